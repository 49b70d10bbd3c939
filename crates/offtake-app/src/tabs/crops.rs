//! The Crop curves tab: Kc curves of the selected plantings with their growth stages shaded.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Crop curves tab.
#[derive(Debug, Default)]
pub struct CropCurvesTab {}

impl CropCurvesTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab shows the Kc curve of each selected planting, growth stages shaded.",
            );
        }
    }
}
