//! The right panel: every field of the selected item with its unit and
//! inline validation (see [`crate::fields`]).
//!
//! Each committed field change becomes one undoable edit that replaces the
//! touched record with an updated copy.

use egui::{Id, RichText, Ui};
use offtake_core::project::{
    Block, Canal, CanalKind, DesignBasis, EffectiveRain, Et0Method, LongGaps, MonthDay, Options,
    Planting, PlantingArea, Project, ReportingStep, Strategy,
};

use offtake_core::engine::outlets::OutletSummary;
use offtake_io::library::Libraries;

use crate::command::{Command, ItemRef, Selection};
use crate::edit::DocEdit;
use crate::fields::{Bounds, date_free_month_day, name_field, number_field};

/// Temporary-memory key the status bar sets to unfold the data warnings.
pub const OPEN_WARNINGS: &str = "offtake-open-data-warnings";

/// Allowed ranges, in the units shown. Where the core's table of limits
/// (`offtake_core::limits`) has the range, it is read from there (the
/// renovation issue moves every form onto the table).
pub mod bounds {
    use crate::fields::Bounds;
    use offtake_core::limits;

    /// Conveyance efficiency Ec of a canal reach.
    pub const CONVEYANCE: Bounds = Bounds::from_limit(
        "Conveyance efficiency",
        "%",
        &limits::CONVEYANCE_EFFICIENCY,
        100.0,
    );
    /// Field application efficiency Ea.
    pub const APPLICATION: Bounds = Bounds::from_limit(
        "Application efficiency",
        "%",
        &limits::APPLICATION_EFFICIENCY,
        100.0,
    );
    /// Field-canal efficiency Eb.
    pub const FIELD_CANAL: Bounds = Bounds::from_limit(
        "Field-canal efficiency",
        "%",
        &limits::FIELD_CANAL_EFFICIENCY,
        100.0,
    );
    /// Hours of canal operation per day.
    pub const HOURS: Bounds =
        Bounds::from_limit("Operating hours", "h/day", &limits::OPERATING_HOURS, 1.0);
    /// Existing capacity of a canal.
    pub const CAPACITY: Bounds = Bounds::from_limit(
        "Existing capacity",
        "m³/s",
        &limits::EXISTING_CAPACITY_M3S,
        1.0,
    );
    /// Bed slope of a canal section.
    pub const BED_SLOPE: Bounds = Bounds::new("Bed slope", "m/m", 0.000_001, 0.1);
    /// Side slope of a canal section.
    pub const SIDE_SLOPE: Bounds = Bounds::new("Side slope", "H per 1 V", 0.0, 10.0);
    /// Reach length.
    pub const LENGTH: Bounds = Bounds::new("Length", "m", 0.0, 1.0e6);
    /// Seepage rate per wetted area.
    pub const SEEPAGE: Bounds = Bounds::new("Seepage rate", "m³/m²/day", 0.0, 5.0);
    /// Block area.
    pub const AREA: Bounds = Bounds::new("Area", "ha", 0.0, 1.0e6);
    /// Planting share of its block.
    pub const SHARE: Bounds = Bounds::new("Share of block", "%", 0.0, 100.0);
    /// Planting spread.
    pub const SPREAD: Bounds =
        Bounds::from_limit("Planting spread", "days", &limits::SPREAD_DAYS, 1.0);
    /// Longest weather gap filled by linear interpolation.
    pub const INTERPOLATION: Bounds =
        Bounds::new("Interpolate weather gaps up to", "days", 0.0, 31.0);
    /// Season length of a planting (FAO-56 stage lengths are scaled to it).
    pub const SEASON: Bounds =
        Bounds::from_limit("Season length", "days", &limits::SEASON_LENGTH_DAYS, 1.0);
    /// Latitude.
    pub const LATITUDE: Bounds = Bounds::new("Latitude", "°", -90.0, 90.0);
    /// Elevation.
    pub const ELEVATION: Bounds = Bounds::from_limit("Elevation", "m", &limits::ELEVATION_M, 1.0);
    /// Wind measurement height.
    pub const WIND_HEIGHT: Bounds =
        Bounds::from_limit("Wind measurement height", "m", &limits::WIND_HEIGHT_M, 1.0);
    /// Design probability.
    pub const DESIGN_PROBABILITY: Bounds = Bounds::new("Design probability", "%", 1.0, 99.0);
    /// Percent of RAW that triggers irrigation.
    pub const TRIGGER_RAW: Bounds = Bounds::new("Trigger", "% of RAW", 1.0, 100.0);
    /// Days between irrigations.
    pub const INTERVAL: Bounds = Bounds::new("Interval", "days", 1.0, 365.0);
    /// Net depth per irrigation.
    pub const DEPTH: Bounds = Bounds::new("Net depth", "mm", 0.1, 500.0);
    /// Percent of TAW that triggers deficit irrigation.
    pub const TRIGGER_TAW: Bounds = Bounds::new("Trigger", "% of TAW", 1.0, 100.0);
    /// Share of depletion refilled.
    pub const REFILL: Bounds = Bounds::new("Refill", "% of depletion", 1.0, 100.0);
    /// Rotation cycle within a block, or continuous-flow cycle.
    pub const DELIVERY_CYCLE: Bounds = Bounds::new("Cycle", "days", 1.0, 30.0);
    /// Smallest depletion worth a turn.
    pub const MIN_TURN: Bounds = Bounds::new("Smallest turn", "mm", 0.0, 200.0);
    /// Outlet stream size.
    pub const STREAM_SIZE: Bounds = Bounds::new("Outlet stream size", "l/s", 0.1, 100_000.0);
    /// Rotation period.
    pub const ROTATION: Bounds = Bounds::new("Rotation period", "days", 1.0, 60.0);
    /// Fixed share of rain that is effective.
    pub const FIXED_RAIN: Bounds = Bounds::new("Effective share of rain", "%", 0.0, 100.0);
}

