//! One planting over a whole weather record: the crop coefficient curve of
//! every season, each cohort's root-zone water balance, and the daily net
//! irrigation requirement (NIR) per hectare of planting area.
//!
//! This is the step of the computation chain between the crop library and
//! the scheme: `offtake planting` and `offtake run` call [`run_planting`].
//!
//! # How "every year" applies
//!
//! * **Annual crops** (`CycleKind::Annual`): the first planting date
//!   (month/day) is repeated in every year of the record (or only in
//!   [`PlantingSpec::only_year`]). Each year's season is its own balance run,
//!   starting at the set initial depletion, so root depth never decreases
//!   within a run. Seasons may cross 31 December. A season that starts
//!   before the record or ends after it is simulated over the days inside
//!   the record (the state at the record start is the initial depletion —
//!   an assumption), reported with `complete: false` and left out of
//!   statistics ([`PlantingWarning::SeasonCut`]).
//! * **Perennials** (`CycleKind::Repeated`: sugarcane plant crop then
//!   ratoons, alfalfa cutting cycles; `CycleKind::Yearly`: orchards and
//!   vines): one continuous chain of cycles from the first planting date
//!   (the first anniversary of month/day on or after the record start, or
//!   the date in [`PlantingSpec::only_year`]) to the end of the record, or
//!   for `season_length_days` if set. The chain is one balance run (roots
//!   grow in the first cycle and stay at their maximum, so depth never
//!   decreases). For statistics the chain is cut into **irrigation years**
//!   starting on the planting anniversary; a year cut by the record end is
//!   incomplete.
//! * Leap days are ordinary days. A 29 February planting date falls on 28
//!   February in common years ([`PlantingWarning::LeapDayPlantingMoved`]).
//!
//! # Cohorts
//!
//! A window of `spread_days` is split into ⌈spread_days/5⌉ cohorts of equal
//! area share, each planted on the middle day of its part of the window
//! ([`layout::cohort_offsets`]). Each cohort runs its own balance (the
//! balance is not linear in Kc); the planting's daily series are the
//! area-weighted sums.
//!
//! # Effective rain
//!
//! * [`EffectiveRainMethod::WaterBalance`] (default): NIR is the balance's
//!   net irrigation under the strategy; effective rain is the rain stored in
//!   the root zone (see [`crate::balance`]).
//! * USDA-SCS, fixed percentage, dependable rain — simpler alternatives on
//!   period totals: per calendar month (or 10-day period, [`PlantingSpec::
//!   rain_period`]) of each cohort's season, NIR = max(0, ETc − Pe) spread
//!   evenly over the period's days ([`crate::rain::daily_nir_from_periods`]),
//!   ETc = Kc ET₀ unstressed. No soil balance, no irrigation events, no
//!   yield loss.
//!
//! # Dual crop coefficient
//!
//! With [`PlantingSpec::coefficients`] = [`CoefficientMode::Dual`], each
//! cohort's balance uses Kcb + Ke (FAO-56 eq. 80) with its own soil
//! evaporation layer (FAO-56 Chapter 7; inputs chosen as in [`dual`]): TEW
//! and REW of the soil, Kc max from each day's u2 and RHmin and the crop
//! height, few from the canopy cover and the fraction wetted by irrigation
//! ([`Wetting`], FAO-56 Table 20) or rain (1). A crop without Kcb, paddy
//! rice and the period-total effective-rain methods keep the single Kc, with
//! [`PlantingWarning::DualCoefficientNotUsed`].
//!
//! # Paddy rice
//!
//! A crop of group `PaddyRice` uses [`crate::paddy`]: the planting date is
//! the first transplanting; land preparation and the optional nursery take
//! place in the days before it; the window is staggered over the cohorts
//! (the paddy module's groups). NIR includes land preparation, nursery,
//! ponding and seepage/percolation. A paddy season whose calendar is not
//! wholly inside the record is not computed (warning).
//!
//! # Salinity
//!
//! With [`LeachingInput`] the leaching requirement LR (FAO-29, see
//! [`crate::salinity::leaching_requirement`]) is found from the irrigation
//! water ECw and the crop's threshold ECe, and NIR becomes NIR ÷ (1 − LR).
//! Not for paddy rice, whose requirement already contains the seepage and
//! percolation that leach the root zone ([`PlantingWarning::LeachingNotForPaddy`]).
//!
//! # Yield
//!
//! Relative yield loss per season: FAO-56 eq. 90 (FAO-33) with the crop's
//! seasonal Ky (1 when unknown, with a warning) for each cohort, then
//! area-weighted.
//!
//! Results are planning estimates; designs built on them must be checked by a
//! qualified engineer.

