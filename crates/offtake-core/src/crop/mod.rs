//! Crops: the crop library types and the crop coefficient curve.
//!
//! A [`Crop`] is library data (FAO-56 Tables 11, 12, 17, 22, 23 and 24 with
//! the source of every value). From it, [`season::crop_season_series`] builds
//! the per-day crop coefficient (Kc), basal crop coefficient (Kcb), rooting
//! depth and depletion fraction of one planting, for a season or a chain of
//! perennial cycles, adjusted for the actual weather of each year.
//!
//! Module map:
//! - [`stages`]: the four growth stages, their lengths and scaling to a season.
//! - [`kc_curve`]: the piecewise-linear curve of FAO-56 eq. 66.
//! - [`climate`]: climate adjustment of Kc mid/end and Kcb (FAO-56 eq. 62, 65, 70)
//!   and RHmin from dewpoint or Tmin (eq. 63, 64).
//! - [`kc_ini`]: Kc ini from the wetting interval and infiltrated depth
//!   (FAO-56 eq. 59–61, Figures 29 and 30).
//! - [`root`]: root depth growth over the season.
//! - [`season`]: the daily sequence for a planting, including perennial cycles.
//!
//! Sources: FAO-56 is Allen, Pereira, Raes and Smith (1998), *Crop
//! evapotranspiration*, FAO Irrigation and Drainage Paper 56. Page numbers
//! beside equations that are not confirmed in our shared reference file
//! (`published-check-values.md`) are recalled from memory; verify them
//! against the printed text.

pub mod climate;
pub mod kc_curve;
pub mod kc_ini;
pub mod root;
pub mod season;
pub mod stages;

use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use season::{ClimateInput, CropDay, CropSeries, CycleSummary, SeasonSpec, crop_season_series};
pub use stages::{Stage, StageLengths};

/// The broad group a crop belongs to (used for defaults and for display).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[non_exhaustive]
pub enum CropGroup {
    /// Cereals, oil seeds, fibre and other field crops.
    FieldCrop,
    /// Vegetables.
    Vegetable,
    /// Forage and fodder crops, including pasture.
    Fodder,
    /// Fruit trees, vines and other woody perennials.
    OrchardVine,
    /// Paddy (ponded) rice.
    PaddyRice,
    /// Tropical perennials such as sugarcane and banana.
    TropicalPerennial,
}

/// How reliable a library value is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[non_exhaustive]
pub enum Provenance {
    /// Checked against the shared reference file of published values
    /// (read from the cited table).
    Reference,
    /// Checked against a machine-readable transcription of the cited table
    /// (named in the note), not against the printed page. The check of every
    /// library value, with the published value and where it was read, is kept
    /// beside the project's shared reference file (`library-check.csv`).
    Transcription,
    /// Recalled from the cited published table, not yet checked against the
    /// printed page: verify before relying on it.
    Memory,
    /// Not published for this crop: an assumption stated in the note.
    Assumption,
}

/// Where one library value (or group of values) comes from.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct Source {
    /// Publication, table and page, e.g. "FAO-56 Table 12, p.110-114".
    pub cite: String,
    /// How the value was obtained.
    pub provenance: Provenance,
    /// Choice made where the table prints a range or several rows.
    #[serde(default)]
    pub note: String,
}

/// Sources for each group of values of a crop entry.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct CropSources {
    /// Stage lengths (FAO-56 Table 11).
    pub stages: Source,
    /// Single crop coefficients (FAO-56 Table 12).
    pub kc: Source,
    /// Basal crop coefficients (FAO-56 Table 17).
    #[serde(default)]
    pub kcb: Option<Source>,
    /// Maximum crop height (FAO-56 Table 12).
    pub height: Source,
    /// Rooting depth and depletion fraction (FAO-56 Table 22).
    pub root: Source,
    /// Yield response factor (FAO-33 via FAO-56 Table 24).
    #[serde(default)]
    pub ky: Option<Source>,
    /// Salinity tolerance (FAO-56 Table 23).
    #[serde(default)]
    pub salinity: Option<Source>,
    /// Later-cycle stage lengths (ratoon, cutting cycles), when the crop has them.
    #[serde(default)]
    pub cycles: Option<Source>,
}

/// Crop coefficients at the three anchor points of the FAO-56 curve.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct CoefficientSet {
    /// Coefficient during the initial stage (–).
    pub ini: f64,
    /// Coefficient during the mid-season stage (–).
    pub mid: f64,
    /// Coefficient at the end of the late-season stage (–).
    pub end: f64,
}

/// Yield response factor Ky by growth period (FAO-33).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct KyByStage {
    /// Vegetative (establishment and vegetative) period.
    pub vegetative: f64,
    /// Flowering period.
    pub flowering: f64,
    /// Yield formation period.
    pub yield_formation: f64,
    /// Ripening period.
    pub ripening: f64,
}

/// Salinity tolerance of a crop (FAO-56 Table 23, from FAO-29 and FAO-48).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct SalinityTolerance {
    /// Threshold soil salinity ECe (dS/m) below which yield is not reduced.
    pub ece_threshold_ds_m: f64,
    /// Yield decline b (% per dS/m) above the threshold.
    pub slope_b_pct_per_ds_m: f64,
}

/// How the crop repeats when it is grown for longer than one cycle.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[non_exhaustive]
pub enum CycleKind {
    /// One season; the crop is harvested at its end.
    Annual,
    /// A first cycle, then repeated later cycles with their own stage
    /// lengths (sugarcane plant crop then ratoons; alfalfa first cutting
    /// cycle then later cutting cycles). Each cycle runs the full four-stage
    /// curve from Kc ini to Kc end.
    Repeated {
        /// Stage lengths of every cycle after the first.
        later: StageLengths,
    },
    /// An orchard or vine: the four-stage curve starts on the same calendar
    /// date each year; days of the year after the late season (dormancy)
    /// take `off_season_kc` (and `off_season_kcb`).
    Yearly {
        /// Kc during the days of the year outside the four stages (–).
        off_season_kc: f64,
        /// Kcb during those days (–).
        off_season_kcb: f64,
    },
}

