//! Weather preparation: scenario perturbation, ET₀ per day, and the daily
//! u2, RHmin, air temperature, vapour pressure and radiation the plantings
//! and the reservoir need.

use chrono::{Datelike, NaiveDate};

use super::EngineError;
use crate::et0::atmosphere::{atmospheric_pressure_kpa, saturation_vapour_pressure_kpa};
use crate::et0::radiation::{
    Angstrom, clear_sky_radiation_mj, solar_radiation_from_sunshine_mj,
    solar_radiation_from_temperature_mj,
};
use crate::et0::series::{Et0Context, Et0Options, HumiditySource, RadiationSource, WindSource};
use crate::et0::wind::{DEFAULT_WIND_2M_MS, wind_height_factor};
use crate::project::{Et0Method as ProjectEt0Method, WeatherPerturbation};
use crate::weather::{StationSite, WeatherDay};

/// Daily weather series ready for the plantings and the reservoir, one value
/// per day from `start`, without gaps.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct PreparedWeather {
    /// First day.
    pub start: NaiveDate,
    /// Reference ET₀ (mm/day).
    pub et0_mm: Vec<f64>,
    /// Rain (mm/day); a missing value counts as 0 (see `rain_missing_days`).
    pub rain_mm: Vec<f64>,
    /// Wind speed at 2 m (m/s): measured and converted by FAO-56 eq. 47, or
    /// 2 m/s when missing (FAO-56 p. 63).
    pub wind_2m_ms: Vec<f64>,
    /// Minimum relative humidity (%): measured, or 100·ea/e°(Tmax), which is
    /// FAO-56 eq. 63 (p. 123) with ea from the FAO-56 humidity precedence.
    pub rhmin_pct: Vec<f64>,
    /// Mean air temperature (Tmax + Tmin)/2 (°C), FAO-56 eq. 9.
    pub tmean_c: Vec<f64>,
    /// Actual vapour pressure (kPa), FAO-56 precedence (eqs. 14, 17–19, 48).
    pub ea_kpa: Vec<f64>,
    /// Net radiation over open water (MJ m⁻² day⁻¹): albedo 0.08, net
    /// longwave by FAO-56 eq. 39.
    pub rn_open_water_mj: Vec<f64>,
    /// Wind at the measurement height (m/s), default 2 m/s at 2 m when missing.
    pub wind_ms: Vec<f64>,
    /// Height the `wind_ms` values refer to (m) per day.
    pub wind_height_m: Vec<f64>,
    /// Atmospheric pressure (kPa), FAO-56 eq. 7.
    pub pressure_kpa: f64,
    /// Days on which ET₀ used a FAO-56 missing-data procedure (humidity from
    /// Tmin, radiation from the temperature range, or default wind).
    pub estimated_days: usize,
    /// Days without a rain value (taken as 0 mm).
    pub rain_missing_days: usize,
}

impl PreparedWeather {
    /// Number of days.
    pub fn days(&self) -> usize {
        self.et0_mm.len()
    }

    /// Date of day `i`.
    pub fn date(&self, i: usize) -> NaiveDate {
        self.start + chrono::Days::new(i as u64)
    }
}

/// Actual vapour pressure ea (kPa) by the FAO-56 precedence (Chapter 3,
/// pp. 37–39 and 58): measured ea; dewpoint (eq. 14); RHmax and RHmin
/// (eq. 17); RHmax (eq. 18); RHmean (eq. 19); else e°(Tmin) (eq. 48).
pub fn actual_vapour_pressure_kpa(day: &WeatherDay, tmax_c: f64, tmin_c: f64) -> f64 {
    let e_tmax = saturation_vapour_pressure_kpa(tmax_c); // Eq. 11
    let e_tmin = saturation_vapour_pressure_kpa(tmin_c); // Eq. 11
    let rh = |v: Option<f64>| v.filter(|x| x.is_finite()).map(|x| x.clamp(0.0, 100.0));
    if let Some(ea) = day.ea_kpa.filter(|v| v.is_finite() && *v >= 0.0) {
        ea
    } else if let Some(td) = day.tdew_c.filter(|v| v.is_finite()) {
        saturation_vapour_pressure_kpa(td) // Eq. 14
    } else if let (Some(hi), Some(lo)) = (rh(day.rhmax_pct), rh(day.rhmin_pct)) {
        f64::midpoint(e_tmin * hi, e_tmax * lo) / 100.0 // Eq. 17
    } else if let Some(hi) = rh(day.rhmax_pct) {
        e_tmin * hi / 100.0 // Eq. 18
    } else if let Some(m) = rh(day.rhmean_pct) {
        m / 100.0 * f64::midpoint(e_tmax, e_tmin) // Eq. 19
    } else {
        e_tmin // Eq. 48
    }
}

