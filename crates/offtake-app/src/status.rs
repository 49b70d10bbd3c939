//! The bottom status bar: recompute time, data warnings, save state, caution.

use egui::{RichText, Ui};

use crate::command::{Command, HelpWindow};
use crate::help::CAUTION_LINE;
use crate::state::{RecomputeStatus, RuntimeState};

/// Save state of the document, as the status bar shows it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SaveState {
    /// No project open.
    NoProject,
    /// Never saved to a file.
    NotSaved,
    /// Edited since the last save.
    Unsaved,
    /// Same as the file.
    Saved,
}

impl SaveState {
    /// Text for the status bar.
    pub fn text(self) -> &'static str {
        match self {
            SaveState::NoProject => "No project",
            SaveState::NotSaved => "Not saved yet",
            SaveState::Unsaved => "Unsaved changes",
            SaveState::Saved => "Saved",
        }
    }
}

/// Draws the status bar.
pub fn ui(ui: &mut Ui, state: &RuntimeState, save: SaveState, commands: &mut Vec<Command>) {
    ui.horizontal(|ui| {
        match &state.recompute {
            RecomputeStatus::NothingToCompute => {
                ui.label("Nothing to compute");
            }
            RecomputeStatus::Running => {
                spinner(ui);
                ui.label("recomputing…");
            }
            RecomputeStatus::Done { .. } if state.error_count > 0 => {
                let text = match state.error_count {
                    1 => "1 error in the project — results out of date".to_owned(),
                    n => format!("{n} errors in the project — results out of date"),
                };
                ui.label(RichText::new(text).color(ui.visuals().error_fg_color))
                    .on_hover_text(
                        "Nothing was computed from the project as it stands; the results shown are from the last good run. The errors are listed with the data warnings.",
                    );
            }
            RecomputeStatus::Done { elapsed_ms } => {
                ui.label(format!("recomputed in {elapsed_ms:.0} ms"));
            }
            RecomputeStatus::Stopped => {
                ui.label(
                    RichText::new("computation stopped — results are from the last good run")
                        .color(ui.visuals().warn_fg_color),
                );
            }
        }
        ui.separator();
        let warnings = match state.warning_count {
            0 => "No data warnings".to_owned(),
            1 => "1 data warning".to_owned(),
            n => format!("{n} data warnings"),
        };
        if state.warning_count == 0 {
            ui.label(warnings);
        } else if ui
            .link(warnings)
            .on_hover_text("Show them in the inspector (the scheme's page)")
            .clicked()
        {
            commands.push(Command::Select(crate::command::Selection::Scheme));
            ui.ctx().data_mut(|d| {
                d.insert_temp(egui::Id::unique(crate::inspector::OPEN_WARNINGS), true);
            });
        }
        ui.separator();
        ui.label(save.text());
        if let Some(msg) = &state.message {
            ui.separator();
            ui.label(msg);
        }
        ui.separator();
        if ui
            .link(CAUTION_LINE)
            .on_hover_text("Open Help › Cautions")
            .clicked()
        {
            commands.push(Command::ShowHelp(HelpWindow::Cautions));
        }
    });
}

/// A small rotating spinner that repaints at 20 Hz rather than every frame,
/// so it costs little and headless tests settle.
fn spinner(ui: &mut Ui) {
    let size = ui.spacing().interact_size.y * 0.7;
    let (rect, _) = ui.allocate_exact_size(egui::vec2(size, size), egui::Sense::hover());
    let t = ui.input(|i| i.time);
    let angle = (t * std::f64::consts::TAU) as f32;
    let c = rect.center();
    let r = size * 0.45;
    let stroke = egui::Stroke::new(2.0, ui.visuals().strong_text_color());
    ui.painter()
        .circle_stroke(c, r, ui.visuals().widgets.noninteractive.bg_stroke);
    ui.painter()
        .line_segment([c, c + r * egui::vec2(angle.cos(), angle.sin())], stroke);
    ui.ctx()
        .request_repaint_after(std::time::Duration::from_millis(50));
}
