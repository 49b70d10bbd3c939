//! The Weather & ET₀ tab: daily ET₀ and rain of a chosen year over the day-of-year climatology band, with flagged and filled days marked.

use egui::Ui;

use super::{View, no_project};
use crate::command::Command;

/// View state of the Weather & ET₀ tab.
#[derive(Debug, Default)]
pub struct WeatherTab {}

impl WeatherTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab shows the weather series: daily ET₀ (mm/day) and rain (mm) for a chosen year over the 10–90 % climatology band, with flagged and filled days marked.",
            );
        }
    }
}
