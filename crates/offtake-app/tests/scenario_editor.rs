//! Headless tests of the scenario editor on the invented demo scheme
//! (`demo-projects/`): a scenario made from the current plan is edited as a
//! cropping pattern, each change is one override in the scenario (never in
//! the base plan), the Compare tab recomputes it, and undo, delete and
//! inline validation behave. Every wait on the background worker goes
//! through `wait_for_recompute`, as in `tests/engine.rs`.

use std::path::PathBuf;
use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::fields::format_sig;
use offtake_core::engine::ScenarioColumn;
use offtake_core::project::{Override, Project, Scenario};

fn demo_file() -> PathBuf {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    ))
}

fn demo_harness() -> Harness<'static, OfftakeApp> {
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(&demo_file());
    let mut h = Harness::builder()
        .with_size(egui::vec2(1500.0, 1000.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    settle(&mut h);
    h
}

/// Runs frames and lets the worker finish.
fn settle(h: &mut Harness<'static, OfftakeApp>) {
    for _ in 0..2 {
        // Frames poll the running worker; on a busy machine they may outlast
        // the harness's step limit, which is not a failure here.
        let _ = h.run_ok();
        h.state_mut().wait_for_recompute(Duration::from_mins(2));
    }
    h.run();
}

fn project(h: &Harness<'static, OfftakeApp>) -> Project {
    h.state().project().expect("demo open").clone()
}

fn scenario(h: &Harness<'static, OfftakeApp>, name: &str) -> Scenario {
    project(h).scenario(name).expect("scenario").clone()
}

fn column(h: &Harness<'static, OfftakeApp>, name: &str) -> ScenarioColumn {
    h.state()
        .computed
        .as_ref()
        .and_then(|c| c.comparison.clone())
        .expect("comparison asked")
        .expect("scenarios computed")
        .columns
        .into_iter()
        .find(|c| c.name == name)
        .expect("column of the scenario")
}

/// Opens the Compare tab and creates a scenario from the current plan; the
/// editor opens on it. Returns its name.
fn create_scenario(h: &mut Harness<'static, OfftakeApp>) -> String {
    h.get_by_label("Compare").click();
    settle(h);
    let before = project(h).scenarios.len();
    h.get_by_label("Create scenario from the current plan")
        .click();
    settle(h);
    let p = project(h);
    assert_eq!(p.scenarios.len(), before + 1);
    let name = p.scenarios.last().expect("new scenario").name.clone();
    assert!(scenario(h, &name).overrides.is_empty());
    assert_eq!(h.state().scenario_editor.scenario.as_deref(), Some(&*name));
    name
}

/// Clicks the last node with this label (a combo box option: the popup is
/// drawn after the table, which may show the same crop name).
fn click_last(h: &mut Harness<'static, OfftakeApp>, label: &str) {
    h.query_all_by_label(label)
        .last()
        .unwrap_or_else(|| panic!("no {label:?} on screen"))
        .click();
    h.run();
}

#[test]
fn changing_a_rice_planting_to_maize_is_one_override_and_the_comparison_moves() {
    let mut h = demo_harness();
    let base = project(&h);
    let name = create_scenario(&mut h);
    // Before any change the new scenario computes as the base plan does
    // (the demo's "current" scenario has no overrides either).
    let same = column(&h, &name);
    assert!((same.headworks_volume_m3 - column(&h, "current").headworks_volume_m3).abs() < 1e-6);

    // In the editor: select the rice planting of block C1, pick maize.
    h.get_by_label("C1-rice").click();
    h.run();
    h.get_by_label("Crop in scenario").click();
    h.run();
    click_last(&mut h, "Maize, field (grain)");
    settle(&mut h);

    let s = scenario(&h, &name);
    assert_eq!(
        s.overrides,
        vec![Override::SetPlantingCrop {
            planting: "C1-rice".to_owned(),
            crop: "maize-grain".to_owned(),
        }]
    );
    // The base plan is untouched (only the scenario list changed).
    let after = project(&h);
    assert_eq!(after.plantings, base.plantings);
    assert_eq!(after.blocks, base.blocks);
    assert_eq!(after.canals, base.canals);
    assert_eq!(
        after.planting("C1-rice").expect("base rice").crop,
        "rice-paddy"
    );
    // The editor reads the change back as a sentence, and shows the
    // recomputed headworks figures beside the base plan's.
    h.get_by_label_contains("Planting C1-rice grows Maize, field (grain)");
    h.get_by_label_contains("Headworks in this scenario: design flow");

    // The Compare tab recomputed: the new scenario differs from the base.
    let changed = column(&h, &name);
    let current = column(&h, "current");
    assert!(
        (changed.headworks_volume_m3 - current.headworks_volume_m3).abs() > 1.0
            || (changed.design_flow_ls - current.design_flow_ls).abs() > 0.1,
        "maize instead of paddy rice on C1 changes the headworks: volume {} vs {} m³, design flow {} vs {} l/s",
        changed.headworks_volume_m3,
        current.headworks_volume_m3,
        changed.design_flow_ls,
        current.design_flow_ls
    );
    // …and the table shows the new volume (Mm³/year, 3 significant figures).
    let shown = format_sig(changed.headworks_volume_m3 / 1.0e6, 3);
    assert_ne!(
        shown,
        format_sig(current.headworks_volume_m3 / 1.0e6, 3),
        "the table shows a different headworks volume"
    );
    assert!(h.query_all_by_label(&shown).count() >= 1, "{shown} shown");

    // Ctrl+Z takes the override out again; the base plan never changed.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert!(scenario(&h, &name).overrides.is_empty());
    assert_eq!(project(&h).plantings, base.plantings);
}

#[test]
fn deleting_an_override_from_the_list_removes_it() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    h.get_by_label("C1-rice").click();
    h.run();
    h.get_by_label("Crop in scenario").click();
    h.run();
    click_last(&mut h, "Maize, field (grain)");
    settle(&mut h);
    // A second change of the same field replaces the first, never stacks.
    h.get_by_label("Crop in scenario").click();
    h.run();
    click_last(&mut h, "Cotton");
    settle(&mut h);
    let s = scenario(&h, &name);
    assert_eq!(
        s.overrides,
        vec![Override::SetPlantingCrop {
            planting: "C1-rice".to_owned(),
            crop: "cotton".to_owned(),
        }]
    );
    // Remove another planting: a second override.
    h.get_by_label("C1-onion").click();
    h.run();
    h.get_by_label("Remove this planting from the scenario")
        .click();
    settle(&mut h);
    assert_eq!(scenario(&h, &name).overrides.len(), 2);
    h.get_by_label_contains("Removes planting C1-onion");
    // Delete the first from the list: only the removal is left.
    h.get_by_label("Delete override 1").click();
    settle(&mut h);
    assert_eq!(
        scenario(&h, &name).overrides,
        vec![Override::RemovePlanting {
            planting: "C1-onion".to_owned()
        }]
    );
    assert!(project(&h).planting("C1-onion").is_some(), "base keeps it");
}

