//! The Rotation tab: the roster of turns as a timeline and a table.

use egui::Ui;

use super::{View, empty_state, no_project};
use crate::command::Command;

/// View state of the Rotation tab.
#[derive(Debug, Default)]
pub struct RotationTab {}

impl RotationTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows the rotation roster when supply is short: dated turns per canal and block, and the relative water supply of each block.",
            );
            return;
        };
        let _ = project;
        empty_state(
            ui,
            "Rotation: not computed in this version yet",
            "The scheme, crops and Kc curves are ready; this view fills in when the rotation computation is wired into the app.",
        );
    }
}
