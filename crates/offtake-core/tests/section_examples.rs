//! Canal sections against published worked examples and a reference
//! library. The cases and their sources are in
//! tests/reference/canal_normal_depth.csv; the Lacey case is below with its
//! source beside it.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use offtake_core::section::geometry::{Prism, Shape};
use offtake_core::section::lacey;
use offtake_core::section::manning::normal_depth_m;

const CASES: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../tests/reference/canal_normal_depth.csv"
));

#[test]
fn normal_depth_reproduces_published_cases() {
    let mut lines = CASES
        .lines()
        .filter(|l| !l.trim().is_empty() && !l.starts_with('#'));
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    let col = |name: &str| header.iter().position(|h| *h == name).unwrap();
    let mut n_cases = 0;
    for line in lines {
        let f: Vec<&str> = line.split(',').collect();
        let num = |name: &str| f[col(name)].parse::<f64>().unwrap();
        let shape = Shape::parse(f[col("shape")]).unwrap();
        let prism = Prism::new(shape, num("bed_width"), num("side_slope_h_per_v"));
        let y = normal_depth_m(
            &prism,
            num("flow"),
            num("bed_slope"),
            num("manning_n"),
            num("k"),
        )
        .unwrap();
        let expected = num("normal_depth");
        assert!(
            (y - expected).abs() <= num("tolerance"),
            "{}: normal depth {y} against printed {expected} ({})",
            f[col("case")],
            f[col("source")]
        );
        n_cases += 1;
    }
    assert_eq!(n_cases, 3);
}

/// Regime channel for 50 m³/s with silt factor 1.1, worked step by step in
/// the solution published at ques10.com ("Design a regime channel for
/// discharge of 50 cumec", question 23218), which applies Lacey's (1930)
/// relations in metric form: V = 0.8695 m/s, A = 57.50 m², P = 33.5876 m,
/// R = 1.7183 m, S = 1/5420. Tolerance: half a unit of each printed last
/// decimal. The printed slope 1/5420 is not reproduced at full precision
/// (the formula gives 1/5469, 0.9 % flatter; the worked solution rounded an
/// intermediate it does not print), so the slope is held to 1 % and that is
/// said here rather than hidden.
#[test]
fn lacey_regime_example_step_by_step() {
    let q = 50.0;
    let f = 1.1;
    let v = lacey::regime_velocity_ms(q, f);
    assert!((v - 0.8695).abs() <= 0.000_05, "V {v}");
    let a = q / v;
    assert!((a - 57.50).abs() <= 0.005, "A {a}");
    let p = lacey::regime_wetted_perimeter_m(q);
    assert!((p - 33.5876).abs() <= 0.000_05, "P {p}");
    let r = lacey::regime_hydraulic_radius_m(v, f);
    assert!((r - 1.7183).abs() <= 0.000_05, "R {r}");
    let s = lacey::regime_slope(q, f);
    assert!((s * 5420.0 - 1.0).abs() <= 0.01, "S 1/{}", 1.0 / s);
    // The section: a ½:1 trapezoid with that area and perimeter (the depth
    // from c y² − P y + A = 0, c = 2√1.25 − 0.5, the form the regime method
    // uses). Its area and perimeter must give back A and P.
    let sec = lacey::regime_section(q, f).unwrap();
    let prism = Prism::new(Shape::Trapezoidal, sec.bed_width_m, 0.5);
    assert!((prism.area_m2(sec.depth_m) - a).abs() < 1e-9);
    assert!((prism.wetted_perimeter_m(sec.depth_m) - p).abs() < 1e-9);
}

/// Silt factor f = 1.76 √d: for d = 0.25 mm, f = 0.88 (Lacey 1930; the
/// arithmetic is exact).
#[test]
fn lacey_silt_factor() {
    assert!((lacey::silt_factor(0.25) - 0.88).abs() < 1e-12);
}
