//! Seepage by wetted perimeter replacing a canal's fixed Ec in the scheme
//! aggregation: a constructed one-canal case checked against the volume
//! balance it must satisfy (inflow = outflow + rate × P × L over the hours
//! the canal runs), and the efficiency falling at low flow.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use chrono::NaiveDate;
use offtake_core::scheme::{Block, Canal, CanalSeepage, Network, NirSeries, Node, SchemeDemand};
use offtake_core::section::geometry::{Prism, Shape};
use offtake_core::section::manning::{MANNING_K_SI, normal_depth_m};

fn demand(nir_mm_day: &[f64], hours: f64) -> (SchemeDemand, CanalSeepage) {
    let mut network = Network::new(
        vec![Canal {
            id: "main".into(),
            name: "main".into(),
            parent: None,
            conveyance_efficiency: 0.7,
            existing_capacity_m3s: None,
            hours_per_day: hours,
        }],
        vec![Block {
            name: "b".into(),
            canal: "main".into(),
            area_ha: 500.0,
            application_efficiency: 1.0,
            field_canal_efficiency: 1.0,
        }],
    )
    .unwrap();
    let seep = CanalSeepage {
        prism: Prism::new(Shape::Trapezoidal, 1.2, 1.5),
        manning_n: 0.022,
        bed_slope: 0.0003,
        rate_m3_m2_day: 0.2,
        length_m: 8000.0,
    };
    network.set_seepage(0, Some(seep));
    let start = NaiveDate::from_ymd_opt(2030, 1, 1).unwrap();
    let series = NirSeries::from_depth_mm("b", "crop", nir_mm_day, 500.0);
    (
        SchemeDemand::compute(&network, start, nir_mm_day.len(), &[series]).unwrap(),
        seep,
    )
}

#[test]
fn seepage_closes_the_volume_balance_each_day() {
    let nir = [8.0, 4.0, 1.0, 0.2, 0.0];
    for hours in [24.0, 12.0] {
        let (d, seep) = demand(&nir, hours);
        let inflow = d.demand_m3_day(Node::Headworks);
        let ec = d.canal_efficiency_day(0);
        for (day, &mm) in nir.iter().enumerate() {
            let outflow_m3 = mm * 500.0 * 10.0;
            if outflow_m3 == 0.0 {
                assert_eq!(inflow[day], 0.0);
                assert_eq!(ec[day], 1.0);
                continue;
            }
            // Loss volume = rate × P × L × hours/24 at the running inflow.
            let q_run = inflow[day] / (hours * 3600.0);
            let y = normal_depth_m(
                &seep.prism,
                q_run,
                seep.bed_slope,
                seep.manning_n,
                MANNING_K_SI,
            )
            .unwrap();
            let loss_m3 =
                seep.rate_m3_m2_day * seep.prism.wetted_perimeter_m(y) * seep.length_m * hours
                    / 24.0;
            let balance = inflow[day] - outflow_m3 - loss_m3;
            assert!(balance.abs() <= 2e-3 * inflow[day], "day {day}: {balance}");
            assert!((ec[day] - outflow_m3 / inflow[day]).abs() < 1e-12);
        }
        // Efficiency falls as the flow falls.
        assert!(ec[0] > ec[1] && ec[1] > ec[2] && ec[2] > ec[3], "{ec:?}");
    }
}
