//! Velocity limits: the largest velocity a canal may run at without scour
//! (by material) and the smallest that keeps silt moving and weeds out.
//!
//! Maximum permissible velocities of earth canals: Fortier and Scobey
//! (1926), "Permissible canal velocities", *Transactions of the ASCE* 89,
//! as tabulated in Chow (1959), *Open-Channel Hydraulics*, Table 7-3
//! (straight channels after aging, clear water and water carrying
//! colloidal silts, ft/s). The values below are from memory of that table
//! and have not been checked against the printed page. Lined canals: the
//! limits are common practice (from memory), not a published table.
//!
//! Minimum non-silting velocity: Chow 1959 §7-3 (from memory) says a mean
//! velocity of 2 to 3 ft/s may be used safely when the silt load is small,
//! and not less than 2.5 ft/s prevents vegetation; we take the lower
//! figure, 2 ft/s = 0.6096 m/s, as the default and let the user set it.

use super::FT_TO_M;
use super::roughness::Lining;

/// One soil row of Fortier and Scobey's table.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FortierScobeyRow {
    /// Material as the table names it.
    pub material: &'static str,
    /// Manning n listed beside it.
    pub manning_n: f64,
    /// Maximum velocity, clear water (ft/s).
    pub clear_water_fts: f64,
    /// Maximum velocity, water carrying colloidal silts (ft/s).
    pub colloidal_silt_fts: f64,
}

/// Fortier and Scobey 1926 as in Chow 1959 Table 7-3 (from memory), the
/// rows Offtake's earth linings use.
pub const FORTIER_SCOBEY: &[FortierScobeyRow] = &[
    FortierScobeyRow {
        material: "Fine sand, colloidal",
        manning_n: 0.020,
        clear_water_fts: 1.50,
        colloidal_silt_fts: 2.50,
    },
    FortierScobeyRow {
        material: "Sandy loam, noncolloidal",
        manning_n: 0.020,
        clear_water_fts: 1.75,
        colloidal_silt_fts: 2.50,
    },
    FortierScobeyRow {
        material: "Silt loam, noncolloidal",
        manning_n: 0.020,
        clear_water_fts: 2.00,
        colloidal_silt_fts: 3.00,
    },
    FortierScobeyRow {
        material: "Ordinary firm loam",
        manning_n: 0.020,
        clear_water_fts: 2.50,
        colloidal_silt_fts: 3.50,
    },
    FortierScobeyRow {
        material: "Stiff clay, very colloidal",
        manning_n: 0.025,
        clear_water_fts: 3.75,
        colloidal_silt_fts: 5.00,
    },
    FortierScobeyRow {
        material: "Fine gravel",
        manning_n: 0.020,
        clear_water_fts: 2.50,
        colloidal_silt_fts: 5.00,
    },
    FortierScobeyRow {
        material: "Coarse gravel, noncolloidal",
        manning_n: 0.025,
        clear_water_fts: 4.00,
        colloidal_silt_fts: 6.00,
    },
];

/// The Fortier and Scobey row of an earth lining; `None` for a lined canal.
#[must_use]
pub fn fortier_scobey(lining: Lining) -> Option<&'static FortierScobeyRow> {
    let i = match lining {
        Lining::EarthFineSand => 0,
        Lining::EarthSandyLoam => 1,
        Lining::EarthSiltLoam => 2,
        Lining::EarthFirmLoam => 3,
        Lining::EarthStiffClay => 4,
        Lining::EarthFineGravel => 5,
        Lining::EarthCoarseGravel => 6,
        Lining::Concrete | Lining::BrickMasonry | Lining::StoneMasonry => return None,
    };
    FORTIER_SCOBEY.get(i)
}

/// Largest permissible mean velocity (m/s) for `lining`, clear water
/// (`colloidal_silt` false) or water carrying colloidal silts (true), and
/// the source of the figure.
#[must_use]
pub fn max_permissible_velocity_ms(lining: Lining, colloidal_silt: bool) -> (f64, &'static str) {
    if let Some(row) = fortier_scobey(lining) {
        let fts = if colloidal_silt {
            row.colloidal_silt_fts
        } else {
            row.clear_water_fts
        };
        (
            fts * FT_TO_M,
            "Fortier and Scobey 1926, as in Chow 1959 Table 7-3 (from memory)",
        )
    } else {
        let ms = match lining {
            Lining::Concrete => 2.5,
            Lining::StoneMasonry => 2.0,
            _ => 1.8,
        };
        (ms, "lined canal limit: common practice (from memory)")
    }
}

/// Default minimum non-silting velocity: 2 ft/s in m/s (Chow 1959 §7-3, from
/// memory).
pub const MIN_NON_SILTING_VELOCITY_MS: f64 = 2.0 * FT_TO_M;

/// Largest Froude number accepted for a canal at normal depth: flow well
/// below critical, away from the unstable range near Fr = 1 (common
/// practice).
pub const MAX_FROUDE: f64 = 0.8;

/// Standard gravity (m/s²), ISO 80000-3.
pub const GRAVITY_MS2: f64 = 9.806_65;

/// Froude number Fr = V / √(g D), D the hydraulic depth A/T (Chow 1959
/// eq. 1-3, from memory of the number).
#[must_use]
pub fn froude_number(velocity_ms: f64, hydraulic_depth_m: f64) -> f64 {
    velocity_ms / (GRAVITY_MS2 * hydraulic_depth_m).sqrt() // Chow 1959 eq. 1-3
}
