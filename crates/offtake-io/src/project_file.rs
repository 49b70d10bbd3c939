//! Project files: RON with a schema version, migration from older schemas,
//! strict reading and atomic saving.
//!
//! # Format
//! A project file is the RON form of [`offtake_core::project::Project`],
//! written with the `implicit_some` extension (an optional value is written
//! bare, `parent: "main"`, not `parent: Some("main")`). Every struct refuses
//! unknown fields, so a misspelt field is an error at its line and column,
//! never silently dropped. The first field is `schema`:
//!
//! * `schema: 2` — the current layout ([`CURRENT_SCHEMA`]).
//! * `schema: 1` — read and migrated (see [`v1`]): its minimal
//!   `weather.mapping` becomes `weather.import`.
//! * `schema: 0` — the first layout, still read and migrated through schema 1
//!   (see [`v0`]).
//! * anything newer is refused with a message naming both versions.
//!
//! # Hostile input
//! Files larger than [`MAX_PROJECT_FILE_BYTES`] are refused before reading;
//! nesting is limited by the RON reader's recursion limit
//! ([`RECURSION_LIMIT`]); numbers that overflow to infinity or are written as
//! `inf`/`NaN` are refused with their position.
//!
//! # Saving
//! [`save_project`] writes through [`crate::atomic`]: a uniquely named
//! temporary file created exclusively in the same folder, flushed and synced;
//! the previous file is copied to `NAME.ron.bak`, then the temporary file is
//! renamed over the target. The saved file keeps the permissions of the file
//! it replaces (`rw-r--r--` for a new file on Unix). A failure at any step
//! before the rename leaves the existing file untouched.
//!
//! # Comments
//! A save writes Offtake's own layout: comments written by hand in a project
//! file cannot be carried through the RON serializer reliably, so they are
//! not kept in the saved file. Instead [`hand_written_comment_lines`] counts
//! them (callers say so before the first save), and the first save over a
//! file with such comments keeps the file as it was in `NAME.ron.original`
//! ([`original_path`]), which later saves never overwrite.
//!
//! # Byte-order mark
//! A file starting with a UTF-8 byte-order mark is read as if it had none.

use std::fs::File;
use std::io::{self, Read, Write};
use std::path::{Path, PathBuf};

use offtake_core::project::{CURRENT_SCHEMA, Project};
use ron::extensions::Extensions;
use serde::Deserialize;
use thiserror::Error;

use crate::atomic::{AtomicFile, AtomicWriteError};

/// Largest project file read, in bytes (16 MiB). A scheme of thousands of
/// blocks is well under one megabyte.
pub const MAX_PROJECT_FILE_BYTES: u64 = 16 * 1024 * 1024;

/// Deepest nesting of RON values accepted (the project needs about 6).
pub const RECURSION_LIMIT: usize = 64;

/// Why a project file could not be read or written.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ProjectFileError {
    /// The file could not be opened, read or written.
    #[error("{}: {source}", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The system error.
        #[source]
        source: io::Error,
    },
    /// The file is larger than [`MAX_PROJECT_FILE_BYTES`].
    #[error("{}: file is {size_bytes} bytes; a project file may be at most {limit_bytes} bytes (is this really a project file?)", path.display())]
    TooLarge {
        /// The file.
        path: PathBuf,
        /// Its size.
        size_bytes: u64,
        /// The limit.
        limit_bytes: u64,
    },
    /// The file is not UTF-8 text.
    #[error("{}:{line}:{column}: the file is not UTF-8 text", path.display())]
    NotUtf8 {
        /// The file.
        path: PathBuf,
        /// Line of the first bad byte (1-based).
        line: usize,
        /// Column of the first bad byte (1-based, in characters).
        column: usize,
    },
    /// RON syntax error, wrong type, unknown or missing field.
    #[error("{}:{line}:{column}: {message}", path.display())]
    Parse {
        /// The file.
        path: PathBuf,
        /// Line (1-based).
        line: usize,
        /// Column (1-based).
        column: usize,
        /// What was found and what was expected.
        message: String,
    },
    /// The file has no `schema` field.
    #[error("{}: no `schema` field; a project file starts with `(schema: {CURRENT_SCHEMA}, ...`", path.display())]
    MissingSchema {
        /// The file.
        path: PathBuf,
    },
    /// The file was written by a newer Offtake.
    #[error("{}: schema {found} is newer than this version of Offtake understands (schema {supported}); open it with a newer Offtake", path.display())]
    NewerSchema {
        /// The file.
        path: PathBuf,
        /// The file's schema.
        found: u32,
        /// The newest schema this build reads.
        supported: u32,
    },
    /// A number is infinite or not a number.
    #[error("{}:{line}:{column}: number `{token}` is out of range; expected a finite number", path.display())]
    NonFinite {
        /// The file.
        path: PathBuf,
        /// Line (1-based).
        line: usize,
        /// Column (1-based).
        column: usize,
        /// The offending text.
        token: String,
    },
    /// An older file holds something the current schema cannot express.
    #[error("{}: cannot migrate schema {from} to schema {CURRENT_SCHEMA}: {message}", path.display())]
    Migration {
        /// The file.
        path: PathBuf,
        /// The file's schema.
        from: u32,
        /// What could not be converted, and what to do.
        message: String,
    },
    /// The project could not be turned into RON (a bug or a non-finite value).
    #[error("could not write the project as RON: {message}")]
    Serialize {
        /// The serializer's message.
        message: String,
    },
}

