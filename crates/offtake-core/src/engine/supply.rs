//! Short supply: the rotation roster at the supply node and the plantings'
//! balances re-run on the water actually delivered.
//!
//! # Method
//! - The available flow (m³/s, constant or by month) is given at a node. When
//!   that node has a single child canal and no blocks (a headworks feeding one
//!   main canal), the rotation is organised one level down, where there is
//!   something to rotate: the flow available at the child's head is the
//!   supply × the node's Ec (1 at the headworks).
//! - When the demand at the node exceeds the available flow on any day, a
//!   roster ([`crate::rotation::rotation_roster`]) shares it among the child
//!   canals and blocks in turns over cycles of the project's rotation period.
//! - Water delivered to a child canal is shared among the blocks below it in
//!   proportion to their demand each day
//!   ([`crate::scheme::SchemeDemand::delivered_to_blocks_m3_day`]).
//! - At a block, the delivered outlet volume is split among the block's
//!   plantings **in proportion to their gross requirement that day** (a
//!   planting that needs nothing that day receives nothing); × that
//!   planting's Ea (the paddy field efficiency for paddy rice) × Eb it is the
//!   water reaching the field, turned into mm over the planting's area. Each
//!   planting thus receives its NIR × min(delivered ÷ block GIR, 1). Each
//!   planting's balance is re-run on that water ([`simulate_planting`] with
//!   the delivered depths), giving actual ET and the FAO-33 yield loss.
//! - Relative irrigation supply (RIS) = delivered ÷ demand at the outlet.
//!   Relative water supply (Levine 1982) = (irrigation + rain) ÷ (ETc +
//!   seepage and percolation) over the seasons, with irrigation taken as the
//!   water delivered to the fields (root-zone water ÷ Ea).

use rayon::prelude::*;

use chrono::Datelike;

use super::EngineError;
use super::planting_step::simulate_planting;
use super::plantings::{PlantingSummary, complete_range};
use super::weather_prep::PreparedWeather;
use crate::calendar::IrrigationYear;
use crate::crop::Crop;
use crate::project::{AvailableSupply, HEADWORKS, Project, SupplyFlow};
use crate::rotation::{
    AvailableFlow, Roster, relative_water_supply, rotation_roster, units_at_node,
};
use crate::scheme::{Node, SchemeDemand};
use crate::soil::Soil;

/// Supply indicators of one block below the rotation node.
#[derive(Debug, Clone, PartialEq)]
pub struct BlockSupply {
    /// Block id.
    pub block: String,
    /// GIR at the outlet over the complete years (m³).
    pub demand_m3: f64,
    /// Delivered at the outlet over the complete years (m³).
    pub delivered_m3: f64,
    /// Delivered ÷ demand; `None` without demand.
    pub relative_irrigation_supply: Option<f64>,
}

/// One planting re-run on delivered water.
#[derive(Debug, Clone, PartialEq)]
pub struct PlantingSupply {
    /// Planting id.
    pub planting: String,
    /// Crop id.
    pub crop: String,
    /// Area (ha).
    pub area_ha: f64,
    /// Mean FAO-33 yield loss over its seasons (%), `None` without Ky.
    pub mean_yield_loss_pct: Option<f64>,
    /// Largest seasonal yield loss (%).
    pub max_yield_loss_pct: Option<f64>,
    /// ETc adj ÷ ETc over its seasons.
    pub relative_et: Option<f64>,
    /// Relative water supply (Levine 1982) over its seasons.
    pub relative_water_supply: Option<f64>,
}

/// Supply, roster and re-run.
#[derive(Debug, Clone)]
pub struct SupplyResult {
    /// Node the supply is given at.
    pub supply_node: String,
    /// Node the rotation is organised at.
    pub rotation_node: String,
    /// Days on which the demand at the node exceeds the available flow.
    pub short_days: usize,
    /// The roster, when supply falls short.
    pub roster: Option<Roster>,
    /// Blocks below the rotation node (only when supply falls short).
    pub blocks: Vec<BlockSupply>,
    /// Plantings re-run on delivered water.
    pub plantings: Vec<PlantingSupply>,
    /// Delivered ÷ demand over all blocks below the node.
    pub relative_irrigation_supply: Option<f64>,
    /// Area-weighted mean relative water supply of the re-run plantings.
    pub relative_water_supply: Option<f64>,
    /// Area-weighted mean FAO-33 yield loss of the re-run plantings with Ky (%).
    pub mean_yield_loss_pct: Option<f64>,
    /// Warnings (roster warnings and notes).
    pub warnings: Vec<String>,
}

