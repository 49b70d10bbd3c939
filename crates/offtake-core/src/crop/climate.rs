//! Climate adjustment of the crop coefficients (FAO-56 Chapter 6 and 7).
//!
//! Table 12 (Kc) and Table 17 (Kcb) values are for a subhumid climate with
//! mean daily minimum relative humidity RHmin ≈ 45 % and mean wind speed at
//! 2 m u2 ≈ 2 m/s. Kc mid and Kc end (eq. 62, 65) and Kcb mid and Kcb end
//! (eq. 70) are adjusted for the mean u2 and RHmin over the stage and the
//! mean crop height h.

use super::{CropError, check_range};

/// Lower limit of u2 in the adjustment (m/s), FAO-56 eq. 62 p.121.
pub const U2_MIN_MS: f64 = 1.0;
/// Upper limit of u2 in the adjustment (m/s), FAO-56 eq. 62 p.121.
pub const U2_MAX_MS: f64 = 6.0;
/// Lower limit of RHmin in the adjustment (%), FAO-56 eq. 62 p.121.
pub const RHMIN_MIN_PCT: f64 = 20.0;
/// Upper limit of RHmin in the adjustment (%), FAO-56 eq. 62 p.121.
pub const RHMIN_MAX_PCT: f64 = 80.0;
/// Lower limit of crop height h (m), FAO-56 eq. 62 p.121 (0.1 m < h).
pub const HEIGHT_MIN_M: f64 = 0.1;
/// Upper limit of crop height h (m), FAO-56 eq. 62 p.121 (h < 10 m).
pub const HEIGHT_MAX_M: f64 = 10.0;
/// Kc end (Table 12) at or below which eq. 65 is not applied (FAO-56 p.125).
pub const KC_END_ADJUST_ABOVE: f64 = 0.45;
/// Kcb (Table 17) below which eq. 70 is not applied to Kcb end (FAO-56 p.137).
pub const KCB_END_ADJUST_FROM: f64 = 0.45;

/// One day's weather as used by the adjustment.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DayClimate {
    /// Mean daily wind speed at 2 m (m/s).
    pub u2_ms: f64,
    /// Daily minimum relative humidity (%).
    pub rhmin_pct: f64,
}

/// Mean weather over a growth stage.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StageClimate {
    /// Mean u2 over the stage (m/s).
    pub u2_ms: f64,
    /// Mean RHmin over the stage (%).
    pub rhmin_pct: f64,
}

impl StageClimate {
    /// The Table 12 standard climate (u2 = 2 m/s, RHmin = 45 %): no adjustment.
    pub const STANDARD: Self = Self {
        u2_ms: 2.0,
        rhmin_pct: 45.0,
    };
}

/// Mean u2 and RHmin over the days of a stage.
///
/// # Errors
/// [`CropError::OutOfRange`] if the slices are empty, differ in length, or
/// hold a value that is not finite (u2 < 0 or RHmin outside 0..=100).
pub fn stage_climate_from_slices(
    u2_ms: &[f64],
    rhmin_pct: &[f64],
) -> Result<StageClimate, CropError> {
    if u2_ms.is_empty() || u2_ms.len() != rhmin_pct.len() {
        return Err(CropError::OutOfRange {
            what: "stage weather days",
            found: u2_ms.len() as f64,
            expected: "at least one day, as many RHmin as u2 values",
        });
    }
    let mut su = 0.0;
    let mut sr = 0.0;
    for (&u, &r) in u2_ms.iter().zip(rhmin_pct) {
        su += check_range("u2 (m/s)", u, 0.0, 100.0, "0 to 100 m/s")?;
        sr += check_range("RHmin (%)", r, 0.0, 100.0, "0 to 100 %")?;
    }
    let n = u2_ms.len() as f64;
    Ok(StageClimate {
        u2_ms: su / n,
        rhmin_pct: sr / n,
    })
}

/// Mean u2 and RHmin over a slice of days.
///
/// # Errors
/// As [`stage_climate_from_slices`].
pub fn stage_climate(days: &[DayClimate]) -> Result<StageClimate, CropError> {
    let u: Vec<f64> = days.iter().map(|d| d.u2_ms).collect();
    let r: Vec<f64> = days.iter().map(|d| d.rhmin_pct).collect();
    stage_climate_from_slices(&u, &r)
}

