//! A run's results written as one set: never a silent mix of two runs.
//!
//! A results folder may hold the user's own files beside Offtake's; only the
//! files a manifest lists belong to Offtake. Writing a set ([`write_file_set`]):
//!
//! 1. takes an exclusive lock on `DIR/.offtake-results.lock` (an OS file lock,
//!    released when the process ends, even by a kill), so two runs into one
//!    folder write one after the other, never into each other;
//! 2. completes an interrupted earlier write if its journal is there
//!    ([`recover`]), and removes staging folders that no journal names;
//! 3. writes every file of the run into a fresh, uniquely named staging folder
//!    inside DIR (`.offtake-staging-*`), synced;
//! 4. writes the journal `DIR/offtake-journal.ron` atomically: the staging
//!    folder, the new manifest, and the files of the previous manifest that
//!    this run does not write. From here the write is decided: a kill at any
//!    later step is completed by the next write or [`recover`];
//! 5. removes the previous manifest, moves each staged file into DIR,
//!    removes the previous run's files that this run does not write (only
//!    names the previous manifest lists), writes the new manifest
//!    [`MANIFEST_FILE`] (last), then removes the journal and the staging
//!    folder.
//!
//! So at any moment DIR holds either one run's complete set with its
//! manifest (each file's size and checksum listed), or a visible journal
//! saying that a write was interrupted and will be completed. Files that no
//! manifest lists are never touched.

use std::fs::File;
use std::io::{self, Read as _};
use std::path::{Component, Path, PathBuf};

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::atomic::{AtomicWriteError, kill_point, write_atomically};

/// The manifest of a results folder, written last.
pub const MANIFEST_FILE: &str = "offtake-manifest.ron";
/// The journal of a write in progress (visible on purpose: while it is there,
/// the folder may mix two runs).
pub const JOURNAL_FILE: &str = "offtake-journal.ron";
const LOCK_FILE: &str = ".offtake-results.lock";
const STAGING_PREFIX: &str = ".offtake-staging-";

/// One file of a results set.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct ManifestFile {
    /// File name inside the results folder.
    pub name: String,
    /// Size in bytes.
    pub bytes: u64,
    /// FNV-1a 64-bit checksum of the content, hexadecimal.
    pub fnv1a64: String,
}

/// What a results folder holds: one run's files and where they came from.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct Manifest {
    /// Offtake version that wrote the set.
    pub offtake_version: String,
    /// The scheme's name.
    pub scheme: String,
    /// The project file computed, when known.
    pub project_file: Option<String>,
    /// The scenario computed; `None` is the base case.
    pub scenario: Option<String>,
    /// When the set was written (UTC, RFC 3339).
    pub written_utc: String,
    /// The files of the run.
    pub files: Vec<ManifestFile>,
}

/// Who wrote a set (the manifest's header fields).
#[derive(Debug, Clone, Default)]
pub struct SetOrigin {
    /// The scheme's name.
    pub scheme: String,
    /// The project file computed, when known.
    pub project_file: Option<PathBuf>,
    /// The scenario computed; `None` is the base case.
    pub scenario: Option<String>,
}

#[derive(Debug, Serialize, Deserialize)]
struct Journal {
    staging: String,
    manifest: Manifest,
    remove: Vec<String>,
}

/// Why a results set could not be written or read.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ResultsSetError {
    /// A file-system step failed.
    #[error("{}: {what}", path.display())]
    Io {
        /// The file or folder.
        path: PathBuf,
        /// The step that failed.
        what: &'static str,
        /// The system's reason.
        #[source]
        source: io::Error,
    },
    /// An atomic write failed.
    #[error(transparent)]
    Write(#[from] AtomicWriteError),
    /// A manifest or journal is not readable.
    #[error("{}: {message}; expected an Offtake results manifest (RON)", path.display())]
    Corrupt {
        /// The file.
        path: PathBuf,
        /// What is wrong.
        message: String,
    },
    /// A file name that is not a plain name inside the folder.
    #[error(
        "results file name {name:?} is not a plain file name; expected a name such as \"design_values.csv\""
    )]
    BadName {
        /// The name.
        name: String,
    },
    /// The lock file's place holds something else (e.g. a symlink).
    #[error("{}: is not a regular file; expected Offtake's results lock (remove it)", path.display())]
    LockNotAFile {
        /// The lock path.
        path: PathBuf,
    },
}

