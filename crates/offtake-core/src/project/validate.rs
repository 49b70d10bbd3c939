//! Whole-project validation: every problem listed, never a panic.
//!
//! [`Project::validate`] checks ids (the rules of [`crate::limits::check_id`])
//! and cross references, the canal tree, every numeric input against the
//! table of limits ([`crate::limits`]: outside the physical range an error,
//! outside the usual range a warning), planting windows, the occupancy
//! of each block through the year, options, and every scenario. Each
//! problem has a [`Severity`]: a project with an error is not computed
//! (the engine refuses it); warnings never stop a run. It needs two
//! things the document does not hold: the season length of each crop (from
//! the crop library, passed as a closure so this module does not depend on
//! it) and the date range of the weather record.
//!
//! # Block occupancy
//! A planting is planted in `max(spread_days, 1)` equal cohorts, one per day
//! from its first planting day; each cohort occupies the land for the season
//! length. Summing the cohorts of every planting on a block over a 365-day
//! year (seasons may cross 31 December) gives the area in the field on each
//! day; it must not exceed the block's area. Two seasons may therefore each
//! use the whole block, as long as one is harvested before the next is
//! planted.

use std::collections::{HashMap, HashSet};
use std::fmt;

use chrono::{Datelike, NaiveDate};
use thiserror::Error;

use super::tree::TreeError;
use super::{AvailableSupply, EffectiveRain, HEADWORKS, Planting, Project, SupplyFlow};
use crate::limits::{self, IdProblem, Num};
use crate::weather_import::ImportSettingsProblem;

#[cfg(test)]
mod limit_tests;
mod ranges;

use ranges::{check_count, check_limit, check_paddy, check_strategy};

/// Days in the cropping-plan year used for the occupancy check.
const PLAN_YEAR_DAYS: usize = 365;

/// Relative tolerance for area sums (floating-point rounding of percents).
const AREA_TOLERANCE: f64 = 1e-9;

/// Kind of an item that carries an id.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ItemKind {
    /// A canal.
    Canal,
    /// A block.
    Block,
    /// A planting.
    Planting,
    /// A scenario (its name is its id).
    Scenario,
}

impl fmt::Display for ItemKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Self::Canal => "canal",
            Self::Block => "block",
            Self::Planting => "planting",
            Self::Scenario => "scenario",
        })
    }
}

/// Season length of a crop in days, as the crop library gives it.
///
/// Implemented for any `Fn(&str) -> Option<u32>`; `None` means the crop id is
/// not in the library.
pub trait CropSeasonLengths {
    /// Total season length (initial + development + mid + late) in days.
    fn season_length_days(&self, crop_id: &str) -> Option<u32>;
}

impl<F: Fn(&str) -> Option<u32>> CropSeasonLengths for F {
    fn season_length_days(&self, crop_id: &str) -> Option<u32> {
        self(crop_id)
    }
}

/// What validation needs to know beyond the document.
pub struct ValidationContext<'a> {
    /// Season lengths from the crop library.
    pub crops: &'a dyn CropSeasonLengths,
    /// First and last date of the weather record, if it has been read.
    pub weather_range: Option<(NaiveDate, NaiveDate)>,
}

/// How serious a validation problem is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Severity {
    /// The project cannot be computed as it stands.
    Error,
    /// Computed, but the value is worth a second look.
    Warning,
}

/// An id as messages show it: quoted, and cut after 40 characters with its
/// length, so a runaway id does not flood the list.
pub struct ShortId<'a>(pub &'a str);

impl fmt::Display for ShortId<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        const SHOWN: usize = 40;
        let n = self.0.chars().count();
        if n <= SHOWN {
            write!(f, "{:?}", self.0)
        } else {
            let head: String = self.0.chars().take(SHOWN).collect();
            write!(f, "{head:?}… ({n} characters)")
        }
    }
}

