//! Validation at the ends of every range of the table of limits: each end
//! of the physical range passes, a step beyond it is an error naming the item
//! and the field; each end of the usual range passes without a warning, a
//! step beyond it (inside the physical range) is a warning.

#![allow(clippy::unwrap_used, clippy::float_cmp)]

use crate::limits::{self, Bound, Limit};
use crate::project::{
    AvailableSupply, Block, Canal, CanalKind, CoefficientChoice, EffectiveRain, IrrigationMethod,
    MonthDay, OpenWaterMethod, PaddyInputs, Planting, PlantingArea, Project, Reservoir, Strategy,
    SupplyFlow, ValidationContext, ValidationProblem, WeatherSource,
};

fn base() -> Project {
    Project {
        canals: vec![Canal {
            id: "main".into(),
            name: "Main".into(),
            parent: None,
            kind: CanalKind::Main,
            conveyance_efficiency: 0.9,
            existing_capacity_m3s: Some(1.0),
            operating_hours_per_day: 24.0,
            section: crate::project::CanalSectionSpec::default(),
        }],
        blocks: vec![Block {
            id: "b1".into(),
            name: "B1".into(),
            canal: "main".into(),
            area_ha: 50.0,
            soil: "loam".into(),
            method: IrrigationMethod {
                name: "furrow".into(),
                application_efficiency: 0.6,
            },
            field_canal_efficiency: 0.8,
            delivery: crate::project::DeliveryMode::OnDemand,
            outlet_stream_size_ls: None,
        }],
        plantings: vec![Planting {
            id: "p1".into(),
            block: "b1".into(),
            crop: "rice-paddy".into(),
            area: PlantingArea::Hectares(50.0),
            first_planting: MonthDay { month: 7, day: 1 },
            spread_days: 10,
            season: "wet".into(),
            strategy: Strategy::Refill {
                trigger_pct_of_raw: 100.0,
            },
            season_length_days: Some(120),
            paddy: Some(PaddyInputs {
                nursery_share: 0.05,
                ..PaddyInputs::default()
            }),
            coefficients: CoefficientChoice::Dual {
                wetted_fraction: Some(0.8),
            },
        }],
        weather: WeatherSource {
            path: "weather.csv".into(),
            latitude_deg: 18.0,
            elevation_m: 350.0,
            wind_height_m: 2.0,
            import: None,
        },
        reservoir: Some(Reservoir {
            name: "Tank".into(),
            surface_area_ha: [100.0; 12],
            water_temperature_c: Some([25.0; 12]),
            method: OpenWaterMethod::Meyer,
        }),
        ..Project::default()
    }
    .with_options()
}

trait WithOptions {
    fn with_options(self) -> Self;
}

impl WithOptions for Project {
    fn with_options(mut self) -> Self {
        self.options.effective_rain = EffectiveRain::FixedPercent(70.0);
        self.options.available_supply = Some(AvailableSupply {
            node: "headworks".into(),
            flow: SupplyFlow::Constant(1.0),
        });
        self
    }
}

fn ctx() -> ValidationContext<'static> {
    ValidationContext {
        crops: &|_: &str| Some(120),
        weather_range: None,
    }
}

type Set = fn(&mut Project, f64);

/// Whole numbers are stored as u32; values below 0 or beyond u32 cannot be
/// written in a file and are not tried.
fn days(v: f64) -> u32 {
    v as u32
}

fn paddy(p: &mut Project) -> &mut PaddyInputs {
    p.plantings[0].paddy.as_mut().unwrap()
}

