//! Headless tests of the app with the computation engine plugged in: the demo
//! scheme (invented, `demo-projects/`) shows the headworks design flow that
//! the engine (the same call `offtake run` makes) computes for it, and edits
//! move it as they should. Every wait on the background worker goes through
//! `Worker::wait` (via `wait_for_recompute`), so the tests are deterministic.

use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::command::{Command, ItemRef, Selection, Tab};
use offtake_app::edit;
use offtake_app::fields::format_sig;
use offtake_core::project::PlantingArea;

mod support;
use support::{demo_file, headworks_design_flow_ls, settle};

fn demo_harness() -> support::H {
    support::open_demo(Harness::builder(), egui::vec2(1500.0, 950.0))
}

/// What `offtake run` computes for the demo: the same engine call on the
/// project and weather read from disk.
fn engine_design_flow_ls() -> f64 {
    let path = demo_file();
    let project = offtake_io::project_file::load_project(&path).expect("demo project");
    let libraries = offtake_io::library::Libraries::builtin().expect("libraries");
    let weather = offtake_io::weather::import_weather_file(
        &offtake_io::project_file::weather_path(&path, &project),
        &offtake_io::weather::ImportOptions::default(),
    )
    .expect("demo weather");
    let r = offtake_core::engine::run_scenario(
        &project,
        None,
        &libraries.crops,
        &libraries.soils,
        &weather.days,
    )
    .expect("engine");
    r.headworks().expect("headworks").design_flow_ls
}

#[test]
fn demo_shows_the_headworks_design_flow_the_engine_computes() {
    let mut h = demo_harness();
    let app_q = headworks_design_flow_ls(&h);
    let cli_q = engine_design_flow_ls();
    assert!(
        (app_q - cli_q).abs() < 1e-9 * cli_q.max(1.0),
        "app {app_q} l/s, engine {cli_q} l/s"
    );
    h.get_by_label("Canal capacity").click();
    h.run();
    // The table shows it to 3 significant figures, with the unit in the header.
    h.get_by_label("Design flow\n(l/s)");
    h.get_by_label("Duty\n(l/s/ha)");
    h.get_by_label("Seasonal volume\n(Mm³)");
    assert!(
        h.query_all_by_label(&format_sig(cli_q, 3)).count() >= 1,
        "design flow {} shown",
        format_sig(cli_q, 3)
    );
    // It explains itself.
    h.get_by_label("How was this computed?").click();
    h.run();
    h.get_by_label_contains("Weibull plotting positions m/(n+1)");
    h.get_by_label_contains("Required capacity = design flow × 24 h");
    h.get_by_label_contains("recomputed in");
}

#[test]
fn changing_a_planting_date_changes_the_headworks_design_flow() {
    let mut h = demo_harness();
    let before = headworks_design_flow_ls(&h);
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            "C1-rice".to_owned(),
        ))));
    h.run();
    let field = h.get_by_label("First planting");
    field.focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("First planting").type_text("03-01");
    h.run();
    h.key_press(Key::Enter);
    settle(&mut h);
    let p = h.state().project().expect("demo");
    let rice = p
        .plantings
        .iter()
        .find(|p| p.id == "C1-rice")
        .expect("planting");
    assert_eq!((rice.first_planting.month, rice.first_planting.day), (3, 1));
    let after = headworks_design_flow_ls(&h);
    assert!(
        (after - before).abs() > 1.0,
        "rice planted in March instead of June moves the headworks design flow: {before} → {after} l/s"
    );
    // Undo brings the exact figure back.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert!((headworks_design_flow_ls(&h) - before).abs() < 1e-9);
}

#[test]
fn adding_a_block_then_undo_restores_the_design_flow() {
    let mut h = demo_harness();
    let before = headworks_design_flow_ls(&h);
    // A new 400 ha block on the main canal, planted with the demo's rice.
    let project = h.state().project().expect("demo").clone();
    let mut block = edit::new_block(&project, "main");
    block.area_ha = 400.0;
    block.soil.clone_from(&project.blocks[0].soil);
    let mut rice = project
        .plantings
        .iter()
        .find(|p| p.id == "C1-rice")
        .expect("rice")
        .clone();
    rice.id = edit::fresh_id(&project, "planting");
    rice.block.clone_from(&block.id);
    rice.area = PlantingArea::PercentOfBlock(100.0);
    h.state_mut().push(Command::Edit(edit::add_block(block)));
    settle(&mut h);
    h.state_mut().push(Command::Edit(edit::add_planting(rice)));
    settle(&mut h);
    let grown = headworks_design_flow_ls(&h);
    assert!(
        grown > before + 50.0,
        "400 ha more rice raises the design flow: {before} → {grown} l/s"
    );
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert_eq!(h.state().project(), Some(&project));
    assert!((headworks_design_flow_ls(&h) - before).abs() < 1e-9);
}

