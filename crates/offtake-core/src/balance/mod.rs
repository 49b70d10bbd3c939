//! Root-zone water balance of one planting, FAO-56 Chapter 8.
//!
//! Source: Allen, Pereira, Raes & Smith (1998), *Crop evapotranspiration*,
//! FAO Irrigation and Drainage Paper 56, Chapter 8, eqs. 81–88;
//! the dual coefficient's evaporation layer is Chapter 7 (see
//! [`evaporation`]).
//!
//! # The daily step
//!
//! For day *i* with inputs ET₀, P (rain), Kc (or Kcb + Ke), root depth Zr and
//! optional capillary rise CR:
//!
//! 1. TAW = (θFC − θWP)·1000·Zr (eq. 82), ETc = Kc·ET₀, p adjusted for ETc
//!    (Table 22 note: p = p_tab + 0.04(5 − ETc), 0.1 ≤ p ≤ 0.8), RAW = p·TAW
//!    (eq. 83).
//! 2. **Root growth.** FAO-56 takes the soil newly explored by the roots to be
//!    at field capacity, so the depletion (mm) carries over unchanged while
//!    TAW grows. Root depth must therefore not decrease within a run (a
//!    shrinking root zone would lose water outside eq. 85); a decrease is an
//!    error.
//! 3. **Irrigation** is decided from the depletion at the end of day *i* − 1
//!    (see [`Strategy`]).
//! 4. **Runoff** RO of the rain by the chosen [`RunoffRule`].
//! 5. **Wetting early in the day** (FAO-56 Example 38, p. 172):
//!    Dr,start = max(Dr,i−1 − (P − RO) − I − CR, 0); water above field capacity
//!    leaves as deep percolation DP = max(0, (P − RO) + I + CR − Dr,i−1)
//!    (eq. 88 with the ET of the day taken after the wetting). CR is taken
//!    only up to the room left after rain and irrigation, so it never
//!    percolates.
//! 6. Ks from Dr,start (eq. 84); ETc adj = Ks·Kc·ET₀ (eq. 81), or
//!    (Ks·Kcb + Ke)·ET₀ (eq. 80); ETc adj is bounded by the water left,
//!    TAW − Dr,start, so that 0 ≤ Dr ≤ TAW (eq. 86).
//! 7. Dr,i = Dr,start + ETc adj. The day then satisfies eq. 85 exactly:
//!    Dr,i = Dr,i−1 − (P − RO) − I − CR + ETc adj + DP.
//!
//! # Effective rain
//!
//! Effective rain Peff is the rain stored in the root zone: the infiltrated
//! rain P − RO less the share of the day's deep percolation attributed to
//! rain. Deep percolation is shared between infiltrated rain and irrigation
//! in proportion to their depths that day (capillary rise never percolates):
//! Peff = (P − RO) − DP·(P − RO)/((P − RO) + I). Stored water is used by the
//! crop later or left in the root zone at the end of the run; the seasonal
//! identity [`SeasonTotals::storage_change_mm`] accounts for the latter.
//!
//! Results are planning estimates; designs built on them must be checked by a
//! qualified engineer.

pub mod evaporation;
pub mod strategy;

use serde::{Deserialize, Serialize};

pub use evaporation::{EvaporationDay, EvaporationLayer, ExposedWetted};
pub use strategy::{
    IntervalDepth, IrrigationEvent, ParseStrategyError, RefillTarget, Strategy, TurnTarget,
};

/// p of FAO-56 Table 22 applies at ETc ≈ 5 mm/day (Table 22 note).
pub const P_REFERENCE_ETC_MM_DAY: f64 = 5.0;
/// Slope of the p adjustment, per mm/day of ETc (Table 22 note).
pub const P_ADJUST_PER_MM_DAY: f64 = 0.04;
/// Lower limit of the adjusted p (Table 22 note).
pub const P_MIN: f64 = 0.1;
/// Upper limit of the adjusted p (Table 22 note).
pub const P_MAX: f64 = 0.8;
/// Initial abstraction ratio Ia = 0.2 S of the curve number method
/// (USDA-NRCS, NEH Part 630, Chapter 10).
pub const CURVE_NUMBER_IA_RATIO: f64 = 0.2;

