//! Probabilities of yearly (or seasonal, monthly, 10-day) values with Weibull
//! plotting positions, dependable values and design years.
//!
//! # Method
//!
//! The n values are ranked in ascending order, m = 1 for the smallest. The
//! value of rank m is given the **non-exceedance probability**
//! P(m) = m / (n + 1) — the Weibull plotting position (Weibull 1939; see
//! Chow, Maidment and Mays 1988, *Applied Hydrology*, section 12.1 on
//! plotting positions, where it is written for exceedance with ranks counted
//! from the largest; section reference from memory). The value at any other
//! probability p is read by linear interpolation between the two neighbouring
//! ranks.
//!
//! Two ways of speaking about the same curve are kept apart by
//! [`Probability`]:
//!
//! - **non-exceedance** p: the value not exceeded in a share p of years. ET₀,
//!   irrigation demand and design flows are taken at a chosen non-exceedance
//!   probability (default 80 %).
//! - **exceedance** p: the value equalled or exceeded in a share p of years.
//!   *Dependable rain* at 80 % is the 80 % exceedance value, which is the 20 %
//!   non-exceedance value.
//!
//! # Outside the plotted range
//!
//! The plotting positions cover only [1/(n+1), n/(n+1)]. For a non-exceedance
//! probability below 1/(n+1) the smallest value is returned, and above
//! n/(n+1) the largest: the result is **clamped to the extreme observed
//! values**, never extrapolated. With 9 years the 95 % value is therefore the
//! largest of the nine. Use a longer record (or a fitted distribution,
//! outside this module) when such tails matter.

use std::fmt;

use serde::{Deserialize, Serialize};

pub mod interval;

pub use interval::{QuantileInterval, RankInterval, quantile_interval_ranks};

/// Errors of the probability functions.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum StatsError {
    /// No values were given.
    #[error("no values to rank: at least one value is needed")]
    Empty,
    /// A value is NaN or infinite.
    #[error("value {value} at position {index} is not a finite number")]
    NotFinite {
        /// Zero-based position of the value in the input.
        index: usize,
        /// The value found.
        value: f64,
    },
    /// A probability outside 0..=1 (or NaN).
    #[error("probability {p} is outside 0 to 1")]
    ProbabilityOutOfRange {
        /// The probability given (as a fraction, not a percentage).
        p: f64,
    },
    /// A confidence level outside (0, 1) (or NaN).
    #[error("confidence level {level} is outside 0 to 1 (exclusive)")]
    LevelOutOfRange {
        /// The level given (as a fraction, not a percentage).
        level: f64,
    },
}

/// Weibull plotting position m / (n + 1) of rank `rank` (1-based) among `n`
/// values (Weibull 1939; Chow, Maidment and Mays 1988, section 12.1).
///
/// With ranks counted from the smallest value it is the non-exceedance
/// probability of that value. `rank` is expected in 1..=n; other ranks give the
/// formula's value without complaint.
pub fn weibull_plotting_position(rank: usize, n: usize) -> f64 {
    rank as f64 / (n as f64 + 1.0)
}

/// A probability with its meaning attached, as a fraction 0..=1.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum Probability {
    /// Value not exceeded in this share of years (ET₀, demand, design flow).
    NonExceedance(f64),
    /// Value equalled or exceeded in this share of years (dependable rain).
    Exceedance(f64),
}

impl Probability {
    /// The equivalent non-exceedance probability (exceedance p → 1 − p).
    ///
    /// # Errors
    /// [`StatsError::ProbabilityOutOfRange`] when the fraction is NaN or
    /// outside 0..=1.
    pub fn non_exceedance(self) -> Result<f64, StatsError> {
        let p = match self {
            Self::NonExceedance(p) | Self::Exceedance(p) => p,
        };
        if !(0.0..=1.0).contains(&p) {
            return Err(StatsError::ProbabilityOutOfRange { p });
        }
        Ok(match self {
            Self::NonExceedance(p) => p,
            Self::Exceedance(p) => 1.0 - p,
        })
    }

    /// The fraction as given (0..=1), whichever its meaning.
    pub fn fraction(self) -> f64 {
        match self {
            Self::NonExceedance(p) | Self::Exceedance(p) => p,
        }
    }

    /// Short word for the kind: `"non-exceedance"` or `"exceedance"`.
    pub fn kind(self) -> &'static str {
        match self {
            Self::NonExceedance(_) => "non-exceedance",
            Self::Exceedance(_) => "exceedance",
        }
    }
}

impl fmt::Display for Probability {
    /// `80 % non-exceedance` or `80 % exceedance`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let pct = self.fraction() * 100.0;
        // Whole percentages print without decimals; others keep one.
        if (pct - pct.round()).abs() < 1e-9 {
            write!(f, "{pct:.0} % {}", self.kind())
        } else {
            write!(f, "{pct:.1} % {}", self.kind())
        }
    }
}

/// Values sorted in ascending order, ready for probability look-ups.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RankedSample {
    ascending: Vec<f64>,
}

impl RankedSample {
    /// Ranks `values` (any order).
    ///
    /// # Errors
    /// [`StatsError::Empty`] for no values; [`StatsError::NotFinite`] for the
    /// first NaN or infinite value, with its position.
    pub fn new(values: &[f64]) -> Result<Self, StatsError> {
        check_finite(values)?;
        let mut ascending = values.to_vec();
        ascending.sort_by(f64::total_cmp);
        Ok(Self { ascending })
    }

