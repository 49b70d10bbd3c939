//! A small scheme worked by hand: two canals, three blocks, five years.
//! Every expected value is computed in the comments from the definitions of
//! DESIGN.md ("Definitions we hold to") and the FAO-56 Annex 1 conversions
//! (1 mm on 1 ha = 10 m³; 1 l/s = 86.4 m³/day).
//!
//! The scheme (invented):
//!
//! ```text
//! headworks
//! └── M  main canal, Ec 0.9, 24 h/day
//!     ├── block A  50 ha, Ea 0.60, Eb 0.80
//!     └── D  distributary, Ec 0.8, 12 h/day, existing capacity 0.5 m³/s
//!         ├── block B  40 ha, Ea 0.70, Eb 0.90
//!         └── block C  60 ha, Ea 0.75, Eb 0.80
//! ```
//!
//! NIR is zero outside July. In July of year y: days 1–10 and 21–31 carry the
//! base depth × f_y, days 11–20 twice that. Base depths: A 4.8, B 5.04,
//! C 6.0 mm/day. Year factors f: 2001 1.0, 2002 1.2, 2003 0.8, 2004 1.1,
//! 2005 0.9.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use chrono::{Datelike, NaiveDate};
use offtake_core::rotation::{
    AvailableFlow, CycleMode, RosterWarning, RotationUnit, continuous_flow_roster, rotation_roster,
    units_at_node,
};
use offtake_core::scheme::{
    Block, Canal, DesignBasis, DesignOptions, Network, NirSeries, Node, PeriodStep, SchemeDemand,
    design_values,
};

const FACTORS: [(i32, f64); 5] = [
    (2001, 1.0),
    (2002, 1.2),
    (2003, 0.8),
    (2004, 1.1),
    (2005, 0.9),
];

fn assert_close(found: f64, expected: f64, tol: f64, what: &str) {
    assert!(
        (found - expected).abs() <= tol,
        "{what}: found {found}, expected {expected} ± {tol}"
    );
}

fn scheme() -> (Network, SchemeDemand) {
    let canals = vec![
        Canal {
            id: "M".into(),
            name: "main".into(),
            parent: None,
            conveyance_efficiency: 0.9,
            existing_capacity_m3s: None,
            hours_per_day: 24.0,
        },
        Canal {
            id: "D".into(),
            name: "distributary".into(),
            parent: Some("M".into()),
            conveyance_efficiency: 0.8,
            existing_capacity_m3s: Some(0.5),
            hours_per_day: 12.0,
        },
    ];
    let block = |name: &str, canal: &str, area_ha, ea, eb| Block {
        name: name.into(),
        canal: canal.into(),
        area_ha,
        application_efficiency: ea,
        field_canal_efficiency: eb,
    };
    let blocks = vec![
        block("A", "M", 50.0, 0.60, 0.80),
        block("B", "D", 40.0, 0.70, 0.90),
        block("C", "D", 60.0, 0.75, 0.80),
    ];
    let network = Network::new(canals, blocks).unwrap();
    let start = NaiveDate::from_ymd_opt(2001, 1, 1).unwrap();
    let end = NaiveDate::from_ymd_opt(2005, 12, 31).unwrap();
    let days = (end - start).num_days() as usize + 1;
    let shape: Vec<f64> = (0..days)
        .map(|i| {
            let d = start + chrono::Days::new(i as u64);
            let f = FACTORS.iter().find(|(y, _)| *y == d.year()).unwrap().1;
            match (d.month(), d.day()) {
                (7, 11..=20) => 2.0 * f,
                (7, _) => f,
                _ => 0.0,
            }
        })
        .collect();
    let depth = |base: f64| shape.iter().map(|s| s * base).collect::<Vec<_>>();
    let series = vec![
        NirSeries::from_depth_mm("A", "maize", &depth(4.8), 50.0),
        NirSeries::from_depth_mm("B", "cotton", &depth(5.04), 40.0),
        // C carries two plantings of 30 ha each, of different crops.
        NirSeries::from_depth_mm("C", "maize", &depth(6.0), 30.0),
        NirSeries::from_depth_mm("C", "sorghum", &depth(6.0), 30.0),
    ];
    let demand = SchemeDemand::compute(&network, start, days, &series).unwrap();
    (network, demand)
}

