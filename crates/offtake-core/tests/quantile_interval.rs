//! The design-flow confidence interval (distribution-free interval of a
//! quantile from order statistics; Hahn and Meeker 1991, *Statistical
//! Intervals*, Wiley, chapter 5) checked against a general-purpose
//! statistics library's binomial distribution (`statrs`), and on a sample
//! whose order statistics are known.

#![allow(clippy::unwrap_used)]

use offtake_core::stats::{RankedSample, quantile_interval_ranks};
use statrs::distribution::{Binomial, DiscreteCDF};

/// B(k; n, p) from statrs, with B(−1) = 0 and B(n) = 1.
fn cdf(n: usize, p: f64, k: isize) -> f64 {
    if k < 0 {
        return 0.0;
    }
    Binomial::new(p, n as u64).unwrap().cdf(k as u64)
}

/// The ranks, re-derived from statrs by the definition: l the largest rank
/// with B(l − 1) ≤ α/2, u the smallest with 1 − B(u − 1) ≤ α/2, coverage
/// B(u − 1) − B(l − 1).
fn reference(n: usize, p: f64, level: f64) -> (Option<usize>, Option<usize>, f64) {
    let tail = (1.0 - level) / 2.0;
    let l = (1..=n)
        .rev()
        .find(|&l| cdf(n, p, l as isize - 1) <= tail + 1e-12);
    let u = (1..=n).find(|&u| 1.0 - cdf(n, p, u as isize - 1) <= tail + 1e-12);
    let bu = u.map_or(1.0, |u| cdf(n, p, u as isize - 1));
    let bl = l.map_or(0.0, |l| cdf(n, p, l as isize - 1));
    (l, u, bu - bl)
}

#[test]
fn ranks_and_coverage_match_statrs_binomial() {
    let mut cases = 0;
    for n in (1..=60).chain([75, 100, 150]) {
        for p in [0.5, 0.75, 0.8, 0.9, 0.95] {
            for level in [0.8, 0.9, 0.95] {
                let r = quantile_interval_ranks(n, p, level).unwrap();
                let (l, u, coverage) = reference(n, p, level);
                assert_eq!(r.lower_rank, l, "lower rank n {n} p {p} level {level}");
                assert_eq!(r.upper_rank, u, "upper rank n {n} p {p} level {level}");
                assert!(
                    (r.coverage - coverage).abs() < 1e-9,
                    "coverage n {n} p {p} level {level}: {} vs statrs {coverage}",
                    r.coverage
                );
                // Never below nominal; each tail at most α/2.
                assert!(r.coverage >= level - 1e-12, "n {n} p {p} level {level}");
                if let (Some(l), Some(u)) = (r.lower_rank, r.upper_rank) {
                    assert!(l <= u);
                    // The tails are the tightest: one rank further in either
                    // direction would break the α/2 limit.
                    let tail = (1.0 - level) / 2.0;
                    if l < n {
                        assert!(cdf(n, p, l as isize) > tail - 1e-12);
                    }
                    if u > 1 {
                        assert!(1.0 - cdf(n, p, u as isize - 2) > tail - 1e-12);
                    }
                }
                cases += 1;
            }
        }
    }
    assert!(cases > 900);
}

/// The demo's case: 24 yearly peaks, 80 % design flow, 90 % interval.
/// Worked by hand from the binomial (n = 24, p = 0.8; C(24, k) 0.8^k
/// 0.2^(24−k) summed): B(15) = 0.036 17 ≤ 0.05 < B(16) = 0.089 17 gives
/// l = 16; 1 − B(21) = 0.114 52 > 0.05 ≥ 1 − B(22) = 0.033 06 gives u = 23;
/// coverage B(22) − B(15) = 0.930 77.
#[test]
fn twenty_four_years_at_eighty_percent() {
    let r = quantile_interval_ranks(24, 0.8, 0.9).unwrap();
    assert_eq!((r.lower_rank, r.upper_rank), (Some(16), Some(23)));
    let expect = cdf(24, 0.8, 22) - cdf(24, 0.8, 15);
    assert!((r.coverage - expect).abs() < 1e-12);
    assert!((r.coverage - 0.930_77).abs() < 5e-6, "{}", r.coverage);
}

/// The median of 10 values at 95 %: the classic sign-test interval (X(2),
/// X(9)) with coverage 1 − 2 × 11/1024 = 0.978 515 625, exactly from the
/// binomial (n = 10, p = 0.5).
#[test]
fn median_of_ten_exact() {
    let r = quantile_interval_ranks(10, 0.5, 0.95).unwrap();
    assert_eq!((r.lower_rank, r.upper_rank), (Some(2), Some(9)));
    assert!((r.coverage - (1.0 - 2.0 * 11.0 / 1024.0)).abs() < 1e-12);
}

#[test]
fn bounds_are_the_order_statistics_and_open_when_unreached() {
    // Values 10, 20, ... 240 in scrambled order: rank m is 10 m.
    let mut values: Vec<f64> = (1..=24).map(|m| f64::from(m) * 10.0).collect();
    values.reverse();
    values.swap(3, 17);
    let s = RankedSample::new(&values).unwrap();
    let i = s.quantile_interval(0.8, 0.9).unwrap();
    assert_eq!(i.lower, Some(160.0));
    assert_eq!(i.upper, Some(230.0));
    assert!(i.contains(190.0) && !i.contains(231.0) && !i.contains(159.0));

    // 8 years at 95 %: 0.95^8 = 0.663 > 0.05, no upper rank: above the
    // largest of record.
    let short = RankedSample::new(&values[..8]).unwrap();
    let i = short.quantile_interval(0.95, 0.9).unwrap();
    assert_eq!(i.upper, None);
    assert!(i.lower.is_some());
    assert!(i.contains(1e9));
    // 3 years at 50 %: 0.5^3 = 0.125 > 0.05 on both sides: both open.
    let tiny = RankedSample::new(&values[..3]).unwrap();
    let i = tiny.quantile_interval(0.5, 0.9).unwrap();
    assert_eq!((i.lower, i.upper), (None, None));
    assert!((i.ranks.coverage - 1.0).abs() < 1e-12);
}
