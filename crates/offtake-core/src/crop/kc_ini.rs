//! Kc ini from the wetting interval, the infiltrated depth and ET₀
//! (FAO-56 Chapter 6, p.114–120, eq. 59–61, Figures 29 and 30).
//!
//! # What is computed, and why
//!
//! FAO-56 Figures 29 and 30 are graphs of Kc ini against the mean interval
//! between wetting events tw for several ET₀ levels. They were drawn from
//! the two-stage soil evaporation model that FAO-56 Chapter 7 states as
//! eq. 73–74 (stage 1: energy-limited evaporation at the potential rate Eso
//! until the readily evaporable water REW is gone; stage 2: evaporation
//! falling linearly with the depletion De towards the total evaporable water
//! TEW, Kr = (TEW − De)/(TEW − REW)). Rather than reading the graphs, we
//! integrate that model over one wetting interval, which gives the graphs'
//! curves in closed form:
//!
//! - Eso = 1.15 ET₀ (the potential evaporation rate of a wet bare soil, the
//!   Kc ini ceiling of Figures 29–30).
//! - t1 = REW / Eso, the length of stage 1 (days).
//! - if tw ≤ t1: Kc ini = Eso / ET₀ = 1.15;
//! - else, integrating dDe/dt = Eso (TEW − De)/(TEW − REW) from De(t1) = REW:
//!   E(tw) = TEW − (TEW − REW) exp[−(tw − t1) Eso / (TEW − REW)],
//!   Kc ini = E(tw) / (tw ET₀).
//!
//! The TEW and REW that give each figure depend on the wetting depth, soil
//! and ET₀. The values used here are recalled from the published derivation
//! of the figures, **not printed in FAO-56 itself** (tagged MEMORY; verify):
//!
//! - Figure 29, light events (I ≤ 10 mm), all soils: TEW = 10 mm,
//!   REW = min(max(2.5, 6/√ET₀), 7) mm.
//! - Figure 30a, heavy events (I ≥ 40 mm), coarse soils:
//!   TEW = min(15, 7 √ET₀), REW = min(6, TEW − 0.01).
//! - Figure 30b, heavy events (I ≥ 40 mm), medium and fine soils:
//!   TEW = min(28, 13 √ET₀), REW = min(9, TEW − 0.01).
//!
//! Between 10 and 40 mm FAO-56 eq. 59 interpolates linearly between the two
//! figures; partial wetting (trickle, alternate furrows) uses eq. 60–61.
//! The result reproduces the values FAO-56 reads from the graphs in Examples
//! 24, 25, 26 and Box 15 within ±0.05 (see the tests in
//! `crates/offtake-core/tests/kc_ini_examples.rs`).

use serde::{Deserialize, Serialize};

use super::{CropError, check_range};

/// Ratio Eso/ET₀ of the potential evaporation of a wet bare soil, the
/// ceiling of FAO-56 Figures 29–30 (Kc ini = 1.15).
pub const ESO_PER_ET0: f64 = 1.15;

/// Infiltrated depth (mm) at and below which Figure 29 applies (FAO-56 eq. 59).
pub const LIGHT_WETTING_MM: f64 = 10.0;
/// Infiltrated depth (mm) at and above which Figure 30 applies (FAO-56 eq. 59).
pub const HEAVY_WETTING_MM: f64 = 40.0;

/// Soil texture class for Figure 30.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum WettingSoil {
    /// Coarse-textured soils (sands, loamy sands): Figure 30a.
    Coarse,
    /// Medium- and fine-textured soils: Figure 30b.
    MediumFine,
}

/// Surface-layer evaporation parameters used for one figure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EvaporationLayer {
    /// Total evaporable water TEW (mm).
    pub tew_mm: f64,
    /// Readily evaporable water REW (mm).
    pub rew_mm: f64,
}

/// TEW and REW behind FAO-56 Figure 29 (light wetting, I ≤ 10 mm) at an ET₀
/// (mm/day). Parameter rule recalled from memory (see the module docs).
pub fn figure29_layer(et0_mm_day: f64) -> EvaporationLayer {
    let rew = (6.0 / et0_mm_day.sqrt()).clamp(2.5, 7.0);
    EvaporationLayer {
        tew_mm: 10.0,
        rew_mm: rew,
    }
}