#[test]
fn daily_demand_up_the_tree() {
    let (network, demand) = scheme();
    let m = Node::Canal(network.canal_index("M").unwrap());
    let d = Node::Canal(network.canal_index("D").unwrap());
    // 1 July 2001 is day 181 (31+28+31+30+31+30).
    let day = 181;
    assert_eq!(
        demand.date(day),
        NaiveDate::from_ymd_opt(2001, 7, 1).unwrap()
    );
    // Block NIR and GIR (m³/day):
    //   A: 4.8 mm × 50 ha × 10 = 2400;   GIR = 2400 ÷ (0.60 × 0.80 = 0.48) = 5000
    //   B: 5.04 mm × 40 ha × 10 = 2016;  GIR = 2016 ÷ (0.70 × 0.90 = 0.63) = 3200
    //   C: 6.0 mm × 60 ha × 10 = 3600;   GIR = 3600 ÷ (0.75 × 0.80 = 0.60) = 6000
    for (b, nir, gir) in [
        (0, 2400.0, 5000.0),
        (1, 2016.0, 3200.0),
        (2, 3600.0, 6000.0),
    ] {
        assert_close(demand.block_nir_m3_day(b)[day], nir, 1e-9, "block NIR");
        assert_close(demand.block_gir_m3_day(b)[day], gir, 1e-9, "block GIR");
    }
    // D = (3200 + 6000) ÷ 0.8 = 11 500 m³/day
    // M = (5000 + 11 500) ÷ 0.9 = 18 333.33 m³/day = headworks
    assert_close(demand.demand_m3_day(d)[day], 11_500.0, 1e-9, "D");
    assert_close(demand.demand_m3_day(m)[day], 18_333.333_333, 1e-6, "M");
    assert_close(
        demand.demand_m3_day(Node::Headworks)[day],
        18_333.333_333,
        1e-6,
        "headworks",
    );
    // In l/s: 11 500 ÷ 86.4 = 133.1019; in mm over D's 100 ha: 11 500 ÷ 1000 = 11.5
    assert_close(demand.demand_ls(d)[day], 133.101_852, 1e-6, "D l/s");
    assert_close(demand.demand_mm_day(d)[day], 11.5, 1e-9, "D mm");
    // Headworks over 150 ha: 18 333.33 ÷ 1500 = 12.2222 mm/day
    assert_close(
        demand.demand_mm_day(Node::Headworks)[day],
        12.222_222,
        1e-6,
        "hw mm",
    );
    // 15 July 2002 (day 365 + 195): twice the base × 1.2 → D = 11 500 × 2.4 = 27 600
    assert_close(
        demand.demand_m3_day(d)[365 + 195],
        27_600.0,
        1e-9,
        "D 2002-07-15",
    );
    // Crop breakdown at M, 1 July 2001:
    //   maize = (A 5000 ÷ 0.9) + (C half 3000 ÷ 0.8 ÷ 0.9) = 5555.56 + 4166.67 = 9722.22
    //   cotton = 3200 ÷ 0.8 ÷ 0.9 = 4444.44; sorghum = 3000 ÷ 0.8 ÷ 0.9 = 4166.67
    let crop = |name: &str| demand.crops().iter().position(|c| c == name).unwrap();
    assert_close(
        demand.crop_demand_m3_day(m, crop("maize"))[day],
        9_722.222_222,
        1e-6,
        "maize",
    );
    assert_close(
        demand.crop_demand_m3_day(m, crop("cotton"))[day],
        4_444.444_444,
        1e-6,
        "cotton",
    );
    assert_close(
        demand.crop_demand_m3_day(m, crop("sorghum"))[day],
        4_166.666_667,
        1e-6,
        "sorghum",
    );
    // Block breakdown at the headworks: B's share 3200 ÷ 0.8 ÷ 0.9 = 4444.44; A is not below D.
    assert_close(
        demand.block_share_m3_day(Node::Headworks, 1).unwrap()[day],
        4_444.444_444,
        1e-6,
        "B share",
    );
    assert!(demand.block_share_m3_day(d, 0).is_none());
    assert_close(network.commanded_area_ha(d), 100.0, 0.0, "D area");
    assert_close(network.commanded_area_ha(m), 150.0, 0.0, "M area");
}

