//! The malformed and awkward weather file corpus (tests/weather-corpus/README.md
//! documents each file's expected outcome). Every file must give its documented
//! result and none may panic.
#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::PathBuf;

use offtake_io::weather::{
    DateFormat, Delimiter, ImportError, ImportOptions, ImportedSeries, ProblemKind, WarningKind,
    import_weather_file, load_mapping,
};

fn corpus(name: &str) -> PathBuf {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/weather-corpus/"
    ))
    .join(name)
}

fn import(name: &str) -> Result<ImportedSeries, ImportError> {
    import_weather_file(&corpus(name), &ImportOptions::default())
}

fn err_text(name: &str) -> String {
    match import(name) {
        Ok(s) => panic!("{name}: expected an error, imported {} days", s.days.len()),
        Err(e) => e.to_string(),
    }
}

/// The message starts with `<path>:line:column: `.
fn assert_at(name: &str, msg: &str, line: u64, column: u64) {
    let prefix = format!("{}:{line}:{column}: ", corpus(name).display());
    assert!(
        msg.starts_with(&prefix),
        "{name}: expected message at {line}:{column}, got: {msg}"
    );
}

fn assert_good_three_days(s: &ImportedSeries) {
    assert_eq!(s.days.len(), 3);
    assert_eq!(s.days[0].tmax_c, Some(31.2));
    assert_eq!(s.days[2].rain_mm, Some(4.2));
    assert_eq!(s.days[1].solar_mj, Some(23.0));
    assert_eq!(s.days[0].tmean_c, None);
    assert_eq!(s.lines, vec![2, 3, 4]);
}

#[test]
fn good_own_format() {
    let s = import("good_own.csv").unwrap();
    assert_good_three_days(&s);
    assert!(s.warnings.is_empty(), "{:?}", s.warnings);
    assert_eq!(s.date_format, DateFormat::Iso);
}

#[test]
fn bom_is_accepted() {
    let s = import("bom.csv").unwrap();
    assert_good_three_days(&s);
    assert!(s.warnings.is_empty());
}

#[test]
fn crlf_is_accepted() {
    assert_good_three_days(&import("crlf.csv").unwrap());
}

#[test]
fn wrong_delimiter() {
    let msg = err_text("wrong_delimiter.csv");
    assert_at("wrong_delimiter.csv", &msg, 1, 1);
    assert!(msg.contains("no comma, semicolon or tab"), "{msg}");
}

#[test]
fn stated_delimiter_that_does_not_match() {
    let opts = ImportOptions {
        delimiter: Some(Delimiter::Comma),
        ..ImportOptions::default()
    };
    let msg = import_weather_file(&corpus("decimal_comma.csv"), &opts)
        .unwrap_err()
        .to_string();
    assert_at("decimal_comma.csv", &msg, 1, 1);
    assert!(msg.contains("single column with delimiter comma"), "{msg}");
}

#[test]
fn missing_header() {
    let msg = err_text("missing_header.csv");
    assert_at("missing_header.csv", &msg, 1, 1);
    assert!(
        msg.contains("found a date \"2021-03-01\" on the first line"),
        "{msg}"
    );
}

#[test]
fn text_in_numeric_cell() {
    let msg = err_text("text_in_numeric.csv");
    assert_at("text_in_numeric.csv", &msg, 3, 12);
    assert!(
        msg.contains("tmax_c: found \"abc\", expected a number in °C"),
        "{msg}"
    );
}

#[test]
fn duplicate_date_rejects_row() {
    let msg = err_text("duplicate_date.csv");
    assert_at("duplicate_date.csv", &msg, 4, 1);
    assert!(msg.contains("found 2021-03-02 again"), "{msg}");
    assert!(msg.contains("first on line 3"), "{msg}");
}

#[test]
fn out_of_order_rejects_row() {
    let msg = err_text("out_of_order.csv");
    assert_at("out_of_order.csv", &msg, 4, 1);
    assert!(
        msg.contains("found 2021-03-02 after 2021-03-03 (line 3)"),
        "{msg}"
    );
}

