//! The second project layout (schema 1), kept so its files still open.
//!
//! Differences from schema 2: the weather source held a minimal column
//! mapping, `weather.mapping: (columns: [(source, target, unit)])`, where
//! `target` is one of Offtake's own column names (DESIGN.md) and `unit` a
//! free unit text. Schema 2 replaces it by `weather.import`
//! ([`ImportSettings`]); [`migrate`] converts the mapping, reading the
//! unit texts listed at [`quantity_of`]. A mapping without a `date`
//! target keeps the date column `date`; delimiter, decimal separator and
//! date format stay detected, as schema 1 read them.

use offtake_core::project as cur;
use offtake_core::weather_import::units::{
    DepthUnit, HumidityUnit, PressureUnit, RadiationUnit, TemperatureUnit, WindUnit,
};
use offtake_core::weather_import::{
    ColumnMapping, DateFormat, ImportSettings, MappedColumn, Quantity,
};
use serde::Deserialize;
use thiserror::Error;

/// Schema-1 project: the current layout except the weather source.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields, rename = "Project")]
pub struct Project {
    /// Always 1.
    pub schema: u32,
    /// Scheme name and notes.
    pub scheme: cur::SchemeInfo,
    /// Canals.
    pub canals: Vec<cur::Canal>,
    /// Blocks.
    pub blocks: Vec<cur::Block>,
    /// Plantings.
    pub plantings: Vec<cur::Planting>,
    /// Weather source with the schema-1 mapping.
    pub weather: WeatherSource,
    /// Reservoir.
    #[serde(default)]
    pub reservoir: Option<cur::Reservoir>,
    /// Options.
    pub options: cur::Options,
    /// Scenarios.
    #[serde(default)]
    pub scenarios: Vec<cur::Scenario>,
}

/// Schema-1 weather source.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WeatherSource {
    /// Path to the weather CSV.
    pub path: String,
    /// Latitude, degrees.
    pub latitude_deg: f64,
    /// Elevation, m.
    pub elevation_m: f64,
    /// Wind measurement height, m.
    pub wind_height_m: f64,
    /// The minimal mapping.
    #[serde(default)]
    pub mapping: Option<WeatherMapping>,
}

/// Schema-1 mapping: one entry per mapped column.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WeatherMapping {
    /// The mapped columns.
    pub columns: Vec<ColumnMap>,
}

/// Schema-1 mapped column.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ColumnMap {
    /// Header in the source file.
    pub source: String,
    /// Offtake column name (`date`, `tmax_c`, `rain_mm`, …).
    pub target: String,
    /// Unit text of the source column, if not Offtake's unit.
    #[serde(default)]
    pub unit: Option<String>,
}

/// A schema-1 mapping entry the current schema cannot express.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[non_exhaustive]
pub enum MigrationError {
    /// `target` is not one of Offtake's column names.
    #[error(
        "weather.mapping column {header:?}: target {target:?} is not an Offtake column name (expected one of date, tmax_c, tmin_c, tmean_c, rhmax_pct, rhmin_pct, rhmean_pct, tdew_c, ea_kpa, wind_ms, solar_mj, sunshine_h, rain_mm)"
    )]
    UnknownTarget {
        /// The source header.
        header: String,
        /// The target given.
        target: String,
    },
    /// The unit text is not one this target can be in.
    #[error(
        "weather.mapping column {header:?} ({target}): unit {unit:?} is not understood; expected one of {expected}"
    )]
    UnknownUnit {
        /// The source header.
        header: String,
        /// The target.
        target: String,
        /// The unit text given.
        unit: String,
        /// The unit texts accepted for this target.
        expected: &'static str,
    },
}

/// Lower case, without spaces, degree signs and `_`.
fn normalise_unit(unit: &str) -> String {
    unit.chars()
        .filter(|c| !c.is_whitespace() && !matches!(c, '°' | 'º' | '_'))
        .flat_map(char::to_lowercase)
        .collect()
}

