//! Calendar periods used by the statistics: months, 10-day periods,
//! irrigation years that start in a chosen month, and day-of-year helpers.
//!
//! # Conventions
//!
//! - **10-day periods.** Each month has three: days 1–10, 11–20 and 21 to the
//!   month's end, so the third period lasts 8 to 11 days. They are numbered
//!   1..=36 through the calendar year (period 1 is 1–10 January, period 36 is
//!   21–31 December). This is the division FAO-56 uses for its 10-day tables
//!   (Allen et al. 1998, Table 2.5 note: "ten-day periods: D = 5, 15, 25").
//! - **Irrigation years** start on the 1st of a chosen month ([`YearStart`]).
//!   A year that starts in a month other than January crosses 31 December. It
//!   is identified by the calendar year in which it *starts*
//!   ([`IrrigationYear::start_year`]) and labelled `"2031/32"`; a year starting
//!   in January is labelled `"2031"`.
//! - **Leap days are ordinary days.** 29 February belongs to its month, to the
//!   third 10-day period of February (which then lasts 9 days) and to its
//!   irrigation year, which then lasts 366 days. Nothing is dropped or merged.
//! - **Incomplete years.** [`year_coverage`] splits the span of a dated record
//!   into years wholly inside it and years cut by the record's first or last
//!   day; statistics use only the former and report the latter.
//!
//! All end dates are inclusive.

use std::fmt;

use chrono::{Datelike, NaiveDate};
use serde::{Deserialize, Serialize};

/// Errors from building calendar periods.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum CalendarError {
    /// A month number outside 1..=12.
    #[error("month {month} is not a month number; expected 1 to 12")]
    InvalidMonth {
        /// The month number given.
        month: u32,
    },
    /// A 10-day period index outside 1..=36.
    #[error("10-day period {index} does not exist; expected 1 to 36")]
    InvalidTenDayIndex {
        /// The index given.
        index: u32,
    },
    /// A year the date library cannot represent.
    #[error("year {year} is outside the supported date range")]
    YearOutOfRange {
        /// The year given.
        year: i32,
    },
    /// A record whose first day comes after its last day.
    #[error("record runs backwards: first day {first} is after last day {last}")]
    ReversedRecord {
        /// First day of the record.
        first: NaiveDate,
        /// Last day of the record.
        last: NaiveDate,
    },
}

/// Number of 10-day periods in a year.
pub const TEN_DAY_PERIODS_PER_YEAR: u32 = 36;

/// Builds a date, returning an error for a year chrono cannot represent.
fn ymd(year: i32, month: u32, day: u32) -> Result<NaiveDate, CalendarError> {
    NaiveDate::from_ymd_opt(year, month, day).ok_or(CalendarError::YearOutOfRange { year })
}

/// The day before a date; the earliest representable date stays itself.
fn day_before(date: NaiveDate) -> NaiveDate {
    date.pred_opt().unwrap_or(date)
}

/// The day after a date; the latest representable date stays itself.
fn day_after(date: NaiveDate) -> NaiveDate {
    date.succ_opt().unwrap_or(date)
}

/// Whether `year` is a leap year of the Gregorian calendar.
pub fn is_leap_year(year: i32) -> bool {
    (year % 4 == 0 && year % 100 != 0) || year % 400 == 0
}

/// Number of days in a calendar year (365 or 366).
pub fn days_in_year(year: i32) -> u32 {
    if is_leap_year(year) { 366 } else { 365 }
}

/// Number of days in a month (28 to 31).
///
/// # Errors
/// [`CalendarError::InvalidMonth`] when `month` is not 1..=12.
pub fn days_in_month(year: i32, month: u32) -> Result<u32, CalendarError> {
    Ok(match month {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if is_leap_year(year) => 29,
        2 => 28,
        _ => return Err(CalendarError::InvalidMonth { month }),
    })
}

/// Day of the year J (1 = 1 January, up to 365 or 366), as used by the FAO-56
/// radiation equations (Allen et al. 1998, eq. 21–25, Table 2.5).
pub fn day_of_year(date: NaiveDate) -> u32 {
    date.ordinal()
}

