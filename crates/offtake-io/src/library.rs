//! The crop and soil libraries: the built-in files shipped in
//! `assets/library/` (compiled in with `include_str!`) and user library files
//! that sit beside them.
//!
//! Both are RON lists of entries (see `assets/library/crops.ron`). A user
//! entry with the same id as a built-in one replaces it. Every parse error
//! reports `file:line:column: what was found, what was expected`.

use std::path::{Path, PathBuf};

use offtake_core::crop::Crop;
use offtake_core::soil::Soil;
use serde::de::DeserializeOwned;
use thiserror::Error;

/// Text of the built-in crop library.
pub const BUILTIN_CROPS_RON: &str = include_str!("../../../assets/library/crops.ron");
/// Text of the built-in soil library.
pub const BUILTIN_SOILS_RON: &str = include_str!("../../../assets/library/soils.ron");
/// Name under which built-in crop errors are reported.
pub const BUILTIN_CROPS_NAME: &str = "<built-in>/crops.ron";
/// Name under which built-in soil errors are reported.
pub const BUILTIN_SOILS_NAME: &str = "<built-in>/soils.ron";

/// Errors while reading a library.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum LibraryError {
    /// The file could not be read.
    #[error("{file}: cannot read library file: {source}")]
    Io {
        /// File name.
        file: String,
        /// Underlying error.
        #[source]
        source: std::io::Error,
    },
    /// The text is not a valid library in RON.
    #[error("{file}:{line}:{column}: {message}")]
    Parse {
        /// File name.
        file: String,
        /// 1-based line.
        line: usize,
        /// 1-based column.
        column: usize,
        /// What was found and what was expected.
        message: String,
    },
    /// An entry parsed but its values are inconsistent.
    #[error("{file}: entry '{id}': {reason}")]
    Invalid {
        /// File name.
        file: String,
        /// Entry id.
        id: String,
        /// What is wrong.
        reason: String,
    },
    /// Two entries of one file share an id, or an id is not short lowercase.
    #[error("{file}: entry id '{id}': {reason}")]
    BadId {
        /// File name.
        file: String,
        /// The id.
        id: String,
        /// What is wrong.
        reason: &'static str,
    },
}

fn parse_list<T: DeserializeOwned>(text: &str, file: &str) -> Result<Vec<T>, LibraryError> {
    ron::from_str::<Vec<T>>(text).map_err(|e| LibraryError::Parse {
        file: file.to_owned(),
        line: e.span.start.line,
        column: e.span.start.col,
        message: e.code.to_string(),
    })
}

fn check_ids<'a>(ids: impl Iterator<Item = &'a str>, file: &str) -> Result<(), LibraryError> {
    let mut seen = std::collections::HashSet::new();
    for id in ids {
        let ok = !id.is_empty()
            && id.len() <= 40
            && id
                .chars()
                .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '-');
        if !ok {
            return Err(LibraryError::BadId {
                file: file.to_owned(),
                id: id.to_owned(),
                reason: "expected 1-40 characters of lowercase letters, digits and '-'",
            });
        }
        if !seen.insert(id) {
            return Err(LibraryError::BadId {
                file: file.to_owned(),
                id: id.to_owned(),
                reason: "the id appears more than once in this file",
            });
        }
    }
    Ok(())
}

/// Parses and validates a crop library text. `file` names it in errors.
///
/// # Errors
/// [`LibraryError::Parse`] with line and column, [`LibraryError::BadId`], or
/// [`LibraryError::Invalid`] for an entry whose values are inconsistent.
pub fn parse_crops(text: &str, file: &str) -> Result<Vec<Crop>, LibraryError> {
    let crops: Vec<Crop> = parse_list(text, file)?;
    check_ids(crops.iter().map(|c| c.id.as_str()), file)?;
    for c in &crops {
        c.validate().map_err(|e| LibraryError::Invalid {
            file: file.to_owned(),
            id: c.id.clone(),
            reason: e.to_string(),
        })?;
    }
    Ok(crops)
}

