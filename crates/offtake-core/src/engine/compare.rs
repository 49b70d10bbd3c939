//! Scenario comparison: every scenario of a project run side by side.

use super::{EngineError, Results, SeasonVolume, run_scenario};
use crate::crop::Crop;
use crate::project::Project;
use crate::soil::Soil;
use crate::weather::WeatherDay;

/// One scenario's figures.
#[derive(Debug, Clone, PartialEq)]
pub struct ScenarioColumn {
    /// Scenario name (`base` when the project has none).
    pub name: String,
    /// Area planted per crop (ha), summed over plantings.
    pub area_by_crop: Vec<(String, f64)>,
    /// Mean yearly volumes per season label.
    pub season_volumes: Vec<SeasonVolume>,
    /// Mean yearly volume at the headworks, all seasons (m³).
    pub headworks_volume_m3: f64,
    /// Headworks design flow (l/s).
    pub design_flow_ls: f64,
    /// Design year of the headworks (label).
    pub design_year: String,
    /// Headworks duty (l/s/ha).
    pub duty_ls_ha: Option<f64>,
    /// Volume not delivered by canals with an existing capacity, on the
    /// design basis (Σ (mean − capacity) × days over the short periods),
    /// mean per complete irrigation year (m³/year): the same years as
    /// `shortfall_years` and `complete_years`.
    pub shortfall_m3_per_year: f64,
    /// Periods of the design basis in shortfall within the complete
    /// irrigation years, summed over those canals.
    pub shortfall_periods: usize,
    /// Complete irrigation years in which any of those canals falls short
    /// on the design basis.
    pub shortfall_years: usize,
    /// Complete irrigation years of the record.
    pub complete_years: usize,
    /// The design basis of the shortfall (`10-day`, `monthly`, `daily`).
    pub shortfall_basis: &'static str,
    /// Daily peaks: days on which the daily demand exceeds the capacity,
    /// summed over those canals (for information; not the design basis).
    pub shortfall_days: usize,
    /// Mean yearly reservoir evaporation (m³), if any, by the reservoir's method.
    pub storage_loss_m3: Option<f64>,
    /// The reservoir's method (label), if any.
    pub storage_method: Option<&'static str>,
    /// Smallest and largest mean yearly reservoir evaporation of the three
    /// open-water methods (m³/year), if any.
    pub storage_spread_m3: Option<(f64, f64)>,
    /// Relative irrigation supply under the given supply.
    pub relative_irrigation_supply: Option<f64>,
    /// Relative water supply (Levine 1982) under the given supply.
    pub relative_water_supply: Option<f64>,
    /// Area-weighted FAO-33 yield loss where water is short (%).
    pub mean_yield_loss_pct: Option<f64>,
}

/// All scenarios side by side.
#[derive(Debug, Clone, PartialEq)]
pub struct Comparison {
    /// One column per scenario.
    pub columns: Vec<ScenarioColumn>,
    /// Every crop of any column, in first-seen order.
    pub crops: Vec<String>,
    /// Every season label of any column, in first-seen order.
    pub seasons: Vec<String>,
    /// Scenarios that could not be computed, with the reason (only from
    /// [`compare_scenarios_each`]; [`compare_scenarios`] stops at the first).
    pub failed: Vec<(String, EngineError)>,
}

