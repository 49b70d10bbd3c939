//! [`OfftakeApp`]: the window, its panels, and the end-of-frame command loop.
//!
//! Each frame: keyboard shortcuts and views push [`Command`]s onto a list;
//! after everything is drawn, [`OfftakeApp::apply`] runs them in order.
//! Document edits go through the undo history; results come from the
//! background worker and are cached, never computed inside a frame.

use std::sync::Arc;
use std::sync::mpsc::{self, Receiver, Sender};
use std::time::{Duration, Instant};

use egui::{Key, KeyboardShortcut, Modifiers, Ui};
use offtake_core::project::Project;
use offtake_io::library::Libraries;

use crate::command::{Command, HelpWindow, ItemRef, PanelKind, Selection};
use crate::compute::{ComputeFn, Computed, SeasonRequest, Snapshot};
use crate::document::OpenDocument;
use crate::edit::DocEdit;
use crate::history::History;
use crate::menu::MenuInfo;
use crate::recovery::Recovery;
use crate::state::{Discard, RecomputeStatus, RuntimeState};
use crate::status::SaveState;
use crate::tabs::{Tabs, View};
use crate::worker::{Worker, WorkerState};
use crate::{help, inspector, menu, status, tree};

/// The invented demo scheme of the repository.
pub const DEMO_PROJECT: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../demo-projects/demo-scheme/scheme.ron"
);

/// Quiet time after the last edit before recomputing.
pub const DEFAULT_DEBOUNCE: Duration = Duration::from_millis(150);

/// Ctrl+S: save.
pub const SAVE: KeyboardShortcut = KeyboardShortcut::new(Modifiers::COMMAND, Key::S);
/// Ctrl+O: open.
pub const OPEN: KeyboardShortcut = KeyboardShortcut::new(Modifiers::COMMAND, Key::O);
/// Ctrl+Z: undo.
pub const UNDO: KeyboardShortcut = KeyboardShortcut::new(Modifiers::COMMAND, Key::Z);
/// Ctrl+Shift+Z: redo.
pub const REDO: KeyboardShortcut = KeyboardShortcut::new(
    Modifiers {
        alt: false,
        ctrl: false,
        shift: true,
        mac_cmd: false,
        command: true,
    },
    Key::Z,
);
/// F1: help (Methods and sources).
pub const HELP: KeyboardShortcut = KeyboardShortcut::new(Modifiers::NONE, Key::F1);
/// Delete: remove the selected tree item.
pub const DELETE: KeyboardShortcut = KeyboardShortcut::new(Modifiers::NONE, Key::Delete);

/// A plot image waiting for the user to pick a file.
struct PendingImage {
    file_name: String,
    image: egui::ColorImage,
}

/// The desktop application: the document (once open), runtime state, cached
/// results and the handles of background work.
pub struct OfftakeApp {
    /// Crop and soil libraries (built-in FAO-56 tables).
    pub libraries: Arc<Libraries>,
    /// The open project, if any.
    pub document: Option<OpenDocument>,
    /// Undo/redo of document edits.
    pub history: History<DocEdit>,
    /// Session state: tab, selection, windows, panels, messages.
    pub state: RuntimeState,
    /// Background recomputation.
    worker: Worker<Snapshot, Computed>,
    /// View state of the workspace tabs.
    pub tabs: Tabs,
    /// Results of the last finished computation.
    pub computed: Option<Computed>,
    /// Commands recorded this frame, applied at its end.
    commands: Vec<Command>,
    /// Screenshots cropped to a plot arrive here from the renderer.
    images_tx: Sender<PendingImage>,
    images_rx: Receiver<PendingImage>,
    /// Where file and folder choices come from (native dialogs, or answers
    /// given in advance in headless tests).
    prompt: crate::prompt::FilePrompt,
    /// The user confirmed closing with unsaved changes.
    closing: bool,
    /// Autosave to a recovery file (off when `None`).
    recovery: Option<Recovery>,
    /// A recovery file from an earlier session waits for the user's answer.
    offer_recovery: bool,
    /// The weather import window, while open.
    pub import: Option<crate::import::ImportJob>,
    /// The crop and soil library window.
    pub library_editor: crate::library_editor::LibraryEditor,
    /// What the last request asked of the worker besides the project: the
    /// season, and whether to compare the scenarios.
    requested: (Option<SeasonRequest>, bool),
    /// A running export of the result tables.
    export_job: Option<Receiver<ExportOutcome>>,
    /// The scenario editor window (see [`crate::scenario_editor`]).
    pub scenario_editor: crate::scenario_editor::ScenarioEditor,
}

/// The folder an export wrote to and the files written, or why it failed.
type ExportOutcome = (std::path::PathBuf, Result<Vec<String>, String>);

impl std::fmt::Debug for OfftakeApp {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("OfftakeApp")
            .field("state", &self.state)
            .finish_non_exhaustive()
    }
}

impl Default for OfftakeApp {
    fn default() -> Self {
        Self::new()
    }
}

