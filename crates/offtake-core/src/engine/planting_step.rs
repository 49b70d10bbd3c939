//! The per-planting step: one planting's daily NIR per hectare over the whole
//! weather record, and its seasons' totals and FAO-33 yield loss, optionally
//! on the water actually delivered.
//!
//! This is the single call the engine makes per planting
//! ([`simulate_planting`]). It is an interim implementation on the crop,
//! balance and paddy modules until the planting module
//! (`offtake_core::planting::run_planting`) is merged, which will replace its
//! body; its inputs and outputs will not change.
//!
//! # Method (interim)
//! - The planting window is split into at most [`MAX_COHORTS`] equal cohorts
//!   planted at even steps over `spread_days` (first on the opening day).
//! - Every year of the record, each cohort's season (length from the planting
//!   or the crop library's FAO-56 Table 11 total) is simulated; a season that
//!   does not fit inside the record is left out and counted.
//! - Upland crops: Kc, root depth and p from the crop module (Kc mid/end
//!   adjusted to the season's u2 and RHmin, FAO-56 eq. 62 and 65), FAO-56
//!   Chapter 8 root-zone balance from field capacity with curve-number runoff
//!   of the soil; NIR = the net irrigation of the strategy.
//! - Paddy rice (crop group `PaddyRice`): the paddy module's staggered
//!   requirement (land preparation, pond, seepage and percolation) with its
//!   planning defaults; on delivered water the paddy is taken as an upland
//!   balance is not — its yield loss is reported from the share of the
//!   requirement delivered (ETa/ETc ≈ delivered ÷ required, a simplification
//!   stated in the results).
//! - Yield loss: FAO-56 eq. 90 (FAO-33) with the crop's seasonal Ky.

use chrono::{Datelike, Days, NaiveDate};

use super::weather_prep::PreparedWeather;
use crate::balance::{
    self, BalanceParams, CropCoefficients, DailySeries, IrrigationEvent, RefillTarget, RunoffRule,
    strategy::IntervalDepth,
};
use crate::crop::climate::DayClimate;
use crate::crop::season::{ClimateInput, SeasonSpec, crop_season_series};
use crate::crop::{Crop, CropGroup};
use crate::paddy::{LandPreparation, PaddyField, PaddyPlanting, paddy_planting_requirement};
use crate::project::{Planting, Strategy as PlanStrategy};
use crate::soil::Soil;
use crate::yield_response::relative_yield_loss;

/// Most cohorts a planting window is split into (interim step).
pub const MAX_COHORTS: u32 = 3;

/// Totals of one season (one year's planting, all cohorts, per hectare).
#[derive(Debug, Clone, PartialEq)]
pub struct SeasonOutcome {
    /// First planting day of the season (first cohort).
    pub start: NaiveDate,
    /// Last day of the season (last cohort's harvest).
    pub end: NaiveDate,
    /// Crop ET under no stress ETc (mm).
    pub etc_mm: f64,
    /// Actual crop ET ETc adj (mm).
    pub etc_adj_mm: f64,
    /// Net irrigation applied (mm).
    pub net_irrigation_mm: f64,
    /// Rain over the season (mm).
    pub rain_mm: f64,
    /// Seepage and percolation of paddy fields (mm; 0 for upland crops).
    pub percolation_mm: f64,
    /// FAO-33 relative yield loss (%); `None` without a published Ky.
    pub yield_loss_pct: Option<f64>,
}

/// Result of one planting over the record, per hectare planted.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PlantingOutcome {
    /// Net irrigation requirement (mm/day), one value per weather day, 0
    /// outside seasons.
    pub nir_mm: Vec<f64>,
    /// Seasons that fit inside the record.
    pub seasons: Vec<SeasonOutcome>,
    /// Seasons left out because they do not fit inside the record.
    pub seasons_excluded: usize,
}

fn balance_strategy(s: PlanStrategy, crop: &Crop) -> balance::Strategy {
    match s {
        PlanStrategy::Refill { trigger_pct_of_raw } => balance::Strategy::Refill {
            trigger_pct_of_raw,
            refill_to: RefillTarget::FieldCapacity,
        },
        PlanStrategy::Interval { days } => balance::Strategy::FixedInterval {
            days: days.max(1) as usize,
            first_day: 0,
            depth: IntervalDepth::CurrentDepletion,
        },
        PlanStrategy::Depth { net_mm } => balance::Strategy::FixedDepth {
            net_mm,
            trigger_pct_of_raw: 100.0,
        },
        PlanStrategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => {
            // Trigger as a share of TAW → share of the stress range TAW − RAW
            // with RAW = p·TAW (FAO-56 eq. 83, p from Table 22).
            let p = crop.depletion_p;
            let t = trigger_pct_of_taw / 100.0;
            balance::Strategy::Deficit {
                allowed_stress: ((t - p) / (1.0 - p)).clamp(0.0, 1.0),
                refill_fraction: (refill_pct_of_depletion / 100.0).clamp(0.01, 1.0),
            }
        }
        PlanStrategy::Rainfed => balance::Strategy::Rainfed,
    }
}

