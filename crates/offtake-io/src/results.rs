//! The result tables of a computed project, shared by `offtake run` and the
//! app's File › Export so that both write the same files (DESIGN.md
//! "Headless command contract"): `design_values.csv`,
//! `node_demand_daily.csv`, `block_requirements_daily.csv`,
//! `demand_10day.csv`, `demand_monthly.csv`, `roster.csv` (when supply is
//! short) and `results.xlsx` (summary, design values, 10-day and monthly
//! tables, roster; daily tables stay in CSV), plus the text summary with
//! units that `offtake run` prints.

use std::fmt::Write as _;
use std::path::Path;

use crate::export::{
    self, BLOCK_REQUIREMENTS_DAILY_CSV, BLOCK_REQUIREMENTS_DAILY_HEADERS, Cell, DESIGN_VALUES_CSV,
    DESIGN_VALUES_HEADERS, ExportError, NODE_DEMAND_DAILY_CSV, NODE_DEMAND_DAILY_HEADERS,
    RESULTS_WORKBOOK, Table, decimals as dec,
};
use crate::results_set::{FileWriter, SetOrigin, write_file_set};
use offtake_core::engine::Results;
use offtake_core::project::Project;
use offtake_core::scheme::{DesignBasis, Node, PeriodStep};

/// 10-day table file.
pub const DEMAND_10DAY_CSV: &str = "demand_10day.csv";
/// Monthly table file.
pub const DEMAND_MONTHLY_CSV: &str = "demand_monthly.csv";
/// Period table header.
pub const PERIOD_HEADERS: [&str; 6] = [
    "node",
    "period_start",
    "period_days",
    "mean_flow_ls",
    "volume_m3",
    "depth_mm",
];
/// Roster file.
pub const ROSTER_CSV: &str = "roster.csv";
/// Roster header.
pub const ROSTER_HEADERS: [&str; 7] = [
    "cycle",
    "turn",
    "unit",
    "start",
    "end",
    "flow_ls",
    "volume_m3",
];

fn fmt_int(v: f64) -> String {
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

/// A value to 3 significant figures, with thousands separators
/// (5,575.2 → "5,580"; 638.8 → "639"; 1.9159 → "1.92").
pub fn fmt_sig3(v: f64) -> String {
    if v == 0.0 || !v.is_finite() {
        return format!("{v}");
    }
    let digits_of = |x: f64| x.abs().log10().floor() as i32 + 1;
    let unit = 10_f64.powi(digits_of(v) - 3);
    let v = (v / unit).round() * unit;
    // Rounding may add a digit (99.96 → 100).
    let digits = digits_of(v);
    if digits >= 3 {
        fmt_int(v)
    } else {
        let decimals = usize::try_from(3 - digits).unwrap_or(0);
        format!("{v:.decimals$}")
    }
}

fn fmt_opt(v: Option<f64>, decimals: usize) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{x:.decimals$}"))
}

