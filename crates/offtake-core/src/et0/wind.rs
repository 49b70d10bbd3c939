//! Wind speed at 2 m: FAO-56 eq. 47 and the default wind of Chapter 3.

use super::error::Et0Error;

/// Lowest accepted anemometer height (m). Eq. 47 is undefined below 0.095 m
/// (ln(67.8 z − 5.42) ≤ 0) and a logarithmic profile over short grass is not
/// credible that close to the canopy.
pub const MIN_WIND_HEIGHT_M: f64 = 0.5;
/// Highest accepted anemometer height (m); above this the surface-layer
/// profile of eq. 47 no longer describes the wind.
pub const MAX_WIND_HEIGHT_M: f64 = 100.0;
/// Default u2 when no wind data are available (m/s): the average over 2 000
/// weather stations around the globe, FAO-56 p. 63 (Chapter 3, missing wind).
pub const DEFAULT_WIND_2M_MS: f64 = 2.0;

/// Factor converting wind speed measured at height z to 2 m (–), checked.
///
/// * `height_m` — anemometer height above ground z (m), 0.5..=100 m.
///
/// Eq. 47: u2 = uz · 4.87/ln(67.8 z − 5.42). FAO-56 p. 56; tabulated in Annex 2
/// Table 2.9 (1.000 at 2 m, 0.748 at 10 m).
///
/// # Errors
/// [`Et0Error::WindHeightOutOfRange`] outside 0.5..=100 m or when not finite.
pub fn wind_height_factor(height_m: f64) -> Result<f64, Et0Error> {
    if !(MIN_WIND_HEIGHT_M..=MAX_WIND_HEIGHT_M).contains(&height_m) {
        return Err(Et0Error::WindHeightOutOfRange {
            height_m,
            min_m: MIN_WIND_HEIGHT_M,
            max_m: MAX_WIND_HEIGHT_M,
        });
    }
    Ok(4.87 / (67.8 * height_m - 5.42).ln()) // Eq. 47
}

/// Wind speed at 2 m above ground from a measurement at height z (m/s).
///
/// * `wind_ms` — measured wind speed uz (m/s); `height_m` — z (m), 0.5..=100.
///
/// Eq. 47 (FAO-56 p. 56): u2 = uz · 4.87/ln(67.8 z − 5.42).
///
/// # Errors
/// [`Et0Error::WindHeightOutOfRange`] for heights outside 0.5..=100 m.
pub fn wind_2m_ms(wind_ms: f64, height_m: f64) -> Result<f64, Et0Error> {
    Ok(wind_ms * wind_height_factor(height_m)?) // Eq. 47
}

/// Wind at 2 m, or the FAO-56 default 2 m/s when the measurement is missing (m/s).
///
/// # Errors
/// As [`wind_2m_ms`].
pub fn wind_2m_or_default_ms(wind_ms: Option<f64>, height_m: f64) -> Result<f64, Et0Error> {
    match wind_ms {
        Some(u) => wind_2m_ms(u, height_m),
        None => Ok(DEFAULT_WIND_2M_MS),
    }
}
