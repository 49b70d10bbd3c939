//! Result tables as CSV files and as one XLSX workbook.
//!
//! A [`Table`] is a name, column headers (with units in the header, e.g.
//! `design_flow_ls`) and rows of [`Cell`]s. [`write_csv`] writes one table
//! as CSV; [`write_workbook`] writes several tables as the sheets of one
//! workbook, header row bold and frozen. Daily tables go to CSV only: a
//! worksheet holds at most [`XLSX_MAX_ROWS`] rows, and a table longer than
//! that is refused with a clear error instead of being cut.
//!
//! Both writers go through [`crate::atomic`] (a uniquely named temporary
//! file created exclusively beside the target, renamed into place), so a
//! failed export never leaves half a file. The file gets
//! the permissions of the file it replaces, or `rw-r--r--` (0o644) for a new
//! file on Unix — not the owner-only mode of a temporary file.
//!
//! The file names and headers that `offtake run` writes are part of the
//! command contract (DESIGN.md, issue 5) and are constants here.

use std::io::{self, Write};
use std::path::{Path, PathBuf};

use chrono::{Datelike, NaiveDate};
use rust_xlsxwriter::{ExcelDateTime, Format, Workbook, XlsxError};
use thiserror::Error;

use crate::atomic::{AtomicFile, AtomicWriteError};

/// Design values per node: file name.
pub const DESIGN_VALUES_CSV: &str = "design_values.csv";
/// Design values per node: header (one row per canal and one named
/// `headworks`; existing capacity blank where none is given; the bounds of
/// the design flow's confidence interval blank where no order statistic of
/// the record reaches them).
pub const DESIGN_VALUES_HEADERS: [&str; 12] = [
    "node",
    "area_ha",
    "design_flow_ls",
    "required_capacity_ls",
    "existing_capacity_ls",
    "peak_daily_ls",
    "peak_10day_ls",
    "duty_ls_ha",
    "seasonal_volume_m3",
    "design_year",
    "design_flow_low_ls",
    "design_flow_high_ls",
];
/// Daily demand at every node: file name.
pub const NODE_DEMAND_DAILY_CSV: &str = "node_demand_daily.csv";
/// Daily demand at every node: header.
pub const NODE_DEMAND_DAILY_HEADERS: [&str; 3] = ["date", "node", "demand_ls"];
/// Daily block requirements: file name.
pub const BLOCK_REQUIREMENTS_DAILY_CSV: &str = "block_requirements_daily.csv";
/// Daily block requirements: header.
pub const BLOCK_REQUIREMENTS_DAILY_HEADERS: [&str; 6] =
    ["date", "block", "nir_mm", "gir_mm", "nir_m3", "gir_m3"];
/// The workbook `offtake run` writes.
pub const RESULTS_WORKBOOK: &str = "results.xlsx";

/// Rows in one worksheet, header included (Excel's limit).
pub const XLSX_MAX_ROWS: usize = 1_048_576;
/// Longest worksheet name Excel accepts.
pub const XLSX_MAX_SHEET_NAME_CHARS: usize = 31;

/// One value of a table.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    /// Blank (e.g. no existing capacity given).
    Empty,
    /// A number; must be finite.
    Number(f64),
    /// A whole number (years, counts).
    Integer(i64),
    /// Text.
    Text(String),
    /// A calendar date, written `YYYY-MM-DD`.
    Date(NaiveDate),
}

/// `value` rounded to `decimals` places (half away from zero), with −0
/// written as 0. Non-finite values are returned unchanged (the table check
/// refuses them).
///
/// The result is the double nearest the rounded decimal, so the CSV writer
/// (shortest round-trip form) prints it with at most `decimals` places.
pub fn round_to(value: f64, decimals: u32) -> f64 {
    if !value.is_finite() {
        return value;
    }
    let scale = 10_f64.powi(i32::try_from(decimals).unwrap_or(i32::MAX));
    let scaled = value * scale;
    // Beyond 2^52 every double is already a whole number at this scale.
    if scaled.abs() >= 4.5e15 {
        return value;
    }
    (scaled.round() / scale) + 0.0
}

