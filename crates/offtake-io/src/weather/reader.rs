//! The streaming weather CSV reader and the whole-file importer built on it.

use std::collections::VecDeque;
use std::fs::File;
use std::io::Read;
use std::path::Path;

use chrono::NaiveDate;
use offtake_core::weather::WeatherDay;
use offtake_core::weather_import::ImportSettings;
pub use offtake_core::weather_import::{DecimalSeparator, Delimiter};
use serde::{Deserialize, Serialize};

use super::date::{self, DateFormat, Evidence};
use super::error::{
    ImportError, ImportProblem, ImportWarning, ProblemKind, SourceLocation, WarningKind,
};
pub use super::lines::{HeaderLine, read_header, read_header_from};
use super::lines::{
    HeaderRead, Source, column_of_field, csv_fatal, delimiter_name, field_columns, line_length,
    read_header_record,
};
use super::mapping::{ColumnMapping, OWN_COLUMNS, Quantity, guess_mapping};

/// Largest magnitude accepted for any weather value after conversion to SI.
///
/// Not a plausibility limit (the quality checks judge plausibility): it only
/// stops absurd numbers such as `1e308` entering the series, where arithmetic
/// on them would overflow. No daily weather quantity in the SI units of
/// `WeatherDay` comes near 10⁶.
pub const MAGNITUDE_LIMIT: f64 = 1.0e6;

/// Default cap on the number of problems an import lists.
pub const DEFAULT_MAX_PROBLEMS: usize = 100;

/// Longest line read, in bytes (1 MiB). A weather file's line is a few
/// hundred bytes; a header of 30,000 named columns fits. A longer line (or a
/// file with no line ends at all, such as `/dev/zero`) is refused with its
/// line number before more is read.
pub const MAX_LINE_BYTES: usize = 1024 * 1024;

/// Most columns read (100,000); a header with more is refused.
pub const MAX_COLUMNS: usize = 100_000;

/// Most days a whole series may hold (100,000 days, about 273 years): the
/// computation holds several arrays per day for every block, so a longer
/// record would exhaust memory. Refused with its size and this limit.
pub const MAX_SERIES_DAYS: usize = 100_000;

/// Longest cell text repeated in a message, in characters; a longer cell is
/// shown cut, with its length.
pub const MAX_SHOWN_CELL_CHARS: usize = 60;

/// A cell text for a message: whole when short, else its start and its
/// length (`"12345678…" (250000 characters)` form).
pub fn shown_cell(text: &str) -> String {
    let mut chars = text.char_indices();
    match chars.nth(MAX_SHOWN_CELL_CHARS) {
        None => text.to_owned(),
        Some((cut, _)) => {
            let total = text.chars().count();
            format!("{}… ({total} characters)", &text[..cut])
        }
    }
}

/// How to read a weather file: the saved [`ImportSettings`] of a file plus
/// the run-time cap on listed problems. `None` fields are detected from the
/// file; detection never guesses between day/month and month/day order.
///
/// Convert with [`ImportOptions::from_settings`] and
/// [`ImportOptions::settings`]; a project saves only the settings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ImportOptions {
    /// Column mapping; `None` means the file uses Offtake's own column names.
    pub mapping: Option<ColumnMapping>,
    /// Date format; `None` detects ISO, or D/M/Y vs M/D/Y from a date whose
    /// day is above 12 (reported as a warning). A file where no date decides
    /// is an error.
    pub date_format: Option<DateFormat>,
    /// Delimiter; `None` detects it from the header line.
    pub delimiter: Option<Delimiter>,
    /// Decimal separator; `None` accepts a decimal comma when the delimiter is
    /// not a comma (reported as a warning).
    pub decimal: Option<DecimalSeparator>,
    /// Cell texts meaning "missing" besides a blank cell (e.g. `"NA"`,
    /// `"-9999"`); matched exactly after trimming.
    pub missing_markers: Vec<String>,
    /// Most problems listed by [`import_weather_file`]; further ones are counted.
    pub max_problems: usize,
}

impl Default for ImportOptions {
    fn default() -> Self {
        Self {
            mapping: None,
            date_format: None,
            delimiter: None,
            decimal: None,
            missing_markers: Vec::new(),
            max_problems: DEFAULT_MAX_PROBLEMS,
        }
    }
}

