//! Gap filling of a daily weather series, with a mark on every value saying
//! how it was obtained.
//!
//! Short gaps (up to [`GapFillOptions::max_interpolation_days`], default 3)
//! are filled by linear interpolation between the measured neighbours. Longer
//! gaps, and gaps at either end of the record, are handled as the user
//! chooses ([`LongGapMethod`]):
//!
//! - **FAO-56 missing-data procedures** (Allen et al. 1998, Chapter 3,
//!   "Missing data"): solar radiation is left missing and marked to be
//!   estimated by the ET₀ procedure from the temperature range (eq. 50);
//!   humidity is left missing and marked to be estimated by the ET₀ procedure
//!   from Tmin (eq. 48); wind is set to a default (2 m/s, FAO-56 "Missing wind
//!   speed data", as a temporary estimate \[from memory: p. 63\]). Temperature and
//!   rain have no FAO-56 procedure and stay missing.
//! - **Day-of-year climatology** of the series itself: the mean of the
//!   measured values within a window of days of the year, over all years.
//!
//! Rain is not interpolated by default (a rain gap is not the average of its
//! neighbours); it is filled only by climatology when chosen, or not at all.
//! Filling never overwrites a measured or corrected value.

use chrono::{Datelike, NaiveDate};

use crate::quality::Variable;
use crate::weather::WeatherDay;

/// FAO-56 missing-data procedure an ET₀ computation will apply.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum Fao56Procedure {
    /// Rs from the temperature range, FAO-56 eq. 50 (Hargreaves radiation formula).
    SolarFromTemperatureRange,
    /// ea from Tmin (dewpoint ≈ Tmin), FAO-56 eq. 48.
    VapourPressureFromTmin,
}

/// How one value of a filled series was obtained.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum FillMark {
    /// Measured (as imported).
    Measured,
    /// Missing and not filled.
    Missing,
    /// Linear interpolation across a short gap.
    Interpolated,
    /// Left missing for the ET₀ computation to estimate with this procedure.
    EstimatedByEt0Procedure(Fao56Procedure),
    /// Set to the default wind speed (FAO-56 missing wind procedure).
    DefaultWind,
    /// Day-of-year mean of the series' own measured values.
    Climatology,
    /// Set by the user as a correction.
    Corrected,
}

impl FillMark {
    /// Short name for reports and CSV columns.
    pub fn name(self) -> &'static str {
        match self {
            Self::Measured => "measured",
            Self::Missing => "missing",
            Self::Interpolated => "interpolated",
            Self::EstimatedByEt0Procedure(Fao56Procedure::SolarFromTemperatureRange) => {
                "estimated_by_et0_procedure_rs_from_temperature"
            }
            Self::EstimatedByEt0Procedure(Fao56Procedure::VapourPressureFromTmin) => {
                "estimated_by_et0_procedure_ea_from_tmin"
            }
            Self::DefaultWind => "default_wind",
            Self::Climatology => "climatology",
            Self::Corrected => "corrected",
        }
    }

    /// Whether the value is not as measured (filled, estimated or corrected).
    pub fn is_not_measured(self) -> bool {
        !matches!(self, Self::Measured | Self::Missing)
    }
}

/// How gaps longer than the interpolation limit are handled.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum LongGapMethod {
    /// FAO-56 missing-data procedures (see the module documentation).
    Fao56MissingData,
    /// Day-of-year climatology of the series.
    Climatology,
}

/// Default wind speed for missing wind (m/s): FAO-56 Chapter 3, "Missing wind
/// speed data", 2 m/s as a temporary estimate (average of over 2000 stations)
/// \[from memory: FAO-56 p. 63\].
pub const FAO56_DEFAULT_WIND_MS: f64 = 2.0;

/// Gap filling choices.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GapFillOptions {
    /// Longest gap (days) filled by linear interpolation. Default 3.
    pub max_interpolation_days: u32,
    /// Method for longer gaps and gaps at the ends of the record.
    pub long_gaps: LongGapMethod,
    /// Wind speed used by the FAO-56 default-wind procedure (m/s).
    pub default_wind_ms: f64,
    /// Interpolate short rain gaps too. Default false.
    pub interpolate_rain: bool,
    /// Half-width of the climatology window in days of the year. Default 7
    /// (a 15-day window; common practice).
    pub climatology_half_window_days: u32,
    /// Fewest measured values a climatology mean needs. Default 3.
    pub climatology_min_values: usize,
}

