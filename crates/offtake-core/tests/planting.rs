//! One planting over a weather record: seasons across 31 December, leap days,
//! sugarcane ratoons, cut seasons, cohorts, eq. 85 closure, the zero-rain
//! refill identity, and the period-total effective-rain methods.
//!
//! Weather here is invented (smooth seasonal ET₀, pseudo-random rain),
//! labelled so; crops and soils are the built-in library (FAO-56 values).
#![allow(clippy::unwrap_used, missing_docs)]

use chrono::{Datelike, NaiveDate};
use offtake_core::balance::{BalanceDay, RunoffRule, Strategy};
use offtake_core::crop::{Crop, StageLengths};
use offtake_core::planting::{
    LeachingInput, PlantingSpec, PlantingWarning, PlantingWeather, cohort_offsets, run_planting,
    run_planting_with_delivery, season_detail,
};
use offtake_core::rain::EffectiveRainMethod;
use offtake_core::soil::Soil;

const CROPS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/crops.ron"
));
const SOILS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/soils.ron"
));

fn crop(id: &str) -> Crop {
    let crops: Vec<Crop> = ron::from_str(CROPS).unwrap();
    crops.into_iter().find(|c| c.id == id).unwrap()
}

fn soil(id: &str) -> Soil {
    let soils: Vec<Soil> = ron::from_str(SOILS).unwrap();
    soils.into_iter().find(|s| s.id == id).unwrap()
}

/// Invented daily weather from `start` for `days` days.
struct Wx {
    start: NaiveDate,
    et0: Vec<f64>,
    rain: Vec<f64>,
    u2: Vec<f64>,
    rhmin: Vec<f64>,
}

impl Wx {
    fn invented(start: NaiveDate, days: usize, with_rain: bool) -> Self {
        let mut state: u64 = 0x2545_f491_4f6c_dd1d;
        let mut et0 = Vec::with_capacity(days);
        let mut rain = Vec::with_capacity(days);
        for i in 0..days {
            let doy = f64::from((start + chrono::Days::new(i as u64)).ordinal());
            et0.push(4.0 + 2.5 * (2.0 * std::f64::consts::PI * (doy - 100.0) / 365.0).sin());
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            let r = (state % 1000) as f64 / 1000.0;
            rain.push(if with_rain && r > 0.8 {
                40.0 * (r - 0.8) / 0.2
            } else {
                0.0
            });
        }
        Self {
            start,
            et0,
            rain,
            u2: vec![2.5; days],
            rhmin: vec![35.0; days],
        }
    }
    fn view(&self) -> PlantingWeather<'_> {
        PlantingWeather {
            start: self.start,
            et0_mm: &self.et0,
            rain_mm: &self.rain,
            wind_2m_ms: &self.u2,
            rhmin_pct: &self.rhmin,
        }
    }
}

fn ymd(y: i32, m: u32, d: u32) -> NaiveDate {
    NaiveDate::from_ymd_opt(y, m, d).unwrap()
}

/// FAO-56 eq. 85 day by day: Dr,i = Dr,i−1 − (P − RO) − I − CR + ETc adj + DP.
fn assert_eq85(days: &[BalanceDay], initial_mm: f64) {
    let mut prev = initial_mm;
    for (i, d) in days.iter().enumerate() {
        let expect = prev - (d.rain_mm - d.runoff_mm) - d.irrigation_mm - d.capillary_rise_mm
            + d.etc_adj_mm
            + d.deep_perc_mm;
        assert!(
            (d.depletion_mm - expect).abs() < 1e-9,
            "day {i}: {} vs {expect}",
            d.depletion_mm
        );
        prev = d.depletion_mm;
    }
}

#[test]
fn southern_hemisphere_season_crosses_31_december() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2000, 1, 1), 4 * 365 + 1, true);
    let spec = PlantingSpec::new(&maize, &loam, 11, 15);
    let r = run_planting(&spec, &wx.view()).unwrap();
    let years: Vec<(i32, bool)> = r.seasons.iter().map(|s| (s.year, s.complete)).collect();
    // 1999 season runs into the record start; 2003's is cut by the record end.
    assert_eq!(
        years,
        vec![
            (1999, false),
            (2000, true),
            (2001, true),
            (2002, true),
            (2003, false)
        ]
    );
    let s2000 = &r.seasons[1];
    assert_eq!(s2000.start, ymd(2000, 11, 15));
    // 150 days of FAO-56 Table 11 maize: 15 Nov 2000 + 149 days = 13 Apr 2001.
    assert_eq!(s2000.end, ymd(2001, 4, 13));
    assert!(s2000.net_irrigation_mm > 0.0);
    // Demand on both sides of 31 December.
    let i_dec = (ymd(2000, 12, 31) - wx.start).num_days() as usize;
    assert!(r.etc_mm[i_dec] > 0.0 && r.etc_mm[i_dec + 1] > 0.0);
    // No crop between harvest and the next planting.
    let i_jul = (ymd(2001, 7, 1) - wx.start).num_days() as usize;
    assert!(r.nir_mm[i_jul].abs() < 1e-15 && r.etc_mm[i_jul].abs() < 1e-15);
    assert!(
        r.warnings
            .iter()
            .any(|w| matches!(w, PlantingWarning::SeasonCut { year: 2003, .. }))
    );
    assert!(r.nir_mm.iter().all(|v| v.is_finite() && *v >= 0.0));
}

