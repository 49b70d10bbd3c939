//! The engine on the invented demo scheme: conservation through the canal
//! tree, finite design values, scenario direction, rotation re-run bounds.
//!
//! The conservation identity is DESIGN.md "Definitions we hold to": block
//! GIR = NIR ÷ (Ea × Eb); a canal's demand = Σ children ÷ its Ec; the
//! headworks demand is the sum over blocks of NIR ÷ (Ea × Eb × Π Ec along the
//! path), computed here independently from the project's own tree helper.
//! A paddy planting's NIR already holds seepage, percolation and land
//! preparation, so its Ea is the paddy field efficiency (operational losses
//! only, issue 4), not the block's method efficiency: the identity is
//! Σ_plantings NIR_p ÷ (Ea_p × Eb × Π Ec).

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::Path;

use offtake_core::engine::{self, Results, compare_scenarios, compare_scenarios_each};
use offtake_core::project::Project;
use offtake_core::scheme::Node;
use offtake_core::weather::WeatherDay;
use offtake_io::library::Libraries;
use offtake_io::project_file::{load_project, weather_path};
use offtake_io::weather::{ImportOptions, import_weather_file};

const DEMO: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../demo-projects/demo-scheme/scheme.ron"
);

fn demo() -> (Project, Libraries, Vec<WeatherDay>) {
    let path = Path::new(DEMO);
    let project = load_project(path).expect("demo project loads");
    let libs = Libraries::builtin().expect("built-in libraries");
    let weather = import_weather_file(&weather_path(path, &project), &ImportOptions::default())
        .expect("demo weather imports")
        .days;
    (project, libs, weather)
}

fn run(project: &Project, scenario: Option<&str>) -> Results {
    let (_, libs, weather) = demo();
    engine::run_scenario(project, scenario, &libs.crops, &libs.soils, &weather).expect("runs")
}