/// TEW and REW behind FAO-56 Figure 30 (heavy wetting, I ≥ 40 mm) at an ET₀
/// (mm/day) for a soil class. Parameter rule recalled from memory.
pub fn figure30_layer(et0_mm_day: f64, soil: WettingSoil) -> EvaporationLayer {
    let (cap, coeff, rew_cap): (f64, f64, f64) = match soil {
        WettingSoil::Coarse => (15.0, 7.0, 6.0),
        WettingSoil::MediumFine => (28.0, 13.0, 9.0),
    };
    let tew = (coeff * et0_mm_day.sqrt()).min(cap);
    EvaporationLayer {
        tew_mm: tew,
        rew_mm: rew_cap.min(tew - 0.01),
    }
}

/// Kc ini from the two-stage evaporation model integrated over a wetting
/// interval (see the module docs for the equations).
///
/// Inputs: mean interval between wetting events `tw_days` (days, > 0),
/// `et0_mm_day` (> 0), the layer's TEW and REW (mm, TEW > REW > 0).
/// Output between 0 and 1.15.
///
/// # Errors
/// [`CropError::OutOfRange`] for a non-positive or non-finite input, or REW ≥ TEW.
pub fn kc_ini_two_stage(
    tw_days: f64,
    et0_mm_day: f64,
    layer: EvaporationLayer,
) -> Result<f64, CropError> {
    check_range(
        "wetting interval (days)",
        tw_days,
        0.01,
        3650.0,
        "0.01 to 3650 days",
    )?;
    check_range("ET0 (mm/day)", et0_mm_day, 0.01, 30.0, "0.01 to 30 mm/day")?;
    check_range("TEW (mm)", layer.tew_mm, 0.1, 200.0, "0.1 to 200 mm")?;
    check_range(
        "REW (mm)",
        layer.rew_mm,
        0.01,
        layer.tew_mm - 1e-6,
        "0.01 mm to below TEW",
    )?;
    let eso = ESO_PER_ET0 * et0_mm_day;
    let t1 = layer.rew_mm / eso;
    if tw_days <= t1 {
        return Ok(ESO_PER_ET0);
    }
    let span = layer.tew_mm - layer.rew_mm;
    let evaporated = layer.tew_mm - span * (-(tw_days - t1) * eso / span).exp();
    Ok((evaporated / (tw_days * et0_mm_day)).min(ESO_PER_ET0))
}

/// Kc ini of FAO-56 Figure 29 (light wetting events, 3–10 mm, all soils).
///
/// # Errors
/// As [`kc_ini_two_stage`].
pub fn kc_ini_figure29(tw_days: f64, et0_mm_day: f64) -> Result<f64, CropError> {
    kc_ini_two_stage(tw_days, et0_mm_day, figure29_layer(et0_mm_day))
}

/// Kc ini of FAO-56 Figure 30 (heavy wetting events, ≥ 40 mm).
///
/// # Errors
/// As [`kc_ini_two_stage`].
pub fn kc_ini_figure30(tw_days: f64, et0_mm_day: f64, soil: WettingSoil) -> Result<f64, CropError> {
    kc_ini_two_stage(tw_days, et0_mm_day, figure30_layer(et0_mm_day, soil))
}