impl OfftakeApp {
    /// A new window with no project open.
    pub fn new() -> Self {
        let (libraries, problem) = match Libraries::builtin() {
            Ok(l) => (l, None),
            Err(e) => (
                Libraries {
                    crops: Vec::new(),
                    soils: Vec::new(),
                },
                Some(format!(
                    "The built-in crop and soil libraries could not be read: {e}"
                )),
            ),
        };
        let libs = Arc::new(libraries);
        let for_worker = Arc::clone(&libs);
        let mut app = Self::with_compute(
            DEFAULT_DEBOUNCE,
            crate::compute::default_compute(for_worker),
        );
        app.libraries = libs;
        app.state.message = problem;
        app
    }

    /// A new window whose worker runs `compute` on a snapshot of the project
    /// after each burst of edits (`debounce` of quiet time). This is where the
    /// computation chain plugs in.
    pub fn with_compute(debounce: Duration, compute: ComputeFn) -> Self {
        let (images_tx, images_rx) = mpsc::channel();
        Self {
            libraries: Arc::new(Libraries {
                crops: Vec::new(),
                soils: Vec::new(),
            }),
            document: None,
            history: History::default(),
            worker: Worker::spawn(debounce, compute),
            state: RuntimeState::default(),
            tabs: Tabs::default(),
            computed: None,
            commands: Vec::new(),
            images_tx,
            images_rx,
            prompt: crate::prompt::FilePrompt::Native,
            closing: false,
            recovery: None,
            offer_recovery: false,
            import: None,
            library_editor: crate::library_editor::LibraryEditor::default(),
            requested: (None, false),
            export_job: None,
            scenario_editor: crate::scenario_editor::ScenarioEditor::default(),
        }
    }

    /// Turns native file dialogs off (headless tests): commands that need a
    /// file take the answers given with [`Self::answer_next`], in order, and
    /// report "File dialogs are off" when none is left.
    #[must_use]
    pub fn without_dialogs(mut self) -> Self {
        self.prompt = crate::prompt::FilePrompt::scripted([]);
        self
    }

    /// Gives the answer to the next file or folder question in advance (the
    /// path a user would pick in the dialog). Turns native dialogs off.
    pub fn answer_next(&mut self, path: impl Into<std::path::PathBuf>) {
        self.prompt.push(path.into());
    }

    /// Asks for a file or folder; `None` when cancelled or headless with no
    /// answer left (then the status line says so).
    fn ask(&mut self, ask: &crate::prompt::Ask) -> Option<std::path::PathBuf> {
        match self.prompt.ask(ask) {
            Ok(path) => Some(path),
            Err(crate::prompt::NoAnswer::Cancelled) => None,
            Err(crate::prompt::NoAnswer::NoDialogs) => {
                self.state.message = Some("File dialogs are off".to_owned());
                None
            }
        }
    }

    /// Autosaves unsaved work to `path`; if the file is already there (an
    /// earlier session ended without saving), offers to restore it.
    #[must_use]
    pub fn with_recovery_file(mut self, path: std::path::PathBuf) -> Self {
        let r = Recovery::new(path);
        self.offer_recovery = r.exists();
        self.recovery = Some(r);
        self
    }

    /// Writes the recovery file now if there are unsaved changes.
    pub fn autosave_now(&mut self) {
        self.autosave(true);
    }

    fn autosave(&mut self, force: bool) {
        if self.offer_recovery {
            // Never overwrite an earlier session's work before the user answers.
            return;
        }
        let (Some(r), Some(doc)) = (self.recovery.as_mut(), self.document.as_ref()) else {
            return;
        };
        if !doc.is_dirty() {
            return;
        }
        if let Err(e) = r.write_if_due(&doc.project, doc.path.as_deref(), Instant::now(), force) {
            self.state.message = Some(format!("Autosave failed: {e}"));
        }
    }

    fn clear_recovery(&mut self) {
        if !self.offer_recovery
            && let Some(r) = self.recovery.as_mut()
        {
            r.clear();
        }
    }

    fn recovery_window(&mut self, ctx: &egui::Context) {
        if !self.offer_recovery {
            return;
        }
        let mut answer = None;
        egui::Window::new("Restore unsaved work?")
            .collapsible(false)
            .resizable(false)
            .show(ctx, |ui| {
                ui.label(
                    "The last session ended with unsaved changes. Restore them as an unsaved project?",
                );
                ui.horizontal(|ui| {
                    if ui.button("Restore").clicked() {
                        answer = Some(true);
                    }
                    if ui.button("Discard the recovered work").clicked() {
                        answer = Some(false);
                    }
                });
            });
        let Some(restore) = answer else { return };
        self.offer_recovery = false;
        if restore {
            let read = self.recovery.as_ref().map(Recovery::read);
            match read {
                Some(Ok((project, path))) => {
                    self.state.message = Some(path.as_ref().map_or_else(
                        || "Restored unsaved work — save it with File › Save as…".to_owned(),
                        |p| {
                            format!(
                                "Restored unsaved work of {} — save it with File › Save",
                                p.display()
                            )
                        },
                    ));
                    self.set_document(OpenDocument::restored(project, path));
                    // Keep the file until the restored work is saved again.
                    self.autosave(true);
                }
                Some(Err(e)) => self.state.message = Some(format!("Could not restore: {e}")),
                None => {}
            }
        } else {
            self.clear_recovery();
        }
    }