/// Error in the inputs of a water balance.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum BalanceError {
    /// A daily series has a different length from ET₀.
    #[error("series `{series}` has {found} days, expected {expected} (the length of et0_mm)")]
    LengthMismatch {
        /// Name of the series.
        series: &'static str,
        /// Length of et0_mm.
        expected: usize,
        /// Length found.
        found: usize,
    },
    /// A daily value is not finite or is outside its range.
    #[error("series `{series}` day {day}: found {value}, expected {expected}")]
    BadDailyValue {
        /// Name of the series.
        series: &'static str,
        /// Day index (0-based).
        day: usize,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// A parameter is not finite or is outside its range.
    #[error("parameter `{name}`: found {value}, expected {expected}")]
    BadParameter {
        /// Name of the parameter.
        name: &'static str,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// The root depth decreased from one day to the next.
    #[error(
        "root depth decreases on day {day}: {previous_m} m then {found_m} m (must not decrease within a run)"
    )]
    RootDepthDecreasing {
        /// Day index (0-based).
        day: usize,
        /// Root depth the day before (m).
        previous_m: f64,
        /// Root depth found (m).
        found_m: f64,
    },
}

/// Total available water TAW (mm), FAO-56 eq. 82.
///
/// TAW = 1000 (θFC − θWP) Zr, with θ in m³/m³ and Zr the root depth (m).
pub fn total_available_water_mm(theta_fc: f64, theta_wp: f64, root_depth_m: f64) -> f64 {
    1000.0 * (theta_fc - theta_wp) * root_depth_m
}

/// Readily available water RAW (mm), FAO-56 eq. 83: RAW = p TAW.
pub fn readily_available_water_mm(p: f64, taw_mm: f64) -> f64 {
    p * taw_mm
}

/// Depletion fraction p adjusted for the day's ETc, FAO-56 Table 22 note:
/// p = p_tab + 0.04 (5 − ETc), limited to 0.1 ≤ p ≤ 0.8, with ETc
/// in mm/day and p_tab the Table 22 value (valid at ETc ≈ 5 mm/day).
pub fn depletion_fraction_adjusted(p_table: f64, etc_mm_day: f64) -> f64 {
    (p_table + P_ADJUST_PER_MM_DAY * (P_REFERENCE_ETC_MM_DAY - etc_mm_day)).clamp(P_MIN, P_MAX)
}

/// Water stress coefficient Ks, FAO-56 eq. 84.
///
/// Ks = (TAW − Dr)/(TAW − RAW) when Dr > RAW, else 1; Dr the root-zone
/// depletion (mm). Clamped to 0..1 (Dr ≥ TAW gives 0).
pub fn water_stress_coefficient(taw_mm: f64, raw_mm: f64, depletion_mm: f64) -> f64 {
    if depletion_mm <= raw_mm {
        1.0
    } else if taw_mm <= raw_mm {
        0.0
    } else {
        ((taw_mm - depletion_mm) / (taw_mm - raw_mm)).clamp(0.0, 1.0)
    }
}

/// Initial root-zone depletion (mm) from the initial water content,
/// FAO-56 eq. 87: Dr,i−1 = 1000 (θFC − θi−1) Zr.
pub fn initial_depletion_mm(theta_fc: f64, theta_initial: f64, root_depth_m: f64) -> f64 {
    1000.0 * (theta_fc - theta_initial) * root_depth_m
}

/// Daily surface runoff (mm) by the USDA-SCS curve number method
/// (USDA-NRCS National Engineering Handbook Part 630, Chapter 10, runoff
/// equation; originally NEH-4 Section 4) [equation written from memory of
/// the handbook; the primary text was not retrieved here — verify]:
///
/// Q = (P − Ia)² / (P − Ia + S) for P > Ia, else 0; S = 25400/CN − 254 (mm),
/// Ia = 0.2 S.
///
/// `curve_number` 1..=100 (100: all rain runs off). The method is meant for
/// storm rain; applying it to daily totals is the common practice in daily
/// soil water balances.
pub fn curve_number_runoff_mm(rain_mm: f64, curve_number: f64) -> f64 {
    if rain_mm <= 0.0 {
        return 0.0;
    }
    if curve_number >= 100.0 {
        return rain_mm;
    }
    let s = 25_400.0 / curve_number - 254.0;
    let ia = CURVE_NUMBER_IA_RATIO * s;
    if rain_mm <= ia {
        0.0
    } else {
        (rain_mm - ia).powi(2) / (rain_mm - ia + s)
    }
}

