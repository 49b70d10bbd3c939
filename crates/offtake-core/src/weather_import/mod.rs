//! How a weather file is read: the saved import settings of a project.
//!
//! These are the pure document types of weather import — which column holds
//! which quantity in which unit ([`ColumnMapping`]), how dates are written
//! ([`DateFormat`]), the delimiter and decimal separator, and the texts that
//! mean "missing" — gathered in [`ImportSettings`]. A project keeps one in
//! `WeatherSource::import` so the same file layout is re-imported in one step.
//! Reading files with them is the job of `offtake_io::weather`, which
//! re-exports every type here under its old paths.
//!
//! The unit conversion factors live in [`units`], each with its source.
//!
//! The enums here are deliberately exhaustive (not `#[non_exhaustive]`): the
//! importer and the app's mapping editor match on every variant, so a new
//! unit or quantity fails to compile until each of them handles it.

mod mapping;
pub mod units;

use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use mapping::{ColumnMapping, MappedColumn, OWN_COLUMNS, Quantity};

/// How dates are written in a weather file. Four-digit years only.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum DateFormat {
    /// Year-month-day, ISO 8601 (`2024-03-15`; `/` also accepted).
    Iso,
    /// Day/month/year (`15/03/2024`; `-` and `.` also accepted).
    DayMonthYear,
    /// Month/day/year (`03/15/2024`; `-` and `.` also accepted).
    MonthDayYear,
}

impl DateFormat {
    /// Human description for messages.
    pub fn describe(self) -> &'static str {
        match self {
            Self::Iso => "a date YYYY-MM-DD",
            Self::DayMonthYear => "a date DD/MM/YYYY (day/month/year)",
            Self::MonthDayYear => "a date MM/DD/YYYY (month/day/year)",
        }
    }
}

/// Field delimiter of a weather file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Delimiter {
    /// `,`
    Comma,
    /// `;`
    Semicolon,
    /// Tab.
    Tab,
}

impl Delimiter {
    /// The delimiter's byte.
    pub fn as_byte(self) -> u8 {
        match self {
            Self::Comma => b',',
            Self::Semicolon => b';',
            Self::Tab => b'\t',
        }
    }
}

/// Decimal separator of numbers in a weather file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum DecimalSeparator {
    /// `12.5`
    Point,
    /// `12,5` (only possible when the delimiter is not a comma).
    Comma,
}

/// How to read one weather file: the part of the importer's options that is
/// a property of the file and is saved with a project.
///
/// `None` fields are detected from the file when it is read; detection never
/// guesses between day/month and month/day order. `ImportSettings::default()`
/// reads a file in Offtake's own column names with everything detected.
///
/// # Wind height
/// A mapped wind column may state its measurement height
/// (`Quantity::Wind { height_m }`). In a project the station's
/// `WeatherSource::wind_height_m` is what the computation uses; a stated
/// height must equal it (project validation reports a mismatch and
/// `offtake_io::weather::load_project_weather` refuses the file), and
/// `WeatherSource::set_import` adopts the mapping's height when settings are
/// attached, so the mapping's stated height wins at that moment.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImportSettings {
    /// Column mapping; `None` means the file uses Offtake's own column names.
    #[serde(default)]
    pub mapping: Option<ColumnMapping>,
    /// Date format; `None` detects ISO, or D/M/Y vs M/D/Y from a date whose
    /// day is above 12 (reported as a warning). A file where no date decides
    /// is an error.
    #[serde(default)]
    pub date_format: Option<DateFormat>,
    /// Delimiter; `None` detects it from the header line.
    #[serde(default)]
    pub delimiter: Option<Delimiter>,
    /// Decimal separator; `None` accepts a decimal comma when the delimiter is
    /// not a comma (reported as a warning).
    #[serde(default)]
    pub decimal: Option<DecimalSeparator>,
    /// Cell texts meaning "missing" besides a blank cell (e.g. `"NA"`,
    /// `"-9999"`); matched exactly after trimming.
    #[serde(default)]
    pub missing_markers: Vec<String>,
}

impl ImportSettings {
    /// Measurement height (m) stated by the mapping's wind column, if any.
    pub fn stated_wind_height_m(&self) -> Option<f64> {
        self.mapping
            .as_ref()
            .and_then(ColumnMapping::wind_column)
            .and_then(|(_, h)| h)
    }

    /// Every contradiction within the settings; empty when they can be used.
    pub fn problems(&self) -> Vec<ImportSettingsProblem> {
        let mut out = Vec::new();
        if self.decimal == Some(DecimalSeparator::Comma) && self.delimiter == Some(Delimiter::Comma)
        {
            out.push(ImportSettingsProblem::DecimalCommaWithCommaDelimiter);
        }
        if let Some(m) = &self.mapping {
            if m.date_column.trim().is_empty() {
                out.push(ImportSettingsProblem::NoDateColumn);
            }
            let mut headers: Vec<String> = vec![m.date_column.trim().to_lowercase()];
            let mut fields: Vec<&'static str> = Vec::new();
            for c in &m.columns {
                let h = c.header.trim().to_lowercase();
                if headers.contains(&h) {
                    out.push(ImportSettingsProblem::HeaderMappedTwice {
                        header: c.header.clone(),
                    });
                }
                headers.push(h);
                let field = c.quantity.field_name();
                if fields.contains(&field) {
                    out.push(ImportSettingsProblem::QuantityMappedTwice {
                        header: c.header.clone(),
                        field,
                    });
                }
                fields.push(field);
                if let Quantity::Wind {
                    height_m: Some(h), ..
                } = c.quantity
                    && !(h.is_finite() && h > 0.0)
                {
                    out.push(ImportSettingsProblem::BadWindHeight {
                        header: c.header.clone(),
                        height_m: h,
                    });
                }
            }
        }
        out
    }
}

