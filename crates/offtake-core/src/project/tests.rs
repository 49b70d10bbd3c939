//! Tests of the project document: tree helpers, validation, scenarios.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use chrono::NaiveDate;

use super::*;
use crate::weather::WeatherDay;

fn canal(id: &str, parent: Option<&str>, ec: f64) -> Canal {
    Canal {
        id: id.into(),
        name: id.to_uppercase(),
        parent: parent.map(Into::into),
        kind: if parent.is_none() {
            CanalKind::Main
        } else {
            CanalKind::Distributary
        },
        conveyance_efficiency: ec,
        existing_capacity_m3s: None,
        operating_hours_per_day: 24.0,
        section: crate::project::CanalSectionSpec::default(),
    }
}

fn block(id: &str, canal: &str, area_ha: f64) -> Block {
    Block {
        id: id.into(),
        name: id.to_uppercase(),
        canal: canal.into(),
        area_ha,
        soil: "loam".into(),
        method: IrrigationMethod {
            name: "furrow".into(),
            application_efficiency: 0.6,
        },
        field_canal_efficiency: 0.8,
        delivery: crate::project::DeliveryMode::OnDemand,
        outlet_stream_size_ls: None,
    }
}

fn planting(
    id: &str,
    block: &str,
    crop: &str,
    area: PlantingArea,
    m: u32,
    d: u32,
    spread: u32,
) -> Planting {
    Planting {
        id: id.into(),
        block: block.into(),
        crop: crop.into(),
        area,
        first_planting: MonthDay { month: m, day: d },
        spread_days: spread,
        season: "wet".into(),
        strategy: Strategy::Refill {
            trigger_pct_of_raw: 100.0,
        },
        season_length_days: None,
        paddy: None,
        coefficients: crate::project::CoefficientChoice::Single,
    }
}

/// main (Ec 0.9) → d1 (Ec 0.8) → m1 (Ec 0.95); main → d2 (Ec 0.85).
fn fixture() -> Project {
    Project {
        scheme: SchemeInfo {
            name: "Test".into(),
            notes: String::new(),
        },
        canals: vec![
            canal("main", None, 0.9),
            canal("d1", Some("main"), 0.8),
            canal("d2", Some("main"), 0.85),
            canal("m1", Some("d1"), 0.95),
        ],
        blocks: vec![
            block("b1", "d1", 100.0),
            block("b2", "m1", 50.0),
            block("b3", "d2", 80.0),
        ],
        plantings: vec![
            planting(
                "p1",
                "b1",
                "rice-paddy",
                PlantingArea::PercentOfBlock(100.0),
                7,
                1,
                10,
            ),
            planting(
                "p2",
                "b2",
                "maize-grain",
                PlantingArea::Hectares(50.0),
                6,
                15,
                0,
            ),
            planting(
                "p3",
                "b3",
                "rice-paddy",
                PlantingArea::Hectares(40.0),
                7,
                1,
                0,
            ),
        ],
        weather: WeatherSource {
            path: "weather.csv".into(),
            latitude_deg: 18.0,
            elevation_m: 350.0,
            wind_height_m: 2.0,
            import: None,
        },
        scenarios: vec![Scenario {
            name: "shift".into(),
            description: String::new(),
            overrides: vec![Override::ShiftCropShare {
                from_crop: "rice-paddy".into(),
                to_crop: "maize-grain".into(),
                share_pct: 30.0,
                strategy: None,
                season_length_days: None,
            }],
            weather: WeatherPerturbation::default(),
        }],
        ..Project::default()
    }
}

/// Season lengths used by the tests (round numbers, not library values).
fn lengths(crop: &str) -> Option<u32> {
    match crop {
        "rice-paddy" => Some(120),
        "maize-grain" => Some(100),
        _ => None,
    }
}

fn ctx() -> ValidationContext<'static> {
    ValidationContext {
        crops: &lengths,
        weather_range: None,
    }
}

