//! The Canal capacity tab: the node hydrograph with design flow and existing
//! capacity, and the table of design values per canal.

use egui::{RichText, Ui};

use super::{View, empty_state, no_project};
use crate::command::{Command, ItemRef, Selection};
use crate::fields::format_number;

/// View state of the Canal capacity tab.
#[derive(Debug, Default)]
pub struct CanalCapacityTab {}

impl CanalCapacityTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        ui.label(RichText::new(crate::help::CAUTION_LINE).color(ui.visuals().warn_fg_color));
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows each canal's demand hydrograph (l/s) with its design flow and existing capacity, and a table of design flows, duties and capacities.",
            );
            return;
        };
        if project.canals.is_empty() {
            empty_state(
                ui,
                "No canals yet",
                "Right-click the scheme in the tree › Add main canal.",
            );
            return;
        }
        let areas = view.computed.map_or(&[][..], |c| &c.canal_area_ha[..]);
        ui.label(
            RichText::new(
                "Design flows, duties and required capacities are not computed in this version yet; \
                 the table shows the canal inputs and command areas.",
            )
            .weak(),
        );
        egui::ScrollArea::both().show(ui, |ui| {
            egui::Grid::new("canal-table")
                .striped(true)
                .num_columns(7)
                .show(ui, |ui| {
                    for h in [
                        "Canal",
                        "Role",
                        "Takes from",
                        "Command area (ha)",
                        "Conveyance Ec (%)",
                        "Operation (h/day)",
                        "Existing capacity (m³/s)",
                    ] {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for c in &project.canals {
                        let me = Selection::Item(ItemRef::Canal(c.id.clone()));
                        if ui
                            .selectable_label(*view.selection == me, &c.name)
                            .clicked()
                        {
                            commands.push(Command::Select(me));
                        }
                        ui.label(c.kind.label());
                        ui.label(
                            c.parent
                                .as_deref()
                                .and_then(|p| project.canal(p))
                                .map_or("headworks", |p| p.name.as_str()),
                        );
                        let area = areas
                            .iter()
                            .find(|(id, _)| *id == c.id)
                            .map_or_else(|| "—".to_owned(), |(_, a)| format_number(*a, 1));
                        ui.label(area);
                        ui.label(format_number(c.conveyance_efficiency * 100.0, 1));
                        ui.label(format_number(c.operating_hours_per_day, 1));
                        ui.label(
                            c.existing_capacity_m3s
                                .map_or_else(|| "unknown".to_owned(), |q| format_number(q, 3)),
                        );
                        ui.end_row();
                    }
                });
        });
    }
}
