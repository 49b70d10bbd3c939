//! Design values of every node: yearly peaks, the design flow at a chosen
//! non-exceedance probability, duty, required capacity, and the shortfall
//! against an existing capacity.
//!
//! # Definitions (DESIGN.md, "Definitions we hold to")
//!
//! Over every complete irrigation year of the record (incomplete years at
//! the ends are left out), per node:
//!
//! - peak daily flow (reported only);
//! - peak 10-day flow: the largest mean flow of a calendar 10-day period
//!   (days 1–10, 11–20, 21–end), its volume ÷ its 8–11 days;
//! - peak monthly flow, likewise over calendar months;
//! - seasonal volume and delta (the volume as a depth over the commanded
//!   area).
//!
//! Design flow = the chosen non-exceedance probability (default 80 %) of the
//! yearly peaks of the design basis (10-day by default; monthly or daily on
//! request), with Weibull plotting positions m/(n+1) interpolated between
//! ranks ([`crate::stats`]). The design year is the year whose peak is
//! closest to the design flow.
//!
//! With each design flow, a distribution-free confidence interval of the
//! quantile from the order statistics of the yearly peaks (binomial ranks,
//! Hahn and Meeker 1991; [`crate::stats::interval`]), at a nominal level of
//! 90 % by default: it says how far the design flow could move with another
//! record of the same length.
//!
//! Duty = design flow ÷ area commanded below the node (l/s/ha; also ha per
//! m³/s). Required capacity = design flow × 24 ÷ hours of operation per day
//! (published-check-values §10.3).
//!
//! # Shortfall against an existing capacity
//!
//! The shortfall follows the design basis ([`capacity_shortfall_on_basis`]):
//! with the default 10-day basis a calendar 10-day period is short when its
//! mean flow exceeds what the canal can carry (capacity × hours ÷ 24 as a
//! continuous flow), and the volume not delivered is Σ (mean − capacity) ×
//! the period's days. Daily peaks of refill-style schedules (a whole block
//! irrigated in one day) are never the default basis (issue 5): the days on
//! which the daily demand exceeds the capacity are reported too, labelled as
//! daily peaks, for information.
//!
//! Results are planning estimates: canal and structure designs must be
//! checked by a qualified engineer against local codes and measured data.

use chrono::NaiveDate;
use serde::{Deserialize, Serialize};

use super::SchemeError;
use super::demand::SchemeDemand;
use super::network::{NetworkProblem, Node};
use crate::calendar::{IrrigationYear, TenDayPeriod, YearMonth, YearStart, year_coverage};
use crate::stats::{Probability, QuantileInterval, RankedSample, design_year};
use crate::units::{SECONDS_PER_DAY, m3_day_to_l_s};

/// The yearly peak the design flow is taken from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
pub enum DesignBasis {
    /// Peak calendar 10-day mean flow (the default).
    #[default]
    TenDay,
    /// Peak calendar-month mean flow (large schemes).
    Monthly,
    /// Peak daily flow (small continuous-flow schemes).
    Daily,
}

impl DesignBasis {
    /// Label of the averaging period: `10-day`, `monthly` or `daily`.
    pub fn label(self) -> &'static str {
        match self {
            Self::TenDay => "10-day",
            Self::Monthly => "monthly",
            Self::Daily => "daily",
        }
    }

    /// Plural noun of the periods: `10-day periods`, `months` or `days`.
    pub fn periods_noun(self) -> &'static str {
        match self {
            Self::TenDay => "10-day periods",
            Self::Monthly => "months",
            Self::Daily => "days",
        }
    }
}

