//! Monthly tables of a run: per-crop requirements by season and calendar
//! month, per-block gross requirement, and the station's ET₀ and rain by
//! month (mean and dependable), all as means over the complete irrigation
//! years (incomplete years at the ends of the record are left out).
//!
//! # Definitions
//!
//! - A calendar month's value in one irrigation year is the sum of its days;
//!   each complete irrigation year holds every calendar month once, so the
//!   mean over the years is Σ ÷ number of complete years.
//! - Per-crop rows (one per season, crop and month in which the crop uses
//!   water): depths (ET₀, ETc, effective rain, NIR, mm) are area-weighted
//!   means over the plantings of that crop and season, per hectare planted;
//!   `kc_mean` = ETc ÷ ET₀ of the month (the month's mean crop coefficient,
//!   days out of the field counted as Kc = 0, so that ETc = Kc × ET₀ holds in
//!   the table; in a month the crop occupies only in part it is below the
//!   Kc curve's value); GIR (m³) = Σ NIR × area ÷ (Ea × Eb) at the block
//!   outlets (DESIGN.md definitions).
//! - Dependable values: ET₀ at the design probability as non-exceedance
//!   (the month's ET₀ not exceeded in that share of years), rain at the
//!   same share as exceedance (dependable rain, DESIGN.md), Weibull
//!   positions ([`crate::stats`]).

use chrono::{Datelike, NaiveDate};
use serde::{Deserialize, Serialize};

use super::Results;
use super::plantings::PlantingSummary;
use crate::calendar::IrrigationYear;
use crate::scheme::Node;
use crate::stats::RankedSample;
use crate::units::m3_day_to_l_s;

/// Mean depths of one planting per calendar month (index 0 = January), per
/// hectare planted, over the complete irrigation years (mm).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct MonthlyDepths {
    /// ET₀ of the month (mm), the station's.
    pub et0_mm: [f64; 12],
    /// Crop ET under no stress, ETc (mm).
    pub etc_mm: [f64; 12],
    /// Effective rain (mm).
    pub peff_mm: [f64; 12],
    /// Net irrigation requirement (mm).
    pub nir_mm: [f64; 12],
}

/// Totals of a daily series per calendar month and complete irrigation
/// year: `out[year][month]`.
pub fn monthly_totals_per_year(
    start: NaiveDate,
    daily: &[f64],
    years: &[IrrigationYear],
) -> Vec<[f64; 12]> {
    years
        .iter()
        .map(|y| {
            let mut m = [0.0; 12];
            let i0 = usize::try_from((y.start() - start).num_days()).unwrap_or(usize::MAX);
            let mut date = y.start();
            for i in i0..i0.saturating_add(y.length_days() as usize) {
                if let Some(v) = daily.get(i) {
                    m[date.month0() as usize] += v;
                }
                date = date.succ_opt().unwrap_or(date);
            }
            m
        })
        .collect()
}

/// Mean over complete irrigation years of a daily series' monthly totals.
pub fn monthly_means(start: NaiveDate, daily: &[f64], years: &[IrrigationYear]) -> [f64; 12] {
    let per_year = monthly_totals_per_year(start, daily, years);
    let n = per_year.len().max(1) as f64;
    let mut out = [0.0; 12];
    for y in &per_year {
        for (o, v) in out.iter_mut().zip(y) {
            *o += v / n;
        }
    }
    out
}

/// One planting's monthly depths from its daily series (per hectare).
pub fn planting_monthly_depths(
    start: NaiveDate,
    et0_mm: &[f64],
    etc_mm: &[f64],
    peff_mm: &[f64],
    nir_mm: &[f64],
    years: &[IrrigationYear],
) -> MonthlyDepths {
    MonthlyDepths {
        et0_mm: monthly_means(start, et0_mm, years),
        etc_mm: monthly_means(start, etc_mm, years),
        peff_mm: monthly_means(start, peff_mm, years),
        nir_mm: monthly_means(start, nir_mm, years),
    }
}

/// The station's ET₀ and rain per calendar month (index 0 = January) over
/// the complete irrigation years.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct MonthlyClimate {
    /// Share of years of the dependable values (fraction; the design
    /// probability).
    pub probability: f64,
    /// Mean ET₀ of the month (mm).
    pub et0_mean_mm: [f64; 12],
    /// ET₀ not exceeded in `probability` of years (mm).
    pub et0_dependable_mm: [f64; 12],
    /// Mean rain of the month (mm).
    pub rain_mean_mm: [f64; 12],
    /// Rain equalled or exceeded in `probability` of years (mm).
    pub rain_dependable_mm: [f64; 12],
    /// Number of years the values rest on.
    pub years: usize,
}

