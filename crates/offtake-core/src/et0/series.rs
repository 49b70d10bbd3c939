//! Day-series ET₀: the FAO-56 missing-data procedures applied day by day.
//!
//! [`Et0Context`] validates the station and options once and caches Ra and N
//! for every day of the year; [`Et0Context::day`] computes one day (usable in
//! a streaming loop); [`et0_daily_series`] maps a whole series.
//!
//! # Procedures (FAO-56 Chapter 3, "missing data", pp. 56–64)
//! * Temperature: Tmax and Tmin are required; Tmean = (Tmax + Tmin)/2 (eq. 9),
//!   a measured `tmean_c` is not used (FAO-56 standardization).
//! * Humidity, first available of: `ea_kpa`; `tdew_c` (eq. 14); `rhmax_pct` +
//!   `rhmin_pct` (eq. 17); `rhmax_pct` (eq. 18); `rhmean_pct` (eq. 19); else
//!   Tmin (eq. 48, minus the arid offset of the options).
//! * Radiation, first available of: measured `solar_mj`; `sunshine_h` (eq. 35);
//!   else the temperature range (eq. 50, kRs from the options, Rs ≤ Rso).
//! * Wind: `wind_ms` at the station's height converted by eq. 47, raised to at
//!   least 0.5 m/s (FAO-56 p. 63 limit for eq. 6, settable); else 2 m/s (FAO-56 p. 63).
//! * Rso: eq. 37 (elevation), or eq. 36 when the Ångström coefficients are
//!   marked calibrated.
//!
//! # Validity checks (typed per-day errors, never NaN)
//! Every value present on a day that ET₀ may use is checked, whichever method
//! runs: finite; Tmin ≤ Tmax; relative humidity within 0..=100 % give or take
//! `rh_tolerance_pct` (values within the tolerance are limited to 0..=100);
//! wind, solar radiation, sunshine and ea not negative; sunshine not more than
//! N + `sunshine_tolerance_h`.
//!
//! # Negative ET₀
//! On rare days (polar winter, fog) Rn − G is negative and the air near
//! saturation, and eq. 6 returns a small negative value (condensation). FAO-56
//! practice for water-requirement work is to count such days as zero demand;
//! by default ET₀ is clipped at 0 and the day is marked `clipped_to_zero`.
//! Set [`Et0Options::clip_negative`] to `false` to keep the raw value.

use chrono::{Datelike, NaiveDate};
use serde::{Deserialize, Serialize};

use super::atmosphere::{atmospheric_pressure_kpa, saturation_vapour_pressure_kpa};
use super::daily::{DailyInputs, DailyReference, DaySun, daily_steps_with_saturation};
use super::error::{Et0Error, require_finite};
use super::hargreaves::et0_hargreaves_samani_mm_day;
use super::method::Et0Method;
use super::radiation::{
    Angstrom, clear_sky_radiation_angstrom_mj, clear_sky_radiation_mj, krs,
    solar_radiation_from_sunshine_mj, solar_radiation_from_temperature_mj,
};
use super::wind::{DEFAULT_WIND_2M_MS, wind_height_factor};
use crate::units::MM_DAY_PER_MJ_M2_DAY;
use crate::weather::{StationSite, WeatherDay};

/// Lowest accepted station elevation (m); the shore of the lowest inland sea is about −430 m.
pub const MIN_ELEVATION_M: f64 = -450.0;
/// Highest accepted station elevation (m).
pub const MAX_ELEVATION_M: f64 = 9000.0;
/// Lower limit of u2 applied in eq. 6 (m/s): FAO-56 p. 63 (Chapter 3, wind speed).
pub const MIN_WIND_2M_MS: f64 = 0.5;

