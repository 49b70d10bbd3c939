//! The engine: from a project, the crop and soil libraries and a daily
//! weather series to every result the command line and the app show.
//!
//! Pure orchestration of the computation modules, no I/O:
//!
//! 1. **Weather** ([`weather_prep`]): the scenario's weather perturbation, ET₀
//!    per day by the project's method (days that needed a FAO-56 missing-data
//!    procedure are counted), u2 (FAO-56 eq. 47) and RHmin per day.
//! 2. **Plantings** ([`plantings`]): each planting's daily NIR per hectare from
//!    its root-zone (or paddy) balance, × its area → m³/day, labelled with its
//!    crop. Blocks are computed in parallel (rayon), the plantings of one
//!    block in turn, so that a block's series can be summed by crop at once
//!    and memory stays bounded by one series per block and crop.
//! 3. **Scheme** ([`crate::scheme`]): the project's canals and blocks become a
//!    [`Network`] (Ea = the block method's application efficiency, Eb = the
//!    block's field-canal efficiency, Ec, hours, capacities). A paddy rice
//!    planting's series carries its own Ea, the paddy field efficiency
//!    (operational losses only, [`crate::project::PaddyInputs`]), because
//!    its NIR already holds seepage, percolation and land preparation: the
//!    block's GIR is Σ_series NIR ÷ (Ea_series × Eb). Demand up the
//!    tree; design values over the complete irrigation years (start month,
//!    probability and basis from the options); shortfall where an existing
//!    capacity is given.
//! 4. **Storage** ([`storage`]): open-water evaporation from the reservoir
//!    by Meyer, Penman and Rohwer side by side, the reservoir's method giving
//!    the losses (water temperature = air temperature where not given; a
//!    scenario's temperature change shifts both), against FAO-56 Table 12
//!    open-water Kc × ET₀ as a plausibility line; × its monthly surface area,
//!    reported beside the headworks demand, never added to it.
//! 5. **Supply** ([`supply`]): when the options give an available supply at a
//!    node and it falls short of the demand there, a rotation roster; the
//!    water each block receives is re-applied to its plantings' balances to
//!    get actual ET, deficits and the FAO-33 yield loss, with the relative
//!    irrigation supply and the relative water supply (Levine 1982).
//! 6. **Compare** ([`compare`]): the above for every scenario, side by side.
//!
//! Results are planning estimates: canal and structure designs must be
//! checked by a qualified engineer against local codes and measured data.

pub mod compare;
pub mod outlets;
pub mod planting_step;
pub mod plantings;
pub mod storage;
pub mod supply;
pub mod tables;
pub mod weather_prep;

use std::time::{Duration, Instant};

use chrono::NaiveDate;
use thiserror::Error;

use crate::calendar::{IrrigationYear, YearStart, year_coverage};
use crate::crop::Crop;
use crate::project::{
    DesignBasis as ProjectBasis, HEADWORKS, Project, ScenarioError, ValidationContext,
    ValidationProblem, WeatherPerturbation,
};
use crate::scheme::{
    self, DesignBasis, DesignOptions, Network, NodeDesign, SchemeDemand, SchemeError,
};
use crate::soil::Soil;
use crate::weather::{StationSite, WeatherDay};

pub use compare::{Comparison, ScenarioColumn, compare_scenarios, compare_scenarios_each};
pub use planting_step::{PlantingOutcome, SeasonOutcome};
pub use plantings::PlantingSummary;
pub use storage::{MethodLoss, StorageLosses};
pub use supply::{BlockSupply, PlantingSupply, SupplyResult};
pub use weather_prep::PreparedWeather;

