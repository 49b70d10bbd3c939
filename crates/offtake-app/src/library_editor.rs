//! The crop and soil library editors.
//!
//! The built-in libraries (FAO-56 tables, shipped with Offtake) are read
//! only. "Copy to my crops" (or "Copy to my soils") puts a copy with a new id
//! in the project (`Project::user_crops`, `user_soils`); the project's own
//! entries can then be edited field by field, with units and inline
//! validation (`Crop::validate`, `Soil::validate`), and a crop's Kc curve
//! (FAO-56 eq. 66, stages shaded) is redrawn as its values change.
//!
//! An own entry with the id of a library entry replaces it everywhere the
//! project is computed (pickers, the app's computation, `offtake run`). Every
//! change is one undoable edit ([`DocEdit::SetUserCrops`],
//! [`DocEdit::SetUserSoils`]) of the whole list of own entries.
//!
//! A copy has its own id, so no planting uses it at first. "Use for all
//! plantings of <original crop>" re-points every planting of the base plan
//! that grows the library crop the copy was made from to the copy, as one
//! undoable edit ([`DocEdit::SetPlantingCrops`]); the form says how many
//! plantings that changes. Scenarios that name the original crop are left
//! as they are.

use egui::{Color32, Id, RichText, Ui};
use egui_plot::{Legend, Line, Plot, PlotPoint, Polygon, Text};
use offtake_core::crop::kc_curve::KcCurve;
use offtake_core::crop::{CoefficientSet, Crop, CropGroup, CycleKind, StageLengths};
use offtake_core::project::Project;
use offtake_core::soil::{HydrologicSoilGroup, Soil};
use offtake_io::library::Libraries;

use crate::command::Command;
use crate::edit::DocEdit;
use crate::fields::{Bounds, format_number, name_field, number_field};

/// Which library the window shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum LibraryKind {
    /// Crops.
    #[default]
    Crops,
    /// Soils.
    Soils,
}

/// State of the library window (runtime only, never saved).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LibraryEditor {
    /// Whether the window is open.
    pub open: bool,
    /// Crops or soils.
    pub kind: LibraryKind,
    /// The crop shown (id); an own crop is editable.
    pub crop: Option<String>,
    /// The soil shown (id).
    pub soil: Option<String>,
    /// The Kc curve drawn in the last frame: `[day after planting, Kc]`
    /// (tests and the CSV of the plot read it).
    pub plotted_kc: Vec<[f64; 2]>,
}

/// Kc on each day of the crop's first cycle (FAO-56 eq. 66 through
/// [`KcCurve`]), as `[day, Kc]` with day 0 at planting, and the last day of
/// each of the four stages.
///
/// # Errors
/// The crop's stage lengths or coefficients are invalid (the message of
/// `CropError`).
pub fn kc_curve_points(crop: &Crop) -> Result<(Vec<[f64; 2]>, [u32; 4]), String> {
    let curve = KcCurve::new(crop.stages, crop.kc).map_err(|e| e.to_string())?;
    let mut points = vec![[0.0, curve.kc_at(0.0)]];
    points.extend(
        curve
            .daily()
            .into_iter()
            .enumerate()
            .map(|(i, kc)| [(i + 1) as f64, kc]),
    );
    let l = curve.lengths;
    let ends = [
        l.ini_days,
        l.ini_days + l.dev_days,
        l.ini_days + l.dev_days + l.mid_days,
        l.total_days(),
    ];
    Ok((points, ends))
}

/// An id not used by any library or own entry: `<base>-mine`, then
/// `<base>-mine-2`, ….
fn fresh_library_id(base: &str, used: &dyn Fn(&str) -> bool) -> String {
    let first = format!("{base}-mine");
    if !used(&first) {
        return first;
    }
    // Among as many candidates as there can be entries, one is free.
    (2..100_000)
        .map(|n| format!("{base}-mine-{n}"))
        .find(|id| !used(id))
        .unwrap_or(first)
}

/// A copy of a library crop for the project, with a new id.
pub fn copy_crop(crop: &Crop, project: &Project, base: &Libraries) -> Crop {
    let used = |id: &str| base.crop(id).is_some() || project.user_crops.iter().any(|c| c.id == id);
    let mut copy = crop.clone();
    copy.id = fresh_library_id(&crop.id, &used);
    copy.name = format!("{} (my copy)", crop.name);
    let note = format!(
        "Project copy of library entry '{}'; values edited in the project are the user's, not the cited table's.",
        crop.id
    );
    copy.sources.kc.note = if copy.sources.kc.note.is_empty() {
        note
    } else {
        format!("{} {note}", copy.sources.kc.note)
    };
    copy
}

/// The library crop an own crop was copied from: its id is the copy's id
/// without the `-mine` (or `-mine-N`) suffix that [`copy_crop`] adds.
pub fn original_crop<'a>(copy: &Crop, base: &'a Libraries) -> Option<&'a Crop> {
    let (stem, tail) = copy.id.rsplit_once("-mine")?;
    let numbered = tail
        .strip_prefix('-')
        .is_some_and(|n| !n.is_empty() && n.bytes().all(|b| b.is_ascii_digit()));
    if !(tail.is_empty() || numbered) {
        return None;
    }
    base.crop(stem)
}