    /// Number of values n (at least 1).
    pub fn len(&self) -> usize {
        self.ascending.len()
    }

    /// Always false: a sample holds at least one value.
    pub fn is_empty(&self) -> bool {
        self.ascending.is_empty()
    }

    /// The values, smallest first (rank m is at position m − 1).
    pub fn ascending(&self) -> &[f64] {
        &self.ascending
    }

    /// Smallest value.
    pub fn min(&self) -> f64 {
        self.ascending.first().copied().unwrap_or(0.0)
    }

    /// Largest value.
    pub fn max(&self) -> f64 {
        self.ascending.last().copied().unwrap_or(0.0)
    }

    /// Non-exceedance probability m/(n+1) of each value in [`Self::ascending`].
    pub fn plotting_positions(&self) -> Vec<f64> {
        let n = self.len();
        (1..=n).map(|m| weibull_plotting_position(m, n)).collect()
    }

    /// Value at non-exceedance probability `p` (0..=1), interpolated linearly
    /// between the Weibull plotting positions of neighbouring ranks and
    /// clamped to the smallest/largest value outside [1/(n+1), n/(n+1)].
    ///
    /// # Errors
    /// [`StatsError::ProbabilityOutOfRange`] when `p` is NaN or outside 0..=1.
    pub fn non_exceedance_value(&self, p: f64) -> Result<f64, StatsError> {
        if !(0.0..=1.0).contains(&p) {
            return Err(StatsError::ProbabilityOutOfRange { p });
        }
        let n = self.len();
        // Fractional rank r with r / (n + 1) = p.
        let rank = p * (n as f64 + 1.0);
        if rank <= 1.0 {
            return Ok(self.min());
        }
        if rank >= n as f64 {
            return Ok(self.max());
        }
        // 1 < rank < n, so lower is in 1..n and lower + 1 ≤ n.
        let lower = rank.floor() as usize;
        let fraction = rank - lower as f64;
        let below = self.ascending[lower - 1];
        let above = self.ascending[lower];
        Ok(below + fraction * (above - below))
    }

    /// Value equalled or exceeded in a share `p` of years (0..=1): the
    /// non-exceedance value at 1 − p. Dependable rain at 80 % is
    /// `exceedance_value(0.8)`.
    ///
    /// # Errors
    /// [`StatsError::ProbabilityOutOfRange`] when `p` is NaN or outside 0..=1.
    pub fn exceedance_value(&self, p: f64) -> Result<f64, StatsError> {
        if !(0.0..=1.0).contains(&p) {
            return Err(StatsError::ProbabilityOutOfRange { p });
        }
        self.non_exceedance_value(1.0 - p)
    }

    /// Value at a probability of either kind.
    ///
    /// # Errors
    /// [`StatsError::ProbabilityOutOfRange`] when the fraction is NaN or
    /// outside 0..=1.
    pub fn value_at(&self, probability: Probability) -> Result<f64, StatsError> {
        self.non_exceedance_value(probability.non_exceedance()?)
    }
}

fn check_finite(values: &[f64]) -> Result<(), StatsError> {
    if values.is_empty() {
        return Err(StatsError::Empty);
    }
    if let Some((index, &value)) = values.iter().enumerate().find(|(_, v)| !v.is_finite()) {
        return Err(StatsError::NotFinite { index, value });
    }
    Ok(())
}

/// Value at non-exceedance probability `p` of `values`; see
/// [`RankedSample::non_exceedance_value`].
///
/// # Errors
/// Empty input, a non-finite value, or `p` outside 0..=1.
pub fn non_exceedance_value(values: &[f64], p: f64) -> Result<f64, StatsError> {
    RankedSample::new(values)?.non_exceedance_value(p)
}

/// Value equalled or exceeded in a share `p` of `values` (dependable value);
/// see [`RankedSample::exceedance_value`].
///
/// # Errors
/// Empty input, a non-finite value, or `p` outside 0..=1.
pub fn exceedance_value(values: &[f64], p: f64) -> Result<f64, StatsError> {
    RankedSample::new(values)?.exceedance_value(p)
}

/// The value at a chosen probability and the year closest to it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct DesignYear {
    /// The probability asked for, with its meaning.
    pub probability: Probability,
    /// Interpolated value at that probability.
    pub value_at_probability: f64,
    /// Zero-based position, in the input order, of the design year.
    pub index: usize,
    /// The design year's own value.
    pub value: f64,
}

/// The "design year": among `values` (one per year, in the caller's order),
/// the one whose value is closest to the value at `probability`.
///
/// When two years are equally close, the earlier one (smaller index) is
/// chosen.
///
/// # Errors
/// Empty input, a non-finite value, or a probability outside 0..=1.
pub fn design_year(values: &[f64], probability: Probability) -> Result<DesignYear, StatsError> {
    let target = RankedSample::new(values)?.value_at(probability)?;
    let mut best = 0;
    for (i, v) in values.iter().enumerate() {
        if (v - target).abs() < (values[best] - target).abs() {
            best = i;
        }
    }
    Ok(DesignYear {
        probability,
        value_at_probability: target,
        index: best,
        value: values[best],
    })
}