fn io_err(path: &Path) -> impl FnOnce(io::Error) -> ProjectFileError + '_ {
    move |source| ProjectFileError::Io {
        path: path.to_path_buf(),
        source,
    }
}

fn ron_options() -> ron::Options {
    ron::Options::default()
        .with_default_extension(Extensions::IMPLICIT_SOME)
        .with_recursion_limit(RECURSION_LIMIT)
}

/// Reads a project file, migrating older schemas to the current one.
///
/// # Errors
/// [`ProjectFileError`] with the file, line and column of the problem.
pub fn load_project(path: &Path) -> Result<Project, ProjectFileError> {
    let file = File::open(path).map_err(io_err(path))?;
    let size = file.metadata().map_err(io_err(path))?.len();
    if size > MAX_PROJECT_FILE_BYTES {
        return Err(ProjectFileError::TooLarge {
            path: path.to_path_buf(),
            size_bytes: size,
            limit_bytes: MAX_PROJECT_FILE_BYTES,
        });
    }
    // The size may change between the check and the read (or the file may be
    // a device): never read more than one byte past the cap.
    let mut bytes = Vec::new();
    file.take(MAX_PROJECT_FILE_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(io_err(path))?;
    if bytes.len() as u64 > MAX_PROJECT_FILE_BYTES {
        return Err(ProjectFileError::TooLarge {
            path: path.to_path_buf(),
            size_bytes: bytes.len() as u64,
            limit_bytes: MAX_PROJECT_FILE_BYTES,
        });
    }
    let text = match std::str::from_utf8(&bytes) {
        Ok(t) => t,
        Err(e) => {
            let (line, column) = line_col(&bytes[..e.valid_up_to()]);
            return Err(ProjectFileError::NotUtf8 {
                path: path.to_path_buf(),
                line,
                column,
            });
        }
    };
    parse_project(text, path)
}

/// Parses the text of a project file; `path` is only used in messages.
///
/// # Errors
/// As [`load_project`], except for I/O and size.
pub fn parse_project(text: &str, path: &Path) -> Result<Project, ProjectFileError> {
    // A byte-order mark (as some Windows editors write) is not part of the
    // RON text; positions after it are unchanged for the user.
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let parse_err = |e: ron::error::SpannedError| ProjectFileError::Parse {
        path: path.to_path_buf(),
        line: e.span.start.line,
        column: e.span.start.col,
        message: describe_ron_error(&e.code),
    };
    // First pass: only the schema number (other fields are skipped).
    let probe: SchemaProbe = ron_options().from_str(text).map_err(|e| {
        if matches!(
            e.code,
            ron::Error::MissingStructField {
                field: "schema",
                ..
            }
        ) {
            ProjectFileError::MissingSchema {
                path: path.to_path_buf(),
            }
        } else {
            parse_err(e)
        }
    })?;
    let migration_err = |from: u32| {
        move |e: v1::MigrationError| ProjectFileError::Migration {
            path: path.to_path_buf(),
            from,
            message: e.to_string(),
        }
    };
    let project = match probe.schema {
        0 => v1::migrate(v0::migrate(
            ron_options()
                .from_str::<v0::Project>(text)
                .map_err(parse_err)?,
        ))
        .map_err(migration_err(0))?,
        1 => v1::migrate(
            ron_options()
                .from_str::<v1::Project>(text)
                .map_err(parse_err)?,
        )
        .map_err(migration_err(1))?,
        // Schema 2 lacks the blocks' delivery mode and stream size: its
        // blocks are delivered on demand (as they were computed), with no
        // stream size entered.
        2 => Project {
            schema: CURRENT_SCHEMA,
            ..ron_options().from_str::<Project>(text).map_err(parse_err)?
        },
        CURRENT_SCHEMA => ron_options().from_str::<Project>(text).map_err(parse_err)?,
        found => {
            return Err(ProjectFileError::NewerSchema {
                path: path.to_path_buf(),
                found,
                supported: CURRENT_SCHEMA,
            });
        }
    };
    if let Some((line, column, token)) = find_non_finite_number(text) {
        return Err(ProjectFileError::NonFinite {
            path: path.to_path_buf(),
            line,
            column,
            token,
        });
    }
    Ok(project)
}

/// The first pass of reading: the schema version alone.
#[derive(Deserialize)]
#[serde(rename = "Project")]
struct SchemaProbe {
    schema: u32,
}

/// Rewords the RON reader's messages where they would puzzle a user.
fn describe_ron_error(code: &ron::Error) -> String {
    match code {
        ron::Error::NoSuchStructField {
            expected,
            found,
            outer,
        } => {
            let within = outer
                .as_deref()
                .map_or_else(String::new, |o| format!(" in {o}"));
            format!(
                "unknown field `{found}`{within}; expected one of: {}",
                expected.join(", ")
            )
        }
        ron::Error::MissingStructField { field, outer } => {
            let within = outer
                .as_deref()
                .map_or_else(String::new, |o| format!(" in {o}"));
            format!("missing field `{field}`{within}")
        }
        ron::Error::IntegerOutOfBounds => {
            "integer out of range for this field (expected a small whole number)".to_owned()
        }
        ron::Error::ExpectedFloat => "expected a number (e.g. 50.0)".to_owned(),
        ron::Error::ExpectedInteger => "expected a whole number (e.g. 10)".to_owned(),
        ron::Error::ExpectedString => "expected text in double quotes".to_owned(),
        ron::Error::Eof => "the file ends too early (a bracket or value is missing)".to_owned(),
        ron::Error::ExceededRecursionLimit => format!(
            "values are nested deeper than {RECURSION_LIMIT} levels; a project file is never this deep"
        ),
        other => other.to_string(),
    }
}

/// 1-based line and column (in characters) just after `prefix`.
fn line_col(prefix: &[u8]) -> (usize, usize) {
    let text = String::from_utf8_lossy(prefix);
    let line = 1 + text.matches('\n').count();
    let column = 1 + text.rsplit('\n').next().map_or(0, |l| l.chars().count());
    (line, column)
}

/// Finds the first number in RON text that is not finite (`inf`, `NaN`, or a
/// literal such as `1e999` that overflows), skipping strings and comments.
/// Returns its 1-based line, column and text.
fn find_non_finite_number(text: &str) -> Option<(usize, usize, String)> {
    let chars: Vec<char> = text.chars().collect();
    let (mut i, mut line, mut col) = (0usize, 1usize, 1usize);
    let advance = |i: &mut usize, line: &mut usize, col: &mut usize, to: usize| {
        while *i < to.min(chars.len()) {
            if chars.get(*i) == Some(&'\n') {
                *line += 1;
                *col = 1;
            } else {
                *col += 1;
            }
            *i += 1;
        }
    };
    while i < chars.len() {
        let c = chars[i];
        if c == '"' {
            // String literal: skip to the closing quote, honouring escapes.
            let mut j = i + 1;
            while j < chars.len() && chars[j] != '"' {
                j += if chars[j] == '\\' { 2 } else { 1 };
            }
            advance(&mut i, &mut line, &mut col, j + 1);
        } else if c == '/' && chars.get(i + 1) == Some(&'/') {
            let mut j = i;
            while j < chars.len() && chars[j] != '\n' {
                j += 1;
            }
            advance(&mut i, &mut line, &mut col, j);
        } else if c == '/' && chars.get(i + 1) == Some(&'*') {
            let mut j = i + 2;
            while j + 1 < chars.len() && !(chars[j] == '*' && chars[j + 1] == '/') {
                j += 1;
            }
            advance(&mut i, &mut line, &mut col, j + 2);
        } else if c.is_ascii_alphanumeric() || c == '_' || c == '.' {
            let mut j = i;
            while j < chars.len()
                && (chars[j].is_ascii_alphanumeric()
                    || chars[j] == '_'
                    || chars[j] == '.'
                    || ((chars[j] == '-' || chars[j] == '+')
                        && j > i
                        && matches!(chars[j - 1], 'e' | 'E')
                        && chars[i].is_ascii_digit()))
            {
                j += 1;
            }
            let token: String = chars[i..j].iter().collect();
            if is_non_finite_token(&token) {
                return Some((line, col, token));
            }
            advance(&mut i, &mut line, &mut col, j);
        } else {
            let next = i + 1;
            advance(&mut i, &mut line, &mut col, next);
        }
    }
    None
}

fn is_non_finite_token(token: &str) -> bool {
    if matches!(token, "inf" | "NaN" | "infinity" | "Infinity") {
        return true;
    }
    let first = token.chars().next().unwrap_or(' ');
    if !(first.is_ascii_digit() || first == '.') {
        return false;
    }
    let lower = token.to_ascii_lowercase();
    if lower.starts_with("0x") || lower.starts_with("0b") || lower.starts_with("0o") {
        return false;
    }
    let cleaned: String = token.chars().filter(|&c| c != '_').collect();
    // Strip a RON type suffix such as `f64` (number_suffixes extension).
    let cleaned = cleaned
        .strip_suffix("f64")
        .or_else(|| cleaned.strip_suffix("f32"))
        .unwrap_or(&cleaned);
    cleaned.parse::<f64>().is_ok_and(|v| !v.is_finite())
}

/// The RON text a save writes: a comment header and the pretty form, one
/// field per line in declaration order (so diffs of saved files are stable).
///
/// # Errors
/// [`ProjectFileError::Serialize`] if a value cannot be written, or if a
/// number is NaN or infinite (the file would be refused on loading).
pub fn project_to_string(project: &Project) -> Result<String, ProjectFileError> {
    let config = ron::ser::PrettyConfig::new()
        .struct_names(false)
        .extensions(Extensions::IMPLICIT_SOME)
        .indentor("    ");
    let body = ron::Options::default()
        .to_string_pretty(project, config)
        .map_err(|e| ProjectFileError::Serialize {
            message: e.to_string(),
        })?;
    let text = format!("{}{body}\n", own_header(project.schema));
    // Never write a file that would be refused on loading.
    if let Some((line, _, token)) = find_non_finite_number(&text) {
        let context = text.lines().nth(line - 1).unwrap_or("").trim();
        return Err(ProjectFileError::Serialize {
            message: format!(
                "the project holds a number that is not finite ({token}) at `{context}`; \
                 correct it (validation lists it) before saving"
            ),
        });
    }
    Ok(text)
}

/// Writes the project's RON text to any writer.
///
/// # Errors
/// [`ProjectFileError::Serialize`] or the writer's I/O error (reported
/// against `path`).
pub fn save_to_writer<W: Write>(
    mut writer: W,
    project: &Project,
    path: &Path,
) -> Result<(), ProjectFileError> {
    let text = project_to_string(project)?;
    writer.write_all(text.as_bytes()).map_err(io_err(path))?;
    writer.flush().map_err(io_err(path))
}

/// The path of the backup kept by [`save_project`]: `NAME.ron.bak` beside
/// `NAME.ron`.
pub fn backup_path(path: &Path) -> PathBuf {
    let mut name = path.file_name().unwrap_or_default().to_os_string();
    name.push(".bak");
    path.with_file_name(name)
}

/// Saves atomically, keeping the previous file as `NAME.ron.bak`.
///
/// # Errors
/// [`ProjectFileError`]; on any error the existing file is left as it was.
pub fn save_project(path: &Path, project: &Project) -> Result<(), ProjectFileError> {
    save_project_through(path, project, |file| Box::new(file))
}

/// [`save_project`] with the temporary file's writer wrapped by `wrap`
/// (for tests that make the write fail part-way, or for progress reporting).
///
/// # Errors
/// As [`save_project`].
pub fn save_project_through<F>(
    path: &Path,
    project: &Project,
    wrap: F,
) -> Result<(), ProjectFileError>
where
    F: for<'a> FnOnce(&'a mut AtomicFile) -> Box<dyn Write + 'a>,
{
    // Serialize first: a value that cannot be written never touches the disk.
    let text = project_to_string(project)?;
    // The temporary file is created exclusively beside the target under a
    // unique name and keeps the permissions of the file it replaces
    // (crate::atomic); it is removed on every error path.
    let mut file = AtomicFile::create(path).map_err(atomic_err(path))?;
    {
        let mut writer = wrap(&mut file);
        writer.write_all(text.as_bytes()).map_err(io_err(path))?;
        writer.flush().map_err(io_err(path))?;
    }
    file.commit_with(|| keep_previous(path))
        .map_err(atomic_err(path))
}

