//! Scenarios: named changes to the base cropping plan, efficiencies and
//! weather, applied to a copy of the project.
//!
//! A scenario is a list of [`Override`]s applied in order to a clone of the
//! base project, plus an optional [`WeatherPerturbation`] for a
//! climate-sensitivity study. The base project itself is never modified.

use serde::{Deserialize, Serialize};
use thiserror::Error;

use super::{DeliveryMode, IrrigationMethod, MonthDay, Planting, PlantingArea, Project, Strategy};
use crate::weather::WeatherDay;

/// A named alternative to the base case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Scenario {
    /// Unique name (e.g. "current", "shift-to-maize").
    pub name: String,
    /// What the scenario represents.
    #[serde(default)]
    pub description: String,
    /// Changes applied in order to the base project.
    #[serde(default)]
    pub overrides: Vec<Override>,
    /// Changes to the weather series (all zero = the recorded weather).
    #[serde(default)]
    pub weather: WeatherPerturbation,
}

/// One change a scenario makes to the base project.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
#[non_exhaustive]
pub enum Override {
    /// Grow another crop on a planting.
    SetPlantingCrop {
        /// Planting id.
        planting: String,
        /// New crop id.
        crop: String,
    },
    /// Change a planting's area.
    SetPlantingArea {
        /// Planting id.
        planting: String,
        /// New area.
        area: PlantingArea,
    },
    /// Move a planting window.
    SetPlantingDate {
        /// Planting id.
        planting: String,
        /// New first planting day.
        first_planting: MonthDay,
        /// New spread in days (unchanged when absent).
        #[serde(default)]
        spread_days: Option<u32>,
    },
    /// Change a planting's irrigation scheduling.
    SetPlantingStrategy {
        /// Planting id.
        planting: String,
        /// New strategy.
        strategy: Strategy,
    },
    /// Add a planting (its id must be new).
    AddPlanting(Planting),
    /// Remove a planting.
    RemovePlanting {
        /// Planting id.
        planting: String,
    },
    /// Move a share of every planting of one crop to another crop.
    ///
    /// Each planting of `from_crop` keeps `100 − share_pct` % of its area; a
    /// new planting with id `"<id>-<to_crop>"` on the same block, window and
    /// season takes the rest (with `strategy` if given, else the original's).
    ShiftCropShare {
        /// Crop id losing area.
        from_crop: String,
        /// Crop id gaining area.
        to_crop: String,
        /// Share of each planting moved, percent (0–100].
        share_pct: f64,
        /// Strategy of the new plantings (the original's when absent).
        #[serde(default)]
        strategy: Option<Strategy>,
        /// Season length of the new plantings (library value when absent).
        #[serde(default)]
        season_length_days: Option<u32>,
    },
    /// Change a block's irrigation method and/or efficiencies.
    SetBlockEfficiency {
        /// Block id.
        block: String,
        /// New method and application efficiency Ea (unchanged when absent).
        #[serde(default)]
        method: Option<IrrigationMethod>,
        /// New field-canal efficiency Eb (unchanged when absent).
        #[serde(default)]
        field_canal_efficiency: Option<f64>,
    },
    /// Change how a block's outlet delivers, and/or its stream size.
    SetBlockDelivery {
        /// Block id.
        block: String,
        /// New delivery mode (unchanged when absent).
        #[serde(default)]
        delivery: Option<DeliveryMode>,
        /// New outlet stream size in l/s (unchanged when absent).
        #[serde(default)]
        outlet_stream_size_ls: Option<f64>,
    },
    /// Change a canal reach's conveyance efficiency Ec.
    SetCanalEfficiency {
        /// Canal id.
        canal: String,
        /// New conveyance efficiency (fraction).
        conveyance_efficiency: f64,
    },
    /// Change a canal's existing capacity (e.g. after lining or enlarging).
    SetCanalCapacity {
        /// Canal id.
        canal: String,
        /// New existing capacity in m³/s (`None` = unknown).
        existing_capacity_m3s: Option<f64>,
    },
    /// Change a canal's hours of operation per day.
    SetCanalHours {
        /// Canal id.
        canal: String,
        /// New hours per day, (0, 24].
        operating_hours_per_day: f64,
    },
}