/// What the inspector reads beside the document.
#[derive(Debug, Clone, Copy)]
pub struct Context<'a> {
    /// Crop and soil libraries for the pickers.
    pub libraries: &'a Libraries,
    /// Problems found by the last validation run.
    pub problems: &'a [String],
    /// The block outlets of the last run (empty when none).
    pub outlets: &'a [OutletSummary],
}

/// Shows the problems that name this item's id.
fn problems_of(ui: &mut Ui, ctx: &Context<'_>, id: &str) {
    let quoted = format!("{id:?}");
    let mine: Vec<&String> = ctx
        .problems
        .iter()
        .filter(|p| p.contains(&quoted))
        .collect();
    if mine.is_empty() {
        return;
    }
    ui.separator();
    ui.label(RichText::new("Problems").strong());
    for p in mine {
        ui.label(RichText::new(p).color(ui.visuals().error_fg_color));
    }
}

pub(crate) fn fid(item: &str, field: &str) -> Id {
    Id::unique(("inspector", item, field))
}

/// Draws the inspector for the selection.
pub fn ui(
    ui: &mut Ui,
    doc: Option<&Project>,
    selection: &Selection,
    ctx: &Context<'_>,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Inspector").strong());
    ui.separator();
    let Some(doc) = doc else {
        ui.label("Nothing selected.");
        return;
    };
    match selection {
        Selection::None => {
            ui.label("Select the scheme, a canal, block or planting in the scheme tree to see and edit its fields.");
        }
        Selection::Scheme => {
            scheme_ui(ui, doc, commands);
            if !ctx.problems.is_empty() {
                ui.separator();
                // Open while short; a long list starts folded so the scheme's
                // fields stay in view (the status bar keeps the count).
                let open_now = ui.ctx().data_mut(|d| {
                    d.remove_temp::<bool>(egui::Id::unique(OPEN_WARNINGS))
                        .unwrap_or(false)
                });
                egui::CollapsingHeader::new(
                    RichText::new(format!("Data warnings ({})", ctx.problems.len())).strong(),
                )
                .id_salt("data-warnings")
                .default_open(ctx.problems.len() <= 6)
                .open(open_now.then_some(true))
                .show(ui, |ui| {
                    for p in ctx.problems {
                        ui.label(RichText::new(p).color(ui.visuals().warn_fg_color));
                    }
                });
            }
        }
        Selection::Weather => weather_ui(ui, doc, commands),
        Selection::Options => options_ui(ui, &doc.options, commands),
        Selection::Item(ItemRef::Canal(id)) => match doc.canal(id) {
            Some(c) => {
                canal_ui(ui, doc, c, commands);
                problems_of(ui, ctx, &c.id);
            }
            None => gone(ui),
        },
        Selection::Item(ItemRef::Block(id)) => match doc.block(id) {
            Some(b) => {
                block_ui(ui, doc, b, ctx, commands);
                problems_of(ui, ctx, &b.id);
            }
            None => gone(ui),
        },
        Selection::Item(ItemRef::Planting(id)) => match doc.planting(id) {
            Some(p) => {
                planting_ui(ui, doc, p, ctx, commands);
                problems_of(ui, ctx, &p.id);
            }
            None => gone(ui),
        },
    }
}

fn gone(ui: &mut Ui) {
    ui.label("The selected item is no longer in the project.");
}

fn scheme_ui(ui: &mut Ui, doc: &Project, commands: &mut Vec<Command>) {
    ui.label(RichText::new("Scheme").heading());
    on_demand_notice(ui, doc, commands);
    if let Some(name) =
        name_field(ui, fid("scheme", "name"), "Scheme name", &doc.scheme.name).committed
    {
        let mut s = doc.scheme.clone();
        s.name = name;
        commands.push(Command::Edit(DocEdit::SetScheme(s)));
    }
    let notes_id = fid("scheme", "notes");
    let mut notes = ui
        .data(|d| d.get_temp::<String>(notes_id))
        .unwrap_or_else(|| doc.scheme.notes.clone());
    let label = ui.label("Notes (data sources, assumptions)");
    let r = ui
        .add(
            egui::TextEdit::multiline(&mut notes)
                .id(notes_id)
                .desired_rows(3),
        )
        .labelled_by(label.id);
    if r.has_focus() {
        ui.data_mut(|d| d.insert_temp(notes_id, notes.clone()));
    } else {
        ui.data_mut(|d| d.remove::<String>(notes_id));
    }
    if r.lost_focus() && notes != doc.scheme.notes {
        let mut s = doc.scheme.clone();
        s.notes = notes;
        commands.push(Command::Edit(DocEdit::SetScheme(s)));
    }
    ui.label(format!(
        "{} canals, {} blocks, {} plantings; {} ha commanded",
        doc.canals.len(),
        doc.blocks.len(),
        doc.plantings.len(),
        crate::fields::format_number(doc.scheme_area_ha(), 1)
    ));
}