/// Why the engine could not compute a project.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum EngineError {
    /// The weather series holds no day.
    #[error("the weather series holds no day")]
    NoWeather,
    /// The weather series is not one value per consecutive day.
    #[error(
        "weather series: expected {expected}, found {found} (days must be consecutive, without gaps or repeats; fill gaps first)"
    )]
    WeatherGap {
        /// The date expected.
        expected: NaiveDate,
        /// The date found.
        found: NaiveDate,
    },
    /// Gap filling failed (e.g. dates not increasing).
    #[error("weather gap filling: {0}")]
    WeatherFill(String),
    /// The station or ET₀ options are unusable.
    #[error("weather station: {0}")]
    Station(crate::et0::Et0Error),
    /// ET₀ cannot be computed on a day.
    #[error("ET0 on {date}: {cause}")]
    Et0Day {
        /// The day.
        date: NaiveDate,
        /// Why.
        cause: String,
    },
    /// A scenario cannot be applied.
    #[error(transparent)]
    Scenario(#[from] ScenarioError),
    /// A planting names a crop the library does not hold.
    #[error("planting {planting:?}: crop {crop:?} is not in the crop library")]
    MissingCrop {
        /// Planting id.
        planting: String,
        /// Crop id.
        crop: String,
    },
    /// A block names a soil the library does not hold.
    #[error("block {block:?}: soil {soil:?} is not in the soil library")]
    MissingSoil {
        /// Block id.
        block: String,
        /// Soil id.
        soil: String,
    },
    /// A planting is on a block the project does not hold.
    #[error("planting {planting:?}: block {block:?} does not exist")]
    MissingBlock {
        /// Planting id.
        planting: String,
        /// Block id.
        block: String,
    },
    /// A planting's balance failed.
    #[error("planting {planting:?}: {cause}")]
    Planting {
        /// Planting id.
        planting: String,
        /// Why.
        cause: String,
    },
    /// The scheme computation failed.
    #[error(transparent)]
    Scheme(#[from] SchemeError),
    /// Reservoir evaporation failed.
    #[error("reservoir {reservoir:?}: {cause}")]
    Storage {
        /// Reservoir name.
        reservoir: String,
        /// Why.
        cause: String,
    },
    /// The available supply names an unknown node.
    #[error("available supply: node {node:?} is neither \"headworks\" nor a canal id")]
    UnknownSupplyNode {
        /// The node named.
        node: String,
    },
    /// The available supply is not a finite flow ≥ 0.
    #[error("available supply: {value} m³/s is not a finite flow >= 0")]
    BadSupply {
        /// The value.
        value: f64,
    },
    /// The rotation roster failed.
    #[error("rotation roster: {0}")]
    Rotation(String),
    /// The project has validation errors: nothing was computed. Every
    /// error is listed (warnings are not: they never stop a run).
    #[error("{} and was not computed:\n{}", error_count(errors.len()), bullet_list(errors))]
    Invalid {
        /// Every validation error, in the order validation found them.
        errors: Vec<ValidationProblem>,
    },
    /// A result is not a finite number (a guard: validation limits are
    /// meant to prevent it).
    #[error("{what} is not a finite number ({value}); check the inputs it depends on")]
    NotFinite {
        /// Which result.
        what: String,
        /// The value.
        value: f64,
    },
}

fn error_count(n: usize) -> String {
    match n {
        1 => "the project has 1 error".to_owned(),
        n => format!("the project has {n} errors"),
    }
}

fn bullet_list(problems: &[ValidationProblem]) -> String {
    problems
        .iter()
        .map(|p| format!("  - {p}"))
        .collect::<Vec<_>>()
        .join("\n")
}

/// Every validation problem of a whole project (base case and every
/// scenario), errors and warnings, with the season lengths of `crops` and
/// the date range of `weather`.
pub fn validate_project(
    project: &Project,
    crops: &[Crop],
    weather: &[WeatherDay],
) -> Vec<ValidationProblem> {
    with_context(crops, weather, |ctx| project.validate(ctx))
}

/// Calls `f` with the validation context of `crops` and `weather`.
fn with_context<T>(
    crops: &[Crop],
    weather: &[WeatherDay],
    f: impl FnOnce(&ValidationContext<'_>) -> T,
) -> T {
    let crop_len = |id: &str| {
        crops
            .iter()
            .find(|c| c.id == id)
            .map(|c| c.stages.total_days())
    };
    let range = weather
        .first()
        .zip(weather.last())
        .map(|(a, b)| (a.date, b.date));
    f(&ValidationContext {
        crops: &crop_len,
        weather_range: range,
    })
}

/// The errors among `problems`, as [`EngineError::Invalid`], if any.
fn refuse_errors(problems: &[ValidationProblem]) -> Result<(), EngineError> {
    let errors: Vec<ValidationProblem> =
        problems.iter().filter(|p| p.is_error()).cloned().collect();
    if errors.is_empty() {
        Ok(())
    } else {
        Err(EngineError::Invalid { errors })
    }
}

/// What the engine needs besides the project.
#[derive(Debug, Clone, Copy)]
pub struct EngineInput<'a> {
    /// The project, with the scenario's overrides already applied.
    pub project: &'a Project,
    /// Crop library.
    pub crops: &'a [Crop],
    /// Soil library.
    pub soils: &'a [Soil],
    /// Daily weather, one record per consecutive day.
    pub weather: &'a [WeatherDay],
    /// Weather change of the scenario (identity for the base case).
    pub perturbation: WeatherPerturbation,
    /// Scenario name, for labels.
    pub scenario: Option<&'a str>,
}

/// Wall-clock time of each step.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Timing {
    /// Weather preparation and ET₀.
    pub weather: Duration,
    /// Planting balances.
    pub plantings: Duration,
    /// Demand, design values, storage.
    pub scheme: Duration,
    /// Roster and re-run on delivered water.
    pub supply: Duration,
    /// Whole run.
    pub total: Duration,
}

