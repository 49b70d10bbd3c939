//! The sections of the design report, in order. Each reads the engine's
//! results and writes tables and figures; none computes a model rule.

use std::fmt::Write as _;

use offtake_core::calendar::TenDayPeriod;
use offtake_core::engine::tables::{
    block_gir_monthly, crop_requirements_monthly, ten_day_hydrograph_ls,
};
use offtake_core::project::{CanalKind, Strategy};
use offtake_core::scheme::NodeDesign;

use super::ReportInput;
use super::html::{Doc, Td, esc};
use super::methods::{CAUTION_LINE, CAUTIONS, METHODS};
use super::svg::{HLine, LineChart, PALETTE, Series, grouped_bars};
use crate::results::{fmt_sig3, interval_basis_text, interval_text};

const MONTHS: [&str; 12] = [
    "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
];

/// Whole number with thousands separators.
fn int(v: f64) -> String {
    let s = format!("{:.0}", v.abs());
    let mut out = String::new();
    for (i, ch) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    if v < -0.5 { format!("-{out}") } else { out }
}

fn dec(v: f64, d: usize) -> String {
    format!("{v:.d$}")
}

fn opt(v: Option<f64>, f: impl Fn(f64) -> String) -> String {
    v.map_or_else(|| "—".to_owned(), f)
}

fn pct(v: f64) -> String {
    format!("{:.0}", v * 100.0)
}

/// The report's body: every section in order.
pub fn body(input: &ReportInput<'_>) -> String {
    let mut doc = Doc::default();
    summary(&mut doc, input);
    climate(&mut doc, input);
    crops(&mut doc, input);
    hydrographs(&mut doc, input);
    design(&mut doc, input);
    capacity(&mut doc, input);
    rotation(&mut doc, input);
    scenarios(&mut doc, input);
    methods(&mut doc);
    cautions(&mut doc);
    provenance(&mut doc, input);
    doc.finish();
    doc.body
}

fn node_label(input: &ReportInput<'_>, d: &NodeDesign) -> String {
    match input.project.canal(&d.name) {
        Some(c) if c.name != c.id => format!("{} ({})", c.name, c.id),
        _ => d.name.clone(),
    }
}

