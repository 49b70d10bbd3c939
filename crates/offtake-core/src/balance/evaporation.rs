//! The FAO-56 Chapter 7 soil evaporation layer of the dual crop coefficient
//! (Kc = Ks·Kcb + Ke).
//!
//! The surface layer of depth Ze (0.10–0.15 m) holds TEW mm of evaporable
//! water; the first REW mm evaporate at the energy-limited rate (stage 1),
//! the rest at a rate falling with the layer's depletion De (stage 2).
//! Sources: Allen, Pereira, Raes & Smith (1998), FAO Irrigation and Drainage
//! Paper 56, Chapter 7, eqs. 71–79.

use serde::{Deserialize, Serialize};

/// Upper limit of Kc after rain or irrigation, FAO-56 eq. 72.
///
/// Kc max = max({1.2 + [0.04(u2 − 2) − 0.004(RHmin − 45)](h/3)^0.3}, {Kcb + 0.05}).
///
/// Inputs: `wind_2m_ms` u2 (m/s), `rh_min_pct` RHmin (%), `crop_height_m` h
/// (m), `kcb`. `base` is 1.2 normally; FAO-56 uses 1.1 instead of 1.2
/// where wetting is daily or every 2 days. FAO-56 limits the climate term to
/// 1 ≤ u2 ≤ 6 m/s and 20 ≤ RHmin ≤ 80 %; the inputs are clamped to that range.
pub fn kc_max(base: f64, wind_2m_ms: f64, rh_min_pct: f64, crop_height_m: f64, kcb: f64) -> f64 {
    let u2 = wind_2m_ms.clamp(1.0, 6.0);
    let rh = rh_min_pct.clamp(20.0, 80.0);
    let h = crop_height_m.max(0.0);
    let climate = (0.04 * (u2 - 2.0) - 0.004 * (rh - 45.0)) * (h / 3.0).powf(0.3);
    (base + climate).max(kcb + 0.05)
}

/// Total evaporable water TEW (mm), FAO-56 eq. 73.
///
/// TEW = 1000 (θFC − 0.5 θWP) Ze, with θ in m³/m³ and Ze (m) the depth of
/// the evaporating layer (0.10–0.15 m).
pub fn total_evaporable_water_mm(theta_fc: f64, theta_wp: f64, layer_depth_m: f64) -> f64 {
    1000.0 * (theta_fc - 0.5 * theta_wp) * layer_depth_m
}

/// Evaporation reduction coefficient Kr, FAO-56 eq. 74.
///
/// Kr = (TEW − De)/(TEW − REW) when De > REW, else 1; De (mm) is the
/// depletion of the surface layer after the day's wetting. Clamped to 0..1.
pub fn evaporation_reduction_coefficient(depletion_mm: f64, tew_mm: f64, rew_mm: f64) -> f64 {
    if depletion_mm <= rew_mm {
        1.0
    } else if tew_mm <= rew_mm {
        0.0
    } else {
        ((tew_mm - depletion_mm) / (tew_mm - rew_mm)).clamp(0.0, 1.0)
    }
}

/// Effective fraction of ground covered by vegetation fc, FAO-56 eq. 76.
///
/// fc = ((Kcb − Kc min)/(Kc max − Kc min))^(1 + 0.5 h), limited to 0..0.99 as
/// FAO-56 advises. `kc_min` ≈ 0.15 for annual crops (FAO-56 Chapter 7).
pub fn canopy_cover_fraction(kcb: f64, kc_min: f64, kc_max: f64, crop_height_m: f64) -> f64 {
    if kc_max <= kc_min || kcb <= kc_min {
        return 0.0;
    }
    let ratio = ((kcb - kc_min) / (kc_max - kc_min)).clamp(0.0, 1.0);
    ratio
        .powf(1.0 + 0.5 * crop_height_m.max(0.0))
        .clamp(0.0, 0.99)
}

/// Exposed and wetted soil fraction few, FAO-56 eq. 75.
///
/// few = min(1 − fc, fw), with fc the canopy cover and fw the fraction of the
/// surface wetted by the last irrigation or rain (1 for rain; FAO-56 Table 20).
/// Limited to 0.01..1 as FAO-56 advises.
pub fn exposed_wetted_fraction(canopy_cover: f64, fw: f64) -> f64 {
    (1.0 - canopy_cover).min(fw).clamp(0.01, 1.0)
}

/// Soil evaporation coefficient Ke, FAO-56 eq. 71.
///
/// Ke = Kr (Kc max − Kcb) ≤ few · Kc max.
pub fn soil_evaporation_coefficient(kr: f64, kc_max: f64, kcb: f64, few: f64) -> f64 {
    (kr * (kc_max - kcb)).min(few * kc_max).max(0.0)
}

/// Parameters of the surface evaporation layer.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct EvaporationLayer {
    /// Total evaporable water TEW (mm), eq. 73; Table 19 ranges.
    pub tew_mm: f64,
    /// Readily evaporable water REW (mm), Table 19; REW < TEW.
    pub rew_mm: f64,
    /// Depletion of the layer at the start (mm), 0 after heavy wetting.
    pub initial_depletion_mm: f64,
    /// Fraction of the surface wetted by irrigation fw (FAO-56 Table 20:
    /// 1.0 basin, border and sprinkler; 0.3–0.8 furrow; 0.3–0.4 trickle).
    /// Rain wets the whole surface (fw = 1).
    pub fw_irrigation: f64,
}

