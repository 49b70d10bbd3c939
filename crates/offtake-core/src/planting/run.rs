//! The computation behind [`run_planting`] (see the module documentation of
//! [`super`] for the rules).

use chrono::{Datelike, Days, NaiveDate};

use super::delivery::{
    DeliveryRule, MAX_CYCLE_DAYS, add_weighted_day, add_weighted_layer, mean_of_share_layers,
    mean_of_shares, share_first_day, spread_over_cycles, turn_strategy,
};
use super::dual::{
    CoefficientMode, DualFallback, KC_MIN, STANDARD_RHMIN_PCT, STANDARD_WIND_2M_MS, crop_height_m,
    kc_max_base,
};
use super::layout::{SeasonPlan, anniversary, cohort_offsets, is_chain, seasons};
use super::wetting_kc_ini::{
    KC_INI_TOLERANCE, MAX_PASSES, kc_ini_from_initial_stage, wetting_soil,
};
use super::{
    CohortDetail, KcIniRule, PaddyOptions, PlantingError, PlantingIrrigation, PlantingResult,
    PlantingSpec, PlantingWarning, PlantingWeather, SeasonDetail, SeasonSummary,
};
use crate::balance::evaporation::kc_max;
use crate::balance::{
    BalanceDay, BalanceParams, CropCoefficients, DailySeries, EvaporationDay, EvaporationLayer,
    ExposedWetted, IrrigationEvent, RunoffRule, Strategy, simulate,
};
use crate::crop::climate::DayClimate;
use crate::crop::{
    ClimateInput, CropGroup, CropSeries, CycleKind, SeasonSpec, crop_season_series,
    root::RootDepthChoice,
};
use crate::paddy::{PaddyDay, PaddyPlanting, paddy_planting_requirement};
use crate::rain::{EffectiveRainMethod, effective_rain_period_mm, period_totals};
use crate::salinity::leaching_requirement;
use crate::yield_response::{KY_UNKNOWN, relative_yield_loss};

/// The dual coefficient's fixed inputs, once the option applies.
#[derive(Clone, Copy)]
struct DualSetup {
    /// fw of irrigation (Table 20).
    fw: f64,
    /// TEW (mm), eq. 73.
    tew_mm: f64,
    /// REW (mm).
    rew_mm: f64,
    /// Base of eq. 72.
    kc_max_base: f64,
}

/// Validated inputs shared by every season.
struct Prepared<'s, 'w> {
    spec: &'s PlantingSpec<'s>,
    weather: &'w PlantingWeather<'w>,
    n: usize,
    runoff: RunoffRule,
    lr: f64,
    ky: f64,
    dual: Option<DualSetup>,
    /// The delivery rule in force (the block's, or its stand-in).
    delivery: DeliveryRule,
    warnings: Vec<PlantingWarning>,
}

/// One cohort's days inside the record.
struct CohortOut {
    index: usize,
    share: f64,
    /// Weather index of `days[0]`.
    first: usize,
    days: Vec<BalanceDay>,
    /// (weather index, net mm at the root zone).
    events: Vec<(usize, f64)>,
    complete: bool,
    /// Dual coefficient: the evaporation layer per day (else empty).
    evaporation: Vec<EvaporationDay>,
    /// Root-zone depletion before `days[0]` (mm).
    initial_depletion_mm: f64,
    /// Layer depletion before `days[0]` (mm).
    initial_evaporation_depletion_mm: f64,
    /// Kc ini of the run (single coefficient).
    kc_ini: f64,
    /// Each share's days under a rotation within the block (else empty).
    shares: Vec<Vec<BalanceDay>>,
}

/// One season (or chain) and its cohorts.
struct PlanOut {
    plan: SeasonPlan,
    span_start: NaiveDate,
    /// Inclusive.
    span_end: NaiveDate,
    complete: bool,
    cohorts: Vec<CohortOut>,
}

fn setting(
    name: &'static str,
    value: f64,
    ok: bool,
    expected: &'static str,
) -> Result<(), PlantingError> {
    if value.is_finite() && ok {
        Ok(())
    } else {
        Err(PlantingError::BadSetting {
            name,
            value,
            expected,
        })
    }
}