/// Before a save replaces `path`: copies it to `NAME.ron.bak`, and, the first
/// time a file with hand-written comments is replaced, to
/// `NAME.ron.original` as well (never overwritten afterwards), since a save
/// writes Offtake's own layout and cannot keep comments.
fn keep_previous(path: &Path) -> io::Result<()> {
    let meta = match std::fs::symlink_metadata(path) {
        Ok(m) => m,
        Err(e) if e.kind() == io::ErrorKind::NotFound => return Ok(()),
        Err(e) => return Err(e),
    };
    if !meta.is_file() {
        return Ok(());
    }
    let original = original_path(path);
    if !original.exists() {
        let mut text = String::new();
        File::open(path)?
            .take(MAX_PROJECT_FILE_BYTES)
            .read_to_string(&mut text)
            .ok();
        if hand_written_comment_lines(&text) > 0 {
            crate::atomic::write_atomically(&original, text.as_bytes())
                .map_err(io::Error::other)?;
        }
    }
    let bak = backup_path(path);
    let bytes = std::fs::read(path)?;
    crate::atomic::write_atomically(&bak, &bytes).map_err(io::Error::other)
}

/// The path where the first save of a hand-written project file keeps the
/// file as it was: `NAME.ron.original` beside `NAME.ron`.
pub fn original_path(path: &Path) -> PathBuf {
    let mut name = path.file_name().unwrap_or_default().to_os_string();
    name.push(".original");
    path.with_file_name(name)
}

