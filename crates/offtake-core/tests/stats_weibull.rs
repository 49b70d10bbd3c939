//! Weibull plotting positions, non-exceedance and dependable values, design
//! years: a hand-worked example written out below, plus property tests.
#![expect(
    clippy::float_cmp,
    reason = "the properties compare results that must be bit-identical (same arithmetic, reordered input)"
)]

use offtake_core::stats::{
    DesignYear, Probability, RankedSample, StatsError, design_year, exceedance_value,
    non_exceedance_value, weibull_plotting_position,
};
use proptest::prelude::*;

/// Eleven invented yearly rain totals (mm), in year order.
const RAIN_MM: [f64; 11] = [
    612.0, 455.0, 538.0, 701.0, 389.0, 580.0, 497.0, 644.0, 520.0, 430.0, 566.0,
];

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-9
}

/// Hand-worked example (worked on paper, not by the code under test).
///
/// Sorted ascending, with rank m and Weibull position m/(n+1), n = 11, n+1 = 12:
///
/// | m | value | m/12     |
/// |---|-------|----------|
/// | 1 | 389   | 0.083333 |
/// | 2 | 430   | 0.166667 |
/// | 3 | 455   | 0.25     |
/// | 4 | 497   | 0.333333 |
/// | 5 | 520   | 0.416667 |
/// | 6 | 538   | 0.5      |
/// | 7 | 566   | 0.583333 |
/// | 8 | 580   | 0.666667 |
/// | 9 | 612   | 0.75     |
/// |10 | 644   | 0.833333 |
/// |11 | 701   | 0.916667 |
///
/// 80 % non-exceedance: fractional rank r = 0.80 × 12 = 9.6, between m = 9
/// (612) and m = 10 (644): 612 + 0.6 × (644 − 612) = 612 + 19.2 = 631.2 mm.
///
/// Dependable rain at 80 % (equalled or exceeded in 80 % of years) = 20 %
/// non-exceedance: r = 0.20 × 12 = 2.4, between m = 2 (430) and m = 3 (455):
/// 430 + 0.4 × 25 = 440.0 mm.
///
/// Median (50 %): r = 6.0 exactly → 538 mm.
///
/// 5 % non-exceedance: r = 0.6 < 1 → clamped to the smallest, 389 mm.
/// 95 % non-exceedance: r = 11.4 > 11 → clamped to the largest, 701 mm.
///
/// Design year at 80 % non-exceedance (631.2): |644 − 631.2| = 12.8 beats
/// |612 − 631.2| = 19.2, so 644 mm, the 8th year (index 7).
/// Design year for 80 % dependable rain (440.0): |430 − 440| = 10 beats
/// |455 − 440| = 15, so 430 mm, the 10th year (index 9).
#[test]
fn hand_worked_eleven_years() {
    let sample = RankedSample::new(&RAIN_MM).expect("finite values");
    assert_eq!(
        sample.ascending(),
        &[
            389.0, 430.0, 455.0, 497.0, 520.0, 538.0, 566.0, 580.0, 612.0, 644.0, 701.0
        ]
    );
    let positions = sample.plotting_positions();
    let by_hand = [
        1.0 / 12.0,
        2.0 / 12.0,
        0.25,
        4.0 / 12.0,
        5.0 / 12.0,
        0.5,
        7.0 / 12.0,
        8.0 / 12.0,
        0.75,
        10.0 / 12.0,
        11.0 / 12.0,
    ];
    for (got, want) in positions.iter().zip(by_hand) {
        assert!(close(*got, want), "{got} vs {want}");
    }

    assert!(close(
        sample.non_exceedance_value(0.8).expect("p ok"),
        631.2
    ));
    assert!(close(sample.exceedance_value(0.8).expect("p ok"), 440.0));
    assert!(close(
        sample.non_exceedance_value(0.2).expect("p ok"),
        440.0
    ));
    assert!(close(
        sample.non_exceedance_value(0.5).expect("p ok"),
        538.0
    ));
    assert!(close(
        sample.non_exceedance_value(0.05).expect("p ok"),
        389.0
    ));
    assert!(close(
        sample.non_exceedance_value(0.95).expect("p ok"),
        701.0
    ));

    assert!(close(
        non_exceedance_value(&RAIN_MM, 0.8).expect("ok"),
        631.2
    ));
    assert!(close(exceedance_value(&RAIN_MM, 0.8).expect("ok"), 440.0));

    let dy = design_year(&RAIN_MM, Probability::NonExceedance(0.8)).expect("ok");
    assert_eq!(dy.index, 7);
    assert!(close(dy.value, 644.0));
    assert!(close(dy.value_at_probability, 631.2));

    let DesignYear { index, value, .. } =
        design_year(&RAIN_MM, Probability::Exceedance(0.8)).expect("ok");
    assert_eq!(index, 9);
    assert!(close(value, 430.0));
}

