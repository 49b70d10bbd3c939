//! `offtake et0 --weather FILE.csv --lat DEG --elevation M [--wind-height M]
//! [--method pm|hargreaves|asce-short|asce-tall] [--skip-invalid]
//! [--out FILE.csv] [--mapping FILE] [--date-format iso|dmy|mdy]`
//!
//! Streams the weather file through the common importer (so malformed-file
//! messages are the same as `offtake weather check`'s) and writes one row per
//! day: `date,et0_mm,humidity,radiation,wind`; the last three name the
//! FAO-56 source or missing-data procedure of each input. A day with Tmin >
//! Tmax (or another invalid value) is listed with `file:line:column` among
//! the rejected cells (all of them, up to the cap of `weather check`) and the
//! command stops once the file is read, or with `--skip-invalid` it gets a
//! blank et0 and a warning naming the date. A
//! day without Tmax or Tmin gets a blank et0 and a warning.

use std::io::{BufWriter, Write};
use std::path::PathBuf;

use anyhow::{Context, Result, bail};
use clap::Args as ClapArgs;
use offtake_core::et0::{Et0Context, Et0Error, Et0Method, Et0Options};
use offtake_io::atomic::AtomicFile;
use offtake_io::weather::{ImportError, ImportProblem, ProblemKind, SourceLocation, WeatherReader};

use crate::cmd_weather_check::{DateFormatArg, import_options, site_from_args};

/// Arguments of `offtake et0`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Weather CSV file.
    #[arg(long)]
    pub weather: PathBuf,
    /// Station latitude in decimal degrees (north positive).
    #[arg(long, allow_hyphen_values = true)]
    pub lat: f64,
    /// Station elevation above sea level (m).
    #[arg(long, allow_hyphen_values = true)]
    pub elevation: f64,
    /// Wind measurement height above the ground (m); default: the mapping's
    /// stated height, else 2 m.
    #[arg(long)]
    pub wind_height: Option<f64>,
    /// Reference ET method.
    #[arg(long, default_value = "pm", value_parser = parse_method)]
    pub method: Et0Method,
    /// Leave et0 blank on days with invalid values (e.g. Tmin > Tmax) and warn,
    /// instead of stopping.
    #[arg(long)]
    pub skip_invalid: bool,
    /// Output CSV file (written atomically); standard output when absent.
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Column mapping file (RON) for files not using Offtake's column names.
    #[arg(long)]
    pub mapping: Option<PathBuf>,
    /// Date format when the file's dates are day/month or month/day ordered.
    #[arg(long, value_enum)]
    pub date_format: Option<DateFormatArg>,
}

fn parse_method(s: &str) -> Result<Et0Method, String> {
    s.parse::<Et0Method>().map_err(|e| e.to_string())
}

/// Runs the command.
///
/// # Errors
/// Unreadable input, an invalid site, an invalid day (without
/// `--skip-invalid`), or a failed write.
pub fn run(args: &Args) -> Result<()> {
    let options = import_options(args.mapping.as_deref(), args.date_format)?;
    let mut reader = WeatherReader::open(&args.weather, &options)?;
    let wind_height = args.wind_height.or(reader.wind_height_m());
    let site = site_from_args(Some(args.lat), Some(args.elevation), wind_height)?
        .context("station site")?;
    let context = Et0Context::new(
        &site,
        &Et0Options {
            method: args.method,
            ..Et0Options::default()
        },
    )
    .context("station site")?;

    if let Some(path) = &args.out {
        // offtake-io's one atomic writer: a uniquely named temporary file
        // created exclusively beside the target; dropped (and removed) on
        // any error, renamed over the target only when the whole table is
        // written.
        let mut file = AtomicFile::create(path)?;
        {
            let mut out = BufWriter::new(&mut file);
            stream(&mut reader, &context, args, &mut out)?;
            out.flush()
                .with_context(|| format!("{}: cannot write", path.display()))?;
        }
        file.commit()?;
        Ok(())
    } else {
        let stdout = std::io::stdout();
        let mut out = BufWriter::new(stdout.lock());
        stream(&mut reader, &context, args, &mut out)?;
        out.flush().context("writing to standard output")
    }
}

