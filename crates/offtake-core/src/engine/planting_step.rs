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
    CoefficientMode, PlantingSpec, PlantingWarning, PlantingWeather, Wetting, run_planting,
    run_planting_with_delivery,
};
use crate::project::{
    Block, CoefficientChoice, EffectiveRain, PaddyInputs, Planting, Strategy as PlanStrategy,
};
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
    /// Crop ET under no stress (mm/day), one value per weather day
    /// (area-weighted over cohorts, 0 outside seasons).
    pub etc_mm: Vec<f64>,
    /// Effective rain (mm/day), one value per weather day.
    pub peff_mm: Vec<f64>,
    /// Largest mean ETc over a calendar 10-day period of the record
    /// (mm/day, per hectare planted; 0 when the crop is never in the field).
    pub peak_etc_10day_mm_day: f64,
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

/// Whether the planting is computed by the paddy balance (a paddy rice crop).
pub fn is_paddy(crop: &Crop) -> bool {
    crop.group == CropGroup::PaddyRice
}

/// The field application efficiency that replaces the block's Ea for this
/// planting, if any: for paddy rice the paddy field efficiency (operational
/// losses only, because the paddy NIR already holds seepage, percolation and
/// land preparation; [`PaddyInputs`], default 0.9), `None` for other crops.
pub fn application_efficiency_override(crop: &Crop, planting: &Planting) -> Option<f64> {
    is_paddy(crop).then(|| planting.paddy.unwrap_or_default().field_efficiency)
}

/// The paddy inputs used for a planting: its own, or the defaults.
pub fn paddy_inputs(planting: &Planting) -> PaddyInputs {
    planting.paddy.unwrap_or_default()
}

/// Largest mean of a daily series (from `start`) over a calendar 10-day
/// period (days 1–10, 11–20, 21–end), over the days of the period inside
/// the series; 0 for an empty series.
pub fn peak_10day_mean(start: NaiveDate, daily: &[f64]) -> f64 {
    crate::scheme::aggregate_periods(start, daily, crate::scheme::PeriodStep::TenDay, 0.0)
        .iter()
        .map(|p| p.volume_m3 / f64::from(p.covered_days.max(1)))
        .fold(0.0, f64::max)
}

/// Readily available water and the peak ETc it is used at, for the
/// rotation-period check (issue 5: warn when the rotation period is longer
/// than the time the crop takes to use its readily available water, RAW ÷
/// ETc). `None` for a rainfed planting or one that never uses water.
///
/// * Upland crops: RAW = p × TAW at the maximum rooting depth (FAO-56 eqs.
///   82–83), with p adjusted for the peak ETc (FAO-56 Table 22 note:
///   p = p_table + 0.04 (5 − ETc), 0.1 ≤ p ≤ 0.8); ETc = the planting's
///   largest 10-day mean ETc (the safe choice).
/// * Paddy rice: the water a field holds between turns is its pond, used
///   by ETc and by seepage and percolation: "RAW" = the target pond depth,
///   "ETc" = peak ETc + S&P (so RAW ÷ ETc is the days the pond lasts).
///
/// Returns (RAW mm, rate mm/day).
pub fn raw_and_peak_etc(
    crop: &Crop,
    soil: &Soil,
    planting: &Planting,
    peak_etc_mm_day: f64,
) -> Option<(f64, f64)> {
    if matches!(planting.strategy, PlanStrategy::Rainfed)
        || !(peak_etc_mm_day.is_finite() && peak_etc_mm_day > 0.0)
    {
        return None;
    }
    if is_paddy(crop) {
        let inputs = paddy_inputs(planting);
        let rate = peak_etc_mm_day + inputs.percolation_seepage_mm_day;
        return (inputs.target_ponding_mm > 0.0).then_some((inputs.target_ponding_mm, rate));
    }
    let taw = soil.taw_mm(crop.root_depth_max_m).ok()?;
    let p = balance::depletion_fraction_adjusted(crop.depletion_p, peak_etc_mm_day);
    let raw = balance::readily_available_water_mm(p, taw);
    (raw.is_finite() && raw > 0.0).then_some((raw, peak_etc_mm_day))
}

