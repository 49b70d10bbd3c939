//! The selected canal's section drawn to scale in the Canal capacity tab:
//! bed, side slopes, water level and freeboard with their dimensions, and
//! the section's checks (pass or fail with the limit and its source).
//! The section comes from the results (`Results::sections`); this view only
//! draws it.

use std::fmt::Write as _;

use egui::{Align2, Color32, FontId, Pos2, RichText, Sense, Stroke, Ui, pos2, vec2};
use offtake_core::engine::Results;
use offtake_core::section::SectionResult;
use offtake_core::section::canal::CanalSectionRow;

use crate::fields::format_number;
use crate::palette::OKABE_ITO;

/// Caution shown beside the drawing.
pub const SECTION_CAUTION: &str = "Section sizes are preliminary: structures, transitions, sediment, survey and local codes decide the final design, which a qualified engineer must check.";

/// Draws the section of canal `canal_id`, or says why there is none.
pub fn show(ui: &mut Ui, r: &Results, canal_id: &str) {
    let Some(row) = r.sections.iter().find(|s| s.node == canal_id) else {
        ui.label("No section: select a canal.");
        return;
    };
    ui.label(RichText::new(SECTION_CAUTION).color(ui.visuals().warn_fg_color));
    let Some(s) = &row.section else {
        ui.label(format!(
            "No section for this canal: {}. Give the canal a bed slope in the inspector (Section).",
            if row.note.is_empty() {
                "not designed"
            } else {
                &row.note
            }
        ));
        return;
    };
    ui.label(summary(row, s));
    let height = 220.0_f32.min(ui.available_height().max(160.0));
    let (response, painter) = ui.allocate_painter(
        vec2(ui.available_width().min(720.0), height),
        Sense::hover(),
    );
    let rect = response.rect;
    let text = ui.visuals().text_color();
    let b = s.prism.bed_width_m;
    let z = s.prism.side_slope_h_per_v;
    let y = s.water_depth_m;
    let h = y + s.freeboard_m;
    let bank_w = b + 2.0 * z * h;
    let margin = 60.0_f32;
    #[expect(
        clippy::cast_possible_truncation,
        reason = "screen coordinates fit f32"
    )]
    let px = |v: f64| v as f32;
    let scale = px((f64::from(rect.width() - 2.0 * margin) / bank_w.max(1e-6))
        .min(f64::from(rect.height() - 2.0 * margin) / h.max(1e-6)));
    let x0 = rect.center().x - 0.5 * scale * px(bank_w);
    let y0 = rect.center().y + 0.5 * scale * px(h);
    let p = |x: f64, up: f64| -> Pos2 { pos2(x0 + scale * px(x), y0 - scale * px(up)) };
    let bed_l = z * h;
    let bed_r = z * h + b;
    let water = vec![
        p(z * (h - y), y),
        p(bed_l, 0.0),
        p(bed_r, 0.0),
        p(bed_r + z * y, y),
    ];
    painter.add(egui::Shape::convex_polygon(
        water,
        OKABE_ITO[1].gamma_multiply(0.6),
        Stroke::NONE,
    ));
    let outline = [p(0.0, h), p(bed_l, 0.0), p(bed_r, 0.0), p(bank_w, h)];
    let stroke = Stroke::new(2.0, text);
    for w in outline.windows(2) {
        painter.line_segment([w[0], w[1]], stroke);
    }
    painter.line_segment([p(0.0, h), p(-0.15 * bank_w, h)], stroke);
    painter.line_segment([p(bank_w, h), p(1.15 * bank_w, h)], stroke);
    let wl = Stroke::new(1.5, OKABE_ITO[4]);
    painter.line_segment([p(z * (h - y), y), p(bed_r + z * y, y)], wl);
    let font = FontId::proportional(13.0);
    let label = |pos: Pos2, align: Align2, t: String| {
        painter.text(pos, align, t, font.clone(), text);
    };
    label(
        p(0.5 * (bed_l + bed_r), 0.0) + vec2(0.0, 6.0),
        Align2::CENTER_TOP,
        format!("bed width b = {} m", format_number(b, 2)),
    );
    label(
        p(0.5 * bank_w, y) + vec2(0.0, -4.0),
        Align2::CENTER_BOTTOM,
        format!("water surface T = {} m", format_number(s.top_width_m, 2)),
    );
    let dim_x = bed_r + z * h + 0.08 * bank_w;
    let dim = Stroke::new(1.0, text);
    painter.line_segment([p(dim_x, 0.0), p(dim_x, y)], dim);
    painter.line_segment([p(dim_x, y), p(dim_x, h)], Stroke::new(1.0, OKABE_ITO[5]));
    label(
        p(dim_x, 0.5 * y) + vec2(6.0, 0.0),
        Align2::LEFT_CENTER,
        format!("y = {} m", format_number(y, 3)),
    );
    label(
        p(dim_x, y + 0.5 * s.freeboard_m) + vec2(6.0, 0.0),
        Align2::LEFT_CENTER,
        format!("freeboard = {} m", format_number(s.freeboard_m, 2)),
    );
    label(
        p(0.5 * bank_w, h) + vec2(0.0, -4.0),
        Align2::CENTER_BOTTOM,
        format!(
            "bank top width = {} m",
            format_number(s.bank_top_width_m, 2)
        ),
    );
    if z > 0.0 {
        label(
            p(0.5 * bed_l, 0.5 * h) + vec2(-8.0, 0.0),
            Align2::RIGHT_CENTER,
            format!("{}:1 (H:V)", format_number(z, 2)),
        );
    }
    label(
        rect.left_bottom() + vec2(4.0, -4.0),
        Align2::LEFT_BOTTOM,
        "drawn to scale (same scale across and down)".to_owned(),
    );
    checks(ui, s);
    if let Some(p) = &row.proposal {
        ui.label(format!("Nearest section that passes: {p}"));
    }
    if !row.note.is_empty() {
        ui.label(row.note.as_str());
    }
}

