//! The Weather & ET₀ tab: daily ET₀ and rain of a chosen year over the day-of-year climatology band, with flagged and filled days marked.

use egui::Ui;

use super::{View, empty_state, no_project};
use crate::command::Command;

/// View state of the Weather & ET₀ tab.
#[derive(Debug, Default)]
pub struct WeatherTab {}

impl WeatherTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, _commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows the weather series: daily ET₀ (mm/day) and rain (mm) for a chosen year over the 10–90 % climatology band, with flagged and filled days marked.",
            );
            return;
        };
        if project.weather.path.trim().is_empty() {
            empty_state(
                ui,
                "No weather yet — File › Import weather…",
                "Daily ET₀ and rain appear here once a weather series is attached to the project.",
            );
        } else {
            empty_state(
                ui,
                &format!("Weather series: {}", project.weather.path),
                &format!(
                    "Station at {:.2}° latitude, {:.0} m elevation, wind measured at {:.1} m. \
                     Daily ET₀ plots are not computed in this version yet.",
                    project.weather.latitude_deg,
                    project.weather.elevation_m,
                    project.weather.wind_height_m
                ),
            );
        }
    }
}