/// One problem found in a project.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum ValidationProblem {
    /// An id is empty.
    #[error("{kind} #{index} has an empty id")]
    EmptyId {
        /// Kind of item.
        kind: ItemKind,
        /// Zero-based position in its list.
        index: usize,
    },
    /// Two items of one kind share an id.
    #[error("{kind} id {} is used {count} times; ids must be unique", ShortId(id))]
    DuplicateId {
        /// Kind of item.
        kind: ItemKind,
        /// The id.
        id: String,
        /// How many items use it.
        count: usize,
    },
    /// An id that breaks the id rules ([`crate::limits::check_id`]).
    #[error("{kind} #{index} id {}: {problem}", ShortId(id))]
    BadId {
        /// Kind of item.
        kind: ItemKind,
        /// Zero-based position in its list.
        index: usize,
        /// The id.
        id: String,
        /// What is wrong.
        problem: IdProblem,
    },
    /// A canal uses the name reserved for the node above all root canals.
    #[error(
        "canal id {} is reserved for the node above the root canals; rename the canal",
        ShortId(id)
    )]
    ReservedId {
        /// The id.
        id: String,
    },
    /// The project has no canal.
    #[error("the scheme has no canal")]
    NoCanals,
    /// A canal's parent is not a canal of the project (or is the canal itself).
    #[error("canal {canal:?} takes from {parent:?}, which is not a canal of the project")]
    MissingParent {
        /// The canal.
        canal: String,
        /// The missing parent id.
        parent: String,
    },
    /// Canals whose parents form a loop.
    #[error("the canal tree has a cycle: {}", canals.join(" → "))]
    CanalCycle {
        /// The canals on the loop, first repeated last.
        canals: Vec<String>,
    },
    /// A block's canal does not exist.
    #[error("block {block:?} takes from canal {canal:?}, which does not exist")]
    BlockOnMissingCanal {
        /// The block.
        block: String,
        /// The missing canal id.
        canal: String,
    },
    /// A planting's block does not exist.
    #[error("planting {planting:?} is on block {block:?}, which does not exist")]
    PlantingOnMissingBlock {
        /// The planting.
        planting: String,
        /// The missing block id.
        block: String,
    },
    /// A number outside its physical range in the table of limits (an
    /// error: the project is not computed).
    #[error("{subject}: {label} ({field}) = {} is outside its physical range: it must be {expected}", Num(*value))]
    OutOfRange {
        /// What holds the value (e.g. `block "B1"`).
        subject: String,
        /// Field as the file names it.
        field: &'static str,
        /// Label of the field ([`crate::limits::Limit::label`]).
        label: &'static str,
        /// The bad value.
        value: f64,
        /// The physical range in words, with its unit.
        expected: String,
    },
    /// A number inside its physical range but outside the range usual in
    /// practice (a warning: computed).
    #[error("{subject}: {label} ({field}) = {} is outside the usual range {usual}; check it", Num(*value))]
    Unusual {
        /// What holds the value.
        subject: String,
        /// Field as the file names it.
        field: &'static str,
        /// Label of the field.
        label: &'static str,
        /// The value.
        value: f64,
        /// The usual range in words, with its unit.
        usual: String,
        /// Where the usual range comes from.
        range_source: &'static str,
    },
    /// A value that breaks a rule other than a range of the table.
    #[error("{subject}: {field} = {} must be {expected}", Num(*value))]
    BadValue {
        /// What holds the value (e.g. `block "B1"`).
        subject: String,
        /// Field name.
        field: &'static str,
        /// The bad value.
        value: f64,
        /// What was expected (e.g. "a finite number > 0").
        expected: &'static str,
    },
    /// A month-day that does not exist in every year.
    #[error(
        "planting {planting:?}: first planting day {month}-{day} does not exist in every year (use 1–12 and a valid day; not 29 February)"
    )]
    InvalidPlantingDay {
        /// The planting.
        planting: String,
        /// Month given.
        month: u32,
        /// Day given.
        day: u32,
    },
    /// The crop library does not know the crop and no season length is given.
    #[error("planting {planting:?}: crop {crop:?} is not in the crop library")]
    UnknownCrop {
        /// The planting.
        planting: String,
        /// The crop id.
        crop: String,
    },
    /// A planting alone is larger than its block.
    #[error(
        "planting {planting:?}: {area_ha} ha is more than block {block:?} ({block_area_ha} ha)"
    )]
    PlantingLargerThanBlock {
        /// The planting.
        planting: String,
        /// Its area (ha).
        area_ha: f64,
        /// The block.
        block: String,
        /// The block's area (ha).
        block_area_ha: f64,
    },
    /// Spread plus season length exceeds a year, so the yearly plan overlaps
    /// itself.
    #[error(
        "planting {planting:?}: spread ({spread_days} d) + season ({season_days} d) exceeds a year; a cropping plan repeats every year"
    )]
    SeasonLongerThanYear {
        /// The planting.
        planting: String,
        /// Spread in days.
        spread_days: u32,
        /// Season length in days.
        season_days: u32,
    },
    /// Plantings on a block need more land than the block has on some days.
    #[error("block {block:?} ({block_area_ha} ha): plantings need up to {planted_ha:.2} ha on {first_day} ({days} day(s) over the block area): {}", plantings.join(", "))]
    BlockOverplanted {
        /// The block.
        block: String,
        /// Block area (ha).
        block_area_ha: f64,
        /// Largest area in the field on one day (ha).
        planted_ha: f64,
        /// First month-day (MM-DD) on which the area is exceeded.
        first_day: String,
        /// Number of days of the year on which it is exceeded.
        days: usize,
        /// Plantings in the field on the worst day.
        plantings: Vec<String>,
    },
    /// No complete season of a planting falls inside the weather record.
    #[error(
        "planting {planting:?}: no complete season ({first} + spread + season) fits in the weather record {record_start} to {record_end}"
    )]
    PlantingOutsideWeather {
        /// The planting.
        planting: String,
        /// First planting date tried (in the record's first year).
        first: NaiveDate,
        /// First date of the record.
        record_start: NaiveDate,
        /// Last date of the record.
        record_end: NaiveDate,
    },
    /// An option out of range.
    #[error("options: {field} = {value} {expected}")]
    BadOption {
        /// The option.
        field: &'static str,
        /// The bad value, as text.
        value: String,
        /// What was expected.
        expected: &'static str,
    },
    /// The weather import settings contradict themselves.
    #[error("{0}")]
    WeatherImport(ImportSettingsProblem),
    /// The station is still at latitude 0° and elevation 0 m, the values of a
    /// new project: almost certainly not entered yet.
    #[error(
        "weather: station latitude 0° and elevation 0 m are the values of a new project; enter the station's (they set Ra, day length and the psychrometric constant of ET₀)"
    )]
    StationNotEntered,
    /// The import mapping's wind column states a measurement height other
    /// than the weather source's `wind_height_m`.
    #[error(
        "weather: wind_height_m = {source_m} m but the import mapping's wind column {column:?} states {mapping_m} m; set one height (the computation uses wind_height_m)"
    )]
    WindHeightMismatch {
        /// The weather source's wind height (m).
        source_m: f64,
        /// The wind column's header.
        column: String,
        /// The height the mapping states (m).
        mapping_m: f64,
    },
    /// A scenario cannot be applied.
    #[error("{0}")]
    Scenario(super::ScenarioError),
    /// A problem that appears only under a scenario.
    #[error("under scenario {scenario:?}: {problem}")]
    InScenario {
        /// The scenario name.
        scenario: String,
        /// The problem.
        problem: Box<ValidationProblem>,
    },
}