#[test]
fn tree_paths_areas_and_order() {
    let p = fixture();
    let path: Vec<&str> = p
        .path_to_headworks("m1")
        .unwrap()
        .iter()
        .map(|c| c.id.as_str())
        .collect();
    assert_eq!(path, ["m1", "d1", "main"]);
    assert_eq!(p.commanded_area_ha("main").unwrap(), 230.0);
    assert_eq!(p.commanded_area_ha("d1").unwrap(), 150.0);
    assert_eq!(p.commanded_area_ha("m1").unwrap(), 50.0);
    assert_eq!(p.scheme_area_ha(), 230.0);
    // 0.95 × 0.8 × 0.9 = 0.684
    assert!((p.conveyance_to_headworks("b2").unwrap() - 0.684).abs() < 1e-12);
    let order = p.canals_leaves_first().unwrap();
    let pos = |id| order.iter().position(|x| *x == id).unwrap();
    assert!(pos("m1") < pos("d1") && pos("d1") < pos("main") && pos("d2") < pos("main"));
    assert_eq!(p.child_canals("main").len(), 2);
    assert_eq!(p.blocks_on("d1").len(), 1);
}

#[test]
fn tree_helpers_terminate_on_cycles() {
    let mut p = fixture();
    p.canals[0].parent = Some("m1".into()); // main → m1 → d1 → main
    let err = p.path_to_headworks("d2").unwrap_err();
    assert!(matches!(err, tree::TreeError::Cycle { .. }), "{err}");
    assert!(p.canals_leaves_first().is_err());
    // commanded area is cycle-safe: every canal counted once.
    assert_eq!(p.commanded_area_ha("main").unwrap(), 230.0);
}

#[test]
fn fixture_is_valid() {
    let problems = fixture().validate(&ctx());
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn every_problem_is_listed() {
    let mut p = fixture();
    p.canals.push(canal("d2", Some("main"), 1.2)); // duplicate id, Ec > 1
    p.canals[1].operating_hours_per_day = 25.0;
    p.canals[2].conveyance_efficiency = 0.0;
    p.canals.push(canal("x1", Some("x2"), 0.9));
    p.canals.push(canal("x2", Some("x1"), 0.9));
    p.canals.push(canal("orphan", Some("nowhere"), 0.9));
    p.blocks.push(block("b4", "no-such-canal", -5.0));
    p.blocks[0].method.application_efficiency = 1.5;
    p.plantings.push(planting(
        "p4",
        "no-such-block",
        "maize-grain",
        PlantingArea::Hectares(1.0),
        1,
        1,
        0,
    ));
    p.plantings.push(planting(
        "p5",
        "b3",
        "unknown-crop",
        PlantingArea::Hectares(1.0),
        2,
        29,
        0,
    ));
    let problems = p.validate(&ctx());
    let text: Vec<String> = problems.iter().map(ToString::to_string).collect();
    let has = |pred: &dyn Fn(&ValidationProblem) -> bool| problems.iter().any(pred);
    assert!(
        has(
            &|q| matches!(q, ValidationProblem::DuplicateId { kind: ItemKind::Canal, id, count: 2 } if id == "d2")
        ),
        "{text:#?}"
    );
    assert!(has(
        &|q| matches!(q, ValidationProblem::OutOfRange { value, .. } if *value == 1.2)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::OutOfRange { value, .. } if *value == 0.0)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::OutOfRange { value, .. } if *value == 1.5)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::OutOfRange { field: "operating_hours_per_day", value, .. } if *value == 25.0)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::CanalCycle { canals } if canals.len() == 3)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::MissingParent { canal, .. } if canal == "orphan")
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::BlockOnMissingCanal { block, .. } if block == "b4")
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::OutOfRange { field: "area_ha", value, .. } if *value == -5.0)
    ));
    assert!(has(
        &|q| matches!(q, ValidationProblem::PlantingOnMissingBlock { planting, .. } if planting == "p4")
    ));
    assert!(has(&|q| matches!(
        q,
        ValidationProblem::InvalidPlantingDay {
            month: 2,
            day: 29,
            ..
        }
    )));
    assert!(has(
        &|q| matches!(q, ValidationProblem::UnknownCrop { crop, .. } if crop == "unknown-crop")
    ));
    // The cycle x1 ↔ x2 is reported once, not once per canal on it.
    let cycles = problems
        .iter()
        .filter(|q| matches!(q, ValidationProblem::CanalCycle { .. }))
        .count();
    assert_eq!(cycles, 1, "{text:#?}");
}

