//! `offtake weather stats FILE.csv --lat DEG --elevation M [--wind-height M]
//! [--year-start MONTH] [--out FILE.csv]`
//!
//! Reads a weather file through the common importer, computes daily ET₀
//! (FAO-56 Penman–Monteith with the FAO-56 missing-data procedures), and
//! prints the multi-year statistics of ET₀ and rain: yearly totals, yearly,
//! monthly and 10-day values at 50 % and 80 % probability, and design years.
//! ET₀ is given at *non-exceedance* probabilities, rain at *exceedance*
//! probabilities (80 % exceedance = dependable rain). With `--out` the same
//! figures, and the day-of-year climatology, are written as a long CSV table.

use std::fmt::Write as _;
use std::io::Write as _;
use std::path::PathBuf;

use anyhow::{Context as _, Result};
use chrono::NaiveDate;
use clap::Args as ClapArgs;
use offtake_core::calendar::{YearStart, month_abbreviation};
use offtake_core::climate_stats::{
    DEFAULT_ET0_PROBABILITIES, DEFAULT_RAIN_PROBABILITIES, DailySeries, SeriesStatistics,
    SlotStatistics, WeatherStatistics, weather_statistics,
};
use offtake_core::et0::{
    DayProcedures, Et0DayResult, Et0Options, HumiditySource, RadiationSource, WindSource,
    et0_daily_series,
};
use offtake_core::stats::Probability;
use offtake_core::weather::WeatherDay;

use crate::cmd_weather_check::{DateFormatArg, read_series, site_from_args, write_atomically};

/// Options of `offtake weather stats`.
#[derive(Debug, Clone, ClapArgs)]
pub struct Args {
    /// Weather CSV file (DESIGN.md columns).
    pub file: PathBuf,
    /// Station latitude in decimal degrees, north positive.
    #[arg(long, allow_hyphen_values = true)]
    pub lat: f64,
    /// Station elevation above sea level (m).
    #[arg(long, allow_hyphen_values = true)]
    pub elevation: f64,
    /// Wind measurement height above the ground (m); default: the mapping's
    /// stated height, else 2 m.
    #[arg(long)]
    pub wind_height: Option<f64>,
    /// First month (1–12) of the irrigation year; 1 gives calendar years.
    #[arg(long, default_value_t = 1, value_parser = clap::value_parser!(u32).range(1..=12))]
    pub year_start: u32,
    /// Also write the statistics as CSV to this file (written atomically).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Column mapping file (RON) for files not using Offtake's column names.
    #[arg(long)]
    pub mapping: Option<PathBuf>,
    /// Date format when the file's dates are day/month or month/day ordered.
    #[arg(long, value_enum)]
    pub date_format: Option<DateFormatArg>,
}

/// Runs the command.
///
/// Import warnings, and each day whose ET₀ cannot be computed (with its
/// reason), go to standard error; the report goes to standard output.
///
/// # Errors
/// An unreadable weather or mapping file (`file:line:column: reason`), an
/// invalid site, a record without one complete year, or a failed write.
pub fn run(args: &Args) -> Result<()> {
    let year_start = YearStart::new(args.year_start)?;
    let series = read_series(&args.file, args.mapping.as_deref(), args.date_format)?;
    for w in &series.warnings {
        eprintln!("{w}");
    }
    let wind_height = args.wind_height.or(series.wind_height_m);
    let site = site_from_args(Some(args.lat), Some(args.elevation), wind_height)?
        .context("station site")?;
    let results =
        et0_daily_series(&site, &series.days, &Et0Options::default()).context("station site")?;
    for (result, line) in results.iter().zip(&series.lines) {
        if let Err(e) = &result.outcome {
            eprintln!(
                "{}:{line}: warning: {}: no ET0 ({e}); the day counts as missing",
                args.file.display(),
                result.date
            );
        }
    }
    let (inputs, failed) = day_inputs_from_results(&series.days, &results);
    let arrays = daily_arrays(&inputs)
        .with_context(|| format!("{}: no days in the file", args.file.display()))?;
    let stats = compute_statistics(&arrays, year_start)
        .with_context(|| format!("{}: statistics", args.file.display()))?;
    let context = ReportContext {
        source: args.file.display().to_string(),
        latitude_deg: site.latitude_deg,
        elevation_m: site.elevation_m,
        wind_height_m: site.wind_height_m,
        days_read: series.days.len(),
        absent_days: arrays.absent_days,
        et0_failed_days: failed,
    };
    std::io::stdout()
        .lock()
        .write_all(render_text(&context, &stats).as_bytes())
        .context("writing the report to standard output")?;
    if let Some(out) = &args.out {
        write_atomically(out, render_csv(&stats).as_bytes())?;
    }
    Ok(())
}

