//! All plantings of a project: their daily NIR in m³ per block and crop.
//!
//! Plantings with the same setting (crop, soil, window, season length,
//! strategy) have the same NIR per hectare, so each distinct setting is
//! simulated once; distinct settings run in parallel (rayon), then blocks sum
//! their plantings' series by crop in parallel.

use rayon::prelude::*;

use super::EngineError;
use super::outlets::{OutletRun, OutletSummary, OutletUnit, apply_outlet};
use super::planting_step::{
    PlantingOutcome, SeasonOutcome, application_efficiency_override, coefficient_mode,
    raw_and_peak_etc, simulate_planting,
};
use super::tables::{MonthlyDepths, planting_monthly_depths};
use super::weather_prep::PreparedWeather;
use crate::calendar::IrrigationYear;
use crate::crop::Crop;
use crate::project::Project;
use crate::scheme::{DemandAccumulator, Network, NirSeries, Node, SchemeDemand, SchemeError};
use crate::soil::Soil;
use crate::units::depth_mm_over_area_ha_to_m3;

/// One planting's summary.
#[derive(Debug, Clone, PartialEq)]
pub struct PlantingSummary {
    /// Planting id.
    pub id: String,
    /// Block id.
    pub block: String,
    /// Crop id.
    pub crop: String,
    /// Season label.
    pub season: String,
    /// Area planted (ha).
    pub area_ha: f64,
    /// Mean yearly NIR volume over the complete irrigation years (m³).
    pub nir_m3_per_year: f64,
    /// Mean yearly volume at the headworks (m³): NIR ÷ (Ea × Eb × Π Ec).
    pub headworks_m3_per_year: f64,
    /// Field application efficiency used for this planting's GIR: the
    /// block method's Ea, or for paddy rice the paddy field efficiency
    /// (operational losses only).
    pub application_efficiency: f64,
    /// Seasons simulated (per hectare).
    pub seasons: Vec<SeasonOutcome>,
    /// Seasons left out because they do not fit inside the weather record.
    pub seasons_excluded: usize,
    /// Readily available water (mm) and the peak 10-day ETc (mm/day) it is
    /// used at, for the rotation-period check
    /// ([`super::planting_step::raw_and_peak_etc`]); `None` for rainfed
    /// plantings.
    pub raw_and_etc: Option<(f64, f64)>,
    /// Whether the planting is paddy rice (its RAW is the pond, its rate
    /// ETc + seepage and percolation).
    pub is_paddy: bool,
    /// ET₀, ETc, effective rain and NIR per calendar month, per hectare
    /// planted, means over the complete irrigation years.
    pub monthly: MonthlyDepths,
}

/// Plantings computed for the scheme.
#[derive(Debug, Clone, Default)]
pub struct ComputedPlantings {
    /// The demand of the scheme, built from the NIR series per block and
    /// crop (m³/day) as each chunk of blocks is computed.
    pub demand: Option<Result<SchemeDemand, SchemeError>>,
    /// One summary per planting, in project order.
    pub summaries: Vec<PlantingSummary>,
    /// Daily NIR per hectare of each planting (mm/day), in project order,
    /// kept only when asked (for sharing delivered water).
    pub daily: Vec<Vec<f64>>,
    /// Warnings.
    pub warnings: Vec<String>,
    /// One outlet per block with plantings, in block order.
    pub outlets: Vec<OutletSummary>,
}

/// Blocks computed together before their series are added to the demand.
const BLOCKS_PER_CHUNK: usize = 64;

/// Index range of the complete irrigation years in the record.
pub fn complete_range(w: &PreparedWeather, years: &[IrrigationYear]) -> std::ops::Range<usize> {
    match (years.first(), years.last()) {
        (Some(a), Some(b)) => {
            let i0 = usize::try_from((a.start() - w.start).num_days()).unwrap_or(0);
            let i1 = usize::try_from((b.end() - w.start).num_days() + 1).unwrap_or(0);
            i0.min(w.days())..i1.min(w.days())
        }
        _ => 0..0,
    }
}

/// Series and summaries of one block's plantings, its outlet and the
/// outlet's warning.
type BlockOut = (
    Vec<NirSeries>,
    Vec<(usize, PlantingSummary, Vec<f64>)>,
    OutletSummary,
    Option<String>,
);

/// Resolved inputs of one planting.
struct Job<'a> {
    index: usize,
    block: usize,
    soil: &'a Soil,
    area_ha: f64,
    /// Ea override of the planting (paddy field efficiency), if any.
    ea_override: Option<f64>,
    /// Index of its distinct setting in the list of distinct plantings.
    distinct: usize,
}

/// A planting setting computed once: the per-hectare result depends only on
/// the crop, the soil, the window, the season length, the strategy and the
/// effective-rain method, so plantings that share them share the result.
struct Distinct<'a> {
    planting: usize,
    crop: &'a Crop,
    soil: &'a Soil,
    block: usize,
}

