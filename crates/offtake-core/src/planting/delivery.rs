//! How water reaches a planting through its block's outlet: the delivery
//! rule of the block, in the planting path.
//!
//! - [`DeliveryRule::OnDemand`]: each cohort takes its water on the day its
//!   strategy asks, over its whole area (the strategy's own schedule).
//! - [`DeliveryRule::RotationWithinBlock`]: the block's area is served in a
//!   cycle of N days, each day its own share of the area (share k on the
//!   weather days g with g mod N = k). Each share holds every cohort of every
//!   planting pro rata, so each cohort runs N balances, one per share, each
//!   with [`crate::balance::Strategy::Turns`]: on its turn the share is
//!   brought to the strategy's target ([`turn_strategy`]) unless its
//!   depletion is below the minimum depth. The cohort's days are the mean of
//!   its shares (each 1/N of its area); eq. 85 closes on every share and on
//!   the mean. The single coefficient's Kc ini follows the shares' own
//!   wetting (the interval is the rotation cycle, with the rains): it is
//!   found on share 0 by the iteration of [`super::wetting_kc_ini`] and used
//!   for every share.
//! - [`DeliveryRule::ContinuousFlow`]: the requirement of each cycle of N
//!   days (weather days g with ⌊g / N⌋ equal) is delivered at a steady rate
//!   over the cycle; the balance is the strategy's (the field stores the
//!   water, as a pond or a wet root zone between deliveries).
//!
//! Paddy rice is ponded, not a root-zone balance: a rotation within the
//! block is delivered to it as continuous flow over the same cycle. The
//! period-total effective-rain methods have no daily balance: a rotation
//! within the block is computed on demand. Both say so in a warning.
//!
//! An outlet too small for a day's requests is given to the planting as a
//! daily share of its requests ([`super::PlantingSpec::supply_factor`]): the
//! water not delivered is not owed later; the next request follows from the
//! depletion, and the balance shows the stress.

use serde::{Deserialize, Serialize};

use crate::balance::{
    BalanceDay, EvaporationDay, IntervalDepth, RefillTarget, Strategy, TurnTarget,
};

/// Longest rotation cycle within a block (days).
pub const MAX_CYCLE_DAYS: u32 = 30;

/// How a block's outlet serves its plantings.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub enum DeliveryRule {
    /// Each cohort on the day its strategy asks. Default.
    #[default]
    OnDemand,
    /// The block's area in a cycle of `cycle_days` days, each day its own share.
    RotationWithinBlock {
        /// Days of the cycle (1–30).
        cycle_days: u32,
        /// Smallest depletion (mm) worth a turn; a share less depleted is skipped.
        min_depth_mm: f64,
    },
    /// The requirement of each cycle of `cycle_days` days at a steady rate.
    ContinuousFlow {
        /// Days of the cycle (1–30).
        cycle_days: u32,
    },
}

impl DeliveryRule {
    /// The cycle length (days), 1 for on demand.
    pub fn cycle_days(self) -> u32 {
        match self {
            Self::OnDemand => 1,
            Self::RotationWithinBlock { cycle_days, .. } | Self::ContinuousFlow { cycle_days } => {
                cycle_days
            }
        }
    }
}

/// The turn strategy of a share, from the planting's strategy: refill to
/// field capacity (refill, interval), a fixed depth (depth, interval with a
/// fixed depth), or the strategy's fraction of the depletion (refill to a
/// fraction, deficit). A given schedule and rainfed stay as they are.
pub fn turn_strategy(
    strategy: &Strategy,
    cycle_days: usize,
    first_day: usize,
    min_depletion_mm: f64,
) -> Strategy {
    let target = match *strategy {
        Strategy::Refill {
            refill_to: RefillTarget::FieldCapacity,
            ..
        }
        | Strategy::FixedInterval {
            depth: IntervalDepth::CurrentDepletion,
            ..
        } => TurnTarget::FieldCapacity,
        Strategy::Refill {
            refill_to: RefillTarget::FractionOfDepletion(f),
            ..
        } => TurnTarget::FractionOfDepletion(f),
        Strategy::FixedInterval {
            depth: IntervalDepth::FixedMm(d),
            ..
        }
        | Strategy::FixedDepth { net_mm: d, .. } => TurnTarget::FixedMm(d),
        Strategy::Deficit {
            refill_fraction, ..
        } => TurnTarget::FractionOfDepletion(refill_fraction),
        Strategy::Turns { target, .. } => target,
        Strategy::Scheduled(_) | Strategy::Rainfed => return strategy.clone(),
    };
    Strategy::Turns {
        cycle_days,
        first_day,
        min_depletion_mm,
        target,
    }
}

/// First day (cohort day index) of share `share`'s turns when the cohort's
/// day 0 is weather day `first_weather_index`: share k takes water on the
/// weather days g with g mod N = k.
pub fn share_first_day(share: usize, cycle_days: usize, first_weather_index: usize) -> usize {
    (share + cycle_days - first_weather_index % cycle_days) % cycle_days
}

