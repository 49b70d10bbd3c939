//! What a new user does in the app alone (issue "Done when"): start a scheme
//! from nothing, lay out two canals with blocks and plantings, import the
//! weather, read the headworks design flow, compare two cropping patterns and
//! export the workbook — every step through the real UI, by label; file
//! choices are answered in advance as the user would pick them in the dialog.
//!
//! The figures are checked against the engine run on the saved project (the
//! call `offtake run` makes), so the app shows what the command computes.
//! Weather: the invented demo station (`demo-projects/demo-weather`).

use std::path::Path;
use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::command::Tab;

mod support;
use support::{H, demo_weather, project, settle};

/// Clicks `label` (the last one on screen: a combo's popup is drawn last).
fn click(h: &mut H, label: &str) {
    h.query_all_by_label(label)
        .last()
        .unwrap_or_else(|| panic!("no {label:?} on screen"))
        .click();
    // Background work (import, recompute) keeps a spinner turning, which
    // can outlast the harness's step limit; not a failure here.
    let _ = h.run_ok();
}

fn menu(h: &mut H, menu: &str, entry: &str) {
    click(h, menu);
    click(h, entry);
}

fn context(h: &mut H, node: &str, entry: &str) {
    h.get_by_label(node).click_secondary();
    h.run();
    click(h, entry);
    settle(h);
}

/// Types `text` into the field labelled `label`, replacing what is there,
/// and presses Enter.
fn type_into(h: &mut H, label: &str, text: &str) {
    support::replace_text(h, label, text);
    h.key_press(Key::Enter);
    settle(h);
}

fn pick(h: &mut H, combo: &str, option: &str) {
    click(h, combo);
    click(h, option);
    settle(h);
}

/// The headworks design flow (l/s) the engine computes for `project` saved
/// at `file`, as `offtake run` would.
fn engine_design_flow_ls(file: &Path) -> f64 {
    let project = offtake_io::project_file::load_project(file).expect("saved project");
    let libraries = offtake_io::library::Libraries::builtin()
        .expect("libraries")
        .for_project(&project);
    let weather = offtake_io::weather::load_project_weather(file, &project).expect("weather");
    offtake_core::engine::run_scenario(
        &project,
        None,
        &libraries.crops,
        &libraries.soils,
        &weather.series.days,
    )
    .expect("engine")
    .headworks()
    .expect("headworks")
    .design_flow_ls
}

/// Adds a block under `canal` with `area` ha of loam, surface irrigated at
/// Ea 55 % (typed in %, as the inspector shows efficiencies), and one
/// planting of `crop` on `date` (MM-DD).
fn add_block(h: &mut H, canal: &str, area: &str, crop: &str, date: &str) {
    context(h, canal, "Add block");
    type_into(h, "Area", area);
    pick(h, "Soil", "Loam");
    // A new block starts at typical surface-irrigation efficiencies, said so.
    h.get_by_label_contains("typical starting values for surface irrigation");
    type_into(h, "Application efficiency Ea", "55");
    assert!(
        h.query_all_by_label_contains("typical starting values")
            .next()
            .is_none()
    );
    let block = project(h).blocks.last().expect("new block").clone();
    assert!((block.method.application_efficiency - 0.55).abs() < 1e-12);
    context(h, &format!("{} — {} ha", block.name, area), "Add planting");
    pick(h, "Crop", crop);
    type_into(h, "First planting", date);
}

