//! The dual crop coefficient option of a planting: Kcb + Ke with the FAO-56
//! Chapter 7 soil evaporation layer, for row crops and drip.
//!
//! Source: Allen, Pereira, Raes & Smith (1998), FAO Irrigation and Drainage
//! Paper 56, Chapter 7 (eqs. 69–79, Table 20). The layer itself is
//! [`crate::balance::evaporation`]; this module chooses its inputs for a
//! planting:
//!
//! * **Kcb** per day from the crop library (FAO-56 Table 17, adjusted for
//!   climate by eq. 70 in [`crate::crop`]). A crop without Kcb falls back to
//!   the single Kc ([`super::PlantingWarning::DualCoefficientNotUsed`]).
//! * **TEW** from the soil by eq. 73 with the soil's Ze, **REW** from the soil
//!   library (Table 19).
//! * **Kc max** per day by eq. 72 from that day's u2 and RHmin (a day with a
//!   missing value takes the FAO-56 standard climate, u2 = 2 m/s,
//!   RHmin = 45 %) and the crop height of the day ([`crop_height_m`]); base
//!   1.2, or 1.1 when wetting is daily or every 2 days (FAO-56, text with
//!   eq. 72), which we take to be a fixed-interval strategy of 1 or 2 days.
//! * **few** by eq. 75 from the canopy cover of eq. 76 (Kc min =
//!   [`KC_MIN`]) and the fraction fw wetted by the last event: [`Wetting`]
//!   for irrigation, 1 for rain.
//! * The layer starts each run with the same fraction of TEW depleted as the
//!   root zone has of TAW ([`super::PlantingSpec::initial_depletion_pct_of_taw`]);
//!   at field capacity both are 0.
//!
//! Each cohort runs its own evaporation layer, as it runs its own root-zone
//! balance.

use std::fmt;
use std::str::FromStr;

use serde::{Deserialize, Serialize};

use crate::crop::{CycleKind, Stage, StageLengths};

/// fw of rain, and of basin and border irrigation: the whole surface is
/// wetted (FAO-56 Table 20, p. 149 [values of Table 20 recalled from memory;
/// verify against the printed table]).
pub const FW_PRECIPITATION: f64 = 1.0;
/// fw of basin and border (surface) irrigation, FAO-56 Table 20: 1.0
/// [from memory].
pub const FW_SURFACE: f64 = 1.0;
/// fw of sprinkler irrigation, FAO-56 Table 20: 1.0 [from memory].
pub const FW_SPRINKLER: f64 = 1.0;
/// fw of furrow irrigation, every furrow, narrow bed: FAO-56 Table 20 prints
/// 0.6–1.0 [from memory]; we take the middle, 0.8 (also the fw that
/// reproduces the printed Ke of FAO-56 Example 38).
pub const FW_FURROW: f64 = 0.8;
/// fw of furrow irrigation, every furrow, wide bed: Table 20 0.4–0.6
/// [from memory]; middle 0.5.
pub const FW_FURROW_WIDE_BED: f64 = 0.5;
/// fw of alternate-furrow irrigation: Table 20 0.3–0.5 [from memory];
/// middle 0.4.
pub const FW_FURROW_ALTERNATE: f64 = 0.4;
/// fw of trickle (drip) irrigation: Table 20 0.3–0.4 [from memory];
/// middle 0.35.
pub const FW_TRICKLE: f64 = 0.35;

/// Kc min of eq. 76, the Kc of dry bare soil: about 0.15–0.20 for annual
/// crops (FAO-56 Chapter 7, text of eq. 76 [from memory]); we take 0.15, the
/// Kcb ini of most Table 17 rows.
pub const KC_MIN: f64 = 0.15;
/// Base of eq. 72 (FAO-56 Chapter 7).
pub const KC_MAX_BASE: f64 = 1.2;
/// Base of eq. 72 when the soil is wetted daily or every 2 days (FAO-56,
/// text with eq. 72).
pub const KC_MAX_BASE_FREQUENT_WETTING: f64 = 1.1;
/// u2 (m/s) of the FAO-56 standard climate, used on days without wind data.
pub const STANDARD_WIND_2M_MS: f64 = 2.0;
/// RHmin (%) of the FAO-56 standard climate, used on days without humidity.
pub const STANDARD_RHMIN_PCT: f64 = 45.0;

