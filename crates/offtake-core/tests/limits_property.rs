//! Property (issue 15): random projects drawn inside the physical ranges of
//! the table of limits (`offtake_core::limits`) never panic; each either
//! computes, with finite design flows, or returns a listed problem.
//!
//! Values are drawn at both ends of each physical range as well as inside
//! it, so the ends of every range are exercised. The weather is three
//! invented years from the seeded generator (`weather_gen`, invented data).

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::sync::OnceLock;

use offtake_core::crop::Crop;
use offtake_core::engine::{self, EngineError};
use offtake_core::limits::{self, Bound, Limit};
use offtake_core::project::{
    AvailableSupply, Block, Canal, CanalKind, CoefficientChoice, DesignBasis, EffectiveRain,
    IrrigationMethod, MonthDay, Options, PaddyInputs, Planting, PlantingArea, Project, Reservoir,
    Strategy as Schedule, SupplyFlow, WeatherSource,
};
use offtake_core::soil::Soil;
use offtake_core::weather::{StationSite, WeatherDay};
use offtake_core::weather_gen::{GeneratorSettings, generate_invented_weather};
use proptest::prelude::*;

const CROPS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/crops.ron"
));
const SOILS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../assets/library/soils.ron"
));

struct Inputs {
    crops: Vec<Crop>,
    soils: Vec<Soil>,
    weather: Vec<WeatherDay>,
}

fn inputs() -> &'static Inputs {
    static INPUTS: OnceLock<Inputs> = OnceLock::new();
    INPUTS.get_or_init(|| {
        let settings = GeneratorSettings {
            years: 3,
            plant_defects: false,
            site: StationSite {
                latitude_deg: 18.0,
                elevation_m: 350.0,
                wind_height_m: 2.0,
            },
            ..GeneratorSettings::demo()
        };
        Inputs {
            crops: ron::from_str(CROPS).unwrap(),
            soils: ron::from_str(SOILS).unwrap(),
            weather: generate_invented_weather(&settings).unwrap().days,
        }
    })
}

/// The smallest and largest allowed values of a physical range.
fn ends(l: &Limit) -> (f64, f64) {
    let lo = match l.physical.min {
        Bound::Inclusive(v) => v,
        Bound::Exclusive(v) => v + (v.abs() * 1e-9).max(1e-9),
    };
    let hi = match l.physical.max {
        Bound::Inclusive(v) => v,
        Bound::Exclusive(v) => v - (v.abs() * 1e-9).max(1e-9),
    };
    (lo, hi)
}

/// A value inside the physical range: either end, or anywhere between.
fn physical(l: &'static Limit) -> BoxedStrategy<f64> {
    let (lo, hi) = ends(l);
    prop_oneof![1 => Just(lo), 1 => Just(hi), 3 => lo..=hi].boxed()
}

/// A whole number inside the physical range.
fn physical_days(l: &'static Limit) -> BoxedStrategy<u32> {
    let (lo, hi) = ends(l);
    let (lo, hi) = (lo.ceil() as u32, hi.floor() as u32);
    prop_oneof![1 => Just(lo), 1 => Just(hi), 3 => lo..=hi].boxed()
}

fn canal_strategy() -> impl Strategy<Value = (f64, f64, Option<f64>)> {
    (
        physical(&limits::CONVEYANCE_EFFICIENCY),
        physical(&limits::OPERATING_HOURS),
        proptest::option::of(physical(&limits::EXISTING_CAPACITY_M3S)),
    )
}

fn block_strategy() -> impl Strategy<Value = (f64, f64, f64)> {
    (
        physical(&limits::BLOCK_AREA_HA),
        physical(&limits::APPLICATION_EFFICIENCY),
        physical(&limits::FIELD_CANAL_EFFICIENCY),
    )
}

