//! `offtake compare PROJECT.ron`: every scenario of the project side by side,
//! one column per scenario, one row per figure with its unit.

use std::fmt::Write as _;
use std::path::PathBuf;

use anyhow::{Context, Result};
use clap::Args as ClapArgs;
use offtake_core::engine::{Comparison, compare_scenarios};

use crate::cmd_run::load;

/// Arguments of `offtake compare`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Project file (RON).
    pub project: PathBuf,
}

/// Runs the command.
///
/// # Errors
/// Any input or computation problem, with its cause chain.
pub fn run(args: &Args) -> Result<()> {
    let loaded = load(&args.project)?;
    let cmp = compare_scenarios(
        &loaded.project,
        &loaded.libraries.crops,
        &loaded.libraries.soils,
        &loaded.weather,
    )
    .with_context(|| format!("comparing the scenarios of {}", args.project.display()))?;
    crate::cmd_run::print_text(&comparison_text(&cmp))?;
    Ok(())
}

fn opt(v: Option<f64>, d: usize) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{x:.d$}"))
}

/// How one row's cell is made from a scenario's figures.
type RowFn = Box<dyn Fn(&offtake_core::engine::ScenarioColumn) -> String>;

/// The printed table.
pub(crate) fn comparison_text(c: &Comparison) -> String {
    let mut rows: Vec<(String, Vec<String>)> = Vec::new();
    for crop in &c.crops {
        rows.push((
            format!("area {crop} (ha)"),
            c.columns
                .iter()
                .map(|col| {
                    let a = col
                        .area_by_crop
                        .iter()
                        .find(|(k, _)| k == crop)
                        .map_or(0.0, |(_, a)| *a);
                    format!("{a:.0}")
                })
                .collect(),
        ));
    }
    for season in &c.seasons {
        rows.push((
            format!("headworks volume {season} (m3/year)"),
            c.columns
                .iter()
                .map(|col| {
                    let v = col
                        .season_volumes
                        .iter()
                        .find(|s| &s.season == season)
                        .map_or(0.0, |s| s.headworks_m3);
                    format!("{v:.0}")
                })
                .collect(),
        ));
    }
    let simple: [(&str, RowFn); 14] = [
        (
            "headworks volume total (m3/year)",
            Box::new(|x| format!("{:.0}", x.headworks_volume_m3)),
        ),
        (
            "headworks design flow (l/s)",
            Box::new(|x| format!("{:.0}", x.design_flow_ls)),
        ),
        ("design year", Box::new(|x| x.design_year.clone())),
        (
            "headworks duty (l/s/ha)",
            Box::new(|x| opt(x.duty_ls_ha, 2)),
        ),
        (
            "capacity shortfall, design basis (m3/year)",
            Box::new(|x| format!("{:.0}", x.shortfall_m3_per_year)),
        ),
        (
            "capacity shortfall, design basis (periods)",
            Box::new(|x| x.shortfall_periods.to_string()),
        ),
        (
            "years with a shortfall (of complete years)",
            Box::new(|x| format!("{} of {}", x.shortfall_years, x.complete_years)),
        ),
        (
            "daily peaks above capacity (days, info)",
            Box::new(|x| x.shortfall_days.to_string()),
        ),
        (
            "reservoir evaporation (m3/year)",
            Box::new(|x| opt(x.storage_loss_m3, 0)),
        ),
        (
            "reservoir evaporation method",
            Box::new(|x| x.storage_method.unwrap_or("-").to_owned()),
        ),
        (
            "reservoir evaporation, spread of 3 methods (m3/year)",
            Box::new(|x| {
                x.storage_spread_m3
                    .map_or_else(|| "-".to_owned(), |(lo, hi)| format!("{lo:.0}-{hi:.0}"))
            }),
        ),
        (
            "relative irrigation supply (-)",
            Box::new(|x| opt(x.relative_irrigation_supply, 2)),
        ),
        (
            "relative water supply, Levine 1982 (-)",
            Box::new(|x| opt(x.relative_water_supply, 2)),
        ),
        (
            "FAO-33 yield loss where short (%)",
            Box::new(|x| opt(x.mean_yield_loss_pct, 1)),
        ),
    ];
    for (label, f) in &simple {
        rows.push((
            (*label).to_owned(),
            c.columns.iter().map(f.as_ref()).collect(),
        ));
    }
    let w0 = rows.iter().map(|r| r.0.chars().count()).max().unwrap_or(0);
    let widths: Vec<usize> = c
        .columns
        .iter()
        .enumerate()
        .map(|(i, col)| {
            rows.iter()
                .map(|r| r.1[i].len())
                .chain(std::iter::once(col.name.len()))
                .max()
                .unwrap_or(0)
        })
        .collect();
    let mut s = String::new();
    let _ = write!(s, "{:w0$}", "");
    for (col, w) in c.columns.iter().zip(&widths) {
        let _ = write!(s, "  {:>w$}", col.name);
    }
    s.push('\n');
    for (label, vals) in &rows {
        let pad = w0 - label.chars().count();
        let _ = write!(s, "{label}{:pad$}", "");
        for (v, w) in vals.iter().zip(&widths) {
            let _ = write!(s, "  {v:>w$}");
        }
        s.push('\n');
    }
    let basis = c.columns.first().map_or("10-day", |x| x.shortfall_basis);
    let _ = writeln!(
        s,
        "Capacity shortfall on the design basis ({basis} mean flows): a period is short when its mean flow exceeds the existing capacity; volume = sum of (mean - capacity) x days. Daily peaks (refill pulses) are shown for information only."
    );
    let years = c.columns.first().map_or(0, |x| x.complete_years);
    let _ = writeln!(
        s,
        "Per-year figures (m3/year, periods, years short) are over the {years} complete irrigation years of the record, the years the design flows use; the incomplete years at its ends are left out."
    );
    let _ = writeln!(
        s,
        "Reservoir evaporation: by the reservoir's method; the spread is the smallest and largest of Meyer (1915), Penman (1948) open water and Rohwer (1931) on the same weather (see `offtake run`)."
    );
    s.push_str("Planning estimates: canal and structure designs must be checked by a qualified engineer.\n");
    s
}
