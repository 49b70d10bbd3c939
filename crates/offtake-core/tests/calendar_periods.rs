//! Calendar periods: 10-day periods, months, irrigation years, day of year.

use chrono::{Datelike, NaiveDate};
use offtake_core::calendar::{
    CalendarError, IrrigationYear, RecordEnd, TenDayPeriod, YearMonth, YearStart, day_of_year,
    day_of_year_fao56, days_between, days_in_month, is_leap_year, leap_calendar_day,
    leap_calendar_month_day, year_coverage,
};
use proptest::prelude::*;

fn d(y: i32, m: u32, day: u32) -> NaiveDate {
    NaiveDate::from_ymd_opt(y, m, day).expect("valid test date")
}

/// FAO-56 (Allen et al. 1998), Annex 2, Table 2.5: J of the first of
/// each month in a non-leap year, "add 1 from March in a leap year".
#[test]
fn day_of_year_matches_fao56_table_2_5() {
    let first_of_month = [1, 32, 60, 91, 121, 152, 182, 213, 244, 274, 305, 335];
    for (i, j) in first_of_month.iter().enumerate() {
        let month = i as u32 + 1;
        assert_eq!(day_of_year(d(2023, month, 1)), *j);
        assert_eq!(day_of_year_fao56(month, 1, false).expect("month"), *j);
        let leap_j = if month >= 3 { j + 1 } else { *j };
        assert_eq!(day_of_year(d(2024, month, 1)), leap_j);
        assert_eq!(day_of_year_fao56(month, 1, true).expect("month"), leap_j);
    }
}

/// FAO-56 worked examples give J for given dates: 15 May = 135 (Example 10,
/// p. 50); 15 July = 196 (Example 15, p. 61); 3 September = 246 (Example 8,
/// p. 47); Bangkok, April, J = 105 (Example 16, p. 62), which is 15 April.
#[test]
fn day_of_year_matches_fao56_examples() {
    assert_eq!(day_of_year(d(2023, 5, 15)), 135);
    assert_eq!(day_of_year(d(2023, 7, 15)), 196);
    assert_eq!(day_of_year(d(2023, 9, 3)), 246);
    assert_eq!(day_of_year(d(2023, 4, 15)), 105);
    assert_eq!(day_of_year_fao56(9, 3, false).expect("month"), 246);
}

/// The published integer formula agrees with the date library on every day of
/// a common year and a leap year.
#[test]
fn fao56_formula_agrees_with_ordinal_every_day() {
    for year in [2023, 2024, 1900, 2000] {
        for day in days_between(d(year, 1, 1), d(year, 12, 31)) {
            assert_eq!(
                day_of_year_fao56(day.month(), day.day(), is_leap_year(year)).expect("month"),
                day_of_year(day),
                "{day}"
            );
        }
    }
    assert_eq!(
        day_of_year_fao56(13, 1, false),
        Err(CalendarError::InvalidMonth { month: 13 })
    );
}

#[test]
fn leap_years() {
    assert!(is_leap_year(2024));
    assert!(is_leap_year(2000));
    assert!(!is_leap_year(1900));
    assert!(!is_leap_year(2023));
    assert_eq!(days_in_month(2024, 2), Ok(29));
    assert_eq!(days_in_month(2100, 2), Ok(28));
    assert_eq!(
        days_in_month(2024, 0),
        Err(CalendarError::InvalidMonth { month: 0 })
    );
}

#[test]
fn leap_calendar_slots_keep_calendar_days_together() {
    assert_eq!(leap_calendar_day(d(2023, 2, 28)), 59);
    assert_eq!(leap_calendar_day(d(2024, 2, 29)), 60);
    assert_eq!(leap_calendar_day(d(2023, 3, 1)), 61);
    assert_eq!(leap_calendar_day(d(2024, 3, 1)), 61);
    assert_eq!(leap_calendar_day(d(2023, 12, 31)), 366);
    assert_eq!(leap_calendar_month_day(60), Some((2, 29)));
    assert_eq!(leap_calendar_month_day(367), None);
}

#[test]
fn ten_day_periods_cover_each_year_exactly_once() {
    for year in [2023, 2024] {
        let mut p = TenDayPeriod::from_index(year, 1).expect("index");
        let mut total = 0;
        let mut expected_start = d(year, 1, 1);
        for index in 1..=36 {
            assert_eq!(p.index(), index);
            assert_eq!(p.start(), expected_start);
            let len = p.length_days();
            assert!((8..=11).contains(&len));
            assert_eq!((p.end() - p.start()).num_days() + 1, i64::from(len));
            assert_eq!(TenDayPeriod::containing(p.end()), p);
            total += len;
            expected_start = p.end().succ_opt().expect("date");
            p = p.next();
        }
        assert_eq!(total, if year == 2024 { 366 } else { 365 });
        assert_eq!(p, TenDayPeriod::from_index(year + 1, 1).expect("index"));
    }
    assert_eq!(
        TenDayPeriod::from_index(2024, 37),
        Err(CalendarError::InvalidTenDayIndex { index: 37 })
    );
}

