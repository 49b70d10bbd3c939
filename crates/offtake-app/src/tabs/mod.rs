//! The centre workspace tabs, one file per tab.
//!
//! Each tab keeps its own view state (chosen year, basis, stacking) and draws
//! from the cached results in [`View`]; requests go out as commands.

pub mod balance;
pub mod capacity;
pub mod compare;
pub mod crops;
pub mod demand;
pub mod rotation;
pub mod weather;

use egui::{RichText, Ui};

use crate::command::{Command, Tab};
use crate::compute::Computed;

/// What every tab may read this frame.
#[derive(Debug, Clone, Copy)]
pub struct View<'a> {
    /// Whether a project is open.
    pub project_open: bool,
    /// The open project.
    pub project: Option<&'a offtake_core::project::Project>,
    /// The tree selection.
    pub selection: &'a crate::command::Selection,
    /// Results of the last finished computation, if any.
    pub computed: Option<&'a Computed>,
}

/// The view state of all tabs.
#[derive(Debug, Default)]
pub struct Tabs {
    /// Weather & ET₀.
    pub weather: weather::WeatherTab,
    /// Crop curves.
    pub crops: crops::CropCurvesTab,
    /// Water balance.
    pub balance: balance::WaterBalanceTab,
    /// Demand.
    pub demand: demand::DemandTab,
    /// Canal capacity.
    pub capacity: capacity::CanalCapacityTab,
    /// Rotation.
    pub rotation: rotation::RotationTab,
    /// Compare.
    pub compare: compare::CompareTab,
}

impl Tabs {
    /// Draws the tab bar and the current tab.
    pub fn ui(&mut self, ui: &mut Ui, current: Tab, view: &View<'_>, commands: &mut Vec<Command>) {
        ui.horizontal_wrapped(|ui| {
            for tab in Tab::ALL {
                if ui.selectable_label(current == tab, tab.title()).clicked() && current != tab {
                    commands.push(Command::SelectTab(tab));
                }
            }
        });
        ui.separator();
        match current {
            Tab::Weather => self.weather.ui(ui, view, commands),
            Tab::CropCurves => self.crops.ui(ui, view, commands),
            Tab::WaterBalance => self.balance.ui(ui, view, commands),
            Tab::Demand => self.demand.ui(ui, view, commands),
            Tab::CanalCapacity => self.capacity.ui(ui, view, commands),
            Tab::Rotation => self.rotation.ui(ui, view, commands),
            Tab::Compare => self.compare.ui(ui, view, commands),
        }
    }
}

/// An empty state: what is missing and the next step, instead of a blank plot.
pub fn empty_state(ui: &mut Ui, headline: &str, next_step: &str) {
    ui.add_space(40.0);
    ui.vertical_centered(|ui| {
        ui.label(RichText::new(headline).heading());
        ui.add_space(8.0);
        ui.label(next_step);
    });
}

/// The engine results for a tab, or an empty state saying why there are
/// none (no weather, still computing, or the engine's error).
pub fn engine_results<'a>(
    ui: &mut Ui,
    view: &View<'a>,
    what_this_tab_shows: &str,
) -> Option<(&'a crate::compute::EngineRun, &'a offtake_core::engine::Results)> {
    let project = view.project?;
    if project.weather.path.trim().is_empty() {
        empty_state(
            ui,
            "No weather yet — File › Import weather…",
            what_this_tab_shows,
        );
        return None;
    }
    match view.computed.and_then(|c| c.engine.as_ref()) {
        Some(Ok(run)) => Some((run, &run.results)),
        Some(Err(e)) => {
            empty_state(ui, "The scheme cannot be computed yet", e);
            None
        }
        None => {
            empty_state(
                ui,
                "Computing…",
                "Results appear here when the background computation finishes (see the status bar).",
            );
            None
        }
    }
}

/// The empty state shared by every tab when no project is open.
pub fn no_project(ui: &mut Ui, what_this_tab_shows: &str) {
    empty_state(
        ui,
        "No project open — File › New starts one, File › Open… opens a project file",
        what_this_tab_shows,
    );
}
