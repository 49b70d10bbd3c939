//! Headless tests of editing the scheme: tree, inspector, undo/redo, files.
//!
//! The scheme below is invented for the tests (no real place or scheme).

use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::command::{Command, ItemRef, Selection};
use offtake_app::edit;
use offtake_core::project::{Block, Canal, CanalKind, IrrigationMethod, Project, SchemeInfo};

/// An invented two-canal scheme: a main canal with one branch, one block on each.
fn invented_scheme() -> Project {
    let canal = |id: &str, name: &str, parent: Option<&str>, kind| Canal {
        id: id.into(),
        name: name.into(),
        parent: parent.map(Into::into),
        kind,
        conveyance_efficiency: 0.9,
        existing_capacity_m3s: None,
        operating_hours_per_day: 24.0,
        section: offtake_core::project::CanalSectionSpec::default(),
    };
    let block = |id: &str, name: &str, canal: &str, area_ha| Block {
        id: id.into(),
        name: name.into(),
        canal: canal.into(),
        area_ha,
        soil: "loam".into(),
        method: IrrigationMethod {
            name: "furrow".into(),
            application_efficiency: 0.6,
        },
        field_canal_efficiency: 0.85,
        delivery: offtake_core::project::DeliveryMode::OnDemand,
        outlet_stream_size_ls: None,
    };
    Project {
        scheme: SchemeInfo {
            name: "Test Flats (invented)".into(),
            notes: String::new(),
        },
        canals: vec![
            canal("main", "Main canal", None, CanalKind::Main),
            canal("east", "East branch", Some("main"), CanalKind::Branch),
        ],
        blocks: vec![
            block("b1", "Block M1", "main", 120.0),
            block("b2", "Block E1", "east", 80.0),
        ],
        ..Project::default()
    }
}

fn harness_with(project: Option<Project>) -> Harness<'static, OfftakeApp> {
    let mut app = OfftakeApp::new().without_dialogs();
    if let Some(p) = project {
        app.open_project(p);
        app.wait_for_recompute(Duration::from_hours(1));
    }
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app)
}

/// Runs frames, lets the worker finish, runs again to show its results.
fn settle(h: &mut Harness<'static, OfftakeApp>) {
    // While the worker computes, frames keep asking for a repaint to poll
    // it; on a busy machine that can outlast the harness's step limit.
    let _ = h.run_ok();
    h.state_mut().wait_for_recompute(Duration::from_hours(1));
    h.run();
}

fn scheme_area(h: &Harness<'static, OfftakeApp>) -> f64 {
    h.state().computed.as_ref().expect("results").scheme_area_ha
}

#[test]
fn file_new_gives_an_empty_scheme_with_next_step() {
    let mut h = harness_with(None);
    h.run();
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("New").click();
    settle(&mut h);
    assert!(h.state().document.is_some());
    h.get_by_label("(unnamed scheme)");
    h.get_by_label("Not saved yet");
    h.get_by_label_contains("No canals yet");
    // The next step is shown in the tree and in the Weather & ET₀ tab.
    assert_eq!(
        h.query_all_by_label_contains("No weather yet — File › Import weather…")
            .count(),
        2
    );
}

#[test]
fn tree_shows_canals_and_blocks_and_selection_fills_inspector_and_breadcrumb() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.get_by_label("Main canal (main)");
    h.get_by_label("East branch (branch)");
    h.get_by_label("Block E1 — 80 ha").click();
    h.run();
    assert_eq!(
        h.state().state.selection,
        Selection::Item(ItemRef::Block("b2".into()))
    );
    h.get_by_label("Selection: Test Flats (invented) › Main canal › East branch › Block E1");
    h.get_by_label("Application efficiency Ea");
    h.get_by_label("Field-canal efficiency Eb");
    // The worker summed the blocks: 120 + 80 ha.
    assert!((scheme_area(&h) - 200.0).abs() < 1e-9);
    h.get_by_label_contains("recomputed in");
}

#[test]
fn add_block_then_undo_restores_totals_and_redo_reapplies() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    let before = scheme_area(&h);
    let mut b = edit::new_block(h.state().project().expect("project"), "east");
    b.area_ha = 45.0;
    h.state_mut().push(Command::Edit(edit::add_block(b)));
    settle(&mut h);
    assert!((scheme_area(&h) - (before + 45.0)).abs() < 1e-9);
    h.get_by_label("Not saved yet");

    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert!((scheme_area(&h) - before).abs() < 1e-9);
    assert_eq!(h.state().project().expect("project").blocks.len(), 2);

    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    settle(&mut h);
    assert!((scheme_area(&h) - (before + 45.0)).abs() < 1e-9);
}