/// Decimals used by `offtake run` for each kind of quantity (issue 5
/// exports): flows in l/s to 0.01, depths in mm to 0.01, volumes in m³ to
/// 0.1, duty in l/s/ha to 0.001, areas in ha to 0.01.
pub mod decimals {
    /// Flows (l/s).
    pub const FLOW_LS: u32 = 2;
    /// Depths (mm).
    pub const DEPTH_MM: u32 = 2;
    /// Volumes (m³).
    pub const VOLUME_M3: u32 = 1;
    /// Duty (l/s/ha).
    pub const DUTY_LS_HA: u32 = 3;
    /// Areas (ha).
    pub const AREA_HA: u32 = 2;
}

impl Cell {
    /// A number rounded to `decimals` places ([`round_to`]).
    pub fn rounded(value: f64, decimals: u32) -> Self {
        Self::Number(round_to(value, decimals))
    }

    /// An optional number rounded to `decimals` places; blank when `None`.
    pub fn rounded_opt(value: Option<f64>, decimals: u32) -> Self {
        value.map_or(Self::Empty, |v| Self::rounded(v, decimals))
    }
}

impl From<f64> for Cell {
    fn from(v: f64) -> Self {
        Self::Number(v)
    }
}

impl From<Option<f64>> for Cell {
    fn from(v: Option<f64>) -> Self {
        v.map_or(Self::Empty, Self::Number)
    }
}

impl From<i64> for Cell {
    fn from(v: i64) -> Self {
        Self::Integer(v)
    }
}

impl From<i32> for Cell {
    fn from(v: i32) -> Self {
        Self::Integer(i64::from(v))
    }
}

impl From<&str> for Cell {
    fn from(v: &str) -> Self {
        Self::Text(v.to_owned())
    }
}

impl From<String> for Cell {
    fn from(v: String) -> Self {
        Self::Text(v)
    }
}

impl From<NaiveDate> for Cell {
    fn from(v: NaiveDate) -> Self {
        Self::Date(v)
    }
}

/// A column of a table.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Column {
    /// Header, with the unit in it (`design_flow_ls`, `area_ha`).
    pub header: String,
}

/// A named table of results.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Table {
    /// Name (the worksheet name in a workbook).
    pub name: String,
    /// Columns, in order.
    pub columns: Vec<Column>,
    /// Rows; each has one cell per column.
    pub rows: Vec<Vec<Cell>>,
}

impl Table {
    /// An empty table with these headers.
    pub fn with_headers(name: impl Into<String>, headers: &[&str]) -> Self {
        Self {
            name: name.into(),
            columns: headers
                .iter()
                .map(|h| Column {
                    header: (*h).to_owned(),
                })
                .collect(),
            rows: Vec::new(),
        }
    }

    /// Appends a row.
    pub fn push_row(&mut self, row: Vec<Cell>) {
        self.rows.push(row);
    }

    /// Checks that every row has one cell per column and every number is
    /// finite.
    ///
    /// # Errors
    /// [`ExportError::RowWidth`] or [`ExportError::NonFinite`].
    pub fn check(&self) -> Result<(), ExportError> {
        for (r, row) in self.rows.iter().enumerate() {
            if row.len() != self.columns.len() {
                return Err(ExportError::RowWidth {
                    table: self.name.clone(),
                    row: r + 1,
                    expected: self.columns.len(),
                    found: row.len(),
                });
            }
            for (c, cell) in row.iter().enumerate() {
                if let Cell::Number(v) = cell
                    && !v.is_finite()
                {
                    return Err(ExportError::NonFinite {
                        table: self.name.clone(),
                        row: r + 1,
                        column: self.columns[c].header.clone(),
                    });
                }
            }
        }
        Ok(())
    }
}

