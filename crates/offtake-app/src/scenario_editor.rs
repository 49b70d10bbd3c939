//! The scenario editor: a scenario edited as a cropping pattern, not as raw
//! overrides.
//!
//! The window lists the plan as the scenario makes it (the base plantings
//! with the scenario's overrides applied) and lets the engineer change a
//! planting's crop, area, planting window and strategy, remove a planting,
//! add one to a block, move a share of one crop to another, change a block's
//! efficiencies (Ea with its irrigation method, Eb) or a canal's conveyance
//! efficiency, existing capacity and hours of operation, and change the
//! weather (temperature shift, rain, radiation and wind). Each change is
//! stored in the scenario as the matching [`Override`] — an earlier override
//! of the same planting field, block or canal value is replaced, never
//! stacked — through one undoable [`DocEdit::SetScenario`]. The base plan is
//! never changed.
//!
//! As in the inspector, a number outside its allowed range is **kept**: it
//! is stored in the scenario (so it is saved and never lost), the field
//! shows the reason and the range, the list of stored changes repeats it,
//! and the project validation reports it (`under scenario "…": …`). Text
//! that is not a number never reaches the document.
//!
//! The pure part (what a change does to a [`Scenario`]) is in free
//! functions ([`plan`], [`with_planting_override`], [`with_planting_removed`],
//! [`with_item_override`], [`with_shift`], [`without_override`],
//! [`sentence`], [`override_problems`]) so it is tested without a window.

use egui::{Id, RichText, Ui};
use offtake_core::project::{
    IrrigationMethod, MonthDay, Override, Planting, PlantingArea, Project, Scenario, ScenarioError,
    Strategy, WeatherPerturbation,
};
use offtake_io::library::Libraries;

use crate::command::Command;
use crate::edit::DocEdit;
use crate::fields::{Bounds, date_free_month_day, format_number, number_field, parse_number};

/// Allowed ranges of the scenario's weather change, in the units shown.
/// They bound a sensitivity study, not the climate: rain −100 % is no rain.
pub mod bounds {
    use crate::fields::Bounds;

    use offtake_core::project::WeatherPerturbation as P;

    /// Shift of every air temperature (the core's accepted range).
    pub const TEMPERATURE: Bounds = Bounds::new(
        "Temperature shift",
        "°C",
        P::TEMPERATURE_SHIFT_C.0,
        P::TEMPERATURE_SHIFT_C.1,
    );
    /// Change of daily rain.
    pub const RAIN: Bounds = Bounds::new(
        "Rain change",
        "%",
        P::RAIN_CHANGE_PCT.0,
        P::RAIN_CHANGE_PCT.1,
    );
    /// Change of solar radiation.
    pub const RADIATION: Bounds = Bounds::new(
        "Radiation change",
        "%",
        P::RADIATION_CHANGE_PCT.0,
        P::RADIATION_CHANGE_PCT.1,
    );
    /// Change of wind speed.
    pub const WIND: Bounds = Bounds::new(
        "Wind change",
        "%",
        P::WIND_CHANGE_PCT.0,
        P::WIND_CHANGE_PCT.1,
    );
    /// Area of a planting in hectares.
    pub const AREA_HA: Bounds = Bounds::new("Area", "ha", 0.0, 1.0e6);
    /// Area of a planting as a share of its block.
    pub const AREA_PCT: Bounds = Bounds::new("Share of block", "%", 0.0, 100.0);
    /// Spread of the planting window.
    pub const SPREAD: Bounds = Bounds::new("Planting spread", "days", 0.0, 365.0);
}

/// The plan as a scenario makes it.
#[derive(Debug, Clone, PartialEq)]
pub struct ScenarioPlan {
    /// The base project with every override that applies applied in order.
    pub project: Project,
    /// Overrides that could not be applied: (position in the list, reason).
    /// The engine refuses the whole scenario while any is left.
    pub problems: Vec<(usize, String)>,
}

/// A reason for a scenario error, without the scenario name and index (the
/// editor shows it beside the override it belongs to).
fn reason(e: &ScenarioError) -> String {
    match e {
        ScenarioError::UnknownItem { kind, id, .. } => {
            format!("no {kind} with id {id:?} in the plan")
        }
        ScenarioError::DuplicatePlanting { id, .. } => {
            format!("a planting with id {id:?} already exists")
        }
        ScenarioError::ShareOutOfRange { value, .. } => {
            format!("share {value} % is outside (0, 100]")
        }
        ScenarioError::CropNotGrown { crop, .. } => format!("no planting grows {crop:?}"),
        other => other.to_string(),
    }
}

/// One override applied to `p` (the core applies scenarios as a whole; a
/// one-override scenario gives the step and its own error).
fn apply_one(p: &Project, ov: &Override) -> Result<Project, String> {
    let mut tmp = p.clone();
    tmp.scenarios = vec![Scenario {
        name: "step".to_owned(),
        description: String::new(),
        overrides: vec![ov.clone()],
        weather: WeatherPerturbation::default(),
    }];
    tmp.apply_scenario("step")
        .map(|mut q| {
            q.scenarios.clear();
            q
        })
        .map_err(|e| reason(&e))
}

/// The base plan with the scenario's overrides applied in order. An
/// override that does not apply is skipped and reported, so the editor can
/// still show the rest of the plan.
pub fn plan(base: &Project, scenario: &Scenario) -> ScenarioPlan {
    let mut project = base.clone();
    project.scenarios.clear();
    let mut problems = Vec::new();
    for (i, ov) in scenario.overrides.iter().enumerate() {
        match apply_one(&project, ov) {
            Ok(next) => project = next,
            Err(e) => problems.push((i, e)),
        }
    }
    ScenarioPlan { project, problems }
}

/// The planting a planting-field override targets.
fn planting_target(ov: &Override) -> Option<&str> {
    match ov {
        Override::SetPlantingCrop { planting, .. }
        | Override::SetPlantingArea { planting, .. }
        | Override::SetPlantingDate { planting, .. }
        | Override::SetPlantingStrategy { planting, .. }
        | Override::RemovePlanting { planting } => Some(planting),
        _ => None,
    }
}

/// Whether two overrides set the same thing (so the newer replaces the older).
fn same_target(a: &Override, b: &Override) -> bool {
    use Override as O;
    match (a, b) {
        (O::SetPlantingCrop { planting: x, .. }, O::SetPlantingCrop { planting: y, .. })
        | (O::SetPlantingArea { planting: x, .. }, O::SetPlantingArea { planting: y, .. })
        | (O::SetPlantingDate { planting: x, .. }, O::SetPlantingDate { planting: y, .. })
        | (
            O::SetPlantingStrategy { planting: x, .. },
            O::SetPlantingStrategy { planting: y, .. },
        )
        | (O::RemovePlanting { planting: x }, O::RemovePlanting { planting: y })
        | (O::SetBlockEfficiency { block: x, .. }, O::SetBlockEfficiency { block: y, .. })
        | (O::SetCanalEfficiency { canal: x, .. }, O::SetCanalEfficiency { canal: y, .. })
        | (O::SetCanalCapacity { canal: x, .. }, O::SetCanalCapacity { canal: y, .. })
        | (O::SetCanalHours { canal: x, .. }, O::SetCanalHours { canal: y, .. }) => x == y,
        (
            O::ShiftCropShare {
                from_crop: f1,
                to_crop: t1,
                ..
            },
            O::ShiftCropShare {
                from_crop: f2,
                to_crop: t2,
                ..
            },
        ) => f1 == f2 && t1 == t2,
        (O::AddPlanting(x), O::AddPlanting(y)) => x.id == y.id,
        _ => false,
    }
}

/// Whether `ov` would change nothing in `p` (the planting already has that value).
fn is_noop(p: &Project, ov: &Override) -> bool {
    let Some(pl) = planting_target(ov).and_then(|id| p.planting(id)) else {
        return false;
    };
    match ov {
        Override::SetPlantingCrop { crop, .. } => pl.crop == *crop,
        Override::SetPlantingArea { area, .. } => pl.area == *area,
        Override::SetPlantingDate {
            first_planting,
            spread_days,
            ..
        } => {
            pl.first_planting == *first_planting && spread_days.is_none_or(|s| s == pl.spread_days)
        }
        Override::SetPlantingStrategy { strategy, .. } => pl.strategy == *strategy,
        _ => false,
    }
}

/// Applies a planting-field override to a planting record.
fn patch_planting(pl: &mut Planting, ov: &Override) {
    match ov {
        Override::SetPlantingCrop { crop, .. } => pl.crop.clone_from(crop),
        Override::SetPlantingArea { area, .. } => pl.area = *area,
        Override::SetPlantingDate {
            first_planting,
            spread_days,
            ..
        } => {
            pl.first_planting = *first_planting;
            if let Some(s) = spread_days {
                pl.spread_days = *s;
            }
        }
        Override::SetPlantingStrategy { strategy, .. } => pl.strategy = *strategy,
        _ => {}
    }
}