/// m/(n+1) written out: rank 3 of 9 is 3/10.
#[test]
fn plotting_position_formula() {
    assert!(close(weibull_plotting_position(3, 9), 0.3));
    assert!(close(weibull_plotting_position(9, 9), 0.9));
}

#[test]
fn probability_labels_say_which_kind() {
    assert_eq!(
        Probability::NonExceedance(0.8).to_string(),
        "80 % non-exceedance"
    );
    assert_eq!(Probability::Exceedance(0.8).to_string(), "80 % exceedance");
    assert_eq!(
        Probability::Exceedance(0.755).to_string(),
        "75.5 % exceedance"
    );
}

#[test]
fn one_value_is_every_quantile() {
    let s = RankedSample::new(&[42.0]).expect("ok");
    for p in [0.0, 0.3, 0.5, 0.8, 1.0] {
        assert!(close(s.non_exceedance_value(p).expect("ok"), 42.0));
    }
}

#[test]
fn ties_in_design_year_go_to_the_earlier_year() {
    // 50 % of [10, 30] by Weibull positions 1/3, 2/3: r = 1.5 → 20, equidistant.
    let dy = design_year(&[30.0, 10.0], Probability::NonExceedance(0.5)).expect("ok");
    assert!(close(dy.value_at_probability, 20.0));
    assert_eq!(dy.index, 0);
}

#[test]
fn typed_errors() {
    assert_eq!(RankedSample::new(&[]), Err(StatsError::Empty));
    match RankedSample::new(&[1.0, f64::NAN, 3.0]) {
        Err(StatsError::NotFinite { index, value }) => {
            assert_eq!(index, 1);
            assert!(value.is_nan());
        }
        other => panic!("expected NotFinite, got {other:?}"),
    }
    assert!(matches!(
        RankedSample::new(&[1.0, f64::INFINITY]),
        Err(StatsError::NotFinite { index: 1, .. })
    ));
    let s = RankedSample::new(&[1.0, 2.0]).expect("ok");
    assert!(matches!(
        s.non_exceedance_value(1.2),
        Err(StatsError::ProbabilityOutOfRange { .. })
    ));
    assert!(matches!(
        s.exceedance_value(f64::NAN),
        Err(StatsError::ProbabilityOutOfRange { .. })
    ));
    assert!(matches!(
        design_year(&[1.0], Probability::Exceedance(-0.1)),
        Err(StatsError::ProbabilityOutOfRange { .. })
    ));
}

fn sample_values() -> impl Strategy<Value = Vec<f64>> {
    prop::collection::vec(-1.0e6..1.0e6_f64, 1..60)
}

proptest! {
    #[test]
    fn monotone_in_p(values in sample_values(), a in 0.0..=1.0_f64, b in 0.0..=1.0_f64) {
        let s = RankedSample::new(&values).expect("finite");
        let (lo, hi) = if a <= b { (a, b) } else { (b, a) };
        prop_assert!(s.non_exceedance_value(lo).expect("ok") <= s.non_exceedance_value(hi).expect("ok"));
        prop_assert!(s.exceedance_value(lo).expect("ok") >= s.exceedance_value(hi).expect("ok"));
    }

    #[test]
    fn within_min_and_max(values in sample_values(), p in 0.0..=1.0_f64) {
        let s = RankedSample::new(&values).expect("finite");
        let v = s.non_exceedance_value(p).expect("ok");
        let min = values.iter().copied().fold(f64::INFINITY, f64::min);
        let max = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        prop_assert!(v >= min && v <= max);
    }

    #[test]
    fn exceedance_mirrors_non_exceedance(values in sample_values(), p in 0.0..=1.0_f64) {
        let s = RankedSample::new(&values).expect("finite");
        prop_assert_eq!(s.exceedance_value(p).expect("ok"), s.non_exceedance_value(1.0 - p).expect("ok"));
    }

    #[test]
    fn at_plotting_positions_the_ranked_value_comes_back(values in sample_values()) {
        let s = RankedSample::new(&values).expect("finite");
        for (pos, v) in s.plotting_positions().iter().zip(s.ascending()) {
            let got = s.non_exceedance_value(*pos).expect("ok");
            prop_assert!((got - v).abs() <= 1e-9 * (1.0 + v.abs()), "{} vs {}", got, v);
        }
    }

    #[test]
    fn design_year_is_a_closest_value(values in sample_values(), p in 0.0..=1.0_f64) {
        let dy = design_year(&values, Probability::NonExceedance(p)).expect("ok");
        let best = values.iter().map(|v| (v - dy.value_at_probability).abs()).fold(f64::INFINITY, f64::min);
        prop_assert!(((dy.value - dy.value_at_probability).abs() - best).abs() < 1e-12);
        prop_assert_eq!(values[dy.index], dy.value);
    }

    #[test]
    fn order_of_input_does_not_matter(mut values in sample_values(), p in 0.0..=1.0_f64) {
        let a = non_exceedance_value(&values, p).expect("ok");
        values.reverse();
        let b = non_exceedance_value(&values, p).expect("ok");
        prop_assert_eq!(a, b);
    }
}
