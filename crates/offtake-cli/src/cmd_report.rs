//! `offtake report PROJECT.ron [--scenario NAME] [--out report.html]`
//!
//! Computes the project (as `offtake run` does) and writes the design
//! report: one self-contained HTML file with inline CSS and SVG
//! (`offtake_io::report`), printable on A4 or Letter. When the project has
//! scenarios they are compared side by side in the report. The default
//! output is `report.html` beside the project file.

use std::path::{Path, PathBuf};

use anyhow::{Context, Result};
use clap::Args as ClapArgs;
use offtake_core::engine;
use offtake_io::report::write_project_report;

use crate::cmd_run::load;

/// Arguments of `offtake report`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Project file (RON).
    pub project: PathBuf,
    /// Scenario to report (default: the base case).
    #[arg(long)]
    pub scenario: Option<String>,
    /// Output HTML file (default: `report.html` beside the project).
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// Runs the command.
///
/// # Errors
/// Any input, computation or output problem, with its cause chain.
pub fn run(args: &Args) -> Result<()> {
    let loaded = load(&args.project)?;
    let (crops, soils) = (&loaded.libraries.crops, &loaded.libraries.soils);
    let results = engine::run_scenario(
        &loaded.project,
        args.scenario.as_deref(),
        crops,
        soils,
        &loaded.weather,
    )
    .with_context(|| format!("computing {}", args.project.display()))?;
    let comparison = (!loaded.project.scenarios.is_empty())
        .then(|| engine::compare_scenarios_each(&loaded.project, crops, soils, &loaded.weather));
    // The report's input tables show the project as computed (a scenario
    // applied); the digests are of the files as they are.
    let shown = match args.scenario.as_deref() {
        Some(name) => loaded.project.apply_scenario(name)?,
        None => loaded.project.clone(),
    };
    let out = args.out.clone().unwrap_or_else(|| {
        args.project
            .parent()
            .unwrap_or_else(|| Path::new(""))
            .join("report.html")
    });
    let bytes = write_project_report(
        &results,
        &shown,
        Some(&args.project),
        comparison.as_ref(),
        &out,
    )?;
    crate::cmd_run::print_text(&format!(
        "Design report of {} written to {} ({} KB)\n",
        results.scheme_name,
        out.display(),
        bytes.div_ceil(1024)
    ))
}
