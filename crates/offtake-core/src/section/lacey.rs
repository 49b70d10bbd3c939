//! Lacey's regime method for unlined canals in alluvium: the section and
//! slope at which a canal carrying silt neither scours nor silts.
//!
//! Lacey (1930), "Stable channels in alluvium", *Minutes of Proceedings of
//! the Institution of Civil Engineers* 229, pp. 259–292; the relations in
//! metric units (Q in m³/s, lengths in m, d in mm) as the regime method is
//! usually written. The regime method is an empirical fit to canals of the
//! Indo-Gangetic plain in fine alluvium; outside such canals it has no
//! standing.
//!
//! The section shape is a trapezoid with side slopes ½ H : 1 V, which
//! regime canals take up (common practice).

use super::SectionError;

/// Side slope of a regime section (½ H : 1 V; common practice).
pub const REGIME_SIDE_SLOPE_H_PER_V: f64 = 0.5;

/// Lacey's silt factor from the median grain size: f = 1.76 √d (d in mm;
/// Lacey 1930).
#[must_use]
pub fn silt_factor(median_grain_mm: f64) -> f64 {
    1.76 * median_grain_mm.sqrt() // Lacey 1930
}

/// Regime velocity V = (Q f² / 140)^(1/6) (m/s; Lacey 1930).
#[must_use]
pub fn regime_velocity_ms(flow_m3s: f64, silt_factor: f64) -> f64 {
    (flow_m3s * silt_factor * silt_factor / 140.0).powf(1.0 / 6.0) // Lacey 1930
}

/// Regime hydraulic radius R = 5 V² / (2 f) (m; Lacey 1930).
#[must_use]
pub fn regime_hydraulic_radius_m(velocity_ms: f64, silt_factor: f64) -> f64 {
    2.5 * velocity_ms * velocity_ms / silt_factor // Lacey 1930
}

/// Regime wetted perimeter P = 4.75 √Q (m; Lacey 1930).
#[must_use]
pub fn regime_wetted_perimeter_m(flow_m3s: f64) -> f64 {
    4.75 * flow_m3s.sqrt() // Lacey 1930
}

/// Regime bed slope S = f^(5/3) / (3340 Q^(1/6)) (m/m; Lacey 1930).
#[must_use]
pub fn regime_slope(flow_m3s: f64, silt_factor: f64) -> f64 {
    silt_factor.powf(5.0 / 3.0) / (3340.0 * flow_m3s.powf(1.0 / 6.0)) // Lacey 1930
}

/// A regime section: the relations above and the trapezoid they give.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RegimeSection {
    /// Silt factor f used.
    pub silt_factor: f64,
    /// Regime velocity (m/s).
    pub velocity_ms: f64,
    /// Flow area A = Q / V (m²).
    pub area_m2: f64,
    /// Regime wetted perimeter (m).
    pub wetted_perimeter_m: f64,
    /// Regime hydraulic radius (m).
    pub hydraulic_radius_m: f64,
    /// Regime slope (m/m).
    pub slope: f64,
    /// Water depth of the ½:1 trapezoid with area A and perimeter P (m).
    pub depth_m: f64,
    /// Bed width of that trapezoid (m).
    pub bed_width_m: f64,
}

/// The regime section for `flow_m3s` and `silt_factor`.
///
/// The depth y and bed width b of the ½:1 trapezoid follow from A = (b +
/// z y) y and P = b + 2 y √(1 + z²): c y² − P y + A = 0 with c = 2√(1 + z²)
/// − z, taking the smaller root (the wide, shallow section).
///
/// # Errors
/// [`SectionError::NotPositive`] for a flow or silt factor that is not
/// positive and finite; [`SectionError::NoRegimeSection`] when the
/// quadratic has no real root or the bed width comes out negative.
pub fn regime_section(flow_m3s: f64, silt_factor: f64) -> Result<RegimeSection, SectionError> {
    super::positive("flow (m³/s)", flow_m3s)?;
    super::positive("silt factor", silt_factor)?;
    let v = regime_velocity_ms(flow_m3s, silt_factor);
    let area = flow_m3s / v;
    let p = regime_wetted_perimeter_m(flow_m3s);
    let z = REGIME_SIDE_SLOPE_H_PER_V;
    let side = (1.0 + z * z).sqrt();
    let c = 2.0 * side - z;
    let disc = p * p - 4.0 * c * area;
    if disc < 0.0 {
        return Err(SectionError::NoRegimeSection {
            flow_m3s,
            silt_factor,
        });
    }
    let depth = (p - disc.sqrt()) / (2.0 * c);
    let bed = p - 2.0 * depth * side;
    if bed < 0.0 || depth <= 0.0 {
        return Err(SectionError::NoRegimeSection {
            flow_m3s,
            silt_factor,
        });
    }
    Ok(RegimeSection {
        silt_factor,
        velocity_ms: v,
        area_m2: area,
        wetted_perimeter_m: p,
        hydraulic_radius_m: regime_hydraulic_radius_m(v, silt_factor),
        slope: regime_slope(flow_m3s, silt_factor),
        depth_m: depth,
        bed_width_m: bed,
    })
}