/// Settings of the day-series ET₀ computation.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Et0Options {
    /// Reference ET method.
    pub method: Et0Method,
    /// Ångström coefficients for Rs from sunshine (eq. 35); default 0.25/0.50.
    pub angstrom: Angstrom,
    /// Whether `angstrom` is locally calibrated; if so Rso = (a_s + b_s) Ra (eq. 36),
    /// else Rso = (0.75 + 2×10⁻⁵ z) Ra (eq. 37). Default false.
    pub angstrom_calibrated: bool,
    /// kRs of eq. 50 (°C⁻⁰·⁵): 0.16 interior (default), 0.19 coastal.
    pub krs: f64,
    /// Degrees the dewpoint is taken below Tmin when humidity is missing (eq. 48):
    /// 0 (default) humid/subhumid, 2–3 °C arid (FAO-56 p. 58).
    pub arid_tmin_offset_c: f64,
    /// u2 used when wind is missing (m/s); default 2.0 (FAO-56 p. 63).
    pub default_wind_2m_ms: f64,
    /// Lower limit on u2 from measurements (m/s); default 0.5 (FAO-56 p. 63).
    pub min_wind_2m_ms: f64,
    /// Tolerance on relative humidity beyond 0..=100 % before a day is rejected (%); default 3.
    pub rh_tolerance_pct: f64,
    /// Tolerance on sunshine beyond the day length N before a day is rejected (h); default 0.5.
    pub sunshine_tolerance_h: f64,
    /// Clip negative ET₀ to zero (default true; see the module documentation).
    pub clip_negative: bool,
}

impl Default for Et0Options {
    fn default() -> Self {
        Self {
            method: Et0Method::PenmanMonteith,
            angstrom: Angstrom::default(),
            angstrom_calibrated: false,
            krs: krs::INTERIOR,
            arid_tmin_offset_c: 0.0,
            default_wind_2m_ms: DEFAULT_WIND_2M_MS,
            min_wind_2m_ms: MIN_WIND_2M_MS,
            rh_tolerance_pct: 3.0,
            sunshine_tolerance_h: 0.5,
            clip_negative: true,
        }
    }
}

/// Where a day's air humidity came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[non_exhaustive]
pub enum HumiditySource {
    /// Measured actual vapour pressure `ea_kpa`.
    MeasuredEa,
    /// Dewpoint temperature, FAO-56 eq. 14.
    Dewpoint,
    /// RHmax and RHmin, FAO-56 eq. 17.
    RhMaxMin,
    /// RHmax only, FAO-56 eq. 18.
    RhMax,
    /// RHmean, FAO-56 eq. 19.
    RhMean,
    /// Estimated from Tmin, FAO-56 eq. 48 (missing humidity).
    FromTmin,
    /// The method does not use humidity (Hargreaves–Samani).
    NotUsed,
}

/// Where a day's solar radiation came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[non_exhaustive]
pub enum RadiationSource {
    /// Measured `solar_mj`.
    Measured,
    /// Sunshine duration with the Ångström formula, FAO-56 eq. 35.
    Sunshine,
    /// Temperature range, FAO-56 eq. 50 (missing radiation).
    TemperatureRange,
    /// The method uses Ra only (Hargreaves–Samani).
    NotUsed,
}

/// Where a day's wind speed came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[non_exhaustive]
pub enum WindSource {
    /// Measured, converted to 2 m by FAO-56 eq. 47.
    Measured,
    /// Measured, but below the lower limit and raised to it.
    RaisedToMinimum,
    /// Missing: the default (2 m/s, FAO-56 p. 63).
    Default,
    /// The method does not use wind (Hargreaves–Samani).
    NotUsed,
}

macro_rules! labels {
    ($t:ty { $($v:ident => $s:literal),* $(,)? }) => {
        impl $t {
            /// Short machine-readable label (for CSV columns).
            pub fn label(self) -> &'static str {
                match self { $(Self::$v => $s),* }
            }
        }
    };
}
labels!(HumiditySource { MeasuredEa => "ea", Dewpoint => "tdew", RhMaxMin => "rhmax_rhmin",
    RhMax => "rhmax", RhMean => "rhmean", FromTmin => "tmin", NotUsed => "none" });
labels!(RadiationSource { Measured => "measured", Sunshine => "sunshine",
    TemperatureRange => "temperature_range", NotUsed => "none" });
labels!(WindSource { Measured => "measured", RaisedToMinimum => "raised_to_minimum",
    Default => "default", NotUsed => "none" });

/// Which FAO-56 procedures produced a day's ET₀.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct DayProcedures {
    /// Source of ea.
    pub humidity: HumiditySource,
    /// Source of Rs.
    pub radiation: RadiationSource,
    /// Source of u2.
    pub wind: WindSource,
    /// The raw ET₀ was negative and was set to zero.
    pub clipped_to_zero: bool,
}

