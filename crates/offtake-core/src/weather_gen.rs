//! A seeded generator of **invented** daily weather for demonstrations and
//! tests.
//!
//! This is not a climate model and its output describes no real place. It
//! produces plausible-looking daily records for a fictional semi-arid station
//! so that the demo project exercises import, quality checks, gap filling,
//! ET₀ and the multi-year statistics. Every parameter below is invented for
//! that purpose; none is fitted to observations.
//!
//! # Model (all parameters invented)
//!
//! - **Rain occurrence**: a two-state (dry/wet) first-order Markov chain whose
//!   unconditional wet-day probability π follows a monthly table with a
//!   monsoon-like wet season (July–September) and a long dry season, and whose
//!   lag-1 persistence is [`RAIN_PERSISTENCE`]: P(wet | wet) = π + r(1 − π),
//!   P(wet | dry) = π(1 − r).
//! - **Rain amount** on a wet day: a gamma distribution with shape
//!   [`RAIN_GAMMA_SHAPE`] and a mean from a monthly table.
//! - **Inter-annual variability**: each year draws a log-normal "wet-season
//!   strength" (mean 1) that scales both π and the mean amount, and a normal
//!   shift of the wet season's timing. Weak years are dry years.
//! - **Temperatures**: monthly normals interpolated to the day plus AR(1)
//!   anomalies (Tmin's innovations correlated with Tmax's); wet days are
//!   cooler by day and slightly warmer at night; dry years are a little hotter.
//! - **Humidity**: a dewpoint with its own seasonal cycle and AR(1) anomaly,
//!   raised after rain and kept below Tmin; RHmax and RHmin follow from the
//!   dewpoint and Tmin/Tmax through the saturation vapour pressure (FAO-56,
//!   Allen et al. 1998, eq. 11), so humidity is coherent with rain and
//!   temperature.
//! - **Solar radiation**: a clearness fraction of the clear-sky radiation Rso
//!   (FAO-56 eq. 37, from Ra of eq. 21), lower on wet days and in the wet
//!   season, never above Rso.
//! - **Wind** at the station's wind height: monthly normals with a log-AR(1)
//!   anomaly.
//! - **Planted defects** ([`PlantedDefect`]): a few missing days, a blank
//!   rain cell, a multi-week gap of the radiation sensor and of the humidity
//!   sensor, a temperature spike, a stuck wind sensor and one day with Tmin
//!   above Tmax, at fixed places in the record, so that checks and gap
//!   filling have something to find.
//!
//! Values are rounded as a station logger would report them (0.1 °C, 0.1 %,
//! 0.1 m/s, 0.1 MJ m⁻², 0.1 mm).
//!
//! The same settings and seed always give the same record (ChaCha8 random
//! stream, fixed order of draws).

use chrono::{Datelike, NaiveDate};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution, Gamma, StandardNormal};
use serde::{Deserialize, Serialize};

use crate::calendar::{day_of_year, days_between, days_in_year};
use crate::et0::atmosphere::saturation_vapour_pressure_kpa;
use crate::et0::radiation::{clear_sky_radiation_mj, extraterrestrial_radiation_mj};
use crate::weather::{StationSite, WeatherDay};

/// Name of the invented demo station.
pub const DEMO_STATION_NAME: &str = "Tamarisk Flats station (invented)";

/// The invented demo station: 18.0° N, 350 m above sea level, wind measured
/// at 10 m (so the wind height conversion of FAO-56 eq. 47 is exercised).
pub const DEMO_SITE: StationSite = StationSite {
    latitude_deg: 18.0,
    elevation_m: 350.0,
    wind_height_m: 10.0,
};

/// Seed of the committed demo weather.
pub const DEMO_SEED: u64 = 20_261_201;

/// First year of the committed demo weather (invented dates).
pub const DEMO_FIRST_YEAR: i32 = 2001;

/// Number of years of the committed demo weather.
pub const DEMO_YEARS: u32 = 25;

