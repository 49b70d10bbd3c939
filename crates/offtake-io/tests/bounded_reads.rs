//! Bounded reads of weather and project files (issue 14): every cap refuses
//! with a message naming the limit, long cells are cut with their length,
//! underflow is reported, and the header reader is the importer's own.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::fmt::Write as _;
use std::io::Read;
use std::path::Path;

use offtake_io::project_file::{hand_written_comment_lines, load_project, parse_project};
use offtake_io::weather::{
    Delimiter, ImportError, ImportOptions, MAX_COLUMNS, MAX_LINE_BYTES, MAX_SERIES_DAYS,
    ProblemKind, import_weather_reader, read_header_from,
};

/// An endless stream of one byte (like `/dev/zero`), counting what is read.
struct Endless {
    byte: u8,
    read: usize,
}

impl Read for Endless {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        buf.fill(self.byte);
        self.read += buf.len();
        Ok(buf.len())
    }
}

#[test]
fn a_file_without_line_ends_stops_at_the_line_cap() {
    let mut source = Endless { byte: 0, read: 0 };
    let err = import_weather_reader(&mut source, "zero", &ImportOptions::default()).unwrap_err();
    assert!(
        matches!(&err, ImportError::LineTooLong { at, limit_bytes } if at.line == 1 && *limit_bytes == MAX_LINE_BYTES),
        "{err}"
    );
    assert_eq!(
        err.to_string(),
        format!(
            "zero:1:1: found a line longer than {MAX_LINE_BYTES} bytes, expected lines of at most {MAX_LINE_BYTES} bytes (a weather file's line is a few hundred; is this a weather CSV file?)"
        )
    );
    // Read no more than the cap and one buffer beyond it.
    assert!(
        source.read < MAX_LINE_BYTES + 64 * 1024,
        "read {}",
        source.read
    );
}

#[test]
fn an_over_long_data_line_names_its_line() {
    let text = format!(
        "date,tmax_c,tmin_c\n2021-01-01,30,20\n2021-01-02,{},20\n",
        "9".repeat(MAX_LINE_BYTES + 10)
    );
    let err =
        import_weather_reader(text.as_bytes(), "long.csv", &ImportOptions::default()).unwrap_err();
    assert!(
        err.to_string()
            .starts_with("long.csv:3:1: found a line longer than"),
        "{err}"
    );
}

#[test]
fn too_many_columns_are_refused_with_the_limit() {
    let mut header = String::from("date");
    for i in 0..=MAX_COLUMNS {
        let _ = write!(header, ",c{i}");
    }
    header.push('\n');
    let err = import_weather_reader(header.as_bytes(), "wide.csv", &ImportOptions::default())
        .unwrap_err();
    assert_eq!(
        err.to_string(),
        format!(
            "wide.csv:1:1: found {} columns in the header, expected at most {MAX_COLUMNS} columns",
            MAX_COLUMNS + 2
        )
    );
    let err = read_header_from(header.as_bytes(), "wide.csv", None).unwrap_err();
    assert!(matches!(err, ImportError::TooManyColumns { .. }), "{err}");
}

#[test]
fn a_wide_header_lists_only_the_first_names() {
    let mut header = String::from("date");
    for i in 0..30_000 {
        let _ = write!(header, ",c{i}");
    }
    header.push('\n');
    let err = import_weather_reader(header.as_bytes(), "wide.csv", &ImportOptions::default())
        .unwrap_err();
    let text = err.to_string();
    assert!(text.contains("and 29980 more"), "{}", &text[..200]);
    assert!(text.len() < 5_000, "message of {} bytes", text.len());
}

#[test]
fn a_long_cell_is_shown_cut_with_its_length() {
    let long = "7".repeat(250_000);
    let text = format!("date,tmax_c,tmin_c\n2021-01-01,{long}x,20\n");
    let err =
        import_weather_reader(text.as_bytes(), "cell.csv", &ImportOptions::default()).unwrap_err();
    let msg = err.to_string();
    assert!(
        msg.contains("… (250001 characters)"),
        "{}",
        &msg[..msg.len().min(300)]
    );
    assert!(msg.len() < 400, "message of {} bytes", msg.len());
}

