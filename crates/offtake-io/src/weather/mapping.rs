//! Column mappings: which column of a weather file holds which quantity, in
//! which unit.
//!
//! The mapping types are plain serde data held by the computation crate
//! ([`offtake_core::weather_import`]) so a project can save them and
//! re-import the same file layout in one step; they are re-exported here. Files that use
//! Offtake's own column names (DESIGN.md) need no mapping; for any other file
//! [`guess_mapping`] proposes one from the header names for the user to
//! confirm.

use serde::{Deserialize, Serialize};

pub use offtake_core::weather_import::{ColumnMapping, MappedColumn, OWN_COLUMNS, Quantity};

use super::units::{
    DepthUnit, HumidityUnit, PressureUnit, RadiationUnit, TemperatureUnit, WindUnit,
};

/// Reads a column mapping from RON text.
///
/// # Errors
/// The RON parse error, with its line and column in the text.
pub fn mapping_from_ron_str(text: &str) -> Result<ColumnMapping, ron::error::SpannedError> {
    ron::from_str(text)
}

/// Writes a column mapping as pretty RON text.
///
/// # Errors
/// Only if serialisation fails, which plain data like this does not.
pub fn mapping_to_ron_string(mapping: &ColumnMapping) -> Result<String, ron::Error> {
    ron::ser::to_string_pretty(mapping, ron::ser::PrettyConfig::default())
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
        let text = mapping_to_ron_string(&m).expect("serialise");
        let back = mapping_from_ron_str(&text).expect("parse");
        assert_eq!(back, m);
    }
}