fn summary(row: &CanalSectionRow, s: &SectionResult) -> String {
    let mut t = format!(
        "Section ({}, {}) for the required capacity {} l/s: {} {} at slope {}, n = {}; area {} m², wetted perimeter {} m, R = {} m, V = {} m/s, Froude {}",
        row.basis.label(),
        match s.method {
            offtake_core::section::Method::Manning => "normal depth by Manning",
            offtake_core::section::Method::LaceyRegime { .. } => "Lacey regime",
        },
        format_number(row.required_capacity_ls, 1),
        s.prism.shape.as_str(),
        if s.prism.shape.as_str() == "triangular" {
            String::new()
        } else {
            format!("bed {} m", format_number(s.prism.bed_width_m, 2))
        },
        format_number(s.bed_slope, 6),
        format_number(s.manning_n, 4),
        format_number(s.area_m2, 3),
        format_number(s.wetted_perimeter_m, 3),
        format_number(s.hydraulic_radius_m, 3),
        format_number(s.velocity_ms, 3),
        format_number(s.froude, 2),
    );
    if let Some(q) = row.seepage_ls {
        let _ = write!(t, "; seepage {} l/s", format_number(q, 1));
    }
    if let Some(e) = row.seepage_efficiency_season {
        let _ = write!(
            t,
            "; conveyance efficiency from seepage {} % over the record",
            format_number(e * 100.0, 1)
        );
    }
    t
}

fn checks(ui: &mut Ui, s: &SectionResult) {
    egui::Grid::new("section-checks")
        .striped(true)
        .show(ui, |ui| {
            ui.strong("Check");
            ui.strong("Result");
            ui.strong("Value");
            ui.strong("Limit");
            ui.strong("Source");
            ui.end_row();
            for c in &s.checks {
                ui.label(c.kind.as_str().replace('_', " "));
                let (txt, colour) = if c.pass {
                    ("pass", OKABE_ITO[2])
                } else {
                    ("FAIL", Color32::from_rgb(0xD5, 0x5E, 0x00))
                };
                ui.label(RichText::new(txt).color(colour).strong());
                ui.label(format_number(c.value, 4));
                ui.label(format_number(c.limit, 4));
                ui.label(c.source);
                ui.end_row();
            }
        });
}