/// Changes to the weather series for a climate-sensitivity study.
///
/// All-zero is the recorded weather. Percent changes are relative:
/// `rain_change_pct = -20` means 80 % of the recorded rain.
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WeatherPerturbation {
    /// Added to every air temperature (°C); humidity is adjusted so that the
    /// relative humidity stays as recorded.
    #[serde(default)]
    pub temperature_shift_c: f64,
    /// Change of daily rainfall, percent of the recorded value.
    #[serde(default)]
    pub rain_change_pct: f64,
    /// Change of solar radiation, percent of the recorded (or estimated) value.
    #[serde(default)]
    pub radiation_change_pct: f64,
    /// Change of wind speed, percent of the recorded value.
    #[serde(default)]
    pub wind_change_pct: f64,
}

impl WeatherPerturbation {
    /// Accepted range of `temperature_shift_c` (°C). The limits of this and
    /// the ranges below are our own: they bound a sensitivity study, not the
    /// climate (common practice; wider changes belong in a new weather file).
    pub const TEMPERATURE_SHIFT_C: (f64, f64) = (-10.0, 10.0);
    /// Accepted range of `rain_change_pct` (%): −100 % is no rain.
    pub const RAIN_CHANGE_PCT: (f64, f64) = (-100.0, 200.0);
    /// Accepted range of `radiation_change_pct` (%).
    pub const RADIATION_CHANGE_PCT: (f64, f64) = (-50.0, 50.0);
    /// Accepted range of `wind_change_pct` (%): −100 % is calm.
    pub const WIND_CHANGE_PCT: (f64, f64) = (-100.0, 200.0);

    /// The changes outside their accepted ranges (or not finite): field
    /// name, value and the range in words.
    pub fn out_of_range(&self) -> Vec<(&'static str, f64, &'static str)> {
        [
            (
                "weather.temperature_shift_c",
                self.temperature_shift_c,
                Self::TEMPERATURE_SHIFT_C,
                "between −10 and +10 °C",
            ),
            (
                "weather.rain_change_pct",
                self.rain_change_pct,
                Self::RAIN_CHANGE_PCT,
                "between −100 and +200 %",
            ),
            (
                "weather.radiation_change_pct",
                self.radiation_change_pct,
                Self::RADIATION_CHANGE_PCT,
                "between −50 and +50 %",
            ),
            (
                "weather.wind_change_pct",
                self.wind_change_pct,
                Self::WIND_CHANGE_PCT,
                "between −100 and +200 %",
            ),
        ]
        .into_iter()
        .filter(|(_, v, (lo, hi), _)| !(v.is_finite() && (*lo..=*hi).contains(v)))
        .map(|(field, v, _, expected)| (field, v, expected))
        .collect()
    }
}

/// Why a scenario could not be applied.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum ScenarioError {
    /// No scenario has this name.
    #[error("no scenario named {name:?}; the project has: {}", available.join(", "))]
    UnknownScenario {
        /// The name asked for.
        name: String,
        /// The names the project has.
        available: Vec<String>,
    },
    /// An override names an item that does not exist.
    #[error("scenario {scenario:?}, override {index}: no {kind} with id {id:?}")]
    UnknownItem {
        /// Scenario name.
        scenario: String,
        /// Zero-based position of the override in the list.
        index: usize,
        /// "planting", "block" or "canal".
        kind: &'static str,
        /// The missing id.
        id: String,
    },
    /// An added planting reuses an existing id.
    #[error("scenario {scenario:?}, override {index}: a planting with id {id:?} already exists")]
    DuplicatePlanting {
        /// Scenario name.
        scenario: String,
        /// Zero-based position of the override.
        index: usize,
        /// The duplicate id.
        id: String,
    },
    /// A share outside (0, 100].
    #[error("scenario {scenario:?}, override {index}: share {value} % is outside (0, 100]")]
    ShareOutOfRange {
        /// Scenario name.
        scenario: String,
        /// Zero-based position of the override.
        index: usize,
        /// The bad share.
        value: f64,
    },
    /// A weather change outside its accepted range.
    #[error("scenario {scenario:?}: {field} = {value} is outside the accepted range ({expected})")]
    WeatherChangeOutOfRange {
        /// Scenario name.
        scenario: String,
        /// The field, e.g. `weather.temperature_shift_c`.
        field: &'static str,
        /// The value given.
        value: f64,
        /// The accepted range in words.
        expected: &'static str,
    },
    /// `ShiftCropShare` found no planting of the crop.
    #[error("scenario {scenario:?}, override {index}: no planting grows {crop:?}")]
    CropNotGrown {
        /// Scenario name.
        scenario: String,
        /// Zero-based position of the override.
        index: usize,
        /// The crop id.
        crop: String,
    },
}

