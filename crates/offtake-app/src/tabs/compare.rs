//! The Compare tab: scenario table and grouped bars.

use egui::Ui;

use super::{View, empty_state, no_project};
use crate::command::Command;

/// View state of the Compare tab.
#[derive(Debug, Default)]
pub struct CompareTab {}

impl CompareTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab compares scenarios: seasonal volume, peak flow, shortfall and area served.",
            );
            return;
        };
        if project.scenarios.is_empty() {
            empty_state(
                ui,
                "No scenarios yet",
                "Scenarios are alternatives to the base cropping plan; the comparison of volumes, peak flows and shortfalls appears here.",
            );
        } else {
            ui.label(egui::RichText::new("Scenarios in the project").strong());
            for s in &project.scenarios {
                ui.label(format!("- {}", s.name));
            }
            ui.label("The comparison of volumes, peak flows and shortfalls is not computed in this version yet.");
        }
    }
}
