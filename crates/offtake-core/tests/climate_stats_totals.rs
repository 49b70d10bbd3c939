//! Multi-year statistics of daily series: totals, complete years, missing and
//! filled days, probabilities and design years, worked by hand below.

use chrono::{Datelike, NaiveDate};
use offtake_core::calendar::{RecordEnd, YearStart, days_between};
use offtake_core::climate_stats::{
    ClimateStatsError, DailySeries, series_statistics, series_totals, weather_statistics,
};
use offtake_core::stats::Probability;

fn d(y: i32, m: u32, day: u32) -> NaiveDate {
    NaiveDate::from_ymd_opt(y, m, day).expect("valid test date")
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-9
}

fn days(first: NaiveDate, last: NaiveDate) -> Vec<NaiveDate> {
    days_between(first, last).collect()
}

/// 1 mm every day, 1 July 2022 to 15 March 2026: complete calendar years
/// 2023, 2024 (leap), 2025. Totals are day counts, known by hand.
#[test]
fn totals_count_leap_days_and_drop_partial_years() {
    let dates = days(d(2022, 7, 1), d(2026, 3, 15));
    let values = vec![Some(1.0); dates.len()];
    let series = DailySeries::new(dates[0], &values, None).expect("valid");
    let totals = series_totals(&series, YearStart::JANUARY).expect("complete years");

    let labels: Vec<_> = totals.years.iter().map(|y| y.period.label()).collect();
    assert_eq!(labels, ["2023", "2024", "2025"]);
    let year_totals: Vec<_> = totals.years.iter().map(|y| y.total).collect();
    assert_eq!(year_totals, [Some(365.0), Some(366.0), Some(365.0)]);
    assert_eq!(totals.coverage.partial.len(), 2);
    assert_eq!(totals.coverage.partial[0].cut_at, RecordEnd::Start);
    // 1 July to 31 December 2022 = 184 days; 1 January to 15 March 2026 = 74.
    assert_eq!(totals.coverage.partial[0].days_in_record, 184);
    assert_eq!(totals.coverage.partial[1].days_in_record, 74);

    assert_eq!(totals.months.len(), 36);
    assert_eq!(totals.months[1].period.to_string(), "2023-02");
    assert_eq!(totals.months[1].total, Some(28.0));
    assert_eq!(totals.months[13].total, Some(29.0));
    assert_eq!(totals.ten_days.len(), 108);
    // February's third period: 8 days in 2023, 9 in 2024.
    assert_eq!(totals.ten_days[5].period.to_string(), "2023-02 d3");
    assert_eq!(totals.ten_days[5].total, Some(8.0));
    assert_eq!(totals.ten_days[36 + 5].total, Some(9.0));
    assert_eq!(totals.ten_days[36 + 5].days, 9);
    assert!(close(
        totals.ten_days[36 + 5].mean_per_day().expect("total"),
        1.0
    ));
    // January's third period: 11 days.
    assert_eq!(totals.ten_days[2].total, Some(11.0));
}

/// Irrigation years from October: 1 October 2022 to 30 September 2025 gives
/// 2022/23, 2023/24 (holds 29 February 2024, 366 days), 2024/25.
#[test]
fn irrigation_years_from_october() {
    let dates = days(d(2022, 10, 1), d(2025, 9, 30));
    let values: Vec<_> = dates.iter().map(|_| Some(2.0)).collect();
    let series = DailySeries::new(dates[0], &values, None).expect("valid");
    let october = YearStart::new(10).expect("month");
    let totals = series_totals(&series, october).expect("complete");
    assert!(totals.coverage.partial.is_empty());
    let labels: Vec<_> = totals.years.iter().map(|y| y.period.label()).collect();
    assert_eq!(labels, ["2022/23", "2023/24", "2024/25"]);
    assert_eq!(totals.years[1].total, Some(732.0));
    // Months run October first.
    assert_eq!(totals.months[0].period.to_string(), "2022-10");
    assert_eq!(totals.months[3].period.to_string(), "2023-01");
    assert_eq!(totals.ten_days[0].period.to_string(), "2022-10 d1");
    assert_eq!(totals.ten_days[35].period.to_string(), "2023-09 d3");

    let stats =
        series_statistics(&series, october, &[Probability::NonExceedance(0.5)]).expect("stats");
    assert_eq!(stats.monthly[0].label, "Oct");
    assert_eq!(stats.monthly[0].slot, 10);
    assert_eq!(stats.ten_day[0].label, "Oct 1");
    assert_eq!(stats.ten_day[0].slot, 28);
}

