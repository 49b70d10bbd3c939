//! Headless interaction tests: drive the real UI by accessible labels.

use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_app::command::{HelpWindow, Tab};

fn harness() -> Harness<'static, OfftakeApp> {
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(
            |ui, app: &mut OfftakeApp| app.ui(ui),
            OfftakeApp::new().without_dialogs(),
        )
}

#[test]
fn app_opens_with_menus_tabs_and_status_bar() {
    let mut h = harness();
    h.run();
    for menu in ["File", "Edit", "View", "Help"] {
        h.get_by_label(menu);
    }
    for tab in Tab::ALL {
        h.get_by_label(tab.title());
    }
    // Empty state explains the next step instead of a blank plot.
    h.get_by_label_contains("No project open — File › New starts one");
    // Status bar: recompute state, warnings, save state and the caution line.
    h.get_by_label("Nothing to compute");
    h.get_by_label("No data warnings");
    h.get_by_label("No project");
    h.get_by_label_contains("checked by a qualified engineer");
}

#[test]
fn clicking_a_tab_selects_it() {
    let mut h = harness();
    h.run();
    h.get_by_label("Canal capacity").click();
    h.run();
    assert_eq!(h.state().state.tab, Tab::CanalCapacity);
    h.get_by_label("Rotation").click();
    h.run();
    assert_eq!(h.state().state.tab, Tab::Rotation);
}

#[test]
fn file_menu_lists_every_entry() {
    let mut h = harness();
    h.run();
    h.get_by_label("File").click();
    h.run();
    for entry in [
        "New",
        "Open recent",
        "Save as…",
        "Import weather…",
        "Export tables/workbook…",
        "Export report…",
        "Export plot image…",
    ] {
        h.get_by_label(entry);
    }
    // Entries with a shortcut carry it in their label.
    h.get_by_label("Open… Ctrl+O");
    h.get_by_label("Save Ctrl+S");
}

#[test]
fn help_cautions_opens_the_cautions_text() {
    let mut h = harness();
    h.run();
    assert!(!h.state().state.help.cautions);
    h.get_by_label("Help").click();
    h.run();
    h.get_by_label("Cautions").click();
    h.run();
    assert!(h.state().state.help.cautions);
    h.get_by_label_contains("Over-topped canals flood land");
    h.get_by_label_contains("must be checked by a qualified engineer against local codes");
}

#[test]
fn help_methods_names_sources_and_equations() {
    let mut h = harness();
    h.run();
    h.get_by_label("Help").click();
    h.run();
    h.get_by_label_contains("Methods and sources").click();
    h.run();
    assert!(h.state().state.help.methods);
    h.get_by_label_contains("FAO-56 Penman–Monteith, eq. 6");
    h.get_by_label_contains("Hargreaves–Samani");
}

#[test]
fn f1_opens_help() {
    let mut h = harness();
    h.run();
    assert!(!h.state().state.help.methods);
    h.key_press(egui::Key::F1);
    h.run();
    assert!(h.state().state.help.methods);
    h.get_by_label_contains("Weibull plotting positions");
}

#[test]
fn status_bar_caution_link_opens_cautions() {
    let mut h = harness();
    h.run();
    h.get_by_label_contains("Planning estimates only").click();
    h.run();
    assert!(h.state().state.help.cautions);
}

#[test]
fn view_menu_hides_the_inspector() {
    let mut h = harness();
    h.run();
    h.get_by_label("View").click();
    h.run();
    h.get_by_label("Inspector panel").click();
    h.run();
    assert!(!h.state().state.panels.inspector);
}

#[test]
fn help_command_via_push_is_applied_at_end_of_frame() {
    let mut h = harness();
    h.state_mut()
        .push(offtake_app::command::Command::ShowHelp(HelpWindow::About));
    h.run();
    assert!(h.state().state.help.about);
    h.get_by_label_contains("Okabe");
}