impl ImportOptions {
    /// Options that read a file as `settings` say, with the default problem cap.
    pub fn from_settings(settings: &ImportSettings) -> Self {
        let ImportSettings {
            mapping,
            date_format,
            delimiter,
            decimal,
            missing_markers,
        } = settings.clone();
        Self {
            mapping,
            date_format,
            delimiter,
            decimal,
            missing_markers,
            max_problems: DEFAULT_MAX_PROBLEMS,
        }
    }

    /// The part of the options that describes the file, for saving with a
    /// project.
    pub fn settings(&self) -> ImportSettings {
        ImportSettings {
            mapping: self.mapping.clone(),
            date_format: self.date_format,
            delimiter: self.delimiter,
            decimal: self.decimal,
            missing_markers: self.missing_markers.clone(),
        }
    }
}

impl From<&ImportSettings> for ImportOptions {
    fn from(settings: &ImportSettings) -> Self {
        Self::from_settings(settings)
    }
}

/// One accepted day and the line it came from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ReadDay {
    /// Line number in the file (from 1; the header is line 1).
    pub line: u64,
    /// The day's values in SI units.
    pub day: WeatherDay,
}

/// A whole imported weather series.
#[derive(Debug, Clone, PartialEq)]
pub struct ImportedSeries {
    /// The file name as given.
    pub source: String,
    /// Accepted days in file order (strictly increasing dates; gaps possible).
    pub days: Vec<WeatherDay>,
    /// The line of each day in `days`.
    pub lines: Vec<u64>,
    /// Warnings: missing days, blank lines, ignored columns, deduced formats.
    pub warnings: Vec<ImportWarning>,
    /// The date format used.
    pub date_format: DateFormat,
    /// Wind measurement height stated by the mapping, if any (m).
    pub wind_height_m: Option<f64>,
    /// `WeatherDay` field names present as columns.
    pub fields: Vec<&'static str>,
}

/// Streaming weather CSV reader: yields one [`ReadDay`] at a time, so a file of
/// any length is processed without holding it.
///
/// Each rejected cell or row is yielded as `Err(ImportError::Row(..))` and
/// reading can go on; a fatal error (I/O, undecidable date format) is yielded
/// once and ends the stream. Warnings accumulate in [`WeatherReader::warnings`].
pub struct WeatherReader<R: Read> {
    source: String,
    csv: csv::Reader<Source<R>>,
    n_fields: usize,
    date_idx: usize,
    columns: Vec<(usize, Quantity)>,
    header_names: Vec<String>,
    delimiter: u8,
    decimal: Option<DecimalSeparator>,
    missing_markers: Vec<String>,
    date_format: Option<DateFormat>,
    lookahead: VecDeque<(csv::ByteRecord, u64)>,
    pending: VecDeque<Result<ReadDay, ImportError>>,
    previous: Option<(NaiveDate, u64)>,
    last_line: u64,
    warnings: Vec<ImportWarning>,
    decimal_comma_seen: bool,
    wind_height_m: Option<f64>,
    finished: bool,
}

impl WeatherReader<File> {
    /// Opens a weather file and reads its header.
    ///
    /// # Errors
    /// I/O errors, an empty file, a missing or unusable header, or columns that
    /// need a mapping.
    pub fn open(path: &Path, options: &ImportOptions) -> Result<Self, ImportError> {
        let file = File::open(path).map_err(|source| ImportError::Io {
            path: path.to_path_buf(),
            source,
        })?;
        Self::new(file, &path.display().to_string(), options)
    }
}

