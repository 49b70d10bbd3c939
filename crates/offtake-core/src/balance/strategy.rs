//! Irrigation scheduling strategies for the root-zone water balance.
//!
//! A strategy decides, at the start of each day, whether to irrigate and how
//! much net depth (mm stored in the root zone) to apply. The decision sees the
//! depletion at the end of the previous day and the day's TAW and RAW; it does
//! not see the day's rain (no forecast). Water is applied early in the day, as
//! in FAO-56 Example 38 (p. 172).
//!
//! FAO-56 (Allen et al. 1998, pp. 170–171) gives the rule the refill strategy
//! follows: irrigate at or before Dr = RAW, with net depth I ≤ Dr. The other
//! strategies are common scheduling practices; their default numbers are our
//! own planning defaults, not published values, and say so.

use std::fmt;
use std::str::FromStr;

use serde::{Deserialize, Serialize};

/// How much water a refill brings back.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum RefillTarget {
    /// Back to field capacity: the net depth equals the current depletion.
    FieldCapacity,
    /// A set fraction (0 < f ≤ 1) of the current depletion, leaving room for
    /// rain: net depth = f × Dr.
    FractionOfDepletion(f64),
}

/// Net depth applied by the fixed-interval strategy.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum IntervalDepth {
    /// The depletion on the day of irrigation (refill to field capacity).
    CurrentDepletion,
    /// A fixed net depth in mm; any excess over the depletion percolates.
    FixedMm(f64),
}

/// What a turn of a rotation brings back.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum TurnTarget {
    /// Field capacity: the net depth equals the depletion.
    FieldCapacity,
    /// A fraction (0 < f ≤ 1) of the depletion.
    FractionOfDepletion(f64),
    /// A fixed net depth (mm, > 0); any excess over the depletion percolates.
    FixedMm(f64),
}

/// One irrigation: the day index in the simulated series (0-based) and the
/// net depth in mm.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct IrrigationEvent {
    /// Index of the day in the input series (0 = first day).
    pub day: usize,
    /// Net depth applied (mm).
    pub net_mm: f64,
}

/// Irrigation scheduling strategy.
///
/// Command-line names (see [`Strategy::from_str`]): `refill`, `interval`,
/// `depth`, `deficit`, `rainfed`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum Strategy {
    /// Irrigate when the depletion reaches `trigger_pct_of_raw` % of RAW
    /// (FAO-56 pp. 170–171: "at or before Dr = RAW"; default 100 %), bringing the
    /// root zone back to `refill_to`.
    Refill {
        /// Trigger depletion as a percentage of RAW (0 < x ≤ 100 for no stress).
        trigger_pct_of_raw: f64,
        /// How much water each irrigation brings back.
        refill_to: RefillTarget,
    },
    /// Irrigate every `days` days, the first time on day index `first_day`.
    FixedInterval {
        /// Interval between irrigations (days, ≥ 1).
        days: usize,
        /// Day index (0-based) of the first irrigation.
        first_day: usize,
        /// Depth applied each time.
        depth: IntervalDepth,
    },
    /// Apply a fixed net depth whenever the depletion reaches
    /// `trigger_pct_of_raw` % of RAW. Excess over the depletion percolates.
    FixedDepth {
        /// Net depth of each irrigation (mm, > 0).
        net_mm: f64,
        /// Trigger depletion as a percentage of RAW.
        trigger_pct_of_raw: f64,
    },
    /// Regulated deficit irrigation: let the depletion go beyond RAW, to
    /// RAW + `allowed_stress` × (TAW − RAW) — the depletion at which Ks
    /// (FAO-56 eq. 84) falls to 1 − `allowed_stress` — then apply
    /// `refill_fraction` × Dr.
    Deficit {
        /// Fraction 0..1 of the stress range TAW − RAW the crop may use;
        /// the trigger Ks is 1 − this.
        allowed_stress: f64,
        /// Fraction 0 < f ≤ 1 of the depletion applied at each irrigation.
        refill_fraction: f64,
    },
    /// A given list of irrigations (day index, net mm), e.g. a farmer's
    /// actual schedule or a worked example.
    Scheduled(Vec<IrrigationEvent>),
    /// Turns of a rotation: water comes only every `cycle_days` days, the
    /// first time on day index `first_day`. On its turn the root zone is
    /// brought to `target` whatever its depletion, unless the depletion is
    /// below `min_depletion_mm` (too little to apply); it is not held back
    /// until RAW. (A rotation within the block: each share of the block's area
    /// has its own turn day.)
    Turns {
        /// Days between turns (≥ 1).
        cycle_days: usize,
        /// Day index (0-based) of the first turn.
        first_day: usize,
        /// Smallest depletion worth a turn (mm, ≥ 0).
        min_depletion_mm: f64,
        /// What a turn brings back.
        target: TurnTarget,
    },
    /// No irrigation.
    Rainfed,
}

