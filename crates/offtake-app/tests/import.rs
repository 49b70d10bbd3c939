//! Headless tests of the weather import window.
//!
//! The weather files are invented for the tests (no real station).

use std::fmt::Write as _;
use std::time::Duration;

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use offtake_app::OfftakeApp;
use offtake_core::project::{Project, SchemeInfo};
use offtake_core::weather_import::units::{TemperatureUnit, WindUnit};
use offtake_core::weather_import::{DateFormat, Quantity};

mod support;
use support::replace_text as type_into;

fn harness() -> Harness<'static, OfftakeApp> {
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_project(Project {
        scheme: SchemeInfo {
            name: "Import Flats (invented)".into(),
            notes: String::new(),
        },
        ..Project::default()
    });
    app.wait_for_recompute(Duration::from_secs(10));
    Harness::builder()
        .with_size(egui::vec2(1500.0, 1100.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app)
}

fn settle(h: &mut Harness<'static, OfftakeApp>) {
    support::settle(h);
}

/// Most background reads one `read` waits for in turn (a read can be
/// followed by another that the form starts); more is a failure.
const MAX_READS: usize = 3;

/// Waits for the weather import's background read, then settles the frames.
///
/// While the read runs, every frame draws a spinner and asks for another
/// frame, so `Harness::run` would exceed its step limit on a slow machine.
/// No frame is run until the read is done: one `step` handles a pending
/// click (Re-read starts its read in that frame), then the test blocks on
/// the read's channel, which returns as soon as the result arrives (the
/// timeout only guards against a hang; nothing depends on how long it
/// takes), and only then runs the frames.
fn read(h: &mut Harness<'static, OfftakeApp>) {
    h.step();
    let mut reads = 0;
    while h
        .state()
        .import
        .as_ref()
        .is_some_and(offtake_app::import::ImportJob::running)
    {
        assert!(reads < MAX_READS, "more than {MAX_READS} reads in a row");
        h.state_mut().wait_for_import(Duration::from_mins(10));
        reads += 1;
    }
    h.run();
    h.run();
}

/// An invented station file with foreign headers: °F, km/h, dd/mm/yyyy,
/// semicolon delimiter and decimal comma. Twenty days from 13 January 2031.
fn foreign_csv() -> String {
    let mut s = String::from(
        "Date;Max Temp (F);Min Temp (F);RH mean (%);Wind speed (km/h);Solar (MJ/m2);Precip (mm)\n",
    );
    for i in 0..20 {
        let day = 13 + i;
        let (d, m) = if day > 31 { (day - 31, 2) } else { (day, 1) };
        writeln!(
            s,
            "{d:02}/{m:02}/2031;{},{};{},4;55;7,2;18,5;{}",
            86 + i % 3,
            i % 10,
            60 + i % 4,
            if i % 5 == 0 { "3,5" } else { "0" }
        )
        .expect("write to a String");
    }
    s
}

#[test]
fn a_foreign_file_shows_the_guessed_mapping_and_once_used_its_et0_is_computed() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("station.csv");
    std::fs::write(&path, foreign_csv()).expect("write");
    let mut h = harness();
    settle(&mut h);
    h.state_mut().preview_weather(path.clone());
    read(&mut h);

    // The guessed mapping, column by column, with the file's units.
    let shown = |h: &Harness<'static, OfftakeApp>, column: &str| -> Vec<String> {
        h.query_all_by_label(column)
            .filter_map(|n| n.value())
            .collect()
    };
    assert_eq!(shown(&h, "Max Temp (F)"), ["Tmax", "°F"]);
    assert_eq!(shown(&h, "Min Temp (F)"), ["Tmin", "°F"]);
    assert_eq!(shown(&h, "Wind speed (km/h)"), ["Wind speed", "km/h"]);
    assert!(shown(&h, "Date").iter().any(|v| v == "Date"));
    {
        let job = h.state().import.as_ref().expect("window open");
        let mapping = job.settings.mapping.as_ref().expect("guessed mapping");
        assert_eq!(mapping.date_column, "Date");
        assert!(mapping.columns.iter().any(|c| c.header == "Max Temp (F)"
            && c.quantity == Quantity::Tmax(TemperatureUnit::Fahrenheit)));
        assert!(mapping.columns.iter().any(|c| matches!(
            c.quantity,
            Quantity::Wind {
                unit: WindUnit::KilometresPerHour,
                ..
            }
        )));
        let r = job.result.as_ref().expect("read");
        assert_eq!(r.days.len(), 20);
        assert!(r.fatal.is_none(), "{:?}", r.fatal);
    }
    // Preview in Offtake's units: 86.0 °F is 30 °C (°C = (°F − 32) × 5/9).
    h.get_by_label("2031-01-13");
    h.get_by_label("30");
    h.get_by_label_contains("20 days from 2031-01-13 to 2031-02-01");
    h.get_by_label("Quality report");

    // An impossible latitude is shown with its range and blocks Use.
    type_into(&mut h, "Station latitude", "95");
    h.get_by_label("Station latitude must be between -90 ° and 90 °");
    assert!(!h.state().import.as_ref().expect("open").usable());
    type_into(&mut h, "Station latitude", "-12.5");
    type_into(&mut h, "Station elevation", "420");
    h.key_press(Key::Escape);
    h.run();
    h.get_by_label("Use this weather").click();
    settle(&mut h);
    assert!(h.state().import.is_none());
    let w = h.state().project().expect("open").weather.clone();
    let settings = w.import.expect("import settings stored");
    assert_eq!(settings.date_format, Some(DateFormat::DayMonthYear));
    assert!(settings.mapping.is_some());
    assert!((w.latitude_deg + 12.5).abs() < 1e-12);
    assert!((w.elevation_m - 420.0).abs() < 1e-12);
    let weather = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.weather.as_ref())
        .expect("ET₀ computed from the imported file");
    assert_eq!(weather.dates.len(), 20);
    assert!(weather.et0_mm.iter().all(|e| e.is_some_and(|v| v > 0.0)));

    // One undo step takes the file, its settings and the station back.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    settle(&mut h);
    let w = &h.state().project().expect("open").weather;
    assert!(w.path.is_empty());
    assert!(w.import.is_none());
    assert!(w.latitude_deg.abs() < 1e-12);
}

#[test]
fn an_ambiguous_date_order_is_asked_for_never_guessed() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("ambiguous.csv");
    let mut text = String::from("date,tmax_c,tmin_c,rain_mm\n");
    for d in 1..=12 {
        writeln!(text, "{d:02}/03/2031,30,18,0").expect("write to a String");
    }
    std::fs::write(&path, text).expect("write");
    let mut h = harness();
    settle(&mut h);
    h.state_mut().preview_weather(path);
    read(&mut h);
    h.get_by_label_contains("do not say whether they are day/month or month/day");
    assert!(!h.state().import.as_ref().expect("open").usable());

    h.get_by_label("day/month/year").click();
    h.run();
    h.get_by_label("Re-read").click();
    read(&mut h);
    let job = h.state().import.as_ref().expect("open");
    assert!(job.usable());
    let r = job.result.as_ref().expect("read");
    assert_eq!(r.days[0].date.to_string(), "2031-03-01");
    assert_eq!(r.days.len(), 12);
    h.get_by_label("Use this weather").click();
    settle(&mut h);
    assert!(h.state().import.is_none(), "{:?}", h.state().state.message);
    let w = &h.state().project().expect("open").weather;
    assert_eq!(
        w.import.as_ref().and_then(|s| s.date_format),
        Some(DateFormat::DayMonthYear)
    );
}
