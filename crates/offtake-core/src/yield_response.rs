//! Yield response to water deficit, FAO-33 (Doorenbos & Kassam 1979) as
//! given in FAO-56 (Allen et al. 1998) eq. 90, p. 176:
//!
//! (1 − Ya/Ym) = Ky (1 − ETc adj / ETc).
//!
//! Seasonal Ky values are in FAO-56 Table 24 (p. 181, from FAO-33); where Ky
//! is unknown FAO-56 suggests Ky = 1. The equation is linear and meant for
//! water deficits up to about 50 % (1 − ETa/ETm ≤ 0.5, FAO-33); beyond that
//! it is an extrapolation. Results are planning estimates.

use serde::{Deserialize, Serialize};

use crate::balance::BalanceDay;

/// Ky to use when the crop's is unknown (FAO-56 p. 176: "Ky = 1").
pub const KY_UNKNOWN: f64 = 1.0;

/// Error in yield-response inputs.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum YieldError {
    /// A value is not finite or outside its range.
    #[error("{name}: found {value}, expected {expected}")]
    BadValue {
        /// What the value is.
        name: &'static str,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// A stage boundary lies outside the season or out of order.
    #[error("stage {stage} ends on day {end} but the season has {days} days (ends must increase)")]
    BadStageEnd {
        /// Stage index (0-based).
        stage: usize,
        /// End (exclusive day index) found.
        end: usize,
        /// Days in the season.
        days: usize,
    },
}

/// Relative yield loss 1 − Ya/Ym, FAO-56 eq. 90 (FAO-33).
///
/// Inputs: `ky` yield response factor (≥ 0), `etc_adj_mm` actual and
/// `etc_mm` potential crop ET over the same period (mm, ETc > 0). The loss
/// is limited to 0..1 (no negative yield); ETc = 0 gives no loss.
///
/// # Errors
/// [`YieldError::BadValue`] for a negative or non-finite input.
pub fn relative_yield_loss(ky: f64, etc_adj_mm: f64, etc_mm: f64) -> Result<f64, YieldError> {
    for (name, value) in [("ky", ky), ("etc_adj_mm", etc_adj_mm), ("etc_mm", etc_mm)] {
        if !(value.is_finite() && value >= 0.0) {
            return Err(YieldError::BadValue {
                name,
                value,
                expected: "a finite value ≥ 0",
            });
        }
    }
    if etc_mm <= 0.0 {
        return Ok(0.0);
    }
    Ok((ky * (1.0 - etc_adj_mm / etc_mm)).clamp(0.0, 1.0))
}

/// How per-stage losses combine into a seasonal relative yield.
///
/// FAO-56 eq. 90 is written for one period; FAO-33 gives Ky per growth
/// stage. The way stage losses combine is not fixed by eq. 90; the two
/// forms in common use are offered, labelled as such.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum StageCombination {
    /// Ya/Ym = Π (1 − loss_s): a deficit in each stage reduces what the
    /// others left (common practice).
    #[default]
    Multiplicative,
    /// 1 − Ya/Ym = Σ loss_s, limited to 1 (common practice).
    Additive,
}

/// One growth stage for the per-stage yield response.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct StageWater {
    /// Ky of the stage (FAO-33).
    pub ky: f64,
    /// Σ ETc adj over the stage (mm).
    pub etc_adj_mm: f64,
    /// Σ ETc over the stage (mm).
    pub etc_mm: f64,
}

/// Seasonal relative yield loss 1 − Ya/Ym from per-stage Ky and ET sums,
/// each stage by FAO-56 eq. 90, combined by `combination`.
///
/// # Errors
/// As [`relative_yield_loss`].
pub fn relative_yield_loss_by_stage(
    stages: &[StageWater],
    combination: StageCombination,
) -> Result<f64, YieldError> {
    let mut losses = Vec::with_capacity(stages.len());
    for s in stages {
        losses.push(relative_yield_loss(s.ky, s.etc_adj_mm, s.etc_mm)?);
    }
    Ok(match combination {
        StageCombination::Multiplicative => 1.0 - losses.iter().map(|l| 1.0 - l).product::<f64>(),
        StageCombination::Additive => losses.iter().sum::<f64>().min(1.0),
    })
}