/// Day of the year J by the published integer formula of FAO-56 (Allen et
/// al. 1998, Annex 2, Table 2.5 note):
///
/// J = INTEGER(275 M / 9 − 30 + D) − 2; if M < 3 then J = J + 2; in a leap
/// year with M > 2, J = J + 1.
///
/// Inputs: `month` M (1..=12), `day` D of the month, `leap` whether the year is
/// a leap year. Gives the same result as [`day_of_year`] for every valid date;
/// kept as the published form so the two can be checked against each other.
/// Day numbers past the month's end are not rejected (the formula simply
/// continues counting).
///
/// # Errors
/// [`CalendarError::InvalidMonth`] when `month` is not 1..=12.
pub fn day_of_year_fao56(month: u32, day: u32, leap: bool) -> Result<u32, CalendarError> {
    if !(1..=12).contains(&month) {
        return Err(CalendarError::InvalidMonth { month });
    }
    // INTEGER(275 M / 9 − 30 + D): for D ≥ 1 the argument is positive, so the
    // integer part is floor(275 M / 9) + D − 30, done in integers.
    let m = i64::from(month);
    let mut j = (275 * m) / 9 - 30 + i64::from(day) - 2;
    if month < 3 {
        j += 2;
    }
    if leap && month > 2 {
        j += 1;
    }
    // Only D = 0 could give a negative value; report it as 0.
    Ok(u32::try_from(j).unwrap_or(0))
}

/// Slot of a date in a 366-day leap-year calendar (1..=366): 29 February is
/// slot 60 and 1 March is always slot 61, whether or not the year is a leap
/// year.
///
/// Day-of-year climatologies use this so that each slot collects the same
/// calendar day from every year; 29 February is a slot of its own with fewer
/// samples (leap days are ordinary days, neither dropped nor merged).
pub fn leap_calendar_day(date: NaiveDate) -> u32 {
    let ordinal = date.ordinal();
    if !is_leap_year(date.year()) && date.month() > 2 {
        ordinal + 1
    } else {
        ordinal
    }
}

/// The (month, day) of a slot of the 366-day leap-year calendar of
/// [`leap_calendar_day`]; `None` outside 1..=366.
pub fn leap_calendar_month_day(slot: u32) -> Option<(u32, u32)> {
    // 2000 is a leap year.
    let date = NaiveDate::from_yo_opt(2000, slot)?;
    Some((date.month(), date.day()))
}

/// English three-letter abbreviation of a month (1..=12); `"?"` otherwise.
pub fn month_abbreviation(month: u32) -> &'static str {
    const NAMES: [&str; 12] = [
        "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
    ];
    month
        .checked_sub(1)
        .and_then(|i| NAMES.get(i as usize))
        .copied()
        .unwrap_or("?")
}

/// A calendar month of a given year.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
pub struct YearMonth {
    year: i32,
    month: u32,
}

impl YearMonth {
    /// The month `month` (1..=12) of `year`.
    ///
    /// # Errors
    /// [`CalendarError::InvalidMonth`] or [`CalendarError::YearOutOfRange`].
    pub fn new(year: i32, month: u32) -> Result<Self, CalendarError> {
        ymd(year, 1, 1)?;
        days_in_month(year, month)?;
        Ok(Self { year, month })
    }

    /// The month containing `date`.
    pub fn containing(date: NaiveDate) -> Self {
        Self {
            year: date.year(),
            month: date.month(),
        }
    }

    /// Calendar year.
    pub fn year(self) -> i32 {
        self.year
    }

    /// Month number, 1 = January.
    pub fn month(self) -> u32 {
        self.month
    }

    /// First day of the month.
    pub fn start(self) -> NaiveDate {
        NaiveDate::from_ymd_opt(self.year, self.month, 1).unwrap_or(NaiveDate::MIN)
    }

