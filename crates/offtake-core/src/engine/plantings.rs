//! All plantings of a project: their daily NIR in m³ per block and crop,
//! computed in parallel over blocks.

use rayon::prelude::*;

use super::EngineError;
use super::planting_step::{SeasonOutcome, simulate_planting};
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
    /// Warnings of the planting step.
    pub warnings: Vec<String>,
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
struct Job<'a> {
    index: usize,
    block: usize,
    crop: &'a Crop,
    soil: &'a Soil,
    area_ha: f64,
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
        by_block[block].push(Job {
            index,
            block,
            crop,
            soil,
            area_ha: p.area.hectares(b.area_ha),
        });
    }
    let range = complete_range(w, years);
    let n_years = years.len().max(1) as f64;

    let per_block: Vec<Result<BlockOut, EngineError>> = by_block
        .par_iter()
        .filter(|jobs| !jobs.is_empty())
        .map(|jobs| {
            let mut series: Vec<NirSeries> = Vec::new();
            let mut summaries = Vec::with_capacity(jobs.len());
            for job in jobs {
                let p = &project.plantings[job.index];
                let block_id = &project.blocks[job.block].id;
                let outcome = simulate_planting(
                    job.crop,
                    job.soil,
                    p,
                    project.options.effective_rain,
                    w,
                    None,
                )
                .map_err(|cause| EngineError::Planting {
                    planting: p.id.clone(),
                    cause,
                })?;
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
                        seasons: outcome.seasons,
                        seasons_excluded: outcome.seasons_excluded,
                        warnings: outcome.warnings,
                    },
                    if keep_daily {
                        outcome.nir_mm
                    } else {
                        Vec::new()
                    },
                ));
            }
            Ok((series, summaries))
        })
        .collect();

    let mut out = ComputedPlantings::default();
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
        out.warnings.extend(s.warnings.iter().cloned());
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