/// Runs every planting and sums their NIR by block and crop.
///
/// # Errors
/// [`EngineError::MissingBlock`], [`EngineError::MissingCrop`],
/// [`EngineError::MissingSoil`] for a dangling reference (the first in
/// project order), [`EngineError::Planting`] when a planting's balance fails.
pub fn compute_plantings(
    project: &Project,
    crops: &[Crop],
    soils: &[Soil],
    w: &PreparedWeather,
    network: &Network,
    years: &[IrrigationYear],
    keep_daily: bool,
) -> Result<ComputedPlantings, EngineError> {
    let mut by_block: Vec<Vec<Job<'_>>> = (0..project.blocks.len()).map(|_| Vec::new()).collect();
    let mut keys: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    let mut distinct: Vec<Distinct<'_>> = Vec::new();
    let mut mode_warnings: Vec<String> = Vec::new();
    for (index, p) in project.plantings.iter().enumerate() {
        // The network's blocks are the project's, in order, named by id
        // (`network_of`): its map gives the project index.
        let block = network
            .block_index(&p.block)
            .ok_or_else(|| EngineError::MissingBlock {
                planting: p.id.clone(),
                block: p.block.clone(),
            })?;
        let b = &project.blocks[block];
        let crop =
            crops
                .iter()
                .find(|c| c.id == p.crop)
                .ok_or_else(|| EngineError::MissingCrop {
                    planting: p.id.clone(),
                    crop: p.crop.clone(),
                })?;
        let soil =
            soils
                .iter()
                .find(|s| s.id == b.soil)
                .ok_or_else(|| EngineError::MissingSoil {
                    block: b.id.clone(),
                    soil: b.soil.clone(),
                })?;
        let (mode, wetting, mode_warning) = coefficient_mode(p, b);
        if let Some(w) = mode_warning {
            mode_warnings.push(w);
        }
        let key = format!(
            "{}|{}|{:?}|{}|{:?}|{:?}|{:?}|{:?}|{:?}|{:?}",
            p.crop,
            b.soil,
            p.first_planting,
            p.spread_days,
            p.season_length_days,
            p.strategy,
            p.paddy,
            mode,
            wetting,
            b.delivery
        );
        let next = distinct.len();
        let d = *keys.entry(key).or_insert(next);
        if d == next {
            distinct.push(Distinct {
                planting: index,
                crop,
                soil,
                block,
            });
        }
        by_block[block].push(Job {
            index,
            block,
            soil,
            area_ha: p.area.hectares(b.area_ha),
            ea_override: application_efficiency_override(crop, p),
            distinct: d,
        });
    }
    let range = complete_range(w, years);
    let n_years = years.len().max(1) as f64;

    let outcomes: Vec<Result<PlantingOutcome, EngineError>> = distinct
        .par_iter()
        .map(|d| {
            let p = &project.plantings[d.planting];
            simulate_planting(
                d.crop,
                d.soil,
                p,
                &project.blocks[d.block],
                project.options.effective_rain,
                w,
                None,
                None,
            )
            .map_err(|cause| EngineError::Planting {
                planting: p.id.clone(),
                cause,
            })
        })
        .collect();
    let outcomes: Vec<PlantingOutcome> = outcomes.into_iter().collect::<Result<_, _>>()?;
    let monthly: Vec<MonthlyDepths> = outcomes
        .par_iter()
        .map(|o| {
            planting_monthly_depths(w.start, &w.et0_mm, &o.etc_mm, &o.peff_mm, &o.nir_mm, years)
        })
        .collect();
    // Each message once (e.g. an unknown Ky is said once per crop).
    let mut warnings: Vec<String> = mode_warnings;
    for w in outcomes.iter().flat_map(|o| o.warnings.iter()) {
        if !warnings.contains(w) {
            warnings.push(w.clone());
        }
    }

    let block_out = |jobs: &Vec<Job<'_>>| -> Result<BlockOut, EngineError> {
        let mut series: Vec<NirSeries> = Vec::new();
        let mut summaries = Vec::with_capacity(jobs.len());
        let (limited, outlet, outlet_warning) = block_outlet(
            project,
            w,
            jobs,
            &outcomes,
            &distinct,
            range.clone(),
            n_years,
        )?;
        for (k, job) in jobs.iter().enumerate() {
            let p = &project.plantings[job.index];
            let block_id = &project.blocks[job.block].id;
            let outcome = limited.as_ref().map_or(&outcomes[job.distinct], |l| &l[k]);
            let nir_mm_year: f64 = outcome.nir_mm[range.clone()].iter().sum::<f64>() / n_years;
            let nir_m3_per_year = depth_mm_over_area_ha_to_m3(nir_mm_year, job.area_ha);
            // Blocks are named by id in the network (see `network_of`).
            let block_ea = project.blocks[job.block].method.application_efficiency;
            let ea = job.ea_override.unwrap_or(block_ea);
            let factor = network
                .block_index(block_id)
                .and_then(|b| network.block_factor_with_efficiency(b, Node::Headworks, ea))
                .unwrap_or(0.0);
            // One series per crop and efficiency override.
            let target = if let Some(s) = series
                .iter_mut()
                .find(|s| s.crop == p.crop && s.application_efficiency == job.ea_override)
            {
                s
            } else {
                series.push(NirSeries {
                    block: block_id.clone(),
                    crop: p.crop.clone(),
                    nir_m3_day: vec![0.0; w.days()],
                    application_efficiency: job.ea_override,
                });
                series.last_mut().ok_or_else(|| EngineError::Planting {
                    planting: p.id.clone(),
                    cause: "internal: series list empty".into(),
                })?
            };
            for (acc, &mm) in target.nir_m3_day.iter_mut().zip(&outcome.nir_mm) {
                *acc += depth_mm_over_area_ha_to_m3(mm, job.area_ha);
            }
            summaries.push((
                job.index,
                PlantingSummary {
                    id: p.id.clone(),
                    block: block_id.clone(),
                    crop: p.crop.clone(),
                    season: p.season.clone(),
                    area_ha: job.area_ha,
                    nir_m3_per_year,
                    headworks_m3_per_year: nir_m3_per_year * factor,
                    application_efficiency: ea,
                    seasons: outcome.seasons.clone(),
                    seasons_excluded: outcome.seasons_excluded,
                    raw_and_etc: raw_and_peak_etc(
                        distinct[job.distinct].crop,
                        job.soil,
                        p,
                        outcome.peak_etc_10day_mm_day,
                    ),
                    is_paddy: job.ea_override.is_some(),
                    monthly: monthly[job.distinct],
                },
                if keep_daily {
                    outcome.nir_mm.clone()
                } else {
                    Vec::new()
                },
            ));
        }
        Ok((series, summaries, outlet, outlet_warning))
    };

    let mut out = ComputedPlantings::default();
    out.warnings.append(&mut warnings);
    let mut indexed = Vec::with_capacity(project.plantings.len());
    // Blocks in chunks, in order: each chunk's series are added to the
    // demand and dropped before the next chunk, so the memory peak is one
    // chunk of series rather than every planting's.
    let mut demand = DemandAccumulator::new(network, w.start, w.days());
    for chunk in by_block.chunks(BLOCKS_PER_CHUNK) {
        let per_block: Vec<Result<BlockOut, EngineError>> = chunk
            .par_iter()
            .filter(|jobs| !jobs.is_empty())
            .map(block_out)
            .collect();
        for r in per_block {
            let (series, summaries, outlet, outlet_warning) = r?;
            out.outlets.push(outlet);
            out.warnings.extend(outlet_warning);
            for s in &series {
                demand.add(s);
            }
            indexed.extend(summaries);
        }
    }
    out.demand = Some(demand.finish());
    indexed.sort_by_key(|(i, _, _)| *i);
    let mut excluded = 0;
    for (_, s, d) in indexed {
        excluded += s.seasons_excluded;
        out.summaries.push(s);
        out.daily.push(d);
    }
    if excluded > 0 {
        out.warnings.push(format!(
            "{excluded} planting seasons cut by the ends of the weather record, left out of statistics (their days inside the record still count in the demand)"
        ));
    }
    Ok(out)
}

