//! The Water balance tab: root-zone depletion of a planting with TAW and RAW, rain and irrigation events, and Ks.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Water balance tab.
#[derive(Debug, Default)]
pub struct WaterBalanceTab {}

impl WaterBalanceTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab shows a planting's root-zone depletion (mm) against TAW and RAW, with rain and irrigation events and the stress coefficient Ks.",
            );
        }
    }
}
