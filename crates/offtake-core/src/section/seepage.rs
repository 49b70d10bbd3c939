//! Seepage from a canal as a flow: the rate per unit wetted area times the
//! wetted area of the reach, so the share lost grows as the flow falls.
//!
//! The seepage rate is an input (m³ of water per m² of wetted area per
//! day, i.e. m/day), measured by ponding or inflow–outflow tests on the
//! canal itself. Loss while the canal runs: q_s = rate × P × L / 86 400
//! (m³/s), P the wetted perimeter at the flow, L the reach length
//! (conservation of volume over the wetted area; no published empirical
//! formula is used).

use super::SectionError;
use super::geometry::Prism;
use super::manning::{MANNING_K_SI, normal_depth_m};
use crate::units::SECONDS_PER_DAY;

/// Relative tolerance of the seepage iteration on the inflow (0.1 %).
pub const SEEPAGE_TOLERANCE: f64 = 1e-3;

/// Seepage loss while the canal runs (m³/s): rate × P × L / 86 400.
#[must_use]
pub fn seepage_loss_m3s(rate_m3_m2_day: f64, wetted_perimeter_m: f64, length_m: f64) -> f64 {
    rate_m3_m2_day * wetted_perimeter_m * length_m / SECONDS_PER_DAY
}

/// The inflow a reach needs to deliver `outflow_m3s` at its tail while
/// losing seepage at the wetted perimeter of the inflow in `prism`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeepageSolution {
    /// Inflow at the head of the reach (m³/s).
    pub inflow_m3s: f64,
    /// Seepage loss (m³/s).
    pub loss_m3s: f64,
    /// Conveyance efficiency outflow ÷ inflow (fraction).
    pub efficiency: f64,
    /// Iterations taken to reach [`SEEPAGE_TOLERANCE`].
    pub iterations: usize,
}

/// Solves Q_in = Q_out + rate × P(y_n(Q_in)) × L / 86 400 by successive
/// substitution to 0.1 % on Q_in. Flows are the flows while the canal
/// runs. A zero outflow gives a zero inflow (an empty canal loses nothing).
///
/// # Errors
/// [`SectionError`] for an invalid section, slope, n, rate or length, or
/// when the iteration does not settle in 100 steps (seepage larger than
/// the flow can carry).
pub fn inflow_with_seepage(
    prism: &Prism,
    manning_n: f64,
    bed_slope: f64,
    outflow_m3s: f64,
    rate_m3_m2_day: f64,
    length_m: f64,
) -> Result<SeepageSolution, SectionError> {
    super::non_negative("outflow (m³/s)", outflow_m3s)?;
    super::non_negative("seepage rate (m³/m²/day)", rate_m3_m2_day)?;
    super::non_negative("canal length (m)", length_m)?;
    if outflow_m3s == 0.0 {
        return Ok(SeepageSolution {
            inflow_m3s: 0.0,
            loss_m3s: 0.0,
            efficiency: 1.0,
            iterations: 0,
        });
    }
    let mut inflow = outflow_m3s;
    for i in 1..=100 {
        let y = normal_depth_m(prism, inflow, bed_slope, manning_n, MANNING_K_SI)?;
        let loss = seepage_loss_m3s(rate_m3_m2_day, prism.wetted_perimeter_m(y), length_m);
        let next = outflow_m3s + loss;
        if (next - inflow).abs() <= SEEPAGE_TOLERANCE * next {
            return Ok(SeepageSolution {
                inflow_m3s: next,
                loss_m3s: next - outflow_m3s,
                efficiency: outflow_m3s / next,
                iterations: i,
            });
        }
        inflow = next;
    }
    Err(SectionError::SeepageNotSettled { outflow_m3s })
}