pub mod delivery;
pub mod dual;
pub mod layout;
mod run;
pub mod wetting_kc_ini;

use chrono::NaiveDate;
use serde::{Deserialize, Serialize};

use crate::balance::{BalanceDay, BalanceError, EvaporationDay, RunoffRule, Strategy};
use crate::crop::{Crop, CropError};
use crate::paddy::{LandPreparation, Nursery, PaddyError, PaddyField};
use crate::rain::{EffectiveRainMethod, PeriodKind, RainError};
use crate::salinity::SalinityError;
use crate::soil::Soil;
use crate::yield_response::YieldError;

pub use delivery::DeliveryRule;
pub use dual::{CoefficientMode, DualFallback, ParseWettingError, Wetting};
pub use layout::{Cohort, MAX_DAYS_PER_COHORT, cohort_offsets};
pub use run::{
    cohort_details, daily_detail, run_planting, run_planting_with_delivery, season_detail,
};

/// One aligned daily weather record; element 0 of every slice is `start`.
///
/// `et0_mm` and `rain_mm` must be finite and ≥ 0 on every day (fill gaps
/// first). `wind_2m_ms` and `rhmin_pct` feed the climate adjustment of Kc
/// mid/end only: a missing day may be NaN and is left out of the stage mean.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PlantingWeather<'a> {
    /// Date of day 0.
    pub start: NaiveDate,
    /// Reference ET₀ (mm/day).
    pub et0_mm: &'a [f64],
    /// Rain (mm/day).
    pub rain_mm: &'a [f64],
    /// Wind speed at 2 m (m/s), NaN where missing.
    pub wind_2m_ms: &'a [f64],
    /// Minimum relative humidity (%), NaN where missing.
    pub rhmin_pct: &'a [f64],
}

/// Leaching for salinity control (FAO-29).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct LeachingInput {
    /// Salinity of the irrigation water ECw (dS/m).
    pub ecw_ds_m: f64,
    /// Soil salinity ECe to hold (dS/m); `None`: the crop's threshold
    /// (FAO-56 Table 23).
    pub ece_ds_m: Option<f64>,
}

/// Paddy rice settings (defaults from [`crate::paddy`]).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct PaddyOptions {
    /// Main-field ponding.
    pub field: PaddyField,
    /// Land preparation.
    pub land_prep: LandPreparation,
    /// Optional nursery.
    pub nursery: Option<Nursery>,
}

/// Everything that defines one planting apart from its area and the weather.
#[derive(Debug, Clone, PartialEq)]
pub struct PlantingSpec<'a> {
    /// The crop.
    pub crop: &'a Crop,
    /// The soil.
    pub soil: &'a Soil,
    /// Month (1–12) of the first planting date.
    pub first_planting_month: u32,
    /// Day of month of the first planting date.
    pub first_planting_day: u32,
    /// Days over which planting is spread (0 or 1: all on the first day).
    pub spread_days: u32,
    /// Season length (annual crops: Table 11 stages scaled to it;
    /// perennials: the chain length). `None`: the Table 11 total for annual
    /// crops, to the end of the record for perennials.
    pub season_length_days: Option<u32>,
    /// Irrigation scheduling strategy.
    pub strategy: Strategy,
    /// Effective-rain method.
    pub effective_rain: EffectiveRainMethod,
    /// Periods of the period-total effective-rain methods (default months).
    pub rain_period: PeriodKind,
    /// Leaching requirement, when irrigation water salinity is given.
    pub leaching: Option<LeachingInput>,
    /// Paddy settings; `None` uses the paddy defaults for a paddy crop.
    /// Ignored for other crops.
    pub paddy: Option<PaddyOptions>,
    /// Root-zone depletion at the start of each run, % of that day's TAW.
    pub initial_depletion_pct_of_taw: f64,
    /// `None`: every year of the record; `Some(y)`: only the season whose
    /// first planting date is in year `y`.
    pub only_year: Option<i32>,
    /// Runoff of rain; `None`: from the soil (curve number and maximum
    /// infiltration rate of the soil library).
    pub runoff: Option<RunoffRule>,
    /// Single Kc (default) or dual Kcb + Ke with the soil evaporation layer
    /// (see [`dual`]).
    pub coefficients: CoefficientMode,
    /// How the irrigation method wets the surface (fw, FAO-56 Table 20):
    /// used for the single coefficient's Kc ini (eq. 60–61); the dual
    /// coefficient takes its own [`CoefficientMode::Dual`] wetting.
    pub irrigation_wetting: Wetting,
    /// Where the single coefficient's Kc ini comes from.
    pub kc_ini: KcIniRule,
    /// How the block's outlet delivers (see [`delivery`]).
    pub delivery: DeliveryRule,
    /// Share (0..=1) of each day's requests the outlet can deliver, one
    /// value per weather day; `None`: all of it (see [`delivery`]).
    pub supply_factor: Option<&'a [f64]>,
}