/// How the runoff RO of the daily rain is found. Irrigation is taken to be
/// applied without runoff.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct RunoffRule {
    /// USDA-SCS curve number (1..100) for the daily rain, see
    /// [`curve_number_runoff_mm`]; `None` for no curve-number runoff.
    pub curve_number: Option<f64>,
    /// Maximum infiltration in one day (mm/day); rain left after the curve
    /// number runoff and above this also runs off. `None` for no limit.
    pub max_infiltration_mm_day: Option<f64>,
}

impl RunoffRule {
    /// No runoff: all rain infiltrates (FAO-56 Example 38 case).
    pub const NONE: RunoffRule = RunoffRule {
        curve_number: None,
        max_infiltration_mm_day: None,
    };

    /// Daily runoff (mm) of `rain_mm` under this rule.
    pub fn runoff_mm(&self, rain_mm: f64) -> f64 {
        let mut ro = match self.curve_number {
            Some(cn) => curve_number_runoff_mm(rain_mm, cn),
            None => 0.0,
        };
        if let Some(max) = self.max_infiltration_mm_day {
            ro += (rain_mm - ro - max).max(0.0);
        }
        ro.min(rain_mm).max(0.0)
    }
}

/// The crop coefficient series of a run.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum CropCoefficients<'a> {
    /// Single Kc per day (FAO-56 eq. 81).
    Single {
        /// Kc per day.
        kc: &'a [f64],
    },
    /// Dual coefficient Kcb + Ke (FAO-56 eq. 80) with the evaporation layer.
    Dual {
        /// Kcb per day.
        kcb: &'a [f64],
        /// Kc max per day (eq. 72; see [`evaporation::kc_max`]).
        kc_max: &'a [f64],
        /// The surface layer's parameters.
        layer: EvaporationLayer,
        /// How few is found each day.
        few: ExposedWetted<'a>,
    },
}

/// Daily input series of one run (all of the same length).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DailySeries<'a> {
    /// Reference evapotranspiration ET₀ (mm/day).
    pub et0_mm: &'a [f64],
    /// Rain P (mm/day).
    pub rain_mm: &'a [f64],
    /// Crop coefficients.
    pub crop: CropCoefficients<'a>,
    /// Effective root depth Zr (m, > 0, non-decreasing).
    pub root_depth_m: &'a [f64],
    /// Capillary rise from a shallow water table CR (mm/day), optional
    /// (FAO-56 pp. 170–171: CR ≈ 0 when the water table is more than about 1 m
    /// below the root zone).
    pub capillary_rise_mm: Option<&'a [f64]>,
}

/// Soil and management parameters of a run.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BalanceParams {
    /// Total available water per metre of root depth, 1000 (θFC − θWP)
    /// (mm/m); FAO-56 Table 19 ranges (e.g. loam 130–180 mm/m).
    pub taw_mm_per_m: f64,
    /// Depletion fraction p of FAO-56 Table 22 (valid at ETc ≈ 5 mm/day).
    pub p_table: f64,
    /// Adjust p daily for ETc by the Table 22 note (default true). FAO-56
    /// Examples 37 and 38 keep p fixed.
    pub adjust_p_for_etc: bool,
    /// Root-zone depletion at the start of the first day (mm), 0..=TAW
    /// (eq. 87 gives it from a water content).
    pub initial_depletion_mm: f64,
    /// Runoff of rain.
    pub runoff: RunoffRule,
    /// Scheduling strategy.
    pub strategy: Strategy,
    /// Share (0..=1) of each day's request that can be delivered (an outlet
    /// too small for the day's requests of all it serves), indexed like the
    /// series; `None`, or a day beyond the slice: all of it. The water not
    /// delivered is not owed later: the next request follows from the
    /// depletion.
    #[serde(skip)]
    pub supply_factor: Option<std::sync::Arc<[f64]>>,
}

impl BalanceParams {
    /// Parameters with field capacity and wilting point in m³/m³ (TAW per
    /// metre from eq. 82), the default strategy (refill at RAW), p adjusted
    /// for ETc, no runoff and the root zone at field capacity at the start.
    pub fn new(theta_fc: f64, theta_wp: f64, p_table: f64) -> Self {
        Self {
            taw_mm_per_m: total_available_water_mm(theta_fc, theta_wp, 1.0),
            p_table,
            adjust_p_for_etc: true,
            initial_depletion_mm: 0.0,
            runoff: RunoffRule::NONE,
            strategy: Strategy::default(),
            supply_factor: None,
        }
    }
}

