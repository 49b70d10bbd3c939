//! Lines and the header of a weather CSV file: the line cap under the
//! buffer, line numbers of records, the one header reader (shared by the
//! importer and the app's import window), and column positions.

use std::collections::VecDeque;
use std::fs::File;
use std::io::{BufRead, BufReader, Cursor, Read};
use std::path::Path;

use super::error::{ImportError, SourceLocation};
use super::reader::{Delimiter, MAX_COLUMNS, MAX_LINE_BYTES, shown_cell};

pub(super) type Source<R> = LineTap<std::io::Chain<Cursor<Vec<u8>>, BufReader<LineCap<R>>>>;

/// The error a [`LineCap`] returns for a line over [`MAX_LINE_BYTES`].
#[derive(Debug)]
pub(super) struct LineTooLong {
    line: u64,
}

impl std::fmt::Display for LineTooLong {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "line {} is longer than {MAX_LINE_BYTES} bytes",
            self.line
        )
    }
}

impl std::error::Error for LineTooLong {}

/// A reader that fails as soon as a line grows past [`MAX_LINE_BYTES`], so
/// no line is ever buffered whole beyond the cap.
pub(super) struct LineCap<R> {
    inner: R,
    since_line_end: usize,
    line: u64,
}

impl<R: Read> Read for LineCap<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.inner.read(buf)?;
        for b in &buf[..n] {
            if *b == b'\n' {
                self.line += 1;
                self.since_line_end = 0;
            } else if *b == b'\r' {
                // A line end on its own too (the CSV reader accepts it).
                self.since_line_end = 0;
            } else {
                self.since_line_end += 1;
                if self.since_line_end > MAX_LINE_BYTES {
                    return Err(std::io::Error::other(LineTooLong { line: self.line }));
                }
            }
        }
        Ok(n)
    }
}

/// The line number of a [`LineTooLong`] inside an I/O error, if it is one.
pub(super) fn line_too_long(e: &std::io::Error) -> Option<u64> {
    e.get_ref()
        .and_then(|inner| inner.downcast_ref::<LineTooLong>())
        .map(|l| l.line)
}

pub(super) fn io_error(source: std::io::Error, name: &str) -> ImportError {
    match line_too_long(&source) {
        Some(line) => ImportError::LineTooLong {
            at: SourceLocation {
                file: name.to_owned(),
                line,
                column: 1,
            },
            limit_bytes: MAX_LINE_BYTES,
        },
        None => ImportError::Io {
            path: name.into(),
            source,
        },
    }
}

/// A reader that notes where each line-end byte is, so a record's byte offset
/// (which the csv crate reports from the end of the previous record, blank
/// lines included) can be turned into the line number an editor shows.
/// Offsets already passed are dropped, so memory stays bounded by the csv
/// read-ahead buffer.
pub(super) struct LineTap<R> {
    inner: R,
    offset: u64,
    /// Offsets of `\r` and `\n` bytes not yet passed, with whether each is `\n`.
    ends: VecDeque<(u64, bool)>,
    lines_before: u64,
}

impl<R> LineTap<R> {
    pub(super) fn new(inner: R) -> Self {
        Self {
            inner,
            offset: 0,
            ends: VecDeque::new(),
            lines_before: 0,
        }
    }

    /// Line number (from 1) of the first byte at or after `byte` that is not a
    /// line end; calls must not go backwards.
    pub(super) fn line_at(&mut self, byte: u64) -> u64 {
        while let Some(&(at, is_nl)) = self.ends.front() {
            if at >= byte {
                break;
            }
            self.ends.pop_front();
            if is_nl {
                self.lines_before += 1;
            }
        }
        let mut leading = 0;
        for (expected, &(at, is_nl)) in (byte..).zip(self.ends.iter()) {
            if at != expected {
                break;
            }
            if is_nl {
                leading += 1;
            }
        }
        self.lines_before + leading + 1
    }
}

impl<R: Read> Read for LineTap<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.inner.read(buf)?;
        for (i, b) in buf[..n].iter().enumerate() {
            if *b == b'\n' || *b == b'\r' {
                self.ends.push_back((self.offset + i as u64, *b == b'\n'));
            }
        }
        self.offset += n as u64;
        Ok(n)
    }
}

/// The header line as read by every caller (this reader, the app's import
/// window): the same line cap, byte-order mark, delimiter detection, CSV
/// quoting and column cap.
pub(super) struct HeaderRead<R> {
    pub(super) csv: csv::Reader<Source<R>>,
    pub(super) header: csv::ByteRecord,
    pub(super) header_text: String,
    pub(super) delimiter: u8,
}

