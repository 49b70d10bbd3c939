//! The app keeps the user's files (issue 14): `offtake-app PATH` opens PATH;
//! on first start the demo is copied into the user's data folder and opened
//! (and saved) there; restoring after a crash keeps the project's path, so
//! its relative weather path still resolves; opening a hand-written file
//! says before the first save that its comments cannot be kept.

#![allow(clippy::unwrap_used, clippy::expect_used)]

mod support;

use std::path::{Path, PathBuf};

use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::command::Command;
use support::{H, demo_file, demo_weather, settle};

fn harness(app: OfftakeApp) -> H {
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app)
}

/// The demo project and weather copied into `dir` with their relative layout.
fn demo_copy(dir: &Path) -> PathBuf {
    let project = dir.join("demo-scheme/scheme.ron");
    let weather = dir.join("demo-weather/weather.csv");
    for (from, to) in [(demo_file(), &project), (demo_weather(), &weather)] {
        std::fs::create_dir_all(to.parent().unwrap()).unwrap();
        std::fs::copy(from, to).unwrap();
    }
    project
}

fn doc_path(app: &OfftakeApp) -> Option<PathBuf> {
    app.document.as_ref().and_then(|d| d.path.clone())
}

fn weather_days(h: &H) -> Option<usize> {
    h.state()
        .computed
        .as_ref()
        .and_then(|c| c.weather.as_ref())
        .map(|w| w.dates.len())
}

#[test]
fn the_path_on_the_command_line_is_opened() {
    let dir = tempfile::tempdir().unwrap();
    let project = demo_copy(dir.path());
    let data = dir.path().join("data");
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_at_start(Some(&project), &data, None);
    assert_eq!(doc_path(&app), Some(project.clone()));
    assert!(!data.exists(), "no demo copied when a project is named");
    // A file that cannot be read says so, and no demo is opened instead.
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_at_start(Some(&dir.path().join("missing.ron")), &data, None);
    assert!(app.project().is_none());
    let message = app.state.message.clone().unwrap_or_default();
    assert!(message.contains("missing.ron"), "{message}");
}

#[test]
fn first_start_copies_the_demo_into_the_data_folder_and_saves_there() {
    let dir = tempfile::tempdir().unwrap();
    let data = dir.path().join("data");
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_at_start(None, &data, None);
    let path = doc_path(&app).expect("the demo is open from a file");
    assert!(
        path.starts_with(&data),
        "{} is not in the data folder",
        path.display()
    );
    let mut h = harness(app);
    settle(&mut h);
    assert!(
        weather_days(&h).is_some_and(|n| n > 9_000),
        "the demo's weather is found beside it"
    );
    // Ctrl+S (File › Save) writes the copy in the data folder.
    let source_before = std::fs::read(demo_file()).unwrap();
    h.state_mut().document.as_mut().unwrap().project.scheme.name = "My demo (invented)".into();
    h.state_mut().push(Command::Save);
    h.run();
    let saved = std::fs::read_to_string(&path).unwrap();
    assert!(saved.contains("My demo (invented)"));
    assert_eq!(
        std::fs::read(demo_file()).unwrap(),
        source_before,
        "the repository's demo is untouched"
    );
    // The next start opens the user's copy as it is.
    let mut again = OfftakeApp::new().without_dialogs();
    again.open_at_start(None, &data, None);
    assert_eq!(again.project().unwrap().scheme.name, "My demo (invented)");
}

#[test]
fn restoring_after_a_crash_keeps_the_projects_path() {
    let dir = tempfile::tempdir().unwrap();
    let project = demo_copy(dir.path());
    let recovery = dir.path().join("state/recovery.ron");
    let mut first = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    first.open_file(&project);
    first.document.as_mut().unwrap().project.scheme.name = "Unsaved edit (invented)".into();
    first.autosave_now();
    assert!(recovery.is_file());
    drop(first); // the "crash"

    let app = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    let mut h = harness(app);
    h.run();
    h.get_by_label("Restore").click();
    settle(&mut h);
    assert_eq!(doc_path(h.state()), Some(project.clone()));
    assert_eq!(
        h.state().project().unwrap().scheme.name,
        "Unsaved edit (invented)"
    );
    assert!(
        h.state().document.as_ref().unwrap().is_dirty(),
        "restored work is not saved yet"
    );
    assert!(
        weather_days(&h).is_some_and(|n| n > 9_000),
        "the relative weather path resolves against the project's folder"
    );
    // File › Save writes back to the project's own file.
    h.state_mut().push(Command::Save);
    h.run();
    assert!(
        std::fs::read_to_string(&project)
            .unwrap()
            .contains("Unsaved edit (invented)")
    );
    assert!(!recovery.exists());
}

#[test]
fn a_hand_written_file_is_announced_before_the_first_save_and_kept() {
    let dir = tempfile::tempdir().unwrap();
    let project = demo_copy(dir.path());
    let text = std::fs::read_to_string(&project).unwrap();
    let hand_written = format!("// My notes on this scheme (invented).\n// Second line.\n{text}");
    std::fs::write(&project, &hand_written).unwrap();
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(&project);
    let opened = app.state.message.clone().unwrap_or_default();
    assert!(
        opened.contains("hand-written comments") && opened.contains("scheme.ron.original"),
        "{opened}"
    );
    app.save_to(&project);
    let saved = app.state.message.clone().unwrap_or_default();
    assert!(saved.contains("is kept as"), "{saved}");
    let original = offtake_io::project_file::original_path(&project);
    assert_eq!(std::fs::read_to_string(original).unwrap(), hand_written);
}