impl<R: Read> WeatherReader<R> {
    /// Reads the header from `reader`; `source` names the input in messages.
    ///
    /// # Errors
    /// As [`WeatherReader::open`].
    pub fn new(reader: R, source: &str, options: &ImportOptions) -> Result<Self, ImportError> {
        let at = |line, column| SourceLocation {
            file: source.to_owned(),
            line,
            column,
        };
        if options.decimal == Some(DecimalSeparator::Comma)
            && options.delimiter == Some(Delimiter::Comma)
        {
            return Err(ImportError::Options {
                found: "decimal comma with comma delimiter".into(),
                expected: "a semicolon or tab delimiter when numbers use a decimal comma".into(),
            });
        }
        let HeaderRead {
            csv,
            header,
            header_text,
            delimiter,
        } = read_header_record(reader, source, options.delimiter)?;
        // Every header cell's column, computed once (linear in the header).
        let header_cols = field_columns(&header);
        let header_names: Vec<String> = header
            .iter()
            .map(|f| String::from_utf8_lossy(f).trim().to_owned())
            .collect();
        if let Some(first_cell) = header_names.first()
            && date::evidence(first_cell) != Evidence::Invalid
        {
            return Err(ImportError::Header {
                at: at(1, 1),
                found: format!("a date \"{}\" on the first line", shown_cell(first_cell)),
                expected: format!(
                    "a header line naming the columns, such as \"{}\"",
                    OWN_COLUMNS.join(",")
                ),
            });
        }
        let lower: Vec<String> = header_names.iter().map(|h| h.to_lowercase()).collect();
        let mut warnings = Vec::new();
        let mapping = if let Some(m) = &options.mapping {
            m.clone()
        } else {
            {
                let unrecognised: Vec<String> = header_names
                    .iter()
                    .zip(&lower)
                    .filter(|(_, l)| !l.is_empty() && !OWN_COLUMNS.contains(&l.as_str()))
                    .map(|(h, _)| h.clone())
                    .collect();
                if header.len() == 1 {
                    return Err(ImportError::Header {
                        at: at(1, 1),
                        found: format!(
                            "header \"{header_text}\" read as a single column with delimiter {}",
                            delimiter_name(delimiter)
                        ),
                        expected: "several columns; check the delimiter (comma, semicolon or tab)"
                            .into(),
                    });
                }
                let own_count = lower
                    .iter()
                    .filter(|l| OWN_COLUMNS.contains(&l.as_str()))
                    .count();
                if !lower.iter().any(|l| l == "date") || own_count < 2 {
                    let refs: Vec<&str> = header_names.iter().map(String::as_str).collect();
                    return Err(ImportError::NeedsMapping {
                        at: at(1, 1),
                        unrecognised,
                        proposed: Box::new(guess_mapping(&refs)),
                    });
                }
                ColumnMapping::own_format()
            }
        };
        let find = |name: &str| -> Result<Option<usize>, ImportError> {
            let want = name.trim().to_lowercase();
            let hits: Vec<usize> = lower
                .iter()
                .enumerate()
                .filter(|(_, l)| **l == want)
                .map(|(i, _)| i)
                .collect();
            if hits.len() > 1 {
                return Err(ImportError::Header {
                    at: at(1, header_cols[hits[1]]),
                    found: format!("column \"{}\" twice", shown_cell(name)),
                    expected: "each column name once".into(),
                });
            }
            Ok(hits.first().copied())
        };
        let date_idx = find(&mapping.date_column)?.ok_or_else(|| ImportError::Header {
            at: at(1, 1),
            found: format!(
                "header \"{header_text}\" without a \"{}\" column",
                mapping.date_column
            ),
            expected: format!(
                "a \"{}\" column (delimiter in use: {})",
                mapping.date_column,
                delimiter_name(delimiter)
            ),
        })?;
        let mut columns = Vec::new();
        let mut wind_height_m = None;
        let own_mapping = options.mapping.is_none();
        for c in &mapping.columns {
            match find(&c.header)? {
                Some(i) => {
                    if let Quantity::Wind { height_m, .. } = c.quantity {
                        wind_height_m = height_m;
                    }
                    columns.push((i, c.quantity));
                }
                // Offtake's own format lets any column be absent.
                None if own_mapping => {}
                None => {
                    return Err(ImportError::Header {
                        at: at(1, 1),
                        found: format!("no column \"{}\" in header \"{header_text}\"", c.header),
                        expected: "every column named by the mapping".into(),
                    });
                }
            }
        }
        for (i, name) in header_names.iter().enumerate() {
            if i != date_idx && !columns.iter().any(|(j, _)| *j == i) && !name.is_empty() {
                warnings.push(ImportWarning {
                    at: at(1, header_cols[i]),
                    kind: WarningKind::IgnoredColumn {
                        header: name.clone(),
                    },
                });
            }
        }
        let decimal = match (options.decimal, delimiter) {
            (Some(d), _) => Some(d),
            (None, b',') => Some(DecimalSeparator::Point),
            (None, _) => None,
        };
        Ok(Self {
            source: source.to_owned(),
            csv,
            n_fields: header.len(),
            date_idx,
            columns,
            header_names,
            delimiter,
            decimal,
            missing_markers: options.missing_markers.clone(),
            date_format: options.date_format,
            lookahead: VecDeque::new(),
            pending: VecDeque::new(),
            previous: None,
            last_line: 1,
            warnings,
            decimal_comma_seen: false,
            wind_height_m,
            finished: false,
        })
    }

