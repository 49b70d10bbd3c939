//! Measurement, not a check: egui CPU time per frame (UI code and
//! tessellation, no renderer) while panning the 25-year daily hydrograph of
//! the demo's headworks on the Canal capacity tab. Ignored by default (no
//! timed assertions in tests); run it with
//!
//! ```text
//! cargo test --release -p offtake-app --test frame_time -- --ignored --nocapture
//! ```

use std::time::{Duration, Instant};

use egui_kittest::Harness;
use offtake_app::OfftakeApp;
use offtake_app::command::{Command, Tab};
use offtake_app::tabs::capacity::YearChoice;

#[test]
#[ignore = "measurement; run with --ignored --nocapture in a release build"]
fn panning_a_25_year_daily_plot() {
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(std::path::Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    )));
    app.wait_for_recompute(Duration::from_hours(1));
    app.push(Command::SelectTab(Tab::CanalCapacity));
    app.tabs.capacity.year = YearChoice::Record;
    let mut h = Harness::builder()
        .with_size(egui::vec2(1600.0, 1000.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    h.run();
    h.state_mut().wait_for_recompute(Duration::from_hours(1));
    h.run();
    let run = h
        .state()
        .computed
        .as_ref()
        .and_then(|c| c.engine.clone())
        .and_then(Result::ok)
        .expect("demo computed");
    let days = run.results.days;
    let rect = h
        .ctx
        .data(|d| d.get_temp::<egui::Rect>(egui::Id::unique(offtake_app::plot::LAST_PLOT_RECT)))
        .expect("the hydrograph was drawn");
    let start = rect.center();
    h.hover_at(start);
    h.step();
    h.drag_at(start);
    h.step();
    let frames = 200;
    let mut times = Vec::with_capacity(frames);
    for i in 0..frames {
        let x = start.x - 3.0 * (i as f32 + 1.0) * if (i / 50) % 2 == 0 { 1.0 } else { -1.0 };
        h.hover_at(egui::pos2(x, start.y));
        let t0 = Instant::now();
        h.step();
        let shapes = h.output().shapes.clone();
        let ppp = h.ctx.pixels_per_point();
        let primitives = h.ctx.tessellate(shapes, ppp);
        times.push(t0.elapsed().as_secs_f64() * 1000.0);
        assert!(!primitives.is_empty());
        // egui starts a drag after the pointer moved a few points.
        assert!(
            i < 5 || h.ctx.dragged_id().is_some(),
            "the plot is being dragged (panned) in frame {i}"
        );
    }
    h.drop_at(start);
    h.step();
    times.sort_by(f64::total_cmp);
    let mean = times.iter().sum::<f64>() / times.len() as f64;
    let p95 = times[(times.len() * 95) / 100];
    println!(
        "panning a {days}-day hydrograph: {frames} frames, mean {mean:.2} ms/frame, median {:.2} ms, 95th percentile {p95:.2} ms, max {:.2} ms (UI code + tessellation, no rendering)",
        times[times.len() / 2],
        times[times.len() - 1]
    );
}

#[test]
#[ignore = "measurement; run with --ignored --nocapture in a release build"]
fn recompute_after_an_edit_of_the_demo() {
    use offtake_app::edit::DocEdit;
    use offtake_app::state::RecomputeStatus;
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_file(std::path::Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    )));
    app.wait_for_recompute(Duration::from_hours(1));
    let mut h = Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut OfftakeApp| app.ui(ui), app);
    let _ = h.run_ok();
    h.state_mut().wait_for_recompute(Duration::from_hours(1));
    let mut times = Vec::new();
    let mut engine_ms = Vec::new();
    for i in 0..6 {
        let mut p = h
            .state()
            .project()
            .and_then(|p| p.plantings.iter().find(|p| p.id == "C1-rice"))
            .expect("demo rice")
            .clone();
        p.first_planting.day = if i % 2 == 0 { 12 } else { 10 };
        h.state_mut().push(Command::Edit(DocEdit::SetPlanting {
            id: p.id.clone(),
            planting: Box::new(p),
        }));
        let _ = h.run_ok();
        h.state_mut().wait_for_recompute(Duration::from_hours(1));
        if let RecomputeStatus::Done { elapsed_ms } = h.state().state.recompute {
            times.push(elapsed_ms);
        }
        if let Some(Ok(run)) = h.state().computed.as_ref().and_then(|c| c.engine.clone()) {
            engine_ms.push(run.results.timing.total.as_secs_f64() * 1000.0);
        }
    }
    println!(
        "recompute after an edit of the demo (worker wall time, ms): {times:.1?}; engine part: {engine_ms:.1?}"
    );
}