impl Default for GapFillOptions {
    fn default() -> Self {
        Self {
            max_interpolation_days: 3,
            long_gaps: LongGapMethod::Fao56MissingData,
            default_wind_ms: FAO56_DEFAULT_WIND_MS,
            interpolate_rain: false,
            climatology_half_window_days: 7,
            climatology_min_values: 3,
        }
    }
}

/// A user's correction of one value.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Correction {
    /// The day.
    pub date: NaiveDate,
    /// The variable.
    pub variable: Variable,
    /// The corrected value (in the variable's unit).
    pub value: f64,
}

/// A series on a complete calendar with a [`FillMark`] per day and variable.
#[derive(Debug, Clone, PartialEq)]
pub struct FilledSeries {
    /// One day per calendar date from the first to the last date.
    pub days: Vec<WeatherDay>,
    /// Marks per day, indexed as [`Variable::ALL`].
    pub marks: Vec<[FillMark; 12]>,
}

impl FilledSeries {
    /// The mark of `variable` on day `index`.
    pub fn mark(&self, index: usize, variable: Variable) -> Option<FillMark> {
        self.marks.get(index).map(|m| m[variable.index()])
    }

    /// Number of days on which any of `variables` is not as measured
    /// (interpolated, estimated, defaulted, from climatology or corrected).
    pub fn days_resting_on_filled_data(&self, variables: &[Variable]) -> usize {
        self.marks
            .iter()
            .filter(|m| variables.iter().any(|v| m[v.index()].is_not_measured()))
            .count()
    }
}

/// Why a series could not be filled.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum GapFillError {
    /// Dates not strictly increasing.
    #[error("found {date} after {previous}; expected strictly increasing dates")]
    NotIncreasing {
        /// The offending date.
        date: NaiveDate,
        /// The date before it.
        previous: NaiveDate,
    },
    /// A correction for a date outside the record.
    #[error("correction for {date}: found a date outside the record {first} to {last}")]
    CorrectionOutsideRecord {
        /// The correction's date.
        date: NaiveDate,
        /// First date of the record.
        first: NaiveDate,
        /// Last date of the record.
        last: NaiveDate,
    },
    /// A correction value that is not finite.
    #[error("correction for {date} {variable}: found {value}, expected a finite number")]
    CorrectionNotFinite {
        /// The day.
        date: NaiveDate,
        /// The variable.
        variable: Variable,
        /// The value given.
        value: f64,
    },
}

/// The series on a complete calendar: every date from the first to the last,
/// with empty days where dates were missing.
///
/// # Errors
/// [`GapFillError::NotIncreasing`] if dates are not strictly increasing.
pub fn complete_calendar(days: &[WeatherDay]) -> Result<Vec<WeatherDay>, GapFillError> {
    let mut out = Vec::with_capacity(days.len());
    for day in days {
        if let Some(prev) = out.last().map(|d: &WeatherDay| d.date) {
            if day.date <= prev {
                return Err(GapFillError::NotIncreasing {
                    date: day.date,
                    previous: prev,
                });
            }
            let mut next = prev.succ_opt();
            while let Some(d) = next.filter(|d| *d < day.date) {
                out.push(WeatherDay::empty(d));
                next = d.succ_opt();
            }
        }
        out.push(*day);
    }
    Ok(out)
}

/// Fills gaps as `options` say, after applying the user's `corrections`.
///
/// The result is on a complete calendar. Measured and corrected values are
/// never changed by filling.
///
/// # Errors
/// [`GapFillError`] for unsorted dates or a correction outside the record or
/// not finite.
pub fn fill_gaps(
    days: &[WeatherDay],
    options: &GapFillOptions,
    corrections: &[Correction],
) -> Result<FilledSeries, GapFillError> {
    let mut days = complete_calendar(days)?;
    let mut marks: Vec<[FillMark; 12]> = days
        .iter()
        .map(|d| {
            let mut m = [FillMark::Missing; 12];
            for v in Variable::ALL {
                if v.get(d).is_some() {
                    m[v.index()] = FillMark::Measured;
                }
            }
            m
        })
        .collect();
    if let (Some(first), Some(last)) = (days.first().map(|d| d.date), days.last().map(|d| d.date)) {
        for c in corrections {
            if !c.value.is_finite() {
                return Err(GapFillError::CorrectionNotFinite {
                    date: c.date,
                    variable: c.variable,
                    value: c.value,
                });
            }
            let i = usize::try_from((c.date - first).num_days())
                .ok()
                .filter(|&i| i < days.len())
                .ok_or(GapFillError::CorrectionOutsideRecord {
                    date: c.date,
                    first,
                    last,
                })?;
            c.variable.set(&mut days[i], Some(c.value));
            marks[i][c.variable.index()] = FillMark::Corrected;
        }
    }
    for v in Variable::ALL {
        if days.iter().all(|d| v.get(d).is_none()) {
            continue; // not recorded at all: nothing to fill from
        }
        let climatology = match options.long_gaps {
            LongGapMethod::Climatology => Some(day_of_year_means(&days, v, options)),
            LongGapMethod::Fao56MissingData => None,
        };
        fill_variable(&mut days, &mut marks, v, options, climatology.as_ref());
    }
    Ok(FilledSeries { days, marks })
}

