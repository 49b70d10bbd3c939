//! Headless tests of the scenario editor on the invented demo scheme
//! (`demo-projects/`): a scenario made from the current plan is edited as a
//! cropping pattern, each change is one override in the scenario (never in
//! the base plan), the Compare tab recomputes it, and undo, delete and
//! inline validation behave. Every wait on the background worker goes
//! through `wait_for_recompute`, as in `tests/engine.rs`.

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::fields::format_sig;
use offtake_core::engine::{Results, ScenarioColumn};
use offtake_core::project::{
    Override, Project, Scenario, Strategy, ValidationContext, ValidationProblem,
};

mod support;
use support::{demo_file, project, replace_text as type_into, settle};

fn demo_harness() -> support::H {
    support::open_demo(Harness::builder(), egui::vec2(1500.0, 1000.0))
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
        .columns
        .into_iter()
        .find(|c| c.name == name)
        .expect("column of the scenario")
}

/// The engine results the app shows (the base plan, or the scenario shown
/// in every tab).
fn engine_results(h: &Harness<'static, OfftakeApp>) -> std::sync::Arc<Results> {
    h.state()
        .computed
        .as_ref()
        .and_then(|c| c.engine.clone())
        .expect("engine ran")
        .expect("the demo computes")
        .results
}

/// Total gross irrigation requirement of a block over the record (m³),
/// from the engine's demand at the block.
fn block_gir_m3(r: &Results, block: &str) -> f64 {
    let i = r
        .demand
        .network()
        .block_index(block)
        .expect("block in the network");
    r.demand.block_gir_slice_m3_day(i).iter().sum()
}