fn schedule_strategy() -> impl Strategy<Value = Schedule> {
    prop_oneof![
        physical(&limits::TRIGGER_PCT_OF_RAW).prop_map(|t| Schedule::Refill {
            trigger_pct_of_raw: t
        }),
        physical_days(&limits::INTERVAL_DAYS).prop_map(|days| Schedule::Interval { days }),
        physical(&limits::NET_DEPTH_MM).prop_map(|net_mm| Schedule::Depth { net_mm }),
        (
            physical(&limits::TRIGGER_PCT_OF_TAW),
            physical(&limits::REFILL_PCT_OF_DEPLETION)
        )
            .prop_map(|(a, b)| Schedule::Deficit {
                trigger_pct_of_taw: a,
                refill_pct_of_depletion: b
            }),
        Just(Schedule::Rainfed),
    ]
}

fn paddy_strategy() -> impl Strategy<Value = PaddyInputs> {
    (
        physical(&limits::BUND_HEIGHT_MM),
        0.0..=1.0_f64,
        physical(&limits::PERCOLATION_SEEPAGE_MM_DAY),
        physical(&limits::LAND_PREPARATION_MM),
        physical_days(&limits::LAND_PREPARATION_DAYS),
        physical(&limits::NURSERY_SHARE),
        physical_days(&limits::NURSERY_DAYS),
        0_u32..=60,
        physical(&limits::PADDY_FIELD_EFFICIENCY),
    )
        .prop_map(
            |(bund, pond_share, ps, prep_mm, prep_days, share, nursery_days, drain, eff)| {
                PaddyInputs {
                    bund_height_mm: bund,
                    target_ponding_mm: bund * pond_share,
                    percolation_seepage_mm_day: ps,
                    land_preparation_mm: prep_mm,
                    land_preparation_days: prep_days,
                    nursery_share: share,
                    nursery_days,
                    drain_days_before_harvest: drain,
                    field_efficiency: eff,
                }
            },
        )
}

const CROP_IDS: [&str; 4] = ["maize-grain", "rice-paddy", "wheat-spring", "tomato"];

#[derive(Debug, Clone)]
struct PlantingDraw {
    block: usize,
    crop: usize,
    area_share: f64,
    month: u32,
    day: u32,
    spread: u32,
    strategy: Schedule,
    paddy: PaddyInputs,
    season: Option<u32>,
    dual: Option<f64>,
}

fn planting_strategy() -> impl Strategy<Value = PlantingDraw> {
    (
        0_usize..3,
        0..CROP_IDS.len(),
        physical(&limits::PLANTING_AREA_PCT),
        1_u32..=12,
        1_u32..=28,
        // Both ends, but mostly windows that leave room for a season (a
        // spread plus a season longer than a year is a listed problem).
        prop_oneof![1 => Just(0_u32), 1 => Just(365_u32), 6 => 0_u32..=60],
        schedule_strategy(),
        paddy_strategy(),
        proptest::option::of(physical_days(&limits::SEASON_LENGTH_DAYS)),
        proptest::option::of(physical(&limits::WETTED_FRACTION)),
    )
        .prop_map(
            |(block, crop, area_share, month, day, spread, strategy, paddy, season, dual)| {
                PlantingDraw {
                    block,
                    crop,
                    area_share,
                    month,
                    day,
                    spread,
                    strategy,
                    paddy,
                    season,
                    dual,
                }
            },
        )
}

#[derive(Debug, Clone)]
struct OptionsDraw {
    latitude: f64,
    elevation: f64,
    wind_height: f64,
    probability: f64,
    rotation: u32,
    supply: Option<f64>,
    reservoir: Option<(f64, f64)>,
    fixed_rain: Option<f64>,
}

