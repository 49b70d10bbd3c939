//! Daily weather records and the station they were measured at.
//!
//! These are the plain data types shared by the ET₀ core, the quality checks,
//! the gap filler and the importers. Every field is optional because real
//! records have gaps; the ET₀ functions decide which FAO-56 missing-data
//! procedure applies to each day.

use chrono::NaiveDate;
use serde::{Deserialize, Serialize};

/// Where a weather series was measured.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct StationSite {
    /// Latitude in decimal degrees, north positive, −90..=90.
    pub latitude_deg: f64,
    /// Station elevation above mean sea level in metres.
    pub elevation_m: f64,
    /// Height of the wind measurement above the ground in metres (2 m standard).
    pub wind_height_m: f64,
}

impl Default for StationSite {
    fn default() -> Self {
        Self {
            latitude_deg: 0.0,
            elevation_m: 0.0,
            wind_height_m: 2.0,
        }
    }
}

/// One day of measured weather, in SI units, every value optional.
///
/// Field names follow the weather CSV column names of DESIGN.md.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct WeatherDay {
    /// Calendar date of the record.
    pub date: NaiveDate,
    /// Daily maximum air temperature (°C).
    pub tmax_c: Option<f64>,
    /// Daily minimum air temperature (°C).
    pub tmin_c: Option<f64>,
    /// Daily mean air temperature (°C), if measured.
    pub tmean_c: Option<f64>,
    /// Daily maximum relative humidity (%).
    pub rhmax_pct: Option<f64>,
    /// Daily minimum relative humidity (%).
    pub rhmin_pct: Option<f64>,
    /// Daily mean relative humidity (%).
    pub rhmean_pct: Option<f64>,
    /// Dewpoint temperature (°C).
    pub tdew_c: Option<f64>,
    /// Actual vapour pressure (kPa).
    pub ea_kpa: Option<f64>,
    /// Mean wind speed at the station's wind height (m/s).
    pub wind_ms: Option<f64>,
    /// Incoming solar (shortwave) radiation (MJ m⁻² day⁻¹).
    pub solar_mj: Option<f64>,
    /// Bright sunshine duration (hours).
    pub sunshine_h: Option<f64>,
    /// Precipitation (mm).
    pub rain_mm: Option<f64>,
}

impl WeatherDay {
    /// A day with a date and every value missing.
    pub fn empty(date: NaiveDate) -> Self {
        Self {
            date,
            tmax_c: None,
            tmin_c: None,
            tmean_c: None,
            rhmax_pct: None,
            rhmin_pct: None,
            rhmean_pct: None,
            tdew_c: None,
            ea_kpa: None,
            wind_ms: None,
            solar_mj: None,
            sunshine_h: None,
            rain_mm: None,
        }
    }
}
