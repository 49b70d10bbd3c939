//! Set-up shared by the app's interaction tests: the invented demo files,
//! a harness with the demo open, waiting for the background worker, and
//! typing into a field found by its label. Each test file is its own crate
//! and uses the part it needs.

#![allow(dead_code, reason = "each test crate uses a part of this module")]

use std::path::PathBuf;
use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::{Harness, HarnessBuilder};
use offtake_app::OfftakeApp;
use offtake_core::project::Project;
use offtake_core::scheme::NodeDesign;

/// A harness driving the whole app.
pub type H = Harness<'static, OfftakeApp>;

/// The invented demo scheme (`demo-projects/demo-scheme`).
pub fn demo_file() -> PathBuf {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    ))
}

/// The invented demo station's weather (`demo-projects/demo-weather`).
pub fn demo_weather() -> PathBuf {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-weather/weather.csv"
    ))
}

/// The app with the demo open in a window of `size`, its results computed;
/// file dialogs off (answers are given with `answer_next`).
pub fn open_demo(builder: HarnessBuilder<OfftakeApp>, size: egui::Vec2) -> H {
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(&demo_file());
    let mut h = builder
        .with_size(size)
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    settle(&mut h);
    h
}

/// Runs frames and lets the worker finish (twice: the first results bring
/// the design year, which asks for that season's balance).
pub fn settle(h: &mut H) {
    for _ in 0..2 {
        // Frames poll the running worker; on a busy machine they may outlast
        // the harness's step limit, which is not a failure here. The wait is
        // for the computation to finish, however long a loaded machine takes
        // (no test may depend on timing); a hung worker fails CI's time limit.
        let _ = h.run_ok();
        h.state_mut().wait_for_recompute(Duration::from_hours(1));
    }
    h.run();
}

/// The open project.
pub fn project(h: &H) -> Project {
    h.state().project().expect("a project is open").clone()
}

/// The headworks row of the design values on screen.
pub fn headworks(h: &H) -> NodeDesign {
    h.state()
        .computed
        .as_ref()
        .and_then(|c| c.engine.as_ref())
        .and_then(|e| e.as_ref().ok())
        .and_then(|r| r.results.headworks())
        .expect("headworks results")
        .clone()
}

/// The headworks design flow on screen (l/s).
pub fn headworks_design_flow_ls(h: &H) -> f64 {
    headworks(h).design_flow_ls
}

/// Replaces the text of the field labelled `label` (focus, select all,
/// type); the caller presses Enter or moves on.
pub fn replace_text(h: &mut H, label: &str, text: &str) {
    h.get_by_label(label).focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label(label).type_text(text);
    h.run();
}
