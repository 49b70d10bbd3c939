//! Demand up the canal tree: block NIR → block GIR at the outlet → demand at
//! the head of every canal → headworks demand, per day, with per-crop and
//! per-block breakdowns, and aggregation to 10-day periods and months.
//!
//! # Method (DESIGN.md, "Definitions we hold to")
//!
//! - block GIR at the outlet = block NIR ÷ (Ea × Eb);
//! - demand at a canal's head = Σ (demand of child canals + GIR of blocks on
//!   it) ÷ Ec of the canal's reach;
//! - headworks demand = Σ demand of the main canals.
//!
//! Eb and the reach Ec together make up the distribution efficiency (Ed =
//! Ec × Eb, published-check-values §10.1, after Bos & Nugteren 1974), so no
//! lumped distribution efficiency is applied on top.
//!
//! # Units
//! Volumes in m³/day; flows in l/s (continuous over 24 h); depths in mm over
//! the area commanded below the node (1 mm on 1 ha = 10 m³, FAO-56 Annex 1).

use chrono::{Datelike, NaiveDate};

use crate::calendar::{TenDayPeriod, YearMonth};
use serde::{Deserialize, Serialize};

use super::SchemeError;
use super::network::{Network, NetworkProblem, Node};
use crate::units::{depth_mm_over_area_ha_to_m3, m3_day_to_l_s};

/// One daily NIR series for (part of) a block, labelled with its crop.
///
/// A block may have several series (plantings); series with the same crop
/// label are summed in the per-crop breakdown.
///
/// The series' GIR at the block outlet is NIR ÷ (Ea × Eb), with Ea the
/// block's field application efficiency unless `application_efficiency`
/// overrides it for this series. The override is for plantings whose NIR
/// already holds losses a method efficiency would count again: a paddy NIR
/// contains seepage, percolation and land preparation, so its efficiency
/// covers operational losses only (issue 4, [`crate::paddy`]).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NirSeries {
    /// Name of the block the planting is on.
    pub block: String,
    /// Crop label for the breakdowns.
    pub crop: String,
    /// Net irrigation requirement of the planting, m³/day, one value per day
    /// from the scheme's start date.
    pub nir_m3_day: Vec<f64>,
    /// Field application efficiency Ea of this series (fraction in (0, 1]);
    /// `None`: the block's.
    #[serde(default)]
    pub application_efficiency: Option<f64>,
}

impl NirSeries {
    /// Builds a series from a planting's NIR depth (mm/day) over its area (ha):
    /// volume (m³/day) = depth (mm) × area (ha) × 10 (FAO-56 Annex 1).
    pub fn from_depth_mm(
        block: impl Into<String>,
        crop: impl Into<String>,
        nir_mm_day: &[f64],
        area_ha: f64,
    ) -> Self {
        Self {
            block: block.into(),
            crop: crop.into(),
            nir_m3_day: nir_mm_day
                .iter()
                .map(|&d| depth_mm_over_area_ha_to_m3(d, area_ha))
                .collect(),
            application_efficiency: None,
        }
    }

    /// The same series with its own field application efficiency Ea
    /// (used instead of the block's for this series' GIR).
    #[must_use]
    pub fn with_application_efficiency(mut self, application_efficiency: f64) -> Self {
        self.application_efficiency = Some(application_efficiency);
        self
    }
}

/// Aggregation step for period tables.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum PeriodStep {
    /// Calendar 10-day periods: days 1–10, 11–20 and 21–end of each month.
    TenDay,
    /// Calendar months.
    Month,
}

/// Demand of one node over one period.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PeriodDemand {
    /// First calendar day of the period (even if the record starts later).
    pub start: NaiveDate,
    /// Calendar length of the period (days).
    pub period_days: u32,
    /// Days of the period covered by the record (less than `period_days` only
    /// at the ends of the record).
    pub covered_days: u32,
    /// Volume over the covered days (m³).
    pub volume_m3: f64,
    /// Mean continuous flow over the covered days (l/s).
    pub mean_flow_ls: f64,
    /// Depth over the commanded area (mm).
    pub depth_mm: f64,
}