/// The plantings of the base plan that grow `crop` (ids, in plan order).
pub fn plantings_growing<'a>(project: &'a Project, crop: &str) -> Vec<&'a str> {
    project
        .plantings
        .iter()
        .filter(|p| p.crop == crop)
        .map(|p| p.id.as_str())
        .collect()
}

/// One edit giving every planting of the base plan that grows `from` the
/// crop `to`; `None` when no planting grows `from`.
pub fn use_for_all_plantings(project: &Project, from: &str, to: &str) -> Option<DocEdit> {
    let pairs: Vec<(String, String)> = plantings_growing(project, from)
        .into_iter()
        .map(|id| (id.to_owned(), to.to_owned()))
        .collect();
    (!pairs.is_empty()).then_some(DocEdit::SetPlantingCrops(pairs))
}

/// The offer to grow an own crop instead of the library crop it copies,
/// on every planting of the base plan, with the number of plantings it
/// changes.
fn use_for_all_ui(
    ui: &mut Ui,
    project: &Project,
    own: &Crop,
    base: &Libraries,
    commands: &mut Vec<Command>,
) {
    let Some(original) = original_crop(own, base) else {
        return;
    };
    let ids = plantings_growing(project, &original.id);
    let n = ids.len();
    let clicked = ui
        .add_enabled(
            n > 0,
            egui::Button::new(format!("Use for all plantings of {}", original.name)),
        )
        .on_hover_text(format!(
            "Every planting of the base plan that grows {} grows {} instead, in one step (undo restores them all). Scenarios that name {} are not changed.",
            original.id, own.id, original.id
        ))
        .on_disabled_hover_text(format!("No planting of the base plan grows {}", original.id))
        .clicked();
    ui.label(match n {
        0 => format!(
            "No planting of the base plan grows {} ({}).",
            original.name, original.id
        ),
        1 => format!("Changes 1 planting of the base plan: {}.", ids[0]),
        _ => format!(
            "Changes {n} plantings of the base plan: {}.",
            ids.join(", ")
        ),
    });
    let using = plantings_growing(project, &own.id).len();
    if using > 0 {
        ui.label(
            RichText::new(format!(
                "{using} planting{} of the base plan grow{} this crop.",
                if using == 1 { "" } else { "s" },
                if using == 1 { "s" } else { "" }
            ))
            .weak(),
        );
    }
    if clicked && let Some(edit) = use_for_all_plantings(project, &original.id, &own.id) {
        commands.push(Command::Edit(edit));
    }
}

/// A copy of a library soil for the project, with a new id.
pub fn copy_soil(soil: &Soil, project: &Project, base: &Libraries) -> Soil {
    let used = |id: &str| base.soil(id).is_some() || project.user_soils.iter().any(|s| s.id == id);
    let mut copy = soil.clone();
    copy.id = fresh_library_id(&soil.id, &used);
    copy.name = format!("{} (my copy)", soil.name);
    let note = format!(
        "Project copy of library entry '{}'; values edited in the project are the user's.",
        soil.id
    );
    copy.sources.water.note = if copy.sources.water.note.is_empty() {
        note
    } else {
        format!("{} {note}", copy.sources.water.note)
    };
    copy
}

fn group_label(g: CropGroup) -> &'static str {
    match g {
        CropGroup::FieldCrop => "Field crop",
        CropGroup::Vegetable => "Vegetable",
        CropGroup::Fodder => "Fodder",
        CropGroup::OrchardVine => "Orchard or vine",
        CropGroup::PaddyRice => "Paddy rice",
        CropGroup::TropicalPerennial => "Tropical perennial",
        _ => "Other",
    }
}

const GROUPS: [CropGroup; 6] = [
    CropGroup::FieldCrop,
    CropGroup::Vegetable,
    CropGroup::Fodder,
    CropGroup::OrchardVine,
    CropGroup::PaddyRice,
    CropGroup::TropicalPerennial,
];

/// Bounds of the crop fields: the ranges `Crop::validate` accepts.
mod crop_bounds {
    use crate::fields::Bounds;
    pub const STAGE: Bounds = Bounds::new("Stage length", "d", 1.0, 366.0);
    pub const KC: Bounds = Bounds::new("Crop coefficient", "", 0.0, 2.0);
    pub const HEIGHT: Bounds = Bounds::new("Maximum crop height", "m", 0.0, 30.0);
    pub const ROOT: Bounds = Bounds::new("Rooting depth", "m", 0.05, 5.0);
    pub const P: Bounds = Bounds::new("Depletion fraction p", "", 0.05, 0.95);
    pub const KY: Bounds = Bounds::new("Yield response factor Ky", "", 0.0, 3.0);
    pub const ECE: Bounds = Bounds::new("ECe threshold", "dS/m", 0.0, 50.0);
    pub const SLOPE: Bounds = Bounds::new("Yield decline", "%/(dS/m)", 0.0, 100.0);
}

