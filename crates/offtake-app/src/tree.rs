//! The left panel: the scheme tree (scheme → canals → blocks → plantings)
//! above the libraries and weather series.
//!
//! Click selects; the right-click menu of each item adds children, moves
//! (re-parents) and deletes, all as undoable edits.

use egui::{RichText, Ui};
use offtake_core::project::{Canal, Project};
use offtake_io::library::Libraries;

use crate::command::{Command, ItemRef, Selection};
use crate::edit::{self, DocEdit};
use crate::fields::format_number;

/// Draws the left panel.
pub fn ui(
    ui: &mut Ui,
    doc: Option<&Project>,
    libraries: &Libraries,
    selection: &Selection,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Scheme").strong());
    let Some(doc) = doc else {
        ui.label("No project open.");
        ui.label("File › New starts a scheme; File › Open… opens one.");
        return;
    };
    let name = if doc.scheme.name.trim().is_empty() {
        "(unnamed scheme)"
    } else {
        doc.scheme.name.as_str()
    };
    let r = ui.selectable_label(*selection == Selection::Scheme, name);
    if r.clicked() {
        commands.push(Command::Select(Selection::Scheme));
    }
    r.context_menu(|ui| {
        if ui.button("Add main canal").clicked() {
            let c = edit::new_canal(doc, None);
            commands.push(Command::Select(Selection::Item(ItemRef::Canal(
                c.id.clone(),
            ))));
            commands.push(Command::Edit(edit::add_canal(c)));
        }
    });
    ui.indent("scheme-children", |ui| {
        let roots = doc.root_canals();
        if roots.is_empty() {
            ui.label("No canals yet — right-click the scheme or use Add main canal.");
        }
        for canal in roots {
            canal_node(ui, doc, libraries, canal, selection, commands, 0);
        }
        if ui.button("Add main canal").clicked() {
            let c = edit::new_canal(doc, None);
            commands.push(Command::Select(Selection::Item(ItemRef::Canal(
                c.id.clone(),
            ))));
            commands.push(Command::Edit(edit::add_canal(c)));
        }
    });
    ui.separator();
    ui.label(RichText::new("Libraries").strong());
    ui.label(format!(
        "Built-in FAO-56 crops and soils; this project's own: {} crop(s), {} soil(s).",
        doc.user_crops.len(),
        doc.user_soils.len()
    ));
    ui.horizontal(|ui| {
        if ui.button("Crops…").clicked() {
            commands.push(Command::ShowLibrary(
                crate::library_editor::LibraryKind::Crops,
            ));
        }
        if ui.button("Soils…").clicked() {
            commands.push(Command::ShowLibrary(
                crate::library_editor::LibraryKind::Soils,
            ));
        }
    });
    ui.separator();
    ui.label(RichText::new("Weather").strong());
    let weather_text = if doc.weather.path.trim().is_empty() {
        "No weather yet — File › Import weather…".to_owned()
    } else {
        doc.weather.path.clone()
    };
    if ui
        .selectable_label(*selection == Selection::Weather, weather_text)
        .clicked()
    {
        commands.push(Command::Select(Selection::Weather));
    }
    if ui
        .selectable_label(*selection == Selection::Options, "Computation options")
        .clicked()
    {
        commands.push(Command::Select(Selection::Options));
    }
}

/// Maximum depth drawn (the tree helpers are cycle-safe; this guards drawing).
const MAX_DEPTH: usize = 16;

