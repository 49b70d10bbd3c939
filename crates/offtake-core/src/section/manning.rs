//! Manning's equation for uniform flow, solved for discharge and for normal
//! depth.
//!
//! Manning (1891), "On the flow of water in open channels and pipes",
//! *Transactions of the Institution of Civil Engineers of Ireland* 20; in
//! SI units as given by Chow (1959), *Open-Channel Hydraulics*, Chapter 5:
//! V = (1/n) R^(2/3) S^(1/2), with V in m/s and R in m (in US units the
//! factor is 1.49, Chow 1959 eq. 5-6).

use super::SectionError;
use super::geometry::Prism;

/// Unit factor k of Manning's equation: 1 in SI units (m, s).
pub const MANNING_K_SI: f64 = 1.0;

/// Unit factor of Manning's equation in US customary units (ft, s): 1.486,
/// Chow 1959 §5-6 (printed as 1.49 in the equation). Used by tests that
/// reproduce examples worked in feet.
pub const MANNING_K_US: f64 = 1.486;

/// Mean velocity by Manning: V = (k/n) R^(2/3) S^(1/2) (m/s, or ft/s with
/// [`MANNING_K_US`]).
///
/// Inputs: hydraulic radius `hydraulic_radius_m` (m), bed slope (m/m),
/// Manning n (s m^(-1/3)), unit factor `k`.
#[must_use]
pub fn manning_velocity_ms(hydraulic_radius_m: f64, bed_slope: f64, manning_n: f64, k: f64) -> f64 {
    k / manning_n * hydraulic_radius_m.powf(2.0 / 3.0) * bed_slope.sqrt() // Manning 1891; Chow 1959 eq. 5-6
}

/// Discharge of `prism` at `depth_m` by Manning: Q = A V (m³/s).
#[must_use]
pub fn manning_discharge_m3s(
    prism: &Prism,
    depth_m: f64,
    bed_slope: f64,
    manning_n: f64,
    k: f64,
) -> f64 {
    if depth_m <= 0.0 {
        return 0.0;
    }
    let r = prism.hydraulic_radius_m(depth_m);
    prism.area_m2(depth_m) * manning_velocity_ms(r, bed_slope, manning_n, k)
}

/// Relative tolerance the normal depth is solved to (on the discharge).
pub const NORMAL_DEPTH_TOLERANCE: f64 = 1e-10;

/// Normal depth: the depth at which `prism` carries `flow_m3s` in uniform
/// flow by Manning (m, or ft with [`MANNING_K_US`]).
///
/// Solved by bisection on the depth (the discharge grows with depth for
/// every shape here), to a relative error on the discharge below
/// [`NORMAL_DEPTH_TOLERANCE`].
///
/// # Errors
/// [`SectionError::NotPositive`] for a flow, slope, n or section dimension
/// that is not positive and finite; [`SectionError::NoNormalDepth`] when no
/// depth up to 10 000 m carries the flow.
pub fn normal_depth_m(
    prism: &Prism,
    flow_m3s: f64,
    bed_slope: f64,
    manning_n: f64,
    k: f64,
) -> Result<f64, SectionError> {
    super::positive("flow (m³/s)", flow_m3s)?;
    super::positive("bed slope (m/m)", bed_slope)?;
    super::positive("Manning n", manning_n)?;
    super::check_prism(prism)?;
    let q = |y: f64| manning_discharge_m3s(prism, y, bed_slope, manning_n, k);
    let mut hi = 1.0_f64;
    while q(hi) < flow_m3s {
        hi *= 2.0;
        if hi > 1e4 {
            return Err(SectionError::NoNormalDepth { flow_m3s });
        }
    }
    let mut lo = 0.0_f64;
    for _ in 0..2000 {
        let mid = 0.5 * (lo + hi);
        let qm = q(mid);
        if (qm - flow_m3s).abs() <= NORMAL_DEPTH_TOLERANCE * flow_m3s {
            return Ok(mid);
        }
        if qm < flow_m3s {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}
