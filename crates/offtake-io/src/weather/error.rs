//! Import errors, rejected cells and warnings, each with `file:line:column`.

use std::fmt::{self, Write as _};
use std::path::PathBuf;

use chrono::NaiveDate;

use super::mapping::MappingGuess;

/// Where in a source file something was found. Lines and columns count from 1;
/// the column counts characters from the start of the line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SourceLocation {
    /// The file name as the user gave it.
    pub file: String,
    /// Line number, from 1.
    pub line: u64,
    /// Character column, from 1.
    pub column: u64,
}

impl fmt::Display for SourceLocation {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}:{}:{}", self.file, self.line, self.column)
    }
}

/// What was wrong with a rejected cell or row.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum ProblemKind {
    /// A cell that is not a number.
    NotANumber {
        /// Column (field) name.
        column: String,
        /// The cell text.
        found: String,
        /// What a valid cell looks like.
        expected: String,
    },
    /// A number that is NaN or infinite (or overflows to infinity).
    NonFinite {
        /// Column (field) name.
        column: String,
        /// The cell text.
        found: String,
    },
    /// A finite number far beyond any plausible value of any weather quantity.
    Implausible {
        /// Column (field) name.
        column: String,
        /// The cell text.
        found: String,
        /// The magnitude limit applied, in the field's SI unit.
        limit: f64,
    },
    /// A date cell that does not parse in the date format in use.
    BadDate {
        /// The cell text.
        found: String,
        /// The expected date format.
        expected: String,
    },
    /// A row with the wrong number of fields.
    FieldCount {
        /// Fields found.
        found: usize,
        /// Fields in the header.
        expected: usize,
        /// A hint at the likely cause.
        hint: &'static str,
    },
    /// A date already given on an earlier line.
    DuplicateDate {
        /// The repeated date.
        date: NaiveDate,
        /// Line where it first appeared.
        first_line: u64,
    },
    /// A date earlier than the date of the row before it.
    OutOfOrder {
        /// The date on this row.
        date: NaiveDate,
        /// The latest date before it.
        previous: NaiveDate,
        /// The line of that previous date.
        previous_line: u64,
    },
    /// A day whose values, each readable, cannot be used together (e.g.
    /// Tmin above Tmax); the reason says what is expected.
    InvalidDay {
        /// The day.
        date: NaiveDate,
        /// What is wrong and what is expected.
        reason: String,
    },
    /// A non-zero number too small to hold (it would be read as 0).
    Underflow {
        /// Column (field) name.
        column: String,
        /// The cell text (cut when long).
        found: String,
    },
    /// A cell that is not UTF-8 text.
    NotUtf8 {
        /// Column (field) name.
        column: String,
    },
}

impl fmt::Display for ProblemKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::NotANumber {
                column,
                found,
                expected,
            } => write!(f, "{column}: found \"{found}\", expected {expected}"),
            Self::NonFinite { column, found } => write!(
                f,
                "{column}: found \"{found}\", expected a finite number (NaN and infinity are not values; leave the cell blank for a missing value)"
            ),
            Self::Implausible {
                column,
                found,
                limit,
            } => write!(
                f,
                "{column}: found \"{found}\", expected a number of plausible size (magnitude below {limit:e} after unit conversion)"
            ),
            Self::BadDate { found, expected } => {
                write!(f, "date: found \"{found}\", expected {expected}")
            }
            Self::FieldCount {
                found,
                expected,
                hint,
            } => write!(
                f,
                "found {found} fields, expected {expected} as in the header{hint}"
            ),
            Self::DuplicateDate { date, first_line } => write!(
                f,
                "date: found {date} again, expected each date once (first on line {first_line}); row rejected"
            ),
            Self::OutOfOrder {
                date,
                previous,
                previous_line,
            } => write!(
                f,
                "date: found {date} after {previous} (line {previous_line}), expected dates in increasing order; row rejected"
            ),
            Self::InvalidDay { date, reason } => write!(f, "{date}: {reason}"),
            Self::Underflow { column, found } => write!(
                f,
                "{column}: found \"{found}\", a number too small to hold (it would be read as 0), expected 0 or a number of plausible size"
            ),
            Self::NotUtf8 { column } => {
                write!(
                    f,
                    "{column}: found bytes that are not UTF-8, expected UTF-8 text"
                )
            }
        }
    }
}