fn canal_node(
    ui: &mut Ui,
    doc: &Project,
    libraries: &Libraries,
    canal: &Canal,
    selection: &Selection,
    commands: &mut Vec<Command>,
    depth: usize,
) {
    let me = Selection::Item(ItemRef::Canal(canal.id.clone()));
    let r = ui.selectable_label(
        *selection == me,
        format!("{} ({})", canal.name, canal.kind.label()),
    );
    if r.clicked() {
        commands.push(Command::Select(me.clone()));
    }
    r.context_menu(|ui| {
        if ui.button("Add canal below").clicked() {
            let c = edit::new_canal(doc, Some(&canal.id));
            commands.push(Command::Select(Selection::Item(ItemRef::Canal(
                c.id.clone(),
            ))));
            commands.push(Command::Edit(edit::add_canal(c)));
        }
        if ui.button("Add block").clicked() {
            let b = edit::new_block(doc, &canal.id);
            commands.push(Command::Select(Selection::Item(ItemRef::Block(
                b.id.clone(),
            ))));
            commands.push(Command::Edit(edit::add_block(b)));
        }
        ui.menu_button("Move to", |ui| {
            let below = doc.canals_below(&canal.id);
            if canal.parent.is_some() && ui.button("Headworks").clicked() {
                let mut moved = canal.clone();
                moved.parent = None;
                commands.push(set_canal(moved));
            }
            for target in doc
                .canals
                .iter()
                .filter(|t| !below.contains(&t.id.as_str()))
            {
                if canal.parent.as_deref() != Some(&target.id) && ui.button(&target.name).clicked()
                {
                    let mut moved = canal.clone();
                    moved.parent = Some(target.id.clone());
                    commands.push(set_canal(moved));
                }
            }
        });
        if ui.button("Delete").clicked() {
            commands.push(Command::Edit(DocEdit::Remove(ItemRef::Canal(
                canal.id.clone(),
            ))));
        }
    });
    if depth >= MAX_DEPTH {
        return;
    }
    ui.indent(("canal", &canal.id), |ui| {
        for child in doc.child_canals(&canal.id) {
            canal_node(ui, doc, libraries, child, selection, commands, depth + 1);
        }
        for block in doc.blocks_on(&canal.id) {
            let me = Selection::Item(ItemRef::Block(block.id.clone()));
            let r = ui.selectable_label(
                *selection == me,
                format!("{} — {} ha", block.name, format_number(block.area_ha, 1)),
            );
            if r.clicked() {
                commands.push(Command::Select(me.clone()));
            }
            r.context_menu(|ui| {
                if ui.button("Add planting").clicked() {
                    let p = edit::new_planting(doc, &block.id);
                    commands.push(Command::Select(Selection::Item(ItemRef::Planting(
                        p.id.clone(),
                    ))));
                    commands.push(Command::Edit(edit::add_planting(p)));
                }
                ui.menu_button("Move to", |ui| {
                    for target in doc.canals.iter().filter(|t| t.id != block.canal) {
                        if ui.button(&target.name).clicked() {
                            let mut moved = block.clone();
                            moved.canal.clone_from(&target.id);
                            commands.push(Command::Edit(DocEdit::SetBlock {
                                id: moved.id.clone(),
                                block: Box::new(moved),
                            }));
                        }
                    }
                });
                if ui.button("Delete").clicked() {
                    commands.push(Command::Edit(DocEdit::Remove(ItemRef::Block(
                        block.id.clone(),
                    ))));
                }
            });
            ui.indent(("block", &block.id), |ui| {
                for p in doc.plantings.iter().filter(|p| p.block == block.id) {
                    planting_node(ui, doc, libraries, p, selection, commands);
                }
            });
        }
    });
}

fn planting_node(
    ui: &mut Ui,
    doc: &Project,
    libraries: &Libraries,
    p: &offtake_core::project::Planting,
    selection: &Selection,
    commands: &mut Vec<Command>,
) {
    let me = Selection::Item(ItemRef::Planting(p.id.clone()));
    let crop = if p.crop.is_empty() {
        "(no crop)"
    } else {
        libraries.crop_name(&p.crop)
    };
    let area = doc
        .planting_area_ha(p)
        .map_or_else(String::new, |ha| format!(" — {} ha", format_number(ha, 1)));
    let r = ui.selectable_label(
        *selection == me,
        format!(
            "{crop}{area}, from {:02}-{:02}",
            p.first_planting.month, p.first_planting.day
        ),
    );
    if r.clicked() {
        commands.push(Command::Select(me));
    }
    r.context_menu(|ui| {
        ui.menu_button("Move to", |ui| {
            for target in doc.blocks.iter().filter(|b| b.id != p.block) {
                if ui.button(&target.name).clicked() {
                    let mut moved = p.clone();
                    moved.block.clone_from(&target.id);
                    commands.push(Command::Edit(DocEdit::SetPlanting {
                        id: moved.id.clone(),
                        planting: Box::new(moved),
                    }));
                }
            }
        });
        if ui.button("Delete").clicked() {
            commands.push(Command::Edit(DocEdit::Remove(ItemRef::Planting(
                p.id.clone(),
            ))));
        }
    });
}

fn set_canal(canal: Canal) -> Command {
    Command::Edit(DocEdit::SetCanal {
        id: canal.id.clone(),
        canal: Box::new(canal),
    })
}

/// The path of the selection for the breadcrumb: Scheme › Canal › … › Block › Planting.
pub fn breadcrumb(doc: &Project, selection: &Selection) -> Vec<String> {
    let scheme = if doc.scheme.name.trim().is_empty() {
        "Scheme".to_owned()
    } else {
        doc.scheme.name.clone()
    };
    let mut out = vec![scheme];
    let canal_path = |canal_id: &str| -> Vec<String> {
        doc.path_to_headworks(canal_id)
            .map(|path| path.iter().rev().map(|c| c.name.clone()).collect())
            .unwrap_or_default()
    };
    match selection {
        Selection::None | Selection::Scheme => {}
        Selection::Weather => out.push("Weather".to_owned()),
        Selection::Options => out.push("Options".to_owned()),
        Selection::Item(ItemRef::Canal(id)) => out.extend(canal_path(id)),
        Selection::Item(ItemRef::Block(id)) => {
            if let Some(b) = doc.block(id) {
                out.extend(canal_path(&b.canal));
                out.push(b.name.clone());
            }
        }
        Selection::Item(ItemRef::Planting(id)) => {
            if let Some(p) = doc.planting(id) {
                if let Some(b) = doc.block(&p.block) {
                    out.extend(canal_path(&b.canal));
                    out.push(b.name.clone());
                }
                out.push(if p.crop.is_empty() {
                    "(no crop)".to_owned()
                } else {
                    p.crop.clone()
                });
            }
        }
    }
    out
}