    /// Queues a command as if a view had pushed it; it runs at the end of the next frame.
    pub fn push(&mut self, command: Command) {
        self.commands.push(command);
    }

    fn project_open(&self) -> bool {
        self.document.is_some()
    }

    /// The open project, if any.
    pub fn project(&self) -> Option<&Project> {
        self.document.as_ref().map(|d| &d.project)
    }

    /// Opens `project` as a new, unsaved document (clears the history and
    /// schedules a recompute).
    pub fn open_project(&mut self, project: Project) {
        self.set_document(OpenDocument::new(project));
    }

    fn set_document(&mut self, doc: OpenDocument) {
        self.document = Some(doc);
        self.history.clear();
        self.state.selection = Selection::Scheme;
        self.request_recompute();
    }

    fn request_recompute(&mut self) {
        if let Some(doc) = &self.document {
            let snapshot = Snapshot {
                project: doc.project.clone(),
                project_path: doc.path.clone(),
                season: self.season_request(),
                scenario: self.state.scenario.clone(),
                compare: self.state.tab == crate::command::Tab::Compare,
            };
            self.requested = (snapshot.season.clone(), snapshot.compare);
            self.worker.request(snapshot, Instant::now());
            self.state.recompute = RecomputeStatus::Running;
        }
    }

    /// Blocks until the background computation settles (at most `timeout`)
    /// and takes its results. For tests and scripted screenshots; the UI
    /// itself never waits.
    pub fn wait_for_recompute(&mut self, timeout: Duration) {
        if let Some(done) = self.worker.wait(timeout) {
            self.take_results(done);
        }
        self.sync_worker_state();
    }

    fn take_results(&mut self, done: crate::worker::Finished<Computed>) {
        self.state.warning_count = done.output.warnings.len();
        self.state.error_count = done.output.out_of_date.len();
        self.computed = Some(done.output);
        self.state.recompute = RecomputeStatus::Done {
            elapsed_ms: done.elapsed_ms,
        };
    }

    fn sync_worker_state(&mut self) {
        match self.worker.state() {
            WorkerState::Running | WorkerState::Waiting => {
                self.state.recompute = RecomputeStatus::Running;
            }
            WorkerState::Stopped => self.state.recompute = RecomputeStatus::Stopped,
            WorkerState::Idle => {
                if self.document.is_none() {
                    self.state.recompute = RecomputeStatus::NothingToCompute;
                }
            }
        }
    }

    fn poll_worker(&mut self, ctx: &egui::Context) {
        let now = Instant::now();
        if let Some(done) = self.worker.poll(now) {
            self.take_results(done);
        }
        self.sync_worker_state();
        if let Some(wait) = self.worker.next_poll_in(now) {
            ctx.request_repaint_after(wait.max(Duration::from_millis(5)));
        }
    }

    fn save_state(&self) -> SaveState {
        match &self.document {
            None => SaveState::NoProject,
            Some(d) if !d.has_file() => SaveState::NotSaved,
            Some(d) if d.is_dirty() => SaveState::Unsaved,
            Some(_) => SaveState::Saved,
        }
    }

    /// Draws one frame of the whole window, then applies the frame's commands.
    pub fn ui(&mut self, ui: &mut Ui) {
        self.shortcuts(ui);
        self.receive_images();
        self.poll_export(ui.ctx());
        self.poll_worker(ui.ctx());
        let mut commands = std::mem::take(&mut self.commands);
        let project_open = self.project_open();
        let project = self.document.as_ref().map(|d| &d.project);
        // Pickers and the tree see the project's own crops and soils over the library.
        let libraries: std::borrow::Cow<'_, Libraries> = match project {
            Some(p) if !p.user_crops.is_empty() || !p.user_soils.is_empty() => {
                std::borrow::Cow::Owned(self.libraries.for_project(p))
            }
            _ => std::borrow::Cow::Borrowed(&*self.libraries),
        };

