//! The result tables of a computed project, shared by `offtake run` and the
//! app's File › Export so that both write the same files (DESIGN.md
//! "Headless command contract"): `design_values.csv`,
//! `node_demand_daily.csv`, `block_requirements_daily.csv`,
//! `demand_10day.csv`, `demand_monthly.csv`, `roster.csv` (when supply is
//! short) and `results.xlsx` (summary, design values, 10-day and monthly
//! tables, roster, reservoir evaporation by every open-water method, canal
//! sections; daily tables stay in CSV), `canal_sections.csv` (see
//! [`crate::sections`]), plus the text summary with
//! units that `offtake run` prints.

use std::fmt::Write as _;
use std::path::Path;

use crate::export::{
    self, BLOCK_REQUIREMENTS_DAILY_CSV, BLOCK_REQUIREMENTS_DAILY_HEADERS, Cell, DESIGN_VALUES_CSV,
    DESIGN_VALUES_HEADERS, ExportError, NODE_DEMAND_DAILY_CSV, NODE_DEMAND_DAILY_HEADERS,
    RESULTS_WORKBOOK, Table, decimals as dec,
};
use crate::results_set::{FileWriter, SetOrigin, write_file_set};
use offtake_core::engine::storage::method_label;
use offtake_core::engine::{Results, StorageLosses};
use offtake_core::openwater::FAO56_SHALLOW_OPEN_WATER_KC;
use offtake_core::project::Project;
use offtake_core::scheme::{DesignBasis, Node, PeriodStep};
use offtake_core::stats::QuantileInterval;

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
/// Block outlets file: each block's delivery mode, stream size and what the
/// outlet limited.
pub const BLOCK_OUTLETS_CSV: &str = "block_outlets.csv";
/// Block outlets header.
pub const BLOCK_OUTLETS_HEADERS: [&str; 11] = [
    "block",
    "block_name",
    "delivery",
    "stream_size_ls",
    "stream_size_assumed",
    "hours_per_day",
    "peak_delivery_ls",
    "limited_days_per_year",
    "limited_m3_per_year",
    "delivered_m3_per_year",
    "limited_pct",
];
/// Per-crop monthly requirements file (issue 21).
pub const CROP_REQUIREMENTS_MONTHLY_CSV: &str = "crop_requirements_monthly.csv";
/// Per-crop monthly requirements header (issue 21; a contract).
pub const CROP_REQUIREMENTS_MONTHLY_HEADERS: [&str; 10] = [
    "season", "crop", "month", "area_ha", "et0_mm", "kc_mean", "etc_mm", "peff_mm", "nir_mm",
    "gir_m3",
];

/// The per-crop monthly table: one row per season, crop and calendar month
/// in which the crop uses water, means over the complete irrigation years
/// ([`offtake_core::engine::tables::crop_requirements_monthly`]).
pub fn crop_requirements_table(r: &Results) -> Table {
    let mut t = Table::with_headers(
        "crop requirements monthly",
        &CROP_REQUIREMENTS_MONTHLY_HEADERS,
    );
    for row in offtake_core::engine::tables::crop_requirements_monthly(r) {
        t.push_row(vec![
            Cell::Text(row.season),
            Cell::Text(row.crop),
            Cell::Integer(i64::from(row.month)),
            Cell::rounded(row.area_ha, dec::AREA_HA),
            Cell::rounded(row.et0_mm, dec::DEPTH_MM),
            Cell::rounded(row.kc_mean, 3),
            Cell::rounded(row.etc_mm, dec::DEPTH_MM),
            Cell::rounded(row.peff_mm, dec::DEPTH_MM),
            Cell::rounded(row.nir_mm, dec::DEPTH_MM),
            Cell::rounded(row.gir_m3, dec::VOLUME_M3),
        ]);
    }
    t
}

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