#[test]
fn blank_lines_are_skipped_and_reported() {
    let s = import("blank_lines.csv").unwrap();
    assert_eq!(s.days.len(), 3);
    assert_eq!(s.lines, vec![2, 4, 7]);
    let blanks: Vec<(u64, u64)> = s
        .warnings
        .iter()
        .filter_map(|w| match w.kind {
            WarningKind::BlankLines { count } => Some((w.at.line, count)),
            _ => None,
        })
        .collect();
    assert_eq!(blanks, vec![(3, 1), (5, 2)]);
}

#[test]
fn decimal_comma_with_semicolons() {
    let s = import("decimal_comma.csv").unwrap();
    assert_good_three_days(&s);
    assert!(
        s.warnings
            .iter()
            .any(|w| w.kind == WarningKind::DecimalComma)
    );
}

#[test]
fn decimal_comma_in_comma_file_is_a_field_count_error() {
    let msg = err_text("decimal_comma_in_comma_file.csv");
    assert!(msg.contains("found 9 fields, expected 8"), "{msg}");
    assert!(msg.contains("decimal comma"), "{msg}");
    assert_at("decimal_comma_in_comma_file.csv", &msg, 2, 38);
}

#[test]
fn overflow_sized_number_rejected() {
    let msg = err_text("huge_1e308.csv");
    assert_at("huge_1e308.csv", &msg, 3, 32);
    assert!(msg.contains("solar_mj: found \"1e308\""), "{msg}");
}

#[test]
fn nan_and_infinity_rejected_both_listed() {
    let e = import("nan.csv").unwrap_err();
    let ImportError::Rejected { problems, omitted } = &e else {
        panic!("expected Rejected, got {e}");
    };
    assert_eq!(*omitted, 0);
    assert_eq!(problems.len(), 2);
    assert!(matches!(&problems[0].kind, ProblemKind::NonFinite { found, .. } if found == "NaN"));
    assert_eq!((problems[0].at.line, problems[0].at.column), (3, 12));
    assert!(matches!(&problems[1].kind, ProblemKind::NonFinite { found, .. } if found == "inf"));
    assert_eq!(problems[1].at.line, 4);
}

#[test]
fn empty_file() {
    let msg = err_text("empty.csv");
    assert_at("empty.csv", &msg, 1, 1);
    assert!(msg.contains("empty file"), "{msg}");
}

#[test]
fn truncated_last_line() {
    let msg = err_text("truncated_last_line.csv");
    assert_at("truncated_last_line.csv", &msg, 4, 23);
    assert!(msg.contains("found 4 fields, expected 8"), "{msg}");
    assert!(msg.contains("truncated"), "{msg}");
}

#[test]
fn header_only() {
    let msg = err_text("header_only.csv");
    assert_at("header_only.csv", &msg, 2, 1);
    assert!(msg.contains("at least one data row"), "{msg}");
}

#[test]
fn ambiguous_dates_are_not_guessed() {
    let msg = err_text("ambiguous_dates.csv");
    assert_at("ambiguous_dates.csv", &msg, 2, 1);
    assert!(
        msg.contains("expected the date format to be stated"),
        "{msg}"
    );
    // Stating the format reads it.
    for (format, month) in [(DateFormat::DayMonthYear, 3), (DateFormat::MonthDayYear, 1)] {
        let opts = ImportOptions {
            date_format: Some(format),
            ..ImportOptions::default()
        };
        let s = import_weather_file(&corpus("ambiguous_dates.csv"), &opts).unwrap();
        assert_eq!(chrono::Datelike::month(&s.days[0].date), month);
    }
}

#[test]
fn day_month_year_deduced_and_reported() {
    let s = import("dmy_deduced.csv").unwrap();
    assert_eq!(s.date_format, DateFormat::DayMonthYear);
    assert_eq!(s.days[0].date.to_string(), "2021-01-11");
    let w = s
        .warnings
        .iter()
        .find(|w| matches!(w.kind, WarningKind::DateFormatDeduced { .. }))
        .expect("deduction reported");
    assert_eq!(w.at.line, 4);
}