/// Prepares the weather: applies the perturbation, computes ET₀ and the
/// auxiliary daily series.
///
/// # Errors
/// [`EngineError::NoWeather`], [`EngineError::WeatherGap`] for a missing or
/// repeated date, [`EngineError::Station`] for a bad site, and
/// [`EngineError::Et0Day`] for the first day whose ET₀ cannot be computed
/// (e.g. missing Tmax), naming the date.
pub fn prepare_weather(
    days: &[WeatherDay],
    site: &StationSite,
    method: ProjectEt0Method,
    perturbation: &WeatherPerturbation,
) -> Result<PreparedWeather, EngineError> {
    let first = days.first().ok_or(EngineError::NoWeather)?;
    let start = first.date;
    let options = Et0Options {
        method: method.into(),
        ..Et0Options::default()
    };
    let ctx = Et0Context::new(site, &options).map_err(EngineError::Station)?;
    let wind_factor = wind_height_factor(site.wind_height_m).map_err(EngineError::Station)?;
    let n = days.len();
    let mut w = PreparedWeather {
        start,
        pressure_kpa: atmospheric_pressure_kpa(site.elevation_m), // Eq. 7
        ..PreparedWeather::default()
    };
    for v in [
        &mut w.et0_mm,
        &mut w.rain_mm,
        &mut w.wind_2m_ms,
        &mut w.rhmin_pct,
        &mut w.tmean_c,
        &mut w.ea_kpa,
        &mut w.rn_open_water_mj,
        &mut w.wind_ms,
        &mut w.wind_height_m,
    ] {
        v.reserve_exact(n);
    }
    let identity = perturbation.is_identity();
    let mut expected = start;
    for raw in days {
        if raw.date != expected {
            return Err(EngineError::WeatherGap {
                expected,
                found: raw.date,
            });
        }
        expected = expected.succ_opt().unwrap_or(expected);
        let perturbed;
        let day = if identity {
            raw
        } else {
            perturbed = perturbation.apply_to_day(raw);
            &perturbed
        };
        let result = ctx.day(day);
        let (Some(et0), Ok(proc_)) = (result.et0_mm, &result.outcome) else {
            let cause = match result.outcome {
                Err(e) => e.to_string(),
                Ok(_) => "no value".to_owned(),
            };
            return Err(EngineError::Et0Day {
                date: day.date,
                cause,
            });
        };
        if proc_.humidity == HumiditySource::FromTmin
            || proc_.radiation == RadiationSource::TemperatureRange
            || proc_.wind == WindSource::Default
        {
            w.estimated_days += 1;
        }
        // ET₀ succeeded, so Tmax and Tmin are present and finite.
        let tmax = day.tmax_c.unwrap_or(0.0);
        let tmin = day.tmin_c.unwrap_or(0.0);
        let ea = actual_vapour_pressure_kpa(day, tmax, tmin);
        let rhmin = day
            .rhmin_pct
            .filter(|v| v.is_finite())
            .unwrap_or_else(|| 100.0 * ea / saturation_vapour_pressure_kpa(tmax)) // FAO-56 eq. 63
            .clamp(0.0, 100.0);
        let (u2, u, uh) = match day.wind_ms.filter(|v| v.is_finite() && *v >= 0.0) {
            Some(u) => (u * wind_factor, u, site.wind_height_m), // Eq. 47
            None => (DEFAULT_WIND_2M_MS, DEFAULT_WIND_2M_MS, 2.0),
        };
        let doy = day.date.ordinal();
        let sun = ctx.sun(doy);
        let rso = clear_sky_radiation_mj(sun.ra_mj, site.elevation_m); // Eq. 37
        let rs = if let Some(rs) = day.solar_mj.filter(|v| v.is_finite() && *v >= 0.0) {
            rs
        } else if let Some(nh) = day.sunshine_h.filter(|v| v.is_finite() && *v >= 0.0) {
            solar_radiation_from_sunshine_mj(nh, sun.daylight_h, sun.ra_mj, Angstrom::default()) // Eq. 35
        } else {
            solar_radiation_from_temperature_mj(tmax, tmin, sun.ra_mj, options.krs, rso) // Eq. 50
        };
        let rns = crate::et0::radiation::net_shortwave_radiation_mj(
            rs,
            crate::openwater::OPEN_WATER_ALBEDO,
        ); // Eq. 38
        let rel = crate::et0::radiation::relative_shortwave_radiation(rs, rso, 0.5);
        let rnl = crate::et0::radiation::net_longwave_radiation_mj(tmax, tmin, ea, rel); // Eq. 39
        let rain = day.rain_mm.filter(|v| v.is_finite() && *v >= 0.0);
        if rain.is_none() {
            w.rain_missing_days += 1;
        }
        w.et0_mm.push(et0);
        w.rain_mm.push(rain.unwrap_or(0.0));
        w.wind_2m_ms.push(u2);
        w.rhmin_pct.push(rhmin);
        w.tmean_c.push(f64::midpoint(tmax, tmin)); // Eq. 9
        w.ea_kpa.push(ea);
        w.rn_open_water_mj
            .push(crate::et0::radiation::net_radiation_mj(rns, rnl)); // Eq. 40
        w.wind_ms.push(u);
        w.wind_height_m.push(uh);
    }
    Ok(w)
}

