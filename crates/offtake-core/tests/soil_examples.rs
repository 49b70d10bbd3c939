//! TAW and RAW against FAO-56 Examples 36 and 37
//! (data in tests/reference/fao56-soil-water.ron).
#![allow(clippy::unwrap_used)]

use offtake_core::soil::{readily_available_water_mm, total_available_water_mm};
use serde::Deserialize;

/// (crop, Zr m, p, printed (TAW, RAW) per soil).
type CropRow = (String, f64, f64, Vec<(f64, f64)>);

#[derive(Deserialize)]
struct Ex36 {
    source: String,
    soils: Vec<(String, f64, f64)>,
    crops: Vec<CropRow>,
    tolerance: f64,
}

#[derive(Deserialize)]
struct Ex37 {
    source: String,
    theta_fc: f64,
    theta_wp: f64,
    root_depth_m: f64,
    p: f64,
    taw_mm: f64,
    raw_mm: f64,
    tolerance: f64,
}

#[derive(Deserialize)]
struct Cases {
    example36: Ex36,
    example37: Ex37,
}

fn cases() -> Cases {
    let text = include_str!(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/reference/fao56-soil-water.ron"
    ));
    ron::from_str(text).unwrap()
}

#[test]
fn example_36_taw_raw() {
    let ex = cases().example36;
    let mut checked = 0;
    for (crop, zr, p, values) in &ex.crops {
        for ((soil, fc, wp), (taw_pub, raw_pub)) in ex.soils.iter().zip(values) {
            let taw = total_available_water_mm(*fc, *wp, *zr).unwrap();
            let raw = readily_available_water_mm(taw, *p).unwrap();
            assert!(
                (taw - taw_pub).abs() <= ex.tolerance,
                "{}: {crop} on {soil}: TAW {taw}",
                ex.source
            );
            assert!(
                (raw - raw_pub).abs() <= ex.tolerance,
                "{}: {crop} on {soil}: RAW {raw}",
                ex.source
            );
            checked += 1;
        }
    }
    assert_eq!(checked, 9);
}

#[test]
fn example_37_taw_raw() {
    let ex = cases().example37;
    let taw = total_available_water_mm(ex.theta_fc, ex.theta_wp, ex.root_depth_m).unwrap();
    let raw = readily_available_water_mm(taw, ex.p).unwrap();
    assert!(
        (taw - ex.taw_mm).abs() <= ex.tolerance,
        "{}: {taw}",
        ex.source
    );
    assert!(
        (raw - ex.raw_mm).abs() <= ex.tolerance,
        "{}: {raw}",
        ex.source
    );
}