/// The scenario with a planting-field override (crop, area, date or
/// strategy) set.
///
/// - A planting the scenario itself adds is changed inside its
///   `AddPlanting` record.
/// - Otherwise an earlier override of the same field of the same planting
///   is replaced: in place for crop, date and strategy (so a later crop
///   shift still sees the crop chosen here); an area override moves to the
///   end, so the area typed is the area the plan shows even after a shift.
/// - An override that would leave the planting as the plan without it has
///   it is dropped rather than stored.
pub fn with_planting_override(base: &Project, scenario: &Scenario, ov: Override) -> Scenario {
    let mut out = scenario.clone();
    let Some(target) = planting_target(&ov).map(str::to_owned) else {
        return out;
    };
    if let Some(Override::AddPlanting(pl)) = out
        .overrides
        .iter_mut()
        .find(|o| matches!(o, Override::AddPlanting(p) if p.id == target))
    {
        patch_planting(pl, &ov);
        return out;
    }
    let position = out.overrides.iter().position(|o| same_target(o, &ov));
    let mut without = out.clone();
    without.overrides.retain(|o| !same_target(o, &ov));
    if is_noop(&plan(base, &without).project, &ov) {
        return without;
    }
    match (position, &ov) {
        (Some(i), ov) if !matches!(ov, Override::SetPlantingArea { .. }) => {
            out.overrides[i] = ov.clone();
        }
        _ => {
            out = without;
            out.overrides.push(ov);
        }
    }
    out
}

/// The scenario without the planting `id`: an added planting loses its
/// `AddPlanting` record; any other gets a `RemovePlanting`. Overrides of
/// that planting's fields go too (they would change nothing).
pub fn with_planting_removed(scenario: &Scenario, id: &str) -> Scenario {
    let mut out = scenario.clone();
    let added = out
        .overrides
        .iter()
        .any(|o| matches!(o, Override::AddPlanting(p) if p.id == id));
    out.overrides.retain(|o| {
        planting_target(o) != Some(id) && !matches!(o, Override::AddPlanting(p) if p.id == id)
    });
    if !added {
        out.overrides.push(Override::RemovePlanting {
            planting: id.to_owned(),
        });
    }
    out
}

/// The scenario with a planting added (its id must be new in the plan).
pub fn with_planting_added(scenario: &Scenario, planting: Planting) -> Scenario {
    let mut out = scenario.clone();
    out.overrides.push(Override::AddPlanting(planting));
    out
}

/// What a crop shift gives the plantings it makes: `None` keeps the
/// original planting's strategy and the library season length.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct ShiftedPlantings {
    /// Irrigation strategy of the new plantings.
    pub strategy: Option<Strategy>,
    /// Season length of the new plantings (days).
    pub season_length_days: Option<u32>,
}

/// The scenario with "move `share_pct` % of `from` to `to`": replaces an
/// earlier shift between the same two crops, else is added at the end.
pub fn with_shift(
    scenario: &Scenario,
    from: &str,
    to: &str,
    share_pct: f64,
    new: ShiftedPlantings,
) -> Scenario {
    let ov = Override::ShiftCropShare {
        from_crop: from.to_owned(),
        to_crop: to.to_owned(),
        share_pct,
        strategy: new.strategy,
        season_length_days: new.season_length_days,
    };
    let mut out = scenario.clone();
    match out.overrides.iter().position(|o| same_target(o, &ov)) {
        Some(i) => out.overrides[i] = ov,
        None => out.overrides.push(ov),
    }
    out
}

/// `ov` without the parts that would leave the plan `p` as it is (the block
/// or canal already has that value); `None` when nothing is left.
#[expect(
    clippy::float_cmp,
    reason = "a value equal to the plan's, bit for bit, is no change"
)]
fn strip_noop(p: &Project, ov: Override) -> Option<Override> {
    match ov {
        Override::SetBlockEfficiency {
            block,
            method,
            field_canal_efficiency,
        } => {
            let Some(b) = p.block(&block) else {
                return Some(Override::SetBlockEfficiency {
                    block,
                    method,
                    field_canal_efficiency,
                });
            };
            let method = method.filter(|m| *m != b.method);
            let field_canal_efficiency =
                field_canal_efficiency.filter(|&eb| eb != b.field_canal_efficiency);
            (method.is_some() || field_canal_efficiency.is_some()).then_some(
                Override::SetBlockEfficiency {
                    block,
                    method,
                    field_canal_efficiency,
                },
            )
        }
        Override::SetCanalEfficiency {
            canal,
            conveyance_efficiency,
        } => match p.canal(&canal) {
            Some(c) if c.conveyance_efficiency == conveyance_efficiency => None,
            _ => Some(Override::SetCanalEfficiency {
                canal,
                conveyance_efficiency,
            }),
        },
        Override::SetCanalCapacity {
            canal,
            existing_capacity_m3s,
        } => match p.canal(&canal) {
            Some(c) if c.existing_capacity_m3s == existing_capacity_m3s => None,
            _ => Some(Override::SetCanalCapacity {
                canal,
                existing_capacity_m3s,
            }),
        },
        Override::SetCanalHours {
            canal,
            operating_hours_per_day,
        } => match p.canal(&canal) {
            Some(c) if c.operating_hours_per_day == operating_hours_per_day => None,
            _ => Some(Override::SetCanalHours {
                canal,
                operating_hours_per_day,
            }),
        },
        other => Some(other),
    }
}

/// The scenario with a block or canal override set (`SetBlockEfficiency`,
/// `SetCanalEfficiency`, `SetCanalCapacity`, `SetCanalHours`).
///
/// - An earlier override of the same block (or the same value of the same
///   canal) is replaced in place, never stacked. For a block, the parts not
///   given are kept from the earlier override: setting Eb keeps an Ea set
///   before, and the other way round.
/// - Parts equal to the plan without the override are dropped; an override
///   left with nothing to change is not stored (typing the base value back
///   removes the change).
/// - The value is stored as given, in range or not: validation reports it.
///
/// Planting overrides go through [`with_planting_override`]; any other
/// override is returned unchanged.
pub fn with_item_override(base: &Project, scenario: &Scenario, ov: Override) -> Scenario {
    if !matches!(
        ov,
        Override::SetBlockEfficiency { .. }
            | Override::SetCanalEfficiency { .. }
            | Override::SetCanalCapacity { .. }
            | Override::SetCanalHours { .. }
    ) {
        return scenario.clone();
    }
    let mut out = scenario.clone();
    let position = out.overrides.iter().position(|o| same_target(o, &ov));
    let ov = match (position.map(|i| &out.overrides[i]), ov) {
        (
            Some(Override::SetBlockEfficiency {
                method: old_method,
                field_canal_efficiency: old_eb,
                ..
            }),
            Override::SetBlockEfficiency {
                block,
                method,
                field_canal_efficiency,
            },
        ) => Override::SetBlockEfficiency {
            block,
            method: method.or_else(|| old_method.clone()),
            field_canal_efficiency: field_canal_efficiency.or(*old_eb),
        },
        (_, ov) => ov,
    };
    let mut without = out.clone();
    without.overrides.retain(|o| !same_target(o, &ov));
    match (position, strip_noop(&plan(base, &without).project, ov)) {
        (_, None) => without,
        (Some(i), Some(ov)) => {
            out.overrides[i] = ov;
            out
        }
        (None, Some(ov)) => {
            out.overrides.push(ov);
            out
        }
    }
}

/// The values of an override that lie outside the ranges the editor allows,
/// each as the field shows it ("Field-canal efficiency must be between 1 %
/// and 100 %"). Such a value is kept in the scenario; this says why it
/// needs fixing.
pub fn override_problems(ov: &Override) -> Vec<String> {
    use crate::inspector::bounds as ib;
    let mut out = Vec::new();
    let mut share = None;
    let mut check = |b: &Bounds, stored: f64| {
        if let Err(e) = b.check(stored * b.factor) {
            out.push(e);
        }
    };
    let planting = |pl: &Planting, check: &mut dyn FnMut(&Bounds, f64)| {
        match pl.area {
            PlantingArea::Hectares(ha) => check(&bounds::AREA_HA, ha),
            PlantingArea::PercentOfBlock(p) => check(&bounds::AREA_PCT, p),
        }
        check(&bounds::SPREAD, f64::from(pl.spread_days));
        strategy_problems(&pl.strategy, check);
    };
    match ov {
        Override::SetPlantingArea { area, .. } => match *area {
            PlantingArea::Hectares(ha) => check(&bounds::AREA_HA, ha),
            PlantingArea::PercentOfBlock(p) => check(&bounds::AREA_PCT, p),
        },
        Override::SetPlantingDate {
            spread_days: Some(d),
            ..
        } => check(&bounds::SPREAD, f64::from(*d)),
        Override::SetPlantingStrategy { strategy, .. } => strategy_problems(strategy, &mut check),
        Override::AddPlanting(pl) => planting(pl, &mut check),
        Override::ShiftCropShare {
            share_pct,
            strategy,
            season_length_days,
            ..
        } => {
            share = check_share(&share_pct.to_string()).err();
            if let Some(st) = strategy {
                strategy_problems(st, &mut check);
            }
            if let Some(d) = season_length_days {
                check(&ib::SEASON, f64::from(*d));
            }
        }
        Override::SetBlockEfficiency {
            method,
            field_canal_efficiency,
            ..
        } => {
            if let Some(m) = method {
                check(&ib::APPLICATION, m.application_efficiency);
            }
            if let Some(eb) = field_canal_efficiency {
                check(&ib::FIELD_CANAL, *eb);
            }
        }
        Override::SetCanalEfficiency {
            conveyance_efficiency,
            ..
        } => check(&ib::CONVEYANCE, *conveyance_efficiency),
        Override::SetCanalCapacity {
            existing_capacity_m3s: Some(q),
            ..
        } => check(&ib::CAPACITY, *q),
        Override::SetCanalHours {
            operating_hours_per_day,
            ..
        } => check(&ib::HOURS, *operating_hours_per_day),
        _ => {}
    }
    out.extend(share);
    out
}

