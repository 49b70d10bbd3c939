//! The day-series API against FAO-56 Examples 18 and 20 (inputs and printed
//! ETo read from `tests/reference/fao56_chains.ron`), the ASCE-EWRI (2005)
//! cross-check, the missing-data procedure choice and the typed errors.

#![allow(clippy::unwrap_used, clippy::expect_used)]

mod common;

use chrono::NaiveDate;
use offtake_core::et0::daily::{DailyInputs, DailyReference, daily_steps};
use offtake_core::et0::{
    Et0Context, Et0Error, Et0Method, Et0Options, HumiditySource, RadiationSource, WindSource,
    atmosphere, et0_daily_series, radiation, soil_heat,
};
use offtake_core::weather::{StationSite, WeatherDay};

use common::{Chain, load};

fn chain(prefix: &str) -> Chain {
    let chains: Vec<Chain> = load("fao56_chains.ron");
    chains
        .into_iter()
        .find(|c| c.source.starts_with(prefix))
        .unwrap_or_else(|| panic!("no chain {prefix}"))
}

fn expected_et0(c: &Chain) -> (f64, f64) {
    let extra = c.extra_units.get("et0_mm").copied().unwrap_or(0.0);
    common::printed_value_and_tolerance(&c.expected["et0_mm"], extra)
}

fn date(y: i32, m: u32, d: u32) -> NaiveDate {
    NaiveDate::from_ymd_opt(y, m, d).unwrap()
}

/// FAO-56 Example 18, p. 72–73: Uccle, 6 July (J = 187 in a non-leap year).
fn example_18() -> (StationSite, WeatherDay, Chain) {
    let c = chain("FAO-56 Example 18, pp. 72-73");
    let i = &c.inputs;
    let site = StationSite {
        latitude_deg: i["latitude_deg"],
        elevation_m: i["elevation_m"],
        wind_height_m: i["uz_height"],
    };
    let mut day = WeatherDay::empty(date(2026, 7, 6));
    day.tmax_c = Some(i["tmax"]);
    day.tmin_c = Some(i["tmin"]);
    day.rhmax_pct = Some(i["rhmax"]);
    day.rhmin_pct = Some(i["rhmin"]);
    day.wind_ms = Some(i["uz"]);
    day.sunshine_h = Some(i["n_h"]);
    (site, day, c)
}

/// FAO-56 Example 20, p. 77–78: near Lyon, 15 July (J = 196), temperatures only.
fn example_20() -> (StationSite, WeatherDay, Chain) {
    let c = chain("FAO-56 Example 20, pp. 77-78");
    let i = &c.inputs;
    let site = StationSite {
        latitude_deg: i["latitude_deg"],
        elevation_m: i["elevation_m"],
        wind_height_m: 2.0,
    };
    let mut day = WeatherDay::empty(date(2026, 7, 15));
    day.tmax_c = Some(i["tmax"]);
    day.tmin_c = Some(i["tmin"]);
    (site, day, c)
}

#[test]
fn example_18_through_the_series_api() {
    let (site, day, c) = example_18();
    let out = et0_daily_series(&site, &[day], &Et0Options::default()).unwrap();
    let (expected, tol) = expected_et0(&c);
    let got = out[0].et0_mm.unwrap();
    assert!((got - expected).abs() <= tol, "{got} vs {expected} ± {tol}");
    let p = out[0].outcome.as_ref().unwrap();
    assert_eq!(p.humidity, HumiditySource::RhMaxMin);
    assert_eq!(p.radiation, RadiationSource::Sunshine);
    assert_eq!(p.wind, WindSource::Measured);
    assert!(!p.clipped_to_zero);
}

#[test]
fn example_20_missing_data_procedures() {
    let (site, day, c) = example_20();
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    let r = ctx.day(&day);
    let (expected, tol) = expected_et0(&c);
    let got = r.et0_mm.unwrap();
    assert!((got - expected).abs() <= tol, "{got} vs {expected} ± {tol}");
    let p = r.outcome.unwrap();
    assert_eq!(p.humidity, HumiditySource::FromTmin);
    assert_eq!(p.radiation, RadiationSource::TemperatureRange);
    assert_eq!(p.wind, WindSource::Default);
}

/// FAO-56 Example 20, p. 78: "Hargreaves equation predicts ETo = 5.0 mm/day".
#[test]
fn example_20_hargreaves_through_the_series_api() {
    let (site, day, c) = example_20();
    let options = Et0Options {
        method: Et0Method::HargreavesSamani,
        ..Et0Options::default()
    };
    let r = Et0Context::new(&site, &options).unwrap().day(&day);
    let (expected, tol) = common::printed_value_and_tolerance(&c.expected["hargreaves_mm"], 0.0);
    let got = r.et0_mm.unwrap();
    assert!((got - expected).abs() <= tol, "{got} vs {expected}");
    assert_eq!(r.outcome.unwrap().humidity, HumiditySource::NotUsed);
}