/// Invented monthly normals of the wet-day probability π (Jan..Dec).
pub const WET_DAY_PROBABILITY: [f64; 12] = [
    0.015, 0.015, 0.02, 0.03, 0.06, 0.20, 0.40, 0.44, 0.31, 0.11, 0.03, 0.015,
];

/// Invented monthly normals of the mean rain on a wet day (mm, Jan..Dec).
pub const MEAN_WET_DAY_RAIN_MM: [f64; 12] = [
    5.0, 5.0, 6.0, 7.0, 9.0, 10.0, 11.5, 12.0, 11.0, 9.0, 6.0, 5.0,
];

/// Invented lag-1 persistence r of rain occurrence.
pub const RAIN_PERSISTENCE: f64 = 0.35;

/// Invented shape of the gamma distribution of wet-day rain.
pub const RAIN_GAMMA_SHAPE: f64 = 0.8;

/// Invented standard deviation of the log of the yearly wet-season strength.
pub const YEAR_STRENGTH_LOG_SD: f64 = 0.25;

/// Invented standard deviation of the yearly shift of the wet season (days).
pub const SEASON_SHIFT_SD_DAYS: f64 = 9.0;

/// Invented monthly normals of Tmax (°C, Jan..Dec).
pub const TMAX_NORMAL_C: [f64; 12] = [
    29.0, 31.5, 34.5, 37.0, 38.0, 35.0, 31.5, 30.5, 31.5, 32.0, 30.0, 28.5,
];

/// Invented monthly normals of Tmin (°C, Jan..Dec).
pub const TMIN_NORMAL_C: [f64; 12] = [
    13.0, 14.5, 18.0, 22.0, 24.5, 24.5, 23.5, 23.0, 22.5, 19.5, 15.5, 13.0,
];

/// Invented monthly normals of the dewpoint (°C, Jan..Dec).
pub const TDEW_NORMAL_C: [f64; 12] = [
    9.0, 9.0, 10.0, 12.0, 15.0, 20.0, 22.0, 22.0, 21.0, 17.0, 13.0, 10.0,
];

/// Invented monthly normals of wind speed at 10 m (m/s, Jan..Dec).
pub const WIND_10M_NORMAL_MS: [f64; 12] =
    [2.3, 2.4, 2.5, 2.6, 2.8, 3.2, 3.3, 3.0, 2.5, 1.9, 1.9, 2.1];

/// Invented monthly normals of the clearness Rs/Rso on a dry day (Jan..Dec).
pub const DRY_DAY_CLEARNESS: [f64; 12] = [
    0.90, 0.90, 0.90, 0.88, 0.85, 0.75, 0.66, 0.66, 0.72, 0.85, 0.90, 0.90,
];

/// Errors of the generator settings.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum WeatherGenError {
    /// Zero years requested.
    #[error("no years requested; expected at least 1")]
    NoYears,
    /// A first year or span outside the supported date range.
    #[error("years {first_year} to {last_year} are outside the supported date range")]
    YearOutOfRange {
        /// First year.
        first_year: i32,
        /// Last year.
        last_year: i64,
    },
    /// A latitude where the sun does not set or rise on some days, or not a
    /// latitude at all.
    #[error("latitude {latitude_deg}° is outside the generator's range −60..=60")]
    LatitudeOutOfRange {
        /// The latitude given.
        latitude_deg: f64,
    },
    /// A distribution parameter the random library rejects (a bug in the
    /// invented parameter tables).
    #[error("invalid distribution parameter: {what}")]
    InvalidDistribution {
        /// Which distribution.
        what: &'static str,
    },
    /// An elevation or wind height that is not a finite, plausible number.
    #[error("{what} {value} is not plausible; expected {expected}")]
    ImplausibleSite {
        /// Which quantity.
        what: &'static str,
        /// The value given.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
}