/// Range checks of a strategy's parameters (the inspector's bounds).
fn strategy_problems(s: &Strategy, check: &mut dyn FnMut(&Bounds, f64)) {
    use crate::inspector::bounds as ib;
    match *s {
        Strategy::Refill { trigger_pct_of_raw } => check(&ib::TRIGGER_RAW, trigger_pct_of_raw),
        Strategy::Interval { days } => check(&ib::INTERVAL, f64::from(days)),
        Strategy::Depth { net_mm } => check(&ib::DEPTH, net_mm),
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => {
            check(&ib::TRIGGER_TAW, trigger_pct_of_taw);
            check(&ib::REFILL, refill_pct_of_depletion);
        }
        Strategy::Rainfed => {}
    }
}

/// The weather change's values outside the editor's ranges.
pub fn weather_problems(w: &WeatherPerturbation) -> Vec<String> {
    [
        (&bounds::TEMPERATURE, w.temperature_shift_c),
        (&bounds::RAIN, w.rain_change_pct),
        (&bounds::RADIATION, w.radiation_change_pct),
        (&bounds::WIND, w.wind_change_pct),
    ]
    .into_iter()
    .filter_map(|(b, v)| b.check(v).err())
    .collect()
}

/// The scenario without its override at `index`.
pub fn without_override(scenario: &Scenario, index: usize) -> Scenario {
    let mut out = scenario.clone();
    if index < out.overrides.len() {
        out.overrides.remove(index);
    }
    out
}

/// Checks the share of a crop shift as typed (percent, in (0, 100]).
///
/// # Errors
/// The reason, with the allowed range.
pub fn check_share(text: &str) -> Result<f64, String> {
    let v = parse_number(text)?;
    if v > 0.0 && v <= 100.0 {
        Ok(v)
    } else {
        Err("Share moved must be more than 0 % and at most 100 %".to_owned())
    }
}

fn month_abbrev(m: u32) -> &'static str {
    const NAMES: [&str; 12] = [
        "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
    ];
    NAMES
        .get(m.wrapping_sub(1) as usize)
        .copied()
        .unwrap_or("?")
}

/// A day of the year as "15 Jun".
pub fn month_day_text(md: MonthDay) -> String {
    format!("{} {}", md.day, month_abbrev(md.month))
}

/// An area as the user gave it ("40 % of the block", "12.5 ha").
pub fn area_text(a: PlantingArea) -> String {
    match a {
        PlantingArea::Hectares(ha) => format!("{} ha", format_number(ha, 2)),
        PlantingArea::PercentOfBlock(p) => format!("{} % of its block", format_number(p, 2)),
    }
}

/// A strategy in words with its parameters and units.
pub fn strategy_text(s: &Strategy) -> String {
    match s {
        Strategy::Refill { trigger_pct_of_raw } => format!(
            "refill when depletion reaches {} % of RAW",
            format_number(*trigger_pct_of_raw, 1)
        ),
        Strategy::Interval { days } => format!("every {days} days"),
        Strategy::Depth { net_mm } => format!("fixed net depth {} mm", format_number(*net_mm, 1)),
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => format!(
            "deficit: at {} % of TAW, refill {} % of depletion",
            format_number(*trigger_pct_of_taw, 1),
            format_number(*refill_pct_of_depletion, 1)
        ),
        Strategy::Rainfed => "rainfed (no irrigation)".to_owned(),
    }
}

/// A strategy in a few words, for the plan table.
fn strategy_short(s: &Strategy) -> String {
    match s {
        Strategy::Refill { trigger_pct_of_raw } => {
            format!("refill at {} % RAW", format_number(*trigger_pct_of_raw, 1))
        }
        Strategy::Interval { days } => format!("every {days} days"),
        Strategy::Depth { net_mm } => format!("{} mm each", format_number(*net_mm, 1)),
        Strategy::Deficit {
            trigger_pct_of_taw, ..
        } => format!("deficit at {} % TAW", format_number(*trigger_pct_of_taw, 1)),
        Strategy::Rainfed => "rainfed".to_owned(),
    }
}

fn pct(fraction: f64) -> String {
    format!("{} %", format_number(fraction * 100.0, 1))
}

/// One override as a readable sentence. `base` is the base plan (for what a
/// planting grew before).
pub fn sentence(ov: &Override, base: &Project, libs: &Libraries) -> String {
    let was = |id: &str| {
        base.planting(id)
            .map(|p| format!(" (base plan: {})", libs.crop_name(&p.crop)))
            .unwrap_or_default()
    };
    let block_label = |id: &str| {
        base.block(id)
            .map_or_else(|| id.to_owned(), |b| format!("{} ({id})", b.name))
    };
    let canal_label = |id: &str| {
        base.canal(id)
            .map_or_else(|| id.to_owned(), |c| format!("{} ({id})", c.name))
    };
    match ov {
        Override::SetPlantingCrop { planting, crop } => format!(
            "Planting {planting} grows {}{}.",
            libs.crop_name(crop),
            was(planting)
        ),
        Override::SetPlantingArea { planting, area } => {
            format!("Planting {planting} covers {}.", area_text(*area))
        }
        Override::SetPlantingDate {
            planting,
            first_planting,
            spread_days,
        } => format!(
            "Planting {planting} is first planted on {}{}.",
            month_day_text(*first_planting),
            spread_days.map_or_else(String::new, |d| format!(", spread over {d} days"))
        ),
        Override::SetPlantingStrategy { planting, strategy } => format!(
            "Planting {planting} is irrigated: {}.",
            strategy_text(strategy)
        ),
        Override::AddPlanting(p) => format!(
            "Adds planting {}: {} on block {}, {}, first planted on {}.",
            p.id,
            libs.crop_name(&p.crop),
            p.block,
            area_text(p.area),
            month_day_text(p.first_planting)
        ),
        Override::RemovePlanting { planting } => {
            format!("Removes planting {planting}{}.", was(planting))
        }
        Override::ShiftCropShare {
            from_crop,
            to_crop,
            share_pct,
            strategy,
            season_length_days,
        } => {
            let mut new = Vec::new();
            if let Some(s) = strategy {
                new.push(format!("irrigated: {}", strategy_text(s)));
            }
            if let Some(d) = season_length_days {
                new.push(format!("season {d} days"));
            }
            format!(
                "Moves {} % of every {} planting to {}{}.",
                format_number(*share_pct, 2),
                libs.crop_name(from_crop),
                libs.crop_name(to_crop),
                if new.is_empty() {
                    String::new()
                } else {
                    format!(" (new plantings {})", new.join(", "))
                }
            )
        }
        Override::SetBlockEfficiency {
            block,
            method,
            field_canal_efficiency,
        } => {
            let mut parts = Vec::new();
            if let Some(m) = method {
                parts.push(format!(
                    "method {} with application efficiency Ea {}",
                    m.name,
                    pct(m.application_efficiency)
                ));
            }
            if let Some(eb) = field_canal_efficiency {
                parts.push(format!("field-canal efficiency Eb {}", pct(*eb)));
            }
            format!("Block {}: {}.", block_label(block), parts.join(", "))
        }
        Override::SetCanalEfficiency {
            canal,
            conveyance_efficiency,
        } => format!(
            "Canal {} conveys with {} efficiency.",
            canal_label(canal),
            pct(*conveyance_efficiency)
        ),
        Override::SetCanalCapacity {
            canal,
            existing_capacity_m3s,
        } => match existing_capacity_m3s {
            Some(q) => format!(
                "Canal {} has an existing capacity of {} m³/s.",
                canal_label(canal),
                format_number(*q, 3)
            ),
            None => format!(
                "Canal {} has no known existing capacity.",
                canal_label(canal)
            ),
        },
        Override::SetCanalHours {
            canal,
            operating_hours_per_day,
        } => format!(
            "Canal {} runs {} h/day.",
            canal_label(canal),
            format_number(*operating_hours_per_day, 1)
        ),
        other => format!("{other:?}"),
    }
}

/// The weather change in words ("recorded weather" when there is none).
pub fn weather_text(w: &WeatherPerturbation) -> String {
    if w.is_identity() {
        return "Recorded weather (no change).".to_owned();
    }
    let signed = |v: f64, unit: &str| {
        let n = format_number(v, 2);
        if v > 0.0 {
            format!("+{n} {unit}")
        } else {
            format!("{n} {unit}")
        }
    };
    format!(
        "Weather: temperature {}, rain {}, radiation {}, wind {}.",
        signed(w.temperature_shift_c, "°C"),
        signed(w.rain_change_pct, "%"),
        signed(w.radiation_change_pct, "%"),
        signed(w.wind_change_pct, "%")
    )
}

/// How a planting of the scenario's plan differs from the base plan.
fn status(base: &Project, plan: &Project, id: &str) -> &'static str {
    match (base.planting(id), plan.planting(id)) {
        (None, Some(_)) => "added",
        (Some(b), Some(p)) if b != p => "changed",
        (Some(_), Some(_)) => "as base",
        _ => "",
    }
}

/// View state of the scenario editor window.
#[derive(Debug, Default)]
pub struct ScenarioEditor {
    /// The scenario being edited (`None`: the window is closed).
    pub scenario: Option<String>,
    /// The planting whose form is shown.
    pub selected: Option<String>,
    add_block: Option<String>,
    add_crop: Option<String>,
    shift_from: Option<String>,
    shift_to: Option<String>,
    shift_share: String,
    shift_new: ShiftedPlantings,
    /// The block whose efficiencies the block form changes.
    change_block: Option<String>,
    /// Which of the block's values the form changes.
    block_value: BlockValue,
    /// The canal the canal form changes.
    change_canal: Option<String>,
    /// Which of the canal's values the form changes.
    canal_value: CanalValue,
}

/// The value of a block a scenario can change (`Override::SetBlockEfficiency`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum BlockValue {
    /// Field-canal efficiency Eb.
    #[default]
    FieldCanal,
    /// Irrigation method and its application efficiency Ea.
    Application,
}

