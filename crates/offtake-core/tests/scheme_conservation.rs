//! Conservation of water through the canal tree (issue 5, "Tests"): every day,
//! the sum over blocks of NIR ÷ (Ea × Eb) ÷ the conveyance efficiencies along
//! the block's path equals the headworks demand. The reference sum is
//! computed here independently of the tree walk in `SchemeDemand`.
//!
//! Some series carry their own application efficiency (a paddy planting,
//! whose efficiency covers operational losses only): for those the sum uses
//! NIR ÷ (Ea of the series × Eb), so the identity is
//! Σ_series NIR_s ÷ (Ea_s × Eb × Π Ec) = headworks demand.
#![allow(clippy::unwrap_used, clippy::float_cmp, clippy::needless_range_loop)]

use chrono::NaiveDate;
use offtake_core::scheme::{
    Block, Canal, Network, NetworkProblem, NirSeries, Node, SchemeDemand, SchemeError,
};
use proptest::prelude::*;

const DAYS: usize = 15;

#[derive(Debug, Clone)]
struct RandomScheme {
    canals: Vec<(Option<usize>, f64)>,
    blocks: Vec<(usize, f64, f64, f64)>,
    series: Vec<(usize, usize, Vec<f64>, Option<f64>)>,
}

fn scheme_strategy() -> impl Strategy<Value = RandomScheme> {
    (1usize..10)
        .prop_flat_map(|n_canals| {
            let canals = (0..n_canals)
                .map(|i| {
                    let parent = if i == 0 {
                        Just(None).boxed()
                    } else {
                        prop_oneof![Just(None), (0..i).prop_map(Some)].boxed()
                    };
                    (parent, 0.3f64..=1.0)
                })
                .collect::<Vec<_>>();
            let blocks = prop::collection::vec(
                (0..n_canals, 0.5f64..500.0, 0.3f64..=1.0, 0.3f64..=1.0),
                1..15,
            );
            (canals, blocks)
        })
        .prop_flat_map(|(canals, blocks)| {
            let n_blocks = blocks.len();
            let series = prop::collection::vec(
                (
                    0..n_blocks,
                    0usize..3,
                    prop::collection::vec(0.0f64..20_000.0, DAYS),
                    prop::option::of(0.3f64..=1.0),
                ),
                1..25,
            );
            (Just(canals), Just(blocks), series)
        })
        .prop_map(|(canals, blocks, series)| RandomScheme {
            canals,
            blocks,
            series,
        })
}

fn build(s: &RandomScheme) -> (Network, Vec<NirSeries>) {
    let canals = s
        .canals
        .iter()
        .enumerate()
        .map(|(i, (parent, ec))| Canal {
            id: format!("c{i}"),
            name: format!("canal {i}"),
            parent: parent.map(|p| format!("c{p}")),
            conveyance_efficiency: *ec,
            existing_capacity_m3s: None,
            hours_per_day: 24.0,
        })
        .collect();
    let blocks = s
        .blocks
        .iter()
        .enumerate()
        .map(|(i, (canal, area, ea, eb))| Block {
            name: format!("b{i}"),
            canal: format!("c{canal}"),
            area_ha: *area,
            application_efficiency: *ea,
            field_canal_efficiency: *eb,
        })
        .collect();
    let series = s
        .series
        .iter()
        .map(|(b, crop, v, ea)| NirSeries {
            block: format!("b{b}"),
            crop: ["maize", "rice", "wheat"][*crop].to_owned(),
            nir_m3_day: v.clone(),
            application_efficiency: *ea,
        })
        .collect();
    (Network::new(canals, blocks).unwrap(), series)
}

/// Π Ec from canal `c` up to the headworks, walking the parent links of the
/// generated tree directly.
fn path_ec(s: &RandomScheme, mut c: usize) -> f64 {
    let mut product = 1.0;
    loop {
        product *= s.canals[c].1;
        match s.canals[c].0 {
            Some(p) => c = p,
            None => return product,
        }
    }
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(b.abs()).max(1.0)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn headworks_equals_sum_of_blocks_through_their_paths(s in scheme_strategy()) {
        let (network, series) = build(&s);
        let start = NaiveDate::from_ymd_opt(2030, 1, 1).unwrap();
        let demand = SchemeDemand::compute(&network, start, DAYS, &series).unwrap();
        let head = demand.demand_m3_day(Node::Headworks);
        for day in 0..DAYS {
            let expected: f64 = s
                .series
                .iter()
                .map(|(b, _, v, ea_series)| {
                    let (canal, _, ea_block, eb) = s.blocks[*b];
                    let ea = ea_series.unwrap_or(ea_block);
                    v[day] / (ea * eb) / path_ec(&s, canal)
                })
                .sum();
            prop_assert!(close(head[day], expected), "day {day}: {} vs {expected}", head[day]);
        }
        // At every node, the per-crop and per-block breakdowns add up to the demand.
        for node in network.nodes() {
            let total = demand.demand_m3_day(node);
            for day in 0..DAYS {
                let by_crop: f64 = (0..demand.crops().len())
                    .map(|c| demand.crop_demand_m3_day(node, c)[day])
                    .sum();
                prop_assert!(close(by_crop, total[day]));
                let by_block: f64 = demand
                    .blocks_below(node)
                    .into_iter()
                    .map(|b| demand.block_share_m3_day(node, b).unwrap()[day])
                    .sum();
                prop_assert!(close(by_block, total[day]));
            }
        }
        // Each block's GIR at the outlet is Σ its series' NIR ÷ (Ea_s × Eb).
        for (bi, (_, _, ea_block, eb)) in s.blocks.iter().enumerate() {
            let gir = demand.block_gir_m3_day(bi);
            for day in 0..DAYS {
                let expected: f64 = s
                    .series
                    .iter()
                    .filter(|(b, ..)| *b == bi)
                    .map(|(_, _, v, ea)| v[day] / (ea.unwrap_or(*ea_block) * eb))
                    .sum();
                prop_assert!(close(gir[day], expected), "block {bi} day {day}");
            }
        }
    }
}