#[test]
fn delete_key_removes_a_canal_with_its_blocks_and_undo_puts_them_back() {
    let original = invented_scheme();
    let mut h = harness_with(Some(original.clone()));
    settle(&mut h);
    h.get_by_label("East branch (branch)").click();
    h.run();
    h.key_press(Key::Delete);
    settle(&mut h);
    let p = h.state().project().expect("project");
    assert!(p.canal("east").is_none());
    assert!(
        p.block("b2").is_none(),
        "the block on the branch goes with it"
    );
    assert!((scheme_area(&h) - 120.0).abs() < 1e-9);
    h.get_by_label("Edit").click();
    h.run();
    h.get_by_label("Undo delete canal east Ctrl+Z").click();
    settle(&mut h);
    assert_eq!(
        h.state().project(),
        Some(&original),
        "undo restores the exact document"
    );
}

#[test]
fn invalid_efficiency_shows_reason_and_range_and_is_kept() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.get_by_label("Block M1 — 120 ha").click();
    h.run();
    let field = h.get_by_label("Application efficiency Ea");
    field.focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Application efficiency Ea").type_text("150");
    h.run();
    h.get_by_label("Application efficiency must be between 1 % and 100 %");
    h.key_press(Key::Enter);
    settle(&mut h);
    // Kept in the document, not silently replaced, and still shown with its error.
    let b = h
        .state()
        .project()
        .expect("project")
        .block("b1")
        .expect("block");
    assert!((b.method.application_efficiency - 1.5).abs() < 1e-12);
    h.get_by_label("Application efficiency must be between 1 % and 100 %");
    // The project is still open and the edit can be undone.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    let b = h
        .state()
        .project()
        .expect("project")
        .block("b1")
        .expect("block");
    assert!((b.method.application_efficiency - 0.6).abs() < 1e-12);
}

#[test]
fn rename_scheme_in_inspector_is_one_undo_step() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.get_by_label("Test Flats (invented)").click();
    h.run();
    h.get_by_label("Scheme name").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Scheme name").type_text("Renamed Flats");
    h.key_press(Key::Enter);
    settle(&mut h);
    assert_eq!(h.state().project().expect("p").scheme.name, "Renamed Flats");
    assert_eq!(h.state().history.undo_len(), 1);
    h.state_mut().push(Command::Undo);
    settle(&mut h);
    assert_eq!(
        h.state().project().expect("p").scheme.name,
        "Test Flats (invented)"
    );
}

#[test]
fn save_then_open_round_trips() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("flats.ron");
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().save_to(&path);
    h.run();
    h.get_by_label("Saved");
    let saved = h.state().project().cloned();

    let mut h2 = harness_with(None);
    h2.state_mut().open_file(&path);
    settle(&mut h2);
    assert_eq!(h2.state().project().cloned(), saved);
    assert_eq!(h2.state().state.recent.first(), Some(&path));
    h2.get_by_label("Saved");
}

#[test]
fn opening_a_bad_file_reports_it_and_keeps_the_open_project() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("broken.ron");
    std::fs::write(&path, "(schema: 1, scheme: (name: \"x\"").expect("write");
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().open_file(&path);
    h.run();
    assert_eq!(h.state().project(), Some(&invented_scheme()));
    h.get_by_label_contains("Could not open");
}

#[test]
fn new_with_unsaved_changes_asks_first() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().push(Command::NewProject);
    h.run();
    h.get_by_label_contains("not saved. Discard them?");
    h.get_by_label("Cancel").click();
    h.run();
    assert_eq!(h.state().project(), Some(&invented_scheme()));
    h.state_mut().push(Command::NewProject);
    h.run();
    h.get_by_label("Discard changes").click();
    settle(&mut h);
    assert_eq!(h.state().project(), Some(&Project::default()));
}

#[test]
fn demo_scheme_opens_with_its_tree_and_validation() {
    let mut h = harness_with(None);
    h.state_mut().open_demo();
    settle(&mut h);
    let p = h.state().project().expect("demo project");
    assert!(!p.canals.is_empty());
    let root = p.root_canals()[0].clone();
    h.get_by_label(&format!("{} ({})", root.name, root.kind.label()));
    h.get_by_label("Saved");
    h.get_by_label_contains("recomputed in");
    // Every crop of the demo is in the built-in library; any other problem
    // validation finds is counted in the status bar.
    let problems = h
        .state()
        .computed
        .as_ref()
        .expect("results")
        .warnings
        .clone();
    assert!(
        problems.iter().all(|p| !p.contains("crop library")),
        "demo crops missing: {problems:?}"
    );
    // The demo validates: its seasons fit its blocks.
    assert!(
        problems.iter().all(|p| !p.contains("over the block area")),
        "demo over-planted: {problems:?}"
    );
    let count = match problems.len() {
        0 => "No data warnings".to_owned(),
        1 => "1 data warning".to_owned(),
        n => format!("{n} data warnings"),
    };
    h.get_by_label(&count);
}