/// ET₀ of one day.
///
/// `et0_mm` is `Some` exactly when `outcome` is `Ok`.
#[derive(Debug, Clone, PartialEq)]
pub struct Et0DayResult {
    /// The date of the weather record.
    pub date: NaiveDate,
    /// Reference ET (mm/day), `None` when the day cannot be computed. Never NaN.
    pub et0_mm: Option<f64>,
    /// The procedures used, or why the day could not be computed.
    pub outcome: Result<DayProcedures, Et0Error>,
}

/// A validated station with options and a per-day-of-year cache of Ra and N.
#[derive(Debug, Clone)]
pub struct Et0Context {
    options: Et0Options,
    elevation_m: f64,
    pressure_kpa: f64,
    wind_factor: f64,
    /// Ra, N and Rso indexed by day of year (index 0 unused).
    sun: Vec<(DaySun, f64)>,
    reference: DailyReference,
}

impl Et0Context {
    /// Validates the station and the options and fills the Ra/N cache.
    ///
    /// # Errors
    /// [`Et0Error::LatitudeOutOfRange`], [`Et0Error::ElevationOutOfRange`],
    /// [`Et0Error::WindHeightOutOfRange`], or [`Et0Error::NotFinite`] /
    /// [`Et0Error::Negative`] for an unusable option.
    pub fn new(site: &StationSite, options: &Et0Options) -> Result<Self, Et0Error> {
        if !(-90.0..=90.0).contains(&site.latitude_deg) {
            return Err(Et0Error::LatitudeOutOfRange {
                latitude_deg: site.latitude_deg,
            });
        }
        if !(MIN_ELEVATION_M..=MAX_ELEVATION_M).contains(&site.elevation_m) {
            return Err(Et0Error::ElevationOutOfRange {
                elevation_m: site.elevation_m,
                min_m: MIN_ELEVATION_M,
                max_m: MAX_ELEVATION_M,
            });
        }
        let wind_factor = wind_height_factor(site.wind_height_m)?;
        for (name, v) in [
            ("krs", options.krs),
            ("angstrom.a_s", options.angstrom.a_s),
            ("angstrom.b_s", options.angstrom.b_s),
            ("arid_tmin_offset_c", options.arid_tmin_offset_c),
            ("default_wind_2m_ms", options.default_wind_2m_ms),
            ("min_wind_2m_ms", options.min_wind_2m_ms),
            ("rh_tolerance_pct", options.rh_tolerance_pct),
            ("sunshine_tolerance_h", options.sunshine_tolerance_h),
        ] {
            require_non_negative(name, v)?;
        }
        let latitude_rad = site.latitude_deg.to_radians();
        let sun = (0..=366u32)
            .map(|j| {
                let s = DaySun::new(latitude_rad, j.max(1));
                let rso = if options.angstrom_calibrated {
                    clear_sky_radiation_angstrom_mj(s.ra_mj, options.angstrom) // Eq. 36
                } else {
                    clear_sky_radiation_mj(s.ra_mj, site.elevation_m) // Eq. 37
                };
                (s, rso)
            })
            .collect();
        let reference = match options.method {
            Et0Method::AsceShort => DailyReference::AsceShort,
            Et0Method::AsceTall => DailyReference::AsceTall,
            Et0Method::PenmanMonteith | Et0Method::HargreavesSamani => DailyReference::Fao56,
        };
        Ok(Self {
            options: *options,
            elevation_m: site.elevation_m,
            pressure_kpa: atmospheric_pressure_kpa(site.elevation_m), // Eq. 7
            wind_factor,
            sun,
            reference,
        })
    }

    /// The options in force.
    pub fn options(&self) -> &Et0Options {
        &self.options
    }

    /// Station elevation (m).
    pub fn elevation_m(&self) -> f64 {
        self.elevation_m
    }

    /// Cached Ra (MJ m⁻² day⁻¹) and N (h) for a day of year 1..=366.
    pub fn sun(&self, day_of_year: u32) -> DaySun {
        self.sun[day_of_year.clamp(1, 366) as usize].0
    }

