//! `offtake run PROJECT.ron [--out DIR] [--scenario NAME]`
//!
//! Loads the project and its weather file, computes the whole chain
//! (`offtake_core::engine`), prints a summary with units and writes the
//! contract tables into DIR (default `<project dir>/results`):
//! `design_values.csv`, `node_demand_daily.csv`,
//! `block_requirements_daily.csv`, `demand_10day.csv`, `demand_monthly.csv`,
//! `roster.csv` (when supply is short) and `results.xlsx` (summary, design
//! values, 10-day and monthly tables, roster; daily tables in CSV only),
//! as one set with the manifest `offtake-manifest.ron` written last.

use std::path::{Path, PathBuf};

use anyhow::{Context, Result};
use clap::Args as ClapArgs;
use offtake_core::engine;
use offtake_core::project::Project;
use offtake_core::weather::WeatherDay;
use offtake_io::library::Libraries;
use offtake_io::project_file::load_project;
use offtake_io::results::{summary_text, write_results_set};
use offtake_io::weather::load_project_weather;

/// Arguments of `offtake run`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Project file (RON).
    pub project: PathBuf,
    /// Output folder (default: `<project dir>/results`).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Scenario to compute (default: the base case).
    #[arg(long)]
    pub scenario: Option<String>,
}

/// A loaded project with its libraries and weather.
pub(crate) struct Loaded {
    pub project: Project,
    pub libraries: Libraries,
    pub weather: Vec<WeatherDay>,
}

/// Loads the project, the built-in libraries and the project's weather file.
///
/// # Errors
/// The project or weather file's problems with `file:line:column`.
pub(crate) fn load(path: &Path) -> Result<Loaded> {
    let project = load_project(path)?;
    // The project's own crops and soils replace library entries with the
    // same id (the project file is self-contained).
    let libraries = Libraries::builtin()
        .context("built-in crop and soil libraries")?
        .for_project(&project);
    // The project's saved import settings (mapping, units, date format,
    // delimiter, decimal separator) are applied by the one shared loader.
    let weather = load_project_weather(path, &project)
        .with_context(|| format!("reading the weather series of {}", path.display()))?;
    Ok(Loaded {
        project,
        libraries,
        weather: weather.series.days,
    })
}

/// Runs the command.
///
/// # Errors
/// Any input, computation or output problem, with its cause chain.
pub fn run(args: &Args) -> Result<()> {
    let loaded = load(&args.project)?;
    let results = engine::run_scenario(
        &loaded.project,
        args.scenario.as_deref(),
        &loaded.libraries.crops,
        &loaded.libraries.soils,
        &loaded.weather,
    )
    .with_context(|| format!("computing {}", args.project.display()))?;
    let out = args.out.clone().unwrap_or_else(|| {
        args.project
            .parent()
            .unwrap_or_else(|| Path::new(""))
            .join("results")
    });
    std::fs::create_dir_all(&out)
        .with_context(|| format!("creating the output folder {}", out.display()))?;
    // One set with a manifest written last (offtake_io::results_set): never
    // a silent mix of two runs, a previous run's extra files removed.
    write_results_set(&results, &loaded.project, Some(&args.project), &out)?;
    let text = format!(
        "{}Results written to {}\n",
        summary_text(&results, &loaded.project),
        out.display()
    );
    print_text(&text)
}

/// Writes text to standard output; a closed pipe (`offtake run … | head`)
/// ends the output quietly instead of panicking.
///
/// # Errors
/// Any other write error.
pub(crate) fn print_text(text: &str) -> Result<()> {
    use std::io::Write as _;
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|()| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => {
            Err(e).context("writing to standard output")
        }
        _ => Ok(()),
    }
}

#[cfg(test)]
mod tests {
    use offtake_io::results::fmt_sig3;

    #[test]
    fn three_significant_figures() {
        assert_eq!(fmt_sig3(5575.22), "5,580");
        assert_eq!(fmt_sig3(638.797), "639");
        assert_eq!(fmt_sig3(1277.6), "1,280");
        assert_eq!(fmt_sig3(99.96), "100");
        assert_eq!(fmt_sig3(12.345), "12.3");
        assert_eq!(fmt_sig3(1.9159), "1.92");
        assert_eq!(fmt_sig3(0.012_34), "0.0123");
        assert_eq!(fmt_sig3(0.0), "0");
        assert_eq!(fmt_sig3(19_354.9), "19,400");
    }
}