/// Planning default of the `interval` strategy: every 7 days (ours, not published).
pub const DEFAULT_INTERVAL_DAYS: usize = 7;
/// Planning default of the `depth` strategy: 40 mm net (ours, not published).
pub const DEFAULT_FIXED_NET_MM: f64 = 40.0;
/// Planning default of the `deficit` strategy: irrigate when Ks reaches 0.7
/// (ours, not published).
pub const DEFAULT_DEFICIT_ALLOWED_STRESS: f64 = 0.3;

impl Default for Strategy {
    /// Refill at 100 % of RAW back to field capacity (FAO-56 pp. 170–171).
    fn default() -> Self {
        Strategy::Refill {
            trigger_pct_of_raw: 100.0,
            refill_to: RefillTarget::FieldCapacity,
        }
    }
}

/// Error parsing a strategy name.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("unknown strategy `{found}`: expected one of refill, interval, depth, deficit, rainfed")]
pub struct ParseStrategyError {
    /// The text that was given.
    pub found: String,
}

impl FromStr for Strategy {
    type Err = ParseStrategyError;

    /// Parses a command-line strategy name into the strategy with its
    /// defaults: `refill` (100 % of RAW, to field capacity), `interval`
    /// (every 7 days from day 0, refilling the depletion), `depth` (40 mm net
    /// at 100 % of RAW), `deficit` (trigger at Ks = 0.7, refill fully),
    /// `rainfed`. Case-insensitive.
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s.trim().to_ascii_lowercase().as_str() {
            "refill" => Ok(Strategy::default()),
            "interval" => Ok(Strategy::FixedInterval {
                days: DEFAULT_INTERVAL_DAYS,
                first_day: 0,
                depth: IntervalDepth::CurrentDepletion,
            }),
            "depth" => Ok(Strategy::FixedDepth {
                net_mm: DEFAULT_FIXED_NET_MM,
                trigger_pct_of_raw: 100.0,
            }),
            "deficit" => Ok(Strategy::Deficit {
                allowed_stress: DEFAULT_DEFICIT_ALLOWED_STRESS,
                refill_fraction: 1.0,
            }),
            "rainfed" => Ok(Strategy::Rainfed),
            _ => Err(ParseStrategyError {
                found: s.to_string(),
            }),
        }
    }
}

impl fmt::Display for Strategy {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let name = match self {
            Strategy::Refill { .. } => "refill",
            Strategy::FixedInterval { .. } => "interval",
            Strategy::FixedDepth { .. } => "depth",
            Strategy::Deficit { .. } => "deficit",
            Strategy::Scheduled(_) => "scheduled",
            Strategy::Turns { .. } => "turns",
            Strategy::Rainfed => "rainfed",
        };
        f.write_str(name)
    }
}

