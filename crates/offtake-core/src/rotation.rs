//! Rotation rosters: sharing a short supply at a node among its child canals
//! or blocks in turns, and the supply indicators that judge the result.
//!
//! # Method
//!
//! The period is cut into cycles of the chosen rotation period (the last cycle
//! may be shorter). In each cycle of length T with mean available flow Qa and
//! unit demands Dᵢ (m³ over the cycle, ΣDᵢ = D):
//!
//! - if Qa·T ≥ D the supply suffices and every unit takes its demand
//!   continuously (the continuous-flow alternative, see
//!   [`continuous_flow_roster`]);
//! - otherwise units are grouped into turns g. A turn lasts T·D_g/D and in it
//!   the whole of Qa is split among its members in proportion to demand,
//!   qᵢ = Qa·Dᵢ/D_g. Every unit therefore receives the same share Qa·T/D of
//!   its demand, and the turn volumes of a cycle add up to Qa·T.
//!
//! Turns are as small as the capacities allow (a bigger stream per unit is
//! easier to apply): a turn needs D_g ≥ Qa·Dᵢ/capᵢ for each member so that
//! qᵢ ≤ capᵢ. Units are taken in decreasing order of that need and added to a
//! turn until it is met; leftovers that cannot make a turn of their own join
//! the last turn formed.
//!
//! A rotation period longer than the time a crop takes to use its readily
//! available water (RAW ÷ ETc, FAO-56 Chapter 8) is reported as a warning:
//! the crop would be stressed between turns.
//!
//! Relative irrigation supply and relative water supply (Levine 1982) are
//! given as functions.
//!
//! Results are planning estimates to be checked against field conditions.

use std::fmt;

use chrono::{NaiveDate, NaiveDateTime, TimeDelta};
use serde::{Deserialize, Serialize};

use crate::scheme::{Node, SchemeDemand};
use crate::units::{SECONDS_PER_DAY, l_s_to_m3_day, m3_day_to_l_s};

/// A child canal or block that takes part in the rotation.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RotationUnit {
    /// Canal or block name.
    pub name: String,
    /// Demand at the unit's head (m³/day), one value per day of the period.
    pub demand_m3_day: Vec<f64>,
    /// Capacity of the unit's head (l/s), if limited.
    pub capacity_ls: Option<f64>,
    /// Readily available water of the unit's crop (mm), for the rotation
    /// period warning; `None` skips the check.
    pub raw_mm: Option<f64>,
    /// Crop evapotranspiration ETc (mm/day) used with `raw_mm`; the peak of
    /// the period is the safe choice.
    pub etc_mm_day: Option<f64>,
}

/// Flow available at the node.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub enum AvailableFlow {
    /// The same flow every day (l/s).
    Constant(f64),
    /// One flow per day of the period (l/s).
    Daily(Vec<f64>),
}

impl AvailableFlow {
    fn on_day(&self, day: usize) -> f64 {
        match self {
            Self::Constant(q) => *q,
            Self::Daily(v) => v.get(day).copied().unwrap_or(0.0),
        }
    }
}

/// How a cycle was served.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum CycleMode {
    /// Supply short: units took turns.
    Rotation,
    /// Supply sufficient (or continuous flow asked for): every unit took its
    /// demand continuously, scaled down on any day the supply fell short.
    Continuous,
}

/// One line of the roster: one unit in one turn.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RosterEntry {
    /// Cycle number, from 1.
    pub cycle: usize,
    /// Turn number within the cycle, from 1.
    pub turn: usize,
    /// Unit index in the input.
    pub unit: usize,
    /// Unit name.
    pub unit_name: String,
    /// Start of the turn (rounded to the second).
    pub start: NaiveDateTime,
    /// End of the turn (rounded to the second).
    pub end: NaiveDateTime,
    /// Flow into the unit during the turn (l/s).
    pub flow_ls: f64,
    /// Volume delivered to the unit in the turn (m³).
    pub volume_m3: f64,
}

/// Summary of one cycle.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RosterCycle {
    /// Cycle number, from 1.
    pub cycle: usize,
    /// First day of the cycle.
    pub start: NaiveDate,
    /// Length in days.
    pub days: usize,
    /// How the cycle was served.
    pub mode: CycleMode,
    /// Mean available flow over the cycle (l/s).
    pub available_flow_ls: f64,
    /// Available volume over the cycle (m³).
    pub available_volume_m3: f64,
    /// Demand of all units over the cycle (m³).
    pub demand_volume_m3: f64,
    /// Volume delivered over the cycle (m³).
    pub delivered_volume_m3: f64,
}

