//! Block outlets: the most a block can take in a day, and what happens when
//! its plantings ask for more.
//!
//! A block's outlet delivers at most its stream size (l/s) over the hours its
//! canal runs: cap (m³/day) = stream size × 3.6 × hours. The day's gross
//! request at the outlet is Σ over the block's plantings (and, under a
//! rotation within the block, the shares served that day) of NIR × area ÷
//! (Ea × Eb). When the requests exceed the cap, every request of that day
//! gets the same share f = cap ÷ Σ requests (pro rata to the requests); the
//! water not delivered is not owed: each planting is simulated again with
//! that daily share ([`crate::planting::PlantingSpec::supply_factor`]), so
//! its next request follows from its depletion and its balance shows the
//! stress (Ks, FAO-33 yield loss).
//!
//! Requests change once earlier requests are cut, so the shares are found by
//! iteration: f = min(1, cap ÷ Σ requests of the last run), at most
//! [`FREE_PASSES`] times; then f may only fall (f = min(f, cap ÷ Σ
//! requests)), which converges; at most [`MAX_PASSES`] runs in all. A block
//! whose deliveries still exceed its cap after that is reported in a warning
//! with the largest excess.
//!
//! Without a stream size the outlet is assumed large enough: its assumed
//! stream size is the block's largest daily delivery over the canal's hours
//! (at least the peak 10-day rate, so it never binds on the design basis),
//! marked as assumed.

use super::EngineError;
use super::planting_step::PlantingOutcome;
use crate::project::DeliveryMode;

/// What applying an outlet gives: the limited outcomes (when it binds), the
/// outlet's summary and a warning when the limit did not settle.
pub type OutletRun = (Option<Vec<PlantingOutcome>>, OutletSummary, Option<String>);

/// Re-runs planting `k` of a block with a daily supply factor.
pub type Rerun<'a> = dyn Fn(usize, &[f64]) -> Result<PlantingOutcome, EngineError> + Sync + 'a;

/// Runs with f = min(1, cap ÷ Σ requests) before f may only fall.
pub const FREE_PASSES: usize = 6;
/// Most re-runs of a limited block.
pub const MAX_PASSES: usize = 40;
/// Relative excess over the cap still taken as within it (rounding).
const CAP_TOLERANCE: f64 = 1e-9;

/// A block's outlet over the record.
#[derive(Debug, Clone, PartialEq)]
pub struct OutletSummary {
    /// Block id.
    pub block: String,
    /// Delivery mode of the block.
    pub delivery: DeliveryMode,
    /// Stream size (l/s): the entered one, or the assumed one.
    pub stream_size_ls: f64,
    /// Whether the stream size is assumed (none entered).
    pub stream_size_assumed: bool,
    /// Hours per day the outlet runs (its canal's hours).
    pub hours_per_day: f64,
    /// Largest daily delivery as a flow over the outlet's hours (l/s).
    pub peak_delivery_ls: f64,
    /// Days of the complete irrigation years on which the outlet limited
    /// delivery (mean per year).
    pub limited_days_per_year: f64,
    /// Water asked for but not delivered (m³ per year at the outlet, mean over
    /// the complete irrigation years).
    pub limited_m3_per_year: f64,
    /// Water delivered (m³ per year at the outlet, mean over the complete
    /// irrigation years).
    pub delivered_m3_per_year: f64,
}

impl OutletSummary {
    /// Share of the requests the outlet held back (0..1).
    pub fn limited_share(&self) -> f64 {
        let asked = self.delivered_m3_per_year + self.limited_m3_per_year;
        if asked > 0.0 {
            self.limited_m3_per_year / asked
        } else {
            0.0
        }
    }
}

/// One planting of a block, for the outlet: its gross volume at the outlet
/// per mm of NIR (m³/mm = area × 10 ÷ (Ea × Eb)) and its outcome.
pub struct OutletUnit<'a> {
    /// m³ at the outlet per mm of NIR over the planting.
    pub m3_per_mm: f64,
    /// The planting's outcome without a limit.
    pub outcome: &'a PlantingOutcome,
}

/// Daily cap of an outlet (m³/day) from its stream size (l/s) and hours.
pub fn outlet_cap_m3_day(stream_size_ls: f64, hours_per_day: f64) -> f64 {
    stream_size_ls * 3.6 * hours_per_day
}