impl Project {
    /// The project as the named scenario sees it: a copy of the base with the
    /// scenario's overrides applied in order.
    ///
    /// The weather perturbation is not applied here (the project holds no
    /// weather); get it with [`Project::scenario`] and apply it to the series
    /// with [`WeatherPerturbation::apply_to_day`]. The returned project keeps
    /// the list of scenarios unchanged.
    ///
    /// # Errors
    /// [`ScenarioError`] when the name is unknown or an override names a
    /// missing planting, block or canal, adds a duplicate planting id, or
    /// gives a share outside (0, 100].
    pub fn apply_scenario(&self, name: &str) -> Result<Project, ScenarioError> {
        let scenario = self
            .scenario(name)
            .ok_or_else(|| ScenarioError::UnknownScenario {
                name: name.to_owned(),
                available: self.scenarios.iter().map(|s| s.name.clone()).collect(),
            })?;
        let mut out = self.clone();
        for (index, ov) in scenario.overrides.iter().enumerate() {
            apply_override(&mut out, &scenario.name, index, ov)?;
        }
        Ok(out)
    }
}

fn apply_override(
    p: &mut Project,
    scenario: &str,
    index: usize,
    ov: &Override,
) -> Result<(), ScenarioError> {
    let missing = |kind: &'static str, id: &str| ScenarioError::UnknownItem {
        scenario: scenario.to_owned(),
        index,
        kind,
        id: id.to_owned(),
    };
    match ov {
        Override::SetPlantingCrop { planting, crop } => {
            planting_mut(p, planting)
                .ok_or_else(|| missing("planting", planting))?
                .crop
                .clone_from(crop);
        }
        Override::SetPlantingArea { planting, area } => {
            planting_mut(p, planting)
                .ok_or_else(|| missing("planting", planting))?
                .area = *area;
        }
        Override::SetPlantingDate {
            planting,
            first_planting,
            spread_days,
        } => {
            let pl = planting_mut(p, planting).ok_or_else(|| missing("planting", planting))?;
            pl.first_planting = *first_planting;
            if let Some(s) = spread_days {
                pl.spread_days = *s;
            }
        }
        Override::SetPlantingStrategy { planting, strategy } => {
            planting_mut(p, planting)
                .ok_or_else(|| missing("planting", planting))?
                .strategy = *strategy;
        }
        Override::AddPlanting(new) => {
            if p.planting(&new.id).is_some() {
                return Err(ScenarioError::DuplicatePlanting {
                    scenario: scenario.to_owned(),
                    index,
                    id: new.id.clone(),
                });
            }
            p.plantings.push(new.clone());
        }
        Override::RemovePlanting { planting } => {
            let pos = p
                .plantings
                .iter()
                .position(|x| &x.id == planting)
                .ok_or_else(|| missing("planting", planting))?;
            p.plantings.remove(pos);
        }
        Override::ShiftCropShare {
            from_crop,
            to_crop,
            share_pct,
            strategy,
            season_length_days,
        } => shift_crop_share(
            p,
            scenario,
            index,
            from_crop,
            to_crop,
            *share_pct,
            *strategy,
            *season_length_days,
        )?,
        Override::SetBlockEfficiency {
            block,
            method,
            field_canal_efficiency,
        } => {
            let b = p
                .blocks
                .iter_mut()
                .find(|b| &b.id == block)
                .ok_or_else(|| missing("block", block))?;
            if let Some(m) = method {
                b.method = m.clone();
            }
            if let Some(eb) = field_canal_efficiency {
                b.field_canal_efficiency = *eb;
            }
        }
        Override::SetBlockDelivery {
            block,
            delivery,
            outlet_stream_size_ls,
        } => {
            let b = p
                .blocks
                .iter_mut()
                .find(|b| &b.id == block)
                .ok_or_else(|| missing("block", block))?;
            if let Some(d) = delivery {
                b.delivery = *d;
            }
            if let Some(q) = outlet_stream_size_ls {
                b.outlet_stream_size_ls = Some(*q);
            }
        }
        Override::SetCanalEfficiency {
            canal,
            conveyance_efficiency,
        } => {
            canal_mut(p, canal)
                .ok_or_else(|| missing("canal", canal))?
                .conveyance_efficiency = *conveyance_efficiency;
        }
        Override::SetCanalCapacity {
            canal,
            existing_capacity_m3s,
        } => {
            canal_mut(p, canal)
                .ok_or_else(|| missing("canal", canal))?
                .existing_capacity_m3s = *existing_capacity_m3s;
        }
        Override::SetCanalHours {
            canal,
            operating_hours_per_day,
        } => {
            canal_mut(p, canal)
                .ok_or_else(|| missing("canal", canal))?
                .operating_hours_per_day = *operating_hours_per_day;
        }
    }
    Ok(())
}