/// Options of the design-value computation.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct DesignOptions {
    /// Month (1–12) on whose 1st the irrigation year starts.
    pub year_start_month: u32,
    /// Non-exceedance probability of the design flow, a fraction in [0, 1]
    /// (0.8 = the flow not exceeded in 80 % of years).
    pub non_exceedance: f64,
    /// Which yearly peak the design flow is taken from.
    pub basis: DesignBasis,
    /// Hours of operation per day at the headworks, in (0, 24].
    pub headworks_hours_per_day: f64,
    /// Existing capacity of the headworks (m³/s), if any.
    pub headworks_capacity_m3s: Option<f64>,
    /// Nominal level of the design flow's confidence interval, a fraction
    /// in (0, 1) (default 0.9).
    pub confidence_level: f64,
}

/// Default nominal level of the design-flow confidence interval (90 %).
pub const DEFAULT_CONFIDENCE_LEVEL: f64 = 0.9;

impl Default for DesignOptions {
    fn default() -> Self {
        Self {
            year_start_month: 1,
            non_exceedance: 0.8,
            basis: DesignBasis::TenDay,
            headworks_hours_per_day: 24.0,
            headworks_capacity_m3s: None,
            confidence_level: DEFAULT_CONFIDENCE_LEVEL,
        }
    }
}

/// Values of one node in one complete irrigation year.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct YearValues {
    /// The irrigation year.
    pub year: IrrigationYear,
    /// Largest daily flow (l/s).
    pub peak_daily_ls: f64,
    /// Day of the largest daily flow.
    pub peak_daily_date: NaiveDate,
    /// Largest 10-day mean flow (l/s).
    pub peak_10day_ls: f64,
    /// 10-day period of the largest mean flow.
    pub peak_10day_period: TenDayPeriod,
    /// Largest monthly mean flow (l/s).
    pub peak_monthly_ls: f64,
    /// Month of the largest mean flow.
    pub peak_month: YearMonth,
    /// Volume over the year (m³).
    pub volume_m3: f64,
    /// Volume as depth over the commanded area (mm); 0 when no area.
    pub delta_mm: f64,
}

impl YearValues {
    /// The peak used by a design basis (l/s).
    pub fn peak_ls(&self, basis: DesignBasis) -> f64 {
        match basis {
            DesignBasis::TenDay => self.peak_10day_ls,
            DesignBasis::Monthly => self.peak_monthly_ls,
            DesignBasis::Daily => self.peak_daily_ls,
        }
    }
}

/// Design values of one node.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NodeDesign {
    /// The node.
    pub node: Node,
    /// Node name (`headworks` or the canal id).
    pub name: String,
    /// Area commanded below the node (ha).
    pub area_ha: f64,
    /// Values per complete irrigation year, in order.
    pub years: Vec<YearValues>,
    /// Basis of the design flow.
    pub basis: DesignBasis,
    /// Non-exceedance probability of the design flow (fraction).
    pub non_exceedance: f64,
    /// Design flow: continuous 24-hour flow (l/s).
    pub design_flow_ls: f64,
    /// Distribution-free confidence interval of the design flow (l/s) from
    /// the order statistics of the yearly peaks on the design basis
    /// ([`crate::stats::interval`]); an open bound lies beyond the record.
    #[serde(default)]
    pub design_flow_interval: QuantileInterval,
    /// The year whose peak is closest to the design flow.
    pub design_year: IrrigationYear,
    /// Largest daily flow over the complete years (l/s), reported only.
    pub peak_daily_ls: f64,
    /// Largest 10-day mean flow over the complete years (l/s).
    pub peak_10day_ls: f64,
    /// Mean yearly volume over the complete years (m³).
    pub seasonal_volume_m3: f64,
    /// Mean yearly delta over the complete years (mm).
    pub delta_mm: f64,
    /// Duty (l/s/ha); `None` when no area is commanded.
    pub duty_ls_ha: Option<f64>,
    /// Duty as area served per unit flow (ha per m³/s); `None` for a zero
    /// design flow or no area.
    pub duty_ha_per_m3s: Option<f64>,
    /// Hours of operation per day.
    pub hours_per_day: f64,
    /// Required capacity: design flow × 24 ÷ hours of operation (l/s).
    pub required_capacity_ls: f64,
    /// Existing capacity (l/s), if given.
    pub existing_capacity_ls: Option<f64>,
    /// Shortfall against the existing capacity over the whole record, on
    /// the design basis (with the daily peaks beside it), if a capacity is
    /// given.
    pub shortfall: Option<Shortfall>,
}

