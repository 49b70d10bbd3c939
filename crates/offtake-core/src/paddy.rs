//! Paddy rice: daily ponding balance of the main field, land preparation and
//! nursery, staggered over the planting window.
//!
//! Rice fields are kept flooded, so the FAO-56 root-zone depletion balance
//! (which starts at field capacity) does not describe them. This module keeps
//! a daily balance of the ponded water instead:
//!
//! h,i = h,i−1 + P − spill + I − ETc − (S + P)erc − drained + soil,
//!
//! with the bund height capping the pond (rain above it spills and is not
//! effective), irrigation topping the pond up to the target depth, seepage
//! and percolation S&P a daily loss while water stands, and the field drained
//! for the last days before harvest. FAO-56 (Allen et al. 1998) gives the rice
//! Kc (Tables 12 and 14: Kc ini 1.05 for 0.10–0.20 m of paddy water) and the
//! stage lengths; the water-layer bookkeeping is the common practice of
//! irrigation planning, labelled so.
//!
//! # Land preparation
//!
//! A simple documented volume balance (common practice): over the
//! preparation period of T days, the field needs the water to saturate the
//! puddled layer (`saturation_mm`) and to establish the pond (`ponding_mm`),
//! spread evenly, plus each day's open-water evaporation (`prep_kc` × ET₀)
//! and seepage and percolation, less the day's rain (rain above a day's need
//! is not carried over — a conservative simplification). Each sub-area of a
//! staggered planting is prepared in the T days before its own
//! transplanting, which is why land preparation often sets the peak demand of
//! a rice scheme.
//!
//! # Nursery
//!
//! Optional: the seedbed is `area_share` of the planted area (FAO Training
//! Manual No. 4: "usually 5–10 % of the size of the total area to be
//! planted") for `duration_days` before transplanting; it needs its own
//! saturation and ponding volume spread over that time plus `kc` × ET₀ and
//! S&P less rain each day.
//!
//! # Typical values (handbook ranges, inputs — not fixed constants)
//!
//! * Seepage plus percolation: about 3 mm/day in poorly drained and 6 mm/day
//!   in well drained soils (Sri Lanka Department of Agriculture, rice water
//!   management); [from memory, FAO Training Manuals 3/4, verify] 1–2 mm/day
//!   on heavy clay up to 6–10 mm/day on sandy soils.
//! * Paddy water depth 0.10–0.20 m in the initial stage (FAO-56 Table 14
//!   note); [from memory, verify] a standing layer of 50–100 mm through the
//!   season.
//! * Land preparation starts about one, sometimes two, months before
//!   transplanting (FAO Training Manual No. 4, Ch. 4); [from memory, verify]
//!   about 200 mm to saturate plus about 100 mm to set up the water layer.
//!
//! # Efficiency
//!
//! The NIR here already contains seepage and percolation. A paddy field
//! application efficiency applied to it must therefore cover operational
//! losses only (spills from management, uneven levelling): counting
//! percolation again in the efficiency would count it twice.
//!
//! Results are planning estimates; designs built on them must be checked by a
//! qualified engineer.

use serde::{Deserialize, Serialize};

/// Error in paddy inputs.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PaddyError {
    /// A parameter is not finite or outside its range.
    #[error("parameter `{name}`: found {value}, expected {expected}")]
    BadParameter {
        /// Name of the parameter.
        name: &'static str,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// A daily value is not finite or is negative.
    #[error("series `{series}` day {day}: found {value}, expected a finite value ≥ 0")]
    BadDailyValue {
        /// Name of the series.
        series: &'static str,
        /// Day index (0-based).
        day: usize,
        /// The value found.
        value: f64,
    },
    /// A daily series is too short for the calendar the planting needs.
    #[error("series `{series}` has {found} days, the planting needs {needed}")]
    SeriesTooShort {
        /// Name of the series.
        series: &'static str,
        /// Days needed.
        needed: usize,
        /// Days found.
        found: usize,
    },
}

