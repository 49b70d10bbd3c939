//! End-to-end tests of `offtake weather check` and `offtake et0` on the
//! weather corpus (tests/weather-corpus/README.md gives each file's outcome).
#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::PathBuf;
use std::process::{Command, Output};

fn corpus(name: &str) -> String {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/weather-corpus/"
    ))
    .join(name)
    .display()
    .to_string()
}

fn offtake(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
        .args(args)
        .output()
        .expect("run offtake")
}

fn text(b: &[u8]) -> String {
    String::from_utf8_lossy(b).into_owned()
}

#[test]
fn check_good_file_exits_zero_with_summary() {
    let o = offtake(&["weather", "check", &corpus("good_own.csv")]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let out = text(&o.stdout);
    assert!(
        out.starts_with("summary: record 2021-03-01 to 2021-03-03"),
        "{out}"
    );
    assert!(out.contains("flags: 0"), "{out}");
}

#[test]
fn check_flags_are_not_failures() {
    let o = offtake(&["weather", "check", &corpus("tmin_above_tmax.csv")]);
    assert!(o.status.success());
    let out = text(&o.stdout);
    assert_eq!(
        out.lines().next().unwrap(),
        "2021-03-01 tmin_c tmin_above_tmax value=35 tmax=31.2"
    );
    assert!(out.contains("tmin_above_tmax 1"), "{out}");
}

#[test]
fn check_with_site_applies_radiation_rules() {
    let o = offtake(&[
        "weather",
        "check",
        &corpus("good_own.csv"),
        "--lat",
        "-20",
        "--elevation",
        "100",
    ]);
    assert!(o.status.success());
    assert!(!text(&o.stdout).contains("not applied"));
    let o = offtake(&["weather", "check", &corpus("good_own.csv")]);
    assert!(text(&o.stdout).contains("not applied"));
}

/// Each malformed file: non-zero exit, `file:line:column: reason` on stderr,
/// the same text from both commands.
#[test]
fn malformed_files_give_positioned_errors_in_both_commands() {
    let cases = [
        ("text_in_numeric.csv", ":3:12: tmax_c: found \"abc\""),
        ("missing_header.csv", ":1:1: found a date"),
        ("wrong_delimiter.csv", ":1:1: found header"),
        ("duplicate_date.csv", ":4:1: date: found 2021-03-02 again"),
        (
            "out_of_order.csv",
            ":4:1: date: found 2021-03-02 after 2021-03-03",
        ),
        ("huge_1e308.csv", ":3:32: solar_mj: found \"1e308\""),
        ("nan.csv", ":3:12: tmax_c: found \"NaN\""),
        ("empty.csv", ":1:1: found an empty file"),
        (
            "truncated_last_line.csv",
            ":4:23: found 4 fields, expected 8",
        ),
        ("header_only.csv", ":2:1: found the end of the file"),
        ("ambiguous_dates.csv", ":2:1: date: found \"01/03/2021\""),
        ("decimal_comma_in_comma_file.csv", ":2:38: found 9 fields"),
    ];
    for (file, expected) in cases {
        let path = corpus(file);
        let check = offtake(&["weather", "check", &path]);
        let et0 = offtake(&[
            "et0",
            "--weather",
            &path,
            "--lat",
            "10",
            "--elevation",
            "200",
        ]);
        for (cmd, o) in [("check", &check), ("et0", &et0)] {
            assert!(!o.status.success(), "{cmd} {file}: expected failure");
            let err = text(&o.stderr);
            let wanted = format!("{path}{expected}");
            assert!(
                err.contains(&wanted),
                "{cmd} {file}: expected {wanted:?} in:\n{err}"
            );
            assert!(!err.contains("panicked"), "{cmd} {file}: panicked:\n{err}");
        }
    }
}

#[test]
fn all_problems_listed() {
    let path = corpus("many_errors.csv");
    let o = offtake(&["weather", "check", &path]);
    assert!(!o.status.success());
    let err = text(&o.stderr);
    for at in [":3:12:", ":4:28:", ":5:1:"] {
        assert!(
            err.contains(&format!("{path}{at}")),
            "{at} missing in:\n{err}"
        );
    }
}

#[test]
fn stated_date_format_reads_ambiguous_file() {
    let o = offtake(&[
        "weather",
        "check",
        &corpus("ambiguous_dates.csv"),
        "--date-format",
        "dmy",
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("record 2021-03-01 to 2021-05-01"));
}

#[test]
fn mapping_file_reads_foreign_units() {
    let o = offtake(&[
        "weather",
        "check",
        &corpus("foreign_units.csv"),
        "--mapping",
        &corpus("foreign_units.mapping.ron"),
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert!(text(&o.stderr).contains("\"Station\" is not mapped and is ignored"));
    let o = offtake(&["weather", "check", &corpus("foreign_units.csv")]);
    assert!(!o.status.success());
    assert!(text(&o.stderr).contains("expected a column mapping (proposed: \"Date\" = date"));
}

#[test]
fn et0_csv_header_and_rows() {
    let o = offtake(&[
        "et0",
        "--weather",
        &corpus("good_own.csv"),
        "--lat",
        "-20",
        "--elevation",
        "100",
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let out = text(&o.stdout);
    let mut lines = out.lines();
    assert!(lines.next().unwrap().starts_with("date,et0_mm"));
    let rows: Vec<&str> = lines.collect();
    assert_eq!(rows.len(), 3);
    assert!(rows[0].starts_with("2021-03-01,"));
    let et0: f64 = rows[0].split(',').nth(1).unwrap().parse().unwrap();
    assert!(et0 > 0.0 && et0 < 15.0, "{et0}");
}

#[test]
fn et0_tmin_above_tmax_stops_or_skips() {
    let path = corpus("tmin_above_tmax.csv");
    let o = offtake(&[
        "et0",
        "--weather",
        &path,
        "--lat",
        "-20",
        "--elevation",
        "100",
    ]);
    assert!(!o.status.success());
    let err = text(&o.stderr);
    assert!(
        err.contains(&format!("{path}:2:1: 2021-03-01: tmin_c = 35")),
        "{err}"
    );

    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("et0.csv");
    let o = offtake(&[
        "et0",
        "--weather",
        &path,
        "--lat",
        "-20",
        "--elevation",
        "100",
        "--skip-invalid",
        "--out",
        out_path.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert!(text(&o.stderr).contains("warning: 2021-03-01"));
    let written = std::fs::read_to_string(&out_path).unwrap();
    let rows: Vec<&str> = written.lines().collect();
    assert!(rows[0].starts_with("date,et0_mm"));
    assert_eq!(rows[1], "2021-03-01,,,,");
    assert!(rows[2].starts_with("2021-03-02,"));
}

#[test]
fn et0_failure_leaves_no_partial_output_file() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("et0.csv");
    let o = offtake(&[
        "et0",
        "--weather",
        &corpus("text_in_numeric.csv"),
        "--lat",
        "-20",
        "--elevation",
        "100",
        "--out",
        out_path.to_str().unwrap(),
    ]);
    assert!(!o.status.success());
    assert!(!out_path.exists());
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
}

#[test]
fn bad_site_is_an_error() {
    let o = offtake(&[
        "et0",
        "--weather",
        &corpus("good_own.csv"),
        "--lat",
        "95",
        "--elevation",
        "100",
    ]);
    assert!(!o.status.success());
    assert!(text(&o.stderr).contains("--lat: found 95"));
}

/// FAO-56 Example 18 (Allen et al. 1998, pp. 72–73), Uccle 6 July: ET0 = 3.9
/// mm/day (printed to one decimal). The file uses foreign headers and wind in
/// km/h at 10 m, so this checks mapping, unit conversion (NIST SP 811 km/h),
/// wind height from the mapping, and the ET0 call end to end.
#[test]
fn et0_fao56_example18_through_mapping() {
    let o = offtake(&[
        "et0",
        "--weather",
        &corpus("fao56_example18.csv"),
        "--mapping",
        &corpus("fao56_example18.mapping.ron"),
        "--lat",
        "50.8",
        "--elevation",
        "100",
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let out = text(&o.stdout);
    let row = out.lines().nth(1).unwrap();
    let et0: f64 = row.split(',').nth(1).unwrap().parse().unwrap();
    assert!((et0 - 3.9).abs() <= 0.05, "{row}");
    assert!(row.ends_with(",rhmax_rhmin,sunshine,measured"), "{row}");
}

#[test]
fn check_writes_flags_csv() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("flags.csv");
    let o = offtake(&[
        "weather",
        "check",
        &corpus("tmin_above_tmax.csv"),
        "--out",
        out_path.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let written = std::fs::read_to_string(&out_path).unwrap();
    let rows: Vec<&str> = written.lines().collect();
    assert_eq!(rows[0], "date,variable,rule,value,limit");
    assert_eq!(rows[1], "2021-03-01,tmin_c,tmin_above_tmax,35,31.2");
}

#[test]
fn bad_mapping_file_is_positioned() {
    let mapping = corpus("good_own.csv"); // not RON
    let o = offtake(&[
        "weather",
        "check",
        &corpus("foreign_units.csv"),
        "--mapping",
        &mapping,
    ]);
    assert!(!o.status.success());
    let err = text(&o.stderr);
    assert!(
        err.starts_with(&format!("{mapping}:1:1: mapping file:")),
        "{err}"
    );
}