fn summary(doc: &mut Doc, input: &ReportInput<'_>) {
    let (p, r) = (input.project, input.results);
    doc.section("summary", "Scheme summary and inputs");
    let _ = writeln!(
        doc.body,
        "<div class=\"title\"><h1>{}</h1><p class=\"subtitle\">Design report of irrigation water demand — {}; made {} by {}.</p></div>",
        esc(&r.scheme_name),
        esc(&r
            .scenario
            .as_deref()
            .map_or_else(|| "base case".to_owned(), |s| format!("scenario {s}"))),
        esc(&input.provenance.generated),
        esc(&input.provenance.program),
    );
    doc.p_class("caution", CAUTION_LINE);
    doc.body.push_str("<ol class=\"toc\">");
    for (id, title) in super::SECTION_IDS.iter().zip(SECTION_TITLES) {
        let _ = write!(doc.body, "<li><a href=\"#{id}\">{}</a></li>", esc(title));
    }
    doc.body.push_str("</ol>\n");
    if !p.scheme.notes.trim().is_empty() {
        doc.p(&p.scheme.notes);
    }
    let last = r.start + chrono::Days::new(r.days.saturating_sub(1) as u64);
    let mut facts: Vec<(&str, String)> = Vec::new();
    if let Some(h) = r.headworks() {
        facts.push((
            "Headworks design flow",
            format!(
                "{} l/s ({} % non-exceedance of the yearly peak {} mean flow, {} years); uncertainty of the record {} l/s, {}",
                fmt_sig3(h.design_flow_ls),
                dec(h.non_exceedance * 100.0, 0),
                h.basis.label(),
                h.years.len(),
                interval_text(&h.design_flow_interval),
                interval_basis_text(&h.design_flow_interval)
            ),
        ));
        facts.push((
            "Area commanded",
            format!(
                "{} ha; duty {} l/s/ha",
                int(h.area_ha),
                opt(h.duty_ls_ha, |v| dec(v, 2))
            ),
        ));
    }
    facts.push((
        "Station",
        format!(
            "latitude {}°, elevation {} m, wind measured at {} m",
            dec(p.weather.latitude_deg, 2),
            dec(p.weather.elevation_m, 0),
            dec(p.weather.wind_height_m, 1)
        ),
    ));
    facts.push((
        "Weather record",
        format!(
            "{}, {} to {}: {} days; {} complete irrigation years from month {}",
            p.weather.path,
            r.start,
            last,
            r.days,
            r.complete_years.len(),
            p.options.irrigation_year_start_month
        ),
    ));
    facts.push((
        "Record quality",
        format!(
            "ET₀ used a FAO-56 missing-data procedure on {} of {} days; mean ET₀ {} mm/day",
            r.et0_estimated_days,
            r.days,
            dec(r.et0_mean_mm_day, 2)
        ),
    ));
    facts.push((
        "Options",
        format!(
            "ET₀ {:?}; effective rain {:?}; design basis {} at {} % non-exceedance; confidence level {} %; rotation period {} days",
            p.options.et0_method,
            p.options.effective_rain,
            r.design.first().map_or("10-day", |d| d.basis.label()),
            dec(p.options.design_probability_pct, 0),
            dec(p.options.design_confidence_pct, 0),
            p.options.rotation_period_days
        ),
    ));
    doc.facts(&facts);
    if !r.warnings.is_empty() {
        doc.h3("Warnings of the run (data quality and checks)");
        doc.body.push_str("<ul>");
        for w in &r.warnings {
            let _ = write!(doc.body, "<li>{}</li>", esc(w));
        }
        doc.body.push_str("</ul>\n");
    }
    doc.h3("Canals");
    let rows: Vec<Vec<Td>> = p
        .canals
        .iter()
        .map(|c| {
            vec![
                Td::text(&c.id),
                Td::text(&c.name),
                Td::text(match c.kind {
                    CanalKind::Main => "main",
                    CanalKind::Branch => "branch",
                    CanalKind::Distributary => "distributary",
                    CanalKind::Minor => "minor",
                }),
                Td::text(c.parent.as_deref().unwrap_or("headworks")),
                Td::num(pct(c.conveyance_efficiency)),
                Td::num(dec(c.operating_hours_per_day, 1)),
                Td::num(opt(c.existing_capacity_m3s, |v| dec(v, 3))),
            ]
        })
        .collect();
    doc.table(
        "Canals: conveyance efficiency Ec, hours of operation and existing capacity.",
        &[
            "Id",
            "Name",
            "Kind",
            "Takes from",
            "Ec (%)",
            "Hours (h/day)",
            "Existing capacity (m³/s)",
        ],
        &rows,
    );
    doc.h3("Blocks");
    let rows: Vec<Vec<Td>> = p
        .blocks
        .iter()
        .map(|b| {
            vec![
                Td::text(&b.id),
                Td::text(&b.name),
                Td::text(&b.canal),
                Td::num(dec(b.area_ha, 1)),
                Td::text(&b.soil),
                Td::text(&b.method.name),
                Td::num(pct(b.method.application_efficiency)),
                Td::num(pct(b.field_canal_efficiency)),
            ]
        })
        .collect();
    doc.table(
        "Blocks: area, soil, irrigation method, field application efficiency Ea and field-canal efficiency Eb.",
        &[
            "Id", "Name", "Canal", "Area (ha)", "Soil", "Method", "Ea (%)", "Eb (%)",
        ],
        &rows,
    );
    doc.h3("Plantings");
    let rows: Vec<Vec<Td>> = p
        .plantings
        .iter()
        .map(|pl| {
            vec![
                Td::text(&pl.id),
                Td::text(&pl.block),
                Td::text(&pl.crop),
                Td::text(&pl.season),
                Td::num(opt(p.planting_area_ha(pl), |v| dec(v, 1))),
                Td::text(format!(
                    "{} {}",
                    pl.first_planting.day,
                    MONTHS
                        .get(pl.first_planting.month.saturating_sub(1) as usize)
                        .unwrap_or(&"?")
                )),
                Td::num(pl.spread_days.to_string()),
                Td::text(strategy_text(pl.strategy)),
            ]
        })
        .collect();
    doc.table(
        "Plantings: crop, season, area, first planting day, planting window and irrigation strategy.",
        &[
            "Id",
            "Block",
            "Crop",
            "Season",
            "Area (ha)",
            "First planting",
            "Window (days)",
            "Strategy",
        ],
        &rows,
    );
}

