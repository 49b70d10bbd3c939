//! Solar and net radiation: FAO-56 Chapter 3, equations 21–40 and 50.
//!
//! Source: Allen, Pereira, Raes & Smith (1998), FAO Irrigation and Drainage
//! Paper 56, pp. 41–54 and 60–61.
//!
//! # Units
//! Angles in radians inside (degrees only at the edges), radiation in
//! MJ m⁻² day⁻¹ (daily) or MJ m⁻² hour⁻¹ (hourly and shorter periods),
//! temperatures in °C, vapour pressures in kPa, times in hours.

use std::f64::consts::PI;

/// Solar constant Gsc (MJ m⁻² min⁻¹), FAO-56 eq. 21 (p. 46).
pub const SOLAR_CONSTANT_MJ_M2_MIN: f64 = 0.0820;
/// Stefan–Boltzmann constant σ for daily sums (MJ K⁻⁴ m⁻² day⁻¹), FAO-56 eq. 39 (p. 52).
pub const STEFAN_BOLTZMANN_MJ_K4_M2_DAY: f64 = 4.903e-9;
/// Stefan–Boltzmann constant σ for hourly sums (MJ K⁻⁴ m⁻² hour⁻¹): 4.903×10⁻⁹/24,
/// printed as 2.043×10⁻¹⁰ in FAO-56 (p. 74, eq. 54 context).
pub const STEFAN_BOLTZMANN_MJ_K4_M2_HOUR: f64 = 4.903e-9 / 24.0;
/// Offset from °C to K used in FAO-56 eq. 39 and Annex 1 (K = °C + 273.16).
pub const KELVIN_OFFSET_FAO56: f64 = 273.16;
/// Albedo of the hypothetical grass reference crop (–), FAO-56 eq. 38 (p. 51).
pub const REFERENCE_ALBEDO: f64 = 0.23;

/// Ångström coefficients a_s and b_s of eq. 35.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Angstrom {
    /// a_s: fraction of Ra reaching the earth on overcast days (n = 0).
    pub a_s: f64,
    /// b_s: with a_s, the fraction of Ra reaching the earth on clear days (n = N).
    pub b_s: f64,
}

impl Default for Angstrom {
    /// FAO-56 p. 50: a_s = 0.25, b_s = 0.50 where no calibration is available.
    fn default() -> Self {
        Self {
            a_s: 0.25,
            b_s: 0.50,
        }
    }
}

/// Adjustment coefficient kRs of the Hargreaves radiation formula, eq. 50 (°C⁻⁰·⁵).
pub mod krs {
    /// Interior locations, where land mass dominates: 0.16 (FAO-56 p. 60).
    pub const INTERIOR: f64 = 0.16;
    /// Coastal locations, on or adjacent to the coast of a large land mass: 0.19 (FAO-56 p. 60).
    pub const COASTAL: f64 = 0.19;
}

/// Inverse relative distance Earth–Sun dr (–).
///
/// * `day_of_year` — J, 1..=366.
///
/// Eq. 23: dr = 1 + 0.033 cos(2πJ/365). FAO-56 p. 46.
#[inline]
pub fn inverse_relative_distance(day_of_year: u32) -> f64 {
    1.0 + 0.033 * (2.0 * PI * f64::from(day_of_year) / 365.0).cos() // Eq. 23
}

/// Solar declination δ (rad).
///
/// * `day_of_year` — J, 1..=366.
///
/// Eq. 24: δ = 0.409 sin(2πJ/365 − 1.39). FAO-56 p. 46.
#[inline]
pub fn solar_declination_rad(day_of_year: u32) -> f64 {
    0.409 * (2.0 * PI * f64::from(day_of_year) / 365.0 - 1.39).sin() // Eq. 24
}

/// Sunset hour angle ωs (rad), clamped for polar night and polar day.
///
/// * `latitude_rad` — φ, −π/2..=π/2 (south negative);
/// * `declination_rad` — δ from eq. 24.
///
/// Eq. 25: ωs = arccos[−tan φ tan δ]. FAO-56 p. 46.
///
/// Outside the polar circles the argument −tan φ tan δ leaves [−1, 1]: FAO-56
/// eqs. 26–27 then fix X = 0.00001, which gives ωs slightly off 0 or π and can
/// make Ra slightly negative. Here the argument is clamped to [−1, 1] instead:
/// ωs = 0 in polar night (no sunrise; Ra = 0, N = 0) and ωs = π in polar day
/// (sun never sets; N = 24 h). Inside the polar circles this is exactly eq. 25.
#[inline]
pub fn sunset_hour_angle_rad(latitude_rad: f64, declination_rad: f64) -> f64 {
    let arg = -latitude_rad.tan() * declination_rad.tan();
    if arg.is_nan() {
        // tan(±π/2)·tan(0) — sun on the horizon all day at the pole: half the day lit.
        return PI / 2.0;
    }
    arg.clamp(-1.0, 1.0).acos() // Eq. 25
}