impl ValidationProblem {
    /// Whether the problem stops the computation.
    pub fn severity(&self) -> Severity {
        match self {
            // Overlapping seasons on a block are computed with a warning:
            // the occupancy model (equal daily cohorts, whole seasons) is an
            // approximation, and while a plan is edited seasons often
            // overlap for a few days.
            Self::Unusual { .. } | Self::StationNotEntered | Self::BlockOverplanted { .. } => {
                Severity::Warning
            }
            Self::InScenario { problem, .. } => problem.severity(),
            _ => Severity::Error,
        }
    }

    /// True for an error (the project is not computed).
    pub fn is_error(&self) -> bool {
        self.severity() == Severity::Error
    }
}

impl Project {
    /// Every problem in the project, base case and scenarios, errors and
    /// warnings ([`ValidationProblem::severity`]); empty when the project
    /// can be computed without a remark.
    pub fn validate(&self, ctx: &ValidationContext<'_>) -> Vec<ValidationProblem> {
        let mut problems = self.validate_base(ctx);
        problems.extend(self.scenario_name_problems());
        let base_messages: HashSet<String> = problems.iter().map(ToString::to_string).collect();
        for s in &self.scenarios {
            match self.apply_scenario(&s.name) {
                Err(e) => problems.push(ValidationProblem::Scenario(e)),
                Ok(p) => {
                    for problem in p.validate_base(ctx) {
                        if !base_messages.contains(&problem.to_string()) {
                            problems.push(ValidationProblem::InScenario {
                                scenario: s.name.clone(),
                                problem: Box::new(problem),
                            });
                        }
                    }
                }
            }
            for (field, value, expected) in s.weather.out_of_range() {
                problems.push(ValidationProblem::BadValue {
                    subject: format!("scenario {:?}", s.name),
                    field,
                    value,
                    expected,
                });
            }
        }
        problems
    }