/// A contradiction within [`ImportSettings`].
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum ImportSettingsProblem {
    /// Numbers with a decimal comma cannot be read in a comma-delimited file.
    #[error(
        "weather import: decimal comma with a comma delimiter; use a semicolon or tab delimiter"
    )]
    DecimalCommaWithCommaDelimiter,
    /// The mapping names no date column.
    #[error("weather import: the column mapping names no date column")]
    NoDateColumn,
    /// One header is assigned twice (or is also the date column).
    #[error("weather import: column {header:?} is mapped twice")]
    HeaderMappedTwice {
        /// The header.
        header: String,
    },
    /// Two columns fill the same quantity.
    #[error("weather import: column {header:?} fills {field}, which another column already fills")]
    QuantityMappedTwice {
        /// The second column.
        header: String,
        /// The quantity's field name (e.g. `tmax_c`).
        field: &'static str,
    },
    /// A stated wind height is not a finite number > 0.
    #[error(
        "weather import: wind column {header:?} height {height_m} m must be a finite number > 0"
    )]
    BadWindHeight {
        /// The wind column.
        header: String,
        /// The stated height.
        height_m: f64,
    },
}

#[cfg(test)]
mod tests {
    use super::units::{DepthUnit, TemperatureUnit, WindUnit};
    use super::*;

    fn foreign() -> ImportSettings {
        ImportSettings {
            mapping: Some(ColumnMapping {
                date_column: "Fecha".into(),
                columns: vec![
                    MappedColumn {
                        header: "Tx (F)".into(),
                        quantity: Quantity::Tmax(TemperatureUnit::Fahrenheit),
                    },
                    MappedColumn {
                        header: "Viento km/h".into(),
                        quantity: Quantity::Wind {
                            unit: WindUnit::KilometresPerHour,
                            height_m: Some(10.0),
                        },
                    },
                    MappedColumn {
                        header: "Lluvia in".into(),
                        quantity: Quantity::Rain(DepthUnit::Inches),
                    },
                ],
            }),
            date_format: Some(DateFormat::DayMonthYear),
            delimiter: Some(Delimiter::Semicolon),
            decimal: Some(DecimalSeparator::Comma),
            missing_markers: vec!["-9999".into()],
        }
    }

    #[test]
    fn consistent_settings_have_no_problems() {
        assert!(foreign().problems().is_empty());
        assert!(ImportSettings::default().problems().is_empty());
        assert_eq!(foreign().stated_wind_height_m(), Some(10.0));
        assert_eq!(ImportSettings::default().stated_wind_height_m(), None);
    }

    #[test]
    fn each_contradiction_is_reported() {
        let mut s = foreign();
        s.delimiter = Some(Delimiter::Comma);
        assert_eq!(
            s.problems(),
            vec![ImportSettingsProblem::DecimalCommaWithCommaDelimiter]
        );
        let mut s = foreign();
        let m = s.mapping.as_mut().expect("mapping");
        m.date_column = " ".into();
        m.columns.push(MappedColumn {
            header: "TX (f)".into(),
            quantity: Quantity::Tmin(TemperatureUnit::Fahrenheit),
        });
        m.columns.push(MappedColumn {
            header: "Other rain".into(),
            quantity: Quantity::Rain(DepthUnit::Millimetres),
        });
        m.set_wind_height_m(Some(-2.0));
        let p = s.problems();
        assert!(p.contains(&ImportSettingsProblem::NoDateColumn), "{p:?}");
        assert!(p.contains(&ImportSettingsProblem::HeaderMappedTwice {
            header: "TX (f)".into()
        }));
        assert!(p.contains(&ImportSettingsProblem::QuantityMappedTwice {
            header: "Other rain".into(),
            field: "rain_mm"
        }));
        assert!(p.contains(&ImportSettingsProblem::BadWindHeight {
            header: "Viento km/h".into(),
            height_m: -2.0
        }));
    }

    #[test]
    fn settings_round_trip_through_ron() {
        let s = foreign();
        let text =
            ron::ser::to_string_pretty(&s, ron::ser::PrettyConfig::default()).expect("serialise");
        let back: ImportSettings = ron::from_str(&text).expect("parse");
        assert_eq!(back, s);
        // Every field may be left out.
        let empty: ImportSettings = ron::from_str("()").expect("parse");
        assert_eq!(empty, ImportSettings::default());
    }
}
