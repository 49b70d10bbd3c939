//! CSV and XLSX table writers.
#![allow(clippy::unwrap_used)]

use std::path::Path;

use chrono::NaiveDate;
use offtake_io::export::{
    BLOCK_REQUIREMENTS_DAILY_HEADERS, Cell, DESIGN_VALUES_CSV, DESIGN_VALUES_HEADERS, ExportError,
    NODE_DEMAND_DAILY_HEADERS, RESULTS_WORKBOOK, Table, XLSX_MAX_ROWS, sheet_name, write_csv,
    write_csv_to, write_workbook,
};

fn design_table() -> Table {
    let mut t = Table::with_headers("design values", &DESIGN_VALUES_HEADERS);
    t.push_row(vec![
        "headworks".into(),
        2910.0.into(),
        4321.5.into(),
        4321.5.into(),
        Cell::Empty,
        5000.25.into(),
        4500.0.into(),
        1.485.into(),
        12_345_678.0.into(),
        2011.into(),
        3900.0.into(),
        Cell::Empty,
    ]);
    t.push_row(vec![
        "Lower, Minor \"1\"".into(),
        370.0.into(),
        500.0.into(),
        1000.0.into(),
        Some(800.0).into(),
        600.0.into(),
        550.0.into(),
        1.351.into(),
        1.0e6.into(),
        2007.into(),
        450.5.into(),
        520.0.into(),
    ]);
    t
}

/// The contract headers of `offtake run` (issue 5), spelled out here so a
/// change to the constants fails this test.
#[test]
fn contract_headers() {
    assert_eq!(
        DESIGN_VALUES_HEADERS.join(","),
        "node,area_ha,design_flow_ls,required_capacity_ls,existing_capacity_ls,peak_daily_ls,peak_10day_ls,duty_ls_ha,seasonal_volume_m3,design_year,design_flow_low_ls,design_flow_high_ls"
    );
    assert_eq!(NODE_DEMAND_DAILY_HEADERS.join(","), "date,node,demand_ls");
    assert_eq!(
        BLOCK_REQUIREMENTS_DAILY_HEADERS.join(","),
        "date,block,nir_mm,gir_mm,nir_m3,gir_m3"
    );
    assert_eq!(DESIGN_VALUES_CSV, "design_values.csv");
    assert_eq!(RESULTS_WORKBOOK, "results.xlsx");
}

#[test]
fn csv_has_header_blanks_quotes_and_dates() {
    let mut out = Vec::new();
    write_csv_to(&design_table(), &mut out, Path::new("x.csv")).unwrap();
    let text = String::from_utf8(out).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines[0], DESIGN_VALUES_HEADERS.join(","));
    assert_eq!(
        lines[1],
        "headworks,2910,4321.5,4321.5,,5000.25,4500,1.485,12345678,2011,3900,"
    );
    assert_eq!(
        lines[2],
        "\"Lower, Minor \"\"1\"\"\",370,500,1000,800,600,550,1.351,1000000,2007,450.5,520"
    );

    let mut daily = Table::with_headers("daily", &NODE_DEMAND_DAILY_HEADERS);
    daily.push_row(vec![
        NaiveDate::from_ymd_opt(2001, 2, 3).unwrap().into(),
        "main".into(),
        12.5.into(),
    ]);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("node_demand_daily.csv");
    write_csv(&daily, &path).unwrap();
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "date,node,demand_ls\n2001-02-03,main,12.5\n"
    );
}

#[test]
fn malformed_tables_are_refused() {
    let mut t = design_table();
    t.rows[1][2] = Cell::Number(f64::NAN);
    let err = write_csv_to(&t, Vec::new(), Path::new("x.csv")).unwrap_err();
    assert!(
        matches!(&err, ExportError::NonFinite { row: 2, column, .. } if column == "design_flow_ls"),
        "{err}"
    );
    let mut t = design_table();
    t.rows[0].pop();
    let err = write_csv_to(&t, Vec::new(), Path::new("x.csv")).unwrap_err();
    assert!(
        matches!(
            err,
            ExportError::RowWidth {
                row: 1,
                expected: 12,
                found: 11,
                ..
            }
        ),
        "{err}"
    );
}

