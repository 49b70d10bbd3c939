//! The Rotation tab: when the available supply falls short, the roster of
//! turns (offtake-core `rotation`, computed by the engine) as a timeline —
//! one row per canal or block, one bar per turn — and as a table, for a
//! chosen irrigation year; with the supply indicators of the re-run.

use chrono::{NaiveDateTime, NaiveTime};
use egui::{RichText, Ui};
use egui_plot::{Bar, BarChart, Legend, Plot};
use offtake_core::engine::Results;
use offtake_core::project::Project;
use offtake_core::rotation::{Roster, RosterEntry};

use super::{View, empty_state, engine_results, no_project};
use crate::command::Command;
use crate::fields::{format_number, format_sig};
use crate::palette::Colours;
use crate::plot::date_to_x;

/// View state of the Rotation tab.
#[derive(Debug, Default)]
pub struct RotationTab {
    /// Start year of the irrigation year shown (`None` = the design year).
    pub year: Option<i32>,
}

fn datetime_x(t: NaiveDateTime) -> f64 {
    let day = t.date();
    let secs = (t.time() - NaiveTime::MIN).num_seconds() as f64;
    date_to_x(day) + secs / 86_400.0
}

fn opt(v: Option<f64>, f: impl Fn(f64) -> String) -> String {
    v.map_or_else(|| "—".to_owned(), f)
}

/// The entries of the roster inside the irrigation year starting in `year`.
fn entries_in<'a>(r: &Results, roster: &'a Roster, year: i32) -> Vec<&'a RosterEntry> {
    let Some(iy) = r.complete_years.iter().find(|y| y.start_year() == year) else {
        return roster.entries.iter().collect();
    };
    roster
        .entries
        .iter()
        .filter(|e| iy.contains(e.start.date()))
        .collect()
}

impl RotationTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows the rotation roster when supply is short: dated turns per canal and block, and the relative water supply of each block.",
            );
            return;
        };
        let Some((_, r)) = engine_results(
            ui,
            view,
            "The rotation roster appears here when an available supply is given and falls short.",
        ) else {
            return;
        };
        let Some(supply) = &r.supply else {
            empty_state(
                ui,
                "No rotation: no available supply is given",
                "Give the available supply at the headworks or a canal (Scheme › Computation options); when it falls short of the demand, the roster of turns appears here.",
            );
            return;
        };
        ui.label(format!(
            "Available supply at {}; short on {} days of the record. Rotation among the offtakes of {}. \
             Relative irrigation supply {}, relative water supply (Levine 1982) {}, FAO-33 yield loss {} (area-weighted).",
            node_name(project, &supply.supply_node),
            supply.short_days,
            node_name(project, &supply.rotation_node),
            opt(supply.relative_irrigation_supply, |v| format_number(v, 2)),
            opt(supply.relative_water_supply, |v| format_number(v, 2)),
            opt(supply.mean_yield_loss_pct, |v| format!("{} %", format_number(v, 1))),
        ));
        let Some(roster) = &supply.roster else {
            empty_state(
                ui,
                "The supply covers the demand: no roster needed",
                "Every offtake can run at its demand.",
            );
            return;
        };
        let design = r.headworks().map(|h| h.design_year.start_year());
        let year = self.year.or(design).unwrap_or(0);
        ui.horizontal(|ui| {
            let mut chosen = year;
            let text = |y: i32| {
                let label = r
                    .complete_years
                    .iter()
                    .find(|x| x.start_year() == y)
                    .map_or_else(|| y.to_string(), |x| x.label());
                if Some(y) == design {
                    format!("{label} (design year)")
                } else {
                    label
                }
            };
            egui::ComboBox::from_label("Irrigation year")
                .selected_text(text(year))
                .show_ui(ui, |ui| {
                    for y in &r.complete_years {
                        ui.selectable_value(&mut chosen, y.start_year(), text(y.start_year()));
                    }
                });
            if chosen != year {
                self.year = Some(chosen);
            }
        });
        let entries = entries_in(r, roster, year);
        ui.label(
            RichText::new(format!(
                "{} turns in this year ({} over the record). Each bar is one turn: the unit receives the flow shown in the table from the bar's start to its end.",
                entries.len(),
                roster.entries.len()
            ))
            .weak(),
        );
        // Units are canal or block ids in the roster; the engineer reads names.
        let units: Vec<String> = roster
            .units
            .iter()
            .map(|id| unit_name(project, id))
            .collect();
        let h = ui.available_height();
        ui.allocate_ui(
            egui::vec2(ui.available_width(), (h * 0.55).max(180.0)),
            |ui| {
                timeline(ui, &units, &entries, year, commands);
            },
        );
        ui.separator();
        turn_table(ui, project, &entries);
    }
}