#[test]
fn leap_day_inside_a_season_is_an_ordinary_day() {
    let wheat = crop("wheat-spring");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(1999, 6, 1), 3 * 365, false);
    let spec = PlantingSpec::new(&wheat, &loam, 1, 20);
    let r = run_planting(&spec, &wx.view()).unwrap();
    let s = r.seasons.iter().find(|s| s.year == 2000).unwrap();
    // 135 days from 20 Jan 2000, counting 29 Feb: the last day is 2 Jun 2000
    // (in 2001, a common year, the same season ends on 3 Jun).
    assert_eq!(s.end, ymd(2000, 6, 2));
    assert_eq!(
        r.seasons.iter().find(|s| s.year == 2001).unwrap().end,
        ymd(2001, 6, 3)
    );
    let i = (ymd(2000, 2, 29) - wx.start).num_days() as usize;
    assert!(r.etc_mm[i] > 0.0);
    let detail = season_detail(&spec, &wx.view(), 2000).unwrap();
    assert_eq!(detail.days.len(), 135);
    assert_eq!(detail.first_date, ymd(2000, 1, 20));
    assert_eq85(&detail.days, 0.0);
}

#[test]
fn leap_day_planting_moves_in_common_years() {
    let wheat = crop("wheat-spring");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2000, 1, 1), 2 * 366, false);
    let spec = PlantingSpec::new(&wheat, &loam, 2, 29);
    let r = run_planting(&spec, &wx.view()).unwrap();
    assert_eq!(r.seasons[0].start, ymd(2000, 2, 29));
    assert_eq!(r.seasons[1].start, ymd(2001, 2, 28));
    assert!(
        r.warnings
            .contains(&PlantingWarning::LeapDayPlantingMoved { year: 2001 })
    );
}

#[test]
fn sugarcane_plant_crop_then_ratoons_as_one_chain() {
    let cane = crop("sugarcane");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 4 * 365 + 1, true);
    let spec = PlantingSpec::new(&cane, &loam, 3, 1);
    let r = run_planting(&spec, &wx.view()).unwrap();
    // Irrigation years from 1 Mar 2001; the 2004 year is cut by the record end.
    let years: Vec<(i32, bool)> = r.seasons.iter().map(|s| (s.year, s.complete)).collect();
    assert_eq!(
        years,
        vec![(2001, true), (2002, true), (2003, true), (2004, false)]
    );
    assert_eq!(r.seasons[0].start, ymd(2001, 3, 1));
    assert_eq!(r.seasons[0].end, ymd(2002, 2, 28));
    // No crop before the first planting.
    assert!(r.etc_mm[..59].iter().all(|v| *v == 0.0));
    // The plant crop is 405 days (FAO-56 Table 11); day 406 is ratoon day 1 at
    // Kc ini = 0.40 (Table 12), then the 280-day ratoon cycle.
    let d = season_detail(&spec, &wx.view(), 2002).unwrap();
    let ratoon_day1 = ymd(2001, 3, 1) + chrono::Days::new(405);
    let k = (ratoon_day1 - d.first_date).num_days() as usize;
    assert!((d.days[k].kc - 0.40).abs() < 1e-12, "{}", d.days[k].kc);
    assert!(d.days[k - 1].kc > 0.40);
    // Roots stay at the maximum through the ratoon (one run, never shrinking).
    assert!((d.days[k].taw_mm - d.days[k - 1].taw_mm).abs() < 1e-9);
    assert!(r.seasons.iter().all(|s| s.etc_mm > 0.0));
    assert!(r.nir_mm.iter().all(|v| v.is_finite()));
}