/// Mean yearly volume of one season label.
#[derive(Debug, Clone, PartialEq)]
pub struct SeasonVolume {
    /// Season label of the plantings.
    pub season: String,
    /// Mean yearly NIR volume of the season's plantings (m³), over the
    /// complete irrigation years.
    pub nir_m3: f64,
    /// Mean yearly volume at the headworks (m³): NIR ÷ (Ea × Eb × Π Ec).
    pub headworks_m3: f64,
}

/// Everything a run produces.
#[derive(Debug, Clone)]
pub struct Results {
    /// Scheme name.
    pub scheme_name: String,
    /// Scenario computed (`None` = the base case).
    pub scenario: Option<String>,
    /// First day of the daily series.
    pub start: NaiveDate,
    /// Number of days.
    pub days: usize,
    /// Complete irrigation years used for statistics.
    pub complete_years: Vec<IrrigationYear>,
    /// Days on which ET₀ used a FAO-56 missing-data procedure.
    pub et0_estimated_days: usize,
    /// Mean ET₀ over the record (mm/day).
    pub et0_mean_mm_day: f64,
    /// ET₀ and rain per calendar month over the complete irrigation years,
    /// mean and dependable (at the design probability).
    pub climate: tables::MonthlyClimate,
    /// Daily demand at every node with breakdowns.
    pub demand: SchemeDemand,
    /// Design values: canals in network order, then the headworks.
    pub design: Vec<NodeDesign>,
    /// One summary per planting.
    pub plantings: Vec<PlantingSummary>,
    /// One outlet per block with plantings, in block order.
    pub outlets: Vec<outlets::OutletSummary>,
    /// Mean yearly volumes per season label.
    pub season_volumes: Vec<SeasonVolume>,
    /// Reservoir evaporation, if the scheme has a reservoir.
    pub storage: Option<StorageLosses>,
    /// Weather values beyond the station limits: treated as missing and
    /// filled, or kept when the project says so.
    pub weather_out_of_limits: Vec<crate::station_limits::OutOfLimits>,
    /// Supply, roster and re-run, if an available supply is given.
    pub supply: Option<SupplyResult>,
    /// Warnings (validation problems, estimated data, excluded seasons...).
    pub warnings: Vec<String>,
    /// Each canal's section at its required capacity, in network order.
    pub sections: Vec<crate::section::canal::CanalSectionRow>,
    /// Step timings.
    pub timing: Timing,
}