#[test]
fn demo_runs_end_to_end_with_finite_values_and_conserves_water() {
    let (project, _, _) = demo();
    let r = run(&project, None);
    assert!(r.days > 3000);
    assert!(!r.complete_years.is_empty());
    for d in &r.design {
        for v in [
            d.area_ha,
            d.design_flow_ls,
            d.required_capacity_ls,
            d.peak_daily_ls,
            d.peak_10day_ls,
            d.seasonal_volume_m3,
        ] {
            assert!(v.is_finite() && v >= 0.0, "{}: {v}", d.name);
        }
    }
    let head = r.headworks().expect("headworks row");
    assert!(head.design_flow_ls > 0.0);
    // Required capacity = design flow × 24 ÷ hours (DESIGN.md).
    for c in &project.canals {
        let d = r.canal(&c.id).expect("canal row");
        let expected = d.design_flow_ls * 24.0 / c.operating_hours_per_day;
        assert!((d.required_capacity_ls - expected).abs() <= 1e-9 * expected.max(1.0));
    }

    // Conservation, every day: headworks = Σ block GIR ÷ Π Ec.
    let net = r.demand.network();
    let head_m3 = r.demand.demand_m3_day(Node::Headworks);
    let factors: Vec<(usize, f64)> = project
        .blocks
        .iter()
        .map(|b| {
            let ec = project.conveyance_to_headworks(&b.id).unwrap();
            (net.block_index(&b.id).unwrap(), 1.0 / ec)
        })
        .collect();
    let mut total = 0.0;
    for (day, &h) in head_m3.iter().enumerate() {
        let sum: f64 = factors
            .iter()
            .map(|&(b, k)| r.demand.block_gir_m3_day(b)[day] * k)
            .sum();
        assert!(
            (h - sum).abs() <= 1e-9 * sum.max(1.0),
            "day {day}: headworks {h} vs blocks {sum}"
        );
        total += h;
    }
    assert!(total > 0.0);
    // And each block's GIR = Σ over its plantings of NIR ÷ (Ea_p × Eb), with
    // Ea_p the paddy field efficiency for rice (0.9 where the file gives
    // none) and the method's Ea otherwise: checked on the mean yearly
    // volumes over the complete irrigation years.
    let first = r.complete_years.first().unwrap().start();
    let last = r.complete_years.last().unwrap().end();
    let i0 = usize::try_from((first - r.start).num_days()).unwrap();
    let i1 = usize::try_from((last - r.start).num_days()).unwrap() + 1;
    let n_years = r.complete_years.len() as f64;
    let mut rice_blocks = 0;
    for b in &project.blocks {
        let bi = net.block_index(&b.id).unwrap();
        let gir_year: f64 = r.demand.block_gir_m3_day(bi)[i0..i1].iter().sum::<f64>() / n_years;
        let expected: f64 = r
            .plantings
            .iter()
            .filter(|p| p.block == b.id)
            .map(|p| {
                let planting = project.planting(&p.id).unwrap();
                let ea = if p.crop == "rice-paddy" {
                    planting.paddy.map_or(0.9, |x| x.field_efficiency)
                } else {
                    b.method.application_efficiency
                };
                p.nir_m3_per_year / (ea * b.field_canal_efficiency)
            })
            .sum();
        assert!(
            (gir_year - expected).abs() <= 1e-6 * expected.max(1.0),
            "block {}: GIR {gir_year} vs {expected}",
            b.id
        );
        if r.plantings
            .iter()
            .any(|p| p.block == b.id && p.crop == "rice-paddy")
        {
            rice_blocks += 1;
            // The rice blocks' GIR is less than NIR ÷ (method Ea × Eb):
            // percolation is not counted twice.
            let nir_year: f64 = r.demand.block_nir_m3_day(bi)[i0..i1].iter().sum::<f64>() / n_years;
            assert!(
                gir_year < nir_year / (b.method.application_efficiency * b.field_canal_efficiency)
            );
        }
    }
    assert!(rice_blocks >= 4);
    // Storage losses are reported apart: present, positive, and not in the
    // headworks demand (which the identity above already pins down).
    let st = r.storage.as_ref().expect("the demo has a reservoir");
    assert!(st.mean_yearly_m3 > 0.0);
    assert_eq!(st.loss_m3_day.len(), r.days);
    // Season volumes add up to the headworks seasonal volume (both are means
    // over the complete irrigation years).
    let seasons: f64 = r.season_volumes.iter().map(|s| s.headworks_m3).sum();
    assert!(
        (seasons - head.seasonal_volume_m3).abs() <= 1e-6 * seasons,
        "{seasons} vs {}",
        head.seasonal_volume_m3
    );
}

/// The engine adds block series to the scheme demand in chunks of blocks;
/// a scheme of six copies of the demo's blocks (96 blocks, more than one
/// chunk) gives every copy exactly its original's series, and the
/// headworks still equals Σ block GIR ÷ Π Ec every day.
#[test]
fn blocks_computed_in_chunks_keep_their_own_series() {
    let (demo_project, libs, weather) = demo();
    let mut big = demo_project.clone();
    big.scenarios.clear();
    big.options.available_supply = None;
    for copy in 1..6 {
        for b in &demo_project.blocks {
            let mut nb = b.clone();
            nb.id = format!("{}-copy{copy}", b.id);
            nb.name = format!("{} copy {copy}", b.name);
            big.blocks.push(nb);
        }
        for p in &demo_project.plantings {
            let mut np = p.clone();
            np.id = format!("{}-copy{copy}", p.id);
            np.block = format!("{}-copy{copy}", p.block);
            big.plantings.push(np);
        }
    }
    assert!(big.blocks.len() > 64);
    let r = engine::run_scenario(&big, None, &libs.crops, &libs.soils, &weather).expect("runs");
    let net = r.demand.network();
    for b in &demo_project.blocks {
        let original = r.demand.block_gir_m3_day(net.block_index(&b.id).unwrap());
        for copy in 1..6 {
            let id = format!("{}-copy{copy}", b.id);
            assert_eq!(
                r.demand.block_gir_m3_day(net.block_index(&id).unwrap()),
                original,
                "{id}"
            );
            assert_eq!(
                r.demand.block_nir_m3_day(net.block_index(&id).unwrap()),
                r.demand.block_nir_m3_day(net.block_index(&b.id).unwrap()),
            );
        }
    }
    let head_m3 = r.demand.demand_m3_day(Node::Headworks);
    for (day, &h) in head_m3.iter().enumerate() {
        let sum: f64 = big
            .blocks
            .iter()
            .map(|b| {
                let k = 1.0 / big.conveyance_to_headworks(&b.id).unwrap();
                r.demand.block_gir_m3_day(net.block_index(&b.id).unwrap())[day] * k
            })
            .sum();
        assert!(
            (h - sum).abs() <= 1e-9 * sum.max(1.0),
            "day {day}: headworks {h} vs blocks {sum}"
        );
    }
}

