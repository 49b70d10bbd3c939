//! Column mappings: which column of a weather file holds which quantity, in
//! which unit.
//!
//! A mapping is plain serde data (RON-friendly enums and strings) so a project
//! can save it and re-import the same file layout in one step. Files that use
//! Offtake's own column names (DESIGN.md) need no mapping; for any other file
//! [`guess_mapping`] proposes one from the header names for the user to
//! confirm.

use serde::{Deserialize, Serialize};

use super::units::{
    DepthUnit, HumidityUnit, PressureUnit, RadiationUnit, TemperatureUnit, WindUnit,
};

/// Offtake's own weather CSV column names (DESIGN.md), in canonical order.
pub const OWN_COLUMNS: [&str; 13] = [
    "date",
    "tmax_c",
    "tmin_c",
    "tmean_c",
    "rhmax_pct",
    "rhmin_pct",
    "rhmean_pct",
    "tdew_c",
    "ea_kpa",
    "wind_ms",
    "solar_mj",
    "sunshine_h",
    "rain_mm",
];

/// A measured quantity of a column, with the unit the file uses.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum Quantity {
    /// Daily maximum air temperature.
    Tmax(TemperatureUnit),
    /// Daily minimum air temperature.
    Tmin(TemperatureUnit),
    /// Daily mean air temperature.
    Tmean(TemperatureUnit),
    /// Daily maximum relative humidity.
    RhMax(HumidityUnit),
    /// Daily minimum relative humidity.
    RhMin(HumidityUnit),
    /// Daily mean relative humidity.
    RhMean(HumidityUnit),
    /// Dewpoint temperature.
    Dewpoint(TemperatureUnit),
    /// Actual vapour pressure.
    VapourPressure(PressureUnit),
    /// Mean wind speed measured at `height_m` above the ground.
    Wind {
        /// Unit of the values.
        unit: WindUnit,
        /// Measurement height above the ground (m); `None` when not known.
        height_m: Option<f64>,
    },
    /// Daily incoming solar radiation.
    Solar(RadiationUnit),
    /// Bright sunshine duration in hours.
    SunshineHours,
    /// Precipitation depth.
    Rain(DepthUnit),
}

impl Quantity {
    /// The `WeatherDay` field (and own CSV column) this quantity fills.
    pub fn field_name(&self) -> &'static str {
        match self {
            Self::Tmax(_) => "tmax_c",
            Self::Tmin(_) => "tmin_c",
            Self::Tmean(_) => "tmean_c",
            Self::RhMax(_) => "rhmax_pct",
            Self::RhMin(_) => "rhmin_pct",
            Self::RhMean(_) => "rhmean_pct",
            Self::Dewpoint(_) => "tdew_c",
            Self::VapourPressure(_) => "ea_kpa",
            Self::Wind { .. } => "wind_ms",
            Self::Solar(_) => "solar_mj",
            Self::SunshineHours => "sunshine_h",
            Self::Rain(_) => "rain_mm",
        }
    }

    /// The unit the file's values are in, for messages.
    pub fn unit_symbol(&self) -> &'static str {
        match self {
            Self::Tmax(u) | Self::Tmin(u) | Self::Tmean(u) | Self::Dewpoint(u) => u.symbol(),
            Self::RhMax(u) | Self::RhMin(u) | Self::RhMean(u) => u.symbol(),
            Self::VapourPressure(u) => u.symbol(),
            Self::Wind { unit, .. } => unit.symbol(),
            Self::Solar(u) => u.symbol(),
            Self::SunshineHours => "h",
            Self::Rain(u) => u.symbol(),
        }
    }

    /// Converts a value in the file's unit to the SI unit of the field.
    pub fn to_si(&self, value: f64) -> f64 {
        match self {
            Self::Tmax(u) | Self::Tmin(u) | Self::Tmean(u) | Self::Dewpoint(u) => {
                u.to_celsius(value)
            }
            Self::RhMax(u) | Self::RhMin(u) | Self::RhMean(u) => u.to_pct(value),
            Self::VapourPressure(u) => u.to_kpa(value),
            Self::Wind { unit, .. } => unit.to_ms(value),
            Self::Solar(u) => u.to_mj_m2_day(value),
            Self::SunshineHours => value,
            Self::Rain(u) => u.to_mm(value),
        }
    }

    /// The quantity of one of Offtake's own column names (SI units), if it is one.
    pub fn from_own_column(name: &str) -> Option<Self> {
        let q = match name {
            "tmax_c" => Self::Tmax(TemperatureUnit::Celsius),
            "tmin_c" => Self::Tmin(TemperatureUnit::Celsius),
            "tmean_c" => Self::Tmean(TemperatureUnit::Celsius),
            "rhmax_pct" => Self::RhMax(HumidityUnit::Percent),
            "rhmin_pct" => Self::RhMin(HumidityUnit::Percent),
            "rhmean_pct" => Self::RhMean(HumidityUnit::Percent),
            "tdew_c" => Self::Dewpoint(TemperatureUnit::Celsius),
            "ea_kpa" => Self::VapourPressure(PressureUnit::Kilopascal),
            "wind_ms" => Self::Wind {
                unit: WindUnit::MetresPerSecond,
                height_m: None,
            },
            "solar_mj" => Self::Solar(RadiationUnit::MegajoulesPerSquareMetreDay),
            "sunshine_h" => Self::SunshineHours,
            "rain_mm" => Self::Rain(DepthUnit::Millimetres),
            _ => return None,
        };
        Some(q)
    }
}

