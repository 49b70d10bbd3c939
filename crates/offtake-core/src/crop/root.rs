//! Effective rooting depth through the season.
//!
//! FAO-56 Chapter 8 (p.169, "root zone depth") lets the root zone depth grow
//! during the season; newly explored soil is taken to be at field capacity.
//! The linear growth rule follows FAO-56 Annex 8 (eq. 8-1, recalled from
//! memory: Zr = Zr,min + (Zr,max − Zr,min)(J − Jsow)/(Jmax − Jsow)) and the
//! style of FAO-56 Example 38 (p.172), where Zr grows by equal daily steps
//! (0.30 → 0.35 m over ten days of the development stage).

use serde::{Deserialize, Serialize};

use super::{CropError, StageLengths, check_range};

/// Default effective rooting depth at planting (m).
///
/// FAO-56 Annex 8 (recalled from memory, verify) gives an initial effective
/// depth of about 0.15–0.20 m for the initial period; we take 0.20 m.
pub const DEFAULT_INITIAL_ROOT_DEPTH_M: f64 = 0.20;

/// When the roots grow from the initial to the maximum depth.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
pub enum RootGrowthRule {
    /// Constant initial depth through the initial stage, linear growth over
    /// the development stage, maximum depth from the start of mid-season
    /// (full cover) on. Default.
    #[default]
    OverDevelopment,
    /// Linear growth from planting (day 1 at the initial depth) to the start
    /// of the mid-season (FAO-56 Annex 8 eq. 8-1 with Jmax at full cover).
    FromPlantingToMidSeason,
    /// Maximum depth from the first day (established perennials, ratoons).
    Established,
}

/// Which value of the Table 22 range is the maximum rooting depth.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub enum RootDepthChoice {
    /// The smaller value: FAO-56 Table 22 footnote 1 recommends it for
    /// irrigation scheduling. Default.
    #[default]
    Scheduling,
    /// The larger value: for stress modelling and rainfed conditions
    /// (Table 22 footnote 1) or soils without restricting layers.
    Stress,
    /// A depth set by the user (m).
    Custom(f64),
}

/// Rooting depth (m) on season day `day` (1-based) of a cycle.
///
/// Inputs: cycle stage lengths; initial and maximum depth (m, 0 < ini ≤ max);
/// the growth rule. Days after the cycle stay at the maximum.
///
/// # Errors
/// [`CropError::OutOfRange`] if a depth is not finite or ini > max.
pub fn root_depth_on_day_m(
    day: u32,
    lengths: &StageLengths,
    initial_m: f64,
    max_m: f64,
    rule: RootGrowthRule,
) -> Result<f64, CropError> {
    check_range("maximum root depth (m)", max_m, 0.01, 10.0, "0.01 to 10 m")?;
    check_range(
        "initial root depth (m)",
        initial_m,
        0.01,
        max_m,
        "0.01 m to the maximum depth",
    )?;
    let d = f64::from(day);
    let ini = f64::from(lengths.ini_days);
    let mid_start = ini + f64::from(lengths.dev_days);
    let frac = match rule {
        RootGrowthRule::Established => 1.0,
        RootGrowthRule::OverDevelopment => {
            ((d - ini) / f64::from(lengths.dev_days.max(1))).clamp(0.0, 1.0)
        }
        RootGrowthRule::FromPlantingToMidSeason => {
            ((d - 1.0) / (mid_start - 1.0).max(1.0)).clamp(0.0, 1.0)
        }
    };
    Ok(initial_m + (max_m - initial_m) * frac)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grows_over_development() {
        let l = StageLengths::new(10, 20, 30, 10);
        let r =
            |d| root_depth_on_day_m(d, &l, 0.2, 1.2, RootGrowthRule::OverDevelopment).expect("ok");
        assert!((r(1) - 0.2).abs() < 1e-12);
        assert!((r(10) - 0.2).abs() < 1e-12);
        assert!((r(20) - 0.7).abs() < 1e-12);
        assert!((r(30) - 1.2).abs() < 1e-12);
        assert!((r(70) - 1.2).abs() < 1e-12);
        let p = |d| {
            root_depth_on_day_m(d, &l, 0.2, 1.2, RootGrowthRule::FromPlantingToMidSeason)
                .expect("ok")
        };
        assert!((p(1) - 0.2).abs() < 1e-12);
        assert!((p(31) - 1.2).abs() < 1e-12);
        assert!(root_depth_on_day_m(1, &l, 1.5, 1.2, RootGrowthRule::OverDevelopment).is_err());
    }
}