/// Bounds of the soil fields: the ranges `Soil::validate` accepts.
mod soil_bounds {
    use crate::fields::Bounds;
    pub const THETA: Bounds = Bounds::new("Water content", "m³/m³", 0.0, 0.6);
    pub const REW: Bounds = Bounds::new("Readily evaporable water REW", "mm", 0.1, 100.0);
    pub const ZE: Bounds = Bounds::new("Evaporation layer Ze", "m", 0.05, 0.25);
    pub const INFIL: Bounds = Bounds::new("Maximum infiltration rate", "mm/day", 0.1, 1.0e5);
    pub const CN: Bounds = Bounds::new("Curve number", "", 30.0, 100.0);
}

/// One numeric field of an own entry; a committed value is written by `set`
/// into a copy, which becomes the new value of the list.
#[expect(
    clippy::too_many_arguments,
    reason = "one call per form field reads best with the field's label, value, bounds and setter side by side"
)]
fn num<T: Clone>(
    ui: &mut Ui,
    id: Id,
    label: &str,
    value: f64,
    bounds: &Bounds,
    decimals: usize,
    entry: &T,
    changed: &mut Option<T>,
    set: impl FnOnce(&mut T, f64),
) {
    let out = number_field(ui, id, label, value, bounds, decimals);
    if let Some(v) = out.committed {
        let mut e = changed.clone().unwrap_or_else(|| entry.clone());
        set(&mut e, v);
        *changed = Some(e);
    }
}

fn to_days(v: f64) -> u32 {
    // Stage lengths are whole days; negative or huge text is clamped so the
    // validation message (not a wrap-around) explains it.
    #[expect(
        clippy::cast_possible_truncation,
        clippy::cast_sign_loss,
        reason = "rounded and clamped to 0..=100000 first"
    )]
    let d = v.round().clamp(0.0, 100_000.0) as u32;
    d
}

impl LibraryEditor {
    /// Opens the window on one library.
    pub fn show(&mut self, kind: LibraryKind) {
        self.open = true;
        self.kind = kind;
    }

