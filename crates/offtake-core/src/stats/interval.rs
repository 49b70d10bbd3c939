//! Distribution-free confidence interval of a quantile from the order
//! statistics of a sample (binomial ranks).
//!
//! # Method
//!
//! Hahn, G. J. and Meeker, W. Q. (1991), *Statistical Intervals: A Guide for
//! Practitioners*, Wiley, chapter 5, "distribution-free confidence interval
//! for a distribution percentile" (chapter from memory). For a continuous
//! distribution, let x_p be its p quantile and Y the number of the n sample
//! values at or below x_p: Y is binomial (n, p). The l-th smallest value
//! X(l) lies at or below x_p exactly when Y ≥ l, and X(u) lies above x_p
//! exactly when Y ≤ u − 1, so
//!
//! P( X(l) ≤ x_p ≤ X(u) ) = B(u − 1; n, p) − B(l − 1; n, p),
//!
//! where B(k; n, p) is the binomial cumulative distribution function. The
//! result holds whatever the distribution of the values, which is why the
//! interval needs no fitted distribution.
//!
//! # Equal tails, coverage at least nominal
//!
//! For a nominal level 1 − α (90 % by default in Offtake) each tail is held
//! to at most α/2:
//!
//! - lower rank l = the largest rank with B(l − 1) ≤ α/2 (the chance that
//!   X(l) lies above x_p);
//! - upper rank u = the smallest rank with 1 − B(u − 1) ≤ α/2 (the chance
//!   that X(u) lies below x_p).
//!
//! The binomial is discrete, so the achieved coverage
//! B(u − 1) − B(l − 1) is at least the nominal level and usually above it;
//! it is reported beside the interval. When even the smallest value leaves
//! more than α/2 in the lower tail ((1 − p)ⁿ > α/2) there is no lower rank:
//! the bound is open ("below the smallest of record"); likewise there is no
//! upper rank when pⁿ > α/2 ("above the largest of record"). The coverage
//! then counts the open side as reaching to infinity (B(−1) = 0, B(n) = 1).
//!
//! Ties (equal values) make the interval, if anything, wider in probability
//! terms; the ranks are those of the sorted values.

use serde::{Deserialize, Serialize};

use super::{RankedSample, StatsError};

/// Slack on the tail comparisons, so that a tail exactly at α/2 (as in the
/// printed tables) is not lost to rounding of the binomial sums.
const TAIL_SLACK: f64 = 1e-12;

/// The order-statistic ranks of a distribution-free confidence interval of
/// the p quantile (see the module documentation).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub struct RankInterval {
    /// Number of values n.
    pub n: usize,
    /// Quantile: non-exceedance probability p (fraction).
    pub non_exceedance: f64,
    /// Nominal confidence level 1 − α (fraction).
    pub level: f64,
    /// Rank l (1-based, from the smallest) of the lower bound; `None` when
    /// no order statistic reaches it (below the smallest of record).
    pub lower_rank: Option<usize>,
    /// Rank u (1-based, from the smallest) of the upper bound; `None` when
    /// no order statistic reaches it (above the largest of record).
    pub upper_rank: Option<usize>,
    /// Achieved coverage B(u − 1) − B(l − 1) (fraction), at least `level`.
    pub coverage: f64,
}

/// A confidence interval of a quantile with its bounds read from a sample.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub struct QuantileInterval {
    /// The ranks and their coverage.
    pub ranks: RankInterval,
    /// Lower bound (the value of rank l); `None` below the smallest of
    /// record.
    pub lower: Option<f64>,
    /// Upper bound (the value of rank u); `None` above the largest of
    /// record.
    pub upper: Option<f64>,
}

impl QuantileInterval {
    /// Whether `x` lies inside the interval (an open side reaches to
    /// infinity).
    pub fn contains(&self, x: f64) -> bool {
        self.lower.is_none_or(|l| x >= l) && self.upper.is_none_or(|u| x <= u)
    }

    /// The interval with both bounds multiplied by `factor` (> 0), e.g. a
    /// design flow's interval as a required capacity (× 24 ÷ hours).
    #[must_use]
    pub fn scaled(&self, factor: f64) -> Self {
        Self {
            ranks: self.ranks,
            lower: self.lower.map(|v| v * factor),
            upper: self.upper.map(|v| v * factor),
        }
    }
}

/// Binomial probabilities P(Y = k), k = 0..=n, for Y ~ binomial(n, p).
///
/// Computed in logarithms (ln C(n, k) + k ln p + (n − k) ln(1 − p)) so
/// that long records do not underflow; p = 0 and p = 1 are exact.
pub fn binomial_pmf(n: usize, p: f64) -> Vec<f64> {
    let mut out = vec![0.0; n + 1];
    if p <= 0.0 {
        out[0] = 1.0;
        return out;
    }
    if p >= 1.0 {
        out[n] = 1.0;
        return out;
    }
    let (ln_p, ln_q) = (p.ln(), (-p).ln_1p());
    let mut ln_choose = 0.0; // ln C(n, 0)
    for (k, slot) in out.iter_mut().enumerate() {
        if k > 0 {
            ln_choose += ((n - k + 1) as f64).ln() - (k as f64).ln();
        }
        *slot = (ln_choose + k as f64 * ln_p + (n - k) as f64 * ln_q).exp();
    }
    out
}