/// Parses and validates a soil library text. `file` names it in errors.
///
/// # Errors
/// As [`parse_crops`].
pub fn parse_soils(text: &str, file: &str) -> Result<Vec<Soil>, LibraryError> {
    let soils: Vec<Soil> = parse_list(text, file)?;
    check_ids(soils.iter().map(|s| s.id.as_str()), file)?;
    for s in &soils {
        s.validate().map_err(|e| LibraryError::Invalid {
            file: file.to_owned(),
            id: s.id.clone(),
            reason: e.to_string(),
        })?;
    }
    Ok(soils)
}

/// The built-in crop library.
///
/// # Errors
/// Only if the shipped file is broken (a test guards against it).
pub fn builtin_crops() -> Result<Vec<Crop>, LibraryError> {
    parse_crops(BUILTIN_CROPS_RON, BUILTIN_CROPS_NAME)
}

/// The built-in soil library.
///
/// # Errors
/// Only if the shipped file is broken (a test guards against it).
pub fn builtin_soils() -> Result<Vec<Soil>, LibraryError> {
    parse_soils(BUILTIN_SOILS_RON, BUILTIN_SOILS_NAME)
}

fn read(path: &Path) -> Result<String, LibraryError> {
    std::fs::read_to_string(path).map_err(|source| LibraryError::Io {
        file: path.display().to_string(),
        source,
    })
}

/// Replaces entries with the same id, appends new ones, keeping order.
fn merge<T>(base: &mut Vec<T>, extra: Vec<T>, id: impl Fn(&T) -> &str) {
    for item in extra {
        if let Some(pos) = base.iter().position(|b| id(b) == id(&item)) {
            base[pos] = item;
        } else {
            base.push(item);
        }
    }
}

/// A crop and a soil library: the built-in entries, overlaid by user files.
#[derive(Debug, Clone, PartialEq)]
pub struct Libraries {
    /// Crops, built-in first, user entries replacing those with the same id.
    pub crops: Vec<Crop>,
    /// Soils, likewise.
    pub soils: Vec<Soil>,
}

impl Libraries {
    /// The built-in libraries only.
    ///
    /// # Errors
    /// As [`builtin_crops`].
    pub fn builtin() -> Result<Self, LibraryError> {
        Ok(Self {
            crops: builtin_crops()?,
            soils: builtin_soils()?,
        })
    }

    /// Built-in libraries overlaid with user crop and soil files, in order.
    ///
    /// # Errors
    /// The first file that cannot be read, parsed or validated.
    pub fn with_user_files(
        crop_files: &[PathBuf],
        soil_files: &[PathBuf],
    ) -> Result<Self, LibraryError> {
        let mut libs = Self::builtin()?;
        for p in crop_files {
            let extra = parse_crops(&read(p)?, &p.display().to_string())?;
            merge(&mut libs.crops, extra, |c| c.id.as_str());
        }
        for p in soil_files {
            let extra = parse_soils(&read(p)?, &p.display().to_string())?;
            merge(&mut libs.soils, extra, |s| s.id.as_str());
        }
        Ok(libs)
    }

    /// These libraries with `crops` and `soils` laid over them: an entry
    /// replaces the one with the same id, new ids are appended (in order).
    #[must_use]
    pub fn overlaid(&self, crops: &[Crop], soils: &[Soil]) -> Self {
        let mut libs = self.clone();
        merge(&mut libs.crops, crops.to_vec(), |c| c.id.as_str());
        merge(&mut libs.soils, soils.to_vec(), |s| s.id.as_str());
        libs
    }

    /// The libraries a project computes with: these, overlaid by the
    /// project's own crops and soils (`Project::user_crops`, `user_soils`).
    #[must_use]
    pub fn for_project(&self, project: &offtake_core::project::Project) -> Self {
        self.overlaid(&project.user_crops, &project.user_soils)
    }

    /// The crop with this id.
    pub fn crop(&self, id: &str) -> Option<&Crop> {
        self.crops.iter().find(|c| c.id == id)
    }

    /// Display name of a crop id ("Maize, field (grain)"), or the id itself
    /// when the library does not know it.
    pub fn crop_name<'a>(&'a self, id: &'a str) -> &'a str {
        self.crop(id).map_or(id, |c| c.name.as_str())
    }

    /// The soil with this id.
    pub fn soil(&self, id: &str) -> Option<&Soil> {
        self.soils.iter().find(|s| s.id == id)
    }
}