/// Two seasons may each use the whole block when one is harvested before the
/// next is planted; a spread planting leaves the field cohort by cohort.
///
/// Worked by hand: planting A (100 % of 100 ha) goes in over 10 days from
/// 1 January (day 0), each cohort (10 ha) for 100 days, so cohort c is in the
/// field on days c..c+99. On day 103 (14 April) cohorts 4–9 remain = 60 ha;
/// on day 104 (15 April) cohorts 5–9 = 50 ha. Planting B of 50 ha on
/// 15 April therefore fits exactly; on 14 April it needs 110 ha on one day.
#[test]
fn occupancy_with_spread_by_hand() {
    let mut p = fixture();
    p.scenarios.clear();
    p.blocks[0].area_ha = 100.0;
    let mut a = planting(
        "a",
        "b1",
        "x",
        PlantingArea::PercentOfBlock(100.0),
        1,
        1,
        10,
    );
    a.season_length_days = Some(100);
    let mut b = planting("b", "b1", "x", PlantingArea::Hectares(50.0), 4, 15, 0);
    b.season_length_days = Some(100);
    p.plantings = vec![a, b];
    assert!(p.validate(&ctx()).is_empty(), "{:#?}", p.validate(&ctx()));

    p.plantings[1].first_planting = MonthDay { month: 4, day: 14 };
    let problems = p.validate(&ctx());
    assert_eq!(problems.len(), 1, "{problems:#?}");
    match &problems[0] {
        ValidationProblem::BlockOverplanted {
            block,
            planted_ha,
            first_day,
            days,
            plantings,
            ..
        } => {
            assert_eq!(block, "b1");
            assert!((planted_ha - 110.0).abs() < 1e-9);
            assert_eq!(first_day, "04-14");
            assert_eq!(*days, 1);
            assert_eq!(plantings, &["a", "b"]);
        }
        other => panic!("unexpected {other}"),
    }
}

/// A season crossing 31 December occupies the start of the next year:
/// 120 days from 1 November (day 304) run to day 423 = day 58 (28 February)
/// of the next year, so a whole-block planting on 1 February (day 31)
/// overlaps it on days 31..=58, 28 days.
#[test]
fn occupancy_wraps_across_year_end() {
    let mut p = fixture();
    p.scenarios.clear();
    let mut a = planting(
        "a",
        "b1",
        "x",
        PlantingArea::PercentOfBlock(100.0),
        11,
        1,
        0,
    );
    a.season_length_days = Some(120);
    let mut b = planting("b", "b1", "x", PlantingArea::PercentOfBlock(100.0), 2, 1, 0);
    b.season_length_days = Some(60);
    p.plantings = vec![a, b];
    let problems = p.validate(&ctx());
    assert!(
        matches!(&problems[..], [ValidationProblem::BlockOverplanted { days: 28, first_day, .. }] if first_day == "02-01"),
        "{problems:#?}"
    );
    // Moved to 1 March it fits.
    p.plantings[1].first_planting = MonthDay { month: 3, day: 1 };
    assert!(p.validate(&ctx()).is_empty());
}

#[test]
fn planting_larger_than_its_block_is_reported_without_crop_data() {
    let mut p = fixture();
    p.plantings[1].crop = "not-in-library".into();
    p.plantings[1].area = PlantingArea::Hectares(75.0); // block b2 is 50 ha
    let problems = p.validate(&ctx());
    assert!(
        problems.iter().any(|q| matches!(q,
            ValidationProblem::PlantingLargerThanBlock { planting, area_ha, block_area_ha, .. }
                if planting == "p2" && *area_ha == 75.0 && *block_area_ha == 50.0)),
        "{problems:#?}"
    );
}

#[test]
fn season_longer_than_a_year_is_reported() {
    let mut p = fixture();
    p.plantings[0].season_length_days = Some(360);
    p.plantings[0].spread_days = 10;
    assert!(p.validate(&ctx()).iter().any(|q| matches!(
        q,
        ValidationProblem::SeasonLongerThanYear {
            season_days: 360,
            ..
        }
    )));
    // A season alone longer than a year is outside the table's physical
    // range (crate::limits::SEASON_LENGTH_DAYS).
    p.plantings[0].season_length_days = Some(400);
    assert!(p.validate(&ctx()).iter().any(|q| matches!(
        q,
        ValidationProblem::OutOfRange {
            field: "season_length_days",
            ..
        }
    )));
}