#[test]
fn ten_day_and_monthly_tables() {
    let (network, demand) = scheme();
    let d = Node::Canal(network.canal_index("D").unwrap());
    let tenday = demand.periods(d, PeriodStep::TenDay);
    let july =
        |p: &&offtake_core::scheme::PeriodDemand| p.start.year() == 2001 && p.start.month() == 7;
    let july_periods: Vec<_> = tenday.iter().filter(july).collect();
    assert_eq!(july_periods.len(), 3);
    // 1–10 July: 10 × 11 500 = 115 000 m³; 133.10 l/s; 115 mm over 100 ha
    assert_close(july_periods[0].volume_m3, 115_000.0, 1e-6, "July d1");
    assert_close(
        july_periods[0].mean_flow_ls,
        133.101_852,
        1e-6,
        "July d1 l/s",
    );
    assert_close(july_periods[0].depth_mm, 115.0, 1e-9, "July d1 mm");
    // 11–20 July: 10 × 23 000 = 230 000 m³; 266.20 l/s
    assert_close(
        july_periods[1].mean_flow_ls,
        266.203_704,
        1e-6,
        "July d2 l/s",
    );
    // 21–31 July: 11 days × 11 500 = 126 500 m³
    assert_eq!(july_periods[2].period_days, 11);
    assert_close(july_periods[2].volume_m3, 126_500.0, 1e-6, "July d3");
    // 36 periods a year, 5 years
    assert_eq!(tenday.len(), 180);
    assert!(
        tenday
            .iter()
            .all(offtake_core::scheme::PeriodDemand::is_complete)
    );
    // July 2001 month: 115 000 + 230 000 + 126 500 = 471 500 m³; 471.5 mm
    let months = demand.periods(d, PeriodStep::Month);
    let m = months.iter().find(july).unwrap();
    assert_close(m.volume_m3, 471_500.0, 1e-6, "July volume");
    assert_close(m.depth_mm, 471.5, 1e-9, "July depth");
}