/// Main-field ponding parameters.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PaddyField {
    /// Bund height: the most water the field holds (mm); rain above spills.
    pub bund_height_mm: f64,
    /// Pond depth irrigation keeps (mm), ≤ bund height.
    pub target_ponding_mm: f64,
    /// Seepage and percolation while water stands (mm/day).
    pub percolation_seepage_mm_day: f64,
    /// Days before harvest when irrigation stops and the pond is drained.
    pub drain_days_before_harvest: usize,
}

impl Default for PaddyField {
    /// Planning defaults: pond 100 mm (FAO-56 Table 14 note, lower end of
    /// 0.10–0.20 m), bund 200 mm (ours), S&P 4 mm/day (within 3–6 mm/day,
    /// Sri Lanka Dept. of Agriculture), drained 10 days before harvest
    /// (ours).
    fn default() -> Self {
        Self {
            bund_height_mm: 200.0,
            target_ponding_mm: 100.0,
            percolation_seepage_mm_day: 4.0,
            drain_days_before_harvest: 10,
        }
    }
}

/// Land preparation parameters (volume balance, see the module docs).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct LandPreparation {
    /// Duration of preparation before transplanting (days, ≥ 1).
    pub duration_days: usize,
    /// Water to saturate the puddled soil (mm).
    pub saturation_mm: f64,
    /// Water to establish the initial pond (mm); normally the target depth.
    pub ponding_mm: f64,
    /// Evaporation coefficient of the wet field during preparation (× ET₀);
    /// FAO-56 Table 12 rice Kc ini 1.05.
    pub prep_kc: f64,
}

impl Default for LandPreparation {
    /// 30 days (FAO TM4: about one month), 200 mm saturation and 100 mm
    /// pond ([from memory] TM3/TM4 planning norms, verify), Kc 1.05
    /// (FAO-56 Table 12).
    fn default() -> Self {
        Self {
            duration_days: 30,
            saturation_mm: 200.0,
            ponding_mm: 100.0,
            prep_kc: 1.05,
        }
    }
}

/// Nursery parameters.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Nursery {
    /// Seedbed area as a share of the planted area (FAO TM4: 0.05–0.10).
    pub area_share: f64,
    /// Days the seedbed is kept before transplanting (≥ 1).
    pub duration_days: usize,
    /// Crop coefficient of the seedbed (× ET₀).
    pub kc: f64,
    /// Saturation plus ponding water of the seedbed (mm), spread over its
    /// duration.
    pub establishment_mm: f64,
}

/// A paddy planting: main field, land preparation, optional nursery, and the
/// planting window.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PaddyPlanting {
    /// Main-field ponding.
    pub field: PaddyField,
    /// Land preparation.
    pub land_prep: LandPreparation,
    /// Optional nursery.
    pub nursery: Option<Nursery>,
    /// Days over which transplanting is spread (0 = all on one day).
    pub window_days: usize,
    /// Number of equal sub-areas transplanted at even steps over the window
    /// (≥ 1).
    pub groups: usize,
}

/// One day of the main-field ponding balance (mm).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct PaddyFieldDay {
    /// Crop ET, Kc·ET₀.
    pub etc_mm: f64,
    /// Rain.
    pub rain_mm: f64,
    /// Rain above the bund, lost.
    pub spill_mm: f64,
    /// Effective rain: rain stored in the pond (rain − spill).
    pub peff_mm: f64,
    /// Seepage and percolation.
    pub percolation_mm: f64,
    /// Net irrigation.
    pub irrigation_mm: f64,
    /// Pond water released when drainage starts.
    pub drained_mm: f64,
    /// Water drawn from the soil once the pond is empty in the drainage
    /// period (not supplied by irrigation).
    pub soil_water_used_mm: f64,
    /// Pond depth at the end of the day.
    pub ponding_mm: f64,
}

fn check_param(
    name: &'static str,
    value: f64,
    ok: bool,
    expected: &'static str,
) -> Result<(), PaddyError> {
    if value.is_finite() && ok {
        Ok(())
    } else {
        Err(PaddyError::BadParameter {
            name,
            value,
            expected,
        })
    }
}

