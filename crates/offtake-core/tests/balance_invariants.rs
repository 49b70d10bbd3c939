//! Invariants of the root-zone water balance: FAO-56 eq. 85 closes every day
//! and eq. 86 bounds hold (0 ≤ Dr ≤ TAW), over random weather, crops, soils
//! and strategies; plus the seasonal identity of an irrigated run without
//! rain.
#![allow(clippy::unwrap_used)]

use offtake_core::balance::{
    BalanceParams, BalanceRun, CropCoefficients, DailySeries, EvaporationLayer, ExposedWetted,
    IntervalDepth, RefillTarget, RunoffRule, Strategy, simulate,
};
use proptest::prelude::*;
use proptest::strategy::Strategy as _;

const TOL_MM: f64 = 1e-9;

fn check_closure(run: &BalanceRun) -> Result<(), TestCaseError> {
    let mut prev = run.initial_depletion_mm;
    for (i, d) in run.days.iter().enumerate() {
        // FAO-56 eq. 85: Dr,i = Dr,i−1 − (P − RO) − I − CR + ETc adj + DP.
        let rhs = prev - (d.rain_mm - d.runoff_mm) - d.irrigation_mm - d.capillary_rise_mm
            + d.etc_adj_mm
            + d.deep_perc_mm;
        prop_assert!(
            (d.depletion_mm - rhs).abs() < TOL_MM,
            "day {i}: {} vs {rhs}",
            d.depletion_mm
        );
        // Eq. 86.
        prop_assert!(
            d.depletion_mm >= -TOL_MM && d.depletion_mm <= d.taw_mm + TOL_MM,
            "day {i}"
        );
        prop_assert!((0.0..=1.0).contains(&d.ks));
        prop_assert!(d.etc_adj_mm <= d.etc_mm + TOL_MM);
        prop_assert!(d.peff_mm >= -TOL_MM && d.peff_mm <= d.rain_mm - d.runoff_mm + TOL_MM);
        prop_assert!(d.deep_perc_mm >= 0.0 && d.runoff_mm >= 0.0);
        prop_assert!(d.p > 0.0 && d.p < 1.0);
        for v in [
            d.etc_mm,
            d.etc_adj_mm,
            d.peff_mm,
            d.depletion_mm,
            d.ks,
            d.raw_mm,
        ] {
            prop_assert!(v.is_finite());
        }
        prev = d.depletion_mm;
    }
    // Summed over the season: storage change identity.
    let t = run.totals();
    let balance = (t.rain_mm - t.runoff_mm) + t.irrigation_mm + t.capillary_rise_mm
        - t.etc_adj_mm
        - t.deep_perc_mm;
    prop_assert!((balance + t.storage_change_mm()).abs() < 1e-6);
    Ok(())
}

fn strategy_strategy() -> impl proptest::strategy::Strategy<Value = Strategy> {
    prop_oneof![
        (
            20.0..150.0f64,
            prop_oneof![Just(None), (0.3..1.0f64).prop_map(Some)]
        )
            .prop_map(|(t, f)| Strategy::Refill {
                trigger_pct_of_raw: t,
                refill_to: f.map_or(
                    RefillTarget::FieldCapacity,
                    RefillTarget::FractionOfDepletion
                ),
            }),
        (
            1usize..15,
            0usize..10,
            prop_oneof![Just(None), (0.0..80.0f64).prop_map(Some)]
        )
            .prop_map(|(days, first_day, d)| Strategy::FixedInterval {
                days,
                first_day,
                depth: d.map_or(IntervalDepth::CurrentDepletion, IntervalDepth::FixedMm),
            }),
        (1.0..80.0f64, 20.0..150.0f64).prop_map(|(net_mm, t)| Strategy::FixedDepth {
            net_mm,
            trigger_pct_of_raw: t
        }),
        (0.0..0.95f64, 0.2..1.0f64).prop_map(|(a, r)| Strategy::Deficit {
            allowed_stress: a,
            refill_fraction: r
        }),
        Just(Strategy::Rainfed),
    ]
}

#[derive(Debug, Clone)]
struct Case {
    et0: Vec<f64>,
    rain: Vec<f64>,
    kc: Vec<f64>,
    zr: Vec<f64>,
    cr: Option<Vec<f64>>,
    params: BalanceParams,
}

