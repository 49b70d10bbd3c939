//! The Canal capacity tab: the node hydrograph (daily demand in l/s, and the
//! 10-day or monthly means the design flow is computed from) with
//! the design flow (dashed) and the existing capacity (dotted), shortfall
//! shaded; the table of design values per canal and headworks, and how the
//! design flow was computed.

use std::fmt::Write as _;
use std::sync::Arc;

use chrono::Days;
use egui::{RichText, Ui};
use offtake_core::engine::Results;
use offtake_core::project::Project;
use offtake_core::scheme::{DesignBasis, Node, NodeDesign, PeriodStep};

use super::{View, empty_state, engine_results, no_project};
use crate::command::{Command, ItemRef, Selection};
use crate::fields::{format_number, format_sig};
use crate::palette::{CAPACITY, CAPACITY_STYLE, DESIGN_FLOW, DESIGN_FLOW_STYLE, OKABE_ITO};
use crate::plot::{self, PlotSpec, Series, SeriesKind, XAxis, date_to_x};

/// Which days the hydrograph shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum YearChoice {
    /// The node's design year.
    #[default]
    Design,
    /// The irrigation year starting in this calendar year.
    Year(i32),
    /// Every day of the weather record.
    Record,
}

/// View state of the Canal capacity tab.
#[derive(Debug, Default)]
pub struct CanalCapacityTab {
    /// Days shown.
    pub year: YearChoice,
    /// The plot prepared for (results, node, days), reused while they stay.
    cache: Option<(usize, Node, YearChoice, Arc<PlotSpec>)>,
}

/// The node the tab shows for a tree selection: a canal, a block's canal,
/// or the headworks.
pub fn node_of_selection(results: &Results, project: &Project, selection: &Selection) -> Node {
    let canal = match selection {
        Selection::Item(ItemRef::Canal(id)) => Some(id.as_str()),
        Selection::Item(ItemRef::Block(id)) => project.block(id).map(|b| b.canal.as_str()),
        Selection::Item(ItemRef::Planting(id)) => project
            .plantings
            .iter()
            .find(|p| p.id == *id)
            .and_then(|p| project.block(&p.block))
            .map(|b| b.canal.as_str()),
        _ => None,
    };
    canal
        .and_then(|c| results.demand.network().canal_index(c))
        .map_or(Node::Headworks, Node::Canal)
}

/// Display name of a node: the canal's name, or "Headworks".
pub fn node_label(project: &Project, d: &NodeDesign) -> String {
    match d.node {
        Node::Headworks => "Headworks".to_owned(),
        Node::Canal(_) => project
            .canal(&d.name)
            .map_or_else(|| d.name.clone(), |c| c.name.clone()),
    }
}

fn basis_label(b: DesignBasis) -> &'static str {
    match b {
        DesignBasis::TenDay => "10-day",
        DesignBasis::Monthly => "monthly",
        DesignBasis::Daily => "daily",
    }
}

/// The days of `choice` as an index range into the daily series.
fn day_range(r: &Results, d: &NodeDesign, choice: YearChoice) -> std::ops::Range<usize> {
    let year = match choice {
        YearChoice::Record => return 0..r.days,
        YearChoice::Design => Some(d.design_year),
        YearChoice::Year(y) => r
            .complete_years
            .iter()
            .copied()
            .find(|iy| iy.start_year() == y),
    };
    let Some(year) = year else {
        return 0..r.days;
    };
    let index = |date: chrono::NaiveDate| {
        usize::try_from((date - r.start).num_days())
            .unwrap_or(0)
            .min(r.days)
    };
    index(year.start())..(index(year.end()) + 1).min(r.days)
}

