//! The Compare tab: scenario table and grouped bars.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Compare tab.
#[derive(Debug, Default)]
pub struct CompareTab {}

impl CompareTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab compares scenarios: seasonal volume, peak flow, shortfall and area served.",
            );
        }
    }
}