impl PeriodDemand {
    /// Whether the record covers the whole period.
    pub fn is_complete(&self) -> bool {
        self.covered_days == self.period_days
    }
}

/// First day and calendar length (days) of the period containing `date`.
fn period_of(date: NaiveDate, step: PeriodStep) -> (NaiveDate, u32) {
    match step {
        PeriodStep::TenDay => {
            let p = TenDayPeriod::containing(date);
            (p.start(), p.length_days())
        }
        PeriodStep::Month => {
            let m = YearMonth::containing(date);
            (m.start(), m.length_days())
        }
    }
}

/// Aggregates a daily volume series (m³/day, from `start`) into calendar
/// periods: volume, mean continuous flow and depth over `area_ha`.
///
/// Periods cut by the ends of the record are kept with `covered_days` less
/// than `period_days`; their mean flow is over the covered days.
pub fn aggregate_periods(
    start: NaiveDate,
    series_m3_day: &[f64],
    step: PeriodStep,
    area_ha: f64,
) -> Vec<PeriodDemand> {
    let mut out: Vec<PeriodDemand> = Vec::new();
    let mut date = start;
    for &v in series_m3_day {
        let (ps, period_days) = period_of(date, step);
        match out.last_mut() {
            Some(last) if last.start == ps => {
                last.covered_days += 1;
                last.volume_m3 += v;
            }
            _ => out.push(PeriodDemand {
                start: ps,
                period_days,
                covered_days: 1,
                volume_m3: v,
                mean_flow_ls: 0.0,
                depth_mm: 0.0,
            }),
        }
        date = date.succ_opt().unwrap_or(date);
    }
    for p in &mut out {
        p.mean_flow_ls = m3_day_to_l_s(p.volume_m3 / f64::from(p.covered_days));
        p.depth_mm = depth_over_area_mm(p.volume_m3, area_ha);
    }
    out
}

/// Depth (mm) of a volume (m³) spread over an area (ha): V ÷ (10 A).
/// Zero when the area is zero.
fn depth_over_area_mm(volume_m3: f64, area_ha: f64) -> f64 {
    if area_ha > 0.0 {
        volume_m3 / (10.0 * area_ha)
    } else {
        0.0
    }
}

/// Daily demand at every node of a scheme, with breakdowns.
///
/// Arrays are flat, row-major: node × day, (node × crop) × day and
/// block × day; rows are canals in the network's order, then the headworks.
#[derive(Debug, Clone)]
pub struct SchemeDemand {
    network: Network,
    start: NaiveDate,
    days: usize,
    crops: Vec<String>,
    block_nir_m3_day: Vec<f64>,
    block_gir_m3_day: Vec<f64>,
    node_m3_day: Vec<f64>,
    node_crop_m3_day: Vec<f64>,
    /// Conveyance efficiency of each canal on each day (`[canal × days]`):
    /// the fixed Ec, or the day's efficiency from seepage.
    canal_efficiency_day: Vec<f64>,
}

/// Builds a [`SchemeDemand`] one NIR series at a time, so a caller can
/// drop each series once added instead of holding every planting's series
/// at once (the memory peak of large schemes). Adding the series in the
/// same order as [`SchemeDemand::compute`] gives the same result, bit for
/// bit.
#[derive(Debug)]
pub struct DemandAccumulator {
    network: Network,
    start: NaiveDate,
    days: usize,
    crops: Vec<String>,
    block_nir_m3_day: Vec<f64>,
    block_gir_m3_day: Vec<f64>,
    /// GIR at the canal each block takes from, per crop (`[crop][canal × days]`).
    canal_crop_m3_day: Vec<Vec<f64>>,
    problems: Vec<NetworkProblem>,
}

impl DemandAccumulator {
    /// An empty accumulator for series of `days` days from `start`.
    pub fn new(network: &Network, start: NaiveDate, days: usize) -> Self {
        let n_blocks = network.blocks().len();
        Self {
            network: network.clone(),
            start,
            days,
            crops: Vec::new(),
            block_nir_m3_day: vec![0.0; n_blocks * days],
            block_gir_m3_day: vec![0.0; n_blocks * days],
            canal_crop_m3_day: Vec::new(),
            problems: Vec::new(),
        }
    }

