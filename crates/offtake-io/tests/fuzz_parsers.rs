//! Random-input tests of every parser of user files (issue 14): the weather
//! CSV reader (and its header reader), the column-mapping RON reader and the
//! project RON reader. Each is driven by a fixed seed and a fixed case count
//! in CI, so a failure reproduces exactly; a longer run is asked for with
//! `OFFTAKE_FUZZ_MINUTES=N` (see DEVELOPERS.md, "Random-input tests").
//!
//! Properties: no panic on any input; an accepted weather series holds only
//! finite values in strictly increasing date order; every message line stays
//! readable (long cells are cut); a project that is accepted saves and reads
//! back to the same project.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::Path;
use std::time::{Duration, Instant};

use offtake_io::project_file::{parse_project, project_to_string};
use offtake_io::weather::{
    ImportOptions, import_weather_reader, mapping_from_ron_str, read_header_from,
};
use proptest::prelude::*;
use proptest::test_runner::{Config, RngAlgorithm, TestRng, TestRunner};

/// Cases per parser in CI.
const CI_CASES: u32 = 400;

/// Longest message line accepted: 20 listed names of at most 60 characters
/// and the words around them.
const MAX_MESSAGE_LINE_CHARS: usize = 2_500;

const GOOD_WEATHER: &str = "date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,rain_mm\n\
2021-03-01,31.2,18.4,82,35,2.1,22.5,0\n\
2021-03-02,32.0,19.1,80,33,2.4,23.0,0\n\
2021-03-03,30.5,18.9,85,40,1.9,19.8,4.2\n";

const GOOD_MAPPING: &str = r#"(date_column: "Day", columns: [(header: "Max T (F)", quantity: Tmax(Fahrenheit)), (header: "Rain (in)", quantity: Rain(Inches))])"#;

const MINIMAL_PROJECT: &str = include_str!("../../../tests/project-files/minimal.ron");

/// Runs `test` over `strategy` with a fixed seed: `CI_CASES` cases, or for
/// `OFFTAKE_FUZZ_MINUTES` minutes (fresh seeds each round) when set.
fn run<S: Strategy>(name: &str, strategy: S, test: impl Fn(S::Value) + Clone)
where
    S::Value: std::fmt::Debug,
{
    let minutes: u64 = std::env::var("OFFTAKE_FUZZ_MINUTES")
        .ok()
        .and_then(|m| m.parse().ok())
        .unwrap_or(0);
    let started = Instant::now();
    let deadline = started + Duration::from_secs(minutes * 60);
    let mut round: u32 = 0;
    let mut total: u64 = 0;
    loop {
        // Seed: the test's name, then the round number.
        let mut seed = [0u8; 32];
        let n = name.len().min(28);
        seed[..n].copy_from_slice(&name.as_bytes()[..n]);
        seed[28..].copy_from_slice(&round.to_le_bytes());
        let config = Config {
            cases: CI_CASES,
            failure_persistence: None,
            ..Config::default()
        };
        let mut runner =
            TestRunner::new_with_rng(config, TestRng::from_seed(RngAlgorithm::ChaCha, &seed));
        let t = test.clone();
        runner
            .run(&strategy, move |v| {
                t(v);
                Ok(())
            })
            .unwrap_or_else(|e| panic!("{name}, round {round}: {e}"));
        total += u64::from(CI_CASES);
        round += 1;
        if Instant::now() >= deadline {
            break;
        }
    }
    if minutes > 0 {
        eprintln!(
            "{name}: {total} cases in {round} rounds, {:.1} minutes",
            started.elapsed().as_secs_f64() / 60.0
        );
    }
}

fn check_message(text: &str) {
    assert!(!text.trim().is_empty(), "an error says what is wrong");
    for line in text.lines() {
        assert!(
            line.chars().count() <= MAX_MESSAGE_LINE_CHARS,
            "message line of {} characters",
            line.chars().count()
        );
    }
}