impl BlockValue {
    /// The choice as the form lists it.
    pub fn label(self) -> &'static str {
        match self {
            BlockValue::FieldCanal => "Field-canal efficiency Eb",
            BlockValue::Application => "Irrigation method and application efficiency Ea",
        }
    }
}

/// The value of a canal a scenario can change.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum CanalValue {
    /// Conveyance efficiency Ec (`Override::SetCanalEfficiency`).
    #[default]
    Conveyance,
    /// Existing capacity (`Override::SetCanalCapacity`).
    Capacity,
    /// Hours of operation per day (`Override::SetCanalHours`).
    Hours,
}

impl CanalValue {
    /// The choice as the form lists it.
    pub fn label(self) -> &'static str {
        match self {
            CanalValue::Conveyance => "Conveyance efficiency Ec",
            CanalValue::Capacity => "Existing capacity",
            CanalValue::Hours => "Operating hours",
        }
    }
}

impl ScenarioEditor {
    /// Opens the editor on a scenario (`None` closes it).
    pub fn open(&mut self, scenario: Option<String>) {
        if scenario != self.scenario {
            self.selected = None;
        }
        self.scenario = scenario;
    }
}

fn fid(scenario: &str, item: &str, field: &str) -> Id {
    Id::unique(("scenario-editor", scenario, item, field))
}

fn edit_command(name: &str, new: Scenario) -> Command {
    Command::Edit(DocEdit::SetScenario {
        name: name.to_owned(),
        scenario: Box::new(new),
    })
}

/// What the editor shows of the last computation.
#[derive(Debug, Clone, Copy)]
pub struct Results<'a> {
    /// Results of the last finished computation (its scenario comparison
    /// is there while the Compare tab is shown).
    pub computed: Option<&'a crate::compute::Computed>,
    /// Whether a recomputation is waiting or running (the results are then
    /// those of the project before the last edit).
    pub recomputing: bool,
    /// The scenario whose results the tabs show (kept on a rename).
    pub shown: Option<&'a str>,
}

/// Draws the editor window when it is open.
pub fn window(
    ctx: &egui::Context,
    editor: &mut ScenarioEditor,
    base: Option<&Project>,
    libs: &Libraries,
    results: Results<'_>,
    commands: &mut Vec<Command>,
) {
    let Some(name) = editor.scenario.clone() else {
        return;
    };
    // Gone (undo of its creation, another project): close.
    let Some(base) = base else {
        editor.scenario = None;
        return;
    };
    let Some(scenario) = base.scenario(&name) else {
        editor.scenario = None;
        return;
    };
    let mut open = true;
    egui::Window::new(format!("Scenario editor: {name}"))
        .id(Id::unique("scenario-editor-window"))
        .open(&mut open)
        // On the right, over the inspector, so the Compare tab's switcher
        // and the first columns of its table stay in view.
        .default_pos(egui::pos2(
            (ctx.content_rect().right() - 820.0).max(0.0),
            60.0,
        ))
        .default_width(800.0)
        .default_height(760.0)
        .vscroll(true)
        .show(ctx, |ui| {
            result_line(ui, base, scenario, results);
            editor_ui(ui, editor, base, scenario, libs, results, commands);
        });
    if !open {
        editor.scenario = None;
    }
}

/// The scenario's headworks figures from the comparison, beside a
/// scenario that is the base plan unchanged (if the project has one).
fn result_line(ui: &mut Ui, base: &Project, scenario: &Scenario, results: Results<'_>) {
    use crate::fields::format_sig;
    let comparison = results.computed.and_then(|c| c.comparison.as_ref());
    let text = if results.recomputing {
        "Recomputing the scenarios…".to_owned()
    } else if let Some(c) = comparison {
        let figures = |col: &offtake_core::engine::ScenarioColumn| {
            let short = if col.shortfall_periods > 0 {
                format!(
                    "; canals with an existing capacity fall short in {} of {} complete irrigation years ({} Mm³ per complete irrigation year not delivered, {} means)",
                    col.shortfall_years,
                    col.complete_years,
                    format_sig(col.shortfall_m3_per_year / 1.0e6, 3),
                    col.shortfall_basis
                )
            } else {
                String::new()
            };
            format!(
                "design flow {} l/s, volume {} Mm³/year{short}",
                format_sig(col.design_flow_ls, 3),
                format_sig(col.headworks_volume_m3 / 1.0e6, 3)
            )
        };
        let same_as_base = base
            .scenarios
            .iter()
            .find(|s| s.overrides.is_empty() && s.weather.is_identity() && s.name != scenario.name)
            .and_then(|s| c.columns.iter().find(|col| col.name == s.name));
        match c.columns.iter().find(|col| col.name == scenario.name) {
            Some(col) => format!(
                "Headworks in this scenario: {}{}",
                figures(col),
                same_as_base.map_or_else(String::new, |b| format!(
                    "\nBase plan (as {}): {}",
                    b.name,
                    figures(b)
                ))
            ),
            None => c
                .failed
                .iter()
                .find(|(name, _)| *name == scenario.name)
                .map_or_else(
                    || {
                        "Not computed yet: open the Compare tab to compute every scenario."
                            .to_owned()
                    },
                    |(_, e)| format!("This scenario cannot be computed: {e}"),
                ),
        }
    } else {
        "Results appear here while the Compare tab is shown (it computes every scenario)."
            .to_owned()
    };
    ui.label(RichText::new(text).strong());
}

/// Checks a new scenario name: not empty, not another scenario's.
///
/// # Errors
/// The reason.
pub fn check_name(base: &Project, old: &str, new: &str) -> Result<(), String> {
    let new = new.trim();
    if new.is_empty() {
        Err("Scenario name must not be empty".to_owned())
    } else if new != old && base.scenario(new).is_some() {
        Err(format!("Another scenario is already named {new:?}"))
    } else {
        Ok(())
    }
}

/// The name (renaming keeps the editor and the results shown on it) and the
/// description.
fn name_and_description(
    ui: &mut Ui,
    base: &Project,
    scenario: &Scenario,
    shown: Option<&str>,
    commands: &mut Vec<Command>,
) {
    let name = scenario.name.as_str();
    let id = fid(name, "", "name");
    let mut text = ui
        .data(|d| d.get_temp::<String>(id))
        .unwrap_or_else(|| name.to_owned());
    let r = ui
        .horizontal(|ui| {
            let l = ui.label("Scenario name");
            ui.add(
                egui::TextEdit::singleline(&mut text)
                    .id(id)
                    .desired_width(220.0),
            )
            .labelled_by(l.id)
        })
        .inner;
    let check = check_name(base, name, &text);
    if r.has_focus() {
        ui.data_mut(|d| d.insert_temp(id, text.clone()));
    } else {
        ui.data_mut(|d| d.remove::<String>(id));
    }
    if let Err(e) = &check {
        ui.label(RichText::new(e).color(ui.visuals().error_fg_color));
    }
    let new_name = text.trim().to_owned();
    if r.lost_focus() && check.is_ok() && new_name != name {
        let mut s = scenario.clone();
        s.name.clone_from(&new_name);
        commands.push(edit_command(name, s));
        commands.push(Command::EditScenario(Some(new_name.clone())));
        if shown == Some(name) {
            commands.push(Command::ShowScenario(Some(new_name)));
        }
    }
    let id = fid(name, "", "description");
    let mut text = ui
        .data(|d| d.get_temp::<String>(id))
        .unwrap_or_else(|| scenario.description.clone());
    let r = ui
        .horizontal(|ui| {
            let l = ui.label("Description");
            ui.add(
                egui::TextEdit::singleline(&mut text)
                    .id(id)
                    .desired_width(560.0),
            )
            .labelled_by(l.id)
        })
        .inner;
    if r.has_focus() {
        ui.data_mut(|d| d.insert_temp(id, text.clone()));
    } else {
        ui.data_mut(|d| d.remove::<String>(id));
    }
    if r.lost_focus() && text != scenario.description {
        let mut s = scenario.clone();
        s.description = text;
        commands.push(edit_command(name, s));
    }
}

fn editor_ui(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    base: &Project,
    scenario: &Scenario,
    libs: &Libraries,
    results: Results<'_>,
    commands: &mut Vec<Command>,
) {
    let name = scenario.name.as_str();
    let shown = results.shown;
    let made = plan(base, scenario);
    let validation = results
        .computed
        .map(|c| validation_problems(&c.warnings, name))
        .unwrap_or_default();
    ui.horizontal(|ui| {
        ui.label(
            RichText::new(
                "Changes here are stored in this scenario only; the base plan stays as it is.",
            )
            .weak(),
        );
        if ui.button("Show this scenario in every tab").clicked() {
            commands.push(Command::ShowScenario(Some(name.to_owned())));
        }
    });
    name_and_description(ui, base, scenario, shown, commands);
    if !made.problems.is_empty() {
        ui.label(
            RichText::new(
                "This scenario cannot be computed until the changes marked below are fixed or deleted.",
            )
            .color(ui.visuals().error_fg_color),
        );
    }
    ui.separator();
    overrides_ui(
        ui,
        base,
        scenario,
        &made.problems,
        &validation,
        libs,
        commands,
    );
    ui.separator();
    egui::CollapsingHeader::new("Cropping plan in this scenario")
        .default_open(true)
        .show(ui, |ui| plan_table(ui, editor, base, &made.project, libs));
    if let Some(id) = editor.selected.clone() {
        match made.project.planting(&id) {
            Some(pl) => {
                ui.separator();
                planting_form(
                    ui,
                    base,
                    scenario,
                    &made.project,
                    pl,
                    libs,
                    commands,
                    editor,
                );
            }
            None => editor.selected = None,
        }
    }
    ui.separator();
    add_planting_ui(ui, editor, scenario, &made.project, libs, commands);
    ui.separator();
    shift_ui(ui, editor, scenario, &made.project, libs, commands);
    ui.separator();
    block_change_ui(ui, editor, base, scenario, &made.project, commands);
    ui.separator();
    canal_change_ui(ui, editor, base, scenario, &made.project, commands);
    ui.separator();
    weather_ui(ui, scenario, commands);
}