impl Strategy {
    /// Checks the strategy's numbers; returns the name of the bad field and
    /// its value, or `None` when all are valid.
    pub(crate) fn invalid_field(&self) -> Option<(&'static str, f64)> {
        let frac_ok = |x: f64| x.is_finite() && x > 0.0 && x <= 1.0;
        match *self {
            Strategy::Refill {
                trigger_pct_of_raw,
                refill_to,
            } => {
                if !(trigger_pct_of_raw.is_finite() && trigger_pct_of_raw > 0.0) {
                    return Some(("trigger_pct_of_raw", trigger_pct_of_raw));
                }
                if let RefillTarget::FractionOfDepletion(f) = refill_to
                    && !frac_ok(f)
                {
                    return Some(("refill fraction", f));
                }
                None
            }
            Strategy::FixedInterval { days, depth, .. } => {
                if days == 0 {
                    return Some(("interval days", 0.0));
                }
                if let IntervalDepth::FixedMm(d) = depth
                    && !(d.is_finite() && d >= 0.0)
                {
                    return Some(("interval net_mm", d));
                }
                None
            }
            Strategy::FixedDepth {
                net_mm,
                trigger_pct_of_raw,
            } => {
                if !(net_mm.is_finite() && net_mm > 0.0) {
                    return Some(("net_mm", net_mm));
                }
                if !(trigger_pct_of_raw.is_finite() && trigger_pct_of_raw > 0.0) {
                    return Some(("trigger_pct_of_raw", trigger_pct_of_raw));
                }
                None
            }
            Strategy::Deficit {
                allowed_stress,
                refill_fraction,
            } => {
                if !(allowed_stress.is_finite() && (0.0..1.0).contains(&allowed_stress)) {
                    return Some(("allowed_stress", allowed_stress));
                }
                if !frac_ok(refill_fraction) {
                    return Some(("refill_fraction", refill_fraction));
                }
                None
            }
            Strategy::Scheduled(ref events) => events
                .iter()
                .find(|e| !(e.net_mm.is_finite() && e.net_mm >= 0.0))
                .map(|e| ("scheduled net_mm", e.net_mm)),
            Strategy::Turns {
                cycle_days,
                min_depletion_mm,
                target,
                ..
            } => {
                if cycle_days == 0 {
                    return Some(("turn cycle days", 0.0));
                }
                if !(min_depletion_mm.is_finite() && min_depletion_mm >= 0.0) {
                    return Some(("turn minimum depletion (mm)", min_depletion_mm));
                }
                match target {
                    TurnTarget::FractionOfDepletion(f) if !frac_ok(f) => {
                        Some(("turn fraction of depletion", f))
                    }
                    TurnTarget::FixedMm(d) if !(d.is_finite() && d > 0.0) => {
                        Some(("turn net depth (mm)", d))
                    }
                    _ => None,
                }
            }
            Strategy::Rainfed => None,
        }
    }