/// Binomial cumulative probabilities B(k) = P(Y ≤ k), k = 0..=n.
pub fn binomial_cdf(n: usize, p: f64) -> Vec<f64> {
    let mut acc = 0.0;
    binomial_pmf(n, p)
        .into_iter()
        .map(|f| {
            acc += f;
            acc.min(1.0)
        })
        .collect()
}

/// Equal-tailed order-statistic ranks of the distribution-free confidence
/// interval of the p quantile of n values at nominal level `level`
/// (Hahn and Meeker 1991, chapter 5; see the module documentation).
///
/// # Errors
/// [`StatsError::Empty`] for n = 0; [`StatsError::ProbabilityOutOfRange`]
/// for p outside 0..=1; [`StatsError::LevelOutOfRange`] for a level not in
/// (0, 1).
pub fn quantile_interval_ranks(
    n: usize,
    non_exceedance: f64,
    level: f64,
) -> Result<RankInterval, StatsError> {
    if n == 0 {
        return Err(StatsError::Empty);
    }
    if !(0.0..=1.0).contains(&non_exceedance) {
        return Err(StatsError::ProbabilityOutOfRange { p: non_exceedance });
    }
    if !(level > 0.0 && level < 1.0) {
        return Err(StatsError::LevelOutOfRange { level });
    }
    let tail = (1.0 - level) / 2.0;
    let cdf = binomial_cdf(n, non_exceedance);
    // B(k) for k = −1..=n.
    let b = |k: isize| -> f64 {
        if k < 0 {
            0.0
        } else {
            cdf.get(k as usize).copied().unwrap_or(1.0)
        }
    };
    // Largest l in 1..=n with B(l − 1) ≤ α/2 (B is non-decreasing).
    let lower_rank = (1..=n)
        .rev()
        .find(|&l| b(l as isize - 1) <= tail + TAIL_SLACK);
    // Smallest u in 1..=n with 1 − B(u − 1) ≤ α/2.
    let upper_rank = (1..=n).find(|&u| 1.0 - b(u as isize - 1) <= tail + TAIL_SLACK);
    let b_upper = upper_rank.map_or(1.0, |u| b(u as isize - 1));
    let b_lower = lower_rank.map_or(0.0, |l| b(l as isize - 1));
    Ok(RankInterval {
        n,
        non_exceedance,
        level,
        lower_rank,
        upper_rank,
        coverage: (b_upper - b_lower).clamp(0.0, 1.0),
    })
}

impl RankedSample {
    /// Distribution-free confidence interval of the quantile at
    /// non-exceedance probability `non_exceedance`, nominal level `level`
    /// ([`quantile_interval_ranks`]), bounds read from the sorted values.
    ///
    /// # Errors
    /// As [`quantile_interval_ranks`].
    pub fn quantile_interval(
        &self,
        non_exceedance: f64,
        level: f64,
    ) -> Result<QuantileInterval, StatsError> {
        let ranks = quantile_interval_ranks(self.len(), non_exceedance, level)?;
        let value = |rank: Option<usize>| rank.and_then(|r| self.ascending().get(r - 1).copied());
        Ok(QuantileInterval {
            ranks,
            lower: value(ranks.lower_rank),
            upper: value(ranks.upper_rank),
        })
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn pmf_sums_to_one_and_handles_the_ends() {
        for n in [1, 5, 24, 200, 2000] {
            for p in [0.0, 0.05, 0.5, 0.8, 0.99, 1.0] {
                let s: f64 = binomial_pmf(n, p).iter().sum();
                assert!((s - 1.0).abs() < 1e-9, "n {n} p {p}: {s}");
            }
        }
    }

    #[test]
    fn open_bounds_when_no_rank_reaches() {
        // 0.95^5 = 0.774 > 0.05: no upper rank with 5 values at p = 0.95.
        let r = quantile_interval_ranks(5, 0.95, 0.9).unwrap();
        assert_eq!(r.upper_rank, None);
        assert!(r.lower_rank.is_some());
        // 0.95^1 > 0.05 and 0.05^1 ≤ 0.05: one value, lower bound only.
        let one = quantile_interval_ranks(1, 0.95, 0.9).unwrap();
        assert_eq!((one.lower_rank, one.upper_rank), (Some(1), None));
        assert!(r.coverage >= 0.9);
    }

    #[test]
    fn bad_inputs_are_errors() {
        assert!(matches!(
            quantile_interval_ranks(0, 0.8, 0.9),
            Err(StatsError::Empty)
        ));
        assert!(matches!(
            quantile_interval_ranks(10, 1.2, 0.9),
            Err(StatsError::ProbabilityOutOfRange { .. })
        ));
        for level in [0.0, 1.0, f64::NAN, 1e9] {
            assert!(matches!(
                quantile_interval_ranks(10, 0.8, level),
                Err(StatsError::LevelOutOfRange { .. })
            ));
        }
    }
}