/// A day on which demand exceeded what the existing capacity can deliver.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ShortfallDay {
    /// The day.
    pub date: NaiveDate,
    /// Demand (m³/day).
    pub demand_m3: f64,
    /// Volume not delivered (m³).
    pub deficit_m3: f64,
}

/// A 10-day period holding at least one shortfall day.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ShortfallPeriod {
    /// The period.
    pub period: TenDayPeriod,
    /// Days of shortfall in the period.
    pub shortfall_days: u32,
    /// Mean demand over the period's days in the record (l/s).
    pub mean_demand_ls: f64,
    /// Volume not delivered in the period (m³).
    pub deficit_m3: f64,
}

/// A period of the design basis (a calendar 10-day period, month or day)
/// whose mean demand exceeds what the existing capacity can carry.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct BasisShortfallPeriod {
    /// First calendar day of the period.
    pub start: NaiveDate,
    /// Calendar length of the period (days).
    pub period_days: u32,
    /// Days of the period inside the record (fewer only at its ends).
    pub covered_days: u32,
    /// Mean demand over the covered days, as a continuous flow (l/s).
    pub mean_demand_ls: f64,
    /// Volume not delivered (m³): (mean − deliverable per day) × covered days.
    pub deficit_m3: f64,
}

/// Shortfall of a demand against an existing capacity.
///
/// The `basis_*` fields follow the design basis (the default 10-day mean
/// flows); `days`, `periods` and `volume_not_delivered_m3` are **daily
/// peaks**, reported for information (a refill schedule's one-day pulses
/// make them large; they are not the design basis).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Shortfall {
    /// Volume the canal can deliver in a day: capacity × hours × 3600 (m³).
    pub deliverable_m3_day: f64,
    /// Daily peaks: days whose demand exceeds the deliverable volume, in order.
    pub days: Vec<ShortfallDay>,
    /// Daily peaks: 10-day periods holding such days, in order.
    pub periods: Vec<ShortfallPeriod>,
    /// Daily peaks: volume not delivered (m³), Σ max(0, demand − deliverable)
    /// over the days (water not carried over between days).
    pub volume_not_delivered_m3: f64,
    /// Averaging period of the comparison in the `basis_*` fields.
    #[serde(default)]
    pub basis: DesignBasis,
    /// Periods of the basis whose mean flow exceeds the capacity, in order.
    #[serde(default)]
    pub basis_periods: Vec<BasisShortfallPeriod>,
    /// Volume not delivered on the basis (m³): Σ (mean − capacity) × period
    /// days over the short periods.
    #[serde(default)]
    pub basis_volume_not_delivered_m3: f64,
    /// Complete irrigation years holding at least one short period of the
    /// basis (filled by [`design_values`]; empty otherwise).
    #[serde(default)]
    pub years_short: Vec<IrrigationYear>,
}

impl Shortfall {
    /// The short periods of the basis that lie in `years` (the complete
    /// irrigation years: the one basis of every per-year figure).
    pub fn basis_periods_in<'a>(
        &'a self,
        years: &'a [IrrigationYear],
    ) -> impl Iterator<Item = &'a BasisShortfallPeriod> + 'a {
        self.basis_periods
            .iter()
            .filter(move |p| years.iter().any(|y| y.contains(p.start)))
    }

    /// Volume not delivered on the basis in `years` (m³), Σ of
    /// [`Self::basis_periods_in`]'s deficits.
    pub fn basis_volume_in_m3(&self, years: &[IrrigationYear]) -> f64 {
        self.basis_periods_in(years).map(|p| p.deficit_m3).sum()
    }

    /// Mean volume not delivered per complete irrigation year (m³/year):
    /// [`Self::basis_volume_in_m3`] over `complete_years` ÷ their number
    /// (0 without complete years).
    pub fn basis_volume_per_year_m3(&self, complete_years: &[IrrigationYear]) -> f64 {
        if complete_years.is_empty() {
            0.0
        } else {
            self.basis_volume_in_m3(complete_years) / complete_years.len() as f64
        }
    }
}