#[test]
fn invalid_field_shows_its_error_and_keeps_the_project_and_results() {
    let mut h = demo_harness();
    let before = h.state().project().expect("demo").clone();
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Block(
            "C1".to_owned(),
        ))));
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
    // The value is kept, the project stays open with every other item, and
    // the error is still shown beside the field.
    let p = h.state().project().expect("project still open");
    assert_eq!(p.blocks.len(), before.blocks.len());
    assert_eq!(p.plantings, before.plantings);
    assert!((p.block("C1").expect("C1").method.application_efficiency - 1.5).abs() < 1e-12);
    h.get_by_label("Application efficiency must be between 1 % and 100 %");
    // Results are still there (an invalid project is reported, never lost).
    assert!(
        h.state()
            .computed
            .as_ref()
            .is_some_and(|c| c.engine.is_some())
    );
    // Nothing is computed from the invalid block (issue 15): the last good
    // results stay, marked out of date, and the status bar says so.
    let c = h.state().computed.as_ref().expect("computed");
    assert!(matches!(c.engine, Some(Ok(_))), "last good results kept");
    assert!(
        c.out_of_date
            .iter()
            .any(|e| e.starts_with("block \"C1\": Application efficiency Ea")),
        "{:?}",
        c.out_of_date
    );
    h.get_by_label("1 error in the project — results out of date");
    // Undo: the project is valid again and the results are current.
    h.state_mut().push(Command::Undo);
    h.run();
    settle(&mut h);
    let c = h.state().computed.as_ref().expect("computed");
    assert!(c.out_of_date.is_empty(), "{:?}", c.out_of_date);
}

#[test]
fn every_results_tab_draws_from_the_cached_results() {
    let mut h = demo_harness();
    for tab in [
        Tab::Demand,
        Tab::WaterBalance,
        Tab::CropCurves,
        Tab::Rotation,
        Tab::Compare,
        Tab::CanalCapacity,
    ] {
        h.get_by_label(tab.title()).click();
        h.run();
        assert_eq!(h.state().state.tab, tab);
    }
    // The Water balance tab asked for the design year's season of a planting.
    let season = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.season.clone())
        .expect("season asked");
    let season = season.expect("season computed");
    assert!(!season.days.is_empty());
    assert!(
        season
            .days
            .iter()
            .all(|d| d.depletion_mm >= -1e-9 && d.ks <= 1.0 + 1e-9)
    );
}

#[test]
fn export_writes_the_tables_and_workbook_of_offtake_run() {
    let mut h = demo_harness();
    let dir = tempfile::tempdir().expect("temp dir");
    h.state_mut().export_tables_to(dir.path());
    h.state_mut().wait_for_export(Duration::from_mins(2));
    h.run();
    h.get_by_label_contains("Wrote design_values.csv");
    for f in [
        "design_values.csv",
        "node_demand_daily.csv",
        "block_requirements_daily.csv",
        "demand_10day.csv",
        "demand_monthly.csv",
        "roster.csv",
        "results.xlsx",
    ] {
        assert!(dir.path().join(f).is_file(), "{f} written");
    }
    let design = std::fs::read_to_string(dir.path().join("design_values.csv")).expect("csv");
    let mut lines = design.lines();
    assert_eq!(
        lines.next(),
        Some(offtake_io::export::DESIGN_VALUES_HEADERS.join(",").as_str())
    );
    let head = lines
        .find(|l| l.starts_with("headworks,"))
        .expect("headworks row");
    let q: f64 = head
        .split(',')
        .nth(2)
        .expect("design flow")
        .parse()
        .expect("number");
    assert!((q - engine_design_flow_ls()).abs() < 1e-6 * q);
}