    /// Adds one series: its NIR to its block, its GIR = NIR ÷ (Ea × Eb)
    /// (with the series' Ea where it overrides the block's) to the block and
    /// to the (canal, crop) row of the canal the block takes from. A series
    /// with a problem is recorded for [`Self::finish`] and not added.
    pub fn add(&mut self, s: &NirSeries) {
        let days = self.days;
        let block = self.network.block_index(&s.block);
        if block.is_none() {
            self.problems.push(NetworkProblem::SeriesOnMissingBlock {
                block: s.block.clone(),
            });
        }
        if s.nir_m3_day.len() != days {
            self.problems.push(NetworkProblem::SeriesLength {
                block: s.block.clone(),
                crop: s.crop.clone(),
                expected: days,
                found: s.nir_m3_day.len(),
            });
        }
        if let Some((day, &value)) = s
            .nir_m3_day
            .iter()
            .enumerate()
            .find(|(_, v)| !(v.is_finite() && **v >= 0.0))
        {
            self.problems.push(NetworkProblem::BadRequirement {
                block: s.block.clone(),
                crop: s.crop.clone(),
                day,
                value,
            });
        }
        if let Some(ea) = s.application_efficiency
            && !(ea.is_finite() && ea > 0.0 && ea <= 1.0)
        {
            self.problems.push(NetworkProblem::EfficiencyOutOfRange {
                kind: "Ea",
                item: format!("{} ({})", s.block, s.crop),
                value: ea,
            });
        }
        let n_canals = self.network.canals().len();
        let c = if let Some(i) = self.crops.iter().position(|c| *c == s.crop) {
            i
        } else {
            self.crops.push(s.crop.clone());
            self.canal_crop_m3_day.push(vec![0.0; n_canals * days]);
            self.crops.len() - 1
        };
        let Some(b) = block else {
            return;
        };
        if !self.problems.is_empty() {
            // Nothing is computed once a problem is known: finish() fails.
            return;
        }
        let blk = &self.network.blocks()[b];
        let ea = s
            .application_efficiency
            .unwrap_or(blk.application_efficiency);
        let to_gir = 1.0 / (ea * blk.field_canal_efficiency);
        let canal = self.network.block_canal(b);
        let block_row = &mut self.block_nir_m3_day[b * days..(b + 1) * days];
        let block_gir_row = &mut self.block_gir_m3_day[b * days..(b + 1) * days];
        let node_row = &mut self.canal_crop_m3_day[c][canal * days..(canal + 1) * days];
        for (((nir_acc, block_gir_acc), gir_acc), &v) in block_row
            .iter_mut()
            .zip(block_gir_row.iter_mut())
            .zip(node_row.iter_mut())
            .zip(&s.nir_m3_day)
        {
            *nir_acc += v;
            *block_gir_acc += v * to_gir;
            *gir_acc += v * to_gir;
        }
    }