/// Counts of a run, for the closing note.
#[derive(Debug, Default)]
struct Tally {
    days: usize,
    computed: usize,
    blank: usize,
    procedures: usize,
}

fn stream<R: std::io::Read, W: Write>(
    reader: &mut WeatherReader<R>,
    context: &Et0Context,
    args: &Args,
    out: &mut W,
) -> Result<()> {
    writeln!(out, "date,et0_mm,humidity,radiation,wind").context("writing output")?;
    let mut problems = Vec::new();
    let mut omitted = 0usize;
    let mut tally = Tally::default();
    let source = reader.source().to_owned();
    for item in reader.by_ref() {
        let read = match item {
            Ok(r) => r,
            Err(ImportError::Row(p)) => {
                if problems.len() < offtake_io::weather::DEFAULT_MAX_PROBLEMS {
                    problems.push(*p);
                } else {
                    omitted += 1;
                }
                continue;
            }
            Err(fatal) => return Err(fatal.into()),
        };
        tally.days += 1;
        let at = SourceLocation {
            file: source.clone(),
            line: read.line,
            column: 1,
        };
        let result = context.day(&read.day);
        match (&result.outcome, result.et0_mm) {
            (Ok(p), Some(et0)) => {
                tally.computed += 1;
                let estimated = p.humidity == offtake_core::et0::HumiditySource::FromTmin
                    || p.radiation == offtake_core::et0::RadiationSource::TemperatureRange
                    || p.wind == offtake_core::et0::WindSource::Default;
                if estimated {
                    tally.procedures += 1;
                }
                writeln!(
                    out,
                    "{},{et0:.2},{},{},{}",
                    read.day.date,
                    p.humidity.label(),
                    p.radiation.label(),
                    p.wind.label()
                )
                .context("writing output")?;
            }
            (Err(Et0Error::MissingTemperature { .. }), _) => {
                tally.blank += 1;
                eprintln!(
                    "{at}: warning: {}: {}; et0 left blank",
                    read.day.date,
                    result
                        .outcome
                        .as_ref()
                        .err()
                        .map_or_else(String::new, ToString::to_string)
                );
                writeln!(out, "{},,,,", read.day.date).context("writing output")?;
            }
            (Err(e), _) => {
                if !args.skip_invalid {
                    // Listed with the rejected cells (same cap as `weather
                    // check`); the command stops after the whole file.
                    let problem = ImportProblem {
                        at,
                        kind: ProblemKind::InvalidDay {
                            date: read.day.date,
                            reason: format!("{e}; expected valid weather (or use --skip-invalid)"),
                        },
                    };
                    if problems.len() < offtake_io::weather::DEFAULT_MAX_PROBLEMS {
                        problems.push(problem);
                    } else {
                        omitted += 1;
                    }
                    continue;
                }
                tally.blank += 1;
                eprintln!("{at}: warning: {}: {e}; et0 left blank", read.day.date);
                writeln!(out, "{},,,,", read.day.date).context("writing output")?;
            }
            (Ok(_), None) => {
                bail!("{at}: {}: ET0 result without a value", read.day.date);
            }
        }
    }
    for w in reader.warnings() {
        eprintln!("{w}");
    }
    if !problems.is_empty() {
        return Err(ImportError::Rejected { problems, omitted }.into());
    }
    if tally.days == 0 {
        return Err(ImportError::NoData {
            at: SourceLocation {
                file: source,
                line: reader.last_line() + 1,
                column: 1,
            },
        }
        .into());
    }
    eprintln!(
        "{} days: {} computed ({} using a FAO-56 missing-data procedure), {} blank; method {}",
        tally.days, tally.computed, tally.procedures, tally.blank, args.method
    );
    Ok(())
}