#[test]
fn shifting_rice_to_maize_lowers_the_headworks_volume() {
    let (project, libs, weather) = demo();
    let cmp = compare_scenarios(&project, &libs.crops, &libs.soils, &weather).unwrap();
    let col = |n: &str| cmp.columns.iter().find(|c| c.name == n).unwrap();
    let current = col("current");
    let maize = col("shift-to-maize");
    let area = |c: &engine::ScenarioColumn, crop: &str| {
        c.area_by_crop
            .iter()
            .find(|(k, _)| k == crop)
            .map_or(0.0, |(_, a)| *a)
    };
    assert!(area(maize, "rice-paddy") < area(current, "rice-paddy"));
    assert!(area(maize, "maize-grain") > area(current, "maize-grain"));
    assert!(maize.headworks_volume_m3 < current.headworks_volume_m3);
    // The rice distributary's design flow is set by land preparation in
    // June: with 30 % of its rice area under maize it falls. (The headworks
    // design flow need not fall: its yearly peaks come in the dry season or
    // in October, when maize on basins at Ea 0.65 needs more gross water than
    // ponded rice at its operational field efficiency 0.9.)
    let upper = |scenario| {
        run(&project, Some(scenario))
            .canal("upper-dy")
            .unwrap()
            .design_flow_ls
    };
    assert!(upper("shift-to-maize") < upper("current"));
    // Warmer and drier weather raises the demand.
    let warm = col("warmer-drier");
    assert!(warm.headworks_volume_m3 > current.headworks_volume_m3);
    // …and the reservoir's evaporation: the +1.5 °C warms the water surface
    // too (Meyer 1915: E = K_M (e_w − e_a)(1 + u9/16), Subramanya 2009 p. 63,
    // grows with the surface temperature through e_w).
    assert!(
        warm.storage_loss_m3.unwrap() > current.storage_loss_m3.unwrap(),
        "warmer-drier {:?} vs current {:?} m³/year",
        warm.storage_loss_m3,
        current.storage_loss_m3
    );
}