    /// Net irrigation (mm) to apply early on day `day`, given the depletion
    /// at the end of the previous day and the day's TAW and RAW (mm).
    /// Returns 0 for no irrigation.
    pub(crate) fn net_irrigation_mm(
        &self,
        day: usize,
        depletion_prev_mm: f64,
        taw_mm: f64,
        raw_mm: f64,
        next_scheduled: &mut usize,
    ) -> f64 {
        match *self {
            Strategy::Refill {
                trigger_pct_of_raw,
                refill_to,
            } => {
                if depletion_prev_mm > 0.0
                    && depletion_prev_mm >= trigger_pct_of_raw / 100.0 * raw_mm
                {
                    match refill_to {
                        RefillTarget::FieldCapacity => depletion_prev_mm,
                        RefillTarget::FractionOfDepletion(f) => f * depletion_prev_mm,
                    }
                } else {
                    0.0
                }
            }
            Strategy::FixedInterval {
                days,
                first_day,
                depth,
            } => {
                if day >= first_day && (day - first_day).is_multiple_of(days) {
                    match depth {
                        IntervalDepth::CurrentDepletion => depletion_prev_mm,
                        IntervalDepth::FixedMm(d) => d,
                    }
                } else {
                    0.0
                }
            }
            Strategy::FixedDepth {
                net_mm,
                trigger_pct_of_raw,
            } => {
                if depletion_prev_mm > 0.0
                    && depletion_prev_mm >= trigger_pct_of_raw / 100.0 * raw_mm
                {
                    net_mm
                } else {
                    0.0
                }
            }
            Strategy::Deficit {
                allowed_stress,
                refill_fraction,
            } => {
                let trigger = raw_mm + allowed_stress * (taw_mm - raw_mm);
                if depletion_prev_mm > 0.0 && depletion_prev_mm >= trigger {
                    refill_fraction * depletion_prev_mm
                } else {
                    0.0
                }
            }
            Strategy::Scheduled(ref events) => {
                let mut total = 0.0;
                while let Some(e) = events.get(*next_scheduled) {
                    if e.day > day {
                        break;
                    }
                    if e.day == day {
                        total += e.net_mm;
                    }
                    *next_scheduled += 1;
                }
                total
            }
            Strategy::Turns {
                cycle_days,
                first_day,
                min_depletion_mm,
                target,
            } => {
                let turn = day >= first_day && (day - first_day).is_multiple_of(cycle_days);
                if !turn || depletion_prev_mm <= 0.0 || depletion_prev_mm < min_depletion_mm {
                    return 0.0;
                }
                match target {
                    TurnTarget::FieldCapacity => depletion_prev_mm,
                    TurnTarget::FractionOfDepletion(f) => f * depletion_prev_mm,
                    TurnTarget::FixedMm(d) => d,
                }
            }
            Strategy::Rainfed => 0.0,
        }
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn parses_cli_names_with_defaults() {
        assert_eq!("refill".parse::<Strategy>(), Ok(Strategy::default()));
        assert_eq!("RAINFED".parse::<Strategy>(), Ok(Strategy::Rainfed));
        assert!(matches!(
            "interval".parse::<Strategy>(),
            Ok(Strategy::FixedInterval { days: 7, .. })
        ));
        assert!(matches!(
            "depth".parse::<Strategy>(),
            Ok(Strategy::FixedDepth { .. })
        ));
        assert!(matches!(
            "deficit".parse::<Strategy>(),
            Ok(Strategy::Deficit { .. })
        ));
        let err = "sprinkle".parse::<Strategy>().unwrap_err();
        assert_eq!(err.found, "sprinkle");
        for s in ["refill", "interval", "depth", "deficit", "rainfed"] {
            assert_eq!(s.parse::<Strategy>().map(|x| x.to_string()), Ok(s.into()));
        }
    }

    #[test]
    fn refill_triggers_at_raw_and_refills_to_field_capacity() {
        let s = Strategy::default();
        let mut k = 0;
        assert!(s.net_irrigation_mm(0, 63.9, 160.0, 64.0, &mut k).abs() < 1e-12);
        assert!((s.net_irrigation_mm(0, 64.0, 160.0, 64.0, &mut k) - 64.0).abs() < 1e-12);
    }

    /// A turn refills whatever the depletion (not held back until RAW), skips
    /// below the minimum depth, and comes only on its own days.
    #[test]
    fn turns_refill_on_their_days_only() {
        let s = Strategy::Turns {
            cycle_days: 7,
            first_day: 3,
            min_depletion_mm: 5.0,
            target: TurnTarget::FieldCapacity,
        };
        let mut k = 0;
        // Day 3 is a turn: 20 mm depleted (below RAW 64) is refilled.
        assert!((s.net_irrigation_mm(3, 20.0, 160.0, 64.0, &mut k) - 20.0).abs() < 1e-12);
        // Day 10 is the next turn; day 4 is not.
        assert!(s.net_irrigation_mm(4, 90.0, 160.0, 64.0, &mut k).abs() < 1e-12);
        assert!((s.net_irrigation_mm(10, 90.0, 160.0, 64.0, &mut k) - 90.0).abs() < 1e-12);
        // Below the minimum depth the turn is skipped.
        assert!(s.net_irrigation_mm(17, 4.9, 160.0, 64.0, &mut k).abs() < 1e-12);
        assert!(s.invalid_field().is_none());
    }

    #[test]
    fn deficit_triggers_at_the_chosen_ks() {
        // TAW 160, RAW 64: Ks = 0.7 at Dr = 64 + 0.3 × 96 = 92.8 (FAO-56 eq. 84).
        let s = Strategy::Deficit {
            allowed_stress: 0.3,
            refill_fraction: 1.0,
        };
        let mut k = 0;
        assert!(s.net_irrigation_mm(0, 92.0, 160.0, 64.0, &mut k).abs() < 1e-12);
        assert!((s.net_irrigation_mm(0, 92.8, 160.0, 64.0, &mut k) - 92.8).abs() < 1e-12);
    }
}