fn check_weather(bytes: &[u8]) {
    match import_weather_reader(bytes, "fuzz.csv", &ImportOptions::default()) {
        Ok(s) => {
            for d in &s.days {
                for v in [
                    d.tmax_c,
                    d.tmin_c,
                    d.tmean_c,
                    d.rhmax_pct,
                    d.rhmin_pct,
                    d.rhmean_pct,
                    d.tdew_c,
                    d.ea_kpa,
                    d.wind_ms,
                    d.solar_mj,
                    d.sunshine_h,
                    d.rain_mm,
                ]
                .into_iter()
                .flatten()
                {
                    assert!(v.is_finite());
                }
            }
            assert_eq!(s.days.len(), s.lines.len());
            assert!(s.days.windows(2).all(|w| w[0].date < w[1].date));
        }
        Err(e) => check_message(&e.to_string()),
    }
    if let Err(e) = read_header_from(bytes, "fuzz.csv", None) {
        check_message(&e.to_string());
    }
}

fn mutate(base: &str) -> impl Strategy<Value = Vec<u8>> {
    let len = base.len();
    let bytes = base.as_bytes().to_vec();
    proptest::collection::vec(
        (
            0..len,
            prop::sample::select(vec![
                b',', b';', b'\t', b'\n', b'\r', b'"', b'(', b')', b'[', b']', b':', b'x', b'-',
                b'.', b'e', b'9', b'0', b' ', b'/', b'*', 0xFF, 0xEF,
            ]),
            0..3u8,
        ),
        1..8,
    )
    .prop_map(move |edits| {
        let mut b = bytes.clone();
        for (pos, ch, op) in edits {
            let pos = pos.min(b.len().saturating_sub(1));
            match op {
                0 if !b.is_empty() => b[pos] = ch,
                1 => b.insert(pos, ch),
                _ if !b.is_empty() => {
                    b.remove(pos);
                }
                _ => {}
            }
        }
        b
    })
}

#[test]
fn weather_csv_arbitrary_bytes() {
    run(
        "weather-bytes",
        proptest::collection::vec(any::<u8>(), 0..600),
        |b| check_weather(&b),
    );
}

#[test]
fn weather_csv_mutated_good_file() {
    run("weather-mutated", mutate(GOOD_WEATHER), |b| {
        check_weather(&b);
    });
}

#[test]
fn weather_csv_long_cells_and_numbers() {
    let cell = prop_oneof![
        "[0-9]{1,400}",
        "[0-9]\\.[0-9]{0,5}e-?[0-9]{1,4}",
        "-?[0-9]{0,3}\\.?[0-9]{0,3}",
        "[a-zA-Z ]{0,300}",
    ];
    run(
        "weather-cells",
        proptest::collection::vec(cell, 7),
        |cells| {
            let text = format!("{}2021-03-04,{}\n", GOOD_WEATHER, cells.join(","));
            check_weather(text.as_bytes());
        },
    );
}

#[test]
fn mapping_ron_arbitrary_and_mutated() {
    run("mapping-mutated", mutate(GOOD_MAPPING), |b| {
        if let Ok(text) = std::str::from_utf8(&b) {
            let _ = mapping_from_ron_str(text);
        }
    });
    run("mapping-text", ".{0,300}", |text: String| {
        let _ = mapping_from_ron_str(&text);
    });
}

#[test]
fn project_ron_mutated_minimal_file() {
    run("project-mutated", mutate(MINIMAL_PROJECT), |b| {
        let Ok(text) = std::str::from_utf8(&b) else {
            return;
        };
        match parse_project(text, Path::new("fuzz.ron")) {
            Ok(project) => {
                // What is accepted saves and reads back the same.
                if let Ok(saved) = project_to_string(&project) {
                    let again = parse_project(&saved, Path::new("saved.ron")).unwrap();
                    assert_eq!(again, project);
                }
            }
            Err(e) => check_message(&e.to_string()),
        }
    });
}

#[test]
fn project_ron_arbitrary_text() {
    run("project-text", ".{0,400}", |text: String| {
        if let Err(e) = parse_project(&text, Path::new("fuzz.ron")) {
            check_message(&e.to_string());
        }
    });
}