/// Extraterrestrial radiation for a day, Ra (MJ m⁻² day⁻¹).
///
/// * `latitude_rad` — φ (rad); `day_of_year` — J.
///
/// Eq. 21: Ra = (24·60/π) Gsc dr [ωs sin φ sin δ + cos φ cos δ sin ωs]. FAO-56 p. 46.
/// With ωs from [`sunset_hour_angle_rad`] Ra is never negative (the result is
/// also floored at 0 against rounding at the polar-night edge).
#[inline]
pub fn extraterrestrial_radiation_mj(latitude_rad: f64, day_of_year: u32) -> f64 {
    let dr = inverse_relative_distance(day_of_year);
    let delta = solar_declination_rad(day_of_year);
    let ws = sunset_hour_angle_rad(latitude_rad, delta);
    let ra = 24.0 * 60.0 / PI
        * SOLAR_CONSTANT_MJ_M2_MIN
        * dr
        * (ws * latitude_rad.sin() * delta.sin() + latitude_rad.cos() * delta.cos() * ws.sin()); // Eq. 21
    ra.max(0.0)
}

/// Seasonal correction for solar time Sc (hour).
///
/// * `day_of_year` — J.
///
/// Eqs. 32–33: Sc = 0.1645 sin(2b) − 0.1255 cos(b) − 0.025 sin(b), b = 2π(J − 81)/364. FAO-56 p. 48.
#[inline]
pub fn seasonal_correction_h(day_of_year: u32) -> f64 {
    let b = 2.0 * PI * (f64::from(day_of_year) - 81.0) / 364.0; // Eq. 33
    0.1645 * (2.0 * b).sin() - 0.1255 * b.cos() - 0.025 * b.sin() // Eq. 32
}

/// Solar time angle ω at the midpoint of a period (rad).
///
/// * `clock_time_mid_h` — standard clock time at the midpoint of the period t (hour, e.g. 14.5);
/// * `lz_deg_west` — longitude of the centre of the local time zone Lz (degrees **west** of Greenwich);
/// * `lm_deg_west` — longitude of the site Lm (degrees west of Greenwich);
/// * `day_of_year` — J.
///
/// Eq. 31: ω = (π/12)[(t + 0.06667(Lz − Lm) + Sc) − 12]. FAO-56 p. 48.
/// FAO-56 counts longitudes westward (e.g. Lz = 15 for GMT−1, Lm = 16.25 at 16°15'W).
#[inline]
pub fn solar_time_angle_rad(
    clock_time_mid_h: f64,
    lz_deg_west: f64,
    lm_deg_west: f64,
    day_of_year: u32,
) -> f64 {
    let sc = seasonal_correction_h(day_of_year);
    PI / 12.0 * ((clock_time_mid_h + 0.06667 * (lz_deg_west - lm_deg_west) + sc) - 12.0) // Eq. 31
}

/// Solar time angles at the start and end of a period, (ω1, ω2) (rad).
///
/// * `omega_mid_rad` — ω at the midpoint (eq. 31); `period_h` — tl, length of the period (hour).
///
/// Eqs. 29–30: ω1 = ω − π tl/24, ω2 = ω + π tl/24. FAO-56 p. 48.
#[inline]
pub fn period_solar_time_angles_rad(omega_mid_rad: f64, period_h: f64) -> (f64, f64) {
    let half = PI * period_h / 24.0;
    (omega_mid_rad - half, omega_mid_rad + half) // Eqs. 29, 30
}