/// The printed summary.
pub fn summary_text(r: &Results, project: &Project) -> String {
    let mut s = String::new();
    let o = &project.options;
    let _ = writeln!(
        s,
        "{} — {}",
        r.scheme_name,
        r.scenario
            .as_deref()
            .map_or_else(|| "base case".to_owned(), |n| format!("scenario {n}"))
    );
    let last = r.start + chrono::Days::new(r.days.saturating_sub(1) as u64);
    let _ = writeln!(
        s,
        "Weather {} to {} ({} days); {} complete irrigation years starting in month {}; mean ET0 {:.2} mm/day",
        r.start,
        last,
        r.days,
        r.complete_years.len(),
        o.irrigation_year_start_month,
        r.et0_mean_mm_day
    );
    if let Some(h) = r.headworks() {
        let _ = writeln!(
            s,
            "Headworks design flow: {} l/s ({:.2} m3/s), {:.0} % non-exceedance of the yearly peak {} mean flow; design year {}",
            fmt_int(h.design_flow_ls),
            h.design_flow_ls / 1000.0,
            h.non_exceedance * 100.0,
            match h.basis {
                DesignBasis::TenDay => "10-day",
                DesignBasis::Monthly => "monthly",
                DesignBasis::Daily => "daily",
            },
            h.design_year.label()
        );
        let _ = writeln!(
            s,
            "Peak duty at the headworks: {} l/s/ha over {} ha ({} ha per m3/s); largest daily flow {} l/s",
            fmt_opt(h.duty_ls_ha, 2),
            fmt_int(h.area_ha),
            h.duty_ha_per_m3s.map_or_else(|| "-".into(), fmt_int),
            fmt_int(h.peak_daily_ls)
        );
    }
    design_table(&mut s, r);
    let _ = writeln!(s, "Seasonal volume (mean per irrigation year):");
    for v in &r.season_volumes {
        let _ = writeln!(
            s,
            "  {:<12} {:>14} m3 at the headworks  ({} m3 NIR at the fields)",
            v.season,
            fmt_int(v.headworks_m3),
            fmt_int(v.nir_m3)
        );
    }
    if let Some(st) = &r.storage {
        let _ = writeln!(
            s,
            "Reservoir {} evaporation ({:?}): {} m3/year, beside (not included in) the headworks demand",
            st.reservoir,
            st.method,
            fmt_int(st.mean_yearly_m3)
        );
    }
    let with_cap: Vec<_> = r
        .design
        .iter()
        .filter(|d| d.existing_capacity_ls.is_some())
        .collect();
    if with_cap.is_empty() {
        let _ = writeln!(s, "No canal has an existing capacity.");
    } else {
        let basis = with_cap.first().map_or(DesignBasis::TenDay, |d| d.basis);
        let _ = writeln!(
            s,
            "Canals with an existing capacity (shortfall on the design basis: a {} period is short when its mean flow exceeds the capacity):",
            basis.label()
        );
        for d in with_cap {
            let cap = d.existing_capacity_ls.unwrap_or(0.0);
            let _ = writeln!(
                s,
                "  {}: capacity {} l/s, required {} l/s ({})",
                d.name,
                fmt_int(cap),
                fmt_int(d.required_capacity_ls),
                if d.required_capacity_ls > cap {
                    "TOO SMALL"
                } else {
                    "sufficient"
                },
            );
            if let Some(f) = &d.shortfall {
                let years: Vec<String> = f.years_short.iter().map(|y| y.label()).collect();
                let _ = writeln!(
                    s,
                    "    {} mean flow above capacity in {} {}, in {} of {} complete years{}; {} m3 not delivered over the record",
                    f.basis.label(),
                    f.basis_periods.len(),
                    f.basis.periods_noun(),
                    f.years_short.len(),
                    d.years.len(),
                    if years.is_empty() || years.len() > 8 {
                        String::new()
                    } else {
                        format!(" ({})", years.join(", "))
                    },
                    fmt_int(f.basis_volume_not_delivered_m3)
                );
                if f.basis != DesignBasis::Daily {
                    let _ = writeln!(
                        s,
                        "    daily peaks (for information, not the design basis): daily demand above capacity on {} days",
                        f.days.len()
                    );
                }
            }
        }
    }
    if let Some(sp) = &r.supply {
        if sp.short_days == 0 {
            let _ = writeln!(
                s,
                "Available supply at {} covers the demand every day (continuous flow).",
                sp.supply_node
            );
        } else {
            let _ = writeln!(
                s,
                "Available supply at {} falls short on {} days: rotation among the offtakes of {} every {} days ({} roster lines)",
                sp.supply_node,
                sp.short_days,
                sp.rotation_node,
                o.rotation_period_days,
                sp.roster.as_ref().map_or(0, |x| x.entries.len())
            );
            let _ = writeln!(
                s,
                "  relative irrigation supply {}, relative water supply (Levine 1982) {}, FAO-33 yield loss {} % (area-weighted)",
                fmt_opt(sp.relative_irrigation_supply, 2),
                fmt_opt(sp.relative_water_supply, 2),
                fmt_opt(sp.mean_yield_loss_pct, 1)
            );
        }
    }
    let _ = writeln!(s, "Warnings: {}", r.warnings.len());
    for w in r.warnings.iter().take(15) {
        let _ = writeln!(s, "  - {w}");
    }
    if r.warnings.len() > 15 {
        let _ = writeln!(s, "  ... {} more", r.warnings.len() - 15);
    }
    let _ = writeln!(
        s,
        "Computed in {:.2} s. Planning estimates: canal and structure designs must be checked by a qualified engineer against local codes and measured data.",
        r.timing.total.as_secs_f64()
    );
    s
}