/// Kc mid from the Table 12 value and the per-day u2 (m/s) and RHmin (%) of
/// the mid-season days: the stage means ([`stage_climate_from_slices`]) in
/// FAO-56 eq. 62.
///
/// # Errors
/// As [`stage_climate_from_slices`].
pub fn kc_mid_from_daily(
    kc_mid_tab: f64,
    u2_ms: &[f64],
    rhmin_pct: &[f64],
    height_m: f64,
) -> Result<f64, CropError> {
    Ok(kc_mid_adjusted(
        kc_mid_tab,
        stage_climate_from_slices(u2_ms, rhmin_pct)?,
        height_m,
    ))
}

/// Kc end from the Table 12 value and the per-day u2 and RHmin of the
/// late-season days: FAO-56 eq. 65 (only when Kc end > 0.45).
///
/// # Errors
/// As [`stage_climate_from_slices`].
pub fn kc_end_from_daily(
    kc_end_tab: f64,
    u2_ms: &[f64],
    rhmin_pct: &[f64],
    height_m: f64,
) -> Result<f64, CropError> {
    Ok(kc_end_adjusted(
        kc_end_tab,
        stage_climate_from_slices(u2_ms, rhmin_pct)?,
        height_m,
    ))
}

/// The climate term [0.04(u2 − 2) − 0.004(RHmin − 45)](h/3)^0.3 of
/// FAO-56 eq. 62, 65, 68, 70 and 72.
///
/// Inputs: mean u2 (m/s), mean RHmin (%), mean crop height h (m). Each input
/// is clamped to its published limits 1 ≤ u2 ≤ 6, 20 ≤ RHmin ≤ 80,
/// 0.1 ≤ h ≤ 10 (FAO-56 p.121) before use; non-finite inputs give 0 (no
/// adjustment), so no NaN leaves this function.
pub fn climate_adjustment_term(u2_ms: f64, rhmin_pct: f64, height_m: f64) -> f64 {
    if !(u2_ms.is_finite() && rhmin_pct.is_finite() && height_m.is_finite()) {
        return 0.0;
    }
    let u2 = u2_ms.clamp(U2_MIN_MS, U2_MAX_MS);
    let rh = rhmin_pct.clamp(RHMIN_MIN_PCT, RHMIN_MAX_PCT);
    let h = height_m.clamp(HEIGHT_MIN_M, HEIGHT_MAX_M);
    (0.04 * (u2 - 2.0) - 0.004 * (rh - 45.0)) * (h / 3.0).powf(0.3)
}

/// Kc mid adjusted for climate.
///
/// FAO-56 eq. 62 (p.121): Kc mid = Kc mid(Tab) + [0.04(u2 − 2) − 0.004(RHmin − 45)](h/3)^0.3.
/// Inputs: Table 12 Kc mid (–), mean u2 (m/s) and RHmin (%) over the
/// mid-season, mean plant height h (m) during the mid-season. Limits as
/// [`climate_adjustment_term`]. Checked on Example 27 (p.125).
pub fn kc_mid_adjusted(kc_mid_tab: f64, climate: StageClimate, height_m: f64) -> f64 {
    kc_mid_tab + climate_adjustment_term(climate.u2_ms, climate.rhmin_pct, height_m)
}

/// Kc end adjusted for climate.
///
/// FAO-56 eq. 65 (p.125): same form as eq. 62, with u2 and RHmin averaged
/// over the late-season stage; applied only when Kc end(Tab) > 0.45,
/// otherwise Kc end(Tab) is returned unchanged.
pub fn kc_end_adjusted(kc_end_tab: f64, climate: StageClimate, height_m: f64) -> f64 {
    if kc_end_tab > KC_END_ADJUST_ABOVE {
        kc_end_tab + climate_adjustment_term(climate.u2_ms, climate.rhmin_pct, height_m)
    } else {
        kc_end_tab
    }
}

/// Kcb mid adjusted for climate.
///
/// FAO-56 eq. 70 (p.137): Kcb = Kcb(Tab) + [0.04(u2 − 2) − 0.004(RHmin − 45)](h/3)^0.3.
/// Checked on Example 29 (p.138): Kcb mid 1.10 → 1.14 for beans.
pub fn kcb_mid_adjusted(kcb_mid_tab: f64, climate: StageClimate, height_m: f64) -> f64 {
    kcb_mid_tab + climate_adjustment_term(climate.u2_ms, climate.rhmin_pct, height_m)
}