/// Settings of one generated record.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct GeneratorSettings {
    /// Seed of the random stream.
    pub seed: u64,
    /// First calendar year (the record starts on 1 January).
    pub first_year: i32,
    /// Number of whole calendar years.
    pub years: u32,
    /// Station latitude, elevation and wind height.
    pub site: StationSite,
    /// Whether to plant the defects of [`PlantedDefect`].
    pub plant_defects: bool,
}

impl GeneratorSettings {
    /// The settings of the committed demo weather.
    pub fn demo() -> Self {
        Self {
            seed: DEMO_SEED,
            first_year: DEMO_FIRST_YEAR,
            years: DEMO_YEARS,
            site: DEMO_SITE,
            plant_defects: true,
        }
    }
}

/// What a planted defect is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum DefectKind {
    /// The whole day is absent from the record.
    MissingDay,
    /// One variable is blank on these days.
    Blank,
    /// A one-day jump far beyond the neighbouring days.
    Spike,
    /// A sensor repeats the same value.
    Stuck,
    /// Tmin recorded above Tmax.
    TminAboveTmax,
}

/// A defect the generator planted on purpose.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct PlantedDefect {
    /// First day affected.
    pub first: NaiveDate,
    /// Last day affected (inclusive).
    pub last: NaiveDate,
    /// Weather CSV column(s) affected, as in DESIGN.md (`"*"` for all).
    pub columns: &'static str,
    /// What was done.
    pub kind: DefectKind,
}

/// A generated record: the days (absent days left out) and the defects
/// planted in it.
#[derive(Debug, Clone, PartialEq)]
pub struct GeneratedWeather {
    /// Daily records in date order. Fields filled: tmax_c, tmin_c,
    /// rhmax_pct, rhmin_pct, wind_ms, solar_mj, rain_mm.
    pub days: Vec<WeatherDay>,
    /// The planted defects, in date order.
    pub defects: Vec<PlantedDefect>,
}

/// Size of the planted Tmax spike (°C): well beyond any day-to-day change of
/// the generated temperatures, so a spike rule with a threshold of 15 °C or
/// less finds it.
pub const SPIKE_C: f64 = 18.0;

/// Where (year offset from the first year, month, day, length in days) and
/// what each planted defect is.
const DEFECT_PLAN: [(i32, u32, u32, u32, &str, DefectKind); 8] = [
    (3, 3, 14, 1, "*", DefectKind::MissingDay),
    (7, 8, 19, 1, "rain_mm", DefectKind::Blank),
    (8, 4, 17, 1, "tmax_c", DefectKind::Spike),
    (10, 11, 2, 2, "*", DefectKind::MissingDay),
    (14, 6, 3, 36, "solar_mj", DefectKind::Blank),
    (16, 10, 5, 12, "wind_ms", DefectKind::Stuck),
    (18, 1, 10, 21, "rhmax_pct,rhmin_pct", DefectKind::Blank),
    (20, 2, 11, 1, "tmin_c", DefectKind::TminAboveTmax),
];

/// Linear interpolation of a monthly table (values at mid-month) to a day of
/// the year, wrapping from December to January. `doy` may be fractional and
/// outside 1..=len (it wraps).
fn seasonal(table: &[f64; 12], doy: f64, year_len: f64) -> f64 {
    // Month position: 0.0 at mid-January, 11.0 at mid-December.
    let position = ((doy - 0.5) / year_len * 12.0 - 0.5).rem_euclid(12.0);
    let lower = position.floor() as usize % 12;
    let upper = (lower + 1) % 12;
    let fraction = position - position.floor();
    table[lower] + fraction * (table[upper] - table[lower])
}

/// Clear-sky solar radiation Rso (MJ m⁻² day⁻¹) of a day: FAO-56 eq. 37 with
/// Ra of eq. 21 (functions of [`crate::et0::radiation`]).
fn clear_sky_radiation_of_day_mj(latitude_rad: f64, elevation_m: f64, doy: u32) -> f64 {
    clear_sky_radiation_mj(
        extraterrestrial_radiation_mj(latitude_rad, doy),
        elevation_m,
    )
}

