//! The Water balance tab: root-zone depletion of a planting with TAW and RAW, rain and irrigation events, and Ks.

use egui::Ui;

use super::{View, empty_state, no_project};
use crate::command::Command;

/// View state of the Water balance tab.
#[derive(Debug, Default)]
pub struct WaterBalanceTab {}

impl WaterBalanceTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows a planting's root-zone depletion (mm) against TAW and RAW, with rain and irrigation events and the stress coefficient Ks.",
            );
            return;
        };
        let _ = project;
        empty_state(
            ui,
            "Water balance: not computed in this version yet",
            "The scheme, crops and Kc curves are ready; this view fills in when the water balance computation is wired into the app.",
        );
    }
}