/// Comment lines in a project file's text that a save would drop: every
/// line holding a `//` or `/* */` comment outside strings, except the two
/// header lines that Offtake writes itself. Saving writes Offtake's own
/// layout (comments cannot be kept reliably through the RON serializer), so
/// a caller says so before the first save when this is above zero.
pub fn hand_written_comment_lines(text: &str) -> usize {
    let own = own_header_lines();
    let mut count = 0;
    let mut in_block = false;
    for line in text.lines() {
        let trimmed = line.trim();
        // Offtake's own header, of this schema or an older one.
        if own[1] == trimmed
            || (trimmed.starts_with("// Offtake project file (schema ")
                && trimmed.ends_with("Planning estimates only: designs"))
        {
            continue;
        }
        let mut has_comment = in_block;
        let mut in_string = false;
        let chars: Vec<char> = line.chars().collect();
        let mut i = 0;
        while i < chars.len() {
            let c = chars[i];
            let next = chars.get(i + 1).copied();
            if in_block {
                if c == '*' && next == Some('/') {
                    in_block = false;
                    i += 1;
                }
            } else if in_string {
                if c == '\\' {
                    i += 1;
                } else if c == '"' {
                    in_string = false;
                }
            } else if c == '"' {
                in_string = true;
            } else if c == '/' && next == Some('/') {
                has_comment = true;
                break;
            } else if c == '/' && next == Some('*') {
                has_comment = true;
                in_block = true;
                i += 1;
            }
            i += 1;
        }
        if has_comment {
            count += 1;
        }
    }
    count
}