/// A warning about the roster; the roster is still usable.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum RosterWarning {
    /// The rotation period is longer than the time the unit's crop takes to
    /// use its readily available water (RAW ÷ ETc).
    RotationLongerThanRaw {
        /// Unit name.
        unit: String,
        /// The rotation period (days).
        rotation_days: u32,
        /// RAW ÷ ETc (days).
        raw_days: f64,
    },
    /// In continuous flow a unit's demand exceeded its capacity on some days;
    /// it was given its capacity.
    CapacityLimited {
        /// Unit name.
        unit: String,
        /// Days on which the capacity limited the flow.
        days: usize,
    },
}

impl fmt::Display for RosterWarning {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::RotationLongerThanRaw {
                unit,
                rotation_days,
                raw_days,
            } => write!(
                f,
                "`{unit}`: rotation period {rotation_days} days is longer than RAW ÷ ETc = {raw_days:.1} days; the crop will be stressed between turns"
            ),
            Self::CapacityLimited { unit, days } => write!(
                f,
                "`{unit}`: demand exceeded the capacity on {days} days; flow held at capacity"
            ),
        }
    }
}

/// One problem in the rotation input.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum RotationProblem {
    /// No unit was given.
    NoUnits,
    /// The period has no day.
    NoDays,
    /// The rotation period is zero days.
    ZeroRotationPeriod,
    /// A unit's demand series has the wrong length.
    DemandLength {
        /// Unit name.
        unit: String,
        /// Days expected (those of the first unit).
        expected: usize,
        /// Days found.
        found: usize,
    },
    /// A demand value is negative or not finite.
    BadDemand {
        /// Unit name.
        unit: String,
        /// Day index.
        day: usize,
        /// Value found (m³/day).
        value: f64,
    },
    /// A capacity, RAW or ETc is not a positive finite number.
    BadUnitValue {
        /// Unit name.
        unit: String,
        /// Which value.
        what: &'static str,
        /// Value found.
        value: f64,
    },
    /// The available flow series has the wrong length.
    AvailableLength {
        /// Days expected.
        expected: usize,
        /// Days found.
        found: usize,
    },
    /// An available flow is negative or not finite.
    BadAvailable {
        /// Day index.
        day: usize,
        /// Value found (l/s).
        value: f64,
    },
}

impl fmt::Display for RotationProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::NoUnits => write!(f, "no canal or block to rotate among"),
            Self::NoDays => write!(f, "the rotation period covers no day"),
            Self::ZeroRotationPeriod => write!(f, "rotation period is 0 days, expected at least 1"),
            Self::DemandLength {
                unit,
                expected,
                found,
            } => write!(f, "`{unit}`: demand has {found} days, expected {expected}"),
            Self::BadDemand { unit, day, value } => write!(
                f,
                "`{unit}`, day {day}: demand = {value} m³/day, expected a finite value >= 0"
            ),
            Self::BadUnitValue { unit, what, value } => {
                write!(f, "`{unit}`: {what} = {value}, expected a positive number")
            }
            Self::AvailableLength { expected, found } => {
                write!(f, "available flow has {found} days, expected {expected}")
            }
            Self::BadAvailable { day, value } => write!(
                f,
                "day {day}: available flow = {value} l/s, expected a finite value >= 0"
            ),
        }
    }
}

/// Errors of the rotation roster.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum RotationError {
    /// The input has problems; every one is listed.
    #[error("invalid rotation input:\n{}", list(.0))]
    Invalid(Vec<RotationProblem>),
    /// Even all units together cannot take the available flow without one
    /// exceeding its capacity.
    #[error(
        "cycle {cycle}: unit `{unit}` would need {share_ls:.1} l/s with every unit open, above its capacity {capacity_ls:.1} l/s; reduce the flow released to this node"
    )]
    CapacityTooSmall {
        /// Cycle number, from 1.
        cycle: usize,
        /// Unit name.
        unit: String,
        /// Its proportional share of the available flow (l/s).
        share_ls: f64,
        /// Its capacity (l/s).
        capacity_ls: f64,
    },
    /// A turn's time falls outside the calendar (or is not a number): the
    /// demands or flows are beyond any real scheme.
    #[error(
        "a turn would start or end {seconds} s after the roster's start, outside the calendar; check the efficiencies, hours and flows of the units"
    )]
    TimeOutOfRange {
        /// Seconds from the roster's start.
        seconds: f64,
    },
}

