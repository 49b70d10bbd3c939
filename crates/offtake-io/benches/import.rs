//! Import speed of a 30-year daily weather file (about 11,000 rows) in
//! Offtake's own format (target: well under 100 ms), and of a 30,000-column
//! header (target: well under a second; issue 14 found the header handling
//! quadratic: 10,000 columns took 0.6 s, 100,000 took 58 s).
#![allow(clippy::unwrap_used, clippy::expect_used, missing_docs)]

use std::fmt::Write as _;
use std::hint::black_box;

use chrono::NaiveDate;
use criterion::{Criterion, criterion_group, criterion_main};
use offtake_io::weather::{
    ImportOptions, import_weather_file, import_weather_reader, read_header_from,
};

/// 30 years of invented daily weather (a deterministic pattern, not a climate).
fn thirty_years_csv() -> String {
    let mut s = String::from(
        "date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,sunshine_h,rain_mm\n",
    );
    let mut d = NaiveDate::from_ymd_opt(1991, 1, 1).unwrap();
    let end = NaiveDate::from_ymd_opt(2020, 12, 31).unwrap();
    let mut i = 0u32;
    while d <= end {
        let k = f64::from(i % 97) / 97.0;
        let _ = writeln!(
            s,
            "{d},{:.1},{:.1},{:.0},{:.0},{:.1},{:.1},{:.1},{:.1}",
            28.0 + 6.0 * k,
            15.0 + 4.0 * k,
            70.0 + 20.0 * k,
            30.0 + 15.0 * k,
            1.0 + 2.0 * k,
            15.0 + 10.0 * k,
            6.0 + 4.0 * k,
            if i.is_multiple_of(7) { 3.2 } else { 0.0 }
        );
        d = d.succ_opt().unwrap();
        i += 1;
    }
    s
}

fn bench_import(c: &mut Criterion) {
    let text = thirty_years_csv();
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("thirty_years.csv");
    std::fs::write(&path, &text).unwrap();
    let opts = ImportOptions::default();
    let n = import_weather_file(&path, &opts).unwrap().days.len();
    assert_eq!(n, 10_958);
    c.bench_function("import 30-year daily file (10,958 rows)", |b| {
        b.iter(|| import_weather_file(black_box(&path), &opts).unwrap());
    });
    c.bench_function("import 30-year daily text from memory", |b| {
        b.iter(|| import_weather_reader(black_box(text.as_bytes()), "mem", &opts).unwrap());
    });
}

/// A header of Offtake's own columns followed by 29,997 columns the reader
/// ignores (each gets a warning), and one data row.
fn wide_csv() -> String {
    let mut s = String::from("date,tmax_c,tmin_c");
    let mut row = String::from("2021-01-01,30,20");
    for i in 3..30_000 {
        let _ = write!(s, ",extra_{i}");
        row.push_str(",1");
    }
    s.push('\n');
    s.push_str(&row);
    s.push('\n');
    s
}

fn bench_wide_header(c: &mut Criterion) {
    let text = wide_csv();
    let opts = ImportOptions::default();
    let series = import_weather_reader(text.as_bytes(), "wide", &opts).unwrap();
    assert_eq!(series.warnings.len(), 29_997);
    c.bench_function("import a 30,000-column header and one row", |b| {
        b.iter(|| import_weather_reader(black_box(text.as_bytes()), "wide", &opts).unwrap());
    });
    c.bench_function("read_header of a 30,000-column header", |b| {
        b.iter(|| read_header_from(black_box(text.as_bytes()), "wide", None).unwrap());
    });
}

criterion_group!(benches, bench_import, bench_wide_header);
criterion_main!(benches);