        egui::Panel::top("menu").show(ui, |ui| {
            let info = MenuInfo {
                project_open,
                undo: self.history.undo_label(),
                redo: self.history.redo_label(),
            };
            menu::ui(ui, &self.state, info, &mut commands);
        });
        if self.state.panels.status_bar {
            egui::Panel::bottom("status").show(ui, |ui| {
                status::ui(ui, &self.state, self.save_state(), &mut commands);
            });
        }
        if self.state.panels.tree {
            egui::Panel::left("tree")
                .resizable(true)
                .default_size(260.0)
                .show(ui, |ui| {
                    egui::ScrollArea::vertical().show(ui, |ui| {
                        tree::ui(
                            ui,
                            project,
                            &libraries,
                            &self.state.selection,
                            &mut commands,
                        );
                    });
                });
        }
        if self.state.panels.inspector {
            egui::Panel::right("inspector")
                .resizable(true)
                .default_size(300.0)
                .show(ui, |ui| {
                    egui::ScrollArea::vertical().show(ui, |ui| {
                        let ctx = inspector::Context {
                            libraries: &libraries,
                            problems: self.computed.as_ref().map_or(&[][..], |c| &c.warnings[..]),
                            outlets: self
                                .computed
                                .as_ref()
                                .and_then(|c| c.engine.as_ref())
                                .and_then(|e| e.as_ref().ok())
                                .map_or(&[][..], |r| &r.results.outlets[..]),
                        };
                        inspector::ui(ui, project, &self.state.selection, &ctx, &mut commands);
                    });
                });
        }
        egui::CentralPanel::default().show(ui, |ui| {
            if let Some(p) = project {
                ui.horizontal(|ui| {
                    ui.label(format!(
                        "Selection: {}",
                        tree::breadcrumb(p, &self.state.selection).join(" › ")
                    ));
                    if let Some(name) = &self.state.scenario {
                        ui.separator();
                        ui.label(
                            egui::RichText::new(format!("Results of scenario {name}"))
                                .color(ui.visuals().warn_fg_color),
                        );
                    }
                });
            }
            let view = View {
                project_open,
                project,
                selection: &self.state.selection,
                computed: self.computed.as_ref(),
                scenario: self.state.scenario.as_deref(),
                libraries: &libraries,
            };
            self.tabs.ui(ui, self.state.tab, &view, &mut commands);
        });
        crate::scenario_editor::window(
            ui.ctx(),
            &mut self.scenario_editor,
            project,
            &libraries,
            crate::scenario_editor::Results {
                computed: self.computed.as_ref(),
                recomputing: self.state.recompute == RecomputeStatus::Running,
                shown: self.state.scenario.as_deref(),
            },
            &mut commands,
        );
        self.help_windows(ui.ctx());
        self.discard_guard(ui.ctx());
        self.recovery_window(ui.ctx());
        self.import_window(ui.ctx());
        self.library_window(ui.ctx(), &mut commands);