fn unlimited_of(units: &[OutletUnit<'_>], days: usize) -> Vec<f64> {
    let base: Vec<(f64, &PlantingOutcome)> =
        units.iter().map(|u| (u.m3_per_mm, u.outcome)).collect();
    gross_m3(&base, days)
}

fn requests_cap_factor(requests: &[f64], cap: f64) -> Vec<f64> {
    requests
        .iter()
        .map(|r| if *r > cap { cap / r } else { 1.0 })
        .collect()
}

/// Days and volume limited, and the deliveries, from the requests and factors.
fn fill_limits(
    summary: &mut OutletSummary,
    requests: &[f64],
    factor: &[f64],
    cap: f64,
    range: std::ops::Range<usize>,
    n_years: f64,
    hours: f64,
) {
    let delivered: Vec<f64> = requests.iter().zip(factor).map(|(r, f)| r * f).collect();
    let mut limited_days = 0usize;
    let mut limited_m3 = 0.0;
    for d in range.clone() {
        let short = requests[d] - delivered[d];
        if factor[d] < 1.0 && short > cap * CAP_TOLERANCE {
            limited_days += 1;
            limited_m3 += short;
        }
    }
    summary.limited_days_per_year = limited_days as f64 / n_years;
    summary.limited_m3_per_year = limited_m3 / n_years;
    summary.delivered_m3_per_year = delivered[range].iter().sum::<f64>() / n_years;
    summary.peak_delivery_ls = delivered.iter().copied().fold(0.0, f64::max) / (3.6 * hours);
}

fn gross_m3(units: &[(f64, &PlantingOutcome)], days: usize) -> Vec<f64> {
    let mut g = vec![0.0; days];
    for (m3_per_mm, o) in units {
        for (acc, mm) in g.iter_mut().zip(&o.nir_mm) {
            *acc += m3_per_mm * mm;
        }
    }
    g
}

/// Applies a block's outlet: returns the limited outcomes (when the outlet
/// binds; in the units' order) and the outlet's summary, and a warning when
/// the iteration did not bring every day within the cap.
///
/// `rerun(k, factor)` simulates unit k again with the daily supply factor.
///
/// # Errors
/// An error of a re-run.
#[expect(clippy::too_many_arguments, reason = "the outlet's inputs, each named")]
pub fn apply_outlet(
    block: &str,
    delivery: DeliveryMode,
    stream_size_ls: Option<f64>,
    hours_per_day: f64,
    units: &[OutletUnit<'_>],
    days: usize,
    range: std::ops::Range<usize>,
    n_years: f64,
    rerun: &Rerun<'_>,
) -> Result<OutletRun, EngineError> {
    let base: Vec<(f64, &PlantingOutcome)> =
        units.iter().map(|u| (u.m3_per_mm, u.outcome)).collect();
    let unlimited = gross_m3(&base, days);
    let hours = hours_per_day.max(f64::MIN_POSITIVE);
    let peak = unlimited.iter().copied().fold(0.0, f64::max);
    let mut summary = OutletSummary {
        block: block.to_owned(),
        delivery,
        stream_size_ls: stream_size_ls.unwrap_or(peak / (3.6 * hours)),
        stream_size_assumed: stream_size_ls.is_none(),
        hours_per_day,
        peak_delivery_ls: peak / (3.6 * hours),
        limited_days_per_year: 0.0,
        limited_m3_per_year: 0.0,
        delivered_m3_per_year: unlimited[range.clone()].iter().sum::<f64>() / n_years,
    };
    let Some(stream) = stream_size_ls else {
        return Ok((None, summary, None));
    };
    let cap = outlet_cap_m3_day(stream, hours);
    if peak <= cap * (1.0 + CAP_TOLERANCE) {
        return Ok((None, summary, None));
    }
    if let DeliveryMode::ContinuousFlow { .. } = delivery {
        // The steady flow of each cycle is clipped to the cap; the field's
        // storage (pond) is not re-balanced, and the shortfall is reported.
        let factor: Vec<f64> = requests_cap_factor(&unlimited_of(units, days), cap);
        let outcomes: Vec<PlantingOutcome> = units
            .iter()
            .map(|u| {
                let mut o = u.outcome.clone();
                for (v, f) in o.nir_mm.iter_mut().zip(&factor) {
                    *v *= f;
                }
                o
            })
            .collect();
        let requests = unlimited_of(units, days);
        fill_limits(&mut summary, &requests, &factor, cap, range, n_years, hours);
        return Ok((
            Some(outcomes),
            summary,
            Some(format!(
                "block {block}: the outlet's stream size limits its continuous flow; the shortfall is reported and the pond or root zone is not re-balanced for it"
            )),
        ));
    }
    // Requests of the last run (before the factor) and the factor.
    let mut factor = vec![1.0; days];
    let mut requests = unlimited;
    let mut outcomes: Vec<PlantingOutcome> = Vec::new();
    let mut delivered = vec![0.0; days];
    let mut converged = false;
    for pass in 0..MAX_PASSES {
        for (d, f) in factor.iter_mut().enumerate() {
            let want = if requests[d] > cap {
                cap / requests[d]
            } else {
                1.0
            };
            *f = if pass < FREE_PASSES {
                want
            } else {
                f.min(want)
            };
        }
        outcomes = (0..units.len())
            .map(|k| rerun(k, &factor))
            .collect::<Result<_, _>>()?;
        let limited: Vec<(f64, &PlantingOutcome)> = units
            .iter()
            .zip(&outcomes)
            .map(|(u, o)| (u.m3_per_mm, o))
            .collect();
        delivered = gross_m3(&limited, days);
        requests = delivered
            .iter()
            .zip(&factor)
            .map(|(v, f)| if *f > 0.0 { v / f } else { *v })
            .collect();
        if delivered.iter().all(|v| *v <= cap * (1.0 + CAP_TOLERANCE)) {
            converged = true;
            break;
        }
    }
    fill_limits(&mut summary, &requests, &factor, cap, range, n_years, hours);
    let warning = (!converged).then(|| {
        let worst = delivered
            .iter()
            .map(|v| v / cap - 1.0)
            .fold(0.0, f64::max);
        format!(
            "block {block}: the outlet limit did not settle in {MAX_PASSES} runs; deliveries exceed the stream size by up to {:.2} % on some days",
            100.0 * worst
        )
    });
    Ok((Some(outcomes), summary, warning))
}

/// Warnings where a rotation within the block is longer than the crop can
/// wait: cycle × peak ETc > RAW (FAO-56 eq. 83, p adjusted for the peak ETc
/// by the Table 22 note), once per crop, season label and cycle, naming the
/// blocks and the interval that would avoid the stress (RAW ÷ peak ETc).
pub fn rotation_stress_warnings(
    project: &crate::project::Project,
    plantings: &[super::plantings::PlantingSummary],
) -> Vec<String> {
    // (crop, season, cycle) -> (blocks, shortest RAW/ETc in days)
    type Key = (String, String, u32);
    let mut found: Vec<(Key, Vec<String>, f64)> = Vec::new();
    for p in plantings {
        let Some(block) = project.blocks.iter().find(|b| b.id == p.block) else {
            continue;
        };
        let DeliveryMode::RotationWithinBlock { cycle_days, .. } = block.delivery else {
            continue;
        };
        let Some((raw, etc)) = p.raw_and_etc else {
            continue;
        };
        if p.is_paddy || etc <= 0.0 || f64::from(cycle_days) * etc <= raw {
            continue;
        }
        let days = raw / etc;
        let key = (p.crop.clone(), p.season.clone(), cycle_days);
        let name = if block.name.is_empty() {
            block.id.clone()
        } else {
            block.name.clone()
        };
        if let Some(e) = found.iter_mut().find(|e| e.0 == key) {
            if !e.1.contains(&name) {
                e.1.push(name);
            }
            e.2 = e.2.min(days);
        } else {
            found.push((key, vec![name], days));
        }
    }
    found
        .into_iter()
        .map(|((crop, season, cycle), blocks, days)| {
            format!(
                "{crop} ({season}): a {cycle}-day rotation within the block is longer than the crop can go between turns at its peak ETc (RAW ÷ ETc = {days:.1} days); it is stressed between turns on {} — {}",
                blocks.join(", "),
                if days >= 2.0 {
                    format!("a cycle of {} days would avoid it", days.floor())
                } else {
                    "it needs water more often than every 2 days (a shorter cycle, or a method that waters daily)".to_owned()
                }
            )
        })
        .collect()
}