/// One day of the balance. Depths in mm; depletion at the end of the day.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct BalanceDay {
    /// Reference ET₀ (mm).
    pub et0_mm: f64,
    /// Crop coefficient of the unstressed crop: Kc, or Kcb + Ke for the dual
    /// coefficient.
    pub kc: f64,
    /// Crop ET under standard conditions ETc = Kc ET₀ (mm).
    pub etc_mm: f64,
    /// Actual crop ET, ETc adj (eq. 80/81) (mm).
    pub etc_adj_mm: f64,
    /// Rain P (mm).
    pub rain_mm: f64,
    /// Runoff RO (mm).
    pub runoff_mm: f64,
    /// Effective rain: infiltrated rain stored in the root zone (mm); see the
    /// module documentation.
    pub peff_mm: f64,
    /// Net irrigation I (mm).
    pub irrigation_mm: f64,
    /// Capillary rise taken CR (mm).
    pub capillary_rise_mm: f64,
    /// Deep percolation DP (mm).
    pub deep_perc_mm: f64,
    /// Root-zone depletion at the end of the day Dr (mm).
    pub depletion_mm: f64,
    /// Total available water TAW (mm).
    pub taw_mm: f64,
    /// Readily available water RAW (mm).
    pub raw_mm: f64,
    /// Depletion fraction p used.
    pub p: f64,
    /// Water stress coefficient Ks.
    pub ks: f64,
}

/// The result of a run.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct BalanceRun {
    /// One record per input day.
    pub days: Vec<BalanceDay>,
    /// Evaporation layer records (dual coefficient only, else empty).
    pub evaporation: Vec<EvaporationDay>,
    /// Every irrigation (day index, net mm).
    pub events: Vec<IrrigationEvent>,
    /// Root-zone depletion before the first day (mm).
    pub initial_depletion_mm: f64,
}

/// Seasonal sums of a run (mm unless named).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct SeasonTotals {
    /// Number of days.
    pub days: usize,
    /// Σ ET₀.
    pub et0_mm: f64,
    /// Σ ETc.
    pub etc_mm: f64,
    /// Σ ETc adj.
    pub etc_adj_mm: f64,
    /// Σ P.
    pub rain_mm: f64,
    /// Σ effective rain.
    pub peff_mm: f64,
    /// Σ net irrigation.
    pub irrigation_mm: f64,
    /// Number of irrigations.
    pub irrigation_count: usize,
    /// Σ deep percolation.
    pub deep_perc_mm: f64,
    /// Σ runoff.
    pub runoff_mm: f64,
    /// Σ capillary rise.
    pub capillary_rise_mm: f64,
    /// Depletion before the first day.
    pub initial_depletion_mm: f64,
    /// Depletion at the end of the last day.
    pub final_depletion_mm: f64,
}

impl SeasonTotals {
    /// Soil water drawn from the root-zone store over the run,
    /// Dr,final − Dr,initial (mm; positive when the soil dried).
    ///
    /// Summing eq. 85 over the season gives the identity
    /// Σ(P − RO) + ΣI + ΣCR − ΣETc adj − ΣDP = −(Dr,final − Dr,initial).
    pub fn storage_change_mm(&self) -> f64 {
        self.final_depletion_mm - self.initial_depletion_mm
    }

    /// Relative ET ETc adj / ETc over the run (1 when ETc is 0).
    pub fn relative_et(&self) -> f64 {
        if self.etc_mm > 0.0 {
            self.etc_adj_mm / self.etc_mm
        } else {
            1.0
        }
    }
}

impl BalanceRun {
    /// Seasonal totals of the run.
    pub fn totals(&self) -> SeasonTotals {
        let mut t = SeasonTotals {
            days: self.days.len(),
            irrigation_count: self.events.len(),
            initial_depletion_mm: self.initial_depletion_mm,
            final_depletion_mm: self
                .days
                .last()
                .map_or(self.initial_depletion_mm, |d| d.depletion_mm),
            ..SeasonTotals::default()
        };
        for d in &self.days {
            t.et0_mm += d.et0_mm;
            t.etc_mm += d.etc_mm;
            t.etc_adj_mm += d.etc_adj_mm;
            t.rain_mm += d.rain_mm;
            t.peff_mm += d.peff_mm;
            t.irrigation_mm += d.irrigation_mm;
            t.deep_perc_mm += d.deep_perc_mm;
            t.runoff_mm += d.runoff_mm;
            t.capillary_rise_mm += d.capillary_rise_mm;
        }
        t
    }
}

