//! Shared loading and evaluation code for the reference-value test harnesses.
//!
//! The check values are data in the repository's top-level `tests/reference/`
//! folder, each with its published source. This module maps each named
//! quantity to the crate function that computes it.

#![allow(dead_code, clippy::unwrap_used, clippy::expect_used, missing_docs)]

use std::collections::BTreeMap;
use std::f64::consts::PI;

use offtake_core::et0::atmosphere as atm;
use offtake_core::et0::combination::{
    CombinationInputs, FAO56_DAILY, FAO56_HOURLY, aerodynamic_term_mm, radiation_term_mm,
};
use offtake_core::et0::daily::{DailyInputs, DailyReference, daily_steps};
use offtake_core::et0::hourly::{HourlyInputs, HourlyReference, hourly_steps};
use offtake_core::et0::{asce, calendar, hargreaves, radiation as rad, soil_heat, wind};
use offtake_core::openwater;
use offtake_core::units::MM_DAY_PER_MJ_M2_DAY;
use serde::Deserialize;

/// Directory of the reference data files.
pub const REFERENCE_DIR: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/../../tests/reference/");

/// One single-quantity check.
#[derive(Debug, Deserialize)]
pub struct Check {
    pub source: String,
    pub quantity: String,
    pub inputs: BTreeMap<String, f64>,
    pub printed: String,
    #[serde(default)]
    pub tolerance: Option<f64>,
}

/// One step-by-step worked example.
#[derive(Debug, Deserialize)]
pub struct Chain {
    pub source: String,
    pub kind: String,
    pub inputs: BTreeMap<String, f64>,
    pub expected: BTreeMap<String, String>,
    #[serde(default)]
    pub extra_units: BTreeMap<String, f64>,
    #[serde(default)]
    pub tolerance: BTreeMap<String, f64>,
    #[serde(default)]
    pub note: Option<String>,
}

