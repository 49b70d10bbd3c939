//! The per-planting step: one planting's daily NIR per hectare over the whole
//! weather record, and its seasons' totals and FAO-33 yield loss, optionally
//! on the water actually delivered.
//!
//! This is the single call the engine makes per planting
//! ([`simulate_planting`]): it maps the project's planting to a
//! [`PlantingSpec`] and calls [`run_planting`] (or
//! [`run_planting_with_delivery`] on delivered water), which simulate every
//! season of the record with its cohorts, paddy rice, effective rain and the
//! FAO-33 yield loss (see [`crate::planting`]).
//!
//! Only complete seasons (wholly inside the record) are returned; the others
//! are counted in [`PlantingOutcome::seasons_excluded`].

use chrono::NaiveDate;

use super::weather_prep::PreparedWeather;
use crate::balance::{self, RefillTarget, strategy::IntervalDepth};
use crate::crop::{Crop, CropGroup};
use crate::planting::{
    PlantingSpec, PlantingWarning, PlantingWeather, run_planting, run_planting_with_delivery,
};
use crate::project::{EffectiveRain, Planting, Strategy as PlanStrategy};
use crate::rain::EffectiveRainMethod;
use crate::soil::Soil;

/// Totals of one complete season (all cohorts, per hectare).
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
    /// Net irrigation reaching the root zone (mm).
    pub net_irrigation_mm: f64,
    /// Rain over the season (mm).
    pub rain_mm: f64,
    /// Seepage and percolation of paddy fields (mm; 0 for upland crops).
    pub percolation_mm: f64,
    /// FAO-33 relative yield loss (%).
    pub yield_loss_pct: Option<f64>,
}

/// Result of one planting over the record, per hectare planted.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PlantingOutcome {
    /// Net irrigation requirement (mm/day), one value per weather day, 0
    /// outside seasons.
    pub nir_mm: Vec<f64>,
    /// Complete seasons.
    pub seasons: Vec<SeasonOutcome>,
    /// Seasons left out of statistics (cut by the record's ends).
    pub seasons_excluded: usize,
    /// Warnings of the planting other than cut seasons.
    pub warnings: Vec<String>,
}

/// The balance's strategy for a project strategy.
///
/// The project's deficit trigger is a share of TAW; the balance's is a share
/// of the stress range TAW − RAW, with RAW = p·TAW (FAO-56 eq. 83, p of
/// Table 22): allowed stress = (t − p)/(1 − p).
pub fn balance_strategy(s: PlanStrategy, crop: &Crop) -> balance::Strategy {
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

/// The rain module's method for the project's choice. USDA-SCS needs the
/// usable soil storage D: taken as the crop's RAW at maximum rooting depth,
/// p·1000(θFC − θWP)·Zr,max (FAO-56 eqs. 82–83), the usual net application.
pub fn effective_rain_method(e: EffectiveRain, crop: &Crop, soil: &Soil) -> EffectiveRainMethod {
    match e {
        EffectiveRain::WaterBalance => EffectiveRainMethod::WaterBalance,
        EffectiveRain::UsdaScs => EffectiveRainMethod::UsdaScs {
            storage_mm: crop.depletion_p
                * 1000.0
                * (soil.theta_fc - soil.theta_wp)
                * crop.root_depth_max_m,
        },
        EffectiveRain::FixedPercent(pct) => EffectiveRainMethod::FixedPercentage {
            fraction: (pct / 100.0).clamp(0.0, 1.0),
        },
        EffectiveRain::Dependable => EffectiveRainMethod::DependableFaoTm3,
    }
}

/// Simulates one planting over the whole weather record, per hectare.
///
/// `delivered_net_mm`, when given, is the net depth (mm/day per hectare of
/// the planting) that actually reached the fields; the balance is re-run
/// with that water instead of the strategy, so ETc adj and the yield loss
/// follow from the delivery.
///
/// # Errors
/// The planting module's error as text (it names the season and cause).
pub fn simulate_planting(
    crop: &Crop,
    soil: &Soil,
    planting: &Planting,
    effective_rain: EffectiveRain,
    w: &PreparedWeather,
    delivered_net_mm: Option<&[f64]>,
) -> Result<PlantingOutcome, String> {
    let mut spec = PlantingSpec::new(
        crop,
        soil,
        planting.first_planting.month,
        planting.first_planting.day,
    );
    spec.spread_days = planting.spread_days;
    spec.season_length_days = planting.season_length_days;
    spec.strategy = balance_strategy(planting.strategy, crop);
    spec.effective_rain = effective_rain_method(effective_rain, crop, soil);
    let weather = PlantingWeather {
        start: w.start,
        et0_mm: &w.et0_mm,
        rain_mm: &w.rain_mm,
        wind_2m_ms: &w.wind_2m_ms,
        rhmin_pct: &w.rhmin_pct,
    };
    let result = match delivered_net_mm {
        Some(d) => run_planting_with_delivery(&spec, &weather, d),
        None => run_planting(&spec, &weather),
    }
    .map_err(|e| e.to_string())?;
    let paddy = crop.group == CropGroup::PaddyRice;
    let mut out = PlantingOutcome {
        nir_mm: result.nir_mm,
        ..PlantingOutcome::default()
    };
    for s in &result.seasons {
        if !s.complete {
            out.seasons_excluded += 1;
            continue;
        }
        out.seasons.push(SeasonOutcome {
            start: s.start,
            end: s.end,
            etc_mm: s.etc_mm,
            etc_adj_mm: s.etc_adj_mm,
            net_irrigation_mm: s.net_irrigation_mm,
            rain_mm: s.rain_mm,
            percolation_mm: if paddy { s.deep_perc_mm } else { 0.0 },
            yield_loss_pct: Some(s.relative_yield_loss * 100.0),
        });
    }
    for warning in &result.warnings {
        match warning {
            PlantingWarning::SeasonCut { .. } => {}
            other => out
                .warnings
                .push(format!("planting {}: {other:?}", planting.id)),
        }
    }
    Ok(out)
}