/// One column of the file assigned to a quantity.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MappedColumn {
    /// Header text of the column (matched case-insensitively, surrounding
    /// spaces ignored).
    pub header: String,
    /// What the column holds and in which unit.
    pub quantity: Quantity,
}

/// Which column of a weather file holds the date and which hold which
/// quantity. Columns not listed are ignored (and reported as ignored).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ColumnMapping {
    /// Header text of the date column.
    pub date_column: String,
    /// The measured columns.
    pub columns: Vec<MappedColumn>,
}

impl ColumnMapping {
    /// The mapping of Offtake's own column names (all SI units).
    pub fn own_format() -> Self {
        Self {
            date_column: "date".to_owned(),
            columns: OWN_COLUMNS[1..]
                .iter()
                .filter_map(|name| {
                    Quantity::from_own_column(name).map(|quantity| MappedColumn {
                        header: (*name).to_owned(),
                        quantity,
                    })
                })
                .collect(),
        }
    }

    /// Reads a mapping from RON text.
    ///
    /// # Errors
    /// The RON parse error, with its line and column in the text.
    pub fn from_ron_str(text: &str) -> Result<Self, ron::error::SpannedError> {
        ron::from_str(text)
    }

    /// Writes the mapping as pretty RON text.
    ///
    /// # Errors
    /// Only if serialisation fails, which plain data like this does not.
    pub fn to_ron_string(&self) -> Result<String, ron::Error> {
        ron::ser::to_string_pretty(self, ron::ser::PrettyConfig::default())
    }
}

/// A proposed mapping for the user to confirm, with the columns it could not place.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MappingGuess {
    /// The proposal. `date_column` is empty when no date column was recognised.
    pub mapping: ColumnMapping,
    /// Headers that were not assigned to any quantity.
    pub unassigned: Vec<String>,
}

/// Proposes a mapping from header names alone, for the user to confirm.
///
/// Recognises common spellings of each quantity ("Max Temp (F)", "TMAX",
/// "Wind speed km/h", "Precip (in)", "Solar W/m2", "RH min", "Dew point") and
/// a unit marker in the name; a name without a unit marker gets the SI unit.
/// The first column matching each quantity wins; later duplicates are left
/// unassigned. Wind height is never guessed: it stays `None` for the user to
/// state.
pub fn guess_mapping(headers: &[&str]) -> MappingGuess {
    let mut date_column = String::new();
    let mut columns: Vec<MappedColumn> = Vec::new();
    let mut unassigned = Vec::new();
    for raw in headers {
        let header = raw.trim();
        let norm = normalise(header);
        if let Some(q) = Quantity::from_own_column(&norm) {
            push_unique(&mut columns, &mut unassigned, header, q);
            continue;
        }
        if date_column.is_empty() && is_date_header(&norm) {
            header.clone_into(&mut date_column);
            continue;
        }
        match guess_quantity(&norm) {
            Some(q) => push_unique(&mut columns, &mut unassigned, header, q),
            None => unassigned.push(header.to_owned()),
        }
    }
    MappingGuess {
        mapping: ColumnMapping {
            date_column,
            columns,
        },
        unassigned,
    }
}