fn hydrograph(r: &Results, project: &Project, d: &NodeDesign, choice: YearChoice) -> PlotSpec {
    let flow_ls = r.demand.demand_ls(d.node);
    let range = day_range(r, d, choice);
    let x = |i: usize| date_to_x(r.start + Days::new(i as u64));
    let demand: Vec<[f64; 2]> = range
        .clone()
        .filter_map(|i| flow_ls.get(i).map(|q| [x(i), *q]))
        .collect();
    let label = node_label(project, d);
    // The design flow is a statistic of period means (10-day or monthly):
    // those means are drawn over the daily demand, which rotation and refill
    // schedules make spiky, so the two can be read against the same line.
    let step = match d.basis {
        DesignBasis::TenDay => Some(PeriodStep::TenDay),
        DesignBasis::Monthly => Some(PeriodStep::Month),
        DesignBasis::Daily => None,
    };
    let (first, last) = (
        demand.first().map_or(f64::NEG_INFINITY, |p| p[0]),
        demand.last().map_or(f64::INFINITY, |p| p[0]),
    );
    let means: Vec<[f64; 2]> = step.map_or_else(Vec::new, |step| {
        r.demand
            .periods(d.node, step)
            .iter()
            .map(|p| {
                let a = date_to_x(p.start);
                let b = date_to_x(p.start + Days::new(u64::from(p.period_days)));
                (a, b, p.mean_flow_ls)
            })
            .filter(|(a, b, _)| *b > first && *a <= last + 1.0)
            .flat_map(|(a, b, q)| [[a, q], [b, q]])
            .collect()
    });
    // Shortfall on the design basis: the series the capacity is checked against.
    let basis_series = if step.is_some() { &means } else { &demand };
    let mut series = Vec::new();
    if let Some(cap) = d.existing_capacity_ls
        && basis_series.iter().any(|p| p[1] > cap)
    {
        series.push(Series {
            name: format!(
                "Shortfall of {} mean flow above existing capacity",
                basis_label(d.basis)
            ),
            points: basis_series.iter().map(|p| [p[0], p[1].max(cap)]).collect(),
            colour: OKABE_ITO[6],
            style: egui_plot::LineStyle::Solid,
            kind: SeriesKind::Shaded { base: cap },
        });
    }
    let daily_colour = if step.is_some() {
        OKABE_ITO[2].gamma_multiply(0.35)
    } else {
        OKABE_ITO[2]
    };
    series.push(Series::line(
        format!("Daily demand at {label} (l/s)"),
        demand,
        daily_colour,
    ));
    if step.is_some() {
        series.push(Series::line(
            format!(
                "{} mean demand, the design basis (l/s)",
                basis_label(d.basis)
            ),
            means,
            OKABE_ITO[2],
        ));
    }
    series.push(Series {
        name: format!("Design flow {} l/s", format_sig(d.design_flow_ls, 3)),
        points: vec![[0.0, d.design_flow_ls]],
        colour: DESIGN_FLOW,
        style: DESIGN_FLOW_STYLE,
        kind: SeriesKind::Level,
    });
    if let Some(cap) = d.existing_capacity_ls {
        series.push(Series {
            name: format!("Existing capacity {} l/s", format_sig(cap, 3)),
            points: vec![[0.0, cap]],
            colour: CAPACITY,
            style: CAPACITY_STYLE,
            kind: SeriesKind::Level,
        });
    }
    let days = match choice {
        YearChoice::Record => "record".to_owned(),
        _ => day_range(r, d, choice).start.to_string(),
    };
    PlotSpec {
        id: format!("hydrograph-{}-{days}", d.name),
        x: XAxis::Date,
        y_title: "Flow (l/s)".to_owned(),
        y_unit: "l/s".to_owned(),
        series,
    }
}

