//! Atmospheric parameters and air humidity: FAO-56 Chapter 3, equations 7–19 and 48.
//!
//! Source throughout: Allen, R.G., Pereira, L.S., Raes, D., Smith, M. (1998).
//! *Crop evapotranspiration — Guidelines for computing crop water requirements.*
//! FAO Irrigation and Drainage Paper 56, Rome (pages as printed).
//!
//! # Units
//! Temperatures in °C, pressures and vapour pressures in kPa, elevations in m,
//! relative humidity in %.

/// Latent heat of vaporization λ used by FAO-56 (MJ kg⁻¹), eq. 8 (p. 31).
pub const LATENT_HEAT_MJ_KG: f64 = 2.45;
/// Specific heat at constant pressure cp (MJ kg⁻¹ °C⁻¹), FAO-56 eq. 8 (p. 31).
pub const SPECIFIC_HEAT_MJ_KG_C: f64 = 1.013e-3;
/// Ratio of molecular weights of water vapour and dry air ε (–), FAO-56 eq. 8 (p. 31).
pub const MOLECULAR_WEIGHT_RATIO: f64 = 0.622;

/// cp/(ε λ) as printed in FAO-56 eq. 8 (p. 31): 0.665×10⁻³ °C⁻¹.
pub const PSYCHROMETRIC_COEFFICIENT_PER_C: f64 = 0.665e-3;

/// Psychrometer coefficient a_psy (°C⁻¹), FAO-56 eq. 16 (p. 38).
#[derive(Debug, Clone, Copy, PartialEq)]
#[non_exhaustive]
pub enum Psychrometer {
    /// Ventilated (Assmann type) psychrometer, air movement about 5 m/s: 0.000662 °C⁻¹.
    Ventilated,
    /// Naturally ventilated psychrometer (about 1 m/s): 0.000800 °C⁻¹.
    NaturallyVentilated,
    /// Non-ventilated psychrometer installed indoors: 0.001200 °C⁻¹.
    NonVentilatedIndoors,
}

impl Psychrometer {
    /// The coefficient a_psy in °C⁻¹ (FAO-56 eq. 16, p. 38).
    pub fn coefficient_per_c(self) -> f64 {
        match self {
            Self::Ventilated => 0.000_662,
            Self::NaturallyVentilated => 0.000_800,
            Self::NonVentilatedIndoors => 0.001_200,
        }
    }
}

/// Atmospheric pressure from elevation (kPa).
///
/// * `elevation_m` — elevation above sea level z (m).
///
/// Eq. 7: P = 101.3 [(293 − 0.0065 z)/293]^5.26 — a simplification of the ideal
/// gas law for a standard atmosphere at 20 °C. FAO-56 p. 31.
///
/// Validity: meaningful for terrestrial stations (about −450 m to 9 000 m); the
/// series API rejects elevations outside that range.
#[inline]
pub fn atmospheric_pressure_kpa(elevation_m: f64) -> f64 {
    101.3 * ((293.0 - 0.0065 * elevation_m) / 293.0).powf(5.26) // Eq. 7
}

/// Psychrometric constant γ (kPa °C⁻¹).
///
/// * `pressure_kpa` — atmospheric pressure P (kPa).
///
/// Eq. 8: γ = cp P/(ε λ) = 0.665×10⁻³ P with λ = 2.45 MJ kg⁻¹. FAO-56 p. 31.
/// The printed coefficient 0.665×10⁻³ is used (as in ASCE-EWRI 2005 eq. 4 and
/// Annex 2 Table 2.2); cp/(ε λ) itself evaluates to 0.6647×10⁻³.
#[inline]
pub fn psychrometric_constant_kpa_c(pressure_kpa: f64) -> f64 {
    PSYCHROMETRIC_COEFFICIENT_PER_C * pressure_kpa // Eq. 8
}

