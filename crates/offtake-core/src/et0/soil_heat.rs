//! Soil heat flux G: FAO-56 Chapter 3, equations 42–46 (pp. 54–55).
//!
//! # Units
//! MJ m⁻² day⁻¹ (daily and monthly) or MJ m⁻² hour⁻¹ (hourly); temperatures in °C.

/// Soil heat flux beneath the grass reference for a day or ten-day period (MJ m⁻² day⁻¹).
///
/// Eq. 42: G_day ≈ 0. FAO-56 p. 54 — the flux is small compared with Rn over a day.
#[inline]
pub const fn soil_heat_flux_daily_mj() -> f64 {
    0.0 // Eq. 42
}

/// Monthly soil heat flux from the previous and next months' mean air temperature (MJ m⁻² day⁻¹).
///
/// * `t_prev_month_c` — T of month i−1; `t_next_month_c` — T of month i+1 (°C).
///
/// Eq. 43: G_month,i = 0.07 (T_month,i+1 − T_month,i−1). FAO-56 p. 54. Assumes a
/// constant soil heat capacity of 2.1 MJ m⁻³ °C⁻¹ and an appropriate soil depth.
#[inline]
pub fn soil_heat_flux_monthly_mj(t_prev_month_c: f64, t_next_month_c: f64) -> f64 {
    0.07 * (t_next_month_c - t_prev_month_c) // Eq. 43
}

/// Monthly soil heat flux when the next month is unknown (MJ m⁻² day⁻¹).
///
/// * `t_prev_month_c` — T of month i−1; `t_month_c` — T of month i (°C).
///
/// Eq. 44: G_month,i = 0.14 (T_month,i − T_month,i−1). FAO-56 p. 54.
#[inline]
pub fn soil_heat_flux_monthly_backward_mj(t_prev_month_c: f64, t_month_c: f64) -> f64 {
    0.14 * (t_month_c - t_prev_month_c) // Eq. 44
}

/// Hourly soil heat flux during daylight (MJ m⁻² hour⁻¹).
///
/// Eq. 45: G_hr = 0.1 Rn. FAO-56 p. 55.
#[inline]
pub fn soil_heat_flux_hourly_day_mj(rn_mj: f64) -> f64 {
    0.1 * rn_mj // Eq. 45
}

/// Hourly soil heat flux during night-time (MJ m⁻² hour⁻¹).
///
/// Eq. 46: G_hr = 0.5 Rn. FAO-56 p. 55.
#[inline]
pub fn soil_heat_flux_hourly_night_mj(rn_mj: f64) -> f64 {
    0.5 * rn_mj // Eq. 46
}