/// Daily ET₀ and rain laid out day by day from the first to the last date
/// of the record, `None` where a day is absent or a value missing.
#[derive(Debug, Clone, PartialEq)]
pub struct DailyArrays {
    /// First day.
    pub start: NaiveDate,
    /// ET₀ (mm/day).
    pub et0_mm: Vec<Option<f64>>,
    /// Whether the day's ET₀ rests on an estimated input (FAO-56
    /// missing-data procedure) or a filled value.
    pub et0_estimated: Vec<bool>,
    /// Rain (mm).
    pub rain_mm: Vec<Option<f64>>,
    /// Whether the day's rain was filled.
    pub rain_filled: Vec<bool>,
    /// Days absent from the file between its first and last date.
    pub absent_days: usize,
}

/// One day as the command needs it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DayInput {
    /// Date.
    pub date: NaiveDate,
    /// ET₀ (mm/day), `None` when it could not be computed.
    pub et0_mm: Option<f64>,
    /// ET₀ rests on an estimated or filled input.
    pub et0_estimated: bool,
    /// Rain (mm).
    pub rain_mm: Option<f64>,
    /// Rain was filled.
    pub rain_filled: bool,
}

/// Lays out days (strictly increasing dates, gaps allowed) on a contiguous
/// calendar; absent days become missing values. `None` for no days.
pub fn daily_arrays(days: &[DayInput]) -> Option<DailyArrays> {
    let first = days.first()?;
    let last = days.last()?;
    let len = usize::try_from((last.date - first.date).num_days()).ok()? + 1;
    let mut arrays = DailyArrays {
        start: first.date,
        et0_mm: vec![None; len],
        et0_estimated: vec![false; len],
        rain_mm: vec![None; len],
        rain_filled: vec![false; len],
        absent_days: len.saturating_sub(days.len()),
    };
    for day in days {
        let Ok(i) = usize::try_from((day.date - first.date).num_days()) else {
            continue;
        };
        if i >= len {
            continue;
        }
        arrays.et0_mm[i] = day.et0_mm;
        arrays.et0_estimated[i] = day.et0_estimated;
        arrays.rain_mm[i] = day.rain_mm;
        arrays.rain_filled[i] = day.rain_filled;
    }
    Some(arrays)
}

/// Whether a day's ET₀ rests on an estimated input: radiation from the
/// temperature range (FAO-56 eq. 50), vapour pressure from Tmin (eq. 48) or
/// the default wind (FAO-56 p. 63).
fn rests_on_estimate(procedures: DayProcedures) -> bool {
    matches!(procedures.radiation, RadiationSource::TemperatureRange)
        || matches!(procedures.humidity, HumiditySource::FromTmin)
        || matches!(procedures.wind, WindSource::Default)
}