fn io_at<'a>(path: &'a Path, what: &'static str) -> impl FnOnce(io::Error) -> ResultsSetError + 'a {
    move |source| ResultsSetError::Io {
        path: path.to_path_buf(),
        what,
        source,
    }
}

/// A writer of one file of a set: writes the content to the path it is
/// given (a path inside the staging folder).
pub type FileWriter<'a, E> = Box<dyn FnOnce(&Path) -> Result<(), E> + 'a>;

/// Writes `files` into `dir` as one set with a manifest; see the module
/// documentation. Returns the manifest written.
///
/// # Errors
/// An error of a file writer (`E`), or [`ResultsSetError`] converted into
/// `E`. Before the journal is written, an error leaves the folder as it was
/// (the staging folder is removed); after it, the next write completes it.
pub fn write_file_set<E>(
    dir: &Path,
    origin: &SetOrigin,
    files: Vec<(String, FileWriter<'_, E>)>,
) -> Result<Manifest, E>
where
    E: From<ResultsSetError>,
{
    for (name, _) in &files {
        check_name(name)?;
    }
    std::fs::create_dir_all(dir).map_err(io_at(dir, "cannot create the results folder"))?;
    let _lock = lock(dir)?;
    recover_locked(dir)?;
    let previous = read_manifest(dir).ok().flatten();
    let staging_dir = tempfile::Builder::new()
        .prefix(STAGING_PREFIX)
        .tempdir_in(dir)
        .map_err(io_at(dir, "cannot create a staging folder for the results"))?;
    let staging = staging_dir.path().to_path_buf();
    let mut listed = Vec::new();
    for (name, write) in files {
        let path = staging.join(&name);
        write(&path)?;
        listed.push(describe(&path, &name)?);
        kill_point(&format!("results:staged:{name}"));
    }
    let remove = previous
        .map(|m| {
            m.files
                .into_iter()
                .map(|f| f.name)
                .filter(|n| !listed.iter().any(|f| &f.name == n) && check_name(n).is_ok())
                .collect()
        })
        .unwrap_or_default();
    let manifest = Manifest {
        offtake_version: env!("CARGO_PKG_VERSION").to_owned(),
        scheme: origin.scheme.clone(),
        project_file: origin
            .project_file
            .as_ref()
            .map(|p| p.display().to_string()),
        scenario: origin.scenario.clone(),
        written_utc: chrono::Utc::now().to_rfc3339_opts(chrono::SecondsFormat::Secs, true),
        files: listed,
    };
    let journal = Journal {
        staging: staging
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default(),
        manifest: manifest.clone(),
        remove,
    };
    let text = format!(
        "// An Offtake run was writing this results folder and has not finished.\n\
         // Until the next `offtake run` (or export) into this folder completes it,\n\
         // the files here may mix two runs. Do not edit.\n{}\n",
        to_ron(&journal)?
    );
    // The staging folder now belongs to the journal.
    let _ = staging_dir.keep();
    write_atomically(&dir.join(JOURNAL_FILE), text.as_bytes()).map_err(ResultsSetError::from)?;
    kill_point("results:journal");
    apply(dir, &journal)?;
    Ok(manifest)
}

/// Completes an interrupted write of a results folder, if one is there.
/// Returns whether there was one.
///
/// # Errors
/// [`ResultsSetError`] when the folder cannot be locked or repaired.
pub fn recover(dir: &Path) -> Result<bool, ResultsSetError> {
    if !dir.is_dir() {
        return Ok(false);
    }
    let _lock = lock(dir)?;
    recover_locked(dir)
}

/// The manifest of a results folder; `None` when there is none.
///
/// # Errors
/// [`ResultsSetError::Corrupt`] when it cannot be read as a manifest.
pub fn read_manifest(dir: &Path) -> Result<Option<Manifest>, ResultsSetError> {
    let path = dir.join(MANIFEST_FILE);
    let text = match std::fs::read_to_string(&path) {
        Ok(t) => t,
        Err(e) if e.kind() == io::ErrorKind::NotFound => return Ok(None),
        Err(e) => return Err(io_at(&path, "cannot read the manifest")(e)),
    };
    ron::from_str(&text)
        .map(Some)
        .map_err(|e| ResultsSetError::Corrupt {
            path,
            message: e.to_string(),
        })
}

/// Whether the folder's files are exactly as its manifest lists them
/// (each present with its size and checksum). `Ok(None)` when there is no
/// manifest; a journal present means the set is not complete.
///
/// # Errors
/// As [`read_manifest`], or a file that cannot be read.
pub fn verify(dir: &Path) -> Result<Option<bool>, ResultsSetError> {
    let Some(manifest) = read_manifest(dir)? else {
        return Ok(None);
    };
    if dir.join(JOURNAL_FILE).exists() {
        return Ok(Some(false));
    }
    for f in &manifest.files {
        let path = dir.join(&f.name);
        let Ok(actual) = describe(&path, &f.name) else {
            return Ok(Some(false));
        };
        if actual != *f {
            return Ok(Some(false));
        }
    }
    Ok(Some(true))
}

fn recover_locked(dir: &Path) -> Result<bool, ResultsSetError> {
    let journal_path = dir.join(JOURNAL_FILE);
    let found = match std::fs::read_to_string(&journal_path) {
        Ok(text) => {
            let journal: Journal = ron::from_str(&text).map_err(|e| ResultsSetError::Corrupt {
                path: journal_path.clone(),
                message: e.to_string(),
            })?;
            apply(dir, &journal)?;
            true
        }
        Err(e) if e.kind() == io::ErrorKind::NotFound => false,
        Err(e) => return Err(io_at(&journal_path, "cannot read the journal")(e)),
    };
    // Staging folders no journal names: runs killed before their journal.
    if let Ok(entries) = std::fs::read_dir(dir) {
        for entry in entries.flatten() {
            let is_staging = entry
                .file_name()
                .to_str()
                .is_some_and(|n| n.starts_with(STAGING_PREFIX));
            if is_staging && entry.file_type().is_ok_and(|t| t.is_dir()) {
                let _ = std::fs::remove_dir_all(entry.path());
            }
        }
    }
    Ok(found)
}

/// Steps 5 of the module documentation; every step can be repeated.
fn apply(dir: &Path, journal: &Journal) -> Result<(), ResultsSetError> {
    check_name(&journal.staging)?;
    let staging = dir.join(&journal.staging);
    let manifest_path = dir.join(MANIFEST_FILE);
    match std::fs::remove_file(&manifest_path) {
        Err(e) if e.kind() != io::ErrorKind::NotFound => {
            return Err(io_at(&manifest_path, "cannot remove the previous manifest")(e));
        }
        _ => {}
    }
    for f in &journal.manifest.files {
        check_name(&f.name)?;
        let from = staging.join(&f.name);
        let to = dir.join(&f.name);
        if from.exists() {
            std::fs::rename(&from, &to)
                .map_err(io_at(&to, "cannot move the new file into place"))?;
        }
        kill_point(&format!("results:moved:{}", f.name));
    }
    for name in &journal.remove {
        check_name(name)?;
        let path = dir.join(name);
        if std::fs::symlink_metadata(&path).is_ok_and(|m| m.is_file()) {
            std::fs::remove_file(&path)
                .map_err(io_at(&path, "cannot remove the previous run's file"))?;
        }
    }
    kill_point("results:removed");
    let text = format!(
        "// The files of one Offtake run, written after all of them. Planning\n\
         // estimates: designs must be checked by a qualified engineer.\n{}\n",
        to_ron(&journal.manifest)?
    );
    write_atomically(&manifest_path, text.as_bytes())?;
    kill_point("results:manifest");
    let journal_path = dir.join(JOURNAL_FILE);
    std::fs::remove_file(&journal_path)
        .map_err(io_at(&journal_path, "cannot remove the journal"))?;
    if staging.is_dir() {
        let _ = std::fs::remove_dir_all(&staging);
    }
    if let Ok(d) = File::open(dir) {
        let _ = d.sync_all();
    }
    Ok(())
}

/// The lock is an OS advisory lock on a file that is never written; it is
/// released when the process ends, however it ends.
fn lock(dir: &Path) -> Result<File, ResultsSetError> {
    let path = dir.join(LOCK_FILE);
    if let Ok(meta) = std::fs::symlink_metadata(&path)
        && !meta.is_file()
    {
        return Err(ResultsSetError::LockNotAFile { path });
    }
    let file = File::options()
        .append(true)
        .create(true)
        .open(&path)
        .map_err(io_at(&path, "cannot open the results lock"))?;
    file.lock()
        .map_err(io_at(&path, "cannot lock the results folder"))?;
    Ok(file)
}

fn check_name(name: &str) -> Result<(), ResultsSetError> {
    let mut parts = Path::new(name).components();
    let plain = matches!(parts.next(), Some(Component::Normal(_))) && parts.next().is_none();
    if !plain
        || name.is_empty()
        || name == MANIFEST_FILE
        || name == JOURNAL_FILE
        || name == LOCK_FILE
    {
        return Err(ResultsSetError::BadName {
            name: name.to_owned(),
        });
    }
    Ok(())
}

fn describe(path: &Path, name: &str) -> Result<ManifestFile, ResultsSetError> {
    let mut file = File::open(path).map_err(io_at(path, "cannot read the written file"))?;
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    let mut bytes = 0u64;
    let mut buf = vec![0u8; 64 * 1024];
    loop {
        let n = file
            .read(&mut buf)
            .map_err(io_at(path, "cannot read the written file"))?;
        if n == 0 {
            break;
        }
        for b in &buf[..n] {
            hash ^= u64::from(*b);
            hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
        }
        bytes += n as u64;
    }
    Ok(ManifestFile {
        name: name.to_owned(),
        bytes,
        fnv1a64: format!("{hash:016x}"),
    })
}

fn to_ron<T: Serialize>(value: &T) -> Result<String, ResultsSetError> {
    ron::ser::to_string_pretty(value, ron::ser::PrettyConfig::new()).map_err(|e| {
        ResultsSetError::Corrupt {
            path: PathBuf::from(MANIFEST_FILE),
            message: e.to_string(),
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn writer(text: &'static str) -> FileWriter<'static, ResultsSetError> {
        Box::new(move |p: &Path| std::fs::write(p, text).map_err(io_at(p, "test write")))
    }

    fn set(dir: &Path, files: &[(&str, &'static str)]) -> Manifest {
        write_file_set(
            dir,
            &SetOrigin {
                scheme: "Test (invented)".into(),
                project_file: None,
                scenario: None,
            },
            files
                .iter()
                .map(|(n, t)| ((*n).to_owned(), writer(t)))
                .collect(),
        )
        .expect("set")
    }

    #[test]
    fn a_later_set_removes_what_only_the_earlier_manifest_listed() {
        let dir = tempfile::tempdir().expect("dir");
        std::fs::write(dir.path().join("notes.txt"), "mine").expect("seed");
        set(dir.path(), &[("a.csv", "1"), ("roster.csv", "r")]);
        let m = set(dir.path(), &[("a.csv", "2")]);
        assert!(!dir.path().join("roster.csv").exists());
        assert_eq!(
            std::fs::read_to_string(dir.path().join("a.csv")).expect("a"),
            "2"
        );
        assert_eq!(
            std::fs::read_to_string(dir.path().join("notes.txt")).expect("n"),
            "mine",
            "a file no manifest lists is never touched"
        );
        assert_eq!(m.files.len(), 1);
        assert_eq!(verify(dir.path()).expect("verify"), Some(true));
        assert!(!dir.path().join(JOURNAL_FILE).exists());
        let hidden: Vec<_> = std::fs::read_dir(dir.path())
            .expect("ls")
            .flatten()
            .filter(|e| e.file_name().to_string_lossy().starts_with(STAGING_PREFIX))
            .collect();
        assert!(hidden.is_empty(), "no staging folder is left");
    }

    #[test]
    fn a_user_file_with_a_name_the_set_never_listed_is_kept() {
        let dir = tempfile::tempdir().expect("dir");
        // The user's roster.csv was there before any Offtake run.
        std::fs::write(dir.path().join("roster.csv"), "mine").expect("seed");
        set(dir.path(), &[("a.csv", "1")]);
        set(dir.path(), &[("a.csv", "2")]);
        assert_eq!(
            std::fs::read_to_string(dir.path().join("roster.csv")).expect("r"),
            "mine"
        );
    }

    #[test]
    fn a_failing_writer_leaves_the_previous_set() {
        let dir = tempfile::tempdir().expect("dir");
        set(dir.path(), &[("a.csv", "1"), ("b.csv", "1")]);
        let fail: FileWriter<'_, ResultsSetError> =
            Box::new(|p: &Path| Err(io_at(p, "test write")(io::Error::other("disk full"))));
        let err = write_file_set(
            dir.path(),
            &SetOrigin::default(),
            vec![
                ("a.csv".to_owned(), writer("2")),
                ("b.csv".to_owned(), fail),
            ],
        )
        .expect_err("fails");
        assert!(err.to_string().contains("test write"), "{err}");
        assert_eq!(
            std::fs::read_to_string(dir.path().join("a.csv")).expect("a"),
            "1"
        );
        assert_eq!(verify(dir.path()).expect("verify"), Some(true));
    }

    #[test]
    fn a_hostile_manifest_cannot_remove_files_outside_the_folder() {
        let outer = tempfile::tempdir().expect("dir");
        let dir = outer.path().join("results");
        set(&dir, &[("a.csv", "1")]);
        std::fs::write(outer.path().join("precious.txt"), "keep").expect("seed");
        let mut m = read_manifest(&dir).expect("read").expect("some");
        m.files.push(ManifestFile {
            name: "../precious.txt".into(),
            bytes: 4,
            fnv1a64: String::new(),
        });
        std::fs::write(dir.join(MANIFEST_FILE), to_ron(&m).expect("ron")).expect("write");
        set(&dir, &[("a.csv", "2")]);
        assert!(outer.path().join("precious.txt").exists());
    }

    #[test]
    fn names_with_folders_are_refused() {
        assert!(check_name("a/b.csv").is_err());
        assert!(check_name("..").is_err());
        assert!(check_name(MANIFEST_FILE).is_err());
        assert!(check_name("design_values.csv").is_ok());
    }

    #[test]
    fn checksum_is_fnv1a64() {
        // FNV-1a 64-bit test vector: "a" -> af63dc4c8601ec8c (Fowler, Noll,
        // Vo, "FNV hash", IETF draft-eastlake-fnv, test vectors).
        let dir = tempfile::tempdir().expect("dir");
        let p = dir.path().join("a");
        std::fs::write(&p, "a").expect("seed");
        assert_eq!(describe(&p, "a").expect("d").fnv1a64, "af63dc4c8601ec8c");
    }
}
