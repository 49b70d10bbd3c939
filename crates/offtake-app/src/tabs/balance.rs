//! The Water balance tab: a planting's root-zone depletion with TAW and RAW,
//! rain and irrigation as bars, and the water stress coefficient Ks, for the
//! season starting in a chosen year (FAO-56 ch. 8, eqs. 82–85; area-weighted
//! over the planting's cohorts).

use chrono::Days;
use egui::{RichText, Ui};
use egui_plot::LineStyle;

use super::{View, no_project, season_with_picker};
use crate::command::Command;
use crate::compute::SeasonView;
use crate::fields::format_number;
use crate::palette::OKABE_ITO;
use crate::plot::{self, PlotSpec, Series, SeriesKind, XAxis, date_to_x};

/// View state of the Water balance tab.
#[derive(Debug, Default)]
pub struct WaterBalanceTab {}

/// The depth plot and the Ks plot of one season.
pub fn season_plots(s: &SeasonView) -> (PlotSpec, PlotSpec) {
    let x = |i: usize| date_to_x(s.first_date + Days::new(i as u64));
    let pick = |f: fn(&offtake_core::balance::BalanceDay) -> f64| -> Vec<[f64; 2]> {
        s.days
            .iter()
            .enumerate()
            .map(|(i, d)| [x(i), f(d)])
            .collect()
    };
    let events = |f: fn(&offtake_core::balance::BalanceDay) -> f64| -> Vec<[f64; 2]> {
        s.days
            .iter()
            .enumerate()
            .filter(|(_, d)| f(d) > 0.0)
            .map(|(i, d)| [x(i), f(d)])
            .collect()
    };
    let id = format!("balance-{}-{}", s.request.planting, s.year);
    let depth = PlotSpec {
        id: id.clone(),
        x: XAxis::Date,
        y_title: "Depth (mm)".to_owned(),
        y_unit: "mm".to_owned(),
        series: vec![
            Series {
                name: "Rain (mm)".to_owned(),
                points: events(|d| d.rain_mm),
                colour: OKABE_ITO[1],
                style: LineStyle::Solid,
                kind: SeriesKind::Bars { width: 0.8 },
            },
            Series {
                name: "Net irrigation (mm)".to_owned(),
                points: events(|d| d.irrigation_mm),
                colour: OKABE_ITO[2],
                style: LineStyle::Solid,
                kind: SeriesKind::Bars { width: 0.8 },
            },
            Series {
                name: "TAW, total available water (mm)".to_owned(),
                points: pick(|d| d.taw_mm),
                colour: OKABE_ITO[4],
                style: LineStyle::Dashed { length: 8.0 },
                kind: SeriesKind::Line,
            },
            Series {
                name: "RAW, readily available water (mm)".to_owned(),
                points: pick(|d| d.raw_mm),
                colour: OKABE_ITO[5],
                style: LineStyle::Dotted { spacing: 5.0 },
                kind: SeriesKind::Line,
            },
            Series::line(
                "Root-zone depletion Dr (mm)",
                pick(|d| d.depletion_mm),
                OKABE_ITO[0],
            ),
        ],
    };
    let ks = PlotSpec {
        id: format!("{id}-ks"),
        x: XAxis::Date,
        y_title: "Ks (–)".to_owned(),
        y_unit: String::new(),
        series: vec![
            Series {
                name: "Ks = 1: no water stress".to_owned(),
                points: vec![[0.0, 1.0]],
                colour: egui::Color32::GRAY,
                style: LineStyle::Dotted { spacing: 5.0 },
                kind: SeriesKind::Level,
            },
            Series {
                name: "Ks = 0: wilting point".to_owned(),
                points: vec![[0.0, 0.0]],
                colour: egui::Color32::GRAY,
                style: LineStyle::Dashed { length: 6.0 },
                kind: SeriesKind::Level,
            },
            Series::line(
                "Water stress coefficient Ks (FAO-56 eq. 84)",
                pick(|d| d.ks),
                OKABE_ITO[6],
            ),
        ],
    };
    (depth, ks)
}

impl WaterBalanceTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        if view.project.is_none() {
            no_project(
                ui,
                "This tab shows a planting's root-zone depletion (mm) against TAW and RAW, with rain and irrigation events and the stress coefficient Ks.",
            );
            return;
        }
        let Some(s) = season_with_picker(ui, view, commands) else {
            return;
        };
        let sum = |f: fn(&offtake_core::balance::BalanceDay) -> f64| -> f64 {
            s.days.iter().map(f).sum()
        };
        let last = s.first_date + Days::new(s.days.len().saturating_sub(1) as u64);
        ui.label(
            RichText::new(format!(
                "{} to {} ({} days{}): ET₀ {} mm, ETc {} mm, ETc adj {} mm, rain {} mm, effective rain {} mm, net irrigation {} mm, deep percolation {} mm. \
                 Area-weighted over the planting's cohorts; FAO-56 ch. 8 root-zone balance (eq. 85), RAW = p·TAW (eq. 83), Ks (eq. 84).",
                s.first_date,
                last,
                s.days.len(),
                if s.complete { "" } else { ", cut by the end of the weather record" },
                format_number(sum(|d| d.et0_mm), 0),
                format_number(sum(|d| d.etc_mm), 0),
                format_number(sum(|d| d.etc_adj_mm), 0),
                format_number(sum(|d| d.rain_mm), 0),
                format_number(sum(|d| d.peff_mm), 0),
                format_number(sum(|d| d.irrigation_mm), 0),
                format_number(sum(|d| d.deep_perc_mm), 0),
            ))
            .weak(),
        );
        let (mut depth, ks) = season_plots(s);
        if s.days.iter().all(|d| d.taw_mm == 0.0) {
            // Paddy rice and the period methods do not run a root-zone
            // balance: only rain and the water applied are meaningful.
            ui.label(
                RichText::new(
                    "This planting has no root-zone balance (paddy rice is kept flooded, or a period method is used): \
                     the bars show rain and the net irrigation requirement, including land preparation and percolation for paddy.",
                )
                .color(ui.visuals().warn_fg_color),
            );
            depth.series.truncate(2);
            plot::show(ui, &depth, commands);
            return;
        }
        let h = ui.available_height();
        ui.allocate_ui(
            egui::vec2(ui.available_width(), (h * 0.68).max(200.0)),
            |ui| {
                plot::show(ui, &depth, commands);
            },
        );
        plot::show(ui, &ks, commands);
    }
}