/// How the block's irrigation wets the surface (fw, FAO-56 Table 20): the
/// planting's own fraction when its dual coefficient sets one, else read from
/// the block's irrigation method name. An unrecognised method name falls back
/// to full wetting (fw = 1, as sprinkler and basin) and returns a warning.
pub fn irrigation_wetting(planting: &Planting, block: &Block) -> (Wetting, Option<String>) {
    if let CoefficientChoice::Dual {
        wetted_fraction: Some(fw),
    } = planting.coefficients
    {
        return (Wetting::Fraction(fw), None);
    }
    match Wetting::from_method_name(&block.method.name) {
        Some(wetting) => (wetting, None),
        None => (
            Wetting::Sprinkler,
            Some(format!(
                "planting {}: irrigation method \"{}\" of block {} does not say how much of the surface it wets; fw = 1 (full wetting, FAO-56 Table 20) was used for Kc ini and the soil evaporation",
                planting.id, block.method.name, block.id
            )),
        ),
    }
}

/// The crop coefficient mode of a planting on its block (single Kc, or dual
/// Kcb + Ke), the wetting of its irrigation ([`irrigation_wetting`], used by
/// both: the single Kc's Kc ini and the dual Ke) and a warning when the
/// method's wetting is not known.
pub fn coefficient_mode(
    planting: &Planting,
    block: &Block,
) -> (CoefficientMode, Wetting, Option<String>) {
    let (wetting, warning) = irrigation_wetting(planting, block);
    let mode = match planting.coefficients {
        CoefficientChoice::Single => CoefficientMode::Single,
        CoefficientChoice::Dual { .. } => CoefficientMode::Dual { wetting },
    };
    (mode, wetting, warning)
}

/// The planting module's input for a project planting on `soil` in `block`:
/// window, season length, strategy, effective rain, coefficient mode and
/// wetting, the block's delivery rule and, for paddy rice, the paddy inputs. The one place a project planting becomes a
/// [`PlantingSpec`] (the engine and the app's season view both use it).
pub fn planting_spec<'a>(
    crop: &'a Crop,
    soil: &'a Soil,
    planting: &Planting,
    block: &Block,
    effective_rain: EffectiveRain,
) -> PlantingSpec<'a> {
    let (coefficients, wetting, _) = coefficient_mode(planting, block);
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
    spec.coefficients = coefficients;
    spec.irrigation_wetting = wetting;
    spec.delivery = block.delivery.rule();
    if is_paddy(crop) {
        spec.paddy = Some(paddy_inputs(planting).paddy_options());
    }
    spec
}

/// The planting module's view of the prepared weather.
pub fn planting_weather(w: &PreparedWeather) -> PlantingWeather<'_> {
    PlantingWeather {
        start: w.start,
        et0_mm: &w.et0_mm,
        rain_mm: &w.rain_mm,
        wind_2m_ms: &w.wind_2m_ms,
        rhmin_pct: &w.rhmin_pct,
    }
}

/// Simulates one planting over the whole weather record, per hectare.
///
/// `supply_factor`, when given, is the share of each day's requests the
/// block's outlet can deliver ([`super::outlets`]).
///
/// `delivered_net_mm`, when given, is the net depth (mm/day per hectare of
/// the planting) that actually reached the fields; the balance is re-run
/// with that water instead of the strategy, so ETc adj and the yield loss
/// follow from the delivery.
///
/// # Errors
/// The planting module's error as text (it names the season and cause).
#[expect(
    clippy::too_many_arguments,
    reason = "the planting, its block, the weather and the two delivery inputs, each named"
)]
pub fn simulate_planting(
    crop: &Crop,
    soil: &Soil,
    planting: &Planting,
    block: &Block,
    effective_rain: EffectiveRain,
    w: &PreparedWeather,
    delivered_net_mm: Option<&[f64]>,
    supply_factor: Option<&[f64]>,
) -> Result<PlantingOutcome, String> {
    let mut spec = planting_spec(crop, soil, planting, block, effective_rain);
    spec.supply_factor = supply_factor;
    let weather = planting_weather(w);
    let result = match delivered_net_mm {
        Some(d) => run_planting_with_delivery(&spec, &weather, d),
        None => run_planting(&spec, &weather),
    }
    .map_err(|e| e.to_string())?;
    let paddy = crop.group == CropGroup::PaddyRice;
    let mut out = PlantingOutcome {
        peak_etc_10day_mm_day: peak_10day_mean(w.start, &result.etc_mm),
        nir_mm: result.nir_mm,
        etc_mm: result.etc_mm,
        peff_mm: result.peff_mm,
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
            // Said once per crop (the engine removes repeats).
            PlantingWarning::KyUnknown { .. } | PlantingWarning::DeliveryRuleNotUsed { .. } => {
                out.warnings.push(warning.to_string());
            }
            other => out
                .warnings
                .push(format!("planting {}: {other}", planting.id)),
        }
    }
    Ok(out)
}