/// Five calendar years 2021–2025 of rain falling on one day each year, with
/// yearly totals 100, 300, 200, 500, 400 mm.
///
/// By hand (Weibull positions m/6): sorted 100, 200, 300, 400, 500.
/// - 80 % exceedance (dependable) = 20 % non-exceedance: r = 0.2 × 6 = 1.2 →
///   100 + 0.2 × 100 = 120 mm; the closest year is 2021 (100 mm).
/// - 80 % non-exceedance: r = 4.8 → 400 + 0.8 × 100 = 480 mm; closest is 2024
///   (500 mm, 20 away, against 400 mm in 2025, 80 away).
/// - Mean = 1500 / 5 = 300 mm.
/// - July: the rain falls on 15 July, so July totals equal the yearly ones
///   and all other months are 0.
#[test]
fn dependable_rain_and_design_years_by_hand() {
    let dates = days(d(2021, 1, 1), d(2025, 12, 31));
    let yearly = [100.0, 300.0, 200.0, 500.0, 400.0];
    let values: Vec<_> = dates
        .iter()
        .map(|date| {
            if date.month() == 7 && date.day() == 15 {
                Some(yearly[(date.year() - 2021) as usize])
            } else {
                Some(0.0)
            }
        })
        .collect();
    let series = DailySeries::new(dates[0], &values, None).expect("valid");
    let probabilities = [
        Probability::Exceedance(0.8),
        Probability::NonExceedance(0.8),
    ];
    let stats = series_statistics(&series, YearStart::JANUARY, &probabilities).expect("stats");

    assert_eq!(stats.yearly.years_used, 5);
    assert!(close(stats.yearly.mean.expect("mean"), 300.0));
    assert!(close(stats.yearly.at[0].value, 120.0));
    assert_eq!(stats.yearly.at[0].probability, Probability::Exceedance(0.8));
    assert!(close(stats.yearly.at[1].value, 480.0));
    assert_eq!(stats.design_years[0].year.label(), "2021");
    assert!(close(stats.design_years[0].total, 100.0));
    assert_eq!(stats.design_years[1].year.label(), "2024");

    let july = &stats.monthly[6];
    assert_eq!(july.label, "Jul");
    assert!(close(july.at[0].value, 120.0));
    assert!(close(stats.monthly[0].max.expect("max"), 0.0));
    // 15 July lies in July's second 10-day period (index 20).
    let jul2 = &stats.ten_day[19];
    assert_eq!(jul2.label, "Jul 2");
    assert!(close(jul2.at[1].value, 480.0));

    // Day-of-year climatology: 366 slots; 29 February (slot 60) holds only
    // 2024's value, every other slot one value per year.
    assert_eq!(stats.day_of_year.len(), 366);
    assert!(
        stats
            .day_of_year
            .iter()
            .all(|b| b.n == if b.slot == 60 { 1 } else { 5 })
    );
    let jul15 = stats
        .day_of_year
        .iter()
        .find(|b| b.month == 7 && b.day == 15)
        .expect("slot");
    assert!(close(jul15.p50, 300.0));
    // 10 % non-exceedance: r = 0.6 < 1, clamped to the smallest, 100.
    assert!(close(jul15.p10, 100.0));
    // 90 %: r = 5.4 > 5, clamped to the largest, 500.
    assert!(close(jul15.p90, 500.0));
}

/// A missing day removes its year, month and 10-day period from the
/// statistics but not the year's other months; filled days are counted.
#[test]
fn missing_and_filled_days() {
    let dates = days(d(2021, 1, 1), d(2023, 12, 31));
    let mut values = vec![Some(1.0); dates.len()];
    let mut filled = vec![false; dates.len()];
    let gap = dates.iter().position(|x| *x == d(2022, 3, 5)).expect("day");
    values[gap] = None;
    for flag in filled.iter_mut().skip(gap + 1).take(4) {
        *flag = true;
    }
    let series = DailySeries::new(dates[0], &values, Some(&filled)).expect("valid");
    let stats = series_statistics(
        &series,
        YearStart::JANUARY,
        &[Probability::NonExceedance(0.5)],
    )
    .expect("stats");
    assert_eq!(stats.totals.years[1].total, None);
    assert_eq!(stats.totals.years[1].missing_days, 1);
    assert_eq!(stats.totals.years[1].filled_days, 4);
    assert_eq!(stats.yearly.years_used, 2);
    assert_eq!(stats.yearly.years_with_missing_days, 1);
    assert_eq!(stats.monthly[2].years_used, 2); // March
    assert_eq!(stats.monthly[3].years_used, 3); // April
    assert_eq!(stats.ten_day[6].years_used, 2); // 1–10 March
    assert_eq!(stats.ten_day[7].years_used, 3); // 11–20 March
    assert_eq!(stats.missing_days, 1);
    assert_eq!(stats.filled_days, 4);
    // The 5 March slot of the climatology has the two present values.
    let mar5 = stats
        .day_of_year
        .iter()
        .find(|b| b.month == 3 && b.day == 5)
        .expect("slot");
    assert_eq!(mar5.n, 2);
}

