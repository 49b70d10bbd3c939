//! [`OfftakeApp`]: the window, its panels, and the end-of-frame command loop.
//!
//! Each frame: keyboard shortcuts and views push [`Command`]s onto a list;
//! after everything is drawn, [`OfftakeApp::apply`] runs them in order.
//! Document edits go through the undo history; results come from the
//! background worker and are cached, never computed inside a frame.

use std::sync::Arc;
use std::sync::mpsc::{self, Receiver, Sender};

use egui::{Key, KeyboardShortcut, Modifiers, Ui};

use crate::command::{Command, HelpWindow, PanelKind};
use crate::compute::Computed;
use crate::menu::MenuInfo;
use crate::state::RuntimeState;
use crate::status::SaveState;
use crate::tabs::{Tabs, View};
use crate::{help, inspector, menu, status, tree};

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
    /// Session state: tab, windows, panels, messages.
    pub state: RuntimeState,
    /// View state of the workspace tabs.
    pub tabs: Tabs,
    /// Results of the last finished computation.
    pub computed: Option<Computed>,
    /// Commands recorded this frame, applied at its end.
    commands: Vec<Command>,
    /// Screenshots cropped to a plot arrive here from the renderer.
    images_tx: Sender<PendingImage>,
    images_rx: Receiver<PendingImage>,
    /// Whether file dialogs may open (off in headless tests).
    dialogs: bool,
}

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
        let (images_tx, images_rx) = mpsc::channel();
        Self {
            state: RuntimeState::default(),
            tabs: Tabs::default(),
            computed: None,
            commands: Vec::new(),
            images_tx,
            images_rx,
            dialogs: true,
        }
    }

    /// Turns native file dialogs off (headless tests): commands that need a
    /// file then report so in the status line instead.
    #[must_use]
    pub fn without_dialogs(mut self) -> Self {
        self.dialogs = false;
        self
    }

    /// Queues a command as if a view had pushed it; it runs at the end of the next frame.
    pub fn push(&mut self, command: Command) {
        self.commands.push(command);
    }

    #[expect(
        clippy::unused_self,
        reason = "reads the document once the project type is wired in"
    )]
    fn project_open(&self) -> bool {
        false
    }

    #[expect(
        clippy::unused_self,
        reason = "reads the document once the project type is wired in"
    )]
    fn save_state(&self) -> SaveState {
        SaveState::NoProject
    }

    /// Draws one frame of the whole window, then applies the frame's commands.
    pub fn ui(&mut self, ui: &mut Ui) {
        self.shortcuts(ui);
        self.receive_images();
        let mut commands = std::mem::take(&mut self.commands);
        let project_open = self.project_open();

        egui::Panel::top("menu").show(ui, |ui| {
            let info = MenuInfo {
                project_open,
                undo: None,
                redo: None,
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
                        tree::ui(ui, project_open, &mut commands);
                    });
                });
        }
        if self.state.panels.inspector {
            egui::Panel::right("inspector")
                .resizable(true)
                .default_size(300.0)
                .show(ui, |ui| {
                    egui::ScrollArea::vertical().show(ui, |ui| {
                        inspector::ui(ui, project_open, &mut commands);
                    });
                });
        }
        egui::CentralPanel::default().show(ui, |ui| {
            let view = View {
                project_open,
                computed: self.computed.as_ref(),
            };
            self.tabs.ui(ui, self.state.tab, &view, &mut commands);
        });
        self.help_windows(ui.ctx());

        commands.append(&mut self.commands);
        if !commands.is_empty() {
            // Show the effect of the commands in the next frame.
            ui.ctx().request_repaint();
        }
        for command in commands {
            self.apply(command, ui.ctx());
        }
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
            Command::ShowHelp(which) => self.state.help.open(which),
            Command::TogglePanel(kind) => self.state.panels.toggle(kind),
            Command::Undo => self.state.message = Some("Nothing to undo".to_owned()),
            Command::Redo => self.state.message = Some("Nothing to redo".to_owned()),
            Command::DeleteSelected => {
                self.state.message = Some("Nothing selected to delete".to_owned());
            }
            Command::NewProject
            | Command::OpenProject
            | Command::OpenRecent(_)
            | Command::Save
            | Command::SaveAs
            | Command::ImportWeather
            | Command::ExportWorkbook => {
                self.state.message = Some("No project document in this build yet".to_owned());
            }
            Command::ExportPlotCsv { file_name, csv } => self.export_csv(&file_name, &csv),
            Command::ExportPlotImage { file_name, rect } => {
                self.request_plot_image(ctx, file_name, rect);
            }
        }
    }

    fn export_csv(&mut self, file_name: &str, csv: &str) {
        if !self.dialogs {
            self.state.message = Some("File dialogs are off".to_owned());
            return;
        }
        let Some(path) = rfd::FileDialog::new()
            .set_file_name(file_name)
            .add_filter("CSV", &["csv"])
            .save_file()
        else {
            return;
        };
        self.state.message = Some(match std::fs::write(&path, csv) {
            Ok(()) => format!("Plot data saved to {}", path.display()),
            Err(e) => format!("Could not write {}: {e}", path.display()),
        });
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

    fn receive_images(&mut self) {
        while let Ok(pending) = self.images_rx.try_recv() {
            self.save_png(&pending);
        }
    }

    fn save_png(&mut self, pending: &PendingImage) {
        if !self.dialogs {
            return;
        }
        let Some(path) = rfd::FileDialog::new()
            .set_file_name(&pending.file_name)
            .add_filter("PNG image", &["png"])
            .save_file()
        else {
            return;
        };
        let [w, h] = pending.image.size;
        let bytes: Vec<u8> = pending
            .image
            .pixels
            .iter()
            .flat_map(egui::Color32::to_srgba_unmultiplied)
            .collect();
        let result = image::RgbaImage::from_raw(w as u32, h as u32, bytes)
            .ok_or_else(|| "image size does not match its pixels".to_owned())
            .and_then(|img| img.save(&path).map_err(|e| e.to_string()));
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
}