/// Total net irrigation requirement of a block over the record (m³).
fn block_nir_m3(r: &Results, block: &str) -> f64 {
    let i = r
        .demand
        .network()
        .block_index(block)
        .expect("block in the network");
    r.demand.block_nir_m3_day(i).iter().sum()
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

/// Scrolls the editor window to the control with this label and clicks it
/// (the window scrolls when its forms are taller than the screen).
fn click(h: &mut Harness<'static, OfftakeApp>, label: &str) {
    h.get_by_label(label).scroll_to_me();
    h.run();
    h.get_by_label(label).click();
    h.run();
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
    click(&mut h, "Remove this planting from the scenario");
    settle(&mut h);
    assert_eq!(scenario(&h, &name).overrides.len(), 2);
    h.get_by_label_contains("Removes planting C1-onion");
    // Delete the first from the list: only the removal is left.
    click(&mut h, "Delete override 1");
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
fn a_crop_shift_is_stored_with_its_share_and_strategy_and_a_bad_share_is_kept_with_its_reason() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    let share = h.get_by_label("Share moved");
    share.focus();
    h.run();
    h.get_by_label("Share moved").type_text("150");
    h.run();
    h.get_by_label("Share moved must be more than 0 % and at most 100 %");
    click(&mut h, "Crop losing area");
    click_last(&mut h, "Rice, paddy");
    click(&mut h, "Crop gaining area");
    click_last(&mut h, "Maize, field (grain)");
    // The new plantings get their own strategy: every 10 days.
    click(&mut h, "Own irrigation strategy for the new plantings");
    click(&mut h, "Strategy of the new plantings");
    click_last(&mut h, "Fixed interval");
    type_into(&mut h, "Interval of the new plantings", "10");
    h.key_press(Key::Enter);
    h.run();
    // A share out of range is applied as typed and kept; the scenario says
    // why it cannot be computed.
    click(&mut h, "Apply shift");
    settle(&mut h);
    let s = scenario(&h, &name);
    assert!(
        matches!(
            s.overrides.as_slice(),
            [Override::ShiftCropShare { share_pct, .. }] if (*share_pct - 150.0).abs() < 1e-12
        ),
        "{:?}",
        s.overrides
    );
    h.get_by_label("Cannot apply: share 150 % is outside (0, 100]");
    h.get_by_label("1. Share moved must be more than 0 % and at most 100 %");

    // 25 % between the same crops replaces it.
    type_into(&mut h, "Share moved", "25");
    click(&mut h, "Apply shift");
    settle(&mut h);
    let s = scenario(&h, &name);
    assert!(
        matches!(
            s.overrides.as_slice(),
            [Override::ShiftCropShare { from_crop, to_crop, share_pct, strategy: Some(Strategy::Interval { days: 10 }), season_length_days: None }]
                if from_crop == "rice-paddy" && to_crop == "maize-grain" && (*share_pct - 25.0).abs() < 1e-12
        ),
        "{:?}",
        s.overrides
    );
    h.get_by_label_contains("(new plantings irrigated: every 10 days)");
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

#[test]
fn a_canal_capacity_set_in_the_form_makes_that_canal_fall_short() {
    let mut h = demo_harness();
    // The Upper Distributary has no known capacity in the base plan; its
    // design flow comes from the engine's own base run.
    let base_run = engine_results(&h);
    let upper = base_run.canal("upper-dy").expect("upper distributary");
    assert!(upper.existing_capacity_ls.is_none());
    let design_ls = upper.design_flow_ls;
    assert!(design_ls > 0.0);
    let name = create_scenario(&mut h);
    let current = column(&h, "current");

    click(&mut h, "Canal to change");
    click_last(&mut h, "Upper Distributary (upper-dy)");
    click(&mut h, "Canal value to change");
    click_last(&mut h, "Existing capacity");
    click(&mut h, "Existing capacity known in scenario");
    // Half the design flow, typed in m³/s (the unit the field shows).
    let capacity_m3s = (design_ls / 2.0).round() / 1000.0;
    type_into(
        &mut h,
        "Existing capacity in scenario",
        &format!("{capacity_m3s}"),
    );
    h.key_press(Key::Enter);
    settle(&mut h);
    assert_eq!(
        scenario(&h, &name).overrides,
        vec![Override::SetCanalCapacity {
            canal: "upper-dy".to_owned(),
            existing_capacity_m3s: Some(capacity_m3s),
        }],
        "one override, the value typed (the first tick's start value replaced)"
    );
    assert_eq!(project(&h).canals, base_run_canals(), "base plan untouched");
    h.get_by_label_contains("Upper Distributary (upper-dy) has an existing capacity of");

    // The comparison: this scenario now falls short where the base plan
    // (the unchanged "current" scenario) does not.
    let changed = column(&h, &name);
    assert!(
        changed.shortfall_m3_per_year > current.shortfall_m3_per_year,
        "shortfall {} vs {} m³/year",
        changed.shortfall_m3_per_year,
        current.shortfall_m3_per_year
    );
    assert!(changed.shortfall_years >= 1);
    h.get_by_label_contains("canals with an existing capacity fall short in");

    // The scenario's own run: the capacity is the one typed and the extra
    // shortfall of the comparison is exactly this canal's.
    click(&mut h, "Show this scenario in every tab");
    settle(&mut h);
    let run = engine_results(&h);
    assert_eq!(run.scenario.as_deref(), Some(name.as_str()));
    let upper = run.canal("upper-dy").expect("upper distributary");
    assert!((upper.existing_capacity_ls.expect("capacity") - capacity_m3s * 1000.0).abs() < 1e-9);
    assert!(
        (upper.design_flow_ls - design_ls).abs() < 1e-9 * design_ls,
        "a capacity does not change the demand"
    );
    let short = upper.shortfall.as_ref().expect("shortfall computed");
    // Per complete irrigation year, the basis of every per-year figure.
    let extra = short.basis_volume_per_year_m3(&run.complete_years);
    assert!(extra > 0.0);
    assert!(
        ((changed.shortfall_m3_per_year - current.shortfall_m3_per_year) - extra).abs()
            < 1e-6 * extra,
        "comparison {} − {} vs canal {extra} m³/year",
        changed.shortfall_m3_per_year,
        current.shortfall_m3_per_year
    );
}

/// The canals of the demo file as saved.
fn base_run_canals() -> Vec<offtake_core::project::Canal> {
    offtake_io::project_file::load_project(&demo_file())
        .expect("demo")
        .canals
}

#[test]
fn a_block_field_canal_efficiency_set_in_the_form_scales_its_gir() {
    let mut h = demo_harness();
    // An outlet that never limits (no stream size entered: the block's own
    // largest delivery is assumed), so that halving Eb can double the GIR.
    let mut c1 = project(&h).block("C1").expect("C1").clone();
    c1.outlet_stream_size_ls = None;
    h.state_mut().push(offtake_app::command::Command::Edit(
        offtake_app::edit::DocEdit::SetBlock {
            id: c1.id.clone(),
            block: Box::new(c1),
        },
    ));
    settle(&mut h);
    let base_run = engine_results(&h);
    let base_gir = block_gir_m3(&base_run, "C1");
    let base_nir = block_nir_m3(&base_run, "C1");
    let other_gir = block_gir_m3(&base_run, "L1");
    let eb_base = project(&h).block("C1").expect("C1").field_canal_efficiency;
    assert!(base_gir > 0.0);
    let name = create_scenario(&mut h);

    click(&mut h, "Block to change");
    click_last(&mut h, "Clay 1 (C1)");
    click(&mut h, "Block value to change");
    click_last(&mut h, "Field-canal efficiency Eb");
    // Eb in %, as the field shows it: half the base value.
    let eb_new_pct = eb_base * 100.0 / 2.0;
    type_into(
        &mut h,
        "Field-canal efficiency Eb in scenario",
        &format!("{eb_new_pct}"),
    );
    h.key_press(Key::Enter);
    settle(&mut h);
    let s = scenario(&h, &name);
    assert_eq!(s.overrides.len(), 1);
    let Override::SetBlockEfficiency {
        block,
        method: None,
        field_canal_efficiency: Some(eb_new),
    } = &s.overrides[0]
    else {
        panic!("one block efficiency override, got {:?}", s.overrides);
    };
    assert_eq!(block, "C1");
    assert!((eb_new - eb_base / 2.0).abs() < 1e-12);
    h.get_by_label_contains("Clay 1 (C1): field-canal efficiency Eb");

    // GIR = NIR ÷ (Ea × Eb): halving Eb doubles the block's GIR and leaves
    // its NIR and the other blocks alone.
    click(&mut h, "Show this scenario in every tab");
    settle(&mut h);
    let run = engine_results(&h);
    assert_eq!(run.scenario.as_deref(), Some(name.as_str()));
    let gir = block_gir_m3(&run, "C1");
    let expected = base_gir * eb_base / eb_new;
    assert!(
        (gir - expected).abs() < 1e-9 * expected,
        "GIR {gir} m³, expected {expected} m³ (base {base_gir} m³ × {eb_base} / {eb_new})"
    );
    assert!(gir > base_gir);
    assert!((block_nir_m3(&run, "C1") - base_nir).abs() < 1e-9 * base_nir);
    assert!((block_gir_m3(&run, "L1") - other_gir).abs() < 1e-9 * other_gir);

    // One undo takes the change out again.
    h.key_press(Key::Escape);
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    assert!(scenario(&h, &name).overrides.is_empty());
}

/// Validation of a project with the built-in crop library, as the app runs it.
fn validate(p: &Project) -> Vec<ValidationProblem> {
    let libs = offtake_io::library::Libraries::builtin().expect("libraries");
    let season = |crop: &str| libs.crop(crop).map(|c| c.stages.total_days());
    p.validate(&ValidationContext {
        crops: &season,
        weather_range: None,
    })
}

#[test]
fn an_out_of_range_efficiency_is_kept_shown_validated_and_saved() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("kept.ron");
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    click(&mut h, "Block to change");
    click_last(&mut h, "Clay 1 (C1)");
    type_into(&mut h, "Field-canal efficiency Eb in scenario", "150");
    // The reason and the range while typing…
    h.get_by_label("Field-canal efficiency must be between 1 % and 100 %");
    h.key_press(Key::Enter);
    settle(&mut h);
    // …and the value is kept in the scenario, as typed (a fraction).
    let kept = Override::SetBlockEfficiency {
        block: "C1".to_owned(),
        method: None,
        field_canal_efficiency: Some(1.5),
    };
    assert_eq!(scenario(&h, &name).overrides, vec![kept.clone()]);
    // The field keeps showing it with the reason, and so does the list.
    assert_eq!(
        h.get_by_label("Field-canal efficiency Eb in scenario")
            .value()
            .as_deref(),
        Some("150")
    );
    h.get_by_label("Field-canal efficiency must be between 1 % and 100 %");
    h.get_by_label("1. Field-canal efficiency must be between 1 % and 100 %");
    // Project validation reports it under the scenario, and the editor
    // lists that problem.
    let problems = validate(&project(&h));
    let expected = format!(
        "under scenario {name:?}: block \"C1\": Field-canal efficiency Eb (field_canal_efficiency) = 1.5 is outside its physical range: it must be 0.01 to 1 fraction"
    );
    assert!(
        problems.iter().any(|p| p.to_string() == expected),
        "{problems:?}"
    );
    h.get_by_label_contains("Problems the project validation finds in this scenario");
    h.get_by_label("block \"C1\": Field-canal efficiency Eb (field_canal_efficiency) = 1.5 is outside its physical range: it must be 0.01 to 1 fraction");

    // Saved and loaded: the value survives, and loading gives the
    // validation problem, not an error.
    h.state_mut().save_to(&path);
    h.run();
    let loaded = offtake_io::project_file::load_project(&path).expect("loads");
    assert_eq!(
        loaded.scenario(&name).expect("scenario saved").overrides,
        vec![kept.clone()]
    );
    assert!(validate(&loaded).iter().any(|p| p.to_string() == expected));
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(&path);
    assert_eq!(
        app.project()
            .and_then(|p| p.scenario(&name))
            .map(|s| s.overrides.clone()),
        Some(vec![kept])
    );
}

#[test]
fn a_scenario_edited_out_of_range_is_named_and_the_others_still_compared() {
    let mut h = demo_harness();
    let name = create_scenario(&mut h);
    h.get_by_label("Temperature shift").focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by_label("Temperature shift").type_text("15");
    h.run();
    h.key_press(Key::Enter);
    settle(&mut h);
    // Kept in the scenario, with its reason at the field.
    assert!((scenario(&h, &name).weather.temperature_shift_c - 15.0).abs() < 1e-12);
    // The engine refuses it; the comparison names it and keeps the others.
    let c = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.comparison.clone())
        .expect("comparison asked");
    assert_eq!(c.failed.len(), 1);
    assert_eq!(c.failed[0].0, name);
    assert!(c.columns.iter().any(|col| col.name == "current"));
    assert!(c.columns.iter().all(|col| col.name != name));
    h.get_by_label_contains("This scenario cannot be computed");
    h.get_by_label_contains(&format!("Scenario {name} cannot be computed"));
}