impl Results {
    /// Design values of the headworks.
    pub fn headworks(&self) -> Option<&NodeDesign> {
        self.design
            .iter()
            .find(|d| d.node == scheme::Node::Headworks)
    }

    /// Design values of a canal by id.
    pub fn canal(&self, id: &str) -> Option<&NodeDesign> {
        self.design.iter().find(|d| d.name == id)
    }

    /// Area-weighted share of the scheme's area with each crop (ha by crop,
    /// summed over plantings, in first-seen order).
    pub fn area_by_crop(&self) -> Vec<(String, f64)> {
        let mut out: Vec<(String, f64)> = Vec::new();
        for p in &self.plantings {
            if let Some(e) = out.iter_mut().find(|(c, _)| *c == p.crop) {
                e.1 += p.area_ha;
            } else {
                out.push((p.crop.clone(), p.area_ha));
            }
        }
        out
    }
}

/// Each canal's section at its required capacity (the design values'
/// `required_capacity_ls`); capacity differences and sections that cannot
/// be computed become warnings.
fn canal_sections(
    project: &Project,
    design: &[NodeDesign],
    demand: &SchemeDemand,
    warnings: &mut Vec<String>,
) -> Vec<crate::section::canal::CanalSectionRow> {
    let mut rows = Vec::new();
    for d in design {
        if let Some((i, c)) = project
            .canals
            .iter()
            .enumerate()
            .find(|(_, c)| c.id == d.name)
        {
            let mut row = crate::section::canal::canal_section_row(c, d.required_capacity_ls);
            if demand.network().seepage(i).is_some() {
                let ec = demand.canal_efficiency_day(i);
                let inflow = demand.demand_m3_day(scheme::Node::Canal(i));
                let total_in: f64 = inflow.iter().sum();
                let total_out: f64 = inflow.iter().zip(ec).map(|(q, e)| q * e).sum();
                if total_in > 0.0 {
                    row.seepage_efficiency_season = Some(total_out / total_in);
                }
                row.seepage_efficiency_min_day = inflow
                    .iter()
                    .zip(ec)
                    .filter(|(q, _)| **q > 0.0)
                    .map(|(_, e)| *e)
                    .reduce(f64::min);
            }
            if !row.note.is_empty() && c.section.bed_slope.is_some() {
                warnings.push(format!("canal {}: section: {}", c.id, row.note));
            }
            rows.push(row);
        }
    }
    rows
}

/// A copy of `network` with seepage models for the canals whose section
/// asks seepage to replace the fixed Ec; `None` when no canal does.
fn with_seepage(project: &Project, network: &Network, design: &[NodeDesign]) -> Option<Network> {
    let mut net = network.clone();
    let mut any = false;
    for (i, c) in project.canals.iter().enumerate() {
        let flow = design
            .iter()
            .find(|d| d.name == c.id)
            .map(|d| d.required_capacity_ls / 1000.0)
            .filter(|q| *q > 0.0);
        if let Some(model) = c.section.seepage_model(flow) {
            net.set_seepage(i, Some(model));
            any = true;
        }
    }
    any.then_some(net)
}

/// The scheme network of a project: Ea = the block method's application
/// efficiency, Eb = the field-canal efficiency; blocks are named by id.
///
/// # Errors
/// [`SchemeError::Invalid`] listing every problem of the tree.
pub fn network_of(project: &Project) -> Result<Network, SchemeError> {
    Network::new(
        project
            .canals
            .iter()
            .map(|c| scheme::Canal {
                id: c.id.clone(),
                name: c.name.clone(),
                parent: c.parent.clone(),
                conveyance_efficiency: c.conveyance_efficiency,
                existing_capacity_m3s: c.effective_existing_capacity_m3s(),
                hours_per_day: c.operating_hours_per_day,
            })
            .collect(),
        project
            .blocks
            .iter()
            .map(|b| scheme::Block {
                name: b.id.clone(),
                canal: b.canal.clone(),
                area_ha: b.area_ha,
                application_efficiency: b.method.application_efficiency,
                field_canal_efficiency: b.field_canal_efficiency,
            })
            .collect(),
    )
}