/// A rejected cell or row, with where it is.
#[derive(Debug, Clone, PartialEq)]
pub struct ImportProblem {
    /// Where the problem is.
    pub at: SourceLocation,
    /// What is wrong.
    pub kind: ProblemKind,
}

impl fmt::Display for ImportProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.at, self.kind)
    }
}

/// Something the user should know that does not reject any data.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum WarningKind {
    /// Days missing between two dates (the record has a gap; not filled here).
    MissingDays {
        /// Last date before the gap.
        after: NaiveDate,
        /// First date after the gap.
        before: NaiveDate,
        /// Number of missing days.
        count: i64,
    },
    /// Blank lines skipped.
    BlankLines {
        /// Number of blank lines.
        count: u64,
    },
    /// A header column that the mapping does not use.
    IgnoredColumn {
        /// The header text.
        header: String,
    },
    /// Decimal commas were read as decimal points.
    DecimalComma,
    /// The date format was not stated and was deduced from an unambiguous date.
    DateFormatDeduced {
        /// The format deduced.
        format: super::date::DateFormat,
        /// The date cell that decides it.
        evidence: String,
    },
}

impl fmt::Display for WarningKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::MissingDays {
                after,
                before,
                count,
            } => write!(
                f,
                "{count} missing day(s) between {after} and {before} (not filled)"
            ),
            Self::BlankLines { count } => write!(f, "{count} blank line(s) skipped"),
            Self::IgnoredColumn { header } => {
                write!(f, "column \"{header}\" is not mapped and is ignored")
            }
            Self::DecimalComma => write!(f, "decimal commas read as decimal points"),
            Self::DateFormatDeduced { format, evidence } => write!(
                f,
                "date format not stated; {} deduced from \"{evidence}\"",
                format.describe()
            ),
        }
    }
}

/// A warning with where it applies.
#[derive(Debug, Clone, PartialEq)]
pub struct ImportWarning {
    /// Where it applies (first line of the gap, first blank line, header cell...).
    pub at: SourceLocation,
    /// What it is.
    pub kind: WarningKind,
}

impl fmt::Display for ImportWarning {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: warning: {}", self.at, self.kind)
    }
}