/// One crop of the crop library.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Crop {
    /// Short lowercase identifier used by the command line (`maize-grain`).
    pub id: String,
    /// Display name.
    pub name: String,
    /// Crop group.
    pub group: CropGroup,
    /// Stage lengths of the (first) cycle, days (FAO-56 Table 11).
    pub stages: StageLengths,
    /// Region and planting date of the Table 11 row used.
    pub stages_region: String,
    /// Single crop coefficients, subhumid climate (FAO-56 Table 12).
    pub kc: CoefficientSet,
    /// Basal crop coefficients (FAO-56 Table 17), where published.
    #[serde(default)]
    pub kcb: Option<CoefficientSet>,
    /// Maximum crop height h (m) (FAO-56 Table 12).
    pub max_height_m: f64,
    /// Smaller maximum effective rooting depth of the Table 22 range (m).
    pub root_depth_min_m: f64,
    /// Larger maximum effective rooting depth of the Table 22 range (m).
    pub root_depth_max_m: f64,
    /// Soil water depletion fraction for no stress p at ETc ≈ 5 mm/day (–).
    pub depletion_p: f64,
    /// Seasonal yield response factor Ky (–), where published.
    #[serde(default)]
    pub ky_seasonal: Option<f64>,
    /// Yield response factor by growth period, where published.
    #[serde(default)]
    pub ky_by_stage: Option<KyByStage>,
    /// Salinity tolerance, where published.
    #[serde(default)]
    pub salinity: Option<SalinityTolerance>,
    /// How the crop repeats.
    pub cycle: CycleKind,
    /// Where every value comes from.
    pub sources: CropSources,
}

/// Errors of crop computations.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum CropError {
    /// A stage length is zero or the total is zero.
    #[error("stage lengths must each be at least one day; found {found:?} for {what}")]
    BadStageLengths {
        /// What the lengths belong to.
        what: String,
        /// The lengths found.
        found: [u32; 4],
    },
    /// A season length too short to hold four stages of at least one day.
    #[error("season length {found} days is too short: at least 4 days expected")]
    SeasonTooShort {
        /// The season length found.
        found: u32,
    },
    /// A numeric input out of its valid domain or not finite.
    #[error("{what} = {found} is outside the valid range {expected}")]
    OutOfRange {
        /// Name of the input.
        what: &'static str,
        /// Value found.
        found: f64,
        /// Description of the valid range.
        expected: &'static str,
    },
    /// The per-day weather slice does not cover the season.
    #[error("weather covers {found} days but the season needs {expected}")]
    WeatherTooShort {
        /// Days of weather given.
        found: usize,
        /// Days needed.
        expected: usize,
    },
    /// The crop has no basal coefficients but the dual method was asked for.
    #[error("crop '{id}' has no basal crop coefficients (Kcb) in the library")]
    NoKcb {
        /// Crop id.
        id: String,
    },
}

/// Checks that `value` is finite and within `lo..=hi`.
pub(crate) fn check_range(
    what: &'static str,
    value: f64,
    lo: f64,
    hi: f64,
    expected: &'static str,
) -> Result<f64, CropError> {
    if value.is_finite() && value >= lo && value <= hi {
        Ok(value)
    } else {
        Err(CropError::OutOfRange {
            what,
            found: value,
            expected,
        })
    }
}

impl Crop {
    /// Checks the entry for internal consistency: positive stage lengths,
    /// coefficients in 0..=2, heights and depths positive, p in 0..1.
    ///
    /// # Errors
    /// The first inconsistency found.
    pub fn validate(&self) -> Result<(), CropError> {
        self.stages.validate(&self.id)?;
        match &self.cycle {
            CycleKind::Repeated { later } => later.validate(&self.id)?,
            CycleKind::Yearly {
                off_season_kc,
                off_season_kcb,
            } => {
                if self.stages.total_days() > 365 {
                    return Err(CropError::BadStageLengths {
                        what: format!("{} (a yearly cycle must fit in 365 days)", self.id),
                        found: self.stages.as_array(),
                    });
                }
                check_range("off-season Kc", *off_season_kc, 0.0, 2.0, "0 to 2")?;
                check_range("off-season Kcb", *off_season_kcb, 0.0, 2.0, "0 to 2")?;
            }
            CycleKind::Annual => {}
        }
        for (what, v) in [
            ("kc ini", self.kc.ini),
            ("kc mid", self.kc.mid),
            ("kc end", self.kc.end),
        ] {
            check_range(what, v, 0.0, 2.0, "0 to 2")?;
        }
        if let Some(kcb) = &self.kcb {
            for (what, v) in [
                ("kcb ini", kcb.ini),
                ("kcb mid", kcb.mid),
                ("kcb end", kcb.end),
            ] {
                check_range(what, v, 0.0, 2.0, "0 to 2")?;
            }
        }
        check_range("max height (m)", self.max_height_m, 0.0, 30.0, "0 to 30 m")?;
        check_range(
            "root depth min (m)",
            self.root_depth_min_m,
            0.05,
            5.0,
            "0.05 to 5 m",
        )?;
        check_range(
            "root depth max (m)",
            self.root_depth_max_m,
            self.root_depth_min_m,
            5.0,
            "root depth min to 5 m",
        )?;
        check_range(
            "depletion fraction p",
            self.depletion_p,
            0.05,
            0.95,
            "0.05 to 0.95",
        )?;
        Ok(())
    }
}