/// "the headworks" or the canal's name, for a node id in the supply results.
fn node_name(project: &Project, id: &str) -> String {
    if id == "headworks" {
        "the headworks".to_owned()
    } else {
        unit_name(project, id)
    }
}

/// The name of a canal or block id ("Upper Distributary"), or the id.
fn unit_name(project: &Project, id: &str) -> String {
    project
        .canal(id)
        .map(|c| c.name.clone())
        .or_else(|| project.block(id).map(|b| b.name.clone()))
        .unwrap_or_else(|| id.to_owned())
}

/// The roster of one year as CSV: one line per turn.
fn roster_csv(units: &[String], entries: &[&RosterEntry]) -> String {
    use std::fmt::Write as _;
    let mut out = "cycle,turn,canal_or_block,start,end,flow_ls,volume_m3\n".to_owned();
    for e in entries {
        let unit = units
            .get(e.unit)
            .map_or(e.unit_name.as_str(), String::as_str);
        let _ = writeln!(
            out,
            "{},{},{},{},{},{},{}",
            e.cycle,
            e.turn,
            crate::plot::csv_field(unit),
            e.start.format("%Y-%m-%d %H:%M"),
            e.end.format("%Y-%m-%d %H:%M"),
            e.flow_ls,
            e.volume_m3
        );
    }
    out
}

fn timeline(
    ui: &mut Ui,
    units: &[String],
    entries: &[&RosterEntry],
    year: i32,
    commands: &mut Vec<Command>,
) {
    let id = format!("roster-{year}");
    let tb = crate::plot::toolbar(ui, &id, || roster_csv(units, entries), commands);
    let names = units.to_vec();
    let colours = Colours::for_ids(units);
    let mut plot = Plot::new("roster-timeline")
        .legend(Legend::default())
        .x_axis_label("Date")
        .y_axis_label("Canal or block")
        .x_axis_formatter(|mark, _| crate::plot::date_tick_label(mark.value, mark.step_size))
        .y_axis_formatter(move |mark, _| {
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
            for (u, name) in units.iter().enumerate() {
                let bars: Vec<Bar> = entries
                    .iter()
                    .filter(|e| e.unit == u)
                    .map(|e| {
                        let a = datetime_x(e.start);
                        let b = datetime_x(e.end);
                        Bar::new(u as f64, b - a)
                            .base_offset(a)
                            .width(0.6)
                            .horizontal()
                            .name(format!(
                                "{name}: {} to {}, {} l/s",
                                e.start,
                                e.end,
                                format_sig(e.flow_ls, 3)
                            ))
                    })
                    .collect();
                if !bars.is_empty() {
                    plot_ui.bar_chart(
                        BarChart::new(name.clone(), bars)
                            .color(colours.of(name))
                            .horizontal(),
                    );
                }
            }
        })
    });
    crate::plot::drawn(ui, &id, scope.response.rect, tb.export_image, commands);
}

fn turn_table(ui: &mut Ui, project: &Project, entries: &[&RosterEntry]) {
    const HEADERS: [&str; 7] = [
        "Cycle",
        "Turn",
        "Canal or block",
        "Start",
        "End",
        "Flow (l/s)",
        "Volume (m³)",
    ];
    let row_h = ui.text_style_height(&egui::TextStyle::Body) + 4.0;
    egui::Grid::new("roster-head")
        .num_columns(HEADERS.len())
        .min_col_width(110.0)
        .show(ui, |ui| {
            for h in HEADERS {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
        });
    egui::ScrollArea::vertical()
        .id_salt("roster-table")
        .show_rows(ui, row_h, entries.len(), |ui, rows| {
            egui::Grid::new("roster-rows")
                .num_columns(HEADERS.len())
                .min_col_width(110.0)
                .striped(true)
                .show(ui, |ui| {
                    for e in &entries[rows] {
                        ui.label(e.cycle.to_string());
                        ui.label(e.turn.to_string());
                        ui.label(unit_name(project, &e.unit_name));
                        ui.label(e.start.format("%Y-%m-%d %H:%M").to_string());
                        ui.label(e.end.format("%Y-%m-%d %H:%M").to_string());
                        ui.label(format_sig(e.flow_ls, 3));
                        ui.label(format_sig(e.volume_m3, 3));
                        ui.end_row();
                    }
                });
        });
}
