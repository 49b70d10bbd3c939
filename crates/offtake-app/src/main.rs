//! Starts the Offtake desktop planner: `offtake-app [PATH]` opens the
//! project file PATH, or without one the invented demo scheme in the user's
//! data folder (copied there on first start; see `offtake_app::startup`).

fn main() -> eframe::Result {
    let argument = offtake_app::startup::project_argument(std::env::args_os());
    let shipped = std::env::current_exe()
        .ok()
        .and_then(|exe| offtake_app::startup::shipped_demo_dir(&exe));
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_title("Offtake — irrigation demand planner")
            .with_inner_size([1400.0, 900.0]),
        ..Default::default()
    };
    eframe::run_native(
        "Offtake",
        options,
        Box::new(move |_cc| {
            let mut app = offtake_app::OfftakeApp::new()
                .with_recovery_file(offtake_app::recovery::default_recovery_path());
            app.open_at_start(
                argument.as_deref(),
                &offtake_app::startup::user_data_dir(),
                shipped.as_deref(),
            );
            Ok(Box::new(app))
        }),
    )
}
