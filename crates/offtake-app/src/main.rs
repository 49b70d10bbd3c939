//! Starts the Offtake desktop planner (opening the invented demo scheme).

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
        Box::new(|_cc| {
            let mut app = offtake_app::OfftakeApp::new()
                .with_recovery_file(offtake_app::recovery::default_recovery_path());
            app.open_demo();
            Ok(Box::new(app))
        }),
    )
}