fn design_options(project: &Project) -> DesignOptions {
    DesignOptions {
        year_start_month: project.options.irrigation_year_start_month,
        non_exceedance: project.options.design_probability_pct / 100.0,
        basis: match project.options.design_basis {
            ProjectBasis::TenDay => DesignBasis::TenDay,
            ProjectBasis::Monthly => DesignBasis::Monthly,
            ProjectBasis::Daily => DesignBasis::Daily,
        },
        headworks_hours_per_day: 24.0,
        headworks_capacity_m3s: None,
        confidence_level: project.options.design_confidence_pct / 100.0,
    }
}

/// The station of a project's weather source.
pub fn site_of(project: &Project) -> StationSite {
    StationSite {
        latitude_deg: project.weather.latitude_deg,
        elevation_m: project.weather.elevation_m,
        wind_height_m: project.weather.wind_height_m,
    }
}

/// Runs the whole chain for one project (scenario already applied).
///
/// # Errors
/// [`EngineError`] naming the step and the item that failed.
pub fn run(input: &EngineInput<'_>) -> Result<Results, EngineError> {
    let t0 = Instant::now();
    let project = input.project;
    let mut warnings = Vec::new();

    // The validation gate: a project with an error is not computed (every
    // error is listed); warnings are reported with the results. The project
    // is validated as computed (its scenario already applied).
    let problems = with_context(input.crops, input.weather, |ctx| project.validate_base(ctx));
    refuse_errors(&problems)?;
    for p in problems {
        warnings.push(format!("validation: {p}"));
    }
    warnings.extend(crate::project::plausibility::season_warnings(
        project,
        input.crops,
        input.weather,
    ));

    // Gaps: the default gap filling (linear interpolation up to 3 days, the
    // FAO-56 missing-data procedures beyond; rain is not invented).
    // Days whose values ET₀ rejects (e.g. Tmin above Tmax) are treated as
    // missing (rain kept) and filled like gaps, with a warning.
    let checker =
        crate::et0::Et0Context::new(&site_of(project), &crate::et0::Et0Options::default())
            .map_err(EngineError::Station)?;
    let screened = weather_prep::screen_weather(input.weather, project)?;
    warnings.extend(screened.warning.clone());
    let weather_out_of_limits = screened.out_of_limits.clone();
    let repaired = crate::gapfill::repair_for_daily_balance(
        &screened.days,
        &project.options.gap_filling.options(),
        |d| checker.et0_mm_day(d).map(|_| ()).map_err(|e| e.to_string()),
    )
    .map_err(|e| EngineError::WeatherFill(e.to_string()))?;
    if !repaired.rejected.is_empty() {
        warnings.push(format!(
            "weather: {} rejected by the ET0 checks and filled as gaps (first: {})",
            match repaired.rejected.len() {
                1 => "1 day".to_owned(),
                n => format!("{n} days"),
            },
            repaired
                .rejected
                .iter()
                .take(3)
                .map(|(date, reason)| format!("{date}: {reason}"))
                .collect::<Vec<_>>()
                .join("; ")
        ));
    }
    let (inserted, filled_days) = (repaired.inserted_days, repaired.filled_days);
    if inserted > 0 || filled_days > 0 {
        warnings.push(format!(
            "weather: {inserted} missing dates added and values filled on {filled_days} days (interpolation up to {} days, {} beyond)",
            project.options.gap_filling.max_interpolation_days,
            match project.options.gap_filling.long_gaps {
                crate::project::LongGaps::Fao56Procedures => "FAO-56 missing-data procedures",
                crate::project::LongGaps::Climatology => "the day-of-year climatology of the series",
            }
        ));
    }
    let filled = repaired.filled;
    let weather = weather_prep::prepare_weather(
        &filled.days,
        &site_of(project),
        project.options.et0_method,
        &input.perturbation,
    )?;
    if weather.estimated_days > 0 {
        warnings.push(format!(
            "ET0 on {} of {} days used a FAO-56 missing-data procedure (humidity from Tmin, radiation from the temperature range or default wind)",
            weather.estimated_days,
            weather.days()
        ));
    }
    if weather.rain_missing_days > 0 {
        warnings.push(format!(
            "rain missing on {} days, taken as 0 mm",
            weather.rain_missing_days
        ));
    }
    let t_weather = t0.elapsed();

    let network = network_of(project)?;
    let options = design_options(project);
    let confidence_pct = project.options.design_confidence_pct;
    if !(50.0..=99.99).contains(&confidence_pct) {
        return Err(SchemeError::BadOption {
            what: "options.design_confidence_pct (confidence level of the design flow, %)",
            value: confidence_pct,
            expected: "a percentage from 50 to 99.99, e.g. 90",
        }
        .into());
    }
    let year_start =
        YearStart::new(options.year_start_month).map_err(|_| SchemeError::BadOption {
            what: "irrigation-year start month",
            value: f64::from(options.year_start_month),
            expected: "a month number 1 to 12",
        })?;
    let last = weather.date(weather.days() - 1);
    let complete_years = year_coverage(weather.start, last, year_start)
        .map(|c| c.complete)
        .unwrap_or_default();

    let t1 = Instant::now();
    let keep_daily = project.options.available_supply.is_some();
    let mut computed = plantings::compute_plantings(
        project,
        input.crops,
        input.soils,
        &weather,
        &network,
        &complete_years,
        keep_daily,
    )?;
    warnings.extend(computed.warnings.iter().cloned());
    warnings.extend(outlets::rotation_stress_warnings(
        project,
        &computed.summaries,
    ));
    let t_plantings = t1.elapsed();

    let t2 = Instant::now();
    let demand = match computed.demand.take() {
        Some(d) => d?,
        None => SchemeDemand::compute(&network, weather.start, weather.days(), &[])?,
    };
    let mut design = scheme::design_values(&demand, &options)?;
    // Seepage by wetted perimeter replacing a fixed Ec: size each such
    // canal's section for the required capacity found with the fixed Ec,
    // then recompute the demand with the daily seepage solved to 0.1 %.
    let seepage_network = with_seepage(project, &network, &design);
    let (demand, computed) = if let Some(net2) = seepage_network {
        let mut again = plantings::compute_plantings(
            project,
            input.crops,
            input.soils,
            &weather,
            &net2,
            &complete_years,
            keep_daily,
        )?;
        let d2 = match again.demand.take() {
            Some(d) => d?,
            None => SchemeDemand::compute(&net2, weather.start, weather.days(), &[])?,
        };
        design = scheme::design_values(&d2, &options)?;
        warnings.push(
            "seepage by wetted perimeter replaces the fixed Ec of some canals: each day's loss solved by iteration to 0.1 % on the section sized for the fixed-Ec required capacity".to_owned(),
        );
        (d2, again)
    } else {
        (demand, computed)
    };
    let storage = match &project.reservoir {
        Some(r) => Some(storage::reservoir_losses(
            r,
            &weather,
            &complete_years,
            input.perturbation.temperature_shift_c,
        )?),
        None => None,
    };
    let mut season_volumes: Vec<SeasonVolume> = Vec::new();
    for p in &computed.summaries {
        if let Some(s) = season_volumes.iter_mut().find(|s| s.season == p.season) {
            s.nir_m3 += p.nir_m3_per_year;
            s.headworks_m3 += p.headworks_m3_per_year;
        } else {
            season_volumes.push(SeasonVolume {
                season: p.season.clone(),
                nir_m3: p.nir_m3_per_year,
                headworks_m3: p.headworks_m3_per_year,
            });
        }
    }
    for d in &design {
        if let Some(sf) = &d.shortfall
            && !sf.basis_periods.is_empty()
        {
            warnings.push(format!(
                "canal {}: the {} mean demand exceeds the existing capacity in {} {} of the {} complete irrigation years, in {} of those years ({:.0} m³ not delivered per complete irrigation year)",
                d.name,
                sf.basis.label(),
                sf.basis_periods_in(&complete_years).count(),
                sf.basis.periods_noun(),
                complete_years.len(),
                sf.years_short.len(),
                sf.basis_volume_per_year_m3(&complete_years)
            ));
        }
    }
    let sections = canal_sections(project, &design, &demand, &mut warnings);
    let t_scheme = t2.elapsed();

    let t3 = Instant::now();
    let supply = match &project.options.available_supply {
        Some(s) => Some(supply::supply_and_rerun(
            project,
            input.crops,
            input.soils,
            &weather,
            &demand,
            s,
            &computed.daily,
            &computed.summaries,
            &complete_years,
        )?),
        None => None,
    };
    if let Some(s) = &supply {
        warnings.extend(s.warnings.iter().cloned());
    }
    let t_supply = t3.elapsed();

    // No NaN or infinity leaves the core.
    for d in &design {
        if !d.design_flow_ls.is_finite() {
            return Err(EngineError::NotFinite {
                what: format!("the design flow of {}", d.name),
                value: d.design_flow_ls,
            });
        }
    }
    let et0_mean_mm_day = weather.et0_mm.iter().sum::<f64>() / weather.days() as f64;
    let climate = tables::monthly_climate(
        weather.start,
        &weather.et0_mm,
        &weather.rain_mm,
        &complete_years,
        options.non_exceedance,
    );
    Ok(Results {
        scheme_name: project.scheme.name.clone(),
        scenario: input.scenario.map(str::to_owned),
        start: weather.start,
        days: weather.days(),
        complete_years,
        et0_estimated_days: weather.estimated_days,
        et0_mean_mm_day,
        climate,
        demand,
        design,
        plantings: computed.summaries,
        outlets: computed.outlets,
        season_volumes,
        storage,
        weather_out_of_limits,
        supply,
        warnings,
        sections,
        timing: Timing {
            weather: t_weather,
            plantings: t_plantings,
            scheme: t_scheme,
            supply: t_supply,
            total: t0.elapsed(),
        },
    })
}

