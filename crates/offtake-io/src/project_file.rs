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
//! [`save_project`] writes a temporary file in the same folder, flushes and
//! syncs it, copies the previous file to `NAME.ron.bak`, then renames the
//! temporary file over the target. The saved file keeps the permissions of
//! the file it replaces (`rw-r--r--` for a new file on Unix). A failure at any step before the rename
//! leaves the existing file untouched.

use std::fs::File;
use std::io::{self, Read, Write};
use std::path::{Path, PathBuf};

use offtake_core::project::{CURRENT_SCHEMA, Project};
use ron::extensions::Extensions;
use serde::Deserialize;
use thiserror::Error;

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
    let text = format!(
        "// Offtake project file (schema {}). Planning estimates only: designs\n\
         // must be checked by a qualified engineer under local codes.\n{body}\n",
        project.schema
    );
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
    F: for<'a> FnOnce(&'a mut File) -> Box<dyn Write + 'a>,
{
    // Serialize first: a value that cannot be written never touches the disk.
    let text = project_to_string(project)?;
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    // The saved file keeps the permissions of the file it replaces (0o644
    // for a new file on Unix), not the owner-only mode of a temporary file.
    let mut builder = tempfile::Builder::new();
    builder.prefix(".offtake-save-").suffix(".tmp");
    if let Some(p) = crate::export::permissions_for(path) {
        builder.permissions(p);
    }
    let mut tmp = builder.tempfile_in(&dir).map_err(io_err(&dir))?;
    {
        let mut writer = wrap(tmp.as_file_mut());
        writer.write_all(text.as_bytes()).map_err(io_err(path))?;
        writer.flush().map_err(io_err(path))?;
    }
    // On error above, `tmp` is dropped and deleted; the target is untouched.
    tmp.as_file().sync_all().map_err(io_err(path))?;
    if path.exists() {
        let bak = backup_path(path);
        std::fs::copy(path, &bak).map_err(io_err(&bak))?;
    }
    tmp.persist(path).map_err(|e| ProjectFileError::Io {
        path: path.to_path_buf(),
        source: e.error,
    })?;
    // Make the rename durable where the platform allows syncing a folder.
    #[cfg(unix)]
    if let Ok(d) = File::open(&dir) {
        // Best effort: the file itself is already synced and renamed.
        let _ = d.sync_all();
    }
    Ok(())
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

pub mod v0 {
    //! The first project layout (schema 0), kept so old files still open.
    //! It migrates to schema 1 ([`super::v1`]), which migrates to the current
    //! schema.
    //!
    //! Differences from schema 1:
    //! * efficiencies were percentages: `conveyance_efficiency_pct`,
    //!   `application_efficiency_pct`, `field_canal_efficiency_pct`;
    //! * a block named its canal `outlet_on`, and held one method name
    //!   (`method`) beside the application efficiency;
    //! * planting areas were always hectares (`area_ha`), the first planting
    //!   day was `planting_month` + `planting_day`, and there was no season
    //!   length override;
    //! * the design probability was called `dependability_pct`;
    //!   there were no reservoir, ET₀ method choice, supply or scenarios.

    use offtake_core::project as cur;
    use serde::Deserialize;

    use super::v1;

    /// Schema-0 project.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields, rename = "Project")]
    pub struct Project {
        /// Always 0.
        pub schema: u32,
        /// Scheme name and notes (unchanged since).
        pub scheme: cur::SchemeInfo,
        /// Canals.
        pub canals: Vec<Canal>,
        /// Blocks.
        pub blocks: Vec<Block>,
        /// Plantings.
        pub plantings: Vec<Planting>,
        /// Weather source (unchanged in schema 1).
        pub weather: v1::WeatherSource,
        /// Options.
        pub options: Options,
    }

    /// Schema-0 canal.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct Canal {
        /// Id.
        pub id: String,
        /// Name.
        pub name: String,
        /// Parent canal id.
        #[serde(default)]
        pub parent: Option<String>,
        /// Kind.
        pub kind: cur::CanalKind,
        /// Conveyance efficiency in percent.
        pub conveyance_efficiency_pct: f64,
        /// Existing capacity, m³/s.
        #[serde(default)]
        pub existing_capacity_m3s: Option<f64>,
        /// Hours per day.
        pub operating_hours_per_day: f64,
    }

    /// Schema-0 block.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct Block {
        /// Id.
        pub id: String,
        /// Name.
        pub name: String,
        /// Canal id (renamed `canal` in schema 1).
        pub outlet_on: String,
        /// Area, ha.
        pub area_ha: f64,
        /// Soil id.
        pub soil: String,
        /// Irrigation method name.
        pub method: String,
        /// Field application efficiency in percent.
        pub application_efficiency_pct: f64,
        /// Field-canal efficiency in percent.
        pub field_canal_efficiency_pct: f64,
    }

    /// Schema-0 planting.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct Planting {
        /// Id.
        pub id: String,
        /// Block id.
        pub block: String,
        /// Crop id.
        pub crop: String,
        /// Area, ha.
        pub area_ha: f64,
        /// First planting month.
        pub planting_month: u32,
        /// First planting day.
        pub planting_day: u32,
        /// Spread, days.
        pub spread_days: u32,
        /// Season label.
        pub season: String,
        /// Strategy (unchanged since).
        pub strategy: cur::Strategy,
    }

    /// Schema-0 options.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct Options {
        /// Effective rain method.
        pub effective_rain: cur::EffectiveRain,
        /// Reporting step.
        pub reporting_step: cur::ReportingStep,
        /// Irrigation year start month.
        pub irrigation_year_start_month: u32,
        /// Design probability (renamed `design_probability_pct`).
        pub dependability_pct: f64,
        /// Design basis.
        pub design_basis: cur::DesignBasis,
        /// Rotation period, days.
        pub rotation_period_days: u32,
    }

    /// Converts a schema-0 project to schema 1.
    pub fn migrate(old: Project) -> v1::Project {
        v1::Project {
            schema: 1,
            scheme: old.scheme,
            canals: old
                .canals
                .into_iter()
                .map(|c| cur::Canal {
                    id: c.id,
                    name: c.name,
                    parent: c.parent,
                    kind: c.kind,
                    conveyance_efficiency: c.conveyance_efficiency_pct / 100.0,
                    existing_capacity_m3s: c.existing_capacity_m3s,
                    operating_hours_per_day: c.operating_hours_per_day,
                    section: cur::CanalSectionSpec::default(),
                })
                .collect(),
            blocks: old
                .blocks
                .into_iter()
                .map(|b| cur::Block {
                    id: b.id,
                    name: b.name,
                    canal: b.outlet_on,
                    area_ha: b.area_ha,
                    soil: b.soil,
                    method: cur::IrrigationMethod {
                        name: b.method,
                        application_efficiency: b.application_efficiency_pct / 100.0,
                    },
                    field_canal_efficiency: b.field_canal_efficiency_pct / 100.0,
                    delivery: offtake_core::project::DeliveryMode::OnDemand,
                    outlet_stream_size_ls: None,
                })
                .collect(),
            plantings: old
                .plantings
                .into_iter()
                .map(|p| cur::Planting {
                    id: p.id,
                    block: p.block,
                    crop: p.crop,
                    area: cur::PlantingArea::Hectares(p.area_ha),
                    first_planting: cur::MonthDay {
                        month: p.planting_month,
                        day: p.planting_day,
                    },
                    spread_days: p.spread_days,
                    season: p.season,
                    strategy: p.strategy,
                    season_length_days: None,
                    paddy: None,
                    coefficients: offtake_core::project::CoefficientChoice::Single,
                })
                .collect(),
            weather: old.weather,
            reservoir: None,
            options: cur::Options {
                et0_method: cur::Et0Method::PenmanMonteith,
                effective_rain: old.options.effective_rain,
                reporting_step: old.options.reporting_step,
                irrigation_year_start_month: old.options.irrigation_year_start_month,
                design_probability_pct: old.options.dependability_pct,
                design_basis: old.options.design_basis,
                design_confidence_pct: cur::Options::default().design_confidence_pct,
                rotation_period_days: old.options.rotation_period_days,
                available_supply: None,
                gap_filling: cur::GapFilling::default(),
                station_limits: offtake_core::station_limits::StationLimits::default(),
            },
            scenarios: Vec::new(),
        }
    }
}