/// Daily peaks: days and 10-day periods on which a daily demand (m³/day
/// from `start`) exceeds what a canal of capacity `capacity_m3s` running
/// `hours_per_day` hours a day can deliver (capacity × hours × 3600
/// m³/day), and the volume not delivered (Σ max(0, demand − deliverable)
/// over the days).
///
/// A 10-day period is listed in `periods` when it holds at least one
/// shortfall day; water is not carried over between days. The `basis_*`
/// fields hold the same comparison day by day ([`DesignBasis::Daily`]).
/// The design values use [`capacity_shortfall_on_basis`] instead, whose
/// default basis is the 10-day mean flow.
///
/// # Errors
/// [`SchemeError::BadOption`] for a capacity that is not a positive finite
/// number or hours outside (0, 24]; [`SchemeError::Invalid`] for a negative
/// or non-finite demand.
pub fn capacity_shortfall(
    start: NaiveDate,
    demand_m3_day: &[f64],
    capacity_m3s: f64,
    hours_per_day: f64,
) -> Result<Shortfall, SchemeError> {
    if !(capacity_m3s.is_finite() && capacity_m3s > 0.0) {
        return Err(SchemeError::BadOption {
            what: "existing capacity (m³/s)",
            value: capacity_m3s,
            expected: "a positive number",
        });
    }
    if !(hours_per_day.is_finite() && hours_per_day > 0.0 && hours_per_day <= 24.0) {
        return Err(SchemeError::BadOption {
            what: "hours of operation",
            value: hours_per_day,
            expected: "a value in (0, 24]",
        });
    }
    if let Some((day, &value)) = demand_m3_day
        .iter()
        .enumerate()
        .find(|(_, v)| !(v.is_finite() && **v >= 0.0))
    {
        return Err(SchemeError::Invalid(vec![NetworkProblem::BadRequirement {
            block: "(node demand)".into(),
            crop: "all".into(),
            day,
            value,
        }]));
    }
    let deliverable = capacity_m3s * hours_per_day * 3600.0;
    let mut days = Vec::new();
    let mut periods: Vec<ShortfallPeriod> = Vec::new();
    let mut period_demand = (None::<TenDayPeriod>, 0.0, 0u32);
    let mut total = 0.0;
    let mut date = start;
    let close = |periods: &mut Vec<ShortfallPeriod>, acc: &(Option<TenDayPeriod>, f64, u32)| {
        if let (Some(p), volume, n) = *acc
            && let Some(last) = periods.last_mut()
            && last.period == p
        {
            last.mean_demand_ls = m3_day_to_l_s(volume / f64::from(n.max(1)));
        }
    };
    for &d in demand_m3_day {
        let period = TenDayPeriod::containing(date);
        if period_demand.0 != Some(period) {
            close(&mut periods, &period_demand);
            period_demand = (Some(period), 0.0, 0);
        }
        period_demand.1 += d;
        period_demand.2 += 1;
        let deficit = d - deliverable;
        if deficit > 0.0 {
            total += deficit;
            days.push(ShortfallDay {
                date,
                demand_m3: d,
                deficit_m3: deficit,
            });
            match periods.last_mut() {
                Some(last) if last.period == period => {
                    last.shortfall_days += 1;
                    last.deficit_m3 += deficit;
                }
                _ => periods.push(ShortfallPeriod {
                    period,
                    shortfall_days: 1,
                    mean_demand_ls: 0.0,
                    deficit_m3: deficit,
                }),
            }
        }
        date = date.succ_opt().unwrap_or(date);
    }
    close(&mut periods, &period_demand);
    let basis_periods = days
        .iter()
        .map(|d| BasisShortfallPeriod {
            start: d.date,
            period_days: 1,
            covered_days: 1,
            mean_demand_ls: m3_day_to_l_s(d.demand_m3),
            deficit_m3: d.deficit_m3,
        })
        .collect();
    Ok(Shortfall {
        deliverable_m3_day: deliverable,
        days,
        periods,
        volume_not_delivered_m3: total,
        basis: DesignBasis::Daily,
        basis_periods,
        basis_volume_not_delivered_m3: total,
        years_short: Vec::new(),
    })
}