fn available_ls(flow: &SupplyFlow, w: &PreparedWeather) -> Result<Vec<f64>, EngineError> {
    let check = |v: f64| {
        if v.is_finite() && v >= 0.0 {
            Ok(v)
        } else {
            Err(EngineError::BadSupply { value: v })
        }
    };
    match flow {
        SupplyFlow::Constant(q) => Ok(vec![check(*q)? * 1000.0; w.days()]),
        SupplyFlow::Monthly(m) => {
            for &q in m {
                check(q)?;
            }
            Ok((0..w.days())
                .map(|i| m[w.date(i).month0() as usize] * 1000.0)
                .collect())
        }
    }
}

/// Lowers the available flow of each rotation cycle to what the units can
/// take: in a rotating cycle every unit receives the share Qa·Dᵢ/D of the
/// flow while open (see [`crate::rotation`]), so Qa ≤ capᵢ·D/Dᵢ for each
/// unit with a capacity. Returns the number of cycles lowered.
fn limit_to_capacities(
    units: &[crate::rotation::RotationUnit],
    avail_ls: &mut [f64],
    period_days: u32,
) -> usize {
    let period = (period_days.max(1)) as usize;
    let mut lowered = 0;
    let mut start = 0;
    while start < avail_ls.len() {
        let end = (start + period).min(avail_ls.len());
        let demand: Vec<f64> = units
            .iter()
            .map(|u| u.demand_m3_day[start..end].iter().sum())
            .collect();
        let total: f64 = demand.iter().sum();
        let days = (end - start) as f64;
        let qa = avail_ls[start..end].iter().sum::<f64>() / days;
        let mut limit = f64::INFINITY;
        for (u, d) in units.iter().zip(&demand) {
            if let Some(cap) = u.capacity_ls
                && *d > 0.0
            {
                limit = limit.min(cap * total / d);
            }
        }
        // Only rotating cycles (available volume below demand) are limited.
        let available_m3 = qa * days * 86.4;
        if qa > limit && available_m3 < total && qa > 0.0 {
            let k = limit / qa;
            for a in &mut avail_ls[start..end] {
                *a *= k;
            }
            lowered += 1;
        }
        start = end;
    }
    lowered
}

/// Fills each rotation unit's RAW and ETc from the plantings below it, for
/// the rotation-period warning (RAW ÷ ETc, [`crate::rotation`]): a block
/// takes the planting whose RAW ÷ peak ETc is shortest (the crop that runs
/// out of readily available water first), a child canal the shortest over
/// every block below it. Rainfed plantings are left out. Returns, per unit
/// filled, a description of the limiting planting.
pub fn fill_raw_and_etc(
    units: &mut [crate::rotation::RotationUnit],
    demand: &SchemeDemand,
    summaries: &[PlantingSummary],
) -> Vec<(String, String)> {
    let network = demand.network();
    let mut out = Vec::new();
    for u in units.iter_mut() {
        let below = |block: &str| -> bool {
            if u.name == block {
                return true;
            }
            match (network.canal_index(&u.name), network.block_index(block)) {
                (Some(c), Some(b)) => network.block_is_below(b, Node::Canal(c)),
                _ => false,
            }
        };
        let best = summaries
            .iter()
            .filter(|p| below(&p.block))
            .filter_map(|p| p.raw_and_etc.map(|(raw, etc)| (p, raw, etc)))
            .min_by(|a, b| (a.1 / a.2).total_cmp(&(b.1 / b.2)));
        if let Some((p, raw, etc)) = best {
            u.raw_mm = Some(raw);
            u.etc_mm_day = Some(etc);
            let what = if p.is_paddy {
                format!("pond {raw:.0} mm used at ETc + seepage and percolation {etc:.1} mm/day")
            } else {
                format!("RAW {raw:.0} mm used at a peak 10-day ETc of {etc:.1} mm/day")
            };
            out.push((
                u.name.clone(),
                format!("{} on block {}, {what}", p.crop, p.block),
            ));
        }
    }
    out
}