/// Adds `w` × every depth, coefficient and water-holding term of `d` to `t`
/// (not ET₀ and rain, which are the day's own, nor Ks, whose callers weight
/// it each their way): the one area-weighted sum of balance days, used for
/// the shares of a cohort and for the cohorts of a season.
pub(super) fn add_weighted_day(t: &mut BalanceDay, d: &BalanceDay, w: f64) {
    t.kc += w * d.kc;
    t.etc_mm += w * d.etc_mm;
    t.etc_adj_mm += w * d.etc_adj_mm;
    t.runoff_mm += w * d.runoff_mm;
    t.peff_mm += w * d.peff_mm;
    t.irrigation_mm += w * d.irrigation_mm;
    t.capillary_rise_mm += w * d.capillary_rise_mm;
    t.deep_perc_mm += w * d.deep_perc_mm;
    t.depletion_mm += w * d.depletion_mm;
    t.taw_mm += w * d.taw_mm;
    t.raw_mm += w * d.raw_mm;
    t.p += w * d.p;
}

/// Adds `w` × an evaporation-layer day `d` to `t` (dual coefficient).
pub(super) fn add_weighted_layer(t: &mut EvaporationDay, d: &EvaporationDay, w: f64) {
    t.kcb += w * d.kcb;
    t.kc_max += w * d.kc_max;
    t.few += w * d.few;
    t.kr += w * d.kr;
    t.ke += w * d.ke;
    t.evaporation_mm += w * d.evaporation_mm;
    t.deep_perc_mm += w * d.deep_perc_mm;
    t.depletion_mm += w * d.depletion_mm;
}

/// The mean of equal-area shares' daily balances (each 1/N of the area).
pub fn mean_of_shares(shares: &[Vec<BalanceDay>]) -> Vec<BalanceDay> {
    let Some(first) = shares.first() else {
        return Vec::new();
    };
    let w = 1.0 / shares.len() as f64;
    let mut out = vec![BalanceDay::default(); first.len()];
    for s in shares {
        for (t, d) in out.iter_mut().zip(s) {
            t.et0_mm = d.et0_mm;
            t.rain_mm = d.rain_mm;
            add_weighted_day(t, d, w);
            t.ks += w * d.ks;
        }
    }
    out
}

/// The mean of equal-area shares' evaporation layers (dual coefficient).
pub fn mean_of_share_layers(shares: &[Vec<EvaporationDay>]) -> Vec<EvaporationDay> {
    let Some(first) = shares.first() else {
        return Vec::new();
    };
    let w = 1.0 / shares.len() as f64;
    let mut out = vec![EvaporationDay::default(); first.len()];
    for s in shares {
        for (t, d) in out.iter_mut().zip(s) {
            add_weighted_layer(t, d, w);
        }
    }
    out
}

/// Spreads a daily series evenly over cycles of `cycle_days` days (weather
/// days g with ⌊g / N⌋ equal; the last cycle may be shorter). Totals per
/// cycle are kept.
pub fn spread_over_cycles(daily: &mut [f64], cycle_days: usize) {
    if cycle_days <= 1 {
        return;
    }
    for chunk in daily.chunks_mut(cycle_days) {
        let mean = chunk.iter().sum::<f64>() / chunk.len() as f64;
        chunk.fill(mean);
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn shares_take_their_own_weather_days() {
        // N = 7, cohort starting on weather day 10 (10 mod 7 = 3): share 3's
        // first turn is the cohort's day 0, share 4's day 1, share 0's day 4.
        assert_eq!(share_first_day(3, 7, 10), 0);
        assert_eq!(share_first_day(4, 7, 10), 1);
        assert_eq!(share_first_day(0, 7, 10), 4);
        assert_eq!(share_first_day(2, 7, 10), 6);
    }

    #[test]
    fn spreading_keeps_cycle_totals() {
        let mut d = vec![0.0, 0.0, 7.0, 0.0, 0.0, 0.0, 0.0, 3.0, 0.0];
        spread_over_cycles(&mut d, 7);
        assert!(d[..7].iter().all(|v| (v - 1.0).abs() < 1e-12));
        assert!(d[7..].iter().all(|v| (v - 1.5).abs() < 1e-12));
    }

    #[test]
    fn turn_targets_follow_the_strategy() {
        let t = turn_strategy(&Strategy::default(), 7, 2, 10.0);
        assert_eq!(
            t,
            Strategy::Turns {
                cycle_days: 7,
                first_day: 2,
                min_depletion_mm: 10.0,
                target: TurnTarget::FieldCapacity
            }
        );
        assert_eq!(
            turn_strategy(&Strategy::Rainfed, 7, 2, 10.0),
            Strategy::Rainfed
        );
    }
}