pub(crate) fn set_canal(c: Canal) -> Command {
    Command::Edit(DocEdit::SetCanal {
        id: c.id.clone(),
        canal: Box::new(c),
    })
}

fn canal_ui(ui: &mut Ui, doc: &Project, c: &Canal, commands: &mut Vec<Command>) {
    ui.label(RichText::new("Canal").heading());
    ui.label(format!("Id: {}", c.id));
    if let Some(name) = name_field(ui, fid(&c.id, "name"), "Name", &c.name).committed {
        let mut n = c.clone();
        n.name = name;
        commands.push(set_canal(n));
    }
    let mut kind = c.kind;
    egui::ComboBox::from_label("Role")
        .selected_text(kind.label())
        .show_ui(ui, |ui| {
            for k in [
                CanalKind::Main,
                CanalKind::Branch,
                CanalKind::Distributary,
                CanalKind::Minor,
            ] {
                ui.selectable_value(&mut kind, k, k.label());
            }
        });
    if kind != c.kind {
        let mut n = c.clone();
        n.kind = kind;
        commands.push(set_canal(n));
    }
    let parent_name = c
        .parent
        .as_deref()
        .and_then(|p| doc.canal(p))
        .map_or_else(|| "Headworks".to_owned(), |p| p.name.clone());
    ui.label(format!("Takes water from: {parent_name}"));
    let out = number_field(
        ui,
        fid(&c.id, "ec"),
        "Conveyance efficiency Ec",
        c.conveyance_efficiency,
        &bounds::CONVEYANCE,
        1,
    );
    if let Some(v) = out.committed {
        let mut n = c.clone();
        n.conveyance_efficiency = v;
        commands.push(set_canal(n));
    }
    ui.label(RichText::new("Water delivered to the children ÷ water entering the reach.").weak());
    let out = number_field(
        ui,
        fid(&c.id, "hours"),
        "Operating hours",
        c.operating_hours_per_day,
        &bounds::HOURS,
        1,
    );
    if let Some(v) = out.committed {
        let mut n = c.clone();
        n.operating_hours_per_day = v;
        commands.push(set_canal(n));
    }
    let mut has_capacity = c.existing_capacity_m3s.is_some();
    if ui
        .checkbox(&mut has_capacity, "Existing capacity known")
        .changed()
    {
        let mut n = c.clone();
        n.existing_capacity_m3s = has_capacity.then_some(0.0);
        commands.push(set_canal(n));
    }
    if let Some(cap) = c.existing_capacity_m3s {
        let out = number_field(
            ui,
            fid(&c.id, "cap"),
            "Existing capacity",
            cap,
            &bounds::CAPACITY,
            3,
        );
        if let Some(v) = out.committed {
            let mut n = c.clone();
            n.existing_capacity_m3s = Some(v);
            commands.push(set_canal(n));
        }
    }
    if let Ok(area) = doc.commanded_area_ha(&c.id) {
        ui.label(format!(
            "Command area: {} ha",
            crate::fields::format_number(area, 1)
        ));
    }
    crate::section_fields::section_ui(ui, c, commands);
}

fn set_block(b: Block) -> Command {
    Command::Edit(DocEdit::SetBlock {
        id: b.id.clone(),
        block: Box::new(b),
    })
}