#[test]
fn an_impossible_tmax_is_replaced_by_the_gap_filling_unless_kept() {
    // The demo's planted defect: Tmax 55.2 °C on 2009-04-17 (below the world
    // record, so no physical limit catches it), around 36.5 °C on the days
    // either side. Its day-of-year climatology ± 5 sd rejects it; the default
    // gap filling interpolates it (a 1-day gap), and ET0 (FAO-56 eq. 6) on
    // the day falls back among its neighbours'.
    use offtake_core::engine::weather_prep::screen_weather;
    use offtake_core::gapfill::{FillMark, repair_for_daily_balance};
    use offtake_core::quality::Variable;
    let (project, libs, weather) = demo();
    let date = chrono::NaiveDate::from_ymd_opt(2009, 4, 17).unwrap();
    let screened = screen_weather(&weather, &project).unwrap();
    let hit = screened
        .out_of_limits
        .iter()
        .find(|o| o.date == date && o.variable == Variable::Tmax)
        .expect("Tmax 55.2 beyond the station limits");
    assert!((hit.value - 55.2).abs() < 1e-9 && hit.high < 50.0);
    assert!(
        screened
            .warning
            .as_ref()
            .unwrap()
            .contains("treated as missing")
    );
    let repaired = repair_for_daily_balance(
        &screened.days,
        &project.options.gap_filling.options(),
        |_| Ok(()),
    )
    .unwrap();
    let i = repaired
        .filled
        .days
        .iter()
        .position(|d| d.date == date)
        .unwrap();
    let filled = repaired.filled.days[i];
    let neighbours = [repaired.filled.days[i - 1], repaired.filled.days[i + 1]];
    let mid = f64::midpoint(neighbours[0].tmax_c.unwrap(), neighbours[1].tmax_c.unwrap());
    assert!((filled.tmax_c.unwrap() - mid).abs() < 1e-9);
    assert_eq!(
        repaired.filled.mark(i, Variable::Tmax),
        Some(FillMark::Interpolated)
    );
    let site = engine::site_of(&project);
    let ctx = offtake_core::et0::Et0Context::new(&site, &offtake_core::et0::Et0Options::default())
        .unwrap();
    let et0 = |d: &WeatherDay| ctx.et0_mm_day(d).unwrap();
    let around = f64::midpoint(et0(&neighbours[0]), et0(&neighbours[1]));
    let raw_day = weather.iter().find(|d| d.date == date).unwrap();
    assert!(et0(raw_day) > 1.2 * around, "the raw day's ET0 stands out");
    assert!((et0(&filled) - around).abs() < 0.1 * around);
    // The run lists it; with the keep option it is kept and said so.
    let r = run(&project, None);
    assert!(r.weather_out_of_limits.iter().any(|o| o.date == date));
    let mut keep = project.clone();
    keep.options.station_limits.keep_out_of_limit_values = true;
    let kept = engine::run_scenario(&keep, None, &libs.crops, &libs.soils, &weather).unwrap();
    assert!(kept.weather_out_of_limits.iter().any(|o| o.date == date));
    assert!(
        kept.warnings.iter().any(|w| w.contains("kept as measured")),
        "{:?}",
        kept.warnings
    );
}

#[test]
fn a_mediterranean_winter_wheat_at_18_degrees_north_warns_naming_the_planting() {
    // FAO-56 Table 11: winter wheat, November planting, Mediterranean,
    // 30/140/40/30 = 240 days (the library's row). The demo station is at
    // 18° N with a coldest month near 21 °C: tropical (Köppen, from memory).
    let (mut project, libs, weather) = demo();
    let id = project.plantings[0].id.clone();
    project.plantings[0].crop = "wheat-winter".to_owned();
    // Its own row's length (the planting had rice's season length).
    project.plantings[0].season_length_days = None;
    project.plantings[0].paddy = None;
    let r = engine::run_scenario(&project, None, &libs.crops, &libs.soils, &weather).unwrap();
    let w = r
        .warnings
        .iter()
        .find(|w| w.starts_with("season plausibility") && w.contains("(wheat-winter)"))
        .unwrap_or_else(|| panic!("no plausibility warning: {:#?}", r.warnings));
    assert!(w.contains(&id), "{w}");
    assert!(w.contains("Mediterranean") && w.contains("18.0° N"), "{w}");
    // A tropical row (sugarcane, low latitudes) at the same station does not.
    project.plantings[0].crop = "sugarcane".to_owned();
    let r = engine::run_scenario(&project, None, &libs.crops, &libs.soils, &weather).unwrap();
    assert!(
        !r.warnings.iter().any(|w| w.contains("(sugarcane)")),
        "{:#?}",
        r.warnings
    );
}

#[test]
fn a_season_far_from_its_row_warns() {
    // More than 25 % away from the row's total (FAO-56 Table 11 maize,
    // 150 days): 200 days warns, 170 days does not.
    let (mut project, libs, weather) = demo();
    let i = project
        .plantings
        .iter()
        .position(|p| p.crop == "maize-grain")
        .unwrap();
    let id = project.plantings[i].id.clone();
    let departs = |r: &Results| {
        r.warnings
            .iter()
            .any(|w| w.contains(&format!("planting {id} (maize-grain): season of")))
    };
    project.plantings[i].season_length_days = Some(200);
    let r = engine::run_scenario(&project, None, &libs.crops, &libs.soils, &weather).unwrap();
    assert!(departs(&r), "{:#?}", r.warnings);
    project.plantings[i].season_length_days = Some(170);
    let r = engine::run_scenario(&project, None, &libs.crops, &libs.soils, &weather).unwrap();
    assert!(!departs(&r));
}