#[expect(
    clippy::too_many_arguments,
    reason = "mirrors the fields of Override::ShiftCropShare one to one"
)]
fn shift_crop_share(
    p: &mut Project,
    scenario: &str,
    index: usize,
    from_crop: &str,
    to_crop: &str,
    share_pct: f64,
    strategy: Option<Strategy>,
    season_length_days: Option<u32>,
) -> Result<(), ScenarioError> {
    if !(share_pct > 0.0 && share_pct <= 100.0) {
        return Err(ScenarioError::ShareOutOfRange {
            scenario: scenario.to_owned(),
            index,
            value: share_pct,
        });
    }
    let keep = 1.0 - share_pct / 100.0;
    let mut added = Vec::new();
    for pl in p.plantings.iter_mut().filter(|pl| pl.crop == from_crop) {
        let moved = match pl.area {
            PlantingArea::Hectares(ha) => PlantingArea::Hectares(ha * share_pct / 100.0),
            PlantingArea::PercentOfBlock(pct) => {
                PlantingArea::PercentOfBlock(pct * share_pct / 100.0)
            }
        };
        pl.area = match pl.area {
            PlantingArea::Hectares(ha) => PlantingArea::Hectares(ha * keep),
            PlantingArea::PercentOfBlock(pct) => PlantingArea::PercentOfBlock(pct * keep),
        };
        added.push(Planting {
            id: format!("{}-{}", pl.id, to_crop),
            block: pl.block.clone(),
            crop: to_crop.to_owned(),
            area: moved,
            first_planting: pl.first_planting,
            spread_days: pl.spread_days,
            season: pl.season.clone(),
            strategy: strategy.unwrap_or(pl.strategy),
            season_length_days,
            // The share moves to another crop: the paddy inputs stay with
            // the rice (a paddy crop shifted to takes the paddy defaults).
            paddy: None,
            // The coefficient approach belongs to how the block is farmed.
            coefficients: pl.coefficients,
        });
    }
    if added.is_empty() {
        return Err(ScenarioError::CropNotGrown {
            scenario: scenario.to_owned(),
            index,
            crop: from_crop.to_owned(),
        });
    }
    for new in &added {
        if p.planting(&new.id).is_some() {
            return Err(ScenarioError::DuplicatePlanting {
                scenario: scenario.to_owned(),
                index,
                id: new.id.clone(),
            });
        }
    }
    // A planting moved entirely keeps no area: drop it.
    if share_pct >= 100.0 {
        p.plantings.retain(|pl| pl.crop != from_crop);
    }
    p.plantings.extend(added);
    Ok(())
}

fn planting_mut<'a>(p: &'a mut Project, id: &str) -> Option<&'a mut Planting> {
    p.plantings.iter_mut().find(|x| x.id == id)
}

fn canal_mut<'a>(p: &'a mut Project, id: &str) -> Option<&'a mut super::Canal> {
    p.canals.iter_mut().find(|x| x.id == id)
}

/// Saturation vapour pressure e°(T) in kPa at air temperature `t_c` (°C).
///
/// e°(T) = 0.6108 exp(17.27 T / (T + 237.3)) — FAO-56 (Allen et al. 1998)
/// eq. 11, p. 36. Kept private here to make the perturbation self-contained;
/// the ET₀ module holds the public version.
fn saturation_vapour_pressure_kpa(t_c: f64) -> f64 {
    0.6108 * (17.27 * t_c / (t_c + 237.3)).exp()
}

