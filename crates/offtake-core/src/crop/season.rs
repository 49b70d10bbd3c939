//! The daily crop coefficient, basal coefficient, rooting depth and
//! depletion fraction of one planting, for a season or a chain of cycles.
//!
//! This is what the root-zone water balance consumes: per-day arrays aligned
//! with the planting's days, day 1 being the planting (or cycle-start) date.
//!
//! - Annual crops: the Table 11 stage lengths scaled to the season length
//!   ([`StageLengths::scaled_to`]).
//! - [`CycleKind::Repeated`] (sugarcane plant crop then ratoons; alfalfa first
//!   cutting cycle then later cycles): the first cycle with the crop's stages,
//!   then later cycles until the requested length is covered; the last cycle
//!   may be cut short (reported in [`CycleSummary::complete`]).
//! - [`CycleKind::Yearly`] (orchards, vines): the four stages start on the
//!   same calendar date every year; days after the late season until the
//!   next anniversary take the off-season coefficients.
//!
//! Kc mid and Kc end (and Kcb mid/end) of every cycle are adjusted with
//! FAO-56 eq. 62, 65 and 70 from the mean u2 and RHmin of the actual days
//! of that cycle's mid-season and late-season stages, when daily weather is
//! given.

use chrono::{Months, NaiveDate};

use super::climate::{
    DayClimate, StageClimate, kc_end_adjusted, kc_mid_adjusted, kcb_end_adjusted, kcb_mid_adjusted,
    stage_climate,
};
use super::kc_curve::KcCurve;
use super::root::{
    DEFAULT_INITIAL_ROOT_DEPTH_M, RootDepthChoice, RootGrowthRule, root_depth_on_day_m,
};
use super::{CoefficientSet, Crop, CropError, CycleKind, Stage, StageLengths, check_range};

/// Weather used for the climate adjustment.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum ClimateInput<'a> {
    /// Table 12/17 values as printed (subhumid, u2 = 2 m/s, RHmin = 45 %).
    #[default]
    Standard,
    /// One mean for every stage (e.g. a climate from FAO-56 Tables 15–16).
    Constant(StageClimate),
    /// Daily u2 and RHmin, element 0 being day 1 of the planting. Days
    /// beyond the slice, and days whose u2 or RHmin is missing (not finite)
    /// or impossible (u2 < 0, RHmin outside 0..=100), are not used; a stage
    /// with no usable weather day is left unadjusted. The number of days
    /// used is reported in [`CycleSummary`].
    Daily(&'a [DayClimate]),
}

/// What the user sets for one planting's crop curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeasonSpec<'a> {
    /// First day of the planting (day 1).
    pub start: NaiveDate,
    /// Length in days: for annual crops the season length the Table 11
    /// stages are scaled to; for repeated and yearly crops the length of the
    /// cycle chain. `None`: the Table 11 total (annual and repeated crops:
    /// the first cycle) or 365 days (yearly crops).
    pub length_days: Option<u32>,
    /// Weather for the climate adjustment.
    pub climate: ClimateInput<'a>,
    /// Kc ini to use instead of the Table 12 value in every cycle, e.g. from
    /// [`super::kc_ini::kc_ini_full_wetting`].
    pub kc_ini_override: Option<f64>,
    /// Rooting depth at planting (m).
    pub initial_root_depth_m: f64,
    /// Which maximum rooting depth to use.
    pub root_depth: RootDepthChoice,
    /// How roots grow in the first cycle.
    pub root_growth: RootGrowthRule,
}

impl SeasonSpec<'_> {
    /// A spec with defaults: Table 11 length, standard climate, Table 12
    /// Kc ini, 0.20 m initial roots, scheduling root depth, growth over the
    /// development stage.
    pub fn new(start: NaiveDate) -> Self {
        Self {
            start,
            length_days: None,
            climate: ClimateInput::Standard,
            kc_ini_override: None,
            initial_root_depth_m: DEFAULT_INITIAL_ROOT_DEPTH_M,
            root_depth: RootDepthChoice::Scheduling,
            root_growth: RootGrowthRule::OverDevelopment,
        }
    }
}

/// One day of a planting's crop series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CropDay {
    /// Calendar date.
    pub date: NaiveDate,
    /// Cycle number, 0 for the first (plant crop, first cutting cycle, first year).
    pub cycle: u32,
    /// Day within the cycle, 1-based.
    pub day_in_cycle: u32,
    /// Growth stage; `None` in the off-season of a yearly crop.
    pub stage: Option<Stage>,
    /// Single crop coefficient Kc (–).
    pub kc: f64,
    /// Basal crop coefficient Kcb (–), when the crop has Table 17 values.
    pub kcb: Option<f64>,
    /// Effective rooting depth Zr (m).
    pub root_depth_m: f64,
    /// Depletion fraction p from Table 22, not yet adjusted for ETc (–).
    pub depletion_p: f64,
}