    /// Carries the canal sums up the tree (children first, each divided by
    /// its conveyance efficiency Ec) to the headworks.
    ///
    /// # Errors
    /// [`SchemeError::Invalid`] with every problem found while adding.
    pub fn finish(self) -> Result<SchemeDemand, SchemeError> {
        if !self.problems.is_empty() {
            return Err(SchemeError::Invalid(self.problems));
        }
        let Self {
            network,
            start,
            days,
            crops,
            block_nir_m3_day,
            block_gir_m3_day,
            canal_crop_m3_day,
            ..
        } = self;
        let n_canals = network.canals().len();
        let n_nodes = n_canals + 1;
        let n_crops = crops.len();
        let mut node_crop_m3_day = vec![0.0; n_nodes * n_crops * days];
        for (c, rows) in canal_crop_m3_day.into_iter().enumerate() {
            for canal in 0..n_canals {
                let at = (canal * n_crops + c) * days;
                node_crop_m3_day[at..at + days]
                    .copy_from_slice(&rows[canal * days..(canal + 1) * days]);
            }
        }
        // Canals, children first: divide the sum at the canal by its Ec, then
        // add it into the parent (or the headworks).
        let mut canal_efficiency_day = vec![0.0; n_canals * days];
        for &canal in network.upward_order() {
            let ec = network.canals()[canal].conveyance_efficiency;
            let day_ec = daily_efficiency(&network, canal, &node_crop_m3_day, n_crops, days)?;
            canal_efficiency_day[canal * days..(canal + 1) * days].copy_from_slice(&day_ec);
            let to = network.parent(canal).unwrap_or(n_canals);
            let (lo, hi) = node_crop_m3_day.split_at_mut(canal.max(to) * n_crops * days);
            let (src, dst) = if canal < to {
                (
                    &mut lo[canal * n_crops * days..(canal + 1) * n_crops * days],
                    &mut hi[..n_crops * days],
                )
            } else {
                (
                    &mut hi[..n_crops * days],
                    &mut lo[to * n_crops * days..(to + 1) * n_crops * days],
                )
            };
            if network.seepage(canal).is_some() {
                for (k, (s, d)) in src.iter_mut().zip(dst.iter_mut()).enumerate() {
                    *s /= day_ec[k % days];
                    *d += *s;
                }
            } else {
                for (s, d) in src.iter_mut().zip(dst.iter_mut()) {
                    *s /= ec;
                    *d += *s;
                }
            }
        }
        let mut node_m3_day = vec![0.0; n_nodes * days];
        for node in 0..n_nodes {
            let out = &mut node_m3_day[node * days..(node + 1) * days];
            for c in 0..n_crops {
                let at = (node * n_crops + c) * days;
                for (o, &v) in out.iter_mut().zip(&node_crop_m3_day[at..at + days]) {
                    *o += v;
                }
            }
        }
        Ok(SchemeDemand {
            network,
            start,
            days,
            crops,
            block_nir_m3_day,
            block_gir_m3_day,
            node_m3_day,
            node_crop_m3_day,
            canal_efficiency_day,
        })
    }
}

/// Each day's conveyance efficiency of `canal`: its fixed Ec, or, with a
/// seepage model, outflow ÷ inflow from
/// [`crate::section::seepage::inflow_with_seepage`] at the day's flow while
/// the canal runs (daily total ÷ running hours). The sum at the canal over
/// crops is its outflow (what its blocks and children take).
fn daily_efficiency(
    network: &Network,
    canal: usize,
    node_crop_m3_day: &[f64],
    n_crops: usize,
    days: usize,
) -> Result<Vec<f64>, SchemeError> {
    let c = &network.canals()[canal];
    let Some(seep) = network.seepage(canal) else {
        return Ok(vec![c.conveyance_efficiency; days]);
    };
    let running_s = c.hours_per_day * 3600.0;
    let mut out = vec![1.0; days];
    for (day, e) in out.iter_mut().enumerate() {
        let outflow_m3_day: f64 = (0..n_crops)
            .map(|k| node_crop_m3_day[(canal * n_crops + k) * days + day])
            .sum();
        let q = outflow_m3_day / running_s;
        let sol = crate::section::seepage::inflow_with_seepage(
            &seep.prism,
            seep.manning_n,
            seep.bed_slope,
            q,
            seep.rate_m3_m2_day,
            seep.length_m,
        )
        .map_err(|source| SchemeError::Seepage {
            canal: c.id.clone(),
            source,
        })?;
        *e = sol.efficiency;
    }
    Ok(out)
}

impl SchemeDemand {
    /// Computes the demand at every node from the NIR series of the plantings.
    ///
    /// `days` is the length of every series, counted from `start`. The same
    /// as adding each series to a [`DemandAccumulator`] and finishing it.
    ///
    /// # Errors
    /// [`SchemeError::Invalid`] listing every series on a missing block,
    /// every series of the wrong length, every negative or non-finite value
    /// (the first bad day of each series) and every efficiency override
    /// outside (0, 1].
    pub fn compute(
        network: &Network,
        start: NaiveDate,
        days: usize,
        nir: &[NirSeries],
    ) -> Result<Self, SchemeError> {
        let mut acc = DemandAccumulator::new(network, start, days);
        for s in nir {
            acc.add(s);
        }
        acc.finish()
    }

    /// The network the demand was computed on.
    pub fn network(&self) -> &Network {
        &self.network
    }

