//! `offtake weather check FILE.csv [--lat DEG --elevation M] [--mapping FILE]
//! [--date-format iso|dmy|mdy] [--out FILE.csv]`
//!
//! Reads a weather file through the common importer, runs the quality checks
//! and prints one line per flag (`YYYY-MM-DD variable rule ...`), then the
//! summary. Import warnings go to standard error. Exit 0 when the file could
//! be read (flags are not failures); an unreadable file is an error with
//! `file:line:column: reason`.

use std::fmt::Write as _;
use std::io::Write as _;
use std::path::{Path, PathBuf};

use anyhow::{Context, Result, bail};
use clap::Args as ClapArgs;
use offtake_core::et0::series::{MAX_ELEVATION_M, MIN_ELEVATION_M};
use offtake_core::quality::{
    DayAstronomy, QualityReport, QualityRules, Rule, SiteAstronomy, check_series,
};
use offtake_core::weather::StationSite;
use offtake_io::weather::{
    DateFormat, ImportOptions, ImportedSeries, import_weather_file, load_mapping,
};

/// Arguments of `offtake weather check`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Weather CSV file.
    pub file: PathBuf,
    /// Station latitude in decimal degrees (north positive); with
    /// --elevation, enables the clear-sky radiation and daylight-hours rules.
    #[arg(long, allow_hyphen_values = true, requires = "elevation")]
    pub lat: Option<f64>,
    /// Station elevation above sea level (m).
    #[arg(long, allow_hyphen_values = true, requires = "lat")]
    pub elevation: Option<f64>,
    /// Column mapping file (RON) for files not using Offtake's column names.
    #[arg(long)]
    pub mapping: Option<PathBuf>,
    /// Date format when the file's dates are day/month or month/day ordered.
    #[arg(long, value_enum)]
    pub date_format: Option<DateFormatArg>,
    /// Also write the flags as CSV (date,variable,rule,value,limit).
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// Runs the command.
///
/// # Errors
/// An unreadable weather or mapping file, an invalid site, or a failed write.
pub fn run(args: &Args) -> Result<()> {
    let series = read_series(&args.file, args.mapping.as_deref(), args.date_format)?;
    for w in &series.warnings {
        eprintln!("{w}");
    }
    let site = site_from_args(args.lat, args.elevation, None)?;
    // Rso (FAO-56 eq. 37) and N (eq. 34) for the radiation and sunshine rules.
    let astronomy = site.as_ref().map(SiteAstronomy::new).transpose()?;
    let lookup = astronomy.as_ref().map(|a| move |d| a.for_date(d));
    let lookup_ref = lookup
        .as_ref()
        .map(|f| f as &dyn Fn(chrono::NaiveDate) -> Option<DayAstronomy>);
    let report = check_series(&series.days, &QualityRules::default(), lookup_ref)
        .with_context(|| format!("{}: quality checks", args.file.display()))?;
    let text = render_report(&report);
    let mut stdout = std::io::stdout().lock();
    stdout
        .write_all(text.as_bytes())
        .context("writing the report to standard output")?;
    if let Some(out) = &args.out {
        write_atomically(out, flags_csv(&report).as_bytes())?;
    }
    Ok(())
}

/// `--date-format` values.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum DateFormatArg {
    /// YYYY-MM-DD
    Iso,
    /// DD/MM/YYYY
    Dmy,
    /// MM/DD/YYYY
    Mdy,
}

impl From<DateFormatArg> for DateFormat {
    fn from(a: DateFormatArg) -> Self {
        match a {
            DateFormatArg::Iso => Self::Iso,
            DateFormatArg::Dmy => Self::DayMonthYear,
            DateFormatArg::Mdy => Self::MonthDayYear,
        }
    }
}

/// Import options from the common command-line choices (shared with `offtake et0`
/// so both commands read files, and word their messages, the same way).
///
/// # Errors
/// An unreadable or invalid mapping file.
pub(crate) fn import_options(
    mapping: Option<&Path>,
    date_format: Option<DateFormatArg>,
) -> Result<ImportOptions> {
    Ok(ImportOptions {
        mapping: mapping.map(load_mapping).transpose()?,
        date_format: date_format.map(DateFormat::from),
        ..ImportOptions::default()
    })
}

/// Reads a whole weather series through the common importer.
///
/// # Errors
/// Every problem of the file, each as `file:line:column: reason`.
pub(crate) fn read_series(
    file: &Path,
    mapping: Option<&Path>,
    date_format: Option<DateFormatArg>,
) -> Result<ImportedSeries> {
    let options = import_options(mapping, date_format)?;
    Ok(import_weather_file(file, &options)?)
}

