//! The left panel: the scheme tree above the libraries and weather series.

use egui::{RichText, Ui};

use crate::command::Command;

/// Draws the left panel.
pub fn ui(ui: &mut Ui, project_open: bool, _commands: &mut Vec<Command>) {
    ui.label(RichText::new("Scheme").strong());
    if !project_open {
        ui.label("No project open.");
        ui.label("File › New starts a scheme; File › Open… opens one.");
    }
    ui.separator();
    ui.label(RichText::new("Libraries").strong());
    ui.collapsing("Crops", |ui| {
        if !project_open {
            ui.label("Open a project to see its crop library.");
        }
    });
    ui.collapsing("Soils", |ui| {
        if !project_open {
            ui.label("Open a project to see its soil library.");
        }
    });
    ui.separator();
    ui.label(RichText::new("Weather").strong());
    if project_open {
        ui.label("No weather yet — File › Import weather…");
    } else {
        ui.label("No weather series.");
    }
}
