//! The right panel: every field of the selected item, with unit and inline validation.

use egui::{RichText, Ui};

use crate::command::Command;

/// Draws the inspector.
pub fn ui(ui: &mut Ui, project_open: bool, _commands: &mut Vec<Command>) {
    ui.label(RichText::new("Inspector").strong());
    ui.separator();
    if project_open {
        ui.label(
            "Select a canal, block or planting in the scheme tree to see and edit its fields.",
        );
    } else {
        ui.label("Nothing selected.");
    }
}