fn prepare<'s, 'w>(
    spec: &'s PlantingSpec<'s>,
    weather: &'w PlantingWeather<'w>,
) -> Result<Prepared<'s, 'w>, PlantingError> {
    let n = weather.et0_mm.len();
    for (series, s) in [
        ("rain_mm", weather.rain_mm),
        ("wind_2m_ms", weather.wind_2m_ms),
        ("rhmin_pct", weather.rhmin_pct),
    ] {
        if s.len() != n {
            return Err(PlantingError::WeatherLength {
                series,
                expected: n,
                found: s.len(),
            });
        }
    }
    for (series, s) in [("et0_mm", weather.et0_mm), ("rain_mm", weather.rain_mm)] {
        if let Some(i) = s.iter().position(|v| !(v.is_finite() && *v >= 0.0)) {
            return Err(PlantingError::BadWeather {
                series,
                date: weather.start + Days::new(i as u64),
                value: s[i],
            });
        }
    }
    spec.crop.validate()?;
    spec.soil.validate()?;
    setting(
        "initial_depletion_pct_of_taw",
        spec.initial_depletion_pct_of_taw,
        (0.0..=100.0).contains(&spec.initial_depletion_pct_of_taw),
        "0 to 100 % of TAW",
    )?;
    setting(
        "spread_days",
        f64::from(spec.spread_days),
        spec.spread_days <= 366,
        "0 to 366 days",
    )?;
    if let Some(l) = spec.season_length_days {
        setting(
            "season_length_days",
            f64::from(l),
            (4..=36_600).contains(&l),
            "4 to 36600 days",
        )?;
    }
    let mut warnings = Vec::new();
    let paddy = spec.crop.group == CropGroup::PaddyRice && !is_chain(spec);
    let lr = match spec.leaching {
        None => 0.0,
        Some(_) if paddy => {
            warnings.push(PlantingWarning::LeachingNotForPaddy);
            0.0
        }
        Some(l) => {
            let ece = match (l.ece_ds_m, spec.crop.salinity) {
                (Some(e), _) => e,
                (None, Some(s)) => s.ece_threshold_ds_m,
                (None, None) => {
                    return Err(PlantingError::NoSalinityThreshold {
                        crop: spec.crop.id.clone(),
                    });
                }
            };
            leaching_requirement(l.ecw_ds_m, ece)?
        }
    };
    let ky = if let Some(k) = spec.crop.ky_seasonal {
        k
    } else {
        warnings.push(PlantingWarning::KyUnknown {
            crop: spec.crop.id.clone(),
        });
        KY_UNKNOWN
    };
    let dual = match spec.coefficients {
        CoefficientMode::Single => None,
        CoefficientMode::Dual { wetting } => {
            let fw = wetting.fw();
            setting("wetting fw", fw, fw > 0.0 && fw <= 1.0, "0 < fw ≤ 1")?;
            let fallback = if paddy {
                Some(DualFallback::PaddyRice)
            } else if !matches!(spec.effective_rain, EffectiveRainMethod::WaterBalance) {
                Some(DualFallback::PeriodEffectiveRain)
            } else if spec.crop.kcb.is_none() {
                Some(DualFallback::NoKcb)
            } else {
                None
            };
            if let Some(reason) = fallback {
                warnings.push(PlantingWarning::DualCoefficientNotUsed {
                    crop: spec.crop.id.clone(),
                    reason,
                });
                None
            } else {
                Some(DualSetup {
                    fw,
                    tew_mm: spec.soil.tew_mm()?,
                    rew_mm: spec.soil.rew_mm,
                    kc_max_base: kc_max_base(&spec.strategy),
                })
            }
        }
    };
    let delivery = delivery_in_force(spec, paddy, &mut warnings)?;
    if let Some(f) = spec.supply_factor {
        if f.len() != n {
            return Err(PlantingError::WeatherLength {
                series: "supply_factor",
                expected: n,
                found: f.len(),
            });
        }
        if let Some(i) = f
            .iter()
            .position(|v| !(v.is_finite() && (0.0..=1.0).contains(v)))
        {
            return Err(PlantingError::BadWeather {
                series: "supply_factor",
                date: weather.start + Days::new(i as u64),
                value: f[i],
            });
        }
    }
    let runoff = spec.runoff.unwrap_or(RunoffRule {
        curve_number: Some(spec.soil.curve_number),
        max_infiltration_mm_day: Some(spec.soil.max_infiltration_mm_day),
    });
    Ok(Prepared {
        spec,
        weather,
        n,
        runoff,
        lr,
        ky,
        dual,
        delivery,
        warnings,
    })
}

/// The delivery rule a planting is computed with: the block's, checked; a
/// rotation within the block becomes continuous flow for paddy rice and on
/// demand for the period-total effective-rain methods (see [`super::delivery`]).
fn delivery_in_force(
    spec: &PlantingSpec<'_>,
    paddy: bool,
    warnings: &mut Vec<PlantingWarning>,
) -> Result<DeliveryRule, PlantingError> {
    let cycle = spec.delivery.cycle_days();
    setting(
        "delivery cycle_days",
        f64::from(cycle),
        (1..=MAX_CYCLE_DAYS).contains(&cycle),
        "1 to 30 days",
    )?;
    let DeliveryRule::RotationWithinBlock {
        cycle_days,
        min_depth_mm,
    } = spec.delivery
    else {
        return Ok(spec.delivery);
    };
    setting(
        "delivery min_depth_mm",
        min_depth_mm,
        min_depth_mm >= 0.0,
        "a depth of 0 mm or more",
    )?;
    if paddy {
        warnings.push(PlantingWarning::DeliveryRuleNotUsed {
            crop: spec.crop.id.clone(),
            reason: "paddy rice is ponded and was delivered as continuous flow over the same cycle"
                .to_owned(),
        });
        return Ok(DeliveryRule::ContinuousFlow { cycle_days });
    }
    if !matches!(spec.effective_rain, EffectiveRainMethod::WaterBalance) {
        warnings.push(PlantingWarning::DeliveryRuleNotUsed {
            crop: spec.crop.id.clone(),
            reason: "the period-total effective-rain method has no daily soil balance, so it was computed on demand"
                .to_owned(),
        });
        return Ok(DeliveryRule::OnDemand);
    }
    Ok(spec.delivery)
}

fn index_of(weather: &PlantingWeather<'_>, date: NaiveDate) -> i64 {
    (date - weather.start).num_days()
}