/// How irrigation wets the soil surface: the fraction fw of FAO-56 Table 20.
///
/// Rain always wets the whole surface (fw = [`FW_PRECIPITATION`]).
/// Command-line names ([`Wetting::from_str`]): `surface` (also `basin`,
/// `border`), `sprinkler`, `furrow`, `furrow-wide-bed`, `alternate-furrow`,
/// `drip` (also `trickle`).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
#[non_exhaustive]
pub enum Wetting {
    /// Basin or border irrigation, fw = [`FW_SURFACE`].
    Surface,
    /// Sprinkler irrigation, fw = [`FW_SPRINKLER`]. Default.
    #[default]
    Sprinkler,
    /// Every furrow, narrow bed, fw = [`FW_FURROW`].
    Furrow,
    /// Every furrow, wide bed, fw = [`FW_FURROW_WIDE_BED`].
    FurrowWideBed,
    /// Alternate furrows, fw = [`FW_FURROW_ALTERNATE`].
    AlternateFurrow,
    /// Trickle (drip) irrigation, fw = [`FW_TRICKLE`].
    Drip,
    /// A fraction the user sets, 0 < fw ≤ 1.
    Fraction(f64),
}

impl Wetting {
    /// The fraction of the surface wetted by irrigation fw (0..1].
    pub fn fw(self) -> f64 {
        match self {
            Self::Surface => FW_SURFACE,
            Self::Sprinkler => FW_SPRINKLER,
            Self::Furrow => FW_FURROW,
            Self::FurrowWideBed => FW_FURROW_WIDE_BED,
            Self::AlternateFurrow => FW_FURROW_ALTERNATE,
            Self::Drip => FW_TRICKLE,
            Self::Fraction(f) => f,
        }
    }

    /// The wetting of an irrigation method named in free text (e.g. a
    /// block's method name): basin, border, surface, flood → surface;
    /// sprinkler, pivot, centre/center pivot, lateral move → sprinkler;
    /// furrow → furrow (narrow bed); "wide bed" furrow; alternate furrow;
    /// drip, trickle, micro → drip. `None` when not recognised.
    pub fn from_method_name(name: &str) -> Option<Self> {
        let n = name.trim().to_ascii_lowercase().replace(['_', ' '], "-");
        let has = |w: &str| n.contains(w);
        if has("drip") || has("trickle") || has("micro") {
            Some(Self::Drip)
        } else if has("furrow") && has("alternat") {
            Some(Self::AlternateFurrow)
        } else if has("furrow") && has("wide") {
            Some(Self::FurrowWideBed)
        } else if has("furrow") {
            Some(Self::Furrow)
        } else if has("sprinkler") || has("pivot") || has("lateral-move") || has("gun") {
            Some(Self::Sprinkler)
        } else if has("basin") || has("border") || has("surface") || has("flood") {
            Some(Self::Surface)
        } else {
            None
        }
    }
}

impl fmt::Display for Wetting {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::Surface => f.write_str("surface"),
            Self::Sprinkler => f.write_str("sprinkler"),
            Self::Furrow => f.write_str("furrow"),
            Self::FurrowWideBed => f.write_str("furrow-wide-bed"),
            Self::AlternateFurrow => f.write_str("alternate-furrow"),
            Self::Drip => f.write_str("drip"),
            Self::Fraction(v) => write!(f, "fw {v}"),
        }
    }
}

/// Error parsing a wetting name.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error(
    "unknown wetting `{found}`: expected one of surface, sprinkler, furrow, furrow-wide-bed, alternate-furrow, drip"
)]
pub struct ParseWettingError {
    /// The text found.
    pub found: String,
}

impl FromStr for Wetting {
    type Err = ParseWettingError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s.trim().to_ascii_lowercase().as_str() {
            "surface" | "basin" | "border" => Ok(Self::Surface),
            "sprinkler" => Ok(Self::Sprinkler),
            "furrow" => Ok(Self::Furrow),
            "furrow-wide-bed" => Ok(Self::FurrowWideBed),
            "alternate-furrow" => Ok(Self::AlternateFurrow),
            "drip" | "trickle" => Ok(Self::Drip),
            _ => Err(ParseWettingError {
                found: s.to_string(),
            }),
        }
    }
}

/// Which crop coefficient a planting uses.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub enum CoefficientMode {
    /// Single Kc (FAO-56 eq. 81). Default.
    #[default]
    Single,
    /// Dual Kcb + Ke (FAO-56 eq. 80) with the evaporation layer (see the
    /// module documentation). Water-balance effective rain only; paddy rice
    /// and the period-total methods keep the single Kc (with a warning).
    Dual {
        /// How irrigation wets the surface (fw, FAO-56 Table 20).
        wetting: Wetting,
    },
}

/// Why a planting asked for the dual coefficient ran with the single Kc.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum DualFallback {
    /// The crop has no basal coefficients (FAO-56 Table 17) in the library.
    NoKcb,
    /// Paddy rice: the field is ponded, there is no drying surface layer.
    PaddyRice,
    /// A period-total effective-rain method has no daily soil balance.
    PeriodEffectiveRain,
}