/// Daily ET₀ and rain of imported days, ready for [`daily_arrays`], from the
/// ET₀ results of those days (one per day, FAO-56 Penman–Monteith with its
/// missing-data procedures); also the number of days whose ET₀ could not be
/// computed.
pub fn day_inputs_from_results(
    days: &[WeatherDay],
    results: &[Et0DayResult],
) -> (Vec<DayInput>, usize) {
    let mut failed = 0;
    let inputs = days
        .iter()
        .zip(results)
        .map(|(day, result)| {
            let et0_estimated = if let Ok(procedures) = &result.outcome {
                rests_on_estimate(*procedures)
            } else {
                failed += 1;
                false
            };
            DayInput {
                date: day.date,
                et0_mm: result.et0_mm,
                et0_estimated,
                rain_mm: day.rain_mm,
                rain_filled: false,
            }
        })
        .collect();
    (inputs, failed)
}

/// Everything the report shows besides the statistics.
#[derive(Debug, Clone, PartialEq)]
pub struct ReportContext {
    /// File as given.
    pub source: String,
    /// Latitude (°).
    pub latitude_deg: f64,
    /// Elevation (m).
    pub elevation_m: f64,
    /// Wind height (m).
    pub wind_height_m: f64,
    /// Days read from the file.
    pub days_read: usize,
    /// Days absent between the first and last date.
    pub absent_days: usize,
    /// Days whose ET₀ could not be computed (bad or missing inputs).
    pub et0_failed_days: usize,
}

/// Computes the statistics of laid-out daily arrays.
///
/// # Errors
/// The core's typed errors (no complete year, a non-finite value).
pub fn compute_statistics(
    arrays: &DailyArrays,
    year_start: YearStart,
) -> Result<WeatherStatistics> {
    let et0 = DailySeries::new(arrays.start, &arrays.et0_mm, Some(&arrays.et0_estimated))?;
    let rain = DailySeries::new(arrays.start, &arrays.rain_mm, Some(&arrays.rain_filled))?;
    Ok(weather_statistics(
        &et0,
        &rain,
        year_start,
        &DEFAULT_ET0_PROBABILITIES,
        &DEFAULT_RAIN_PROBABILITIES,
    )?)
}

fn mm(value: Option<f64>) -> String {
    value.map_or_else(|| "-".to_owned(), |v| format!("{v:.1}"))
}

/// Short column label of a probability: `80% NE` or `80% E`.
fn short_label(p: Probability) -> String {
    let kind = match p {
        Probability::NonExceedance(_) => "NE",
        Probability::Exceedance(_) => "E",
    };
    format!("{:.0}% {kind}", p.fraction() * 100.0)
}

/// Renders rows as a plain text table: first column left-aligned, the others
/// right-aligned.
fn table(out: &mut String, headers: &[String], rows: &[Vec<String>]) {
    let mut widths: Vec<usize> = headers.iter().map(|h| h.chars().count()).collect();
    for row in rows {
        for (w, cell) in widths.iter_mut().zip(row) {
            *w = (*w).max(cell.chars().count());
        }
    }
    let line = |out: &mut String, cells: &[String]| {
        let mut text = String::new();
        for (i, (cell, w)) in cells.iter().zip(&widths).enumerate() {
            if i == 0 {
                let _ = write!(text, "{cell:<w$}");
            } else {
                let _ = write!(text, "  {cell:>w$}");
            }
        }
        out.push_str(text.trim_end());
        out.push('\n');
    };
    line(out, headers);
    for row in rows {
        line(out, row);
    }
}

fn slot_row(label: &str, et0: &SlotStatistics, rain: &SlotStatistics) -> Vec<String> {
    let mut row = vec![label.to_owned(), mm(et0.mean)];
    row.extend(et0.at.iter().map(|v| mm(Some(v.value))));
    row.push(mm(rain.mean));
    row.extend(rain.at.iter().map(|v| mm(Some(v.value))));
    row.push(format!("{}/{}", et0.years_used, rain.years_used));
    row
}