fn plan_table(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    base: &Project,
    plan: &Project,
    libs: &Libraries,
) {
    egui::ScrollArea::vertical()
        .id_salt("scenario-plan")
        .max_height(220.0)
        .show(ui, |ui| {
            egui::Grid::new("scenario-plan-grid")
                .striped(true)
                .show(ui, |ui| {
                    for h in [
                        "Planting",
                        "Block",
                        "Crop",
                        "Area (ha)",
                        "Area as given",
                        "First planting",
                        "Spread (days)",
                        "Strategy",
                        "vs base",
                    ] {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for block in &plan.blocks {
                        for pl in plan.plantings.iter().filter(|p| p.block == block.id) {
                            let selected = editor.selected.as_deref() == Some(pl.id.as_str());
                            if ui
                                .selectable_label(selected, &pl.id)
                                .on_hover_text("Edit this planting in the scenario")
                                .clicked()
                            {
                                editor.selected = Some(pl.id.clone());
                            }
                            ui.label(&block.name);
                            ui.label(libs.crop_name(&pl.crop));
                            ui.label(format_number(pl.area.hectares(block.area_ha), 1));
                            ui.label(match pl.area {
                                PlantingArea::Hectares(ha) => {
                                    format!("{} ha", format_number(ha, 2))
                                }
                                PlantingArea::PercentOfBlock(p) => {
                                    format!("{} % of block", format_number(p, 2))
                                }
                            });
                            ui.label(month_day_text(pl.first_planting));
                            ui.label(pl.spread_days.to_string());
                            ui.label(strategy_short(&pl.strategy))
                                .on_hover_text(strategy_text(&pl.strategy));
                            ui.label(status(base, plan, &pl.id));
                            ui.end_row();
                        }
                    }
                });
        });
    let removed: Vec<&str> = base
        .plantings
        .iter()
        .filter(|p| plan.planting(&p.id).is_none())
        .map(|p| p.id.as_str())
        .collect();
    if !removed.is_empty() {
        ui.label(format!(
            "Removed in this scenario: {} (delete the override below to restore).",
            removed.join(", ")
        ));
    }
    let total: f64 = plan
        .plantings
        .iter()
        .map(|p| {
            p.area
                .hectares(plan.block(&p.block).map_or(0.0, |b| b.area_ha))
        })
        .sum();
    let base_total: f64 = base
        .plantings
        .iter()
        .map(|p| {
            p.area
                .hectares(base.block(&p.block).map_or(0.0, |b| b.area_ha))
        })
        .sum();
    ui.label(format!(
        "Planted area over the year: {} ha (base plan {} ha). Select a planting to change it.",
        format_number(total, 1),
        format_number(base_total, 1)
    ));
}

fn crop_picker(ui: &mut Ui, label: &str, current: &mut String, libs: &Libraries) {
    let shown = if current.is_empty() {
        "(choose a crop)".to_owned()
    } else {
        libs.crop_name(current).to_owned()
    };
    egui::ComboBox::from_label(label)
        .selected_text(shown)
        .show_ui(ui, |ui| {
            for c in &libs.crops {
                ui.selectable_value(current, c.id.clone(), &c.name);
            }
        });
}

#[expect(
    clippy::too_many_arguments,
    reason = "the form reads the base, the scenario, its plan and the libraries"
)]
fn planting_form(
    ui: &mut Ui,
    base: &Project,
    scenario: &Scenario,
    plan: &Project,
    pl: &Planting,
    libs: &Libraries,
    commands: &mut Vec<Command>,
    editor: &mut ScenarioEditor,
) {
    let name = scenario.name.as_str();
    let block = plan.block(&pl.block);
    ui.label(
        RichText::new(format!(
            "Planting {} on {} ({})",
            pl.id,
            block.map_or("(missing block)", |b| b.name.as_str()),
            status(base, plan, &pl.id)
        ))
        .strong(),
    );
    if let Some(b) = base.planting(&pl.id) {
        ui.label(
            RichText::new(format!(
                "Base plan: {}, {}, first planted on {}, spread {} days, {}.",
                libs.crop_name(&b.crop),
                area_text(b.area),
                month_day_text(b.first_planting),
                b.spread_days,
                strategy_text(&b.strategy)
            ))
            .weak(),
        );
    }
    let mut push = |ov: Override| {
        let new = with_planting_override(base, scenario, ov);
        if new != *scenario {
            commands.push(edit_command(name, new));
        }
    };
    let mut crop = pl.crop.clone();
    crop_picker(ui, "Crop in scenario", &mut crop, libs);
    if crop != pl.crop {
        push(Override::SetPlantingCrop {
            planting: pl.id.clone(),
            crop,
        });
    }
    let block_ha = block.map_or(0.0, |b| b.area_ha);
    let mut in_percent = matches!(pl.area, PlantingArea::PercentOfBlock(_));
    ui.horizontal(|ui| {
        ui.label("Area given in");
        let before = in_percent;
        ui.radio_value(&mut in_percent, false, "ha");
        ui.radio_value(&mut in_percent, true, "% of block");
        if before != in_percent {
            let ha = pl.area.hectares(block_ha);
            let area = if in_percent {
                PlantingArea::PercentOfBlock(if block_ha > 0.0 {
                    100.0 * ha / block_ha
                } else {
                    100.0
                })
            } else {
                PlantingArea::Hectares(ha)
            };
            push(Override::SetPlantingArea {
                planting: pl.id.clone(),
                area,
            });
        }
    });
    let (value, b) = match pl.area {
        PlantingArea::Hectares(ha) => (ha, bounds::AREA_HA),
        PlantingArea::PercentOfBlock(p) => (p, bounds::AREA_PCT),
    };
    let out = number_field(
        ui,
        fid(name, &pl.id, "area"),
        "Area in scenario",
        value,
        &b,
        2,
    );
    // Kept even when out of range (the field shows why; validation reports it).
    if let Some(v) = out.committed {
        let area = match pl.area {
            PlantingArea::Hectares(_) => PlantingArea::Hectares(v),
            PlantingArea::PercentOfBlock(_) => PlantingArea::PercentOfBlock(v),
        };
        push(Override::SetPlantingArea {
            planting: pl.id.clone(),
            area,
        });
    }
    let out = date_free_month_day(
        ui,
        fid(name, &pl.id, "first"),
        "First planting in scenario",
        (pl.first_planting.month, pl.first_planting.day),
    );
    if let Some((month, day)) = out.committed {
        push(Override::SetPlantingDate {
            planting: pl.id.clone(),
            first_planting: MonthDay { month, day },
            spread_days: Some(pl.spread_days),
        });
    }
    let out = number_field(
        ui,
        fid(name, &pl.id, "spread"),
        "Spread in scenario",
        f64::from(pl.spread_days),
        &bounds::SPREAD,
        0,
    );
    // Whole days only (a spread is a count of days); beyond a year is kept
    // and reported.
    if let Some(v) = out.committed
        && v >= 0.0
        && v.fract() == 0.0
        && v <= f64::from(u32::MAX)
    {
        push(Override::SetPlantingDate {
            planting: pl.id.clone(),
            first_planting: pl.first_planting,
            spread_days: Some(v as u32),
        });
    }
    if let Some(s) = strategy_editor(ui, ("Strategy in scenario", ""), name, &pl.id, pl.strategy) {
        push(Override::SetPlantingStrategy {
            planting: pl.id.clone(),
            strategy: s,
        });
    }
    if ui
        .button("Remove this planting from the scenario")
        .clicked()
    {
        commands.push(edit_command(name, with_planting_removed(scenario, &pl.id)));
        editor.selected = None;
    }
}

/// The strategy picker with its parameters; returns a changed strategy.
/// `combo` labels the picker; `suffix` is added to each parameter's label
/// so that two editors in one window keep distinct labels.
fn strategy_editor(
    ui: &mut Ui,
    (combo, suffix): (&str, &str),
    scenario: &str,
    planting: &str,
    current: Strategy,
) -> Option<Strategy> {
    use crate::inspector::bounds as b;
    let mut s = current;
    crate::inspector::strategy_kind_combo(ui, combo, &mut s);
    let param = |ui: &mut Ui, field: &str, label: &str, v: f64, bounds: &Bounds| {
        // A number out of range is kept; the field shows why.
        let label = format!("{label}{suffix}");
        number_field(ui, fid(scenario, planting, field), &label, v, bounds, 1).committed
    };
    match &mut s {
        Strategy::Refill { trigger_pct_of_raw } => {
            if let Some(v) = param(ui, "raw", "Trigger", *trigger_pct_of_raw, &b::TRIGGER_RAW) {
                *trigger_pct_of_raw = v;
            }
        }
        Strategy::Interval { days } => {
            if let Some(v) = param(ui, "interval", "Interval", f64::from(*days), &b::INTERVAL)
                && v >= 0.0
                && v.fract() == 0.0
                && v <= f64::from(u32::MAX)
            {
                *days = v as u32;
            }
        }
        Strategy::Depth { net_mm } => {
            if let Some(v) = param(ui, "depth", "Net depth", *net_mm, &b::DEPTH) {
                *net_mm = v;
            }
        }
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => {
            if let Some(v) = param(ui, "taw", "Trigger", *trigger_pct_of_taw, &b::TRIGGER_TAW) {
                *trigger_pct_of_taw = v;
            }
            if let Some(v) = param(ui, "refill", "Refill", *refill_pct_of_depletion, &b::REFILL) {
                *refill_pct_of_depletion = v;
            }
        }
        Strategy::Rainfed => {}
    }
    (s != current).then_some(s)
}

