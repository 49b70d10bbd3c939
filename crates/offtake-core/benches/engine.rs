//! The whole engine on a synthetic scheme: N blocks × 3 plantings × 30 years
//! of daily weather (all generated here; invented).
//!
//! `cargo bench -p offtake-core --bench engine` runs criterion on 100 and
//! 1,000 blocks. For one timed run of any size (e.g. under
//! `/usr/bin/time -v` for peak memory):
//! `ENGINE_BENCH_ONCE=10000 target/release/deps/engine-<hash>`.
//!
//! Blocks are served by a 7-day rotation within the block with outlets that
//! do not bind (no stream size); `ENGINE_BENCH_DELIVERY=binding` gives every
//! outlet 0.8 l/s/ha so that it limits on the peak days, and `on-demand`
//! the rule of schema 2.

use std::hint::black_box;
use std::time::Instant;

use chrono::{Datelike, Days, NaiveDate};
use criterion::Criterion;
use offtake_core::crop::Crop;
use offtake_core::engine::{EngineInput, run};
use offtake_core::project::{
    Block, Canal, CanalKind, IrrigationMethod, MonthDay, Planting, PlantingArea, Project, Strategy,
    WeatherPerturbation,
};
use offtake_core::soil::Soil;
use offtake_core::weather::WeatherDay;

const CROPS: &str = include_str!("../../../assets/library/crops.ron");
const SOILS: &str = include_str!("../../../assets/library/soils.ron");

fn unit_hash(x: u64) -> f64 {
    let mut z = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^= z >> 31;
    (z >> 11) as f64 / (1u64 << 53) as f64
}

/// 30 years of invented semi-arid daily weather.
fn weather() -> Vec<WeatherDay> {
    let start = NaiveDate::from_ymd_opt(1991, 1, 1).expect("date");
    let end = NaiveDate::from_ymd_opt(2020, 12, 31).expect("date");
    let n = (end - start).num_days() as u64 + 1;
    (0..n)
        .map(|i| {
            let date = start + Days::new(i);
            let doy = f64::from(date.ordinal());
            let season = (2.0 * std::f64::consts::PI * (doy - 100.0) / 365.0).sin();
            let wet = (2.0 * std::f64::consts::PI * (doy - 200.0) / 365.0)
                .cos()
                .max(0.0);
            let r = unit_hash(i);
            WeatherDay {
                tmax_c: Some(31.0 + 5.0 * season + 2.0 * (r - 0.5)),
                tmin_c: Some(17.0 + 5.0 * season + 2.0 * (r - 0.5)),
                rhmax_pct: Some(70.0 + 20.0 * wet),
                rhmin_pct: Some(30.0 + 25.0 * wet),
                wind_ms: Some(2.0 + r),
                solar_mj: Some(20.0 + 4.0 * season - 4.0 * wet),
                rain_mm: Some(if r < 0.25 * wet {
                    40.0 * r / (0.25 * wet)
                } else {
                    0.0
                }),
                ..WeatherDay::empty(date)
            }
        })
        .collect()
}

/// How the synthetic blocks are served.
#[derive(Clone, Copy)]
enum Delivery {
    Rotation,
    Binding,
    OnDemand,
}

fn delivery_from_env() -> Delivery {
    match std::env::var("ENGINE_BENCH_DELIVERY").as_deref() {
        Ok("binding") => Delivery::Binding,
        Ok("on-demand") => Delivery::OnDemand,
        _ => Delivery::Rotation,
    }
}

