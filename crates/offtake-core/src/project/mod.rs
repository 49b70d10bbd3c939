//! The project document: one irrigation scheme, its canal tree, blocks,
//! cropping plan, weather source, options and scenarios.
//!
//! This is the saved state of the desktop app and the input of `offtake run`.
//! It is plain serde data (no runtime handles), cheap enough to clone for an
//! undo stack (a scheme of a few hundred blocks is a few tens of kilobytes),
//! and compared with `PartialEq` to know whether there are unsaved changes.
//!
//! Cross references use stable string ids (`Canal::id`, `Block::id`,
//! `Planting::id`), never indices, so that editing one list never silently
//! re-points another.
//!
//! A cropping plan applies to **every year** of the weather record: a
//! planting's first planting date is a month and a day ([`MonthDay`]), and the
//! same planting is simulated in each irrigation year of the series.
//!
//! Reading and writing files (RON, schema migration, atomic save) lives in
//! `offtake-io`; this module only holds the types, the tree helpers
//! ([`tree`]), whole-project validation ([`validate`]) and scenario
//! application ([`scenario`]).

pub mod canal_section;
pub mod plausibility;
pub mod scenario;
pub mod tree;
pub mod validate;

use chrono::{Datelike, NaiveDate};
use serde::{Deserialize, Serialize};

use crate::weather_import::ImportSettings;

pub use canal_section::{CanalSectionSpec, ExistingSectionSpec};
pub use scenario::{Override, Scenario, ScenarioError, WeatherPerturbation};
pub use validate::{CropSeasonLengths, ItemKind, ValidationContext, ValidationProblem};

/// The schema version this build writes. Files with a lower version are
/// migrated on load; files with a higher version are refused.
///
/// * 3 — a block's delivery mode and outlet stream size
///   ([`Block::delivery`], [`Block::outlet_stream_size_ls`]); schema-2 blocks
///   are delivered on demand, as they were computed.
/// * 2 — `weather.import` ([`ImportSettings`]: full column mapping with
///   units, date format, delimiter, decimal separator, missing markers)
///   replaces schema 1's minimal `weather.mapping`.
/// * 1 — efficiencies as fractions, planting areas and month-day windows,
///   reservoir, scenarios.
/// * 0 — the first layout.
pub const CURRENT_SCHEMA: u32 = 3;

/// A whole project: what `offtake run` computes and what the app saves.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Project {
    /// File schema version ([`CURRENT_SCHEMA`] for documents built in memory).
    pub schema: u32,
    /// Name and notes of the scheme.
    pub scheme: SchemeInfo,
    /// The canal tree, as a flat list with parent links (roots take water
    /// directly from the headworks).
    pub canals: Vec<Canal>,
    /// Blocks: the area served by one outlet on a canal.
    pub blocks: Vec<Block>,
    /// The cropping plan of the base case.
    pub plantings: Vec<Planting>,
    /// Where the daily weather comes from and where it was measured.
    pub weather: WeatherSource,
    /// Storage reservoir feeding the scheme, if any (its open-water
    /// evaporation is reported beside the headworks demand).
    #[serde(default)]
    pub reservoir: Option<Reservoir>,
    /// Computation and reporting options.
    pub options: Options,
    /// Named alternatives to the base case.
    #[serde(default)]
    pub scenarios: Vec<Scenario>,
    /// The project's own crops (copied from the library and edited). An
    /// entry replaces the library crop with the same id, so the project
    /// stays self-contained. Omitted from the file when empty, so files
    /// without it load unchanged.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub user_crops: Vec<crate::crop::Crop>,
    /// The project's own soils; as `user_crops`.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub user_soils: Vec<crate::soil::Soil>,
}

impl Default for Project {
    /// An empty project of the current schema, for "File → New".
    fn default() -> Self {
        Self {
            schema: CURRENT_SCHEMA,
            scheme: SchemeInfo::default(),
            canals: Vec::new(),
            blocks: Vec::new(),
            plantings: Vec::new(),
            weather: WeatherSource::default(),
            reservoir: None,
            options: Options::default(),
            scenarios: Vec::new(),
            user_crops: Vec::new(),
            user_soils: Vec::new(),
        }
    }
}