/// Extraterrestrial radiation for an hourly or shorter period (MJ m⁻² per period).
///
/// * `latitude_rad` — φ; `day_of_year` — J;
/// * `omega1_rad`, `omega2_rad` — solar time angles at the start and end of the period (eqs. 29–30).
///
/// Eq. 28: Ra = (12·60/π) Gsc dr [(ω2 − ω1) sin φ sin δ + cos φ cos δ (sin ω2 − sin ω1)]. FAO-56 p. 47.
///
/// Outside daylight: FAO-56 (p. 48) sets Ra = 0 when the midpoint angle lies
/// outside −ωs..ωs. Periods that straddle sunrise or sunset have ω1, ω2 limited to
/// −ωs..ωs (as ASCE-EWRI 2005 eqs. 56–58 do) so that only the lit part counts.
/// The result is never negative.
#[inline]
pub fn extraterrestrial_radiation_period_mj(
    latitude_rad: f64,
    day_of_year: u32,
    omega1_rad: f64,
    omega2_rad: f64,
) -> f64 {
    let dr = inverse_relative_distance(day_of_year);
    let delta = solar_declination_rad(day_of_year);
    let ws = sunset_hour_angle_rad(latitude_rad, delta);
    let mid = 0.5 * (omega1_rad + omega2_rad);
    if mid < -ws || mid > ws {
        return 0.0;
    }
    let w1 = omega1_rad.clamp(-ws, ws);
    let w2 = omega2_rad.clamp(-ws, ws);
    let ra = 12.0 * 60.0 / PI
        * SOLAR_CONSTANT_MJ_M2_MIN
        * dr
        * ((w2 - w1) * latitude_rad.sin() * delta.sin()
            + latitude_rad.cos() * delta.cos() * (w2.sin() - w1.sin())); // Eq. 28
    ra.max(0.0)
}

/// Daylight hours N (hour).
///
/// * `sunset_hour_angle_rad` — ωs (eq. 25).
///
/// Eq. 34: N = (24/π) ωs. FAO-56 p. 48. With the clamped ωs, 0 ≤ N ≤ 24.
#[inline]
pub fn daylight_hours(sunset_hour_angle_rad: f64) -> f64 {
    24.0 / PI * sunset_hour_angle_rad // Eq. 34
}

/// Solar (shortwave) radiation from sunshine duration, Rs (MJ m⁻² day⁻¹).
///
/// * `sunshine_h` — actual bright sunshine n (hour); `daylight_h` — N (eq. 34);
/// * `ra_mj` — Ra (eq. 21); `angstrom` — a_s, b_s (default 0.25, 0.50).
///
/// Eq. 35: Rs = (a_s + b_s n/N) Ra. FAO-56 p. 50. n/N is limited to 0..=1; with
/// N = 0 (polar night) Rs = a_s Ra = 0.
#[inline]
pub fn solar_radiation_from_sunshine_mj(
    sunshine_h: f64,
    daylight_h: f64,
    ra_mj: f64,
    angstrom: Angstrom,
) -> f64 {
    let ratio = if daylight_h > 0.0 {
        (sunshine_h / daylight_h).clamp(0.0, 1.0)
    } else {
        0.0
    };
    (angstrom.a_s + angstrom.b_s * ratio) * ra_mj // Eq. 35
}

/// Clear-sky solar radiation from calibrated Ångström coefficients, Rso (MJ m⁻² day⁻¹).
///
/// Eq. 36: Rso = (a_s + b_s) Ra. FAO-56 p. 51, for when a_s and b_s are calibrated.
#[inline]
pub fn clear_sky_radiation_angstrom_mj(ra_mj: f64, angstrom: Angstrom) -> f64 {
    (angstrom.a_s + angstrom.b_s) * ra_mj // Eq. 36
}

/// Clear-sky solar radiation from elevation, Rso (MJ m⁻² day⁻¹ or per period).
///
/// * `ra_mj` — Ra; `elevation_m` — station elevation z (m).
///
/// Eq. 37: Rso = (0.75 + 2×10⁻⁵ z) Ra. FAO-56 p. 51, for when a_s, b_s are not calibrated.
#[inline]
pub fn clear_sky_radiation_mj(ra_mj: f64, elevation_m: f64) -> f64 {
    (0.75 + 2e-5 * elevation_m) * ra_mj // Eq. 37
}

/// Solar radiation from the air temperature range (Hargreaves), Rs (MJ m⁻² day⁻¹).
///
/// * `tmax_c`, `tmin_c` — daily maximum and minimum temperature (°C);
/// * `ra_mj` — Ra; `krs` — adjustment coefficient (0.16 interior, 0.19 coastal; see [`krs`]);
/// * `rso_mj` — clear-sky radiation, the upper limit.
///
/// Eq. 50: Rs = kRs √(Tmax − Tmin) Ra, limited to Rs ≤ Rso. FAO-56 p. 60–61.
/// A negative range (Tmin > Tmax) gives 0 here; the day-series API rejects such days.
#[inline]
pub fn solar_radiation_from_temperature_mj(
    tmax_c: f64,
    tmin_c: f64,
    ra_mj: f64,
    krs: f64,
    rso_mj: f64,
) -> f64 {
    (krs * (tmax_c - tmin_c).max(0.0).sqrt() * ra_mj).min(rso_mj) // Eq. 50
}