fn options_strategy() -> impl Strategy<Value = OptionsDraw> {
    (
        physical(&limits::LATITUDE_DEG),
        physical(&limits::ELEVATION_M),
        physical(&limits::WIND_HEIGHT_M),
        physical(&limits::DESIGN_PROBABILITY_PCT),
        physical_days(&limits::ROTATION_PERIOD_DAYS),
        proptest::option::of(physical(&limits::AVAILABLE_FLOW_M3S)),
        proptest::option::of((
            physical(&limits::RESERVOIR_AREA_HA),
            physical(&limits::WATER_TEMPERATURE_C),
        )),
        proptest::option::of(physical(&limits::FIXED_EFFECTIVE_RAIN_PCT)),
    )
        .prop_map(
            |(latitude, elevation, wind_height, probability, rotation, supply, reservoir, rain)| {
                OptionsDraw {
                    latitude,
                    elevation,
                    wind_height,
                    probability,
                    rotation,
                    supply,
                    reservoir,
                    fixed_rain: rain,
                }
            },
        )
}

fn project(
    canals: &[(f64, f64, Option<f64>)],
    blocks: &[(f64, f64, f64)],
    plantings: &[PlantingDraw],
    o: &OptionsDraw,
) -> Project {
    let canal_id = |i: usize| format!("c{i}");
    let mut p = Project {
        canals: canals
            .iter()
            .enumerate()
            .map(|(i, &(ec, hours, cap))| Canal {
                id: canal_id(i),
                name: canal_id(i),
                // A chain: each canal takes from the one before.
                parent: i.checked_sub(1).map(canal_id),
                kind: CanalKind::Main,
                conveyance_efficiency: ec,
                existing_capacity_m3s: cap,
                operating_hours_per_day: hours,
                section: offtake_core::project::CanalSectionSpec::default(),
            })
            .collect(),
        blocks: blocks
            .iter()
            .enumerate()
            .map(|(i, &(area, ea, eb))| Block {
                id: format!("b{i}"),
                name: format!("b{i}"),
                canal: canal_id(i % canals.len()),
                area_ha: area,
                soil: "loam".into(),
                method: IrrigationMethod {
                    name: "furrow".into(),
                    application_efficiency: ea,
                },
                field_canal_efficiency: eb,
                // Each delivery mode, cycles at both ends of their range, and
                // an outlet that binds on every third block.
                delivery: match i % 3 {
                    0 => offtake_core::project::DeliveryMode::RotationWithinBlock {
                        cycle_days: if i % 2 == 0 { 1 } else { 30 },
                        min_depth_mm: 10.0,
                    },
                    1 => offtake_core::project::DeliveryMode::ContinuousFlow { cycle_days: 30 },
                    _ => offtake_core::project::DeliveryMode::OnDemand,
                },
                outlet_stream_size_ls: (i % 3 == 0).then_some((0.5 * area).clamp(1.0, 50_000.0)),
            })
            .collect(),
        weather: WeatherSource {
            path: "invented.csv".into(),
            latitude_deg: o.latitude,
            elevation_m: o.elevation,
            wind_height_m: o.wind_height,
            import: None,
        },
        options: Options {
            design_probability_pct: o.probability,
            design_basis: DesignBasis::TenDay,
            rotation_period_days: o.rotation,
            effective_rain: o
                .fixed_rain
                .map_or(EffectiveRain::WaterBalance, EffectiveRain::FixedPercent),
            available_supply: o.supply.map(|q| AvailableSupply {
                node: "headworks".into(),
                flow: SupplyFlow::Constant(q),
            }),
            ..Options::default()
        },
        reservoir: o.reservoir.map(|(area, temp)| Reservoir {
            name: "tank".into(),
            surface_area_ha: [area; 12],
            water_temperature_c: Some([temp; 12]),
            method: offtake_core::project::OpenWaterMethod::Penman,
        }),
        ..Project::default()
    };
    p.scheme.name = "random (invented)".into();
    for (i, d) in plantings.iter().enumerate() {
        let block = d.block % blocks.len();
        let crop = CROP_IDS[d.crop];
        p.plantings.push(Planting {
            id: format!("p{i}"),
            block: format!("b{block}"),
            crop: crop.into(),
            // Shares of one block stay within it when they are small.
            area: PlantingArea::PercentOfBlock(d.area_share / plantings.len() as f64),
            first_planting: MonthDay {
                month: d.month,
                day: d.day,
            },
            spread_days: d.spread,
            season: "s".into(),
            strategy: d.strategy,
            season_length_days: d.season,
            paddy: (crop == "rice-paddy").then_some(d.paddy),
            coefficients: d
                .dual
                .map_or(CoefficientChoice::Single, |fw| CoefficientChoice::Dual {
                    wetted_fraction: Some(fw),
                }),
        });
    }
    p
}