pub mod v1 {
    //! The second project layout (schema 1), kept so its files still open.
    //!
    //! Differences from schema 2: the weather source held a minimal column
    //! mapping, `weather.mapping: (columns: [(source, target, unit)])`, where
    //! `target` is one of Offtake's own column names (DESIGN.md) and `unit` a
    //! free unit text. Schema 2 replaces it by `weather.import`
    //! ([`ImportSettings`]); [`migrate`] converts the mapping, reading the
    //! unit texts listed at [`quantity_of`]. A mapping without a `date`
    //! target keeps the date column `date`; delimiter, decimal separator and
    //! date format stay detected, as schema 1 read them.

    use offtake_core::project as cur;
    use offtake_core::weather_import::units::{
        DepthUnit, HumidityUnit, PressureUnit, RadiationUnit, TemperatureUnit, WindUnit,
    };
    use offtake_core::weather_import::{
        ColumnMapping, DateFormat, ImportSettings, MappedColumn, Quantity,
    };
    use serde::Deserialize;
    use thiserror::Error;

    /// Schema-1 project: the current layout except the weather source.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields, rename = "Project")]
    pub struct Project {
        /// Always 1.
        pub schema: u32,
        /// Scheme name and notes.
        pub scheme: cur::SchemeInfo,
        /// Canals.
        pub canals: Vec<cur::Canal>,
        /// Blocks.
        pub blocks: Vec<cur::Block>,
        /// Plantings.
        pub plantings: Vec<cur::Planting>,
        /// Weather source with the schema-1 mapping.
        pub weather: WeatherSource,
        /// Reservoir.
        #[serde(default)]
        pub reservoir: Option<cur::Reservoir>,
        /// Options.
        pub options: cur::Options,
        /// Scenarios.
        #[serde(default)]
        pub scenarios: Vec<cur::Scenario>,
    }