#[test]
fn orchard_runs_every_day_after_planting() {
    let citrus = crop("citrus");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 3 * 365, true);
    let spec = PlantingSpec::new(&citrus, &loam, 1, 1);
    let r = run_planting(&spec, &wx.view()).unwrap();
    assert_eq!(r.seasons.len(), 3);
    assert!(r.seasons.iter().all(|s| s.complete));
    assert!(r.etc_mm.iter().all(|v| *v > 0.0));
}

#[test]
fn season_cut_by_record_end_is_reported_and_flagged() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    // Record ends 31 Jul 2002; the 2002 season (from 1 Apr) needs 150 days.
    let start = ymd(2001, 1, 1);
    let days = (ymd(2002, 8, 1) - start).num_days() as usize;
    let wx = Wx::invented(start, days, true);
    let spec = PlantingSpec::new(&maize, &loam, 4, 1);
    let r = run_planting(&spec, &wx.view()).unwrap();
    assert_eq!(r.seasons.len(), 2);
    assert!(r.seasons[0].complete);
    assert!(!r.seasons[1].complete);
    assert!(
        r.warnings
            .iter()
            .any(|w| matches!(w, PlantingWarning::SeasonCut { year: 2002, .. }))
    );
    // Its days inside the record still carry demand.
    assert!(r.etc_mm[days - 1] > 0.0);
}

#[test]
fn cohorts_sum_to_area_weighted_separate_runs() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 3 * 365, true);
    let spec = PlantingSpec {
        spread_days: 10,
        initial_depletion_pct_of_taw: 20.0,
        ..PlantingSpec::new(&maize, &loam, 3, 1)
    };
    let whole = run_planting(&spec, &wx.view()).unwrap();
    let offsets = cohort_offsets(10);
    assert_eq!(offsets, vec![(2, 0.5), (7, 0.5)]);
    let mut sum = vec![0.0; wx.et0.len()];
    let mut irrigations = 0.0;
    for (off, share) in offsets {
        let single = PlantingSpec {
            spread_days: 0,
            first_planting_day: 1 + off,
            ..spec.clone()
        };
        let r = run_planting(&single, &wx.view()).unwrap();
        for (s, v) in sum.iter_mut().zip(&r.nir_mm) {
            *s += share * v;
        }
        irrigations += share * r.seasons[0].irrigation_count;
        // Eq. 85 closes for every cohort.
        let d = season_detail(&single, &wx.view(), 2001).unwrap();
        assert_eq85(&d.days, 0.2 * d.days[0].taw_mm);
    }
    for (a, b) in whole.nir_mm.iter().zip(&sum) {
        assert!((a - b).abs() < 1e-12);
    }
    assert!((whole.seasons[0].irrigation_count - irrigations).abs() < 1e-12);
}

/// With no rain and refill at RAW the crop never stresses, so
/// Σ NIR = Σ ETc − (Dr,final − Dr,initial): seasonal ETc less the soil water
/// used from the store (eq. 85 summed over the season, P = RO = DP = 0,
/// ETc adj = ETc).
#[test]
fn zero_rain_refill_nir_is_etc_less_soil_water_used() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 365, false);
    let spec = PlantingSpec {
        initial_depletion_pct_of_taw: 40.0,
        ..PlantingSpec::new(&maize, &loam, 4, 1)
    };
    let r = run_planting(&spec, &wx.view()).unwrap();
    let s = &r.seasons[0];
    let d = season_detail(&spec, &wx.view(), 2001).unwrap();
    let initial = 0.4 * d.days[0].taw_mm;
    // Soil water used from the store = rise in depletion over the season.
    let used = d.days.last().unwrap().depletion_mm - initial;
    assert!((s.etc_adj_mm - s.etc_mm).abs() < 1e-9, "no stress");
    assert!(
        (s.nir_mm - (s.etc_mm - used)).abs() < 1e-9,
        "{} {} {used} {}",
        s.nir_mm,
        s.etc_mm,
        s.etc_adj_mm
    );
    assert!(s.relative_yield_loss.abs() < 1e-12);
    assert!(s.irrigation_count >= 1.0);
}

/// Rainfed maize under the same dry weather stresses: FAO-56 eq. 90 with
/// Ky 1.25 (Table 24) on the season's ETc adj/ETc.
#[test]
fn rainfed_yield_loss_follows_ky() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 365, false);
    let spec = PlantingSpec {
        strategy: Strategy::Rainfed,
        ..PlantingSpec::new(&maize, &loam, 4, 1)
    };
    let s = &run_planting(&spec, &wx.view()).unwrap().seasons[0];
    assert!(s.nir_mm.abs() < 1e-12);
    let expect = (1.25 * (1.0 - s.etc_adj_mm / s.etc_mm)).clamp(0.0, 1.0);
    assert!(expect > 0.1);
    assert!((s.relative_yield_loss - expect).abs() < 1e-12);
}