#[test]
fn design_values_duty_capacity_shortfall() {
    let (network, demand) = scheme();
    let di = network.canal_index("D").unwrap();
    let values = design_values(&demand, &DesignOptions::default()).unwrap();
    let d = values.iter().find(|v| v.node == Node::Canal(di)).unwrap();
    let hw = values.iter().find(|v| v.node == Node::Headworks).unwrap();
    assert_eq!(d.years.len(), 5);
    // Yearly peak 10-day flow at D = 11–20 July = 2 × 11 500 × f ÷ 86.4
    //   = 266.2037 × f l/s.
    // Ascending f: 0.8, 0.9, 1.0, 1.1, 1.2 (n = 5). Weibull m/(n+1) = 0.8 at
    // m = 0.8 × 6 = 4.8: between rank 4 (1.1) and rank 5 (1.2):
    //   f = 1.1 + 0.8 × (1.2 − 1.1) = 1.18 → design flow = 266.2037 × 1.18
    //   = 314.1204 l/s. The closest year is f = 1.2, 2002.
    assert_close(d.design_flow_ls, 314.120_370, 1e-5, "D design flow");
    assert_eq!(d.design_year.start_year(), 2002);
    // Duty = 314.1204 ÷ 100 ha = 3.141204 l/s/ha = 318.35 ha per m³/s
    assert_close(d.duty_ls_ha.unwrap(), 3.141_204, 1e-6, "D duty");
    assert_close(
        d.duty_ha_per_m3s.unwrap(),
        100.0 / 0.314_120_370,
        1e-3,
        "D ha per m3/s",
    );
    // Required capacity at 12 h/day = 314.1204 × 24 ÷ 12 = 628.2407 l/s
    assert_close(d.required_capacity_ls, 628.240_741, 1e-5, "D capacity");
    // Peaks over the years: daily and 10-day both 266.2037 × 1.2 = 319.4444
    assert_close(d.peak_10day_ls, 319.444_444, 1e-5, "D peak 10-day");
    assert_close(d.peak_daily_ls, 319.444_444, 1e-5, "D peak daily");
    // Seasonal volume: 471 500 × mean f (= 1.0) = 471 500 m³; delta 471.5 mm
    assert_close(d.seasonal_volume_m3, 471_500.0, 1e-5, "D volume");
    assert_close(d.delta_mm, 471.5, 1e-8, "D delta");
    // Headworks: 2 × 18 333.33 × 1.18 ÷ 86.4 = 500.7716 l/s; duty ÷ 150 ha = 3.338477
    assert_close(hw.design_flow_ls, 500.771_605, 1e-5, "hw design flow");
    assert_close(hw.duty_ls_ha.unwrap(), 3.338_477, 1e-6, "hw duty");
    assert_close(
        hw.required_capacity_ls,
        hw.design_flow_ls,
        0.0,
        "hw at 24 h",
    );
    // Shortfall at D: capacity 0.5 m³/s × 12 h × 3600 s = 21 600 m³/day.
    // Only 11–20 July exceeds it: 23 000 f > 21 600 for f = 1.0, 1.1, 1.2.
    //   deficits: 10 × (23 000 − 21 600) = 14 000; 10 × (25 300 − 21 600) = 37 000;
    //             10 × (27 600 − 21 600) = 60 000 → 111 000 m³, 30 days, 3 periods.
    let s = d.shortfall.as_ref().unwrap();
    assert_close(s.deliverable_m3_day, 21_600.0, 1e-9, "deliverable");
    assert_eq!(s.days.len(), 30);
    assert_eq!(s.periods.len(), 3);
    assert!(
        s.periods
            .iter()
            .all(|p| p.period.month() == 7 && p.period.part() == 2)
    );
    assert_close(s.volume_not_delivered_m3, 111_000.0, 1e-6, "not delivered");
    // On the 10-day design basis the same three periods are short (their
    // days are all equal): (23 000 f − 21 600) × 10 days, the same 111 000 m³,
    // in the three years f = 1.0, 1.1, 1.2.
    assert_eq!(s.basis, DesignBasis::TenDay);
    assert_eq!(s.basis_periods.len(), 3);
    assert_close(
        s.basis_volume_not_delivered_m3,
        111_000.0,
        1e-6,
        "basis not delivered",
    );
    assert_eq!(s.years_short.len(), 3);
    assert!(hw.shortfall.is_none());

    // Monthly basis at D: July mean = 471 500 f ÷ 31 ÷ 86.4 = 176.0379 f l/s
    //   → × 1.18 = 207.7247 l/s.
    let monthly = design_values(
        &demand,
        &DesignOptions {
            basis: DesignBasis::Monthly,
            ..DesignOptions::default()
        },
    )
    .unwrap();
    assert_close(
        monthly[di].design_flow_ls,
        207.724_761,
        1e-5,
        "D monthly design",
    );
    // Daily basis: the peak day is inside 11–20 July, the same 266.2037 f.
    let daily = design_values(
        &demand,
        &DesignOptions {
            basis: DesignBasis::Daily,
            ..DesignOptions::default()
        },
    )
    .unwrap();
    assert_close(
        daily[di].design_flow_ls,
        314.120_370,
        1e-5,
        "D daily design",
    );
    // An irrigation year starting in April leaves only 4 complete years
    // (2001/02 .. 2004/05), f = 1.0, 1.2, 0.8, 1.1 (July falls in the start year).
    // Ascending 0.8, 1.0, 1.1, 1.2; rank 0.8 × 5 = 4.0 → f = 1.2 → 319.4444 l/s.
    let april = design_values(
        &demand,
        &DesignOptions {
            year_start_month: 4,
            ..DesignOptions::default()
        },
    )
    .unwrap();
    assert_eq!(april[di].years.len(), 4);
    assert_close(
        april[di].design_flow_ls,
        319.444_444,
        1e-5,
        "D April-year design",
    );
    assert_eq!(april[di].design_year.label(), "2002/03");
}