/// Saturation vapour pressure e°(T) at air temperature T (kPa).
///
/// * `temperature_c` — air temperature T (°C).
///
/// Eq. 11: e°(T) = 0.6108 exp[17.27 T/(T + 237.3)]. FAO-56 p. 36; tabulated in
/// Annex 2 Table 2.3. Valid for ordinary air temperatures (about −40..60 °C).
#[inline]
pub fn saturation_vapour_pressure_kpa(temperature_c: f64) -> f64 {
    0.6108 * (17.27 * temperature_c / (temperature_c + 237.3)).exp() // Eq. 11
}

/// Mean saturation vapour pressure for a day, es (kPa).
///
/// * `tmax_c`, `tmin_c` — daily maximum and minimum air temperature (°C).
///
/// Eq. 12: es = [e°(Tmax) + e°(Tmin)]/2. FAO-56 p. 36. Using e° of the mean
/// temperature instead underestimates es (Example 3).
#[inline]
pub fn mean_saturation_vapour_pressure_kpa(tmax_c: f64, tmin_c: f64) -> f64 {
    0.5 * (saturation_vapour_pressure_kpa(tmax_c) + saturation_vapour_pressure_kpa(tmin_c)) // Eq. 12
}

/// Slope of the saturation vapour pressure curve Δ at temperature T (kPa °C⁻¹).
///
/// * `temperature_c` — air temperature T (°C); for daily ET₀ the mean of Tmax and Tmin (eq. 9).
///
/// Eq. 13: Δ = 4098 [0.6108 exp(17.27 T/(T + 237.3))]/(T + 237.3)². FAO-56 p. 37;
/// tabulated in Annex 2 Table 2.4.
#[inline]
pub fn saturation_slope_kpa_c(temperature_c: f64) -> f64 {
    let r = 1.0 / (temperature_c + 237.3); // one division serves both places
    4098.0 * (0.6108 * (17.27 * temperature_c * r).exp()) * (r * r) // Eq. 13
}

/// Actual vapour pressure from dewpoint temperature (kPa).
///
/// * `tdew_c` — dewpoint temperature (°C).
///
/// Eq. 14: ea = e°(Tdew). FAO-56 p. 37.
#[inline]
pub fn actual_vapour_pressure_from_dewpoint_kpa(tdew_c: f64) -> f64 {
    saturation_vapour_pressure_kpa(tdew_c) // Eq. 14
}

/// Actual vapour pressure from psychrometer readings (kPa).
///
/// * `tdry_c`, `twet_c` — dry- and wet-bulb temperatures (°C);
/// * `pressure_kpa` — atmospheric pressure P (kPa);
/// * `psychrometer` — instrument type giving a_psy.
///
/// Eq. 15: ea = e°(Twet) − γpsy (Tdry − Twet); eq. 16: γpsy = a_psy P. FAO-56 p. 38.
#[inline]
pub fn actual_vapour_pressure_from_psychrometer_kpa(
    tdry_c: f64,
    twet_c: f64,
    pressure_kpa: f64,
    psychrometer: Psychrometer,
) -> f64 {
    let gamma_psy = psychrometer.coefficient_per_c() * pressure_kpa; // Eq. 16
    saturation_vapour_pressure_kpa(twet_c) - gamma_psy * (tdry_c - twet_c) // Eq. 15
}

/// Actual vapour pressure from daily maximum and minimum relative humidity (kPa).
///
/// * `tmax_c`, `tmin_c` — daily maximum and minimum air temperature (°C);
/// * `rhmax_pct`, `rhmin_pct` — daily maximum and minimum relative humidity (%).
///
/// Eq. 17: ea = [e°(Tmin) RHmax/100 + e°(Tmax) RHmin/100]/2. FAO-56 p. 38.
/// For RH in 0..=100 % the result never exceeds es (eq. 12).
#[inline]
pub fn actual_vapour_pressure_from_rh_max_min_kpa(
    tmax_c: f64,
    tmin_c: f64,
    rhmax_pct: f64,
    rhmin_pct: f64,
) -> f64 {
    0.5 * (saturation_vapour_pressure_kpa(tmin_c) * rhmax_pct / 100.0
        + saturation_vapour_pressure_kpa(tmax_c) * rhmin_pct / 100.0) // Eq. 17
}