    /// Draws the window's contents. `base` is the built-in library (without
    /// the project's own entries).
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        project: &Project,
        base: &Libraries,
        commands: &mut Vec<Command>,
    ) {
        ui.horizontal(|ui| {
            ui.selectable_value(&mut self.kind, LibraryKind::Crops, "Crops");
            ui.selectable_value(&mut self.kind, LibraryKind::Soils, "Soils");
        });
        ui.separator();
        match self.kind {
            LibraryKind::Crops => self.crops_ui(ui, project, base, commands),
            LibraryKind::Soils => self.soils_ui(ui, project, base, commands),
        }
    }

    fn crops_ui(
        &mut self,
        ui: &mut Ui,
        project: &Project,
        base: &Libraries,
        commands: &mut Vec<Command>,
    ) {
        ui.columns(2, |cols| {
            let ui = &mut cols[0];
            egui::ScrollArea::vertical()
                .id_salt("crop-list")
                .max_height(520.0)
                .show(ui, |ui| {
                    ui.label(RichText::new("My crops (this project)").strong());
                    if project.user_crops.is_empty() {
                        ui.label("None yet — pick a library crop and use Copy to my crops.");
                    }
                    for c in &project.user_crops {
                        let label = format!("{} [{}]", c.name, c.id);
                        if ui
                            .selectable_label(self.crop.as_deref() == Some(c.id.as_str()), label)
                            .clicked()
                        {
                            self.crop = Some(c.id.clone());
                        }
                    }
                    ui.separator();
                    ui.label(RichText::new("Built-in library (FAO-56, read only)").strong());
                    for c in &base.crops {
                        let replaced = project.user_crops.iter().any(|u| u.id == c.id);
                        let mut label = format!("{} ({})", c.name, c.id);
                        if replaced {
                            label.push_str(" — replaced by my crop");
                        }
                        if ui
                            .selectable_label(
                                self.crop.as_deref() == Some(c.id.as_str()) && !replaced,
                                label,
                            )
                            .clicked()
                        {
                            self.crop = Some(c.id.clone());
                        }
                    }
                });
            let ui = &mut cols[1];
            let own = self
                .crop
                .as_deref()
                .and_then(|id| project.user_crops.iter().find(|c| c.id == id));
            let library = self.crop.as_deref().and_then(|id| base.crop(id));
            match (own, library) {
                (Some(c), _) => {
                    // The curve on top, the form below it (scrolled).
                    self.plotted_kc = kc_plot(ui, c);
                    use_for_all_ui(ui, project, c, base, commands);
                    ui.separator();
                    egui::ScrollArea::vertical()
                        .id_salt("crop-form")
                        .max_height(420.0)
                        .show(ui, |ui| {
                            if let Some(new) = crop_form(ui, c) {
                                let list = project
                                    .user_crops
                                    .iter()
                                    .map(|x| if x.id == c.id { new.clone() } else { x.clone() })
                                    .collect();
                                commands.push(Command::Edit(DocEdit::SetUserCrops(list)));
                            }

                            if ui.button("Remove from my crops").clicked() {
                                let list = project
                                    .user_crops
                                    .iter()
                                    .filter(|x| x.id != c.id)
                                    .cloned()
                                    .collect();
                                commands.push(Command::Edit(DocEdit::SetUserCrops(list)));
                            }
                        });
                }
                (None, Some(c)) => {
                    ui.label(RichText::new(&c.name).strong());
                    ui.label(format!("Library crop {} — read only", c.id));
                    let s = c.stages;
                    ui.label(format!(
                        "Stages (d): initial {}, development {}, mid-season {}, late season {} — {}",
                        s.ini_days, s.dev_days, s.mid_days, s.late_days, c.sources.stages.cite
                    ));
                    ui.label(format!(
                        "Kc ini {} · Kc mid {} · Kc end {} — {}",
                        format_number(c.kc.ini, 2),
                        format_number(c.kc.mid, 2),
                        format_number(c.kc.end, 2),
                        c.sources.kc.cite
                    ));
                    if ui.button("Copy to my crops").clicked() {
                        let copy = copy_crop(c, project, base);
                        self.crop = Some(copy.id.clone());
                        let mut list = project.user_crops.clone();
                        list.push(copy);
                        commands.push(Command::Edit(DocEdit::SetUserCrops(list)));
                    }
                    self.plotted_kc = kc_plot(ui, c);
                }
                (None, None) => {
                    ui.label("Pick a crop on the left to see its Kc curve.");
                    self.plotted_kc.clear();
                }
            }
        });
    }

    fn soils_ui(
        &mut self,
        ui: &mut Ui,
        project: &Project,
        base: &Libraries,
        commands: &mut Vec<Command>,
    ) {
        ui.columns(2, |cols| {
            let ui = &mut cols[0];
            egui::ScrollArea::vertical()
                .id_salt("soil-list")
                .max_height(520.0)
                .show(ui, |ui| {
                    ui.label(RichText::new("My soils (this project)").strong());
                    if project.user_soils.is_empty() {
                        ui.label("None yet — pick a library soil and use Copy to my soils.");
                    }
                    for s in &project.user_soils {
                        let label = format!("{} [{}]", s.name, s.id);
                        if ui
                            .selectable_label(self.soil.as_deref() == Some(s.id.as_str()), label)
                            .clicked()
                        {
                            self.soil = Some(s.id.clone());
                        }
                    }
                    ui.separator();
                    ui.label(RichText::new("Built-in library (FAO-56, read only)").strong());
                    for s in &base.soils {
                        let label = format!("{} ({})", s.name, s.id);
                        if ui
                            .selectable_label(self.soil.as_deref() == Some(s.id.as_str()), label)
                            .clicked()
                        {
                            self.soil = Some(s.id.clone());
                        }
                    }
                });
            let ui = &mut cols[1];
            let own = self
                .soil
                .as_deref()
                .and_then(|id| project.user_soils.iter().find(|s| s.id == id));
            let library = self.soil.as_deref().and_then(|id| base.soil(id));
            match (own, library) {
                (Some(s), _) => {
                    egui::ScrollArea::vertical()
                        .id_salt("soil-form")
                        .max_height(560.0)
                        .show(ui, |ui| {
                            if let Some(new) = soil_form(ui, s) {
                                let list = project
                                    .user_soils
                                    .iter()
                                    .map(|x| if x.id == s.id { new.clone() } else { x.clone() })
                                    .collect();
                                commands.push(Command::Edit(DocEdit::SetUserSoils(list)));
                            }
                            if ui.button("Remove from my soils").clicked() {
                                let list = project
                                    .user_soils
                                    .iter()
                                    .filter(|x| x.id != s.id)
                                    .cloned()
                                    .collect();
                                commands.push(Command::Edit(DocEdit::SetUserSoils(list)));
                            }
                        });
                }
                (None, Some(s)) => {
                    ui.label(RichText::new(&s.name).strong());
                    ui.label(format!("Library soil {} — read only", s.id));
                    ui.label(format!(
                        "θFC {} · θWP {} m³/m³ · TAW {} mm/m · REW {} mm · CN {} — {}",
                        format_number(s.theta_fc, 3),
                        format_number(s.theta_wp, 3),
                        format_number(s.taw_per_m_mm(), 0),
                        format_number(s.rew_mm, 1),
                        format_number(s.curve_number, 0),
                        s.sources.water.cite
                    ));
                    if ui.button("Copy to my soils").clicked() {
                        let copy = copy_soil(s, project, base);
                        self.soil = Some(copy.id.clone());
                        let mut list = project.user_soils.clone();
                        list.push(copy);
                        commands.push(Command::Edit(DocEdit::SetUserSoils(list)));
                    }
                }
                (None, None) => {
                    ui.label("Pick a soil on the left.");
                }
            }
        });
    }
}