/// Name and free notes of a scheme.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SchemeInfo {
    /// Scheme name shown in titles and reports.
    pub name: String,
    /// Free text (source of data, assumptions, caveats).
    #[serde(default)]
    pub notes: String,
}

/// The role of a canal in the tree (for display and defaults; the
/// computation treats every canal the same way).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum CanalKind {
    /// Main canal, taking water at the headworks.
    Main,
    /// Branch canal off a main canal.
    Branch,
    /// Distributary feeding minors or block outlets.
    Distributary,
    /// Minor (tertiary) canal feeding block outlets.
    Minor,
}

impl CanalKind {
    /// Lower-case label used in reports.
    pub fn label(self) -> &'static str {
        match self {
            Self::Main => "main",
            Self::Branch => "branch",
            Self::Distributary => "distributary",
            Self::Minor => "minor",
        }
    }
}

/// One canal reach: a node of the canal tree.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Canal {
    /// Stable id used by blocks, children and scenarios.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Id of the canal this one takes water from; `None` for a canal taking
    /// water at the headworks.
    #[serde(default)]
    pub parent: Option<String>,
    /// Role in the tree.
    pub kind: CanalKind,
    /// Conveyance efficiency Ec of this reach (fraction, in (0, 1]): water
    /// delivered to the children ÷ water entering the reach.
    pub conveyance_efficiency: f64,
    /// Existing capacity of the reach in m³/s, if known.
    #[serde(default)]
    pub existing_capacity_m3s: Option<f64>,
    /// Hours per day the canal runs, in (0, 24]. Required capacity =
    /// design flow × 24 ÷ hours.
    pub operating_hours_per_day: f64,
    /// Section data (slope, lining, shape, length, seepage, existing
    /// section); left out of the file when empty.
    #[serde(default, skip_serializing_if = "CanalSectionSpec::is_empty")]
    pub section: CanalSectionSpec,
}

impl Canal {
    /// The existing capacity the scheme uses (m³/s): an existing section's
    /// Manning capacity wins over an entered capacity.
    #[must_use]
    pub fn effective_existing_capacity_m3s(&self) -> Option<f64> {
        self.section
            .existing_section()
            .and_then(|e| e.capacity_m3s().ok())
            .or(self.existing_capacity_m3s)
    }
}

/// The irrigation method of a block and its field application efficiency.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct IrrigationMethod {
    /// Method name (free text, e.g. "furrow", "basin", "sprinkler").
    pub name: String,
    /// Field application efficiency Ea (fraction, in (0, 1]): water stored
    /// in the root zone ÷ water delivered to the field.
    pub application_efficiency: f64,
}

/// The area served by one outlet.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Block {
    /// Stable id used by plantings and scenarios.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Id of the canal the block's outlet takes from.
    pub canal: String,
    /// Irrigable area of the block in hectares.
    pub area_ha: f64,
    /// Soil id in the soil library (e.g. "loam").
    pub soil: String,
    /// Irrigation method and its application efficiency Ea.
    pub method: IrrigationMethod,
    /// Field-canal efficiency Eb (fraction, in (0, 1]): water at the field
    /// inlets ÷ water at the block outlet.
    pub field_canal_efficiency: f64,
    /// How the block's outlet delivers (schema 3; older files: on demand).
    #[serde(default)]
    pub delivery: DeliveryMode,
    /// Stream size of the block's outlet (l/s), the most it can take; `None`:
    /// assumed large enough (the block's largest daily delivery), marked as
    /// assumed until the user enters one.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub outlet_stream_size_ls: Option<f64>,
}

/// Smallest depletion worth a turn of a rotation within the block (mm): a
/// share less depleted waits for its next turn. Our planning default
/// (common practice: a surface turn applies at least a few centimetres).
pub const DEFAULT_MIN_TURN_DEPTH_MM: f64 = 10.0;
/// Rotation cycle of a new surface-irrigated block (days); common practice
/// for upland crops under surface irrigation is a turn every 7 to 10 days.
pub const DEFAULT_ROTATION_CYCLE_DAYS: u32 = 7;