fn check_series(
    name: &'static str,
    s: &[f64],
    n: usize,
    ok: impl Fn(f64) -> bool,
    expected: &'static str,
) -> Result<(), BalanceError> {
    if s.len() != n {
        return Err(BalanceError::LengthMismatch {
            series: name,
            expected: n,
            found: s.len(),
        });
    }
    match s.iter().position(|&v| !(v.is_finite() && ok(v))) {
        Some(day) => Err(BalanceError::BadDailyValue {
            series: name,
            day,
            value: s[day],
            expected,
        }),
        None => Ok(()),
    }
}

fn check_param(
    name: &'static str,
    value: f64,
    ok: bool,
    expected: &'static str,
) -> Result<(), BalanceError> {
    if value.is_finite() && ok {
        Ok(())
    } else {
        Err(BalanceError::BadParameter {
            name,
            value,
            expected,
        })
    }
}

fn validate(series: &DailySeries<'_>, params: &BalanceParams) -> Result<(), BalanceError> {
    let n = series.et0_mm.len();
    let nonneg = |v: f64| v >= 0.0;
    check_series("et0_mm", series.et0_mm, n, nonneg, "a finite value ≥ 0 mm")?;
    check_series(
        "rain_mm",
        series.rain_mm,
        n,
        nonneg,
        "a finite value ≥ 0 mm",
    )?;
    check_series(
        "root_depth_m",
        series.root_depth_m,
        n,
        |v| v > 0.0,
        "a finite depth > 0 m",
    )?;
    for day in 1..n {
        if series.root_depth_m[day] < series.root_depth_m[day - 1] {
            return Err(BalanceError::RootDepthDecreasing {
                day,
                previous_m: series.root_depth_m[day - 1],
                found_m: series.root_depth_m[day],
            });
        }
    }
    if let Some(cr) = series.capillary_rise_mm {
        check_series("capillary_rise_mm", cr, n, nonneg, "a finite value ≥ 0 mm")?;
    }
    match series.crop {
        CropCoefficients::Single { kc } => {
            check_series("kc", kc, n, nonneg, "a finite coefficient ≥ 0")?;
        }
        CropCoefficients::Dual {
            kcb,
            kc_max,
            layer,
            few,
        } => {
            check_series("kcb", kcb, n, nonneg, "a finite coefficient ≥ 0")?;
            check_series("kc_max", kc_max, n, nonneg, "a finite coefficient ≥ 0")?;
            check_param("tew_mm", layer.tew_mm, layer.tew_mm > 0.0, "TEW > 0 mm")?;
            check_param(
                "rew_mm",
                layer.rew_mm,
                layer.rew_mm >= 0.0 && layer.rew_mm < layer.tew_mm,
                "0 ≤ REW < TEW (mm)",
            )?;
            check_param(
                "evaporation layer initial_depletion_mm",
                layer.initial_depletion_mm,
                (0.0..=layer.tew_mm).contains(&layer.initial_depletion_mm),
                "0 ≤ De ≤ TEW (mm)",
            )?;
            check_param(
                "fw_irrigation",
                layer.fw_irrigation,
                layer.fw_irrigation > 0.0 && layer.fw_irrigation <= 1.0,
                "0 < fw ≤ 1",
            )?;
            match few {
                ExposedWetted::Fixed(f) => {
                    check_param("few", f, f > 0.0 && f <= 1.0, "0 < few ≤ 1")?;
                }
                ExposedWetted::FromCover { canopy_cover } => {
                    check_series(
                        "canopy_cover",
                        canopy_cover,
                        n,
                        |v| (0.0..=1.0).contains(&v),
                        "a cover fraction 0..1",
                    )?;
                }
                ExposedWetted::FromCanopy {
                    kc_min,
                    crop_height_m,
                } => {
                    check_param("kc_min", kc_min, kc_min >= 0.0, "Kc min ≥ 0")?;
                    check_series(
                        "crop_height_m",
                        crop_height_m,
                        n,
                        nonneg,
                        "a finite height ≥ 0 m",
                    )?;
                }
            }
        }
    }
    check_param(
        "taw_mm_per_m",
        params.taw_mm_per_m,
        params.taw_mm_per_m > 0.0,
        "TAW per metre > 0 mm/m (θFC > θWP)",
    )?;
    check_param(
        "p_table",
        params.p_table,
        params.p_table > 0.0 && params.p_table < 1.0,
        "0 < p < 1",
    )?;
    let taw0 = series
        .root_depth_m
        .first()
        .map_or(f64::INFINITY, |z| z * params.taw_mm_per_m);
    check_param(
        "initial_depletion_mm",
        params.initial_depletion_mm,
        params.initial_depletion_mm >= 0.0 && params.initial_depletion_mm <= taw0,
        "0 ≤ initial depletion ≤ TAW of the first day (mm)",
    )?;
    if let Some(cn) = params.runoff.curve_number {
        check_param("curve_number", cn, cn > 0.0 && cn <= 100.0, "0 < CN ≤ 100")?;
    }
    if let Some(m) = params.runoff.max_infiltration_mm_day {
        check_param(
            "max_infiltration_mm_day",
            m,
            m >= 0.0,
            "a finite rate ≥ 0 mm/day",
        )?;
    }
    if let Some(f) = params.supply_factor.as_deref()
        && let Some(day) = f
            .iter()
            .position(|v| !(v.is_finite() && (0.0..=1.0).contains(v)))
    {
        return Err(BalanceError::BadDailyValue {
            series: "supply_factor",
            day,
            value: f[day],
            expected: "a share of the request in 0..=1",
        });
    }
    if let Some((name, value)) = params.strategy.invalid_field() {
        return Err(BalanceError::BadParameter {
            name,
            value,
            expected: "a valid strategy setting (see Strategy docs)",
        });
    }
    Ok(())
}

