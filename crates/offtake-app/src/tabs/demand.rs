//! The Demand tab: GIR at the selected node (a canal's head, the headworks,
//! or a block's outlet) stacked by crop or by block, with the NIR at the
//! fields below it; daily, 10-day or monthly mean flows (l/s) for a chosen
//! irrigation year, the design year marked.

use std::sync::Arc;

use chrono::{Days, NaiveDate};
use egui::{RichText, Ui};
use offtake_core::engine::Results;
use offtake_core::project::Project;
use offtake_core::scheme::{Node, PeriodStep, aggregate_periods};

use super::capacity::node_of_selection;
use super::{View, engine_results, no_project};
use crate::command::{Command, ItemRef, Selection};
use crate::palette::{Colours, DESIGN_FLOW};
use crate::plot::{self, PlotSpec, Series, SeriesKind, XAxis, date_to_x};

/// How the GIR bars are split.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Stacking {
    /// One colour per crop.
    #[default]
    Crop,
    /// One colour per block.
    Block,
}

/// The time step of the bars.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Step {
    /// Daily flows.
    Daily,
    /// Mean flow of each 10-day period (1–10, 11–20, 21–end).
    #[default]
    TenDay,
    /// Mean flow of each month.
    Monthly,
}

/// View state of the Demand tab.
#[derive(Debug, Default)]
pub struct DemandTab {
    /// Split of the bars.
    pub stacking: Stacking,
    /// Time step.
    pub step: Step,
    /// Start year of the irrigation year shown (`None` = the design year).
    pub year: Option<i32>,
    cache: Option<(CacheKey, Arc<PlotSpec>)>,
}

#[derive(Debug, Clone, PartialEq)]
struct CacheKey {
    results: usize,
    target: Target,
    stacking: Stacking,
    step: Step,
    year: i32,
}

/// What the tab shows demand at.
#[derive(Debug, Clone, PartialEq)]
enum Target {
    Node(Node),
    Block(usize),
}

fn target_of(r: &Results, project: &Project, selection: &Selection) -> Target {
    let block = match selection {
        Selection::Item(ItemRef::Block(id)) => Some(id.clone()),
        Selection::Item(ItemRef::Planting(id)) => project
            .plantings
            .iter()
            .find(|p| p.id == *id)
            .map(|p| p.block.clone()),
        _ => None,
    };
    match block.and_then(|b| r.demand.network().block_index(&b)) {
        Some(b) => Target::Block(b),
        None => Target::Node(node_of_selection(r, project, selection)),
    }
}

fn m3_day_to_ls(v: f64) -> f64 {
    v * 1000.0 / 86_400.0
}

/// Bars `[x, l/s]` of one daily series over `lo..hi` at the chosen step,
/// and their width (days).
fn bars(r: &Results, series: &[f64], lo: usize, hi: usize, step: Step) -> Vec<([f64; 2], f64)> {
    let start = r.start + Days::new(lo as u64);
    let slice = series.get(lo..hi).unwrap_or(&[]);
    let periods = |s: PeriodStep| {
        aggregate_periods(start, slice, s, 0.0)
            .into_iter()
            .map(|p| {
                let w = f64::from(p.period_days);
                ([date_to_x(p.start) + 0.5 * (w - 1.0), p.mean_flow_ls], w)
            })
            .collect()
    };
    match step {
        Step::Daily => slice
            .iter()
            .enumerate()
            .map(|(i, v)| ([date_to_x(start) + i as f64, m3_day_to_ls(*v)], 1.0))
            .collect(),
        Step::TenDay => periods(PeriodStep::TenDay),
        Step::Monthly => periods(PeriodStep::Month),
    }
}

fn index_of(r: &Results, date: NaiveDate) -> usize {
    usize::try_from((date - r.start).num_days())
        .unwrap_or(0)
        .min(r.days)
}