fn default_min_turn_depth_mm() -> f64 {
    DEFAULT_MIN_TURN_DEPTH_MM
}

/// How a block's outlet delivers water (see [`crate::planting::delivery`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
pub enum DeliveryMode {
    /// Each planting takes its water on the day its strategy asks, over its
    /// whole area (how projects before schema 3 were computed).
    #[default]
    OnDemand,
    /// The block's area served in a cycle of `cycle_days` days (1–30), each
    /// day its own share, each share brought to the strategy's target on its
    /// turn (skipped when less depleted than `min_depth_mm`).
    RotationWithinBlock {
        /// Days of the cycle (1–30).
        cycle_days: u32,
        /// Smallest depletion worth a turn (mm).
        #[serde(default = "default_min_turn_depth_mm")]
        min_depth_mm: f64,
    },
    /// The requirement of each cycle of `cycle_days` days (1–30) delivered
    /// at a steady rate (paddy, lined schemes with continuous supply).
    ContinuousFlow {
        /// Days of the cycle (1–30).
        cycle_days: u32,
    },
}

impl Block {
    /// The block's delivery cycle (days; 1 on demand).
    pub fn delivery_cycle_days(&self) -> u32 {
        self.delivery.rule().cycle_days()
    }
}

impl DeliveryMode {
    /// The planting module's rule.
    pub fn rule(self) -> crate::planting::DeliveryRule {
        use crate::planting::DeliveryRule;
        match self {
            Self::OnDemand => DeliveryRule::OnDemand,
            Self::RotationWithinBlock {
                cycle_days,
                min_depth_mm,
            } => DeliveryRule::RotationWithinBlock {
                cycle_days,
                min_depth_mm,
            },
            Self::ContinuousFlow { cycle_days } => DeliveryRule::ContinuousFlow { cycle_days },
        }
    }

    /// A short description for tables and the inspector.
    pub fn describe(self) -> String {
        match self {
            Self::OnDemand => "on demand".to_owned(),
            Self::RotationWithinBlock { cycle_days, .. } => {
                format!("rotation within the block, {cycle_days}-day cycle")
            }
            Self::ContinuousFlow { cycle_days } => {
                format!("continuous flow, {cycle_days}-day cycle")
            }
        }
    }
}

/// How much of a block a planting covers.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum PlantingArea {
    /// An absolute area in hectares.
    Hectares(f64),
    /// A share of the block's area, in percent (0–100).
    PercentOfBlock(f64),
}

impl PlantingArea {
    /// The area in hectares on a block of `block_area_ha`.
    pub fn hectares(self, block_area_ha: f64) -> f64 {
        match self {
            Self::Hectares(ha) => ha,
            Self::PercentOfBlock(pct) => block_area_ha * pct / 100.0,
        }
    }
}

/// A day of the year without a year: the cropping plan repeats every year of
/// the weather record.
///
/// 29 February is not allowed (the plan must exist in every year).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MonthDay {
    /// Month, 1–12.
    pub month: u32,
    /// Day of the month, 1–31 (28 for February).
    pub day: u32,
}

impl MonthDay {
    /// A month-day, or `None` if it does not exist in every year
    /// (e.g. 31 April or 29 February).
    pub fn new(month: u32, day: u32) -> Option<Self> {
        let md = Self { month, day };
        md.is_valid().then_some(md)
    }

    /// Whether this month-day exists in every year.
    pub fn is_valid(self) -> bool {
        // 2001 is not a leap year, so 29 February is rejected.
        NaiveDate::from_ymd_opt(2001, self.month, self.day).is_some()
    }

    /// The date of this month-day in `year`, if valid.
    pub fn in_year(self, year: i32) -> Option<NaiveDate> {
        NaiveDate::from_ymd_opt(year, self.month, self.day)
    }

    /// Zero-based day of a 365-day (non-leap) year, if valid.
    pub fn day_of_year0(self) -> Option<u32> {
        NaiveDate::from_ymd_opt(2001, self.month, self.day).map(|d| d.ordinal0())
    }
}