    /// ET₀ of one day of weather.
    pub fn day(&self, day: &WeatherDay) -> Et0DayResult {
        match self.compute(day) {
            Ok((et0, procedures)) => Et0DayResult {
                date: day.date,
                et0_mm: Some(et0),
                outcome: Ok(procedures),
            },
            Err(e) => Et0DayResult {
                date: day.date,
                et0_mm: None,
                outcome: Err(e),
            },
        }
    }

    /// ET₀ (mm/day) of one day, or why it cannot be computed.
    ///
    /// # Errors
    /// The per-day [`Et0Error`] variants listed in the module documentation.
    pub fn et0_mm_day(&self, day: &WeatherDay) -> Result<f64, Et0Error> {
        self.compute(day).map(|(e, _)| e)
    }

    fn compute(&self, day: &WeatherDay) -> Result<(f64, DayProcedures), Et0Error> {
        let o = &self.options;
        let tmax = require_finite(
            "tmax_c",
            day.tmax_c
                .ok_or(Et0Error::MissingTemperature { quantity: "tmax_c" })?,
        )?;
        let tmin = require_finite(
            "tmin_c",
            day.tmin_c
                .ok_or(Et0Error::MissingTemperature { quantity: "tmin_c" })?,
        )?;
        if tmin > tmax {
            return Err(Et0Error::TminAboveTmax {
                tmin_c: tmin,
                tmax_c: tmax,
            });
        }
        let rhmax = checked_rh("rhmax_pct", day.rhmax_pct, o.rh_tolerance_pct)?;
        let rhmin = checked_rh("rhmin_pct", day.rhmin_pct, o.rh_tolerance_pct)?;
        let rhmean = checked_rh("rhmean_pct", day.rhmean_pct, o.rh_tolerance_pct)?;
        let tdew = optional_finite("tdew_c", day.tdew_c)?;
        let ea_measured = optional_non_negative("ea_kpa", day.ea_kpa)?;
        let wind = optional_non_negative("wind_ms", day.wind_ms)?;
        let solar = optional_non_negative("solar_mj", day.solar_mj)?;
        let sunshine = optional_non_negative("sunshine_h", day.sunshine_h)?;

        let (sun, rso) = self.sun[day.date.ordinal() as usize];
        if let Some(n) = sunshine
            && n > sun.daylight_h + o.sunshine_tolerance_h
        {
            return Err(Et0Error::SunshineExceedsDaylength {
                sunshine_h: n,
                daylight_h: sun.daylight_h,
            });
        }

        if o.method == Et0Method::HargreavesSamani {
            let et = et0_hargreaves_samani_mm_day(tmax, tmin, MM_DAY_PER_MJ_M2_DAY * sun.ra_mj); // Eq. 52
            return Ok(self.finish(
                et,
                HumiditySource::NotUsed,
                RadiationSource::NotUsed,
                WindSource::NotUsed,
            ));
        }

        let e_tmax = saturation_vapour_pressure_kpa(tmax); // Eq. 11
        let e_tmin = saturation_vapour_pressure_kpa(tmin); // Eq. 11
        let (ea, humidity) = if let Some(ea) = ea_measured {
            (ea, HumiditySource::MeasuredEa)
        } else if let Some(td) = tdew {
            (saturation_vapour_pressure_kpa(td), HumiditySource::Dewpoint) // Eq. 14
        } else if let (Some(hi), Some(lo)) = (rhmax, rhmin) {
            (
                0.5 * (e_tmin * hi + e_tmax * lo) / 100.0,
                HumiditySource::RhMaxMin,
            ) // Eq. 17
        } else if let Some(hi) = rhmax {
            (e_tmin * hi / 100.0, HumiditySource::RhMax) // Eq. 18
        } else if let Some(m) = rhmean {
            (m / 100.0 * 0.5 * (e_tmax + e_tmin), HumiditySource::RhMean) // Eq. 19
        } else if o.arid_tmin_offset_c == 0.0 {
            (e_tmin, HumiditySource::FromTmin) // Eq. 48
        } else {
            (
                saturation_vapour_pressure_kpa(tmin - o.arid_tmin_offset_c),
                HumiditySource::FromTmin,
            ) // Eq. 48
        };

        let (rs, radiation) = if let Some(rs) = solar {
            (rs, RadiationSource::Measured)
        } else if let Some(n) = sunshine {
            (
                solar_radiation_from_sunshine_mj(n, sun.daylight_h, sun.ra_mj, o.angstrom),
                RadiationSource::Sunshine,
            ) // Eq. 35
        } else {
            (
                solar_radiation_from_temperature_mj(tmax, tmin, sun.ra_mj, o.krs, rso),
                RadiationSource::TemperatureRange,
            ) // Eq. 50
        };

        let (u2, wind_source) = match wind {
            Some(u) => {
                let u2 = u * self.wind_factor; // Eq. 47
                if u2 < o.min_wind_2m_ms {
                    (o.min_wind_2m_ms, WindSource::RaisedToMinimum)
                } else {
                    (u2, WindSource::Measured)
                }
            }
            None => (o.default_wind_2m_ms, WindSource::Default),
        };

        let steps = daily_steps_with_saturation(
            self.pressure_kpa,
            &DailyInputs {
                tmax_c: tmax,
                tmin_c: tmin,
                ea_kpa: ea,
                wind_2m_ms: u2,
                rs_mj: rs,
                rso_mj: rso,
                soil_heat_flux_mj: 0.0, // Eq. 42
            },
            e_tmax,
            e_tmin,
            self.reference,
        );
        Ok(self.finish(steps.et_mm_day, humidity, radiation, wind_source))
    }