/// Why a table could not be exported.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ExportError {
    /// A row has the wrong number of cells (a bug in the caller).
    #[error("table {table:?}, row {row}: {found} cells for {expected} columns")]
    RowWidth {
        /// Table name.
        table: String,
        /// Row (1-based, header not counted).
        row: usize,
        /// Columns in the table.
        expected: usize,
        /// Cells in the row.
        found: usize,
    },
    /// A number is NaN or infinite.
    #[error("table {table:?}, row {row}, column {column}: the value is not a finite number")]
    NonFinite {
        /// Table name.
        table: String,
        /// Row (1-based, header not counted).
        row: usize,
        /// Column header.
        column: String,
    },
    /// The table has more rows than a worksheet holds.
    #[error(
        "table {table:?} has {rows} rows; a worksheet holds at most {max} rows including the header — write it as CSV instead"
    )]
    TooManyRows {
        /// Table name.
        table: String,
        /// Rows, header included.
        rows: usize,
        /// The limit ([`XLSX_MAX_ROWS`]).
        max: usize,
    },
    /// Two tables would get the same worksheet name.
    #[error("two tables share the worksheet name {0:?}")]
    DuplicateSheet(String),
    /// A date Excel cannot hold (before 1900 or after 9999).
    #[error("table {table:?}: date {date} cannot be written to a workbook")]
    BadDate {
        /// Table name.
        table: String,
        /// The date.
        date: NaiveDate,
    },
    /// File system error.
    #[error("{}: {source}", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The system error.
        #[source]
        source: io::Error,
    },
    /// The atomic write failed (the previous file, if any, is unchanged).
    #[error(transparent)]
    Write(#[from] AtomicWriteError),
    /// The results set could not be written as one set.
    #[error(transparent)]
    ResultsSet(#[from] crate::results_set::ResultsSetError),
    /// CSV writer error.
    #[error("{}: {source}", path.display())]
    Csv {
        /// The file.
        path: PathBuf,
        /// The CSV writer's error.
        #[source]
        source: csv::Error,
    },
    /// Workbook writer error.
    #[error("{}: {source}", path.display())]
    Xlsx {
        /// The file.
        path: PathBuf,
        /// The workbook writer's error.
        #[source]
        source: XlsxError,
    },
}

/// Text of a cell in CSV: numbers in Rust's shortest round-trip form,
/// dates `YYYY-MM-DD`, blanks empty.
fn cell_text(cell: &Cell) -> String {
    match cell {
        Cell::Empty => String::new(),
        Cell::Number(v) => format!("{v}"),
        Cell::Integer(v) => v.to_string(),
        Cell::Text(s) => s.clone(),
        Cell::Date(d) => d.format("%Y-%m-%d").to_string(),
    }
}

/// Writes a table as CSV to any writer (`path` names it in errors).
///
/// # Errors
/// [`ExportError`] on a malformed table or a write failure.
pub fn write_csv_to<W: Write>(table: &Table, writer: W, path: &Path) -> Result<(), ExportError> {
    table.check()?;
    let csv_err = |source| ExportError::Csv {
        path: path.to_path_buf(),
        source,
    };
    let mut w = csv::Writer::from_writer(writer);
    w.write_record(table.columns.iter().map(|c| c.header.as_str()))
        .map_err(csv_err)?;
    for row in &table.rows {
        w.write_record(row.iter().map(cell_text)).map_err(csv_err)?;
    }
    w.flush().map_err(|source| ExportError::Io {
        path: path.to_path_buf(),
        source,
    })
}

/// Writes a table as a CSV file, atomically.
///
/// # Errors
/// [`ExportError`] on a malformed table or a file-system failure.
pub fn write_csv(table: &Table, path: &Path) -> Result<(), ExportError> {
    table.check()?;
    let mut file = AtomicFile::create(path)?;
    write_csv_to(table, io::BufWriter::new(&mut file), path)?;
    Ok(file.commit()?)
}

/// Writes `bytes` to `path` atomically (a temporary file beside it, synced,
/// then renamed over it): a failed write leaves the old file untouched.
///
/// # Errors
/// [`ExportError::Io`] on a file-system failure.
pub fn write_bytes(bytes: &[u8], path: &Path) -> Result<(), ExportError> {
    Ok(crate::atomic::write_atomically(path, bytes)?)
}

/// A worksheet name Excel accepts: `[]:*?/\` replaced by `_`, at most 31
/// characters, not blank.
pub fn sheet_name(name: &str) -> String {
    let cleaned: String = name
        .chars()
        .map(|c| {
            if matches!(c, '[' | ']' | ':' | '*' | '?' | '/' | '\\') {
                '_'
            } else {
                c
            }
        })
        .take(XLSX_MAX_SHEET_NAME_CHARS)
        .collect();
    let trimmed = cleaned.trim_matches('\'').trim();
    if trimmed.is_empty() {
        "Sheet".to_owned()
    } else {
        trimmed.to_owned()
    }
}

/// Writes tables as the sheets of one workbook, in order; header row bold
/// and frozen, dates formatted `yyyy-mm-dd`.
///
/// # Errors
/// [`ExportError::TooManyRows`] if a table exceeds a worksheet (checked for
/// every table before anything is written), [`ExportError::DuplicateSheet`],
/// or a writer or file-system failure.
pub fn write_workbook(tables: &[&Table], path: &Path) -> Result<(), ExportError> {
    let mut names: Vec<String> = Vec::new();
    for t in tables {
        t.check()?;
        let rows = t.rows.len() + 1;
        if rows > XLSX_MAX_ROWS {
            return Err(ExportError::TooManyRows {
                table: t.name.clone(),
                rows,
                max: XLSX_MAX_ROWS,
            });
        }
        let name = sheet_name(&t.name);
        if names.iter().any(|n| n.eq_ignore_ascii_case(&name)) {
            return Err(ExportError::DuplicateSheet(name));
        }
        names.push(name);
    }
    let xerr = |source| ExportError::Xlsx {
        path: path.to_path_buf(),
        source,
    };
    let bold = Format::new().set_bold();
    let date_format = Format::new().set_num_format("yyyy-mm-dd");
    let mut workbook = Workbook::new();
    for (t, name) in tables.iter().zip(&names) {
        let sheet = workbook.add_worksheet();
        sheet.set_name(name).map_err(xerr)?;
        for (c, col) in t.columns.iter().enumerate() {
            let c = c as u16;
            sheet
                .write_string_with_format(0, c, &col.header, &bold)
                .map_err(xerr)?;
            let width = (col.header.chars().count() + 2).max(11);
            sheet.set_column_width(c, width as f64).map_err(xerr)?;
        }
        sheet.set_freeze_panes(1, 0).map_err(xerr)?;
        for (r, row) in t.rows.iter().enumerate() {
            let r = (r + 1) as u32;
            for (c, cell) in row.iter().enumerate() {
                let c = c as u16;
                match cell {
                    Cell::Empty => {}
                    Cell::Number(v) => {
                        sheet.write_number(r, c, *v).map_err(xerr)?;
                    }
                    Cell::Integer(v) => {
                        sheet.write_number(r, c, *v as f64).map_err(xerr)?;
                    }
                    Cell::Text(s) => {
                        sheet.write_string(r, c, s).map_err(xerr)?;
                    }
                    Cell::Date(d) => {
                        let bad = || ExportError::BadDate {
                            table: t.name.clone(),
                            date: *d,
                        };
                        let year = u16::try_from(d.year()).map_err(|_| bad())?;
                        let x = ExcelDateTime::from_ymd(year, d.month() as u8, d.day() as u8)
                            .map_err(|_| bad())?;
                        sheet
                            .write_datetime_with_format(r, c, &x, &date_format)
                            .map_err(xerr)?;
                    }
                }
            }
        }
    }
    let mut file = AtomicFile::create(path)?;
    workbook
        .save_to_writer(io::BufWriter::new(&mut file))
        .map_err(xerr)?;
    Ok(file.commit()?)
}

/// Permissions a file written atomically over `path` should get (kept here
/// for callers of the earlier API; the one implementation is
/// [`crate::atomic::permissions_for`]).
pub fn permissions_for(path: &Path) -> Option<std::fs::Permissions> {
    crate::atomic::permissions_for(path)
}