fn round1(x: f64) -> f64 {
    (x * 10.0).round() / 10.0
}

fn normal(rng: &mut ChaCha8Rng) -> f64 {
    rng.sample(StandardNormal)
}

fn check_settings(settings: &GeneratorSettings) -> Result<(NaiveDate, NaiveDate), WeatherGenError> {
    if settings.years == 0 {
        return Err(WeatherGenError::NoYears);
    }
    let last_year = i64::from(settings.first_year) + i64::from(settings.years) - 1;
    let out_of_range = WeatherGenError::YearOutOfRange {
        first_year: settings.first_year,
        last_year,
    };
    let first = NaiveDate::from_ymd_opt(settings.first_year, 1, 1).ok_or(out_of_range.clone())?;
    let last = i32::try_from(last_year)
        .ok()
        .and_then(|y| NaiveDate::from_ymd_opt(y, 12, 31))
        .ok_or(out_of_range)?;
    let lat = settings.site.latitude_deg;
    if !(-60.0..=60.0).contains(&lat) {
        return Err(WeatherGenError::LatitudeOutOfRange { latitude_deg: lat });
    }
    if !(-450.0..=5000.0).contains(&settings.site.elevation_m) {
        return Err(WeatherGenError::ImplausibleSite {
            what: "elevation (m)",
            value: settings.site.elevation_m,
            expected: "-450 to 5000",
        });
    }
    if !(0.5..=100.0).contains(&settings.site.wind_height_m) {
        return Err(WeatherGenError::ImplausibleSite {
            what: "wind height (m)",
            value: settings.site.wind_height_m,
            expected: "0.5 to 100",
        });
    }
    Ok((first, last))
}

/// Per-year draws.
struct YearDraws {
    /// Wet-season strength (log-normal, mean 1).
    strength: f64,
    /// Shift of the seasonal tables (days, positive = late season).
    shift_days: f64,
}