#[test]
fn water_balance_of_a_selected_planting_shows_taw_raw_and_ks() {
    let mut h = demo_harness();
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            "C1-bean".to_owned(),
        ))));
    settle(&mut h);
    h.get_by_label("Water balance").click();
    h.run();
    let season = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.season.clone())
        .expect("season asked")
        .expect("season computed");
    assert_eq!(season.request.planting, "C1-bean");
    // An upland crop runs the FAO-56 root-zone balance: TAW > RAW > 0 once
    // roots grow, depletion never beyond TAW, Ks in [0, 1] (eq. 84).
    assert!(
        season
            .days
            .iter()
            .any(|d| d.taw_mm > d.raw_mm && d.raw_mm > 0.0)
    );
    assert!(
        season
            .days
            .iter()
            .all(|d| d.depletion_mm <= d.taw_mm + 1e-6 && (0.0..=1.0 + 1e-9).contains(&d.ks))
    );
    h.get_by_label_contains("Planting C1-bean");
    // Another year asks the worker for that season only.
    let other = season.year - 1;
    h.state_mut().push(Command::SetSeasonYear(other));
    settle(&mut h);
    let again = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.season.clone())
        .expect("season asked")
        .expect("season computed");
    assert_eq!(again.year, other);
    assert_ne!(again.first_date, season.first_date);
}

#[test]
fn switching_to_a_scenario_shows_its_design_flow_everywhere() {
    // The warmer-drier scenario raises the headworks design flow. (Under the
    // demo's rotation within the block the headworks peak falls in the dry
    // season, so shifting wet-season rice to maize leaves it as it is.)
    let mut h = demo_harness();
    let base = headworks_design_flow_ls(&h);
    h.get_by_label("Compare").click();
    settle(&mut h);
    let comparison = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.comparison.clone())
        .expect("comparison asked");
    assert!(comparison.failed.is_empty(), "{:?}", comparison.failed);
    let warmer = comparison
        .columns
        .iter()
        .find(|c| c.name == "warmer-drier")
        .expect("demo scenario")
        .design_flow_ls;
    h.get_by_label("Headworks design flow (l/s)");
    h.state_mut()
        .push(Command::ShowScenario(Some("warmer-drier".to_owned())));
    settle(&mut h);
    let shown = headworks_design_flow_ls(&h);
    assert!(
        (shown - warmer).abs() < 1e-9 * warmer,
        "{shown} vs {warmer}"
    );
    assert!(
        (shown - base).abs() > 1.0,
        "the scenario changes the design flow"
    );
    h.get_by_label("Results of scenario warmer-drier");
    // Creating a scenario from the current plan is one undoable edit.
    let n = h.state().project().expect("demo").scenarios.len();
    h.get_by_label("Create scenario from the current plan")
        .click();
    settle(&mut h);
    assert_eq!(h.state().project().expect("demo").scenarios.len(), n + 1);
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert_eq!(h.state().project().expect("demo").scenarios.len(), n);
}

#[test]
fn a_planting_date_picked_on_the_calendar_is_one_undoable_edit() {
    let mut h = demo_harness();
    let before = headworks_design_flow_ls(&h);
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            "C1-rice".to_owned(),
        ))));
    h.run();
    h.get_by_label("Pick first planting on a calendar").click();
    h.run();
    // Choose the month, then the day.
    h.get_by_label("Month").click();
    h.run();
    h.query_all_by_label("March").last().expect("March").click();
    h.run();
    // March has 31 days in the calendar; February 28 (no leap day).
    h.get_by_label("31");
    h.query_all_by_label("1").last().expect("day 1").click();
    settle(&mut h);
    let p = h.state().project().expect("demo");
    let rice = p.planting("C1-rice").expect("planting");
    assert_eq!((rice.first_planting.month, rice.first_planting.day), (3, 1));
    // The calendar closed, and the design flow moved as when typed.
    h.get_by_label("Pick first planting on a calendar");
    assert!((headworks_design_flow_ls(&h) - before).abs() > 1.0);
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert!((headworks_design_flow_ls(&h) - before).abs() < 1e-9);
}

#[test]
fn a_long_list_of_data_warnings_starts_folded_under_its_count() {
    let mut h = demo_harness();
    h.state_mut().push(Command::Select(Selection::Scheme));
    h.run();
    let n = h.state().computed.as_ref().expect("results").warnings.len();
    assert!(n > 6, "the demo has {n} warnings");
    let header = format!("Data warnings ({n})");
    h.get_by_label(&header);
    assert!(
        h.query_all_by_label_contains("rain missing on 4 days")
            .next()
            .is_none(),
        "folded"
    );
    h.get_by_label(&header).click();
    h.run();
    h.get_by_label_contains("rain missing on 4 days");

    // The count in the status bar leads there too, from any selection.
    h.get_by_label(&header).click();
    h.state_mut()
        .push(Command::Select(Selection::Item(ItemRef::Planting(
            "C1-rice".to_owned(),
        ))));
    h.run();
    h.get_by_label(&format!("{n} data warnings")).click();
    h.run();
    h.run();
    assert_eq!(h.state().state.selection, Selection::Scheme);
    h.get_by_label_contains("rain missing on 4 days");
}
