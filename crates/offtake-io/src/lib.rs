//! # offtake-io
//!
//! Everything that touches files: reading weather CSV files with a column and
//! unit mapping, reading and writing project files (RON, versioned schema,
//! atomic saves), and exporting result tables as CSV and XLSX.
//!
//! Every file is written through [`atomic`] (a uniquely named temporary file
//! created exclusively beside the target, renamed into place, removed on
//! every error path); a run's result tables are written as one set with a
//! manifest ([`results_set`]). Reads are bounded (line, column, day and
//! project-size caps, each refused with a message naming the limit).
//!
//! Errors carry the file, line and column of the offending cell and say what
//! was found and what was expected.
pub mod atomic;
pub mod export;
pub mod library;
pub mod project_file;
pub mod report;
pub mod results;
pub mod results_set;
pub mod sections;
pub mod weather;