/// The per-canal design flow table of the summary: every canal and the
/// headworks, design flow and capacities to 3 significant figures.
fn design_table(s: &mut String, r: &Results) {
    let Some(first) = r.design.first() else {
        return;
    };
    let _ = writeln!(
        s,
        "Design flows per canal ({:.0} % non-exceedance of the yearly peak {} mean flow over {} complete irrigation years; flows to 3 significant figures):",
        first.non_exceedance * 100.0,
        first.basis.label(),
        first.years.len()
    );
    let head = [
        "node",
        "area ha",
        "design l/s",
        "duty l/s/ha",
        "required l/s",
        "existing l/s",
        "design year",
    ];
    let rows: Vec<[String; 7]> = r
        .design
        .iter()
        .map(|d| {
            [
                d.name.clone(),
                fmt_int(d.area_ha),
                fmt_sig3(d.design_flow_ls),
                fmt_opt(d.duty_ls_ha, 2),
                fmt_sig3(d.required_capacity_ls),
                d.existing_capacity_ls.map_or_else(|| "-".into(), fmt_int),
                d.design_year.label(),
            ]
        })
        .collect();
    let widths: Vec<usize> = (0..head.len())
        .map(|i| {
            rows.iter()
                .map(|row| row[i].chars().count())
                .chain(std::iter::once(head[i].chars().count()))
                .max()
                .unwrap_or(0)
        })
        .collect();
    let line = |cells: &[&str]| {
        let mut out = String::from(" ");
        for (i, (c, w)) in cells.iter().zip(&widths).enumerate() {
            if i == 0 {
                let _ = write!(out, " {c:<w$}");
            } else {
                let _ = write!(out, "  {c:>w$}");
            }
        }
        out
    };
    let _ = writeln!(s, "{}", line(&head));
    for row in &rows {
        let cells: Vec<&str> = row.iter().map(String::as_str).collect();
        let _ = writeln!(s, "{}", line(&cells));
    }
}

fn node_order(r: &Results) -> Vec<Node> {
    let net = r.demand.network();
    let mut v: Vec<Node> = (0..net.canals().len()).map(Node::Canal).collect();
    v.push(Node::Headworks);
    v
}

/// Builds every table of a run.
#[expect(
    clippy::needless_range_loop,
    reason = "the day indexes several per-node and per-block series at once"
)]
pub fn tables(r: &Results, project: &Project) -> Vec<Table> {
    let net = r.demand.network();
    let mut design = Table::with_headers("design values", &DESIGN_VALUES_HEADERS);
    for d in &r.design {
        design.push_row(vec![
            Cell::Text(d.name.clone()),
            Cell::rounded(d.area_ha, dec::AREA_HA),
            Cell::rounded(d.design_flow_ls, dec::FLOW_LS),
            Cell::rounded(d.required_capacity_ls, dec::FLOW_LS),
            Cell::rounded_opt(d.existing_capacity_ls, dec::FLOW_LS),
            Cell::rounded(d.peak_daily_ls, dec::FLOW_LS),
            Cell::rounded(d.peak_10day_ls, dec::FLOW_LS),
            Cell::rounded_opt(d.duty_ls_ha, dec::DUTY_LS_HA),
            Cell::rounded(d.seasonal_volume_m3, dec::VOLUME_M3),
            Cell::Text(d.design_year.label()),
        ]);
    }
    let nodes = node_order(r);
    let flows: Vec<Vec<f64>> = nodes.iter().map(|&n| r.demand.demand_ls(n)).collect();
    let mut node_daily = Table::with_headers("node demand daily", &NODE_DEMAND_DAILY_HEADERS);
    for day in 0..r.days {
        let date = r.demand.date(day);
        for (k, &n) in nodes.iter().enumerate() {
            node_daily.push_row(vec![
                Cell::Date(date),
                Cell::Text(net.node_name(n).to_owned()),
                Cell::rounded(flows[k][day], dec::FLOW_LS),
            ]);
        }
    }
    let mut blocks = Table::with_headers(
        "block requirements daily",
        &BLOCK_REQUIREMENTS_DAILY_HEADERS,
    );
    let gir: Vec<Vec<f64>> = (0..net.blocks().len())
        .map(|b| r.demand.block_gir_m3_day(b))
        .collect();
    for day in 0..r.days {
        let date = r.demand.date(day);
        for (b, blk) in net.blocks().iter().enumerate() {
            let nir_m3 = r.demand.block_nir_m3_day(b)[day];
            let per_mm = blk.area_ha * 10.0;
            blocks.push_row(vec![
                Cell::Date(date),
                Cell::Text(blk.name.clone()),
                Cell::rounded(nir_m3 / per_mm, dec::DEPTH_MM),
                Cell::rounded(gir[b][day] / per_mm, dec::DEPTH_MM),
                Cell::rounded(nir_m3, dec::VOLUME_M3),
                Cell::rounded(gir[b][day], dec::VOLUME_M3),
            ]);
        }
    }
    let mut out = vec![design, node_daily, blocks];
    for (name, step) in [
        ("demand 10-day", PeriodStep::TenDay),
        ("demand monthly", PeriodStep::Month),
    ] {
        let mut t = Table::with_headers(name, &PERIOD_HEADERS);
        for &n in &nodes {
            for p in r.demand.periods(n, step) {
                t.push_row(vec![
                    Cell::Text(net.node_name(n).to_owned()),
                    Cell::Date(p.start),
                    Cell::Integer(i64::from(p.period_days)),
                    Cell::rounded(p.mean_flow_ls, dec::FLOW_LS),
                    Cell::rounded(p.volume_m3, dec::VOLUME_M3),
                    Cell::rounded(p.depth_mm, dec::DEPTH_MM),
                ]);
            }
        }
        out.push(t);
    }
    if let Some(roster) = r.supply.as_ref().and_then(|s| s.roster.as_ref()) {
        let mut t = Table::with_headers("roster", &ROSTER_HEADERS);
        for e in &roster.entries {
            t.push_row(vec![
                Cell::Integer(i64::try_from(e.cycle).unwrap_or(i64::MAX)),
                Cell::Integer(i64::try_from(e.turn).unwrap_or(i64::MAX)),
                Cell::Text(e.unit_name.clone()),
                Cell::Text(e.start.format("%Y-%m-%d %H:%M").to_string()),
                Cell::Text(e.end.format("%Y-%m-%d %H:%M").to_string()),
                Cell::rounded(e.flow_ls, dec::FLOW_LS),
                Cell::rounded(e.volume_m3, dec::VOLUME_M3),
            ]);
        }
        out.push(t);
    }
    let mut summary = Table::with_headers("summary", &["item", "value"]);
    for line in summary_text(r, project).lines() {
        summary.push_row(vec![Cell::Text(line.to_owned()), Cell::Empty]);
    }
    out.push(summary);
    out
}