fn block_ui(ui: &mut Ui, doc: &Project, b: &Block, ctx: &Context<'_>, commands: &mut Vec<Command>) {
    ui.label(RichText::new("Block").heading());
    ui.label(format!("Id: {}", b.id));
    if let Some(name) = name_field(ui, fid(&b.id, "name"), "Name", &b.name).committed {
        let mut n = b.clone();
        n.name = name;
        commands.push(set_block(n));
    }
    let canal = doc
        .canal(&b.canal)
        .map_or("(missing canal)", |c| c.name.as_str());
    ui.label(format!("Outlet on: {canal}"));
    let out = number_field(ui, fid(&b.id, "area"), "Area", b.area_ha, &bounds::AREA, 2);
    if let Some(v) = out.committed {
        let mut n = b.clone();
        n.area_ha = v;
        commands.push(set_block(n));
    }
    let soil_name = ctx.libraries.soil(&b.soil).map_or_else(
        || format!("(not in library: {:?})", b.soil),
        |s| s.name.clone(),
    );
    let mut soil = b.soil.clone();
    egui::ComboBox::from_label("Soil")
        .selected_text(soil_name)
        .show_ui(ui, |ui| {
            for s in &ctx.libraries.soils {
                ui.selectable_value(&mut soil, s.id.clone(), &s.name);
            }
        });
    if soil != b.soil {
        let mut n = b.clone();
        n.soil = soil;
        commands.push(set_block(n));
    }
    if let Some(m) = name_field(
        ui,
        fid(&b.id, "method"),
        "Irrigation method",
        &b.method.name,
    )
    .committed
    {
        let mut n = b.clone();
        n.method.name = m;
        commands.push(set_block(n));
    }
    let out = number_field(
        ui,
        fid(&b.id, "ea"),
        "Application efficiency Ea",
        b.method.application_efficiency,
        &bounds::APPLICATION,
        1,
    );
    if let Some(v) = out.committed {
        let mut n = b.clone();
        n.method.application_efficiency = v;
        commands.push(set_block(n));
    }
    let out = number_field(
        ui,
        fid(&b.id, "eb"),
        "Field-canal efficiency Eb",
        b.field_canal_efficiency,
        &bounds::FIELD_CANAL,
        1,
    );
    if let Some(v) = out.committed {
        let mut n = b.clone();
        n.field_canal_efficiency = v;
        commands.push(set_block(n));
    }
    ui.label(RichText::new("Block GIR = NIR ÷ (Ea × Eb).").weak());
    delivery_ui(ui, b, ctx, commands);
    if b.method.name == crate::edit::NEW_BLOCK_METHOD
        && b.method.application_efficiency == crate::edit::NEW_BLOCK_APPLICATION_EFFICIENCY
        && b.field_canal_efficiency == crate::edit::NEW_BLOCK_FIELD_CANAL_EFFICIENCY
    {
        ui.label(
            RichText::new(
                "Ea 60 % and Eb 80 % are typical starting values for surface irrigation \
                 (common practice; Ea after FAO Irrigation Water Management Training Manual 4, \
                 Brouwer et al. 1989, from memory): replace them with the block's own.",
            )
            .color(ui.visuals().warn_fg_color),
        );
    }
}

fn set_planting(p: Planting) -> Command {
    Command::Edit(DocEdit::SetPlanting {
        id: p.id.clone(),
        planting: Box::new(p),
    })
}

fn planting_ui(
    ui: &mut Ui,
    doc: &Project,
    p: &Planting,
    ctx: &Context<'_>,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Planting").heading());
    ui.label(format!("Id: {}", p.id));
    let block = doc
        .block(&p.block)
        .map_or("(missing block)", |b| b.name.as_str());
    ui.label(format!("On block: {block}"));
    let crop_name = ctx.libraries.crop(&p.crop).map_or_else(
        || format!("(not in library: {:?})", p.crop),
        |c| c.name.clone(),
    );
    let mut crop = p.crop.clone();
    egui::ComboBox::from_label("Crop")
        .selected_text(crop_name)
        .show_ui(ui, |ui| {
            for c in &ctx.libraries.crops {
                ui.selectable_value(&mut crop, c.id.clone(), &c.name);
            }
        });
    if crop != p.crop {
        let mut n = p.clone();
        n.crop = crop;
        commands.push(set_planting(n));
    }
    // Area in ha or % of the block.
    let mut in_percent = matches!(p.area, PlantingArea::PercentOfBlock(_));
    ui.horizontal(|ui| {
        let before = in_percent;
        ui.radio_value(&mut in_percent, false, "Area in ha");
        ui.radio_value(&mut in_percent, true, "Area in % of block");
        if before != in_percent {
            let block_ha = doc.block(&p.block).map_or(0.0, |b| b.area_ha);
            let ha = p.area.hectares(block_ha);
            let mut n = p.clone();
            n.area = if in_percent {
                let pct = if block_ha > 0.0 {
                    100.0 * ha / block_ha
                } else {
                    100.0
                };
                PlantingArea::PercentOfBlock(pct)
            } else {
                PlantingArea::Hectares(ha)
            };
            commands.push(set_planting(n));
        }
    });
    let (value, b) = match p.area {
        PlantingArea::Hectares(ha) => (ha, bounds::AREA),
        PlantingArea::PercentOfBlock(pct) => (pct, bounds::SHARE),
    };
    if let Some(v) = number_field(ui, fid(&p.id, "area"), "Planted", value, &b, 2).committed {
        let mut n = p.clone();
        n.area = match p.area {
            PlantingArea::Hectares(_) => PlantingArea::Hectares(v),
            PlantingArea::PercentOfBlock(_) => PlantingArea::PercentOfBlock(v),
        };
        commands.push(set_planting(n));
    }
    let out = date_free_month_day(
        ui,
        fid(&p.id, "first"),
        "First planting",
        (p.first_planting.month, p.first_planting.day),
    );
    let picked = crate::fields::month_day_calendar(
        ui,
        fid(&p.id, "first"),
        "first planting",
        (p.first_planting.month, p.first_planting.day),
    );
    if let Some((month, day)) = out.committed.or(picked) {
        let mut n = p.clone();
        n.first_planting = MonthDay { month, day };
        commands.push(set_planting(n));
    }
    let out = number_field(
        ui,
        fid(&p.id, "spread"),
        "Planting spread",
        f64::from(p.spread_days),
        &bounds::SPREAD,
        0,
    );
    if let Some(v) = out.committed
        && v >= 0.0
        && v.fract() == 0.0
    {
        let mut n = p.clone();
        n.spread_days = v as u32;
        commands.push(set_planting(n));
    }
    if let Some(season) = name_field(ui, fid(&p.id, "season"), "Season", &p.season).committed {
        let mut n = p.clone();
        n.season = season;
        commands.push(set_planting(n));
    }
    let library_days = ctx.libraries.crop(&p.crop).map(|c| c.stages.total_days());
    let mut own = p.season_length_days.is_some();
    let hint = library_days.map_or_else(String::new, |d| format!(" (library: {d} days)"));
    if ui
        .checkbox(&mut own, format!("Own season length{hint}"))
        .changed()
    {
        let mut n = p.clone();
        n.season_length_days = own.then(|| library_days.unwrap_or(120));
        commands.push(set_planting(n));
    }
    if let Some(days) = p.season_length_days
        && let Some(v) = number_field(
            ui,
            fid(&p.id, "season_len"),
            "Season length",
            f64::from(days),
            &bounds::SEASON,
            0,
        )
        .committed
        && v >= 4.0
        && v.fract() == 0.0
    {
        let mut n = p.clone();
        n.season_length_days = Some(v as u32);
        commands.push(set_planting(n));
    }
    strategy_ui(ui, p, commands);
}