/// How irrigation is scheduled for a planting.
///
/// The balance module turns these into irrigation events; the document only
/// stores the user's choice and its parameters.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum Strategy {
    /// Irrigate back to field capacity when root-zone depletion reaches the
    /// given share of readily available water (100 % = at RAW, no stress).
    Refill {
        /// Trigger as percent of RAW (0 < x ≤ 100 for no stress).
        trigger_pct_of_raw: f64,
    },
    /// Refill to field capacity every `days` days.
    Interval {
        /// Days between irrigations (≥ 1).
        days: u32,
    },
    /// Apply a fixed net depth whenever depletion reaches RAW.
    Depth {
        /// Net depth applied per irrigation in mm (> 0).
        net_mm: f64,
    },
    /// Deficit irrigation: let depletion reach a share of TAW beyond RAW,
    /// then refill part of the depletion.
    Deficit {
        /// Depletion that triggers irrigation, as percent of TAW (0–100).
        trigger_pct_of_taw: f64,
        /// Share of the depletion replaced at each irrigation, percent (0–100].
        refill_pct_of_depletion: f64,
    },
    /// No irrigation: the requirement is reported as zero and the balance
    /// shows the stress.
    Rainfed,
}

/// One crop on part of a block, planted every year over a window.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Planting {
    /// Stable id used by scenarios.
    pub id: String,
    /// Id of the block the planting is on.
    pub block: String,
    /// Crop id in the crop library (e.g. "maize-grain").
    pub crop: String,
    /// Area planted.
    pub area: PlantingArea,
    /// First planting day of each year (the window opens here).
    pub first_planting: MonthDay,
    /// Days over which planting is spread uniformly (0 = all on the first
    /// day). The last part is planted `spread_days − 1` days after the first.
    pub spread_days: u32,
    /// Season label (free text, e.g. "wet", "dry"); used to group results.
    pub season: String,
    /// Irrigation scheduling.
    pub strategy: Strategy,
    /// Override of the crop library's season length in days, if any.
    #[serde(default)]
    pub season_length_days: Option<u32>,
    /// Paddy rice inputs (ponding, seepage and percolation, land
    /// preparation, nursery, drainage) and the paddy field efficiency.
    /// Used only when the crop is paddy rice; `None` there means
    /// [`PaddyInputs::default`]. Older files without the field load as
    /// `None`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub paddy: Option<PaddyInputs>,
    /// Crop coefficient approach: single Kc (default) or dual Kcb + Ke.
    /// Older files without the field load as single Kc.
    #[serde(default, skip_serializing_if = "CoefficientChoice::is_single")]
    pub coefficients: CoefficientChoice,
}

/// The crop coefficient approach of a planting.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub enum CoefficientChoice {
    /// Single time-averaged Kc (FAO-56 Chapter 6), the default.
    #[default]
    Single,
    /// Dual coefficient Kcb + Ke with the soil evaporation layer (FAO-56
    /// Chapter 7), for row crops, drip and frequent wetting.
    Dual {
        /// Fraction of the surface wetted by irrigation, fw (FAO-56
        /// Table 20), in (0, 1]; `None` takes it from the block's
        /// irrigation method name (basin, furrow, sprinkler, drip…).
        #[serde(default)]
        wetted_fraction: Option<f64>,
    },
}

impl CoefficientChoice {
    /// True for the default single-Kc approach.
    pub fn is_single(&self) -> bool {
        matches!(self, Self::Single)
    }
}

