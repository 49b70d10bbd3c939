//! Kc ini from the wetting interval against FAO-56 Examples 24–26 and Box 15
//! (data in tests/reference/fao56-kc-ini.ron), within ±0.05 as the brief asks
//! (the published values are readings of the graphs of Figures 29 and 30).
#![allow(clippy::unwrap_used)]

use offtake_core::crop::kc_ini::{
    WettingSoil, kc_ini_figure29, kc_ini_figure30, kc_ini_full_wetting, kc_ini_partial_wetting,
};
use serde::Deserialize;

#[derive(Deserialize, Debug)]
enum Method {
    Figure29,
    Figure30,
    Eq59,
    Eq60,
}

#[derive(Deserialize)]
struct Case {
    source: String,
    tw_days: f64,
    et0_mm_day: f64,
    infiltrated_mm: f64,
    fraction_wetted: f64,
    soil: WettingSoil,
    method: Method,
    expected: f64,
    tolerance: f64,
}

#[test]
fn published_kc_ini_readings() {
    let text = include_str!(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/reference/fao56-kc-ini.ron"
    ));
    let cases: Vec<Case> = ron::from_str(text).unwrap();
    assert_eq!(cases.len(), 8);
    for c in cases {
        let got = match c.method {
            Method::Figure29 => kc_ini_figure29(c.tw_days, c.et0_mm_day),
            Method::Figure30 => kc_ini_figure30(c.tw_days, c.et0_mm_day, c.soil),
            Method::Eq59 => kc_ini_full_wetting(c.tw_days, c.et0_mm_day, c.infiltrated_mm, c.soil),
            Method::Eq60 => kc_ini_partial_wetting(
                c.tw_days,
                c.et0_mm_day,
                c.infiltrated_mm,
                c.fraction_wetted,
                c.soil,
            ),
        }
        .unwrap();
        assert!(
            (got - c.expected).abs() <= c.tolerance,
            "{}: {got:.3} vs {}",
            c.source,
            c.expected
        );
    }
}

/// FAO-56 Example 24 also gives ETc = Kc ini × ETo = 3.4 mm/day (ETo 4).
#[test]
fn example_24_etc() {
    let etc = kc_ini_figure29(2.0, 4.0).unwrap() * 4.0;
    assert!((etc - 3.4).abs() <= 0.2, "{etc}");
}

/// FAO-56 Example 25 gives ETc = 3.0 mm/day (ETo 5) and Example 26 gives
/// ETc = 1.7 mm/day (ETo 4) from the Kc ini values.
#[test]
fn example_25_and_26_etc() {
    let k25 = kc_ini_full_wetting(3.5, 5.0, 20.0, WettingSoil::Coarse).unwrap();
    assert!((k25 * 5.0 - 3.0).abs() <= 0.25, "{}", k25 * 5.0);
    let k26 = kc_ini_partial_wetting(2.0, 4.0, 12.0, 0.4, WettingSoil::MediumFine).unwrap();
    assert!((k26 * 4.0 - 1.7).abs() <= 0.2, "{}", k26 * 4.0);
}

/// FAO-56 Table 14 (Chapter 6), as read in the shared reference file §3.2.
#[test]
fn rice_table_14() {
    use offtake_core::crop::kc_ini::{RiceHumidityClass as H, RiceWindClass as W, rice_kc_ini};
    assert!((rice_kc_ini(H::AridSemiArid, W::Strong) - 1.20).abs() < 1e-12);
    assert!((rice_kc_ini(H::SubhumidHumid, W::Moderate) - 1.10).abs() < 1e-12);
    assert!((rice_kc_ini(H::VeryHumid, W::Light) - 1.00).abs() < 1e-12);
}