        commands.append(&mut self.commands);
        if !commands.is_empty() {
            // Show the effect of the commands in the next frame.
            ui.ctx().request_repaint();
        }
        for command in commands {
            self.apply(command, ui.ctx());
        }
        // A new selection or season year: ask the worker for that season's
        // balance (the engine results are reused from its cache).
        let wants_compare = self.state.tab == crate::command::Tab::Compare;
        if self.season_request() != self.requested.0 || (wants_compare && !self.requested.1) {
            self.request_recompute();
        }
        self.autosave(false);
    }

    /// Reads the keyboard shortcuts into commands. Undo, redo and Delete are
    /// left to a text field that has the keyboard focus.
    fn shortcuts(&mut self, ui: &Ui) {
        let typing = ui.ctx().egui_wants_keyboard_input();
        ui.input_mut(|i| {
            if i.consume_shortcut(&SAVE) {
                self.commands.push(Command::Save);
            }
            if i.consume_shortcut(&OPEN) {
                self.commands.push(Command::OpenProject);
            }
            if i.consume_shortcut(&HELP) {
                self.commands.push(Command::ShowHelp(HelpWindow::Methods));
            }
            if !typing {
                // Ctrl+Shift+Z before Ctrl+Z: the latter also matches with Shift held.
                if i.consume_shortcut(&REDO) {
                    self.commands.push(Command::Redo);
                }
                if i.consume_shortcut(&UNDO) {
                    self.commands.push(Command::Undo);
                }
                if i.consume_shortcut(&DELETE) {
                    self.commands.push(Command::DeleteSelected);
                }
            }
        });
    }

    fn help_windows(&mut self, ctx: &egui::Context) {
        egui::Window::new("Methods and sources")
            .open(&mut self.state.help.methods)
            .default_width(620.0)
            .show(ctx, help::methods_ui);
        egui::Window::new("Cautions")
            .open(&mut self.state.help.cautions)
            .default_width(520.0)
            .show(ctx, help::cautions_ui);
        egui::Window::new("About Offtake")
            .open(&mut self.state.help.about)
            .default_width(420.0)
            .show(ctx, help::about_ui);
    }

    /// Applies one command.
    pub fn apply(&mut self, command: Command, ctx: &egui::Context) {
        match command {
            Command::SelectTab(tab) => self.state.tab = tab,
            Command::Select(sel) => self.state.selection = sel,
            Command::ShowHelp(which) => self.state.help.open(which),
            Command::TogglePanel(kind) => self.state.panels.toggle(kind),
            Command::ShowLibrary(kind) => self.library_editor.show(kind),
            Command::Edit(edit) => self.edit(edit),
            Command::Undo => self.undo(),
            Command::Redo => self.redo(),
            Command::DeleteSelected => match &self.state.selection {
                Selection::Item(item) => {
                    let item = item.clone();
                    self.edit(DocEdit::Remove(item));
                }
                _ => {
                    self.state.message =
                        Some("Select a canal, block or planting to delete".to_owned());
                }
            },
            Command::NewProject | Command::OpenProject | Command::OpenRecent(_)
                if self.document.as_ref().is_some_and(OpenDocument::is_dirty) =>
            {
                self.state.confirm_discard = Some(Discard::Command(Box::new(command)));
            }
            Command::NewProject | Command::OpenProject | Command::OpenRecent(_) => {
                self.replace_document(command);
            }
            Command::Save => match self.document.as_ref().and_then(|d| d.path.clone()) {
                Some(path) => self.save_to(&path),
                None => self.apply(Command::SaveAs, ctx),
            },
            Command::SaveAs => {
                if self.document.is_some()
                    && let Some(path) =
                        self.ask(&crate::prompt::Ask::SaveProject("project.ron".to_owned()))
                {
                    self.save_to(&path);
                }
            }
            Command::ImportWeather => self.import_weather(),
            Command::ExportWorkbook => {
                if let Some(dir) = self.ask(&crate::prompt::Ask::ExportFolder) {
                    self.export_tables_to(&dir);
                }
            }
            Command::ExportReport => {
                if let Some(path) = self.ask(&crate::prompt::Ask::SaveReport("report.html".into()))
                {
                    self.export_report_to(&path);
                }
            }
            Command::DiscardAndRun(inner) => {
                self.clear_recovery();
                self.replace_document(*inner);
            }
            Command::ExportPlotCsv { file_name, csv } => self.export_csv(&file_name, &csv),
            Command::ExportPlotImage { file_name, rect } => {
                self.request_plot_image(ctx, file_name, rect);
            }
            Command::SetSeasonYear(year) => self.state.season_year = Some(year),
            Command::ShowScenario(name) => {
                self.state.scenario = name;
                self.request_recompute();
            }
            Command::EditScenario(name) => self.scenario_editor.open(name),
        }
    }

    /// The season the Water balance and Crop curves tabs show: the selected
    /// planting (a block: its first planting; otherwise the project's first)
    /// in the chosen year, by default the headworks design year.
    pub fn season_request(&self) -> Option<SeasonRequest> {
        let project = &self.document.as_ref()?.project;
        let planting = match &self.state.selection {
            Selection::Item(ItemRef::Planting(id)) => {
                project.plantings.iter().find(|p| p.id == *id)
            }
            Selection::Item(ItemRef::Block(id)) => {
                project.plantings.iter().find(|p| p.block == *id)
            }
            _ => None,
        }
        .or_else(|| project.plantings.first())?;
        Some(SeasonRequest {
            planting: planting.id.clone(),
            year: self.state.season_year,
        })
    }

    /// Opens the invented demo scheme of the repository's `demo-projects/`
    /// in place (tests and screenshots; the installed app opens the copy in
    /// the user's data folder, [`crate::startup`]).
    pub fn open_demo(&mut self) {
        let path = std::path::Path::new(DEMO_PROJECT);
        let path = std::fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf());
        self.open_file(&path);
    }

    /// New, Open or Open recent, without asking about unsaved changes.
    fn replace_document(&mut self, command: Command) {
        match command {
            Command::NewProject => self.new_project(),
            Command::OpenProject => {
                if let Some(path) = self.ask(&crate::prompt::Ask::OpenProject) {
                    self.open_file(&path);
                }
            }
            Command::OpenRecent(path) => self.open_file(&path),
            other => self.state.message = Some(format!("Unexpected command {other:?}")),
        }
    }

    /// Picks a weather CSV and opens the import window for it.
    fn import_weather(&mut self) {
        if self.document.is_none() {
            return;
        }
        if let Some(file) = self.ask(&crate::prompt::Ask::WeatherCsv) {
            self.preview_weather(file);
        }
    }

    /// Reads `file` in the background and shows the import window.
    pub fn preview_weather(&mut self, file: std::path::PathBuf) {
        let Some(doc) = self.document.as_ref() else {
            return;
        };
        self.import = Some(crate::import::ImportJob::start(file, &doc.project.weather));
    }

    /// Blocks until the weather import window has its result (tests only).
    pub fn wait_for_import(&mut self, timeout: Duration) {
        if let Some(job) = self.import.as_mut() {
            job.wait(timeout);
        }
    }

    fn import_window(&mut self, ctx: &egui::Context) {
        let Some(job) = self.import.as_mut() else {
            return;
        };
        job.poll();
        let mut answer = None;
        egui::Window::new("Import weather")
            .collapsible(false)
            .default_size([820.0, 820.0])
            .show(ctx, |ui| answer = crate::import::ui(ui, job));
        match answer {
            Some(crate::import::ImportAnswer::Use {
                path,
                settings,
                latitude_deg,
                elevation_m,
            }) => {
                self.import = None;
                self.attach_weather(&path, settings, latitude_deg, elevation_m);
            }
            Some(crate::import::ImportAnswer::Cancel) => self.import = None,
            None => {}
        }
    }

    /// The crop and soil library window (edits go through `commands`).
    fn library_window(&mut self, ctx: &egui::Context, commands: &mut Vec<Command>) {
        let (Some(doc), true) = (self.document.as_ref(), self.library_editor.open) else {
            return;
        };
        let mut open = true;
        let editor = &mut self.library_editor;
        egui::Window::new("Crop and soil libraries")
            .open(&mut open)
            .default_width(820.0)
            .show(ctx, |ui| {
                editor.ui(ui, &doc.project, &self.libraries, commands);
            });
        self.library_editor.open = open;
    }

    /// Attaches a weather file to the project as an undoable edit; the worker
    /// reads it and computes daily ET₀.
    fn attach_weather(
        &mut self,
        file: &std::path::Path,
        settings: offtake_core::weather_import::ImportSettings,
        latitude_deg: Option<f64>,
        elevation_m: Option<f64>,
    ) {
        let Some(doc) = self.document.as_ref() else {
            return;
        };
        let mut weather = doc.project.weather.clone();
        weather.path = relative_to_project(file, doc.path.as_deref());
        // One edit: the file, how to read it, and the station fields typed
        // in the import window.
        weather.set_import(Some(settings));
        if let Some(lat) = latitude_deg {
            weather.latitude_deg = lat;
        }
        if let Some(z) = elevation_m {
            weather.elevation_m = z;
        }
        self.edit(DocEdit::SetWeather(weather));
        self.state.selection = Selection::Weather;
        self.state.message = Some(
            "Weather attached — check the station latitude, elevation and wind height in the inspector"
                .to_owned(),
        );
    }

    fn new_project(&mut self) {
        self.set_document(OpenDocument::new(Project::default()));
        self.state.message = Some("New project".to_owned());
    }

    /// Opens a project file; a bad file leaves the open project as it was
    /// and reports the file, line and column of the problem.
    pub fn open_file(&mut self, path: &std::path::Path) {
        match offtake_io::project_file::load_project(path) {
            Ok(project) => {
                self.set_document(OpenDocument::opened(project, path.to_path_buf()));
                self.remember_recent(path);
                // Said before the first save: a save drops hand-written comments.
                self.state.message = Some(format!(
                    "Opened {}{}",
                    path.display(),
                    crate::startup::comment_notice(path).unwrap_or_default()
                ));
            }
            Err(e) => self.state.message = Some(format!("Could not open: {e}")),
        }
    }

    /// Saves the project to `path` (atomic; an invalid project is saved too,
    /// so nothing is lost, and its problems stay listed).
    pub fn save_to(&mut self, path: &std::path::Path) {
        let Some(doc) = self.document.as_mut() else {
            return;
        };
        let original = offtake_io::project_file::original_path(path);
        let had_original = original.exists();
        match offtake_io::project_file::save_project(path, &doc.project) {
            Ok(()) => {
                doc.mark_saved(path.to_path_buf());
                self.remember_recent(path);
                self.clear_recovery();
                let kept = if !had_original && original.exists() {
                    format!(
                        "; the file as it was, with its hand-written comments, is kept as {}",
                        original.display()
                    )
                } else {
                    String::new()
                };
                self.state.message = Some(format!("Saved {}{kept}", path.display()));
            }
            Err(e) => self.state.message = Some(format!("Could not save: {e}")),
        }
    }

    fn remember_recent(&mut self, path: &std::path::Path) {
        self.state.recent.retain(|p| p != path);
        self.state.recent.insert(0, path.to_path_buf());
        self.state.recent.truncate(10);
    }

    /// The "discard unsaved changes?" window and the close guard.
    fn discard_guard(&mut self, ctx: &egui::Context) {
        let dirty = self.document.as_ref().is_some_and(OpenDocument::is_dirty);
        if ctx.input(|i| i.viewport().close_requested()) && dirty && !self.closing {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.state.confirm_discard = Some(Discard::Close);
        }
        let Some(pending) = self.state.confirm_discard.clone() else {
            return;
        };
        let mut answer = None;
        egui::Window::new("Unsaved changes")
            .collapsible(false)
            .resizable(false)
            .show(ctx, |ui| {
                ui.label("The project has changes that are not saved. Discard them?");
                ui.horizontal(|ui| {
                    if ui.button("Discard changes").clicked() {
                        answer = Some(true);
                    }
                    if ui.button("Cancel").clicked() {
                        answer = Some(false);
                    }
                });
            });
        match answer {
            Some(true) => {
                self.state.confirm_discard = None;
                match pending {
                    Discard::Close => {
                        self.closing = true;
                        self.clear_recovery();
                        ctx.send_viewport_cmd(egui::ViewportCommand::Close);
                    }
                    Discard::Command(cmd) => self.commands.push(Command::DiscardAndRun(cmd)),
                }
            }
            Some(false) => self.state.confirm_discard = None,
            None => {}
        }
    }

    fn edit(&mut self, edit: DocEdit) {
        let Some(doc) = self.document.as_mut() else {
            self.state.message = Some("No project open".to_owned());
            return;
        };
        let removed = match &edit {
            DocEdit::Remove(item) => Some(item.clone()),
            _ => None,
        };
        match self.history.apply(edit, &mut doc.project) {
            Ok(()) => {
                if removed.is_some_and(|r| self.state.selection == Selection::Item(r)) {
                    self.state.selection = Selection::Scheme;
                }
                self.state.message = None;
                self.request_recompute();
            }
            Err(e) => self.state.message = Some(format!("Could not apply the edit: {e}")),
        }
    }

    fn undo(&mut self) {
        let Some(doc) = self.document.as_mut() else {
            return;
        };
        self.state.message = Some(match self.history.undo(&mut doc.project) {
            None => "Nothing to undo".to_owned(),
            Some(Ok(label)) => format!("Undid {label}"),
            Some(Err(e)) => format!("Could not undo: {e}"),
        });
        self.fix_selection();
        self.request_recompute();
    }

    fn redo(&mut self) {
        let Some(doc) = self.document.as_mut() else {
            return;
        };
        self.state.message = Some(match self.history.redo(&mut doc.project) {
            None => "Nothing to redo".to_owned(),
            Some(Ok(label)) => format!("Redid {label}"),
            Some(Err(e)) => format!("Could not redo: {e}"),
        });
        self.fix_selection();
        self.request_recompute();
    }

    /// Falls back to the scheme when the selected item is gone.
    fn fix_selection(&mut self) {
        let Some(p) = self.project() else { return };
        let exists = match &self.state.selection {
            Selection::Item(ItemRef::Canal(id)) => p.canal(id).is_some(),
            Selection::Item(ItemRef::Block(id)) => p.block(id).is_some(),
            Selection::Item(ItemRef::Planting(id)) => p.planting(id).is_some(),
            _ => true,
        };
        if !exists {
            self.state.selection = Selection::Scheme;
        }
    }

    fn export_csv(&mut self, file_name: &str, csv: &str) {
        let Some(path) = self.ask(&crate::prompt::Ask::SaveCsv(file_name.to_owned())) else {
            return;
        };
        self.state.message = Some(
            match offtake_io::export::write_bytes(csv.as_bytes(), &path) {
                Ok(()) => format!("Plot data saved to {}", path.display()),
                Err(e) => format!("Could not write {}: {e}", path.display()),
            },
        );
    }

    /// Asks the renderer for a screenshot; the cropped plot arrives on the channel.
    fn request_plot_image(&mut self, ctx: &egui::Context, file_name: String, rect: egui::Rect) {
        let rect = if rect.is_positive() {
            rect
        } else {
            ctx.data(|d| d.get_temp::<egui::Rect>(egui::Id::unique(crate::plot::LAST_PLOT_RECT)))
                .unwrap_or(egui::Rect::NOTHING)
        };
        if !rect.is_positive() {
            self.state.message = Some("No plot on screen to export".to_owned());
            return;
        }
        let tx = self.images_tx.clone();
        let ppp = ctx.pixels_per_point();
        let repaint = ctx.clone();
        ctx.request_screenshot(move |full: Arc<egui::ColorImage>| {
            let image = full.region(&rect, Some(ppp));
            // The receiver lives as long as the app; a closed window drops the image.
            let _ = tx.send(PendingImage { file_name, image });
            repaint.request_repaint();
        });
    }

    /// Writes the result tables and workbook of the current results into
    /// `dir` on a background thread (the same files as `offtake run`); the
    /// status line reports the outcome.
    pub fn export_tables_to(&mut self, dir: &std::path::Path) {
        let run = self
            .computed
            .as_ref()
            .and_then(|c| c.engine.as_ref())
            .and_then(|e| e.as_ref().ok())
            .map(|r| Arc::clone(&r.results));
        let (Some(results), Some(doc)) = (run, &self.document) else {
            self.state.message = Some(
                "Nothing to export yet: the scheme needs weather and a finished computation"
                    .to_owned(),
            );
            return;
        };
        let project = doc.project.clone();
        let dir = dir.to_path_buf();
        let (tx, rx) = mpsc::channel();
        std::thread::spawn(move || {
            let outcome =
                crate::export::write_tables(&results, &project, &dir).map_err(|e| e.to_string());
            let _ = tx.send((dir, outcome));
        });
        self.export_job = Some(rx);
        self.state.message = Some("Writing the result tables…".to_owned());
    }

    /// Writes the design report of the current results to `path` on a
    /// background thread (the same report as `offtake report`, with the
    /// scenarios compared when the worker has compared them); the status
    /// line reports the outcome.
    pub fn export_report_to(&mut self, path: &std::path::Path) {
        let computed = self.computed.as_ref();
        let run = computed
            .and_then(|c| c.engine.as_ref())
            .and_then(|e| e.as_ref().ok())
            .map(|r| Arc::clone(&r.results));
        let (Some(results), Some(doc)) = (run, &self.document) else {
            self.state.message = Some(
                "No report yet: the scheme needs weather and a finished computation".to_owned(),
            );
            return;
        };
        let comparison = computed.and_then(|c| c.comparison.clone());
        let project = doc.project.clone();
        let project_path = doc.path.clone();
        let path = path.to_path_buf();
        let (tx, rx) = mpsc::channel();
        std::thread::spawn(move || {
            let outcome = crate::export::write_report(
                &results,
                &project,
                project_path.as_deref(),
                comparison.as_ref(),
                &path,
            )
            .map_err(|e| e.to_string());
            let name = path
                .file_name()
                .map_or_else(|| "report".into(), |n| n.to_string_lossy().into_owned());
            let dir = path
                .parent()
                .map(std::path::Path::to_path_buf)
                .unwrap_or_default();
            let _ = tx.send((dir, outcome.map(|()| vec![name])));
        });
        self.export_job = Some(rx);
        self.state.message = Some("Writing the design report…".to_owned());
    }

    /// Blocks until a running export finishes (at most `timeout`). For tests.
    pub fn wait_for_export(&mut self, timeout: Duration) {
        if let Some(rx) = self.export_job.take() {
            match rx.recv_timeout(timeout) {
                Ok(done) => self.export_done(done),
                Err(_) => self.export_job = Some(rx),
            }
        }
    }

    fn poll_export(&mut self, ctx: &egui::Context) {
        if let Some(rx) = self.export_job.take() {
            match rx.try_recv() {
                Ok(done) => self.export_done(done),
                Err(mpsc::TryRecvError::Empty) => {
                    self.export_job = Some(rx);
                    ctx.request_repaint_after(Duration::from_millis(100));
                }
                Err(mpsc::TryRecvError::Disconnected) => {
                    self.state.message = Some("The export stopped unexpectedly".to_owned());
                }
            }
        }
    }

    fn export_done(&mut self, (dir, outcome): ExportOutcome) {
        self.state.message = Some(match outcome {
            Ok(files) => format!("Wrote {} to {}", files.join(", "), dir.display()),
            Err(e) => format!("Export failed: {e}"),
        });
    }

    fn receive_images(&mut self) {
        while let Ok(pending) = self.images_rx.try_recv() {
            self.save_png(&pending);
        }
    }

    fn save_png(&mut self, pending: &PendingImage) {
        let Some(path) = self.ask(&crate::prompt::Ask::SavePng(pending.file_name.clone())) else {
            return;
        };
        let result = encode_png(&pending.image).and_then(|bytes| {
            offtake_io::export::write_bytes(&bytes, &path).map_err(|e| e.to_string())
        });
        self.state.message = Some(match result {
            Ok(()) => format!("Plot image saved to {}", path.display()),
            Err(e) => format!("Could not write {}: {e}", path.display()),
        });
    }

    /// Whether a panel is shown (for tests and the View menu).
    pub fn panel_shown(&self, kind: PanelKind) -> bool {
        match kind {
            PanelKind::Tree => self.state.panels.tree,
            PanelKind::Inspector => self.state.panels.inspector,
            PanelKind::StatusBar => self.state.panels.status_bar,
        }
    }
}