/// Titles of the sections, in the order of [`super::SECTION_IDS`].
const SECTION_TITLES: [&str; 11] = [
    "Scheme summary and inputs",
    "ET₀ and rain by month",
    "Crop and block requirements",
    "Demand hydrograph and design basis per canal",
    "Design values",
    "Capacity checks",
    "Rotation and operation",
    "Scenario comparison",
    "Methods and sources",
    "Cautions",
    "About this report",
];

fn strategy_text(s: Strategy) -> String {
    match s {
        Strategy::Refill { trigger_pct_of_raw } => {
            format!("refill at {} % of RAW", dec(trigger_pct_of_raw, 0))
        }
        Strategy::Interval { days } => format!("every {days} days"),
        Strategy::Depth { net_mm } => format!("{} mm net at RAW", dec(net_mm, 0)),
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => format!(
            "deficit: at {} % of TAW, refill {} %",
            dec(trigger_pct_of_taw, 0),
            dec(refill_pct_of_depletion, 0)
        ),
        Strategy::Rainfed => "rainfed".to_owned(),
    }
}

fn climate(doc: &mut Doc, input: &ReportInput<'_>) {
    let c = &input.results.climate;
    doc.section("climate", SECTION_TITLES[1]);
    let p = dec(c.probability * 100.0, 0);
    doc.p(&format!(
        "Monthly totals of the station's ET₀ (by the project's method, after gap filling) and rain, over the {} complete irrigation years. Dependable ET₀ is the {p} % non-exceedance value of the month's totals; dependable rain is the {p} % exceedance value (the depth equalled or exceeded in {p} % of years); Weibull plotting positions m/(n+1).",
        c.years
    ));
    let mut rows: Vec<Vec<Td>> = (0..12)
        .map(|m| {
            vec![
                Td::text(MONTHS[m]),
                Td::num(dec(c.et0_mean_mm[m], 1)),
                Td::num(dec(c.et0_dependable_mm[m], 1)),
                Td::num(dec(c.rain_mean_mm[m], 1)),
                Td::num(dec(c.rain_dependable_mm[m], 1)),
            ]
        })
        .collect();
    rows.push(vec![
        Td::text("Year (mean)"),
        Td::num(dec(c.et0_mean_mm.iter().sum(), 0)),
        Td::text(""),
        Td::num(dec(c.rain_mean_mm.iter().sum(), 0)),
        Td::text(""),
    ]);
    let et0_dep = format!("ET₀ {p} % non-exceedance (mm)");
    let rain_dep = format!("Rain {p} % exceedance (mm)");
    doc.table(
        "ET₀ and rain per calendar month, mean and dependable.",
        &[
            "Month",
            "ET₀ mean (mm)",
            &et0_dep,
            "Rain mean (mm)",
            &rain_dep,
        ],
        &rows,
    );
    let svg = grouped_bars(
        "Monthly ET₀ and rain",
        "Calendar month",
        "Depth (mm/month)",
        &MONTHS,
        &[
            ("ET₀ mean", PALETTE[0], c.et0_mean_mm.to_vec()),
            ("Rain mean", PALETTE[5], c.rain_mean_mm.to_vec()),
            (&rain_dep, PALETTE[1], c.rain_dependable_mm.to_vec()),
        ],
    );
    doc.figure(
        &svg,
        "Mean monthly ET₀ and rain, and dependable rain (the numbers of the table above).",
    );
}