/// Where the Kc ini of a single-coefficient planting comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum KcIniRule {
    /// From the wetting interval and depth of each cohort's own initial
    /// stage (FAO-56 eq. 59–61, Figures 29–30; see [`wetting_kc_ini`]).
    /// Annual upland crops with the water-balance effective rain; the others
    /// keep Table 12. Default.
    #[default]
    FromWetting,
    /// The Table 12 value as printed.
    Table12,
}

impl<'a> PlantingSpec<'a> {
    /// A spec with defaults: one planting day, Table 11 season, refill at
    /// 100 % RAW, effective rain from the balance, no leaching, root zone at
    /// field capacity, every year, runoff from the soil.
    pub fn new(crop: &'a Crop, soil: &'a Soil, month: u32, day: u32) -> Self {
        Self {
            crop,
            soil,
            first_planting_month: month,
            first_planting_day: day,
            spread_days: 0,
            season_length_days: None,
            strategy: Strategy::default(),
            effective_rain: EffectiveRainMethod::WaterBalance,
            rain_period: PeriodKind::Month,
            leaching: None,
            paddy: None,
            initial_depletion_pct_of_taw: 0.0,
            only_year: None,
            runoff: None,
            coefficients: CoefficientMode::Single,
            irrigation_wetting: Wetting::Sprinkler,
            kc_ini: KcIniRule::FromWetting,
            delivery: DeliveryRule::OnDemand,
            supply_factor: None,
        }
    }
}

/// One irrigation of one cohort.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PlantingIrrigation {
    /// Date.
    pub date: NaiveDate,
    /// Cohort index.
    pub cohort: usize,
    /// Share of the planting area the cohort covers.
    pub area_share: f64,
    /// Net depth on the cohort (mm, root zone, before leaching).
    pub net_mm: f64,
}

/// Totals of one season (annual crop) or irrigation year (perennial), per
/// hectare of planting area, area-weighted over cohorts (mm unless named).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SeasonSummary {
    /// Year of the first planting date (annual) or of the irrigation year's start.
    pub year: i32,
    /// First day (first cohort's planting, or the irrigation year's start).
    pub start: NaiveDate,
    /// Last day, inclusive (last cohort's harvest, or the day before the next anniversary).
    pub end: NaiveDate,
    /// False when cut by the start or end of the record (or not computed):
    /// leave it out of statistics.
    pub complete: bool,
    /// Σ ET₀ (area-weighted over the cohorts' days).
    pub et0_mm: f64,
    /// Σ ETc.
    pub etc_mm: f64,
    /// Σ ETc adj.
    pub etc_adj_mm: f64,
    /// Σ rain.
    pub rain_mm: f64,
    /// Σ effective rain.
    pub peff_mm: f64,
    /// Σ NIR including the leaching requirement.
    pub nir_mm: f64,
    /// Σ net irrigation at the root zone (before leaching).
    pub net_irrigation_mm: f64,
    /// Mean number of irrigations per cohort (area-weighted); paddy: days
    /// with a requirement.
    pub irrigation_count: f64,
    /// Σ deep percolation (paddy: seepage and percolation).
    pub deep_perc_mm: f64,
    /// Σ runoff (paddy: spill over the bunds).
    pub runoff_mm: f64,
    /// Σ soil evaporation E = Ke ET₀ (dual coefficient; 0 with the single Kc).
    #[serde(default)]
    pub evaporation_mm: f64,
    /// Relative yield loss 1 − Ya/Ym (FAO-33 Ky), fraction 0..1.
    pub relative_yield_loss: f64,
    /// Leaching requirement LR applied (0 when none).
    pub leaching_requirement: f64,
    /// Kc ini, area-weighted over the cohorts (single coefficient: Table 12,
    /// or from the wetting events of each cohort's initial stage).
    #[serde(default)]
    pub kc_ini: f64,
    /// Every irrigation of every cohort in the season.
    pub irrigations: Vec<PlantingIrrigation>,
}

