//! Typed errors of the ET₀ computations.

use thiserror::Error;

/// Why an ET₀ quantity (or a whole day) could not be computed.
///
/// Every variant carries the offending value so that callers (the importer,
/// the command line, the app) can say what was found and what was expected.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum Et0Error {
    /// Latitude outside −90..=90 decimal degrees.
    #[error("latitude {latitude_deg}° is outside -90..=90 degrees")]
    LatitudeOutOfRange {
        /// The latitude that was given (decimal degrees).
        latitude_deg: f64,
    },
    /// Elevation outside the range where FAO-56 eq. 7 is meaningful.
    #[error("elevation {elevation_m} m is outside {min_m}..={max_m} m")]
    ElevationOutOfRange {
        /// The elevation that was given (m).
        elevation_m: f64,
        /// Lowest accepted elevation (m).
        min_m: f64,
        /// Highest accepted elevation (m).
        max_m: f64,
    },
    /// Wind measurement height outside the accepted range of FAO-56 eq. 47.
    #[error(
        "wind measurement height {height_m} m is outside {min_m}..={max_m} m \
         (FAO-56 eq. 47 is a logarithmic profile over short grass and is undefined below 0.095 m)"
    )]
    WindHeightOutOfRange {
        /// The height that was given (m).
        height_m: f64,
        /// Lowest accepted height (m).
        min_m: f64,
        /// Highest accepted height (m).
        max_m: f64,
    },
    /// A value that must be a finite number was NaN or infinite.
    #[error("{quantity} is not a finite number (found {value})")]
    NotFinite {
        /// Name of the quantity, with its unit (e.g. `"tmax_c"`).
        quantity: &'static str,
        /// The value found.
        value: f64,
    },
    /// A value that must not be negative was negative.
    #[error("{quantity} must not be negative (found {value})")]
    Negative {
        /// Name of the quantity, with its unit (e.g. `"wind_ms"`).
        quantity: &'static str,
        /// The value found.
        value: f64,
    },
    /// A relative humidity outside 0..=100 % (beyond the accepted tolerance).
    #[error("{quantity} = {value_pct} % is outside 0..=100 %")]
    RelativeHumidityOutOfRange {
        /// Which humidity (e.g. `"rhmax_pct"`).
        quantity: &'static str,
        /// The value found (%).
        value_pct: f64,
    },
    /// Daily minimum temperature above the daily maximum.
    #[error("tmin_c = {tmin_c} °C is above tmax_c = {tmax_c} °C")]
    TminAboveTmax {
        /// Daily minimum temperature (°C).
        tmin_c: f64,
        /// Daily maximum temperature (°C).
        tmax_c: f64,
    },
    /// A required temperature is missing.
    #[error("{quantity} is missing; ET0 needs daily maximum and minimum air temperature")]
    MissingTemperature {
        /// Which temperature (`"tmax_c"` or `"tmin_c"`).
        quantity: &'static str,
    },
    /// Bright sunshine longer than the astronomical day length allows.
    #[error("sunshine_h = {sunshine_h} h exceeds the day length N = {daylight_h:.2} h")]
    SunshineExceedsDaylength {
        /// Sunshine duration given (h).
        sunshine_h: f64,
        /// Astronomical day length N (h, FAO-56 eq. 34).
        daylight_h: f64,
    },
}

/// An ET₀ method name that is not one of `pm`, `hargreaves`, `asce-short`, `asce-tall`.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[error("unknown ET0 method '{found}'; expected one of pm, hargreaves, asce-short, asce-tall")]
pub struct UnknownMethodError {
    /// The name that was given.
    pub found: String,
}

/// Returns `Ok(value)` if `value` is finite, else [`Et0Error::NotFinite`].
///
/// # Errors
/// [`Et0Error::NotFinite`] for NaN or ±∞.
pub fn require_finite(quantity: &'static str, value: f64) -> Result<f64, Et0Error> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(Et0Error::NotFinite { quantity, value })
    }
}