impl fmt::Display for DualFallback {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Self::NoKcb => "the crop has no basal coefficients Kcb",
            Self::PaddyRice => "paddy rice is ponded, with no drying surface layer",
            Self::PeriodEffectiveRain => {
                "the period-total effective-rain methods have no daily soil balance"
            }
        })
    }
}

/// Crop height h (m) on day `day_in_cycle` (1-based) of a cycle, for eqs. 72
/// and 76.
///
/// FAO-56 gives the maximum height (Table 12) but no height curve; our
/// planning assumption is: annual crops and the regrowth cycles of
/// [`CycleKind::Repeated`] crops (ratoons, cuttings) grow linearly from 0 at
/// the end of the initial stage to `max_height_m` at the start of mid-season
/// and keep it to the end of the cycle; orchards and vines
/// ([`CycleKind::Yearly`]) stand at `max_height_m` all year. `stage` `None`
/// (off-season days) is at the maximum.
pub fn crop_height_m(
    max_height_m: f64,
    cycle: &CycleKind,
    stage: Option<Stage>,
    day_in_cycle: u32,
    lengths: &StageLengths,
) -> f64 {
    if matches!(cycle, CycleKind::Yearly { .. }) || stage.is_none() {
        return max_height_m;
    }
    let grown = f64::from(day_in_cycle.saturating_sub(lengths.ini_days));
    let frac = (grown / f64::from(lengths.dev_days.max(1))).clamp(0.0, 1.0);
    max_height_m * frac
}

/// The base of eq. 72 for a strategy: [`KC_MAX_BASE_FREQUENT_WETTING`] for a
/// fixed interval of 1 or 2 days, else [`KC_MAX_BASE`].
pub fn kc_max_base(strategy: &crate::balance::Strategy) -> f64 {
    match strategy {
        crate::balance::Strategy::FixedInterval { days, .. } if *days <= 2 => {
            KC_MAX_BASE_FREQUENT_WETTING
        }
        _ => KC_MAX_BASE,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wetting_names_and_fractions() {
        assert_eq!("drip".parse::<Wetting>(), Ok(Wetting::Drip));
        assert_eq!("Sprinkler".parse::<Wetting>(), Ok(Wetting::Sprinkler));
        assert!("rain".parse::<Wetting>().is_err());
        assert!((Wetting::Drip.fw() - 0.35).abs() < 1e-12);
        assert!((Wetting::Furrow.fw() - 0.8).abs() < 1e-12);
        assert_eq!(
            Wetting::from_method_name("Centre pivot"),
            Some(Wetting::Sprinkler)
        );
        assert_eq!(Wetting::from_method_name("basin"), Some(Wetting::Surface));
        assert_eq!(
            Wetting::from_method_name("alternate furrow"),
            Some(Wetting::AlternateFurrow)
        );
        assert_eq!(
            Wetting::from_method_name("subsurface drip"),
            Some(Wetting::Drip)
        );
        assert_eq!(Wetting::from_method_name("bucket"), None);
        for w in [
            Wetting::Surface,
            Wetting::Sprinkler,
            Wetting::Furrow,
            Wetting::FurrowWideBed,
            Wetting::AlternateFurrow,
            Wetting::Drip,
        ] {
            assert_eq!(w.to_string().parse::<Wetting>(), Ok(w));
        }
    }

    /// Eq. 72 base: 1.1 for wetting daily or every 2 days, else 1.2.
    #[test]
    fn kc_max_base_by_strategy() {
        use crate::balance::{IntervalDepth, Strategy};
        let every = |days| Strategy::FixedInterval {
            days,
            first_day: 0,
            depth: IntervalDepth::CurrentDepletion,
        };
        assert!((kc_max_base(&every(1)) - 1.1).abs() < 1e-12);
        assert!((kc_max_base(&every(2)) - 1.1).abs() < 1e-12);
        assert!((kc_max_base(&every(3)) - 1.2).abs() < 1e-12);
        assert!((kc_max_base(&Strategy::default()) - 1.2).abs() < 1e-12);
    }

    #[test]
    fn height_grows_over_development() {
        let l = StageLengths::new(10, 20, 30, 10);
        let annual = CycleKind::Annual;
        let h = |d| crop_height_m(2.0, &annual, Some(l.stage_of_day(d)), d, &l);
        assert!(h(5).abs() < 1e-12);
        assert!((h(20) - 1.0).abs() < 1e-12);
        assert!((h(30) - 2.0).abs() < 1e-12);
        assert!((h(70) - 2.0).abs() < 1e-12);
        let tree = CycleKind::Yearly {
            off_season_kc: 0.5,
            off_season_kcb: 0.4,
        };
        assert!((crop_height_m(3.0, &tree, Some(Stage::Initial), 1, &l) - 3.0).abs() < 1e-12);
    }
}
