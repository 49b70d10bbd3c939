//! The open document: the project, where it lives on disk, and whether it
//! has changed since it was last saved.

use std::path::PathBuf;

use offtake_core::project::Project;

/// A project open in the window.
#[derive(Debug, Clone)]
pub struct OpenDocument {
    /// The project being edited.
    pub project: Project,
    /// The file it was opened from or last saved to.
    pub path: Option<PathBuf>,
    /// The project as last saved (or opened); `None` if never saved.
    saved: Option<Project>,
}

impl OpenDocument {
    /// A new, never saved project.
    pub fn new(project: Project) -> Self {
        Self {
            project,
            path: None,
            saved: None,
        }
    }

    /// A project read from `path`.
    pub fn opened(project: Project, path: PathBuf) -> Self {
        Self {
            saved: Some(project.clone()),
            project,
            path: Some(path),
        }
    }

    /// Unsaved work restored after a crash, belonging to the file at `path`
    /// (if it had one): changed, not saved, and relative paths resolve
    /// against `path`.
    pub fn restored(project: Project, path: Option<PathBuf>) -> Self {
        Self {
            project,
            path,
            saved: None,
        }
    }

    /// Records that the project was written to `path`.
    pub fn mark_saved(&mut self, path: PathBuf) {
        self.saved = Some(self.project.clone());
        self.path = Some(path);
    }

    /// Whether there are changes not written to a file.
    pub fn is_dirty(&self) -> bool {
        self.saved.as_ref() != Some(&self.project)
    }

    /// Whether the project was ever saved.
    pub fn has_file(&self) -> bool {
        self.path.is_some()
    }
}
