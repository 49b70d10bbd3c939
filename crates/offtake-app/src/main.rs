//! Starts the Offtake desktop planner.

fn main() -> eframe::Result {
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_title("Offtake — irrigation demand planner")
            .with_inner_size([1400.0, 900.0]),
        ..Default::default()
    };
    eframe::run_native(
        "Offtake",
        options,
        Box::new(|_cc| Ok(Box::new(offtake_app::OfftakeApp::default()))),
    )
}