/// The quantity of a schema-1 mapping entry: `target` (Offtake's column
/// name) in the unit `unit` (`None` = the column's own unit).
///
/// Unit texts read (case, spaces and degree signs ignored): temperature
/// `C`, `degC`, `celsius`, `F`, `degF`, `fahrenheit`, `K`, `kelvin`;
/// humidity `%`, `pct`, `percent`, `fraction`, `frac`; vapour pressure
/// `kPa`, `hPa`, `mbar`, `mb`; wind `m/s`, `ms`, `km/h`, `kmh`, `kph`,
/// `mph`, `knots`, `knot`, `kn`, `kt`, `kts`; radiation `MJ/m2/day`, `MJ`,
/// `W/m2`, `Wm-2`, `kWh/m2/day`, `kWh`; sunshine `h`, `hours`; rain `mm`,
/// `in`, `inch`, `inches`.
///
/// # Errors
/// [`MigrationError`] naming the column, the text found and the texts
/// accepted.
pub fn quantity_of(c: &ColumnMap) -> Result<Quantity, MigrationError> {
    let Some(own) = Quantity::from_own_column(&c.target.trim().to_lowercase()) else {
        return Err(MigrationError::UnknownTarget {
            header: c.source.clone(),
            target: c.target.clone(),
        });
    };
    let Some(unit_text) = c.unit.as_deref().filter(|u| !u.trim().is_empty()) else {
        return Ok(own);
    };
    let u = normalise_unit(unit_text);
    let bad = |expected: &'static str| MigrationError::UnknownUnit {
        header: c.source.clone(),
        target: own.field_name().to_owned(),
        unit: unit_text.to_owned(),
        expected,
    };
    let temperature = || match u.as_str() {
        "c" | "degc" | "celsius" => Ok(TemperatureUnit::Celsius),
        "f" | "degf" | "fahrenheit" => Ok(TemperatureUnit::Fahrenheit),
        "k" | "kelvin" => Ok(TemperatureUnit::Kelvin),
        _ => Err(bad("C, F, K")),
    };
    let humidity = || match u.as_str() {
        "%" | "pct" | "percent" => Ok(HumidityUnit::Percent),
        "fraction" | "frac" => Ok(HumidityUnit::Fraction),
        _ => Err(bad("%, fraction")),
    };
    let q = match own {
        Quantity::Tmax(_) => Quantity::Tmax(temperature()?),
        Quantity::Tmin(_) => Quantity::Tmin(temperature()?),
        Quantity::Tmean(_) => Quantity::Tmean(temperature()?),
        Quantity::Dewpoint(_) => Quantity::Dewpoint(temperature()?),
        Quantity::RhMax(_) => Quantity::RhMax(humidity()?),
        Quantity::RhMin(_) => Quantity::RhMin(humidity()?),
        Quantity::RhMean(_) => Quantity::RhMean(humidity()?),
        Quantity::VapourPressure(_) => Quantity::VapourPressure(match u.as_str() {
            "kpa" => PressureUnit::Kilopascal,
            "hpa" => PressureUnit::Hectopascal,
            "mbar" | "mb" => PressureUnit::Millibar,
            _ => return Err(bad("kPa, hPa, mbar")),
        }),
        Quantity::Wind { height_m, .. } => Quantity::Wind {
            unit: match u.as_str() {
                "m/s" | "ms" | "mps" => WindUnit::MetresPerSecond,
                "km/h" | "kmh" | "kph" => WindUnit::KilometresPerHour,
                "mph" => WindUnit::MilesPerHour,
                "knots" | "knot" | "kn" | "kt" | "kts" => WindUnit::Knots,
                _ => return Err(bad("m/s, km/h, mph, knots")),
            },
            height_m,
        },
        Quantity::Solar(_) => Quantity::Solar(match u.as_str() {
            "mj/m2/day" | "mj/m2" | "mj" | "mjm-2day-1" | "mj/m²/day" => {
                RadiationUnit::MegajoulesPerSquareMetreDay
            }
            "w/m2" | "wm-2" | "w/m²" | "wm2" => RadiationUnit::WattsPerSquareMetreDailyMean,
            "kwh/m2/day" | "kwh/m2" | "kwh" | "kwh/m²/day" => {
                RadiationUnit::KilowattHoursPerSquareMetreDay
            }
            _ => return Err(bad("MJ/m2/day, W/m2, kWh/m2/day")),
        }),
        Quantity::SunshineHours => match u.as_str() {
            "h" | "hours" | "hour" => Quantity::SunshineHours,
            _ => return Err(bad("h")),
        },
        Quantity::Rain(_) => Quantity::Rain(match u.as_str() {
            "mm" => DepthUnit::Millimetres,
            "in" | "inch" | "inches" => DepthUnit::Inches,
            _ => return Err(bad("mm, in")),
        }),
    };
    Ok(q)
}