fn check_daily(series: &'static str, s: &[f64]) -> Result<(), PaddyError> {
    match s.iter().position(|v| !(v.is_finite() && *v >= 0.0)) {
        Some(day) => Err(PaddyError::BadDailyValue {
            series,
            day,
            value: s[day],
        }),
        None => Ok(()),
    }
}

impl PaddyField {
    fn validate(&self) -> Result<(), PaddyError> {
        check_param(
            "bund_height_mm",
            self.bund_height_mm,
            self.bund_height_mm > 0.0,
            "a height > 0 mm",
        )?;
        check_param(
            "target_ponding_mm",
            self.target_ponding_mm,
            self.target_ponding_mm >= 0.0 && self.target_ponding_mm <= self.bund_height_mm,
            "0 ≤ target ≤ bund height (mm)",
        )?;
        check_param(
            "percolation_seepage_mm_day",
            self.percolation_seepage_mm_day,
            self.percolation_seepage_mm_day >= 0.0,
            "a rate ≥ 0 mm/day",
        )
    }
}

/// Daily ponding balance of the main field from transplanting to harvest
/// (one record per day of `kc`). The pond starts at the target depth
/// (established by land preparation). Each day: rain fills the pond up to
/// the bund (the rest spills); ETc and S&P are drawn; outside the drainage
/// period irrigation tops the pond back up to the target. On the first day of
/// the drainage period the pond above zero is released (`drained_mm`) and no
/// more irrigation is given; the crop finishes on rain and stored soil water
/// (`soil_water_used_mm`, with no S&P once the pond is empty).
///
/// Closure each day: h,i = h,i−1 + P − spill + I − ETc − S&P − drained + soil.
///
/// # Errors
/// [`PaddyError`] for bad parameters, series of different lengths or bad
/// daily values.
pub fn paddy_field_balance(
    et0_mm: &[f64],
    rain_mm: &[f64],
    kc: &[f64],
    field: &PaddyField,
) -> Result<Vec<PaddyFieldDay>, PaddyError> {
    field.validate()?;
    let n = kc.len();
    for (name, s) in [("et0_mm", et0_mm), ("rain_mm", rain_mm)] {
        if s.len() < n {
            return Err(PaddyError::SeriesTooShort {
                series: name,
                needed: n,
                found: s.len(),
            });
        }
    }
    check_daily("et0_mm", &et0_mm[..n])?;
    check_daily("rain_mm", &rain_mm[..n])?;
    check_daily("kc", kc)?;
    let drain_start = n.saturating_sub(field.drain_days_before_harvest);
    let mut h = field.target_ponding_mm;
    let mut out = Vec::with_capacity(n);
    for i in 0..n {
        let mut d = PaddyFieldDay {
            etc_mm: kc[i] * et0_mm[i],
            rain_mm: rain_mm[i],
            ..PaddyFieldDay::default()
        };
        if i == drain_start && i > 0 {
            d.drained_mm = h;
            h = 0.0;
        }
        let filled = h + d.rain_mm;
        d.spill_mm = (filled - field.bund_height_mm).max(0.0);
        d.peff_mm = d.rain_mm - d.spill_mm;
        h = filled - d.spill_mm;
        if i < drain_start {
            d.percolation_mm = field.percolation_seepage_mm_day;
            h -= d.etc_mm + d.percolation_mm;
            d.irrigation_mm = (field.target_ponding_mm - h).max(0.0);
            h += d.irrigation_mm;
        } else {
            d.percolation_mm = field.percolation_seepage_mm_day.min(h);
            h -= d.percolation_mm;
            let from_pond = d.etc_mm.min(h);
            d.soil_water_used_mm = d.etc_mm - from_pond;
            h -= from_pond;
        }
        d.ponding_mm = h;
        out.push(d);
    }
    Ok(out)
}

