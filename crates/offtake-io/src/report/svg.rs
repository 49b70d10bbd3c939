//! Inline SVG figures of the report: a line chart (hydrographs, ranked
//! peaks) and a grouped bar chart (monthly ET₀ and rain). Axis titles carry
//! units; colours are the Okabe and Ito (2008) colour-blind-safe palette,
//! and reference lines differ by dash as well as colour.

use std::fmt::Write as _;

use super::html::esc;

/// Okabe–Ito colours: blue, orange, bluish green, vermillion, reddish
/// purple, sky blue.
pub const PALETTE: [&str; 6] = [
    "#0072B2", "#E69F00", "#009E73", "#D55E00", "#CC79A7", "#56B4E9",
];

const W: f64 = 680.0;
const H: f64 = 250.0;
const LEFT: f64 = 62.0;
const RIGHT: f64 = 12.0;
const TOP: f64 = 12.0;
const BOTTOM: f64 = 58.0;

/// A series of points, drawn as a line (optionally with markers).
pub struct Series<'a> {
    /// Legend name.
    pub name: &'a str,
    /// Points (x, y) in data units.
    pub points: Vec<(f64, f64)>,
    /// Colour.
    pub colour: &'a str,
    /// Draw markers instead of a line.
    pub markers: bool,
}

/// A horizontal reference line (design flow, capacity, interval bound).
pub struct HLine<'a> {
    /// Legend name.
    pub name: &'a str,
    /// Value (y units).
    pub y: f64,
    /// Colour.
    pub colour: &'a str,
    /// SVG dash pattern (`6 3`, `2 2`, …).
    pub dash: &'a str,
}

/// "Nice" tick step for a range (1, 2 or 5 × 10^k).
fn tick_step(span: f64, target: f64) -> f64 {
    if !(span.is_finite() && span > 0.0) {
        return 1.0;
    }
    let raw = span / target;
    let mag = 10_f64.powf(raw.log10().floor());
    let f = raw / mag;
    let nice = if f <= 1.0 {
        1.0
    } else if f <= 2.0 {
        2.0
    } else if f <= 5.0 {
        5.0
    } else {
        10.0
    };
    nice * mag
}

fn fmt_tick(v: f64, step: f64) -> String {
    if step >= 1.0 {
        let s = format!("{:.0}", v.abs());
        let mut out = String::new();
        for (i, ch) in s.chars().enumerate() {
            if i > 0 && (s.len() - i) % 3 == 0 {
                out.push(',');
            }
            out.push(ch);
        }
        if v < 0.0 { format!("-{out}") } else { out }
    } else {
        let d = (-step.log10().floor()) as usize;
        format!("{v:.d$}")
    }
}

/// Frame, grid, axis titles and y ticks; returns the data → pixel maps.
struct Axes {
    x0: f64,
    x1: f64,
    y1: f64,
}

impl Axes {
    fn px(&self, x: f64) -> f64 {
        LEFT + (x - self.x0) / (self.x1 - self.x0).max(f64::MIN_POSITIVE) * (W - LEFT - RIGHT)
    }
    fn py(&self, y: f64) -> f64 {
        H - BOTTOM - y / self.y1.max(f64::MIN_POSITIVE) * (H - TOP - BOTTOM)
    }
}

fn open_svg(out: &mut String, title: &str) {
    let _ = write!(
        out,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {W} {H}\" role=\"img\" aria-label=\"{}\" font-family=\"DejaVu Sans, Arial, sans-serif\" font-size=\"10\">",
        esc(title)
    );
}

fn y_axis(out: &mut String, a: &Axes, y_title: &str) {
    let step = tick_step(a.y1, 5.0);
    let mut v = 0.0;
    while v <= a.y1 + step * 1e-9 {
        let y = a.py(v);
        let _ = write!(
            out,
            "<line x1=\"{LEFT}\" x2=\"{:.1}\" y1=\"{y:.1}\" y2=\"{y:.1}\" stroke=\"#ddd\" stroke-width=\"0.6\"/><text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">{}</text>",
            W - RIGHT,
            LEFT - 4.0,
            y + 3.5,
            fmt_tick(v, step)
        );
        v += step;
    }
    let _ = write!(
        out,
        "<rect x=\"{LEFT}\" y=\"{TOP}\" width=\"{:.1}\" height=\"{:.1}\" fill=\"none\" stroke=\"#555\" stroke-width=\"0.8\"/><text transform=\"translate(14 {:.1}) rotate(-90)\" text-anchor=\"middle\">{}</text>",
        W - LEFT - RIGHT,
        H - TOP - BOTTOM,
        TOP + (H - TOP - BOTTOM) / 2.0,
        esc(y_title)
    );
}