    /// Warnings so far (complete once the iterator is exhausted).
    pub fn warnings(&self) -> &[ImportWarning] {
        &self.warnings
    }

    /// The date format in use, once known.
    pub fn date_format(&self) -> Option<DateFormat> {
        self.date_format
    }

    /// Wind measurement height stated by the mapping (m).
    pub fn wind_height_m(&self) -> Option<f64> {
        self.wind_height_m
    }

    /// The `WeatherDay` field names present as columns.
    pub fn fields(&self) -> Vec<&'static str> {
        self.columns.iter().map(|(_, q)| q.field_name()).collect()
    }

    /// The last line read so far (1 = the header).
    pub fn last_line(&self) -> u64 {
        self.last_line
    }

    /// The input's name as used in messages.
    pub fn source(&self) -> &str {
        &self.source
    }

    fn at(&self, line: u64, column: u64) -> SourceLocation {
        SourceLocation {
            file: self.source.clone(),
            line,
            column,
        }
    }

    /// Reads the next non-blank record with its line; `None` at end of file.
    fn next_record(&mut self) -> Result<Option<(csv::ByteRecord, u64)>, ImportError> {
        let mut rec = csv::ByteRecord::new();
        loop {
            let more = self
                .csv
                .read_byte_record(&mut rec)
                .map_err(|e| csv_fatal(e, &self.source))?;
            if !more {
                return Ok(None);
            }
            let line = match rec.position() {
                Some(p) => self.csv.get_mut().line_at(p.byte()),
                None => self.last_line + 1,
            };
            // A line of only delimiters and spaces counts as blank.
            let blank = rec.iter().all(|f| f.iter().all(u8::is_ascii_whitespace));
            if line > self.last_line + 1 {
                let count = line - self.last_line - 1;
                let at = self.at(self.last_line + 1, 1);
                self.warnings.push(ImportWarning {
                    at,
                    kind: WarningKind::BlankLines { count },
                });
            }
            self.last_line = line;
            if blank {
                let at = self.at(line, 1);
                self.warnings.push(ImportWarning {
                    at,
                    kind: WarningKind::BlankLines { count: 1 },
                });
                continue;
            }
            return Ok(Some((rec, line)));
        }
    }

    /// Settles the date format when it was not stated, reading ahead until a
    /// date decides it.
    fn settle_date_format(&mut self) -> Result<(), ImportError> {
        let mut ambiguous: Option<(String, u64, u64)> = None;
        loop {
            let Some((rec, line)) = self.next_record()? else {
                if let Some((found, line, column)) = ambiguous {
                    return Err(ImportError::AmbiguousDates {
                        at: self.at(line, column),
                        found,
                    });
                }
                // No usable date at all: every row will be rejected as a bad
                // ISO date, which says what is expected.
                self.date_format = Some(DateFormat::Iso);
                return Ok(());
            };
            let cell = rec
                .get(self.date_idx)
                .map(|b| String::from_utf8_lossy(b).trim().to_owned())
                .unwrap_or_default();
            let column = column_of_field(&rec, self.date_idx, self.delimiter);
            self.lookahead.push_back((rec, line));
            match date::evidence(&cell) {
                Evidence::Decides(format) => {
                    if format != DateFormat::Iso {
                        let at = self.at(line, column);
                        self.warnings.push(ImportWarning {
                            at,
                            kind: WarningKind::DateFormatDeduced {
                                format,
                                evidence: cell,
                            },
                        });
                    }
                    self.date_format = Some(format);
                    return Ok(());
                }
                Evidence::Ambiguous if ambiguous.is_none() => {
                    ambiguous = Some((cell, line, column));
                }
                _ => {}
            }
        }
    }

    fn parse_number(
        &mut self,
        text: &str,
        quantity: Quantity,
        line: u64,
        column: u64,
    ) -> Result<Option<f64>, ImportProblem> {
        let name = quantity.field_name();
        let t = text.trim();
        if t.is_empty() || self.missing_markers.iter().any(|m| m == t) {
            return Ok(None);
        }
        let expected = || {
            let sep = match self.decimal {
                Some(DecimalSeparator::Comma) => "decimal comma",
                Some(DecimalSeparator::Point) => "decimal point",
                None => "decimal point or comma",
            };
            format!(
                "a number in {} ({sep}) or a blank cell",
                quantity.unit_symbol()
            )
        };
        let bad = |kind| ImportProblem {
            at: SourceLocation {
                file: self.source.clone(),
                line,
                column,
            },
            kind,
        };
        let has_comma = t.contains(',');
        let owned;
        let numeric = match (self.decimal, has_comma) {
            (_, false) if self.decimal == Some(DecimalSeparator::Comma) && t.contains('.') => {
                return Err(bad(ProblemKind::NotANumber {
                    column: name.into(),
                    found: shown_cell(t),
                    expected: expected(),
                }));
            }
            (_, false) => t,
            (Some(DecimalSeparator::Point), true) => {
                return Err(bad(ProblemKind::NotANumber {
                    column: name.into(),
                    found: shown_cell(t),
                    expected: expected(),
                }));
            }
            (_, true) => {
                if t.contains('.') || t.matches(',').count() > 1 {
                    return Err(bad(ProblemKind::NotANumber {
                        column: name.into(),
                        found: shown_cell(t),
                        expected: expected(),
                    }));
                }
                if self.decimal.is_none() {
                    self.decimal_comma_seen = true;
                }
                owned = t.replace(',', ".");
                owned.as_str()
            }
        };
        let Ok(value) = numeric.parse::<f64>() else {
            return Err(bad(ProblemKind::NotANumber {
                column: name.into(),
                found: shown_cell(t),
                expected: expected(),
            }));
        };
        if underflows(numeric, value) {
            return Err(bad(ProblemKind::Underflow {
                column: name.into(),
                found: shown_cell(t),
            }));
        }
        if !value.is_finite() {
            return Err(bad(ProblemKind::NonFinite {
                column: name.into(),
                found: shown_cell(t),
            }));
        }
        let si = quantity.to_si(value);
        if !si.is_finite() || si.abs() > MAGNITUDE_LIMIT {
            return Err(bad(ProblemKind::Implausible {
                column: name.into(),
                found: shown_cell(t),
                limit: MAGNITUDE_LIMIT,
            }));
        }
        Ok(Some(si))
    }

    /// Turns one record into a day, or the problems that reject it.
    fn process(&mut self, rec: &csv::ByteRecord, line: u64) -> Result<ReadDay, Vec<ImportProblem>> {
        if rec.len() != self.n_fields {
            let hint = if rec.len() < self.n_fields {
                " (line truncated or cells missing?)"
            } else if self.delimiter == b',' {
                " (a decimal comma in a comma-separated file splits numbers; use ';' as delimiter or quote the values)"
            } else {
                " (extra delimiters in the line?)"
            };
            let column = line_length(rec, self.delimiter) + 1;
            return Err(vec![ImportProblem {
                at: self.at(line, column),
                kind: ProblemKind::FieldCount {
                    found: rec.len(),
                    expected: self.n_fields,
                    hint,
                },
            }]);
        }
        let mut problems = Vec::new();
        let format = self.date_format.unwrap_or(DateFormat::Iso);
        let date_bytes = rec.get(self.date_idx).unwrap_or_default();
        // Every field's column in one pass (linear in the row's length).
        let cols = field_columns(rec);
        let date_col = cols[self.date_idx];
        let date = if let Ok(text) = std::str::from_utf8(date_bytes) {
            {
                let t = text.trim();
                let d = date::parse_date(t, format);
                if d.is_none() {
                    problems.push(ImportProblem {
                        at: self.at(line, date_col),
                        kind: ProblemKind::BadDate {
                            found: shown_cell(t),
                            expected: format.describe().into(),
                        },
                    });
                }
                d
            }
        } else {
            {
                problems.push(ImportProblem {
                    at: self.at(line, date_col),
                    kind: ProblemKind::NotUtf8 {
                        column: self
                            .header_names
                            .get(self.date_idx)
                            .cloned()
                            .unwrap_or_default(),
                    },
                });
                None
            }
        };
        let mut day = WeatherDay::empty(date.unwrap_or_default());
        let columns = self.columns.clone();
        for (idx, quantity) in columns {
            let bytes = rec.get(idx).unwrap_or_default();
            let column = cols[idx];
            let Ok(text) = std::str::from_utf8(bytes) else {
                problems.push(ImportProblem {
                    at: self.at(line, column),
                    kind: ProblemKind::NotUtf8 {
                        column: quantity.field_name().into(),
                    },
                });
                continue;
            };
            match self.parse_number(text, quantity, line, column) {
                Ok(v) => set_field(&mut day, quantity, v),
                Err(p) => problems.push(p),
            }
        }
        let Some(date) = date else {
            return Err(problems);
        };
        // Date order is checked even when a cell is rejected, so a rejected
        // row with a good date does not show up as a missing day.
        if let Some((prev, prev_line)) = self.previous {
            if date == prev {
                problems.insert(
                    0,
                    ImportProblem {
                        at: self.at(line, date_col),
                        kind: ProblemKind::DuplicateDate {
                            date,
                            first_line: prev_line,
                        },
                    },
                );
                return Err(problems);
            }
            if date < prev {
                problems.insert(
                    0,
                    ImportProblem {
                        at: self.at(line, date_col),
                        kind: ProblemKind::OutOfOrder {
                            date,
                            previous: prev,
                            previous_line: prev_line,
                        },
                    },
                );
                return Err(problems);
            }
            let gap = (date - prev).num_days() - 1;
            if gap > 0 {
                let at = self.at(line, date_col);
                self.warnings.push(ImportWarning {
                    at,
                    kind: WarningKind::MissingDays {
                        after: prev,
                        before: date,
                        count: gap,
                    },
                });
            }
        }
        self.previous = Some((date, line));
        if !problems.is_empty() {
            return Err(problems);
        }
        Ok(ReadDay { line, day })
    }

    fn finish(&mut self) {
        if !self.finished {
            self.finished = true;
            if self.decimal_comma_seen {
                let at = self.at(1, 1);
                self.warnings.push(ImportWarning {
                    at,
                    kind: WarningKind::DecimalComma,
                });
            }
        }
    }
}