    /// First day of the series.
    pub fn start(&self) -> NaiveDate {
        self.start
    }

    /// Number of days.
    pub fn days(&self) -> usize {
        self.days
    }

    /// Date of day index `day`.
    pub fn date(&self, day: usize) -> NaiveDate {
        self.start + chrono::Days::new(day as u64)
    }

    /// Crop labels, in order of first appearance; indices for
    /// [`Self::crop_demand_m3_day`].
    pub fn crops(&self) -> &[String] {
        &self.crops
    }

    /// Conveyance efficiency of canal `canal` on each day: its fixed Ec, or
    /// the day's efficiency from seepage by wetted perimeter.
    pub fn canal_efficiency_day(&self, canal: usize) -> &[f64] {
        &self.canal_efficiency_day[canal * self.days..(canal + 1) * self.days]
    }

    /// Daily demand at a node (m³/day).
    pub fn demand_m3_day(&self, node: Node) -> &[f64] {
        let r = self.network.node_row(node);
        &self.node_m3_day[r * self.days..(r + 1) * self.days]
    }

    /// Daily demand at a node as a continuous flow (l/s).
    pub fn demand_ls(&self, node: Node) -> Vec<f64> {
        self.demand_m3_day(node)
            .iter()
            .map(|&v| m3_day_to_l_s(v))
            .collect()
    }

    /// Daily demand at a node as a depth over the area commanded below it (mm/day).
    pub fn demand_mm_day(&self, node: Node) -> Vec<f64> {
        let area = self.network.commanded_area_ha(node);
        self.demand_m3_day(node)
            .iter()
            .map(|&v| depth_over_area_mm(v, area))
            .collect()
    }

    /// Daily demand at a node due to one crop (m³/day); `crop` indexes [`Self::crops`].
    pub fn crop_demand_m3_day(&self, node: Node, crop: usize) -> &[f64] {
        let n_crops = self.crops.len();
        let at = (self.network.node_row(node) * n_crops + crop) * self.days;
        &self.node_crop_m3_day[at..at + self.days]
    }

    /// Daily NIR of a block (m³/day), all its plantings summed.
    pub fn block_nir_m3_day(&self, block: usize) -> &[f64] {
        &self.block_nir_m3_day[block * self.days..(block + 1) * self.days]
    }

    /// Daily GIR of a block at its outlet (m³/day): Σ over its series of
    /// NIR ÷ (Ea × Eb), each series with its own Ea where it overrides the
    /// block's.
    pub fn block_gir_m3_day(&self, block: usize) -> Vec<f64> {
        self.block_gir_slice_m3_day(block).to_vec()
    }

    /// [`Self::block_gir_m3_day`] without a copy.
    pub fn block_gir_slice_m3_day(&self, block: usize) -> &[f64] {
        &self.block_gir_m3_day[block * self.days..(block + 1) * self.days]
    }

    /// Blocks served through `node`.
    pub fn blocks_below(&self, node: Node) -> Vec<usize> {
        (0..self.network.blocks().len())
            .filter(|&b| self.network.block_is_below(b, node))
            .collect()
    }

    /// Share of block `block` in the demand at `node` (m³/day): its GIR ÷
    /// Π Ec up to the node, i.e. Σ over its series of NIR ÷ (Ea × Eb × Π Ec).
    /// `None` when the block is not below it. Over all blocks below a node
    /// these add up to the node's demand.
    pub fn block_share_m3_day(&self, node: Node, block: usize) -> Option<Vec<f64>> {
        let k = self.network.conveyance_factor(block, node)?;
        Some(
            self.block_gir_slice_m3_day(block)
                .iter()
                .map(|&v| v * k)
                .collect(),
        )
    }