    fn finish(
        &self,
        et: f64,
        humidity: HumiditySource,
        radiation: RadiationSource,
        wind: WindSource,
    ) -> (f64, DayProcedures) {
        let clipped = self.options.clip_negative && et < 0.0;
        (
            if clipped { 0.0 } else { et },
            DayProcedures {
                humidity,
                radiation,
                wind,
                clipped_to_zero: clipped,
            },
        )
    }
}

fn require_non_negative(quantity: &'static str, value: f64) -> Result<f64, Et0Error> {
    let v = require_finite(quantity, value)?;
    if v < 0.0 {
        Err(Et0Error::Negative { quantity, value: v })
    } else {
        Ok(v)
    }
}

fn optional_finite(quantity: &'static str, value: Option<f64>) -> Result<Option<f64>, Et0Error> {
    value.map(|v| require_finite(quantity, v)).transpose()
}

fn optional_non_negative(
    quantity: &'static str,
    value: Option<f64>,
) -> Result<Option<f64>, Et0Error> {
    value.map(|v| require_non_negative(quantity, v)).transpose()
}

fn checked_rh(
    quantity: &'static str,
    value: Option<f64>,
    tolerance_pct: f64,
) -> Result<Option<f64>, Et0Error> {
    match value {
        None => Ok(None),
        Some(v) if !v.is_finite() => Err(Et0Error::NotFinite { quantity, value: v }),
        Some(v) if v >= -tolerance_pct && v <= 100.0 + tolerance_pct => {
            Ok(Some(v.clamp(0.0, 100.0)))
        }
        Some(v) => Err(Et0Error::RelativeHumidityOutOfRange {
            quantity,
            value_pct: v,
        }),
    }
}

impl Et0Context {
    /// ET₀ of every day of `days`, written into `out` (cleared first).
    ///
    /// Reusing `out` between recomputations avoids reallocating the result
    /// buffer, which matters when the app recomputes on every edit.
    pub fn series_into(&self, days: &[WeatherDay], out: &mut Vec<Et0DayResult>) {
        out.clear();
        out.extend(days.iter().map(|d| self.day(d)));
    }
}

/// ET₀ of one day (free-function form of [`Et0Context::day`]).
pub fn et0_day(context: &Et0Context, day: &WeatherDay) -> Et0DayResult {
    context.day(day)
}

/// ET₀ of every day of a weather series, in order.
///
/// # Errors
/// Station and option errors of [`Et0Context::new`]; per-day problems are in
/// each result's `outcome` instead.
pub fn et0_daily_series(
    site: &StationSite,
    days: &[WeatherDay],
    options: &Et0Options,
) -> Result<Vec<Et0DayResult>, Et0Error> {
    let context = Et0Context::new(site, options)?;
    Ok(days.iter().map(|d| context.day(d)).collect())
}
