//! Runtime state: everything about the session that is not the document.
//!
//! Saved projects never contain any of this; it is rebuilt on start.

use std::path::PathBuf;

use crate::command::{HelpWindow, PanelKind, Selection, Tab};

/// Which help windows are open.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct HelpWindows {
    /// Methods and sources.
    pub methods: bool,
    /// Cautions.
    pub cautions: bool,
    /// About.
    pub about: bool,
}

impl HelpWindows {
    /// Opens one window.
    pub fn open(&mut self, which: HelpWindow) {
        match which {
            HelpWindow::Methods => self.methods = true,
            HelpWindow::Cautions => self.cautions = true,
            HelpWindow::About => self.about = true,
        }
    }
}

/// Which panels are shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Panels {
    /// Left: scheme tree, libraries, weather.
    pub tree: bool,
    /// Right: inspector.
    pub inspector: bool,
    /// Bottom: status bar.
    pub status_bar: bool,
}

impl Default for Panels {
    fn default() -> Self {
        Self {
            tree: true,
            inspector: true,
            status_bar: true,
        }
    }
}

impl Panels {
    /// Flips one panel.
    pub fn toggle(&mut self, which: PanelKind) {
        let flag = match which {
            PanelKind::Tree => &mut self.tree,
            PanelKind::Inspector => &mut self.inspector,
            PanelKind::StatusBar => &mut self.status_bar,
        };
        *flag = !*flag;
    }
}

/// Where the background recomputation is, as the status bar shows it.
#[derive(Debug, Clone, PartialEq)]
pub enum RecomputeStatus {
    /// No project is open, nothing to compute.
    NothingToCompute,
    /// Waiting for the edit burst to end, or computing.
    Running,
    /// The last computation finished in this many milliseconds.
    Done {
        /// Wall time of the computation (ms).
        elapsed_ms: f64,
    },
    /// The computation stopped unexpectedly; results are those of the last run.
    Stopped,
}

/// What waits for the user to agree to discard unsaved changes.
#[derive(Debug, Clone, PartialEq)]
pub enum Discard {
    /// Closing the window.
    Close,
    /// New, Open or Open recent.
    Command(Box<crate::command::Command>),
}

/// The session state beside the document.
#[derive(Debug, Clone, PartialEq)]
pub struct RuntimeState {
    /// The workspace tab shown in the centre.
    pub tab: Tab,
    /// The selected tree item.
    pub selection: Selection,
    /// Open help windows.
    pub help: HelpWindows,
    /// Shown panels.
    pub panels: Panels,
    /// The last message for the user (file saved, nothing to undo…).
    pub message: Option<String>,
    /// Recently opened project files, newest first.
    pub recent: Vec<PathBuf>,
    /// Background computation.
    pub recompute: RecomputeStatus,
    /// Number of data warnings in the last results.
    pub warning_count: usize,
    /// Validation errors that stopped the last computation (the results
    /// shown are the last good ones, out of date).
    pub error_count: usize,
    /// A pending "discard unsaved changes?" question.
    pub confirm_discard: Option<Discard>,
    /// Year of the season the Water balance and Crop curves tabs show
    /// (`None` = the headworks design year).
    pub season_year: Option<i32>,
    /// The scenario whose results the tabs show (`None` = the base plan).
    pub scenario: Option<String>,
}

impl Default for RuntimeState {
    fn default() -> Self {
        Self {
            tab: Tab::default(),
            selection: Selection::default(),
            help: HelpWindows::default(),
            panels: Panels::default(),
            message: None,
            recent: Vec::new(),
            recompute: RecomputeStatus::NothingToCompute,
            warning_count: 0,
            error_count: 0,
            confirm_discard: None,
            season_year: None,
            scenario: None,
        }
    }
}