fn push_unique(
    columns: &mut Vec<MappedColumn>,
    unassigned: &mut Vec<String>,
    header: &str,
    quantity: Quantity,
) {
    if columns
        .iter()
        .any(|c| c.quantity.field_name() == quantity.field_name())
    {
        unassigned.push(header.to_owned());
    } else {
        columns.push(MappedColumn {
            header: header.to_owned(),
            quantity,
        });
    }
}

/// Lower case, with runs of separators and brackets collapsed to one space.
fn normalise(header: &str) -> String {
    let lower = header.to_lowercase();
    if OWN_COLUMNS.contains(&lower.as_str()) {
        return lower;
    }
    let mut out = String::with_capacity(lower.len());
    for ch in lower.chars() {
        let c = match ch {
            '_' | '-' | '(' | ')' | '[' | ']' | ',' | '.' | ':' => ' ',
            '°' | 'º' => continue,
            other => other,
        };
        if c == ' ' && (out.is_empty() || out.ends_with(' ')) {
            continue;
        }
        out.push(c);
    }
    out.trim_end().to_owned()
}

fn words(norm: &str) -> impl Iterator<Item = &str> {
    norm.split(' ')
}

fn has_word(norm: &str, options: &[&str]) -> bool {
    words(norm).any(|w| options.contains(&w))
}

fn is_date_header(norm: &str) -> bool {
    has_word(
        norm,
        &["date", "day", "datum", "fecha", "time", "timestamp"],
    )
}

fn temperature_unit(norm: &str) -> TemperatureUnit {
    if has_word(norm, &["f", "degf", "fahrenheit"]) || norm.ends_with("degf") {
        TemperatureUnit::Fahrenheit
    } else if has_word(norm, &["k", "kelvin"]) {
        TemperatureUnit::Kelvin
    } else {
        TemperatureUnit::Celsius
    }
}

fn humidity_unit(norm: &str) -> HumidityUnit {
    if has_word(norm, &["fraction", "frac"]) {
        HumidityUnit::Fraction
    } else {
        HumidityUnit::Percent
    }
}

