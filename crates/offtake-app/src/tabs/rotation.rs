//! The Rotation tab: the roster of turns as a timeline and a table.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Rotation tab.
#[derive(Debug, Default)]
pub struct RotationTab {}

impl RotationTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab shows the rotation roster when supply is short: dated turns per canal and block, and the relative water supply of each block.",
            );
        }
    }
}