fn weighted(items: impl Iterator<Item = (f64, Option<f64>)>) -> Option<f64> {
    let (mut s, mut a) = (0.0, 0.0);
    for (area, v) in items {
        if let Some(v) = v {
            s += v * area;
            a += area;
        }
    }
    (a > 0.0).then(|| s / a)
}

/// Builds the roster and re-runs the plantings on the delivered water.
///
/// `daily_nir_mm` holds each planting's NIR per hectare (project order).
///
/// # Errors
/// [`EngineError::UnknownSupplyNode`], [`EngineError::BadSupply`],
/// [`EngineError::Rotation`], [`EngineError::Scheme`] and the planting
/// errors of the re-run.
#[expect(
    clippy::too_many_arguments,
    clippy::too_many_lines,
    reason = "one orchestration step; the inputs are the engine's state"
)]
pub fn supply_and_rerun(
    project: &Project,
    crops: &[Crop],
    soils: &[Soil],
    w: &PreparedWeather,
    demand: &SchemeDemand,
    supply: &AvailableSupply,
    daily_nir_mm: &[Vec<f64>],
    summaries: &[PlantingSummary],
    years: &[IrrigationYear],
) -> Result<SupplyResult, EngineError> {
    let network = demand.network();
    let mut node = if supply.node == HEADWORKS {
        Node::Headworks
    } else {
        Node::Canal(network.canal_index(&supply.node).ok_or_else(|| {
            EngineError::UnknownSupplyNode {
                node: supply.node.clone(),
            }
        })?)
    };
    let mut avail = available_ls(&supply.flow, w)?;
    loop {
        let children = network.child_canals(node);
        let blocks = match node {
            Node::Headworks => Vec::new(),
            Node::Canal(c) => network.child_blocks(c),
        };
        if children.len() == 1 && blocks.is_empty() {
            let ec = match node {
                Node::Headworks => 1.0,
                Node::Canal(c) => network.canals()[c].conveyance_efficiency,
            };
            for a in &mut avail {
                *a *= ec;
            }
            node = Node::Canal(children[0]);
        } else {
            break;
        }
    }
    let node_demand_ls = demand.demand_ls(node);
    let short_days = node_demand_ls
        .iter()
        .zip(&avail)
        .filter(|(d, a)| **d > **a * (1.0 + 1e-9))
        .count();
    let mut result = SupplyResult {
        supply_node: supply.node.clone(),
        rotation_node: network.node_name(node).to_owned(),
        short_days,
        roster: None,
        blocks: Vec::new(),
        plantings: Vec::new(),
        relative_irrigation_supply: Some(1.0),
        relative_water_supply: None,
        mean_yield_loss_pct: None,
        warnings: Vec::new(),
    };
    if short_days == 0 {
        return Ok(result);
    }
    let mut units = units_at_node(demand, node, 0..w.days());
    let limiting = fill_raw_and_etc(&mut units, demand, summaries);
    let reduced = limit_to_capacities(&units, &mut avail, project.options.rotation_period_days);
    if reduced > 0 {
        result.warnings.push(format!(
            "roster: the flow released to {} was reduced in {reduced} rotation cycles so that no canal exceeds its existing capacity",
            result.rotation_node
        ));
    }
    let roster = rotation_roster(
        w.start,
        &units,
        &AvailableFlow::Daily(avail.clone()),
        project.options.rotation_period_days,
    )
    .map_err(|e| EngineError::Rotation(e.to_string()))?;
    for warning in &roster.warnings {
        let detail = match warning {
            crate::rotation::RosterWarning::RotationLongerThanRaw { unit, .. } => limiting
                .iter()
                .find(|(u, _)| u == unit)
                .map(|(_, l)| format!(" (limiting: {l})"))
                .unwrap_or_default(),
            _ => String::new(),
        };
        result.warnings.push(format!("roster: {warning}{detail}"));
    }
    let ec_node = match node {
        Node::Headworks => 1.0,
        Node::Canal(c) => network.canals()[c].conveyance_efficiency,
    };
    // Delivered at each block outlet (network block index → m³/day).
    let mut outlet: Vec<(usize, Vec<f64>)> = Vec::new();
    for (u, name) in roster.units.iter().enumerate() {
        let at_unit: Vec<f64> = roster
            .delivered_m3_day(u)
            .iter()
            .map(|v| v * ec_node)
            .collect();
        if let Some(c) = network.canal_index(name) {
            outlet.extend(demand.delivered_to_blocks_m3_day(Node::Canal(c), &at_unit)?);
        } else if let Some(b) = network.block_index(name) {
            outlet.push((b, at_unit));
        }
    }
    let range = complete_range(w, years);
    let (mut tot_dem, mut tot_del) = (0.0, 0.0);
    let mut jobs: Vec<(usize, Vec<f64>)> = Vec::new();
    for (b, delivered) in &outlet {
        let block_net = &network.blocks()[*b];
        let gir = demand.block_gir_m3_day(*b);
        let dem: f64 = gir[range.clone()].iter().sum();
        let del: f64 = delivered[range.clone()].iter().sum();
        tot_dem += dem;
        tot_del += del;
        result.blocks.push(BlockSupply {
            block: block_net.name.clone(),
            demand_m3: dem,
            delivered_m3: del,
            relative_irrigation_supply: crate::rotation::relative_irrigation_supply(del, dem),
        });
        // Outlet water of the block, shared among its plantings in
        // proportion to their gross requirement that day: each receives
        // NIR × min(delivered ÷ GIR of the block, 1) at the root zone.
        for (pi, p) in project.plantings.iter().enumerate() {
            if p.block != block_net.name {
                continue;
            }
            let Some(nir) = daily_nir_mm.get(pi).filter(|v| v.len() == w.days()) else {
                continue;
            };
            let mm: Vec<f64> = (0..w.days())
                .map(|d| {
                    let total = gir[d];
                    if total > 0.0 {
                        nir[d] * (delivered[d] / total).min(1.0)
                    } else {
                        0.0
                    }
                })
                .collect();
            jobs.push((pi, mm));
        }
    }
    result.relative_irrigation_supply =
        crate::rotation::relative_irrigation_supply(tot_del, tot_dem);
    let reruns: Vec<Result<PlantingSupply, EngineError>> = jobs
        .par_iter()
        .map(|(pi, mm)| {
            let p = &project.plantings[*pi];
            let summary = &summaries[*pi];
            // Network blocks are the project's, in order, named by id.
            let block = network
                .block_index(&p.block)
                .and_then(|b| project.blocks.get(b));
            let crop = crops.iter().find(|c| c.id == p.crop);
            let soil = block.and_then(|b| soils.iter().find(|s| s.id == b.soil));
            let (Some(block), Some(crop), Some(soil)) = (block, crop, soil) else {
                return Err(EngineError::MissingCrop {
                    planting: p.id.clone(),
                    crop: p.crop.clone(),
                });
            };
            let out = simulate_planting(
                crop,
                soil,
                p,
                block,
                project.options.effective_rain,
                w,
                Some(mm),
                None,
            )
            .map_err(|cause| EngineError::Planting {
                planting: p.id.clone(),
                cause,
            })?;
            let ea = summary.application_efficiency;
            let n = out.seasons.len();
            let losses: Vec<f64> = out
                .seasons
                .iter()
                .filter_map(|s| s.yield_loss_pct)
                .collect();
            let (etc, eta, irr, rain, perc) =
                out.seasons.iter().fold((0.0, 0.0, 0.0, 0.0, 0.0), |a, s| {
                    (
                        a.0 + s.etc_mm,
                        a.1 + s.etc_adj_mm,
                        a.2 + s.net_irrigation_mm / ea,
                        a.3 + s.rain_mm,
                        a.4 + s.percolation_mm,
                    )
                });
            Ok(PlantingSupply {
                planting: p.id.clone(),
                crop: p.crop.clone(),
                area_ha: summary.area_ha,
                mean_yield_loss_pct: (!losses.is_empty() && n > 0)
                    .then(|| losses.iter().sum::<f64>() / losses.len() as f64),
                max_yield_loss_pct: losses.iter().copied().reduce(f64::max),
                relative_et: (etc > 0.0).then(|| eta / etc),
                relative_water_supply: relative_water_supply(irr, rain, etc, perc),
            })
        })
        .collect();
    for r in reruns {
        result.plantings.push(r?);
    }
    result.relative_water_supply = weighted(
        result
            .plantings
            .iter()
            .map(|p| (p.area_ha, p.relative_water_supply)),
    );
    result.mean_yield_loss_pct = weighted(
        result
            .plantings
            .iter()
            .map(|p| (p.area_ha, p.mean_yield_loss_pct)),
    );
    result.roster = Some(roster);
    Ok(result)
}
