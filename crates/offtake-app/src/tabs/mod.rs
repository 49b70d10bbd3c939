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
pub mod section_view;
pub mod weather;

use std::fmt::Write as _;

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
    /// The scenario whose results are shown (`None` = the base plan).
    pub scenario: Option<&'a str>,
    /// Crop and soil libraries with the project's own entries overlaid.
    pub libraries: &'a offtake_io::library::Libraries,
}

impl View<'_> {
    /// Display name of a crop id ("Maize, field (grain)"), or the id itself
    /// when neither library knows it.
    pub fn crop_name(&self, id: &str) -> String {
        self.libraries.crop_name(id).to_owned()
    }
}

/// One colour per crop of the project (its plantings and any crop `extra`
/// brings, e.g. a scenario's), the same in every tab.
pub fn crop_colours<'a>(
    project: Option<&'a offtake_core::project::Project>,
    extra: impl IntoIterator<Item = &'a str>,
) -> crate::palette::Colours {
    let mut ids: Vec<&str> = project
        .map(|p| p.plantings.iter().map(|x| x.crop.as_str()).collect())
        .unwrap_or_default();
    ids.extend(extra);
    crate::palette::Colours::for_ids(ids)
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
) -> Option<(
    &'a crate::compute::EngineRun,
    &'a offtake_core::engine::Results,
)> {
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
        Some(Ok(run)) => {
            let errors = view.computed.map_or(0, |c| c.out_of_date.len());
            if errors > 0 {
                ui.colored_label(
                    ui.visuals().error_fg_color,
                    format!(
                        "Out of date: the project has {errors} error(s) (listed with the data warnings); these are the last good results and nothing was computed from the invalid input."
                    ),
                );
            }
            Some((run, &run.results))
        }
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

/// The season the worker computed for the Water balance and Crop curves
/// tabs, with a year picker; `None` (after an empty state) when there is none.
pub fn season_with_picker<'a>(
    ui: &mut Ui,
    view: &View<'a>,
    commands: &mut Vec<Command>,
) -> Option<&'a crate::compute::SeasonView> {
    let (_, r) = engine_results(
        ui,
        view,
        "A planting's daily root-zone balance appears here once the scheme is computed.",
    )?;
    let season = view.computed.and_then(|c| c.season.as_ref());
    let Some(season) = season else {
        empty_state(
            ui,
            "No planting to show",
            "Select a planting (or a block) in the scheme tree.",
        );
        return None;
    };
    let asked = match season {
        Ok(s) => (s.request.planting.clone(), s.year),
        Err(e) => {
            year_picker(ui, r, None, commands);
            empty_state(ui, "This season cannot be shown", e);
            return None;
        }
    };
    ui.horizontal(|ui| {
        ui.label(format!("Planting {}", asked.0));
        year_picker(ui, r, Some(asked.1), commands);
    });
    season.as_ref().ok()
}

fn year_picker(
    ui: &mut Ui,
    r: &offtake_core::engine::Results,
    current: Option<i32>,
    commands: &mut Vec<Command>,
) {
    use chrono::Datelike;
    let first = r.start.year();
    let last = (r.start + chrono::Days::new(r.days.saturating_sub(1) as u64)).year();
    let design = r.headworks().map(|h| h.design_year.start_year());
    let text = |y: i32| {
        if Some(y) == design {
            format!("{y} (design year)")
        } else {
            y.to_string()
        }
    };
    let mut chosen = current;
    egui::ComboBox::from_label("Season starting in")
        .selected_text(current.map_or_else(|| "—".to_owned(), text))
        .show_ui(ui, |ui| {
            for y in first..=last {
                ui.selectable_value(&mut chosen, Some(y), text(y));
            }
        });
    if chosen != current
        && let Some(y) = chosen
    {
        commands.push(Command::SetSeasonYear(y));
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

/// How the blocks below a canal (`None`: the whole scheme) are delivered, in
/// one sentence for the Demand and Canal capacity views and their "How was
/// this computed?" (DESIGN.md "Delivery").
pub fn delivery_sentence(project: &offtake_core::project::Project, canal: Option<&str>) -> String {
    use offtake_core::project::DeliveryMode;
    let canals: Vec<&str> = match canal {
        Some(c) => project.canals_below(c),
        None => project.canals.iter().map(|c| c.id.as_str()).collect(),
    };
    let blocks: Vec<_> = project
        .blocks
        .iter()
        .filter(|b| canals.contains(&b.canal.as_str()))
        .collect();
    if blocks.is_empty() {
        return String::new();
    }
    let mut parts: Vec<(String, usize)> = Vec::new();
    for b in &blocks {
        let d = b.delivery.describe();
        match parts.iter_mut().find(|p| p.0 == d) {
            Some(p) => p.1 += 1,
            None => parts.push((d, 1)),
        }
    }
    let list: Vec<String> = parts.iter().map(|(d, n)| format!("{n} by {d}")).collect();
    let on_demand = blocks
        .iter()
        .any(|b| matches!(b.delivery, DeliveryMode::OnDemand));
    let assumed = blocks
        .iter()
        .filter(|b| b.outlet_stream_size_ls.is_none())
        .count();
    let mut s = format!(
        "Flows are what the block outlets deliver (24-hour means): of {} block{}, {}.",
        blocks.len(),
        if blocks.len() == 1 { "" } else { "s" },
        list.join(", ")
    );
    s.push_str(
        " Under rotation within the block each day one share of the block's area takes its turn \
         and is brought back to its strategy's target; continuous flow spreads each cycle's \
         requirement evenly; no day's delivery exceeds the outlet's stream size over its hours.",
    );
    if on_demand {
        s.push_str(
            " Blocks on demand take a planting's whole water on the day its strategy asks, so their \
             daily flows come in pulses.",
        );
    }
    if assumed > 0 {
        let _ = write!(
            s,
            " {assumed} outlet stream size{} assumed (never limiting).",
            if assumed == 1 { " is" } else { "s are" }
        );
    }
    s
}