/// Kc ini for full-surface wetting with an average infiltrated depth I (mm).
///
/// FAO-56 eq. 59 (p.117): Kc ini = Kc ini(Fig 29) + [(I − 10)/(40 − 10)]
/// [Kc ini(Fig 30) − Kc ini(Fig 29)] for 10 < I < 40 mm; Figure 29 alone for
/// I ≤ 10 mm and Figure 30 alone for I ≥ 40 mm.
///
/// # Errors
/// As [`kc_ini_two_stage`], or a negative infiltrated depth.
pub fn kc_ini_full_wetting(
    tw_days: f64,
    et0_mm_day: f64,
    infiltrated_mm: f64,
    soil: WettingSoil,
) -> Result<f64, CropError> {
    check_range(
        "infiltrated depth (mm)",
        infiltrated_mm,
        0.0,
        1000.0,
        "0 to 1000 mm",
    )?;
    let light = kc_ini_figure29(tw_days, et0_mm_day)?;
    if infiltrated_mm <= LIGHT_WETTING_MM {
        return Ok(light);
    }
    let heavy = kc_ini_figure30(tw_days, et0_mm_day, soil)?;
    if infiltrated_mm >= HEAVY_WETTING_MM {
        return Ok(heavy);
    }
    // Eq. 59.
    Ok(light
        + (infiltrated_mm - LIGHT_WETTING_MM) / (HEAVY_WETTING_MM - LIGHT_WETTING_MM)
            * (heavy - light))
}

/// Kc ini when only a fraction fw of the surface is wetted.
///
/// FAO-56 eq. 61 (p.119): the depth per wetted area is Iw = I / fw, where I
/// is the depth averaged over the whole field (mm); eq. 60: Kc ini = fw ·
/// Kc ini(Fig 29/30 at Iw). `fw` in (0, 1].
///
/// # Errors
/// As [`kc_ini_full_wetting`], or fw outside (0, 1].
pub fn kc_ini_partial_wetting(
    tw_days: f64,
    et0_mm_day: f64,
    field_infiltrated_mm: f64,
    fraction_wetted: f64,
    soil: WettingSoil,
) -> Result<f64, CropError> {
    check_range(
        "fraction wetted fw",
        fraction_wetted,
        0.01,
        1.0,
        "0.01 to 1",
    )?;
    let iw = field_infiltrated_mm / fraction_wetted; // Eq. 61.
    Ok(fraction_wetted * kc_ini_full_wetting(tw_days, et0_mm_day, iw, soil)?) // Eq. 60.
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn very_frequent_wetting_reaches_ceiling() {
        let k = kc_ini_figure29(0.1, 5.0).expect("valid");
        assert!((k - 1.15).abs() < 1e-12);
    }

    #[test]
    fn kc_ini_falls_with_interval() {
        let mut prev = 2.0;
        for tw in 1..30 {
            let k = kc_ini_figure30(f64::from(tw), 4.0, WettingSoil::MediumFine).expect("valid");
            assert!(k <= prev + 1e-12);
            prev = k;
        }
        assert!(kc_ini_figure29(0.0, 4.0).is_err());
    }
}

/// Climate class of FAO-56 Table 14 (rows).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum RiceHumidityClass {
    /// Arid to semi-arid.
    AridSemiArid,
    /// Sub-humid to humid.
    SubhumidHumid,
    /// Very humid.
    VeryHumid,
}

/// Wind class of FAO-56 Table 14 (columns; Table 15 gives the speeds:
/// light ≤ 1, moderate about 2, strong ≥ 4–5 m/s at 2 m).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum RiceWindClass {
    /// Light wind.
    Light,
    /// Moderate wind.
    Moderate,
    /// Strong wind.
    Strong,
}

/// FAO-56 Table 14 (Chapter 6): Kc ini of paddy rice (ponded water 0.10–0.20 m)
/// by climate and wind, rows × columns light / moderate / strong wind.
pub const RICE_KC_INI_TABLE14: [[f64; 3]; 3] = [
    [1.10, 1.15, 1.20], // arid - semi-arid
    [1.05, 1.10, 1.15], // sub-humid - humid
    [1.00, 1.05, 1.10], // very humid
];

/// Kc ini of paddy rice from FAO-56 Table 14, replacing the single Table 12
/// value 1.05 where the climate is known.
pub fn rice_kc_ini(humidity: RiceHumidityClass, wind: RiceWindClass) -> f64 {
    let r = match humidity {
        RiceHumidityClass::AridSemiArid => 0,
        RiceHumidityClass::SubhumidHumid => 1,
        RiceHumidityClass::VeryHumid => 2,
    };
    let c = match wind {
        RiceWindClass::Light => 0,
        RiceWindClass::Moderate => 1,
        RiceWindClass::Strong => 2,
    };
    RICE_KC_INI_TABLE14[r][c]
}