#[test]
fn roster_on_the_distributary() {
    let (network, demand) = scheme();
    let d = Node::Canal(network.canal_index("D").unwrap());
    // Rotate B and C at D's head over 1–7 July 2001 (days 181..188).
    // Their demands at D's head: B 3200 ÷ 0.8 = 4000, C 6000 ÷ 0.8 = 7500 m³/day.
    let days = 181..188;
    let units = vec![
        RotationUnit {
            name: "B".into(),
            demand_m3_day: demand.block_share_m3_day(d, 1).unwrap()[days.clone()].to_vec(),
            capacity_ls: Some(80.0),
            raw_mm: Some(40.0),
            etc_mm_day: Some(8.0),
        },
        RotationUnit {
            name: "C".into(),
            demand_m3_day: demand.block_share_m3_day(d, 2).unwrap()[days].to_vec(),
            capacity_ls: Some(100.0),
            raw_mm: Some(70.0),
            etc_mm_day: Some(8.0),
        },
    ];
    // Half the demand is available: 5750 m³/day = 66.5509 l/s.
    let qa_ls = 5_750.0 / 86.4;
    let start = NaiveDate::from_ymd_opt(2001, 7, 1).unwrap();
    let roster = rotation_roster(start, &units, &AvailableFlow::Constant(qa_ls), 7).unwrap();
    // Cycle: demand 7 × 11 500 = 80 500 m³; available 7 × 5750 = 40 250 m³ → rotate.
    assert_eq!(roster.cycles.len(), 1);
    assert_eq!(roster.cycles[0].mode, CycleMode::Rotation);
    // Turn grouping: B alone would need a turn demand of at least
    //   Qa × D_B ÷ cap_B = 66.55 × 28 000 ÷ 80 = 23 293 m³ ≤ 28 000, so B runs
    // alone; C: 66.55 × 52 500 ÷ 100 = 34 939 ≤ 52 500, alone too. Two turns.
    assert_eq!(roster.entries.len(), 2);
    let (b, c) = (&roster.entries[0], &roster.entries[1]);
    assert_eq!(
        (b.unit_name.as_str(), b.turn, c.unit_name.as_str(), c.turn),
        ("B", 1, "C", 2)
    );
    // Durations ∝ demand: B 7 d × 28 000 ÷ 80 500 = 2.434783 d = 210 365.2 s
    //   = 2 d 10 h 26 min 05 s → ends 3 July 10:26:05; C runs to 8 July 00:00.
    let at = |s: &str| chrono::NaiveDateTime::parse_from_str(s, "%Y-%m-%d %H:%M:%S").unwrap();
    assert_eq!(b.start, at("2001-07-01 00:00:00"));
    assert_eq!(b.end, at("2001-07-03 10:26:05"));
    assert_eq!(c.start, b.end);
    assert_eq!(c.end, at("2001-07-08 00:00:00"));
    // Each takes the whole 66.55 l/s in its turn. Volumes:
    //   B 40 250 × 28 000 ÷ 80 500 = 14 000 m³; C 40 250 × 52 500 ÷ 80 500 = 26 250 m³
    //   sum = 40 250 = 66.5509 l/s × 7 d × 86.4.
    assert_close(b.flow_ls, qa_ls, 1e-9, "B flow");
    assert_close(b.volume_m3, 14_000.0, 1e-6, "B volume");
    assert_close(c.volume_m3, 26_250.0, 1e-6, "C volume");
    // Delivered per day: B 5750, 5750, then 0.434783 × 5750 = 2500 on 3 July;
    // C 3250 on 3 July, then 5750 a day.
    assert_close(roster.delivered_m3_day(0)[2], 2_500.0, 1e-6, "B 3 July");
    assert_close(roster.delivered_m3_day(1)[2], 3_250.0, 1e-6, "C 3 July");
    assert_close(roster.delivered_m3_day(1)[6], 5_750.0, 1e-6, "C 7 July");
    // Relative irrigation supply: 14 000 ÷ 28 000 = 0.5 for both.
    assert_close(
        roster.relative_irrigation_supply(0).unwrap(),
        0.5,
        1e-12,
        "RIS B",
    );
    assert_close(
        roster.relative_irrigation_supply(1).unwrap(),
        0.5,
        1e-12,
        "RIS C",
    );
    // B: RAW ÷ ETc = 40 ÷ 8 = 5 days < 7-day rotation → warned; C: 70 ÷ 8 = 8.75, not.
    assert_eq!(
        roster.warnings,
        vec![RosterWarning::RotationLongerThanRaw {
            unit: "B".into(),
            rotation_days: 7,
            raw_days: 5.0
        }]
    );
}