#[test]
fn per_year_shortfall_is_per_complete_irrigation_year() {
    // DESIGN.md: incomplete years at the ends of the record are left out of
    // statistics; the comparison's per-year shortfall, its period count and
    // its count of short years all use the same complete irrigation years.
    let (project, libs, weather) = demo();
    let r = run(&project, None);
    let cmp = compare_scenarios(&project, &libs.crops, &libs.soils, &weather).unwrap();
    let current = cmp.columns.iter().find(|c| c.name == "current").unwrap();
    let complete = &r.complete_years;
    assert_eq!(current.complete_years, complete.len());
    let (mut volume, mut periods) = (0.0, 0);
    for d in &r.design {
        if let Some(s) = &d.shortfall
            && d.node != Node::Headworks
        {
            for p in &s.basis_periods {
                if complete.iter().any(|y| y.contains(p.start)) {
                    volume += p.deficit_m3;
                    periods += 1;
                }
            }
        }
    }
    assert!(volume > 0.0, "the demo's middle distributary falls short");
    let per_year = volume / complete.len() as f64;
    assert!((current.shortfall_m3_per_year - per_year).abs() < 1e-6 * per_year);
    assert_eq!(current.shortfall_periods, periods);
    assert!(current.shortfall_years <= current.complete_years);
}

#[test]
fn reservoir_losses_show_three_methods_and_the_fao56_open_water_line() {
    let (project, _, _) = demo();
    let r = run(&project, None);
    let st = r.storage.as_ref().expect("the demo has a reservoir");
    assert_eq!(st.methods.len(), 3);
    // The used method is the reservoir's, and its loss is one of the three.
    assert_eq!(st.method, project.reservoir.as_ref().unwrap().method);
    let (lo, hi) = st.spread_m3();
    assert!(lo <= st.mean_yearly_m3 && st.mean_yearly_m3 <= hi);
    // FAO-56 Table 12: open water < 2 m deep, Kc 1.05, times the same ET0.
    assert!((st.kc_line_mean_yearly_mm - 1.05 * st.et0_mean_yearly_mm).abs() < 1e-6);
    // Every method lies within a factor of two of that line on the demo
    // weather (a plausibility bound of ours, not a published one).
    for m in &st.methods {
        let ratio = m.mean_yearly_mm / st.kc_line_mean_yearly_mm;
        assert!((0.5..2.0).contains(&ratio), "{m:?}: {ratio}");
    }
    // The summary names all three, the used one, and the line.
    let text = offtake_io::results::summary_text(&r, &project);
    for needle in [
        "Meyer (1915)",
        "Penman (1948) open water",
        "Rohwer (1931)",
        "used for the scheme's losses",
        "FAO-56 Table 12 open water < 2 m deep, Kc 1.05 x ET0",
    ] {
        assert!(text.contains(needle), "{needle} missing from:\n{text}");
    }
}

#[test]
fn one_invalid_scenario_is_listed_and_the_others_still_compared() {
    let (mut project, libs, weather) = demo();
    let strict = compare_scenarios(&project, &libs.crops, &libs.soils, &weather).unwrap();
    // A temperature shift beyond the accepted range, in warmer-drier only.
    let s = project
        .scenarios
        .iter_mut()
        .find(|s| s.name == "warmer-drier")
        .unwrap();
    s.weather.temperature_shift_c = 25.0;
    let each = compare_scenarios_each(&project, &libs.crops, &libs.soils, &weather);
    assert_eq!(each.failed.len(), 1);
    assert_eq!(each.failed[0].0, "warmer-drier");
    assert!(
        each.failed[0].1.to_string().contains("temperature_shift_c"),
        "{}",
        each.failed[0].1
    );
    // The others are computed exactly as before.
    let names: Vec<&str> = each.columns.iter().map(|c| c.name.as_str()).collect();
    assert_eq!(names, ["current", "shift-to-maize"]);
    for c in &each.columns {
        let before = strict.columns.iter().find(|b| b.name == c.name).unwrap();
        assert_eq!(c, before);
    }
    // The strict form (used by `offtake compare`) stops at the failure.
    assert!(compare_scenarios(&project, &libs.crops, &libs.soils, &weather).is_err());
}