#[test]
fn plantings_outside_the_weather_record() {
    let p = fixture();
    let d = |y, m, dd| NaiveDate::from_ymd_opt(y, m, dd).unwrap();
    // p1: 1 July + 9 days of spread + 120-day season: last day 7 November.
    // p3: 1 July, no spread, 120 days: last day 28 October (fits exactly).
    // p2: 15 June + 100 days: last day 22 September.
    let outside = |end: NaiveDate| -> Vec<String> {
        let c = ValidationContext {
            crops: &lengths,
            weather_range: Some((d(2001, 1, 1), end)),
        };
        p.validate(&c)
            .into_iter()
            .filter_map(|q| match q {
                ValidationProblem::PlantingOutsideWeather { planting, .. } => Some(planting),
                _ => None,
            })
            .collect()
    };
    assert_eq!(outside(d(2001, 10, 28)), ["p1"]);
    assert_eq!(outside(d(2001, 10, 27)), ["p1", "p3"]);
    assert_eq!(outside(d(2001, 11, 7)), Vec::<String>::new());
    let long = ValidationContext {
        crops: &lengths,
        weather_range: Some((d(2001, 1, 1), d(2001, 12, 31))),
    };
    assert!(p.validate(&long).is_empty());
}

#[test]
fn shift_crop_share_moves_thirty_percent_of_rice() {
    let p = fixture();
    let s = p.apply_scenario("shift").unwrap();
    // Base untouched.
    assert_eq!(p.plantings.len(), 3);
    assert_eq!(s.plantings.len(), 5);
    let area = |proj: &Project, crop: &str| -> f64 {
        proj.plantings
            .iter()
            .filter(|pl| pl.crop == crop)
            .map(|pl| proj.planting_area_ha(pl).unwrap())
            .sum()
    };
    // Rice: 100 ha (p1) + 40 ha (p3) = 140 ha; 30 % = 42 ha moves to maize.
    assert!((area(&s, "rice-paddy") - 98.0).abs() < 1e-9);
    assert!((area(&s, "maize-grain") - (50.0 + 42.0)).abs() < 1e-9);
    let new = s.planting("p1-maize-grain").unwrap();
    assert_eq!(new.block, "b1");
    assert_eq!(new.first_planting, MonthDay { month: 7, day: 1 });
    // The scenario is itself valid (areas still fit each block).
    assert!(p.validate(&ctx()).is_empty());
}

#[test]
fn scenario_errors_name_the_problem() {
    let mut p = fixture();
    let err = p.apply_scenario("nope").unwrap_err();
    assert_eq!(
        err.to_string(),
        "no scenario named \"nope\"; the project has: shift"
    );
    p.scenarios[0].overrides.push(Override::SetCanalEfficiency {
        canal: "ghost".into(),
        conveyance_efficiency: 0.9,
    });
    let err = p.apply_scenario("shift").unwrap_err();
    assert_eq!(
        err,
        ScenarioError::UnknownItem {
            scenario: "shift".into(),
            index: 1,
            kind: "canal",
            id: "ghost".into()
        }
    );
    assert!(
        p.validate(&ctx())
            .iter()
            .any(|q| matches!(q, ValidationProblem::Scenario(_)))
    );
}

#[test]
fn problems_only_under_a_scenario_are_attributed_to_it() {
    let mut p = fixture();
    p.scenarios[0].overrides = vec![
        Override::SetBlockEfficiency {
            block: "b3".into(),
            method: None,
            field_canal_efficiency: Some(1.1),
        },
        Override::SetPlantingArea {
            planting: "p2".into(),
            area: PlantingArea::Hectares(60.0),
        },
    ];
    let problems = p.validate(&ctx());
    // Eb 1.1; planting larger than block b2 (50 ha); b2 over-planted.
    assert_eq!(problems.len(), 3, "{problems:#?}");
    assert!(problems.iter().all(
        |q| matches!(q, ValidationProblem::InScenario { scenario, .. } if scenario == "shift")
    ));
}

#[test]
fn a_station_left_at_the_new_project_values_is_reported() {
    let mut p = fixture();
    p.weather.path = "w.csv".into();
    p.weather.latitude_deg = 0.0;
    p.weather.elevation_m = 0.0;
    assert!(
        p.validate(&ctx())
            .iter()
            .any(|q| matches!(q, ValidationProblem::StationNotEntered))
    );
    // Either value entered: a real station may sit on the equator or at sea level.
    p.weather.elevation_m = 12.0;
    assert!(
        !p.validate(&ctx())
            .iter()
            .any(|q| matches!(q, ValidationProblem::StationNotEntered))
    );
}