#[test]
fn a_new_user_builds_a_two_canal_scheme_compares_two_patterns_and_exports_the_workbook() {
    let dir = tempfile::tempdir().expect("temp dir");
    let mut h = Harness::builder()
        .with_size(egui::vec2(1500.0, 950.0))
        .build_ui_state(
            |ui, app: &mut OfftakeApp| app.ui(ui),
            OfftakeApp::new().without_dialogs(),
        );
    h.run();

    // A scheme from nothing, saved at once so the weather path is relative.
    menu(&mut h, "File", "New");
    settle(&mut h);
    let file = dir.path().join("two-canals.ron");
    h.state_mut().answer_next(&file);
    menu(&mut h, "File", "Save as…");
    assert!(file.is_file(), "saved");

    h.get_by_label("(unnamed scheme)").click();
    h.run();
    type_into(&mut h, "Scheme name", "Two canals (invented)");

    // Two canals: a main canal and a branch below it.
    click(&mut h, "Add main canal");
    settle(&mut h);
    context(&mut h, "New main canal (main)", "Add canal below");
    assert_eq!(project(&h).canals.len(), 2);

    // Blocks and plantings on both canals.
    add_block(&mut h, "New main canal (main)", "120", "Cotton", "05-15");
    add_block(
        &mut h,
        "New branch canal (branch)",
        "80",
        "Maize, field (grain)",
        "06-01",
    );
    let p = project(&h);
    assert_eq!(p.blocks.len(), 2);
    assert_eq!(p.plantings.len(), 2);

    // Weather through the import window.
    h.state_mut().answer_next(demo_weather());
    menu(&mut h, "File", "Import weather…");
    h.state_mut().wait_for_import(Duration::from_mins(1));
    h.run();
    h.get_by_label_contains("days from 2001-01-01");
    click(&mut h, "Use this weather");
    settle(&mut h);
    // The station: the invented demo station (18° N, 350 m, wind at 10 m).
    click(&mut h, &demo_weather().display().to_string());
    type_into(&mut h, "Latitude", "18");
    type_into(&mut h, "Elevation", "350");
    type_into(&mut h, "Wind measurement height", "10");

    // The design flow is on screen and is what the engine computes.
    h.key_press_modifiers(Modifiers::COMMAND, Key::S);
    settle(&mut h);
    let q = support::headworks_design_flow_ls(&h);
    assert!(q > 0.0);
    assert!((q - engine_design_flow_ls(&file)).abs() < 1e-9 * q);
    click(&mut h, Tab::CanalCapacity.title());
    // The design table and the plot legend show it (3 significant figures).
    let shown = offtake_app::fields::format_sig(q, 3);
    assert!(
        h.query_all_by_label(&shown).count() >= 1,
        "{shown} l/s in the design table"
    );
    h.get_by_label(&format!("Design flow {shown} l/s"));

    // The demand at the headworks, stacked by crop under the crops' names.
    click(&mut h, Tab::Demand.title());
    h.get_by_label("GIR, Cotton");
    h.get_by_label("GIR, Maize, field (grain)");

    // A second cropping pattern: the branch block grows cotton instead.
    click(&mut h, Tab::Compare.title());
    settle(&mut h);
    click(&mut h, "Create scenario from the current plan");
    settle(&mut h);
    let maize = project(&h).plantings[1].id.clone();
    click(&mut h, &maize);
    pick(&mut h, "Crop in scenario", "Cotton");
    // The first alternative brings the plan as it is along as the baseline.
    let scenarios = project(&h).scenarios;
    assert_eq!(scenarios.len(), 2);
    assert_eq!(scenarios[0].name, offtake_app::tabs::compare::BASELINE_NAME);
    assert!(scenarios[0].overrides.is_empty());
    assert_eq!(scenarios[1].overrides.len(), 1);
    let comparison = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.comparison.clone())
        .expect("comparison asked");
    assert!(comparison.failed.is_empty(), "{:?}", comparison.failed);
    assert_eq!(comparison.columns.len(), 2);
    assert!(
        (comparison.columns[0].headworks_volume_m3 - comparison.columns[1].headworks_volume_m3)
            .abs()
            > 1.0,
        "the two patterns differ"
    );

    // The workbook.
    let out = dir.path().join("results");
    std::fs::create_dir(&out).expect("folder");
    h.state_mut().answer_next(&out);
    menu(&mut h, "File", "Export tables/workbook…");
    h.state_mut().wait_for_export(Duration::from_mins(2));
    h.run();
    h.get_by_label_contains("Wrote design_values.csv");
    assert!(out.join("results.xlsx").is_file());
    assert!(out.join("design_values.csv").is_file());
}