#[test]
fn rotation_rerun_under_short_supply_has_bounded_indicators() {
    let (project, _, _) = demo();
    assert!(project.options.available_supply.is_some());
    let r = run(&project, None);
    let s = r.supply.as_ref().expect("supply result");
    assert!(s.short_days > 0, "the demo supply should fall short");
    let roster = s.roster.as_ref().expect("a roster");
    assert!(!roster.entries.is_empty());
    let ris = s.relative_irrigation_supply.unwrap();
    assert!(ris > 0.0 && ris <= 1.0 + 1e-9, "RIS {ris}");
    for b in &s.blocks {
        if let Some(x) = b.relative_irrigation_supply {
            assert!((0.0..=1.0 + 1e-9).contains(&x), "{}: {x}", b.block);
        }
    }
    assert!(!s.plantings.is_empty());
    for p in &s.plantings {
        if let Some(l) = p.mean_yield_loss_pct {
            assert!((0.0..=100.0).contains(&l), "{}: {l}", p.planting);
        }
        if let Some(x) = p.relative_et {
            assert!((0.0..=1.0 + 1e-9).contains(&x), "{}: {x}", p.planting);
        }
    }
    let loss = s.mean_yield_loss_pct.unwrap();
    assert!(loss >= 0.0);
    // The roster never delivers more than the demand at the node.
    for u in 0..roster.units.len() {
        let del: f64 = roster.delivered_m3_day(u).iter().sum();
        let dem: f64 = roster.demand_m3_day[u * roster.days..(u + 1) * roster.days]
            .iter()
            .sum();
        assert!(del <= dem * (1.0 + 1e-9));
    }
}

#[test]
fn ample_supply_needs_no_roster() {
    let (mut project, _, _) = demo();
    if let Some(s) = project.options.available_supply.as_mut() {
        s.flow = offtake_core::project::SupplyFlow::Constant(1000.0);
    }
    let r = run(&project, None);
    let s = r.supply.as_ref().unwrap();
    assert_eq!(s.short_days, 0);
    assert!(s.roster.is_none());
}

/// The rotation units carry RAW and ETc from the plantings (issue 5: warn
/// when the rotation period is longer than the time a block's crop takes to
/// use its readily available water, RAW ÷ ETc).
///
/// Each planting's RAW is checked against FAO-56 eqs. 82–83 with the Table
/// 22 note (p = p_table + 0.04 (5 − ETc), 0.1 ≤ p ≤ 0.8) at its peak
/// 10-day ETc, from the library's soil and crop values; paddy rice holds its
/// pond instead. A unit's figure is the shortest RAW ÷ ETc below it.
#[test]
fn rotation_units_carry_raw_and_etc_from_the_plantings() {
    let (project, libs, _) = demo();
    let r = run(&project, None);
    for p in &r.plantings {
        let planting = project.planting(&p.id).unwrap();
        let block = project.block(&p.block).unwrap();
        let crop = libs.crops.iter().find(|c| c.id == p.crop).unwrap();
        let soil = libs.soils.iter().find(|s| s.id == block.soil).unwrap();
        match p.raw_and_etc {
            None => assert!(
                matches!(planting.strategy, offtake_core::project::Strategy::Rainfed),
                "{}",
                p.id
            ),
            Some((raw, rate)) if p.crop == "rice-paddy" => {
                let paddy = planting.paddy.unwrap();
                assert!((raw - paddy.target_ponding_mm).abs() < 1e-9);
                assert!(rate > paddy.percolation_seepage_mm_day);
            }
            Some((raw, etc)) => {
                let taw = 1000.0 * (soil.theta_fc - soil.theta_wp) * crop.root_depth_max_m;
                let p_adj = (crop.depletion_p + 0.04 * (5.0 - etc)).clamp(0.1, 0.8);
                assert!((raw - p_adj * taw).abs() < 1e-9, "{}: {raw}", p.id);
                assert!(etc > 0.0 && etc < 20.0, "{}: {etc}", p.id);
            }
        }
    }
    // The rainfed sorghum is left out of the check.
    assert!(
        r.plantings
            .iter()
            .find(|p| p.id == "S3-sorghum")
            .unwrap()
            .raw_and_etc
            .is_none()
    );
    // Block M1 takes water from the main canal, where the demo rotates:
    // its unit's figure is the shortest RAW ÷ ETc of its plantings.
    let m1 = r
        .plantings
        .iter()
        .filter(|p| p.block == "M1")
        .filter_map(|p| p.raw_and_etc.map(|(raw, etc)| raw / etc))
        .fold(f64::INFINITY, f64::min);
    assert!(m1 < 7.0);
    let expected = format!("`M1`: rotation period 7 days is longer than RAW ÷ ETc = {m1:.1} days");
    assert!(
        r.warnings.iter().any(|w| w.contains(&expected)),
        "{expected}\n{:#?}",
        r.warnings
    );
    // A 1-day rotation is shorter than every unit's RAW ÷ ETc: no warning.
    let mut daily = project.clone();
    daily.options.rotation_period_days = 1;
    let r1 = run(&daily, None);
    assert!(
        !r1.warnings.iter().any(|w| w.contains("longer than RAW")),
        "{:#?}",
        r1.warnings
    );
}