fn strategy_name(s: &Strategy) -> &'static str {
    match s {
        Strategy::Refill { .. } => "Refill at a share of RAW",
        Strategy::Interval { .. } => "Fixed interval",
        Strategy::Depth { .. } => "Fixed depth",
        Strategy::Deficit { .. } => "Deficit",
        Strategy::Rainfed => "Rainfed",
    }
}

/// A combo box choosing the kind of irrigation strategy; a new kind starts
/// from its default settings (refill at 100 % of RAW, 7-day interval, 50 mm
/// depth, deficit at 70 % of TAW, rainfed).
pub fn strategy_kind_combo(ui: &mut Ui, label: &str, s: &mut Strategy) {
    egui::ComboBox::from_label(label)
        .selected_text(strategy_name(s))
        .show_ui(ui, |ui| {
            for choice in [
                Strategy::Refill {
                    trigger_pct_of_raw: 100.0,
                },
                Strategy::Interval { days: 7 },
                Strategy::Depth { net_mm: 50.0 },
                Strategy::Deficit {
                    trigger_pct_of_taw: 70.0,
                    refill_pct_of_depletion: 100.0,
                },
                Strategy::Rainfed,
            ] {
                let same = std::mem::discriminant(&choice) == std::mem::discriminant(s);
                if ui.selectable_label(same, strategy_name(&choice)).clicked() && !same {
                    *s = choice;
                }
            }
        });
}

fn strategy_ui(ui: &mut Ui, p: &Planting, commands: &mut Vec<Command>) {
    let mut s = p.strategy;
    strategy_kind_combo(ui, "Irrigation strategy", &mut s);
    let param = |ui: &mut Ui, field: &str, label: &str, v: f64, b: &Bounds| {
        number_field(ui, fid(&p.id, field), label, v, b, 1).committed
    };
    match &mut s {
        Strategy::Refill { trigger_pct_of_raw } => {
            if let Some(v) = param(
                ui,
                "raw",
                "Trigger",
                *trigger_pct_of_raw,
                &bounds::TRIGGER_RAW,
            ) {
                *trigger_pct_of_raw = v;
            }
        }
        Strategy::Interval { days } => {
            if let Some(v) = param(
                ui,
                "interval",
                "Interval",
                f64::from(*days),
                &bounds::INTERVAL,
            ) && v >= 1.0
                && v.fract() == 0.0
            {
                *days = v as u32;
            }
        }
        Strategy::Depth { net_mm } => {
            if let Some(v) = param(ui, "depth", "Net depth", *net_mm, &bounds::DEPTH) {
                *net_mm = v;
            }
        }
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => {
            if let Some(v) = param(
                ui,
                "taw",
                "Trigger",
                *trigger_pct_of_taw,
                &bounds::TRIGGER_TAW,
            ) {
                *trigger_pct_of_taw = v;
            }
            if let Some(v) = param(
                ui,
                "refill",
                "Refill",
                *refill_pct_of_depletion,
                &bounds::REFILL,
            ) {
                *refill_pct_of_depletion = v;
            }
        }
        Strategy::Rainfed => {}
    }
    if s != p.strategy {
        let mut n = p.clone();
        n.strategy = s;
        commands.push(set_planting(n));
    }
}

