//! Delivery through block outlets on the invented demo scheme (issue 11):
//! what canals carry under rotation within the block, outlets that bind and
//! outlets that never bind, and schema-2 projects migrated to on demand.
//!
//! The demo's flows are 24-hour means. "In practice the peak day is about
//! 1.1–1.3 × the design flow" is common practice (no published source); the
//! limits checked here (largest daily ÷ largest 10-day mean ≤ 1.5, median
//! yearly peak 10-day ÷ peak monthly ≤ 1.25) are the issue's.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::Path;

use offtake_core::engine::outlets::outlet_cap_m3_day;
use offtake_core::engine::{self, Results};
use offtake_core::project::{DeliveryMode, Project};
use offtake_core::scheme::{Node, PeriodStep};
use offtake_core::weather::WeatherDay;
use offtake_io::library::Libraries;
use offtake_io::project_file::{load_project, weather_path};
use offtake_io::weather::{ImportOptions, import_weather_file};

const DEMO: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../demo-projects/demo-scheme/scheme.ron"
);

fn demo() -> (Project, Libraries, Vec<WeatherDay>) {
    let path = Path::new(DEMO);
    let project = load_project(path).expect("demo project loads");
    let libs = Libraries::builtin().expect("built-in libraries");
    let weather = import_weather_file(&weather_path(path, &project), &ImportOptions::default())
        .expect("demo weather imports")
        .days;
    (project, libs, weather)
}

fn run(project: &Project, libs: &Libraries, weather: &[WeatherDay]) -> Results {
    engine::run_scenario(project, None, &libs.crops, &libs.soils, weather).expect("runs")
}

fn nodes(r: &Results) -> Vec<Node> {
    let mut n: Vec<Node> = (0..r.demand.network().canals().len())
        .map(Node::Canal)
        .collect();
    n.push(Node::Headworks);
    n
}

/// Per canal: largest daily flow ÷ largest 10-day mean flow ≤ 1.5, and the
/// median over complete years of yearly peak 10-day ÷ yearly peak monthly
/// flow ≤ 1.25 (issue 11; on demand the demo gave 3.8–7.0 and up to 1.47).
#[test]
fn demo_canals_carry_what_outlets_deliver() {
    let (project, libs, weather) = demo();
    let r = run(&project, &libs, &weather);
    for n in nodes(&r) {
        let name = r.demand.network().node_name(n).to_owned();
        let daily = r.demand.demand_ls(n);
        let max_daily = daily.iter().copied().fold(0.0, f64::max);
        let ten = r.demand.periods(n, PeriodStep::TenDay);
        let month = r.demand.periods(n, PeriodStep::Month);
        let max10 = ten.iter().map(|p| p.mean_flow_ls).fold(0.0, f64::max);
        assert!(
            max_daily <= 1.5 * max10,
            "{name}: daily {max_daily} vs 10-day {max10}"
        );
        let mut ratios = Vec::new();
        for y in &r.complete_years {
            let in_year = |p: &&offtake_core::scheme::PeriodDemand| {
                p.start >= y.start() && p.start <= y.end()
            };
            let pk10 = ten
                .iter()
                .filter(in_year)
                .map(|p| p.mean_flow_ls)
                .fold(0.0, f64::max);
            let pkm = month
                .iter()
                .filter(in_year)
                .map(|p| p.mean_flow_ls)
                .fold(0.0, f64::max);
            if pkm > 0.0 {
                ratios.push(pk10 / pkm);
            }
        }
        ratios.sort_by(f64::total_cmp);
        let median = ratios[ratios.len() / 2];
        assert!(
            median <= 1.25,
            "{name}: median peak 10-day / monthly {median}"
        );
    }
    // The outlets limit at most 1 % of any block's requests.
    for o in &r.outlets {
        assert!(
            !o.stream_size_assumed,
            "{}: demo enters every stream size",
            o.block
        );
        assert!(
            o.limited_share() <= 0.01,
            "{}: {}",
            o.block,
            o.limited_share()
        );
    }
}

/// An outlet at 60 % of the block's largest daily delivery binds: no day's
/// delivery exceeds stream size × hours, water is held back, and the crops
/// of that block lose yield. An outlet twice as large as needed never binds
/// and gives exactly the run without a stream size.
#[test]
fn a_binding_outlet_caps_every_day_and_a_large_one_changes_nothing() {
    let (mut project, libs, weather) = demo();
    let b = project.blocks.iter().position(|b| b.id == "L1").unwrap();
    project.blocks[b].outlet_stream_size_ls = None;
    let free = run(&project, &libs, &weather);
    let o = free
        .outlets
        .iter()
        .find(|o| o.block == "L1")
        .unwrap()
        .clone();
    assert!(o.stream_size_assumed);

    project.blocks[b].outlet_stream_size_ls = Some(2.0 * o.peak_delivery_ls);
    let large = run(&project, &libs, &weather);
    let bi = large.demand.network().block_index("L1").unwrap();
    assert_eq!(
        large.demand.block_gir_m3_day(bi),
        free.demand.block_gir_m3_day(bi)
    );

    let stream = 0.6 * o.peak_delivery_ls;
    project.blocks[b].outlet_stream_size_ls = Some(stream);
    let small = run(&project, &libs, &weather);
    let cap = outlet_cap_m3_day(stream, o.hours_per_day);
    let gir = small.demand.block_gir_m3_day(bi);
    assert!(
        gir.iter().all(|v| *v <= cap * (1.0 + 1e-9)),
        "a day above the cap"
    );
    let so = small.outlets.iter().find(|o| o.block == "L1").unwrap();
    assert!(so.limited_m3_per_year > 0.0 && so.limited_days_per_year > 0.0);
    let loss = |r: &Results| -> f64 {
        r.plantings
            .iter()
            .filter(|p| p.block == "L1")
            .flat_map(|p| p.seasons.iter().filter_map(|s| s.yield_loss_pct))
            .sum()
    };
    assert!(
        loss(&small) > loss(&free),
        "{} vs {}",
        loss(&small),
        loss(&free)
    );
}

/// A schema-2 file (no delivery modes, no stream sizes) opens as on demand
/// with no stream size, and computes as the same project set to on demand.
#[test]
fn schema_2_projects_migrate_to_on_demand_unchanged() {
    let (project, libs, weather) = demo();
    let text = std::fs::read_to_string(DEMO).unwrap();
    let old: String = text
        .lines()
        .filter(|l| !l.contains("delivery: ") && !l.contains("outlet_stream_size_ls"))
        .collect::<Vec<_>>()
        .join("\n")
        .replacen("schema: 3,", "schema: 2,", 1);
    // Beside the demo, so that its relative weather path still resolves.
    let demo_dir = Path::new(DEMO).parent().unwrap();
    let file = tempfile::Builder::new()
        .prefix(".schema2-")
        .suffix(".ron")
        .tempfile_in(demo_dir)
        .unwrap();
    std::fs::write(file.path(), old).unwrap();
    let migrated = load_project(file.path()).expect("schema 2 loads");
    assert!(
        migrated
            .blocks
            .iter()
            .all(|b| b.delivery == DeliveryMode::OnDemand && b.outlet_stream_size_ls.is_none())
    );
    let mut on_demand = project.clone();
    for b in &mut on_demand.blocks {
        b.delivery = DeliveryMode::OnDemand;
        b.outlet_stream_size_ls = None;
    }
    let a = run(&migrated, &libs, &weather);
    let b = run(&on_demand, &libs, &weather);
    assert_eq!(
        a.demand.demand_ls(Node::Headworks),
        b.demand.demand_ls(Node::Headworks)
    );
}
