//! Station limits: values a station cannot have recorded, treated as missing.
//!
//! The quality checks ([`crate::quality`]) flag values outside physical
//! limits; a value can be inside them and still impossible for the station
//! (a Tmax of 55 °C in a record whose mid-April maxima lie near 35 °C). Each
//! variable gets station limits:
//!
//! - **set by the user** (`options.station_limits.limits` in the project: a
//!   minimum and/or maximum per weather column), else
//! - **the series' own day-of-year climatology ± 5 standard deviations**: for
//!   each day, the mean and standard deviation of the other measured values
//!   of the same variable within ± `half_window_days` days of the year (the
//!   gap-filling climatology window, default 7 days, i.e. 15 days), over all
//!   years. The day's own value is left out of its limits (so one wild value
//!   cannot widen the band that judges it). A band needs at least
//!   [`MIN_CLIMATOLOGY_VALUES`] values and a standard deviation above zero;
//!   otherwise the day has no climatology limit for that variable. Five
//!   standard deviations is our choice (common practice for screening daily
//!   weather records, wide enough that a normal variable passes all but about
//!   one value in 1.7 million).
//!
//! The climatology band applies to the temperatures ([`CLIMATOLOGY_VARIABLES`]:
//! Tmax, Tmin, Tmean, dewpoint), whose daily values scatter nearly normally
//! about their seasonal mean. Rain, radiation, sunshine, humidity and wind are
//! skewed: a storm, an overcast or humid day, a gale lies many standard
//! deviations from the mean and is real (on the demo record a band on solar
//! radiation removed the low values of rainy days). Those variables get
//! station limits only from the user; their physical limits stay flagged by
//! the quality checks.
//!
//! A value beyond its limits is treated as missing, then filled by the
//! project's gap-filling method like any gap (its fill mark says how), and
//! listed ([`OutOfLimits`]) so that the run reports what was replaced. With
//! `keep_out_of_limit_values` the values are listed and kept as measured.

use chrono::{Datelike, NaiveDate};
use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::quality::Variable;
use crate::weather::WeatherDay;

/// Number of standard deviations of the day-of-year climatology that bound a
/// value when the user gives no limit (our choice; see the module docs).
pub const CLIMATOLOGY_SD_MULTIPLE: f64 = 5.0;

/// The variables that get a climatology band when the user gives no limit.
pub const CLIMATOLOGY_VARIABLES: [Variable; 4] = [
    Variable::Tmax,
    Variable::Tmin,
    Variable::Tmean,
    Variable::Tdew,
];

/// Fewest other measured values a day-of-year band needs before it limits a
/// value (common practice: about two per year over 15 years of 15-day windows
/// is far more; 30 keeps the mean and standard deviation stable).
pub const MIN_CLIMATOLOGY_VALUES: usize = 30;

/// The user's limits of one weather variable.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct VariableLimits {
    /// The weather column, e.g. `"tmax_c"` (see [`Variable::name`]).
    pub variable: String,
    /// Smallest value the station can record, in the column's unit.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub min: Option<f64>,
    /// Largest value the station can record, in the column's unit.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max: Option<f64>,
}

/// The project's station-limit choices (`options.station_limits`); omitted
/// from the file when it is the default (no user limits, values replaced).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StationLimits {
    /// Keep values beyond the limits as measured (they are still listed).
    #[serde(default, skip_serializing_if = "is_false")]
    pub keep_out_of_limit_values: bool,
    /// The user's limits; a variable not listed uses the climatology band.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub limits: Vec<VariableLimits>,
}

#[expect(
    clippy::trivially_copy_pass_by_ref,
    reason = "serde's skip_serializing_if passes a reference"
)]
fn is_false(b: &bool) -> bool {
    !*b
}

impl StationLimits {
    /// True for the default (not written to files).
    pub fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// Where a limit came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum LimitSource {
    /// Set by the user in the project.
    User,
    /// The series' day-of-year climatology ± 5 standard deviations.
    Climatology,
}

impl LimitSource {
    /// Words for reports.
    pub fn label(self) -> &'static str {
        match self {
            Self::User => "the station limit set in the project",
            Self::Climatology => "the day-of-year climatology ± 5 standard deviations",
        }
    }
}

/// One value beyond its station limits.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OutOfLimits {
    /// The day.
    pub date: NaiveDate,
    /// The variable.
    pub variable: Variable,
    /// The recorded value.
    pub value: f64,
    /// Lower limit (−∞ when there is none).
    pub low: f64,
    /// Upper limit (+∞ when there is none).
    pub high: f64,
    /// Where the limits came from.
    pub source: LimitSource,
}

/// A record screened against its station limits.
#[derive(Debug, Clone, PartialEq)]
pub struct Screened {
    /// The days, with every value beyond its limits removed (unless kept).
    pub days: Vec<WeatherDay>,
    /// Every value beyond its limits, in date order.
    pub out_of_limits: Vec<OutOfLimits>,
    /// Whether the values were kept as measured.
    pub kept: bool,
}

