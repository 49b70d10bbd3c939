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
    app.wait_for_recompute(Duration::from_hours(1));
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
    h.state_mut().wait_for_recompute(Duration::from_hours(1));
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

/// An invented scheme: one canal, one block, four plantings (three of grain
/// maize in different windows, one of cotton).
fn invented_scheme() -> Project {
    use offtake_app::edit::{new_block, new_canal, new_planting};
    use offtake_core::project::MonthDay;
    let mut p = invented_project();
    let canal = new_canal(&p, None);
    p.canals.push(canal.clone());
    let mut block = new_block(&p, &canal.id);
    block.area_ha = 40.0;
    block.soil = "loam".into();
    p.blocks.push(block.clone());
    for (crop, month) in [
        ("maize-grain", 3),
        ("cotton", 4),
        ("maize-grain", 7),
        ("maize-grain", 11),
    ] {
        let mut pl = new_planting(&p, &block.id);
        pl.crop = crop.into();
        pl.area = offtake_core::project::PlantingArea::Hectares(5.0);
        pl.first_planting = MonthDay { month, day: 1 };
        p.plantings.push(pl);
    }
    p
}

fn crops_of(h: &Harness<'static, OfftakeApp>) -> Vec<(String, String)> {
    h.state()
        .project()
        .expect("open")
        .plantings
        .iter()
        .map(|p| (p.id.clone(), p.crop.clone()))
        .collect()
}

#[test]
fn use_for_all_plantings_re_points_every_planting_of_the_crop_in_one_undo_step() {
    let scheme = invented_scheme();
    let maize: Vec<String> = scheme
        .plantings
        .iter()
        .filter(|p| p.crop == "maize-grain")
        .map(|p| p.id.clone())
        .collect();
    assert_eq!(maize.len(), 3);
    let mut h = harness(scheme);
    h.run();
    let before = crops_of(&h);
    h.get_by_label("Crops…").click();
    h.run();
    h.get_by_label("Maize, field (grain) (maize-grain)").click();
    h.run();
    h.get_by_label("Copy to my crops").click();
    h.run();
    h.run();
    let copy = h.state().project().expect("open").user_crops[0].id.clone();
    assert_eq!(copy, "maize-grain-mine");
    // The offer names the original crop and how many plantings it changes.
    h.get_by_label(&format!(
        "Changes 3 plantings of the base plan: {}.",
        maize.join(", ")
    ));
    h.get_by_label("Use for all plantings of Maize, field (grain)")
        .click();
    h.run();
    h.run();
    let after = crops_of(&h);
    for (id, crop) in &after {
        if maize.contains(id) {
            assert_eq!(crop, &copy, "planting {id} grows the copy");
        } else {
            assert_eq!(crop, "cotton", "planting {id} keeps its crop");
        }
    }
    h.get_by_label("No planting of the base plan grows Maize, field (grain) (maize-grain).");
    h.get_by_label("3 plantings of the base plan grow this crop.");

    // One undo puts all three back on the library crop; the copy stays.
    h.key_press(Key::Escape);
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
    assert_eq!(crops_of(&h), before);
    assert_eq!(h.state().project().expect("open").user_crops.len(), 1);
    h.get_by_label_contains("Changes 3 plantings of the base plan");
    // Redo is one step too.
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    h.run();
    h.run();
    assert_eq!(crops_of(&h), after);
}