pub(super) fn read_header_record<R: Read>(
    reader: R,
    source: &str,
    delimiter_choice: Option<Delimiter>,
) -> Result<HeaderRead<R>, ImportError> {
    let at = |line, column| SourceLocation {
        file: source.to_owned(),
        line,
        column,
    };
    let mut buffered = BufReader::new(LineCap {
        inner: reader,
        since_line_end: 0,
        line: 1,
    });
    let mut first = Vec::new();
    buffered
        .read_until(b'\n', &mut first)
        .map_err(|e| io_error(e, source))?;
    if first.starts_with(&[0xEF, 0xBB, 0xBF]) {
        first.drain(..3);
    }
    if first.is_empty() {
        return Err(ImportError::Empty { at: at(1, 1) });
    }
    let header_full = String::from_utf8_lossy(&first)
        .trim_end_matches(['\r', '\n'])
        .to_owned();
    // Messages repeat the header cut to a readable length.
    let header_text = shown_cell(&header_full);
    if header_full.trim().is_empty() {
        return Err(ImportError::Header {
            at: at(1, 1),
            found: "a blank first line".into(),
            expected: "a header line such as \"date,tmax_c,tmin_c,...\"".into(),
        });
    }
    let delimiter = match delimiter_choice {
        Some(d) => d.as_byte(),
        None => detect_delimiter(&header_full).ok_or_else(|| ImportError::Header {
            at: at(1, 1),
            found: format!("header \"{header_text}\" with no comma, semicolon or tab"),
            expected: "columns separated by comma, semicolon or tab (e.g. \"date,tmax_c,tmin_c\")"
                .into(),
        })?,
    };
    let mut csv = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .delimiter(delimiter)
        .from_reader(LineTap::new(Cursor::new(first).chain(buffered)));
    let mut header = csv::ByteRecord::new();
    csv.read_byte_record(&mut header)
        .map_err(|e| csv_fatal(e, source))?;
    if header.len() > MAX_COLUMNS {
        return Err(ImportError::TooManyColumns {
            at: at(1, 1),
            found: header.len(),
            limit: MAX_COLUMNS,
        });
    }
    Ok(HeaderRead {
        csv,
        header,
        header_text,
        delimiter,
    })
}

/// A weather file's header: its column names (trimmed) and the delimiter in
/// use.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct HeaderLine {
    /// The column names, in file order.
    pub names: Vec<String>,
    /// The delimiter (as stated, or detected from the header line).
    pub delimiter: Delimiter,
}

/// Reads only the header of a weather file, exactly as the importer does
/// (line cap, byte-order mark, delimiter detection, quoting, column cap), so
/// a mapping table shows the columns that will be imported.
///
/// # Errors
/// I/O errors, an empty file, a blank or over-long first line, a header with
/// no delimiter or too many columns.
pub fn read_header(path: &Path, delimiter: Option<Delimiter>) -> Result<HeaderLine, ImportError> {
    let file = File::open(path).map_err(|source| ImportError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    read_header_from(file, &path.display().to_string(), delimiter)
}

/// [`read_header`] from any reader; `source` names it in messages.
///
/// # Errors
/// As [`read_header`].
pub fn read_header_from<R: Read>(
    reader: R,
    source: &str,
    delimiter: Option<Delimiter>,
) -> Result<HeaderLine, ImportError> {
    let read = read_header_record(reader, source, delimiter)?;
    Ok(HeaderLine {
        names: read
            .header
            .iter()
            .map(|f| String::from_utf8_lossy(f).trim().to_owned())
            .collect(),
        delimiter: match read.delimiter {
            b';' => Delimiter::Semicolon,
            b'\t' => Delimiter::Tab,
            _ => Delimiter::Comma,
        },
    })
}

pub(super) fn detect_delimiter(header: &str) -> Option<u8> {
    let count = |c: char| header.matches(c).count();
    [(b',', count(',')), (b';', count(';')), (b'\t', count('\t'))]
        .into_iter()
        .filter(|(_, n)| *n > 0)
        .max_by_key(|(_, n)| *n)
        .map(|(d, _)| d)
}

pub(super) fn delimiter_name(d: u8) -> &'static str {
    match d {
        b',' => "comma",
        b';' => "semicolon",
        b'\t' => "tab",
        _ => "other",
    }
}

/// Character column (from 1) where field `idx` starts, assuming unquoted
/// fields (exact for the files this reader expects; approximate with quotes).
pub(super) fn column_of_field(rec: &csv::ByteRecord, idx: usize, _delimiter: u8) -> u64 {
    let before: usize = rec.iter().take(idx).map(|f| char_count(f) + 1).sum();
    before as u64 + 1
}

/// The start column (from 1) of every field, in one pass; one more entry
/// at the end is the column just past the last field's delimiter.
pub(super) fn field_columns(rec: &csv::ByteRecord) -> Vec<u64> {
    let mut out = Vec::with_capacity(rec.len() + 1);
    let mut column = 1u64;
    for f in rec {
        out.push(column);
        column += char_count(f) as u64 + 1;
    }
    out.push(column);
    out
}

/// Characters in a cell (invalid UTF-8 bytes count one each).
pub(super) fn char_count(bytes: &[u8]) -> usize {
    match std::str::from_utf8(bytes) {
        Ok(t) => t.chars().count(),
        Err(_) => String::from_utf8_lossy(bytes).chars().count(),
    }
}

pub(super) fn line_length(rec: &csv::ByteRecord, delimiter: u8) -> u64 {
    if rec.is_empty() {
        return 0;
    }
    column_of_field(rec, rec.len(), delimiter) - 2
}

pub(super) fn csv_fatal(e: csv::Error, source: &str) -> ImportError {
    let io = match e.into_kind() {
        csv::ErrorKind::Io(err) => err,
        other => std::io::Error::other(format!("{other:?}")),
    };
    io_error(io, source)
}