/// ET₀ and rain by month, mean and dependable (see the module rules).
pub fn monthly_climate(
    start: NaiveDate,
    et0_mm: &[f64],
    rain_mm: &[f64],
    years: &[IrrigationYear],
    probability: f64,
) -> MonthlyClimate {
    let et0 = monthly_totals_per_year(start, et0_mm, years);
    let rain = monthly_totals_per_year(start, rain_mm, years);
    let mut out = MonthlyClimate {
        probability,
        years: years.len(),
        ..MonthlyClimate::default()
    };
    let n = years.len().max(1) as f64;
    for m in 0..12 {
        let e: Vec<f64> = et0.iter().map(|y| y[m]).collect();
        let r: Vec<f64> = rain.iter().map(|y| y[m]).collect();
        out.et0_mean_mm[m] = e.iter().sum::<f64>() / n;
        out.rain_mean_mm[m] = r.iter().sum::<f64>() / n;
        out.et0_dependable_mm[m] = RankedSample::new(&e)
            .and_then(|s| s.non_exceedance_value(probability))
            .unwrap_or(0.0);
        out.rain_dependable_mm[m] = RankedSample::new(&r)
            .and_then(|s| s.exceedance_value(probability))
            .unwrap_or(0.0);
    }
    out
}

/// One row of `crop_requirements_monthly.csv`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CropMonthRow {
    /// Season label.
    pub season: String,
    /// Crop id.
    pub crop: String,
    /// Calendar month 1–12.
    pub month: u32,
    /// Area planted with the crop in the season (ha).
    pub area_ha: f64,
    /// ET₀ of the month (mm).
    pub et0_mm: f64,
    /// Mean crop coefficient of the month, ETc ÷ ET₀.
    pub kc_mean: f64,
    /// Crop ET (mm), area-weighted per hectare planted.
    pub etc_mm: f64,
    /// Effective rain (mm).
    pub peff_mm: f64,
    /// Net irrigation requirement (mm).
    pub nir_mm: f64,
    /// Gross irrigation requirement at the block outlets (m³).
    pub gir_m3: f64,
}

/// Field-canal efficiency Eb of a planting's block in the run's network.
fn field_canal_efficiency(r: &Results, p: &PlantingSummary) -> f64 {
    let net = r.demand.network();
    net.block_index(&p.block)
        .map_or(1.0, |b| net.blocks()[b].field_canal_efficiency)
}

/// Per-crop monthly requirements: one row per season, crop and calendar
/// month in which the crop uses water (ETc or NIR above zero), seasons and
/// crops in the order the plantings first name them, months in calendar
/// order.
pub fn crop_requirements_monthly(r: &Results) -> Vec<CropMonthRow> {
    let mut groups: Vec<(&str, &str, Vec<&PlantingSummary>)> = Vec::new();
    for p in &r.plantings {
        if let Some(g) = groups
            .iter_mut()
            .find(|(s, c, _)| *s == p.season && *c == p.crop)
        {
            g.2.push(p);
        } else {
            groups.push((&p.season, &p.crop, vec![p]));
        }
    }
    let mut out = Vec::new();
    for (season, crop, plantings) in groups {
        let area: f64 = plantings.iter().map(|p| p.area_ha).sum();
        if area <= 0.0 {
            continue;
        }
        for m in 0..12 {
            let weighted = |f: fn(&MonthlyDepths) -> &[f64; 12]| {
                plantings
                    .iter()
                    .map(|p| f(&p.monthly)[m] * p.area_ha)
                    .sum::<f64>()
                    / area
            };
            let etc_mm = weighted(|d| &d.etc_mm);
            let nir_mm = weighted(|d| &d.nir_mm);
            if etc_mm <= 0.0 && nir_mm <= 0.0 {
                continue;
            }
            let et0_mm = weighted(|d| &d.et0_mm);
            let gir_m3: f64 = plantings
                .iter()
                .map(|p| {
                    let eff = p.application_efficiency * field_canal_efficiency(r, p);
                    p.monthly.nir_mm[m] * p.area_ha * 10.0 / eff.max(f64::MIN_POSITIVE)
                })
                .sum();
            out.push(CropMonthRow {
                season: season.to_owned(),
                crop: crop.to_owned(),
                month: m as u32 + 1,
                area_ha: area,
                et0_mm,
                kc_mean: if et0_mm > 0.0 { etc_mm / et0_mm } else { 0.0 },
                etc_mm,
                peff_mm: weighted(|d| &d.peff_mm),
                nir_mm,
                gir_m3,
            });
        }
    }
    out
}