fn crops(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    doc.section("crops", SECTION_TITLES[2]);
    doc.p("Per crop and season, the calendar months in which the crop uses water: ET₀ of the month, the month's mean crop coefficient (ETc ÷ ET₀, days out of the field counted as 0), crop ET, effective rain and NIR (area-weighted depths per hectare planted), and the gross requirement at the block outlets, GIR = NIR × area ÷ (Ea × Eb). Means over the complete irrigation years; the columns are those of crop_requirements_monthly.csv.");
    let rows = crop_requirements_monthly(r);
    let mut seasons: Vec<&str> = Vec::new();
    for row in &rows {
        if !seasons.contains(&row.season.as_str()) {
            seasons.push(&row.season);
        }
    }
    for season in seasons {
        doc.h3(&format!("Season {season}"));
        let cells: Vec<Vec<Td>> = rows
            .iter()
            .filter(|x| x.season == season)
            .map(|x| {
                vec![
                    Td::text(&x.season),
                    Td::text(&x.crop),
                    Td::num(x.month.to_string()),
                    Td::num(dec(x.area_ha, 1)),
                    Td::num(dec(x.et0_mm, 1)),
                    Td::num(dec(x.kc_mean, 2)),
                    Td::num(dec(x.etc_mm, 1)),
                    Td::num(dec(x.peff_mm, 1)),
                    Td::num(dec(x.nir_mm, 1)),
                    Td::num(int(x.gir_m3)),
                ]
            })
            .collect();
        doc.table(
            &format!("Crop requirements by month, season {season}."),
            &[
                "season", "crop", "month", "area_ha", "et0_mm", "kc_mean", "etc_mm", "peff_mm",
                "nir_mm", "gir_m3",
            ],
            &cells,
        );
    }
    doc.h3("Gross requirement per block");
    let blocks = block_gir_monthly(r);
    let mut headers: Vec<&str> = vec!["Block", "Area (ha)"];
    headers.extend(MONTHS);
    headers.push("Year (mm)");
    headers.push("Year (1000 m³)");
    let cells: Vec<Vec<Td>> = blocks
        .iter()
        .map(|b| {
            let mut row = vec![Td::text(&b.block), Td::num(dec(b.area_ha, 0))];
            row.extend(b.gir_mm.iter().map(|v| Td::num(dec(*v, 0))));
            row.push(Td::num(dec(b.gir_mm.iter().sum(), 0)));
            row.push(Td::num(int(b.gir_m3.iter().sum::<f64>() / 1000.0)));
            row
        })
        .collect();
    doc.table(
        "Gross irrigation requirement at each block outlet by calendar month (mm over the block; mean over the complete irrigation years).",
        &headers,
        &cells,
    );
    doc.p_class(
        "note",
        "Supply indicators and the season plan of an operation plan are shown when the project has one; this project's run has none.",
    );
}

fn hydrographs(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    doc.section("hydrographs", SECTION_TITLES[3]);
    let first_month = r
        .complete_years
        .first()
        .map_or(1, |y| chrono::Datelike::month(&y.start()));
    doc.p("For each canal and the headworks: the mean demand in each 10-day period of the irrigation year over the complete years (the hydrograph), and the yearly peaks on the design basis ranked against their Weibull plotting positions, with the design flow and its confidence interval. Demand is the 24-hour mean flow at the head of the canal.");
    let labels: Vec<String> = (0..36)
        .map(|i| {
            let m = (first_month as usize - 1 + i / 3) % 12;
            format!("{} {}", MONTHS[m], i % 3 + 1)
        })
        .collect();
    for d in &r.design {
        let name = node_label(input, d);
        // A node's heading and its two figures stay on one page.
        doc.body.push_str("<div class=\"keep\">");
        doc.h3(&name);
        let hydro = ten_day_hydrograph_ls(r, d.node);
        let mut hlines = vec![HLine {
            name: "design flow",
            y: d.design_flow_ls,
            colour: PALETTE[3],
            dash: "7 3",
        }];
        if let Some(c) = d.existing_capacity_ls {
            hlines.push(HLine {
                name: "existing capacity",
                y: c,
                colour: PALETTE[4],
                dash: "2 2",
            });
        }
        let chart = LineChart {
            title: &format!("Demand hydrograph of {name}"),
            x_title: "10-day period of the irrigation year",
            y_title: "Mean flow (l/s)",
            x_labels: labels.clone(),
            label_every: 3,
            x_range: (0.0, 1.0),
            x_ticks: Vec::new(),
            series: vec![Series {
                name: "mean 10-day demand",
                points: hydro
                    .iter()
                    .enumerate()
                    .map(|(i, v)| (i as f64, *v))
                    .collect(),
                colour: PALETTE[0],
                markers: false,
            }],
            hlines,
        };
        doc.figure(
            &chart.svg(),
            &format!(
                "Demand hydrograph of {name}: mean flow of each 10-day period over {} complete years, design flow {} l/s.",
                d.years.len(),
                fmt_sig3(d.design_flow_ls)
            ),
        );
        let mut peaks: Vec<f64> = d.years.iter().map(|y| y.peak_ls(d.basis)).collect();
        peaks.sort_by(f64::total_cmp);
        let n = peaks.len();
        let mut hlines = vec![HLine {
            name: "design flow",
            y: d.design_flow_ls,
            colour: PALETTE[3],
            dash: "7 3",
        }];
        if let Some(l) = d.design_flow_interval.lower {
            hlines.push(HLine {
                name: "interval low",
                y: l,
                colour: PALETTE[2],
                dash: "3 3",
            });
        }
        if let Some(u) = d.design_flow_interval.upper {
            hlines.push(HLine {
                name: "interval high",
                y: u,
                colour: PALETTE[2],
                dash: "1 3",
            });
        }
        let chart = LineChart {
            title: &format!("Ranked yearly peaks of {name}"),
            x_title: "Non-exceedance probability m/(n+1) (%)",
            y_title: &format!("Yearly peak {} flow (l/s)", d.basis.label()),
            x_labels: Vec::new(),
            label_every: 1,
            x_range: (0.0, 100.0),
            x_ticks: (0..=10)
                .map(|k| (f64::from(k) * 10.0, format!("{}", k * 10)))
                .collect(),
            series: vec![Series {
                name: "yearly peak",
                points: peaks
                    .iter()
                    .enumerate()
                    .map(|(i, v)| (100.0 * (i + 1) as f64 / (n + 1) as f64, *v))
                    .collect(),
                colour: PALETTE[0],
                markers: true,
            }],
            hlines,
        };
        doc.figure(
            &chart.svg(),
            &format!(
                "Design basis of {name}: the {n} yearly peaks (Table of ranked peaks below), design flow at {} % and its {}.",
                dec(d.non_exceedance * 100.0, 0),
                interval_basis_text(&d.design_flow_interval)
            ),
        );
        doc.body.push_str("</div>\n");
    }
    ranked_peaks_table(doc, input);
}

