//! The crop coefficient curve against FAO-56 Examples 28 and 30 and Figure 36
//! (data in tests/reference/fao56-kc-curve.ron), plus property tests.
#![allow(clippy::unwrap_used)]

use offtake_core::crop::kc_curve::KcCurve;
use offtake_core::crop::{CoefficientSet, StageLengths};
use proptest::prelude::*;
use serde::Deserialize;

#[derive(Deserialize)]
struct Daily {
    source: String,
    stages: (u32, u32, u32, u32),
    anchors: (f64, f64, f64),
    days: Vec<(u32, f64)>,
    tolerance: f64,
}

#[derive(Deserialize)]
struct TenDay {
    source: String,
    stages: (u32, u32, u32, u32),
    anchors: (f64, f64, f64),
    periods: Vec<(f64, f64, f64)>,
    tolerance: f64,
}

#[derive(Deserialize)]
struct Cases {
    daily: Vec<Daily>,
    ten_day: TenDay,
}

fn cases() -> Cases {
    let text = include_str!(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/reference/fao56-kc-curve.ron"
    ));
    ron::from_str(text).unwrap()
}

fn curve(s: (u32, u32, u32, u32), a: (f64, f64, f64)) -> KcCurve {
    KcCurve::new(
        StageLengths::new(s.0, s.1, s.2, s.3),
        CoefficientSet {
            ini: a.0,
            mid: a.1,
            end: a.2,
        },
    )
    .unwrap()
}

#[test]
fn daily_kc_matches_examples_28_and_30() {
    for case in cases().daily {
        let c = curve(case.stages, case.anchors);
        for (day, expected) in case.days {
            let got = c.kc_on_day(day);
            assert!(
                (got - expected).abs() <= case.tolerance + 1e-9,
                "{}: day {day}: {got} vs {expected}",
                case.source
            );
        }
    }
}

/// Figure 36 averages each ten-day period as the integral of the
/// piecewise-linear curve over the period (see `KcCurve::mean_kc_between`).
#[test]
fn ten_day_means_match_figure_36() {
    let case = cases().ten_day;
    let c = curve(case.stages, case.anchors);
    for (t0, t1, expected) in case.periods {
        let got = c.mean_kc_between(t0, t1);
        assert!(
            (got - expected).abs() <= case.tolerance + 1e-9,
            "{}: {t0}-{t1}: {got} vs {expected}",
            case.source
        );
    }
}

proptest! {
    /// Eq. 66 joins straight lines end to end: the curve is continuous (a
    /// step of 1e-6 day moves it by at most slope × 1e-6) and stays within
    /// the [min, max] of its anchor values.
    #[test]
    fn curve_is_continuous_and_bounded(
        l in (1u32..200, 1u32..200, 1u32..200, 1u32..200),
        ini in 0.0f64..1.5, mid in 0.0f64..1.5, end in 0.0f64..1.5,
        t in -10.0f64..900.0,
    ) {
        let c = curve(l, (ini, mid, end));
        let lo = ini.min(mid).min(end);
        let hi = ini.max(mid).max(end);
        let k = c.kc_at(t);
        prop_assert!(k >= lo - 1e-12 && k <= hi + 1e-12);
        let max_slope = ((mid - ini).abs() / f64::from(l.1)).max((end - mid).abs() / f64::from(l.3));
        let eps = 1e-6;
        prop_assert!((c.kc_at(t + eps) - k).abs() <= max_slope * eps + 1e-12);
        let day = (t.abs() as u32).max(1);
        let kd = c.kc_on_day(day);
        prop_assert!(kd >= lo - 1e-12 && kd <= hi + 1e-12);
    }

    /// Scaling to any season length keeps the total and every stage ≥ 1 day.
    #[test]
    fn scaled_stages_sum_to_season(l in (1u32..200, 1u32..200, 1u32..200, 1u32..200), n in 4u32..1000) {
        let s = StageLengths::new(l.0, l.1, l.2, l.3).scaled_to(n).unwrap();
        prop_assert_eq!(s.total_days(), n);
        prop_assert!(s.as_array().iter().all(|&d| d >= 1));
    }
}