#[test]
fn weather_changes_outside_their_ranges_are_reported_with_the_range() {
    let mut p = fixture();
    p.scenarios[0].weather = WeatherPerturbation {
        temperature_shift_c: 12.0,
        rain_change_pct: -100.0, // no rain: allowed
        radiation_change_pct: 60.0,
        wind_change_pct: f64::NAN,
    };
    let problems = p.validate(&ctx());
    let fields: Vec<&str> = problems
        .iter()
        .filter_map(|q| match q {
            ValidationProblem::BadValue { field, .. } => Some(*field),
            _ => None,
        })
        .collect();
    assert_eq!(
        fields,
        [
            "weather.temperature_shift_c",
            "weather.radiation_change_pct",
            "weather.wind_change_pct"
        ],
        "{problems:#?}"
    );
    assert!(problems[0].to_string().contains("between −10 and +10 °C"));
}

/// FAO-56 Annex 2, Table 2.3 (p. 214): e°(20 °C) = 2.338 kPa,
/// e°(30 °C) = 4.243 kPa. Checked through a perturbation that only shifts the
/// dewpoint: a day with Tdew = 20 °C keeps RH when shifted, and its dewpoint
/// moves to the temperature whose e° is e°(20) × the es ratio.
#[test]
fn temperature_shift_keeps_relative_humidity() {
    let mut day = WeatherDay::empty(NaiveDate::from_ymd_opt(2001, 5, 1).unwrap());
    day.tmax_c = Some(30.0);
    day.tmin_c = Some(20.0);
    day.tdew_c = Some(20.0);
    day.ea_kpa = Some(2.338);
    day.rain_mm = Some(10.0);
    day.wind_ms = Some(2.0);
    day.solar_mj = Some(20.0);
    let w = WeatherPerturbation {
        temperature_shift_c: 2.0,
        rain_change_pct: -20.0,
        radiation_change_pct: 5.0,
        wind_change_pct: -10.0,
    };
    let out = w.apply_to_day(&day);
    assert_eq!(out.tmax_c, Some(32.0));
    assert_eq!(out.tmin_c, Some(22.0));
    assert!((out.rain_mm.unwrap() - 8.0).abs() < 1e-12);
    assert!((out.solar_mj.unwrap() - 21.0).abs() < 1e-12);
    assert!((out.wind_ms.unwrap() - 1.8).abs() < 1e-12);
    // Table 2.3 values of e°(T) for the unshifted day: es = (4.243 + 2.338)/2.
    let es_before = f64::midpoint(4.243, 2.338);
    assert!(
        (f64::midpoint(
            scenario::tests_support::es(30.0),
            scenario::tests_support::es(20.0)
        ) - es_before)
            .abs()
            < 1e-3
    );
    let es_after = f64::midpoint(
        scenario::tests_support::es(32.0),
        scenario::tests_support::es(22.0),
    );
    let rh_before = 2.338 / es_before;
    let rh_after = out.ea_kpa.unwrap() / es_after;
    assert!(
        (rh_before - rh_after).abs() < 1e-3,
        "{rh_before} {rh_after}"
    );
    // The dewpoint carries the same vapour pressure as ea.
    assert!((scenario::tests_support::es(out.tdew_c.unwrap()) - out.ea_kpa.unwrap()).abs() < 1e-3);
    assert!(WeatherPerturbation::default().is_identity());
    assert_eq!(WeatherPerturbation::default().apply_to_day(&day), day);
}

#[test]
fn month_day_rules() {
    assert!(MonthDay::new(2, 29).is_none());
    assert!(MonthDay::new(4, 31).is_none());
    assert!(MonthDay::new(13, 1).is_none());
    assert_eq!(MonthDay::new(3, 1).unwrap().day_of_year0(), Some(59));
    assert_eq!(PlantingArea::PercentOfBlock(25.0).hectares(80.0), 20.0);
}