/// Something the user should know about a result.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum PlantingWarning {
    /// A season runs past the start or end of the record; it was simulated
    /// over the days inside and left out of statistics.
    SeasonCut {
        /// Year of its first planting date.
        year: i32,
        /// Its first day.
        start: NaiveDate,
        /// Its last day.
        end: NaiveDate,
    },
    /// A paddy season whose calendar (land preparation to harvest) is not
    /// wholly in the record was not computed.
    PaddySeasonNotComputed {
        /// Year of its first transplanting date.
        year: i32,
    },
    /// 29 February planting moved to 28 February in a common year.
    LeapDayPlantingMoved {
        /// The year.
        year: i32,
    },
    /// Seasons of successive years overlap (season plus window longer than
    /// a year): their NIR adds up on the overlapping days.
    SeasonsOverlap {
        /// Days from first planting to last harvest.
        season_days: u32,
    },
    /// The crop has no seasonal Ky; FAO-56 p. 176's Ky = 1 was used.
    KyUnknown {
        /// Crop id.
        crop: String,
    },
    /// Leaching was asked for a paddy crop and not applied: the seepage and
    /// percolation in the paddy requirement already pass water through the
    /// root zone, so adding LR would count that water twice.
    LeachingNotForPaddy,
    /// The dual coefficient was asked for but the single Kc was used.
    DualCoefficientNotUsed {
        /// Crop id.
        crop: String,
        /// Why.
        reason: DualFallback,
    },
    /// The block's delivery rule does not apply to this planting; another
    /// was used.
    DeliveryRuleNotUsed {
        /// Crop id.
        crop: String,
        /// What was used instead, and why.
        reason: String,
    },
    /// The delivered depth was less than the requirement of a paddy or
    /// period-method planting on some days; the shortfall is not carried.
    DeliveryShortfall {
        /// Days short.
        days: usize,
        /// Total shortfall (mm).
        shortfall_mm: f64,
    },
}

impl std::fmt::Display for PlantingWarning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Self::DeliveryRuleNotUsed { crop, reason } => {
                write!(f, "{crop} on blocks served by rotation within the block: {reason}")
            }
            Self::SeasonCut { year, start, end } => write!(
                f,
                "the {year} season ({start} to {end}) runs past the ends of the weather record; it was simulated over the days inside and left out of statistics"
            ),
            Self::PaddySeasonNotComputed { year } => write!(
                f,
                "the {year} paddy season (land preparation to harvest) is not wholly inside the weather record and was not computed"
            ),
            Self::LeapDayPlantingMoved { year } => write!(
                f,
                "planting day 29 February moved to 28 February in {year} (not a leap year)"
            ),
            Self::SeasonsOverlap { season_days } => write!(
                f,
                "the season and planting window last {season_days} days, longer than a year: seasons of successive years overlap and their requirements add up"
            ),
            Self::KyUnknown { crop } => write!(
                f,
                "crop {crop} has no seasonal yield response factor Ky; Ky = 1 was used, as FAO-56 (p. 176) suggests where Ky is unknown"
            ),
            Self::LeachingNotForPaddy => f.write_str(
                "leaching was not applied to paddy rice: its seepage and percolation already leach the root zone"
            ),
            Self::DualCoefficientNotUsed { crop, reason } => write!(
                f,
                "crop {crop}: the dual crop coefficient was not used ({reason}); single Kc was used"
            ),
            Self::DeliveryShortfall { days, shortfall_mm } => write!(
                f,
                "the water delivered was less than the requirement on {days} days ({shortfall_mm:.1} mm short in all; the shortfall is not carried over)"
            ),
        }
    }
}

/// The result of one planting over the record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PlantingResult {
    /// NIR per weather day (mm per ha of planting area), leaching included,
    /// area-weighted over cohorts, 0 outside seasons.
    pub nir_mm: Vec<f64>,
    /// ETc per weather day (area-weighted; 0 outside seasons).
    pub etc_mm: Vec<f64>,
    /// ETc adj per weather day.
    pub etc_adj_mm: Vec<f64>,
    /// Effective rain per weather day.
    pub peff_mm: Vec<f64>,
    /// Soil evaporation E = Ke ET₀ per weather day (dual coefficient; 0 with
    /// the single Kc).
    #[serde(default)]
    pub evaporation_mm: Vec<f64>,
    /// One summary per season (annual) or irrigation year (perennial).
    pub seasons: Vec<SeasonSummary>,
    /// Warnings.
    pub warnings: Vec<PlantingWarning>,
}

