//! The design report: one self-contained HTML file (inline CSS and SVG, no
//! network, no external files) of a computed project, printable on A4 or
//! Letter with every section on its own pages.
//!
//! Every number comes from the engine's [`Results`] (and, for scenarios,
//! its [`Comparison`]); this module only formats them. Tables and figures
//! are numbered; figures are drawn from the same numbers as the tables
//! beside them. Sections: scheme summary and inputs; ET₀ and rain by month;
//! crop and block requirements; demand hydrograph and design basis per
//! canal; design values; capacity checks; rotation; scenario comparison
//! (when the project has scenarios); methods and sources; cautions; and the
//! program version, date and a digest of the input files.

pub mod html;
pub mod methods;
mod sections;
pub mod svg;

use std::path::Path;

use offtake_core::engine::{Comparison, Results};
use offtake_core::project::Project;

use crate::export::{ExportError, write_bytes};

/// Where the report came from: program version, date, and each input
/// file's SHA-256 digest, so a reader can tell which files made it.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub struct Provenance {
    /// Program name and version (`Offtake 0.1.0`).
    pub program: String,
    /// When the report was made (text, e.g. `2026-12-04 18:50 UTC`).
    pub generated: String,
    /// Input files: (name as the project gives it, bytes, SHA-256 hex).
    pub inputs: Vec<(String, u64, String)>,
}

impl Provenance {
    /// Reads the project file and its weather file and digests them.
    ///
    /// # Errors
    /// [`ExportError::Io`] naming a file that cannot be read.
    pub fn of_files(
        program: String,
        generated: String,
        project_path: &Path,
        project: &Project,
    ) -> Result<Self, ExportError> {
        let mut inputs = Vec::new();
        let weather = crate::project_file::weather_path(project_path, project);
        for (name, path) in [
            (
                project_path.display().to_string(),
                project_path.to_path_buf(),
            ),
            (project.weather.path.clone(), weather),
        ] {
            let bytes = std::fs::read(&path).map_err(|source| ExportError::Io {
                path: path.clone(),
                source,
            })?;
            inputs.push((name, bytes.len() as u64, sha256_hex(&bytes)));
        }
        Ok(Self {
            program,
            generated,
            inputs,
        })
    }
}

/// Program name and version as the report prints it (`Offtake 0.1.0`).
pub fn program_version() -> String {
    format!("Offtake {}", env!("CARGO_PKG_VERSION"))
}

/// Builds and writes the report of a run: provenance from the project file
/// (and its weather file) when the project has been saved, made now (UTC).
/// The one path `offtake report` and the app's File › Export report… take.
///
/// # Errors
/// [`ExportError::Io`] when an input file cannot be read for its digest or
/// the report cannot be written.
pub fn write_project_report(
    results: &Results,
    project: &Project,
    project_path: Option<&Path>,
    comparison: Option<&Comparison>,
    out: &Path,
) -> Result<usize, ExportError> {
    let generated = chrono::Utc::now().format("%Y-%m-%d %H:%M UTC").to_string();
    let provenance = match project_path {
        Some(path) => Provenance::of_files(program_version(), generated, path, project)?,
        None => Provenance {
            program: program_version(),
            generated,
            inputs: Vec::new(),
        },
    };
    let html = report_html(&ReportInput {
        project,
        results,
        comparison,
        provenance: &provenance,
    });
    write_report(&html, out)?;
    Ok(html.len())
}

/// SHA-256 of `bytes` as lower-case hex (FIPS 180-4).
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::Digest as _;
    let digest = sha2::Sha256::digest(bytes);
    digest.iter().fold(String::new(), |mut s, b| {
        use std::fmt::Write as _;
        let _ = write!(s, "{b:02x}");
        s
    })
}

/// What the report is made of.
#[derive(Debug, Clone, Copy)]
pub struct ReportInput<'a> {
    /// The project as computed (scenario applied where one is named).
    pub project: &'a Project,
    /// The results of the run.
    pub results: &'a Results,
    /// Every scenario side by side, when the project has scenarios.
    pub comparison: Option<&'a Comparison>,
    /// Program, date and input digests.
    pub provenance: &'a Provenance,
}

/// Ids of the report's sections, in order (each starts a printed page).
pub const SECTION_IDS: [&str; 11] = [
    "summary",
    "climate",
    "crops",
    "hydrographs",
    "design",
    "capacity",
    "rotation",
    "scenarios",
    "methods",
    "cautions",
    "provenance",
];

/// The report as one HTML document.
pub fn report_html(input: &ReportInput<'_>) -> String {
    let body = sections::body(input);
    let title = format!(
        "Design report — {}{}",
        input.results.scheme_name,
        input
            .results
            .scenario
            .as_deref()
            .map_or_else(String::new, |s| format!(" (scenario {s})"))
    );
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>{}</title><meta name=\"generator\" content=\"{}\"><style>{}</style></head><body>\n{}</body></html>\n",
        html::esc(&title),
        html::esc(&input.provenance.program),
        html::CSS,
        body
    )
}

/// Writes the report atomically (a failed write leaves any old file as it
/// was).
///
/// # Errors
/// [`ExportError::Io`] on a file-system failure.
pub fn write_report(html: &str, path: &Path) -> Result<(), ExportError> {
    write_bytes(html.as_bytes(), path)
}