/// The station site from `--lat`, `--elevation` and `--wind-height`, checked.
///
/// # Errors
/// A latitude outside −90..=90, a non-finite elevation, or a wind height not above 0.
pub(crate) fn site_from_args(
    lat: Option<f64>,
    elevation: Option<f64>,
    wind_height_m: Option<f64>,
) -> Result<Option<StationSite>> {
    let (Some(latitude_deg), Some(elevation_m)) = (lat, elevation) else {
        return Ok(None);
    };
    if !(-90.0..=90.0).contains(&latitude_deg) {
        bail!("--lat: found {latitude_deg}, expected decimal degrees from -90 to 90");
    }
    if !elevation_m.is_finite() || !(MIN_ELEVATION_M..=MAX_ELEVATION_M).contains(&elevation_m) {
        bail!(
            "--elevation: found {elevation_m}, expected metres above sea level from {MIN_ELEVATION_M} to {MAX_ELEVATION_M}"
        );
    }
    let wind_height_m = wind_height_m.unwrap_or(2.0);
    if !wind_height_m.is_finite() || wind_height_m <= 0.0 {
        bail!(
            "--wind-height: found {wind_height_m}, expected a height above the ground in metres, above 0"
        );
    }
    Ok(Some(StationSite {
        latitude_deg,
        elevation_m,
        wind_height_m,
    }))
}

/// Writes `bytes` to `path` through offtake-io's one atomic writer (a
/// uniquely named temporary file created exclusively beside it, renamed into
/// place), so a reader never sees a half-written file and two runs at once
/// never share a temporary file.
///
/// # Errors
/// The file system's reason, naming the file.
pub(crate) fn write_atomically(path: &Path, bytes: &[u8]) -> Result<()> {
    offtake_io::atomic::write_atomically(path, bytes)?;
    Ok(())
}

fn render_report(report: &QualityReport) -> String {
    let mut s = String::new();
    for f in &report.flags {
        let _ = writeln!(s, "{f}");
    }
    let sm = &report.summary;
    let _ = writeln!(s, "summary: record {} to {}", sm.first, sm.last);
    if !report.radiation_rules_applied {
        let _ = writeln!(
            s,
            "note: rules {}, {} and {} not applied (give --lat and --elevation)",
            Rule::SolarAboveClearSky,
            Rule::SolarImplausiblyLow,
            Rule::SunshineAboveDaylight
        );
    }
    let _ = write!(
        s,
        "completeness % (days with a value / days of the year in the record):\nyear days"
    );
    for v in &sm.variables {
        let _ = write!(s, " {v}");
    }
    s.push('\n');
    for y in &sm.completeness {
        let _ = write!(s, "{} {}", y.year, y.days_in_span);
        for v in &sm.variables {
            let _ = write!(s, " {:.1}", 100.0 * y.fraction(*v));
        }
        s.push('\n');
    }
    let total: usize = sm.flag_counts.values().sum();
    let _ = write!(s, "flags: {total}");
    for (rule, n) in &sm.flag_counts {
        let _ = write!(s, ", {rule} {n}");
    }
    s.push('\n');
    if sm.worst_missing_runs.is_empty() {
        s.push_str("missing runs: none\n");
    } else {
        s.push_str("worst missing runs:\n");
        for r in &sm.worst_missing_runs {
            let _ = writeln!(
                s,
                "  {} {} to {} ({} days)",
                r.variable, r.first, r.last, r.days
            );
        }
    }
    s
}

fn flags_csv(report: &QualityReport) -> String {
    let mut s = String::from("date,variable,rule,value,limit\n");
    for f in &report.flags {
        let _ = writeln!(
            s,
            "{},{},{},{},{}",
            f.date, f.variable, f.rule, f.value, f.limit
        );
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;
    use chrono::NaiveDate;
    use offtake_core::weather::WeatherDay;

    #[test]
    fn report_lists_flag_then_summary() {
        let d = |day| NaiveDate::from_ymd_opt(2021, 3, day).unwrap_or_default();
        let days = [
            WeatherDay {
                tmax_c: Some(30.0),
                tmin_c: Some(31.0),
                ..WeatherDay::empty(d(1))
            },
            WeatherDay {
                tmax_c: Some(30.5),
                tmin_c: Some(18.0),
                ..WeatherDay::empty(d(2))
            },
        ];
        let r = check_series(&days, &QualityRules::default(), None).expect("checks");
        let text = render_report(&r);
        let first = text.lines().next().unwrap_or_default();
        assert_eq!(first, "2021-03-01 tmin_c tmin_above_tmax value=31 tmax=30");
        assert!(text.contains("flags: 1, tmin_above_tmax 1"), "{text}");
        assert!(text.contains("year days tmax_c tmin_c"), "{text}");
    }
}