fn weather_ui(ui: &mut Ui, doc: &Project, commands: &mut Vec<Command>) {
    ui.label(RichText::new("Weather source").heading());
    let w = &doc.weather;
    if let Some(path) = name_field(ui, fid("weather", "path"), "Weather file", &w.path).committed {
        let mut n = w.clone();
        n.path = path;
        commands.push(Command::Edit(DocEdit::SetWeather(n)));
    }
    let fields: [(&str, &str, f64, &Bounds, usize); 3] = [
        ("lat", "Latitude", w.latitude_deg, &bounds::LATITUDE, 4),
        ("elev", "Elevation", w.elevation_m, &bounds::ELEVATION, 1),
        (
            "wind",
            "Wind measurement height",
            w.wind_height_m,
            &bounds::WIND_HEIGHT,
            2,
        ),
    ];
    for (key, label, value, b, decimals) in fields {
        if let Some(v) = number_field(ui, fid("weather", key), label, value, b, decimals).committed
        {
            let mut n = w.clone();
            match key {
                "lat" => n.latitude_deg = v,
                "elev" => n.elevation_m = v,
                _ => n.wind_height_m = v,
            }
            commands.push(Command::Edit(DocEdit::SetWeather(n)));
        }
    }
}

fn options_ui(ui: &mut Ui, o: &Options, commands: &mut Vec<Command>) {
    ui.label(RichText::new("Computation options").heading());
    let mut n = o.clone();
    egui::ComboBox::from_label("ET₀ method")
        .selected_text(et0_name(n.et0_method))
        .show_ui(ui, |ui| {
            for m in [
                Et0Method::PenmanMonteith,
                Et0Method::Hargreaves,
                Et0Method::AsceShort,
                Et0Method::AsceTall,
            ] {
                ui.selectable_value(&mut n.et0_method, m, et0_name(m));
            }
        });
    egui::ComboBox::from_label("Effective rainfall")
        .selected_text(rain_name(n.effective_rain))
        .show_ui(ui, |ui| {
            for m in [
                EffectiveRain::WaterBalance,
                EffectiveRain::UsdaScs,
                EffectiveRain::FixedPercent(70.0),
                EffectiveRain::Dependable,
            ] {
                let same = std::mem::discriminant(&m) == std::mem::discriminant(&n.effective_rain);
                if ui.selectable_label(same, rain_name(m)).clicked() && !same {
                    n.effective_rain = m;
                }
            }
        });
    if let EffectiveRain::FixedPercent(pct) = n.effective_rain
        && let Some(v) = number_field(
            ui,
            fid("options", "fixedrain"),
            "Effective share",
            pct,
            &bounds::FIXED_RAIN,
            1,
        )
        .committed
    {
        n.effective_rain = EffectiveRain::FixedPercent(v);
    }
    egui::ComboBox::from_label("Reporting step")
        .selected_text(step_name(n.reporting_step))
        .show_ui(ui, |ui| {
            for m in [
                ReportingStep::Daily,
                ReportingStep::TenDay,
                ReportingStep::Monthly,
            ] {
                ui.selectable_value(&mut n.reporting_step, m, step_name(m));
            }
        });
    egui::ComboBox::from_label("Design basis")
        .selected_text(basis_name(n.design_basis))
        .show_ui(ui, |ui| {
            for m in [
                DesignBasis::TenDay,
                DesignBasis::Monthly,
                DesignBasis::Daily,
            ] {
                ui.selectable_value(&mut n.design_basis, m, basis_name(m));
            }
        });
    if let Some(v) = number_field(
        ui,
        fid("options", "prob"),
        "Design probability (non-exceedance)",
        n.design_probability_pct,
        &bounds::DESIGN_PROBABILITY,
        1,
    )
    .committed
    {
        n.design_probability_pct = v;
    }
    if let Some(v) = number_field(
        ui,
        fid("options", "rotation"),
        "Rotation period",
        f64::from(n.rotation_period_days),
        &bounds::ROTATION,
        0,
    )
    .committed
        && v >= 1.0
        && v.fract() == 0.0
    {
        n.rotation_period_days = v as u32;
    }
    if let Some(v) = number_field(
        ui,
        fid("options", "interpolation"),
        "Interpolate weather gaps up to",
        f64::from(n.gap_filling.max_interpolation_days),
        &bounds::INTERPOLATION,
        0,
    )
    .committed
        && v >= 0.0
        && v.fract() == 0.0
    {
        n.gap_filling.max_interpolation_days = v as u32;
    }
    egui::ComboBox::from_label("Longer weather gaps filled by")
        .selected_text(long_gaps_name(n.gap_filling.long_gaps))
        .show_ui(ui, |ui| {
            for m in [LongGaps::Fao56Procedures, LongGaps::Climatology] {
                ui.selectable_value(&mut n.gap_filling.long_gaps, m, long_gaps_name(m));
            }
        });
    egui::ComboBox::from_label("Irrigation year starts in")
        .selected_text(month_name(n.irrigation_year_start_month))
        .show_ui(ui, |ui| {
            for m in 1..=12 {
                ui.selectable_value(&mut n.irrigation_year_start_month, m, month_name(m));
            }
        });
    if &n != o {
        commands.push(Command::Edit(DocEdit::SetOptions(n)));
    }
}