/// Shortfall on a design basis: each calendar period of the basis (10-day
/// periods 1–10, 11–20, 21–end; months; or days) is short when its mean
/// demand exceeds what the canal can deliver per day (capacity × hours ×
/// 3600 m³/day, i.e. a continuous flow of capacity × hours ÷ 24); the
/// volume not delivered is Σ (mean − deliverable per day) × the period's
/// days in the record. Periods cut by the ends of the record are compared
/// on their mean over the days inside it.
///
/// The daily peaks ([`capacity_shortfall`]) are returned beside it in
/// `days`, `periods` and `volume_not_delivered_m3`.
///
/// # Errors
/// As [`capacity_shortfall`].
pub fn capacity_shortfall_on_basis(
    start: NaiveDate,
    demand_m3_day: &[f64],
    capacity_m3s: f64,
    hours_per_day: f64,
    basis: DesignBasis,
) -> Result<Shortfall, SchemeError> {
    let mut out = capacity_shortfall(start, demand_m3_day, capacity_m3s, hours_per_day)?;
    if basis == DesignBasis::Daily {
        return Ok(out);
    }
    let step = match basis {
        DesignBasis::Monthly => super::demand::PeriodStep::Month,
        _ => super::demand::PeriodStep::TenDay,
    };
    let deliverable = out.deliverable_m3_day;
    let mut periods = Vec::new();
    let mut total = 0.0;
    for p in super::demand::aggregate_periods(start, demand_m3_day, step, 0.0) {
        let days = f64::from(p.covered_days);
        let mean_m3_day = p.volume_m3 / days;
        let deficit = (mean_m3_day - deliverable) * days;
        if mean_m3_day > deliverable {
            total += deficit;
            periods.push(BasisShortfallPeriod {
                start: p.start,
                period_days: p.period_days,
                covered_days: p.covered_days,
                mean_demand_ls: p.mean_flow_ls,
                deficit_m3: deficit,
            });
        }
    }
    out.basis = basis;
    out.basis_periods = periods;
    out.basis_volume_not_delivered_m3 = total;
    Ok(out)
}

/// Largest mean flow (l/s) over consecutive groups of days sharing a key, with
/// the key of that group.
fn peak_mean_ls<K: PartialEq + Copy>(
    series_m3_day: &[f64],
    first: NaiveDate,
    key: impl Fn(NaiveDate) -> K,
) -> (f64, K) {
    let mut best = (f64::NEG_INFINITY, key(first));
    let mut current = (key(first), 0.0, 0u32);
    let mut date = first;
    for &v in series_m3_day {
        let k = key(date);
        if k != current.0 {
            let mean = current.1 / f64::from(current.2.max(1));
            if mean > best.0 {
                best = (mean, current.0);
            }
            current = (k, 0.0, 0);
        }
        current.1 += v;
        current.2 += 1;
        date = date.succ_opt().unwrap_or(date);
    }
    let mean = current.1 / f64::from(current.2.max(1));
    if mean > best.0 {
        best = (mean, current.0);
    }
    (m3_day_to_l_s(best.0), best.1)
}