    /// Empty, badly formed and duplicate scenario names (a scenario is
    /// found by its name).
    pub fn scenario_name_problems(&self) -> Vec<ValidationProblem> {
        let mut problems = Vec::new();
        check_id_list(
            ItemKind::Scenario,
            self.scenarios.iter().map(|s| s.name.as_str()),
            &mut problems,
        );
        problems
    }

    /// Problems of the document without its scenarios (the project as
    /// computed, once a scenario has been applied).
    pub fn validate_base(&self, ctx: &ValidationContext<'_>) -> Vec<ValidationProblem> {
        let mut out = Vec::new();
        self.check_ids(&mut out);
        self.check_canals(&mut out);
        self.check_blocks(&mut out);
        let lengths = self.check_plantings(ctx, &mut out);
        self.check_occupancy(&lengths, &mut out);
        self.check_weather_and_options(&mut out);
        out
    }

    fn check_ids(&self, out: &mut Vec<ValidationProblem>) {
        check_id_list(
            ItemKind::Canal,
            self.canals.iter().map(|c| c.id.as_str()),
            out,
        );
        check_id_list(
            ItemKind::Block,
            self.blocks.iter().map(|b| b.id.as_str()),
            out,
        );
        check_id_list(
            ItemKind::Planting,
            self.plantings.iter().map(|p| p.id.as_str()),
            out,
        );
    }

    fn check_canals(&self, out: &mut Vec<ValidationProblem>) {
        if self.canals.is_empty() {
            out.push(ValidationProblem::NoCanals);
        }
        let mut cycles_seen: HashSet<Vec<String>> = HashSet::new();
        for c in &self.canals {
            let subject = format!("canal {}", ShortId(&c.id));
            check_limit(
                &subject,
                "conveyance_efficiency",
                &limits::CONVEYANCE_EFFICIENCY,
                c.conveyance_efficiency,
                out,
            );
            check_limit(
                &subject,
                "operating_hours_per_day",
                &limits::OPERATING_HOURS,
                c.operating_hours_per_day,
                out,
            );
            if let Some(q) = c.existing_capacity_m3s {
                check_limit(
                    &subject,
                    "existing_capacity_m3s",
                    &limits::EXISTING_CAPACITY_M3S,
                    q,
                    out,
                );
            }
            if c.id == HEADWORKS {
                out.push(ValidationProblem::ReservedId { id: c.id.clone() });
            }
            if let Some(parent) = &c.parent
                && self.canal(parent).is_none()
            {
                out.push(ValidationProblem::MissingParent {
                    canal: c.id.clone(),
                    parent: parent.clone(),
                });
                continue;
            }
            if let Err(TreeError::Cycle { canals }) = self.path_to_headworks(&c.id) {
                // Report each loop once, whichever canal it was reached from.
                let mut key = canals[..canals.len().saturating_sub(1)].to_vec();
                key.sort();
                if cycles_seen.insert(key) {
                    out.push(ValidationProblem::CanalCycle { canals });
                }
            }
        }
    }