fn long_gaps_name(m: LongGaps) -> &'static str {
    match m {
        LongGaps::Fao56Procedures => "FAO-56 missing-data procedures",
        LongGaps::Climatology => "Day-of-year climatology of the series",
    }
}

fn et0_name(m: Et0Method) -> &'static str {
    match m {
        Et0Method::PenmanMonteith => "FAO-56 Penman–Monteith",
        Et0Method::Hargreaves => "Hargreaves–Samani (1985)",
        Et0Method::AsceShort => "ASCE-EWRI (2005) short reference",
        Et0Method::AsceTall => "ASCE-EWRI (2005) tall reference",
    }
}

fn rain_name(m: EffectiveRain) -> &'static str {
    match m {
        EffectiveRain::WaterBalance => "From the water balance",
        EffectiveRain::UsdaScs => "USDA-SCS",
        EffectiveRain::FixedPercent(_) => "Fixed percentage",
        EffectiveRain::Dependable => "Dependable rain",
    }
}

fn step_name(m: ReportingStep) -> &'static str {
    match m {
        ReportingStep::Daily => "Daily",
        ReportingStep::TenDay => "10-day",
        ReportingStep::Monthly => "Monthly",
    }
}

fn basis_name(m: DesignBasis) -> &'static str {
    match m {
        DesignBasis::TenDay => "Peak 10-day mean flow",
        DesignBasis::Monthly => "Peak monthly mean flow",
        DesignBasis::Daily => "Peak daily flow",
    }
}

fn month_name(m: u32) -> &'static str {
    const NAMES: [&str; 12] = [
        "January",
        "February",
        "March",
        "April",
        "May",
        "June",
        "July",
        "August",
        "September",
        "October",
        "November",
        "December",
    ];
    NAMES
        .get(m.wrapping_sub(1) as usize)
        .copied()
        .unwrap_or("(invalid month)")
}

/// The block's delivery mode and outlet (see `offtake_core::planting::delivery`).
fn delivery_ui(ui: &mut Ui, b: &Block, ctx: &Context<'_>, commands: &mut Vec<Command>) {
    use offtake_core::project::{
        DEFAULT_MIN_TURN_DEPTH_MM, DEFAULT_ROTATION_CYCLE_DAYS, DeliveryMode,
    };
    ui.separator();
    ui.label(RichText::new("Delivery through the outlet").strong());
    let kind = |d: DeliveryMode| match d {
        DeliveryMode::RotationWithinBlock { .. } => 0,
        DeliveryMode::ContinuousFlow { .. } => 1,
        DeliveryMode::OnDemand => 2,
    };
    let labels = [
        "Rotation within the block",
        "Continuous flow",
        "On demand (each planting on the day it asks)",
    ];
    let mut chosen = kind(b.delivery);
    egui::ComboBox::from_label("Delivery")
        .selected_text(labels[chosen])
        .show_ui(ui, |ui| {
            for (k, l) in labels.iter().enumerate() {
                ui.selectable_value(&mut chosen, k, *l);
            }
        });
    let cycle = b.delivery_cycle_days();
    if chosen != kind(b.delivery) {
        let cycle = if cycle > 1 {
            cycle
        } else {
            DEFAULT_ROTATION_CYCLE_DAYS
        };
        let mut n = b.clone();
        n.delivery = match chosen {
            0 => DeliveryMode::RotationWithinBlock {
                cycle_days: cycle,
                min_depth_mm: DEFAULT_MIN_TURN_DEPTH_MM,
            },
            1 => DeliveryMode::ContinuousFlow { cycle_days: cycle },
            _ => DeliveryMode::OnDemand,
        };
        commands.push(set_block(n));
    }
    match b.delivery {
        DeliveryMode::RotationWithinBlock {
            cycle_days,
            min_depth_mm,
        } => {
            let out = number_field(
                ui,
                fid(&b.id, "cycle"),
                "Rotation cycle",
                f64::from(cycle_days),
                &bounds::DELIVERY_CYCLE,
                0,
            );
            let out_min = number_field(
                ui,
                fid(&b.id, "min-turn"),
                "Smallest turn",
                min_depth_mm,
                &bounds::MIN_TURN,
                1,
            );
            if out.committed.is_some() || out_min.committed.is_some() {
                let mut n = b.clone();
                n.delivery = DeliveryMode::RotationWithinBlock {
                    cycle_days: out.committed.map_or(cycle_days, |v| v.round() as u32),
                    min_depth_mm: out_min.committed.unwrap_or(min_depth_mm),
                };
                commands.push(set_block(n));
            }
            ui.label(
                RichText::new(format!(
                    "Each day 1/{cycle_days} of the area takes its turn and is brought back to \
                     the strategy's target (skipped when less than {} mm is missing).",
                    crate::fields::format_number(min_depth_mm, 0)
                ))
                .weak(),
            );
        }
        DeliveryMode::ContinuousFlow { cycle_days } => {
            let out = number_field(
                ui,
                fid(&b.id, "cycle"),
                "Delivery cycle",
                f64::from(cycle_days),
                &bounds::DELIVERY_CYCLE,
                0,
            );
            if let Some(v) = out.committed {
                let mut n = b.clone();
                n.delivery = DeliveryMode::ContinuousFlow {
                    cycle_days: v.round() as u32,
                };
                commands.push(set_block(n));
            }
            ui.label(
                RichText::new("Each cycle's requirement is delivered at a steady rate.").weak(),
            );
        }
        DeliveryMode::OnDemand => {
            ui.label(
                RichText::new(
                    "Each planting takes its water over its whole area on the day its strategy \
                     asks: canals then carry pulses no outlet delivers. Rotation within the \
                     block is what most surface schemes do.",
                )
                .color(ui.visuals().warn_fg_color),
            );
        }
    }
    let outlet = ctx.outlets.iter().find(|o| o.block == b.id);
    let shown = b
        .outlet_stream_size_ls
        .or_else(|| outlet.map(|o| o.stream_size_ls))
        .unwrap_or(0.0);
    let out = number_field(
        ui,
        fid(&b.id, "stream"),
        "Outlet stream size",
        shown,
        &bounds::STREAM_SIZE,
        1,
    );
    if let Some(v) = out.committed {
        let mut n = b.clone();
        n.outlet_stream_size_ls = Some(v);
        commands.push(set_block(n));
    }
    match (b.outlet_stream_size_ls, outlet) {
        (None, Some(o)) => {
            ui.label(
                RichText::new(format!(
                    "Assumed: the block's largest daily delivery over its canal's {} h \
                     (it never limits). Enter the outlet's real size.",
                    crate::fields::format_number(o.hours_per_day, 1)
                ))
                .color(ui.visuals().warn_fg_color),
            );
        }
        (None, None) => {
            ui.label(RichText::new("Assumed large enough until the scheme is computed.").weak());
        }
        (Some(_), Some(o)) if o.limited_m3_per_year > 0.0 => {
            ui.label(
                RichText::new(format!(
                    "The outlet limits delivery on {} days a year ({} m³ a year, {} % of the requests).",
                    crate::fields::format_number(o.limited_days_per_year, 1),
                    crate::fields::format_number(o.limited_m3_per_year, 0),
                    crate::fields::format_number(100.0 * o.limited_share(), 2)
                ))
                .color(ui.visuals().warn_fg_color),
            );
        }
        (Some(_), _) => {}
    }
    if let Some(o) = outlet {
        ui.label(format!(
            "Largest daily delivery: {} l/s over {} h",
            crate::fields::format_number(o.peak_delivery_ls, 1),
            crate::fields::format_number(o.hours_per_day, 1)
        ));
    }
}