/// Dewpoint (°C) at which the saturation vapour pressure equals `ea_kpa`:
/// the algebraic inverse of FAO-56 eq. 11 (with eq. 14, ea = e°(Tdew)).
fn dewpoint_from_vapour_pressure_c(ea_kpa: f64) -> f64 {
    let l = (ea_kpa / 0.6108).ln();
    237.3 * l / (17.27 - l)
}

impl WeatherPerturbation {
    /// Whether this perturbation leaves the weather unchanged.
    pub fn is_identity(&self) -> bool {
        *self == Self::default()
    }

    /// Multiplier on rainfall (never negative).
    pub fn rain_factor(&self) -> f64 {
        (1.0 + self.rain_change_pct / 100.0).max(0.0)
    }

    /// Multiplier on solar radiation (never negative). The ET₀ step applies
    /// it to estimated radiation too (from sunshine or temperature range).
    pub fn radiation_factor(&self) -> f64 {
        (1.0 + self.radiation_change_pct / 100.0).max(0.0)
    }

    /// Multiplier on wind speed (never negative).
    pub fn wind_factor(&self) -> f64 {
        (1.0 + self.wind_change_pct / 100.0).max(0.0)
    }

    /// One day of weather changed by this perturbation.
    ///
    /// Temperatures (`tmax_c`, `tmin_c`, `tmean_c`) are shifted by
    /// `temperature_shift_c`. Relative humidity is kept as recorded: the
    /// RH fields are left alone, and an actual vapour pressure (`ea_kpa`,
    /// or the one implied by `tdew_c`) is scaled by the ratio of the mean
    /// saturation vapour pressures es = [e°(Tmax) + e°(Tmin)] / 2 (FAO-56
    /// eq. 12) after and before the shift, so that ea/es is unchanged.
    /// With only a mean temperature, e°(Tmean) is used instead. Rain,
    /// measured solar radiation and wind are multiplied by their factors;
    /// sunshine hours are left alone (see [`Self::radiation_factor`]).
    pub fn apply_to_day(&self, day: &WeatherDay) -> WeatherDay {
        let mut out = *day;
        let dt = self.temperature_shift_c;
        if dt != 0.0 {
            let es = |shift: f64| match (day.tmax_c, day.tmin_c, day.tmean_c) {
                (Some(tx), Some(tn), _) => Some(f64::midpoint(
                    saturation_vapour_pressure_kpa(tx + shift),
                    saturation_vapour_pressure_kpa(tn + shift),
                )),
                (_, _, Some(tm)) => Some(saturation_vapour_pressure_kpa(tm + shift)),
                _ => None,
            };
            let ratio = match (es(0.0), es(dt)) {
                (Some(before), Some(after)) if before > 0.0 => Some(after / before),
                _ => None,
            };
            out.tmax_c = day.tmax_c.map(|t| t + dt);
            out.tmin_c = day.tmin_c.map(|t| t + dt);
            out.tmean_c = day.tmean_c.map(|t| t + dt);
            if let Some(r) = ratio {
                out.ea_kpa = day.ea_kpa.map(|ea| ea * r);
                out.tdew_c = day.tdew_c.map(|td| {
                    dewpoint_from_vapour_pressure_c(saturation_vapour_pressure_kpa(td) * r)
                });
            } else {
                // Without a temperature to scale by, shifting the dewpoint by
                // the same amount keeps the humidity roughly constant.
                out.tdew_c = day.tdew_c.map(|t| t + dt);
            }
        }
        out.rain_mm = day.rain_mm.map(|r| r * self.rain_factor());
        out.solar_mj = day.solar_mj.map(|r| r * self.radiation_factor());
        out.wind_ms = day.wind_ms.map(|w| w * self.wind_factor());
        out
    }
}

#[cfg(test)]
pub(super) mod tests_support {
    /// e°(T) for the tests (FAO-56 eq. 11).
    pub fn es(t_c: f64) -> f64 {
        super::saturation_vapour_pressure_kpa(t_c)
    }
}