/// The form of an own crop; returns the edited crop when a field was committed.
fn crop_form(ui: &mut Ui, c: &Crop) -> Option<Crop> {
    use crop_bounds as b;
    let mut changed: Option<Crop> = None;
    let key = |f: &str| Id::unique(("library-crop", c.id.as_str(), f.to_owned()));
    ui.label(RichText::new(format!("My crop {}", c.id)).strong());
    ui.label(
        RichText::new(
            "Plantings refer to this id; a my-crop id equal to a library id replaces that crop.",
        )
        .weak(),
    );
    if let Some(name) = name_field(ui, key("name"), "Crop name", &c.name).committed {
        let mut e = c.clone();
        e.name = name;
        changed = Some(e);
    }
    let mut group = c.group;
    egui::ComboBox::from_label("Crop group")
        .selected_text(group_label(group))
        .show_ui(ui, |ui| {
            for g in GROUPS {
                ui.selectable_value(&mut group, g, group_label(g));
            }
        });
    if group != c.group {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.group = group;
        changed = Some(e);
    }
    ui.label(RichText::new("Stage lengths (FAO-56 Table 11)").strong());
    let s = c.stages;
    num(
        ui,
        key("ini_days"),
        "Initial stage",
        f64::from(s.ini_days),
        &b::STAGE,
        0,
        c,
        &mut changed,
        |e, v| e.stages.ini_days = to_days(v),
    );
    num(
        ui,
        key("dev_days"),
        "Development stage",
        f64::from(s.dev_days),
        &b::STAGE,
        0,
        c,
        &mut changed,
        |e, v| e.stages.dev_days = to_days(v),
    );
    num(
        ui,
        key("mid_days"),
        "Mid-season stage",
        f64::from(s.mid_days),
        &b::STAGE,
        0,
        c,
        &mut changed,
        |e, v| e.stages.mid_days = to_days(v),
    );
    num(
        ui,
        key("late_days"),
        "Late-season stage",
        f64::from(s.late_days),
        &b::STAGE,
        0,
        c,
        &mut changed,
        |e, v| e.stages.late_days = to_days(v),
    );
    ui.label(format!("Season: {} d", s.total_days()));
    if let Some(region) = name_field(
        ui,
        key("stages_region"),
        "Region and planting of the stage lengths",
        &c.stages_region,
    )
    .committed
    {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.stages_region = region;
        changed = Some(e);
    }
    ui.label(RichText::new("Single crop coefficients (FAO-56 Table 12)").strong());
    num(
        ui,
        key("kc_ini"),
        "Kc ini",
        c.kc.ini,
        &b::KC,
        3,
        c,
        &mut changed,
        |e, v| e.kc.ini = v,
    );
    num(
        ui,
        key("kc_mid"),
        "Kc mid",
        c.kc.mid,
        &b::KC,
        3,
        c,
        &mut changed,
        |e, v| e.kc.mid = v,
    );
    num(
        ui,
        key("kc_end"),
        "Kc end",
        c.kc.end,
        &b::KC,
        3,
        c,
        &mut changed,
        |e, v| e.kc.end = v,
    );
    let mut has_kcb = c.kcb.is_some();
    if ui
        .checkbox(&mut has_kcb, "Basal coefficients Kcb (FAO-56 Table 17)")
        .changed()
    {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.kcb = has_kcb.then_some(CoefficientSet {
            ini: c.kc.ini,
            mid: c.kc.mid,
            end: c.kc.end,
        });
        changed = Some(e);
    }
    if let Some(kcb) = c.kcb {
        num(
            ui,
            key("kcb_ini"),
            "Kcb ini",
            kcb.ini,
            &b::KC,
            3,
            c,
            &mut changed,
            |e, v| {
                if let Some(k) = e.kcb.as_mut() {
                    k.ini = v;
                }
            },
        );
        num(
            ui,
            key("kcb_mid"),
            "Kcb mid",
            kcb.mid,
            &b::KC,
            3,
            c,
            &mut changed,
            |e, v| {
                if let Some(k) = e.kcb.as_mut() {
                    k.mid = v;
                }
            },
        );
        num(
            ui,
            key("kcb_end"),
            "Kcb end",
            kcb.end,
            &b::KC,
            3,
            c,
            &mut changed,
            |e, v| {
                if let Some(k) = e.kcb.as_mut() {
                    k.end = v;
                }
            },
        );
    }
    ui.label(RichText::new("Height, roots and depletion (FAO-56 Tables 12 and 22)").strong());
    num(
        ui,
        key("height"),
        "Maximum crop height h",
        c.max_height_m,
        &b::HEIGHT,
        2,
        c,
        &mut changed,
        |e, v| e.max_height_m = v,
    );
    num(
        ui,
        key("root_min"),
        "Rooting depth, shallow end",
        c.root_depth_min_m,
        &b::ROOT,
        2,
        c,
        &mut changed,
        |e, v| e.root_depth_min_m = v,
    );
    num(
        ui,
        key("root_max"),
        "Rooting depth, deep end",
        c.root_depth_max_m,
        &b::ROOT,
        2,
        c,
        &mut changed,
        |e, v| e.root_depth_max_m = v,
    );
    num(
        ui,
        key("p"),
        "Depletion fraction p",
        c.depletion_p,
        &b::P,
        2,
        c,
        &mut changed,
        |e, v| e.depletion_p = v,
    );
    ui.label(RichText::new("Yield response and salinity (FAO-33, FAO-56 Tables 23-24)").strong());
    let mut has_ky = c.ky_seasonal.is_some();
    if ui.checkbox(&mut has_ky, "Seasonal Ky known").changed() {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.ky_seasonal = has_ky.then_some(1.0);
        changed = Some(e);
    }
    if let Some(ky) = c.ky_seasonal {
        num(
            ui,
            key("ky"),
            "Seasonal Ky",
            ky,
            &b::KY,
            2,
            c,
            &mut changed,
            |e, v| e.ky_seasonal = Some(v),
        );
    }
    let mut has_sal = c.salinity.is_some();
    if ui
        .checkbox(&mut has_sal, "Salinity tolerance known")
        .changed()
    {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.salinity = has_sal.then_some(offtake_core::crop::SalinityTolerance {
            ece_threshold_ds_m: 1.0,
            slope_b_pct_per_ds_m: 10.0,
        });
        changed = Some(e);
    }
    if let Some(sal) = c.salinity {
        num(
            ui,
            key("ece"),
            "ECe threshold",
            sal.ece_threshold_ds_m,
            &b::ECE,
            1,
            c,
            &mut changed,
            |e, v| {
                if let Some(s) = e.salinity.as_mut() {
                    s.ece_threshold_ds_m = v;
                }
            },
        );
        num(
            ui,
            key("slope"),
            "Yield decline b",
            sal.slope_b_pct_per_ds_m,
            &b::SLOPE,
            1,
            c,
            &mut changed,
            |e, v| {
                if let Some(s) = e.salinity.as_mut() {
                    s.slope_b_pct_per_ds_m = v;
                }
            },
        );
    }
    ui.label(RichText::new("Cycle").strong());
    let kind = match c.cycle {
        CycleKind::Repeated { .. } => 1,
        CycleKind::Yearly { .. } => 2,
        _ => 0,
    };
    let mut picked = kind;
    egui::ComboBox::from_label("Cycle kind")
        .selected_text(["Annual", "Repeated cycles", "Yearly (orchard, vine)"][picked])
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut picked, 0, "Annual");
            ui.selectable_value(&mut picked, 1, "Repeated cycles");
            ui.selectable_value(&mut picked, 2, "Yearly (orchard, vine)");
        });
    if picked != kind {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.cycle = match picked {
            1 => CycleKind::Repeated { later: c.stages },
            2 => CycleKind::Yearly {
                off_season_kc: c.kc.end,
                off_season_kcb: c.kcb.map_or(c.kc.end, |k| k.end),
            },
            _ => CycleKind::Annual,
        };
        changed = Some(e);
    }
    match c.cycle {
        CycleKind::Repeated { later } => {
            let set = |e: &mut Crop, f: &dyn Fn(&mut StageLengths)| {
                if let CycleKind::Repeated { later } = &mut e.cycle {
                    f(later);
                }
            };
            num(
                ui,
                key("later_ini"),
                "Later cycles: initial",
                f64::from(later.ini_days),
                &b::STAGE,
                0,
                c,
                &mut changed,
                |e, v| set(e, &|l| l.ini_days = to_days(v)),
            );
            num(
                ui,
                key("later_dev"),
                "Later cycles: development",
                f64::from(later.dev_days),
                &b::STAGE,
                0,
                c,
                &mut changed,
                |e, v| set(e, &|l| l.dev_days = to_days(v)),
            );
            num(
                ui,
                key("later_mid"),
                "Later cycles: mid-season",
                f64::from(later.mid_days),
                &b::STAGE,
                0,
                c,
                &mut changed,
                |e, v| set(e, &|l| l.mid_days = to_days(v)),
            );
            num(
                ui,
                key("later_late"),
                "Later cycles: late season",
                f64::from(later.late_days),
                &b::STAGE,
                0,
                c,
                &mut changed,
                |e, v| set(e, &|l| l.late_days = to_days(v)),
            );
        }
        CycleKind::Yearly {
            off_season_kc,
            off_season_kcb,
        } => {
            num(
                ui,
                key("off_kc"),
                "Off-season Kc",
                off_season_kc,
                &b::KC,
                3,
                c,
                &mut changed,
                |e, v| {
                    if let CycleKind::Yearly { off_season_kc, .. } = &mut e.cycle {
                        *off_season_kc = v;
                    }
                },
            );
            num(
                ui,
                key("off_kcb"),
                "Off-season Kcb",
                off_season_kcb,
                &b::KC,
                3,
                c,
                &mut changed,
                |e, v| {
                    if let CycleKind::Yearly { off_season_kcb, .. } = &mut e.cycle {
                        *off_season_kcb = v;
                    }
                },
            );
        }
        _ => {}
    }
    if let Some(note) = name_field(ui, key("kc_note"), "Source note", &c.sources.kc.note).committed
    {
        let mut e = changed.clone().unwrap_or_else(|| c.clone());
        e.sources.kc.note = note;
        changed = Some(e);
    }
    match c.validate() {
        Ok(()) => {
            ui.label(RichText::new("Crop values are consistent.").weak());
        }
        Err(e) => {
            ui.label(
                RichText::new(format!("This crop is not usable yet: {e}"))
                    .color(ui.visuals().error_fg_color),
            );
        }
    }
    changed
}