fn project(blocks: usize, delivery: Delivery) -> Project {
    let mut p = Project::default();
    p.scheme.name = "synthetic (invented)".into();
    p.weather.latitude_deg = 15.0;
    p.weather.elevation_m = 300.0;
    // The weather is given in memory; the path only satisfies validation.
    p.weather.path = "invented-weather.csv".into();
    p.canals.push(Canal {
        id: "main".into(),
        name: "main".into(),
        parent: None,
        kind: CanalKind::Main,
        conveyance_efficiency: 0.95,
        existing_capacity_m3s: None,
        operating_hours_per_day: 24.0,
        section: offtake_core::project::CanalSectionSpec::default(),
    });
    let n_dy = blocks.div_ceil(50);
    for d in 0..n_dy {
        p.canals.push(Canal {
            id: format!("dy{d}"),
            name: format!("dy{d}"),
            parent: Some("main".into()),
            kind: CanalKind::Distributary,
            conveyance_efficiency: 0.85,
            existing_capacity_m3s: None,
            operating_hours_per_day: 24.0,
            section: offtake_core::project::CanalSectionSpec::default(),
        });
    }
    let wet = ["rice-paddy", "maize-grain", "cotton", "sorghum-grain"];
    let dry = ["wheat-winter", "dry-bean", "onion-dry", "potato"];
    let soils = ["clay", "loam", "sandy-loam"];
    for b in 0..blocks {
        let id = format!("b{b}");
        p.blocks.push(Block {
            id: id.clone(),
            name: id.clone(),
            canal: format!("dy{}", b / 50),
            area_ha: 100.0 + (b % 7) as f64 * 20.0,
            soil: soils[b % 3].into(),
            method: IrrigationMethod {
                name: "furrow".into(),
                application_efficiency: 0.65,
            },
            field_canal_efficiency: 0.8,
            delivery: match delivery {
                Delivery::OnDemand => offtake_core::project::DeliveryMode::OnDemand,
                Delivery::Rotation | Delivery::Binding => {
                    offtake_core::project::DeliveryMode::RotationWithinBlock {
                        cycle_days: 7,
                        min_depth_mm: 10.0,
                    }
                }
            },
            outlet_stream_size_ls: match delivery {
                Delivery::Binding => Some(0.8 * (100.0 + (b % 7) as f64 * 20.0)),
                _ => None,
            },
        });
        let plant = |k: &str, crop: &str, md: (u32, u32), pct: f64, season: &str| Planting {
            id: format!("{id}-{k}"),
            block: id.clone(),
            crop: crop.into(),
            area: PlantingArea::PercentOfBlock(pct),
            first_planting: MonthDay {
                month: md.0,
                day: md.1,
            },
            spread_days: 20,
            season: season.into(),
            strategy: Strategy::Refill {
                trigger_pct_of_raw: 100.0,
            },
            season_length_days: None,
            paddy: None,
            coefficients: offtake_core::project::CoefficientChoice::Single,
        };
        p.plantings
            .push(plant("wet", wet[b % 4], (6, 15), 60.0, "wet"));
        p.plantings
            .push(plant("dry", dry[b % 4], (11, 10), 60.0, "dry"));
        p.plantings
            .push(plant("veg", "tomato", (1, 20), 30.0, "dry"));
    }
    p.options.irrigation_year_start_month = 6;
    p
}

fn libraries() -> (Vec<Crop>, Vec<Soil>) {
    (
        ron::from_str(CROPS).expect("crop library"),
        ron::from_str(SOILS).expect("soil library"),
    )
}

fn run_once(
    blocks: usize,
    delivery: Delivery,
    crops: &[Crop],
    soils: &[Soil],
    w: &[WeatherDay],
) -> f64 {
    let p = project(blocks, delivery);
    let r = run(&EngineInput {
        project: &p,
        crops,
        soils,
        weather: w,
        perturbation: WeatherPerturbation::default(),
        scenario: None,
    })
    .expect("engine runs");
    r.headworks().map_or(0.0, |h| h.design_flow_ls)
}

fn bench(c: &mut Criterion) {
    let (crops, soils) = libraries();
    let w = weather();
    let mut g = c.benchmark_group("engine");
    g.sample_size(10);
    for blocks in [100, 1000] {
        g.bench_function(
            format!("{blocks} blocks x 3 plantings x 30 years, rotation"),
            |b| {
                b.iter(|| black_box(run_once(blocks, Delivery::Rotation, &crops, &soils, &w)));
            },
        );
    }
    g.finish();
}

mod group {
    //! The criterion group (its generated function has no doc comment).
    #![allow(missing_docs)]
    criterion::criterion_group!(benches, super::bench);
}

fn main() {
    if let Some(blocks) = std::env::var("ENGINE_BENCH_ONCE")
        .ok()
        .and_then(|v| v.parse::<usize>().ok())
    {
        let (crops, soils) = libraries();
        let w = weather();
        let t = Instant::now();
        let q = run_once(blocks, delivery_from_env(), &crops, &soils, &w);
        println!(
            "{blocks} blocks x 3 plantings x {} days: {:.3} s (headworks design flow {q:.0} l/s)",
            w.len(),
            t.elapsed().as_secs_f64()
        );
        return;
    }
    group::benches();
    Criterion::default().configure_from_args().final_summary();
}