fn check_options(options: &DesignOptions) -> Result<YearStart, SchemeError> {
    if !(0.0..=1.0).contains(&options.non_exceedance) {
        return Err(SchemeError::BadOption {
            what: "non-exceedance probability",
            value: options.non_exceedance,
            expected: "a fraction in [0, 1]",
        });
    }
    let hours = options.headworks_hours_per_day;
    if !(hours.is_finite() && hours > 0.0 && hours <= 24.0) {
        return Err(SchemeError::BadOption {
            what: "headworks hours of operation",
            value: hours,
            expected: "a value in (0, 24]",
        });
    }
    if let Some(cap) = options.headworks_capacity_m3s
        && !(cap.is_finite() && cap > 0.0)
    {
        return Err(SchemeError::BadOption {
            what: "headworks existing capacity (m³/s)",
            value: cap,
            expected: "a positive number",
        });
    }
    if !(options.confidence_level > 0.0 && options.confidence_level < 1.0) {
        return Err(SchemeError::BadOption {
            what: "confidence level of the design flow",
            value: options.confidence_level,
            expected: "a fraction in (0, 1), e.g. 0.9",
        });
    }
    YearStart::new(options.year_start_month).map_err(|_| SchemeError::BadOption {
        what: "irrigation-year start month",
        value: f64::from(options.year_start_month),
        expected: "a month number 1 to 12",
    })
}

/// Design values of every node (canals in network order, then the headworks).
///
/// # Errors
/// [`SchemeError::BadOption`] for options out of range;
/// [`SchemeError::NoCompleteYear`] when the record holds no complete
/// irrigation year.
pub fn design_values(
    demand: &SchemeDemand,
    options: &DesignOptions,
) -> Result<Vec<NodeDesign>, SchemeError> {
    let year_start = check_options(options)?;
    let first = demand.start();
    let last = demand.date(demand.days().saturating_sub(1));
    let no_year = SchemeError::NoCompleteYear {
        year_start_month: options.year_start_month,
        first,
        last,
    };
    if demand.days() == 0 {
        return Err(no_year);
    }
    let coverage = year_coverage(first, last, year_start).map_err(|_| no_year.clone())?;
    if coverage.complete.is_empty() {
        return Err(no_year);
    }
    let network = demand.network();
    let mut out = Vec::with_capacity(network.node_count());
    for node in network.nodes() {
        let series = demand.demand_m3_day(node);
        let area_ha = network.commanded_area_ha(node);
        let mut years = Vec::with_capacity(coverage.complete.len());
        for &year in &coverage.complete {
            let i0 = (year.start() - first).num_days() as usize;
            let s = &series[i0..i0 + year.length_days() as usize];
            let (peak_daily_ls, peak_daily_date) = peak_mean_ls(s, year.start(), |d| d);
            let (peak_10day_ls, peak_10day_period) =
                peak_mean_ls(s, year.start(), TenDayPeriod::containing);
            let (peak_monthly_ls, peak_month) =
                peak_mean_ls(s, year.start(), YearMonth::containing);
            let volume_m3: f64 = s.iter().sum();
            years.push(YearValues {
                year,
                peak_daily_ls,
                peak_daily_date,
                peak_10day_ls,
                peak_10day_period,
                peak_monthly_ls,
                peak_month,
                volume_m3,
                delta_mm: if area_ha > 0.0 {
                    volume_m3 / (10.0 * area_ha)
                } else {
                    0.0
                },
            });
        }
        let peaks: Vec<f64> = years.iter().map(|y| y.peak_ls(options.basis)).collect();
        let dy = design_year(&peaks, Probability::NonExceedance(options.non_exceedance)).map_err(
            |_| SchemeError::BadOption {
                what: "non-exceedance probability",
                value: options.non_exceedance,
                expected: "a fraction in [0, 1]",
            },
        )?;
        let design_flow_ls = dy.value_at_probability;
        let design_flow_interval = RankedSample::new(&peaks)
            .and_then(|s| s.quantile_interval(options.non_exceedance, options.confidence_level))
            .map_err(|_| SchemeError::BadOption {
                what: "confidence level of the design flow",
                value: options.confidence_level,
                expected: "a fraction in (0, 1), e.g. 0.9",
            })?;
        let n_years = years.len() as f64;
        let (hours_per_day, capacity_m3s) = match node {
            Node::Headworks => (
                options.headworks_hours_per_day,
                options.headworks_capacity_m3s,
            ),
            Node::Canal(c) => {
                let canal = &network.canals()[c];
                (canal.hours_per_day, canal.existing_capacity_m3s)
            }
        };
        out.push(NodeDesign {
            node,
            name: network.node_name(node).to_owned(),
            area_ha,
            basis: options.basis,
            non_exceedance: options.non_exceedance,
            design_flow_ls,
            design_flow_interval,
            design_year: years[dy.index].year,
            peak_daily_ls: years.iter().map(|y| y.peak_daily_ls).fold(0.0, f64::max),
            peak_10day_ls: years.iter().map(|y| y.peak_10day_ls).fold(0.0, f64::max),
            seasonal_volume_m3: years.iter().map(|y| y.volume_m3).sum::<f64>() / n_years,
            delta_mm: years.iter().map(|y| y.delta_mm).sum::<f64>() / n_years,
            duty_ls_ha: (area_ha > 0.0).then(|| duty_ls_ha(design_flow_ls, area_ha)),
            duty_ha_per_m3s: (area_ha > 0.0 && design_flow_ls > 0.0)
                .then(|| area_ha / (design_flow_ls / 1000.0)),
            hours_per_day,
            required_capacity_ls: required_capacity_ls(design_flow_ls, hours_per_day),
            existing_capacity_ls: capacity_m3s.map(|c| c * 1000.0),
            shortfall: capacity_m3s
                .map(|c| {
                    capacity_shortfall_on_basis(first, series, c, hours_per_day, options.basis).map(
                        |mut s| {
                            // A complete year is short when its peak on the
                            // basis exceeds the continuous-flow capacity.
                            let capacity_ls = c * 1000.0 * hours_per_day / 24.0;
                            s.years_short = years
                                .iter()
                                .filter(|y| y.peak_ls(options.basis) > capacity_ls)
                                .map(|y| y.year)
                                .collect();
                            s
                        },
                    )
                })
                .transpose()?,
            years,
        });
    }
    Ok(out)
}

