//! The Demand tab: NIR and GIR at the selected node, stacked by crop or by block, daily, 10-day or monthly.

use egui::Ui;

use super::{View, empty_state, no_project};
use crate::command::Command;

/// View state of the Demand tab.
#[derive(Debug, Default)]
pub struct DemandTab {}

impl DemandTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows NIR and GIR at the selected canal or block, stacked by crop or block, daily, 10-day or monthly.",
            );
            return;
        };
        let _ = project;
        empty_state(
            ui,
            "Demand: not computed in this version yet",
            "The scheme, crops and Kc curves are ready; this view fills in when the demand computation is wired into the app.",
        );
    }
}