/// One cycle of the series and the coefficients used for it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CycleSummary {
    /// Index of the cycle's first day in [`CropSeries::days`].
    pub first_index: usize,
    /// Days of this cycle in the series (may be fewer than the stages when cut).
    pub days: u32,
    /// Stage lengths of the cycle.
    pub lengths: StageLengths,
    /// Kc anchor values after the climate adjustment.
    pub kc: CoefficientSet,
    /// Kcb anchor values after the climate adjustment.
    pub kcb: Option<CoefficientSet>,
    /// Mean weather of the mid-season used for the adjustment.
    pub mid_climate: StageClimate,
    /// Mean weather of the late season used for the adjustment.
    pub late_climate: StageClimate,
    /// Days of daily weather behind `mid_climate` (0 when not daily or none usable).
    pub mid_weather_days: usize,
    /// Days of daily weather behind `late_climate`.
    pub late_weather_days: usize,
    /// Whether the cycle runs to the end of its late season.
    pub complete: bool,
}

/// The per-day crop series of one planting.
#[derive(Debug, Clone, PartialEq)]
pub struct CropSeries {
    /// Crop id.
    pub crop_id: String,
    /// One entry per day, from the planting date.
    pub days: Vec<CropDay>,
    /// One entry per cycle.
    pub cycles: Vec<CycleSummary>,
}

impl CropSeries {
    /// Daily Kc.
    pub fn kc(&self) -> Vec<f64> {
        self.days.iter().map(|d| d.kc).collect()
    }
    /// Daily Kcb, if the crop has basal coefficients.
    pub fn kcb(&self) -> Option<Vec<f64>> {
        self.days.iter().map(|d| d.kcb).collect()
    }
    /// Daily rooting depth (m).
    pub fn root_depth_m(&self) -> Vec<f64> {
        self.days.iter().map(|d| d.root_depth_m).collect()
    }
    /// Daily depletion fraction p (Table 22, unadjusted).
    pub fn depletion_p(&self) -> Vec<f64> {
        self.days.iter().map(|d| d.depletion_p).collect()
    }
    /// Dates.
    pub fn dates(&self) -> Vec<NaiveDate> {
        self.days.iter().map(|d| d.date).collect()
    }
}

/// Mean climate over season days `range` (1-based, inclusive), offset by
/// `offset` days from the planting, and the number of daily values used.
fn climate_over(
    input: ClimateInput<'_>,
    offset: usize,
    range: std::ops::RangeInclusive<u32>,
) -> (StageClimate, usize) {
    match input {
        ClimateInput::Standard => (StageClimate::STANDARD, 0),
        ClimateInput::Constant(c) => (c, 0),
        ClimateInput::Daily(days) => {
            let lo = (offset + *range.start() as usize - 1).min(days.len());
            let hi = (offset + *range.end() as usize).min(days.len());
            let usable: Vec<DayClimate> = days[lo..hi.max(lo)]
                .iter()
                .copied()
                .filter(|d| {
                    d.u2_ms.is_finite()
                        && d.u2_ms >= 0.0
                        && d.rhmin_pct.is_finite()
                        && (0.0..=100.0).contains(&d.rhmin_pct)
                })
                .collect();
            match stage_climate(&usable) {
                Ok(c) => (c, usable.len()),
                Err(_) => (StageClimate::STANDARD, 0),
            }
        }
    }
}

/// Adjusted Kc and Kcb anchor values for one cycle.
fn adjusted_sets(
    crop: &Crop,
    kc_ini: f64,
    mid: StageClimate,
    late: StageClimate,
) -> (CoefficientSet, Option<CoefficientSet>) {
    let h = crop.max_height_m;
    let kc = CoefficientSet {
        ini: kc_ini,
        mid: kc_mid_adjusted(crop.kc.mid, mid, h),
        end: kc_end_adjusted(crop.kc.end, late, h),
    };
    let kcb = crop.kcb.map(|b| CoefficientSet {
        ini: b.ini,
        mid: kcb_mid_adjusted(b.mid, mid, h),
        end: kcb_end_adjusted(b.end, late, h),
    });
    (kc, kcb)
}

