//! The Canal capacity tab: the node hydrograph with design flow and existing capacity, and the table of design values per canal.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Canal capacity tab.
#[derive(Debug, Default)]
pub struct CanalCapacityTab {}

impl CanalCapacityTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        ui.label(egui::RichText::new(crate::help::CAUTION_LINE).color(ui.visuals().warn_fg_color));
        if !view.project_open {
            no_project(
                ui,
                "This tab shows each canal's demand hydrograph (l/s) with its design flow and existing capacity, and a table of design flows, duties and capacities.",
            );
        }
    }
}