/// The form of an own soil; returns the edited soil when a field was committed.
fn soil_form(ui: &mut Ui, s: &Soil) -> Option<Soil> {
    use soil_bounds as b;
    let mut changed: Option<Soil> = None;
    let key = |f: &str| Id::unique(("library-soil", s.id.as_str(), f.to_owned()));
    ui.label(RichText::new(format!("My soil {}", s.id)).strong());
    if let Some(name) = name_field(ui, key("name"), "Soil name", &s.name).committed {
        let mut e = s.clone();
        e.name = name;
        changed = Some(e);
    }
    ui.label(RichText::new("Soil water (FAO-56 Table 19)").strong());
    num(
        ui,
        key("fc"),
        "Field capacity θFC",
        s.theta_fc,
        &b::THETA,
        3,
        s,
        &mut changed,
        |e, v| e.theta_fc = v,
    );
    ui.label(
        RichText::new(format!(
            "FAO-56 Table 19 range {}–{} m³/m³",
            format_number(s.theta_fc_range.lo, 2),
            format_number(s.theta_fc_range.hi, 2)
        ))
        .weak(),
    );
    num(
        ui,
        key("wp"),
        "Wilting point θWP",
        s.theta_wp,
        &b::THETA,
        3,
        s,
        &mut changed,
        |e, v| e.theta_wp = v,
    );
    ui.label(
        RichText::new(format!(
            "FAO-56 Table 19 range {}–{} m³/m³",
            format_number(s.theta_wp_range.lo, 2),
            format_number(s.theta_wp_range.hi, 2)
        ))
        .weak(),
    );
    ui.label(format!(
        "TAW per metre of root zone: {} mm/m (FAO-56 eq. 82)",
        format_number(s.taw_per_m_mm(), 0)
    ));
    num(
        ui,
        key("rew"),
        "Readily evaporable water REW",
        s.rew_mm,
        &b::REW,
        1,
        s,
        &mut changed,
        |e, v| e.rew_mm = v,
    );
    num(
        ui,
        key("ze"),
        "Evaporation layer depth Ze",
        s.evaporation_layer_m,
        &b::ZE,
        2,
        s,
        &mut changed,
        |e, v| e.evaporation_layer_m = v,
    );
    if let Ok(tew) = s.tew_mm() {
        ui.label(format!("TEW: {} mm (FAO-56 eq. 73)", format_number(tew, 1)));
    }
    ui.label(RichText::new("Infiltration and runoff (USDA-SCS)").strong());
    num(
        ui,
        key("infil"),
        "Maximum infiltration rate",
        s.max_infiltration_mm_day,
        &b::INFIL,
        0,
        s,
        &mut changed,
        |e, v| e.max_infiltration_mm_day = v,
    );
    let mut group = s.hydrologic_group;
    egui::ComboBox::from_label("Hydrologic soil group")
        .selected_text(format!("{group:?}"))
        .show_ui(ui, |ui| {
            for g in [
                HydrologicSoilGroup::A,
                HydrologicSoilGroup::B,
                HydrologicSoilGroup::C,
                HydrologicSoilGroup::D,
            ] {
                ui.selectable_value(&mut group, g, format!("{g:?}"));
            }
        });
    if group != s.hydrologic_group {
        let mut e = changed.clone().unwrap_or_else(|| s.clone());
        e.hydrologic_group = group;
        changed = Some(e);
    }
    num(
        ui,
        key("cn"),
        "Curve number CN II",
        s.curve_number,
        &b::CN,
        0,
        s,
        &mut changed,
        |e, v| e.curve_number = v,
    );
    match s.validate() {
        Ok(()) => {
            ui.label(RichText::new("Soil values are consistent.").weak());
        }
        Err(e) => {
            ui.label(
                RichText::new(format!("This soil is not usable yet: {e}"))
                    .color(ui.visuals().error_fg_color),
            );
        }
    }
    changed
}