/// The "How was this computed?" text of a node's design flow.
pub fn explanation(project: &Project, r: &Results, d: &NodeDesign) -> String {
    let n = d.years.len();
    let first = r
        .complete_years
        .first()
        .map(|y| y.label())
        .unwrap_or_default();
    let last = r
        .complete_years
        .last()
        .map(|y| y.label())
        .unwrap_or_default();
    let basis = basis_label(d.basis);
    let mut t = format!(
        "Design flow of {} = {} l/s: the {} % non-exceedance value of the yearly peak {basis} mean flow \
         over the N = {n} complete irrigation years {first} to {last} (years start in month {}; \
         incomplete years at the ends of the record are left out). The yearly peaks are ranked and \
         given Weibull plotting positions m/(n+1), and the design flow is interpolated between \
         ranks. Design year {}: the year whose peak is closest to the design flow.\n",
        node_label(project, d),
        format_sig(d.design_flow_ls, 3),
        format_number(d.non_exceedance * 100.0, 1),
        project.options.irrigation_year_start_month,
        d.design_year.label(),
    );
    let _ = writeln!(
        t,
        "Required capacity = design flow × 24 h ÷ {} h of operation per day = {} l/s.",
        format_number(d.hours_per_day, 1),
        format_sig(d.required_capacity_ls, 3)
    );
    let _ = writeln!(
        t,
        "Uncertainty of the record: the design flow lies between {} l/s, {} — a distribution-free \
         confidence interval of the quantile from the order statistics of the {n} yearly peaks \
         (binomial ranks; Hahn and Meeker 1991, Statistical Intervals).",
        offtake_io::results::interval_text(&d.design_flow_interval),
        offtake_io::results::interval_basis_text(&d.design_flow_interval),
    );
    if d.capacity_within_uncertainty() == Some(true) {
        let _ = writeln!(
            t,
            "The existing capacity lies inside the interval of the required capacity ({} l/s): \
             the capacity verdict is within the uncertainty of the record.",
            offtake_io::results::interval_text(&d.required_capacity_interval()),
        );
    }
    if let Some(duty) = d.duty_ls_ha {
        let _ = writeln!(
            t,
            "Duty = design flow ÷ {} ha commanded = {} l/s/ha.",
            format_sig(d.area_ha, 3),
            format_sig(duty, 3)
        );
    }
    let canal = match d.node {
        offtake_core::scheme::Node::Canal(_) => Some(d.name.as_str()),
        offtake_core::scheme::Node::Headworks => None,
    };
    let _ = writeln!(t, "{}", super::delivery_sentence(project, canal));
    t.push_str(
        "Demand at a node = Σ block NIR ÷ (application efficiency Ea × field-canal efficiency Eb), \
         then ÷ the conveyance efficiency Ec of each canal from the block up to the node. \
         Block NIR comes from each planting's daily FAO-56 root-zone water balance \
         (FAO Irrigation and Drainage Paper 56, ch. 8, eq. 85) on ET₀ from the project's method.",
    );
    t
}

