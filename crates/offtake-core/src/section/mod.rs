//! Canal sections: the cross-section a canal needs to carry its required
//! capacity, the checks a designer applies to it, and the capacity of a
//! section that is already built.
//!
//! One file per relation: [`geometry`] (area, perimeter, widths; Chow 1959
//! Table 2-1), [`manning`] (Manning 1891: discharge and normal depth),
//! [`roughness`] (Manning n by lining, Chow 1959 Table 5-6), [`lacey`]
//! (Lacey 1930 regime method), [`freeboard`] (USBR rule), [`velocity`]
//! (Fortier and Scobey 1926 limits, minimum non-silting velocity, Froude),
//! [`seepage`] (loss by wetted area), and [`design`] (a section with its
//! checks and the nearest passing section when a check fails).
//!
//! # Units
//! SI throughout: m, m², m³/s, m/s; side slopes z as horizontal per
//! vertical; bed slope in m/m. The foot is the international foot,
//! 0.3048 m exactly.
//!
//! # Caution
//! Section sizes are preliminary: structures, transitions, sediment,
//! survey and local codes decide the final design, which a qualified
//! engineer must check.

pub mod canal;
pub mod design;
pub mod freeboard;
pub mod geometry;
pub mod lacey;
pub mod manning;
pub mod roughness;
pub mod seepage;
pub mod velocity;

#[cfg(test)]
mod tests;

pub use design::{
    Check, CheckKind, DesignRequest, ExistingSection, Method, Proposal, SectionResult, Width,
    check_existing, design_section, propose,
};
pub use geometry::{Prism, Shape};
pub use roughness::{LININGS, Lining, MANNING_N_TABLE, RoughnessRow};

/// The international foot in metres (exact, 1959 International Yard and
/// Pound Agreement).
pub const FT_TO_M: f64 = 0.3048;

/// What went wrong computing a section.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SectionError {
    /// An input that must be positive and finite is not.
    #[error("{what} must be a positive finite number, got {value}")]
    NotPositive {
        /// The quantity.
        what: &'static str,
        /// The value given.
        value: f64,
    },
    /// An input that must not be negative is.
    #[error("{what} must be zero or more, got {value}")]
    Negative {
        /// The quantity.
        what: &'static str,
        /// The value given.
        value: f64,
    },
    /// No depth up to 10 000 m carries the flow.
    #[error("no normal depth up to 10 000 m carries {flow_m3s} m³/s in this section")]
    NoNormalDepth {
        /// The flow asked for (m³/s).
        flow_m3s: f64,
    },
    /// The regime relations give no real trapezoid.
    #[error(
        "the regime relations give no ½:1 trapezoid for {flow_m3s} m³/s with silt factor {silt_factor}"
    )]
    NoRegimeSection {
        /// Flow (m³/s).
        flow_m3s: f64,
        /// Silt factor.
        silt_factor: f64,
    },
    /// The seepage iteration did not settle: the loss is as large as the
    /// flow the reach can carry.
    #[error(
        "seepage does not settle for an outflow of {outflow_m3s} m³/s: the loss outgrows the flow"
    )]
    SeepageNotSettled {
        /// Outflow asked for (m³/s).
        outflow_m3s: f64,
    },
    /// A shape that needs a bed width (rectangle) was given none, or a
    /// section that needs side slopes (triangle) was given vertical sides.
    #[error("a {shape} section needs {what}")]
    Degenerate {
        /// The shape.
        shape: &'static str,
        /// What it needs.
        what: &'static str,
    },
}

/// `Ok` when `value` is positive and finite.
pub(crate) fn positive(what: &'static str, value: f64) -> Result<(), SectionError> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(SectionError::NotPositive { what, value })
    }
}

/// `Ok` when `value` is zero or more and finite.
pub(crate) fn non_negative(what: &'static str, value: f64) -> Result<(), SectionError> {
    if value.is_finite() && value >= 0.0 {
        Ok(())
    } else if value.is_finite() {
        Err(SectionError::Negative { what, value })
    } else {
        Err(SectionError::NotPositive { what, value })
    }
}

/// Checks that a prism's dimensions make a section of its shape.
pub(crate) fn check_prism(prism: &Prism) -> Result<(), SectionError> {
    non_negative("bed width (m)", prism.bed_width_m)?;
    non_negative("side slope (H per V)", prism.side_slope_h_per_v)?;
    match prism.shape {
        Shape::Rectangular if prism.bed_width_m <= 0.0 => Err(SectionError::Degenerate {
            shape: "rectangular",
            what: "a bed width above zero",
        }),
        Shape::Triangular if prism.side_slope_h_per_v <= 0.0 => Err(SectionError::Degenerate {
            shape: "triangular",
            what: "a side slope above zero",
        }),
        Shape::Trapezoidal if prism.bed_width_m <= 0.0 && prism.side_slope_h_per_v <= 0.0 => {
            Err(SectionError::Degenerate {
                shape: "trapezoidal",
                what: "a bed width or a side slope above zero",
            })
        }
        _ => Ok(()),
    }
}