    /// Last day of the month (inclusive).
    pub fn end(self) -> NaiveDate {
        NaiveDate::from_ymd_opt(self.year, self.month, self.length_days()).unwrap_or(NaiveDate::MAX)
    }

    /// Number of days (28 to 31).
    pub fn length_days(self) -> u32 {
        days_in_month(self.year, self.month).unwrap_or(30)
    }

    /// The following month.
    #[must_use]
    pub fn next(self) -> Self {
        if self.month == 12 {
            Self {
                year: self.year + 1,
                month: 1,
            }
        } else {
            Self {
                year: self.year,
                month: self.month + 1,
            }
        }
    }
}

impl fmt::Display for YearMonth {
    /// `2031-03`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{:04}-{:02}", self.year, self.month)
    }
}

/// One 10-day period: days 1–10, 11–20 or 21–end of a month of a year.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
pub struct TenDayPeriod {
    year: i32,
    month: u32,
    /// 1, 2 or 3 within the month.
    part: u32,
}

impl TenDayPeriod {
    /// The 10-day period containing `date`.
    pub fn containing(date: NaiveDate) -> Self {
        let part = match date.day() {
            1..=10 => 1,
            11..=20 => 2,
            _ => 3,
        };
        Self {
            year: date.year(),
            month: date.month(),
            part,
        }
    }

    /// The period with calendar index `index` (1..=36) of `year`.
    ///
    /// # Errors
    /// [`CalendarError::InvalidTenDayIndex`] or [`CalendarError::YearOutOfRange`].
    pub fn from_index(year: i32, index: u32) -> Result<Self, CalendarError> {
        if !(1..=TEN_DAY_PERIODS_PER_YEAR).contains(&index) {
            return Err(CalendarError::InvalidTenDayIndex { index });
        }
        ymd(year, 12, 31)?;
        Ok(Self {
            year,
            month: (index - 1) / 3 + 1,
            part: (index - 1) % 3 + 1,
        })
    }

    /// Calendar index 1..=36 (1 = 1–10 January, 36 = 21–31 December).
    pub fn index(self) -> u32 {
        (self.month - 1) * 3 + self.part
    }

    /// Position 1..=36 counted from the first period of an irrigation year
    /// starting in `year_start` (1 = days 1–10 of the start month).
    pub fn index_in_year(self, year_start: YearStart) -> u32 {
        let offset = (year_start.month() - 1) * 3;
        (self.index() + TEN_DAY_PERIODS_PER_YEAR - 1 - offset) % TEN_DAY_PERIODS_PER_YEAR + 1
    }

    /// Calendar year.
    pub fn year(self) -> i32 {
        self.year
    }

    /// Month number, 1 = January.
    pub fn month(self) -> u32 {
        self.month
    }

    /// Which period of the month: 1 (days 1–10), 2 (11–20) or 3 (21–end).
    pub fn part(self) -> u32 {
        self.part
    }

    /// First day of the period.
    pub fn start(self) -> NaiveDate {
        let day = (self.part - 1) * 10 + 1;
        NaiveDate::from_ymd_opt(self.year, self.month, day).unwrap_or(NaiveDate::MIN)
    }

    /// Last day of the period (inclusive).
    pub fn end(self) -> NaiveDate {
        let day = match self.part {
            1 => 10,
            2 => 20,
            _ => days_in_month(self.year, self.month).unwrap_or(30),
        };
        NaiveDate::from_ymd_opt(self.year, self.month, day).unwrap_or(NaiveDate::MAX)
    }

    /// Number of days: 10 for the first two periods of a month, 8 to 11 for
    /// the third.
    pub fn length_days(self) -> u32 {
        match self.part {
            1 | 2 => 10,
            _ => days_in_month(self.year, self.month).unwrap_or(30) - 20,
        }
    }

    /// The following period.
    #[must_use]
    pub fn next(self) -> Self {
        if self.part < 3 {
            Self {
                part: self.part + 1,
                ..self
            }
        } else {
            let month = YearMonth {
                year: self.year,
                month: self.month,
            }
            .next();
            Self {
                year: month.year,
                month: month.month,
                part: 1,
            }
        }
    }

