//! The plot widget every tab uses (egui_plot 0.38).
//!
//! A tab prepares a [`PlotSpec`] (plain data: named series with their unit and
//! colour) from cached results, then calls [`show`]. The widget adds the axis
//! titles, a legend, a hover read-out of the nearest value with its unit and
//! date, a *Reset zoom* button (double-click also resets), and export of the
//! plotted data as CSV and of the plot as a PNG image.
//!
//! Long daily series are decimated **for drawing only** ([`decimate_min_max`]):
//! each pixel column keeps the lowest and highest point of the days it
//! covers, so peaks stay visible. The CSV export writes the full series.

use std::fmt::Write as _;

use chrono::{Days, NaiveDate};
use egui::{Color32, Ui};
use egui_plot::{
    Bar, BarChart, HLine, HoverPosition, Legend, Line, LineStyle, Plot, PlotPoints, VLine,
};

use crate::command::Command;

/// Temp-data key under which [`show`] records the screen rect of the last
/// plot drawn (File › Export plot image uses it).
pub const LAST_PLOT_RECT: &str = "offtake-last-plot-rect";

/// How a series is drawn.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SeriesKind {
    /// A polyline through the points (decimated for drawing when long).
    Line,
    /// One bar per point, of the given width in x units (rain, irrigation events).
    Bars {
        /// Bar width in x units (1.0 = one day on a date axis).
        width: f64,
    },
    /// A horizontal level at the first point's y (design flow, capacity, TAW).
    Level,
    /// A vertical marker at the first point's x (stage ends, design year).
    Marker,
    /// A line shaded down (or up) to a level: the area between the points
    /// and `base` is filled (shortfall above a capacity).
    Shaded {
        /// The level the fill reaches (y units).
        base: f64,
    },
    /// Bars stacked on the bars of the earlier `StackedBars` series of the
    /// same plot at the same x (demand by crop or block).
    StackedBars {
        /// Bar width in x units.
        width: f64,
    },
    /// Unjoined markers of the given radius in points (flagged or estimated
    /// days).
    Points {
        /// Marker radius (screen points).
        radius: f32,
    },
    /// A band of x ranges shaded over the whole height: each pair of
    /// consecutive points is one `[x_start, x_end]` range (crop stages, the
    /// design year).
    Spans,
}

/// One named series of a plot.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Legend name ("GIR, Block N7").
    pub name: String,
    /// Points `[x, y]`, sorted by x. On a date axis x is [`date_to_x`].
    pub points: Vec<[f64; 2]>,
    /// Colour (see [`crate::palette`]).
    pub colour: Color32,
    /// Dash pattern (design and capacity lines are dashed or dotted).
    pub style: LineStyle,
    /// How it is drawn.
    pub kind: SeriesKind,
}

impl Series {
    /// A solid line.
    pub fn line(name: impl Into<String>, points: Vec<[f64; 2]>, colour: Color32) -> Self {
        Self {
            name: name.into(),
            points,
            colour,
            style: LineStyle::Solid,
            kind: SeriesKind::Line,
        }
    }
}

/// What the x axis shows.
#[derive(Debug, Clone, PartialEq)]
pub enum XAxis {
    /// Calendar dates; x is days since 1970-01-01 ([`date_to_x`]).
    Date,
    /// A plain quantity with its title and unit ("Day after planting (d)").
    Quantity {
        /// Axis title with unit.
        title: String,
        /// Unit shown in the hover read-out.
        unit: String,
    },
}

/// Everything one plot shows, prepared before drawing.
#[derive(Debug, Clone, PartialEq)]
pub struct PlotSpec {
    /// Unique id of the plot within the window (also the default export name).
    pub id: String,
    /// The x axis.
    pub x: XAxis,
    /// Y axis title with unit ("Flow (l/s)").
    pub y_title: String,
    /// Y unit for the hover read-out ("l/s").
    pub y_unit: String,
    /// The series, drawn in order.
    pub series: Vec<Series>,
}

fn epoch() -> NaiveDate {
    NaiveDate::from_ymd_opt(1970, 1, 1).unwrap_or_default()
}

/// The x coordinate of a date: days since 1970-01-01.
pub fn date_to_x(date: NaiveDate) -> f64 {
    (date - epoch()).num_days() as f64
}

/// The date at x (rounded to the nearest day), if within chrono's range.
pub fn x_to_date(x: f64) -> Option<NaiveDate> {
    if !x.is_finite() || x.abs() > 1.0e8 {
        return None;
    }
    let days = x.round() as i64;
    if days >= 0 {
        epoch().checked_add_days(Days::new(days as u64))
    } else {
        epoch().checked_sub_days(Days::new(days.unsigned_abs()))
    }
}

