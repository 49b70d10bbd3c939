//! `offtake run` on a project whose weather file is in a foreign layout,
//! read through the import settings saved in the project (issue 3: "a
//! mapping is saved with the project so re-import is one click").
//!
//! One invented series (the project's seeded generator) is written twice in
//! the test's folder: in Offtake's own format, and as °F, km/h at 10 m,
//! W m⁻² daily mean, inches, day/month/year dates, semicolon delimiter and
//! decimal comma. The two projects differ only in their weather source; the
//! design flows must agree. The foreign values are written with the inverse
//! of the published factors (NIST SP 811 Appendix B.8; FAO-56 Annex 1) to 9
//! decimals, so the two inputs agree to about 1e-9 relative.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::fmt::Write as _;
use std::path::Path;
use std::process::Command;

use offtake_core::weather::WeatherDay;
use offtake_core::weather_gen::{GeneratorSettings, generate_invented_weather};
use offtake_io::project_file::{load_project, save_project};
use offtake_io::weather::units::{
    DepthUnit, HumidityUnit, RadiationUnit, TemperatureUnit, WindUnit,
};
use offtake_io::weather::{
    ColumnMapping, DateFormat, DecimalSeparator, Delimiter, ImportSettings, MappedColumn, Quantity,
};

const MINIMAL: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../tests/project-files/minimal.ron"
);

fn offtake() -> Command {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
}

fn opt(v: Option<f64>, f: impl Fn(f64) -> String) -> String {
    v.map(f).unwrap_or_default()
}

fn own_csv(days: &[WeatherDay]) -> String {
    let mut s = String::from("date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,rain_mm\n");
    let f = |v: f64| format!("{v}");
    for d in days {
        writeln!(
            s,
            "{},{},{},{},{},{},{},{}",
            d.date.format("%Y-%m-%d"),
            opt(d.tmax_c, f),
            opt(d.tmin_c, f),
            opt(d.rhmax_pct, f),
            opt(d.rhmin_pct, f),
            opt(d.wind_ms, f),
            opt(d.solar_mj, f),
            opt(d.rain_mm, f),
        )
        .unwrap();
    }
    s
}

fn foreign_csv(days: &[WeatherDay]) -> String {
    let mut s = String::from(
        "Fecha;Max Temp (F);Min Temp (F);RH max %;RH min %;Wind 10m (km/h);Solar (W/m2);Precip (in)\n",
    );
    let n = |v: f64| format!("{v:.9}").replace('.', ",");
    for d in days {
        writeln!(
            s,
            "{};{};{};{};{};{};{};{}",
            d.date.format("%d/%m/%Y"),
            opt(d.tmax_c, |c| n(c * 1.8 + 32.0)),
            opt(d.tmin_c, |c| n(c * 1.8 + 32.0)),
            opt(d.rhmax_pct, n),
            opt(d.rhmin_pct, n),
            opt(d.wind_ms, |v| n(v * 3.6)),
            opt(d.solar_mj, |v| n(v / 0.0864)),
            opt(d.rain_mm, |v| n(v / 25.4)),
        )
        .unwrap();
    }
    s
}

fn foreign_settings() -> ImportSettings {
    let col = |header: &str, quantity| MappedColumn {
        header: header.into(),
        quantity,
    };
    ImportSettings {
        mapping: Some(ColumnMapping {
            date_column: "Fecha".into(),
            columns: vec![
                col("Max Temp (F)", Quantity::Tmax(TemperatureUnit::Fahrenheit)),
                col("Min Temp (F)", Quantity::Tmin(TemperatureUnit::Fahrenheit)),
                col("RH max %", Quantity::RhMax(HumidityUnit::Percent)),
                col("RH min %", Quantity::RhMin(HumidityUnit::Percent)),
                col(
                    "Wind 10m (km/h)",
                    Quantity::Wind {
                        unit: WindUnit::KilometresPerHour,
                        height_m: Some(10.0),
                    },
                ),
                col(
                    "Solar (W/m2)",
                    Quantity::Solar(RadiationUnit::WattsPerSquareMetreDailyMean),
                ),
                col("Precip (in)", Quantity::Rain(DepthUnit::Inches)),
            ],
        }),
        date_format: Some(DateFormat::DayMonthYear),
        delimiter: Some(Delimiter::Semicolon),
        decimal: Some(DecimalSeparator::Comma),
        missing_markers: Vec::new(),
    }
}

