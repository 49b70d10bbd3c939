//! Rotation rosters: turn volumes add up to the available flow × the cycle
//! length, no turn exceeds a capacity, delivered water is accounted day by
//! day, and the continuous-flow alternative when supply suffices.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use chrono::NaiveDate;
use offtake_core::rotation::{
    AvailableFlow, CycleMode, RotationError, RotationProblem, RotationUnit, continuous_flow_roster,
    relative_irrigation_supply, relative_water_supply, rotation_roster,
};
use proptest::prelude::*;

fn unit(name: &str, demand: Vec<f64>, capacity_ls: Option<f64>) -> RotationUnit {
    RotationUnit {
        name: name.to_owned(),
        demand_m3_day: demand,
        capacity_ls,
        raw_mm: None,
        etc_mm_day: None,
    }
}

fn start() -> NaiveDate {
    NaiveDate::from_ymd_opt(2031, 3, 1).unwrap()
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-7 * a.abs().max(b.abs()).max(1.0)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// In every rotation cycle the turn volumes add up to the available flow ×
    /// the cycle length; turns follow each other without overlap inside the
    /// cycle; no unit's flow exceeds its capacity; the daily delivered volumes
    /// add up to the roster volumes; every unit gets the same share of its
    /// demand within a cycle.
    #[test]
    fn roster_volumes_add_up(
        demands in prop::collection::vec(
            (prop::collection::vec(0.0f64..5_000.0, 16), prop::option::of(20.0f64..200.0)),
            1..8,
        ),
        share in 0.05f64..0.95,
        period in 1u32..11,
    ) {
        let units: Vec<RotationUnit> = demands
            .iter()
            .enumerate()
            .map(|(i, (d, cap))| unit(&format!("u{i}"), d.clone(), *cap))
            .collect();
        // Available: a share of the mean total demand, as a constant flow.
        let total_m3: f64 = units.iter().flat_map(|u| u.demand_m3_day.iter()).sum();
        let available_ls = share * total_m3 / 16.0 / 86.4;
        let roster = match rotation_roster(start(), &units, &AvailableFlow::Constant(available_ls), period) {
            Ok(r) => r,
            // Capacities too small for the flow: a typed error, acceptable.
            Err(RotationError::CapacityTooSmall { .. }) => return Ok(()),
            Err(e) => panic!("{e}"),
        };
        for cycle in &roster.cycles {
            let lines: Vec<_> = roster.entries.iter().filter(|e| e.cycle == cycle.cycle).collect();
            let volume: f64 = lines.iter().map(|e| e.volume_m3).sum();
            if cycle.mode == CycleMode::Rotation {
                prop_assert!(close(volume, available_ls * 86.4 * cycle.days as f64));
                prop_assert!(close(volume, cycle.available_volume_m3));
                let ris: Vec<f64> = lines
                    .iter()
                    .map(|e| {
                        let i = e.unit;
                        let d0 = (cycle.start - start()).num_days() as usize;
                        let demand: f64 = units[i].demand_m3_day[d0..d0 + cycle.days].iter().sum();
                        e.volume_m3 / demand
                    })
                    .collect();
                for r in &ris {
                    prop_assert!(close(*r, ris[0]));
                    prop_assert!(*r < 1.0);
                }
                // Turns in sequence, inside the cycle.
                let cycle_start = cycle.start.and_hms_opt(0, 0, 0).unwrap();
                let cycle_end = cycle_start + chrono::TimeDelta::days(cycle.days as i64);
                let mut last_end = cycle_start;
                let mut turn = 0;
                for e in &lines {
                    prop_assert!(e.start <= e.end);
                    if e.turn != turn {
                        prop_assert_eq!(e.start, last_end);
                        turn = e.turn;
                    }
                    last_end = e.end;
                    prop_assert!(e.end <= cycle_end);
                }
                prop_assert_eq!(last_end, cycle_end);
            } else {
                prop_assert!(volume <= cycle.available_volume_m3 * (1.0 + 1e-9));
            }
            for e in &lines {
                if let Some(cap) = units[e.unit].capacity_ls {
                    prop_assert!(e.flow_ls <= cap * (1.0 + 1e-9), "{} > {cap}", e.flow_ls);
                }
            }
        }
        let delivered: f64 = roster.delivered_m3_day.iter().sum();
        let listed: f64 = roster.entries.iter().map(|e| e.volume_m3).sum();
        prop_assert!(close(delivered, listed));
    }
}