fn spec(r: &Results, project: &Project, view: &View<'_>, key: &CacheKey) -> PlotSpec {
    let d = &r.demand;
    let crop_colours = super::crop_colours(Some(project), d.crops().iter().map(String::as_str));
    let block_colours = Colours::for_ids(d.network().blocks().iter().map(|b| b.name.as_str()));
    let year = r
        .complete_years
        .iter()
        .copied()
        .find(|y| y.start_year() == key.year);
    let (lo, hi) = year.map_or((0, r.days), |y| {
        (
            index_of(r, y.start()),
            (index_of(r, y.end()) + 1).min(r.days),
        )
    });
    let mut series = Vec::new();
    let mut push_bars = |name: String, colour, daily: &[f64]| {
        let b = bars(r, daily, lo, hi, key.step);
        let width = b.first().map_or(1.0, |x| x.1);
        if b.iter().any(|x| x.0[1] > 0.0) {
            series.push(Series {
                name,
                points: b.into_iter().map(|x| x.0).collect(),
                colour,
                style: egui_plot::LineStyle::Solid,
                kind: SeriesKind::StackedBars { width: width * 0.9 },
            });
        }
    };
    let (label, nir): (String, Vec<f64>) = match key.target {
        Target::Block(b) => {
            let name = d.network().blocks()[b].name.clone();
            push_bars(
                format!("GIR, block {name}"),
                block_colours.of(&name),
                &d.block_gir_m3_day(b),
            );
            (
                format!("block {name} outlet"),
                d.block_nir_m3_day(b).to_vec(),
            )
        }
        Target::Node(node) => {
            match key.stacking {
                Stacking::Crop => {
                    for (ci, crop) in d.crops().iter().enumerate() {
                        push_bars(
                            format!("GIR, {}", view.crop_name(crop)),
                            crop_colours.of(crop),
                            d.crop_demand_m3_day(node, ci),
                        );
                    }
                }
                Stacking::Block => {
                    for b in d.blocks_below(node) {
                        if let Some(share) = d.block_share_m3_day(node, b) {
                            let name = d.network().blocks()[b].name.clone();
                            push_bars(
                                format!("GIR, block {name}"),
                                block_colours.of(&name),
                                &share,
                            );
                        }
                    }
                }
            }
            let mut nir = vec![0.0; r.days];
            for b in d.blocks_below(node) {
                for (t, v) in nir.iter_mut().zip(d.block_nir_m3_day(b)) {
                    *t += v;
                }
            }
            let label = match node {
                Node::Headworks => "headworks".to_owned(),
                Node::Canal(i) => {
                    let id = &d.network().canals()[i].id;
                    project
                        .canal(id)
                        .map_or_else(|| id.clone(), |c| c.name.clone())
                }
            };
            (label, nir)
        }
    };
    let nir_points: Vec<[f64; 2]> = bars(r, &nir, lo, hi, key.step)
        .into_iter()
        .map(|x| x.0)
        .collect();
    series.push(Series::line(
        "NIR at the fields (l/s)",
        nir_points,
        egui::Color32::from_gray(210),
    ));
    // The design year's peak 10-day period of the node, marked.
    if let (Target::Node(node), Some(year)) = (&key.target, year)
        && let Some(nd) = r.design.iter().find(|x| x.node == *node)
        && nd.design_year == year
        && let Some(yv) = nd.years.iter().find(|y| y.year == year)
    {
        let p = yv.peak_10day_period;
        let a = date_to_x(p.start()) - 0.5;
        let b = a + f64::from(p.length_days());
        let top = yv.peak_10day_ls.max(nd.design_flow_ls) * 1.05;
        series.insert(
            0,
            Series {
                name: "Peak 10-day period of the design year".to_owned(),
                points: vec![[a, top], [b, 0.0]],
                colour: DESIGN_FLOW,
                style: egui_plot::LineStyle::Solid,
                kind: SeriesKind::Spans,
            },
        );
    }
    let step = match key.step {
        Step::Daily => "daily",
        Step::TenDay => "10day",
        Step::Monthly => "monthly",
    };
    PlotSpec {
        id: format!("demand-{}-{step}-{}", label.replace(' ', "_"), key.year),
        x: XAxis::Date,
        y_title: format!("Demand at {label} (l/s)"),
        y_unit: "l/s".to_owned(),
        series,
    }
}

impl DemandTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows NIR and GIR at the selected canal or block, stacked by crop or block, daily, 10-day or monthly.",
            );
            return;
        };
        let Some((run, r)) = engine_results(
            ui,
            view,
            "GIR and NIR at the selected canal or block appear here once the scheme is computed.",
        ) else {
            return;
        };
        let target = target_of(r, project, view.selection);
        let design_year = r.headworks().map(|h| h.design_year);
        let node_design_year = match &target {
            Target::Node(n) => r
                .design
                .iter()
                .find(|d| d.node == *n)
                .map(|d| d.design_year),
            Target::Block(_) => None,
        }
        .or(design_year);
        let year = self
            .year
            .or(node_design_year.map(offtake_core::calendar::IrrigationYear::start_year))
            .unwrap_or(0);
        ui.horizontal_wrapped(|ui| {
            ui.label("Stack by");
            let block_only = matches!(target, Target::Block(_));
            ui.add_enabled_ui(!block_only, |ui| {
                ui.selectable_value(&mut self.stacking, Stacking::Crop, "Crop");
                ui.selectable_value(&mut self.stacking, Stacking::Block, "Block");
            })
            .response
            .on_disabled_hover_text("A block's GIR is shown whole; select a canal to split it");
            ui.separator();
            ui.label("Step");
            ui.selectable_value(&mut self.step, Step::Daily, "Daily");
            ui.selectable_value(&mut self.step, Step::TenDay, "10-day");
            ui.selectable_value(&mut self.step, Step::Monthly, "Monthly");
            ui.separator();
            let mut chosen = year;
            let text = |y: i32| {
                let iy = r.complete_years.iter().find(|x| x.start_year() == y);
                let label = iy.map_or_else(|| y.to_string(), |x| x.label());
                if iy.is_some() && iy.copied() == node_design_year {
                    format!("{label} (design year)")
                } else {
                    label
                }
            };
            egui::ComboBox::from_label("Irrigation year")
                .selected_text(text(year))
                .show_ui(ui, |ui| {
                    for y in &r.complete_years {
                        ui.selectable_value(&mut chosen, y.start_year(), text(y.start_year()));
                    }
                });
            if chosen != year {
                self.year = Some(chosen);
            }
        });
        ui.label(
            RichText::new(
                "GIR = NIR ÷ (Ea × Eb) at a block's outlet, ÷ each canal's Ec up to the node. \
                 Select a canal or block in the tree to see its demand.",
            )
            .weak(),
        );
        if let Some(project) = view.project {
            ui.label(RichText::new(super::delivery_sentence(project, None)).weak());
        }
        let key = CacheKey {
            results: Arc::as_ptr(&run.results) as usize,
            target,
            stacking: self.stacking,
            step: self.step,
            year,
        };
        let spec = match &self.cache {
            Some((k, s)) if *k == key => Arc::clone(s),
            _ => {
                let s = Arc::new(spec(r, project, view, &key));
                self.cache = Some((key, Arc::clone(&s)));
                s
            }
        };
        plot::show(ui, &spec, commands);
    }
}