fn add_planting_ui(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    scenario: &Scenario,
    plan: &Project,
    libs: &Libraries,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Add a planting to a block").strong());
    ui.horizontal(|ui| {
        let block_name = editor
            .add_block
            .as_deref()
            .and_then(|id| plan.block(id))
            .map_or("(choose a block)", |b| b.name.as_str());
        let mut chosen = editor.add_block.clone();
        egui::ComboBox::from_label("Block for the new planting")
            .selected_text(block_name)
            .show_ui(ui, |ui| {
                for b in &plan.blocks {
                    ui.selectable_value(&mut chosen, Some(b.id.clone()), &b.name);
                }
            });
        editor.add_block = chosen;
        let mut crop = editor.add_crop.clone().unwrap_or_default();
        crop_picker(ui, "Crop of the new planting", &mut crop, libs);
        editor.add_crop = (!crop.is_empty()).then_some(crop);
    });
    let ready = editor.add_block.is_some() && editor.add_crop.is_some();
    if ui
        .add_enabled(ready, egui::Button::new("Add planting to the scenario"))
        .on_disabled_hover_text("Choose a block and a crop first")
        .on_hover_text("Covers the whole block from 1 January; change its area and window above")
        .clicked()
        && let (Some(block), Some(crop)) = (editor.add_block.clone(), editor.add_crop.clone())
    {
        let mut pl = crate::edit::new_planting(plan, &block);
        pl.crop = crop;
        editor.selected = Some(pl.id.clone());
        commands.push(edit_command(
            &scenario.name,
            with_planting_added(scenario, pl),
        ));
    }
}

fn shift_ui(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    scenario: &Scenario,
    plan: &Project,
    libs: &Libraries,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Shift a share of one crop to another").strong());
    let mut grown: Vec<&str> = plan.plantings.iter().map(|p| p.crop.as_str()).collect();
    grown.sort_unstable();
    grown.dedup();
    let mut share_error = None;
    ui.horizontal(|ui| {
        let l = ui.label("Share moved");
        ui.add(egui::TextEdit::singleline(&mut editor.shift_share).desired_width(60.0))
            .labelled_by(l.id)
            .on_hover_text("Share of every planting of the crop losing area, percent (0–100]");
        ui.label("%");
    });
    ui.horizontal(|ui| {
        let mut from = editor.shift_from.clone();
        egui::ComboBox::from_label("Crop losing area")
            .selected_text(
                from.as_deref()
                    .map_or("(a crop grown)", |c| libs.crop_name(c)),
            )
            .show_ui(ui, |ui| {
                for c in &grown {
                    ui.selectable_value(&mut from, Some((*c).to_owned()), libs.crop_name(c));
                }
            });
        editor.shift_from = from;
        let mut to = editor.shift_to.clone().unwrap_or_default();
        crop_picker(ui, "Crop gaining area", &mut to, libs);
        editor.shift_to = (!to.is_empty()).then_some(to);
    });
    shifted_plantings_ui(ui, &mut editor.shift_new, &scenario.name);
    // A number outside (0, 100] can be applied and is kept (the scenario
    // then cannot be computed and says why); text that is no number cannot.
    let share = if editor.shift_share.trim().is_empty() {
        None
    } else {
        share_error = check_share(&editor.shift_share).err();
        parse_number(&editor.shift_share).ok()
    };
    if let Some(e) = &share_error {
        ui.label(RichText::new(e).color(ui.visuals().error_fg_color));
    }
    let same = editor.shift_from.is_some() && editor.shift_from == editor.shift_to;
    if same {
        ui.label(RichText::new("The two crops must differ").color(ui.visuals().error_fg_color));
    }
    let ready =
        share.is_some() && editor.shift_from.is_some() && editor.shift_to.is_some() && !same;
    if ui
        .add_enabled(ready, egui::Button::new("Apply shift"))
        .on_disabled_hover_text("Give the share (%), the crop losing area and the crop gaining it")
        .clicked()
        && let (Some(v), Some(from), Some(to)) =
            (share, editor.shift_from.clone(), editor.shift_to.clone())
    {
        commands.push(edit_command(
            &scenario.name,
            with_shift(scenario, &from, &to, v, editor.shift_new),
        ));
    }
}

/// The optional strategy and season length of the plantings a crop shift
/// makes (kept in the form until the shift is applied).
fn shifted_plantings_ui(ui: &mut Ui, new: &mut ShiftedPlantings, scenario: &str) {
    let mut own = new.strategy.is_some();
    if ui
        .checkbox(&mut own, "Own irrigation strategy for the new plantings")
        .on_hover_text(
            "Otherwise each new planting keeps the strategy of the planting it comes from",
        )
        .changed()
    {
        new.strategy = own.then_some(Strategy::Refill {
            trigger_pct_of_raw: 100.0,
        });
    }
    if let Some(s) = new.strategy
        && let Some(changed) = strategy_editor(
            ui,
            ("Strategy of the new plantings", " of the new plantings"),
            scenario,
            "shift",
            s,
        )
    {
        new.strategy = Some(changed);
    }
    let mut own = new.season_length_days.is_some();
    if ui
        .checkbox(&mut own, "Own season length for the new plantings")
        .on_hover_text("Otherwise the crop library's season length (the FAO-56 stage lengths)")
        .changed()
    {
        new.season_length_days = own.then_some(120);
    }
    if let Some(days) = new.season_length_days {
        let out = number_field(
            ui,
            fid(scenario, "shift", "season"),
            "Season length of the new plantings",
            f64::from(days),
            &crate::inspector::bounds::SEASON,
            0,
        );
        // Whole days; a length outside the range is kept and shown.
        if let Some(v) = out.committed
            && v >= 0.0
            && v.fract() == 0.0
            && v <= f64::from(u32::MAX)
        {
            new.season_length_days = Some(v as u32);
        }
    }
}

/// A combo box choosing a block or canal by name (id in brackets)./// A combo box choosing a block or canal by name (id in brackets).
fn item_combo<'a>(
    ui: &mut Ui,
    label: &str,
    none: &str,
    chosen: &mut Option<String>,
    items: impl Iterator<Item = (&'a str, &'a str)> + Clone,
) {
    let shown = chosen
        .as_deref()
        .and_then(|id| items.clone().find(|(i, _)| *i == id))
        .map_or_else(|| none.to_owned(), |(id, n)| format!("{n} ({id})"));
    egui::ComboBox::from_label(label)
        .selected_text(shown)
        .show_ui(ui, |ui| {
            for (id, n) in items {
                ui.selectable_value(chosen, Some(id.to_owned()), format!("{n} ({id})"));
            }
        });
}

/// The form that changes a block's efficiencies in the scenario: pick the
/// block and the value; the field shows the value in the scenario's plan
/// (with its unit), and a committed value becomes a `SetBlockEfficiency`.
fn block_change_ui(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    base: &Project,
    scenario: &Scenario,
    plan: &Project,
    commands: &mut Vec<Command>,
) {
    use crate::inspector::bounds as ib;
    let name = scenario.name.as_str();
    ui.label(RichText::new("Change a block's efficiencies").strong());
    ui.label(
        RichText::new(
            "Block GIR = NIR ÷ (Ea × Eb). Type the value in the scenario and press Enter; it is stored in this scenario only.",
        )
        .weak(),
    );
    ui.horizontal(|ui| {
        item_combo(
            ui,
            "Block to change",
            "(choose a block)",
            &mut editor.change_block,
            plan.blocks.iter().map(|b| (b.id.as_str(), b.name.as_str())),
        );
        egui::ComboBox::from_label("Block value to change")
            .selected_text(editor.block_value.label())
            .show_ui(ui, |ui| {
                for v in [BlockValue::FieldCanal, BlockValue::Application] {
                    ui.selectable_value(&mut editor.block_value, v, v.label());
                }
            });
    });
    let Some(b) = editor.change_block.as_deref().and_then(|id| plan.block(id)) else {
        ui.label("Choose a block to see its values in this scenario.");
        return;
    };
    let item = format!("block:{}", b.id);
    let mut push = |ov: Override| {
        let new = with_item_override(base, scenario, ov);
        if new != *scenario {
            commands.push(edit_command(name, new));
        }
    };
    let was = base.block(&b.id);
    match editor.block_value {
        BlockValue::FieldCanal => {
            let out = number_field(
                ui,
                fid(name, &item, "eb"),
                "Field-canal efficiency Eb in scenario",
                b.field_canal_efficiency,
                &ib::FIELD_CANAL,
                1,
            );
            if let Some(v) = out.committed {
                push(Override::SetBlockEfficiency {
                    block: b.id.clone(),
                    method: None,
                    field_canal_efficiency: Some(v),
                });
            }
            if let Some(w) = was {
                ui.label(
                    RichText::new(format!("Base plan: Eb {}", pct(w.field_canal_efficiency)))
                        .weak(),
                );
            }
        }
        BlockValue::Application => {
            let out = crate::fields::name_field(
                ui,
                fid(name, &item, "method"),
                "Irrigation method in scenario",
                &b.method.name,
            );
            if let Some(m) = out.committed {
                push(Override::SetBlockEfficiency {
                    block: b.id.clone(),
                    method: Some(IrrigationMethod {
                        name: m,
                        application_efficiency: b.method.application_efficiency,
                    }),
                    field_canal_efficiency: None,
                });
            }
            let out = number_field(
                ui,
                fid(name, &item, "ea"),
                "Application efficiency Ea in scenario",
                b.method.application_efficiency,
                &ib::APPLICATION,
                1,
            );
            if let Some(v) = out.committed {
                push(Override::SetBlockEfficiency {
                    block: b.id.clone(),
                    method: Some(IrrigationMethod {
                        name: b.method.name.clone(),
                        application_efficiency: v,
                    }),
                    field_canal_efficiency: None,
                });
            }
            if let Some(w) = was {
                ui.label(
                    RichText::new(format!(
                        "Base plan: {} with Ea {} (a paddy rice planting uses its own paddy field efficiency instead of Ea)",
                        w.method.name,
                        pct(w.method.application_efficiency)
                    ))
                    .weak(),
                );
            }
        }
    }
}