impl<R: Read> Iterator for WeatherReader<R> {
    type Item = Result<ReadDay, ImportError>;

    fn next(&mut self) -> Option<Self::Item> {
        loop {
            if let Some(item) = self.pending.pop_front() {
                return Some(item);
            }
            if self.finished {
                return None;
            }
            if self.date_format.is_none()
                && let Err(e) = self.settle_date_format()
            {
                self.finish();
                return Some(Err(e));
            }
            let next = match self.lookahead.pop_front() {
                Some(r) => Some(r),
                None => match self.next_record() {
                    Ok(r) => r,
                    Err(e) => {
                        self.finish();
                        return Some(Err(e));
                    }
                },
            };
            let Some((rec, line)) = next else {
                self.finish();
                return None;
            };
            match self.process(&rec, line) {
                Ok(day) => return Some(Ok(day)),
                Err(problems) => self.pending.extend(
                    problems
                        .into_iter()
                        .map(|p| Err(ImportError::Row(Box::new(p)))),
                ),
            }
        }
    }
}

/// Imports a whole weather file, listing every problem up to
/// `options.max_problems`.
///
/// # Errors
/// [`ImportError::Rejected`] listing rejected cells and rows (with
/// `file:line:column`) if any row was rejected; otherwise the fatal errors of
/// [`WeatherReader::open`], [`ImportError::AmbiguousDates`], or
/// [`ImportError::NoData`] for a file with a header and no data.
pub fn import_weather_file(
    path: &Path,
    options: &ImportOptions,
) -> Result<ImportedSeries, ImportError> {
    let reader = WeatherReader::open(path, options)?;
    // Named in the message if the series is refused as too long (which
    // happens as soon as the day past the cap is read, before more memory
    // is taken).
    let file_bytes = std::fs::metadata(path).ok().map(|m| m.len());
    collect_series(reader, options.max_problems, file_bytes)
}

