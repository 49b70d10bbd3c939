//! The canal inspector's section fields (bed slope, lining, shape, side
//! slope, length, seepage), with units and inline validation; each edit is
//! an undoable `SetCanal`.

use egui::{RichText, Ui};
use offtake_core::project::Canal;

use crate::command::Command;
use crate::fields::number_field;
use crate::inspector::{bounds, fid, set_canal};

/// The canal's section fields: bed slope, lining, shape, side slope,
/// length, seepage rate and whether seepage replaces Ec.
pub fn section_ui(ui: &mut Ui, c: &Canal, commands: &mut Vec<Command>) {
    use offtake_core::section::{LININGS, Shape};
    ui.separator();
    ui.label(RichText::new("Section").strong());
    let spec = &c.section;
    let mut has_slope = spec.bed_slope.is_some();
    if ui
        .checkbox(&mut has_slope, "Design a section (bed slope known)")
        .changed()
    {
        let mut n = c.clone();
        n.section.bed_slope = has_slope.then_some(0.0002);
        commands.push(set_canal(n));
    }
    let Some(slope) = spec.bed_slope else {
        ui.label(RichText::new("Without a bed slope no section is designed.").weak());
        return;
    };
    if let Some(v) = number_field(
        ui,
        fid(&c.id, "bed-slope"),
        "Bed slope",
        slope,
        &bounds::BED_SLOPE,
        7,
    )
    .committed
    {
        let mut n = c.clone();
        n.section.bed_slope = Some(v);
        commands.push(set_canal(n));
    }
    let lining = spec.lining_or_default();
    let mut chosen = lining;
    egui::ComboBox::from_label("Lining or soil")
        .selected_text(lining.label())
        .show_ui(ui, |ui| {
            for l in LININGS {
                ui.selectable_value(&mut chosen, l, l.label());
            }
        });
    if chosen != lining {
        let mut n = c.clone();
        n.section.lining = Some(chosen);
        commands.push(set_canal(n));
    }
    ui.label(
        RichText::new(format!(
            "Manning n {} (Chow 1959 Table 5-6 / Fortier and Scobey 1926, from memory)",
            crate::fields::format_number(spec.manning_n_or_default(), 3)
        ))
        .weak(),
    );
    let shape = spec.shape.unwrap_or_default();
    let mut chosen_shape = shape;
    egui::ComboBox::from_label("Shape")
        .selected_text(shape.as_str())
        .show_ui(ui, |ui| {
            for s in [Shape::Trapezoidal, Shape::Rectangular, Shape::Triangular] {
                ui.selectable_value(&mut chosen_shape, s, s.as_str());
            }
        });
    if chosen_shape != shape {
        let mut n = c.clone();
        n.section.shape = Some(chosen_shape);
        commands.push(set_canal(n));
    }
    if shape != Shape::Rectangular {
        let z = spec
            .side_slope_h_per_v
            .unwrap_or_else(|| lining.side_slope_h_per_v());
        if let Some(v) = number_field(
            ui,
            fid(&c.id, "side-slope"),
            "Side slope",
            z,
            &bounds::SIDE_SLOPE,
            2,
        )
        .committed
        {
            let mut n = c.clone();
            n.section.side_slope_h_per_v = Some(v);
            commands.push(set_canal(n));
        }
    }
    let length = spec.length_m.unwrap_or(0.0);
    if let Some(v) = number_field(
        ui,
        fid(&c.id, "length"),
        "Length",
        length,
        &bounds::LENGTH,
        0,
    )
    .committed
    {
        let mut n = c.clone();
        n.section.length_m = Some(v);
        commands.push(set_canal(n));
    }
    let rate = spec.seepage_m3_m2_day.unwrap_or(0.0);
    if let Some(v) = number_field(
        ui,
        fid(&c.id, "seepage"),
        "Seepage rate",
        rate,
        &bounds::SEEPAGE,
        3,
    )
    .committed
    {
        let mut n = c.clone();
        n.section.seepage_m3_m2_day = Some(v);
        commands.push(set_canal(n));
    }
    let mut replaces = spec.seepage_replaces_ec;
    if ui
        .checkbox(&mut replaces, "Seepage replaces the fixed Ec")
        .changed()
    {
        let mut n = c.clone();
        n.section.seepage_replaces_ec = replaces;
        commands.push(set_canal(n));
    }
    if spec.existing.is_some() {
        ui.label(
            RichText::new(
                "Existing section given in the project file: its Manning capacity is used.",
            )
            .weak(),
        );
    }
}