/// Generates an invented daily weather record; see the module documentation.
///
/// # Errors
/// [`WeatherGenError`] for zero years, years outside the date range, a
/// latitude beyond ±60° or an implausible elevation or wind height.
pub fn generate_invented_weather(
    settings: &GeneratorSettings,
) -> Result<GeneratedWeather, WeatherGenError> {
    let (first, last) = check_settings(settings)?;
    let mut rng = ChaCha8Rng::seed_from_u64(settings.seed);
    let unit_gamma =
        Gamma::new(RAIN_GAMMA_SHAPE, 1.0).map_err(|_| WeatherGenError::InvalidDistribution {
            what: "rain amount gamma",
        })?;
    let latitude_rad = settings.site.latitude_deg.to_radians();
    // Wind varies with height; the tables are for 10 m. Scale with the
    // 1/7 power law, good enough for invented data.
    let wind_height_scale = (settings.site.wind_height_m / 10.0).powf(1.0 / 7.0);

    let mut years = Vec::with_capacity(settings.years as usize);
    for _ in 0..settings.years {
        let z: f64 = normal(&mut rng);
        let s = YEAR_STRENGTH_LOG_SD;
        let strength = (s * z - 0.5 * s * s).exp().clamp(0.3, 2.5);
        let shift_days = (SEASON_SHIFT_SD_DAYS * normal(&mut rng)).clamp(-25.0, 25.0);
        years.push(YearDraws {
            strength,
            shift_days,
        });
    }

    let mut days = Vec::with_capacity((last - first).num_days() as usize + 1);
    let mut wet_yesterday = false;
    let mut wetness: f64 = 0.0;
    let mut tmax_anomaly = 0.0;
    let mut tmin_anomaly = 0.0;
    let mut tdew_anomaly = 0.0;
    let mut wind_log_anomaly = 0.0;
    let mut clearness_anomaly = 0.0;
    for date in days_between(first, last) {
        let year = &years[(date.year() - settings.first_year) as usize];
        let doy = day_of_year(date);
        let year_len = f64::from(days_in_year(date.year()));
        let shifted = f64::from(doy) - year.shift_days;
        let plain = f64::from(doy);

        // Rain: Markov occurrence, gamma amount.
        let pi =
            (seasonal(&WET_DAY_PROBABILITY, shifted, year_len) * year.strength.powf(0.6)).min(0.85);
        let r = RAIN_PERSISTENCE;
        let p_wet = if wet_yesterday {
            pi + r * (1.0 - pi)
        } else {
            pi * (1.0 - r)
        };
        let wet = rng.random::<f64>() < p_wet;
        let rain_mm = if wet {
            let mean = seasonal(&MEAN_WET_DAY_RAIN_MM, shifted, year_len) * year.strength.powf(0.4);
            // Gamma(k, θ) = θ · Gamma(k, 1), with θ = mean / k.
            let amount = mean / RAIN_GAMMA_SHAPE * unit_gamma.sample(&mut rng);
            round1(amount.min(250.0)).max(0.1)
        } else {
            0.0
        };
        wet_yesterday = wet;
        wetness = 0.6 * wetness + if wet { 0.4 } else { 0.0 };

        // Temperatures: normals + AR(1) anomalies + rain and dry-year effects.
        let e_max = normal(&mut rng);
        let e_min = 0.5 * e_max + 0.75_f64.sqrt() * normal(&mut rng);
        tmax_anomaly = 0.75 * tmax_anomaly + 1.5 * (1.0 - 0.75_f64 * 0.75).sqrt() * e_max;
        tmin_anomaly = 0.70 * tmin_anomaly + 1.2 * (1.0 - 0.70_f64 * 0.70).sqrt() * e_min;
        let dry_year_warming = -0.8 * year.strength.ln();
        let mut tmax =
            seasonal(&TMAX_NORMAL_C, shifted, year_len) + tmax_anomaly + dry_year_warming
                - if wet {
                    2.0 + 0.04 * rain_mm.min(50.0)
                } else {
                    0.0
                }
                - 1.5 * wetness;
        let mut tmin = seasonal(&TMIN_NORMAL_C, shifted, year_len)
            + tmin_anomaly
            + 0.3 * dry_year_warming
            + if wet { 0.4 } else { 0.0 };
        tmax = round1(tmax);
        tmin = round1(tmin.min(tmax - 3.0));

        // Humidity from a dewpoint below Tmin.
        tdew_anomaly = 0.8 * tdew_anomaly + 1.8 * (1.0 - 0.8_f64 * 0.8).sqrt() * normal(&mut rng);
        let tdew_cap = tmin - 0.1 - 0.4 * normal(&mut rng).abs();
        let tdew = (seasonal(&TDEW_NORMAL_C, shifted, year_len) + tdew_anomaly + 3.0 * wetness
            - 0.5 * dry_year_warming)
            .min(tdew_cap);
        let ea = saturation_vapour_pressure_kpa(tdew);
        let rhmax = round1((100.0 * ea / saturation_vapour_pressure_kpa(tmin)).min(100.0));
        let rhmin = round1((100.0 * ea / saturation_vapour_pressure_kpa(tmax)).min(rhmax));

        // Radiation: clearness of Rso.
        clearness_anomaly = 0.5 * clearness_anomaly + 0.04 * normal(&mut rng);
        let mut clearness =
            seasonal(&DRY_DAY_CLEARNESS, shifted, year_len) + clearness_anomaly - 0.25 * wetness;
        if wet {
            clearness *= 0.85 - 0.3 * (rain_mm / 40.0).min(1.0);
        }
        let rso = clear_sky_radiation_of_day_mj(latitude_rad, settings.site.elevation_m, doy);
        let solar = ((clearness.clamp(0.22, 0.97) * rso * 10.0).floor()) / 10.0;

        // Wind.
        wind_log_anomaly = 0.6 * wind_log_anomaly + 0.25 * 0.8 * normal(&mut rng);
        let wind = round1(
            (seasonal(&WIND_10M_NORMAL_MS, plain, year_len)
                * wind_height_scale
                * wind_log_anomaly.exp()
                * if wet { 1.1 } else { 1.0 })
            .max(0.3),
        );

        let mut day = WeatherDay::empty(date);
        day.tmax_c = Some(tmax);
        day.tmin_c = Some(tmin);
        day.rhmax_pct = Some(rhmax);
        day.rhmin_pct = Some(rhmin);
        day.wind_ms = Some(wind);
        day.solar_mj = Some(solar);
        day.rain_mm = Some(rain_mm);
        days.push(day);
    }

    let mut defects = Vec::new();
    if settings.plant_defects {
        plant_defects(settings.first_year, &mut days, &mut defects);
    }
    Ok(GeneratedWeather { days, defects })
}