/// The date format named by a schema-1 `date` entry's unit text, if any.
fn date_format_of(c: &ColumnMap) -> Result<Option<DateFormat>, MigrationError> {
    let Some(text) = c.unit.as_deref().filter(|u| !u.trim().is_empty()) else {
        return Ok(None);
    };
    match normalise_unit(text).as_str() {
        "iso" | "yyyy-mm-dd" => Ok(Some(DateFormat::Iso)),
        "dd/mm/yyyy" | "d/m/y" | "dmy" => Ok(Some(DateFormat::DayMonthYear)),
        "mm/dd/yyyy" | "m/d/y" | "mdy" => Ok(Some(DateFormat::MonthDayYear)),
        _ => Err(MigrationError::UnknownUnit {
            header: c.source.clone(),
            target: "date".to_owned(),
            unit: text.to_owned(),
            expected: "yyyy-mm-dd, dd/mm/yyyy, mm/dd/yyyy",
        }),
    }
}

/// Converts a schema-1 mapping to import settings (`None` for no or an
/// empty mapping).
///
/// # Errors
/// [`MigrationError`] for an unknown target or unit text.
pub fn import_settings_of(
    mapping: Option<WeatherMapping>,
) -> Result<Option<ImportSettings>, MigrationError> {
    let Some(mapping) = mapping.filter(|m| !m.columns.is_empty()) else {
        return Ok(None);
    };
    let mut date_column = "date".to_owned();
    let mut date_format = None;
    let mut columns = Vec::new();
    for c in &mapping.columns {
        if c.target.trim().eq_ignore_ascii_case("date") {
            date_column.clone_from(&c.source);
            date_format = date_format_of(c)?;
        } else {
            columns.push(MappedColumn {
                header: c.source.clone(),
                quantity: quantity_of(c)?,
            });
        }
    }
    Ok(Some(ImportSettings {
        mapping: Some(ColumnMapping {
            date_column,
            columns,
        }),
        date_format,
        ..ImportSettings::default()
    }))
}

/// Converts a schema-1 project to the current schema.
///
/// # Errors
/// [`MigrationError`] when the weather mapping names an unknown column or
/// unit.
pub fn migrate(old: Project) -> Result<cur::Project, MigrationError> {
    let w = old.weather;
    Ok(cur::Project {
        schema: cur::CURRENT_SCHEMA,
        scheme: old.scheme,
        canals: old.canals,
        blocks: old.blocks,
        plantings: old.plantings,
        weather: cur::WeatherSource {
            path: w.path,
            latitude_deg: w.latitude_deg,
            elevation_m: w.elevation_m,
            wind_height_m: w.wind_height_m,
            import: import_settings_of(w.mapping)?,
        },
        reservoir: old.reservoir,
        options: old.options,
        scenarios: old.scenarios,
        user_crops: Vec::new(),
        user_soils: Vec::new(),
    })
}