impl NodeDesign {
    /// The design flow's confidence interval as a required capacity (l/s):
    /// both bounds × 24 ÷ hours of operation, as the required capacity
    /// follows from the design flow.
    pub fn required_capacity_interval(&self) -> QuantileInterval {
        self.design_flow_interval
            .scaled(required_capacity_ls(1.0, self.hours_per_day))
    }

    /// Whether the existing capacity lies inside the confidence interval of
    /// the required capacity: the verdict "sufficient" or "too small" is then
    /// within the uncertainty of the record. `None` without an existing
    /// capacity.
    pub fn capacity_within_uncertainty(&self) -> Option<bool> {
        self.existing_capacity_ls
            .map(|cap| self.required_capacity_interval().contains(cap))
    }
}

/// Duty (l/s/ha): design flow (l/s) ÷ commanded area (ha). With a flow
/// derived from a depth, 1 l/s/ha = 8.64 mm/day (FAO-56 Annex 1).
pub fn duty_ls_ha(design_flow_ls: f64, area_ha: f64) -> f64 {
    design_flow_ls / area_ha
}

/// Required capacity (l/s) of a canal running `hours_per_day` hours a day to
/// carry a continuous 24-hour design flow: Q × 24 ÷ hours
/// (published-check-values §10.3).
pub fn required_capacity_ls(design_flow_ls: f64, hours_per_day: f64) -> f64 {
    design_flow_ls * 24.0 / hours_per_day
}

/// Continuous design flow (l/s) for a gross requirement depth (mm/day) over an
/// area (ha): Q = GIR × A ÷ 8.64 (published-check-values §10.3, FAO-56
/// Annex 1).
pub fn design_flow_from_depth_ls(gir_mm_day: f64, area_ha: f64) -> f64 {
    gir_mm_day * area_ha * 10.0 * 1000.0 / SECONDS_PER_DAY
}