/// Why a weather file could not be imported.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum ImportError {
    /// The file could not be opened or read.
    #[error("{}: cannot read the file", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The operating system's reason.
        #[source]
        source: std::io::Error,
    },
    /// The file has no content at all.
    #[error("{at}: found an empty file, expected a header line such as \"date,tmax_c,tmin_c,...\"")]
    Empty {
        /// Line 1, column 1.
        at: SourceLocation,
    },
    /// The header line is missing or unusable.
    #[error("{at}: found {found}, expected {expected}")]
    Header {
        /// Where.
        at: SourceLocation,
        /// What was there.
        found: String,
        /// What should be there.
        expected: String,
    },
    /// The columns are not Offtake's own and no mapping was given.
    #[error(
        "{at}: found columns {} that are not Offtake's own names, expected a column mapping (proposed: {})",
        quote_list(unrecognised),
        describe_guess(proposed)
    )]
    NeedsMapping {
        /// The header line.
        at: SourceLocation,
        /// Header names not recognised as Offtake's own.
        unrecognised: Vec<String>,
        /// A proposed mapping for the user to confirm.
        proposed: Box<MappingGuess>,
    },
    /// The header is followed by no data rows.
    #[error("{at}: found the end of the file, expected at least one data row after the header")]
    NoData {
        /// Where the data should start.
        at: SourceLocation,
    },
    /// The date format was not stated and no date decides between day/month
    /// and month/day order.
    #[error(
        "{at}: date: found \"{found}\" and no date in the file with a day above 12, expected the date format to be stated (day/month/year or month/day/year); not guessed"
    )]
    AmbiguousDates {
        /// The first ambiguous date.
        at: SourceLocation,
        /// Its text.
        found: String,
    },
    /// One rejected cell or row (from the streaming reader; reading may go on).
    #[error("{0}")]
    Row(Box<ImportProblem>),
    /// Rows were rejected; all problems up to the cap are listed.
    #[error("{}{}", list_problems(problems), more_line(*omitted))]
    Rejected {
        /// The problems, in file order, up to the cap.
        problems: Vec<ImportProblem>,
        /// Problems beyond the cap, counted but not listed.
        omitted: usize,
    },
    /// A mapping file could not be parsed.
    #[error(
        "{}:{}:{}: mapping file: {}; expected a column mapping in RON (date_column, columns)",
        path.display(),
        error.span.start.line,
        error.span.start.col,
        error.code
    )]
    MappingFile {
        /// The mapping file.
        path: PathBuf,
        /// The RON parser's error with its line and column.
        error: Box<ron::error::SpannedError>,
    },
    /// A line longer than the cap (or no line end at all).
    #[error(
        "{at}: found a line longer than {limit_bytes} bytes, expected lines of at most {limit_bytes} bytes (a weather file's line is a few hundred; is this a weather CSV file?)"
    )]
    LineTooLong {
        /// The line (column 1).
        at: SourceLocation,
        /// The limit ([`super::MAX_LINE_BYTES`]).
        limit_bytes: usize,
    },
    /// A header with more columns than the cap.
    #[error("{at}: found {found} columns in the header, expected at most {limit} columns")]
    TooManyColumns {
        /// The header line.
        at: SourceLocation,
        /// Columns found.
        found: usize,
        /// The limit ([`super::MAX_COLUMNS`]).
        limit: usize,
    },
    /// A series longer than the computation can hold.
    #[error(
        "{at}: found more than {limit_days} days{}, expected a weather series of at most {limit_days} days (about 273 years); split the record or keep the years you need",
        file_bytes.map_or_else(String::new, |b| format!(" in a file of {b} bytes"))
    )]
    TooManyDays {
        /// The line of the first day past the cap.
        at: SourceLocation,
        /// The limit ([`super::MAX_SERIES_DAYS`]).
        limit_days: usize,
        /// The file's size, when known.
        file_bytes: Option<u64>,
    },
    /// The options are contradictory.
    #[error("import options: found {found}, expected {expected}")]
    Options {
        /// What was given.
        found: String,
        /// What is accepted.
        expected: String,
    },
}

/// Most items a message lists; the rest are counted.
const MAX_LISTED: usize = 20;

fn quote_list(items: &[String]) -> String {
    let mut text = items
        .iter()
        .take(MAX_LISTED)
        .map(|s| format!("\"{}\"", super::reader::shown_cell(s)))
        .collect::<Vec<_>>()
        .join(", ");
    if items.len() > MAX_LISTED {
        let _ = write!(text, " and {} more", items.len() - MAX_LISTED);
    }
    text
}

fn describe_guess(g: &MappingGuess) -> String {
    let mut parts = Vec::new();
    if g.mapping.date_column.is_empty() {
        parts.push("no date column recognised".to_owned());
    } else {
        parts.push(format!("\"{}\" = date", g.mapping.date_column));
    }
    for c in g.mapping.columns.iter().take(MAX_LISTED) {
        parts.push(format!(
            "\"{}\" = {} [{}]",
            c.header,
            c.quantity.field_name(),
            c.quantity.unit_symbol()
        ));
    }
    parts.join("; ")
}

fn list_problems(problems: &[ImportProblem]) -> String {
    problems
        .iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join("\n")
}

fn more_line(omitted: usize) -> String {
    if omitted == 0 {
        String::new()
    } else {
        format!("\n... and {omitted} more problem(s) not listed")
    }
}