/// The form that changes a canal in the scenario: conveyance efficiency,
/// existing capacity (or none known) or hours of operation.
fn canal_change_ui(
    ui: &mut Ui,
    editor: &mut ScenarioEditor,
    base: &Project,
    scenario: &Scenario,
    plan: &Project,
    commands: &mut Vec<Command>,
) {
    use crate::inspector::bounds as ib;
    let name = scenario.name.as_str();
    ui.label(RichText::new("Change a canal").strong());
    ui.label(
        RichText::new(
            "Conveyance efficiency Ec = water delivered to the children ÷ water entering the reach; required capacity = design flow × 24 h ÷ hours of operation.",
        )
        .weak(),
    );
    ui.horizontal(|ui| {
        item_combo(
            ui,
            "Canal to change",
            "(choose a canal)",
            &mut editor.change_canal,
            plan.canals.iter().map(|c| (c.id.as_str(), c.name.as_str())),
        );
        egui::ComboBox::from_label("Canal value to change")
            .selected_text(editor.canal_value.label())
            .show_ui(ui, |ui| {
                for v in [
                    CanalValue::Conveyance,
                    CanalValue::Capacity,
                    CanalValue::Hours,
                ] {
                    ui.selectable_value(&mut editor.canal_value, v, v.label());
                }
            });
    });
    let Some(c) = editor.change_canal.as_deref().and_then(|id| plan.canal(id)) else {
        ui.label("Choose a canal to see its values in this scenario.");
        return;
    };
    let item = format!("canal:{}", c.id);
    let mut push = |ov: Override| {
        let new = with_item_override(base, scenario, ov);
        if new != *scenario {
            commands.push(edit_command(name, new));
        }
    };
    let was = base.canal(&c.id);
    let capacity_text = |q: Option<f64>| {
        q.map_or_else(
            || "not known".to_owned(),
            |q| format!("{} m³/s", format_number(q, 3)),
        )
    };
    match editor.canal_value {
        CanalValue::Conveyance => {
            let out = number_field(
                ui,
                fid(name, &item, "ec"),
                "Conveyance efficiency Ec in scenario",
                c.conveyance_efficiency,
                &ib::CONVEYANCE,
                1,
            );
            if let Some(v) = out.committed {
                push(Override::SetCanalEfficiency {
                    canal: c.id.clone(),
                    conveyance_efficiency: v,
                });
            }
            if let Some(w) = was {
                ui.label(
                    RichText::new(format!("Base plan: Ec {}", pct(w.conveyance_efficiency))).weak(),
                );
            }
        }
        CanalValue::Capacity => {
            let mut known = c.existing_capacity_m3s.is_some();
            if ui
                .checkbox(&mut known, "Existing capacity known in scenario")
                .changed()
            {
                // Start from the base plan's capacity if it has one.
                let start = was.and_then(|w| w.existing_capacity_m3s).unwrap_or(0.0);
                push(Override::SetCanalCapacity {
                    canal: c.id.clone(),
                    existing_capacity_m3s: known.then_some(start),
                });
            }
            if let Some(q) = c.existing_capacity_m3s {
                let out = number_field(
                    ui,
                    fid(name, &item, "capacity"),
                    "Existing capacity in scenario",
                    q,
                    &ib::CAPACITY,
                    3,
                );
                if let Some(v) = out.committed {
                    push(Override::SetCanalCapacity {
                        canal: c.id.clone(),
                        existing_capacity_m3s: Some(v),
                    });
                }
            }
            if let Some(w) = was {
                ui.label(
                    RichText::new(format!(
                        "Base plan: existing capacity {}",
                        capacity_text(w.existing_capacity_m3s)
                    ))
                    .weak(),
                );
            }
        }
        CanalValue::Hours => {
            let out = number_field(
                ui,
                fid(name, &item, "hours"),
                "Operating hours in scenario",
                c.operating_hours_per_day,
                &ib::HOURS,
                1,
            );
            if let Some(v) = out.committed {
                push(Override::SetCanalHours {
                    canal: c.id.clone(),
                    operating_hours_per_day: v,
                });
            }
            if let Some(w) = was {
                ui.label(
                    RichText::new(format!(
                        "Base plan: {} h/day",
                        format_number(w.operating_hours_per_day, 1)
                    ))
                    .weak(),
                );
            }
        }
    }
}

fn weather_ui(ui: &mut Ui, scenario: &Scenario, commands: &mut Vec<Command>) {
    let name = scenario.name.as_str();
    ui.label(RichText::new("Weather change for a sensitivity study").strong());
    ui.label(
        RichText::new(
            "Added to every recorded temperature (relative humidity kept);\nrain, radiation and wind in % of the recorded values.",
        )
        .weak(),
    );
    let w = scenario.weather;
    let mut new = w;
    let fields: [(&str, &str, f64, Bounds); 4] = [
        (
            "temp",
            "Temperature shift",
            w.temperature_shift_c,
            bounds::TEMPERATURE,
        ),
        ("rain", "Rain change", w.rain_change_pct, bounds::RAIN),
        (
            "radiation",
            "Radiation change",
            w.radiation_change_pct,
            bounds::RADIATION,
        ),
        ("wind", "Wind change", w.wind_change_pct, bounds::WIND),
    ];
    for (key, label, value, b) in fields {
        let out = number_field(ui, fid(name, "weather", key), label, value, &b, 2);
        // Kept even when out of range (the field shows why).
        if let Some(v) = out.committed {
            match key {
                "temp" => new.temperature_shift_c = v,
                "rain" => new.rain_change_pct = v,
                "radiation" => new.radiation_change_pct = v,
                _ => new.wind_change_pct = v,
            }
        }
    }
    if new != w {
        let mut s = scenario.clone();
        s.weather = new;
        commands.push(edit_command(name, s));
    }
}

fn overrides_ui(
    ui: &mut Ui,
    base: &Project,
    scenario: &Scenario,
    problems: &[(usize, String)],
    validation: &[&str],
    libs: &Libraries,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Changes stored in this scenario").strong());
    if scenario.overrides.is_empty() {
        ui.label("None yet: this scenario is the base plan.");
    }
    for (i, ov) in scenario.overrides.iter().enumerate() {
        ui.horizontal_wrapped(|ui| {
            ui.label(format!("{}. {}", i + 1, sentence(ov, base, libs)));
            if ui.button(format!("Delete override {}", i + 1)).clicked() {
                commands.push(edit_command(&scenario.name, without_override(scenario, i)));
            }
        });
        for (_, why) in problems.iter().filter(|(k, _)| *k == i) {
            ui.label(
                RichText::new(format!("Cannot apply: {why}")).color(ui.visuals().error_fg_color),
            );
        }
        // A value kept out of range: the reason, as its field shows it.
        for why in override_problems(ov) {
            ui.label(RichText::new(format!("{}. {why}", i + 1)).color(ui.visuals().error_fg_color));
        }
    }
    ui.horizontal(|ui| {
        ui.label(weather_text(&scenario.weather));
        if !scenario.weather.is_identity() && ui.button("Use the recorded weather").clicked() {
            let mut s = scenario.clone();
            s.weather = WeatherPerturbation::default();
            commands.push(edit_command(&scenario.name, s));
        }
    });
    for why in weather_problems(&scenario.weather) {
        ui.label(RichText::new(why).color(ui.visuals().error_fg_color));
    }
    if !validation.is_empty() {
        ui.label(
            RichText::new(format!(
                "Problems the project validation finds in this scenario ({}):",
                validation.len()
            ))
            .strong(),
        );
        for p in validation {
            ui.label(RichText::new(*p).color(ui.visuals().error_fg_color));
        }
    }
}