fn ranked_peaks_table(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    let Some(first) = r.design.first() else {
        return;
    };
    let n = first.years.len();
    let sorted: Vec<Vec<f64>> = r
        .design
        .iter()
        .map(|d| {
            let mut v: Vec<f64> = d.years.iter().map(|y| y.peak_ls(d.basis)).collect();
            v.sort_by(f64::total_cmp);
            v
        })
        .collect();
    let names: Vec<String> = r
        .design
        .iter()
        .map(|d| format!("{} (l/s)", d.name))
        .collect();
    let mut headers: Vec<&str> = vec!["Rank m", "m/(n+1) (%)"];
    headers.extend(names.iter().map(String::as_str));
    let rows: Vec<Vec<Td>> = (0..n)
        .map(|i| {
            let mut row = vec![
                Td::num((i + 1).to_string()),
                Td::num(dec(100.0 * (i + 1) as f64 / (n + 1) as f64, 1)),
            ];
            row.extend(sorted.iter().map(|v| Td::num(int(v[i]))));
            row
        })
        .collect();
    doc.h3("Ranked yearly peaks");
    doc.table(
        &format!(
            "Yearly peak {} mean flows of every node, ranked from the smallest (n = {n} complete irrigation years). The design flow at probability p lies at rank p(n+1), interpolated; the confidence bounds are the order statistics named in the design values.",
            first.basis.label()
        ),
        &headers,
        &rows,
    );
    let years: Vec<Vec<Td>> = first
        .years
        .iter()
        .enumerate()
        .map(|(k, y)| {
            let mut row = vec![Td::text(y.year.label())];
            row.extend(r.design.iter().map(|d| {
                let v = d.years[k];
                Td::num(format!(
                    "{} ({})",
                    int(v.peak_ls(d.basis)),
                    match d.basis {
                        offtake_core::scheme::DesignBasis::TenDay =>
                            period_label(v.peak_10day_period),
                        offtake_core::scheme::DesignBasis::Monthly =>
                            v.peak_month.start().format("%b").to_string(),
                        offtake_core::scheme::DesignBasis::Daily =>
                            v.peak_daily_date.format("%d %b").to_string(),
                    }
                ))
            }));
            row
        })
        .collect();
    let mut headers: Vec<&str> = vec!["Irrigation year"];
    headers.extend(names.iter().map(String::as_str));
    doc.table(
        "Yearly peaks by irrigation year, with the period in which each occurred.",
        &headers,
        &years,
    );
}

fn period_label(p: TenDayPeriod) -> String {
    p.label()
}