fn date_of(weather: &PlantingWeather<'_>, index: usize) -> NaiveDate {
    weather.start + Days::new(index as u64)
}

/// The crop series of a cohort planted on `start`, with the climate of its
/// own days (days before the record are missing to the adjustment).
fn crop_series(
    p: &Prepared<'_, '_>,
    start: NaiveDate,
    length: Option<u32>,
    kc_ini_override: Option<f64>,
) -> Result<CropSeries, PlantingError> {
    let s = index_of(p.weather, start);
    let days = i64::from(length.unwrap_or_else(|| p.spec.crop.stages.total_days()));
    // The season's own weather days; days outside the record are missing (NaN)
    // and left out of the stage means.
    let climate: Vec<DayClimate> = (s..s + days)
        .map(|g| {
            if g >= 0 && (g as usize) < p.n {
                let g = g as usize;
                DayClimate {
                    u2_ms: p.weather.wind_2m_ms[g],
                    rhmin_pct: p.weather.rhmin_pct[g],
                }
            } else {
                DayClimate {
                    u2_ms: f64::NAN,
                    rhmin_pct: f64::NAN,
                }
            }
        })
        .collect();
    // FAO-56 Table 22 note (footnote 1): the smaller depth of the range is
    // for irrigation scheduling, the larger for rainfed crops and stress.
    let root_depth = if matches!(p.spec.strategy, Strategy::Rainfed) {
        RootDepthChoice::Stress
    } else {
        RootDepthChoice::Scheduling
    };
    let season = SeasonSpec {
        length_days: length,
        climate: ClimateInput::Daily(&climate),
        kc_ini_override,
        root_depth,
        ..SeasonSpec::new(start)
    };
    Ok(crop_season_series(p.spec.crop, &season)?)
}

/// Range of weather indices covered by crop days starting at index `s`.
fn in_record(s: i64, len: usize, n: usize) -> (usize, usize) {
    let a = s.max(0) as usize;
    let b = (s + len as i64).clamp(0, n as i64) as usize;
    (a.min(b), b)
}

/// Root-zone balance of one cohort over its days inside the record, with
/// the single coefficient's Kc ini from the wetting events of its initial
/// stage where that applies (see [`super::wetting_kc_ini`]: at most
/// [`MAX_PASSES`] balance runs).
fn balance_cohort(
    p: &Prepared<'_, '_>,
    index: usize,
    start: NaiveDate,
    share: f64,
    length: Option<u32>,
    delivery: Option<&[f64]>,
) -> Result<CohortOut, PlantingError> {
    let DeliveryRule::RotationWithinBlock {
        cycle_days,
        min_depth_mm,
    } = p.delivery
    else {
        return balance_unit(p, index, start, share, length, delivery, None, None);
    };
    if delivery.is_some() {
        return balance_unit(p, index, start, share, length, delivery, None, None);
    }
    // Each share of the block's area: its own turns and balance; Kc ini from
    // share 0's wetting, used for all.
    let n = cycle_days as usize;
    let first = index_of(p.weather, start).max(0) as usize;
    let turns = |k: usize| Some((n, share_first_day(k, n, first), min_depth_mm));
    let first_share = balance_unit(p, index, start, share, length, None, turns(0), None)?;
    let kc_ini = first_share.kc_ini;
    // One crop series for the other shares (same cohort, same Kc ini).
    let series = crop_series(p, start, length, Some(kc_ini))?;
    let mut shares = vec![first_share];
    for k in 1..n {
        shares.push(balance_unit(
            p,
            index,
            start,
            share,
            length,
            None,
            turns(k),
            Some((kc_ini, &series)),
        )?);
    }
    let days: Vec<Vec<BalanceDay>> = shares.iter().map(|s| s.days.clone()).collect();
    let layers: Vec<Vec<EvaporationDay>> = shares.iter().map(|s| s.evaporation.clone()).collect();
    let w = 1.0 / n as f64;
    let mut events: Vec<(usize, f64)> = shares
        .iter()
        .flat_map(|s| s.events.iter().map(move |&(g, mm)| (g, mm * w)))
        .collect();
    events.sort_by_key(|e| e.0);
    let mut out = shares.swap_remove(0);
    out.days = mean_of_shares(&days);
    out.evaporation = mean_of_share_layers(&layers);
    out.events = events;
    out.shares = days;
    Ok(out)
}