#[test]
fn units_at_nodes_and_delivery_to_blocks() {
    let (network, demand) = scheme();
    let mi = network.canal_index("M").unwrap();
    let d = Node::Canal(network.canal_index("D").unwrap());
    // At D's head (Ec 0.8), 1 July 2001: B 3200 ÷ 0.8 = 4000, C 6000 ÷ 0.8 = 7500 m³/day.
    let units = units_at_node(&demand, d, 181..183);
    let names: Vec<_> = units.iter().map(|u| u.name.as_str()).collect();
    assert_eq!(names, ["B", "C"]);
    assert_close(units[0].demand_m3_day[0], 4_000.0, 1e-9, "B at D head");
    assert_close(units[1].demand_m3_day[1], 7_500.0, 1e-9, "C at D head");
    // At M's head (Ec 0.9): canal D 11 500 ÷ 0.9 = 12 777.78 with its capacity
    // 0.5 m³/s = 500 l/s ÷ 0.9 = 555.56 l/s; block A 5000 ÷ 0.9 = 5555.56.
    let units = units_at_node(&demand, Node::Canal(mi), 181..182);
    assert_eq!(units[0].name, "D");
    assert_close(
        units[0].demand_m3_day[0],
        12_777.777_778,
        1e-6,
        "D at M head",
    );
    assert_close(
        units[0].capacity_ls.unwrap(),
        555.555_556,
        1e-6,
        "D capacity at M head",
    );
    assert_eq!(units[1].name, "A");
    assert_close(
        units[1].demand_m3_day[0],
        5_555.555_556,
        1e-6,
        "A at M head",
    );
    // Headworks: the main canal M, 18 333.33 m³/day.
    let units = units_at_node(&demand, Node::Headworks, 181..182);
    assert_eq!(units.len(), 1);
    assert_close(
        units[0].demand_m3_day[0],
        18_333.333_333,
        1e-6,
        "M at headworks",
    );

    // Continuous flow at D with half its demand available every day of July
    // 2001: each block's outlet gets half its GIR: B 1600, C 3000 m³/day on
    // 1 July; on 15 July (double demand) B 3200, C 6000.
    let half: Vec<f64> = demand.demand_m3_day(d).iter().map(|v| v / 2.0).collect();
    let to_blocks = demand.delivered_to_blocks_m3_day(d, &half).unwrap();
    assert_eq!(
        to_blocks.iter().map(|(b, _)| *b).collect::<Vec<_>>(),
        vec![1, 2]
    );
    assert_close(to_blocks[0].1[181], 1_600.0, 1e-9, "B 1 July");
    assert_close(to_blocks[1].1[181], 3_000.0, 1e-9, "C 1 July");
    assert_close(to_blocks[1].1[195], 6_000.0, 1e-9, "C 15 July");
    assert!(demand.delivered_to_blocks_m3_day(d, &half[1..]).is_err());

    // The same through the continuous-flow roster at D's head over 1–10 July:
    // available 5750 m³/day, demand 11 500 → every unit at half: B 2000, C 3750.
    let units = units_at_node(&demand, d, 181..191);
    let roster = continuous_flow_roster(
        NaiveDate::from_ymd_opt(2001, 7, 1).unwrap(),
        &units,
        &AvailableFlow::Constant(5_750.0 / 86.4),
        10,
    )
    .unwrap();
    assert_close(roster.delivered_m3_day(0)[0], 2_000.0, 1e-9, "B continuous");
    assert_close(roster.delivered_m3_day(1)[9], 3_750.0, 1e-9, "C continuous");
    assert_close(
        roster.relative_irrigation_supply(1).unwrap(),
        0.5,
        1e-12,
        "RIS C",
    );
}