/// Actual vapour pressure from daily maximum relative humidity only (kPa).
///
/// * `tmin_c` — daily minimum air temperature (°C);
/// * `rhmax_pct` — daily maximum relative humidity (%).
///
/// Eq. 18: ea = e°(Tmin) RHmax/100. FAO-56 p. 39, recommended over eq. 19 when
/// RHmin is unreliable.
#[inline]
pub fn actual_vapour_pressure_from_rh_max_kpa(tmin_c: f64, rhmax_pct: f64) -> f64 {
    saturation_vapour_pressure_kpa(tmin_c) * rhmax_pct / 100.0 // Eq. 18
}

/// Actual vapour pressure from daily mean relative humidity (kPa).
///
/// * `tmax_c`, `tmin_c` — daily maximum and minimum air temperature (°C);
/// * `rhmean_pct` — mean relative humidity (%).
///
/// Eq. 19: ea = (RHmean/100) [e°(Tmax) + e°(Tmin)]/2. FAO-56 p. 39; less
/// desirable than eqs. 17 and 18.
#[inline]
pub fn actual_vapour_pressure_from_rh_mean_kpa(tmax_c: f64, tmin_c: f64, rhmean_pct: f64) -> f64 {
    rhmean_pct / 100.0 * mean_saturation_vapour_pressure_kpa(tmax_c, tmin_c) // Eq. 19
}

/// Actual vapour pressure estimated from the minimum temperature (kPa), for missing humidity data.
///
/// * `tmin_c` — daily minimum air temperature (°C);
/// * `arid_offset_c` — how far the dewpoint is taken below Tmin (°C, ≥ 0):
///   0 in humid and subhumid climates, 2–3 °C in arid and semi-arid regions (FAO-56 p. 58).
///
/// Eq. 48: ea = e°(Tmin) (with Tdew ≈ Tmin − offset). FAO-56 p. 58.
/// Eq. 48 is printed with 0.611 while eq. 11 uses 0.6108; this function uses
/// eq. 11 (0.6108) throughout so the two paths agree (difference < 0.04 %).
#[inline]
pub fn actual_vapour_pressure_from_tmin_kpa(tmin_c: f64, arid_offset_c: f64) -> f64 {
    saturation_vapour_pressure_kpa(tmin_c - arid_offset_c) // Eq. 48
}

/// Actual vapour pressure for an hour from hourly relative humidity (kPa).
///
/// * `temperature_c` — mean hourly air temperature Thr (°C); `rh_pct` — mean hourly RH (%).
///
/// Eq. 54: ea = e°(Thr) RHhr/100. FAO-56 p. 74.
#[inline]
pub fn actual_vapour_pressure_hourly_kpa(temperature_c: f64, rh_pct: f64) -> f64 {
    saturation_vapour_pressure_kpa(temperature_c) * rh_pct / 100.0 // Eq. 54
}

/// Vapour pressure deficit es − ea (kPa), FAO-56 p. 39 (Example 6).
#[inline]
pub fn vapour_pressure_deficit_kpa(es_kpa: f64, ea_kpa: f64) -> f64 {
    es_kpa - ea_kpa
}

/// Mean daily air temperature from the extremes (°C).
///
/// Eq. 9: Tmean = (Tmax + Tmin)/2. FAO-56 p. 32. Used for daily ET₀ instead of a
/// measured 24-hour mean, as FAO-56 prescribes for standardization.
#[inline]
pub fn mean_air_temperature_c(tmax_c: f64, tmin_c: f64) -> f64 {
    0.5 * (tmax_c + tmin_c) // Eq. 9
}