/// The validation problems of the last computation that belong to the
/// scenario `name` (the part after `under scenario "name": `).
pub fn validation_problems<'a>(warnings: &'a [String], name: &str) -> Vec<&'a str> {
    let prefix = format!("under scenario {name:?}: ");
    warnings
        .iter()
        .filter_map(|w| w.strip_prefix(&prefix))
        .collect()
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    fn demo() -> Project {
        offtake_io::project_file::load_project(std::path::Path::new(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/../../demo-projects/demo-scheme/scheme.ron"
        )))
        .unwrap()
    }

    fn empty(name: &str) -> Scenario {
        Scenario {
            name: name.to_owned(),
            description: String::new(),
            overrides: Vec::new(),
            weather: WeatherPerturbation::default(),
        }
    }

    fn crop(id: &str, c: &str) -> Override {
        Override::SetPlantingCrop {
            planting: id.to_owned(),
            crop: c.to_owned(),
        }
    }

    #[test]
    fn a_second_change_of_the_same_field_replaces_the_first() {
        let base = demo();
        let s = with_planting_override(&base, &empty("a"), crop("C1-rice", "maize-grain"));
        let s = with_planting_override(&base, &s, crop("C1-rice", "cotton"));
        assert_eq!(s.overrides, vec![crop("C1-rice", "cotton")]);
        let p = plan(&base, &s);
        assert!(p.problems.is_empty());
        assert_eq!(p.project.planting("C1-rice").unwrap().crop, "cotton");
        // Back to the base crop: the override goes, nothing is stacked.
        let s = with_planting_override(&base, &s, crop("C1-rice", "rice-paddy"));
        assert!(s.overrides.is_empty());
    }

    #[test]
    fn an_added_planting_is_edited_inside_its_record_and_removed_with_it() {
        let base = demo();
        let mut pl = crate::edit::new_planting(&base, "C1");
        pl.crop = "maize-grain".into();
        let id = pl.id.clone();
        let s = with_planting_added(&empty("a"), pl);
        let s = with_planting_override(&base, &s, crop(&id, "cotton"));
        assert_eq!(s.overrides.len(), 1);
        assert!(matches!(&s.overrides[0], Override::AddPlanting(p) if p.crop == "cotton"));
        assert!(with_planting_removed(&s, &id).overrides.is_empty());
    }

    #[test]
    fn removing_a_base_planting_drops_its_field_overrides() {
        let base = demo();
        let s = with_planting_override(&base, &empty("a"), crop("C1-rice", "cotton"));
        let s = with_planting_removed(&s, "C1-rice");
        assert_eq!(
            s.overrides,
            vec![Override::RemovePlanting {
                planting: "C1-rice".into()
            }]
        );
        assert!(plan(&base, &s).project.planting("C1-rice").is_none());
        // The base plan is a separate record, never touched.
        assert!(base.planting("C1-rice").is_some());
    }

    #[test]
    fn shifts_between_the_same_crops_replace_and_bad_overrides_are_reported() {
        let base = demo();
        let own = ShiftedPlantings {
            strategy: Some(Strategy::Interval { days: 7 }),
            season_length_days: Some(110),
        };
        let s = with_shift(&empty("a"), "rice-paddy", "maize-grain", 30.0, own);
        let s = with_shift(&s, "rice-paddy", "maize-grain", 40.0, own);
        assert!(matches!(
            s.overrides.as_slice(),
            [Override::ShiftCropShare { share_pct, strategy: Some(Strategy::Interval { days: 7 }), season_length_days: Some(110), .. }]
                if (*share_pct - 40.0).abs() < 1e-12
        ));
        let made = plan(&base, &s);
        let new = made.project.planting("C1-rice-maize-grain").unwrap();
        assert_eq!(new.strategy, Strategy::Interval { days: 7 });
        assert_eq!(new.season_length_days, Some(110));
        let s = with_shift(
            &s,
            "rice-paddy",
            "maize-grain",
            40.0,
            ShiftedPlantings::default(),
        );
        assert_eq!(s.overrides.len(), 1);
        let s = with_shift(
            &s,
            "no-such-crop",
            "maize-grain",
            10.0,
            ShiftedPlantings::default(),
        );
        let p = plan(&base, &s);
        assert_eq!(p.problems.len(), 1);
        assert_eq!(p.problems[0].0, 1);
        assert!(p.problems[0].1.contains("no planting grows"));
        assert!(check_share("0").is_err());
        assert!(check_share("abc").is_err());
        assert_eq!(check_share("100"), Ok(100.0));
    }

    fn eb(block: &str, v: f64) -> Override {
        Override::SetBlockEfficiency {
            block: block.to_owned(),
            method: None,
            field_canal_efficiency: Some(v),
        }
    }

    #[test]
    fn block_changes_merge_per_block_and_vanish_at_the_base_values() {
        let base = demo();
        let c1 = base.block("C1").unwrap().clone();
        let s = with_item_override(&base, &empty("a"), eb("C1", 0.4));
        assert_eq!(s.overrides, vec![eb("C1", 0.4)]);
        assert!(
            (plan(&base, &s)
                .project
                .block("C1")
                .unwrap()
                .field_canal_efficiency
                - 0.4)
                .abs()
                < 1e-12
        );
        // Ea on the same block joins the same override; Eb is kept.
        let drip = IrrigationMethod {
            name: "drip".into(),
            application_efficiency: 0.9,
        };
        let s = with_item_override(
            &base,
            &s,
            Override::SetBlockEfficiency {
                block: "C1".into(),
                method: Some(drip.clone()),
                field_canal_efficiency: None,
            },
        );
        assert_eq!(
            s.overrides,
            vec![Override::SetBlockEfficiency {
                block: "C1".into(),
                method: Some(drip.clone()),
                field_canal_efficiency: Some(0.4),
            }]
        );
        // Eb typed back to the base value: only the method change is left.
        let s = with_item_override(&base, &s, eb("C1", c1.field_canal_efficiency));
        assert_eq!(
            s.overrides,
            vec![Override::SetBlockEfficiency {
                block: "C1".into(),
                method: Some(drip),
                field_canal_efficiency: None,
            }]
        );
        // The base method back: nothing left to store.
        let s = with_item_override(
            &base,
            &s,
            Override::SetBlockEfficiency {
                block: "C1".into(),
                method: Some(c1.method.clone()),
                field_canal_efficiency: None,
            },
        );
        assert!(s.overrides.is_empty());
    }

    #[test]
    fn canal_changes_replace_the_same_value_of_the_same_canal() {
        let base = demo();
        let cap = |q: Option<f64>| Override::SetCanalCapacity {
            canal: "upper-dy".into(),
            existing_capacity_m3s: q,
        };
        let hours = Override::SetCanalHours {
            canal: "upper-dy".into(),
            operating_hours_per_day: 12.0,
        };
        let s = with_item_override(&base, &empty("a"), cap(Some(1.0)));
        let s = with_item_override(&base, &s, hours.clone());
        let s = with_item_override(&base, &s, cap(Some(0.5)));
        assert_eq!(s.overrides, vec![cap(Some(0.5)), hours.clone()]);
        let made = plan(&base, &s);
        assert!(made.problems.is_empty());
        let c = made.project.canal("upper-dy").unwrap();
        assert_eq!(c.existing_capacity_m3s, Some(0.5));
        assert!((c.operating_hours_per_day - 12.0).abs() < 1e-12);
        // The base plan knows no capacity for this canal: "unknown" is no change.
        let s = with_item_override(&base, &s, cap(None));
        assert_eq!(s.overrides, vec![hours]);
        // A planting override is not a block or canal change.
        let same = with_item_override(&base, &s, crop("C1-rice", "cotton"));
        assert_eq!(same, s);
    }

    #[test]
    fn out_of_range_values_are_kept_and_named_with_their_range() {
        let base = demo();
        let s = with_item_override(&base, &empty("a"), eb("C1", 1.5));
        assert_eq!(s.overrides, vec![eb("C1", 1.5)]);
        assert_eq!(
            override_problems(&s.overrides[0]),
            vec!["Field-canal efficiency must be between 1 % and 100 %".to_owned()]
        );
        let hours = Override::SetCanalHours {
            canal: "main".into(),
            operating_hours_per_day: 30.0,
        };
        assert_eq!(
            override_problems(&hours),
            vec!["Operating hours must be between 0.5 h/day and 24 h/day".to_owned()]
        );
        assert!(override_problems(&eb("C1", 0.5)).is_empty());
        let w = WeatherPerturbation {
            rain_change_pct: -150.0,
            ..WeatherPerturbation::default()
        };
        assert_eq!(
            weather_problems(&w),
            vec!["Rain change must be between -100 % and 200 %".to_owned()]
        );
        let warnings = vec![
            "under scenario \"a\": block \"C1\": Field-canal efficiency Eb (field_canal_efficiency) = 1.5 is outside its physical range: it must be 0.01 to 1 fraction"
                .to_owned(),
            "under scenario \"b\": something else".to_owned(),
        ];
        assert_eq!(
            validation_problems(&warnings, "a"),
            vec![
                "block \"C1\": Field-canal efficiency Eb (field_canal_efficiency) = 1.5 is outside its physical range: it must be 0.01 to 1 fraction"
            ]
        );
    }

    #[test]
    fn set_scenario_swaps_the_record_and_its_inverse_restores_it() {
        use crate::history::Edit;
        let mut p = demo();
        let original = p.clone();
        let name = p.scenarios[0].name.clone();
        let changed = with_planting_override(&p, &p.scenarios[0], crop("C1-rice", "maize-grain"));
        let inverse = DocEdit::SetScenario {
            name: name.clone(),
            scenario: Box::new(changed.clone()),
        }
        .apply(&mut p)
        .unwrap();
        assert_eq!(p.scenario(&name), Some(&changed));
        assert_eq!(p.plantings, original.plantings, "base plan untouched");
        inverse.apply(&mut p).unwrap();
        assert_eq!(p, original);
        // A missing scenario is refused and changes nothing.
        let missing = DocEdit::SetScenario {
            name: "no-such".into(),
            scenario: Box::new(changed),
        };
        assert!(missing.apply(&mut p).is_err());
        assert_eq!(p, original);
    }

    #[test]
    fn sentences_read_as_the_plan_changes() {
        let base = demo();
        let libs = Libraries::builtin().unwrap();
        assert_eq!(
            sentence(&crop("C1-rice", "maize-grain"), &base, &libs),
            "Planting C1-rice grows Maize, field (grain) (base plan: Rice, paddy)."
        );
        let w = WeatherPerturbation {
            temperature_shift_c: 1.5,
            rain_change_pct: -10.0,
            ..WeatherPerturbation::default()
        };
        assert_eq!(
            weather_text(&w),
            "Weather: temperature +1.5 °C, rain -10 %, radiation 0 %, wind 0 %."
        );
    }
}