/// Stage shading colours (initial, development, mid-season, late season).
const STAGE_FILL: [Color32; 4] = [
    Color32::from_rgba_unmultiplied_const(90, 140, 200, 36),
    Color32::from_rgba_unmultiplied_const(90, 180, 110, 36),
    Color32::from_rgba_unmultiplied_const(210, 180, 60, 36),
    Color32::from_rgba_unmultiplied_const(200, 110, 80, 36),
];

/// Draws the Kc curve of `crop` with its stages shaded; returns the points drawn.
fn kc_plot(ui: &mut Ui, crop: &Crop) -> Vec<[f64; 2]> {
    let (points, ends) = match kc_curve_points(crop) {
        Ok(x) => x,
        Err(e) => {
            ui.label(RichText::new(format!("No Kc curve: {e}")).color(ui.visuals().error_fg_color));
            return Vec::new();
        }
    };
    ui.label(
        RichText::new("Kc by FAO-56 eq. 66 from the values above, before the climate adjustment (eq. 62, 65).")
            .weak(),
    );
    let top = points.iter().map(|p| p[1]).fold(1.2_f64, f64::max) + 0.1;
    let mut start = 0.0;
    let drawn = points.clone();
    let colour = if ui.visuals().dark_mode {
        Color32::from_gray(235)
    } else {
        Color32::from_gray(20)
    };
    Plot::new(("library-kc", crop.id.as_str()))
        .height(260.0)
        .legend(Legend::default().position(egui_plot::Corner::RightBottom))
        .x_axis_label("Days after planting (d)")
        .y_axis_label("Kc (–)")
        .include_y(0.0)
        .include_y(top)
        .show(ui, |plot| {
            for ((end, name), fill) in ends
                .iter()
                .zip(["initial", "development", "mid-season", "late season"])
                .zip(STAGE_FILL)
            {
                let e = f64::from(*end);
                // Unnamed: the shading stays out of the legend; the stage
                // is written on it instead.
                plot.polygon(
                    Polygon::new("", vec![[start, 0.0], [e, 0.0], [e, top], [start, top]])
                        .fill_color(fill)
                        .stroke(egui::Stroke::NONE),
                );
                plot.text(Text::new(
                    "",
                    PlotPoint::new(0.5 * (start + e), top - 0.05),
                    RichText::new(name).small(),
                ));
                start = e;
            }
            plot.line(
                Line::new(format!("Kc, {}", crop.name), points)
                    .color(colour)
                    .width(2.0),
            );
        });
    drawn
}