/// Min/max decimation for drawing: splits `points` (sorted by x) into
/// `buckets` runs of equal count and keeps, from each run, its lowest and its
/// highest point in x order. Returns the points unchanged when there are no
/// more than two per bucket. Non-finite y values are skipped.
pub fn decimate_min_max(points: &[[f64; 2]], buckets: usize) -> Vec<[f64; 2]> {
    let buckets = buckets.max(1);
    if points.len() <= 2 * buckets {
        return points.to_vec();
    }
    let chunk = points.len().div_ceil(buckets);
    let mut out = Vec::with_capacity(2 * buckets + 2);
    for run in points.chunks(chunk) {
        let mut lo: Option<(usize, [f64; 2])> = None;
        let mut hi: Option<(usize, [f64; 2])> = None;
        for (i, p) in run.iter().enumerate() {
            if !p[1].is_finite() {
                continue;
            }
            if lo.is_none_or(|(_, q)| p[1] < q[1]) {
                lo = Some((i, *p));
            }
            if hi.is_none_or(|(_, q)| p[1] > q[1]) {
                hi = Some((i, *p));
            }
        }
        match (lo, hi) {
            (Some((il, pl)), Some((ih, _))) if il == ih => out.push(pl),
            (Some((il, pl)), Some((ih, ph))) => {
                if il < ih {
                    out.extend([pl, ph]);
                } else {
                    out.extend([ph, pl]);
                }
            }
            _ => {}
        }
    }
    out
}

/// The points of `points` (sorted by x) inside `[x_min, x_max]`, plus one
/// neighbour on each side so the line reaches the plot edges.
fn visible_slice(points: &[[f64; 2]], x_min: f64, x_max: f64) -> &[[f64; 2]] {
    let start = points.partition_point(|p| p[0] < x_min).saturating_sub(1);
    let end = (points.partition_point(|p| p[0] <= x_max) + 1).min(points.len());
    if start >= end {
        &[]
    } else {
        &points[start..end]
    }
}

/// A CSV field, quoted (RFC 4180) when it holds a comma, quote or newline.
pub fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// The full (never decimated) data of a plot as CSV in long form:
/// one row per point, columns `series`, x (`date` or the x title), y title.
pub fn plot_csv(spec: &PlotSpec) -> String {
    let x_header = match &spec.x {
        XAxis::Date => "date".to_owned(),
        XAxis::Quantity { title, .. } => title.clone(),
    };
    let mut out = format!(
        "series,{},{}\n",
        csv_field(&x_header),
        csv_field(&spec.y_title)
    );
    for s in &spec.series {
        for p in &s.points {
            let x = match spec.x {
                XAxis::Date => x_to_date(p[0]).map_or_else(|| p[0].to_string(), |d| d.to_string()),
                XAxis::Quantity { .. } => p[0].to_string(),
            };
            let _ = writeln!(out, "{},{},{}", csv_field(&s.name), x, p[1]);
        }
    }
    out
}

/// Hover read-out text: series name, x (date or value with unit), y with unit.
fn hover_text(spec: &PlotSpec, pos: &HoverPosition<'_>) -> String {
    let x_text = |x: f64| match &spec.x {
        XAxis::Date => x_to_date(x).map_or_else(String::new, |d| d.to_string()),
        XAxis::Quantity { unit, .. } => format!("{x:.1} {unit}"),
    };
    match pos {
        HoverPosition::NearDataPoint {
            plot_name,
            position,
            ..
        } => format!(
            "{plot_name}\n{}: {} {}",
            x_text(position.x),
            crate::fields::format_sig(position.y, 3),
            spec.y_unit
        ),
        HoverPosition::Elsewhere { position } => {
            format!(
                "{}\n{} {}",
                x_text(position.x),
                crate::fields::format_sig(position.y, 3),
                spec.y_unit
            )
        }
    }
}

/// The label of a date-axis tick: the ISO date where ticks are far apart
/// (60 days or more), "14 Dec" where they are close, so that labels do not
/// run into each other (day before month, never ambiguous).
pub fn date_tick_label(x: f64, step_days: f64) -> String {
    x_to_date(x).map_or_else(String::new, |d| {
        if step_days >= 60.0 {
            d.to_string()
        } else {
            d.format("%-d %b").to_string()
        }
    })
}