fn case() -> impl proptest::strategy::Strategy<Value = Case> {
    (5usize..200).prop_flat_map(|n| {
        (
            prop::collection::vec(0.0..12.0f64, n),
            prop::collection::vec(prop_oneof![3 => Just(0.0), 1 => 0.0..120.0f64], n),
            prop::collection::vec(0.0..1.4f64, n),
            (0.05..1.0f64, 0.0..1.5f64),
            prop::option::of(prop::collection::vec(0.0..3.0f64, n)),
            (30.0..250.0f64, 0.1..0.9f64, any::<bool>(), 0.0..1.0f64),
            (
                prop::option::of(30.0..99.0f64),
                prop::option::of(0.0..80.0f64),
            ),
            strategy_strategy(),
        )
            .prop_map(
                move |(et0, rain, kc, (z0, dz), cr, (taw_m, p, adj, d0), (cn, maxi), strategy)| {
                    let zr = (0..n)
                        .map(|i| z0 + dz * (i as f64 / n as f64).min(0.6) / 0.6)
                        .collect::<Vec<_>>();
                    Case {
                        et0,
                        rain,
                        kc,
                        params: BalanceParams {
                            taw_mm_per_m: taw_m,
                            p_table: p,
                            adjust_p_for_etc: adj,
                            initial_depletion_mm: d0 * taw_m * zr[0],
                            runoff: RunoffRule {
                                curve_number: cn,
                                max_infiltration_mm_day: maxi,
                            },
                            strategy,
                            supply_factor: None,
                        },
                        zr,
                        cr,
                    }
                },
            )
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    /// Eq. 85 closes every day and eq. 86 holds, single Kc.
    #[test]
    fn single_kc_closes_every_day(c in case()) {
        let series = DailySeries {
            et0_mm: &c.et0,
            rain_mm: &c.rain,
            crop: CropCoefficients::Single { kc: &c.kc },
            root_depth_m: &c.zr,
            capillary_rise_mm: c.cr.as_deref(),
        };
        let run = simulate(&series, &c.params).unwrap();
        prop_assert_eq!(run.days.len(), c.et0.len());
        check_closure(&run)?;
    }

    /// Eq. 85 closes every day with the dual coefficient, and the
    /// evaporation layer stays within 0 ≤ De ≤ TEW (eq. 78).
    #[test]
    fn dual_kc_closes_every_day(c in case(), tew in 6.0..30.0f64, rew_f in 0.1..0.9f64,
                                fw in 0.2..1.0f64, cover in 0.0..0.95f64) {
        let n = c.et0.len();
        let kcb: Vec<f64> = c.kc.iter().map(|k| k * 0.9).collect();
        let kc_max: Vec<f64> = kcb.iter().map(|k| (k + 0.05).max(1.2)).collect();
        let fc = vec![cover; n];
        let series = DailySeries {
            et0_mm: &c.et0,
            rain_mm: &c.rain,
            crop: CropCoefficients::Dual {
                kcb: &kcb,
                kc_max: &kc_max,
                layer: EvaporationLayer {
                    tew_mm: tew,
                    rew_mm: rew_f * tew,
                    initial_depletion_mm: 0.5 * tew,
                    fw_irrigation: fw,
                },
                few: ExposedWetted::FromCover { canopy_cover: &fc },
            },
            root_depth_m: &c.zr,
            capillary_rise_mm: c.cr.as_deref(),
        };
        let run = simulate(&series, &c.params).unwrap();
        check_closure(&run)?;
        for e in &run.evaporation {
            prop_assert!(e.depletion_mm >= -TOL_MM && e.depletion_mm <= tew + TOL_MM);
            prop_assert!(e.ke >= 0.0 && e.ke <= e.few * e.kc_max + TOL_MM);
        }
    }
}

/// Rainfed vs irrigated sanity. With no rain and refill at 100 % of RAW to
/// field capacity, the crop is never stressed (irrigation comes whenever Dr
/// reaches RAW, before Ks can fall below 1: FAO-56 eq. 84), nothing
/// percolates (I = Dr), so summing FAO-56 eq. 85 over the season gives
///
///   ΣI = ΣETc − (Dr,final − Dr,initial),
///
/// i.e. seasonal net irrigation equals seasonal ETc minus the soil water
/// drawn from the initial store. The rainfed run of the same crop uses at
/// most the initial store and is stressed.
#[test]
fn rainfed_vs_irrigated_sanity() {
    let n = 120;
    // Invented season: ET0 rising 3 → 7 mm/day, Kc 0.4 → 1.15 → 0.6.
    let et0: Vec<f64> = (0..n).map(|i| 3.0 + 4.0 * i as f64 / n as f64).collect();
    let kc: Vec<f64> = (0..n)
        .map(|i| match i {
            0..=24 => 0.4,
            25..=59 => 0.4 + 0.75 * (i - 24) as f64 / 35.0,
            60..=99 => 1.15,
            _ => 1.15 - 0.55 * (i - 99) as f64 / 20.0,
        })
        .collect();
    let zr: Vec<f64> = (0..n)
        .map(|i| 0.3 + 0.9 * (i as f64 / 60.0).min(1.0))
        .collect();
    let rain = vec![0.0; n];
    let series = DailySeries {
        et0_mm: &et0,
        rain_mm: &rain,
        crop: CropCoefficients::Single { kc: &kc },
        root_depth_m: &zr,
        capillary_rise_mm: None,
    };
    let base = BalanceParams {
        initial_depletion_mm: 10.0,
        ..BalanceParams::new(0.30, 0.15, 0.55)
    };
    let irrigated = simulate(&series, &base).unwrap();
    let t = irrigated.totals();
    assert!(t.irrigation_count > 3);
    assert!(
        (t.etc_adj_mm - t.etc_mm).abs() < 1e-9,
        "no stress under refill"
    );
    assert!(t.deep_perc_mm.abs() < 1e-9);
    assert!((t.irrigation_mm - (t.etc_mm - t.storage_change_mm())).abs() < 1e-9);

    let rainfed = simulate(
        &series,
        &BalanceParams {
            strategy: Strategy::Rainfed,
            ..base
        },
    )
    .unwrap();
    let r = rainfed.totals();
    assert!(r.irrigation_mm.abs() < 1e-12);
    // The rainfed crop can only use the store: ETc adj = Dr,final − Dr,initial
    // ≤ TAW at maximum depth − Dr,initial.
    assert!((r.etc_adj_mm - r.storage_change_mm()).abs() < 1e-9);
    assert!(r.etc_adj_mm <= 150.0 * 1.2 - 10.0 + 1e-9);
    assert!(r.etc_adj_mm < t.etc_adj_mm);
}