/// Inputs of a paddy rice planting (see [`crate::paddy`] for the balance).
///
/// Every field has a default, so a file may give only those it changes,
/// e.g. `paddy: (percolation_seepage_mm_day: 2.0)`.
///
/// # Typical ranges (published-check-values §10.2; inputs, not constants)
///
/// * Seepage and percolation: about 3 mm/day in poorly drained and 6 mm/day
///   in well drained soils (Sri Lanka Department of Agriculture, rice water
///   management); about 1–2 mm/day on heavy clay up to 6–10 mm/day on sandy
///   soils (FAO Training Manuals 3 and 4, from memory: verify).
/// * Pond depth: 0.10–0.20 m in the initial stage (FAO-56, Table 14 note);
///   a standing layer of 50–100 mm through the season (FAO TM3/TM4, from
///   memory: verify).
/// * Land preparation: starts about one, sometimes two, months before
///   transplanting (FAO Training Manual No. 4, Ch. 4); about 200 mm to
///   saturate the puddled layer (150–250 mm commonly quoted for
///   presaturation) plus the water layer (FAO TM3/TM4, from memory: verify).
/// * Nursery: usually 5–10 % of the area to be planted (FAO Training Manual
///   No. 4, Ch. 4).
///
/// # Field efficiency
///
/// The paddy NIR already contains seepage and percolation, land
/// preparation and the pond. The paddy field efficiency must therefore cover
/// operational losses only (spills from management, uneven levelling,
/// overflow when the pond is topped up), not percolation again: it is used
/// **instead of** the block's method efficiency Ea, so GIR = NIR ÷
/// (field efficiency × Eb). The default 0.9 is common practice for this
/// operational-only efficiency (not a published value); 0.8–0.95 is the
/// range we document for it. An overall rice field efficiency such as
/// FAO-24's 0.32 (Doorenbos & Pruitt 1977, after Bos & Nugteren 1974; from
/// memory, reference §10.1) includes the percolation losses and must not be
/// used with this NIR.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct PaddyInputs {
    /// Bund height (mm): the most water the field holds; rain above spills.
    pub bund_height_mm: f64,
    /// Pond depth irrigation keeps (mm), ≤ bund height; also the pond set up
    /// by land preparation.
    pub target_ponding_mm: f64,
    /// Seepage and percolation while water stands (mm/day).
    pub percolation_seepage_mm_day: f64,
    /// Water to saturate the puddled layer during land preparation (mm).
    pub land_preparation_mm: f64,
    /// Days of land preparation before each part of the area is
    /// transplanted (≥ 1).
    pub land_preparation_days: u32,
    /// Nursery area as a share of the planted area (0 = no nursery;
    /// FAO TM4: 0.05–0.10).
    pub nursery_share: f64,
    /// Days the nursery is kept before transplanting (≥ 1 when a nursery is
    /// given).
    pub nursery_days: u32,
    /// Days before harvest when irrigation stops and the field is drained.
    pub drain_days_before_harvest: u32,
    /// Paddy field efficiency (fraction in (0, 1]): operational losses only,
    /// used instead of the block's Ea (see the type's docs).
    pub field_efficiency: f64,
}

/// Default paddy field efficiency: operational losses only (common
/// practice, not a published value; see [`PaddyInputs`]).
pub const DEFAULT_PADDY_FIELD_EFFICIENCY: f64 = 0.9;

impl Default for PaddyInputs {
    /// The paddy module's planting defaults ([`crate::paddy::PaddyField`],
    /// [`crate::paddy::LandPreparation`]): bund 200 mm, pond 100 mm, S&P
    /// 4 mm/day, 200 mm saturation over 30 days, drained 10 days before
    /// harvest; no nursery (25 days when a share is given, from memory of
    /// common practice); field efficiency 0.9 (common practice).
    fn default() -> Self {
        let field = crate::paddy::PaddyField::default();
        let prep = crate::paddy::LandPreparation::default();
        Self {
            bund_height_mm: field.bund_height_mm,
            target_ponding_mm: field.target_ponding_mm,
            percolation_seepage_mm_day: field.percolation_seepage_mm_day,
            land_preparation_mm: prep.saturation_mm,
            land_preparation_days: u32::try_from(prep.duration_days).unwrap_or(30),
            nursery_share: 0.0,
            nursery_days: 25,
            drain_days_before_harvest: u32::try_from(field.drain_days_before_harvest).unwrap_or(10),
            field_efficiency: DEFAULT_PADDY_FIELD_EFFICIENCY,
        }
    }
}