/// Draws the plot with its toolbar (reset zoom, CSV and PNG export).
/// Export requests are pushed onto `commands`.
pub fn show(ui: &mut Ui, spec: &PlotSpec, commands: &mut Vec<Command>) {
    if spec.series.iter().all(|s| s.points.is_empty()) {
        ui.label("Nothing to plot for this selection.");
        return;
    }
    let Toolbar {
        reset,
        export_image,
    } = toolbar(ui, &spec.id, || plot_csv(spec), commands);
    let mut plot = Plot::new(&spec.id)
        .legend(Legend::default())
        .y_axis_label(spec.y_title.clone())
        .label_formatter(|pos| Some(hover_text(spec, pos)));
    plot = match &spec.x {
        XAxis::Date => plot
            .x_axis_label("Date")
            .x_axis_formatter(|mark, _| date_tick_label(mark.value, mark.step_size)),
        XAxis::Quantity { title, .. } => plot.x_axis_label(title.clone()),
    };
    if reset {
        plot = plot.reset();
    }
    let width_px = ui.available_width().max(100.0) as usize;
    // The scope's rect covers the plot with its axes and tick labels: the
    // area a PNG export shows.
    let scope = ui.scope(|ui| {
        plot.show(ui, |plot_ui| {
            let bounds = plot_ui.plot_bounds();
            let auto = plot_ui.auto_bounds();
            let mut stack: std::collections::HashMap<u64, f64> = std::collections::HashMap::new();
            for s in &spec.series {
                match s.kind {
                    SeriesKind::Line => {
                        let shown = if auto.x || auto.y {
                            &s.points[..]
                        } else {
                            visible_slice(&s.points, bounds.min()[0], bounds.max()[0])
                        };
                        let pts = decimate_min_max(shown, width_px);
                        // Already decimated to the pixel columns; egui_plot's
                        // own band drawing would turn the vertical jumps of
                        // step lines (period means) into filled polygons.
                        plot_ui.line(
                            Line::new(s.name.clone(), PlotPoints::from(pts))
                                .color(s.colour)
                                .style(s.style)
                                .allow_band(false),
                        );
                    }
                    SeriesKind::Points { radius } => {
                        plot_ui.points(
                            egui_plot::Points::new(
                                s.name.clone(),
                                PlotPoints::from(s.points.clone()),
                            )
                            .color(s.colour)
                            .radius(radius),
                        );
                    }
                    SeriesKind::Bars { width } => {
                        let bars = s
                            .points
                            .iter()
                            .map(|p| Bar::new(p[0], p[1]).width(width))
                            .collect();
                        plot_ui.bar_chart(BarChart::new(s.name.clone(), bars).color(s.colour));
                    }
                    SeriesKind::Marker => {
                        if let Some(p) = s.points.first() {
                            plot_ui.vline(
                                VLine::new(s.name.clone(), p[0])
                                    .color(s.colour)
                                    .style(s.style),
                            );
                        }
                    }
                    SeriesKind::Shaded { base } => {
                        let pts = decimate_min_max(&s.points, width_px);
                        plot_ui.line(
                            Line::new(s.name.clone(), PlotPoints::from(pts))
                                .color(s.colour)
                                .style(s.style)
                                .fill(base as f32)
                                .fill_alpha(0.45),
                        );
                    }
                    SeriesKind::StackedBars { width } => {
                        let bars = s
                            .points
                            .iter()
                            .map(|p| {
                                let key = p[0].to_bits();
                                let base = stack.get(&key).copied().unwrap_or(0.0);
                                stack.insert(key, base + p[1]);
                                Bar::new(p[0], p[1]).width(width).base_offset(base)
                            })
                            .collect();
                        plot_ui.bar_chart(BarChart::new(s.name.clone(), bars).color(s.colour));
                    }
                    SeriesKind::Spans => {
                        let bars = s
                            .points
                            .chunks_exact(2)
                            .map(|r| {
                                let (a, b) = (r[0][0], r[1][0]);
                                Bar::new(0.5 * (a + b), r[0][1])
                                    .width((b - a).abs())
                                    .base_offset(r[1][1])
                                    .stroke(egui::Stroke::NONE)
                            })
                            .collect();
                        plot_ui.bar_chart(
                            BarChart::new(s.name.clone(), bars)
                                .color(s.colour.gamma_multiply(0.25)),
                        );
                    }
                    SeriesKind::Level => {
                        if let Some(p) = s.points.first() {
                            plot_ui.hline(
                                HLine::new(s.name.clone(), p[1])
                                    .color(s.colour)
                                    .style(s.style)
                                    .width(2.0),
                            );
                        }
                    }
                }
            }
        })
    });
    drawn(ui, &spec.id, scope.response.rect, export_image, commands);
}

