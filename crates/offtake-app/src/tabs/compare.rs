//! The Compare tab: every scenario of the project side by side (offtake-core
//! `engine::compare_scenarios`, run by the worker) as a table and grouped
//! bars; the scenario switcher (which scenario the other tabs show) and
//! "create a scenario from the current plan".

use egui::{RichText, Ui};
use egui_plot::{Bar, BarChart, Legend, Plot};
use offtake_core::engine::{Comparison, ScenarioColumn};
use offtake_core::project::{Project, Scenario};

use super::{View, empty_state, no_project};
use crate::command::Command;
use crate::edit::DocEdit;
use crate::fields::{format_number, format_sig};
use crate::palette::Colours;

/// View state of the Compare tab.
#[derive(Debug, Default)]
pub struct CompareTab {}

fn opt(v: Option<f64>, f: impl Fn(f64) -> String) -> String {
    v.map_or_else(|| "—".to_owned(), f)
}

fn mm3(v: f64) -> String {
    format_sig(v / 1.0e6, 3)
}

/// Rows of the comparison table: title with unit, one value per scenario;
/// `crop_name` turns a crop id into its display name.
pub fn table_rows(
    c: &Comparison,
    crop_name: &dyn Fn(&str) -> String,
) -> Vec<(String, Vec<String>)> {
    let col = |f: &dyn Fn(&ScenarioColumn) -> String| c.columns.iter().map(f).collect::<Vec<_>>();
    let mut rows = vec![
        (
            "Headworks design flow (l/s)".to_owned(),
            col(&|s| format_sig(s.design_flow_ls, 3)),
        ),
        ("Design year".to_owned(), col(&|s| s.design_year.clone())),
        (
            "Headworks duty (l/s/ha)".to_owned(),
            col(&|s| opt(s.duty_ls_ha, |v| format_sig(v, 3))),
        ),
        (
            "Headworks volume, all seasons (Mm³/year)".to_owned(),
            col(&|s| mm3(s.headworks_volume_m3)),
        ),
    ];
    for season in &c.seasons {
        rows.push((
            format!("Headworks volume, {season} season (Mm³/year)"),
            col(&|s| {
                s.season_volumes
                    .iter()
                    .find(|v| v.season == *season)
                    .map_or_else(|| "—".to_owned(), |v| mm3(v.headworks_m3))
            }),
        ));
    }
    for crop in &c.crops {
        rows.push((
            format!("Area of {} (ha)", crop_name(crop)),
            col(&|s| {
                s.area_by_crop
                    .iter()
                    .find(|(c, _)| c == crop)
                    .map_or_else(|| "—".to_owned(), |(_, a)| format_sig(*a, 3))
            }),
        ));
    }
    rows.extend([
        (
            "Not delivered by too-small canals (Mm³ per complete irrigation year)".to_owned(),
            col(&|s| mm3(s.shortfall_m3_per_year)),
        ),
        (
            "Days of canal shortfall (days)".to_owned(),
            col(&|s| s.shortfall_days.to_string()),
        ),
        (
            "Reservoir evaporation (Mm³/year)".to_owned(),
            col(&|s| opt(s.storage_loss_m3, mm3)),
        ),
        (
            "Reservoir evaporation: method used, spread of Meyer, Penman, Rohwer (Mm³/year)"
                .to_owned(),
            col(&|s| match (s.storage_method, s.storage_spread_m3) {
                (Some(m), Some((lo, hi))) => format!("{m}; {}–{}", mm3(lo), mm3(hi)),
                _ => "—".to_owned(),
            }),
        ),
        (
            "Relative irrigation supply (–)".to_owned(),
            col(&|s| opt(s.relative_irrigation_supply, |v| format_number(v, 2))),
        ),
        (
            "Relative water supply, Levine 1982 (–)".to_owned(),
            col(&|s| opt(s.relative_water_supply, |v| format_number(v, 2))),
        ),
        (
            "FAO-33 yield loss where water is short (%)".to_owned(),
            col(&|s| opt(s.mean_yield_loss_pct, |v| format_number(v, 1))),
        ),
    ]);
    rows
}

/// Name of the scenario that keeps the base plan as it is, added with the
/// first alternative.
pub const BASELINE_NAME: &str = "current-plan";

fn fresh_name(project: &Project) -> String {
    (1..=10_000)
        .map(|i| format!("plan-{i}"))
        .find(|n| project.scenario(n).is_none())
        .unwrap_or_else(|| "plan".to_owned())
}