impl PaddyInputs {
    /// The paddy module's settings for these inputs. Land preparation sets
    /// up the target pond and evaporates at Kc 1.05 (FAO-56 Table 12, rice
    /// Kc ini); the nursery, when given, uses the same Kc and needs the same
    /// saturation and pond depth as the main field.
    pub fn paddy_options(&self) -> crate::planting::PaddyOptions {
        let prep_kc = crate::paddy::LandPreparation::default().prep_kc;
        crate::planting::PaddyOptions {
            field: crate::paddy::PaddyField {
                bund_height_mm: self.bund_height_mm,
                target_ponding_mm: self.target_ponding_mm,
                percolation_seepage_mm_day: self.percolation_seepage_mm_day,
                drain_days_before_harvest: self.drain_days_before_harvest as usize,
            },
            land_prep: crate::paddy::LandPreparation {
                duration_days: self.land_preparation_days as usize,
                saturation_mm: self.land_preparation_mm,
                ponding_mm: self.target_ponding_mm,
                prep_kc,
            },
            nursery: (self.nursery_share > 0.0).then_some(crate::paddy::Nursery {
                area_share: self.nursery_share,
                duration_days: self.nursery_days as usize,
                kc: prep_kc,
                establishment_mm: self.land_preparation_mm + self.target_ponding_mm,
            }),
        }
    }
}

impl Planting {
    /// Number of equal cohorts the spread divides the planting into
    /// (one cohort per planting day; at least one).
    pub fn cohort_count(&self) -> u32 {
        self.spread_days.max(1)
    }
}

/// Largest difference (m) between the project's wind height and the import
/// mapping's stated wind height that still counts as the same height.
pub const WIND_HEIGHT_TOLERANCE_M: f64 = 1e-6;

/// Where the weather series comes from and where it was measured.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WeatherSource {
    /// Path to the weather CSV, relative to the project file's folder
    /// (absolute paths are kept as they are).
    pub path: String,
    /// Station latitude, decimal degrees, north positive.
    pub latitude_deg: f64,
    /// Station elevation above sea level in metres.
    pub elevation_m: f64,
    /// Height of the wind measurement above ground in metres. This is the
    /// height the computation uses; a height stated by the import mapping's
    /// wind column must equal it (see [`WeatherSource::set_import`]).
    pub wind_height_m: f64,
    /// How to read the file (column mapping, units, date format, delimiter,
    /// decimal separator, missing markers). `None`: the file uses Offtake's
    /// own column names and everything else is detected.
    #[serde(default)]
    pub import: Option<ImportSettings>,
}

impl Default for WeatherSource {
    fn default() -> Self {
        Self {
            path: String::new(),
            latitude_deg: 0.0,
            elevation_m: 0.0,
            wind_height_m: 2.0,
            import: None,
        }
    }
}

impl WeatherSource {
    /// Attaches import settings (or clears them with `None`). When the
    /// settings' wind column states a measurement height, that height wins:
    /// it becomes [`WeatherSource::wind_height_m`], so the two never
    /// contradict after this call.
    pub fn set_import(&mut self, import: Option<ImportSettings>) {
        if let Some(h) = import
            .as_ref()
            .and_then(ImportSettings::stated_wind_height_m)
        {
            self.wind_height_m = h;
        }
        self.import = import;
    }

    /// Sets the wind measurement height (m), also in the import mapping's
    /// wind column if it states one, so the two stay equal.
    pub fn set_wind_height_m(&mut self, height_m: f64) {
        self.wind_height_m = height_m;
        if let Some(m) = self.import.as_mut().and_then(|i| i.mapping.as_mut())
            && m.wind_column().is_some_and(|(_, h)| h.is_some())
        {
            m.set_wind_height_m(Some(height_m));
        }
    }

    /// The wind height stated by the import mapping when it differs from
    /// [`WeatherSource::wind_height_m`]: `(wind column header, stated height)`.
    pub fn wind_height_mismatch(&self) -> Option<(&str, f64)> {
        let (header, stated) = self.import.as_ref()?.mapping.as_ref()?.wind_column()?;
        let stated = stated?;
        // `set_import` / `set_wind_height_m` copy one into the other, so
        // equal heights are equal to the last bit; the tolerance (1 µm) only
        // forgives a decimal written out and read back.
        // A NaN on either side counts as a mismatch.
        let same = (stated - self.wind_height_m)
            .abs()
            .partial_cmp(&WIND_HEIGHT_TOLERANCE_M)
            .is_some_and(std::cmp::Ordering::is_le);
        (!same).then_some((header, stated))
    }
}

