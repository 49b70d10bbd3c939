//! Open-water evaporation: Meyer (1915) and Rohwer (1931) in the handbook form
//! of Subramanya (2009) *Engineering Hydrology* §3.5 p. 63, the 1/7 power law,
//! and Penman open water (Shuttleworth 1993). The e_w table is checked in
//! `fao56_reference.rs` from `tests/reference/fao56_single_checks.ron`.
//! No published worked example of Meyer, Rohwer or Penman open water was
//! available in the reference file; the checks below evaluate the published
//! formulas at inputs chosen so that the arithmetic is exact (computed from the
//! published formula), plus the documented fallbacks and errors.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use offtake_core::openwater::{
    MeyerWater, OpenWaterError, OpenWaterInputs, meyer_evaporation_handbook_mm_day,
    meyer_evaporation_mm_day, penman_open_water_mm_day, rohwer_evaporation_handbook_mm_day,
    rohwer_evaporation_mm_day, wind_power_law,
};

/// Subramanya (2009) eq. 3.3 with e_w − e_a = 10 mm Hg and u9 = 16 km/h:
/// E = K_M · 10 · (1 + 16/16) = 20 K_M → 7.2 (large deep) and 10.0 (small shallow) mm/day.
#[test]
fn meyer_handbook_form() {
    let e = meyer_evaporation_handbook_mm_day(20.0, 10.0, 16.0, MeyerWater::LargeDeep);
    assert!((e - 7.2).abs() < 1e-12);
    let e = meyer_evaporation_handbook_mm_day(20.0, 10.0, 16.0, MeyerWater::SmallShallow);
    assert!((e - 10.0).abs() < 1e-12);
}

/// Subramanya (2009) eq. 3.4 with p_a = 1000 mm Hg, u0 = 0, e_w − e_a = 10:
/// E = 0.771 (1.465 − 0.732)(0.44)(10) = 2.48662 mm/day (computed from the published formula).
#[test]
fn rohwer_handbook_form() {
    let e = rohwer_evaporation_handbook_mm_day(1000.0, 0.0, 20.0, 10.0);
    assert!((e - 0.771 * 0.733 * 0.44 * 10.0).abs() < 1e-12);
    assert!((e - 2.486_62).abs() < 1e-5);
}

/// Reference file §8: u9 = u1 × 9^(1/7) by the 1/7 power law.
#[test]
fn power_law_wind_height() {
    let u9 = wind_power_law(1.0, 1.0, 9.0).unwrap();
    assert!((u9 - 9f64.powf(1.0 / 7.0)).abs() < 1e-12);
    assert!((u9 - 1.368_7).abs() < 1e-4);
    assert!(matches!(
        wind_power_law(1.0, 0.0, 9.0),
        Err(OpenWaterError::NonPositiveHeight { .. })
    ));
}

fn inputs() -> OpenWaterInputs {
    OpenWaterInputs {
        water_temperature_c: Some(22.0),
        air_temperature_c: 25.0,
        ea_kpa: 1.5,
        wind_ms: 3.0,
        wind_height_m: 2.0,
        pressure_kpa: 100.0,
    }
}

#[test]
fn si_forms_use_water_temperature_with_air_fallback() {
    let with = inputs();
    let without = OpenWaterInputs {
        water_temperature_c: None,
        ..with
    };
    let as_air = OpenWaterInputs {
        water_temperature_c: Some(25.0),
        ..with
    };
    let m = |i: &OpenWaterInputs| meyer_evaporation_mm_day(i, MeyerWater::LargeDeep).unwrap();
    assert!((m(&without) - m(&as_air)).abs() < 1e-12);
    // Cooler water than air lowers e_w and so the evaporation.
    assert!(m(&with) < m(&without));
    let r = rohwer_evaporation_mm_day(&with).unwrap();
    assert!(r.is_finite() && r > 0.0);
}

#[test]
fn condensation_gives_negative_mass_transfer() {
    let wet = OpenWaterInputs {
        ea_kpa: 4.0,
        ..inputs()
    };
    assert!(meyer_evaporation_mm_day(&wet, MeyerWater::LargeDeep).unwrap() < 0.0);
}

#[test]
fn penman_open_water_terms() {
    // With no vapour pressure deficit and no wind, E = Δ/(Δ+γ) Rn/λ.
    let calm_saturated = OpenWaterInputs {
        ea_kpa: offtake_core::et0::atmosphere::saturation_vapour_pressure_kpa(25.0),
        wind_ms: 0.0,
        ..inputs()
    };
    let e = penman_open_water_mm_day(10.0, &calm_saturated).unwrap();
    let delta = offtake_core::et0::atmosphere::saturation_slope_kpa_c(25.0);
    let gamma = offtake_core::et0::atmosphere::psychrometric_constant_kpa_c(100.0);
    let lambda = 2.501 - 0.002_361 * 25.0;
    assert!((e - delta / (delta + gamma) * 10.0 / lambda).abs() < 1e-12);
}

#[test]
fn bad_inputs_are_typed_errors() {
    let bad = OpenWaterInputs {
        wind_ms: -1.0,
        ..inputs()
    };
    assert!(matches!(
        meyer_evaporation_mm_day(&bad, MeyerWater::LargeDeep),
        Err(OpenWaterError::Negative {
            quantity: "wind_ms",
            ..
        })
    ));
    let nan = OpenWaterInputs {
        air_temperature_c: f64::NAN,
        ..inputs()
    };
    assert!(matches!(
        penman_open_water_mm_day(10.0, &nan),
        Err(OpenWaterError::NotFinite { .. })
    ));
}