/// A record screened against the station limits, ready for gap filling.
#[derive(Debug, Clone, PartialEq)]
pub struct ScreenedWeather {
    /// The days, values beyond the limits removed unless the project keeps them.
    pub days: Vec<WeatherDay>,
    /// Every value beyond its limits.
    pub out_of_limits: Vec<crate::station_limits::OutOfLimits>,
    /// The warning to report (none when every value is inside).
    pub warning: Option<String>,
}

/// Screens the record against the project's station limits
/// ([`crate::station_limits`]) before gap filling: values beyond them are
/// removed (so the chosen gap-filling method fills them) unless the project
/// keeps them.
///
/// # Errors
/// [`EngineError::WeatherFill`] for bad user limits, naming the column.
pub fn screen_weather(
    days: &[WeatherDay],
    project: &crate::project::Project,
) -> Result<ScreenedWeather, EngineError> {
    let limits = &project.options.station_limits;
    let half_window = project
        .options
        .gap_filling
        .options()
        .climatology_half_window_days;
    let s = crate::station_limits::screen_station_limits(days, limits, half_window)
        .map_err(|e| EngineError::WeatherFill(e.to_string()))?;
    let warning = (!s.out_of_limits.is_empty()).then(|| {
        let first: Vec<String> = s
            .out_of_limits
            .iter()
            .take(3)
            .map(|o| {
                let (lo, hi) = (o.low, o.high);
                format!(
                    "{} {} = {} outside {:.1} to {:.1}, {}",
                    o.date,
                    o.variable,
                    o.value,
                    lo,
                    hi,
                    o.source.label()
                )
            })
            .collect();
        let n = s.out_of_limits.len();
        let what = if n == 1 {
            "1 value".to_owned()
        } else {
            format!("{n} values")
        };
        if s.kept {
            format!(
                "weather: {what} beyond the station limits kept as measured (options.station_limits.keep_out_of_limit_values) (first: {})",
                first.join("; ")
            )
        } else {
            format!(
                "weather: {what} beyond the station limits treated as missing and filled by the gap-filling method (first: {}); to keep them set options.station_limits.keep_out_of_limit_values: true",
                first.join("; ")
            )
        }
    });
    Ok(ScreenedWeather {
        days: s.days,
        out_of_limits: s.out_of_limits,
        warning,
    })
}