    /// Shares the water delivered at a node's head among the blocks below
    /// it, day by day, in proportion to their demand: on a day with demand
    /// Dₙ and delivery Vₙ at the node, each block's outlet receives
    /// GIR × min(Vₙ ÷ Dₙ, 1) (conveyance losses are taken in proportion, as
    /// in the demand). Days without demand deliver nothing.
    ///
    /// Returns (block index, delivered at the outlet m³/day) for each block
    /// below the node; × Ea × Eb gives the water reaching the root zone, for
    /// re-running a block's water balance on delivered water.
    ///
    /// # Errors
    /// [`SchemeError::Invalid`] when `delivered_m3_day` does not have one
    /// value per day, or holds a negative or non-finite value.
    pub fn delivered_to_blocks_m3_day(
        &self,
        node: Node,
        delivered_m3_day: &[f64],
    ) -> Result<Vec<(usize, Vec<f64>)>, SchemeError> {
        let name = self.network.node_name(node).to_owned();
        if delivered_m3_day.len() != self.days {
            return Err(SchemeError::Invalid(vec![NetworkProblem::SeriesLength {
                block: name,
                crop: "delivered".into(),
                expected: self.days,
                found: delivered_m3_day.len(),
            }]));
        }
        if let Some((day, &value)) = delivered_m3_day
            .iter()
            .enumerate()
            .find(|(_, v)| !(v.is_finite() && **v >= 0.0))
        {
            return Err(SchemeError::Invalid(vec![NetworkProblem::BadRequirement {
                block: name,
                crop: "delivered".into(),
                day,
                value,
            }]));
        }
        let node_demand = self.demand_m3_day(node);
        let ratio: Vec<f64> = node_demand
            .iter()
            .zip(delivered_m3_day)
            .map(|(&d, &v)| if d > 0.0 { (v / d).min(1.0) } else { 0.0 })
            .collect();
        Ok(self
            .blocks_below(node)
            .into_iter()
            .map(|b| {
                let gir = self.block_gir_slice_m3_day(b);
                (b, gir.iter().zip(&ratio).map(|(g, r)| g * r).collect())
            })
            .collect())
    }

    /// 10-day or monthly table of a node's demand.
    pub fn periods(&self, node: Node, step: PeriodStep) -> Vec<PeriodDemand> {
        aggregate_periods(
            self.start,
            self.demand_m3_day(node),
            step,
            self.network.commanded_area_ha(node),
        )
    }

    /// 10-day or monthly table of one crop's share of a node's demand.
    pub fn crop_periods(&self, node: Node, crop: usize, step: PeriodStep) -> Vec<PeriodDemand> {
        aggregate_periods(
            self.start,
            self.crop_demand_m3_day(node, crop),
            step,
            self.network.commanded_area_ha(node),
        )
    }
}

/// Daily evaporation loss from a storage reservoir (m³/day).
///
/// loss = E × A × 10, with E the open-water evaporation depth of the day
/// (mm/day, from the open-water module: Meyer, Rohwer or Penman) and A the
/// reservoir's surface area in the day's month (ha); 1 mm on 1 ha = 10 m³
/// (FAO-56 Annex 1). The loss is reported beside the headworks demand: the
/// reservoir supplies both, the canals carry only the demand. Rain on the
/// reservoir is not deducted.
///
/// `surface_area_ha_by_month[0]` is January.
///
/// # Errors
/// [`SchemeError::BadStorageInput`] for a negative or non-finite area or
/// evaporation depth, naming the month or day.
pub fn storage_losses_m3_day(
    start: NaiveDate,
    surface_area_ha_by_month: &[f64; 12],
    evaporation_mm_day: &[f64],
) -> Result<Vec<f64>, SchemeError> {
    if let Some((m, &a)) = surface_area_ha_by_month
        .iter()
        .enumerate()
        .find(|(_, a)| !(a.is_finite() && **a >= 0.0))
    {
        return Err(SchemeError::BadStorageInput {
            what: format!("surface area in month {}", m + 1),
            value: a,
        });
    }
    let mut out = Vec::with_capacity(evaporation_mm_day.len());
    let mut date = start;
    for (day, &e) in evaporation_mm_day.iter().enumerate() {
        if !(e.is_finite() && e >= 0.0) {
            return Err(SchemeError::BadStorageInput {
                what: format!("evaporation on day {day} ({date})"),
                value: e,
            });
        }
        let area = surface_area_ha_by_month[date.month0() as usize];
        out.push(depth_mm_over_area_ha_to_m3(e, area));
        date = date.succ_opt().unwrap_or(date);
    }
    Ok(out)
}