/// One balance unit (a cohort, or one share of it under a rotation within
/// the block: `turns` = (cycle days, first turn day, minimum depth)), with
/// the Kc ini iteration unless `fixed_kc_ini` is given.
#[expect(
    clippy::too_many_arguments,
    reason = "the unit's inputs, passed straight through"
)]
fn balance_unit(
    p: &Prepared<'_, '_>,
    index: usize,
    start: NaiveDate,
    share: f64,
    length: Option<u32>,
    delivery: Option<&[f64]>,
    turns: Option<(usize, usize, f64)>,
    fixed: Option<(f64, &CropSeries)>,
) -> Result<CohortOut, PlantingError> {
    if let Some((kc_ini, series)) = fixed {
        let (mut out, _) = balance_cohort_once(p, index, start, share, delivery, turns, series)?;
        out.kc_ini = kc_ini;
        return Ok(out);
    }
    let adjust = p.dual.is_none()
        && p.spec.kc_ini == KcIniRule::FromWetting
        && matches!(p.spec.effective_rain, EffectiveRainMethod::WaterBalance)
        && matches!(p.spec.crop.cycle, CycleKind::Annual)
        && index_of(p.weather, start) >= 0;
    let starts_wet = p.spec.initial_depletion_pct_of_taw <= 0.0;
    let fw = p.spec.irrigation_wetting.fw();
    let soil = wetting_soil(p.spec.soil);
    let mut kc_ini = None;
    let mut pass = 1;
    loop {
        let series = crop_series(p, start, length, kc_ini)?;
        let (mut out, ini_days) =
            balance_cohort_once(p, index, start, share, delivery, turns, &series)?;
        out.kc_ini = kc_ini.unwrap_or(p.spec.crop.kc.ini);
        if !adjust || pass == MAX_PASSES {
            return Ok(out);
        }
        let stage = &out.days[..ini_days.min(out.days.len())];
        let Some(w) = kc_ini_from_initial_stage(stage, starts_wet, fw, soil) else {
            return Ok(out);
        };
        if (w.kc_ini - out.kc_ini).abs() < KC_INI_TOLERANCE {
            return Ok(out);
        }
        kc_ini = Some(w.kc_ini);
        pass += 1;
    }
}

/// One balance run of a cohort (or share) with a given Kc ini (`None`:
/// Table 12); also returns the length of its first initial stage (days).
fn balance_cohort_once(
    p: &Prepared<'_, '_>,
    index: usize,
    start: NaiveDate,
    share: f64,
    delivery: Option<&[f64]>,
    turns: Option<(usize, usize, f64)>,
    series: &CropSeries,
) -> Result<(CohortOut, usize), PlantingError> {
    let ini_days = series
        .cycles
        .first()
        .map_or(0, |c| c.lengths.ini_days as usize);
    let s = index_of(p.weather, start);
    let len = series.days.len();
    let (a, b) = in_record(s, len, p.n);
    let complete = s >= 0 && s + len as i64 <= p.n as i64;
    let mut out = CohortOut {
        index,
        share,
        first: a,
        days: Vec::new(),
        events: Vec::new(),
        complete,
        evaporation: Vec::new(),
        initial_depletion_mm: 0.0,
        initial_evaporation_depletion_mm: 0.0,
        kc_ini: p.spec.crop.kc.ini,
        shares: Vec::new(),
    };
    if a >= b {
        return Ok((out, ini_days));
    }
    let local = (a as i64 - s) as usize..(b as i64 - s) as usize;
    let crop_days = &series.days[local];
    let kc: Vec<f64> = crop_days.iter().map(|d| d.kc).collect();
    let root: Vec<f64> = crop_days.iter().map(|d| d.root_depth_m).collect();
    let et0 = &p.weather.et0_mm[a..b];
    let rain = &p.weather.rain_mm[a..b];
    let taw_per_m = p.spec.soil.taw_per_m_mm();

    if let EffectiveRainMethod::WaterBalance = p.spec.effective_rain {
        let strategy = match delivery {
            None => match turns {
                Some((cycle, first_day, min_mm)) => {
                    turn_strategy(&p.spec.strategy, cycle, first_day, min_mm)
                }
                None => p.spec.strategy.clone(),
            },
            Some(d) => Strategy::Scheduled(
                d[a..b]
                    .iter()
                    .enumerate()
                    .filter(|(_, v)| **v > 0.0)
                    .map(|(day, v)| IrrigationEvent {
                        day,
                        net_mm: v * (1.0 - p.lr),
                    })
                    .collect(),
            ),
        };
        let initial_fraction = p.spec.initial_depletion_pct_of_taw / 100.0;
        let params = BalanceParams {
            taw_mm_per_m: taw_per_m,
            p_table: p.spec.crop.depletion_p,
            adjust_p_for_etc: true,
            initial_depletion_mm: initial_fraction * taw_per_m * root[0],
            runoff: p.runoff,
            strategy,
            supply_factor: p.spec.supply_factor.map(|f| std::sync::Arc::from(&f[a..b])),
        };
        // Dual coefficient inputs (FAO-56 Chapter 7), when the option applies.
        let dual = p.dual.and_then(|d| {
            let kcb: Option<Vec<f64>> = crop_days.iter().map(|c| c.kcb).collect();
            kcb.map(|kcb| (d, kcb))
        });
        let dual_inputs = dual.map(|(d, kcb)| {
            let height: Vec<f64> = crop_days
                .iter()
                .map(|c| {
                    let lengths = series
                        .cycles
                        .get(c.cycle as usize)
                        .map_or(p.spec.crop.stages, |cy| cy.lengths);
                    crop_height_m(
                        p.spec.crop.max_height_m,
                        &p.spec.crop.cycle,
                        c.stage,
                        c.day_in_cycle,
                        &lengths,
                    )
                })
                .collect();
            let kc_max_day: Vec<f64> = (0..kcb.len())
                .map(|i| {
                    let u2 = p.weather.wind_2m_ms[a + i];
                    let rh = p.weather.rhmin_pct[a + i];
                    let u2 = if u2.is_finite() && u2 >= 0.0 {
                        u2
                    } else {
                        STANDARD_WIND_2M_MS
                    };
                    let rh = if rh.is_finite() && (0.0..=100.0).contains(&rh) {
                        rh
                    } else {
                        STANDARD_RHMIN_PCT
                    };
                    kc_max(d.kc_max_base, u2, rh, height[i], kcb[i])
                })
                .collect();
            let layer = EvaporationLayer {
                tew_mm: d.tew_mm,
                rew_mm: d.rew_mm,
                initial_depletion_mm: initial_fraction * d.tew_mm,
                fw_irrigation: d.fw,
            };
            (kcb, kc_max_day, height, layer)
        });
        let crop_coefficients = match &dual_inputs {
            None => CropCoefficients::Single { kc: &kc },
            Some((kcb, kc_max_day, height, layer)) => CropCoefficients::Dual {
                kcb,
                kc_max: kc_max_day,
                layer: *layer,
                few: ExposedWetted::FromCanopy {
                    kc_min: KC_MIN,
                    crop_height_m: height,
                },
            },
        };
        let run = simulate(
            &DailySeries {
                et0_mm: et0,
                rain_mm: rain,
                crop: crop_coefficients,
                root_depth_m: &root,
                capillary_rise_mm: None,
            },
            &params,
        )?;
        out.events = run.events.iter().map(|e| (a + e.day, e.net_mm)).collect();
        out.days = run.days;
        out.evaporation = run.evaporation;
        out.initial_depletion_mm = run.initial_depletion_mm;
        out.initial_evaporation_depletion_mm = dual_inputs
            .as_ref()
            .map_or(0.0, |d| d.3.initial_depletion_mm);
        return Ok((out, ini_days));
    }

    // Period-total effective rain: NIR = max(0, ETc − Pe) per period, spread evenly.
    let etc: Vec<f64> = kc.iter().zip(et0).map(|(k, e)| k * e).collect();
    let periods = period_totals(date_of(p.weather, a), rain, &etc, p.spec.rain_period)?;
    let nir = crate::rain::daily_nir_from_periods(p.spec.effective_rain, &periods)?;
    let mut peff = Vec::with_capacity(etc.len());
    for period in &periods {
        let pe = effective_rain_period_mm(p.spec.effective_rain, period)?;
        peff.extend(std::iter::repeat_n(
            pe / f64::from(period.days),
            period.days as usize,
        ));
    }
    out.days = (0..etc.len())
        .map(|i| {
            let taw = taw_per_m * root[i];
            let mut irrigation = nir[i];
            let mut etc_adj = etc[i];
            if let Some(d) = delivery {
                let got = d[a + i] * (1.0 - p.lr);
                if got < irrigation {
                    etc_adj = (etc_adj - (irrigation - got)).max(0.0);
                    irrigation = got;
                }
            }
            BalanceDay {
                et0_mm: et0[i],
                kc: kc[i],
                etc_mm: etc[i],
                etc_adj_mm: etc_adj,
                rain_mm: rain[i],
                peff_mm: peff[i],
                irrigation_mm: irrigation,
                taw_mm: taw,
                raw_mm: p.spec.crop.depletion_p * taw,
                p: p.spec.crop.depletion_p,
                ks: 1.0,
                ..BalanceDay::default()
            }
        })
        .collect();
    Ok((out, ini_days))
}