/// Open-water evaporation method for a storage reservoir.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum OpenWaterMethod {
    /// Meyer (1915) mass-transfer formula.
    Meyer,
    /// Rohwer (1931) mass-transfer formula.
    Rohwer,
    /// Penman (1948) open-water combination equation.
    Penman,
}

/// A storage reservoir feeding the scheme.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Reservoir {
    /// Display name.
    pub name: String,
    /// Mean water surface area per month (January first), hectares.
    pub surface_area_ha: [f64; 12],
    /// Mean water surface temperature per month (°C); when absent the
    /// air temperature stands in.
    #[serde(default)]
    pub water_temperature_c: Option<[f64; 12]>,
    /// Evaporation method.
    pub method: OpenWaterMethod,
}

/// How effective rainfall is obtained.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum EffectiveRain {
    /// From the root-zone water balance (runoff and deep percolation).
    WaterBalance,
    /// USDA-SCS monthly method.
    UsdaScs,
    /// A fixed percentage of rainfall (0–100).
    FixedPercent(f64),
    /// Dependable rain at the design probability.
    Dependable,
}

/// Time step of reported tables.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum ReportingStep {
    /// Daily.
    Daily,
    /// 10-day periods (1–10, 11–20, 21–end).
    TenDay,
    /// Calendar months.
    Monthly,
}

/// Period over which the yearly peak flow used for design is averaged.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum DesignBasis {
    /// Peak 10-day mean flow (default).
    TenDay,
    /// Peak monthly mean flow (large schemes).
    Monthly,
    /// Peak daily flow (small continuous-flow schemes).
    Daily,
}

/// Reference evapotranspiration method.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum Et0Method {
    /// FAO-56 Penman–Monteith (default).
    PenmanMonteith,
    /// Hargreaves–Samani (1985).
    Hargreaves,
    /// ASCE-EWRI (2005) standardized short reference.
    AsceShort,
    /// ASCE-EWRI (2005) standardized tall reference.
    AsceTall,
}

impl From<Et0Method> for crate::et0::Et0Method {
    fn from(m: Et0Method) -> Self {
        match m {
            Et0Method::PenmanMonteith => Self::PenmanMonteith,
            Et0Method::Hargreaves => Self::HargreavesSamani,
            Et0Method::AsceShort => Self::AsceShort,
            Et0Method::AsceTall => Self::AsceTall,
        }
    }
}

/// Flow available at a node, for the rotation roster.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum SupplyFlow {
    /// The same flow every day, m³/s.
    Constant(f64),
    /// A flow per calendar month (January first), m³/s.
    Monthly([f64; 12]),
}

/// Water available at a node when supply is short.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AvailableSupply {
    /// Node the supply is given at: a canal id, or `"headworks"`.
    pub node: String,
    /// The available flow.
    pub flow: SupplyFlow,
}

/// Name of the virtual node above all root canals.
pub const HEADWORKS: &str = "headworks";

/// Computation and reporting options.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Options {
    /// Reference ET method.
    #[serde(default = "default_et0_method")]
    pub et0_method: Et0Method,
    /// Effective-rainfall method.
    pub effective_rain: EffectiveRain,
    /// Step of the reported tables.
    pub reporting_step: ReportingStep,
    /// First month of the irrigation year (1–12).
    pub irrigation_year_start_month: u32,
    /// Non-exceedance probability of the design flow, percent (default 80).
    pub design_probability_pct: f64,
    /// Averaging period of the yearly peaks used for design.
    pub design_basis: DesignBasis,
    /// Nominal level of the design flow's confidence interval, percent
    /// (default 90; older files without the field take the default).
    #[serde(
        default = "default_design_confidence_pct",
        skip_serializing_if = "is_default_design_confidence_pct"
    )]
    pub design_confidence_pct: f64,
    /// Length of a full rotation cycle in days.
    pub rotation_period_days: u32,
    /// Available supply for the rotation roster; `None` = supply suffices.
    #[serde(default)]
    pub available_supply: Option<AvailableSupply>,
    /// How gaps in the weather record are filled before the daily balance.
    /// Older files without the field take the default.
    #[serde(default, skip_serializing_if = "GapFilling::is_default")]
    pub gap_filling: GapFilling,
    /// Station limits of the weather values (see [`crate::station_limits`]);
    /// omitted from the file when default, so no schema change.
    #[serde(
        default,
        skip_serializing_if = "crate::station_limits::StationLimits::is_default"
    )]
    pub station_limits: crate::station_limits::StationLimits,
}

