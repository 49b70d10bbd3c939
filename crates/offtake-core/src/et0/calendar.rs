//! Day-of-year helpers, FAO-56 Annex 2 Table 2.5 (p. 218).

use chrono::{Datelike, NaiveDate};

/// Day of the year J (1 = 1 January, 365 or 366 = 31 December) of a date.
pub fn day_of_year(date: NaiveDate) -> u32 {
    date.ordinal()
}

/// Day of the year J from year, month and day, by the FAO-56 Annex 2 rule.
///
/// * `year` — calendar year (for the leap-year test);
/// * `month` — 1..=12; `day` — 1..=31.
///
/// FAO-56 Annex 2, Table 2.5 note (p. 218): J = INTEGER(275 M/9 − 30 + D) − 2;
/// if M < 3 then J = J + 2; in a leap year with M > 2, J = J + 1.
/// Values outside the calendar are not rejected (the rule is a formula); use
/// [`day_of_year`] for validated dates.
pub fn day_of_year_fao56(year: i32, month: u32, day: u32) -> u32 {
    let m = f64::from(month);
    let d = f64::from(day);
    let mut j = (275.0 * m / 9.0 - 30.0 + d).trunc() as i64 - 2;
    if month < 3 {
        j += 2;
    }
    if month > 2 && is_leap_year(year) {
        j += 1;
    }
    j.max(1) as u32
}

/// Day of the year of the middle of a month: J = INTEGER(30.4 M − 15).
///
/// FAO-56 Annex 2, Table 2.5 note (p. 218), for monthly calculations.
pub fn mid_month_day_of_year(month: u32) -> u32 {
    (30.4 * f64::from(month) - 15.0).trunc().max(1.0) as u32
}

/// Gregorian leap-year test.
pub fn is_leap_year(year: i32) -> bool {
    (year % 4 == 0 && year % 100 != 0) || year % 400 == 0
}