/// Imports from any reader (e.g. an in-memory string); `source` names it in messages.
///
/// # Errors
/// As [`import_weather_file`].
pub fn import_weather_reader<R: Read>(
    reader: R,
    source: &str,
    options: &ImportOptions,
) -> Result<ImportedSeries, ImportError> {
    let reader = WeatherReader::new(reader, source, options)?;
    collect_series(reader, options.max_problems, None)
}

fn collect_series<R: Read>(
    mut reader: WeatherReader<R>,
    cap: usize,
    file_bytes: Option<u64>,
) -> Result<ImportedSeries, ImportError> {
    let mut days = Vec::new();
    let mut lines = Vec::new();
    let mut problems = Vec::new();
    let mut omitted = 0;
    for item in reader.by_ref() {
        match item {
            Ok(r) => {
                if days.len() == MAX_SERIES_DAYS {
                    return Err(ImportError::TooManyDays {
                        at: reader.at(r.line, 1),
                        limit_days: MAX_SERIES_DAYS,
                        file_bytes,
                    });
                }
                days.push(r.day);
                lines.push(r.line);
            }
            Err(ImportError::Row(p)) => {
                if problems.len() < cap {
                    problems.push(*p);
                } else {
                    omitted += 1;
                }
            }
            Err(fatal) => return Err(fatal),
        }
    }
    if !problems.is_empty() {
        return Err(ImportError::Rejected { problems, omitted });
    }
    if days.is_empty() {
        let line = reader.last_line + 1;
        return Err(ImportError::NoData {
            at: reader.at(line, 1),
        });
    }
    Ok(ImportedSeries {
        source: reader.source.clone(),
        days,
        lines,
        warnings: reader.warnings.clone(),
        date_format: reader.date_format.unwrap_or(DateFormat::Iso),
        wind_height_m: reader.wind_height_m,
        fields: reader.fields(),
    })
}