/// Net shortwave radiation Rns (MJ m⁻² day⁻¹ or per period).
///
/// * `rs_mj` — incoming solar radiation; `albedo` — α (0.23 for the grass reference).
///
/// Eq. 38: Rns = (1 − α) Rs. FAO-56 p. 51.
#[inline]
pub fn net_shortwave_radiation_mj(rs_mj: f64, albedo: f64) -> f64 {
    (1.0 - albedo) * rs_mj // Eq. 38
}

/// Relative shortwave radiation Rs/Rso limited to at most 1.0 (–).
///
/// FAO-56 eq. 39 note (p. 52): Rs/Rso ≤ 1.0. When Rso is zero (polar night,
/// night-time hours) the ratio is undefined and `fallback` is returned (FAO-56
/// p. 75 suggests 0.4–0.6 in humid and 0.7–0.8 in arid climates at night).
#[inline]
pub fn relative_shortwave_radiation(rs_mj: f64, rso_mj: f64, fallback: f64) -> f64 {
    if rso_mj > 0.0 {
        (rs_mj / rso_mj).clamp(0.0, 1.0)
    } else {
        fallback
    }
}

/// σ T_K⁴ for a daily sum (MJ m⁻² day⁻¹), with T_K = T + 273.16 (FAO-56 eq. 39, Annex 2 Table 2.8).
#[inline]
pub fn black_body_radiation_mj_day(temperature_c: f64) -> f64 {
    let tk = temperature_c + KELVIN_OFFSET_FAO56;
    STEFAN_BOLTZMANN_MJ_K4_M2_DAY * (tk * tk) * (tk * tk)
}

/// Net outgoing longwave radiation for a day, Rnl (MJ m⁻² day⁻¹).
///
/// * `tmax_c`, `tmin_c` — daily extremes (°C); `ea_kpa` — actual vapour pressure (kPa);
/// * `rs_over_rso` — relative shortwave radiation, already limited (see [`relative_shortwave_radiation`]).
///
/// Eq. 39: Rnl = σ [(Tmax,K⁴ + Tmin,K⁴)/2] (0.34 − 0.14 √ea)(1.35 Rs/Rso − 0.35),
/// σ = 4.903×10⁻⁹, K = °C + 273.16. FAO-56 p. 52. Negative ea is treated as 0.
#[inline]
pub fn net_longwave_radiation_mj(tmax_c: f64, tmin_c: f64, ea_kpa: f64, rs_over_rso: f64) -> f64 {
    let sigma_t4 =
        0.5 * (black_body_radiation_mj_day(tmax_c) + black_body_radiation_mj_day(tmin_c));
    sigma_t4 * (0.34 - 0.14 * ea_kpa.max(0.0).sqrt()) * (1.35 * rs_over_rso - 0.35) // Eq. 39
}

/// Net longwave radiation for an hourly period, Rnl (MJ m⁻² hour⁻¹).
///
/// * `temperature_c` — mean hourly air temperature (°C); `ea_kpa`; `rs_over_rso` (limited).
///
/// Eq. 39 with σ per hour = 4.903×10⁻⁹/24 and the hourly temperature (FAO-56 p. 74).
#[inline]
pub fn net_longwave_radiation_hourly_mj(temperature_c: f64, ea_kpa: f64, rs_over_rso: f64) -> f64 {
    let tk = temperature_c + KELVIN_OFFSET_FAO56;
    STEFAN_BOLTZMANN_MJ_K4_M2_HOUR
        * (tk * tk)
        * (tk * tk)
        * (0.34 - 0.14 * ea_kpa.max(0.0).sqrt())
        * (1.35 * rs_over_rso - 0.35) // Eq. 39 (hourly σ)
}

/// Net radiation Rn = Rns − Rnl (MJ m⁻² per day or period).
///
/// Eq. 40. FAO-56 p. 53.
#[inline]
pub fn net_radiation_mj(rns_mj: f64, rnl_mj: f64) -> f64 {
    rns_mj - rnl_mj // Eq. 40
}