/// Cohort offsets (days after the opening day) and their area shares.
fn cohorts(spread_days: u32) -> Vec<(u32, f64)> {
    let n = spread_days.clamp(1, MAX_COHORTS);
    let share = 1.0 / f64::from(n);
    (0..n)
        .map(|k| {
            let off = if n == 1 {
                0
            } else {
                k * (spread_days - 1) / (n - 1)
            };
            (off, share)
        })
        .collect()
}

/// One cohort-season of an upland crop.
struct CohortRun {
    first: usize,
    nir: Vec<f64>,
    etc: f64,
    eta: f64,
    irr: f64,
}

#[expect(
    clippy::too_many_arguments,
    reason = "one call per cohort-season; grouping would only rename them"
)]
fn upland_cohort(
    crop: &Crop,
    soil: &Soil,
    strategy: &balance::Strategy,
    w: &PreparedWeather,
    climate: &[DayClimate],
    first: usize,
    len: usize,
    delivered: Option<&[f64]>,
) -> Result<CohortRun, String> {
    let start = w.date(first);
    let mut spec = SeasonSpec::new(start);
    spec.length_days = Some(u32::try_from(len).unwrap_or(u32::MAX));
    spec.climate = ClimateInput::Daily(&climate[first..first + len]);
    let series = crop_season_series(crop, &spec).map_err(|e| e.to_string())?;
    let kc = series.kc();
    let root = series.root_depth_m();
    let n = kc.len().min(len);
    let mut params = BalanceParams::new(soil.theta_fc, soil.theta_wp, crop.depletion_p);
    params.runoff = RunoffRule {
        curve_number: Some(soil.curve_number),
        max_infiltration_mm_day: Some(soil.max_infiltration_mm_day),
    };
    params.strategy = match delivered {
        Some(d) => balance::Strategy::Scheduled(
            d[first..first + n]
                .iter()
                .enumerate()
                .filter(|(_, v)| **v > 0.0)
                .map(|(day, &net_mm)| IrrigationEvent { day, net_mm })
                .collect(),
        ),
        None => strategy.clone(),
    };
    let run = balance::simulate(
        &DailySeries {
            et0_mm: &w.et0_mm[first..first + n],
            rain_mm: &w.rain_mm[first..first + n],
            crop: CropCoefficients::Single { kc: &kc[..n] },
            root_depth_m: &root[..n],
            capillary_rise_mm: None,
        },
        &params,
    )
    .map_err(|e| e.to_string())?;
    let totals = run.totals();
    Ok(CohortRun {
        first,
        nir: run.days.iter().map(|d| d.irrigation_mm).collect(),
        etc: totals.etc_mm,
        eta: totals.etc_adj_mm,
        irr: totals.irrigation_mm,
    })
}