fn guess_quantity(norm: &str) -> Option<Quantity> {
    let is_max = has_word(norm, &["max", "maximum", "tmax", "hi", "high"]) || norm.contains("max");
    let is_min = has_word(norm, &["min", "minimum", "tmin", "lo", "low"]) || norm.contains("min");
    let is_mean = has_word(norm, &["mean", "avg", "average", "tmean", "tavg"])
        || norm.contains("mean")
        || norm.contains("avg");

    if norm.contains("dew") {
        return Some(Quantity::Dewpoint(temperature_unit(norm)));
    }
    if norm.contains("rain") || norm.contains("precip") || norm.contains("prcp") {
        let unit = if has_word(norm, &["in", "inch", "inches"]) {
            DepthUnit::Inches
        } else {
            DepthUnit::Millimetres
        };
        return Some(Quantity::Rain(unit));
    }
    if norm.contains("sunshine") || has_word(norm, &["sun", "ssd", "sunhours"]) {
        return Some(Quantity::SunshineHours);
    }
    if norm.contains("solar") || norm.contains("radiation") || has_word(norm, &["rs", "srad"]) {
        let unit = if norm.contains("kwh") {
            RadiationUnit::KilowattHoursPerSquareMetreDay
        } else if norm.contains("w/m") || norm.contains("wm2") || has_word(norm, &["w", "wm"]) {
            RadiationUnit::WattsPerSquareMetreDailyMean
        } else {
            RadiationUnit::MegajoulesPerSquareMetreDay
        };
        return Some(Quantity::Solar(unit));
    }
    if norm.contains("wind") || has_word(norm, &["ws", "u2", "uz"]) {
        let unit = if norm.contains("km/h") || norm.contains("kmh") || norm.contains("kph") {
            WindUnit::KilometresPerHour
        } else if norm.contains("mph") {
            WindUnit::MilesPerHour
        } else if norm.contains("knot") || has_word(norm, &["kt", "kts", "kn"]) {
            WindUnit::Knots
        } else {
            WindUnit::MetresPerSecond
        };
        return Some(Quantity::Wind {
            unit,
            height_m: None,
        });
    }
    if norm.contains("vapour") || norm.contains("vapor") || has_word(norm, &["ea", "vp"]) {
        let unit = if norm.contains("hpa") {
            PressureUnit::Hectopascal
        } else if norm.contains("mb") {
            PressureUnit::Millibar
        } else {
            PressureUnit::Kilopascal
        };
        return Some(Quantity::VapourPressure(unit));
    }
    if norm.contains("rh") || norm.contains("humid") {
        let unit = humidity_unit(norm);
        return if is_max {
            Some(Quantity::RhMax(unit))
        } else if is_min {
            Some(Quantity::RhMin(unit))
        } else {
            Some(Quantity::RhMean(unit))
        };
    }
    if norm.contains("temp") || norm.starts_with('t') && (is_max || is_min || is_mean) {
        let unit = temperature_unit(norm);
        return if is_max {
            Some(Quantity::Tmax(unit))
        } else if is_min {
            Some(Quantity::Tmin(unit))
        } else {
            Some(Quantity::Tmean(unit))
        };
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn guesses_common_foreign_headers() {
        let g = guess_mapping(&[
            "Date",
            "Max Temp (F)",
            "Min Temp (F)",
            "RH max %",
            "RH min %",
            "Wind speed (km/h)",
            "Solar (W/m2)",
            "Precip (in)",
            "Station",
        ]);
        assert_eq!(g.mapping.date_column, "Date");
        let q: Vec<Quantity> = g.mapping.columns.iter().map(|c| c.quantity).collect();
        assert_eq!(
            q,
            vec![
                Quantity::Tmax(TemperatureUnit::Fahrenheit),
                Quantity::Tmin(TemperatureUnit::Fahrenheit),
                Quantity::RhMax(HumidityUnit::Percent),
                Quantity::RhMin(HumidityUnit::Percent),
                Quantity::Wind {
                    unit: WindUnit::KilometresPerHour,
                    height_m: None
                },
                Quantity::Solar(RadiationUnit::WattsPerSquareMetreDailyMean),
                Quantity::Rain(DepthUnit::Inches),
            ]
        );
        assert_eq!(g.unassigned, vec!["Station".to_owned()]);
    }

    #[test]
    fn own_headers_map_to_si() {
        let g = guess_mapping(&OWN_COLUMNS);
        assert_eq!(g.mapping, ColumnMapping::own_format());
        assert!(g.unassigned.is_empty());
    }

    #[test]
    fn duplicate_quantity_left_unassigned() {
        let g = guess_mapping(&["date", "tmax_c", "Maximum temperature"]);
        assert_eq!(g.mapping.columns.len(), 1);
        assert_eq!(g.unassigned, vec!["Maximum temperature".to_owned()]);
    }

    #[test]
    fn mapping_round_trips_through_ron() {
        let mut m = ColumnMapping::own_format();
        m.columns.push(MappedColumn {
            header: "WS10".into(),
            quantity: Quantity::Wind {
                unit: WindUnit::Knots,
                height_m: Some(10.0),
            },
        });
        let text = m.to_ron_string().expect("serialise");
        let back = ColumnMapping::from_ron_str(&text).expect("parse");
        assert_eq!(back, m);
    }
}
