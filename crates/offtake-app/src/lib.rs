//! # offtake-app
//!
//! The Offtake desktop planner. `main.rs` only starts eframe; the app itself
//! is [`OfftakeApp`], a library type that the interaction tests build and
//! drive headless with egui_kittest.

/// The desktop application state.
#[derive(Debug, Default)]
pub struct OfftakeApp {}

impl OfftakeApp {
    /// Draws one frame of the whole window.
    pub fn ui(&mut self, ui: &mut egui::Ui) {
        ui.heading("Offtake");
    }
}

impl eframe::App for OfftakeApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        OfftakeApp::ui(self, ui);
    }
}