/// A paddy season: land preparation, nursery and main field of every
/// group, as one area-weighted pseudo-cohort over the paddy calendar.
fn paddy_season(
    p: &mut Prepared<'_, '_>,
    plan: &SeasonPlan,
    first: NaiveDate,
    delivery: Option<&[f64]>,
) -> Result<PlanOut, PlantingError> {
    let opts: PaddyOptions = p.spec.paddy.unwrap_or_default();
    let groups = cohort_offsets(p.spec.spread_days).len();
    let planting = PaddyPlanting {
        field: opts.field,
        land_prep: opts.land_prep,
        nursery: opts.nursery,
        window_days: p.spec.spread_days.saturating_sub(1) as usize,
        groups,
    };
    let series = crop_series(p, first, p.spec.season_length_days, None)?;
    let kc = series.kc();
    let lead = planting.lead_days();
    let total = planting.calendar_days(kc.len());
    let cal_start = first - Days::new(lead as u64);
    let span_end = cal_start + Days::new(total as u64 - 1);
    let s = index_of(p.weather, cal_start);
    let mut out = PlanOut {
        plan: plan.clone(),
        span_start: cal_start,
        span_end,
        complete: false,
        cohorts: Vec::new(),
    };
    if s < 0 || s as usize + total > p.n {
        p.warnings
            .push(PlantingWarning::PaddySeasonNotComputed { year: plan.year });
        return Ok(out);
    }
    let a = s as usize;
    let days: Vec<PaddyDay> = paddy_planting_requirement(
        &p.weather.et0_mm[a..a + total],
        &p.weather.rain_mm[a..a + total],
        &kc,
        &planting,
    )?;
    let mut shortfall = (0usize, 0.0);
    let mut events = Vec::new();
    let balance_days = days
        .iter()
        .enumerate()
        .map(|(i, d)| {
            let mut irrigation = d.nir_mm * p.spec.supply_factor.map_or(1.0, |f| f[a + i]);
            if let Some(del) = delivery {
                let got = del[a + i] * (1.0 - p.lr);
                if got < irrigation {
                    shortfall.0 += 1;
                    shortfall.1 += irrigation - got;
                    irrigation = got;
                }
            }
            if irrigation > 0.0 {
                events.push((a + i, irrigation));
            }
            let rain = p.weather.rain_mm[a + i];
            BalanceDay {
                et0_mm: p.weather.et0_mm[a + i],
                kc: if p.weather.et0_mm[a + i] > 0.0 {
                    d.etc_mm / p.weather.et0_mm[a + i]
                } else {
                    0.0
                },
                etc_mm: d.etc_mm,
                etc_adj_mm: d.etc_mm,
                rain_mm: rain,
                runoff_mm: (d.field_share * rain - d.peff_mm).max(0.0),
                peff_mm: d.peff_mm,
                irrigation_mm: irrigation,
                deep_perc_mm: d.percolation_mm,
                ks: 1.0,
                ..BalanceDay::default()
            }
        })
        .collect();
    if shortfall.0 > 0 {
        p.warnings.push(PlantingWarning::DeliveryShortfall {
            days: shortfall.0,
            shortfall_mm: shortfall.1,
        });
    }
    out.complete = true;
    out.cohorts.push(CohortOut {
        index: 0,
        share: 1.0,
        first: a,
        days: balance_days,
        events,
        complete: true,
        evaporation: Vec::new(),
        initial_depletion_mm: 0.0,
        initial_evaporation_depletion_mm: 0.0,
        kc_ini: p.spec.crop.kc.ini,
        shares: Vec::new(),
    });
    Ok(out)
}