/// How the weather record's gaps are filled (see [`crate::gapfill`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GapFilling {
    /// Longest gap (days) filled by linear interpolation (default 3, common
    /// practice).
    pub max_interpolation_days: u32,
    /// Method for longer gaps.
    pub long_gaps: LongGaps,
}

/// Method for gaps longer than the interpolation limit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum LongGaps {
    /// The FAO-56 missing-data procedures (radiation from the temperature
    /// range, vapour pressure from Tmin, default wind), the default.
    Fao56Procedures,
    /// The day-of-year climatology of the series itself.
    Climatology,
}

impl Default for GapFilling {
    fn default() -> Self {
        Self {
            max_interpolation_days: 3,
            long_gaps: LongGaps::Fao56Procedures,
        }
    }
}

impl GapFilling {
    /// True for the default choice (not written to files).
    pub fn is_default(&self) -> bool {
        *self == Self::default()
    }

    /// The gap-filling options of the computation.
    pub fn options(&self) -> crate::gapfill::GapFillOptions {
        crate::gapfill::GapFillOptions {
            max_interpolation_days: self.max_interpolation_days,
            long_gaps: match self.long_gaps {
                LongGaps::Fao56Procedures => crate::gapfill::LongGapMethod::Fao56MissingData,
                LongGaps::Climatology => crate::gapfill::LongGapMethod::Climatology,
            },
            ..crate::gapfill::GapFillOptions::default()
        }
    }
}

fn default_design_confidence_pct() -> f64 {
    90.0
}

#[expect(
    clippy::trivially_copy_pass_by_ref,
    reason = "serde's skip_serializing_if passes a reference"
)]
fn is_default_design_confidence_pct(v: &f64) -> bool {
    (*v - default_design_confidence_pct()).abs() < 1e-12
}

fn default_et0_method() -> Et0Method {
    Et0Method::PenmanMonteith
}

impl Default for Options {
    fn default() -> Self {
        Self {
            et0_method: Et0Method::PenmanMonteith,
            effective_rain: EffectiveRain::WaterBalance,
            reporting_step: ReportingStep::TenDay,
            irrigation_year_start_month: 1,
            design_probability_pct: 80.0,
            design_basis: DesignBasis::TenDay,
            design_confidence_pct: default_design_confidence_pct(),
            rotation_period_days: 7,
            available_supply: None,
            gap_filling: GapFilling::default(),
            station_limits: crate::station_limits::StationLimits::default(),
        }
    }
}

impl Project {
    /// The canal with this id.
    pub fn canal(&self, id: &str) -> Option<&Canal> {
        self.canals.iter().find(|c| c.id == id)
    }

    /// The block with this id.
    pub fn block(&self, id: &str) -> Option<&Block> {
        self.blocks.iter().find(|b| b.id == id)
    }

    /// The planting with this id.
    pub fn planting(&self, id: &str) -> Option<&Planting> {
        self.plantings.iter().find(|p| p.id == id)
    }

    /// The scenario with this name.
    pub fn scenario(&self, name: &str) -> Option<&Scenario> {
        self.scenarios.iter().find(|s| s.name == name)
    }

    /// A planting's area in hectares, or `None` if its block is missing.
    pub fn planting_area_ha(&self, planting: &Planting) -> Option<f64> {
        self.block(&planting.block)
            .map(|b| planting.area.hectares(b.area_ha))
    }
}

#[cfg(test)]
mod tests;