fn slot_headers(stats: &WeatherStatistics) -> Vec<String> {
    let mut headers = vec![String::new(), "ET0 mean".to_owned()];
    headers.extend(
        stats
            .et0
            .yearly
            .at
            .iter()
            .map(|v| format!("ET0 {}", short_label(v.probability))),
    );
    headers.push("rain mean".to_owned());
    headers.extend(
        stats
            .rain
            .yearly
            .at
            .iter()
            .map(|v| format!("rain {}", short_label(v.probability))),
    );
    headers.push("years ET0/rain".to_owned());
    headers
}

fn estimated_note(series: &SeriesStatistics) -> String {
    format!(
        "{} missing, {} estimated or filled",
        series.missing_days, series.filled_days
    )
}

/// The text report.
pub fn render_text(context: &ReportContext, stats: &WeatherStatistics) -> String {
    let mut out = String::new();
    let totals = &stats.et0.totals;
    let year_start = totals.year_start;
    let _ = writeln!(out, "Weather statistics: {}", context.source);
    let _ = writeln!(
        out,
        "Station: latitude {:.3} deg, elevation {:.0} m, wind measured at {} m",
        context.latitude_deg, context.elevation_m, context.wind_height_m
    );
    let _ = writeln!(
        out,
        "Days read: {}; absent between first and last date: {}; ET0 not computable: {}",
        context.days_read, context.absent_days, context.et0_failed_days
    );
    let _ = writeln!(
        out,
        "ET0: FAO-56 Penman-Monteith, daily; days in complete years: ET0 {}; rain {}",
        estimated_note(&stats.et0),
        estimated_note(&stats.rain)
    );
    if year_start.is_calendar_year() {
        let _ = writeln!(out, "Years: calendar years (January to December)");
    } else {
        let _ = writeln!(
            out,
            "Years: irrigation years from 1 {}, labelled by start year and end year (e.g. 2031/32)",
            month_abbreviation(year_start.month())
        );
    }
    let complete = &totals.coverage.complete;
    if let (Some(first), Some(last)) = (complete.first(), complete.last()) {
        let _ = writeln!(
            out,
            "Complete years: {} ({} to {})",
            complete.len(),
            first.label(),
            last.label()
        );
    }
    for partial in &totals.coverage.partial {
        let _ = writeln!(
            out,
            "Left out (incomplete at the {} of the record): {}, {} of {} days",
            match partial.cut_at {
                offtake_core::calendar::RecordEnd::Start => "start",
                offtake_core::calendar::RecordEnd::End => "end",
                _ => "start and end",
            },
            partial.year.label(),
            partial.days_in_record,
            partial.days_in_year
        );
    }
    let _ = writeln!(
        out,
        "Probabilities (Weibull plotting positions m/(n+1), interpolated): NE = non-exceedance, \
         the value not exceeded in that share of years (ET0); E = exceedance, the value equalled \
         or exceeded in that share of years (rain; 80% E is the dependable rain)."
    );

    out.push_str("\nYEARLY TOTALS (mm)\n");
    let rows: Vec<Vec<String>> = stats
        .et0
        .totals
        .years
        .iter()
        .zip(&stats.rain.totals.years)
        .map(|(e, r)| {
            vec![
                e.period.label(),
                mm(e.total),
                mm(r.total),
                e.missing_days.to_string(),
                r.missing_days.to_string(),
                e.filled_days.to_string(),
            ]
        })
        .collect();
    table(
        &mut out,
        &[
            "year",
            "ET0",
            "rain",
            "ET0 missing d",
            "rain missing d",
            "ET0 estimated d",
        ]
        .map(str::to_owned),
        &rows,
    );
    out.push_str("(- : the year has missing days and is left out of the yearly statistics)\n");

    out.push_str("\nYEARLY STATISTICS (mm/year)\n");
    let mut rows = Vec::new();
    for (name, series) in [("ET0", &stats.et0), ("rain", &stats.rain)] {
        let y = &series.yearly;
        for (at, design) in y.at.iter().zip(&series.design_years) {
            rows.push(vec![
                name.to_owned(),
                y.years_used.to_string(),
                mm(y.mean),
                mm(y.min),
                mm(y.max),
                at.probability.to_string(),
                mm(Some(at.value)),
                format!("{} ({:.1})", design.year.label(), design.total),
            ]);
        }
    }
    table(
        &mut out,
        &[
            "",
            "years",
            "mean",
            "min",
            "max",
            "probability",
            "value",
            "design year (total)",
        ]
        .map(str::to_owned),
        &rows,
    );

    out.push_str("\nMONTHLY (mm/month)\n");
    let rows: Vec<_> = stats
        .et0
        .monthly
        .iter()
        .zip(&stats.rain.monthly)
        .map(|(e, r)| slot_row(&e.label, e, r))
        .collect();
    table(&mut out, &slot_headers(stats), &rows);

    out.push_str("\n10-DAY PERIODS (mm per period: days 1-10, 11-20, 21-end)\n");
    let rows: Vec<_> = stats
        .et0
        .ten_day
        .iter()
        .zip(&stats.rain.ten_day)
        .map(|(e, r)| slot_row(&e.label, e, r))
        .collect();
    table(&mut out, &slot_headers(stats), &rows);

    out.push_str(
        "\nPlanning estimates only: canal and structure designs must be checked by a qualified \
         engineer against local codes and measured data.\n",
    );
    out
}

fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

fn stat_name(p: Probability) -> String {
    format!(
        "{:.0}pct_{}",
        p.fraction() * 100.0,
        p.kind().replace('-', "_")
    )
}

/// Header of the CSV written with `--out`.
pub const CSV_HEADER: &str =
    "level,period,variable,statistic,value_mm,years,missing_days,filled_days";

/// The long CSV table written with `--out`: one value per row.
///
/// `level` is `year_total`, `month_total`, `tenday_total` (one row per
/// period of the record), `yearly`, `monthly`, `tenday` (statistics across
/// years) or `day_of_year` (daily climatology, mm/day). `statistic` is
/// `total`, `mean`, `min`, `max`, `p10`, `p50`, `p90` (day of year,
/// non-exceedance), or e.g. `80pct_non_exceedance`, `80pct_exceedance`;
/// design years appear as `design_year_80pct_exceedance` with the year's label
/// in `period` and its total in `value_mm`.
pub fn render_csv(stats: &WeatherStatistics) -> String {
    let mut out = String::new();
    out.push_str(CSV_HEADER);
    out.push('\n');
    let mut row = |level: &str,
                   period: &str,
                   variable: &str,
                   statistic: &str,
                   value: Option<f64>,
                   years: Option<usize>,
                   missing: Option<u32>,
                   filled: Option<u32>| {
        let opt = |v: Option<String>| v.unwrap_or_default();
        let _ = writeln!(
            out,
            "{level},{},{variable},{statistic},{},{},{},{}",
            csv_field(period),
            opt(value.map(|v| format!("{v:.3}"))),
            opt(years.map(|v| v.to_string())),
            opt(missing.map(|v| v.to_string())),
            opt(filled.map(|v| v.to_string())),
        );
    };
    for (variable, series) in [("et0", &stats.et0), ("rain", &stats.rain)] {
        let t = &series.totals;
        for y in &t.years {
            let p = y.period.label();
            row(
                "year_total",
                &p,
                variable,
                "total",
                y.total,
                None,
                Some(y.missing_days),
                Some(y.filled_days),
            );
        }
        for m in &t.months {
            let p = m.period.to_string();
            row(
                "month_total",
                &p,
                variable,
                "total",
                m.total,
                None,
                Some(m.missing_days),
                Some(m.filled_days),
            );
        }
        for d in &t.ten_days {
            let p = d.period.to_string();
            row(
                "tenday_total",
                &p,
                variable,
                "total",
                d.total,
                None,
                Some(d.missing_days),
                Some(d.filled_days),
            );
        }
        let slots = std::iter::once(("yearly", &series.yearly))
            .chain(series.monthly.iter().map(|s| ("monthly", s)))
            .chain(series.ten_day.iter().map(|s| ("tenday", s)));
        for (level, s) in slots {
            let n = Some(s.years_used);
            row(level, &s.label, variable, "mean", s.mean, n, None, None);
            row(level, &s.label, variable, "min", s.min, n, None, None);
            row(level, &s.label, variable, "max", s.max, n, None, None);
            for v in &s.at {
                row(
                    level,
                    &s.label,
                    variable,
                    &stat_name(v.probability),
                    Some(v.value),
                    n,
                    None,
                    None,
                );
            }
        }
        for dy in &series.design_years {
            let statistic = format!("design_year_{}", stat_name(dy.probability));
            row(
                "yearly",
                &dy.year.label(),
                variable,
                &statistic,
                Some(dy.total),
                Some(series.yearly.years_used),
                None,
                None,
            );
        }
        for b in &series.day_of_year {
            let p = format!("{:02}-{:02}", b.month, b.day);
            for (statistic, value) in [
                ("mean", b.mean),
                ("p10", b.p10),
                ("p50", b.p50),
                ("p90", b.p90),
            ] {
                row(
                    "day_of_year",
                    &p,
                    variable,
                    statistic,
                    Some(value),
                    Some(b.n),
                    None,
                    None,
                );
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use offtake_core::weather::StationSite;

    fn d(y: i32, m: u32, day: u32) -> NaiveDate {
        NaiveDate::from_ymd_opt(y, m, day).expect("date")
    }

    fn two_years_with_a_gap() -> Vec<DayInput> {
        let mut days = Vec::new();
        let mut date = d(2021, 1, 1);
        while date <= d(2022, 12, 31) {
            if date != d(2022, 3, 5) {
                days.push(DayInput {
                    date,
                    et0_mm: Some(5.0),
                    et0_estimated: date.format("%m").to_string() == "06",
                    rain_mm: Some(if date == d(2021, 7, 15) { 100.0 } else { 0.0 }),
                    rain_filled: false,
                });
            }
            date = date.succ_opt().expect("date");
        }
        days
    }

    /// Days run through the ET₀ core: a day with Tmin > Tmax has no ET₀
    /// and is counted; a day without radiation rests on an estimate.
    #[test]
    fn et0_of_imported_days() {
        let mut days = Vec::new();
        for (i, date) in [d(2021, 6, 1), d(2021, 6, 2), d(2021, 6, 3)]
            .into_iter()
            .enumerate()
        {
            let mut day = WeatherDay::empty(date);
            day.tmax_c = Some(35.0);
            day.tmin_c = Some(if i == 1 { 36.0 } else { 22.0 });
            day.rhmax_pct = Some(70.0);
            day.rhmin_pct = Some(30.0);
            day.wind_ms = Some(2.0);
            day.solar_mj = if i == 2 { None } else { Some(25.0) };
            day.rain_mm = Some(0.0);
            days.push(day);
        }
        let site = StationSite {
            latitude_deg: 18.0,
            elevation_m: 350.0,
            wind_height_m: 2.0,
        };
        let results = et0_daily_series(&site, &days, &Et0Options::default()).expect("site ok");
        let (inputs, failed) = day_inputs_from_results(&days, &results);
        assert_eq!(failed, 1);
        assert!(inputs[0].et0_mm.is_some() && !inputs[0].et0_estimated);
        assert!(inputs[1].et0_mm.is_none());
        assert!(inputs[2].et0_mm.is_some() && inputs[2].et0_estimated);
    }

    #[test]
    fn absent_days_become_missing_values() {
        let arrays = daily_arrays(&two_years_with_a_gap()).expect("days");
        assert_eq!(arrays.et0_mm.len(), 730);
        assert_eq!(arrays.absent_days, 1);
        let gap = usize::try_from((d(2022, 3, 5) - d(2021, 1, 1)).num_days()).expect("index");
        assert_eq!(arrays.et0_mm[gap], None);
        assert_eq!(arrays.rain_mm[gap], None);
        assert!(daily_arrays(&[]).is_none());
    }

    #[test]
    fn text_and_csv_reports_show_both_kinds() {
        let arrays = daily_arrays(&two_years_with_a_gap()).expect("days");
        let stats = compute_statistics(&arrays, YearStart::JANUARY).expect("stats");
        let context = ReportContext {
            source: "w.csv".to_owned(),
            latitude_deg: 18.0,
            elevation_m: 350.0,
            wind_height_m: 2.0,
            days_read: 729,
            absent_days: 1,
            et0_failed_days: 0,
        };
        let text = render_text(&context, &stats);
        assert!(text.contains("YEARLY TOTALS"));
        assert!(text.contains("80% NE"));
        assert!(text.contains("80% E"));
        assert!(text.contains("80 % exceedance"));
        // 2021: 365 days × 5 mm = 1825.0; 2022 has a missing day.
        assert!(text.contains("1825.0"));
        assert!(text.contains("Jul 2"));
        assert!(text.contains("qualified engineer"));

        let csv = render_csv(&stats);
        let mut lines = csv.lines();
        assert_eq!(lines.next(), Some(CSV_HEADER));
        assert!(csv.contains("year_total,2021,et0,total,1825.000,,0,30\n"));
        assert!(csv.contains("year_total,2022,et0,total,,,1,30\n"));
        assert!(csv.contains("yearly,2021,rain,design_year_80pct_exceedance,100.000,1,,\n"));
        // July rain: 100 mm (2021) and 0 mm (2022); 80 % exceedance = 20 %
        // non-exceedance, r = 0.2 × 3 = 0.6 < 1, clamped to the smaller, 0.
        assert!(csv.contains("monthly,Jul,rain,80pct_exceedance,0.000,2,,\n"));
        for line in csv.lines() {
            assert_eq!(line.split(',').count(), 8, "{line}");
        }
    }

    /// The whole command on the committed demo weather: the CSV's 2003 rain
    /// total equals the rain column of the file summed directly, and the
    /// dependable-rain rows are labelled as exceedance values.
    #[test]
    fn run_on_demo_weather_writes_csv() {
        let demo = PathBuf::from(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/../../demo-projects/demo-weather/weather.csv"
        ));
        let text = std::fs::read_to_string(&demo).expect("demo weather");
        let rain_2003: f64 = text
            .lines()
            .filter(|l| l.starts_with("2003-"))
            .filter_map(|l| l.rsplit(',').next()?.parse::<f64>().ok())
            .sum();
        let dir = tempfile::tempdir().expect("temp dir");
        let out = dir.path().join("stats.csv");
        let args = Args {
            file: demo,
            lat: 18.0,
            elevation: 350.0,
            wind_height: Some(10.0),
            year_start: 1,
            out: Some(out.clone()),
            mapping: None,
            date_format: None,
        };
        run(&args).expect("runs");
        let csv = std::fs::read_to_string(&out).expect("written");
        assert!(csv.starts_with(CSV_HEADER));
        let row = csv
            .lines()
            .find(|l| l.starts_with("year_total,2003,rain,total,"))
            .expect("2003 rain row");
        let value: f64 = row
            .split(',')
            .nth(4)
            .expect("value")
            .parse()
            .expect("number");
        assert!((value - rain_2003).abs() < 1e-6, "{value} vs {rain_2003}");
        assert!(csv.contains("yearly,year,rain,80pct_exceedance,"));
        assert!(csv.contains("yearly,year,et0,80pct_non_exceedance,"));
    }
}