    fn check_blocks(&self, out: &mut Vec<ValidationProblem>) {
        for b in &self.blocks {
            if self.canal(&b.canal).is_none() {
                out.push(ValidationProblem::BlockOnMissingCanal {
                    block: b.id.clone(),
                    canal: b.canal.clone(),
                });
            }
            let subject = format!("block {}", ShortId(&b.id));
            check_limit(&subject, "area_ha", &limits::BLOCK_AREA_HA, b.area_ha, out);
            check_limit(
                &subject,
                "method.application_efficiency",
                &limits::APPLICATION_EFFICIENCY,
                b.method.application_efficiency,
                out,
            );
            check_limit(
                &subject,
                "field_canal_efficiency",
                &limits::FIELD_CANAL_EFFICIENCY,
                b.field_canal_efficiency,
                out,
            );
            check_delivery(b, out);
        }
    }

    /// Checks each planting; returns the season length of those whose
    /// occupancy can be computed.
    fn check_plantings(
        &self,
        ctx: &ValidationContext<'_>,
        out: &mut Vec<ValidationProblem>,
    ) -> HashMap<usize, u32> {
        let mut lengths = HashMap::new();
        let blocks: HashMap<&str, &super::Block> =
            self.blocks.iter().map(|b| (b.id.as_str(), b)).collect();
        for (i, p) in self.plantings.iter().enumerate() {
            let subject = format!("planting {}", ShortId(&p.id));
            let block = blocks.get(p.block.as_str()).copied();
            if block.is_none() {
                out.push(ValidationProblem::PlantingOnMissingBlock {
                    planting: p.id.clone(),
                    block: p.block.clone(),
                });
            }
            match p.area {
                super::PlantingArea::Hectares(ha) => {
                    check_limit(&subject, "area", &limits::PLANTING_AREA_HA, ha, out);
                    if let Some(b) = block
                        && ha > b.area_ha * (1.0 + AREA_TOLERANCE)
                    {
                        out.push(ValidationProblem::PlantingLargerThanBlock {
                            planting: p.id.clone(),
                            area_ha: ha,
                            block: b.id.clone(),
                            block_area_ha: b.area_ha,
                        });
                    }
                }
                super::PlantingArea::PercentOfBlock(pct) => {
                    check_limit(&subject, "area", &limits::PLANTING_AREA_PCT, pct, out);
                }
            }
            check_count(
                &subject,
                "spread_days",
                &limits::SPREAD_DAYS,
                p.spread_days,
                out,
            );
            check_strategy(&subject, &p.strategy, out);
            if let Some(paddy) = &p.paddy {
                check_paddy(&subject, paddy, out);
            }
            if let super::CoefficientChoice::Dual {
                wetted_fraction: Some(fw),
            } = p.coefficients
            {
                check_limit(
                    &subject,
                    "coefficients wetted_fraction",
                    &limits::WETTED_FRACTION,
                    fw,
                    out,
                );
            }
            let day_ok = p.first_planting.is_valid();
            if !day_ok {
                out.push(ValidationProblem::InvalidPlantingDay {
                    planting: p.id.clone(),
                    month: p.first_planting.month,
                    day: p.first_planting.day,
                });
            }
            let season = p
                .season_length_days
                .or_else(|| ctx.crops.season_length_days(&p.crop));
            let Some(season) = season else {
                out.push(ValidationProblem::UnknownCrop {
                    planting: p.id.clone(),
                    crop: p.crop.clone(),
                });
                continue;
            };
            if !limits::SEASON_LENGTH_DAYS
                .physical
                .contains(f64::from(season))
            {
                // A library season is checked with the library (a perennial's
                // first cycle, e.g. sugarcane's 405 days of FAO-56 Table 11,
                // is longer than a year and is computed as a chain); an
                // override here.
                if p.season_length_days.is_some() {
                    check_count(
                        &subject,
                        "season_length_days",
                        &limits::SEASON_LENGTH_DAYS,
                        season,
                        out,
                    );
                }
                continue;
            }
            if p.season_length_days.is_some() {
                check_count(
                    &subject,
                    "season_length_days",
                    &limits::SEASON_LENGTH_DAYS,
                    season,
                    out,
                );
            }
            let span = u64::from(p.cohort_count()) - 1 + u64::from(season);
            if span > PLAN_YEAR_DAYS as u64 {
                out.push(ValidationProblem::SeasonLongerThanYear {
                    planting: p.id.clone(),
                    spread_days: p.spread_days,
                    season_days: season,
                });
                continue;
            }
            if !day_ok {
                continue;
            }
            if let Some((start, end)) = ctx.weather_range {
                check_in_record(p, season, start, end, out);
            }
            if block.is_some() {
                lengths.insert(i, season);
            }
        }
        lengths
    }