/// (limit, setter, start of the message, whether the value is a count).
fn cases() -> Vec<(&'static Limit, Set, &'static str, bool)> {
    vec![
        (
            &limits::CONVEYANCE_EFFICIENCY,
            (|p, v| p.canals[0].conveyance_efficiency = v) as Set,
            "canal \"main\": Conveyance efficiency Ec (conveyance_efficiency)",
            false,
        ),
        (
            &limits::OPERATING_HOURS,
            |p, v| p.canals[0].operating_hours_per_day = v,
            "canal \"main\": Operating hours (operating_hours_per_day)",
            false,
        ),
        (
            &limits::EXISTING_CAPACITY_M3S,
            |p, v| p.canals[0].existing_capacity_m3s = Some(v),
            "canal \"main\": Existing capacity (existing_capacity_m3s)",
            false,
        ),
        (
            &limits::BLOCK_AREA_HA,
            |p, v| {
                p.blocks[0].area_ha = v;
                p.plantings[0].area = PlantingArea::PercentOfBlock(50.0);
            },
            "block \"b1\": Block area (area_ha)",
            false,
        ),
        (
            &limits::APPLICATION_EFFICIENCY,
            |p, v| p.blocks[0].method.application_efficiency = v,
            "block \"b1\": Application efficiency Ea (method.application_efficiency)",
            false,
        ),
        (
            &limits::FIELD_CANAL_EFFICIENCY,
            |p, v| p.blocks[0].field_canal_efficiency = v,
            "block \"b1\": Field-canal efficiency Eb (field_canal_efficiency)",
            false,
        ),
        (
            &limits::PLANTING_AREA_HA,
            |p, v| {
                p.blocks[0].area_ha = 1.0e7;
                p.plantings[0].area = PlantingArea::Hectares(v);
            },
            "planting \"p1\": Planting area (area)",
            false,
        ),
        (
            &limits::PLANTING_AREA_PCT,
            |p, v| p.plantings[0].area = PlantingArea::PercentOfBlock(v),
            "planting \"p1\": Planting area (area)",
            false,
        ),
        (
            &limits::SPREAD_DAYS,
            |p, v| p.plantings[0].spread_days = days(v),
            "planting \"p1\": Planting spread (spread_days)",
            true,
        ),
        (
            &limits::SEASON_LENGTH_DAYS,
            |p, v| {
                p.plantings[0].spread_days = 0;
                p.plantings[0].season_length_days = Some(days(v));
            },
            "planting \"p1\": Season length (season_length_days)",
            true,
        ),
        (
            &limits::TRIGGER_PCT_OF_RAW,
            |p, v| {
                p.plantings[0].strategy = Strategy::Refill {
                    trigger_pct_of_raw: v,
                };
            },
            "planting \"p1\": Refill trigger (strategy.trigger_pct_of_raw)",
            false,
        ),
        (
            &limits::INTERVAL_DAYS,
            |p, v| p.plantings[0].strategy = Strategy::Interval { days: days(v) },
            "planting \"p1\": Irrigation interval (strategy.days)",
            true,
        ),
        (
            &limits::NET_DEPTH_MM,
            |p, v| p.plantings[0].strategy = Strategy::Depth { net_mm: v },
            "planting \"p1\": Net depth per irrigation (strategy.net_mm)",
            false,
        ),
        (
            &limits::TRIGGER_PCT_OF_TAW,
            |p, v| {
                p.plantings[0].strategy = Strategy::Deficit {
                    trigger_pct_of_taw: v,
                    refill_pct_of_depletion: 80.0,
                };
            },
            "planting \"p1\": Deficit trigger (strategy.trigger_pct_of_taw)",
            false,
        ),
        (
            &limits::REFILL_PCT_OF_DEPLETION,
            |p, v| {
                p.plantings[0].strategy = Strategy::Deficit {
                    trigger_pct_of_taw: 60.0,
                    refill_pct_of_depletion: v,
                };
            },
            "planting \"p1\": Refill share (strategy.refill_pct_of_depletion)",
            false,
        ),
        (
            &limits::PADDY_FIELD_EFFICIENCY,
            |p, v| paddy(p).field_efficiency = v,
            "planting \"p1\": Paddy field efficiency (paddy field_efficiency)",
            false,
        ),
        (
            &limits::BUND_HEIGHT_MM,
            |p, v| {
                paddy(p).target_ponding_mm = 0.0;
                paddy(p).bund_height_mm = v;
            },
            "planting \"p1\": Bund height (paddy bund_height_mm)",
            false,
        ),
        (
            &limits::TARGET_PONDING_MM,
            |p, v| {
                paddy(p).bund_height_mm = 1000.0;
                paddy(p).target_ponding_mm = v;
            },
            "planting \"p1\": Pond depth (paddy target_ponding_mm)",
            false,
        ),
        (
            &limits::PERCOLATION_SEEPAGE_MM_DAY,
            |p, v| paddy(p).percolation_seepage_mm_day = v,
            "planting \"p1\": Seepage and percolation (paddy percolation_seepage_mm_day)",
            false,
        ),
        (
            &limits::LAND_PREPARATION_MM,
            |p, v| paddy(p).land_preparation_mm = v,
            "planting \"p1\": Land preparation water (paddy land_preparation_mm)",
            false,
        ),
        (
            &limits::LAND_PREPARATION_DAYS,
            |p, v| paddy(p).land_preparation_days = days(v),
            "planting \"p1\": Land preparation (paddy land_preparation_days)",
            true,
        ),
        (
            &limits::NURSERY_SHARE,
            |p, v| paddy(p).nursery_share = v,
            "planting \"p1\": Nursery share (paddy nursery_share)",
            false,
        ),
        (
            &limits::NURSERY_DAYS,
            |p, v| paddy(p).nursery_days = days(v),
            "planting \"p1\": Nursery (paddy nursery_days)",
            true,
        ),
        (
            &limits::DRAIN_DAYS_BEFORE_HARVEST,
            |p, v| paddy(p).drain_days_before_harvest = days(v),
            "planting \"p1\": Drained before harvest (paddy drain_days_before_harvest)",
            true,
        ),
        (
            &limits::WETTED_FRACTION,
            |p, v| {
                p.plantings[0].coefficients = CoefficientChoice::Dual {
                    wetted_fraction: Some(v),
                };
            },
            "planting \"p1\": Wetted fraction fw (coefficients wetted_fraction)",
            false,
        ),
        (
            &limits::LATITUDE_DEG,
            |p, v| p.weather.latitude_deg = v,
            "weather: Latitude (latitude_deg)",
            false,
        ),
        (
            &limits::ELEVATION_M,
            |p, v| p.weather.elevation_m = v,
            "weather: Elevation (elevation_m)",
            false,
        ),
        (
            &limits::WIND_HEIGHT_M,
            |p, v| p.weather.wind_height_m = v,
            "weather: Wind height (wind_height_m)",
            false,
        ),
        (
            &limits::RESERVOIR_AREA_HA,
            |p, v| p.reservoir.as_mut().unwrap().surface_area_ha[3] = v,
            "reservoir \"Tank\" month 4: Reservoir surface area (surface_area_ha)",
            false,
        ),
        (
            &limits::WATER_TEMPERATURE_C,
            |p, v| {
                p.reservoir
                    .as_mut()
                    .unwrap()
                    .water_temperature_c
                    .as_mut()
                    .unwrap()[11] = v;
            },
            "reservoir \"Tank\" month 12: Water temperature (water_temperature_c)",
            false,
        ),
        (
            &limits::DESIGN_PROBABILITY_PCT,
            |p, v| p.options.design_probability_pct = v,
            "options: Design probability (design_probability_pct)",
            false,
        ),
        (
            &limits::ROTATION_PERIOD_DAYS,
            |p, v| p.options.rotation_period_days = days(v),
            "options: Rotation period (rotation_period_days)",
            true,
        ),
        (
            &limits::FIXED_EFFECTIVE_RAIN_PCT,
            |p, v| p.options.effective_rain = EffectiveRain::FixedPercent(v),
            "options: Effective rain (fixed %) (effective_rain FixedPercent)",
            false,
        ),
        (
            &limits::AVAILABLE_FLOW_M3S,
            |p, v| {
                p.options.available_supply = Some(AvailableSupply {
                    node: "headworks".into(),
                    flow: SupplyFlow::Constant(v),
                });
            },
            "options.available_supply: Available flow (flow)",
            false,
        ),
        (
            &limits::DELIVERY_CYCLE_DAYS,
            |p, v| {
                p.blocks[0].delivery = crate::project::DeliveryMode::RotationWithinBlock {
                    cycle_days: days(v),
                    min_depth_mm: 10.0,
                };
            },
            "block \"b1\": Delivery cycle (delivery.cycle_days)",
            true,
        ),
        (
            &limits::MIN_TURN_DEPTH_MM,
            |p, v| {
                p.blocks[0].delivery = crate::project::DeliveryMode::RotationWithinBlock {
                    cycle_days: 7,
                    min_depth_mm: v,
                };
            },
            "block \"b1\": Smallest turn (delivery.min_depth_mm)",
            false,
        ),
        (
            &limits::OUTLET_STREAM_SIZE_LS,
            |p, v| p.blocks[0].outlet_stream_size_ls = Some(v),
            "block \"b1\": Outlet stream size (outlet_stream_size_ls)",
            false,
        ),
        (
            &limits::MAX_INTERPOLATION_DAYS,
            |p, v| p.options.gap_filling.max_interpolation_days = days(v),
            "options: Longest gap interpolated (gap_filling.max_interpolation_days)",
            true,
        ),
    ]
}

