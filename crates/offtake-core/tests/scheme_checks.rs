//! Scheme arithmetic against published identities and check values
//! (shared/reference/published-check-values.md §10) and capacity shortfall on a
//! constructed series.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use chrono::NaiveDate;
use offtake_core::scheme::design::{design_flow_from_depth_ls, duty_ls_ha, required_capacity_ls};
use offtake_core::scheme::{
    Block, Canal, DesignBasis, DesignOptions, Network, NirSeries, Node, SchemeDemand, SchemeError,
    capacity_shortfall, capacity_shortfall_on_basis, design_values, storage_losses_m3_day,
};

fn assert_close(found: f64, expected: f64, tol: f64, what: &str) {
    assert!(
        (found - expected).abs() <= tol,
        "{what}: found {found}, expected {expected} ± {tol}"
    );
}

/// One block on one canal, constant NIR depth, whole calendar years.
fn one_block(ec: f64, ea: f64, eb: f64, hours: f64, area_ha: f64, nir_mm_day: f64) -> SchemeDemand {
    let network = Network::new(
        vec![Canal {
            id: "main".into(),
            name: "main".into(),
            parent: None,
            conveyance_efficiency: ec,
            existing_capacity_m3s: None,
            hours_per_day: hours,
        }],
        vec![Block {
            name: "b".into(),
            canal: "main".into(),
            area_ha,
            application_efficiency: ea,
            field_canal_efficiency: eb,
        }],
    )
    .unwrap();
    let start = NaiveDate::from_ymd_opt(2030, 1, 1).unwrap();
    let days = 365 * 3 + 1; // 2030, 2031, 2032 (leap)
    let series = NirSeries::from_depth_mm("b", "crop", &vec![nir_mm_day; days], area_ha);
    SchemeDemand::compute(&network, start, days, &[series]).unwrap()
}

/// FAO-56 Annex 1 (p. 211): 1 l s⁻¹ ha⁻¹ = 8.640 mm/day. A block whose gross
/// requirement is 8.64 mm/day with every efficiency 1 draws 1 l/s per ha.
#[test]
fn duty_identity_fao56_annex1() {
    let demand = one_block(1.0, 1.0, 1.0, 24.0, 1.0, 8.64);
    assert_close(
        demand.demand_ls(Node::Headworks)[0],
        1.0,
        1e-12,
        "l/s per ha",
    );
    assert_close(
        duty_ls_ha(design_flow_from_depth_ls(8.64, 1.0), 1.0),
        1.0,
        1e-12,
        "duty",
    );
}

/// published-check-values §10.3 [COMPUTED from the published formula
/// Q = GIR × A ÷ 8.64 × 24 ÷ hours]: GIR 8.64 mm/day on 100 ha → 100 l/s at
/// 24 h/day, 200 l/s at 12 h/day.
#[test]
fn canal_capacity_check_section_10_3() {
    assert_close(design_flow_from_depth_ls(8.64, 100.0), 100.0, 1e-9, "24 h");
    assert_close(required_capacity_ls(100.0, 12.0), 200.0, 1e-9, "12 h");
    // Through the whole chain: one canal running 12 h/day.
    let demand = one_block(1.0, 1.0, 1.0, 12.0, 100.0, 8.64);
    let v = design_values(&demand, &DesignOptions::default()).unwrap();
    assert_eq!(v[0].years.len(), 3);
    assert_close(v[0].design_flow_ls, 100.0, 1e-9, "design flow");
    assert_close(v[0].duty_ls_ha.unwrap(), 1.0, 1e-12, "duty");
    assert_close(v[0].duty_ha_per_m3s.unwrap(), 1000.0, 1e-9, "ha per m3/s");
    assert_close(v[0].required_capacity_ls, 200.0, 1e-9, "required capacity");
}

/// Peace Corps (1994) exam, problem 8 (published-check-values §10.1,
/// [SOLID-2nd] inputs, [COMPUTED] result): net 2.8 mm/day, application
/// efficiency 70 %, conveyance efficiency 80 % → 2.8 ÷ (0.70 × 0.80)
/// = 5.0 mm/day at the headworks.
#[test]
fn gross_requirement_peace_corps_1994() {
    let demand = one_block(0.8, 0.7, 1.0, 24.0, 25.0, 2.8);
    assert_close(
        demand.demand_mm_day(Node::Headworks)[10],
        5.0,
        1e-12,
        "mm/day",
    );
}