fn fill_variable(
    days: &mut [WeatherDay],
    marks: &mut [[FillMark; 12]],
    v: Variable,
    options: &GapFillOptions,
    climatology: Option<&Vec<Option<f64>>>,
) {
    let n = days.len();
    let mut i = 0;
    while i < n {
        if v.get(&days[i]).is_some() {
            i += 1;
            continue;
        }
        let start = i;
        while i < n && v.get(&days[i]).is_none() {
            i += 1;
        }
        let end = i; // gap is start..end
        let len = (end - start) as u32;
        let before = start.checked_sub(1).and_then(|j| v.get(&days[j]));
        let after = days.get(end).and_then(|d| v.get(d));
        let may_interpolate = v != Variable::Rain || options.interpolate_rain;
        if let (Some(a), Some(b), true) = (
            before,
            after,
            may_interpolate && len <= options.max_interpolation_days,
        ) {
            let span = f64::from(len + 1);
            for (k, j) in (start..end).enumerate() {
                let t = (k as f64 + 1.0) / span;
                v.set(&mut days[j], Some(linear_interpolation(a, b, t)));
                marks[j][v.index()] = FillMark::Interpolated;
            }
            continue;
        }
        for j in start..end {
            let mark = match (options.long_gaps, v) {
                (LongGapMethod::Climatology, _) => {
                    match climatology.and_then(|c| c[day_of_year_365(days[j].date)]) {
                        Some(x) => {
                            v.set(&mut days[j], Some(x));
                            FillMark::Climatology
                        }
                        None => FillMark::Missing,
                    }
                }
                (LongGapMethod::Fao56MissingData, Variable::Solar) => {
                    FillMark::EstimatedByEt0Procedure(Fao56Procedure::SolarFromTemperatureRange)
                }
                (
                    LongGapMethod::Fao56MissingData,
                    Variable::RhMax
                    | Variable::RhMin
                    | Variable::RhMean
                    | Variable::Tdew
                    | Variable::Ea,
                ) => FillMark::EstimatedByEt0Procedure(Fao56Procedure::VapourPressureFromTmin),
                (LongGapMethod::Fao56MissingData, Variable::Wind) => {
                    v.set(&mut days[j], Some(options.default_wind_ms));
                    FillMark::DefaultWind
                }
                _ => FillMark::Missing,
            };
            marks[j][v.index()] = mark;
        }
    }
}

/// Linear interpolation between `a` (at t = 0) and `b` (at t = 1).
fn linear_interpolation(a: f64, b: f64, t: f64) -> f64 {
    a + (b - a) * t
}

/// Day of the year 0..365 on a 365-day calendar: 29 February shares the slot
/// of 28 February, so leap years line up with other years from March on.
fn day_of_year_365(date: NaiveDate) -> usize {
    let ordinal0 = date.ordinal0() as usize;
    if date.leap_year() && ordinal0 >= 59 {
        ordinal0 - 1
    } else {
        ordinal0
    }
}

