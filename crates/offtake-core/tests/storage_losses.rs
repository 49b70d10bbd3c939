//! Reservoir losses in the engine: the three open-water methods side by side,
//! the FAO-56 open-water Kc line, and a scenario's temperature change applied
//! to the water surface as well as to the air.
//!
//! Sources: Meyer (1915) and Rohwer (1931) in the SI handbook form of
//! Subramanya (2009) *Engineering Hydrology*, 3rd ed., §3.5 p. 63; Penman
//! (1948) open water as in Shuttleworth (1993), Maidment's *Handbook of
//! Hydrology* ch. 4; FAO-56 (Allen et al. 1998) Table 12, open water < 2 m
//! deep, Kc 1.05, and eq. 56 (ETc = Kc ET0).

#![allow(clippy::unwrap_used, clippy::expect_used)]

use chrono::NaiveDate;
use offtake_core::calendar::{YearStart, year_coverage};
use offtake_core::engine::storage::{OPEN_WATER_METHODS, reservoir_losses};
use offtake_core::engine::weather_prep::PreparedWeather;
use offtake_core::openwater::{
    FAO56_SHALLOW_OPEN_WATER_KC, MeyerWater, OpenWaterInputs, meyer_evaporation_mm_day,
    penman_open_water_mm_day, rohwer_evaporation_mm_day,
};
use offtake_core::project::{OpenWaterMethod, Reservoir};

/// Two calendar years of constant invented weather.
fn weather() -> PreparedWeather {
    let start = NaiveDate::from_ymd_opt(2001, 1, 1).unwrap();
    let n = 730;
    PreparedWeather {
        start,
        et0_mm: vec![5.0; n],
        rain_mm: vec![0.0; n],
        wind_2m_ms: vec![2.0; n],
        rhmin_pct: vec![40.0; n],
        tmean_c: vec![25.0; n],
        ea_kpa: vec![1.5; n],
        rn_open_water_mj: vec![14.0; n],
        wind_ms: vec![2.0; n],
        wind_height_m: vec![2.0; n],
        pressure_kpa: 100.0,
        estimated_days: 0,
        rain_missing_days: 0,
    }
}

fn reservoir(method: OpenWaterMethod) -> Reservoir {
    Reservoir {
        name: "invented".to_owned(),
        surface_area_ha: [100.0; 12],
        water_temperature_c: Some([22.0; 12]),
        method,
    }
}

fn inputs(water_c: f64) -> OpenWaterInputs {
    OpenWaterInputs {
        water_temperature_c: Some(water_c),
        air_temperature_c: 25.0,
        ea_kpa: 1.5,
        wind_ms: 2.0,
        wind_height_m: 2.0,
        pressure_kpa: 100.0,
    }
}

#[test]
fn three_methods_side_by_side_each_from_its_published_formula() {
    let w = weather();
    let years = year_coverage(w.start, w.date(w.days() - 1), YearStart::JANUARY)
        .unwrap()
        .complete;
    assert_eq!(years.len(), 2);
    let st = reservoir_losses(&reservoir(OpenWaterMethod::Penman), &w, &years, 0.0).unwrap();
    assert_eq!(
        st.methods.iter().map(|m| m.method).collect::<Vec<_>>(),
        OPEN_WATER_METHODS.to_vec()
    );
    // Each method's daily depth by its own formula (Subramanya 2009 eq. 3.3 and
    // the Rohwer formula, p. 63; Shuttleworth 1993 Penman), × 365 days.
    let meyer = meyer_evaporation_mm_day(&inputs(22.0), MeyerWater::LargeDeep).unwrap();
    let rohwer = rohwer_evaporation_mm_day(&inputs(22.0)).unwrap();
    let penman = penman_open_water_mm_day(14.0, &inputs(22.0)).unwrap();
    for (m, daily) in st.methods.iter().zip([meyer, penman, rohwer]) {
        assert!(daily > 0.0);
        assert!((m.mean_yearly_mm - 365.0 * daily).abs() < 1e-6, "{m:?}");
        // 1 mm over 1 ha = 10 m³ (FAO-56 Annex 1); 100 ha.
        assert!((m.mean_yearly_m3 - 365.0 * daily * 1000.0).abs() < 1e-3);
        assert!((m.ratio_to_et0 - daily / 5.0).abs() < 1e-9);
    }
    // The reservoir's method gives the scheme's losses.
    assert_eq!(st.method, OpenWaterMethod::Penman);
    assert!((st.mean_yearly_m3 - st.methods[1].mean_yearly_m3).abs() < 1e-6);
    // The plausibility line: FAO-56 Table 12 open water < 2 m deep, Kc 1.05,
    // eq. 56: 1.05 × 5 mm/day × 365 days = 1,916.25 mm/year.
    assert!((FAO56_SHALLOW_OPEN_WATER_KC - 1.05).abs() < 1e-12);
    assert!((st.kc_line_mean_yearly_mm - 1916.25).abs() < 1e-9);
    assert!((st.kc_line_mean_yearly_m3 - 1916.25 * 1000.0).abs() < 1e-6);
    assert!((st.et0_mean_yearly_mm - 1825.0).abs() < 1e-9);
    // The spread is the smallest and largest of the three.
    let (lo, hi) = st.spread_m3();
    let all: Vec<f64> = st.methods.iter().map(|m| m.mean_yearly_m3).collect();
    assert!((lo - all.iter().copied().fold(f64::INFINITY, f64::min)).abs() < 1e-9);
    assert!((hi - all.iter().copied().fold(0.0, f64::max)).abs() < 1e-9);
    assert!((st.spread_pct_of_used() - 100.0 * (hi - lo) / st.mean_yearly_m3).abs() < 1e-9);
}

#[test]
fn a_warmer_scenario_warms_the_water_surface_and_raises_evaporation() {
    let w = weather();
    let years = year_coverage(w.start, w.date(w.days() - 1), YearStart::JANUARY)
        .unwrap()
        .complete;
    for method in [OpenWaterMethod::Meyer, OpenWaterMethod::Rohwer] {
        let base = reservoir_losses(&reservoir(method), &w, &years, 0.0).unwrap();
        let warm = reservoir_losses(&reservoir(method), &w, &years, 1.5).unwrap();
        assert!(warm.mean_yearly_m3 > base.mean_yearly_m3, "{method:?}");
        assert!((warm.water_temperature_shift_c - 1.5).abs() < 1e-12);
        // The shifted surface temperature is 22 + 1.5 °C.
        let daily = match method {
            OpenWaterMethod::Meyer => {
                meyer_evaporation_mm_day(&inputs(23.5), MeyerWater::LargeDeep).unwrap()
            }
            _ => rohwer_evaporation_mm_day(&inputs(23.5)).unwrap(),
        };
        assert!((warm.mean_yearly_mm_of(method) - 365.0 * daily).abs() < 1e-6);
    }
}

trait ByMethod {
    fn mean_yearly_mm_of(&self, m: OpenWaterMethod) -> f64;
}

impl ByMethod for offtake_core::engine::StorageLosses {
    fn mean_yearly_mm_of(&self, m: OpenWaterMethod) -> f64 {
        self.methods
            .iter()
            .find(|x| x.method == m)
            .map(|x| x.mean_yearly_mm)
            .unwrap()
    }
}
