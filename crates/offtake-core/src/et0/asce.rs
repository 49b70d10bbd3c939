//! ASCE-EWRI (2005) standardized reference evapotranspiration: the parts that
//! differ from FAO-56.
//!
//! Source: ASCE-EWRI (2005) *The ASCE Standardized Reference
//! Evapotranspiration Equation*, Report of the Task Committee on
//! Standardization of Reference Evapotranspiration, Allen, R.G., Walter, I.A.,
//! Elliott, R.L. et al. (eds.), ASCE, Reston VA. Table 1 and equations 1–19, 45.
//!
//! The combination equation and its Table 1 constants are in
//! [`super::combination`]; pressure (eq. 3), γ (eq. 4), es, ea, Ra and the
//! wind conversion are the same as FAO-56 and reused from there.

/// Stefan–Boltzmann constant for daily sums in ASCE-EWRI (2005) eq. 17 (MJ K⁻⁴ m⁻² day⁻¹).
pub const STEFAN_BOLTZMANN_MJ_K4_M2_DAY: f64 = 4.901e-9;
/// Stefan–Boltzmann constant for hourly sums in ASCE-EWRI (2005) eq. 44 (MJ K⁻⁴ m⁻² hour⁻¹).
pub const STEFAN_BOLTZMANN_MJ_K4_M2_HOUR: f64 = 2.042e-10;
/// Lower limit of Rs/Rso in the cloudiness function (ASCE-EWRI 2005 eqs. 18, 45).
pub const MIN_RELATIVE_SHORTWAVE: f64 = 0.3;
/// Lower limit of the cloudiness function fcd (ASCE-EWRI 2005 eqs. 18, 45).
pub const MIN_CLOUDINESS_FUNCTION: f64 = 0.05;
/// Kelvin offset used by ASCE-EWRI (2005) eq. 17.
pub const KELVIN_OFFSET: f64 = 273.16;

/// Slope of the saturation vapour pressure curve, ASCE form (kPa °C⁻¹).
///
/// ASCE-EWRI (2005) eq. 5: Δ = 2503 exp(17.27 T/(T + 237.3))/(T + 237.3)².
/// Identical to FAO-56 eq. 13 up to rounding (4098 × 0.6108 = 2503.0).
#[inline]
pub fn saturation_slope_kpa_c(temperature_c: f64) -> f64 {
    let t_plus = temperature_c + 237.3;
    2503.0 * (17.27 * temperature_c / t_plus).exp() / (t_plus * t_plus) // Eq. 5
}

/// Cloudiness function fcd (–).
///
/// * `rs_over_rso` — relative shortwave radiation Rs/Rso (–).
///
/// ASCE-EWRI (2005) eq. 18 (daily) / 45 (hourly): fcd = 1.35 Rs/Rso − 0.35, with
/// Rs/Rso limited to 0.3..=1.0 and fcd to 0.05..=1.0.
#[inline]
pub fn cloudiness_function(rs_over_rso: f64) -> f64 {
    let ratio = rs_over_rso.clamp(MIN_RELATIVE_SHORTWAVE, 1.0);
    (1.35 * ratio - 0.35).clamp(MIN_CLOUDINESS_FUNCTION, 1.0) // Eq. 18
}

/// Net outgoing longwave radiation for a day, ASCE form (MJ m⁻² day⁻¹).
///
/// * `tmax_c`, `tmin_c` (°C); `ea_kpa` (kPa); `rs_over_rso` (–, limited inside).
///
/// ASCE-EWRI (2005) eq. 17: Rnl = σ fcd (0.34 − 0.14 √ea)(Tmax,K⁴ + Tmin,K⁴)/2,
/// σ = 4.901×10⁻⁹.
#[inline]
pub fn net_longwave_radiation_mj(tmax_c: f64, tmin_c: f64, ea_kpa: f64, rs_over_rso: f64) -> f64 {
    let kmax = tmax_c + KELVIN_OFFSET;
    let kmin = tmin_c + KELVIN_OFFSET;
    let mean_t4 = 0.5 * (kmax * kmax * kmax * kmax + kmin * kmin * kmin * kmin);
    STEFAN_BOLTZMANN_MJ_K4_M2_DAY
        * cloudiness_function(rs_over_rso)
        * (0.34 - 0.14 * ea_kpa.max(0.0).sqrt())
        * mean_t4 // Eq. 17
}

/// Net outgoing longwave radiation for an hour, ASCE form (MJ m⁻² hour⁻¹).
///
/// ASCE-EWRI (2005) eq. 44: Rnl = σ fcd (0.34 − 0.14 √ea) T_K⁴, σ = 2.042×10⁻¹⁰.
#[inline]
pub fn net_longwave_radiation_hourly_mj(temperature_c: f64, ea_kpa: f64, rs_over_rso: f64) -> f64 {
    let k = temperature_c + KELVIN_OFFSET;
    STEFAN_BOLTZMANN_MJ_K4_M2_HOUR
        * cloudiness_function(rs_over_rso)
        * (0.34 - 0.14 * ea_kpa.max(0.0).sqrt())
        * (k * k)
        * (k * k) // Eq. 44
}

/// Hourly soil heat flux of the ASCE reference surfaces (MJ m⁻² hour⁻¹).
///
/// ASCE-EWRI (2005) Table 1: short reference G = 0.1 Rn (daytime, Rn > 0) and
/// 0.5 Rn (night); tall reference G = 0.04 Rn (daytime) and 0.2 Rn (night).
#[inline]
pub fn soil_heat_flux_hourly_mj(rn_mj: f64, tall: bool) -> f64 {
    let daytime = rn_mj > 0.0;
    let factor = match (tall, daytime) {
        (false, true) => 0.1,
        (false, false) => 0.5,
        (true, true) => 0.04,
        (true, false) => 0.2,
    };
    factor * rn_mj
}
