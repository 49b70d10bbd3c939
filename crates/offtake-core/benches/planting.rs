//! One planting over 30 years of daily weather (ET₀ given), the target of
//! issue 4: < 0.3 ms. `run_planting` does everything a scheme run needs per
//! planting: the season layout, the climate-adjusted crop curve of each of
//! the 30 seasons, each season's root-zone balance and the seasonal
//! summaries. Weather is invented (smooth seasonal ET₀, pseudo-random rain),
//! labelled so; the crop and soil are the built-in library's.
#![allow(missing_docs)]

use std::hint::black_box;

use chrono::NaiveDate;
use criterion::measurement::{Measurement, ValueFormatter};
use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use offtake_core::crop::Crop;
use offtake_core::planting::{PlantingSpec, PlantingWeather, run_planting};
use offtake_core::soil::Soil;

const DAYS: usize = 10_958; // 30 years

const CROPS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/crops.ron"
));
const SOILS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/soils.ron"
));

/// CPU time of the benchmark thread (Linux `/proc/thread-self/schedstat`,
/// first field: ns on a CPU, brought up to date by a yield before each
/// reading), so that the figure does not depend on how many
/// other jobs share the machine. Falls back to 0 where the file is missing;
/// the wall-time group is the reference figure on an idle machine.
struct ThreadCpuTime;

fn thread_cpu_ns() -> u64 {
    // sched_yield makes the kernel bring the thread's run time up to date.
    std::thread::yield_now();
    std::fs::read_to_string("/proc/thread-self/schedstat")
        .ok()
        .and_then(|s| s.split_whitespace().next().and_then(|v| v.parse().ok()))
        .unwrap_or(0)
}

struct NsFormatter;

impl ValueFormatter for NsFormatter {
    fn scale_values(&self, _typical: f64, values: &mut [f64]) -> &'static str {
        for v in values {
            *v /= 1000.0;
        }
        "µs (CPU)"
    }
    fn scale_throughputs(
        &self,
        _typical: f64,
        _t: &Throughput,
        _values: &mut [f64],
    ) -> &'static str {
        "ns (CPU)"
    }
    fn scale_for_machines(&self, _values: &mut [f64]) -> &'static str {
        "ns"
    }
}

impl Measurement for ThreadCpuTime {
    type Intermediate = u64;
    type Value = u64;
    fn start(&self) -> u64 {
        thread_cpu_ns()
    }
    fn end(&self, i: u64) -> u64 {
        thread_cpu_ns().saturating_sub(i)
    }
    fn add(&self, a: &u64, b: &u64) -> u64 {
        a + b
    }
    fn zero(&self) -> u64 {
        0
    }
    fn to_f64(&self, v: &u64) -> f64 {
        *v as f64
    }
    fn formatter(&self) -> &dyn ValueFormatter {
        &NsFormatter
    }
}

/// Invented weather: ET₀ 2–8 mm/day over the year, rain on about one day in
/// four from a fixed linear congruential sequence, u2 and RHmin constant.
fn invented_weather() -> (Vec<f64>, Vec<f64>, Vec<f64>, Vec<f64>) {
    let mut state: u64 = 0x2545_F491_4F6C_DD1D;
    let mut et0 = Vec::with_capacity(DAYS);
    let mut rain = Vec::with_capacity(DAYS);
    for i in 0..DAYS {
        let doy = (i % 365) as f64;
        et0.push(5.0 - 3.0 * (2.0 * std::f64::consts::PI * doy / 365.0).cos());
        state = state
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1);
        let u = (state >> 11) as f64 / (1u64 << 53) as f64;
        rain.push(if u < 0.25 { 40.0 * u * 4.0 } else { 0.0 });
    }
    (et0, rain, vec![2.5; DAYS], vec![35.0; DAYS])
}

fn bench<M: Measurement + 'static>(c: &mut Criterion<M>, tag: &str) {
    let crops: Vec<Crop> = ron::from_str(CROPS).expect("built-in crop library");
    let soils: Vec<Soil> = ron::from_str(SOILS).expect("built-in soil library");
    let maize = crops
        .iter()
        .find(|c| c.id == "maize-grain")
        .expect("maize-grain");
    let loam = soils.iter().find(|s| s.id == "loam").expect("loam");
    let (et0, rain, u2, rhmin) = invented_weather();
    let weather = PlantingWeather {
        start: NaiveDate::from_ymd_opt(1991, 1, 1).expect("date"),
        et0_mm: &et0,
        rain_mm: &rain,
        wind_2m_ms: &u2,
        rhmin_pct: &rhmin,
    };
    let spec = PlantingSpec::new(maize, loam, 4, 1);
    c.bench_function(&format!("planting_maize_30y_one_cohort_{tag}"), |b| {
        b.iter(|| {
            let r = run_planting(black_box(&spec), black_box(&weather)).expect("valid inputs");
            black_box(r.nir_mm.len())
        });
    });
    let staggered = PlantingSpec {
        spread_days: 20,
        ..spec.clone()
    };
    c.bench_function(&format!("planting_maize_30y_four_cohorts_{tag}"), |b| {
        b.iter(|| {
            let r = run_planting(black_box(&staggered), black_box(&weather)).expect("valid inputs");
            black_box(r.nir_mm.len())
        });
    });
    let cane = crops
        .iter()
        .find(|c| c.id == "sugarcane")
        .expect("sugarcane");
    let chain = PlantingSpec::new(cane, loam, 3, 1);
    c.bench_function(&format!("planting_sugarcane_30y_chain_{tag}"), |b| {
        b.iter(|| {
            let r = run_planting(black_box(&chain), black_box(&weather)).expect("valid inputs");
            black_box(r.nir_mm.len())
        });
    });
}

fn wall(c: &mut Criterion) {
    bench(c, "wall");
}

fn cpu(c: &mut Criterion<ThreadCpuTime>) {
    bench(c, "cpu");
}

criterion_group!(wall_time, wall);
criterion_group! {
    name = cpu_time;
    config = Criterion::default().with_measurement(ThreadCpuTime);
    targets = cpu
}
criterion_main!(wall_time, cpu_time);
