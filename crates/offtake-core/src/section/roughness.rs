//! Manning n of canal linings and earth channels, each row named, with the
//! range the source gives.
//!
//! Source: Chow (1959), *Open-Channel Hydraulics*, Table 5-6 "Values of the
//! roughness coefficient n" (minimum, normal, maximum), parts B-2 (lined
//! or built-up channels) and C-1 (excavated or dredged, earth). The values
//! below are from memory of that table and have not been checked against
//! the printed page; each row says so in `source`.

use serde::{Deserialize, Serialize};

/// One row of the Manning n table.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RoughnessRow {
    /// Stable id used in project files and on the command line.
    pub id: &'static str,
    /// The row's description.
    pub description: &'static str,
    /// Minimum n.
    pub n_min: f64,
    /// Normal n (used for design).
    pub n_normal: f64,
    /// Maximum n.
    pub n_max: f64,
    /// Where the row comes from.
    pub source: &'static str,
}

const CHOW_T56: &str = "Chow 1959, Table 5-6 (from memory)";

/// The Manning n table: Chow 1959 Table 5-6, B-2 and C-1 rows (from memory).
pub const MANNING_N_TABLE: &[RoughnessRow] = &[
    RoughnessRow {
        id: "concrete-trowel",
        description: "Concrete, trowel finish",
        n_min: 0.011,
        n_normal: 0.013,
        n_max: 0.015,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "concrete-float",
        description: "Concrete, float finish",
        n_min: 0.013,
        n_normal: 0.015,
        n_max: 0.016,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "concrete-unfinished",
        description: "Concrete, unfinished",
        n_min: 0.014,
        n_normal: 0.017,
        n_max: 0.020,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "gunite",
        description: "Concrete, gunite, good section",
        n_min: 0.016,
        n_normal: 0.019,
        n_max: 0.023,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "brick-cement-mortar",
        description: "Brick in cement mortar",
        n_min: 0.012,
        n_normal: 0.015,
        n_max: 0.018,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "masonry-cemented-rubble",
        description: "Masonry, cemented rubble",
        n_min: 0.017,
        n_normal: 0.025,
        n_max: 0.030,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "masonry-dry-rubble",
        description: "Masonry, dry rubble",
        n_min: 0.023,
        n_normal: 0.032,
        n_max: 0.035,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-clean-new",
        description: "Earth, straight and uniform, clean, recently completed",
        n_min: 0.016,
        n_normal: 0.018,
        n_max: 0.020,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-clean-weathered",
        description: "Earth, straight and uniform, clean, after weathering",
        n_min: 0.018,
        n_normal: 0.022,
        n_max: 0.025,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-gravel",
        description: "Earth, straight and uniform, gravel, uniform section, clean",
        n_min: 0.022,
        n_normal: 0.025,
        n_max: 0.030,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-short-grass",
        description: "Earth, straight and uniform, with short grass, few weeds",
        n_min: 0.022,
        n_normal: 0.027,
        n_max: 0.033,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-winding-clean",
        description: "Earth, winding and sluggish, no vegetation",
        n_min: 0.023,
        n_normal: 0.025,
        n_max: 0.030,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-winding-grass",
        description: "Earth, winding and sluggish, grass, some weeds",
        n_min: 0.025,
        n_normal: 0.030,
        n_max: 0.033,
        source: CHOW_T56,
    },
    RoughnessRow {
        id: "earth-dense-weeds",
        description: "Earth, not maintained, dense weeds as high as flow depth",
        n_min: 0.050,
        n_normal: 0.080,
        n_max: 0.120,
        source: CHOW_T56,
    },
];

/// The row with `id`, if any.
#[must_use]
pub fn roughness_row(id: &str) -> Option<&'static RoughnessRow> {
    MANNING_N_TABLE.iter().find(|r| r.id == id)
}

/// The canal's lining or the soil it is dug in: sets Manning n, the side
/// slope and the largest velocity the canal may run at without scour.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum Lining {
    /// Concrete lining (float finish).
    Concrete,
    /// Brick in cement mortar.
    BrickMasonry,
    /// Cemented rubble masonry.
    StoneMasonry,
    /// Unlined, in fine sand (colloidal).
    EarthFineSand,
    /// Unlined, in sandy loam (non-colloidal).
    EarthSandyLoam,
    /// Unlined, in silt loam (non-colloidal).
    EarthSiltLoam,
    /// Unlined, in ordinary firm loam.
    #[default]
    EarthFirmLoam,
    /// Unlined, in stiff clay (very colloidal).
    EarthStiffClay,
    /// Unlined, in fine gravel.
    EarthFineGravel,
    /// Unlined, in coarse gravel (non-colloidal).
    EarthCoarseGravel,
}

