//! `load_project_weather`: a project's weather read with its saved import
//! settings. One invented series (the project's seeded generator) is written
//! twice — in Offtake's own format and in a foreign layout (°F, km/h at 10 m,
//! W m⁻² daily mean, inches, day/month/year, semicolon and decimal comma) —
//! and both must give the same days.
//!
//! Unit factors are those of NIST SP 811 Appendix B.8 and FAO-56 Annex 1
//! (see `offtake_core::weather_import::units`); the foreign file is written
//! here with the inverse of each published factor.
#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use offtake_core::project::Project;
use offtake_core::weather::WeatherDay;
use offtake_core::weather_gen::{GeneratorSettings, generate_invented_weather};
use offtake_io::project_file::{load_project, parse_project, save_project};
use offtake_io::weather::units::{DepthUnit, RadiationUnit, TemperatureUnit, WindUnit};
use offtake_io::weather::{
    ColumnMapping, DateFormat, DecimalSeparator, Delimiter, ImportError, ImportSettings,
    ImportSettingsProblem, MappedColumn, ProjectWeatherError, Quantity, load_project_weather,
};

const MINIMAL: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../tests/project-files/minimal.ron"
);

fn series() -> Vec<WeatherDay> {
    let settings = GeneratorSettings {
        years: 3,
        ..GeneratorSettings::demo()
    };
    generate_invented_weather(&settings).unwrap().days
}

fn opt(v: Option<f64>, f: impl Fn(f64) -> String) -> String {
    v.map(f).unwrap_or_default()
}