/// Reads a column mapping saved as RON.
///
/// # Errors
/// [`ImportError::Io`] or [`ImportError::MappingFile`] with the RON position.
pub fn load_mapping(path: &Path) -> Result<ColumnMapping, ImportError> {
    let text = std::fs::read_to_string(path).map_err(|source| ImportError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    super::mapping::mapping_from_ron_str(&text).map_err(|error| ImportError::MappingFile {
        path: path.to_path_buf(),
        error: Box::new(error),
    })
}

/// Whether `text` (a number that parsed to `value`) is a non-zero number too
/// small for a double: it would be read as 0 (e.g. `1e-400`) or lose its
/// precision as a subnormal (e.g. `1e-310`).
fn underflows(text: &str, value: f64) -> bool {
    if value != 0.0 {
        return value.abs() < f64::MIN_POSITIVE;
    }
    let mantissa = text.split(['e', 'E']).next().unwrap_or("");
    mantissa.bytes().any(|b| (b'1'..=b'9').contains(&b))
}

fn set_field(day: &mut WeatherDay, quantity: Quantity, value: Option<f64>) {
    let slot = match quantity {
        Quantity::Tmax(_) => &mut day.tmax_c,
        Quantity::Tmin(_) => &mut day.tmin_c,
        Quantity::Tmean(_) => &mut day.tmean_c,
        Quantity::RhMax(_) => &mut day.rhmax_pct,
        Quantity::RhMin(_) => &mut day.rhmin_pct,
        Quantity::RhMean(_) => &mut day.rhmean_pct,
        Quantity::Dewpoint(_) => &mut day.tdew_c,
        Quantity::VapourPressure(_) => &mut day.ea_kpa,
        Quantity::Wind { .. } => &mut day.wind_ms,
        Quantity::Solar(_) => &mut day.solar_mj,
        Quantity::SunshineHours => &mut day.sunshine_h,
        Quantity::Rain(_) => &mut day.rain_mm,
    };
    *slot = value;
}