fn design(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    doc.section("design", SECTION_TITLES[4]);
    if let Some(first) = r.design.first() {
        doc.p(&format!(
            "Design flow of a node: the {} % non-exceedance value of its yearly peak {} mean flows over the complete irrigation years (Weibull plotting positions m/(n+1), interpolated between ranks; rank r = p(n+1)). Beside it, a distribution-free {} % confidence interval of that quantile from the order statistics of the yearly peaks (binomial ranks, Hahn and Meeker 1991): equal tails, coverage at least nominal, the achieved coverage given. A bound that no order statistic reaches is left open: the true value may lie beyond the record.",
            dec(first.non_exceedance * 100.0, 0),
            first.basis.label(),
            dec(first.design_flow_interval.ranks.level * 100.0, 0)
        ));
    }
    let rows: Vec<Vec<Td>> = r
        .design
        .iter()
        .map(|d| {
            let i = &d.design_flow_interval;
            let node = esc(&d.name);
            vec![
                Td::text(node_label(input, d)),
                Td::num(int(d.area_ha)),
                Td::num(fmt_sig3(d.design_flow_ls))
                    .with_attrs(format!("class=\"n q-design\" data-node=\"{node}\"")),
                Td::num(
                    i.lower
                        .map_or_else(|| "below smallest of record".into(), fmt_sig3),
                )
                .with_attrs(format!("class=\"n q-low\" data-node=\"{node}\"")),
                Td::num(
                    i.upper
                        .map_or_else(|| "above largest of record".into(), fmt_sig3),
                )
                .with_attrs(format!("class=\"n q-high\" data-node=\"{node}\"")),
                Td::num(format!(
                    "{} / {}",
                    i.ranks
                        .lower_rank
                        .map_or_else(|| "—".into(), |v| v.to_string()),
                    i.ranks
                        .upper_rank
                        .map_or_else(|| "—".into(), |v| v.to_string())
                )),
                Td::num(dec(i.ranks.coverage * 100.0, 1)),
                Td::num(d.years.len().to_string()),
                Td::num(dec(d.non_exceedance * (d.years.len() + 1) as f64, 2)),
                Td::text(d.design_year.label()),
            ]
        })
        .collect();
    doc.table(
        "Design flows and their uncertainty (flows to 3 significant figures).",
        &[
            "Node",
            "Area (ha)",
            "Design flow (l/s)",
            "Interval low (l/s)",
            "Interval high (l/s)",
            "Ranks l / u",
            "Coverage (%)",
            "Years n",
            "Rank p(n+1)",
            "Design year",
        ],
        &rows,
    );
    let rows: Vec<Vec<Td>> = r
        .design
        .iter()
        .map(|d| {
            vec![
                Td::text(&d.name),
                Td::num(opt(d.duty_ls_ha, |v| dec(v, 2))),
                Td::num(opt(d.duty_ha_per_m3s, int)),
                Td::num(dec(d.hours_per_day, 1)),
                Td::num(fmt_sig3(d.required_capacity_ls)),
                Td::num(opt(d.existing_capacity_ls, int)),
                Td::num(int(d.peak_10day_ls)),
                Td::num(int(d.peak_daily_ls)),
                Td::num(dec(d.seasonal_volume_m3 / 1.0e6, 2)),
                Td::num(dec(d.delta_mm, 0)),
            ]
        })
        .collect();
    doc.table(
        "Duty and required capacity (required capacity = design flow × 24 ÷ hours of operation); largest 10-day and daily flows of the record; mean yearly volume and delta.",
        &[
            "Node",
            "Duty (l/s/ha)",
            "Duty (ha per m³/s)",
            "Hours (h/day)",
            "Required capacity (l/s)",
            "Existing capacity (l/s)",
            "Largest 10-day (l/s)",
            "Largest daily (l/s)",
            "Volume (Mm³/year)",
            "Delta (mm)",
        ],
        &rows,
    );
}