    fn check_occupancy(&self, lengths: &HashMap<usize, u32>, out: &mut Vec<ValidationProblem>) {
        // Plantings by block, in file order, so each block sees only its own.
        let mut by_block: HashMap<&str, Vec<usize>> = HashMap::new();
        for (i, p) in self.plantings.iter().enumerate() {
            if lengths.contains_key(&i) {
                by_block.entry(p.block.as_str()).or_default().push(i);
            }
        }
        for b in &self.blocks {
            if !(b.area_ha.is_finite() && b.area_ha > 0.0) {
                continue;
            }
            let Some(indices) = by_block.get(b.id.as_str()) else {
                continue;
            };
            let mut area = [0.0_f64; PLAN_YEAR_DAYS];
            let mut present: Vec<(usize, Vec<bool>)> = Vec::new();
            for &i in indices {
                let p = &self.plantings[i];
                let Some(&season) = lengths.get(&i) else {
                    continue;
                };
                let ha = p.area.hectares(b.area_ha);
                if !ha.is_finite() {
                    continue;
                }
                let Some(start) = p.first_planting.day_of_year0() else {
                    continue;
                };
                let occ =
                    cohort_occupancy(start as usize, p.cohort_count() as usize, season as usize);
                let n = f64::from(p.cohort_count());
                let mut on = vec![false; PLAN_YEAR_DAYS];
                for (d, &k) in occ.iter().enumerate() {
                    if k > 0 {
                        area[d] += ha * f64::from(k) / n;
                        on[d] = true;
                    }
                }
                present.push((i, on));
            }
            let limit = b.area_ha * (1.0 + AREA_TOLERANCE);
            let over: Vec<usize> = (0..PLAN_YEAR_DAYS).filter(|&d| area[d] > limit).collect();
            if let Some(&first) = over.first() {
                let worst = over
                    .iter()
                    .copied()
                    .max_by(|&x, &y| area[x].total_cmp(&area[y]))
                    .unwrap_or(first);
                out.push(ValidationProblem::BlockOverplanted {
                    block: b.id.clone(),
                    block_area_ha: b.area_ha,
                    planted_ha: area[worst],
                    first_day: month_day_label(first),
                    days: over.len(),
                    plantings: present
                        .iter()
                        .filter(|(_, on)| on[worst])
                        .map(|(i, _)| self.plantings[*i].id.clone())
                        .collect(),
                });
            }
        }
    }

