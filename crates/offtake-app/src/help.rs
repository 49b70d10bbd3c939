//! Help windows: methods and sources, cautions, about.
//!
//! The text is plain data so the status bar, the Canal capacity tab and the
//! tests can reuse it.

use egui::{RichText, Ui};

pub use offtake_io::report::methods::{CAUTION_LINE, CAUTIONS, METHODS, MethodEntry};

/// Draws the Methods and sources window contents.
pub fn methods_ui(ui: &mut Ui) {
    ui.label(
        "Each step of the chain from weather to design flow uses a published method. \
         Equation numbers refer to the source named.",
    );
    ui.separator();
    egui::ScrollArea::vertical()
        .max_height(520.0)
        .show(ui, |ui| {
            for m in &METHODS {
                ui.label(RichText::new(m.quantity).strong());
                ui.label(m.method);
                ui.label(RichText::new(m.source).italics().weak());
                ui.add_space(6.0);
            }
        });
}

/// Draws the Cautions window contents.
pub fn cautions_ui(ui: &mut Ui) {
    for c in CAUTIONS {
        ui.label(c);
        ui.add_space(4.0);
    }
}

/// Draws the About window contents.
pub fn about_ui(ui: &mut Ui) {
    ui.heading("Offtake");
    ui.label(format!("Version {}", env!("CARGO_PKG_VERSION")));
    ui.label(
        "An irrigation crop-water-demand planner: from daily weather to net and gross \
         irrigation requirements, canal demand, design flows, capacities and rotation rosters.",
    );
    ui.label(format!("Licence: {}", env!("CARGO_PKG_LICENSE")));
    ui.label(
        "Plot colours: Okabe, M. and Ito, K. (2008), Color Universal Design — a palette \
         readable with the common forms of colour-vision deficiency.",
    );
    ui.label(CAUTION_LINE);
}