fn own_header_lines() -> [String; 2] {
    let header = own_header(CURRENT_SCHEMA);
    let mut lines = header.lines().map(|l| l.trim().to_owned());
    [
        lines.next().unwrap_or_default(),
        lines.next().unwrap_or_default(),
    ]
}

fn own_header(schema: u32) -> String {
    format!(
        "// Offtake project file (schema {schema}). Planning estimates only: designs\n\
         // must be checked by a qualified engineer under local codes.\n"
    )
}

fn atomic_err(path: &Path) -> impl FnOnce(AtomicWriteError) -> ProjectFileError + '_ {
    move |e| ProjectFileError::Io {
        path: path.to_path_buf(),
        source: io::Error::other(e),
    }
}

/// The weather file of a project, resolved against the project file's folder
/// (absolute paths are kept).
pub fn weather_path(project_path: &Path, project: &Project) -> PathBuf {
    let p = Path::new(&project.weather.path);
    let joined = if p.is_absolute() {
        p.to_path_buf()
    } else {
        project_path
            .parent()
            .unwrap_or_else(|| Path::new(""))
            .join(p)
    };
    // The real path when the file exists, so messages name it without
    // `dir/../` detours; as joined otherwise (the error then names it).
    std::fs::canonicalize(&joined).unwrap_or(joined)
}

pub mod v0;
pub mod v1;