/// Mean of the series' own measured or corrected values of `v` for each day
/// of the year, over a circular window of ± `climatology_half_window_days`.
fn day_of_year_means(
    days: &[WeatherDay],
    v: Variable,
    options: &GapFillOptions,
) -> Vec<Option<f64>> {
    let mut sum = [0.0_f64; 365];
    let mut count = [0_usize; 365];
    for d in days {
        if let Some(x) = v.get(d) {
            let k = day_of_year_365(d.date);
            sum[k] += x;
            count[k] += 1;
        }
    }
    let h = options.climatology_half_window_days.min(182) as usize;
    (0..365)
        .map(|k| {
            let (mut s, mut c) = (0.0, 0);
            for off in 0..=2 * h {
                let idx = (k + 365 + off - h) % 365;
                s += sum[idx];
                c += count[idx];
            }
            (c >= options.climatology_min_values.max(1)).then(|| s / c as f64)
        })
        .collect()
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used)]
mod tests {
    use super::*;

    fn date(y: i32, m: u32, d: u32) -> NaiveDate {
        NaiveDate::from_ymd_opt(y, m, d).unwrap()
    }

    fn day(y: i32, m: u32, d: u32, tmax: Option<f64>) -> WeatherDay {
        WeatherDay {
            tmax_c: tmax,
            ..WeatherDay::empty(date(y, m, d))
        }
    }

    #[test]
    fn calendar_completed_with_empty_days() {
        let days = [day(2020, 2, 27, Some(1.0)), day(2020, 3, 1, Some(2.0))];
        let full = complete_calendar(&days).unwrap();
        let dates: Vec<String> = full.iter().map(|d| d.date.to_string()).collect();
        assert_eq!(
            dates,
            ["2020-02-27", "2020-02-28", "2020-02-29", "2020-03-01"]
        );
        assert_eq!(full[1].tmax_c, None);
        let bad = [day(2020, 3, 1, None), day(2020, 3, 1, None)];
        assert!(matches!(
            complete_calendar(&bad),
            Err(GapFillError::NotIncreasing { .. })
        ));
    }

    /// Three missing days between 20 and 28 °C: 22, 24, 26 (hand-worked:
    /// 20 + 8 × k/4 for k = 1, 2, 3).
    #[test]
    fn short_gap_interpolated_linearly() {
        let days = [day(2021, 1, 1, Some(20.0)), day(2021, 1, 5, Some(28.0))];
        let f = fill_gaps(&days, &GapFillOptions::default(), &[]).unwrap();
        let t: Vec<f64> = f.days.iter().map(|d| d.tmax_c.unwrap()).collect();
        assert_eq!(t, vec![20.0, 22.0, 24.0, 26.0, 28.0]);
        assert_eq!(f.mark(0, Variable::Tmax), Some(FillMark::Measured));
        assert_eq!(f.mark(2, Variable::Tmax), Some(FillMark::Interpolated));
        assert_eq!(f.days_resting_on_filled_data(&[Variable::Tmax]), 3);
    }

    #[test]
    fn long_gap_not_interpolated_and_temperature_left_missing_under_fao56() {
        let days = [day(2021, 1, 1, Some(20.0)), day(2021, 1, 6, Some(28.0))];
        let f = fill_gaps(&days, &GapFillOptions::default(), &[]).unwrap();
        assert!(f.days[1..5].iter().all(|d| d.tmax_c.is_none()));
        assert_eq!(f.mark(3, Variable::Tmax), Some(FillMark::Missing));
        // A user limit of 4 days interpolates it.
        let opts = GapFillOptions {
            max_interpolation_days: 4,
            ..GapFillOptions::default()
        };
        let f = fill_gaps(&days, &opts, &[]).unwrap();
        assert!((f.days[1].tmax_c.unwrap() - 21.6).abs() < 1e-12);
    }

    #[test]
    fn fao56_procedures_for_long_gaps() {
        let mut days: Vec<WeatherDay> = (1..=10)
            .map(|d| WeatherDay {
                solar_mj: Some(20.0),
                rhmin_pct: Some(40.0),
                wind_ms: Some(3.1),
                rain_mm: Some(1.0),
                ..day(2021, 1, d, Some(30.0))
            })
            .collect();
        for d in &mut days[2..8] {
            d.solar_mj = None;
            d.rhmin_pct = None;
            d.wind_ms = None;
        }
        days[5].rain_mm = None; // one-day rain gap: not interpolated by default
        let f = fill_gaps(&days, &GapFillOptions::default(), &[]).unwrap();
        assert_eq!(f.days[4].solar_mj, None);
        assert_eq!(
            f.mark(4, Variable::Solar),
            Some(FillMark::EstimatedByEt0Procedure(
                Fao56Procedure::SolarFromTemperatureRange
            ))
        );
        assert_eq!(f.days[4].rhmin_pct, None);
        assert_eq!(
            f.mark(4, Variable::RhMin),
            Some(FillMark::EstimatedByEt0Procedure(
                Fao56Procedure::VapourPressureFromTmin
            ))
        );
        assert_eq!(f.days[4].wind_ms, Some(2.0));
        assert_eq!(f.mark(4, Variable::Wind), Some(FillMark::DefaultWind));
        assert_eq!(f.days[5].rain_mm, None);
        assert_eq!(f.mark(5, Variable::Rain), Some(FillMark::Missing));
        // Variables never recorded stay missing without marks of filling.
        assert_eq!(f.mark(4, Variable::Sunshine), Some(FillMark::Missing));
        assert_eq!(
            f.days_resting_on_filled_data(&[Variable::Solar, Variable::Wind]),
            6
        );
    }