impl CanalCapacityTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        ui.label(RichText::new(crate::help::CAUTION_LINE).color(ui.visuals().warn_fg_color));
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows each canal's demand hydrograph (l/s) with its design flow and existing capacity, and a table of design flows, duties and capacities.",
            );
            return;
        };
        if project.canals.is_empty() {
            empty_state(
                ui,
                "No canals yet",
                "Right-click the scheme in the tree › Add main canal.",
            );
            return;
        }
        let Some((run, r)) = engine_results(
            ui,
            view,
            "The demand hydrograph and design flows of every canal appear here once the scheme is computed.",
        ) else {
            return;
        };
        let node = node_of_selection(r, project, view.selection);
        let Some(d) = r.design.iter().find(|d| d.node == node) else {
            empty_state(
                ui,
                "No design values for this node",
                "Select a canal in the tree.",
            );
            return;
        };
        self.controls(ui, project, r, d, node, commands);
        let key = Arc::as_ptr(&run.results) as usize;
        let spec = match &self.cache {
            Some((k, n, y, spec)) if *k == key && *n == node && *y == self.year => Arc::clone(spec),
            _ => {
                let spec = Arc::new(hydrograph(r, project, d, self.year));
                self.cache = Some((key, node, self.year, Arc::clone(&spec)));
                spec
            }
        };
        egui::CollapsingHeader::new("How was this computed?")
            .id_salt("capacity-how")
            .show(ui, |ui| {
                ui.label(explanation(project, r, d));
                yearly_peaks(ui, d);
            });
        if node != Node::Headworks {
            egui::CollapsingHeader::new("Section (drawn to scale) and checks")
                .id_salt("capacity-section")
                .default_open(true)
                .show(ui, |ui| super::section_view::show(ui, r, &d.name));
        }
        let table_height = (r.design.len() as f32 + 2.5) * 22.0 + 8.0;
        let plot_height = (ui.available_height() - table_height - 12.0).max(180.0);
        ui.allocate_ui(egui::vec2(ui.available_width(), plot_height), |ui| {
            plot::show(ui, &spec, commands);
        });
        ui.separator();
        design_table(ui, project, r, view.selection, commands);
    }

    fn controls(
        &mut self,
        ui: &mut Ui,
        project: &Project,
        r: &Results,
        d: &NodeDesign,
        node: Node,
        commands: &mut Vec<Command>,
    ) {
        ui.horizontal(|ui| {
            let mut chosen = node;
            let current = node_label(project, d);
            egui::ComboBox::from_label("Node")
                .selected_text(current)
                .show_ui(ui, |ui| {
                    for n in std::iter::once(Node::Headworks).chain(
                        r.design
                            .iter()
                            .map(|x| x.node)
                            .filter(|n| *n != Node::Headworks),
                    ) {
                        if let Some(x) = r.design.iter().find(|x| x.node == n) {
                            ui.selectable_value(&mut chosen, n, node_label(project, x));
                        }
                    }
                });
            if chosen != node {
                let sel = match chosen {
                    Node::Headworks => Selection::Scheme,
                    Node::Canal(_) => r
                        .design
                        .iter()
                        .find(|x| x.node == chosen)
                        .map_or(Selection::Scheme, |x| {
                            Selection::Item(ItemRef::Canal(x.name.clone()))
                        }),
                };
                commands.push(Command::Select(sel));
            }
            let text = |c: YearChoice| match c {
                YearChoice::Design => format!("Design year ({})", d.design_year.label()),
                YearChoice::Record => "Whole record".to_owned(),
                YearChoice::Year(y) => r
                    .complete_years
                    .iter()
                    .find(|iy| iy.start_year() == y)
                    .map_or_else(|| y.to_string(), |iy| iy.label()),
            };
            egui::ComboBox::from_label("Irrigation year")
                .selected_text(text(self.year))
                .show_ui(ui, |ui| {
                    ui.selectable_value(
                        &mut self.year,
                        YearChoice::Design,
                        text(YearChoice::Design),
                    );
                    ui.selectable_value(
                        &mut self.year,
                        YearChoice::Record,
                        text(YearChoice::Record),
                    );
                    for y in &r.complete_years {
                        let c = YearChoice::Year(y.start_year());
                        ui.selectable_value(&mut self.year, c, text(c));
                    }
                });
        });
    }
}

/// The yearly peaks of a node, ranked, with their Weibull positions.
fn yearly_peaks(ui: &mut Ui, d: &NodeDesign) {
    let mut peaks: Vec<(String, f64)> = d
        .years
        .iter()
        .map(|y| (y.year.label(), y.peak_ls(d.basis)))
        .collect();
    peaks.sort_by(|a, b| a.1.total_cmp(&b.1));
    let n = peaks.len();
    egui::CollapsingHeader::new(format!("Yearly peaks of {n} years, ranked"))
        .id_salt("capacity-peaks")
        .show(ui, |ui| {
            egui::ScrollArea::vertical()
                .max_height(160.0)
                .show(ui, |ui| {
                    egui::Grid::new("peaks").striped(true).show(ui, |ui| {
                        for h in [
                            "Rank m",
                            "Irrigation year",
                            &format!("Peak {} flow (l/s)", basis_label(d.basis)),
                            "Non-exceedance m/(n+1) (%)",
                        ] {
                            ui.label(RichText::new(h).strong());
                        }
                        ui.end_row();
                        for (i, (label, q)) in peaks.iter().enumerate() {
                            ui.label((i + 1).to_string());
                            ui.label(label);
                            ui.label(format_sig(*q, 3));
                            ui.label(format_number(100.0 * (i + 1) as f64 / (n + 1) as f64, 1));
                            ui.end_row();
                        }
                    });
                });
        });
}

