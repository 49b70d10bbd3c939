//! All plantings of a project: their daily NIR in m³ per block and crop.
//!
//! Plantings with the same setting (crop, soil, window, season length,
//! strategy) have the same NIR per hectare, so each distinct setting is
//! simulated once; distinct settings run in parallel (rayon), then blocks sum
//! their plantings' series by crop in parallel.

use rayon::prelude::*;

use super::EngineError;
use super::planting_step::{PlantingOutcome, SeasonOutcome, simulate_planting};
use super::weather_prep::PreparedWeather;
use crate::calendar::IrrigationYear;
use crate::crop::Crop;
use crate::project::Project;
use crate::scheme::{Network, NirSeries, Node};
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
    /// Seasons simulated (per hectare).
    pub seasons: Vec<SeasonOutcome>,
    /// Seasons left out because they do not fit inside the weather record.
    pub seasons_excluded: usize,
}

/// Plantings computed for the scheme.
#[derive(Debug, Clone, Default)]
pub struct ComputedPlantings {
    /// NIR series per block and crop (m³/day).
    pub series: Vec<NirSeries>,
    /// One summary per planting, in project order.
    pub summaries: Vec<PlantingSummary>,
    /// Daily NIR per hectare of each planting (mm/day), in project order,
    /// kept only when asked (for sharing delivered water).
    pub daily: Vec<Vec<f64>>,
    /// Warnings.
    pub warnings: Vec<String>,
}

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

/// Series and summaries of one block's plantings.
type BlockOut = (Vec<NirSeries>, Vec<(usize, PlantingSummary, Vec<f64>)>);

/// Resolved inputs of one planting.
struct Job {
    index: usize,
    block: usize,
    area_ha: f64,
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
    let mut by_block: Vec<Vec<Job>> = (0..project.blocks.len()).map(|_| Vec::new()).collect();
    let mut keys: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    let mut distinct: Vec<Distinct<'_>> = Vec::new();
    for (index, p) in project.plantings.iter().enumerate() {
        let block = project
            .blocks
            .iter()
            .position(|b| b.id == p.block)
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
        let key = format!(
            "{}|{}|{:?}|{}|{:?}|{:?}",
            p.crop, b.soil, p.first_planting, p.spread_days, p.season_length_days, p.strategy
        );
        let next = distinct.len();
        let d = *keys.entry(key).or_insert(next);
        if d == next {
            distinct.push(Distinct {
                planting: index,
                crop,
                soil,
            });
        }
        by_block[block].push(Job {
            index,
            block,
            area_ha: p.area.hectares(b.area_ha),
            distinct: d,
        });
    }
    let range = complete_range(w, years);
    let n_years = years.len().max(1) as f64;

    let outcomes: Vec<Result<PlantingOutcome, EngineError>> = distinct
        .par_iter()
        .map(|d| {
            let p = &project.plantings[d.planting];
            simulate_planting(d.crop, d.soil, p, project.options.effective_rain, w, None).map_err(
                |cause| EngineError::Planting {
                    planting: p.id.clone(),
                    cause,
                },
            )
        })
        .collect();
    let outcomes: Vec<PlantingOutcome> = outcomes.into_iter().collect::<Result<_, _>>()?;
    let mut warnings: Vec<String> = outcomes.iter().flat_map(|o| o.warnings.clone()).collect();

    let per_block: Vec<Result<BlockOut, EngineError>> = by_block
        .par_iter()
        .filter(|jobs| !jobs.is_empty())
        .map(|jobs| {
            let mut series: Vec<NirSeries> = Vec::new();
            let mut summaries = Vec::with_capacity(jobs.len());
            for job in jobs {
                let p = &project.plantings[job.index];
                let block_id = &project.blocks[job.block].id;
                let outcome = &outcomes[job.distinct];
                let nir_mm_year: f64 = outcome.nir_mm[range.clone()].iter().sum::<f64>() / n_years;
                let nir_m3_per_year = depth_mm_over_area_ha_to_m3(nir_mm_year, job.area_ha);
                // Blocks are named by id in the network (see `network_of`).
                let factor = network
                    .block_index(block_id)
                    .and_then(|b| network.block_factor(b, Node::Headworks))
                    .unwrap_or(0.0);
                let target = if let Some(s) = series.iter_mut().find(|s| s.crop == p.crop) {
                    s
                } else {
                    series.push(NirSeries {
                        block: block_id.clone(),
                        crop: p.crop.clone(),
                        nir_m3_day: vec![0.0; w.days()],
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
                        seasons: outcome.seasons.clone(),
                        seasons_excluded: outcome.seasons_excluded,
                    },
                    if keep_daily {
                        outcome.nir_mm.clone()
                    } else {
                        Vec::new()
                    },
                ));
            }
            Ok((series, summaries))
        })
        .collect();

    let mut out = ComputedPlantings::default();
    out.warnings.append(&mut warnings);
    let mut indexed = Vec::with_capacity(project.plantings.len());
    for r in per_block {
        let (series, summaries) = r?;
        out.series.extend(series);
        indexed.extend(summaries);
    }
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