/// One calendar day of a paddy planting, per hectare of planted area (mm).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct PaddyDay {
    /// Land preparation water.
    pub land_prep_mm: f64,
    /// Nursery water (already × its area share).
    pub nursery_mm: f64,
    /// Main-field net irrigation.
    pub field_irrigation_mm: f64,
    /// Net irrigation requirement: the sum of the three above.
    pub nir_mm: f64,
    /// Main-field crop ET.
    pub etc_mm: f64,
    /// Main-field seepage and percolation.
    pub percolation_mm: f64,
    /// Main-field effective rain.
    pub peff_mm: f64,
    /// Share of the planted area under the main-field crop this day.
    pub field_share: f64,
}

impl PaddyPlanting {
    /// Days from the first day of the calendar (day 0: the start of the
    /// earliest land preparation or nursery) to the first transplanting.
    pub fn lead_days(&self) -> usize {
        let nursery = self.nursery.map_or(0, |n| n.duration_days);
        self.land_prep.duration_days.max(nursery)
    }

    /// Transplanting day offsets of the groups from the first transplanting.
    pub fn group_offsets(&self) -> Vec<usize> {
        let g = self.groups.max(1);
        (0..g)
            .map(|k| {
                if g == 1 {
                    0
                } else {
                    k.saturating_mul(self.window_days) / (g - 1)
                }
            })
            .collect()
    }

    /// Calendar days needed for a main season of `season_days`.
    pub fn calendar_days(&self, season_days: usize) -> usize {
        // Saturating: an absurd window cannot overflow; the series-length
        // check of `paddy_planting_requirement` then refuses it.
        self.lead_days()
            .saturating_add(self.group_offsets().last().copied().unwrap_or(0))
            .saturating_add(season_days)
    }
}