    #[test]
    fn climatology_fills_from_other_years() {
        // Two years of Tmax; 2022 has a 10-day gap in July. Values around
        // 10 July are 30 °C in 2021 and 32 °C in 2022 (outside the gap).
        let mut days = Vec::new();
        for y in [2021, 2022] {
            let mut d = date(y, 6, 1);
            while d <= date(y, 8, 31) {
                let t = if y == 2021 { 30.0 } else { 32.0 };
                let gap = y == 2022 && d >= date(2022, 7, 5) && d <= date(2022, 7, 14);
                days.push(WeatherDay {
                    tmax_c: (!gap).then_some(t),
                    ..WeatherDay::empty(d)
                });
                d = d.succ_opt().unwrap();
            }
        }
        let opts = GapFillOptions {
            long_gaps: LongGapMethod::Climatology,
            ..GapFillOptions::default()
        };
        let f = fill_gaps(&days, &opts, &[]).unwrap();
        let i = f
            .days
            .iter()
            .position(|d| d.date == date(2022, 7, 5))
            .unwrap();
        assert_eq!(f.mark(i, Variable::Tmax), Some(FillMark::Climatology));
        // Window 28 Jun..12 Jul: 2021 has 15 values of 30; 2022 has 28 Jun..4 Jul,
        // 7 values of 32. Mean = (15×30 + 7×32)/22 (hand-worked).
        let expected = (15.0 * 30.0 + 7.0 * 32.0) / 22.0;
        assert!((f.days[i].tmax_c.unwrap() - expected).abs() < 1e-12);
        // Measured values unchanged.
        let j = f
            .days
            .iter()
            .position(|d| d.date == date(2022, 7, 4))
            .unwrap();
        assert_eq!(f.days[j].tmax_c, Some(32.0));
        assert_eq!(f.mark(j, Variable::Tmax), Some(FillMark::Measured));
    }

    #[test]
    fn corrections_are_marked_and_not_refilled() {
        let days = [
            day(2021, 1, 1, Some(20.0)),
            day(2021, 1, 2, Some(99.0)),
            day(2021, 1, 4, Some(26.0)),
        ];
        let c = Correction {
            date: date(2021, 1, 2),
            variable: Variable::Tmax,
            value: 22.0,
        };
        let f = fill_gaps(&days, &GapFillOptions::default(), &[c]).unwrap();
        assert_eq!(f.days[1].tmax_c, Some(22.0));
        assert_eq!(f.mark(1, Variable::Tmax), Some(FillMark::Corrected));
        assert_eq!(f.days[2].tmax_c, Some(24.0)); // interpolated from the corrected value
        assert_eq!(f.mark(2, Variable::Tmax), Some(FillMark::Interpolated));
        let outside = Correction {
            date: date(2021, 2, 1),
            ..c
        };
        assert!(matches!(
            fill_gaps(&days, &GapFillOptions::default(), &[outside]),
            Err(GapFillError::CorrectionOutsideRecord { .. })
        ));
        let nan = Correction {
            value: f64::NAN,
            ..c
        };
        assert!(matches!(
            fill_gaps(&days, &GapFillOptions::default(), &[nan]),
            Err(GapFillError::CorrectionNotFinite { .. })
        ));
    }

    #[test]
    fn leap_day_shares_the_slot_of_28_february() {
        assert_eq!(
            day_of_year_365(date(2020, 2, 29)),
            day_of_year_365(date(2020, 2, 28))
        );
        assert_eq!(
            day_of_year_365(date(2020, 3, 1)),
            day_of_year_365(date(2021, 3, 1))
        );
        assert_eq!(day_of_year_365(date(2020, 12, 31)), 364);
    }
}

