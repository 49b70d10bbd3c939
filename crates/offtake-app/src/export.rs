//! Export of the result tables and workbook: the same files `offtake run`
//! writes, built by one shared copy in `offtake_io::results`.

pub use offtake_io::results::{fmt_sig3, summary_text, tables, write_tables};

/// Writes the design report (the same as `offtake report`).
///
/// # Errors
/// An input file cannot be read for its digest, or the report cannot be
/// written.
pub fn write_report(
    results: &offtake_core::engine::Results,
    project: &offtake_core::project::Project,
    project_path: Option<&std::path::Path>,
    comparison: Option<&offtake_core::engine::Comparison>,
    out: &std::path::Path,
) -> Result<(), offtake_io::export::ExportError> {
    offtake_io::report::write_project_report(results, project, project_path, comparison, out)
        .map(|_| ())
}