/// Writes every table of a run into `out` (created if needed): the CSV
/// files and the workbook, as `offtake run --out DIR` does. Returns the
/// names of the files written.
///
/// # Errors
/// The folder cannot be created, or a file cannot be written (the error
/// names the file).
pub fn write_tables(
    r: &Results,
    project: &Project,
    out: &Path,
) -> Result<Vec<String>, ExportError> {
    write_results_set(r, project, None, out).map(|m| m.files.into_iter().map(|f| f.name).collect())
}

/// Writes the result tables into `out` as one set with a manifest
/// ([`crate::results_set`]): a kill or a second run at the same time never
/// leaves a mix of two runs, a file of the previous run that this run does
/// not write (e.g. `roster.csv`) is removed, and files no manifest lists are
/// never touched. `project_file` is named in the manifest.
///
/// # Errors
/// As [`write_tables`].
pub fn write_results_set(
    r: &Results,
    project: &Project,
    project_file: Option<&Path>,
    out: &Path,
) -> Result<crate::results_set::Manifest, ExportError> {
    let all = tables(r, project);
    let files = [
        DESIGN_VALUES_CSV,
        NODE_DEMAND_DAILY_CSV,
        BLOCK_REQUIREMENTS_DAILY_CSV,
        DEMAND_10DAY_CSV,
        DEMAND_MONTHLY_CSV,
    ];
    let mut writers: Vec<(String, FileWriter<'_, ExportError>)> = Vec::new();
    for (t, f) in all.iter().zip(files) {
        writers.push((
            f.to_owned(),
            Box::new(move |p: &Path| export::write_csv(t, p)),
        ));
    }
    let roster = all.iter().find(|t| t.name == "roster");
    if let Some(t) = roster {
        writers.push((
            ROSTER_CSV.to_owned(),
            Box::new(move |p: &Path| export::write_csv(t, p)),
        ));
    }
    let summary = all.iter().find(|t| t.name == "summary");
    let mut book: Vec<&Table> = Vec::new();
    book.extend(summary);
    book.push(&all[0]);
    book.push(&all[3]);
    book.push(&all[4]);
    book.extend(roster);
    writers.push((
        RESULTS_WORKBOOK.to_owned(),
        Box::new(move |p: &Path| export::write_workbook(&book, p)),
    ));
    let origin = SetOrigin {
        scheme: r.scheme_name.clone(),
        project_file: project_file.map(Path::to_path_buf),
        scenario: r.scenario.clone(),
    };
    write_file_set(out, &origin, writers)
}
