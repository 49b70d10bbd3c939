//! Column mappings: which column of a weather file holds which quantity, in
//! which unit.
//!
//! A mapping is plain serde data (RON-friendly enums and strings) so a project
//! can save it and re-import the same file layout in one step. Files that use
//! Offtake's own column names (DESIGN.md) need no mapping; for any other file
//! the importer (`offtake_io::weather::guess_mapping`) proposes one from the
//! header names for the user to confirm.

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
#[serde(deny_unknown_fields)]
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
#[serde(deny_unknown_fields)]
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

    /// The wind column, if the mapping has one: its header and stated
    /// measurement height (m; `None` when the mapping does not state it).
    pub fn wind_column(&self) -> Option<(&str, Option<f64>)> {
        self.columns.iter().find_map(|c| match c.quantity {
            Quantity::Wind { height_m, .. } => Some((c.header.as_str(), height_m)),
            _ => None,
        })
    }

    /// Sets the measurement height of every wind column (m).
    pub fn set_wind_height_m(&mut self, height_m: Option<f64>) {
        for c in &mut self.columns {
            if let Quantity::Wind { height_m: h, .. } = &mut c.quantity {
                *h = height_m;
            }
        }
    }
}