/// Offtake's own format; `{}` prints the shortest text that reads back to
/// the same f64.
fn own_csv(days: &[WeatherDay]) -> String {
    let mut s = String::from("date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,rain_mm\n");
    for d in days {
        let f = |v: f64| format!("{v}");
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

/// The foreign layout, values to 9 decimals with a decimal comma.
fn foreign_csv(days: &[WeatherDay]) -> String {
    let mut s = String::from(
        "Fecha;Max Temp (F);Min Temp (F);RH max %;RH min %;Wind 10m (km/h);Solar (W/m2);Precip (in)\n",
    );
    let n = |v: f64| format!("{v:.9}").replace('.', ",");
    // Inverses of the published factors: °F = °C × 1.8 + 32; km/h = m/s ÷
    // (1000/3600); W m⁻² = MJ m⁻² day⁻¹ ÷ 0.0864; in = mm ÷ 25.4.
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
                col(
                    "RH max %",
                    Quantity::RhMax(offtake_io::weather::units::HumidityUnit::Percent),
                ),
                col(
                    "RH min %",
                    Quantity::RhMin(offtake_io::weather::units::HumidityUnit::Percent),
                ),
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

struct Fixture {
    _dir: tempfile::TempDir,
    own: PathBuf,
    foreign: PathBuf,
    days: Vec<WeatherDay>,
}

/// Writes both weather files and both projects (minimal.ron pointing at
/// them) in a temporary folder; the foreign project carries the settings.
fn fixture() -> Fixture {
    let dir = tempfile::tempdir().unwrap();
    let days = series();
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
    Fixture {
        _dir: dir,
        own: own_path,
        foreign: foreign_path,
        days,
    }
}

fn close(a: Option<f64>, b: Option<f64>) -> bool {
    match (a, b) {
        (Some(a), Some(b)) => (a - b).abs() <= 1e-6 * a.abs().max(1.0),
        (None, None) => true,
        _ => false,
    }
}

#[test]
fn saved_import_settings_round_trip_and_are_applied() {
    let fx = fixture();
    let project = load_project(&fx.foreign).unwrap();
    // Round trip: the settings come back as saved; the mapping's 10 m wind
    // height was adopted as the station's when attached.
    assert_eq!(project.weather.import, Some(foreign_settings()));
    assert!((project.weather.wind_height_m - 10.0).abs() < 1e-12);
    let text = std::fs::read_to_string(&fx.foreign).unwrap();
    assert!(text.contains("schema: 3,"), "{text}");
    assert!(text.contains("import:"), "{text}");
    assert_eq!(parse_project(&text, &fx.foreign).unwrap(), project);

    let foreign = load_project_weather(&fx.foreign, &project).unwrap();
    let own_project = load_project(&fx.own).unwrap();
    assert_eq!(own_project.weather.import, None);
    let own = load_project_weather(&fx.own, &own_project).unwrap();
    assert_eq!(foreign.site, own.site);
    assert_eq!(foreign.series.date_format, DateFormat::DayMonthYear);
    assert_eq!(foreign.series.wind_height_m, Some(10.0));
    assert_eq!(own.series.days.len(), fx.days.len());
    assert_eq!(foreign.series.days.len(), own.series.days.len());
    for ((f, o), g) in foreign
        .series
        .days
        .iter()
        .zip(&own.series.days)
        .zip(&fx.days)
    {
        assert_eq!(f.date, o.date);
        assert_eq!(o, g, "own format reads back exactly");
        for (a, b, what) in [
            (f.tmax_c, o.tmax_c, "tmax"),
            (f.tmin_c, o.tmin_c, "tmin"),
            (f.rhmax_pct, o.rhmax_pct, "rhmax"),
            (f.rhmin_pct, o.rhmin_pct, "rhmin"),
            (f.wind_ms, o.wind_ms, "wind"),
            (f.solar_mj, o.solar_mj, "solar"),
            (f.rain_mm, o.rain_mm, "rain"),
        ] {
            assert!(close(a, b), "{} {what}: {a:?} vs {b:?}", f.date);
        }
    }
}

#[test]
fn without_settings_a_foreign_file_asks_for_a_mapping() {
    let fx = fixture();
    let mut project = load_project(&fx.foreign).unwrap();
    project.weather.import = None;
    let err = load_project_weather(&fx.foreign, &project).unwrap_err();
    assert!(
        matches!(
            err,
            ProjectWeatherError::Import(ImportError::NeedsMapping { .. })
        ),
        "{err}"
    );
}

#[test]
fn a_contradicting_wind_height_is_refused_not_overridden() {
    let fx = fixture();
    let mut project: Project = load_project(&fx.foreign).unwrap();
    project.weather.wind_height_m = 2.0;
    let err = load_project_weather(&fx.foreign, &project).unwrap_err();
    match &err {
        ProjectWeatherError::WindHeightMismatch {
            project_m,
            column,
            mapping_m,
            ..
        } => {
            assert!((project_m - 2.0).abs() < 1e-12);
            assert_eq!(column, "Wind 10m (km/h)");
            assert!((mapping_m - 10.0).abs() < 1e-12);
        }
        other => panic!("unexpected {other}"),
    }
    assert!(err.to_string().contains("foreign.ron"), "{err}");
}

#[test]
fn contradictory_settings_and_missing_files_are_typed_errors() {
    let fx = fixture();
    let mut project = load_project(&fx.foreign).unwrap();
    if let Some(s) = project.weather.import.as_mut() {
        s.delimiter = Some(Delimiter::Comma);
    }
    let err = load_project_weather(&fx.foreign, &project).unwrap_err();
    assert!(
        matches!(
            err,
            ProjectWeatherError::Settings {
                problem: ImportSettingsProblem::DecimalCommaWithCommaDelimiter,
                ..
            }
        ),
        "{err}"
    );
    let mut project = load_project(&fx.own).unwrap();
    project.weather.path = "nowhere.csv".into();
    let err = load_project_weather(&fx.own, &project).unwrap_err();
    assert!(err.to_string().contains("nowhere.csv"), "{err}");
    project.weather.path = "  ".into();
    let err = load_project_weather(&fx.own, &project).unwrap_err();
    assert!(
        matches!(err, ProjectWeatherError::NoWeatherFile { .. }),
        "{err}"
    );
}

#[test]
fn import_options_carry_the_settings_both_ways() {
    use offtake_io::weather::{DEFAULT_MAX_PROBLEMS, ImportOptions};
    let s = foreign_settings();
    let o = ImportOptions::from_settings(&s);
    assert_eq!(o.max_problems, DEFAULT_MAX_PROBLEMS);
    assert_eq!(o.date_format, Some(DateFormat::DayMonthYear));
    assert_eq!(o.settings(), s);
    assert_eq!(ImportOptions::from(&s), o);
    assert_eq!(
        ImportOptions::default().settings(),
        ImportSettings::default()
    );
}
