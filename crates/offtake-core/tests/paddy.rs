//! Paddy rice balance: closure of the ponding balance over random weather,
//! land-preparation volume, and the effect of staggering. Values are
//! computed from the documented volume balance (see `offtake_core::paddy`).
#![allow(clippy::unwrap_used)]

use offtake_core::paddy::{
    LandPreparation, Nursery, PaddyField, PaddyPlanting, paddy_field_balance,
    paddy_planting_requirement,
};
use proptest::prelude::*;

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// h,i = h,i−1 + P − spill + I − ETc − S&P − drained + soil, every day;
    /// the pond stays within 0..bund height.
    #[test]
    fn ponding_balance_closes(
        n in 5usize..150,
        seed_rain in prop::collection::vec(prop_oneof![3 => Just(0.0), 1 => 0.0..250.0f64], 150),
        seed_et0 in prop::collection::vec(0.0..10.0f64, 150),
        kc in 0.5..1.3f64,
        bund in 50.0..300.0f64,
        target_f in 0.0..1.0f64,
        ps in 0.0..12.0f64,
        drain in 0usize..20,
    ) {
        let field = PaddyField {
            bund_height_mm: bund,
            target_ponding_mm: target_f * bund,
            percolation_seepage_mm_day: ps,
            drain_days_before_harvest: drain,
        };
        let days = paddy_field_balance(&seed_et0[..n], &seed_rain[..n], &vec![kc; n], &field).unwrap();
        let mut h = field.target_ponding_mm;
        for (i, d) in days.iter().enumerate() {
            let rhs = h + d.rain_mm - d.spill_mm + d.irrigation_mm - d.etc_mm - d.percolation_mm
                - d.drained_mm + d.soil_water_used_mm;
            prop_assert!((d.ponding_mm - rhs).abs() < 1e-9, "day {}", i);
            prop_assert!(d.ponding_mm >= -1e-9 && d.ponding_mm <= bund + 1e-9);
            prop_assert!(d.irrigation_mm >= 0.0 && d.spill_mm >= 0.0 && d.soil_water_used_mm >= 0.0);
            h = d.ponding_mm;
        }
    }
}

fn planting(groups: usize, window_days: usize) -> PaddyPlanting {
    PaddyPlanting {
        field: PaddyField::default(),
        land_prep: LandPreparation::default(),
        nursery: Some(Nursery {
            area_share: 0.1,
            duration_days: 25,
            kc: 1.1,
            establishment_mm: 150.0,
        }),
        window_days,
        groups,
    }
}

/// With no rain, the land preparation of the whole area is
/// saturation + ponding + Σ(prep Kc·ET₀ + S&P) over its days:
/// 200 + 100 + 30 × (1.05 × 5 + 4) = 577.5 mm, whatever the staggering; the
/// nursery adds 0.1 × (150 + 25 × (1.1 × 5 + 4)) = 38.75 mm. All at once the
/// daily land-preparation peak is 300/30 + 5.25 + 4 = 19.25 mm; six groups at
/// 6-day steps over a 30-day window overlap at most five at a time (peak
/// 5/6 of that); five groups at 30-day steps never overlap (peak 1/5).
#[test]
fn land_preparation_volume_and_staggering() {
    let season = vec![1.1; 100];
    let one = planting(1, 0);
    let six = planting(6, 30);
    let n = six.calendar_days(season.len());
    let et0 = vec![5.0; n];
    let rain = vec![0.0; n];
    let a = paddy_planting_requirement(&et0, &rain, &season, &one).unwrap();
    let b = paddy_planting_requirement(&et0, &rain, &season, &six).unwrap();
    for run in [&a, &b] {
        let lp: f64 = run.iter().map(|d| d.land_prep_mm).sum();
        let nu: f64 = run.iter().map(|d| d.nursery_mm).sum();
        assert!((lp - 577.5).abs() < 1e-9, "{lp}");
        assert!((nu - 38.75).abs() < 1e-9, "{nu}");
        for d in run {
            assert!(
                (d.nir_mm - (d.land_prep_mm + d.nursery_mm + d.field_irrigation_mm)).abs() < 1e-12
            );
            assert!(d.field_share <= 1.0 + 1e-12);
        }
        // Main field: 90 irrigated days × 9.5 mm (ETc 5.5 + S&P 4), the last 10 drained.
        let fi: f64 = run.iter().map(|d| d.field_irrigation_mm).sum();
        assert!((fi - 90.0 * 9.5).abs() < 1e-9, "{fi}");
    }
    let peak =
        |r: &[offtake_core::paddy::PaddyDay]| r.iter().map(|d| d.land_prep_mm).fold(0.0, f64::max);
    assert!((peak(&a) - 19.25).abs() < 1e-9, "{}", peak(&a));
    assert!((peak(&b) - 19.25 * 5.0 / 6.0).abs() < 1e-9, "{}", peak(&b));
    let five = planting(5, 120);
    let n5 = five.calendar_days(season.len());
    let c = paddy_planting_requirement(&vec![5.0; n5], &vec![0.0; n5], &season, &five).unwrap();
    assert!((peak(&c) - 19.25 / 5.0).abs() < 1e-9, "{}", peak(&c));
}

#[test]
fn short_weather_is_an_error() {
    let p = planting(3, 20);
    let e = paddy_planting_requirement(&[5.0; 50], &[0.0; 50], &[1.1; 100], &p);
    assert!(e.is_err());
}