fn foreign_import(height_m: Option<f64>) -> crate::weather_import::ImportSettings {
    use crate::weather_import::units::{TemperatureUnit, WindUnit};
    use crate::weather_import::{
        ColumnMapping, DateFormat, DecimalSeparator, Delimiter, ImportSettings, MappedColumn,
        Quantity,
    };
    ImportSettings {
        mapping: Some(ColumnMapping {
            date_column: "Day".into(),
            columns: vec![
                MappedColumn {
                    header: "Tmax F".into(),
                    quantity: Quantity::Tmax(TemperatureUnit::Fahrenheit),
                },
                MappedColumn {
                    header: "Wind kmh".into(),
                    quantity: Quantity::Wind {
                        unit: WindUnit::KilometresPerHour,
                        height_m,
                    },
                },
            ],
        }),
        date_format: Some(DateFormat::DayMonthYear),
        delimiter: Some(Delimiter::Semicolon),
        decimal: Some(DecimalSeparator::Comma),
        missing_markers: Vec::new(),
    }
}

#[test]
fn attaching_import_settings_adopts_the_stated_wind_height() {
    let mut w = WeatherSource::default();
    assert!((w.wind_height_m - 2.0).abs() < 1e-12);
    w.set_import(Some(foreign_import(Some(10.0))));
    assert!((w.wind_height_m - 10.0).abs() < 1e-12);
    assert_eq!(w.wind_height_mismatch(), None);
    // Changing the height keeps the mapping's stated height equal.
    w.set_wind_height_m(3.0);
    let stated = w
        .import
        .as_ref()
        .and_then(crate::weather_import::ImportSettings::stated_wind_height_m);
    assert_eq!(stated, Some(3.0));
    assert_eq!(w.wind_height_mismatch(), None);
    // A mapping that states no height leaves the source's height alone.
    w.set_import(Some(foreign_import(None)));
    assert!((w.wind_height_m - 3.0).abs() < 1e-12);
    w.set_wind_height_m(4.0);
    assert_eq!(
        w.import
            .as_ref()
            .and_then(crate::weather_import::ImportSettings::stated_wind_height_m),
        None
    );
    assert_eq!(w.wind_height_mismatch(), None);
}

#[test]
fn contradicting_wind_heights_are_reported_by_validation() {
    let mut p = fixture();
    p.weather.import = Some(foreign_import(Some(10.0)));
    let problems = p.validate(&ctx());
    assert!(
        problems.iter().any(|q| matches!(
            q,
            ValidationProblem::WindHeightMismatch { source_m, column, mapping_m }
                if (*source_m - 2.0).abs() < 1e-12
                    && column == "Wind kmh"
                    && (*mapping_m - 10.0).abs() < 1e-12
        )),
        "{problems:?}"
    );
    p.weather.wind_height_m = 10.0;
    assert!(p.validate(&ctx()).is_empty(), "{:?}", p.validate(&ctx()));
}

#[test]
fn contradictory_import_settings_are_reported_by_validation() {
    let mut p = fixture();
    let mut import = foreign_import(None);
    import.delimiter = Some(crate::weather_import::Delimiter::Comma);
    p.weather.import = Some(import);
    let problems = p.validate(&ctx());
    assert!(
        problems.iter().any(|q| matches!(
            q,
            ValidationProblem::WeatherImport(
                crate::weather_import::ImportSettingsProblem::DecimalCommaWithCommaDelimiter
            )
        )),
        "{problems:?}"
    );
}
#[test]
fn paddy_inputs_out_of_range_are_listed() {
    let mut p = fixture();
    p.plantings[0].paddy = Some(super::PaddyInputs::default());
    assert!(p.validate(&ctx()).is_empty());
    p.plantings[0].paddy = Some(super::PaddyInputs {
        field_efficiency: 1.2,
        target_ponding_mm: 300.0,
        percolation_seepage_mm_day: -1.0,
        land_preparation_days: 0,
        ..super::PaddyInputs::default()
    });
    let problems: Vec<ValidationProblem> = p
        .validate(&ctx())
        .into_iter()
        .filter(ValidationProblem::is_error)
        .collect();
    let text: Vec<String> = problems.iter().map(ToString::to_string).collect();
    assert_eq!(problems.len(), 4, "{text:#?}");
    for field in [
        "field_efficiency",
        "target_ponding_mm",
        "percolation_seepage_mm_day",
        "land_preparation_days",
    ] {
        assert!(text.iter().any(|t| t.contains(field)), "{field}: {text:#?}");
    }
}
