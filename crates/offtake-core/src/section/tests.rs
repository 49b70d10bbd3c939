#![allow(clippy::unwrap_used, clippy::float_cmp)]

use proptest::prelude::*;

use super::design::{
    DesignRequest, ExistingSection, Method, Width, check_existing, design_section, propose,
};
use super::freeboard::{CFS_TO_M3S, usbr_coefficient_c, usbr_freeboard_m};
use super::geometry::{Prism, Shape};
use super::manning::{MANNING_K_SI, manning_discharge_m3s, normal_depth_m};
use super::roughness::{Lining, MANNING_N_TABLE};
use super::seepage::{SEEPAGE_TOLERANCE, inflow_with_seepage, seepage_loss_m3s};
use super::{FT_TO_M, SectionError};

fn request(flow: f64, slope: f64, n: f64, shape: Shape, z: f64, ratio: f64) -> DesignRequest {
    DesignRequest {
        flow_m3s: flow,
        bed_slope: slope,
        manning_n: n,
        shape,
        side_slope_h_per_v: z,
        width: Width::Ratio(ratio),
        freeboard_m: None,
        lining: Some(Lining::EarthFirmLoam),
        colloidal_silt: false,
        min_velocity_ms: 0.0,
        method: Method::Manning,
    }
}

fn shape_strategy() -> impl Strategy<Value = Shape> {
    prop_oneof![
        Just(Shape::Trapezoidal),
        Just(Shape::Rectangular),
        Just(Shape::Triangular)
    ]
}

proptest! {
    /// The section returned carries the flow by Manning within 0.1 %, and
    /// its velocity is Q / A.
    #[test]
    fn section_carries_its_flow(
        flow in 0.001_f64..500.0,
        slope in 1e-5_f64..0.05,
        n in 0.010_f64..0.080,
        shape in shape_strategy(),
        z in 0.25_f64..4.0,
        ratio in 0.5_f64..20.0,
        by_ratio in any::<bool>(),
    ) {
        let mut req = request(flow, slope, n, shape, z, ratio);
        if !by_ratio {
            req.width = Width::BedWidthM(ratio * 0.5);
        }
        let s = design_section(&req).unwrap();
        let q = manning_discharge_m3s(&s.prism, s.water_depth_m, slope, n, MANNING_K_SI);
        prop_assert!((q - flow).abs() <= 1e-3 * flow, "carries {q} for {flow}");
        prop_assert!((s.velocity_ms - flow / s.area_m2).abs() <= 1e-12 * s.velocity_ms);
        prop_assert!(s.water_depth_m > 0.0 && s.water_depth_m.is_finite());
        prop_assert!(s.freeboard_m > 0.0);
    }

    /// A wider bed-width-to-depth ratio gives a shallower section.
    #[test]
    fn wider_ratio_is_shallower(
        flow in 0.001_f64..500.0,
        slope in 1e-5_f64..0.05,
        n in 0.010_f64..0.080,
        z in 0.0_f64..4.0,
        ratio in 0.5_f64..20.0,
        factor in 1.01_f64..3.0,
    ) {
        let a = design_section(&request(flow, slope, n, Shape::Trapezoidal, z, ratio)).unwrap();
        let b = design_section(&request(flow, slope, n, Shape::Trapezoidal, z, ratio * factor)).unwrap();
        prop_assert!(b.water_depth_m < a.water_depth_m);
    }

    /// An existing section's capacity at full supply, fed back as a flow,
    /// runs at the full-supply depth.
    #[test]
    fn existing_capacity_round_trip(
        b in 0.2_f64..20.0, z in 0.0_f64..3.0, y in 0.1_f64..5.0,
        n in 0.010_f64..0.050, slope in 1e-5_f64..0.01,
    ) {
        let e = ExistingSection {
            prism: Prism::new(Shape::Trapezoidal, b, z),
            full_supply_depth_m: y,
            bank_height_m: None,
            manning_n: n,
            bed_slope: slope,
        };
        let q = e.capacity_m3s().unwrap();
        let back = normal_depth_m(&e.prism, q, slope, n, MANNING_K_SI).unwrap();
        prop_assert!((back - y).abs() <= 1e-6 * y);
    }

    /// The seepage iteration settles on an inflow that satisfies
    /// Q_in = Q_out + loss(P(Q_in)) to 0.1 %.
    #[test]
    fn seepage_solution_balances(
        out in 0.01_f64..20.0, rate in 0.0_f64..0.5, length in 0.0_f64..20_000.0,
    ) {
        let prism = Prism::new(Shape::Trapezoidal, 1.0, 1.5);
        let s = inflow_with_seepage(&prism, 0.022, 0.0003, out, rate, length).unwrap();
        let y = normal_depth_m(&prism, s.inflow_m3s, 0.0003, 0.022, MANNING_K_SI).unwrap();
        let loss = seepage_loss_m3s(rate, prism.wetted_perimeter_m(y), length);
        prop_assert!((out + loss - s.inflow_m3s).abs() <= 2.0 * SEEPAGE_TOLERANCE * s.inflow_m3s);
        prop_assert!(s.efficiency > 0.0 && s.efficiency <= 1.0);
    }
}