/// The dual crop coefficient (FAO-56 Chapter 7) chosen on the demo's tomato
/// plantings: the run succeeds, and wetting a third of the surface (drip,
/// FAO-56 Table 20 fw 0.3–0.4) needs less water at the headworks than
/// wetting all of it (fw = 1), because less soil evaporates.
#[test]
fn dual_coefficient_plantings_run_and_drip_wetting_needs_less_water() {
    use offtake_core::project::CoefficientChoice;
    let (base, _, _) = demo();
    let with = |fw: Option<f64>| {
        let mut p = base.clone();
        for pl in p.plantings.iter_mut().filter(|pl| pl.crop == "tomato") {
            pl.coefficients = CoefficientChoice::Dual {
                wetted_fraction: fw,
            };
        }
        p
    };
    let volume = |r: &Results| {
        r.design
            .iter()
            .find(|d| d.name == "headworks")
            .expect("headworks row")
            .seasonal_volume_m3
    };
    let full = run(&with(Some(1.0)), None);
    let drip = run(&with(Some(0.35)), None);
    let from_method = run(&with(None), None);
    assert!(
        volume(&drip) < volume(&full),
        "{} vs {}",
        volume(&drip),
        volume(&full)
    );
    assert!(volume(&from_method).is_finite() && volume(&from_method) > 0.0);
}

/// The project's gap-filling choice reaches the computation: the demo's
/// 36-day solar-radiation gap (2015) is filled from the series' day-of-year
/// climatology instead of the FAO-56 temperature-range procedure, which
/// changes ET₀ in those weeks and so the requirement; the warning names the
/// method. The choice round-trips through a project file.
#[test]
fn gap_filling_choice_reaches_the_engine() {
    use offtake_core::project::{GapFilling, LongGaps};
    let (base, _, _) = demo();
    let mut clim = base.clone();
    clim.options.gap_filling = GapFilling {
        max_interpolation_days: 5,
        long_gaps: LongGaps::Climatology,
    };
    let a = run(&base, None);
    let b = run(&clim, None);
    let volume = |r: &Results| {
        r.design
            .iter()
            .find(|d| d.name == "headworks")
            .expect("headworks row")
            .seasonal_volume_m3
    };
    assert!(
        (volume(&a) - volume(&b)).abs() > 1.0,
        "{} vs {}",
        volume(&a),
        volume(&b)
    );
    assert!(
        b.warnings
            .iter()
            .any(|w| w.contains("interpolation up to 5 days") && w.contains("climatology")),
        "{:?}",
        b.warnings
    );
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("clim.ron");
    offtake_io::project_file::save_project(&path, &clim).unwrap();
    let again = load_project(&path).unwrap();
    assert_eq!(again.options.gap_filling, clim.options.gap_filling);
}
