//! Daily FAO-56 Penman–Monteith ET₀ over a 1,000,000-day in-memory series.
//!
//! Target: at least 30 million station-days per second on one core. The
//! weather is invented (a deterministic pseudo-random seasonal series), not
//! measured data.
//!
//! Two clocks: wall time (criterion's default) and, on Linux, the CPU time of
//! the benchmark thread (from `/proc/thread-self/schedstat`), which measures
//! the one-core speed even when the machine is shared with other jobs.

#![allow(missing_docs, clippy::unwrap_used, clippy::expect_used)]

use std::hint::black_box;

use chrono::{Days, NaiveDate};
use criterion::measurement::{Measurement, ValueFormatter, WallTime};
use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use offtake_core::et0::{Et0Context, Et0Options};
use offtake_core::weather::{StationSite, WeatherDay};

const N_DAYS: usize = 1_000_000;

/// Invented daily weather: seasonal temperature with xorshift noise, complete records.
fn invented_series() -> Vec<WeatherDay> {
    let start = NaiveDate::from_ymd_opt(1900, 1, 1).unwrap();
    let mut state: u64 = 0x9E37_79B9_7F4A_7C15;
    let mut noise = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut date = start;
    (0..N_DAYS)
        .map(|i| {
            let season = (i as f64 / 365.25 * std::f64::consts::TAU).sin();
            let tmin = 10.0 + 8.0 * season + 4.0 * noise();
            let mut d = WeatherDay::empty(date);
            d.tmin_c = Some(tmin);
            d.tmax_c = Some(tmin + 6.0 + 10.0 * noise());
            d.rhmax_pct = Some(70.0 + 30.0 * noise());
            d.rhmin_pct = Some(20.0 + 40.0 * noise());
            d.wind_ms = Some(0.5 + 4.0 * noise());
            d.solar_mj = Some(8.0 + 18.0 * noise());
            date = date.checked_add_days(Days::new(1)).unwrap();
            d
        })
        .collect()
}

/// CPU time of the current thread in nanoseconds (Linux), or wall time elsewhere.
struct ThreadCpuTime {
    wall: WallTime,
    start: std::time::Instant,
}

impl ThreadCpuTime {
    fn now_ns(&self) -> u64 {
        std::fs::read_to_string("/proc/thread-self/schedstat")
            .ok()
            .and_then(|s| s.split_whitespace().next()?.parse().ok())
            .unwrap_or_else(|| self.start.elapsed().as_nanos() as u64)
    }
}

impl Measurement for ThreadCpuTime {
    type Intermediate = u64;
    type Value = u64;
    fn start(&self) -> u64 {
        self.now_ns()
    }
    fn end(&self, i: u64) -> u64 {
        self.now_ns().saturating_sub(i)
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
        self.wall.formatter()
    }
}

fn bench_et0_cpu(c: &mut Criterion<ThreadCpuTime>) {
    let days = invented_series();
    let site = StationSite {
        latitude_deg: 31.5,
        elevation_m: 250.0,
        wind_height_m: 2.0,
    };
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    let mut group = c.benchmark_group("et0_pm_daily_thread_cpu_time");
    group.throughput(Throughput::Elements(N_DAYS as u64));
    group.sample_size(10);
    let mut out = Vec::with_capacity(N_DAYS);
    group.bench_function("series_results_1M_days", |b| {
        b.iter(|| {
            ctx.series_into(black_box(&days), &mut out);
            black_box(out.len())
        });
    });
    group.bench_function("sum_mm_1M_days", |b| {
        b.iter(|| {
            black_box(&days)
                .iter()
                .map(|d| ctx.et0_mm_day(d).unwrap_or(0.0))
                .sum::<f64>()
        });
    });
    // The same million station-days over a cache-resident 10 000-day slice
    // (repeated 100 times): compute cost without the memory traffic of
    // 200-byte weather records.
    let small = &days[..10_000];
    group.bench_function("sum_mm_1M_days_cache_resident", |b| {
        b.iter(|| {
            let mut total = 0.0;
            for _ in 0..100 {
                total += black_box(small)
                    .iter()
                    .map(|d| ctx.et0_mm_day(d).unwrap_or(0.0))
                    .sum::<f64>();
            }
            total
        });
    });
    group.finish();
}

fn cpu_criterion() -> Criterion<ThreadCpuTime> {
    Criterion::default()
        .with_measurement(ThreadCpuTime {
            wall: WallTime,
            start: std::time::Instant::now(),
        })
        .configure_from_args()
}

fn bench_et0(c: &mut Criterion) {
    let days = invented_series();
    let site = StationSite {
        latitude_deg: 31.5,
        elevation_m: 250.0,
        wind_height_m: 2.0,
    };
    let ctx = Et0Context::new(&site, &Et0Options::default()).unwrap();
    let mut group = c.benchmark_group("et0_pm_daily");
    group.throughput(Throughput::Elements(N_DAYS as u64));
    group.sample_size(10);
    let mut out = Vec::with_capacity(N_DAYS);
    group.bench_function("series_results_1M_days", |b| {
        b.iter(|| {
            ctx.series_into(black_box(&days), &mut out);
            black_box(out.len())
        });
    });
    group.bench_function("sum_mm_1M_days", |b| {
        b.iter(|| {
            black_box(&days)
                .iter()
                .map(|d| ctx.et0_mm_day(d).unwrap_or(0.0))
                .sum::<f64>()
        });
    });
    group.finish();
}

criterion_group!(benches, bench_et0);
criterion_group! {
    name = cpu_benches;
    config = cpu_criterion();
    targets = bench_et0_cpu
}
criterion_main!(benches, cpu_benches);