/// Bad station limits in a project.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum StationLimitsError {
    /// The column name is not a weather column.
    #[error(
        "options.station_limits: `{name}` is not a weather column (expected one of tmax_c, tmin_c, tmean_c, rhmax_pct, rhmin_pct, rhmean_pct, tdew_c, ea_kpa, wind_ms, solar_mj, sunshine_h, rain_mm)"
    )]
    UnknownVariable {
        /// The name given.
        name: String,
    },
    /// A limit is not a finite number, or the minimum is not below the maximum.
    #[error(
        "options.station_limits: {variable} limits min {min:?}, max {max:?}: expected finite numbers with min below max"
    )]
    BadRange {
        /// The column.
        variable: String,
        /// The minimum given.
        min: Option<f64>,
        /// The maximum given.
        max: Option<f64>,
    },
    /// The same column is listed twice.
    #[error("options.station_limits: {variable} is listed twice; give one min/max pair")]
    Duplicate {
        /// The column.
        variable: String,
    },
}

/// The user's limits by [`Variable::ALL`] index, checked.
fn user_limits(limits: &StationLimits) -> Result<[Option<(f64, f64)>; 12], StationLimitsError> {
    let mut out = [None; 12];
    for l in &limits.limits {
        let v = Variable::ALL
            .into_iter()
            .find(|v| v.name() == l.variable)
            .ok_or_else(|| StationLimitsError::UnknownVariable {
                name: l.variable.clone(),
            })?;
        let bad = || StationLimitsError::BadRange {
            variable: l.variable.clone(),
            min: l.min,
            max: l.max,
        };
        let lo = l.min.unwrap_or(f64::NEG_INFINITY);
        let hi = l.max.unwrap_or(f64::INFINITY);
        if l.min.is_some_and(|x| !x.is_finite())
            || l.max.is_some_and(|x| !x.is_finite())
            || lo >= hi
        {
            return Err(bad());
        }
        if out[v.index()].is_some() {
            return Err(StationLimitsError::Duplicate {
                variable: l.variable.clone(),
            });
        }
        out[v.index()] = Some((lo, hi));
    }
    Ok(out)
}

/// Slot 0..365 of a date on a 365-day calendar (29 February shares 28
/// February's slot).
fn slot_365(date: NaiveDate) -> usize {
    let ordinal = date.ordinal0() as usize;
    if date.leap_year() && ordinal >= 59 {
        ordinal - 1
    } else {
        ordinal
    }
}

/// Sums of the measured values per day-of-year slot, then over the window.
#[derive(Clone, Copy, Default)]
struct Moments {
    n: usize,
    sum: f64,
    sum_sq: f64,
}

fn windowed_moments(
    days: &[WeatherDay],
    variable: Variable,
    half_window_days: u32,
) -> Vec<Moments> {
    let mut per_slot = vec![Moments::default(); 365];
    for d in days {
        if let Some(x) = variable.get(d).filter(|x| x.is_finite()) {
            let m = &mut per_slot[slot_365(d.date)];
            m.n += 1;
            m.sum += x;
            m.sum_sq += x * x;
        }
    }
    let h = (half_window_days as usize).min(182);
    (0..365)
        .map(|s| {
            let mut w = Moments::default();
            for k in 0..=2 * h {
                let m = per_slot[(s + 365 + k - h) % 365];
                w.n += m.n;
                w.sum += m.sum;
                w.sum_sq += m.sum_sq;
            }
            w
        })
        .collect()
}

/// The climatology band of value `x` in a window with moments `w` that
/// include `x`: mean ± 5 sd of the other values, or `None` when they are too
/// few or constant.
fn band_without(w: Moments, x: f64) -> Option<(f64, f64)> {
    let n = w.n.checked_sub(1)?;
    if n < MIN_CLIMATOLOGY_VALUES {
        return None;
    }
    let nf = n as f64;
    let mean = (w.sum - x) / nf;
    let var = ((w.sum_sq - x * x) - nf * mean * mean) / (nf - 1.0);
    let sd = var.max(0.0).sqrt();
    (sd > 1e-9 * mean.abs().max(1.0)).then_some((
        mean - CLIMATOLOGY_SD_MULTIPLE * sd,
        mean + CLIMATOLOGY_SD_MULTIPLE * sd,
    ))
}