#[cfg(test)]
mod tests {
    use super::{
        copy_crop, copy_soil, kc_curve_points, original_crop, plantings_growing,
        use_for_all_plantings,
    };
    use offtake_core::project::Project;
    use offtake_io::library::Libraries;

    #[test]
    fn copies_get_fresh_ids_and_keep_the_values() {
        let libs = Libraries::builtin().expect("built-in libraries");
        let maize = libs.crop("maize-grain").expect("maize in the library");
        let mut project = Project::default();
        let first = copy_crop(maize, &project, &libs);
        assert_eq!(first.id, "maize-grain-mine");
        assert_eq!(first.kc, maize.kc);
        assert_eq!(first.stages, maize.stages);
        project.user_crops.push(first);
        let second = copy_crop(maize, &project, &libs);
        assert_eq!(second.id, "maize-grain-mine-2");
        let soil = &libs.soils[0];
        let s = copy_soil(soil, &project, &libs);
        assert_eq!(s.id, format!("{}-mine", soil.id));
        assert!((s.theta_fc - soil.theta_fc).abs() < f64::EPSILON);
    }

    #[test]
    fn a_copy_knows_its_original_and_replaces_it_on_every_planting() {
        use crate::edit::{DocEdit, new_block, new_canal, new_planting};
        use crate::history::Edit;
        let libs = Libraries::builtin().expect("built-in libraries");
        let maize = libs.crop("maize-grain").expect("maize in the library");
        let mut project = Project::default();
        let canal = new_canal(&project, None);
        project.canals.push(canal.clone());
        let block = new_block(&project, &canal.id);
        project.blocks.push(block.clone());
        for crop in ["maize-grain", "cotton", "maize-grain"] {
            let mut p = new_planting(&project, &block.id);
            p.crop = crop.to_owned();
            project.plantings.push(p);
        }
        let first = copy_crop(maize, &project, &libs);
        project.user_crops.push(first.clone());
        let second = copy_crop(maize, &project, &libs);
        assert_eq!(original_crop(&first, &libs).map(|c| &c.id), Some(&maize.id));
        assert_eq!(
            original_crop(&second, &libs).map(|c| &c.id),
            Some(&maize.id)
        );
        let mut other = first.clone();
        other.id = "maize-grain-mineral".into();
        assert!(original_crop(&other, &libs).is_none());
        other.id = "my-own-crop".into();
        assert!(original_crop(&other, &libs).is_none());

        let before = project.clone();
        let ids = plantings_growing(&project, "maize-grain");
        assert_eq!(ids.len(), 2);
        let edit = use_for_all_plantings(&project, "maize-grain", &first.id).expect("two");
        assert!(matches!(&edit, DocEdit::SetPlantingCrops(p) if p.len() == 2));
        let inverse = edit.apply(&mut project).expect("applies");
        assert!(plantings_growing(&project, "maize-grain").is_empty());
        assert_eq!(plantings_growing(&project, &first.id).len(), 2);
        assert_eq!(plantings_growing(&project, "cotton").len(), 1);
        inverse.apply(&mut project).expect("undo");
        assert_eq!(project, before);
        assert!(use_for_all_plantings(&project, "wheat", &first.id).is_none());
    }

    #[test]
    fn the_curve_runs_from_kc_ini_at_planting_to_kc_end_at_harvest() {
        let libs = Libraries::builtin().expect("built-in libraries");
        let maize = libs.crop("maize-grain").expect("maize in the library");
        let (points, ends) = kc_curve_points(maize).expect("valid crop");
        let total = maize.stages.total_days();
        assert_eq!(ends[3], total);
        assert_eq!(points.len(), total as usize + 1);
        assert!((points[0][1] - maize.kc.ini).abs() < 1e-12);
        assert!((points[total as usize][1] - maize.kc.end).abs() < 1e-12);
        let mut bad = maize.clone();
        bad.kc.mid = 3.0;
        assert!(kc_curve_points(&bad).is_err());
    }
}