/// Period methods against hand arithmetic on June 2001, wholly inside the
/// mid-season of a maize crop (30/31/61/30 days from 1 Mar) with Kc mid
/// unadjusted (no wind/RHmin data) and ET₀ = 100/(30 Kc mid), so that June
/// ETc = 100 mm exactly; June's rain falls on one day.
#[test]
fn period_methods_match_hand_arithmetic() {
    let mut maize = crop("maize-grain");
    maize.stages = StageLengths {
        ini_days: 30,
        dev_days: 31,
        mid_days: 61,
        late_days: 30,
    };
    let loam = soil("loam");
    let start = ymd(2001, 1, 1);
    let mut wx = Wx::invented(start, 365, false);
    wx.u2 = vec![f64::NAN; 365];
    wx.rhmin = vec![f64::NAN; 365];
    let june = (ymd(2001, 6, 1) - start).num_days() as usize;
    for i in june..june + 30 {
        wx.et0[i] = 100.0 / (30.0 * maize.kc.mid);
    }
    // (method, June rain, expected June Pe) — sources beside each case.
    let cases = [
        // Fixed 80 %: Peace Corps Irrigation Training Manual (1994) §5 problem 6 style, 50 mm → 40 mm.
        (
            EffectiveRainMethod::FixedPercentage { fraction: 0.8 },
            50.0,
            40.0,
        ),
        // FAO TM3 (Brouwer & Heibloem 1986): P = 100 → 0.8·100 − 25 = 55 (reference file §6.2).
        (EffectiveRainMethod::DependableFaoTm3, 100.0, 55.0),
        // USDA-SCS, D = 3 in (76.2 mm; the table's "75 mm (3 in)" row), P = 100, ETc = 100 → 65.83 mm: computed from the
        // published formula (reference file §6.1, [COMPUTED]).
        (
            EffectiveRainMethod::UsdaScs { storage_mm: 76.2 },
            100.0,
            65.83,
        ),
    ];
    for (method, rain, pe) in cases {
        wx.rain = vec![0.0; 365];
        wx.rain[june + 10] = rain;
        let spec = PlantingSpec {
            effective_rain: method,
            ..PlantingSpec::new(&maize, &loam, 3, 1)
        };
        let r = run_planting(&spec, &wx.view()).unwrap();
        let etc: f64 = r.etc_mm[june..june + 30].iter().sum();
        assert!((etc - 100.0).abs() < 1e-9, "{etc}");
        let peff: f64 = r.peff_mm[june..june + 30].iter().sum();
        assert!((peff - pe).abs() < 0.006, "{method:?}: {peff}");
        for v in &r.nir_mm[june..june + 30] {
            assert!((v - (100.0 - peff) / 30.0).abs() < 1e-12);
        }
    }
}

/// Leaching (FAO-29 via FAO-56 p.180): maize threshold ECe 1.7, ECw 1.0 →
/// LR = 1/(8.5 − 1) = 0.1333 (reference file §9, [COMPUTED]); NIR ÷ (1 − LR).
#[test]
fn leaching_divides_nir_by_one_minus_lr() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 365, true);
    let base = PlantingSpec::new(&maize, &loam, 4, 1);
    let with = PlantingSpec {
        leaching: Some(LeachingInput {
            ecw_ds_m: 1.0,
            ece_ds_m: None,
        }),
        ..base.clone()
    };
    let a = run_planting(&base, &wx.view()).unwrap();
    let b = run_planting(&with, &wx.view()).unwrap();
    let lr = b.seasons[0].leaching_requirement;
    assert!((lr - 0.1333).abs() < 5e-5);
    for (x, y) in a.nir_mm.iter().zip(&b.nir_mm) {
        assert!((y - x / (1.0 - lr)).abs() < 1e-12);
    }
}

/// Delivering exactly the strategy's NIR reproduces the run.
#[test]
fn delivery_of_the_requirement_reproduces_the_run() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let wx = Wx::invented(ymd(2001, 1, 1), 2 * 365, true);
    let spec = PlantingSpec::new(&maize, &loam, 4, 1);
    let a = run_planting(&spec, &wx.view()).unwrap();
    let b = run_planting_with_delivery(&spec, &wx.view(), &a.nir_mm).unwrap();
    for (x, y) in a.nir_mm.iter().zip(&b.nir_mm) {
        assert!((x - y).abs() < 1e-12);
    }
    // Half the water: stress and a yield loss.
    let half: Vec<f64> = a.nir_mm.iter().map(|v| v / 2.0).collect();
    let c = run_planting_with_delivery(&spec, &wx.view(), &half).unwrap();
    assert!(c.seasons[0].relative_yield_loss > a.seasons[0].relative_yield_loss);
}