fn legend(out: &mut String, items: &[(&str, &str, &str, bool)]) {
    // (name, colour, dash, marker)
    let mut x = LEFT;
    let y = H - 10.0;
    for (name, colour, dash, marker) in items {
        if *marker {
            let _ = write!(
                out,
                "<circle cx=\"{:.1}\" cy=\"{:.1}\" r=\"2.6\" fill=\"{colour}\"/>",
                x + 9.0,
                y - 3.5
            );
        } else {
            let _ = write!(
                out,
                "<line x1=\"{x:.1}\" x2=\"{:.1}\" y1=\"{:.1}\" y2=\"{:.1}\" stroke=\"{colour}\" stroke-width=\"2\" stroke-dasharray=\"{dash}\"/>",
                x + 18.0,
                y - 3.5,
                y - 3.5
            );
        }
        let _ = write!(
            out,
            "<text x=\"{:.1}\" y=\"{y:.1}\">{}</text>",
            x + 22.0,
            esc(name)
        );
        x += 34.0 + 6.2 * name.chars().count() as f64;
    }
}

/// A line chart: x categories labelled by `x_labels` at x = 0, 1, …
/// (every `label_every`-th shown), or a numeric x when `x_labels` is empty
/// (then `x_range` and ticks at `x_ticks`).
pub struct LineChart<'a> {
    /// Accessible title.
    pub title: &'a str,
    /// Axis title of x with unit.
    pub x_title: &'a str,
    /// Axis title of y with unit.
    pub y_title: &'a str,
    /// Category labels (x = index).
    pub x_labels: Vec<String>,
    /// Show one label in this many.
    pub label_every: usize,
    /// Numeric x range when there are no categories.
    pub x_range: (f64, f64),
    /// Numeric ticks (value, label) when there are no categories.
    pub x_ticks: Vec<(f64, String)>,
    /// The series.
    pub series: Vec<Series<'a>>,
    /// Reference lines.
    pub hlines: Vec<HLine<'a>>,
}