    fn check_weather_and_options(&self, out: &mut Vec<ValidationProblem>) {
        let w = &self.weather;
        if w.path.trim().is_empty() {
            out.push(ValidationProblem::BadOption {
                field: "weather.path",
                value: "\"\"".into(),
                expected: "must name the weather CSV file",
            });
        }
        check_limit(
            "weather",
            "latitude_deg",
            &limits::LATITUDE_DEG,
            w.latitude_deg,
            out,
        );
        check_limit(
            "weather",
            "elevation_m",
            &limits::ELEVATION_M,
            w.elevation_m,
            out,
        );
        check_limit(
            "weather",
            "wind_height_m",
            &limits::WIND_HEIGHT_M,
            w.wind_height_m,
            out,
        );
        if w.latitude_deg == 0.0 && w.elevation_m == 0.0 && !w.path.trim().is_empty() {
            out.push(ValidationProblem::StationNotEntered);
        }
        if let Some(import) = &w.import {
            out.extend(
                import
                    .problems()
                    .into_iter()
                    .map(ValidationProblem::WeatherImport),
            );
        }
        if let Some((column, mapping_m)) = w.wind_height_mismatch() {
            out.push(ValidationProblem::WindHeightMismatch {
                source_m: w.wind_height_m,
                column: column.to_owned(),
                mapping_m,
            });
        }
        if let Some(r) = &self.reservoir {
            for (m, &a) in r.surface_area_ha.iter().enumerate() {
                let subject = format!("reservoir {} month {}", ShortId(&r.name), m + 1);
                check_limit(
                    &subject,
                    "surface_area_ha",
                    &limits::RESERVOIR_AREA_HA,
                    a,
                    out,
                );
            }
            if let Some(t) = &r.water_temperature_c {
                for (m, &v) in t.iter().enumerate() {
                    let subject = format!("reservoir {} month {}", ShortId(&r.name), m + 1);
                    check_limit(
                        &subject,
                        "water_temperature_c",
                        &limits::WATER_TEMPERATURE_C,
                        v,
                        out,
                    );
                }
            }
        }
        let o = &self.options;
        if !(1..=12).contains(&o.irrigation_year_start_month) {
            out.push(ValidationProblem::BadOption {
                field: "irrigation_year_start_month",
                value: o.irrigation_year_start_month.to_string(),
                expected: "must be a month, 1–12",
            });
        }
        check_limit(
            "options",
            "design_probability_pct",
            &limits::DESIGN_PROBABILITY_PCT,
            o.design_probability_pct,
            out,
        );
        check_count(
            "options",
            "rotation_period_days",
            &limits::ROTATION_PERIOD_DAYS,
            o.rotation_period_days,
            out,
        );
        check_count(
            "options",
            "gap_filling.max_interpolation_days",
            &limits::MAX_INTERPOLATION_DAYS,
            o.gap_filling.max_interpolation_days,
            out,
        );
        if let EffectiveRain::FixedPercent(pct) = o.effective_rain {
            check_limit(
                "options",
                "effective_rain FixedPercent",
                &limits::FIXED_EFFECTIVE_RAIN_PCT,
                pct,
                out,
            );
        }
        if let Some(AvailableSupply { node, flow }) = &o.available_supply {
            if node != HEADWORKS && self.canal(node).is_none() {
                out.push(ValidationProblem::BadOption {
                    field: "available_supply.node",
                    value: format!("{node:?}"),
                    expected: "must be a canal id or \"headworks\"",
                });
            }
            let flows: &[f64] = match flow {
                SupplyFlow::Constant(q) => std::slice::from_ref(q),
                SupplyFlow::Monthly(m) => m,
            };
            for &q in flows {
                check_limit(
                    "options.available_supply",
                    "flow",
                    &limits::AVAILABLE_FLOW_M3S,
                    q,
                    out,
                );
            }
        }
    }
}

/// Number of cohorts in the field on each day of a 365-day plan year, for a
/// planting whose first cohort goes in on day `start` (zero-based), with
/// `cohorts` cohorts one day apart, each staying `season` days. Wraps
/// around 31 December. Requires `cohorts − 1 + season ≤ 365`.
fn cohort_occupancy(start: usize, cohorts: usize, season: usize) -> [u32; PLAN_YEAR_DAYS] {
    // Difference array over two plan years: cohort c adds one on days
    // start + c .. start + c + season; the second year folds onto the first.
    let mut diff = vec![0_i64; 2 * PLAN_YEAR_DAYS + 1];
    for c in 0..cohorts {
        let from = start + c;
        let to = (from + season).min(2 * PLAN_YEAR_DAYS);
        diff[from] += 1;
        diff[to] -= 1;
    }
    let mut occ = [0_u32; PLAN_YEAR_DAYS];
    let mut running = 0_i64;
    for (d, delta) in diff.iter().take(2 * PLAN_YEAR_DAYS).enumerate() {
        running += delta;
        occ[d % PLAN_YEAR_DAYS] += u32::try_from(running).unwrap_or(0);
    }
    occ
}