#[test]
fn missing_days_reported_not_filled() {
    let s = import("missing_days.csv").unwrap();
    assert_eq!(s.days.len(), 3);
    let gaps: Vec<i64> = s
        .warnings
        .iter()
        .filter_map(|w| match w.kind {
            WarningKind::MissingDays { count, .. } => Some(count),
            _ => None,
        })
        .collect();
    assert_eq!(gaps, vec![3]);
}

#[test]
fn all_problems_listed_not_only_the_first() {
    let e = import("many_errors.csv").unwrap_err();
    let ImportError::Rejected { problems, .. } = &e else {
        panic!("expected Rejected, got {e}");
    };
    let at: Vec<(u64, u64)> = problems.iter().map(|p| (p.at.line, p.at.column)).collect();
    assert_eq!(at, vec![(3, 12), (4, 28), (5, 1)]);
    assert!(matches!(problems[2].kind, ProblemKind::BadDate { .. }));
}

#[test]
fn problem_cap_counts_the_rest() {
    let opts = ImportOptions {
        max_problems: 1,
        ..ImportOptions::default()
    };
    let e = import_weather_file(&corpus("many_errors.csv"), &opts).unwrap_err();
    let ImportError::Rejected { problems, omitted } = &e else {
        panic!("expected Rejected, got {e}");
    };
    assert_eq!((problems.len(), *omitted), (1, 2));
    assert!(e.to_string().contains("and 2 more problem(s)"));
}

#[test]
fn foreign_headers_need_a_mapping_and_get_a_guess() {
    let e = import("foreign_units.csv").unwrap_err();
    let ImportError::NeedsMapping { proposed, .. } = &e else {
        panic!("expected NeedsMapping, got {e}");
    };
    let saved = load_mapping(&corpus("foreign_units.mapping.ron")).unwrap();
    // The guess matches the saved mapping except the wind height, which is
    // never guessed.
    assert_eq!(proposed.mapping.date_column, saved.date_column);
    assert_eq!(proposed.mapping.columns.len(), saved.columns.len());
    assert_eq!(proposed.unassigned, vec!["Station".to_owned()]);
}

/// Conversions: NIST SP 811 B.8 (°F, km/h, inch) and FAO-56 Annex 1 (W m⁻²).
#[test]
fn foreign_units_converted_with_mapping() {
    let opts = ImportOptions {
        mapping: Some(load_mapping(&corpus("foreign_units.mapping.ron")).unwrap()),
        ..ImportOptions::default()
    };
    let s = import_weather_file(&corpus("foreign_units.csv"), &opts).unwrap();
    let d = s.days[0];
    let close = |a: Option<f64>, b: f64| (a.unwrap() - b).abs() < 1e-9;
    assert!(close(d.tmax_c, 35.0)); // 95 °F
    assert!(close(d.tmin_c, 15.0)); // 59 °F
    assert!(close(d.wind_ms, 10.0)); // 36 km/h
    assert!(close(d.solar_mj, 21.6)); // 250 W m⁻² × 0.0864
    assert!(close(d.rain_mm, 25.4)); // 1 in
    assert_eq!(s.wind_height_m, Some(10.0));
    assert!(
        s.warnings.iter().any(
            |w| matches!(&w.kind, WarningKind::IgnoredColumn { header } if header == "Station")
        )
    );
}

#[test]
fn tmin_above_tmax_is_readable() {
    // Import does not judge plausibility; the quality checks flag it.
    let s = import("tmin_above_tmax.csv").unwrap();
    assert_eq!(s.days.len(), 2);
}

#[test]
fn missing_file_is_an_io_error() {
    let e = import("no_such_file.csv").unwrap_err();
    assert!(matches!(e, ImportError::Io { .. }));
}