impl CompareTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab compares scenarios: seasonal volume, peak flow, shortfall and area served.",
            );
            return;
        };
        ui.horizontal(|ui| {
            let mut chosen = view.scenario.map(str::to_owned);
            egui::ComboBox::from_label("Results shown in every tab")
                .selected_text(view.scenario.map_or("Base plan", |s| s))
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut chosen, None, "Base plan");
                    for s in &project.scenarios {
                        ui.selectable_value(&mut chosen, Some(s.name.clone()), &s.name);
                    }
                });
            if chosen.as_deref() != view.scenario {
                commands.push(Command::ShowScenario(chosen));
            }
            // Scenario editor: edit the scenario shown.
            if ui
                .add_enabled(view.scenario.is_some(), egui::Button::new("Edit scenario…"))
                .on_hover_text("Change its crops, areas, planting windows, crop shifts and weather")
                .on_disabled_hover_text("Choose a scenario above to edit it (the base plan is edited in the scheme tree)")
                .clicked()
            {
                commands.push(Command::EditScenario(view.scenario.map(str::to_owned)));
            }
            if ui
                .button("Create scenario from the current plan")
                .on_hover_text(
                    "Adds a scenario equal to today's base plan (no overrides) to change into an alternative; \
                     the first one also adds \"current-plan\", the plan as it is, as the comparison's baseline",
                )
                .clicked()
            {
                let mut list = project.scenarios.clone();
                if list.is_empty() {
                    // The first alternative: keep the plan as it is beside
                    // it, so the comparison has its baseline.
                    list.push(Scenario {
                        name: BASELINE_NAME.to_owned(),
                        description: "The base plan as it is (no overrides), kept for comparison.".to_owned(),
                        overrides: Vec::new(),
                        weather: offtake_core::project::WeatherPerturbation::default(),
                    });
                }
                let name = fresh_name(project);
                // Scenario editor: the new scenario opens for editing.
                commands.push(Command::EditScenario(Some(name.clone())));
                list.push(Scenario {
                    name,
                    description: "Made from the base plan; its changes are listed in the scenario editor.".to_owned(),
                    overrides: Vec::new(),
                    weather: offtake_core::project::WeatherPerturbation::default(),
                });
                commands.push(Command::Edit(DocEdit::SetScenarios(list)));
            }
        });
        if project.scenarios.is_empty() {
            empty_state(
                ui,
                "No scenarios yet",
                "Scenarios are alternatives to the base cropping plan (crop shifts, planting dates, efficiencies, weather changes). \
                 Create one from the current plan above; the comparison of volumes, design flows and shortfalls appears here.",
            );
            return;
        }
        let Some(c) = view.computed.and_then(|c| c.comparison.as_ref()) else {
            empty_state(
                ui,
                "Computing the scenarios…",
                "Each scenario is computed in the background; the table appears when they finish.",
            );
            return;
        };
        for (name, e) in &c.failed {
            ui.label(
                RichText::new(format!("Scenario {name} cannot be computed: {e}"))
                    .color(ui.visuals().error_fg_color),
            );
        }
        if c.columns.is_empty() {
            empty_state(
                ui,
                "No scenario can be computed",
                "Correct the problems listed above (Edit scenario… shows each scenario's fields).",
            );
            return;
        }
        for s in &project.scenarios {
            // Scenario editor: one button per scenario.
            ui.horizontal(|ui| {
                if ui.button(format!("Edit {}", s.name)).clicked() {
                    commands.push(Command::EditScenario(Some(s.name.clone())));
                }
                if !s.description.is_empty() {
                    ui.label(RichText::new(format!("{}: {}", s.name, s.description)).weak());
                }
            });
        }
        let h = ui.available_height();
        ui.allocate_ui(
            egui::vec2(ui.available_width(), (h * 0.45).max(180.0)),
            |ui| {
                grouped_bars(ui, c, commands);
            },
        );
        ui.separator();
        egui::ScrollArea::both()
            .id_salt("compare-table")
            .show(ui, |ui| {
                egui::Grid::new("compare-grid")
                    .striped(true)
                    .show(ui, |ui| {
                        ui.label(RichText::new("Quantity").strong());
                        for s in &c.columns {
                            ui.label(RichText::new(&s.name).strong());
                        }
                        ui.end_row();
                        for (title, values) in table_rows(c, &|id| view.crop_name(id)) {
                            ui.label(title);
                            for v in values {
                                ui.label(v);
                            }
                            ui.end_row();
                        }
                    });
            });
    }
}

/// The grouped bars as CSV: headworks volume per scenario and season.
fn bars_csv(c: &Comparison) -> String {
    use std::fmt::Write as _;
    let mut out = "scenario,season,headworks_volume_mm3_per_year\n".to_owned();
    for s in &c.columns {
        for v in &s.season_volumes {
            let _ = writeln!(
                out,
                "{},{},{}",
                crate::plot::csv_field(&s.name),
                crate::plot::csv_field(&v.season),
                v.headworks_m3 / 1.0e6
            );
        }
    }
    out
}

/// Headworks volume per season (Mm³/year), bars grouped by scenario.
fn grouped_bars(ui: &mut Ui, c: &Comparison, commands: &mut Vec<Command>) {
    let tb = crate::plot::toolbar(ui, "compare-volumes", || bars_csv(c), commands);
    let names: Vec<String> = c.columns.iter().map(|s| s.name.clone()).collect();
    let n_seasons = c.seasons.len().max(1) as f64;
    let width = 0.8 / n_seasons;
    let colours = Colours::for_ids(&c.seasons);
    let mut plot = Plot::new("compare-bars")
        .legend(Legend::default())
        .y_axis_label("Headworks volume (Mm³/year)")
        .x_axis_label("Scenario")
        .x_axis_formatter(move |mark, _| {
            let i = mark.value.round();
            if (mark.value - i).abs() < 1e-6 && i >= 0.0 {
                names.get(i as usize).cloned().unwrap_or_default()
            } else {
                String::new()
            }
        });
    if tb.reset {
        plot = plot.reset();
    }
    let scope = ui.scope(|ui| {
        plot.show(ui, |plot_ui| {
            for (k, season) in c.seasons.iter().enumerate() {
                let offset = (k as f64 - (n_seasons - 1.0) / 2.0) * width;
                let bars: Vec<Bar> = c
                    .columns
                    .iter()
                    .enumerate()
                    .filter_map(|(i, s)| {
                        s.season_volumes
                            .iter()
                            .find(|v| v.season == *season)
                            .map(|v| {
                                Bar::new(i as f64 + offset, v.headworks_m3 / 1.0e6)
                                    .width(width * 0.95)
                                    .name(format!("{}, {season}", s.name))
                            })
                    })
                    .collect();
                plot_ui.bar_chart(
                    BarChart::new(format!("{season} season"), bars).color(colours.of(season)),
                );
            }
        })
    });
    crate::plot::drawn(
        ui,
        "compare-volumes",
        scope.response.rect,
        tb.export_image,
        commands,
    );
}