/// Runs `offtake run` and returns the design-values table (node → numbers).
fn run(project: &Path, out: &Path) -> Vec<(String, Vec<Option<f64>>)> {
    let result = offtake()
        .arg("run")
        .arg(project)
        .arg("--out")
        .arg(out)
        .output()
        .unwrap();
    assert!(
        result.status.success(),
        "{}",
        String::from_utf8_lossy(&result.stderr)
    );
    assert!(String::from_utf8_lossy(&result.stdout).contains("Headworks design flow:"));
    std::fs::read_to_string(out.join("design_values.csv"))
        .unwrap()
        .lines()
        .skip(1)
        .map(|l| {
            let mut cells = l.split(',');
            let node = cells.next().unwrap().to_owned();
            (node, cells.map(|c| c.parse::<f64>().ok()).collect())
        })
        .collect()
}

#[test]
fn run_applies_the_saved_import_settings() {
    let dir = tempfile::tempdir().unwrap();
    let days = generate_invented_weather(&GeneratorSettings {
        years: 4,
        ..GeneratorSettings::demo()
    })
    .unwrap()
    .days;
    std::fs::write(dir.path().join("own.csv"), own_csv(&days)).unwrap();
    std::fs::write(dir.path().join("foreign.csv"), foreign_csv(&days)).unwrap();

    let base = load_project(Path::new(MINIMAL)).unwrap();
    let mut own = base.clone();
    own.weather.path = "own.csv".into();
    own.weather.wind_height_m = 10.0;
    let mut foreign = base;
    foreign.weather.path = "foreign.csv".into();
    foreign.weather.set_import(Some(foreign_settings()));
    let own_path = dir.path().join("own.ron");
    let foreign_path = dir.path().join("foreign.ron");
    save_project(&own_path, &own).unwrap();
    save_project(&foreign_path, &foreign).unwrap();
    // The settings survive save and load.
    let reloaded = load_project(&foreign_path).unwrap();
    assert_eq!(reloaded, foreign);
    assert_eq!(reloaded.weather.import, Some(foreign_settings()));

    let own_rows = run(&own_path, &dir.path().join("own-results"));
    let foreign_rows = run(&foreign_path, &dir.path().join("foreign-results"));
    assert!(!own_rows.is_empty());
    assert_eq!(own_rows.len(), foreign_rows.len());
    let head = own_rows.iter().find(|(n, _)| n == "headworks").unwrap();
    assert!(head.1[1].unwrap() > 0.0, "design flow {:?}", head.1);
    for ((on, ov), (fnode, fv)) in own_rows.iter().zip(&foreign_rows) {
        assert_eq!(on, fnode);
        assert_eq!(ov.len(), fv.len());
        for (a, b) in ov.iter().zip(fv) {
            match (a, b) {
                // The tables print full precision; the inputs agree to about
                // 1e-9 relative, so the results agree far inside 1e-7.
                (Some(a), Some(b)) => assert!(
                    (a - b).abs() <= 1e-7 * a.abs().max(1.0),
                    "{on}: {ov:?} vs {fv:?}"
                ),
                (None, None) => {}
                _ => panic!("{on}: {ov:?} vs {fv:?}"),
            }
        }
    }
}

#[test]
fn run_refuses_a_contradicting_wind_height() {
    let dir = tempfile::tempdir().unwrap();
    let days = generate_invented_weather(&GeneratorSettings {
        years: 2,
        ..GeneratorSettings::demo()
    })
    .unwrap()
    .days;
    std::fs::write(dir.path().join("foreign.csv"), foreign_csv(&days)).unwrap();
    let mut p = load_project(Path::new(MINIMAL)).unwrap();
    p.weather.path = "foreign.csv".into();
    p.weather.import = Some(foreign_settings());
    p.weather.wind_height_m = 2.0;
    let path = dir.path().join("p.ron");
    save_project(&path, &p).unwrap();
    let out = offtake().arg("run").arg(&path).output().unwrap();
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("wind_height_m = 2 m") && err.contains("states 10 m"),
        "{err}"
    );
}