/// Runs the daily root-zone water balance (FAO-56 Chapter 8; see the module
/// documentation for the order of the daily step).
///
/// # Errors
/// [`BalanceError`] when a series has the wrong length or a bad value, a
/// parameter is out of range, or the root depth decreases.
pub fn simulate(
    series: &DailySeries<'_>,
    params: &BalanceParams,
) -> Result<BalanceRun, BalanceError> {
    let mut run = BalanceRun::default();
    simulate_into(series, params, &mut run)?;
    Ok(run)
}

/// As [`simulate`], reusing the buffers of `run` (cleared first); for callers
/// that run many plantings.
///
/// # Errors
/// As [`simulate`].
pub fn simulate_into(
    series: &DailySeries<'_>,
    params: &BalanceParams,
    run: &mut BalanceRun,
) -> Result<(), BalanceError> {
    validate(series, params)?;
    let n = series.et0_mm.len();
    run.days.clear();
    run.days.reserve(n);
    run.evaporation.clear();
    run.events.clear();
    run.initial_depletion_mm = params.initial_depletion_mm;

    match series.crop {
        CropCoefficients::Single { kc } => {
            run_days(series, params, run, &mut SingleCoefficient { kc });
        }
        CropCoefficients::Dual {
            kcb,
            kc_max,
            layer,
            few,
        } => {
            let mut evaporation = std::mem::take(&mut run.evaporation);
            evaporation.reserve(n);
            let mut dual = DualCoefficient {
                kcb,
                kc_max,
                layer,
                few,
                depletion_mm: layer.initial_depletion_mm,
                last_fw: 1.0,
                records: evaporation,
            };
            run_days(series, params, run, &mut dual);
            run.evaporation = dual.records;
        }
    }
    Ok(())
}

/// The crop-coefficient side of the daily step, monomorphised so that the
/// daily loop carries no branch on the coefficient kind.
trait DayCoefficient {
    /// Coefficient whose ET sets the p adjustment: Kc, or Kcb for the dual
    /// coefficient (Ke is not known before the wetting).
    fn kc_for_p(&self, i: usize) -> f64;
    /// Returns (unstressed Kc, ETc adj before the bound by the water left).
    fn coefficients(
        &mut self,
        i: usize,
        ks: f64,
        infiltrated_mm: f64,
        irrigation_mm: f64,
        et0_mm: f64,
    ) -> (f64, f64);
}

struct SingleCoefficient<'a> {
    kc: &'a [f64],
}

impl DayCoefficient for SingleCoefficient<'_> {
    #[inline]
    fn kc_for_p(&self, i: usize) -> f64 {
        self.kc[i]
    }
    #[inline]
    fn coefficients(&mut self, i: usize, ks: f64, _: f64, _: f64, et0_mm: f64) -> (f64, f64) {
        let kc = self.kc[i];
        (kc, ks * kc * et0_mm)
    }
}