/// A triangle has a closed-form normal depth: Q = (1/n) √S (z y²)^(5/3) /
/// (2 y √(1+z²))^(2/3), so y = [Q n (2√(1+z²))^(2/3) / (√S z^(5/3))]^(3/8).
#[test]
fn triangle_matches_closed_form() {
    let (q, n, s, z) = (0.35_f64, 0.015_f64, 0.002_f64, 1.5_f64);
    let closed = (q * n * (2.0 * (1.0 + z * z).sqrt()).powf(2.0 / 3.0)
        / (s.sqrt() * z.powf(5.0 / 3.0)))
    .powf(3.0 / 8.0);
    let prism = Prism::new(Shape::Triangular, 0.0, z);
    let y = normal_depth_m(&prism, q, s, n, MANNING_K_SI).unwrap();
    assert!((y - closed).abs() < 1e-8, "{y} {closed}");
}

/// USBR freeboard: F = √(C y) in feet equals √(0.3048 C y) in metres. For
/// y = 1 m (3.2808 ft) and C = 1.5: F_ft = √(1.5 × 3.2808) = 2.2184 ft =
/// 0.6762 m (arithmetic).
#[test]
fn usbr_freeboard_in_metres_is_the_feet_rule_converted() {
    let small = 10.0 * CFS_TO_M3S;
    assert_eq!(usbr_coefficient_c(small), 1.5);
    assert_eq!(usbr_coefficient_c(5000.0 * CFS_TO_M3S), 2.5);
    let y_m = 1.0;
    let f_ft = (1.5 * y_m / FT_TO_M).sqrt();
    assert!((usbr_freeboard_m(y_m, small) - f_ft * FT_TO_M).abs() < 1e-12);
    assert!((usbr_freeboard_m(y_m, small) - 0.6762).abs() < 5e-5);
    assert!((usbr_coefficient_c(1510.0 * CFS_TO_M3S) - 2.0).abs() < 1e-9);
}

#[test]
fn impossible_input_is_an_error_not_a_panic() {
    for (flow, slope, n) in [
        (0.0, 0.001, 0.02),
        (1.0, 0.0, 0.02),
        (1.0, -0.001, 0.02),
        (1.0, 0.001, 0.0),
        (f64::NAN, 0.001, 0.02),
        (1.0, f64::INFINITY, 0.02),
    ] {
        let e = design_section(&request(flow, slope, n, Shape::Trapezoidal, 1.5, 2.0));
        assert!(matches!(e, Err(SectionError::NotPositive { .. })), "{e:?}");
    }
    let rect0 = request(1.0, 0.001, 0.02, Shape::Rectangular, 0.0, 0.0);
    assert!(matches!(
        design_section(&rect0),
        Err(SectionError::Degenerate { .. })
    ));
}

#[test]
fn extreme_but_valid_flows_compute() {
    for flow in [1e-300, 1e-9, 1e3, 1e5] {
        let s = design_section(&request(flow, 0.001, 0.02, Shape::Trapezoidal, 1.5, 2.0)).unwrap();
        assert!(
            s.water_depth_m.is_finite() && s.water_depth_m > 0.0,
            "{flow}"
        );
    }
    // 1e9 m³/s needs a section far beyond 10 000 m for a given narrow bed.
    let mut r = request(1e12, 0.001, 0.02, Shape::Rectangular, 0.0, 2.0);
    r.width = Width::BedWidthM(1.0);
    assert!(matches!(
        design_section(&r),
        Err(SectionError::NoNormalDepth { .. })
    ));
}

/// A fast earth canal fails the Fortier–Scobey limit, and the proposal is a
/// passing section (wider, flatter or lined).
#[test]
fn failed_check_proposes_a_passing_section() {
    let req = request(2.0, 0.001, 0.020, Shape::Trapezoidal, 1.5, 1.0);
    let s = design_section(&req).unwrap();
    assert!(!s.passes(), "{s:?}");
    assert!(s.failed_text().contains("max_velocity"));
    let p = propose(&req, &s).unwrap();
    assert!(p.section.passes(), "{:?}", p.section.checks);
    assert!(!p.change.is_empty());
    assert!((p.section.flow_m3s - 2.0).abs() < 1e-12);
}

#[test]
fn existing_section_checks_capacity_and_freeboard() {
    let e = ExistingSection {
        prism: Prism::new(Shape::Trapezoidal, 1.0, 1.5),
        full_supply_depth_m: 0.8,
        bank_height_m: Some(1.1),
        manning_n: 0.025,
        bed_slope: 0.0003,
    };
    let cap = e.capacity_m3s().unwrap();
    let ok = check_existing(&e, 0.5 * cap, Some(Lining::EarthFirmLoam), false, 0.0).unwrap();
    assert!(
        ok.checks
            .iter()
            .any(|c| c.kind == super::CheckKind::Capacity && c.pass)
    );
    let over = check_existing(&e, 1.5 * cap, Some(Lining::EarthFirmLoam), false, 0.0).unwrap();
    assert!(over.failed_text().contains("capacity"));
    assert!(over.water_depth_m > 0.8);
}

#[test]
fn every_table_row_is_ordered() {
    for r in MANNING_N_TABLE {
        assert!(r.n_min <= r.n_normal && r.n_normal <= r.n_max, "{}", r.id);
    }
    for l in super::LININGS {
        assert_eq!(Lining::parse(l.id()), Some(l));
        assert!(l.manning_n() > 0.0);
    }
}

/// The regime method returns the regime slope and compares the ground slope.
#[test]
fn regime_method_reports_slope() {
    let mut req = request(50.0, 0.0005, 0.02, Shape::Trapezoidal, 0.5, 2.0);
    req.method = Method::LaceyRegime { silt_factor: 1.1 };
    let s = design_section(&req).unwrap();
    assert!((s.bed_slope - super::lacey::regime_slope(50.0, 1.1)).abs() < 1e-15);
    assert_eq!(s.ground_slope, Some(0.0005));
    assert!(s.failed_text().contains("regime_slope"));
}
