//! The Crop curves tab: Kc curves of the plantings under the selection,
//! from the crop library (FAO-56 eq. 66), stage ends marked.

use egui::{RichText, Ui};
use egui_plot::LineStyle;

use super::{View, empty_state, no_project};
use crate::command::{Command, ItemRef, Selection};

use crate::plot::{self, PlotSpec, Series, SeriesKind, XAxis};

/// Shades of the four growth stages (light to dark grey-blue, distinguishable
/// without colour vision by lightness).
const STAGE_COLOURS: [egui::Color32; 4] = [
    egui::Color32::from_rgb(200, 215, 230),
    egui::Color32::from_rgb(150, 180, 210),
    egui::Color32::from_rgb(90, 140, 190),
    egui::Color32::from_rgb(150, 180, 210),
];

/// View state of the Crop curves tab.
#[derive(Debug, Default)]
pub struct CropCurvesTab {}

/// Ids of the plantings under the selection (all of them for the scheme).
fn plantings_under(view: &View<'_>) -> Vec<String> {
    let Some(p) = view.project else {
        return Vec::new();
    };
    let on_blocks = |blocks: &[String]| -> Vec<String> {
        p.plantings
            .iter()
            .filter(|x| blocks.contains(&x.block))
            .map(|x| x.id.clone())
            .collect()
    };
    match view.selection {
        Selection::Item(ItemRef::Planting(id)) => vec![id.clone()],
        Selection::Item(ItemRef::Block(id)) => on_blocks(std::slice::from_ref(id)),
        Selection::Item(ItemRef::Canal(id)) => {
            let canals = p.canals_below(id);
            let blocks: Vec<String> = p
                .blocks
                .iter()
                .filter(|b| canals.contains(&b.canal.as_str()))
                .map(|b| b.id.clone())
                .collect();
            on_blocks(&blocks)
        }
        _ => p.plantings.iter().map(|x| x.id.clone()).collect(),
    }
}

impl CropCurvesTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        if !view.project_open {
            no_project(
                ui,
                "This tab shows the Kc curve of each selected planting, growth stages marked.",
            );
            return;
        }
        let Some(computed) = view.computed else {
            empty_state(
                ui,
                "Computing…",
                "The Kc curves appear when the computation finishes.",
            );
            return;
        };
        let wanted = plantings_under(view);
        let curves: Vec<_> = computed
            .kc_curves
            .iter()
            .filter(|c| c.plantings.iter().any(|p| wanted.contains(p)))
            .collect();
        if curves.is_empty() {
            empty_state(
                ui,
                "No plantings with a library crop here",
                "Add a planting (right-click a block › Add planting) and pick its crop in the inspector.",
            );
            return;
        }
        ui.label(
            RichText::new(
                "Solid: Kc from the crop library (FAO-56 Table 12, stage lengths Table 11) by FAO-56 eq. 66, \
                 before the climate adjustment. Dashed: the selected planting's Kc in one season, with Kc mid \
                 and Kc end adjusted for wind and RHmin (eq. 62, 65) — choose the season below.",
            )
            .weak(),
        );
        if view.computed.is_some_and(|c| c.engine.is_some()) {
            let _ = super::season_with_picker(ui, view, commands);
        }
        let mut series = Vec::new();
        let colours = super::crop_colours(view.project, curves.iter().map(|c| c.crop.as_str()));
        for c in &curves {
            let name = format!("{} ({} d)", c.crop_name, c.season_days);
            let points =
                c.kc.iter()
                    .enumerate()
                    .map(|(i, kc)| [(i + 1) as f64, *kc])
                    .collect();
            series.push(Series::line(name, points, colours.of(&c.crop)));
        }
        // The climate-adjusted Kc of the season the worker computed for the
        // selected planting (FAO-56 eq. 62 and 65 in the planting's balance),
        // area-weighted over its cohorts, on the same days-after-planting axis.
        let season = computed
            .season
            .as_ref()
            .and_then(|s| s.as_ref().ok())
            .filter(|s| wanted.contains(&s.request.planting));
        if let Some(s) = season {
            let points = s
                .days
                .iter()
                .enumerate()
                .map(|(i, d)| [(i + 1) as f64, d.kc])
                .collect();
            series.push(Series {
                name: format!(
                    "{} adjusted Kc, season {} (area-weighted over cohorts, 0 before planting)",
                    s.request.planting, s.year
                ),
                points,
                colour: egui::Color32::from_gray(210),
                style: LineStyle::Dashed { length: 6.0 },
                kind: SeriesKind::Line,
            });
        }
        if let [only] = curves[..] {
            let top = only.kc.iter().copied().fold(0.0_f64, f64::max) * 1.15 + 0.05;
            let mut start = 0.0;
            for (i, (end, stage)) in only
                .stage_ends
                .iter()
                .zip(["Initial", "Development", "Mid-season", "Late season"])
                .enumerate()
            {
                let end = f64::from(*end) + 0.5;
                series.insert(
                    i,
                    Series {
                        name: format!("{stage} stage"),
                        points: vec![[start, top], [end, 0.0]],
                        colour: STAGE_COLOURS[i],
                        style: LineStyle::Solid,
                        kind: SeriesKind::Spans,
                    },
                );
                start = end;
            }
        }
        let spec = PlotSpec {
            id: "kc-curves".to_owned(),
            x: XAxis::Quantity {
                title: "Days after planting (d)".to_owned(),
                unit: "d".to_owned(),
            },
            y_title: "Kc (–)".to_owned(),
            y_unit: String::new(),
            series,
        };
        plot::show(ui, &spec, commands);
    }
}