struct DualCoefficient<'a> {
    kcb: &'a [f64],
    kc_max: &'a [f64],
    layer: EvaporationLayer,
    few: ExposedWetted<'a>,
    depletion_mm: f64,
    last_fw: f64,
    records: Vec<EvaporationDay>,
}

impl DayCoefficient for DualCoefficient<'_> {
    #[inline]
    fn kc_for_p(&self, i: usize) -> f64 {
        self.kcb[i]
    }
    fn coefficients(
        &mut self,
        i: usize,
        ks: f64,
        infiltrated_mm: f64,
        irrigation_mm: f64,
        et0_mm: f64,
    ) -> (f64, f64) {
        let kcb = self.kcb[i];
        let kc_max = self.kc_max[i];
        if irrigation_mm > 0.0 {
            self.last_fw = self.layer.fw_irrigation;
        } else if infiltrated_mm > 0.0 {
            self.last_fw = 1.0;
        }
        let few = match self.few {
            ExposedWetted::Fixed(f) => f,
            ExposedWetted::FromCover { canopy_cover } => {
                evaporation::exposed_wetted_fraction(canopy_cover[i], self.last_fw)
            }
            ExposedWetted::FromCanopy {
                kc_min,
                crop_height_m,
            } => evaporation::exposed_wetted_fraction(
                evaporation::canopy_cover_fraction(kcb, kc_min, kc_max, crop_height_m[i]),
                self.last_fw,
            ),
        };
        let ev = evaporation::evaporation_layer_step(
            &self.layer,
            self.depletion_mm,
            infiltrated_mm,
            irrigation_mm,
            self.layer.fw_irrigation,
            et0_mm,
            kcb,
            kc_max,
            few,
        );
        self.depletion_mm = ev.depletion_mm;
        self.records.push(ev);
        (kcb + ev.ke, (ks * kcb + ev.ke) * et0_mm)
    }
}

