//! The top menu bar: File, Edit, View, Help.

use egui::{Button, Ui};

use crate::command::{Command, HelpWindow, PanelKind};
use crate::state::RuntimeState;

/// What the menu needs to know about the document and history.
#[derive(Debug, Clone, Copy, Default)]
pub struct MenuInfo<'a> {
    /// Whether a project is open.
    pub project_open: bool,
    /// Label of the edit Undo would undo.
    pub undo: Option<&'a str>,
    /// Label of the edit Redo would redo.
    pub redo: Option<&'a str>,
}

/// Draws the menu bar.
pub fn ui(ui: &mut Ui, state: &RuntimeState, info: MenuInfo<'_>, commands: &mut Vec<Command>) {
    let ctx = ui.ctx().clone();
    let shortcut = |s: &egui::KeyboardShortcut| ctx.format_shortcut(s);
    egui::MenuBar::new().ui(ui, |ui| {
        ui.menu_button("File", |ui| {
            if ui.button("New").clicked() {
                commands.push(Command::NewProject);
            }
            if ui
                .add(Button::new("Open…").shortcut_text(shortcut(&crate::app::OPEN)))
                .clicked()
            {
                commands.push(Command::OpenProject);
            }
            ui.menu_button("Open recent", |ui| {
                if state.recent.is_empty() {
                    ui.label("No recent projects");
                }
                for path in &state.recent {
                    if ui.button(path.display().to_string()).clicked() {
                        commands.push(Command::OpenRecent(path.clone()));
                    }
                }
            });
            ui.separator();
            let save = Button::new("Save").shortcut_text(shortcut(&crate::app::SAVE));
            if ui
                .add_enabled(info.project_open, save)
                .on_disabled_hover_text("No project open")
                .clicked()
            {
                commands.push(Command::Save);
            }
            if ui
                .add_enabled(info.project_open, Button::new("Save as…"))
                .on_disabled_hover_text("No project open")
                .clicked()
            {
                commands.push(Command::SaveAs);
            }
            ui.separator();
            if ui
                .add_enabled(info.project_open, Button::new("Import weather…"))
                .on_disabled_hover_text("Open or start a project first")
                .clicked()
            {
                commands.push(Command::ImportWeather);
            }
            if ui
                .add_enabled(info.project_open, Button::new("Export tables/workbook…"))
                .on_disabled_hover_text("No project open")
                .clicked()
            {
                commands.push(Command::ExportWorkbook);
            }
            if ui
                .add_enabled(info.project_open, Button::new("Export report…"))
                .on_disabled_hover_text("No project open")
                .clicked()
            {
                commands.push(Command::ExportReport);
            }
            if ui.button("Export plot image…").clicked() {
                commands.push(Command::ExportPlotImage {
                    file_name: "offtake-plot.png".to_owned(),
                    rect: egui::Rect::NOTHING,
                });
            }
        });
        ui.menu_button("Edit", |ui| {
            let undo_text = info
                .undo
                .map_or_else(|| "Undo".to_owned(), |l| format!("Undo {l}"));
            let undo = Button::new(undo_text).shortcut_text(shortcut(&crate::app::UNDO));
            if ui.add_enabled(info.undo.is_some(), undo).clicked() {
                commands.push(Command::Undo);
            }
            let redo_text = info
                .redo
                .map_or_else(|| "Redo".to_owned(), |l| format!("Redo {l}"));
            let redo = Button::new(redo_text).shortcut_text(shortcut(&crate::app::REDO));
            if ui.add_enabled(info.redo.is_some(), redo).clicked() {
                commands.push(Command::Redo);
            }
        });
        ui.menu_button("View", |ui| {
            let mut panel = |ui: &mut Ui, on: bool, label: &str, kind: PanelKind| {
                let mut checked = on;
                if ui.checkbox(&mut checked, label).clicked() {
                    commands.push(Command::TogglePanel(kind));
                }
            };
            panel(ui, state.panels.tree, "Scheme tree panel", PanelKind::Tree);
            panel(
                ui,
                state.panels.inspector,
                "Inspector panel",
                PanelKind::Inspector,
            );
            panel(
                ui,
                state.panels.status_bar,
                "Status bar",
                PanelKind::StatusBar,
            );
            ui.separator();
            if ui
                .add_enabled(info.project_open, Button::new("Crop library…"))
                .clicked()
            {
                commands.push(Command::ShowLibrary(
                    crate::library_editor::LibraryKind::Crops,
                ));
            }
            if ui
                .add_enabled(info.project_open, Button::new("Soil library…"))
                .clicked()
            {
                commands.push(Command::ShowLibrary(
                    crate::library_editor::LibraryKind::Soils,
                ));
            }
        });
        ui.menu_button("Help", |ui| {
            if ui
                .add(Button::new("Methods and sources").shortcut_text(shortcut(&crate::app::HELP)))
                .clicked()
            {
                commands.push(Command::ShowHelp(HelpWindow::Methods));
            }
            if ui.button("Cautions").clicked() {
                commands.push(Command::ShowHelp(HelpWindow::Cautions));
            }
            if ui.button("About").clicked() {
                commands.push(Command::ShowHelp(HelpWindow::About));
            }
        });
    });
}
