//! Headless tests of the crop and soil library editors.
//!
//! The scheme is invented for the tests (no real place or scheme).

use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_core::project::{Project, SchemeInfo};

fn invented_project() -> Project {
    Project {
        scheme: SchemeInfo {
            name: "Library Flats (invented)".into(),
            notes: String::new(),
        },
        ..Project::default()
    }
}

fn harness(project: Project) -> Harness<'static, OfftakeApp> {
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_project(project);
    app.wait_for_recompute(Duration::from_secs(10));
    Harness::builder()
        .with_size(egui::vec2(1500.0, 1000.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app)
}

/// Kc at the middle of the mid-season stage in the plotted curve.
fn plotted_kc_at(h: &Harness<'static, OfftakeApp>, day: f64) -> f64 {
    h.state()
        .library_editor
        .plotted_kc
        .iter()
        .find(|p| (p[0] - day).abs() < 0.5)
        .expect("the plotted curve covers the day")[1]
}

#[test]
fn copy_a_library_crop_edit_kc_mid_changes_the_curve_and_undo_restores_it() {
    let mut h = harness(invented_project());
    h.run();
    h.get_by_label("Crops…").click();
    h.run();
    h.get_by_label("Maize, field (grain) (maize-grain)").click();
    h.run();
    // Library maize: stages 30/40/50/30 d, Kc mid 1.2 (FAO-56 Tables 11-12 in
    // the shipped library); day 90 lies in the mid-season stage.
    assert!((plotted_kc_at(&h, 90.0) - 1.2).abs() < 1e-9);
    h.get_by_label("Copy to my crops").click();
    h.run();
    h.run();
    let project = h.state().project().expect("open").clone();
    assert_eq!(project.user_crops.len(), 1);
    let id = project.user_crops[0].id.clone();
    assert_eq!(id, "maize-grain-mine");
    assert_eq!(
        h.state().library_editor.crop.as_deref(),
        Some("maize-grain-mine")
    );

    h.get_by_label("Kc mid").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Kc mid").type_text("1.05");
    h.key_press(Key::Enter);
    h.run();
    h.run();
    let crop = &h.state().project().expect("open").user_crops[0];
    assert!((crop.kc.mid - 1.05).abs() < 1e-12);
    assert!((plotted_kc_at(&h, 90.0) - 1.05).abs() < 1e-9);

    // Ctrl+Z with no text field focused undoes the Kc edit.
    h.key_press(Key::Escape);
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
    let crop = &h.state().project().expect("open").user_crops[0];
    assert!((crop.kc.mid - 1.2).abs() < 1e-12);
    assert!((plotted_kc_at(&h, 90.0) - 1.2).abs() < 1e-9);
}

#[test]
fn an_invalid_kc_is_kept_and_its_reason_shown() {
    let mut h = harness(invented_project());
    h.run();
    h.get_by_label("Crops…").click();
    h.run();
    h.get_by_label("Maize, field (grain) (maize-grain)").click();
    h.run();
    h.get_by_label("Copy to my crops").click();
    h.run();
    h.run();
    h.get_by_label("Kc mid").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Kc mid").type_text("2.5");
    h.run();
    h.get_by_label("Crop coefficient must be between 0 and 2");
    h.key_press(Key::Enter);
    h.run();
    h.run();
    assert!((h.state().project().expect("open").user_crops[0].kc.mid - 2.5).abs() < 1e-12);
    h.get_by_label_contains("This crop is not usable yet: kc mid = 2.5");
    // The computation reports it with the project's other data warnings.
    h.state_mut().wait_for_recompute(Duration::from_secs(10));
    h.run();
    let warnings = &h.state().computed.as_ref().expect("results").warnings;
    assert!(
        warnings
            .iter()
            .any(|w| w.starts_with("my crop maize-grain-mine: kc mid = 2.5")),
        "{warnings:?}"
    );
}

#[test]
fn a_project_with_own_crop_and_soil_round_trips_through_save_and_open() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("library.ron");
    let mut h = harness(invented_project());
    h.run();
    h.get_by_label("Crops…").click();
    h.run();
    h.get_by_label("Maize, field (grain) (maize-grain)").click();
    h.run();
    h.get_by_label("Copy to my crops").click();
    h.run();
    h.get_by_label("Soils").click();
    h.run();
    let soil = h.state().libraries.soils[0].clone();
    h.get_by_label(&format!("{} ({})", soil.name, soil.id))
        .click();
    h.run();
    h.get_by_label("Copy to my soils").click();
    h.run();
    h.run();
    let saved = h.state().project().cloned().expect("open");
    assert_eq!(saved.user_crops.len(), 1);
    assert_eq!(saved.user_soils.len(), 1);
    h.state_mut().save_to(&path);
    h.run();
    h.get_by_label("Saved");

    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(&path);
    assert_eq!(app.project().cloned(), Some(saved));
}