/// Lined-canal preset of published-check-values §10.1: with Ec 0.9, Eb 0.8,
/// Ea 0.55 the project efficiency is 0.396 ≈ 0.40, so the headworks draws
/// NIR ÷ 0.396.
#[test]
fn project_efficiency_preset() {
    let demand = one_block(0.9, 0.55, 0.8, 24.0, 10.0, 3.96);
    assert_close(
        demand.demand_mm_day(Node::Headworks)[0],
        10.0,
        1e-12,
        "mm/day",
    );
}

/// Capacity 2 l/s at 24 h/day delivers 0.002 × 24 × 3600 = 172.8 m³/day.
/// Demand (from 9 January): 100, 200, 300, 172.8, 50 m³/day.
/// Shortfall days: 10 Jan (200 − 172.8 = 27.2) and 11 Jan (300 − 172.8 = 127.2);
/// 12 Jan equals the capacity, no shortfall. 10 Jan lies in 1–10 January and
/// 11 Jan in 11–20 January: two periods. Not delivered: 154.4 m³.
/// Running 12 h/day halves what can be delivered (86.4 m³/day): then every
/// day but 13 Jan falls short: 13.6 + 113.6 + 213.6 + 86.4 = 427.2 m³.
#[test]
fn capacity_shortfall_constructed_series() {
    let start = NaiveDate::from_ymd_opt(2031, 1, 9).unwrap();
    let demand = [100.0, 200.0, 300.0, 172.8, 50.0];
    let s = capacity_shortfall(start, &demand, 0.002, 24.0).unwrap();
    assert_close(s.deliverable_m3_day, 172.8, 1e-9, "deliverable");
    let dates: Vec<_> = s.days.iter().map(|d| d.date.to_string()).collect();
    assert_eq!(dates, ["2031-01-10", "2031-01-11"]);
    assert_close(s.days[0].deficit_m3, 27.2, 1e-9, "10 Jan");
    assert_eq!(s.periods.len(), 2);
    assert_eq!(
        (s.periods[0].period.part(), s.periods[1].period.part()),
        (1, 2)
    );
    // Mean demand of 1–10 Jan in the record (9, 10 Jan): 150 m³/day = 1.736 l/s.
    assert_close(
        s.periods[0].mean_demand_ls,
        150.0 / 86.4,
        1e-12,
        "period mean",
    );
    assert_close(s.volume_not_delivered_m3, 154.4, 1e-9, "not delivered");
    let half = capacity_shortfall(start, &demand, 0.002, 12.0).unwrap();
    assert!(capacity_shortfall(start, &demand, 0.0, 12.0).is_err());
    assert!(capacity_shortfall(start, &[f64::NAN], 1.0, 12.0).is_err());
    assert_eq!(half.days.len(), 4);
    assert_close(
        half.volume_not_delivered_m3,
        427.2,
        1e-9,
        "12 h not delivered",
    );
}