/// Column titles of the design table, with units.
/// Two lines each, so that the table fits beside the tree and inspector.
pub const DESIGN_TABLE_HEADERS: [&str; 10] = [
    "Node",
    "Area\n(ha)",
    "Design flow\n(l/s)",
    "Required capacity\n(l/s)",
    "Existing capacity\n(l/s)",
    "Peak 10-day\n(l/s)",
    "Duty\n(l/s/ha)",
    "Seasonal volume\n(Mm³)",
    "Design\nyear",
    "Design flow interval\n(l/s)",
];

fn design_table(
    ui: &mut Ui,
    project: &Project,
    r: &Results,
    selection: &Selection,
    commands: &mut Vec<Command>,
) {
    egui::ScrollArea::both()
        .id_salt("design-table")
        .show(ui, |ui| {
            egui::Grid::new("design-table-grid")
                .striped(true)
                .num_columns(DESIGN_TABLE_HEADERS.len())
                .show(ui, |ui| {
                    for h in DESIGN_TABLE_HEADERS {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    let rows = r
                        .design
                        .iter()
                        .filter(|d| d.node == Node::Headworks)
                        .chain(r.design.iter().filter(|d| d.node != Node::Headworks));
                    for d in rows {
                        let me = match d.node {
                            Node::Headworks => Selection::Scheme,
                            Node::Canal(_) => Selection::Item(ItemRef::Canal(d.name.clone())),
                        };
                        let label = node_label(project, d);
                        if ui.selectable_label(*selection == me, label).clicked() {
                            commands.push(Command::Select(me));
                        }
                        ui.label(format_sig(d.area_ha, 3));
                        ui.label(RichText::new(format_sig(d.design_flow_ls, 3)).strong())
                            .on_hover_text(explanation(project, r, d));
                        ui.label(format_sig(d.required_capacity_ls, 3));
                        let within = if d.capacity_within_uncertainty() == Some(true) {
                            ", within the uncertainty of the record"
                        } else {
                            ""
                        };
                        match d.existing_capacity_ls {
                            Some(cap) if cap < d.required_capacity_ls => {
                                ui.label(
                                    RichText::new(format!(
                                        "{} (too small{within})",
                                        format_sig(cap, 3)
                                    ))
                                    .color(ui.visuals().error_fg_color),
                                );
                            }
                            Some(cap) => {
                                ui.label(if within.is_empty() {
                                    format_sig(cap, 3)
                                } else {
                                    format!("{} (sufficient{within})", format_sig(cap, 3))
                                });
                            }
                            None => {
                                ui.label("—");
                            }
                        }
                        ui.label(format_sig(d.peak_10day_ls, 3));
                        ui.label(
                            d.duty_ls_ha
                                .map_or_else(|| "—".to_owned(), |v| format_sig(v, 3)),
                        );
                        ui.label(format_sig(d.seasonal_volume_m3 / 1.0e6, 3));
                        ui.label(d.design_year.label());
                        ui.label(offtake_io::results::interval_text(&d.design_flow_interval))
                            .on_hover_text(offtake_io::results::interval_basis_text(
                                &d.design_flow_interval,
                            ));
                        ui.end_row();
                    }
                });
        });
}