fn list(problems: &[RotationProblem]) -> String {
    problems
        .iter()
        .map(|p| format!("  - {p}"))
        .collect::<Vec<_>>()
        .join("\n")
}

/// A dated roster with the water each unit receives.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Roster {
    /// First day of the period.
    pub start: NaiveDate,
    /// Days in the period.
    pub days: usize,
    /// Unit names, in input order.
    pub units: Vec<String>,
    /// Roster lines in time order.
    pub entries: Vec<RosterEntry>,
    /// One summary per cycle.
    pub cycles: Vec<RosterCycle>,
    /// Delivered volume per unit per day (m³/day), unit × day, row-major.
    pub delivered_m3_day: Vec<f64>,
    /// Demand per unit per day (m³/day), unit × day, row-major (copied from
    /// the input for the supply indicators).
    pub demand_m3_day: Vec<f64>,
    /// Warnings.
    pub warnings: Vec<RosterWarning>,
}

impl Roster {
    /// Delivered volume of unit `unit` per day (m³/day).
    pub fn delivered_m3_day(&self, unit: usize) -> &[f64] {
        &self.delivered_m3_day[unit * self.days..(unit + 1) * self.days]
    }

    /// Relative irrigation supply of unit `unit` over the whole period
    /// (delivered ÷ demand); `None` when it had no demand.
    pub fn relative_irrigation_supply(&self, unit: usize) -> Option<f64> {
        let row = unit * self.days..(unit + 1) * self.days;
        relative_irrigation_supply(
            self.delivered_m3_day[row.clone()].iter().sum(),
            self.demand_m3_day[row].iter().sum(),
        )
    }
}

/// The units that rotate at a node: its child canals (main canals for the
/// headworks) and the blocks taking directly from it, with their demand over
/// the days `days` of `demand`.
///
/// Demands and capacities are expressed at the node's head, like the
/// available flow: a child's demand (or a child canal's existing capacity)
/// ÷ the node's own conveyance efficiency Ec (1 at the headworks). RAW and
/// ETc are left empty for the caller to fill per block.
pub fn units_at_node(
    demand: &SchemeDemand,
    node: Node,
    days: std::ops::Range<usize>,
) -> Vec<RotationUnit> {
    let network = demand.network();
    let ec = match node {
        Node::Headworks => 1.0,
        Node::Canal(c) => network.canals()[c].conveyance_efficiency,
    };
    let days = days.start.min(demand.days())..days.end.min(demand.days());
    let mut units: Vec<RotationUnit> = network
        .child_canals(node)
        .into_iter()
        .map(|c| {
            let canal = &network.canals()[c];
            RotationUnit {
                name: canal.id.clone(),
                demand_m3_day: demand.demand_m3_day(Node::Canal(c))[days.clone()]
                    .iter()
                    .map(|v| v / ec)
                    .collect(),
                capacity_ls: canal.existing_capacity_m3s.map(|q| q * 1000.0 / ec),
                raw_mm: None,
                etc_mm_day: None,
            }
        })
        .collect();
    if let Node::Canal(c) = node {
        for b in network.child_blocks(c) {
            units.push(RotationUnit {
                name: network.blocks()[b].name.clone(),
                demand_m3_day: demand.block_gir_m3_day(b)[days.clone()]
                    .iter()
                    .map(|v| v / ec)
                    .collect(),
                capacity_ls: None,
                raw_mm: None,
                etc_mm_day: None,
            });
        }
    }
    units
}

/// Relative irrigation supply: delivered irrigation water ÷ irrigation demand
/// (DESIGN.md; Levine 1982). Any consistent units. `None` when the demand is
/// not positive.
pub fn relative_irrigation_supply(delivered: f64, demand: f64) -> Option<f64> {
    (demand > 0.0 && delivered.is_finite()).then(|| delivered / demand)
}