#[test]
fn continuous_flow_when_supply_suffices() {
    let units = vec![
        unit("a", vec![100.0, 200.0, 300.0], None),
        unit("b", vec![50.0, 0.0, 25.0], None),
    ];
    // 1000 m³/day available, at most 325 m³/day asked.
    let roster =
        rotation_roster(start(), &units, &AvailableFlow::Constant(1000.0 / 86.4), 7).unwrap();
    assert_eq!(roster.cycles.len(), 1);
    assert_eq!(roster.cycles[0].mode, CycleMode::Continuous);
    assert_eq!(
        roster.delivered_m3_day,
        vec![100.0, 200.0, 300.0, 50.0, 0.0, 25.0]
    );
    assert_eq!(roster.relative_irrigation_supply(0), Some(1.0));
}

#[test]
fn continuous_flow_alternative_shares_a_short_day_in_proportion() {
    let units = vec![
        unit("a", vec![300.0, 300.0], None),
        unit("b", vec![100.0, 100.0], Some(1.0)),
    ];
    // Day 0: 200 m³ for 400 asked → half each; day 1: 400 m³ → full, but b's
    // capacity 1 l/s = 86.4 m³/day holds it.
    let available = AvailableFlow::Daily(vec![200.0 / 86.4, 400.0 / 86.4]);
    let roster = continuous_flow_roster(start(), &units, &available, 7).unwrap();
    let d = &roster.delivered_m3_day;
    assert!(close(d[0], 150.0) && close(d[1], 300.0));
    assert!(close(d[2], 50.0) && close(d[3], 86.4));
    assert_eq!(roster.warnings.len(), 1);
}

#[test]
fn capacity_too_small_for_the_flow_is_an_error() {
    // 100 l/s to share, but the two units together can take at most 30 l/s.
    let units = vec![
        unit("a", vec![50_000.0], Some(10.0)),
        unit("b", vec![50_000.0], Some(20.0)),
    ];
    let err = rotation_roster(start(), &units, &AvailableFlow::Constant(100.0), 1).unwrap_err();
    assert!(matches!(err, RotationError::CapacityTooSmall { ref unit, .. } if unit == "a"));
}

#[test]
fn every_input_problem_is_listed() {
    let units = vec![
        unit("a", vec![1.0, f64::NAN], Some(-3.0)),
        unit("b", vec![1.0], None),
    ];
    let Err(RotationError::Invalid(problems)) = rotation_roster(
        start(),
        &units,
        &AvailableFlow::Daily(vec![1.0, -1.0, 2.0]),
        0,
    ) else {
        panic!("expected invalid input");
    };
    assert!(problems.contains(&RotationProblem::ZeroRotationPeriod));
    assert!(
        problems
            .iter()
            .any(|p| matches!(p, RotationProblem::BadDemand { day: 1, .. }))
    );
    assert!(
        problems
            .iter()
            .any(|p| matches!(p, RotationProblem::BadUnitValue { .. }))
    );
    assert!(
        problems
            .iter()
            .any(|p| matches!(p, RotationProblem::DemandLength { found: 1, .. }))
    );
    assert!(
        problems
            .iter()
            .any(|p| matches!(p, RotationProblem::AvailableLength { found: 3, .. }))
    );
    assert!(
        problems
            .iter()
            .any(|p| matches!(p, RotationProblem::BadAvailable { day: 1, .. }))
    );
}

/// Relative water supply as defined by Levine (1982):
/// (irrigation + rain) ÷ (ETc + seepage and percolation).
#[test]
fn relative_supply_definitions() {
    // (300 + 100) ÷ (350 + 50) = 1.0; (150 + 50) ÷ (350 + 50) = 0.5.
    assert!(close(
        relative_water_supply(300.0, 100.0, 350.0, 50.0).unwrap(),
        1.0
    ));
    assert!(close(
        relative_water_supply(150.0, 50.0, 350.0, 50.0).unwrap(),
        0.5
    ));
    assert_eq!(relative_water_supply(10.0, 0.0, 0.0, 0.0), None);
    assert!(close(
        relative_irrigation_supply(14_000.0, 28_000.0).unwrap(),
        0.5
    ));
    assert_eq!(relative_irrigation_supply(1.0, 0.0), None);
}