/// How few is found each day.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ExposedWetted<'a> {
    /// A fixed few for every day (e.g. 1 for bare soil wetted all over, as in
    /// FAO-56 Example 31).
    Fixed(f64),
    /// From a given canopy cover fc per day (0..1) and the fraction wetted by
    /// the last event (eq. 75: few = min(1 − fc, fw)).
    FromCover {
        /// Effective canopy cover fc per day.
        canopy_cover: &'a [f64],
    },
    /// From the canopy (eq. 76, with the crop height per day in m) and the
    /// fraction wetted by the last event (eq. 75).
    FromCanopy {
        /// Kc min, ≈ 0.15 for annual crops (FAO-56 Chapter 7).
        kc_min: f64,
        /// Crop height per day (m).
        crop_height_m: &'a [f64],
    },
}

/// One day of the evaporation layer.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct EvaporationDay {
    /// Basal crop coefficient Kcb.
    pub kcb: f64,
    /// Kc max, eq. 72.
    pub kc_max: f64,
    /// Exposed and wetted fraction few, eq. 75.
    pub few: f64,
    /// Evaporation reduction coefficient Kr, eq. 74.
    pub kr: f64,
    /// Soil evaporation coefficient Ke, eq. 71.
    pub ke: f64,
    /// Soil evaporation E = Ke ET0 (mm), averaged over the whole field.
    pub evaporation_mm: f64,
    /// Deep percolation out of the layer DPe (mm), eq. 79.
    pub deep_perc_mm: f64,
    /// Layer depletion at the end of the day De (mm), eq. 77.
    pub depletion_mm: f64,
}

/// Daily step of the layer with wetting early in the day (FAO-56 eqs. 77–79,
/// with the order of Example 38): the rain (P − RO, all of the surface) and
/// the irrigation (I/fw on the wetted part) first refill the layer, the
/// surplus percolating (eq. 79); Kr and Ke follow from the depletion after
/// wetting; the evaporation E/few is then drawn from the exposed wetted part
/// (eq. 77), bounded so that 0 ≤ De ≤ TEW (eq. 78). Transpiration from the
/// layer (T_ew) is neglected, as FAO-56 Chapter 7 allows except for
/// shallow-rooted crops.
///
/// Returns the day record; `kcb`, `kc_max` and `few` are this day's values.
#[expect(
    clippy::too_many_arguments,
    reason = "one argument per FAO-56 quantity"
)]
pub fn evaporation_layer_step(
    layer: &EvaporationLayer,
    depletion_prev_mm: f64,
    infiltrated_rain_mm: f64,
    irrigation_mm: f64,
    fw: f64,
    et0_mm: f64,
    kcb: f64,
    kc_max: f64,
    few: f64,
) -> EvaporationDay {
    let wetting = infiltrated_rain_mm + if fw > 0.0 { irrigation_mm / fw } else { 0.0 };
    let after = depletion_prev_mm - wetting;
    let deep_perc_mm = (-after).max(0.0);
    let start = after.max(0.0);
    let kr = evaporation_reduction_coefficient(start, layer.tew_mm, layer.rew_mm);
    let mut ke = soil_evaporation_coefficient(kr, kc_max, kcb, few);
    let mut evaporation_mm = ke * et0_mm;
    let room = (layer.tew_mm - start).max(0.0);
    if evaporation_mm / few > room {
        evaporation_mm = room * few;
        ke = if et0_mm > 0.0 {
            evaporation_mm / et0_mm
        } else {
            0.0
        };
    }
    EvaporationDay {
        kcb,
        kc_max,
        few,
        kr,
        ke,
        evaporation_mm,
        deep_perc_mm,
        depletion_mm: start + evaporation_mm / few,
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    /// FAO-56 Example 29 / Box 15 style check of eq. 72 through eq. 62's
    /// climate term: Kc max for u2 = 2, RHmin = 45 is 1.2 whatever h.
    #[test]
    fn kc_max_at_standard_climate_is_base() {
        assert!((kc_max(1.2, 2.0, 45.0, 1.0, 0.3) - 1.2).abs() < 1e-12);
        // Kcb + 0.05 wins for a tall crop with high Kcb.
        assert!((kc_max(1.2, 2.0, 45.0, 1.0, 1.2) - 1.25).abs() < 1e-12);
    }

    /// TEW of FAO-56 Example 38's soil (θFC 0.23, θWP 0.10, Ze 0.10 m):
    /// 1000(0.23 − 0.05)0.10 = 18 mm, eq. 73, computed from the published formula.
    #[test]
    fn tew_eq73() {
        assert!((total_evaporable_water_mm(0.23, 0.10, 0.10) - 18.0).abs() < 1e-9);
    }

    /// Kr printed in FAO-56 Example 31: TEW 20, REW 9;
    /// De = 9.45 → 0.96, 13.98 → 0.55.
    #[test]
    fn kr_example31() {
        assert!((evaporation_reduction_coefficient(9.45, 20.0, 9.0) - 0.96).abs() < 0.005);
        assert!((evaporation_reduction_coefficient(13.98, 20.0, 9.0) - 0.55).abs() < 0.005);
        assert!((evaporation_reduction_coefficient(4.73, 20.0, 9.0) - 1.0).abs() < 1e-12);
    }
}