/// Reads and parses a RON file from `tests/reference/`.
pub fn load<T: for<'de> Deserialize<'de>>(file: &str) -> T {
    let path = format!("{REFERENCE_DIR}{file}");
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
    ron::from_str(&text).unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// The printed value and the tolerance its decimals imply: half a unit of the
/// last printed decimal plus `extra_units` units.
pub fn printed_value_and_tolerance(printed: &str, extra_units: f64) -> (f64, f64) {
    let value: f64 = printed.parse().unwrap_or_else(|e| panic!("{printed}: {e}"));
    let decimals = printed.split_once('.').map_or(0, |(_, d)| d.len()) as i32;
    let unit = 10f64.powi(-decimals);
    (value, (0.5 + extra_units) * unit)
}

fn get(inputs: &BTreeMap<String, f64>, key: &str) -> f64 {
    *inputs
        .get(key)
        .unwrap_or_else(|| panic!("missing input {key}"))
}

/// Evaluates a single named quantity from its inputs with the crate's functions.
pub fn eval_single(quantity: &str, i: &BTreeMap<String, f64>) -> f64 {
    let g = |k: &str| get(i, k);
    match quantity {
        "pressure_kpa" => atm::atmospheric_pressure_kpa(g("z")),
        "psychrometric_kpa_c" => {
            atm::psychrometric_constant_kpa_c(atm::atmospheric_pressure_kpa(g("z")))
        }
        "psychrometric_from_p_kpa_c" => atm::psychrometric_constant_kpa_c(g("p")),
        "e0_kpa" => atm::saturation_vapour_pressure_kpa(g("t")),
        "mean_es_kpa" => atm::mean_saturation_vapour_pressure_kpa(g("tmax"), g("tmin")),
        "slope_kpa_c" => atm::saturation_slope_kpa_c(g("t")),
        "asce_slope_kpa_c" => asce::saturation_slope_kpa_c(g("t")),
        "ea_psychrometer_ventilated_kpa" => atm::actual_vapour_pressure_from_psychrometer_kpa(
            g("tdry"),
            g("twet"),
            atm::atmospheric_pressure_kpa(g("z")),
            atm::Psychrometer::Ventilated,
        ),
        "ea_rh_max_min_kpa" => atm::actual_vapour_pressure_from_rh_max_min_kpa(
            g("tmax"),
            g("tmin"),
            g("rhmax"),
            g("rhmin"),
        ),
        "ea_rh_mean_kpa" => {
            atm::actual_vapour_pressure_from_rh_mean_kpa(g("tmax"), g("tmin"), g("rhmean"))
        }
        "ea_hourly_kpa" => atm::actual_vapour_pressure_hourly_kpa(g("t"), g("rh")),
        "vpd_rh_max_min_kpa" => atm::vapour_pressure_deficit_kpa(
            atm::mean_saturation_vapour_pressure_kpa(g("tmax"), g("tmin")),
            atm::actual_vapour_pressure_from_rh_max_min_kpa(
                g("tmax"),
                g("tmin"),
                g("rhmax"),
                g("rhmin"),
            ),
        ),
        "deg_to_rad" => offtake_core::units::deg_to_rad(g("deg")),
        "g_monthly_mj" => soil_heat::soil_heat_flux_monthly_mj(g("t_prev"), g("t_next")),
        "g_monthly_mm" => {
            MM_DAY_PER_MJ_M2_DAY * soil_heat::soil_heat_flux_monthly_mj(g("t_prev"), g("t_next"))
        }
        "g_monthly_backward_mj" => {
            soil_heat::soil_heat_flux_monthly_backward_mj(g("t_prev"), g("t"))
        }
        "wind_factor" => wind::wind_height_factor(g("z")).unwrap(),
        "u2_ms" => wind::wind_2m_ms(g("uz"), g("z")).unwrap(),
        "day_of_year_fao56" => {
            let (y, m, d) = (g("year") as i32, g("month") as u32, g("day") as u32);
            let j = calendar::day_of_year_fao56(y, m, d);
            // The chrono-based helper must agree with the FAO-56 rule.
            let date = chrono::NaiveDate::from_ymd_opt(y, m, d).unwrap();
            assert_eq!(calendar::day_of_year(date), j, "{y}-{m}-{d}");
            f64::from(j)
        }
        "mid_month_day_of_year" => f64::from(calendar::mid_month_day_of_year(g("month") as u32)),
        "sigma_t4_mj" => rad::black_body_radiation_mj_day(g("t")),
        "hargreaves_mm_day" => hargreaves::et0_hargreaves_samani_mm_day(
            g("tmax"),
            g("tmin"),
            MM_DAY_PER_MJ_M2_DAY * g("ra_mj"),
        ),
        "hargreaves_ra_mm_mm_day" => {
            hargreaves::et0_hargreaves_samani_mm_day(g("tmax"), g("tmin"), g("ra_mm"))
        }
        "ew_mmhg" => openwater::saturation_vapour_pressure_mmhg(g("t")),
        other => panic!("unknown quantity {other}"),
    }
}

/// Computes every intermediate of a daily FAO-56 chain from raw inputs.
///
/// Inputs: `latitude_deg`, `elevation_m`, `j`; optional `tmax`, `tmin`, `ea`
/// (else `rhmax`+`rhmin`, else Tmin by eq. 48), `u2` (else `uz` at
/// `uz_height`, else 2 m/s), `n_h` (else eq. 50 with `krs`), `t_month` +
/// `t_prev_month` (G by eq. 44, else 0).
pub fn eval_daily_chain(i: &BTreeMap<String, f64>) -> BTreeMap<String, f64> {
    let g = |k: &str| get(i, k);
    let opt = |k: &str| i.get(k).copied();
    let mut out = BTreeMap::new();
    let lat = g("latitude_deg").to_radians();
    let z = g("elevation_m");
    let j = g("j") as u32;
    let dr = rad::inverse_relative_distance(j);
    let decl = rad::solar_declination_rad(j);
    let ws = rad::sunset_hour_angle_rad(lat, decl);
    let ra = rad::extraterrestrial_radiation_mj(lat, j);
    let daylight = rad::daylight_hours(ws);
    out.extend([
        ("latitude_rad", lat),
        ("dr", dr),
        ("declination_rad", decl),
        ("sunset_angle_rad", ws),
        ("sin_lat_sin_decl", lat.sin() * decl.sin()),
        ("cos_lat_cos_decl", lat.cos() * decl.cos()),
        ("ra_mj", ra),
        ("ra_mm", MM_DAY_PER_MJ_M2_DAY * ra),
        ("daylight_h", daylight),
    ]);
    let p = atm::atmospheric_pressure_kpa(z);
    let gamma = atm::psychrometric_constant_kpa_c(p);
    out.extend([("pressure_kpa", p), ("gamma_kpa_c", gamma)]);
    let rso = rad::clear_sky_radiation_mj(ra, z);
    out.insert("rso_mj", rso);

    let (Some(tmax), Some(tmin)) = (opt("tmax"), opt("tmin")) else {
        // Radiation-only chains (e.g. Ex 8-10) may also give sunshine.
        if let Some(n) = opt("n_h") {
            let rs =
                rad::solar_radiation_from_sunshine_mj(n, daylight, ra, rad::Angstrom::default());
            out.extend([("n_h", n), ("rs_mj", rs), ("rs_over_ra", rs / ra)]);
        }
        return out.into_iter().map(|(k, v)| (k.to_owned(), v)).collect();
    };
    let tmean = atm::mean_air_temperature_c(tmax, tmin);
    let delta = atm::saturation_slope_kpa_c(tmean);
    let e_tmax = atm::saturation_vapour_pressure_kpa(tmax);
    let e_tmin = atm::saturation_vapour_pressure_kpa(tmin);
    let es = atm::mean_saturation_vapour_pressure_kpa(tmax, tmin);
    let ea = if let Some(ea) = opt("ea") {
        ea
    } else if let (Some(hi), Some(lo)) = (opt("rhmax"), opt("rhmin")) {
        atm::actual_vapour_pressure_from_rh_max_min_kpa(tmax, tmin, hi, lo)
    } else {
        atm::actual_vapour_pressure_from_tmin_kpa(tmin, 0.0)
    };
    let u2 = if let Some(u2) = opt("u2") {
        u2
    } else if let Some(uz) = opt("uz") {
        out.insert("uz_ms", uz);
        wind::wind_2m_ms(uz, g("uz_height")).unwrap()
    } else {
        wind::DEFAULT_WIND_2M_MS
    };
    let (rs, rs_over_ra) = if let Some(n) = opt("n_h") {
        let rs = rad::solar_radiation_from_sunshine_mj(n, daylight, ra, rad::Angstrom::default());
        out.extend([("n_h", n), ("n_over_daylight", n / daylight)]);
        (rs, rs / ra)
    } else {
        let krs = g("krs");
        let rs = rad::solar_radiation_from_temperature_mj(tmax, tmin, ra, krs, rso);
        (rs, krs * (tmax - tmin).sqrt())
    };
    let soil = match (opt("t_month"), opt("t_prev_month")) {
        (Some(t), Some(tp)) => soil_heat::soil_heat_flux_monthly_backward_mj(tp, t),
        _ => soil_heat::soil_heat_flux_daily_mj(),
    };
    let ratio = rad::relative_shortwave_radiation(rs, rso, 0.5);
    let rns = rad::net_shortwave_radiation_mj(rs, rad::REFERENCE_ALBEDO);
    let rnl = rad::net_longwave_radiation_mj(tmax, tmin, ea, ratio);
    let rn = rad::net_radiation_mj(rns, rnl);
    let sigma_tmax4 = rad::black_body_radiation_mj_day(tmax);
    let sigma_tmin4 = rad::black_body_radiation_mj_day(tmin);
    let denominator = delta + gamma * (1.0 + FAO56_DAILY.cd * u2);

    let steps = daily_steps(
        p,
        &DailyInputs {
            tmax_c: tmax,
            tmin_c: tmin,
            ea_kpa: ea,
            wind_2m_ms: u2,
            rs_mj: rs,
            rso_mj: rso,
            soil_heat_flux_mj: soil,
        },
        DailyReference::Fao56,
    );
    // The one-call path must agree with the auxiliaries step by step.
    for (name, a, b) in [
        ("rn", steps.rn_mj, rn),
        ("rnl", steps.rnl_mj, rnl),
        ("es", steps.es_kpa, es),
        ("delta", steps.slope_kpa_c, delta),
    ] {
        assert!((a - b).abs() < 1e-12, "daily_steps {name}: {a} vs {b}");
    }
    let combination = CombinationInputs {
        slope_kpa_c: delta,
        psychrometric_kpa_c: gamma,
        net_radiation_mj: rn,
        soil_heat_flux_mj: soil,
        temperature_c: tmean,
        wind_2m_ms: u2,
        es_kpa: es,
        ea_kpa: ea,
    };
    let et0 = offtake_core::et0::combination::et0_penman_monteith_mm_day(&combination);
    assert!((et0 - steps.et_mm_day).abs() < 1e-12);
    out.extend([
        ("tmean_c", tmean),
        ("delta_kpa_c", delta),
        ("one_plus_cd_u2", 1.0 + FAO56_DAILY.cd * u2),
        ("delta_over_denominator", delta / denominator),
        ("gamma_over_denominator", gamma / denominator),
        ("cn_over_t_u2", FAO56_DAILY.cn / (tmean + 273.0) * u2),
        ("u2_ms", u2),
        ("e_tmax_kpa", e_tmax),
        ("e_tmin_kpa", e_tmin),
        ("es_kpa", es),
        ("ea_kpa", ea),
        ("vpd_kpa", atm::vapour_pressure_deficit_kpa(es, ea)),
        ("rh_max_implied_pct", 100.0 * ea / e_tmin),
        ("rh_min_implied_pct", 100.0 * ea / e_tmax),
        (
            "rh_mean_implied_pct",
            f64::midpoint(100.0 * ea / e_tmin, 100.0 * ea / e_tmax),
        ),
        ("rs_mj", rs),
        ("rs_mm", MM_DAY_PER_MJ_M2_DAY * rs),
        ("rs_over_ra", rs_over_ra),
        ("rs_over_rso", ratio),
        ("rns_mj", rns),
        ("tmax_k", tmax + rad::KELVIN_OFFSET_FAO56),
        ("tmin_k", tmin + rad::KELVIN_OFFSET_FAO56),
        ("sigma_tmax4", sigma_tmax4),
        ("sigma_tmin4", sigma_tmin4),
        ("sigma_t4_mean", f64::midpoint(sigma_tmax4, sigma_tmin4)),
        ("ea_factor", 0.34 - 0.14 * ea.sqrt()),
        ("cloud_factor", 1.35 * ratio - 0.35),
        ("rnl_mj", rnl),
        ("rnl_mm", MM_DAY_PER_MJ_M2_DAY * rnl),
        ("rn_mj", rn),
        ("rn_mm", MM_DAY_PER_MJ_M2_DAY * rn),
        ("g_mj", soil),
        ("rn_minus_g_mj", rn - soil),
        ("rn_minus_g_mm", MM_DAY_PER_MJ_M2_DAY * (rn - soil)),
        (
            "radiation_term_mm",
            radiation_term_mm(&combination, FAO56_DAILY),
        ),
        (
            "aerodynamic_term_mm",
            aerodynamic_term_mm(&combination, FAO56_DAILY),
        ),
        ("et0_mm", steps.et_mm_day),
        (
            "hargreaves_mm",
            hargreaves::et0_hargreaves_samani_mm_day(tmax, tmin, MM_DAY_PER_MJ_M2_DAY * ra),
        ),
    ]);
    out.into_iter().map(|(k, v)| (k.to_owned(), v)).collect()
}

/// Computes every intermediate of an hourly FAO-56 chain (Example 19).
pub fn eval_hourly_chain(i: &BTreeMap<String, f64>) -> BTreeMap<String, f64> {
    let g = |k: &str| get(i, k);
    let lat = g("latitude_deg").to_radians();
    let j = g("j") as u32;
    let t = g("t");
    let ea = atm::actual_vapour_pressure_hourly_kpa(t, g("rh"));
    let inputs = HourlyInputs {
        latitude_rad: lat,
        elevation_m: g("elevation_m"),
        day_of_year: j,
        clock_time_mid_h: g("t_mid"),
        period_h: g("tl"),
        lz_deg_west: g("lz"),
        lm_deg_west: g("lm"),
        temperature_c: t,
        ea_kpa: ea,
        wind_2m_ms: g("u2"),
        rs_mj: g("rs"),
        night_relative_shortwave: g("night_ratio"),
    };
    let s = hourly_steps(&inputs, HourlyReference::Fao56);
    let combination = CombinationInputs {
        slope_kpa_c: s.slope_kpa_c,
        psychrometric_kpa_c: s.psychrometric_kpa_c,
        net_radiation_mj: s.rn_mj,
        soil_heat_flux_mj: s.soil_heat_flux_mj,
        temperature_c: t,
        wind_2m_ms: g("u2"),
        es_kpa: s.es_kpa,
        ea_kpa: ea,
    };
    let et0 = offtake_core::et0::combination::et0_penman_monteith_hourly_mm(&combination);
    assert!((et0 - s.et_mm).abs() < 1e-12);
    let _ = FAO56_HOURLY;
    let tk = t + rad::KELVIN_OFFSET_FAO56;
    [
        ("delta_kpa_c", s.slope_kpa_c),
        ("gamma_kpa_c", s.psychrometric_kpa_c),
        ("es_kpa", s.es_kpa),
        ("ea_kpa", ea),
        ("vpd_kpa", s.es_kpa - ea),
        ("latitude_rad", lat),
        ("dr", rad::inverse_relative_distance(j)),
        ("declination_rad", rad::solar_declination_rad(j)),
        ("b", 2.0 * PI * (f64::from(j) - 81.0) / 364.0),
        ("sc_h", rad::seasonal_correction_h(j)),
        ("omega_rad", s.omega_rad),
        ("omega1_rad", s.omega1_rad),
        ("omega2_rad", s.omega2_rad),
        ("ra_mj", s.ra_mj),
        ("rso_mj", s.rso_mj),
        ("rns_mj", s.rns_mj),
        ("sigma_t4", rad::STEFAN_BOLTZMANN_MJ_K4_M2_HOUR * tk.powi(4)),
        ("ea_factor", 0.34 - 0.14 * ea.sqrt()),
        ("rs_over_rso", s.relative_shortwave),
        ("cloud_factor", 1.35 * s.relative_shortwave - 0.35),
        ("rnl_mj", s.rnl_mj),
        ("rn_mj", s.rn_mj),
        ("g_mj", s.soil_heat_flux_mj),
        ("rn_minus_g_mj", s.rn_mj - s.soil_heat_flux_mj),
        (
            "rn_minus_g_mm",
            MM_DAY_PER_MJ_M2_DAY * (s.rn_mj - s.soil_heat_flux_mj),
        ),
        ("radiation_term_mm", s.radiation_term_mm),
        ("aerodynamic_term_mm", s.aerodynamic_term_mm),
        ("et0_mm", s.et_mm),
    ]
    .into_iter()
    .map(|(k, v)| (k.to_owned(), v))
    .collect()
}