    /// Short label without the year, e.g. `"Mar 2"` for 11–20 March.
    pub fn label(self) -> String {
        format!("{} {}", month_abbreviation(self.month), self.part)
    }
}

impl fmt::Display for TenDayPeriod {
    /// `2031-03 d2` for 11–20 March 2031.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{:04}-{:02} d{}", self.year, self.month, self.part)
    }
}

/// The month on whose 1st every irrigation year starts (1 = January gives
/// calendar years).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct YearStart(u32);

impl YearStart {
    /// Calendar years: 1 January to 31 December.
    pub const JANUARY: Self = Self(1);

    /// Years starting on the 1st of `month` (1..=12).
    ///
    /// # Errors
    /// [`CalendarError::InvalidMonth`] when `month` is not 1..=12.
    pub fn new(month: u32) -> Result<Self, CalendarError> {
        if (1..=12).contains(&month) {
            Ok(Self(month))
        } else {
            Err(CalendarError::InvalidMonth { month })
        }
    }

    /// The start month, 1..=12.
    pub fn month(self) -> u32 {
        self.0
    }

    /// Whether these are plain calendar years.
    pub fn is_calendar_year(self) -> bool {
        self.0 == 1
    }
}

impl Default for YearStart {
    fn default() -> Self {
        Self::JANUARY
    }
}

/// An irrigation year: twelve months from the 1st of its start month.
///
/// Identified by the calendar year in which it starts. With a January start it
/// is the calendar year.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
pub struct IrrigationYear {
    start_year: i32,
    start_month: u32,
}

impl IrrigationYear {
    /// The irrigation year that starts in `start_year` on the 1st of the
    /// `year_start` month.
    ///
    /// # Errors
    /// [`CalendarError::YearOutOfRange`] for a year chrono cannot represent.
    pub fn new(start_year: i32, year_start: YearStart) -> Result<Self, CalendarError> {
        ymd(start_year, 1, 1)?;
        ymd(start_year.saturating_add(1), 12, 31)?;
        Ok(Self {
            start_year,
            start_month: year_start.month(),
        })
    }

    /// The irrigation year containing `date`.
    pub fn containing(date: NaiveDate, year_start: YearStart) -> Self {
        let start_year = if date.month() >= year_start.month() {
            date.year()
        } else {
            date.year() - 1
        };
        Self {
            start_year,
            start_month: year_start.month(),
        }
    }

    /// Calendar year in which this irrigation year starts (its identifier).
    pub fn start_year(self) -> i32 {
        self.start_year
    }

    /// The start month of the year.
    pub fn year_start(self) -> YearStart {
        YearStart(self.start_month)
    }

    /// First day (1st of the start month).
    pub fn start(self) -> NaiveDate {
        NaiveDate::from_ymd_opt(self.start_year, self.start_month, 1).unwrap_or(NaiveDate::MIN)
    }

    /// Last day (inclusive): the day before the next year's start.
    pub fn end(self) -> NaiveDate {
        day_before(self.next().start())
    }

    /// Number of days (365 or 366).
    pub fn length_days(self) -> u32 {
        (self.end() - self.start()).num_days() as u32 + 1
    }

    /// Whether `date` falls in this year.
    pub fn contains(self, date: NaiveDate) -> bool {
        self.start() <= date && date <= self.end()
    }

    /// The following irrigation year.
    #[must_use]
    pub fn next(self) -> Self {
        Self {
            start_year: self.start_year + 1,
            ..self
        }
    }

    /// `"2031"` for a calendar year; `"2031/32"` for a year that starts in
    /// 2031 and ends in 2032 (the second part is the end year modulo 100,
    /// two digits: `"2099/00"`).
    pub fn label(self) -> String {
        if self.start_month == 1 {
            format!("{}", self.start_year)
        } else {
            format!(
                "{}/{:02}",
                self.start_year,
                (self.start_year + 1).rem_euclid(100)
            )
        }
    }
}