/// Cross-check (not a published value): ASCE-EWRI (2005) ETos and FAO-56 eq. 6
/// differ only in σ (4.901 vs 4.903 ×10⁻⁹) and the fcd limits, so on FAO-56
/// Examples 17 and 18 they must agree within about 1 %.
#[test]
fn cross_check_asce_short_vs_fao56_examples_17_and_18() {
    // Example 18 through the series API.
    let (site, day, _) = example_18();
    let fao = Et0Context::new(&site, &Et0Options::default())
        .unwrap()
        .et0_mm_day(&day)
        .unwrap();
    let asce = Et0Context::new(
        &site,
        &Et0Options {
            method: Et0Method::AsceShort,
            ..Et0Options::default()
        },
    )
    .unwrap()
    .et0_mm_day(&day)
    .unwrap();
    assert!(
        (asce - fao).abs() / fao < 0.01,
        "Ex 18: ASCE {asce} vs FAO {fao}"
    );

    // Example 17 (monthly, G by eq. 44) through daily_steps.
    let c = chain("FAO-56 Example 17, pp. 70-71");
    let i = &c.inputs;
    let lat = i["latitude_deg"].to_radians();
    let j = i["j"] as u32;
    let ra = radiation::extraterrestrial_radiation_mj(lat, j);
    let n = radiation::daylight_hours(radiation::sunset_hour_angle_rad(
        lat,
        radiation::solar_declination_rad(j),
    ));
    let inputs = DailyInputs {
        tmax_c: i["tmax"],
        tmin_c: i["tmin"],
        ea_kpa: i["ea"],
        wind_2m_ms: i["u2"],
        rs_mj: radiation::solar_radiation_from_sunshine_mj(
            i["n_h"],
            n,
            ra,
            radiation::Angstrom::default(),
        ),
        rso_mj: radiation::clear_sky_radiation_mj(ra, i["elevation_m"]),
        soil_heat_flux_mj: soil_heat::soil_heat_flux_monthly_backward_mj(
            i["t_prev_month"],
            i["t_month"],
        ),
    };
    let p = atmosphere::atmospheric_pressure_kpa(i["elevation_m"]);
    let fao = daily_steps(p, &inputs, DailyReference::Fao56).et_mm_day;
    let asce = daily_steps(p, &inputs, DailyReference::AsceShort).et_mm_day;
    assert!(
        (asce - fao).abs() / fao < 0.01,
        "Ex 17: ASCE {asce} vs FAO {fao}"
    );
    let (expected, tol) = expected_et0(&c);
    assert!((fao - expected).abs() <= tol);
}

#[test]
fn humidity_precedence_follows_the_brief() {
    let (site, mut day, _) = example_18();
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    day.ea_kpa = Some(1.4);
    day.tdew_c = Some(12.0);
    day.rhmean_pct = Some(70.0);
    let source = |d: &WeatherDay| ctx.day(d).outcome.unwrap().humidity;
    assert_eq!(source(&day), HumiditySource::MeasuredEa);
    day.ea_kpa = None;
    assert_eq!(source(&day), HumiditySource::Dewpoint);
    day.tdew_c = None;
    assert_eq!(source(&day), HumiditySource::RhMaxMin);
    day.rhmin_pct = None;
    assert_eq!(source(&day), HumiditySource::RhMax);
    day.rhmax_pct = None;
    assert_eq!(source(&day), HumiditySource::RhMean);
    day.rhmean_pct = None;
    assert_eq!(source(&day), HumiditySource::FromTmin);
}

#[test]
fn radiation_and_wind_sources() {
    let (site, mut day, _) = example_18();
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    day.solar_mj = Some(20.0);
    assert_eq!(
        ctx.day(&day).outcome.unwrap().radiation,
        RadiationSource::Measured
    );
    day.wind_ms = Some(0.1);
    assert_eq!(
        ctx.day(&day).outcome.unwrap().wind,
        WindSource::RaisedToMinimum
    );
}