/// Kcb end adjusted for climate: FAO-56 eq. 70, applied only when
/// Kcb end(Tab) ≥ 0.45 (p.137), otherwise returned unchanged.
pub fn kcb_end_adjusted(kcb_end_tab: f64, climate: StageClimate, height_m: f64) -> f64 {
    if kcb_end_tab >= KCB_END_ADJUST_FROM {
        kcb_end_tab + climate_adjustment_term(climate.u2_ms, climate.rhmin_pct, height_m)
    } else {
        kcb_end_tab
    }
}

/// Ratio of grass-referenced to alfalfa-referenced Kc.
///
/// FAO-56 eq. 68 (p.134): Kratio = 1.2 + [0.04(u2 − 2) − 0.004(RHmin − 45)](h/3)^0.3
/// with h = 0.5 m (alfalfa reference). Used with eq. 67,
/// Kc(grass) = Kratio · Kc(alfalfa). Kimberly: u2 = 2.2, RHmin = 30 → 1.24.
pub fn kc_ratio_alfalfa_to_grass(climate: StageClimate) -> f64 {
    1.2 + climate_adjustment_term(climate.u2_ms, climate.rhmin_pct, 0.5)
}

/// Saturation vapour pressure e°(T) (kPa) at air temperature T (°C).
///
/// FAO-56 eq. 11 (p.36): e°(T) = 0.6108 exp[17.27 T/(T + 237.3)].
fn saturation_vapour_pressure_kpa(t_c: f64) -> f64 {
    0.6108 * (17.27 * t_c / (t_c + 237.3)).exp()
}

/// RHmin from dewpoint and maximum temperature.
///
/// FAO-56 eq. 63 (p.122): RHmin = 100 e°(Tdew)/e°(Tmax). Inputs in °C;
/// result in %, limited to 0..=100 (a dewpoint above Tmax gives 100).
///
/// # Errors
/// [`CropError::OutOfRange`] if an input is not finite or outside −60..60 °C.
pub fn rhmin_from_dewpoint_pct(tdew_c: f64, tmax_c: f64) -> Result<f64, CropError> {
    check_range("Tdew (°C)", tdew_c, -60.0, 60.0, "-60 to 60 °C")?;
    check_range("Tmax (°C)", tmax_c, -60.0, 60.0, "-60 to 60 °C")?;
    let rh =
        100.0 * saturation_vapour_pressure_kpa(tdew_c) / saturation_vapour_pressure_kpa(tmax_c);
    Ok(rh.clamp(0.0, 100.0))
}

/// RHmin when the dewpoint is not measured.
///
/// FAO-56 eq. 64 (p.122): RHmin = 100 e°(Tmin)/e°(Tmax), taking Tdew ≈ Tmin.
/// In arid and semi-arid climates FAO-56 (p.122, and Annex 6) takes
/// Tdew ≈ Tmin − 2 °C; set `arid` for that.
///
/// # Errors
/// As [`rhmin_from_dewpoint_pct`].
pub fn rhmin_from_tmin_pct(tmin_c: f64, tmax_c: f64, arid: bool) -> Result<f64, CropError> {
    let tdew = if arid { tmin_c - 2.0 } else { tmin_c };
    rhmin_from_dewpoint_pct(tdew, tmax_c)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn standard_climate_gives_no_adjustment() {
        assert!(climate_adjustment_term(2.0, 45.0, 2.0).abs() < 1e-12);
        assert!(
            (kc_end_adjusted(
                0.35,
                StageClimate {
                    u2_ms: 5.0,
                    rhmin_pct: 20.0
                },
                0.4
            ) - 0.35)
                .abs()
                < 1e-12
        );
    }

    #[test]
    fn limits_are_clamped() {
        let a = climate_adjustment_term(9.0, 5.0, 20.0);
        let b = climate_adjustment_term(6.0, 20.0, 10.0);
        assert!((a - b).abs() < 1e-12);
        assert!(climate_adjustment_term(f64::NAN, 45.0, 1.0).abs() < 1e-12);
    }

    #[test]
    fn rhmin_equals_100_when_dewpoint_is_tmax() {
        let rh = rhmin_from_dewpoint_pct(20.0, 20.0).expect("valid");
        assert!((rh - 100.0).abs() < 1e-9);
        assert!(
            rhmin_from_tmin_pct(10.0, 30.0, true).expect("v")
                < rhmin_from_tmin_pct(10.0, 30.0, false).expect("v")
        );
    }
}