/// Shortfall on the design basis (issue 5: daily peaks of refill-style
/// schedules are never the default basis). Capacity 2 l/s × 24 h = 172.8
/// m³/day. Demand from 1 January 2031 (m³/day):
/// - 1–10 Jan: 100 on nine days, 1 000 on 5 Jan (a refill pulse):
///   mean 1 900 ÷ 10 = 190 > 172.8 → short, (190 − 172.8) × 10 = 172.0 m³;
/// - 11–20 Jan: 50 on nine days, 1 000 on 15 Jan: mean 1 450 ÷ 10 = 145
///   ≤ 172.8 → not short, although 15 Jan is a daily peak above capacity;
/// - 21–31 Jan: 200 on 11 days: (200 − 172.8) × 11 = 299.2 m³;
/// - 1–3 Feb (the record ends): 300: the period 1–10 Feb is compared on its
///   3 days: (300 − 172.8) × 3 = 381.6 m³.
///
/// 10-day basis: 3 periods, 172.0 + 299.2 + 381.6 = 852.8 m³.
/// Monthly basis: January 5 550 ÷ 31 = 179.03 > 172.8 → 5 550 − 172.8 × 31
/// = 193.2 m³; February (3 days) 381.6 m³; total 574.8 m³.
/// Daily peaks: 5 and 15 Jan (827.2 each), 21–31 Jan (27.2 × 11 = 299.2),
/// 1–3 Feb (127.2 × 3 = 381.6): 16 days, 2 335.2 m³.
#[test]
fn capacity_shortfall_follows_the_design_basis() {
    let start = NaiveDate::from_ymd_opt(2031, 1, 1).unwrap();
    let mut demand = vec![100.0; 10];
    demand[4] = 1000.0;
    let mut second = vec![50.0; 10];
    second[4] = 1000.0;
    demand.extend(second);
    demand.extend([200.0; 11]);
    demand.extend([300.0; 3]);
    let ten =
        capacity_shortfall_on_basis(start, &demand, 0.002, 24.0, DesignBasis::TenDay).unwrap();
    assert_eq!(ten.basis, DesignBasis::TenDay);
    let starts: Vec<String> = ten
        .basis_periods
        .iter()
        .map(|p| p.start.to_string())
        .collect();
    assert_eq!(starts, ["2031-01-01", "2031-01-21", "2031-02-01"]);
    assert_close(ten.basis_periods[0].deficit_m3, 172.0, 1e-9, "1-10 Jan");
    assert_close(ten.basis_periods[1].deficit_m3, 299.2, 1e-9, "21-31 Jan");
    assert_eq!(ten.basis_periods[2].covered_days, 3);
    assert_eq!(ten.basis_periods[2].period_days, 10);
    assert_close(ten.basis_periods[2].deficit_m3, 381.6, 1e-9, "1-3 Feb");
    assert_close(
        ten.basis_periods[0].mean_demand_ls,
        190.0 / 86.4,
        1e-12,
        "mean l/s",
    );
    assert_close(
        ten.basis_volume_not_delivered_m3,
        852.8,
        1e-9,
        "10-day total",
    );
    // Daily peaks beside it.
    assert_eq!(ten.days.len(), 16);
    assert_close(ten.volume_not_delivered_m3, 2335.2, 1e-9, "daily peaks");

    let month =
        capacity_shortfall_on_basis(start, &demand, 0.002, 24.0, DesignBasis::Monthly).unwrap();
    assert_eq!(month.basis_periods.len(), 2);
    assert_close(month.basis_periods[0].deficit_m3, 193.2, 1e-9, "January");
    assert_close(
        month.basis_volume_not_delivered_m3,
        574.8,
        1e-9,
        "monthly total",
    );

    let daily =
        capacity_shortfall_on_basis(start, &demand, 0.002, 24.0, DesignBasis::Daily).unwrap();
    assert_eq!(daily.basis_periods.len(), 16);
    assert_close(
        daily.basis_volume_not_delivered_m3,
        2335.2,
        1e-9,
        "daily total",
    );
    assert!(capacity_shortfall_on_basis(start, &demand, -1.0, 24.0, DesignBasis::TenDay).is_err());
}

/// Reservoir losses: 5 mm/day over 200 ha = 5 × 200 × 10 = 10 000 m³/day
/// (FAO-56 Annex 1: 1 mm on 1 ha = 10 m³); the area changes with the month.
#[test]
fn storage_losses() {
    let mut area = [200.0; 12];
    area[1] = 100.0; // February
    let start = NaiveDate::from_ymd_opt(2031, 1, 31).unwrap();
    let losses = storage_losses_m3_day(start, &area, &[5.0, 5.0]).unwrap();
    assert_eq!(losses, vec![10_000.0, 5_000.0]);
    let err = storage_losses_m3_day(start, &area, &[5.0, f64::NAN]).unwrap_err();
    assert!(matches!(err, SchemeError::BadStorageInput { .. }));
}

#[test]
fn no_complete_year_is_an_error() {
    let network = Network::new(
        vec![Canal {
            id: "m".into(),
            name: "m".into(),
            parent: None,
            conveyance_efficiency: 1.0,
            existing_capacity_m3s: None,
            hours_per_day: 24.0,
        }],
        vec![Block {
            name: "b".into(),
            canal: "m".into(),
            area_ha: 1.0,
            application_efficiency: 1.0,
            field_canal_efficiency: 1.0,
        }],
    )
    .unwrap();
    let start = NaiveDate::from_ymd_opt(2031, 1, 2).unwrap();
    let series = NirSeries::from_depth_mm("b", "c", &[1.0; 400], 1.0);
    let demand = SchemeDemand::compute(&network, start, 400, &[series]).unwrap();
    assert!(matches!(
        design_values(&demand, &DesignOptions::default()),
        Err(SchemeError::NoCompleteYear { .. })
    ));
    assert!(matches!(
        design_values(
            &demand,
            &DesignOptions {
                non_exceedance: 1.5,
                ..DesignOptions::default()
            }
        ),
        Err(SchemeError::BadOption { .. })
    ));
}