/// Every lining, in the order they are offered.
pub const LININGS: [Lining; 10] = [
    Lining::Concrete,
    Lining::BrickMasonry,
    Lining::StoneMasonry,
    Lining::EarthFineSand,
    Lining::EarthSandyLoam,
    Lining::EarthSiltLoam,
    Lining::EarthFirmLoam,
    Lining::EarthStiffClay,
    Lining::EarthFineGravel,
    Lining::EarthCoarseGravel,
];

impl Lining {
    /// Stable id used in files and on the command line.
    #[must_use]
    pub fn id(self) -> &'static str {
        match self {
            Lining::Concrete => "concrete",
            Lining::BrickMasonry => "brick-masonry",
            Lining::StoneMasonry => "stone-masonry",
            Lining::EarthFineSand => "earth-fine-sand",
            Lining::EarthSandyLoam => "earth-sandy-loam",
            Lining::EarthSiltLoam => "earth-silt-loam",
            Lining::EarthFirmLoam => "earth-firm-loam",
            Lining::EarthStiffClay => "earth-stiff-clay",
            Lining::EarthFineGravel => "earth-fine-gravel",
            Lining::EarthCoarseGravel => "earth-coarse-gravel",
        }
    }

    /// Parses an id of [`Lining::id`].
    #[must_use]
    pub fn parse(text: &str) -> Option<Lining> {
        LININGS.into_iter().find(|l| l.id() == text.trim())
    }

    /// Human-readable name.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Lining::Concrete => "Concrete lining",
            Lining::BrickMasonry => "Brick masonry lining",
            Lining::StoneMasonry => "Stone masonry lining",
            Lining::EarthFineSand => "Earth: fine sand",
            Lining::EarthSandyLoam => "Earth: sandy loam",
            Lining::EarthSiltLoam => "Earth: silt loam",
            Lining::EarthFirmLoam => "Earth: ordinary firm loam",
            Lining::EarthStiffClay => "Earth: stiff clay",
            Lining::EarthFineGravel => "Earth: fine gravel",
            Lining::EarthCoarseGravel => "Earth: coarse gravel",
        }
    }

    /// True for a lined canal (concrete or masonry).
    #[must_use]
    pub fn is_lined(self) -> bool {
        matches!(
            self,
            Lining::Concrete | Lining::BrickMasonry | Lining::StoneMasonry
        )
    }

    /// Design Manning n. Lined canals take the normal n of their Chow 1959
    /// Table 5-6 row; earth canals the n Fortier and Scobey (1926) list
    /// beside each soil (Chow 1959 Table 7-3), both from memory.
    #[must_use]
    pub fn manning_n(self) -> f64 {
        match self {
            Lining::Concrete => ROW_CONCRETE_FLOAT.n_normal,
            Lining::BrickMasonry => ROW_BRICK.n_normal,
            Lining::StoneMasonry => ROW_RUBBLE.n_normal,
            earth => super::velocity::fortier_scobey(earth).map_or(0.025, |r| r.manning_n),
        }
    }

    /// Side slope z (H per V) suited to the material, after Chow 1959
    /// Table 7-2 "Suitable side slopes for channels built in various kinds
    /// of materials" (from memory): earth with concrete lining ½:1 to 1:1
    /// (1 here), firm clay or earth 1½:1, loose sandy earth 2:1, sandy loam
    /// or porous clay 3:1.
    #[must_use]
    pub fn side_slope_h_per_v(self) -> f64 {
        match self {
            Lining::Concrete | Lining::BrickMasonry | Lining::StoneMasonry => 1.0,
            Lining::EarthStiffClay | Lining::EarthFirmLoam | Lining::EarthSiltLoam => 1.5,
            Lining::EarthFineSand | Lining::EarthFineGravel | Lining::EarthCoarseGravel => 2.0,
            Lining::EarthSandyLoam => 3.0,
        }
    }
}

const ROW_CONCRETE_FLOAT: RoughnessRow = MANNING_N_TABLE[1];
const ROW_BRICK: RoughnessRow = MANNING_N_TABLE[4];
const ROW_RUBBLE: RoughnessRow = MANNING_N_TABLE[5];