/// Computes every season of the planting.
fn compute_plans(
    p: &mut Prepared<'_, '_>,
    delivery: Option<&[f64]>,
) -> Result<Vec<PlanOut>, PlantingError> {
    let plans = seasons(p.spec, p.weather.start, p.n, &mut p.warnings)?;
    let paddy = p.spec.crop.group == CropGroup::PaddyRice && !is_chain(p.spec);
    let mut outs = Vec::with_capacity(plans.len());
    for plan in plans {
        if paddy {
            outs.push(paddy_season(p, &plan, plan.first, delivery)?);
            continue;
        }
        let length = if is_chain(p.spec) {
            Some(plan.length_days)
        } else {
            p.spec.season_length_days
        };
        let mut cohorts = Vec::with_capacity(plan.cohorts.len());
        for (k, c) in plan.cohorts.iter().enumerate() {
            cohorts.push(balance_cohort(
                p,
                k,
                c.start,
                c.area_share,
                length,
                delivery,
            )?);
        }
        let span_start = plan.cohorts[0].start;
        let last = plan.cohorts[plan.cohorts.len() - 1].start;
        let span_end = last + Days::new(u64::from(plan.length_days) - 1);
        let complete = cohorts.iter().all(|c| c.complete);
        if !complete && !is_chain(p.spec) {
            p.warnings.push(PlantingWarning::SeasonCut {
                year: plan.year,
                start: span_start,
                end: span_end,
            });
        }
        outs.push(PlanOut {
            plan,
            span_start,
            span_end,
            complete,
            cohorts,
        });
    }
    Ok(outs)
}

/// Totals of the cohort days whose weather index is in `lo..hi`.
fn summarise(
    p: &Prepared<'_, '_>,
    cohorts: &[CohortOut],
    lo: usize,
    hi: usize,
) -> Result<SeasonSummary, PlantingError> {
    let mut s = SeasonSummary {
        year: 0,
        start: p.weather.start,
        end: p.weather.start,
        complete: false,
        et0_mm: 0.0,
        etc_mm: 0.0,
        etc_adj_mm: 0.0,
        rain_mm: 0.0,
        peff_mm: 0.0,
        nir_mm: 0.0,
        net_irrigation_mm: 0.0,
        irrigation_count: 0.0,
        deep_perc_mm: 0.0,
        runoff_mm: 0.0,
        evaporation_mm: 0.0,
        relative_yield_loss: 0.0,
        leaching_requirement: p.lr,
        kc_ini: 0.0,
        irrigations: Vec::new(),
    };
    for c in cohorts {
        let w = c.share;
        let (mut etc, mut etc_adj) = (0.0, 0.0);
        let from = lo.saturating_sub(c.first).min(c.days.len());
        let to = hi.saturating_sub(c.first).min(c.days.len()).max(from);
        for d in &c.days[from..to] {
            s.et0_mm += w * d.et0_mm;
            etc += d.etc_mm;
            etc_adj += d.etc_adj_mm;
            s.rain_mm += w * d.rain_mm;
            s.peff_mm += w * d.peff_mm;
            s.net_irrigation_mm += w * d.irrigation_mm;
            s.deep_perc_mm += w * d.deep_perc_mm;
            s.runoff_mm += w * d.runoff_mm;
        }
        s.evaporation_mm += w * c.evaporation
            [from.min(c.evaporation.len())..to.min(c.evaporation.len())]
            .iter()
            .map(|e| e.evaporation_mm)
            .sum::<f64>();
        s.etc_mm += w * etc;
        s.etc_adj_mm += w * etc_adj;
        s.kc_ini += w * c.kc_ini;
        s.relative_yield_loss += w * relative_yield_loss(p.ky, etc_adj, etc)?;
        for &(g, net_mm) in &c.events {
            if g >= lo && g < hi {
                s.irrigation_count += w;
                s.irrigations.push(PlantingIrrigation {
                    date: date_of(p.weather, g),
                    cohort: c.index,
                    area_share: w,
                    net_mm,
                });
            }
        }
    }
    s.irrigations.sort_by_key(|e| (e.date, e.cohort));
    s.nir_mm = s.net_irrigation_mm / (1.0 - p.lr);
    Ok(s)
}