fn capacity(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    doc.section("capacity", SECTION_TITLES[5]);
    let with_cap: Vec<&NodeDesign> = r
        .design
        .iter()
        .filter(|d| d.existing_capacity_ls.is_some())
        .collect();
    if with_cap.is_empty() {
        doc.p("No canal has an existing capacity: there is nothing to check.");
        return;
    }
    doc.p("A canal's existing capacity against its required capacity. The shortfall is on the design basis: a period is short when its mean demand exceeds what the canal can carry. When the existing capacity lies inside the confidence interval of the required capacity, the verdict is within the uncertainty of the record: another record of the same length could reverse it.");
    let rows: Vec<Vec<Td>> = with_cap
        .iter()
        .map(|d| {
            let cap = d.existing_capacity_ls.unwrap_or(0.0);
            let verdict = if d.required_capacity_ls > cap {
                "too small"
            } else {
                "sufficient"
            };
            let within = if d.capacity_within_uncertainty() == Some(true) {
                "within the uncertainty of the record"
            } else {
                "outside the interval"
            };
            let (periods, years, volume) = d.shortfall.as_ref().map_or((0, 0, 0.0), |s| {
                (
                    s.basis_periods.len(),
                    s.years_short.len(),
                    s.basis_volume_not_delivered_m3,
                )
            });
            vec![
                Td::text(node_label(input, d)),
                Td::num(int(cap)),
                Td::num(fmt_sig3(d.required_capacity_ls)),
                Td::num(interval_text(&d.required_capacity_interval())),
                Td::text(verdict),
                Td::text(within),
                Td::num(periods.to_string()),
                Td::num(format!("{years} of {}", d.years.len())),
                Td::num(int(volume)),
            ]
        })
        .collect();
    doc.table(
        "Capacity checks of the canals with an existing capacity.",
        &[
            "Canal",
            "Existing (l/s)",
            "Required (l/s)",
            "Required, interval (l/s)",
            "Verdict",
            "Uncertainty",
            "Short periods",
            "Years short",
            "Not delivered (m³, record)",
        ],
        &rows,
    );
    for d in with_cap {
        if let Some(s) = &d.shortfall
            && s.basis != offtake_core::scheme::DesignBasis::Daily
        {
            doc.p_class(
                "note",
                &format!(
                    "{}: daily peaks, for information and not the design basis: the daily demand exceeds the capacity on {} days of the record.",
                    d.name,
                    s.days.len()
                ),
            );
        }
    }
}

fn rotation(doc: &mut Doc, input: &ReportInput<'_>) {
    let r = input.results;
    doc.section("rotation", SECTION_TITLES[6]);
    let Some(sp) = &r.supply else {
        doc.p("No available supply is given: the demand is assumed met every day, and no rotation roster is made.");
        return;
    };
    let mut facts: Vec<(&str, String)> = vec![
        ("Supply given at", sp.supply_node.clone()),
        ("Days short", format!("{} of {}", sp.short_days, r.days)),
        (
            "Rotation among",
            format!(
                "the offtakes of {} every {} days",
                sp.rotation_node, input.project.options.rotation_period_days
            ),
        ),
        (
            "Relative irrigation supply",
            opt(sp.relative_irrigation_supply, |v| dec(v, 2)),
        ),
        (
            "Relative water supply (Levine 1982)",
            opt(sp.relative_water_supply, |v| dec(v, 2)),
        ),
        (
            "FAO-33 yield loss (area-weighted)",
            opt(sp.mean_yield_loss_pct, |v| format!("{} %", dec(v, 1))),
        ),
    ];
    if let Some(roster) = &sp.roster {
        facts.push(("Roster lines", roster.entries.len().to_string()));
    }
    doc.facts(&facts);
    let rows: Vec<Vec<Td>> = sp
        .blocks
        .iter()
        .map(|b| {
            vec![
                Td::text(&b.block),
                Td::num(opt(b.relative_irrigation_supply, |v| dec(v, 2))),
            ]
        })
        .collect();
    doc.table(
        "Relative irrigation supply of each block (delivered ÷ GIR at the outlet over the complete years).",
        &["Block", "Relative irrigation supply"],
        &rows,
    );
    if let Some(roster) = &sp.roster {
        let rows: Vec<Vec<Td>> = roster
            .entries
            .iter()
            .take(24)
            .map(|e| {
                vec![
                    Td::num(e.cycle.to_string()),
                    Td::num(e.turn.to_string()),
                    Td::text(&e.unit_name),
                    Td::text(e.start.format("%Y-%m-%d %H:%M").to_string()),
                    Td::text(e.end.format("%Y-%m-%d %H:%M").to_string()),
                    Td::num(int(e.flow_ls)),
                    Td::num(int(e.volume_m3)),
                ]
            })
            .collect();
        doc.table(
            &format!(
                "First turns of the roster ({} lines in all; the whole roster is in roster.csv).",
                roster.entries.len()
            ),
            &[
                "Cycle",
                "Turn",
                "Unit",
                "Start",
                "End",
                "Flow (l/s)",
                "Volume (m³)",
            ],
            &rows,
        );
    }
}