fn plant_defects(first_year: i32, days: &mut Vec<WeatherDay>, defects: &mut Vec<PlantedDefect>) {
    let first_day = days.first().map(|d| d.date);
    let Some(first_day) = first_day else {
        return;
    };
    let index_of = |date: NaiveDate| (date - first_day).num_days() as usize;
    let mut absent = Vec::new();
    for &(year_offset, month, day, len, columns, kind) in &DEFECT_PLAN {
        let Some(start) = NaiveDate::from_ymd_opt(first_year + year_offset, month, day) else {
            continue;
        };
        let end = start + chrono::Days::new(u64::from(len) - 1);
        let (i0, i1) = (index_of(start), index_of(end));
        if i1 >= days.len() {
            continue; // the record is too short for this defect
        }
        match kind {
            DefectKind::MissingDay => absent.extend(i0..=i1),
            DefectKind::Blank => {
                for d in &mut days[i0..=i1] {
                    match columns {
                        "rain_mm" => d.rain_mm = None,
                        "solar_mj" => d.solar_mj = None,
                        _ => {
                            d.rhmax_pct = None;
                            d.rhmin_pct = None;
                        }
                    }
                }
            }
            DefectKind::Spike => {
                let d = &mut days[i0];
                d.tmax_c = d.tmax_c.map(|t| round1(t + SPIKE_C));
            }
            DefectKind::Stuck => {
                let stuck = days[i0].wind_ms;
                for d in &mut days[i0..=i1] {
                    d.wind_ms = stuck;
                }
            }
            DefectKind::TminAboveTmax => {
                // A typing slip: Tmin entered 1.5 °C above that day's Tmax.
                let d = &mut days[i0];
                d.tmin_c = d.tmax_c.map(|t| round1(t + 1.5));
            }
        }
        defects.push(PlantedDefect {
            first: start,
            last: end,
            columns,
            kind,
        });
    }
    // Remove absent days last, from the end, so indices above stay valid.
    absent.sort_unstable();
    for i in absent.into_iter().rev() {
        days.remove(i);
    }
    defects.sort_by_key(|d| d.first);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn seasonal_hits_mid_month_values() {
        let t = [0.0, 1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0, 11.0];
        // Mid-January of a 365-day year: position (15.7/365·12 − 0.5) ≈ 0.016.
        assert!(seasonal(&t, 15.7, 365.0).abs() < 0.05);
        // Between mid-December and mid-January the value wraps 11 → 0.
        let new_year = seasonal(&t, 0.5, 365.0);
        assert!(new_year > 5.0 && new_year < 11.0);
    }

    /// Solar radiation never exceeds the clear-sky radiation Rso of its day.
    #[test]
    fn solar_never_above_clear_sky() {
        let settings = GeneratorSettings::demo();
        let weather = generate_invented_weather(&settings).expect("ok");
        let lat = settings.site.latitude_deg.to_radians();
        for day in &weather.days {
            if let Some(rs) = day.solar_mj {
                let rso = clear_sky_radiation_of_day_mj(
                    lat,
                    settings.site.elevation_m,
                    day_of_year(day.date),
                );
                assert!(rs <= rso, "{}: {rs} > {rso}", day.date);
            }
        }
    }
}