/// Messages about the field (`prefix` starts them).
fn about(p: &Project, prefix: &str) -> Vec<(bool, String)> {
    p.validate(&ctx())
        .iter()
        .map(|q| (q.is_error(), q.to_string()))
        .filter(|(_, m)| m.starts_with(prefix))
        .collect()
}

/// The allowed values nearest each end of a range, and the first values
/// beyond them (`None` where a count cannot go below 0).
fn edges(min: Bound, max: Bound, count: bool) -> [(f64, Option<f64>); 2] {
    let step = |v: f64| {
        if count {
            1.0
        } else {
            (v.abs() * 1e-6).max(1e-6)
        }
    };
    let low = match min {
        Bound::Inclusive(v) => (v, Some(v - step(v))),
        Bound::Exclusive(v) => (v + step(v), Some(v)),
    };
    let high = match max {
        Bound::Inclusive(v) => (v, Some(v + step(v))),
        Bound::Exclusive(v) => (v - step(v), Some(v)),
    };
    let low = (low.0, low.1.filter(|&b| !count || b >= 0.0));
    [low, high]
}

#[test]
fn the_base_project_has_no_problem() {
    let problems = base().validate(&ctx());
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn every_table_field_is_checked() {
    let fields: Vec<&str> = cases().iter().map(|c| c.0.field).collect();
    let missing: Vec<&str> = limits::ALL
        .iter()
        .map(|l| l.field)
        // A month number is checked as a month (BadOption), not as a range.
        .filter(|f| *f != limits::YEAR_START_MONTH.field && !fields.contains(f))
        .collect();
    assert!(missing.is_empty(), "not tested: {missing:?}");
}

#[test]
fn physical_ends_pass_and_a_step_beyond_is_an_error_naming_item_and_field() {
    for (limit, set, prefix, count) in cases() {
        for (inside, beyond) in edges(limit.physical.min, limit.physical.max, count) {
            let mut p = base();
            set(&mut p, inside);
            let msgs = about(&p, prefix);
            assert!(
                msgs.iter().all(|(error, _)| !error),
                "{prefix} = {inside}: {msgs:#?}"
            );
            if let Some(beyond) = beyond {
                let mut p = base();
                set(&mut p, beyond);
                let msgs = about(&p, prefix);
                assert!(
                    msgs.iter()
                        .any(|(error, m)| *error && m.contains("outside its physical range")),
                    "{prefix} = {beyond}: {msgs:#?}"
                );
            }
        }
    }
}

#[test]
fn usual_ends_pass_and_a_step_beyond_warns_with_value_and_usual_range() {
    for (limit, set, prefix, count) in cases() {
        for (inside, beyond) in edges(limit.usual.min, limit.usual.max, count) {
            let mut p = base();
            set(&mut p, inside);
            let msgs = about(&p, prefix);
            assert!(msgs.is_empty(), "{prefix} = {inside}: {msgs:#?}");
            let Some(beyond) = beyond.filter(|&b| limit.physical.contains(b)) else {
                continue;
            };
            let mut p = base();
            set(&mut p, beyond);
            let msgs = about(&p, prefix);
            let expected = format!("is outside the usual range {}", limit.usual_text());
            assert!(
                msgs.iter()
                    .any(|(error, m)| !*error && m.contains(&expected)),
                "{prefix} = {beyond}: {msgs:#?}"
            );
        }
    }
}

#[test]
fn warnings_do_not_count_as_errors() {
    let mut p = base();
    p.blocks[0].method.application_efficiency = 0.01;
    let problems = p.validate(&ctx());
    assert_eq!(problems.len(), 1, "{problems:#?}");
    assert!(!problems[0].is_error());
    assert!(matches!(problems[0], ValidationProblem::Unusual { value, .. } if value == 0.01));
}