#[test]
fn site_errors_are_typed() {
    let (mut site, day, _) = example_18();
    site.latitude_deg = 91.0;
    assert_eq!(
        et0_daily_series(&site, &[day], &Et0Options::default()).unwrap_err(),
        Et0Error::LatitudeOutOfRange { latitude_deg: 91.0 }
    );
    site.latitude_deg = 10.0;
    site.wind_height_m = 0.3;
    assert!(matches!(
        Et0Context::new(&site, &Et0Options::default()),
        Err(Et0Error::WindHeightOutOfRange { .. })
    ));
    site.wind_height_m = f64::NAN;
    assert!(matches!(
        Et0Context::new(&site, &Et0Options::default()),
        Err(Et0Error::WindHeightOutOfRange { .. })
    ));
    site.wind_height_m = 2.0;
    site.elevation_m = 12_000.0;
    assert!(matches!(
        Et0Context::new(&site, &Et0Options::default()),
        Err(Et0Error::ElevationOutOfRange { .. })
    ));
}

#[test]
fn day_errors_are_typed_and_never_nan() {
    let (site, good, _) = example_18();
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    let check = |edit: &dyn Fn(&mut WeatherDay), want: &dyn Fn(&Et0Error) -> bool| {
        let mut d = good;
        edit(&mut d);
        let r = ctx.day(&d);
        assert!(r.et0_mm.is_none());
        let e = r.outcome.unwrap_err();
        assert!(want(&e), "unexpected {e:?}");
    };
    check(&|d| d.tmin_c = Some(30.0), &|e| {
        matches!(e, Et0Error::TminAboveTmax { .. })
    });
    check(&|d| d.tmax_c = None, &|e| {
        matches!(e, Et0Error::MissingTemperature { quantity: "tmax_c" })
    });
    check(&|d| d.tmax_c = Some(f64::NAN), &|e| {
        matches!(
            e,
            Et0Error::NotFinite {
                quantity: "tmax_c",
                ..
            }
        )
    });
    check(&|d| d.rhmax_pct = Some(120.0), &|e| {
        matches!(
            e,
            Et0Error::RelativeHumidityOutOfRange {
                quantity: "rhmax_pct",
                ..
            }
        )
    });
    check(&|d| d.rhmin_pct = Some(f64::NAN), &|e| {
        matches!(
            e,
            Et0Error::NotFinite {
                quantity: "rhmin_pct",
                ..
            }
        )
    });
    check(&|d| d.wind_ms = Some(-1.0), &|e| {
        matches!(
            e,
            Et0Error::Negative {
                quantity: "wind_ms",
                ..
            }
        )
    });
    check(&|d| d.solar_mj = Some(-3.0), &|e| {
        matches!(
            e,
            Et0Error::Negative {
                quantity: "solar_mj",
                ..
            }
        )
    });
    check(&|d| d.sunshine_h = Some(20.0), &|e| {
        matches!(e, Et0Error::SunshineExceedsDaylength { .. })
    });
    // Within the tolerance: RH of 101.5 % is limited to 100 % and accepted.
    let mut d = good;
    d.rhmax_pct = Some(101.5);
    assert!(ctx.day(&d).et0_mm.is_some_and(f64::is_finite));
}

/// Polar night with moist air: eq. 6 gives a negative value, which is clipped
/// to zero by default (documented FAO practice) and kept when asked.
#[test]
fn negative_et0_is_clipped_by_default() {
    let site = StationSite {
        latitude_deg: 75.0,
        elevation_m: 10.0,
        wind_height_m: 2.0,
    };
    let mut day = WeatherDay::empty(date(2026, 12, 21));
    day.tmax_c = Some(-20.0);
    day.tmin_c = Some(-22.0);
    day.tdew_c = Some(-20.0);
    day.wind_ms = Some(1.0);
    let raw = Et0Context::new(
        &site,
        &Et0Options {
            clip_negative: false,
            ..Et0Options::default()
        },
    )
    .unwrap()
    .day(&day);
    let raw_value = raw.et0_mm.unwrap();
    assert!(raw_value < 0.0 && raw_value.is_finite(), "{raw_value}");
    let clipped = Et0Context::new(&site, &Et0Options::default())
        .unwrap()
        .day(&day);
    assert_eq!(clipped.et0_mm, Some(0.0));
    assert!(clipped.outcome.unwrap().clipped_to_zero);
}

#[test]
fn method_names_parse_exactly() {
    for m in Et0Method::ALL {
        assert_eq!(m.to_string().parse::<Et0Method>().unwrap(), m);
    }
    assert_eq!(
        "asce-tall".parse::<Et0Method>().unwrap(),
        Et0Method::AsceTall
    );
    assert_eq!(
        "hargreaves".parse::<Et0Method>().unwrap(),
        Et0Method::HargreavesSamani
    );
    assert!("PM".parse::<Et0Method>().is_err());
    assert!("penman".parse::<Et0Method>().is_err());
}