fn canal(id: &str, parent: Option<&str>, ec: f64) -> Canal {
    Canal {
        id: id.to_owned(),
        name: id.to_owned(),
        parent: parent.map(str::to_owned),
        conveyance_efficiency: ec,
        existing_capacity_m3s: None,
        hours_per_day: 24.0,
    }
}

#[test]
fn every_network_problem_is_listed() {
    let canals = vec![
        canal("main", None, 0.9),
        canal("loop-a", Some("loop-b"), 0.9),
        canal("loop-b", Some("loop-a"), 0.9),
        canal("orphan", Some("nowhere"), 1.2),
        Canal {
            hours_per_day: 0.0,
            existing_capacity_m3s: Some(-1.0),
            ..canal("main", None, 0.0)
        },
    ];
    let blocks = vec![
        Block {
            name: "b1".into(),
            canal: "missing".into(),
            area_ha: 10.0,
            application_efficiency: 0.6,
            field_canal_efficiency: 0.8,
        },
        Block {
            name: "b2".into(),
            canal: "main".into(),
            area_ha: -5.0,
            application_efficiency: f64::NAN,
            field_canal_efficiency: 0.8,
        },
    ];
    let Err(SchemeError::Invalid(problems)) = Network::new(canals, blocks) else {
        panic!("expected an invalid network");
    };
    let has = |f: &dyn Fn(&NetworkProblem) -> bool| problems.iter().any(f);
    assert!(has(
        &|p| matches!(p, NetworkProblem::DuplicateCanal { id } if id == "main")
    ));
    assert!(has(
        &|p| matches!(p, NetworkProblem::Cycle { canals } if canals.len() == 2)
    ));
    assert!(has(
        &|p| matches!(p, NetworkProblem::MissingParent { parent, .. } if parent == "nowhere")
    ));
    assert!(has(
        &|p| matches!(p, NetworkProblem::EfficiencyOutOfRange { kind: "Ec", value, .. } if *value == 1.2)
    ));
    assert!(has(
        &|p| matches!(p, NetworkProblem::EfficiencyOutOfRange { kind: "Ec", value, .. } if *value == 0.0)
    ));
    assert!(has(&|p| matches!(
        p,
        NetworkProblem::HoursOutOfRange { .. }
    )));
    assert!(has(&|p| matches!(
        p,
        NetworkProblem::CapacityNotPositive { .. }
    )));
    assert!(has(
        &|p| matches!(p, NetworkProblem::BlockOnMissingCanal { canal, .. } if canal == "missing")
    ));
    assert!(has(&|p| matches!(
        p,
        NetworkProblem::AreaNotPositive { .. }
    )));
    assert!(has(&|p| matches!(
        p,
        NetworkProblem::EfficiencyOutOfRange { kind: "Ea", .. }
    )));
    // The message lists them all, one per line.
    let message = SchemeError::Invalid(problems.clone()).to_string();
    assert_eq!(message.lines().count(), problems.len() + 1);
}

#[test]
fn bad_requirement_series_are_listed() {
    let network = Network::new(
        vec![canal("main", None, 0.9)],
        vec![Block {
            name: "b".into(),
            canal: "main".into(),
            area_ha: 1.0,
            application_efficiency: 0.5,
            field_canal_efficiency: 0.5,
        }],
    )
    .unwrap();
    let start = NaiveDate::from_ymd_opt(2030, 1, 1).unwrap();
    let series = vec![
        NirSeries {
            block: "b".into(),
            crop: "x".into(),
            nir_m3_day: vec![1.0, f64::NAN, 2.0],
            application_efficiency: None,
        },
        NirSeries {
            block: "nope".into(),
            crop: "x".into(),
            nir_m3_day: vec![1.0, 1.0],
            application_efficiency: Some(1.5),
        },
        NirSeries {
            block: "b".into(),
            crop: "y".into(),
            nir_m3_day: vec![1.0, -1.0, 1.0],
            application_efficiency: None,
        },
    ];
    let Err(SchemeError::Invalid(problems)) = SchemeDemand::compute(&network, start, 3, &series)
    else {
        panic!("expected invalid series");
    };
    // Missing block, wrong length, NaN, negative value, and the override
    // Ea 1.5 outside (0, 1].
    assert_eq!(problems.len(), 5, "{problems:?}");
    assert!(problems.iter().any(|p| matches!(
        p,
        NetworkProblem::EfficiencyOutOfRange { kind: "Ea", value, .. } if *value == 1.5
    )));
}