#[test]
fn typed_errors() {
    assert!(matches!(
        DailySeries::new(d(2021, 1, 1), &[], None),
        Err(ClimateStatsError::EmptySeries)
    ));
    assert!(matches!(
        DailySeries::new(d(2021, 1, 1), &[Some(1.0), Some(2.0)], Some(&[false])),
        Err(ClimateStatsError::FlagLengthMismatch {
            values: 2,
            flags: 1
        })
    ));
    match DailySeries::new(d(2021, 1, 1), &[Some(1.0), Some(f64::NAN)], None) {
        Err(ClimateStatsError::NotFinite { date, .. }) => assert_eq!(date, d(2021, 1, 2)),
        other => panic!("expected NotFinite, got {other:?}"),
    }
    let short = vec![Some(1.0); 200];
    let series = DailySeries::new(d(2021, 3, 1), &short, None).expect("valid");
    assert!(matches!(
        series_totals(&series, YearStart::JANUARY),
        Err(ClimateStatsError::NoCompleteYear { .. })
    ));
    let year = vec![Some(1.0); 365];
    let series = DailySeries::new(d(2021, 1, 1), &year, None).expect("valid");
    assert!(matches!(
        series_statistics(&series, YearStart::JANUARY, &[Probability::Exceedance(1.5)]),
        Err(ClimateStatsError::Stats(_))
    ));
}

#[test]
fn weather_statistics_keeps_the_two_kinds_apart() {
    let dates = days(d(2021, 1, 1), d(2022, 12, 31));
    let et0 = vec![Some(5.0); dates.len()];
    let rain = vec![Some(1.0); dates.len()];
    let et0_series = DailySeries::new(dates[0], &et0, None).expect("valid");
    let rain_series = DailySeries::new(dates[0], &rain, None).expect("valid");
    let w = weather_statistics(
        &et0_series,
        &rain_series,
        YearStart::JANUARY,
        &offtake_core::climate_stats::DEFAULT_ET0_PROBABILITIES,
        &offtake_core::climate_stats::DEFAULT_RAIN_PROBABILITIES,
    )
    .expect("stats");
    assert_eq!(w.et0.yearly.at[1].probability.kind(), "non-exceedance");
    assert_eq!(w.rain.yearly.at[1].probability.kind(), "exceedance");
    assert!(close(w.et0.yearly.at[1].value, 1825.0));
    assert!(close(w.rain.yearly.at[1].value, 365.0));
}

mod properties {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(24))]

        /// Months add up to their year and 10-day periods to their month, for
        /// any start month and any record start.
        #[test]
        fn periods_add_up(
            start_offset in 0_i64..400,
            len in 800_usize..1500,
            start_month in 1_u32..=12,
            seed in 0_u64..1000,
        ) {
            let start = d(2019, 1, 1) + chrono::Duration::days(start_offset);
            // Deterministic pseudo-random values in 0..10 mm.
            let values: Vec<_> = (0..len)
                .map(|i| Some(((i as u64 * 7919 + seed * 104_729) % 1000) as f64 / 100.0))
                .collect();
            let series = DailySeries::new(start, &values, None).expect("valid");
            let year_start = YearStart::new(start_month).expect("month");
            let totals = series_totals(&series, year_start).expect("at least one complete year");
            prop_assert_eq!(totals.months.len(), 12 * totals.years.len());
            prop_assert_eq!(totals.ten_days.len(), 36 * totals.years.len());
            for (y, year) in totals.years.iter().enumerate() {
                let months: f64 = totals.months[y * 12..(y + 1) * 12]
                    .iter()
                    .map(|m| m.total.expect("complete"))
                    .sum();
                prop_assert!((months - year.total.expect("complete")).abs() < 1e-6);
                prop_assert_eq!(totals.months[y * 12].period.start(), year.period.start());
                for m in 0..12 {
                    let month = &totals.months[y * 12 + m];
                    let tens = &totals.ten_days[y * 36 + m * 3..y * 36 + m * 3 + 3];
                    let sum: f64 = tens.iter().map(|t| t.total.expect("complete")).sum();
                    prop_assert!((sum - month.total.expect("complete")).abs() < 1e-6);
                    prop_assert_eq!(tens.iter().map(|t| t.days).sum::<u32>(), month.days);
                    prop_assert_eq!(tens[0].period.start(), month.period.start());
                    prop_assert_eq!(tens[2].period.end(), month.period.end());
                }
            }
        }
    }
}