impl fmt::Display for IrrigationYear {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.label())
    }
}

/// Which end of the record cuts an incomplete year.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum RecordEnd {
    /// The record starts after the year's first day.
    Start,
    /// The record ends before the year's last day.
    End,
    /// The record both starts after the year's first day and ends before its
    /// last day (a record shorter than one year).
    Both,
}

/// A year the record covers only in part.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub struct PartialYear {
    /// The year.
    pub year: IrrigationYear,
    /// Days of the year inside the record.
    pub days_in_record: u32,
    /// Days in the whole year (365 or 366).
    pub days_in_year: u32,
    /// Which end of the record cuts it.
    pub cut_at: RecordEnd,
}

/// The years spanned by a dated record, split into complete and partial ones.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct YearCoverage {
    /// Years whose every day lies between the record's first and last day, in
    /// order. Statistics use only these.
    pub complete: Vec<IrrigationYear>,
    /// Years cut by the record's first or last day (at most two), in order.
    /// Reported, and left out of statistics.
    pub partial: Vec<PartialYear>,
}

/// Splits the span `first..=last` of a record into complete irrigation years
/// and the partial years at either end.
///
/// Only the record's extent counts here; missing days inside the record are
/// the business of the quality checks and gap filling.
///
/// # Errors
/// [`CalendarError::ReversedRecord`] when `first > last`.
pub fn year_coverage(
    first: NaiveDate,
    last: NaiveDate,
    year_start: YearStart,
) -> Result<YearCoverage, CalendarError> {
    if first > last {
        return Err(CalendarError::ReversedRecord { first, last });
    }
    let mut coverage = YearCoverage {
        complete: Vec::new(),
        partial: Vec::new(),
    };
    let mut year = IrrigationYear::containing(first, year_start);
    while year.start() <= last {
        let cut_start = year.start() < first;
        let cut_end = year.end() > last;
        if cut_start || cut_end {
            let from = year.start().max(first);
            let to = year.end().min(last);
            coverage.partial.push(PartialYear {
                year,
                days_in_record: (to - from).num_days() as u32 + 1,
                days_in_year: year.length_days(),
                cut_at: match (cut_start, cut_end) {
                    (true, true) => RecordEnd::Both,
                    (true, false) => RecordEnd::Start,
                    _ => RecordEnd::End,
                },
            });
        } else {
            coverage.complete.push(year);
        }
        if year.end() >= NaiveDate::MAX.pred_opt().unwrap_or(NaiveDate::MAX) {
            break;
        }
        year = year.next();
    }
    Ok(coverage)
}

/// Iterates over the days `first..=last`.
pub fn days_between(first: NaiveDate, last: NaiveDate) -> impl Iterator<Item = NaiveDate> {
    let mut next = Some(first);
    std::iter::from_fn(move || {
        let day = next.filter(|d| *d <= last)?;
        next = if day == NaiveDate::MAX {
            None
        } else {
            Some(day_after(day))
        };
        Some(day)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn d(y: i32, m: u32, day: u32) -> NaiveDate {
        NaiveDate::from_ymd_opt(y, m, day).expect("valid test date")
    }

    #[test]
    fn ten_day_periods_of_a_leap_february() {
        let p = TenDayPeriod::containing(d(2024, 2, 29));
        assert_eq!(p.index(), 6);
        assert_eq!(p.start(), d(2024, 2, 21));
        assert_eq!(p.end(), d(2024, 2, 29));
        assert_eq!(p.length_days(), 9);
        assert_eq!(TenDayPeriod::containing(d(2023, 2, 28)).length_days(), 8);
        assert_eq!(TenDayPeriod::containing(d(2023, 1, 31)).length_days(), 11);
    }

    #[test]
    fn days_between_counts_the_leap_day() {
        let days: Vec<_> = days_between(d(2024, 2, 27), d(2024, 3, 1)).collect();
        assert_eq!(days.len(), 4);
    }
}