/// What one random project gave.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Outcome {
    Computed,
    Invalid,
    Refused,
}

fn check_one(
    canals: &[(f64, f64, Option<f64>)],
    blocks: &[(f64, f64, f64)],
    plantings: &[PlantingDraw],
    options: &OptionsDraw,
) -> Result<Outcome, TestCaseError> {
    let inputs = inputs();
    let p = project(canals, blocks, plantings, options);
    match engine::run_scenario(&p, None, &inputs.crops, &inputs.soils, &inputs.weather) {
        Ok(r) => {
            for d in &r.design {
                prop_assert!(
                    d.design_flow_ls.is_finite(),
                    "{}: {}",
                    d.name,
                    d.design_flow_ls
                );
            }
            Ok(Outcome::Computed)
        }
        Err(EngineError::Invalid { errors }) => {
            prop_assert!(!errors.is_empty());
            for e in &errors {
                prop_assert!(e.is_error());
                prop_assert!(!e.to_string().is_empty());
            }
            Ok(Outcome::Invalid)
        }
        // Any other refusal must say what is wrong; a result that is not
        // finite means a limit of the table lets an overflow through.
        Err(e) => {
            prop_assert!(!matches!(e, EngineError::NotFinite { .. }), "{e}");
            prop_assert!(!e.to_string().is_empty());
            Ok(Outcome::Refused)
        }
    }
}

#[test]
fn projects_inside_the_physical_ranges_compute_or_list_a_problem() {
    use proptest::test_runner::{Config, RngAlgorithm, TestRng, TestRunner};
    use std::sync::Mutex;
    // A fixed seed keeps the run reproducible; `LIMITS_PROPERTY_CASES`
    // asks for a longer exploratory run with a fresh seed.
    let extra: Option<u32> = std::env::var("LIMITS_PROPERTY_CASES")
        .ok()
        .and_then(|v| v.parse().ok());
    let config = Config {
        cases: extra.unwrap_or(96),
        ..Config::default()
    };
    let outcomes = Mutex::new(Vec::new());
    let mut runner = match extra {
        Some(_) => TestRunner::new(config),
        None => TestRunner::new_with_rng(config, TestRng::deterministic_rng(RngAlgorithm::ChaCha)),
    };
    let strategy = (
        prop::collection::vec(canal_strategy(), 1..=3),
        prop::collection::vec(block_strategy(), 1..=3),
        prop::collection::vec(planting_strategy(), 1..=3),
        options_strategy(),
    );
    runner
        .run(&strategy, |(canals, blocks, plantings, options)| {
            let o = check_one(&canals, &blocks, &plantings, &options)?;
            outcomes.lock().unwrap().push(o);
            Ok(())
        })
        .unwrap();
    let outcomes = outcomes.into_inner().unwrap();
    let count = |k| outcomes.iter().filter(|&&o| o == k).count();
    let computed = count(Outcome::Computed);
    eprintln!(
        "{} cases: {computed} computed, {} refused by validation, {} refused by a later step",
        outcomes.len(),
        count(Outcome::Invalid),
        count(Outcome::Refused)
    );
    // The property must reach the computation, not only the validation.
    assert!(
        computed * 4 >= outcomes.len(),
        "only {computed} of {} random projects were computed",
        outcomes.len()
    );
}