/// Paddy rice: land preparation before the first transplanting is part of
/// the NIR; in a dry spell the main field needs ETc + S&P each day.
#[test]
fn paddy_includes_land_preparation() {
    let rice = crop("rice-paddy");
    let clay = soil("clay");
    let wx = Wx::invented(ymd(2001, 1, 1), 2 * 365, false);
    let spec = PlantingSpec {
        spread_days: 10,
        ..PlantingSpec::new(&rice, &clay, 6, 1)
    };
    let r = run_planting(&spec, &wx.view()).unwrap();
    let first = (ymd(2001, 6, 1) - wx.start).num_days() as usize;
    // 30 days of land preparation (paddy defaults) before transplanting.
    assert!(r.nir_mm[first - 30] > 0.0);
    assert!(r.nir_mm[first - 31].abs() < 1e-15);
    let s = &r.seasons[0];
    assert!(s.complete);
    // The requirement contains at least the saturation and pond volumes
    // (200 + 100 mm) and the crop's ET.
    assert!(s.nir_mm > 300.0 + s.etc_mm * 0.99);
    assert!(
        r.warnings
            .iter()
            .any(|w| matches!(w, PlantingWarning::KyUnknown { .. }))
    );
}

#[test]
fn bad_inputs_are_typed_errors() {
    let maize = crop("maize-grain");
    let loam = soil("loam");
    let mut wx = Wx::invented(ymd(2001, 1, 1), 365, true);
    let spec = PlantingSpec::new(&maize, &loam, 2, 30);
    assert!(run_planting(&spec, &wx.view()).is_err());
    wx.et0[5] = f64::NAN;
    let spec = PlantingSpec::new(&maize, &loam, 4, 1);
    assert!(run_planting(&spec, &wx.view()).is_err());
    let wx = Wx::invented(ymd(2001, 1, 1), 365, true);
    let bad = PlantingSpec {
        initial_depletion_pct_of_taw: 120.0,
        runoff: Some(RunoffRule::NONE),
        ..spec
    };
    assert!(run_planting(&bad, &wx.view()).is_err());
}

mod properties {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(24))]

        /// Over random invented weather, window, strategy and initial
        /// depletion: every cohort's daily table closes FAO-56 eq. 85, the
        /// composite NIR is the area-weighted sum of the cohorts' NIR, and
        /// every output is finite and not negative.
        #[test]
        fn every_cohort_closes_eq85(
            et0 in prop::collection::vec(0.0f64..9.0, 400),
            rain in prop::collection::vec(prop_oneof![3 => Just(0.0f64), 1 => 0.0f64..80.0], 400),
            spread in 0u32..16,
            strategy in prop::sample::select(vec!["refill", "interval", "depth", "deficit", "rainfed"]),
            initial in 0.0f64..100.0,
        ) {
            let maize = crop("maize-grain");
            let loam = soil("loam");
            let wx = Wx { start: ymd(2004, 1, 1), et0, rain, u2: vec![2.0; 400], rhmin: vec![45.0; 400] };
            let spec = PlantingSpec {
                spread_days: spread,
                strategy: strategy.parse().unwrap(),
                initial_depletion_pct_of_taw: initial,
                only_year: Some(2004),
                ..PlantingSpec::new(&maize, &loam, 3, 10)
            };
            let whole = run_planting(&spec, &wx.view()).unwrap();
            prop_assert!(whole.nir_mm.iter().chain(&whole.etc_adj_mm).chain(&whole.peff_mm)
                .all(|v| v.is_finite() && *v >= 0.0));
            let mut sum = vec![0.0; 400];
            for (off, share) in cohort_offsets(spread) {
                let single = PlantingSpec { spread_days: 0, first_planting_day: 10 + off, ..spec.clone() };
                let d = season_detail(&single, &wx.view(), 2004).unwrap();
                assert_eq85(&d.days, initial / 100.0 * d.days[0].taw_mm);
                let r = run_planting(&single, &wx.view()).unwrap();
                for (s, v) in sum.iter_mut().zip(&r.nir_mm) {
                    *s += share * v;
                }
            }
            for (a, b) in whole.nir_mm.iter().zip(&sum) {
                prop_assert!((a - b).abs() < 1e-9);
            }
        }
    }
}