impl LineChart<'_> {
    /// The SVG text.
    pub fn svg(&self) -> String {
        let y_max = self
            .series
            .iter()
            .flat_map(|s| s.points.iter().map(|p| p.1))
            .chain(self.hlines.iter().map(|h| h.y))
            .filter(|v| v.is_finite())
            .fold(0.0, f64::max);
        let step = tick_step(y_max.max(1e-9) * 1.05, 5.0);
        let y1 = ((y_max * 1.05) / step).ceil().max(1.0) * step;
        let (x0, x1) = if self.x_labels.is_empty() {
            self.x_range
        } else {
            (-0.5, self.x_labels.len() as f64 - 0.5)
        };
        let a = Axes { x0, x1, y1 };
        let mut out = String::new();
        open_svg(&mut out, self.title);
        y_axis(&mut out, &a, self.y_title);
        let base = H - BOTTOM;
        if self.x_labels.is_empty() {
            for (v, label) in &self.x_ticks {
                let x = a.px(*v);
                let _ = write!(
                    out,
                    "<line x1=\"{x:.1}\" x2=\"{x:.1}\" y1=\"{base:.1}\" y2=\"{:.1}\" stroke=\"#555\"/><text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
                    base + 3.0,
                    base + 13.0,
                    esc(label)
                );
            }
        } else {
            for (i, label) in self.x_labels.iter().enumerate() {
                if i % self.label_every.max(1) != 0 {
                    continue;
                }
                let x = a.px(i as f64);
                let _ = write!(
                    out,
                    "<line x1=\"{x:.1}\" x2=\"{x:.1}\" y1=\"{base:.1}\" y2=\"{:.1}\" stroke=\"#555\"/><text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
                    base + 3.0,
                    base + 13.0,
                    esc(label)
                );
            }
        }
        let _ = write!(
            out,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
            LEFT + (W - LEFT - RIGHT) / 2.0,
            base + 27.0,
            esc(self.x_title)
        );
        for h in &self.hlines {
            let y = a.py(h.y);
            let _ = write!(
                out,
                "<line x1=\"{LEFT}\" x2=\"{:.1}\" y1=\"{y:.1}\" y2=\"{y:.1}\" stroke=\"{}\" stroke-width=\"1.4\" stroke-dasharray=\"{}\"/>",
                W - RIGHT,
                h.colour,
                h.dash
            );
        }
        for s in &self.series {
            if s.markers {
                for (x, y) in &s.points {
                    let _ = write!(
                        out,
                        "<circle cx=\"{:.1}\" cy=\"{:.1}\" r=\"2.6\" fill=\"{}\"/>",
                        a.px(*x),
                        a.py(*y),
                        s.colour
                    );
                }
            } else {
                let pts: Vec<String> = s
                    .points
                    .iter()
                    .map(|(x, y)| format!("{:.1},{:.1}", a.px(*x), a.py(*y)))
                    .collect();
                let _ = write!(
                    out,
                    "<polyline points=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"1.8\"/>",
                    pts.join(" "),
                    s.colour
                );
            }
        }
        let mut items: Vec<(&str, &str, &str, bool)> = self
            .series
            .iter()
            .map(|s| (s.name, s.colour, "", s.markers))
            .collect();
        items.extend(
            self.hlines
                .iter()
                .map(|h| (h.name, h.colour, h.dash, false)),
        );
        legend(&mut out, &items);
        out.push_str("</svg>");
        out
    }
}

/// Grouped bars: one group per category, one bar per series.
pub fn grouped_bars(
    title: &str,
    x_title: &str,
    y_title: &str,
    categories: &[&str],
    series: &[(&str, &str, Vec<f64>)],
) -> String {
    let y_max = series
        .iter()
        .flat_map(|s| s.2.iter().copied())
        .filter(|v| v.is_finite())
        .fold(0.0, f64::max);
    let step = tick_step(y_max.max(1e-9) * 1.05, 5.0);
    let y1 = ((y_max * 1.05) / step).ceil().max(1.0) * step;
    let a = Axes {
        x0: -0.5,
        x1: categories.len() as f64 - 0.5,
        y1,
    };
    let mut out = String::new();
    open_svg(&mut out, title);
    y_axis(&mut out, &a, y_title);
    let base = H - BOTTOM;
    let group_w = (W - LEFT - RIGHT) / categories.len().max(1) as f64 * 0.8;
    let bar_w = group_w / series.len().max(1) as f64;
    for (i, c) in categories.iter().enumerate() {
        let cx = a.px(i as f64);
        let _ = write!(
            out,
            "<text x=\"{cx:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
            base + 13.0,
            esc(c)
        );
        for (k, (_, colour, values)) in series.iter().enumerate() {
            let v = values.get(i).copied().unwrap_or(0.0).max(0.0);
            let x = cx - group_w / 2.0 + k as f64 * bar_w;
            let y = a.py(v);
            let _ = write!(
                out,
                "<rect x=\"{x:.1}\" y=\"{y:.1}\" width=\"{:.1}\" height=\"{:.1}\" fill=\"{colour}\"/>",
                bar_w * 0.92,
                (base - y).max(0.0)
            );
        }
    }
    let _ = write!(
        out,
        "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
        LEFT + (W - LEFT - RIGHT) / 2.0,
        base + 27.0,
        esc(x_title)
    );
    let items: Vec<(&str, &str, &str, bool)> =
        series.iter().map(|s| (s.0, s.1, "", false)).collect();
    legend(&mut out, &items);
    out.push_str("</svg>");
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_are_round() {
        assert!((tick_step(4900.0, 5.0) - 1000.0).abs() < 1e-9);
        assert!((tick_step(9.0, 5.0) - 2.0).abs() < 1e-9);
        assert_eq!(fmt_tick(5000.0, 1000.0), "5,000");
        assert_eq!(fmt_tick(0.4, 0.2), "0.4");
    }
}