/// Daily requirement of a staggered paddy planting, per hectare of planted
/// area, over a calendar starting `planting.lead_days()` before the first
/// transplanting. The planting is split into `groups` equal sub-areas
/// transplanted at even steps over the window; each runs its own land
/// preparation (the T days before its transplanting), nursery and
/// main-field balance ([`paddy_field_balance`]), and the results are
/// area-weighted.
///
/// `et0_mm` and `rain_mm` cover the calendar (at least
/// [`PaddyPlanting::calendar_days`] days); `kc` is the main-field Kc per day
/// after transplanting (its length is the season).
///
/// # Errors
/// [`PaddyError`] for bad parameters or series.
pub fn paddy_planting_requirement(
    et0_mm: &[f64],
    rain_mm: &[f64],
    kc: &[f64],
    planting: &PaddyPlanting,
) -> Result<Vec<PaddyDay>, PaddyError> {
    planting.field.validate()?;
    let lp = planting.land_prep;
    check_param(
        "land_prep.duration_days",
        lp.duration_days as f64,
        lp.duration_days >= 1,
        "≥ 1 day",
    )?;
    for (name, v) in [
        ("land_prep.saturation_mm", lp.saturation_mm),
        ("land_prep.ponding_mm", lp.ponding_mm),
        ("land_prep.prep_kc", lp.prep_kc),
    ] {
        check_param(name, v, v >= 0.0, "a finite value ≥ 0")?;
    }
    check_param(
        "groups",
        planting.groups as f64,
        planting.groups >= 1,
        "≥ 1 group",
    )?;
    if let Some(n) = planting.nursery {
        check_param(
            "nursery.area_share",
            n.area_share,
            (0.0..=1.0).contains(&n.area_share),
            "a share 0..1",
        )?;
        check_param(
            "nursery.duration_days",
            n.duration_days as f64,
            n.duration_days >= 1,
            "≥ 1 day",
        )?;
        check_param("nursery.kc", n.kc, n.kc >= 0.0, "a coefficient ≥ 0")?;
        check_param(
            "nursery.establishment_mm",
            n.establishment_mm,
            n.establishment_mm >= 0.0,
            "a depth ≥ 0 mm",
        )?;
    }
    let total = planting.calendar_days(kc.len());
    for (name, s) in [("et0_mm", et0_mm), ("rain_mm", rain_mm)] {
        if s.len() < total {
            return Err(PaddyError::SeriesTooShort {
                series: name,
                needed: total,
                found: s.len(),
            });
        }
        check_daily(name, &s[..total])?;
    }
    check_daily("kc", kc)?;

    let lead = planting.lead_days();
    let offsets = planting.group_offsets();
    let weight = 1.0 / offsets.len() as f64;
    let ps = planting.field.percolation_seepage_mm_day;
    let mut out = vec![PaddyDay::default(); total];

    for &off in &offsets {
        let transplant = lead + off;
        // Land preparation: the T days before transplanting.
        let start = transplant - lp.duration_days;
        let per_day_volume = (lp.saturation_mm + lp.ponding_mm) / lp.duration_days as f64;
        for (t, day) in out.iter_mut().enumerate().take(transplant).skip(start) {
            let need = per_day_volume + lp.prep_kc * et0_mm[t] + ps - rain_mm[t];
            day.land_prep_mm += weight * need.max(0.0);
        }
        // Nursery: its duration before transplanting, on its area share.
        if let Some(n) = planting.nursery {
            let start = transplant - n.duration_days;
            let per_day_volume = n.establishment_mm / n.duration_days as f64;
            for (t, day) in out.iter_mut().enumerate().take(transplant).skip(start) {
                let need = per_day_volume + n.kc * et0_mm[t] + ps - rain_mm[t];
                day.nursery_mm += weight * n.area_share * need.max(0.0);
            }
        }
        // Main field.
        let end = transplant + kc.len();
        let field = paddy_field_balance(
            &et0_mm[transplant..end],
            &rain_mm[transplant..end],
            kc,
            &planting.field,
        )?;
        for (day, f) in out[transplant..end].iter_mut().zip(&field) {
            day.field_irrigation_mm += weight * f.irrigation_mm;
            day.etc_mm += weight * f.etc_mm;
            day.percolation_mm += weight * f.percolation_mm;
            day.peff_mm += weight * f.peff_mm;
            day.field_share += weight;
        }
    }
    for d in &mut out {
        d.nir_mm = d.land_prep_mm + d.nursery_mm + d.field_irrigation_mm;
    }
    Ok(out)
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    /// Computed from the documented balance: ET₀ 5, Kc 1.1, S&P 4, no rain,
    /// pond at target → irrigation = 5.5 + 4 = 9.5 mm every day before the
    /// drainage period; the pond stays at target.
    #[test]
    fn steady_state_irrigation_is_etc_plus_percolation() {
        let n = 40;
        let f = PaddyField::default();
        let days = paddy_field_balance(&vec![5.0; n], &vec![0.0; n], &vec![1.1; n], &f).unwrap();
        for d in &days[..n - 10] {
            assert!((d.irrigation_mm - 9.5).abs() < 1e-12);
            assert!((d.ponding_mm - 100.0).abs() < 1e-12);
        }
        for d in &days[n - 10..] {
            assert!(d.irrigation_mm.abs() < 1e-12);
        }
        assert!((days[n - 10].drained_mm - 100.0).abs() < 1e-12);
    }

    /// Rain above the bund spills: pond 100, bund 200, rain 150 → spill 50,
    /// effective 100; the next top-up is then 0 until the pond falls to target.
    #[test]
    fn rain_above_bund_spills() {
        let f = PaddyField::default();
        let days = paddy_field_balance(&[5.0, 5.0], &[150.0, 0.0], &[1.0, 1.0], &f).unwrap();
        assert!((days[0].spill_mm - 50.0).abs() < 1e-12);
        assert!((days[0].peff_mm - 100.0).abs() < 1e-12);
        assert!(days[0].irrigation_mm.abs() < 1e-12);
        assert!((days[0].ponding_mm - 191.0).abs() < 1e-12);
    }

    #[test]
    fn bad_target_is_an_error() {
        let f = PaddyField {
            target_ponding_mm: 300.0,
            ..PaddyField::default()
        };
        assert!(paddy_field_balance(&[5.0], &[0.0], &[1.0], &f).is_err());
    }
}
