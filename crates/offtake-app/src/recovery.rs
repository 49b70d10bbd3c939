//! Autosave to a recovery file and the offer to restore it after a crash.
//!
//! While the project has unsaved changes, the app writes it (atomically,
//! through offtake-io) to one recovery file at most every
//! [`AUTOSAVE_INTERVAL`]. Saving the project, discarding the changes or
//! closing normally removes the file. If the file is still there when the
//! app starts, the previous session ended without saving, and the app offers
//! to restore it.
//!
//! The project's own path is kept beside the recovery file (`recovery.path`,
//! one line), so a restored project still resolves its relative weather path
//! and File › Save writes back to where it came from.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use offtake_core::project::Project;

/// Time between two autosaves of a project with unsaved changes.
pub const AUTOSAVE_INTERVAL: Duration = Duration::from_secs(30);

/// The default recovery file: `$XDG_STATE_HOME/offtake/recovery.ron`,
/// `~/.local/state/offtake/recovery.ron`, `%LOCALAPPDATA%\offtake\recovery.ron`,
/// or the temporary folder.
pub fn default_recovery_path() -> PathBuf {
    let base = std::env::var_os("XDG_STATE_HOME")
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("LOCALAPPDATA").map(PathBuf::from))
        .or_else(|| std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".local/state")))
        .unwrap_or_else(std::env::temp_dir);
    base.join("offtake").join("recovery.ron")
}

/// The autosave state.
#[derive(Debug, Clone)]
pub struct Recovery {
    path: PathBuf,
    last_write: Option<Instant>,
}

impl Recovery {
    /// Autosave to `path`.
    pub fn new(path: PathBuf) -> Self {
        Self {
            path,
            last_write: None,
        }
    }

    /// The recovery file.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// Whether a recovery file from an earlier session exists.
    pub fn exists(&self) -> bool {
        self.path.is_file()
    }

    /// Writes `project` if the interval has passed (or `force`).
    ///
    /// # Errors
    /// The file error, as text for the status line.
    pub fn write_if_due(
        &mut self,
        project: &Project,
        project_path: Option<&Path>,
        now: Instant,
        force: bool,
    ) -> Result<bool, String> {
        let due = force
            || self
                .last_write
                .is_none_or(|t| now.duration_since(t) >= AUTOSAVE_INTERVAL);
        if !due {
            return Ok(false);
        }
        if let Some(dir) = self.path.parent() {
            std::fs::create_dir_all(dir).map_err(|e| format!("{}: {e}", dir.display()))?;
        }
        // The path first: a recovery file never names another project's path.
        let path_file = self.path_file();
        match project_path {
            Some(p) => {
                let absolute = std::path::absolute(p).unwrap_or_else(|_| p.to_path_buf());
                let line = format!("{}\n", absolute.display());
                offtake_io::atomic::write_atomically(&path_file, line.as_bytes())
                    .map_err(|e| e.to_string())?;
            }
            None => {
                let _ = std::fs::remove_file(&path_file);
            }
        }
        offtake_io::project_file::save_project(&self.path, project).map_err(|e| e.to_string())?;
        self.last_write = Some(now);
        Ok(true)
    }

    /// Removes the recovery file (and its backup) after a save or discard.
    pub fn clear(&mut self) {
        // A missing file is the normal case.
        let _ = std::fs::remove_file(&self.path);
        let _ = std::fs::remove_file(offtake_io::project_file::backup_path(&self.path));
        let _ = std::fs::remove_file(self.path_file());
        self.last_write = None;
    }

    /// Reads the recovery file and the project's path, if it had one.
    ///
    /// # Errors
    /// The read or parse error with its position.
    pub fn read(&self) -> Result<(Project, Option<PathBuf>), String> {
        let project =
            offtake_io::project_file::load_project(&self.path).map_err(|e| e.to_string())?;
        let path = std::fs::read_to_string(self.path_file())
            .ok()
            .map(|t| t.trim_end_matches(['\r', '\n']).to_owned())
            .filter(|t| !t.is_empty())
            .map(PathBuf::from);
        Ok((project, path))
    }

    /// The file beside the recovery file that names the project's path.
    pub fn path_file(&self) -> PathBuf {
        self.path.with_extension("path")
    }
}
