//! `offtake section`: key=value output, regime slope verdict, and clear
//! errors for impossible input.
#![allow(clippy::unwrap_used)]

use std::process::{Command, Output};

fn offtake(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
        .arg("section")
        .args(args)
        .output()
        .unwrap()
}

fn value(stdout: &str, key: &str) -> f64 {
    stdout
        .lines()
        .find_map(|l| l.strip_prefix(&format!("{key}=")))
        .unwrap_or_else(|| panic!("no {key} in\n{stdout}"))
        .parse()
        .unwrap()
}

/// The rivr normal_depth() documentation example 2 (trapezoid 3H:2V, b =
/// 6.1 m, n = 0.013, S = 0.0008, Q = 126 m³/s; printed 3.2864 m) through
/// the command line.
#[test]
fn prints_normal_depth_as_key_value() {
    let out = offtake(&[
        "--flow-m3s",
        "126",
        "--slope",
        "0.0008",
        "--n",
        "0.013",
        "--side-slope",
        "1.5",
        "--bed-width",
        "6.1",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let s = String::from_utf8(out.stdout).unwrap();
    assert!((value(&s, "water_depth_m") - 3.2864).abs() <= 0.000_05);
    let a = value(&s, "area_m2");
    assert!((value(&s, "velocity_ms") - 126.0 / a).abs() < 1e-3);
    assert!(s.contains("caution="));
}

#[test]
fn regime_prints_slope_and_verdict() {
    let out = offtake(&[
        "--flow-m3s",
        "50",
        "--slope",
        "0.0005",
        "--method",
        "regime",
        "--silt-factor",
        "1.1",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let s = String::from_utf8(out.stdout).unwrap();
    let regime = value(&s, "regime_slope");
    assert!((regime - 1.0 / 5469.2).abs() < 1e-7, "{regime}");
    assert!(s.contains("slope_verdict=the ground is steeper"), "{s}");
}

#[test]
fn impossible_input_exits_non_zero_with_reason() {
    for (args, reason) in [
        (
            vec!["--flow-m3s", "1", "--slope", "0", "--n", "0.02"],
            "bed slope",
        ),
        (
            vec!["--flow-m3s", "1", "--slope", "-0.001", "--n", "0.02"],
            "bed slope",
        ),
        (
            vec!["--flow-m3s", "1", "--slope", "0.001", "--n", "0"],
            "Manning n",
        ),
        (
            vec!["--flow-m3s", "0", "--slope", "0.001", "--n", "0.02"],
            "flow",
        ),
        (vec!["--flow-m3s", "1", "--slope", "0.001"], "--n"),
        (
            vec!["--flow-m3s", "1", "--slope", "0.001", "--method", "regime"],
            "--silt-factor",
        ),
        (
            vec![
                "--flow-m3s",
                "1",
                "--slope",
                "0.001",
                "--n",
                "0.02",
                "--lining",
                "marble",
            ],
            "lining",
        ),
    ] {
        let out = offtake(&args);
        assert!(!out.status.success(), "{args:?}");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains(reason), "{args:?}: {err}");
    }
}

/// On the demo scheme every canal has a section, and each carries its
/// required capacity by Manning within 0.1 % at the printed depth (the
/// printed decimals allow a little more: depths to 1 mm).
#[test]
fn every_demo_canal_has_a_section_that_carries_its_capacity() {
    use offtake_core::section::geometry::{Prism, Shape};
    use offtake_core::section::manning::{MANNING_K_SI, manning_discharge_m3s};
    let dir = tempfile::tempdir().unwrap();
    let project = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    );
    let out = Command::new(env!("CARGO_BIN_EXE_offtake"))
        .args(["run", project, "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let csv = std::fs::read_to_string(dir.path().join("canal_sections.csv")).unwrap();
    let mut lines = csv.lines();
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    assert_eq!(
        header[..18].join(","),
        "node,basis,required_capacity_ls,shape,bed_width_m,water_depth_m,side_slope_h_per_v,freeboard_m,top_width_m,area_m2,wetted_perimeter_m,hydraulic_radius_m,velocity_ms,froude,manning_n,bed_slope,seepage_ls,checks"
    );
    let col = |name: &str| header.iter().position(|h| *h == name).unwrap();
    let mut rows = 0;
    for line in lines {
        let f: Vec<&str> = line.split(',').collect();
        let num = |name: &str| f[col(name)].parse::<f64>().unwrap();
        assert!(
            f[col("basis")] == "designed" || f[col("basis")] == "existing section",
            "{line}"
        );
        let prism = Prism::new(
            Shape::parse(f[col("shape")]).unwrap(),
            num("bed_width_m"),
            num("side_slope_h_per_v"),
        );
        let y = num("water_depth_m");
        let q = |y: f64| {
            manning_discharge_m3s(&prism, y, num("bed_slope"), num("manning_n"), MANNING_K_SI)
                * 1000.0
        };
        let req = num("required_capacity_ls");
        assert!(
            q(y - 0.0005) <= req * 1.001 && q(y + 0.0005) >= req * 0.999,
            "{line}"
        );
        rows += 1;
    }
    assert_eq!(rows, 5);
}