fn month_day_label(day0: usize) -> String {
    NaiveDate::from_yo_opt(2001, day0 as u32 + 1).map_or_else(
        || format!("day {}", day0 + 1),
        |d| format!("{:02}-{:02}", d.month(), d.day()),
    )
}

/// Reports a planting none of whose yearly seasons fits in the record.
fn check_in_record(
    p: &Planting,
    season: u32,
    start: NaiveDate,
    end: NaiveDate,
    out: &mut Vec<ValidationProblem>,
) {
    let span_days = i64::from(p.cohort_count()) - 1 + i64::from(season) - 1;
    let mut year = start.year();
    let mut first_tried = None;
    while year <= end.year() {
        if let Some(first) = p.first_planting.in_year(year) {
            first_tried.get_or_insert(first);
            let last = first + chrono::Duration::days(span_days);
            if first >= start && last <= end {
                return;
            }
        }
        year += 1;
    }
    out.push(ValidationProblem::PlantingOutsideWeather {
        planting: p.id.clone(),
        first: first_tried.unwrap_or(start),
        record_start: start,
        record_end: end,
    });
}

fn check_id_list<'a>(
    kind: ItemKind,
    ids: impl Iterator<Item = &'a str>,
    out: &mut Vec<ValidationProblem>,
) {
    let mut counts: Vec<(&str, usize)> = Vec::new();
    for (index, id) in ids.enumerate() {
        match limits::check_id(id) {
            Some(IdProblem::Empty) => {
                out.push(ValidationProblem::EmptyId { kind, index });
                continue;
            }
            Some(problem) => out.push(ValidationProblem::BadId {
                kind,
                index,
                id: id.to_owned(),
                problem,
            }),
            None => {}
        }
        match counts.iter_mut().find(|(x, _)| *x == id) {
            Some((_, n)) => *n += 1,
            None => counts.push((id, 1)),
        }
    }
    for (id, count) in counts {
        if count > 1 {
            out.push(ValidationProblem::DuplicateId {
                kind,
                id: id.to_owned(),
                count,
            });
        }
    }
}

/// A block's delivery mode and outlet against the table of limits
/// (DESIGN.md "Delivery").
fn check_delivery(b: &super::Block, out: &mut Vec<ValidationProblem>) {
    use super::DeliveryMode;
    let subject = format!("block {}", ShortId(&b.id));
    match b.delivery {
        DeliveryMode::OnDemand => {}
        DeliveryMode::RotationWithinBlock {
            cycle_days,
            min_depth_mm,
        } => {
            check_count(
                &subject,
                "delivery.cycle_days",
                &limits::DELIVERY_CYCLE_DAYS,
                cycle_days,
                out,
            );
            check_limit(
                &subject,
                "delivery.min_depth_mm",
                &limits::MIN_TURN_DEPTH_MM,
                min_depth_mm,
                out,
            );
        }
        DeliveryMode::ContinuousFlow { cycle_days } => check_count(
            &subject,
            "delivery.cycle_days",
            &limits::DELIVERY_CYCLE_DAYS,
            cycle_days,
            out,
        ),
    }
    if let Some(q) = b.outlet_stream_size_ls {
        check_limit(
            &subject,
            "outlet_stream_size_ls",
            &limits::OUTLET_STREAM_SIZE_LS,
            q,
            out,
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        /// The difference-array occupancy equals counting every cohort-day.
        #[test]
        fn occupancy_matches_direct_count(start in 0usize..365, cohorts in 1usize..40, season in 1usize..300) {
            prop_assume!(cohorts - 1 + season <= PLAN_YEAR_DAYS);
            let mut direct = [0_u32; PLAN_YEAR_DAYS];
            for c in 0..cohorts {
                for t in 0..season {
                    direct[(start + c + t) % PLAN_YEAR_DAYS] += 1;
                }
            }
            prop_assert_eq!(cohort_occupancy(start, cohorts, season), direct);
        }
    }
}