/// One irrigation year of a chain: (year, first weather index, end index
/// exclusive, start date, complete).
type IrrigationYear = (i32, usize, usize, NaiveDate, bool);

/// Irrigation years of a chain, from the first planting date to the chain's end.
fn irrigation_years(
    p: &Prepared<'_, '_>,
    out: &PlanOut,
) -> Result<Vec<IrrigationYear>, PlantingError> {
    let (m, d) = (p.spec.first_planting_month, p.spec.first_planting_day);
    let first = out.plan.first;
    let chain_end = index_of(p.weather, out.span_end) + 1;
    let mut years = Vec::new();
    let mut y = first.year();
    let mut start = first;
    loop {
        let lo = index_of(p.weather, start);
        if lo >= chain_end {
            break;
        }
        let next = anniversary(y + 1, m, d, &mut Vec::new())?;
        let hi = index_of(p.weather, next);
        let complete = lo >= 0 && hi <= p.n as i64 && hi <= chain_end;
        years.push((
            y,
            lo.max(0) as usize,
            hi.clamp(0, p.n as i64) as usize,
            start,
            complete,
        ));
        y += 1;
        start = next;
    }
    Ok(years)
}

fn run_common(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
    delivery: Option<&[f64]>,
) -> Result<PlantingResult, PlantingError> {
    let mut p = prepare(spec, weather)?;
    if let Some(d) = delivery {
        if d.len() != p.n {
            return Err(PlantingError::WeatherLength {
                series: "delivered_net_mm",
                expected: p.n,
                found: d.len(),
            });
        }
        if let Some(i) = d.iter().position(|v| !(v.is_finite() && *v >= 0.0)) {
            return Err(PlantingError::BadWeather {
                series: "delivered_net_mm",
                date: date_of(weather, i),
                value: d[i],
            });
        }
    }
    let outs = compute_plans(&mut p, delivery)?;
    let n = p.n;
    let mut result = PlantingResult {
        nir_mm: vec![0.0; n],
        etc_mm: vec![0.0; n],
        etc_adj_mm: vec![0.0; n],
        peff_mm: vec![0.0; n],
        evaporation_mm: vec![0.0; n],
        seasons: Vec::new(),
        warnings: Vec::new(),
    };
    let to_nir = 1.0 / (1.0 - p.lr);
    let spread_cycle = match p.delivery {
        DeliveryRule::ContinuousFlow { cycle_days } => cycle_days as usize,
        _ => 1,
    };
    for out in &outs {
        for c in &out.cohorts {
            let w = c.share;
            for (i, d) in c.days.iter().enumerate() {
                let g = c.first + i;
                result.nir_mm[g] += w * d.irrigation_mm * to_nir;
                result.etc_mm[g] += w * d.etc_mm;
                result.etc_adj_mm[g] += w * d.etc_adj_mm;
                result.peff_mm[g] += w * d.peff_mm;
            }
            for (i, e) in c.evaporation.iter().enumerate() {
                result.evaporation_mm[c.first + i] += w * e.evaporation_mm;
            }
        }
        if is_chain(spec) {
            for (year, lo, hi, start, complete) in irrigation_years(&p, out)? {
                let mut s = summarise(&p, &out.cohorts, lo, hi)?;
                s.year = year;
                s.start = start;
                s.end = anniversary(
                    year + 1,
                    spec.first_planting_month,
                    spec.first_planting_day,
                    &mut Vec::new(),
                )?
                .pred_opt()
                .unwrap_or(start);
                s.complete = complete;
                result.seasons.push(s);
            }
        } else {
            let mut s = summarise(&p, &out.cohorts, 0, n)?;
            s.year = out.plan.year;
            s.start = out.span_start;
            s.end = out.span_end;
            s.complete = out.complete;
            result.seasons.push(s);
        }
    }
    // Continuous flow: each cycle's requirement at a steady rate.
    spread_over_cycles(&mut result.nir_mm, spread_cycle);
    result.warnings = p.warnings;
    Ok(result)
}

/// Runs one planting over the whole weather record (see the module
/// documentation for seasons, cohorts, perennials, effective-rain methods,
/// paddy rice and leaching).
///
/// # Errors
/// [`PlantingError`] for weather series of unequal length or with a missing
/// ET₀ or rain value, an invalid crop or soil entry, a setting out of range,
/// or an error of the crop, balance, paddy, rain or salinity computations.
pub fn run_planting(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
) -> Result<PlantingResult, PlantingError> {
    run_common(spec, weather, None)
}

/// As [`run_planting`], but each cohort receives the given daily delivered
/// net depth (mm at the field per ha of planting area, one value per weather
/// day) instead of following the strategy — for rotation-limited supply.
/// With leaching, (1 − LR) of the delivered depth reaches the root-zone
/// balance. Paddy and period-method plantings take min(requirement,
/// delivered) each day; the shortfall is not carried forward (warning) and,
/// for the period methods, lowers ETc adj by the same depth.
///
/// # Errors
/// As [`run_planting`], and a delivery series of the wrong length or with a
/// negative or non-finite value.
pub fn run_planting_with_delivery(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
    delivered_net_mm: &[f64],
) -> Result<PlantingResult, PlantingError> {
    run_common(spec, weather, Some(delivered_net_mm))
}