#[test]
fn workbook_has_one_sheet_per_table() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join(RESULTS_WORKBOOK);
    let mut daily = Table::with_headers("demand/daily: main", &NODE_DEMAND_DAILY_HEADERS);
    for d in 1..=20 {
        daily.push_row(vec![
            NaiveDate::from_ymd_opt(2001, 1, d).unwrap().into(),
            "main".into(),
            f64::from(d).into(),
        ]);
    }
    let design = design_table();
    write_workbook(&[&design, &daily], &path).unwrap();
    let bytes = std::fs::read(&path).unwrap();
    // An XLSX file is a zip archive; member names are stored uncompressed.
    assert_eq!(&bytes[..4], b"PK\x03\x04");
    let has = |needle: &[u8]| bytes.windows(needle.len()).any(|w| w == needle);
    assert!(has(b"xl/worksheets/sheet1.xml"));
    assert!(has(b"xl/worksheets/sheet2.xml"));
    assert!(!has(b"xl/worksheets/sheet3.xml"));
    // Only the workbook is left in the folder (no temporary file).
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
}

#[test]
fn workbook_refuses_more_rows_than_a_sheet_holds() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("big.xlsx");
    let mut t = Table::with_headers("daily", &["x"]);
    // Header + 1,048,576 rows = one row too many.
    t.rows = vec![vec![Cell::Empty]; XLSX_MAX_ROWS];
    let err = write_workbook(&[&t], &path).unwrap_err();
    assert!(
        matches!(
            err,
            ExportError::TooManyRows {
                rows: 1_048_577,
                max: 1_048_576,
                ..
            }
        ),
        "{err}"
    );
    assert!(err.to_string().contains("CSV"));
    assert!(!path.exists());
}

#[test]
fn sheet_names_are_made_acceptable() {
    assert_eq!(sheet_name("demand/daily: main"), "demand_daily_ main");
    assert_eq!(sheet_name(&"x".repeat(40)).chars().count(), 31);
    assert_eq!(sheet_name("  "), "Sheet");
    let t = Table::with_headers("a", &["x"]);
    let u = Table::with_headers("A", &["x"]);
    let dir = tempfile::tempdir().unwrap();
    let err = write_workbook(&[&t, &u], &dir.path().join("d.xlsx")).unwrap_err();
    assert!(matches!(err, ExportError::DuplicateSheet(_)), "{err}");
}

/// Rounding for the CSV tables: the printed text has at most the asked
/// decimals, halves go away from zero, −0 prints as 0.
#[test]
#[expect(
    clippy::float_cmp,
    reason = "round_to returns the double nearest the rounded decimal: exact equality is the point"
)]
fn numbers_are_rounded_for_export() {
    use offtake_io::export::{Cell, round_to};
    assert_eq!(round_to(5_575.220_450_692_773, 2), 5_575.22);
    assert_eq!(round_to(1.915_883_316_389_269, 3), 1.916);
    assert_eq!(round_to(70_214_696.876_833_93, 1), 70_214_696.9);
    assert_eq!(round_to(0.125, 2), 0.13);
    assert_eq!(format!("{}", round_to(-0.001, 2)), "0");
    assert_eq!(format!("{}", round_to(0.1 + 0.2, 2)), "0.3");
    assert!(round_to(f64::NAN, 2).is_nan());
    let mut t = Table::with_headers("t", &["flow_ls", "duty_ls_ha"]);
    t.push_row(vec![
        Cell::rounded(1_234.567_891, 2),
        Cell::rounded_opt(None, 3),
    ]);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("t.csv");
    write_csv(&t, &path).unwrap();
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "flow_ls,duty_ls_ha\n1234.57,\n"
    );
}

/// Files written atomically get normal permissions (0o644 for a new file),
/// not the owner-only mode of the temporary file; a replaced file keeps its
/// own.
#[cfg(unix)]
#[test]
fn exported_files_get_normal_permissions() {
    use std::os::unix::fs::PermissionsExt;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("d.csv");
    write_csv(&design_table(), &path).unwrap();
    let mode = std::fs::metadata(&path).unwrap().permissions().mode() & 0o777;
    // 0o644 less whatever the process umask removes (never owner-only).
    assert_eq!(mode & 0o600, 0o600);
    assert_ne!(mode & 0o044, 0, "mode {mode:o}");
    std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o640)).unwrap();
    write_csv(&design_table(), &path).unwrap();
    let mode = std::fs::metadata(&path).unwrap().permissions().mode() & 0o777;
    assert_eq!(mode, 0o640);
    let book = dir.path().join("r.xlsx");
    write_workbook(&[&design_table()], &book).unwrap();
    let mode = std::fs::metadata(&book).unwrap().permissions().mode() & 0o777;
    assert_ne!(mode & 0o044, 0, "mode {mode:o}");
}