/// Screens `days` against the station limits: the user's where given, else
/// the day-of-year climatology ± 5 standard deviations for the
/// [`CLIMATOLOGY_VARIABLES`]. Values beyond are removed (left missing for the gap filling)
/// unless `limits.keep_out_of_limit_values`; every one is listed.
///
/// # Errors
/// [`StationLimitsError`] for a user limit on an unknown column, a limit that
/// is not finite, a minimum not below its maximum, or a column listed twice.
pub fn screen_station_limits(
    days: &[WeatherDay],
    limits: &StationLimits,
    half_window_days: u32,
) -> Result<Screened, StationLimitsError> {
    let user = user_limits(limits)?;
    let mut out_of_limits = Vec::new();
    for variable in Variable::ALL {
        let fixed = user[variable.index()];
        if fixed.is_none() && !CLIMATOLOGY_VARIABLES.contains(&variable) {
            continue;
        }
        let moments = if fixed.is_none() {
            windowed_moments(days, variable, half_window_days)
        } else {
            Vec::new()
        };
        for d in days {
            let Some(x) = variable.get(d).filter(|x| x.is_finite()) else {
                continue;
            };
            let (band, source) = match fixed {
                Some(b) => (Some(b), LimitSource::User),
                None => (
                    band_without(moments[slot_365(d.date)], x),
                    LimitSource::Climatology,
                ),
            };
            if let Some((low, high)) = band
                && !(low..=high).contains(&x)
            {
                out_of_limits.push(OutOfLimits {
                    date: d.date,
                    variable,
                    value: x,
                    low,
                    high,
                    source,
                });
            }
        }
    }
    out_of_limits.sort_by_key(|a| (a.date, a.variable));
    let kept = limits.keep_out_of_limit_values;
    let mut days = days.to_vec();
    if !kept && !out_of_limits.is_empty() {
        let mut j = 0;
        for d in &mut days {
            while j < out_of_limits.len() && out_of_limits[j].date < d.date {
                j += 1;
            }
            let mut k = j;
            while k < out_of_limits.len() && out_of_limits[k].date == d.date {
                out_of_limits[k].variable.set(d, None);
                k += 1;
            }
        }
    }
    Ok(Screened {
        days,
        out_of_limits,
        kept,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn record() -> Vec<WeatherDay> {
        // 20 invented years of Tmax varying smoothly through the year, with a
        // small day-to-day wiggle; rain 0 except one storm.
        let start = NaiveDate::from_ymd_opt(2001, 1, 1).expect("date");
        (0..7305_u64)
            .map(|i| {
                let date = start + chrono::Days::new(i);
                let doy = f64::from(date.ordinal());
                let wiggle = ((i * 7919) % 13) as f64 / 13.0 - 0.5;
                WeatherDay {
                    tmax_c: Some(30.0 + 5.0 * (doy / 58.0).sin() + 2.0 * wiggle),
                    rain_mm: Some(if i == 400 { 180.0 } else { 0.0 }),
                    ..WeatherDay::empty(date)
                }
            })
            .collect()
    }

    #[test]
    fn a_wild_value_inside_physical_limits_is_caught_and_removed() {
        let mut days = record();
        days[5000].tmax_c = Some(55.2);
        let s = screen_station_limits(&days, &StationLimits::default(), 7).expect("screens");
        assert_eq!(s.out_of_limits.len(), 1, "{:?}", s.out_of_limits);
        let o = s.out_of_limits[0];
        assert_eq!((o.date, o.variable), (days[5000].date, Variable::Tmax));
        assert_eq!(o.source, LimitSource::Climatology);
        assert!(o.high < 55.2 && o.low < o.high);
        assert_eq!(s.days[5000].tmax_c, None, "removed for the gap filling");
        assert_eq!(s.days[400].rain_mm, Some(180.0), "a storm is not screened");
    }

    #[test]
    fn the_keep_option_lists_and_keeps() {
        let mut days = record();
        days[5000].tmax_c = Some(55.2);
        let keep = StationLimits {
            keep_out_of_limit_values: true,
            ..StationLimits::default()
        };
        let s = screen_station_limits(&days, &keep, 7).expect("screens");
        assert_eq!(s.out_of_limits.len(), 1);
        assert_eq!(s.days[5000].tmax_c, Some(55.2));
        assert!(s.kept);
    }

    #[test]
    fn user_limits_replace_the_climatology_and_are_checked() {
        let days = record();
        let user = StationLimits {
            keep_out_of_limit_values: false,
            limits: vec![VariableLimits {
                variable: "tmax_c".to_owned(),
                min: None,
                max: Some(34.0),
            }],
        };
        let s = screen_station_limits(&days, &user, 7).expect("screens");
        assert!(!s.out_of_limits.is_empty());
        assert!(s.out_of_limits.iter().all(|o| o.source == LimitSource::User
            && o.value > 34.0
            && o.high.to_bits() == 34.0_f64.to_bits()));
        for bad in [
            VariableLimits {
                variable: "tmax".to_owned(),
                min: None,
                max: Some(1.0),
            },
            VariableLimits {
                variable: "tmax_c".to_owned(),
                min: Some(40.0),
                max: Some(30.0),
            },
            VariableLimits {
                variable: "tmax_c".to_owned(),
                min: Some(f64::NAN),
                max: None,
            },
        ] {
            let l = StationLimits {
                keep_out_of_limit_values: false,
                limits: vec![bad],
            };
            assert!(screen_station_limits(&days, &l, 7).is_err());
        }
    }

    #[test]
    fn a_short_record_has_no_climatology_limit() {
        let mut days: Vec<WeatherDay> = record().into_iter().take(300).collect();
        days[100].tmax_c = Some(55.2);
        let s = screen_station_limits(&days, &StationLimits::default(), 7).expect("screens");
        assert!(
            s.out_of_limits.is_empty(),
            "15 values per window are too few"
        );
    }
}