/// Builds the per-day Kc, Kcb, rooting depth and p of one planting.
///
/// See the module documentation for how each crop kind is laid out. The
/// returned series has exactly the requested number of days.
///
/// # Errors
/// An invalid crop entry, a season shorter than 4 days, a custom root depth
/// outside 0.05..=10 m, or a Kc ini override outside 0..=2. Missing weather
/// is not an error (see [`ClimateInput::Daily`]).
pub fn crop_season_series(crop: &Crop, spec: &SeasonSpec<'_>) -> Result<CropSeries, CropError> {
    crop.validate()?;
    if let Some(k) = spec.kc_ini_override {
        check_range("Kc ini override", k, 0.0, 2.0, "0 to 2")?;
    }
    let kc_ini = spec.kc_ini_override.unwrap_or(crop.kc.ini);
    let max_root_m = match spec.root_depth {
        RootDepthChoice::Scheduling => crop.root_depth_min_m,
        RootDepthChoice::Stress => crop.root_depth_max_m,
        RootDepthChoice::Custom(z) => check_range("root depth (m)", z, 0.05, 10.0, "0.05 to 10 m")?,
    };
    let initial_root_m = spec.initial_root_depth_m.min(max_root_m);

    // Lay out the cycles: (start offset in days, lengths, days in series, year-long span).
    let mut layout: Vec<(usize, StageLengths, u32, u32)> = Vec::new();
    match crop.cycle {
        CycleKind::Annual => {
            let lengths = match spec.length_days {
                Some(n) => crop.stages.scaled_to(n)?,
                None => crop.stages,
            };
            layout.push((0, lengths, lengths.total_days(), lengths.total_days()));
        }
        CycleKind::Repeated { later } => {
            let total = spec.length_days.unwrap_or(crop.stages.total_days());
            if total < 4 {
                return Err(CropError::SeasonTooShort { found: total });
            }
            let mut offset = 0u32;
            let mut lengths = crop.stages;
            while offset < total {
                let span = lengths.total_days();
                let days = span.min(total - offset);
                layout.push((offset as usize, lengths, days, span));
                offset += days;
                lengths = later;
            }
        }
        CycleKind::Yearly { .. } => {
            let total = spec.length_days.unwrap_or(365);
            if total < 4 {
                return Err(CropError::SeasonTooShort { found: total });
            }
            let mut offset = 0u32;
            let mut k = 0u32;
            while offset < total {
                let this_start = spec
                    .start
                    .checked_add_months(Months::new(12 * k))
                    .ok_or(CropError::SeasonTooShort { found: total })?;
                let next_start = spec
                    .start
                    .checked_add_months(Months::new(12 * (k + 1)))
                    .ok_or(CropError::SeasonTooShort { found: total })?;
                let span = (next_start - this_start).num_days() as u32;
                let days = span.min(total - offset);
                layout.push((offset as usize, crop.stages, days, span));
                offset += days;
                k += 1;
            }
        }
    }

    let mut days = Vec::new();
    let mut cycles = Vec::new();
    for (cycle_no, &(offset, lengths, n_days, _span)) in layout.iter().enumerate() {
        let (mid, mid_weather_days) =
            climate_over(spec.climate, offset, lengths.day_range(Stage::MidSeason));
        let (late, late_weather_days) =
            climate_over(spec.climate, offset, lengths.day_range(Stage::LateSeason));
        let (kc_set, kcb_set) = adjusted_sets(crop, kc_ini, mid, late);
        let kc_curve = KcCurve::new(lengths, kc_set)?;
        let kcb_curve = kcb_set.map(|s| KcCurve::new(lengths, s)).transpose()?;
        let growth = if cycle_no == 0 && !matches!(crop.cycle, CycleKind::Yearly { .. }) {
            spec.root_growth
        } else {
            RootGrowthRule::Established
        };
        let (off_kc, off_kcb) = match crop.cycle {
            CycleKind::Yearly {
                off_season_kc,
                off_season_kcb,
            } => (off_season_kc, off_season_kcb),
            _ => (kc_set.end, kcb_set.map_or(0.0, |s| s.end)),
        };
        for d in 1..=n_days {
            let index = offset + d as usize - 1;
            let date = spec.start + chrono::Days::new(index as u64);
            let in_stages = d <= lengths.total_days();
            let root = root_depth_on_day_m(d, &lengths, initial_root_m, max_root_m, growth)?;
            days.push(CropDay {
                date,
                cycle: cycle_no as u32,
                day_in_cycle: d,
                stage: in_stages.then(|| lengths.stage_of_day(d)),
                kc: if in_stages {
                    kc_curve.kc_on_day(d)
                } else {
                    off_kc
                },
                kcb: kcb_curve.map(|c| if in_stages { c.kc_on_day(d) } else { off_kcb }),
                root_depth_m: root,
                depletion_p: crop.depletion_p,
            });
        }
        cycles.push(CycleSummary {
            first_index: offset,
            days: n_days,
            lengths,
            kc: kc_set,
            kcb: kcb_set,
            mid_climate: mid,
            late_climate: late,
            mid_weather_days,
            late_weather_days,
            complete: n_days >= lengths.total_days(),
        });
    }
    Ok(CropSeries {
        crop_id: crop.id.clone(),
        days,
        cycles,
    })
}
