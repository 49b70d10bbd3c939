//! Scheme benchmark: demand aggregation up a 3-level canal tree and design
//! values for 1,000 blocks × 3 plantings × 30 years of daily NIR.
//!
//! The scheme is synthetic (invented): 1 main canal, 10 branches, 100
//! distributaries, 10 blocks per distributary; NIR follows a seasonal curve
//! with a pseudo-random year-to-year factor. The per-planting water balance
//! that produces NIR is benchmarked elsewhere.
//!
//! Measured 2026-12-01 on the shared 2-core build machine (load average ~10,
//! so an upper bound): aggregate 0.53 s, design values 0.032 s, both
//! 0.53–0.64 s; peak RSS of the whole benchmark process 553 MB, of which
//! the 3,000 input NIR series are 263 MB and one `SchemeDemand` about 140 MB.
#![allow(missing_docs, clippy::unwrap_used)]

use std::hint::black_box;

use chrono::NaiveDate;
use criterion::{Criterion, criterion_group, criterion_main};
use offtake_core::scheme::{
    Block, Canal, DesignOptions, Network, NirSeries, SchemeDemand, design_values,
};

const BLOCKS: usize = 1_000;
const PLANTINGS: usize = 3;
const CROPS: [&str; 5] = ["rice", "maize", "wheat", "cotton", "vegetables"];

fn canal(id: String, parent: Option<String>, ec: f64) -> Canal {
    Canal {
        name: id.clone(),
        id,
        parent,
        conveyance_efficiency: ec,
        existing_capacity_m3s: Some(1.0),
        hours_per_day: 24.0,
    }
}

/// Deterministic pseudo-random fraction in [0, 1) from an integer (SplitMix64).
fn unit_hash(x: u64) -> f64 {
    let mut z = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
}

fn synthetic() -> (Network, NaiveDate, usize, Vec<NirSeries>) {
    let mut canals = vec![canal("main".into(), None, 0.9)];
    for b in 0..10 {
        canals.push(canal(format!("br{b}"), Some("main".into()), 0.85));
        for d in 0..10 {
            canals.push(canal(format!("d{b}-{d}"), Some(format!("br{b}")), 0.8));
        }
    }
    let blocks: Vec<Block> = (0..BLOCKS)
        .map(|i| Block {
            name: format!("blk{i}"),
            canal: format!("d{}-{}", i / 100, (i / 10) % 10),
            area_ha: 20.0 + 80.0 * unit_hash(i as u64),
            application_efficiency: 0.6,
            field_canal_efficiency: 0.85,
        })
        .collect();
    let start = NaiveDate::from_ymd_opt(1991, 1, 1).unwrap();
    let end = NaiveDate::from_ymd_opt(2020, 12, 31).unwrap();
    let days = (end - start).num_days() as usize + 1;
    let mut series = Vec::with_capacity(BLOCKS * PLANTINGS);
    for (i, b) in blocks.iter().enumerate() {
        for p in 0..PLANTINGS {
            let seed = (i * PLANTINGS + p) as u64;
            let area = b.area_ha / PLANTINGS as f64;
            let phase = 2.0 * std::f64::consts::PI * unit_hash(seed);
            let nir_mm: Vec<f64> = (0..days)
                .map(|d| {
                    let year_factor = 0.8 + 0.4 * unit_hash(1_000_000 + (d / 365) as u64);
                    let season = (2.0 * std::f64::consts::PI * d as f64 / 365.25 + phase).sin();
                    (6.0 * season * year_factor).max(0.0)
                })
                .collect();
            series.push(NirSeries::from_depth_mm(
                b.name.clone(),
                CROPS[(i + p) % CROPS.len()],
                &nir_mm,
                area,
            ));
        }
    }
    (Network::new(canals, blocks).unwrap(), start, days, series)
}

fn bench(c: &mut Criterion) {
    let (network, start, days, series) = synthetic();
    let mut group = c.benchmark_group("scheme_1000_blocks_3_plantings_30_years");
    group.sample_size(10);
    group.bench_function("aggregate", |b| {
        b.iter(|| {
            SchemeDemand::compute(black_box(&network), start, days, black_box(&series)).unwrap()
        });
    });
    let demand = SchemeDemand::compute(&network, start, days, &series).unwrap();
    group.bench_function("design_values", |b| {
        b.iter(|| design_values(black_box(&demand), &DesignOptions::default()).unwrap());
    });
    group.bench_function("aggregate_and_design_values", |b| {
        b.iter(|| {
            let d = SchemeDemand::compute(black_box(&network), start, days, black_box(&series))
                .unwrap();
            design_values(&d, &DesignOptions::default()).unwrap()
        });
    });
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