fn scenarios(doc: &mut Doc, input: &ReportInput<'_>) {
    doc.section("scenarios", SECTION_TITLES[7]);
    let Some(c) = input.comparison.filter(|c| !c.columns.is_empty()) else {
        doc.p("The project has no scenarios.");
        return;
    };
    let mut headers: Vec<&str> = vec!["Figure"];
    headers.extend(c.columns.iter().map(|col| col.name.as_str()));
    let mut rows: Vec<Vec<Td>> = Vec::new();
    for crop in &c.crops {
        let mut row = vec![Td::text(format!("Area {crop} (ha)"))];
        row.extend(c.columns.iter().map(|col| {
            Td::num(int(col
                .area_by_crop
                .iter()
                .find(|(k, _)| k == crop)
                .map_or(0.0, |(_, a)| *a)))
        }));
        rows.push(row);
    }
    let mut line = |label: &str, f: &dyn Fn(&offtake_core::engine::ScenarioColumn) -> String| {
        let mut row = vec![Td::text(label)];
        row.extend(c.columns.iter().map(|col| Td::num(f(col))));
        rows.push(row);
    };
    line("Headworks volume (Mm³/year)", &|col| {
        dec(col.headworks_volume_m3 / 1.0e6, 2)
    });
    line("Headworks design flow (l/s)", &|col| {
        fmt_sig3(col.design_flow_ls)
    });
    line("Headworks duty (l/s/ha)", &|col| {
        opt(col.duty_ls_ha, |v| dec(v, 2))
    });
    line("Design year", &|col| col.design_year.clone());
    line("Not delivered by short canals (m³/year)", &|col| {
        int(col.shortfall_m3_per_year)
    });
    line("Years with a short canal", &|col| {
        format!("{} of {}", col.shortfall_years, col.complete_years)
    });
    line("Relative irrigation supply", &|col| {
        opt(col.relative_irrigation_supply, |v| dec(v, 2))
    });
    doc.table("Scenarios side by side.", &headers, &rows);
    for (name, err) in &c.failed {
        doc.p_class(
            "caution",
            &format!("Scenario {name} could not be computed: {err}"),
        );
    }
}

fn methods(doc: &mut Doc) {
    doc.section("methods", SECTION_TITLES[8]);
    doc.p("Each step from weather to design flow uses a published method; equation numbers refer to the source named.");
    for m in &METHODS {
        doc.h3(m.quantity);
        doc.p(m.method);
        doc.p_class("note", m.source);
    }
}

fn cautions(doc: &mut Doc) {
    doc.section("cautions", SECTION_TITLES[9]);
    for c in CAUTIONS {
        doc.p_class("caution", c);
    }
    doc.p("The confidence intervals of the design flows describe only the sampling spread of the yearly peaks of this record; they do not cover errors of the inputs (weather, crop and soil parameters, efficiencies) nor a change of climate.");
}

fn provenance(doc: &mut Doc, input: &ReportInput<'_>) {
    let pv = input.provenance;
    doc.section("provenance", SECTION_TITLES[10]);
    doc.facts(&[
        ("Program", pv.program.clone()),
        ("Made", pv.generated.clone()),
        (
            "Computed",
            input
                .results
                .scenario
                .as_deref()
                .map_or_else(|| "base case".to_owned(), |s| format!("scenario {s}")),
        ),
    ]);
    let rows: Vec<Vec<Td>> = pv
        .inputs
        .iter()
        .map(|(name, bytes, digest)| {
            vec![
                Td::text(name),
                Td::num(int(*bytes as f64)),
                Td::text(digest).with_attrs("class=\"digest\"".into()),
            ]
        })
        .collect();
    doc.table(
        "Input files of this report and their SHA-256 digests (FIPS 180-4): a file with the same digest is the same file.",
        &["File", "Bytes", "SHA-256"],
        &rows,
    );
    doc.p_class("note", "Every number in this report comes from the same computation as the tables that offtake run writes (design_values.csv, crop_requirements_monthly.csv and the others).");
}