/// A confidence interval of a flow (l/s) in words, bounds to 3 significant
/// figures: `4,150 to 5,020`, with an open side said as `below the smallest
/// of record` or `above the largest of record`.
pub fn interval_text(i: &QuantileInterval) -> String {
    let low = i
        .lower
        .map_or_else(|| "below the smallest of record".to_owned(), fmt_sig3);
    let high = i
        .upper
        .map_or_else(|| "above the largest of record".to_owned(), fmt_sig3);
    format!("{low} to {high}")
}

/// The interval's level and achieved coverage in words:
/// `90 % interval (achieved coverage 93.1 %, 24 years; ranks 16 and 23)`.
pub fn interval_basis_text(i: &QuantileInterval) -> String {
    let r = &i.ranks;
    let rank = |x: Option<usize>| x.map_or_else(|| "none".to_owned(), |v| v.to_string());
    format!(
        "{:.0} % interval (achieved coverage {:.1} %, {} years; order statistics {} and {})",
        r.level * 100.0,
        r.coverage * 100.0,
        r.n,
        rank(r.lower_rank),
        rank(r.upper_rank)
    )
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
            "  uncertainty of the record: {} l/s, {}, distribution-free (Hahn and Meeker 1991)",
            interval_text(&h.design_flow_interval),
            interval_basis_text(&h.design_flow_interval)
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
    outlets_summary(&mut s, r, project);
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
        storage_lines(&mut s, st);
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
                "  {}: capacity {} l/s, required {} l/s ({}{})",
                d.name,
                fmt_int(cap),
                fmt_int(d.required_capacity_ls),
                if d.required_capacity_ls > cap {
                    "TOO SMALL"
                } else {
                    "sufficient"
                },
                if d.capacity_within_uncertainty() == Some(true) {
                    format!(
                        ", within the uncertainty of the record: required {} l/s",
                        interval_text(&d.required_capacity_interval())
                    )
                } else {
                    String::new()
                },
            );
            if let Some(f) = &d.shortfall {
                let years: Vec<String> = f.years_short.iter().map(|y| y.label()).collect();
                let _ = writeln!(
                    s,
                    "    {} mean flow above capacity in {} {} of the {} complete irrigation years, in {} of those years{}; {} m3 not delivered per complete irrigation year",
                    f.basis.label(),
                    f.basis_periods_in(&r.complete_years).count(),
                    f.basis.periods_noun(),
                    r.complete_years.len(),
                    f.years_short.len(),
                    if years.is_empty() || years.len() > 8 {
                        String::new()
                    } else {
                        format!(" ({})", years.join(", "))
                    },
                    fmt_int(f.basis_volume_per_year_m3(&r.complete_years))
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
        "Design flows per canal ({:.0} % non-exceedance of the yearly peak {} mean flow over {} complete irrigation years; flows to 3 significant figures; {:.0} % distribution-free interval of the design flow from the order statistics of the yearly peaks):",
        first.non_exceedance * 100.0,
        first.basis.label(),
        first.years.len(),
        first.design_flow_interval.ranks.level * 100.0
    );
    let head = [
        "node",
        "area ha",
        "design l/s",
        "duty l/s/ha",
        "required l/s",
        "existing l/s",
        "design year",
        "interval l/s",
    ];
    let rows: Vec<[String; 8]> = r
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
                interval_text(&d.design_flow_interval),
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

/// The reservoir's evaporation by the three open-water methods side by
/// side, their spread and the FAO-56 open-water Kc line.
fn storage_lines(s: &mut String, st: &StorageLosses) {
    let _ = writeln!(
        s,
        "Reservoir {} evaporation ({}): {} m3/year, beside (not included in) the headworks demand",
        st.reservoir,
        method_label(st.method),
        fmt_int(st.mean_yearly_m3)
    );
    let shift = if st.water_temperature_shift_c == 0.0 {
        String::new()
    } else {
        format!(
            "; water-surface temperature shifted {:+.1} °C with the air",
            st.water_temperature_shift_c
        )
    };
    let _ = writeln!(
        s,
        "  open-water methods side by side (mean per complete irrigation year{shift}):"
    );
    let _ = writeln!(
        s,
        "    {:<26} {:>8} {:>8} {:>14}",
        "method", "mm/year", "x ET0", "m3/year"
    );
    for m in &st.methods {
        let _ = writeln!(
            s,
            "    {:<26} {:>8} {:>8.2} {:>14}{}",
            method_label(m.method),
            fmt_int(m.mean_yearly_mm),
            m.ratio_to_et0,
            fmt_int(m.mean_yearly_m3),
            if m.method == st.method {
                "  used for the scheme's losses"
            } else {
                ""
            }
        );
    }
    let (lo, hi) = st.spread_m3();
    let _ = writeln!(
        s,
        "  spread of the three methods: {} to {} m3/year ({:.0} % of the loss used); plausibility line FAO-56 Table 12 open water < 2 m deep, Kc {:.2} x ET0: {} mm/year, {} m3/year",
        fmt_int(lo),
        fmt_int(hi),
        st.spread_pct_of_used(),
        FAO56_SHALLOW_OPEN_WATER_KC,
        fmt_int(st.kc_line_mean_yearly_mm),
        fmt_int(st.kc_line_mean_yearly_m3)
    );
}

/// Header of the workbook's reservoir evaporation sheet.
pub const RESERVOIR_EVAPORATION_HEADERS: [&str; 6] = [
    "method",
    "evaporation_mm_year",
    "ratio_to_et0",
    "loss_m3_year",
    "used",
    "note",
];

fn reservoir_table(st: &StorageLosses) -> Table {
    let mut t = Table::with_headers("reservoir evaporation", &RESERVOIR_EVAPORATION_HEADERS);
    for m in &st.methods {
        t.push_row(vec![
            Cell::Text(method_label(m.method).to_owned()),
            Cell::rounded(m.mean_yearly_mm, 0),
            Cell::rounded(m.ratio_to_et0, 2),
            Cell::rounded(m.mean_yearly_m3, dec::VOLUME_M3),
            Cell::Text(if m.method == st.method { "yes" } else { "no" }.to_owned()),
            Cell::Text(format!(
                "{} reservoir, mean per complete irrigation year; water-surface temperature shift {:+.1} °C",
                st.reservoir, st.water_temperature_shift_c
            )),
        ]);
    }
    t.push_row(vec![
        Cell::Text(format!(
            "FAO-56 Table 12 open water < 2 m deep, Kc {FAO56_SHALLOW_OPEN_WATER_KC:.2} x ET0"
        )),
        Cell::rounded(st.kc_line_mean_yearly_mm, 0),
        Cell::rounded(FAO56_SHALLOW_OPEN_WATER_KC, 2),
        Cell::rounded(st.kc_line_mean_yearly_m3, dec::VOLUME_M3),
        Cell::Text("no".to_owned()),
        Cell::Text("plausibility line, not a method".to_owned()),
    ]);
    t
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
            Cell::rounded_opt(d.design_flow_interval.lower, dec::FLOW_LS),
            Cell::rounded_opt(d.design_flow_interval.upper, dec::FLOW_LS),
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
    out.push(outlets_table(r, project));
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
    if let Some(st) = &r.storage {
        out.push(reservoir_table(st));
    }
    out.push(crate::sections::canal_sections_table(r));
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
    let crops = crop_requirements_table(r);
    let efficiency = crate::sections::canal_efficiency_daily_table(r);
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
    let outlets = all.iter().find(|t| t.name == "block outlets");
    if let Some(t) = outlets {
        writers.push((
            BLOCK_OUTLETS_CSV.to_owned(),
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
    {
        let t = &crops;
        writers.push((
            CROP_REQUIREMENTS_MONTHLY_CSV.to_owned(),
            Box::new(move |p: &Path| export::write_csv(t, p)),
        ));
    }
    let sections = all
        .iter()
        .find(|t| t.name == crate::sections::CANAL_SECTIONS_TABLE);
    if let Some(t) = sections {
        writers.push((
            crate::sections::CANAL_SECTIONS_CSV.to_owned(),
            Box::new(move |p: &Path| export::write_csv(t, p)),
        ));
    }
    if let Some(t) = &efficiency {
        writers.push((
            crate::sections::CANAL_EFFICIENCY_DAILY_CSV.to_owned(),
            Box::new(move |p: &Path| export::write_csv(t, p)),
        ));
    }
    let summary = all.iter().find(|t| t.name == "summary");
    let mut book: Vec<&Table> = Vec::new();
    book.extend(summary);
    book.push(&all[0]);
    book.push(&all[3]);
    book.push(&all[4]);
    book.extend(outlets);
    book.push(&crops);
    book.extend(roster);
    book.extend(all.iter().find(|t| t.name == "reservoir evaporation"));
    book.extend(sections);
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

/// The block outlets table ([`BLOCK_OUTLETS_HEADERS`]).
fn outlets_table(r: &Results, project: &Project) -> Table {
    let mut t = Table::with_headers("block outlets", &BLOCK_OUTLETS_HEADERS);
    for o in &r.outlets {
        let name = project
            .blocks
            .iter()
            .find(|b| b.id == o.block)
            .map_or_else(|| o.block.clone(), |b| b.name.clone());
        t.push_row(vec![
            Cell::Text(o.block.clone()),
            Cell::Text(name),
            Cell::Text(o.delivery.describe()),
            Cell::rounded(o.stream_size_ls, dec::FLOW_LS),
            Cell::Text(if o.stream_size_assumed { "yes" } else { "no" }.to_owned()),
            Cell::rounded(o.hours_per_day, 1),
            Cell::rounded(o.peak_delivery_ls, dec::FLOW_LS),
            Cell::rounded(o.limited_days_per_year, 1),
            Cell::rounded(o.limited_m3_per_year, dec::VOLUME_M3),
            Cell::rounded(o.delivered_m3_per_year, dec::VOLUME_M3),
            Cell::rounded(100.0 * o.limited_share(), 2),
        ]);
    }
    t
}

/// How the blocks are delivered and what their outlets limited.
fn outlets_summary(s: &mut String, r: &Results, project: &Project) {
    if r.outlets.is_empty() {
        return;
    }
    let mut modes: Vec<(String, usize)> = Vec::new();
    for o in &r.outlets {
        let d = o.delivery.describe();
        match modes.iter_mut().find(|m| m.0 == d) {
            Some(m) => m.1 += 1,
            None => modes.push((d, 1)),
        }
    }
    let modes: Vec<String> = modes
        .iter()
        .map(|(d, n)| format!("{n} block{} {d}", if *n == 1 { "" } else { "s" }))
        .collect();
    let _ = writeln!(
        s,
        "Delivery to blocks (node flows are what the outlets deliver under these rules): {}",
        modes.join("; ")
    );
    let assumed = r.outlets.iter().filter(|o| o.stream_size_assumed).count();
    let limited: Vec<_> = r
        .outlets
        .iter()
        .filter(|o| o.limited_m3_per_year > 0.0)
        .collect();
    if limited.is_empty() {
        let _ = writeln!(
            s,
            "  outlets: none limited delivery{}",
            if assumed > 0 {
                format!(
                    " ({assumed} stream size{} assumed: the block's largest daily delivery)",
                    if assumed == 1 { "" } else { "s" }
                )
            } else {
                String::new()
            }
        );
    }
    for o in limited {
        let name = project
            .blocks
            .iter()
            .find(|b| b.id == o.block)
            .map_or(o.block.as_str(), |b| b.name.as_str());
        let _ = writeln!(
            s,
            "  outlet of {name}: stream size {} l/s over {} h limited delivery on {:.1} days a year, {} m3 a year ({:.2} % of its requests)",
            fmt_sig3(o.stream_size_ls),
            o.hours_per_day,
            o.limited_days_per_year,
            fmt_int(o.limited_m3_per_year),
            100.0 * o.limited_share()
        );
    }
}