#[test]
fn underflow_to_zero_is_reported_not_read_as_zero() {
    let text = "date,tmax_c,tmin_c,rain_mm\n2021-01-01,30,20,1e-400\n2021-01-02,30,20,0e-400\n";
    let err =
        import_weather_reader(text.as_bytes(), "u.csv", &ImportOptions::default()).unwrap_err();
    let ImportError::Rejected { problems, .. } = &err else {
        panic!("{err}");
    };
    assert_eq!(problems.len(), 1, "0e-400 is zero: {err}");
    assert!(matches!(problems[0].kind, ProblemKind::Underflow { .. }));
    assert_eq!(
        problems[0].to_string(),
        "u.csv:2:18: rain_mm: found \"1e-400\", a number too small to hold (it would be read as 0), expected 0 or a number of plausible size"
    );
}

#[test]
fn a_series_longer_than_the_cap_is_refused_with_its_size() {
    let mut text = String::from("date,rain_mm,tmax_c\n");
    let mut d = chrono::NaiveDate::from_ymd_opt(1700, 1, 1).unwrap();
    for _ in 0..=MAX_SERIES_DAYS {
        let _ = writeln!(text, "{d},0,30");
        d = d.succ_opt().unwrap();
    }
    let err =
        import_weather_reader(text.as_bytes(), "long.csv", &ImportOptions::default()).unwrap_err();
    assert_eq!(
        err.to_string(),
        format!(
            "long.csv:{}:1: found more than {MAX_SERIES_DAYS} days, expected a weather series of at most {MAX_SERIES_DAYS} days (about 273 years); split the record or keep the years you need",
            MAX_SERIES_DAYS + 2
        )
    );
}

#[test]
fn the_header_reader_is_the_importers_on_a_delimiter_tie() {
    // One comma and one semicolon: both readers must pick the same.
    let text = "date;tmax_c,tmin_c\n2021-01-01;30,5\n";
    let header = read_header_from(text.as_bytes(), "tie.csv", None).unwrap();
    assert_eq!(header.delimiter, Delimiter::Semicolon);
    assert_eq!(header.names, ["date", "tmax_c,tmin_c"]);
    let quoted = "\u{feff}\"date\",\"tmax_c\",tmin_c\n";
    let header = read_header_from(quoted.as_bytes(), "q.csv", None).unwrap();
    assert_eq!(header.names, ["date", "tmax_c", "tmin_c"]);
    assert_eq!(header.delimiter, Delimiter::Comma);
}

#[test]
fn a_project_file_with_a_byte_order_mark_is_read() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/project-files/minimal.ron"
    ))
    .unwrap();
    let plain = parse_project(&text, Path::new("p.ron")).unwrap();
    let with_bom = parse_project(&format!("\u{feff}{text}"), Path::new("p.ron")).unwrap();
    assert_eq!(plain, with_bom);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bom.ron");
    std::fs::write(&path, format!("\u{feff}{text}")).unwrap();
    assert_eq!(load_project(&path).unwrap(), plain);
}

#[test]
fn hand_written_comments_are_counted_and_own_header_is_not() {
    let text = "// Offtake project file (schema 2). Planning estimates only: designs\n\
                // must be checked by a qualified engineer under local codes.\n\
                (\n    schema: 2, // the layout\n    /* a block\n       comment */\n    name: \"a // not a comment\",\n)\n";
    assert_eq!(hand_written_comment_lines(text), 3);
}

#[test]
fn the_first_save_over_a_hand_written_file_keeps_the_original_beside_it() {
    use offtake_io::project_file::{original_path, save_project};
    let source = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/project-files/minimal.ron"
    );
    let text = std::fs::read_to_string(source).unwrap();
    assert!(
        hand_written_comment_lines(&text) > 0,
        "the corpus file has a comment"
    );
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("p.ron");
    std::fs::write(&path, &text).unwrap();
    let mut project = load_project(&path).unwrap();
    project.scheme.name = "Saved once (invented)".into();
    save_project(&path, &project).unwrap();
    let original = original_path(&path);
    assert_eq!(std::fs::read_to_string(&original).unwrap(), text);
    assert_eq!(load_project(&path).unwrap(), project);
    // Later saves never overwrite the original.
    project.scheme.name = "Saved twice (invented)".into();
    save_project(&path, &project).unwrap();
    assert_eq!(std::fs::read_to_string(&original).unwrap(), text);
    // A file Offtake wrote itself has no hand-written comments.
    let saved = std::fs::read_to_string(&path).unwrap();
    assert_eq!(hand_written_comment_lines(&saved), 0);
}