/// Applies a scenario (overrides and weather perturbation) and runs it.
/// `scenario = None` runs the base case.
///
/// # Errors
/// [`EngineError::Scenario`] for an unknown scenario, else as [`run`].
pub fn run_scenario(
    project: &Project,
    scenario: Option<&str>,
    crops: &[Crop],
    soils: &[Soil],
    weather: &[WeatherDay],
) -> Result<Results, EngineError> {
    let (applied, perturbation) = match scenario {
        Some(name) => {
            // A scenario is found by its name: an empty or repeated name is
            // an error before anything is applied.
            refuse_errors(&project.scenario_name_problems())?;
            let p = project.apply_scenario(name)?;
            let w = project
                .scenario(name)
                .map(|s| s.weather)
                .unwrap_or_default();
            // A weather change outside its accepted range is refused, as
            // validation reports it (not silently computed).
            if let Some((field, value, expected)) = w.out_of_range().into_iter().next() {
                return Err(ScenarioError::WeatherChangeOutOfRange {
                    scenario: name.to_owned(),
                    field,
                    value,
                    expected,
                }
                .into());
            }
            (p, w)
        }
        None => (project.clone(), WeatherPerturbation::default()),
    };
    run(&EngineInput {
        project: &applied,
        crops,
        soils,
        weather,
        perturbation,
        scenario,
    })
}

/// Name of the headworks node in tables.
pub const HEADWORKS_NODE: &str = HEADWORKS;