/// Simulates one planting over the whole weather record, per hectare.
///
/// `delivered_net_mm`, when given, is the net depth (mm/day per hectare of
/// the planting) that actually reached the root zone; the balance is re-run
/// with that water instead of the strategy, so ETc adj and the yield loss
/// follow from the delivery.
///
/// # Errors
/// A message naming the season and the cause when the crop curve or the
/// balance rejects its inputs.
pub fn simulate_planting(
    crop: &Crop,
    soil: &Soil,
    planting: &Planting,
    w: &PreparedWeather,
    delivered_net_mm: Option<&[f64]>,
) -> Result<PlantingOutcome, String> {
    let n_days = w.days();
    let mut out = PlantingOutcome {
        nir_mm: vec![0.0; n_days],
        ..PlantingOutcome::default()
    };
    if n_days == 0 {
        return Ok(out);
    }
    let len = planting
        .season_length_days
        .unwrap_or_else(|| crop.stages.total_days()) as usize;
    let last = w.date(n_days - 1);
    let ky = crop.ky_seasonal;
    let is_paddy = crop.group == CropGroup::PaddyRice;
    let cohort_list = cohorts(planting.spread_days);
    let spread = cohort_list.last().map_or(0, |c| c.0) as usize;
    let paddy = PaddyPlanting {
        field: PaddyField::default(),
        land_prep: LandPreparation::default(),
        nursery: None,
        window_days: spread,
        groups: cohort_list.len(),
    };
    let lead = if is_paddy { paddy.lead_days() } else { 0 };
    let climate: Vec<DayClimate> = w
        .wind_2m_ms
        .iter()
        .zip(&w.rhmin_pct)
        .map(|(&u2_ms, &rhmin_pct)| DayClimate { u2_ms, rhmin_pct })
        .collect();
    let strategy = balance_strategy(planting.strategy, crop);
    let kc_rice = if is_paddy {
        let s = crop_season_series(crop, &{
            let mut spec = SeasonSpec::new(w.start);
            spec.length_days = Some(u32::try_from(len).unwrap_or(u32::MAX));
            spec
        })
        .map_err(|e| e.to_string())?;
        s.kc()
    } else {
        Vec::new()
    };

    for year in w.start.year() - 1..=last.year() {
        let Some(open) = planting.first_planting.in_year(year) else {
            continue;
        };
        let calendar_start = open - Days::new(lead as u64);
        let end = open + Days::new((spread + len) as u64 - 1);
        if end < w.start || calendar_start > last {
            continue;
        }
        if calendar_start < w.start || end > last {
            out.seasons_excluded += 1;
            continue;
        }
        let first = usize::try_from((calendar_start - w.start).num_days()).unwrap_or(0);
        let season_rain: f64 = w.rain_mm[(first + lead)..(first + lead + spread + len)]
            .iter()
            .sum();
        if is_paddy {
            let span = paddy.calendar_days(len);
            let days = paddy_planting_requirement(
                &w.et0_mm[first..first + span],
                &w.rain_mm[first..first + span],
                &kc_rice,
                &paddy,
            )
            .map_err(|e| format!("season {open}: {e}"))?;
            let req: f64 = days.iter().map(|d| d.nir_mm).sum();
            let etc: f64 = days.iter().map(|d| d.etc_mm).sum();
            let perc: f64 = days.iter().map(|d| d.percolation_mm).sum();
            let (given, ratio) = match delivered_net_mm {
                Some(d) => {
                    let g: f64 = d[first..first + span].iter().sum();
                    (g, if req > 0.0 { (g / req).min(1.0) } else { 1.0 })
                }
                None => (req, 1.0),
            };
            for (k, d) in days.iter().enumerate() {
                out.nir_mm[first + k] += d.nir_mm;
            }
            let eta = etc * ratio;
            out.seasons.push(SeasonOutcome {
                start: open,
                end,
                etc_mm: etc,
                etc_adj_mm: eta,
                net_irrigation_mm: given,
                rain_mm: season_rain,
                percolation_mm: perc,
                yield_loss_pct: ky
                    .map(|k| relative_yield_loss(k, eta, etc).map(|l| l * 100.0))
                    .transpose()
                    .map_err(|e| e.to_string())?,
            });
        } else {
            let mut etc = 0.0;
            let mut eta = 0.0;
            let mut irr = 0.0;
            // Delivered water is shared among cohorts in proportion to their
            // requirement on each day (so a run on full delivery repeats the
            // strategy's run).
            let base: Vec<CohortRun> = cohort_list
                .iter()
                .map(|&(off, _)| {
                    upland_cohort(
                        crop,
                        soil,
                        &strategy,
                        w,
                        &climate,
                        first + off as usize,
                        len,
                        None,
                    )
                })
                .collect::<Result<_, _>>()
                .map_err(|e| format!("season {open}: {e}"))?;
            for (r, &(_, share)) in base.iter().zip(&cohort_list) {
                for (k, v) in r.nir.iter().enumerate() {
                    out.nir_mm[r.first + k] += v * share;
                }
            }
            let runs = if let Some(d) = delivered_net_mm {
                let mut total = vec![0.0; spread + len];
                for (r, &(_, share)) in base.iter().zip(&cohort_list) {
                    for (k, v) in r.nir.iter().enumerate() {
                        total[r.first - first + k] += v * share;
                    }
                }
                let mut per_cohort = vec![0.0; n_days];
                let mut runs = Vec::with_capacity(base.len());
                for r in &base {
                    for (k, v) in r.nir.iter().enumerate() {
                        let day = r.first + k;
                        let t = total[day - first];
                        per_cohort[day] = if t > 0.0 {
                            v * (d[day] / t).min(1.0)
                        } else {
                            0.0
                        };
                    }
                    runs.push(
                        upland_cohort(
                            crop,
                            soil,
                            &strategy,
                            w,
                            &climate,
                            r.first,
                            len,
                            Some(&per_cohort),
                        )
                        .map_err(|e| format!("season {open}: {e}"))?,
                    );
                }
                runs
            } else {
                base
            };
            for (r, &(_, share)) in runs.iter().zip(&cohort_list) {
                etc += r.etc * share;
                eta += r.eta * share;
                irr += r.irr * share;
            }
            out.seasons.push(SeasonOutcome {
                start: open,
                end,
                etc_mm: etc,
                etc_adj_mm: eta,
                net_irrigation_mm: irr,
                rain_mm: season_rain,
                percolation_mm: 0.0,
                yield_loss_pct: ky
                    .map(|k| relative_yield_loss(k, eta, etc).map(|l| l * 100.0))
                    .transpose()
                    .map_err(|e| e.to_string())?,
            });
        }
    }
    Ok(out)
}