/// The outlet of one block ([`super::outlets`]): its plantings limited by its
/// stream size over its canal's hours, when it binds.
fn block_outlet(
    project: &Project,
    w: &PreparedWeather,
    jobs: &[Job<'_>],
    outcomes: &[PlantingOutcome],
    distinct: &[Distinct<'_>],
    range: std::ops::Range<usize>,
    n_years: f64,
) -> Result<OutletRun, EngineError> {
    let block = &project.blocks[jobs[0].block];
    let hours = project
        .canals
        .iter()
        .find(|c| c.id == block.canal)
        .map_or(24.0, |c| c.operating_hours_per_day);
    let units: Vec<OutletUnit<'_>> = jobs
        .iter()
        .map(|job| {
            let ea = job
                .ea_override
                .unwrap_or(block.method.application_efficiency);
            let losses = ea * block.field_canal_efficiency;
            OutletUnit {
                m3_per_mm: depth_mm_over_area_ha_to_m3(1.0, job.area_ha)
                    / if losses > 0.0 { losses } else { 1.0 },
                outcome: &outcomes[job.distinct],
            }
        })
        .collect();
    let rerun = |k: usize, factor: &[f64]| -> Result<PlantingOutcome, EngineError> {
        let job = &jobs[k];
        let p = &project.plantings[job.index];
        let d = &distinct[job.distinct];
        simulate_planting(
            d.crop,
            job.soil,
            p,
            block,
            project.options.effective_rain,
            w,
            None,
            Some(factor),
        )
        .map_err(|cause| EngineError::Planting {
            planting: p.id.clone(),
            cause,
        })
    };
    apply_outlet(
        &block.id,
        block.delivery,
        block.outlet_stream_size_ls,
        hours,
        &units,
        w.days(),
        range,
        n_years,
        &rerun,
    )
}