/// What the plot toolbar's buttons asked for this frame.
#[derive(Debug, Clone, Copy, Default)]
pub struct Toolbar {
    /// Reset zoom and pan to the whole series.
    pub reset: bool,
    /// Save an image of the plot once it is drawn (see [`drawn`]).
    pub export_image: bool,
}

/// The toolbar every plot carries: *Reset zoom*, *Export data (CSV)…*
/// (`csv` is only built when clicked) and *Export image (PNG)…*. `id` names
/// the exported files.
pub fn toolbar(
    ui: &mut Ui,
    id: &str,
    csv: impl FnOnce() -> String,
    commands: &mut Vec<Command>,
) -> Toolbar {
    let mut out = Toolbar::default();
    ui.horizontal(|ui| {
        out.reset = ui
            .button("Reset zoom")
            .on_hover_text("Back to the whole series (double-click the plot does the same)")
            .clicked();
        if ui.button("Export data (CSV)…").clicked() {
            commands.push(Command::ExportPlotCsv {
                file_name: format!("{id}.csv"),
                csv: csv(),
            });
        }
        out.export_image = ui.button("Export image (PNG)…").clicked();
    });
    out
}

/// Records where a plot was drawn (`rect`: the plot with its axes) and, if
/// the toolbar asked, requests its image.
pub fn drawn(
    ui: &mut Ui,
    id: &str,
    rect: egui::Rect,
    export_image: bool,
    commands: &mut Vec<Command>,
) {
    ui.data_mut(|d| d.insert_temp(egui::Id::unique(LAST_PLOT_RECT), rect));
    if export_image {
        commands.push(Command::ExportPlotImage {
            file_name: format!("{id}.png"),
            rect,
        });
    }
}

#[cfg(test)]
mod tests {
    use super::{
        PlotSpec, Series, XAxis, date_to_x, decimate_min_max, plot_csv, visible_slice, x_to_date,
    };
    use chrono::NaiveDate;
    use egui::Color32;

    #[test]
    fn decimation_keeps_extremes_of_each_bucket() {
        // 1000 points with a single spike at index 537: the spike must survive.
        let mut pts: Vec<[f64; 2]> = (0..1000).map(|i| [f64::from(i), 1.0]).collect();
        pts[537][1] = 50.0;
        pts[100][1] = -3.0;
        let d = decimate_min_max(&pts, 50);
        assert!(d.len() <= 100);
        assert!(d.contains(&[537.0, 50.0]));
        assert!(d.contains(&[100.0, -3.0]));
        assert!(d.windows(2).all(|w| w[0][0] < w[1][0]), "x order kept");
    }

    #[test]
    fn short_series_is_not_decimated() {
        let pts = vec![[0.0, 1.0], [1.0, 2.0], [2.0, 0.5]];
        assert_eq!(decimate_min_max(&pts, 10), pts);
    }

    #[test]
    fn visible_slice_keeps_one_neighbour_each_side() {
        let pts: Vec<[f64; 2]> = (0..10).map(|i| [f64::from(i), 0.0]).collect();
        let s = visible_slice(&pts, 3.5, 6.5);
        assert_eq!(s.first().map(|p| p[0]), Some(3.0));
        assert_eq!(s.last().map(|p| p[0]), Some(7.0));
        assert!(visible_slice(&pts, 20.0, 30.0).len() <= 1);
    }

    #[test]
    fn date_axis_round_trips() {
        let d = NaiveDate::from_ymd_opt(2031, 4, 15).expect("date");
        assert_eq!(x_to_date(date_to_x(d)), Some(d));
        assert_eq!(x_to_date(f64::NAN), None);
    }

    #[test]
    fn csv_is_long_form_with_dates_and_quoted_names() {
        let d = NaiveDate::from_ymd_opt(2031, 1, 2).expect("date");
        let spec = PlotSpec {
            id: "t".into(),
            x: XAxis::Date,
            y_title: "Flow (l/s)".into(),
            y_unit: "l/s".into(),
            series: vec![Series::line(
                "GIR, Block A",
                vec![[date_to_x(d), 12.5]],
                Color32::WHITE,
            )],
        };
        assert_eq!(
            plot_csv(&spec),
            "series,date,Flow (l/s)\n\"GIR, Block A\",2031-01-02,12.5\n"
        );
    }
}