impl ScenarioColumn {
    /// The figures of one run.
    pub fn from_results(name: &str, r: &Results) -> Self {
        let head = r.headworks();
        // Per-year figures are per complete irrigation year (the years the
        // design values use); periods in the incomplete ends are left out.
        let complete = &r.complete_years;
        let (mut sf_m3, mut sf_days, mut sf_periods) = (0.0, 0, 0);
        let mut years: Vec<crate::calendar::IrrigationYear> = Vec::new();
        let mut basis = head.map_or(crate::scheme::DesignBasis::TenDay, |h| h.basis);
        for d in &r.design {
            if d.node != crate::scheme::Node::Headworks
                && let Some(s) = &d.shortfall
            {
                sf_m3 += s.basis_volume_in_m3(complete);
                sf_periods += s.basis_periods_in(complete).count();
                sf_days += s.days.len();
                basis = s.basis;
                for y in &s.years_short {
                    if !years.contains(y) {
                        years.push(*y);
                    }
                }
            }
        }
        Self {
            name: name.to_owned(),
            area_by_crop: r.area_by_crop(),
            season_volumes: r.season_volumes.clone(),
            headworks_volume_m3: r.season_volumes.iter().map(|s| s.headworks_m3).sum(),
            design_flow_ls: head.map_or(0.0, |h| h.design_flow_ls),
            design_year: head.map(|h| h.design_year.label()).unwrap_or_default(),
            duty_ls_ha: head.and_then(|h| h.duty_ls_ha),
            shortfall_m3_per_year: if complete.is_empty() {
                0.0
            } else {
                sf_m3 / complete.len() as f64
            },
            shortfall_periods: sf_periods,
            shortfall_years: years.len(),
            complete_years: r.complete_years.len(),
            shortfall_basis: basis.label(),
            shortfall_days: sf_days,
            storage_loss_m3: r.storage.as_ref().map(|s| s.mean_yearly_m3),
            storage_method: r
                .storage
                .as_ref()
                .map(|s| super::storage::method_label(s.method)),
            storage_spread_m3: r.storage.as_ref().map(super::StorageLosses::spread_m3),
            relative_irrigation_supply: r
                .supply
                .as_ref()
                .and_then(|s| s.relative_irrigation_supply),
            relative_water_supply: r.supply.as_ref().and_then(|s| s.relative_water_supply),
            mean_yield_loss_pct: r.supply.as_ref().and_then(|s| s.mean_yield_loss_pct),
        }
    }
}

/// Runs every scenario of the project (the base case when there is none).
///
/// # Errors
/// [`EngineError::Invalid`] listing every validation error of the whole
/// project (base case and every scenario) before anything is computed;
/// else the first scenario's [`EngineError`], which names the step.
pub fn compare_scenarios(
    project: &Project,
    crops: &[Crop],
    soils: &[Soil],
    weather: &[WeatherDay],
) -> Result<Comparison, EngineError> {
    super::refuse_errors(&super::validate_project(project, crops, weather))?;
    let mut c = compare_scenarios_each(project, crops, soils, weather);
    if c.failed.is_empty() {
        Ok(c)
    } else {
        Err(c.failed.swap_remove(0).1)
    }
}

/// Runs every scenario of the project (the base case when there is none),
/// going on past a scenario that cannot be computed: its name and error are
/// in [`Comparison::failed`] and the others are compared. For an editor,
/// where one scenario being edited into an invalid state should not hide
/// the rest.
pub fn compare_scenarios_each(
    project: &Project,
    crops: &[Crop],
    soils: &[Soil],
    weather: &[WeatherDay],
) -> Comparison {
    let names: Vec<Option<&str>> = if project.scenarios.is_empty() {
        vec![None]
    } else {
        project
            .scenarios
            .iter()
            .map(|s| Some(s.name.as_str()))
            .collect()
    };
    let mut columns = Vec::with_capacity(names.len());
    let mut failed = Vec::new();
    for name in names {
        let label = name.unwrap_or("base");
        match run_scenario(project, name, crops, soils, weather) {
            Ok(r) => columns.push(ScenarioColumn::from_results(label, &r)),
            Err(e) => failed.push((label.to_owned(), e)),
        }
    }
    let mut crops_seen: Vec<String> = Vec::new();
    let mut seasons: Vec<String> = Vec::new();
    for c in &columns {
        for (crop, _) in &c.area_by_crop {
            if !crops_seen.contains(crop) {
                crops_seen.push(crop.clone());
            }
        }
        for s in &c.season_volumes {
            if !seasons.contains(&s.season) {
                seasons.push(s.season.clone());
            }
        }
    }
    Comparison {
        columns,
        crops: crops_seen,
        seasons,
        failed,
    }
}