    /// Schema-1 weather source.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct WeatherSource {
        /// Path to the weather CSV.
        pub path: String,
        /// Latitude, degrees.
        pub latitude_deg: f64,
        /// Elevation, m.
        pub elevation_m: f64,
        /// Wind measurement height, m.
        pub wind_height_m: f64,
        /// The minimal mapping.
        #[serde(default)]
        pub mapping: Option<WeatherMapping>,
    }

    /// Schema-1 mapping: one entry per mapped column.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct WeatherMapping {
        /// The mapped columns.
        pub columns: Vec<ColumnMap>,
    }

    /// Schema-1 mapped column.
    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    pub struct ColumnMap {
        /// Header in the source file.
        pub source: String,
        /// Offtake column name (`date`, `tmax_c`, `rain_mm`, …).
        pub target: String,
        /// Unit text of the source column, if not Offtake's unit.
        #[serde(default)]
        pub unit: Option<String>,
    }

    /// A schema-1 mapping entry the current schema cannot express.
    #[derive(Debug, Clone, PartialEq, Eq, Error)]
    #[non_exhaustive]
    pub enum MigrationError {
        /// `target` is not one of Offtake's column names.
        #[error(
            "weather.mapping column {header:?}: target {target:?} is not an Offtake column name (expected one of date, tmax_c, tmin_c, tmean_c, rhmax_pct, rhmin_pct, rhmean_pct, tdew_c, ea_kpa, wind_ms, solar_mj, sunshine_h, rain_mm)"
        )]
        UnknownTarget {
            /// The source header.
            header: String,
            /// The target given.
            target: String,
        },
        /// The unit text is not one this target can be in.
        #[error(
            "weather.mapping column {header:?} ({target}): unit {unit:?} is not understood; expected one of {expected}"
        )]
        UnknownUnit {
            /// The source header.
            header: String,
            /// The target.
            target: String,
            /// The unit text given.
            unit: String,
            /// The unit texts accepted for this target.
            expected: &'static str,
        },
    }

    /// Lower case, without spaces, degree signs and `_`.
    fn normalise_unit(unit: &str) -> String {
        unit.chars()
            .filter(|c| !c.is_whitespace() && !matches!(c, '°' | 'º' | '_'))
            .flat_map(char::to_lowercase)
            .collect()
    }

    /// The quantity of a schema-1 mapping entry: `target` (Offtake's column
    /// name) in the unit `unit` (`None` = the column's own unit).
    ///
    /// Unit texts read (case, spaces and degree signs ignored): temperature
    /// `C`, `degC`, `celsius`, `F`, `degF`, `fahrenheit`, `K`, `kelvin`;
    /// humidity `%`, `pct`, `percent`, `fraction`, `frac`; vapour pressure
    /// `kPa`, `hPa`, `mbar`, `mb`; wind `m/s`, `ms`, `km/h`, `kmh`, `kph`,
    /// `mph`, `knots`, `knot`, `kn`, `kt`, `kts`; radiation `MJ/m2/day`, `MJ`,
    /// `W/m2`, `Wm-2`, `kWh/m2/day`, `kWh`; sunshine `h`, `hours`; rain `mm`,
    /// `in`, `inch`, `inches`.
    ///
    /// # Errors
    /// [`MigrationError`] naming the column, the text found and the texts
    /// accepted.
    pub fn quantity_of(c: &ColumnMap) -> Result<Quantity, MigrationError> {
        let Some(own) = Quantity::from_own_column(&c.target.trim().to_lowercase()) else {
            return Err(MigrationError::UnknownTarget {
                header: c.source.clone(),
                target: c.target.clone(),
            });
        };
        let Some(unit_text) = c.unit.as_deref().filter(|u| !u.trim().is_empty()) else {
            return Ok(own);
        };
        let u = normalise_unit(unit_text);
        let bad = |expected: &'static str| MigrationError::UnknownUnit {
            header: c.source.clone(),
            target: own.field_name().to_owned(),
            unit: unit_text.to_owned(),
            expected,
        };
        let temperature = || match u.as_str() {
            "c" | "degc" | "celsius" => Ok(TemperatureUnit::Celsius),
            "f" | "degf" | "fahrenheit" => Ok(TemperatureUnit::Fahrenheit),
            "k" | "kelvin" => Ok(TemperatureUnit::Kelvin),
            _ => Err(bad("C, F, K")),
        };
        let humidity = || match u.as_str() {
            "%" | "pct" | "percent" => Ok(HumidityUnit::Percent),
            "fraction" | "frac" => Ok(HumidityUnit::Fraction),
            _ => Err(bad("%, fraction")),
        };
        let q = match own {
            Quantity::Tmax(_) => Quantity::Tmax(temperature()?),
            Quantity::Tmin(_) => Quantity::Tmin(temperature()?),
            Quantity::Tmean(_) => Quantity::Tmean(temperature()?),
            Quantity::Dewpoint(_) => Quantity::Dewpoint(temperature()?),
            Quantity::RhMax(_) => Quantity::RhMax(humidity()?),
            Quantity::RhMin(_) => Quantity::RhMin(humidity()?),
            Quantity::RhMean(_) => Quantity::RhMean(humidity()?),
            Quantity::VapourPressure(_) => Quantity::VapourPressure(match u.as_str() {
                "kpa" => PressureUnit::Kilopascal,
                "hpa" => PressureUnit::Hectopascal,
                "mbar" | "mb" => PressureUnit::Millibar,
                _ => return Err(bad("kPa, hPa, mbar")),
            }),
            Quantity::Wind { height_m, .. } => Quantity::Wind {
                unit: match u.as_str() {
                    "m/s" | "ms" | "mps" => WindUnit::MetresPerSecond,
                    "km/h" | "kmh" | "kph" => WindUnit::KilometresPerHour,
                    "mph" => WindUnit::MilesPerHour,
                    "knots" | "knot" | "kn" | "kt" | "kts" => WindUnit::Knots,
                    _ => return Err(bad("m/s, km/h, mph, knots")),
                },
                height_m,
            },
            Quantity::Solar(_) => Quantity::Solar(match u.as_str() {
                "mj/m2/day" | "mj/m2" | "mj" | "mjm-2day-1" | "mj/m²/day" => {
                    RadiationUnit::MegajoulesPerSquareMetreDay
                }
                "w/m2" | "wm-2" | "w/m²" | "wm2" => RadiationUnit::WattsPerSquareMetreDailyMean,
                "kwh/m2/day" | "kwh/m2" | "kwh" | "kwh/m²/day" => {
                    RadiationUnit::KilowattHoursPerSquareMetreDay
                }
                _ => return Err(bad("MJ/m2/day, W/m2, kWh/m2/day")),
            }),
            Quantity::SunshineHours => match u.as_str() {
                "h" | "hours" | "hour" => Quantity::SunshineHours,
                _ => return Err(bad("h")),
            },
            Quantity::Rain(_) => Quantity::Rain(match u.as_str() {
                "mm" => DepthUnit::Millimetres,
                "in" | "inch" | "inches" => DepthUnit::Inches,
                _ => return Err(bad("mm, in")),
            }),
        };
        Ok(q)
    }

    /// The date format named by a schema-1 `date` entry's unit text, if any.
    fn date_format_of(c: &ColumnMap) -> Result<Option<DateFormat>, MigrationError> {
        let Some(text) = c.unit.as_deref().filter(|u| !u.trim().is_empty()) else {
            return Ok(None);
        };
        match normalise_unit(text).as_str() {
            "iso" | "yyyy-mm-dd" => Ok(Some(DateFormat::Iso)),
            "dd/mm/yyyy" | "d/m/y" | "dmy" => Ok(Some(DateFormat::DayMonthYear)),
            "mm/dd/yyyy" | "m/d/y" | "mdy" => Ok(Some(DateFormat::MonthDayYear)),
            _ => Err(MigrationError::UnknownUnit {
                header: c.source.clone(),
                target: "date".to_owned(),
                unit: text.to_owned(),
                expected: "yyyy-mm-dd, dd/mm/yyyy, mm/dd/yyyy",
            }),
        }
    }

    /// Converts a schema-1 mapping to import settings (`None` for no or an
    /// empty mapping).
    ///
    /// # Errors
    /// [`MigrationError`] for an unknown target or unit text.
    pub fn import_settings_of(
        mapping: Option<WeatherMapping>,
    ) -> Result<Option<ImportSettings>, MigrationError> {
        let Some(mapping) = mapping.filter(|m| !m.columns.is_empty()) else {
            return Ok(None);
        };
        let mut date_column = "date".to_owned();
        let mut date_format = None;
        let mut columns = Vec::new();
        for c in &mapping.columns {
            if c.target.trim().eq_ignore_ascii_case("date") {
                date_column.clone_from(&c.source);
                date_format = date_format_of(c)?;
            } else {
                columns.push(MappedColumn {
                    header: c.source.clone(),
                    quantity: quantity_of(c)?,
                });
            }
        }
        Ok(Some(ImportSettings {
            mapping: Some(ColumnMapping {
                date_column,
                columns,
            }),
            date_format,
            ..ImportSettings::default()
        }))
    }

    /// Converts a schema-1 project to the current schema.
    ///
    /// # Errors
    /// [`MigrationError`] when the weather mapping names an unknown column or
    /// unit.
    pub fn migrate(old: Project) -> Result<cur::Project, MigrationError> {
        let w = old.weather;
        Ok(cur::Project {
            schema: cur::CURRENT_SCHEMA,
            scheme: old.scheme,
            canals: old.canals,
            blocks: old.blocks,
            plantings: old.plantings,
            weather: cur::WeatherSource {
                path: w.path,
                latitude_deg: w.latitude_deg,
                elevation_m: w.elevation_m,
                wind_height_m: w.wind_height_m,
                import: import_settings_of(w.mapping)?,
            },
            reservoir: old.reservoir,
            options: old.options,
            scenarios: old.scenarios,
            user_crops: Vec::new(),
            user_soils: Vec::new(),
        })
    }
}