#[test]
fn a_weather_change_that_is_not_a_number_is_refused_with_its_reason() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    let before = project(&h);
    let field = h.get_by_label("Temperature shift");
    field.focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Temperature shift").type_text("warm");
    h.run();
    h.get_by_label("“warm” is not a number");
    h.key_press(Key::Enter);
    settle(&mut h);
    assert_eq!(project(&h), before, "the project is kept as it was");
    assert!(scenario(&h, &name).weather.is_identity());

    // A number is stored in the scenario's weather change (°C).
    h.get_by_label("Temperature shift").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Temperature shift").type_text("1.5");
    h.run();
    h.key_press(Key::Enter);
    settle(&mut h);
    let w = scenario(&h, &name).weather;
    assert!((w.temperature_shift_c - 1.5).abs() < 1e-12);
    assert_eq!(project(&h).plantings, before.plantings);
    h.get_by_label_contains("Weather: temperature +1.5 °C");
}

#[test]
fn a_crop_shift_is_stored_with_its_share_and_a_bad_share_is_refused() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    let share = h.get_by_label("Share moved");
    share.focus();
    h.run();
    h.get_by_label("Share moved").type_text("150");
    h.run();
    h.get_by_label("Share moved must be more than 0 % and at most 100 %");
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Share moved").type_text("25");
    h.run();
    h.get_by_label("Crop losing area").click();
    h.run();
    click_last(&mut h, "Rice, paddy");
    h.get_by_label("Crop gaining area").click();
    h.run();
    click_last(&mut h, "Maize, field (grain)");
    h.get_by_label("Apply shift").click();
    settle(&mut h);
    let s = scenario(&h, &name);
    assert!(matches!(
        s.overrides.as_slice(),
        [Override::ShiftCropShare { from_crop, to_crop, share_pct, .. }]
            if from_crop == "rice-paddy" && to_crop == "maize-grain" && (*share_pct - 25.0).abs() < 1e-12
    ));
    // The plan table lists the new maize plantings the shift makes.
    h.get_by_label("C1-rice-maize-grain");
}

#[test]
fn renaming_a_scenario_keeps_the_editor_on_it_and_a_taken_name_is_refused() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    h.get_by_label("Scenario name").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Scenario name").type_text("current");
    h.run();
    h.get_by_label("Another scenario is already named \"current\"");
    h.key_press(Key::Enter);
    settle(&mut h);
    assert!(project(&h).scenario(&name).is_some(), "not renamed");
    h.get_by_label("Scenario name").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Scenario name").type_text("maize-on-clay-1");
    h.run();
    h.key_press(Key::Enter);
    settle(&mut h);
    let p = project(&h);
    assert!(p.scenario(&name).is_none());
    assert!(p.scenario("maize-on-clay-1").is_some());
    assert_eq!(
        h.state().scenario_editor.scenario.as_deref(),
        Some("maize-on-clay-1")
    );
    h.get_by_label("Edit maize-on-clay-1");
    // The switcher's "Edit scenario…" opens the editor on the scenario shown.
    h.state_mut()
        .push(offtake_app::command::Command::ShowScenario(Some(
            "current".to_owned(),
        )));
    settle(&mut h);
    assert_eq!(h.state().state.scenario.as_deref(), Some("current"));
    // The editor sits on the right: the switcher row stays reachable.
    h.get_by_label("Edit scenario…").click();
    h.run();
    assert_eq!(
        h.state().scenario_editor.scenario.as_deref(),
        Some("current")
    );
}