/// One season's daily table.
#[derive(Debug, Clone, PartialEq)]
pub struct SeasonDetail {
    /// Date of `days[0]`.
    pub first_date: NaiveDate,
    /// Whether the season is complete.
    pub complete: bool,
    /// Area-weighted daily balance over the season's days inside the record.
    /// With one cohort it is exactly that cohort's balance (eq. 85 closes);
    /// with several, the weighted sum closes eq. 85 only while the same
    /// cohorts are in the field (a cohort entering or leaving adds or drops
    /// its depletion). Paddy and period methods: `irrigation_mm` is the NIR
    /// before leaching and the soil columns are not a balance.
    pub days: Vec<BalanceDay>,
    /// Dual coefficient: the evaporation layer per day, area-weighted like
    /// `days` (`kcb`, `ke`, `evaporation_mm` are the planting's; `kr`, `few`,
    /// `depletion_mm` are area-weighted means with cohorts out of the field
    /// counted as 0). Empty with the single Kc.
    pub evaporation: Vec<EvaporationDay>,
}

/// One cohort's daily balance over its days inside the record (see
/// [`cohort_details`]); unlike the area-weighted [`SeasonDetail`], eq. 85
/// closes every day from `initial_depletion_mm`.
#[derive(Debug, Clone, PartialEq)]
pub struct CohortDetail {
    /// Cohort index (planting order).
    pub index: usize,
    /// Share of the planting area.
    pub area_share: f64,
    /// Date of `days[0]`.
    pub first_date: NaiveDate,
    /// Whether all of the cohort's season is inside the record.
    pub complete: bool,
    /// Root-zone depletion before `days[0]` (mm).
    pub initial_depletion_mm: f64,
    /// Evaporation-layer depletion De before `days[0]` (mm; dual only).
    pub initial_evaporation_depletion_mm: f64,
    /// The fraction fw wetted by irrigation (dual only; 1 otherwise).
    pub fw_irrigation: f64,
    /// Kc ini used (single coefficient: Table 12, or from the wetting
    /// events of the initial stage).
    pub kc_ini: f64,
    /// Under a rotation within the block, each share's own daily balance
    /// (share k served on the weather days g with g mod N = k); `days` is
    /// their mean. Empty otherwise.
    pub shares: Vec<Vec<BalanceDay>>,
    /// The daily balance.
    pub days: Vec<BalanceDay>,
    /// The evaporation layer per day (dual coefficient only, else empty).
    pub evaporation: Vec<EvaporationDay>,
}

/// Errors of a planting computation.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PlantingError {
    /// A weather series differs in length from `et0_mm`.
    #[error("weather series `{series}` has {found} days, expected {expected}")]
    WeatherLength {
        /// Series name.
        series: &'static str,
        /// Length of et0_mm.
        expected: usize,
        /// Found.
        found: usize,
    },
    /// A weather value that must be present is missing or negative.
    #[error("weather `{series}` on {date}: found {value}, expected a finite value ≥ 0")]
    BadWeather {
        /// Series name.
        series: &'static str,
        /// Date.
        date: NaiveDate,
        /// Value found.
        value: f64,
    },
    /// No such calendar date.
    #[error("planting date month {month} day {day} is not a calendar date")]
    BadPlantingDate {
        /// Month.
        month: u32,
        /// Day.
        day: u32,
    },
    /// A setting out of range.
    #[error("`{name}`: found {value}, expected {expected}")]
    BadSetting {
        /// Name.
        name: &'static str,
        /// Value.
        value: f64,
        /// Expected.
        expected: &'static str,
    },
    /// Leaching asked for but neither the ECe nor the crop's threshold is known.
    #[error("crop `{crop}` has no salinity threshold; give the soil ECe to hold")]
    NoSalinityThreshold {
        /// Crop id.
        crop: String,
    },
    /// No season of the planting starts in the asked year.
    #[error("no season of the planting starts in {year} within the record")]
    NoSuchSeason {
        /// Year asked.
        year: i32,
    },
    /// Crop curve error.
    #[error("crop curve: {0}")]
    Crop(#[from] CropError),
    /// Water balance error.
    #[error("water balance: {0}")]
    Balance(#[from] BalanceError),
    /// Paddy error.
    #[error("paddy: {0}")]
    Paddy(#[from] PaddyError),
    /// Effective-rain error.
    #[error("effective rain: {0}")]
    Rain(#[from] RainError),
    /// Salinity error.
    #[error("salinity: {0}")]
    Salinity(#[from] SalinityError),
    /// Yield-response error.
    #[error("yield response: {0}")]
    Yield(#[from] YieldError),
    /// Soil entry error.
    #[error("soil: {0}")]
    Soil(#[from] crate::soil::SoilError),
}