/// A weather record made ready for a daily water balance: every calendar day
/// present, days whose ET₀ inputs are impossible blanked and filled, and an
/// account of what was changed.
#[derive(Debug, Clone, PartialEq)]
pub struct RepairedSeries {
    /// The filled series (one day per date).
    pub filled: FilledSeries,
    /// Days whose measured values could not give ET₀ (e.g. Tmin above Tmax),
    /// with the reason; their weather (except rain) was blanked and filled.
    pub rejected: Vec<(NaiveDate, String)>,
    /// Calendar days that were absent from the record and were added.
    pub inserted_days: usize,
    /// Days with at least one value filled (interpolated, estimated or from
    /// climatology).
    pub filled_days: usize,
}

/// Prepares a record for a daily balance.
///
/// `et0_check` returns `Err(reason)` for a day whose inputs make ET₀
/// impossible (the caller passes its ET₀ context, so the rule is the same as
/// the ET₀ computation's). Such days keep their rain and have every other
/// value blanked; then [`fill_gaps`] fills the record with `options`. The
/// measured data are never changed otherwise, and every filled value keeps
/// its [`FillMark`].
///
/// # Errors
/// [`GapFillError`] when the dates are not increasing or the record is empty.
pub fn repair_for_daily_balance(
    days: &[WeatherDay],
    options: &GapFillOptions,
    et0_check: impl Fn(&WeatherDay) -> Result<(), String>,
) -> Result<RepairedSeries, GapFillError> {
    let mut rejected = Vec::new();
    let cleaned: Vec<WeatherDay> = days
        .iter()
        .map(|d| match et0_check(d) {
            Err(reason) if d.tmax_c.is_some() && d.tmin_c.is_some() => {
                rejected.push((d.date, reason));
                WeatherDay {
                    rain_mm: d.rain_mm,
                    ..WeatherDay::empty(d.date)
                }
            }
            _ => *d,
        })
        .collect();
    let filled = fill_gaps(&cleaned, options, &[])?;
    let inserted_days = filled.days.len().saturating_sub(days.len());
    let filled_days = filled
        .marks
        .iter()
        .filter(|m| m.iter().any(|k| k.is_not_measured()))
        .count();
    Ok(RepairedSeries {
        filled,
        rejected,
        inserted_days,
        filled_days,
    })
}

#[cfg(test)]
mod repair_tests {
    use super::*;

    fn day(date: NaiveDate, tmax: f64, tmin: f64, rain: f64) -> WeatherDay {
        WeatherDay {
            tmax_c: Some(tmax),
            tmin_c: Some(tmin),
            rain_mm: Some(rain),
            ..WeatherDay::empty(date)
        }
    }

    /// A Tmin > Tmax day is blanked (rain kept) and refilled by linear
    /// interpolation between its neighbours; a missing date is added.
    #[test]
    fn rejected_day_is_blanked_and_refilled() {
        let d = |n: u32| NaiveDate::from_ymd_opt(2030, 1, n).expect("valid date");
        let days = vec![
            day(d(1), 30.0, 10.0, 0.0),
            day(d(2), 20.0, 25.0, 4.0), // Tmin above Tmax
            day(d(3), 32.0, 12.0, 0.0),
            // 4 January absent
            day(d(5), 34.0, 14.0, 0.0),
        ];
        let check = |w: &WeatherDay| match (w.tmax_c, w.tmin_c) {
            (Some(x), Some(n)) if n > x => Err("Tmin above Tmax".to_string()),
            _ => Ok(()),
        };
        let r =
            repair_for_daily_balance(&days, &GapFillOptions::default(), check).expect("repairs");
        assert_eq!(r.rejected.len(), 1);
        assert_eq!(r.inserted_days, 1);
        assert_eq!(r.filled.days.len(), 5);
        // Interpolated halfway between 30 and 32 (Tmax), 10 and 12 (Tmin).
        let second = r.filled.days[1];
        assert!((second.tmax_c.expect("filled") - 31.0).abs() < 1e-9);
        assert!((second.tmin_c.expect("filled") - 11.0).abs() < 1e-9);
        assert_eq!(second.rain_mm, Some(4.0));
        assert!(r.filled_days >= 2);
    }
}