fn run_days<C: DayCoefficient>(
    series: &DailySeries<'_>,
    params: &BalanceParams,
    run: &mut BalanceRun,
    crop: &mut C,
) {
    let n = series.et0_mm.len();
    let et0_s = &series.et0_mm[..n];
    let rain_s = &series.rain_mm[..n];
    let zr_s = &series.root_depth_m[..n];
    let mut dr = params.initial_depletion_mm;
    let mut next_scheduled = 0usize;
    let supply = params.supply_factor.as_deref();
    for i in 0..n {
        let et0 = et0_s[i];
        let rain = rain_s[i];
        let taw = params.taw_mm_per_m * zr_s[i];
        let p = if params.adjust_p_for_etc {
            depletion_fraction_adjusted(params.p_table, crop.kc_for_p(i) * et0)
        } else {
            params.p_table
        };
        let raw = readily_available_water_mm(p, taw);

        let requested = params
            .strategy
            .net_irrigation_mm(i, dr, taw, raw, &mut next_scheduled)
            .max(0.0);
        let irrigation = match supply {
            Some(f) if requested > 0.0 => requested * f.get(i).copied().unwrap_or(1.0),
            _ => requested,
        };
        if irrigation > 0.0 {
            run.events.push(IrrigationEvent {
                day: i,
                net_mm: irrigation,
            });
        }
        let runoff = if rain > 0.0 {
            params.runoff.runoff_mm(rain)
        } else {
            0.0
        };
        let infiltrated = rain - runoff;
        let after = dr - infiltrated - irrigation;
        let cr = match series.capillary_rise_mm {
            Some(c) => c[i].min(after.max(0.0)),
            None => 0.0,
        };
        let after = after - cr;
        let deep_perc = (-after).max(0.0);
        let dr_start = after.max(0.0);
        let ks = water_stress_coefficient(taw, raw, dr_start);

        let (kc, etc_adj_raw) = crop.coefficients(i, ks, infiltrated, irrigation, et0);
        let etc = kc * et0;
        let etc_adj = etc_adj_raw.min(taw - dr_start).max(0.0);
        dr = dr_start + etc_adj;

        let peff = if infiltrated > 0.0 {
            infiltrated - deep_perc * infiltrated / (infiltrated + irrigation)
        } else {
            0.0
        };
        run.days.push(BalanceDay {
            et0_mm: et0,
            kc,
            etc_mm: etc,
            etc_adj_mm: etc_adj,
            rain_mm: rain,
            runoff_mm: runoff,
            peff_mm: peff,
            irrigation_mm: irrigation,
            capillary_rise_mm: cr,
            deep_perc_mm: deep_perc,
            depletion_mm: dr,
            taw_mm: taw,
            raw_mm: raw,
            p,
            ks,
        });
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    /// FAO-56 Table 22 note: p = 0.55 + 0.04(5 − 8) = 0.43; limits 0.1..0.8.
    #[test]
    fn p_adjustment_table22_note() {
        assert!((depletion_fraction_adjusted(0.55, 8.0) - 0.43).abs() < 1e-12);
        assert!((depletion_fraction_adjusted(0.75, 0.0) - 0.8).abs() < 1e-12);
        assert!((depletion_fraction_adjusted(0.15, 20.0) - 0.1).abs() < 1e-12);
    }

    /// Curve number runoff, computed from the published formula (NEH Part 630
    /// Ch. 10): CN 80 → S = 63.5 mm, Ia = 12.7 mm; P = 50 mm →
    /// Q = 37.3²/100.8 = 13.803 mm.
    #[test]
    fn curve_number_runoff_computed() {
        let q = curve_number_runoff_mm(50.0, 80.0);
        assert!((q - 37.3_f64.powi(2) / 100.8).abs() < 1e-9, "{q}");
        assert!(curve_number_runoff_mm(12.0, 80.0).abs() < 1e-12);
        assert!((curve_number_runoff_mm(30.0, 100.0) - 30.0).abs() < 1e-12);
    }

    #[test]
    fn max_infiltration_adds_runoff() {
        let r = RunoffRule {
            curve_number: None,
            max_infiltration_mm_day: Some(40.0),
        };
        assert!((r.runoff_mm(55.0) - 15.0).abs() < 1e-12);
        assert!(r.runoff_mm(30.0).abs() < 1e-12);
    }

    /// Effective rain as documented: Dr 10 mm, 30 mm rain, no runoff →
    /// DP 20 mm, Peff 10 mm. With 20 mm of scheduled irrigation the same day
    /// DP is 40 mm, shared 30:20 → Peff = 30 − 40·30/50 = 6 mm.
    #[test]
    fn effective_rain_shares_deep_percolation() {
        let s = DailySeries {
            et0_mm: &[0.0],
            rain_mm: &[30.0],
            crop: CropCoefficients::Single { kc: &[1.0] },
            root_depth_m: &[0.5],
            capillary_rise_mm: None,
        };
        let params = BalanceParams {
            initial_depletion_mm: 10.0,
            strategy: Strategy::Rainfed,
            ..BalanceParams::new(0.3, 0.1, 0.5)
        };
        let d = simulate(&s, &params).unwrap().days[0];
        assert!((d.deep_perc_mm - 20.0).abs() < 1e-12);
        assert!((d.peff_mm - 10.0).abs() < 1e-12);
        let params = BalanceParams {
            strategy: Strategy::Scheduled(vec![IrrigationEvent {
                day: 0,
                net_mm: 20.0,
            }]),
            ..params
        };
        let d = simulate(&s, &params).unwrap().days[0];
        assert!((d.deep_perc_mm - 40.0).abs() < 1e-12);
        assert!((d.peff_mm - 6.0).abs() < 1e-12);
    }

    #[test]
    fn decreasing_roots_is_an_error() {
        let s = DailySeries {
            et0_mm: &[5.0, 5.0],
            rain_mm: &[0.0, 0.0],
            crop: CropCoefficients::Single { kc: &[1.0, 1.0] },
            root_depth_m: &[0.5, 0.4],
            capillary_rise_mm: None,
        };
        let e = simulate(&s, &BalanceParams::new(0.3, 0.1, 0.5)).unwrap_err();
        assert!(matches!(
            e,
            BalanceError::RootDepthDecreasing { day: 1, .. }
        ));
    }

    #[test]
    fn nan_input_is_an_error() {
        let s = DailySeries {
            et0_mm: &[5.0, f64::NAN],
            rain_mm: &[0.0, 0.0],
            crop: CropCoefficients::Single { kc: &[1.0, 1.0] },
            root_depth_m: &[0.5, 0.5],
            capillary_rise_mm: None,
        };
        let e = simulate(&s, &BalanceParams::new(0.3, 0.1, 0.5)).unwrap_err();
        assert!(matches!(
            e,
            BalanceError::BadDailyValue {
                series: "et0_mm",
                day: 1,
                ..
            }
        ));
    }
}