/// The daily table of the season whose first planting date is in
/// `season_start_year` (perennials: the irrigation year starting on the
/// planting anniversary in that year), area-weighted over cohorts, over the
/// season's days inside the record. Cohorts not in the field on a day count
/// as zero depths there.
///
/// # Errors
/// As [`run_planting`]; [`PlantingError::NoSuchSeason`] when no season
/// starts in that year within the record.
pub fn season_detail(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
    season_start_year: i32,
) -> Result<SeasonDetail, PlantingError> {
    let mut p = prepare(spec, weather)?;
    let outs = compute_plans(&mut p, None)?;
    let (out, lo, hi, complete) = find_season(&p, &outs, season_start_year)?;
    let mut days = vec![BalanceDay::default(); hi - lo];
    for (g, day) in days.iter_mut().enumerate() {
        day.et0_mm = weather.et0_mm[lo + g];
        day.rain_mm = weather.rain_mm[lo + g];
    }
    let dual = out.cohorts.iter().any(|c| !c.evaporation.is_empty());
    let mut evaporation = if dual {
        vec![EvaporationDay::default(); hi - lo]
    } else {
        Vec::new()
    };
    for c in &out.cohorts {
        let w = c.share;
        for (i, d) in c.days.iter().enumerate() {
            let g = c.first + i;
            if g < lo || g >= hi {
                continue;
            }
            let t = &mut days[g - lo];
            add_weighted_day(t, d, w);
            t.ks += w * (d.ks - 1.0);
        }
        for (i, e) in c.evaporation.iter().enumerate() {
            let g = c.first + i;
            if g < lo || g >= hi {
                continue;
            }
            let t = &mut evaporation[g - lo];
            add_weighted_layer(t, e, w);
        }
    }
    for t in &mut days {
        // Ks: cohorts out of the field count as unstressed.
        t.ks += 1.0;
    }
    Ok(SeasonDetail {
        first_date: date_of(weather, lo),
        complete,
        days,
        evaporation,
    })
}

/// Each cohort's own daily balance (and evaporation layer, dual
/// coefficient) for the season whose first planting date is in
/// `season_start_year` (perennials: the chain), over its days inside the
/// record. Paddy and period-method plantings give their pseudo-balance as in
/// [`season_detail`].
///
/// # Errors
/// As [`season_detail`].
pub fn cohort_details(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
    season_start_year: i32,
) -> Result<Vec<CohortDetail>, PlantingError> {
    let mut p = prepare(spec, weather)?;
    let outs = compute_plans(&mut p, None)?;
    let (out, _, _, _) = find_season(&p, &outs, season_start_year)?;
    let fw = p.dual.map_or(1.0, |d| d.fw);
    Ok(out
        .cohorts
        .iter()
        .map(|c| CohortDetail {
            index: c.index,
            area_share: c.share,
            first_date: date_of(weather, c.first),
            complete: c.complete,
            initial_depletion_mm: c.initial_depletion_mm,
            initial_evaporation_depletion_mm: c.initial_evaporation_depletion_mm,
            fw_irrigation: fw,
            kc_ini: c.kc_ini,
            shares: c.shares.clone(),
            days: c.days.clone(),
            evaporation: c.evaporation.clone(),
        })
        .collect())
}

/// The computed season (or chain) of `season_start_year` and its weather
/// index range `lo..hi` and completeness.
fn find_season<'o>(
    p: &Prepared<'_, '_>,
    outs: &'o [PlanOut],
    season_start_year: i32,
) -> Result<(&'o PlanOut, usize, usize, bool), PlantingError> {
    let chain = is_chain(p.spec);
    let missing = PlantingError::NoSuchSeason {
        year: season_start_year,
    };
    let (out, lo, hi, complete) = if chain {
        let out = outs.first().ok_or(missing.clone())?;
        let (_, lo, hi, _, complete) = irrigation_years(p, out)?
            .into_iter()
            .find(|y| y.0 == season_start_year)
            .ok_or(missing)?;
        (out, lo, hi, complete)
    } else {
        let out = outs
            .iter()
            .find(|o| o.plan.year == season_start_year)
            .ok_or(missing.clone())?;
        let lo = out.cohorts.iter().map(|c| c.first).min().unwrap_or(0);
        let hi = out
            .cohorts
            .iter()
            .map(|c| c.first + c.days.len())
            .max()
            .unwrap_or(0);
        (out, lo, hi, out.complete)
    };
    if lo >= hi {
        return Err(PlantingError::NoSuchSeason {
            year: season_start_year,
        });
    }
    Ok((out, lo, hi, complete))
}

/// One season's daily balance table (see [`season_detail`], which also
/// gives the date of the first row).
///
/// # Errors
/// As [`season_detail`].
pub fn daily_detail(
    spec: &PlantingSpec<'_>,
    weather: &PlantingWeather<'_>,
    season_start_year: i32,
) -> Result<Vec<BalanceDay>, PlantingError> {
    season_detail(spec, weather, season_start_year).map(|d| d.days)
}