/// Sums ETc and ETc adj of a balance run over stages and attaches each
/// stage's Ky. `stage_ends[k]` is the exclusive end day index of stage k
/// (increasing, the last ≤ the number of days); `ky[k]` its Ky.
///
/// # Errors
/// [`YieldError::BadStageEnd`] when the ends are out of order or beyond the
/// season, [`YieldError::BadValue`] when the lengths differ.
pub fn stage_water(
    days: &[BalanceDay],
    stage_ends: &[usize],
    ky: &[f64],
) -> Result<Vec<StageWater>, YieldError> {
    if stage_ends.len() != ky.len() {
        return Err(YieldError::BadValue {
            name: "number of Ky values",
            value: ky.len() as f64,
            expected: "one Ky per stage end",
        });
    }
    let mut start = 0;
    let mut out = Vec::with_capacity(ky.len());
    for (stage, (&end, &k)) in stage_ends.iter().zip(ky).enumerate() {
        if end < start || end > days.len() {
            return Err(YieldError::BadStageEnd {
                stage,
                end,
                days: days.len(),
            });
        }
        let slice = &days[start..end];
        out.push(StageWater {
            ky: k,
            etc_adj_mm: slice.iter().map(|d| d.etc_adj_mm).sum(),
            etc_mm: slice.iter().map(|d| d.etc_mm).sum(),
        });
        start = end;
    }
    Ok(out)
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    /// Computed from the published formula (FAO-56 eq. 90) with Ky of maize
    /// from FAO-56 Table 24 (1.25): ETc adj/ETc = 0.8 → loss 0.25, Ya/Ym 0.75.
    #[test]
    fn maize_eq90() {
        let l = relative_yield_loss(1.25, 80.0, 100.0).unwrap();
        assert!((l - 0.25).abs() < 1e-12);
        assert!(relative_yield_loss(1.25, 100.0, 100.0).unwrap().abs() < 1e-12);
        assert!((relative_yield_loss(1.25, 0.0, 100.0).unwrap() - 1.0).abs() < 1e-12);
        assert!(relative_yield_loss(-1.0, 0.0, 100.0).is_err());
        assert!(relative_yield_loss(1.0, f64::NAN, 100.0).is_err());
    }

    /// Two stages, each computed from eq. 90: losses 0.4·0.5 = 0.2 and
    /// 1.5·0.1 = 0.15; multiplicative 1 − 0.8·0.85 = 0.32, additive 0.35.
    #[test]
    fn stage_combination() {
        let s = [
            StageWater {
                ky: 0.4,
                etc_adj_mm: 50.0,
                etc_mm: 100.0,
            },
            StageWater {
                ky: 1.5,
                etc_adj_mm: 90.0,
                etc_mm: 100.0,
            },
        ];
        let m = relative_yield_loss_by_stage(&s, StageCombination::Multiplicative).unwrap();
        let a = relative_yield_loss_by_stage(&s, StageCombination::Additive).unwrap();
        assert!((m - 0.32).abs() < 1e-12);
        assert!((a - 0.35).abs() < 1e-12);
    }

    #[test]
    fn stage_sums() {
        let d = BalanceDay {
            etc_mm: 5.0,
            etc_adj_mm: 4.0,
            ..BalanceDay::default()
        };
        let days = vec![d; 10];
        let s = stage_water(&days, &[4, 10], &[0.4, 1.5]).unwrap();
        assert!((s[0].etc_mm - 20.0).abs() < 1e-12);
        assert!((s[1].etc_adj_mm - 24.0).abs() < 1e-12);
        assert!(stage_water(&days, &[4, 11], &[0.4, 1.5]).is_err());
    }
}
