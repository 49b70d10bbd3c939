//! Property tests of physical bounds (proptest). Each states its input domain.
//! Only bounds that hold by construction of the published equations are
//! asserted; no monotonicity that the physics does not guarantee.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use chrono::NaiveDate;
use offtake_core::et0::{
    Et0Context, Et0Method, Et0Options, asce, atmosphere as atm, radiation as rad, wind,
};
use offtake_core::openwater;
use offtake_core::units;
use offtake_core::weather::{StationSite, WeatherDay};
use proptest::prelude::*;

fn method() -> impl Strategy<Value = Et0Method> {
    prop::sample::select(Et0Method::ALL.to_vec())
}

proptest! {
    /// Domain: latitude −90..=90°, elevation −400..5000 m, wind height 0.5..100 m,
    /// any day of 2024 (leap), Tmin −40..45 °C, range 0..30 °C, RHmax/RHmin 0..100 %
    /// (each possibly missing), wind 0..20 m/s, sunshine 0..=N, all four methods.
    /// ET₀ is computed and finite.
    #[test]
    fn et0_is_finite(
        lat in -90.0f64..=90.0,
        z in -400.0f64..5000.0,
        zw in 0.5f64..=100.0,
        doy in 0u32..366,
        tmin in -40.0f64..45.0,
        range in 0.0f64..30.0,
        rhmax in prop::option::of(0.0f64..=100.0),
        rhmin in prop::option::of(0.0f64..=100.0),
        wind_ms in prop::option::of(0.0f64..20.0),
        sun_frac in prop::option::of(0.0f64..=1.0),
        m in method(),
    ) {
        let site = StationSite { latitude_deg: lat, elevation_m: z, wind_height_m: zw };
        let ctx = Et0Context::new(&site, &Et0Options { method: m, ..Et0Options::default() }).unwrap();
        let date = NaiveDate::from_yo_opt(2024, doy + 1).unwrap();
        let mut d = WeatherDay::empty(date);
        d.tmin_c = Some(tmin);
        d.tmax_c = Some(tmin + range);
        d.rhmax_pct = rhmax;
        d.rhmin_pct = rhmin;
        d.wind_ms = wind_ms;
        d.sunshine_h = sun_frac.map(|f| f * ctx.sun(doy + 1).daylight_h);
        let r = ctx.day(&d);
        let et0 = r.et0_mm.expect("computable day");
        prop_assert!(et0.is_finite());
        prop_assert!(et0 >= 0.0, "clipped by default");
    }

    /// Domain: Tmin −40..50 °C, Tmax = Tmin + 0..30 °C, RH 0..=100 %.
    /// ea from eqs. 17, 18, 19 never exceeds es (eq. 12) nor goes below 0.
    #[test]
    fn ea_from_rh_not_above_es(
        tmin in -40.0f64..50.0,
        range in 0.0f64..30.0,
        rhmax in 0.0f64..=100.0,
        rhmin in 0.0f64..=100.0,
        rhmean in 0.0f64..=100.0,
    ) {
        let tmax = tmin + range;
        let es = atm::mean_saturation_vapour_pressure_kpa(tmax, tmin);
        let eps = 1e-12 * es;
        for ea in [
            atm::actual_vapour_pressure_from_rh_max_min_kpa(tmax, tmin, rhmax, rhmin),
            atm::actual_vapour_pressure_from_rh_max_kpa(tmin, rhmax),
            atm::actual_vapour_pressure_from_rh_mean_kpa(tmax, tmin, rhmean),
        ] {
            prop_assert!((0.0..=es + eps).contains(&ea), "ea {ea} es {es}");
        }
    }

    /// Domain: latitude −90..=90°, J 1..=366. 0 ≤ N ≤ 24 h and Ra ≥ 0, finite.
    #[test]
    fn daylight_and_ra_bounds(lat in -90.0f64..=90.0, j in 1u32..=366) {
        let phi = lat.to_radians();
        let ws = rad::sunset_hour_angle_rad(phi, rad::solar_declination_rad(j));
        let n = rad::daylight_hours(ws);
        prop_assert!((0.0..=24.0).contains(&n), "N = {n}");
        let ra = rad::extraterrestrial_radiation_mj(phi, j);
        prop_assert!(ra.is_finite() && ra >= 0.0, "Ra = {ra}");
    }

    /// Domain: latitude −90..=90°, J 1..=366, period midpoint 0..24 h, length 0.25..=1 h,
    /// any longitudes. Hourly Ra (eq. 28) is finite and ≥ 0.
    #[test]
    fn hourly_ra_not_negative(
        lat in -90.0f64..=90.0, j in 1u32..=366, t in 0.0f64..24.0, tl in 0.25f64..=1.0,
        lz in 0.0f64..360.0, dl in -15.0f64..15.0,
    ) {
        let w = rad::solar_time_angle_rad(t, lz, lz + dl, j);
        let (w1, w2) = rad::period_solar_time_angles_rad(w, tl);
        let ra = rad::extraterrestrial_radiation_period_mj(lat.to_radians(), j, w1, w2);
        prop_assert!(ra.is_finite() && ra >= 0.0, "Ra = {ra}");
    }

    /// Domain: Rs 0..60, Rso 0..50 MJ m⁻² day⁻¹, fallback 0..=1.
    /// Rs/Rso after limiting lies in 0..=1; ASCE fcd lies in 0.05..=1.
    #[test]
    fn relative_shortwave_limited(rs in 0.0f64..60.0, rso in 0.0f64..50.0, fb in 0.0f64..=1.0) {
        let r = rad::relative_shortwave_radiation(rs, rso, fb);
        prop_assert!((0.0..=1.0).contains(&r));
        let f = asce::cloudiness_function(rs / rso.max(1e-9));
        prop_assert!((0.05..=1.0).contains(&f));
    }

    /// Domain: heights 0.5 ≤ z1 < z2 ≤ 100 m, differing by at least 1 mm.
    /// The eq. 47 factor decreases with height (taller anemometer, stronger wind).
    #[test]
    fn wind_factor_decreases_with_height(z1 in 0.5f64..99.9, dz in 0.001f64..99.5) {
        let z2 = (z1 + dz).min(100.0);
        prop_assume!(z2 > z1);
        prop_assert!(wind::wind_height_factor(z1).unwrap() > wind::wind_height_factor(z2).unwrap());
    }

    /// Domain: values 0..1e6. Unit conversions round-trip to 1e-12 relative.
    #[test]
    fn unit_conversions_round_trip(x in 0.0f64..1e6) {
        let close = |a: f64| (a - x).abs() <= 1e-12 * x.max(1.0);
        prop_assert!(close(openwater::mmhg_to_kpa(openwater::kpa_to_mmhg(x))));
        prop_assert!(close(openwater::kmh_to_ms(openwater::ms_to_kmh(x))));
        prop_assert!(close(units::mm_day_to_l_s_ha(units::l_s_ha_to_mm_day(x))));
        prop_assert!(close(units::m3_day_to_l_s(units::l_s_to_m3_day(x))));
    }
}