#[test]
fn ten_day_period_labels_and_parts() {
    let p = TenDayPeriod::containing(d(2031, 3, 15));
    assert_eq!(p.part(), 2);
    assert_eq!(p.index(), 8);
    assert_eq!(p.to_string(), "2031-03 d2");
    assert_eq!(p.label(), "Mar 2");
    assert_eq!(TenDayPeriod::containing(d(2031, 3, 21)).part(), 3);
    assert_eq!(TenDayPeriod::containing(d(2031, 3, 10)).part(), 1);
    // Counted from a June start, by hand: June to February are 9 months = 27
    // periods, so 1–10 March is 28 and 11–20 March is 29.
    let june = YearStart::new(6).expect("month");
    assert_eq!(p.index_in_year(june), 29);
    assert_eq!(
        TenDayPeriod::containing(d(2031, 6, 1)).index_in_year(june),
        1
    );
    assert_eq!(
        TenDayPeriod::containing(d(2031, 5, 31)).index_in_year(june),
        36
    );
    assert_eq!(p.index_in_year(YearStart::JANUARY), p.index());
}

#[test]
fn months() {
    let m = YearMonth::containing(d(2024, 2, 10));
    assert_eq!(m.start(), d(2024, 2, 1));
    assert_eq!(m.end(), d(2024, 2, 29));
    assert_eq!(m.length_days(), 29);
    assert_eq!(m.to_string(), "2024-02");
    assert_eq!(
        YearMonth::new(2024, 12).expect("ok").next(),
        YearMonth::new(2025, 1).expect("ok")
    );
    assert!(YearMonth::new(2024, 13).is_err());
}

#[test]
fn irrigation_years_cross_31_december() {
    let october = YearStart::new(10).expect("month");
    let y = IrrigationYear::containing(d(2032, 2, 29), october);
    assert_eq!(y.start_year(), 2031);
    assert_eq!(y.start(), d(2031, 10, 1));
    assert_eq!(y.end(), d(2032, 9, 30));
    assert_eq!(y.length_days(), 366); // holds 29 February 2032
    assert_eq!(y.label(), "2031/32");
    assert!(y.contains(d(2031, 12, 31)) && y.contains(d(2032, 1, 1)));
    assert_eq!(
        IrrigationYear::containing(d(2031, 10, 1), october).start_year(),
        2031
    );
    assert_eq!(
        IrrigationYear::containing(d(2031, 9, 30), october).start_year(),
        2030
    );
    assert_eq!(
        IrrigationYear::new(2099, october).expect("ok").label(),
        "2099/00"
    );
    let calendar = IrrigationYear::containing(d(2031, 5, 5), YearStart::JANUARY);
    assert_eq!(calendar.label(), "2031");
    assert_eq!(calendar.end(), d(2031, 12, 31));
    assert!(YearStart::new(0).is_err());
    assert!(YearStart::new(13).is_err());
}

#[test]
fn complete_years_of_a_record() {
    // Record 15 March 2001 to 10 November 2004, years from 1 June.
    let june = YearStart::new(6).expect("month");
    let cov = year_coverage(d(2001, 3, 15), d(2004, 11, 10), june).expect("ordered");
    let complete: Vec<_> = cov.complete.iter().map(|y| y.label()).collect();
    assert_eq!(complete, ["2001/02", "2002/03", "2003/04"]);
    assert_eq!(cov.partial.len(), 2);
    assert_eq!(cov.partial[0].year.label(), "2000/01");
    assert_eq!(cov.partial[0].cut_at, RecordEnd::Start);
    // 15 March to 31 May 2001: 17 + 30 + 31 = 78 days.
    assert_eq!(cov.partial[0].days_in_record, 78);
    assert_eq!(cov.partial[0].days_in_year, 365);
    assert_eq!(cov.partial[1].year.label(), "2004/05");
    assert_eq!(cov.partial[1].cut_at, RecordEnd::End);
    // 1 June to 10 November 2004: 30 + 31 + 31 + 30 + 31 + 10 = 163 days.
    assert_eq!(cov.partial[1].days_in_record, 163);

    // Exactly two calendar years: nothing partial.
    let cov = year_coverage(d(2001, 1, 1), d(2002, 12, 31), YearStart::JANUARY).expect("ok");
    assert_eq!(cov.complete.len(), 2);
    assert!(cov.partial.is_empty());

    // Shorter than a year: one partial year cut at both ends.
    let cov = year_coverage(d(2001, 2, 1), d(2001, 2, 3), YearStart::JANUARY).expect("ok");
    assert!(cov.complete.is_empty());
    assert_eq!(cov.partial[0].cut_at, RecordEnd::Both);
    assert_eq!(cov.partial[0].days_in_record, 3);

    assert!(matches!(
        year_coverage(d(2002, 1, 1), d(2001, 1, 1), YearStart::JANUARY),
        Err(CalendarError::ReversedRecord { .. })
    ));
}

proptest! {
    #[test]
    fn every_day_lies_in_its_periods(ordinal in 0_i64..40_000, start_month in 1_u32..=12) {
        let date = d(1950, 1, 1) + chrono::Duration::days(ordinal);
        let p = TenDayPeriod::containing(date);
        prop_assert!(p.start() <= date && date <= p.end());
        let m = YearMonth::containing(date);
        prop_assert!(m.start() <= date && date <= m.end());
        let ys = YearStart::new(start_month).expect("month");
        let y = IrrigationYear::containing(date, ys);
        prop_assert!(y.contains(date));
        prop_assert_eq!(y.start().month(), start_month);
        prop_assert_eq!(y.start().day(), 1);
        prop_assert!(y.length_days() == 365 || y.length_days() == 366);
        prop_assert!((1..=36).contains(&p.index_in_year(ys)));
    }
}