/// Surface irrigation methods: the blocks a rotation within the block suits.
fn is_surface_method(name: &str) -> bool {
    use offtake_core::planting::Wetting;
    matches!(
        Wetting::from_method_name(name),
        Some(
            Wetting::Surface | Wetting::Furrow | Wetting::FurrowWideBed | Wetting::AlternateFurrow
        )
    ) || name == crate::edit::NEW_BLOCK_METHOD
}

/// The notice of a project whose blocks are all on demand (a project from
/// before schema 3, or set so): offer rotation within the block for the
/// surface-irrigated ones, as one undoable edit.
fn on_demand_notice(ui: &mut Ui, doc: &Project, commands: &mut Vec<Command>) {
    use offtake_core::project::{
        DEFAULT_MIN_TURN_DEPTH_MM, DEFAULT_ROTATION_CYCLE_DAYS, DeliveryMode,
    };
    if doc.blocks.is_empty()
        || !doc
            .blocks
            .iter()
            .all(|b| matches!(b.delivery, DeliveryMode::OnDemand))
    {
        return;
    }
    let surface: Vec<&Block> = doc
        .blocks
        .iter()
        .filter(|b| is_surface_method(&b.method.name))
        .collect();
    ui.group(|ui| {
        ui.label(
            RichText::new(
                "Every block is served on demand: each planting takes its water over its whole \
                 area on the day its strategy asks, so canals carry pulses no outlet delivers. \
                 Surface schemes usually rotate within each block.",
            )
            .color(ui.visuals().warn_fg_color),
        );
        if !surface.is_empty()
            && ui
                .button(format!(
                    "Serve the {} surface-irrigated block{} by a {DEFAULT_ROTATION_CYCLE_DAYS}-day rotation within the block",
                    surface.len(),
                    if surface.len() == 1 { "" } else { "s" }
                ))
                .clicked()
        {
            commands.push(Command::Edit(DocEdit::SetBlockDeliveries(
                surface
                    .iter()
                    .map(|b| {
                        (
                            b.id.clone(),
                            DeliveryMode::RotationWithinBlock {
                                cycle_days: DEFAULT_ROTATION_CYCLE_DAYS,
                                min_depth_mm: DEFAULT_MIN_TURN_DEPTH_MM,
                            },
                        )
                    })
                    .collect(),
            )));
        }
    });
}