#[test]
fn unknown_crop_is_reported_on_the_planting() {
    let mut p = invented_scheme();
    let mut planting = edit::new_planting(&p, "b1");
    planting.crop = "no-such-crop".into();
    p.plantings.push(planting.clone());
    let mut h = harness_with(Some(p));
    settle(&mut h);
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            planting.id.clone(),
        ))));
    settle(&mut h);
    h.get_by_label("Problems");
    h.get_by_label_contains("not in the crop library");
}

#[test]
fn crop_curves_tab_plots_library_kc_of_the_selected_planting() {
    let mut p = invented_scheme();
    let mut planting = edit::new_planting(&p, "b1");
    planting.crop = "maize-grain".into();
    p.plantings.push(planting.clone());
    let mut h = harness_with(Some(p));
    settle(&mut h);
    h.get_by_label("Crop curves").click();
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            planting.id.clone(),
        ))));
    settle(&mut h);
    h.get_by_label("Reset zoom");
    h.get_by_label("Export data (CSV)…");
    h.get_by_label("Export image (PNG)…");
    let computed = h.state().computed.clone().expect("results");
    let curve = &computed.kc_curves[0];
    let crop = h
        .state()
        .libraries
        .crop("maize-grain")
        .expect("library crop")
        .clone();
    assert_eq!(curve.season_days, crop.stages.total_days());
    // Mid-season days carry the library's Kc mid; the first day its Kc ini.
    let mid_day = (curve.stage_ends[1] + 1) as usize;
    assert!((curve.kc[mid_day - 1] - crop.kc.mid).abs() < 1e-12);
    assert!((curve.kc[0] - crop.kc.ini).abs() < 1e-12);
}

#[test]
fn demo_weather_is_read_in_the_background_and_plotted() {
    let mut h = harness_with(None);
    h.state_mut().open_demo();
    settle(&mut h);
    let computed = h.state().computed.clone().expect("results");
    let w = computed.weather.expect("demo weather series read");
    assert!(w.dates.len() > 365, "several years of days");
    assert_eq!(w.dates.len(), w.et0_mm.len());
    // Daily ET₀ is a depth per day: never negative, never absurd.
    assert!(
        w.et0_mm
            .iter()
            .flatten()
            .all(|v| v.is_finite() && (0.0..25.0).contains(v))
    );
    // The day-of-year climatology from offtake-core: one slot per calendar
    // day of a leap year, bands ordered.
    assert_eq!(w.et0_band.len(), 366);
    assert!(w.et0_band.iter().all(|b| b.p10 <= b.p50 && b.p50 <= b.p90));
    // The planted defects of the invented demo record are flagged (the
    // Tmin above Tmax typo of 2021-02-11), and days resting on FAO-56
    // missing-data procedures are marked per day.
    assert!(
        w.flags
            .iter()
            .any(|(d, t)| d.to_string() == "2021-02-11" && t.contains("tmin_above_tmax")),
        "{:?}",
        w.flags
    );
    assert_eq!(w.estimated.len(), w.dates.len());
    assert_eq!(w.estimated.iter().filter(|e| **e).count(), w.estimated_days);
    h.get_by_label("Weather & ET₀").click();
    h.run();
    h.get_by_label("Year");
    h.get_by_label("Export data (CSV)…");
}

#[test]
fn context_menu_adds_a_block_under_a_canal_and_selects_it() {
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.get_by_label("East branch (branch)").click_secondary();
    h.run();
    h.get_by_label("Add block").click();
    settle(&mut h);
    let p = h.state().project().expect("project");
    assert_eq!(p.blocks.len(), 3);
    let new = p.blocks.last().expect("new block");
    assert_eq!(new.canal, "east");
    assert_eq!(
        h.state().state.selection,
        Selection::Item(ItemRef::Block(new.id.clone()))
    );
    // A new block has no area yet; the inspector shows its fields to fill in.
    h.get_by_label("Area");
    assert_eq!(h.state().history.undo_label(), Some("add block"));
}