/// Relative water supply (Levine 1982):
/// RWS = (irrigation + rain) ÷ (ETc + seepage and percolation), all in mm
/// over the same area and period. `None` when the denominator is not
/// positive. Values above 1 mean supply exceeds the crop's need.
pub fn relative_water_supply(
    irrigation_mm: f64,
    rain_mm: f64,
    etc_mm: f64,
    seepage_percolation_mm: f64,
) -> Option<f64> {
    let need = etc_mm + seepage_percolation_mm;
    let supply = irrigation_mm + rain_mm;
    (need > 0.0 && supply.is_finite()).then(|| supply / need)
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Policy {
    Auto,
    Continuous,
}

/// Builds a rotation roster for `units` sharing `available` flow at a node,
/// from 00:00 on `start`, in cycles of `rotation_period_days`.
///
/// Cycles whose available volume covers their demand are served by
/// continuous flow; the others rotate (see the module documentation).
///
/// # Errors
/// [`RotationError::Invalid`] listing every input problem;
/// [`RotationError::CapacityTooSmall`] when the available flow cannot be
/// taken even with every unit open.
pub fn rotation_roster(
    start: NaiveDate,
    units: &[RotationUnit],
    available: &AvailableFlow,
    rotation_period_days: u32,
) -> Result<Roster, RotationError> {
    build(start, units, available, rotation_period_days, Policy::Auto)
}

/// The continuous-flow alternative: every unit takes its demand continuously
/// each day, scaled down in proportion on days the available flow falls
/// short, and held at its capacity. Cycles of `rotation_period_days` are kept
/// only as reporting periods.
///
/// # Errors
/// [`RotationError::Invalid`] listing every input problem.
pub fn continuous_flow_roster(
    start: NaiveDate,
    units: &[RotationUnit],
    available: &AvailableFlow,
    rotation_period_days: u32,
) -> Result<Roster, RotationError> {
    build(
        start,
        units,
        available,
        rotation_period_days,
        Policy::Continuous,
    )
}

fn validate(
    units: &[RotationUnit],
    available: &AvailableFlow,
    rotation_period_days: u32,
) -> Vec<RotationProblem> {
    let mut problems = Vec::new();
    if units.is_empty() {
        problems.push(RotationProblem::NoUnits);
    }
    if rotation_period_days == 0 {
        problems.push(RotationProblem::ZeroRotationPeriod);
    }
    let days = units.first().map_or(0, |u| u.demand_m3_day.len());
    if !units.is_empty() && days == 0 {
        problems.push(RotationProblem::NoDays);
    }
    for u in units {
        if u.demand_m3_day.len() != days {
            problems.push(RotationProblem::DemandLength {
                unit: u.name.clone(),
                expected: days,
                found: u.demand_m3_day.len(),
            });
        }
        if let Some((day, &value)) = u
            .demand_m3_day
            .iter()
            .enumerate()
            .find(|(_, v)| !(v.is_finite() && **v >= 0.0))
        {
            problems.push(RotationProblem::BadDemand {
                unit: u.name.clone(),
                day,
                value,
            });
        }
        for (what, v) in [
            ("capacity (l/s)", u.capacity_ls),
            ("RAW (mm)", u.raw_mm),
            ("ETc (mm/day)", u.etc_mm_day),
        ] {
            if let Some(value) = v
                && !(value.is_finite() && value > 0.0)
            {
                problems.push(RotationProblem::BadUnitValue {
                    unit: u.name.clone(),
                    what,
                    value,
                });
            }
        }
    }
    match available {
        AvailableFlow::Constant(q) => {
            if !(q.is_finite() && *q >= 0.0) {
                problems.push(RotationProblem::BadAvailable { day: 0, value: *q });
            }
        }
        AvailableFlow::Daily(v) => {
            if v.len() != days {
                problems.push(RotationProblem::AvailableLength {
                    expected: days,
                    found: v.len(),
                });
            }
            if let Some((day, &value)) = v
                .iter()
                .enumerate()
                .find(|(_, q)| !(q.is_finite() && **q >= 0.0))
            {
                problems.push(RotationProblem::BadAvailable { day, value });
            }
        }
    }
    problems
}

/// `origin` + `seconds`, checked: a time that is not finite or falls outside
/// the calendar is an error, never a panic.
fn at_seconds(origin: NaiveDateTime, seconds: f64) -> Result<NaiveDateTime, RotationError> {
    let out_of_range = || RotationError::TimeOutOfRange { seconds };
    // i64 seconds far beyond any calendar: TimeDelta refuses them below.
    if !(seconds.is_finite() && seconds.abs() < 9.0e15) {
        return Err(out_of_range());
    }
    // Bounded by 9e15 just above, well inside i64.
    let whole = seconds.round() as i64;
    TimeDelta::try_seconds(whole)
        .and_then(|d| origin.checked_add_signed(d))
        .ok_or_else(out_of_range)
}

/// Adds `volume` spread evenly over the time span [t0, t1) (seconds from the
/// period start) into the daily row.
fn spread(row: &mut [f64], t0: f64, t1: f64, volume: f64) {
    if t1 <= t0 {
        return;
    }
    let rate = volume / (t1 - t0);
    let first = (t0 / SECONDS_PER_DAY).floor() as usize;
    let mut day = first;
    while day < row.len() {
        let d0 = day as f64 * SECONDS_PER_DAY;
        let d1 = d0 + SECONDS_PER_DAY;
        if d0 >= t1 {
            break;
        }
        let overlap = t1.min(d1) - t0.max(d0);
        if overlap > 0.0 {
            row[day] += rate * overlap;
        }
        day += 1;
    }
}

fn build(
    start: NaiveDate,
    units: &[RotationUnit],
    available: &AvailableFlow,
    rotation_period_days: u32,
    policy: Policy,
) -> Result<Roster, RotationError> {
    let problems = validate(units, available, rotation_period_days);
    if !problems.is_empty() {
        return Err(RotationError::Invalid(problems));
    }
    let n = units.len();
    let days = units[0].demand_m3_day.len();
    let period = rotation_period_days as usize;
    let origin = start.and_time(chrono::NaiveTime::MIN);
    let mut demand_m3_day = Vec::with_capacity(n * days);
    for u in units {
        demand_m3_day.extend_from_slice(&u.demand_m3_day);
    }
    let mut delivered = vec![0.0; n * days];
    let mut entries = Vec::new();
    let mut cycles = Vec::new();
    let mut warnings = Vec::new();
    let mut capacity_limited = vec![0usize; n];

    for u in units {
        if let (Some(raw), Some(etc)) = (u.raw_mm, u.etc_mm_day) {
            let raw_days = raw / etc;
            if f64::from(rotation_period_days) > raw_days {
                warnings.push(RosterWarning::RotationLongerThanRaw {
                    unit: u.name.clone(),
                    rotation_days: rotation_period_days,
                    raw_days,
                });
            }
        }
    }

    let mut cycle_no = 0;
    let mut d0 = 0;
    while d0 < days {
        cycle_no += 1;
        let d1 = (d0 + period).min(days);
        let len = d1 - d0;
        let t0 = d0 as f64 * SECONDS_PER_DAY;
        let cycle_s = len as f64 * SECONDS_PER_DAY;
        let available_volume: f64 = (d0..d1).map(|d| l_s_to_m3_day(available.on_day(d))).sum();
        let qa_ls = m3_day_to_l_s(available_volume / len as f64);
        let unit_demand: Vec<f64> = units
            .iter()
            .map(|u| u.demand_m3_day[d0..d1].iter().sum())
            .collect();
        let total: f64 = unit_demand.iter().sum();
        let rotate = policy == Policy::Auto && available_volume < total;
        let mut cycle_delivered = 0.0;
        if rotate {
            let turns = group_turns(units, &unit_demand, qa_ls, cycle_no)?;
            let qa_m3_s = qa_ls / 1000.0;
            let mut cum = 0.0;
            for (t, members) in turns.iter().enumerate() {
                let dg: f64 = members.iter().map(|&i| unit_demand[i]).sum();
                let s0 = t0 + cycle_s * cum / total;
                cum += dg;
                let s1 = t0 + cycle_s * cum / total;
                for &i in members {
                    let flow_ls = qa_ls * unit_demand[i] / dg;
                    let volume = qa_m3_s * (unit_demand[i] / dg) * (cycle_s * dg / total);
                    spread(&mut delivered[i * days..(i + 1) * days], s0, s1, volume);
                    cycle_delivered += volume;
                    entries.push(RosterEntry {
                        cycle: cycle_no,
                        turn: t + 1,
                        unit: i,
                        unit_name: units[i].name.clone(),
                        start: at_seconds(origin, s0)?,
                        end: at_seconds(origin, s1)?,
                        flow_ls,
                        volume_m3: volume,
                    });
                }
            }
        } else {
            let mut unit_volume = vec![0.0; n];
            for d in d0..d1 {
                let avail = l_s_to_m3_day(available.on_day(d));
                let need: f64 = units.iter().map(|u| u.demand_m3_day[d]).sum();
                let scale = if need > avail && need > 0.0 {
                    avail / need
                } else {
                    1.0
                };
                for (i, u) in units.iter().enumerate() {
                    let mut v = u.demand_m3_day[d] * scale;
                    if let Some(cap) = u.capacity_ls {
                        let cap_m3 = l_s_to_m3_day(cap);
                        if v > cap_m3 {
                            v = cap_m3;
                            capacity_limited[i] += 1;
                        }
                    }
                    delivered[i * days + d] = v;
                    unit_volume[i] += v;
                }
            }
            for (i, u) in units.iter().enumerate() {
                if unit_volume[i] > 0.0 {
                    cycle_delivered += unit_volume[i];
                    entries.push(RosterEntry {
                        cycle: cycle_no,
                        turn: 1,
                        unit: i,
                        unit_name: u.name.clone(),
                        start: at_seconds(origin, t0)?,
                        end: at_seconds(origin, t0 + cycle_s)?,
                        flow_ls: m3_day_to_l_s(unit_volume[i] / len as f64),
                        volume_m3: unit_volume[i],
                    });
                }
            }
        }
        cycles.push(RosterCycle {
            cycle: cycle_no,
            start: start.checked_add_days(chrono::Days::new(d0 as u64)).ok_or(
                RotationError::TimeOutOfRange {
                    seconds: d0 as f64 * SECONDS_PER_DAY,
                },
            )?,
            days: len,
            mode: if rotate {
                CycleMode::Rotation
            } else {
                CycleMode::Continuous
            },
            available_flow_ls: qa_ls,
            available_volume_m3: available_volume,
            demand_volume_m3: total,
            delivered_volume_m3: cycle_delivered,
        });
        d0 = d1;
    }
    for (i, &count) in capacity_limited.iter().enumerate() {
        if count > 0 {
            warnings.push(RosterWarning::CapacityLimited {
                unit: units[i].name.clone(),
                days: count,
            });
        }
    }
    Ok(Roster {
        start,
        days,
        units: units.iter().map(|u| u.name.clone()).collect(),
        entries,
        cycles,
        delivered_m3_day: delivered,
        demand_m3_day,
        warnings,
    })
}

/// Groups the units with demand into turns (see the module documentation).
/// Turns are returned in order of their first member's input position, and
/// members in input order.
fn group_turns(
    units: &[RotationUnit],
    unit_demand: &[f64],
    qa_ls: f64,
    cycle: usize,
) -> Result<Vec<Vec<usize>>, RotationError> {
    // need_i: the smallest turn demand D_g for which q_i = Qa·D_i/D_g ≤ cap_i.
    let need = |i: usize| -> f64 {
        units[i]
            .capacity_ls
            .map_or(0.0, |cap| qa_ls * unit_demand[i] / cap)
    };
    let mut order: Vec<usize> = (0..units.len()).filter(|&i| unit_demand[i] > 0.0).collect();
    let total: f64 = order.iter().map(|&i| unit_demand[i]).sum();
    if let Some(&worst) = order.iter().max_by(|&&a, &&b| need(a).total_cmp(&need(b)))
        && need(worst) > total * (1.0 + 1e-12)
    {
        return Err(RotationError::CapacityTooSmall {
            cycle,
            unit: units[worst].name.clone(),
            share_ls: qa_ls * unit_demand[worst] / total,
            capacity_ls: units[worst].capacity_ls.unwrap_or(f64::INFINITY),
        });
    }
    order.sort_by(|&a, &b| need(b).total_cmp(&need(a)).then(a.cmp(&b)));
    let mut turns: Vec<Vec<usize>> = Vec::new();
    let mut current: Vec<usize> = Vec::new();
    let mut current_demand = 0.0;
    let mut current_need = 0.0;
    for i in order {
        if current.is_empty() {
            current_need = need(i);
        }
        current.push(i);
        current_demand += unit_demand[i];
        if current_demand >= current_need {
            turns.push(std::mem::take(&mut current));
            current_demand = 0.0;
        }
    }
    if !current.is_empty() {
        match turns.last_mut() {
            Some(last) => last.extend(current),
            None => turns.push(current),
        }
    }
    for t in &mut turns {
        t.sort_unstable();
    }
    turns.sort_by_key(|t| t[0]);
    Ok(turns)
}