/// One block's gross requirement per calendar month.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BlockMonthRow {
    /// Block id.
    pub block: String,
    /// Block area (ha).
    pub area_ha: f64,
    /// Mean GIR at the block outlet per calendar month (m³), January first.
    pub gir_m3: [f64; 12],
    /// The same as a depth over the block (mm).
    pub gir_mm: [f64; 12],
}

/// Gross requirement of every block by calendar month (means over the
/// complete irrigation years), in network order.
pub fn block_gir_monthly(r: &Results) -> Vec<BlockMonthRow> {
    let net = r.demand.network();
    net.blocks()
        .iter()
        .enumerate()
        .map(|(b, blk)| {
            let gir_m3 = monthly_means(r.start, &r.demand.block_gir_m3_day(b), &r.complete_years);
            let per_mm = blk.area_ha * 10.0;
            BlockMonthRow {
                block: blk.name.clone(),
                area_ha: blk.area_ha,
                gir_m3,
                gir_mm: gir_m3.map(|v| if per_mm > 0.0 { v / per_mm } else { 0.0 }),
            }
        })
        .collect()
}

/// Mean demand of a node in each of the 36 calendar 10-day periods of the
/// irrigation year (slot 0 = days 1–10 of the year's first month), over the
/// complete irrigation years: Σ volume ÷ Σ days of the slot, as a
/// continuous flow (l/s). Draws the demand hydrograph of the report.
pub fn ten_day_hydrograph_ls(r: &Results, node: Node) -> [f64; 36] {
    let series = r.demand.demand_m3_day(node);
    let first_month0 = r.complete_years.first().map_or(0, |y| y.start().month0());
    let mut volume = [0.0; 36];
    let mut days = [0u32; 36];
    for y in &r.complete_years {
        let i0 = usize::try_from((y.start() - r.start).num_days()).unwrap_or(usize::MAX);
        let mut date = y.start();
        for i in i0..i0.saturating_add(y.length_days() as usize) {
            let month = (date.month0() + 12 - first_month0) % 12;
            let dekad = match date.day() {
                1..=10 => 0,
                11..=20 => 1,
                _ => 2,
            };
            let slot = (month * 3 + dekad) as usize;
            if let Some(v) = series.get(i) {
                volume[slot] += v;
                days[slot] += 1;
            }
            date = date.succ_opt().unwrap_or(date);
        }
    }
    let mut out = [0.0; 36];
    for ((o, v), d) in out.iter_mut().zip(volume).zip(days) {
        if d > 0 {
            *o = m3_day_to_l_s(v / f64::from(d));
        }
    }
    out
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;
    use crate::calendar::{YearStart, year_coverage};

    #[test]
    fn monthly_means_over_complete_years_only() {
        // 2001-01-01 .. 2003-06-30 with 1 mm a day; years from January:
        // 2001 and 2002 complete, 2003 cut and left out.
        let start = NaiveDate::from_ymd_opt(2001, 1, 1).unwrap();
        let end = NaiveDate::from_ymd_opt(2003, 6, 30).unwrap();
        let days = (end - start).num_days() as usize + 1;
        let years = year_coverage(start, end, YearStart::new(1).unwrap())
            .unwrap()
            .complete;
        assert_eq!(years.len(), 2);
        let mut daily = vec![1.0; days];
        // 10 mm extra on 2002-02-10 → February mean 28 + 5.
        daily[365 + 40] = 11.0;
        let m = monthly_means(start, &daily, &years);
        assert!((m[0] - 31.0).abs() < 1e-12);
        assert!((m[1] - 33.0).abs() < 1e-12);
        assert!((m[5] - 30.0).abs() < 1e-12);
        let c = monthly_climate(start, &daily, &daily, &years, 0.8);
        // February 2001 = 28, 2002 = 38: 80 % non-exceedance of two values
        // (rank 2.4 > n) → the largest; 80 % exceedance → rank 0.6 → the
        // smallest.
        assert!((c.et0_dependable_mm[1] - 38.0).abs() < 1e-12);
        assert!((c.rain_dependable_mm[1] - 28.0).abs() < 1e-12);
    }
}
