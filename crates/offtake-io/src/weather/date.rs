//! Date formats of weather files and their parsing.

use chrono::NaiveDate;
pub use offtake_core::weather_import::DateFormat;

/// The shape of a date cell before a format is chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum DateShape {
    /// Year first: unambiguous.
    YearFirst(i32, u32, u32),
    /// Two small numbers then a four-digit year: (first, second, year).
    YearLast(u32, u32, i32),
}

fn split3(text: &str) -> Option<[&str; 3]> {
    let sep = text.chars().find(|c| matches!(c, '-' | '/' | '.'))?;
    let mut it = text.split(sep);
    let parts = [it.next()?, it.next()?, it.next()?];
    if it.next().is_some()
        || parts
            .iter()
            .any(|p| p.is_empty() || !p.bytes().all(|b| b.is_ascii_digit()))
    {
        return None;
    }
    Some(parts)
}

/// Classifies a date cell (trimmed) without choosing day/month order.
pub(crate) fn date_shape(text: &str) -> Option<DateShape> {
    let [a, b, c] = split3(text)?;
    if a.len() == 4 && b.len() <= 2 && c.len() <= 2 {
        return Some(DateShape::YearFirst(
            a.parse().ok()?,
            b.parse().ok()?,
            c.parse().ok()?,
        ));
    }
    if c.len() == 4 && a.len() <= 2 && b.len() <= 2 {
        return Some(DateShape::YearLast(
            a.parse().ok()?,
            b.parse().ok()?,
            c.parse().ok()?,
        ));
    }
    None
}

/// Parses a date cell (trimmed) in the given format; `None` if it does not fit
/// the format or names no calendar day.
pub fn parse_date(text: &str, format: DateFormat) -> Option<NaiveDate> {
    match (date_shape(text)?, format) {
        (DateShape::YearFirst(y, m, d), DateFormat::Iso) => NaiveDate::from_ymd_opt(y, m, d),
        (DateShape::YearLast(d, m, y), DateFormat::DayMonthYear)
        | (DateShape::YearLast(m, d, y), DateFormat::MonthDayYear) => {
            NaiveDate::from_ymd_opt(y, m, d)
        }
        _ => None,
    }
}

/// What a single date cell says about the format when none is stated.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Evidence {
    /// Decides the format.
    Decides(DateFormat),
    /// Year last, both orders give a valid date (and different dates).
    Ambiguous,
    /// Year last, both orders give the same date (e.g. 05/05/2024).
    Either,
    /// Not a date in any accepted format.
    Invalid,
}

pub(crate) fn evidence(text: &str) -> Evidence {
    match date_shape(text) {
        Some(DateShape::YearFirst(..)) => Evidence::Decides(DateFormat::Iso),
        Some(DateShape::YearLast(a, b, y)) => {
            let dmy = NaiveDate::from_ymd_opt(y, b, a).is_some();
            let mdy = NaiveDate::from_ymd_opt(y, a, b).is_some();
            match (dmy, mdy) {
                (true, true) if a == b => Evidence::Either,
                (true, true) => Evidence::Ambiguous,
                (true, false) => Evidence::Decides(DateFormat::DayMonthYear),
                (false, true) => Evidence::Decides(DateFormat::MonthDayYear),
                (false, false) => Evidence::Invalid,
            }
        }
        None => Evidence::Invalid,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn d(y: i32, m: u32, day: u32) -> NaiveDate {
        NaiveDate::from_ymd_opt(y, m, day).expect("valid test date")
    }

    #[test]
    fn parses_each_format() {
        assert_eq!(
            parse_date("2024-03-15", DateFormat::Iso),
            Some(d(2024, 3, 15))
        );
        assert_eq!(parse_date("2024/3/5", DateFormat::Iso), Some(d(2024, 3, 5)));
        assert_eq!(
            parse_date("15/03/2024", DateFormat::DayMonthYear),
            Some(d(2024, 3, 15))
        );
        assert_eq!(
            parse_date("15.03.2024", DateFormat::DayMonthYear),
            Some(d(2024, 3, 15))
        );
        assert_eq!(
            parse_date("03/15/2024", DateFormat::MonthDayYear),
            Some(d(2024, 3, 15))
        );
        assert_eq!(parse_date("03/15/2024", DateFormat::DayMonthYear), None);
        assert_eq!(parse_date("2024-02-30", DateFormat::Iso), None);
        assert_eq!(parse_date("24-02-03", DateFormat::Iso), None);
        assert_eq!(parse_date("2024-02", DateFormat::Iso), None);
        assert_eq!(parse_date("2024-02-03-01", DateFormat::Iso), None);
    }

    #[test]
    fn evidence_decides_only_when_unambiguous() {
        assert_eq!(evidence("2024-01-02"), Evidence::Decides(DateFormat::Iso));
        assert_eq!(
            evidence("13/01/2024"),
            Evidence::Decides(DateFormat::DayMonthYear)
        );
        assert_eq!(
            evidence("01/13/2024"),
            Evidence::Decides(DateFormat::MonthDayYear)
        );
        assert_eq!(evidence("02/01/2024"), Evidence::Ambiguous);
        assert_eq!(evidence("05/05/2024"), Evidence::Either);
        assert_eq!(evidence("hello"), Evidence::Invalid);
    }
}