#[test]
fn scheme_edit_keeps_the_weather_results_and_station_edit_recomputes_them() {
    let mut h = harness_with(None);
    h.state_mut().open_demo();
    settle(&mut h);
    let before = h
        .state()
        .computed
        .clone()
        .expect("results")
        .weather
        .expect("weather");
    // An edit of the scheme reuses the cached ET₀.
    let p = h.state().project().expect("demo").clone();
    let mut scheme = p.scheme.clone();
    scheme.name.push_str(" (renamed)");
    h.state_mut()
        .push(Command::Edit(offtake_app::edit::DocEdit::SetScheme(scheme)));
    settle(&mut h);
    let same = h
        .state()
        .computed
        .clone()
        .expect("results")
        .weather
        .expect("weather");
    assert_eq!(same, before);
    // A higher station changes the ET₀ (lower air pressure, FAO-56 eq. 7).
    let mut w = p.weather.clone();
    w.elevation_m += 1500.0;
    h.state_mut()
        .push(Command::Edit(offtake_app::edit::DocEdit::SetWeather(w)));
    settle(&mut h);
    let after = h
        .state()
        .computed
        .clone()
        .expect("results")
        .weather
        .expect("weather");
    assert_ne!(after.et0_mm, before.et0_mm);
}

#[test]
fn unsaved_work_is_autosaved_and_offered_back_after_a_crash() {
    let dir = tempfile::tempdir().expect("temp dir");
    let recovery = dir.path().join("recovery.ron");
    // Session 1: unsaved edits, then the process "crashes" (no save, no exit).
    let mut first = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    first.open_project(invented_scheme());
    first.autosave_now();
    assert!(
        recovery.is_file(),
        "unsaved work is written to the recovery file"
    );
    drop(first);

    // Session 2 offers to restore it.
    let app = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    let mut h = Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    h.run();
    h.get_by_label_contains("ended with unsaved changes");
    h.get_by_label("Restore").click();
    settle(&mut h);
    assert_eq!(h.state().project(), Some(&invented_scheme()));

    // Saving the restored work removes the recovery file.
    let saved = dir.path().join("flats.ron");
    h.state_mut().save_to(&saved);
    h.run();
    assert!(!recovery.exists());
}

#[test]
fn discarding_recovered_work_removes_the_file() {
    let dir = tempfile::tempdir().expect("temp dir");
    let recovery = dir.path().join("recovery.ron");
    let mut first = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    first.open_project(invented_scheme());
    first.autosave_now();
    drop(first);
    let app = OfftakeApp::new()
        .without_dialogs()
        .with_recovery_file(recovery.clone());
    let mut h = Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    h.run();
    h.get_by_label("Discard the recovered work").click();
    h.run();
    assert!(!recovery.exists());
    assert!(h.state().project().is_none());
}

#[test]
fn weather_import_window_previews_then_attaches_the_file() {
    let weather = std::path::PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-weather/weather.csv"
    ));
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().preview_weather(weather.clone());
    h.state_mut().wait_for_import(Duration::from_secs(30));
    h.run();
    h.get_by_label_contains("days from 2001-01-01");
    h.get_by_label("Tmax (°C)");
    h.get_by_label("Use this weather").click();
    settle(&mut h);
    let p = h.state().project().expect("project");
    assert_eq!(std::path::Path::new(&p.weather.path), weather.as_path());
    assert!(h.state().import.is_none());
    // Undoable like every edit.
    h.state_mut().push(Command::Undo);
    settle(&mut h);
    assert!(
        h.state()
            .project()
            .expect("project")
            .weather
            .path
            .is_empty()
    );
}

#[test]
fn weather_import_of_a_foreign_header_shows_the_error_and_the_guess() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("station.csv");
    std::fs::write(
        &path,
        "Day,Max Temp (F),Min Temp (F),Precip (in)\n2031-01-01,80,60,0.1\n",
    )
    .expect("write");
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().preview_weather(path);
    h.state_mut().wait_for_import(Duration::from_secs(30));
    h.run();
    // The guessed mapping is shown for confirmation, column by column.
    assert_eq!(h.query_all_by_label("Max Temp (F)").count(), 2);
    assert_eq!(h.query_all_by_value("°F").count(), 2);
    h.get_by_label("Cancel").click();
    h.run();
    assert!(h.state().import.is_none());
    assert!(
        h.state()
            .project()
            .expect("project")
            .weather
            .path
            .is_empty()
    );
}

#[test]
fn gap_filling_choice_is_an_undoable_option() {
    use offtake_core::project::LongGaps;
    let mut h = harness_with(Some(invented_scheme()));
    settle(&mut h);
    h.state_mut().push(Command::Select(Selection::Options));
    h.run();
    h.get_by_label("Longer weather gaps filled by").click();
    h.run();
    h.get_by_label("Day-of-year climatology of the series")
        .click();
    settle(&mut h);
    assert_eq!(
        h.state()
            .project()
            .expect("p")
            .options
            .gap_filling
            .long_gaps,
        LongGaps::Climatology
    );
    h.state_mut().push(Command::Undo);
    settle(&mut h);
    assert_eq!(
        h.state()
            .project()
            .expect("p")
            .options
            .gap_filling
            .long_gaps,
        LongGaps::Fao56Procedures
    );
}