impl eframe::App for OfftakeApp {
    fn ui(&mut self, ui: &mut Ui, _frame: &mut eframe::Frame) {
        OfftakeApp::ui(self, ui);
    }

    fn on_exit(&mut self) {
        // A normal exit with everything saved leaves no recovery file.
        if !self.document.as_ref().is_some_and(OpenDocument::is_dirty) {
            self.clear_recovery();
        }
    }
}

/// Encodes an egui image as PNG (8-bit sRGB with alpha).
fn encode_png(image: &egui::ColorImage) -> Result<Vec<u8>, String> {
    let [w, h] = image.size;
    let (Ok(w), Ok(h)) = (u32::try_from(w), u32::try_from(h)) else {
        return Err("image too large".to_owned());
    };
    let bytes: Vec<u8> = image
        .pixels
        .iter()
        .flat_map(egui::Color32::to_srgba_unmultiplied)
        .collect();
    let rgba = image::RgbaImage::from_raw(w, h, bytes)
        .ok_or_else(|| "image size does not match its pixels".to_owned())?;
    let mut png = Vec::new();
    rgba.write_to(&mut std::io::Cursor::new(&mut png), image::ImageFormat::Png)
        .map_err(|e| e.to_string())?;
    Ok(png)
}

/// `file` relative to the project file's folder when it is inside it, else as given.
fn relative_to_project(file: &std::path::Path, project: Option<&std::path::Path>) -> String {
    project
        .and_then(std::path::Path::parent)
        .and_then(|dir| file.strip_prefix(dir).ok())
        .unwrap_or(file)
        .display()
        .to_string()
}
