//! Freeboard: the height of the bank above the full-supply water level.
//!
//! US Bureau of Reclamation rule F = √(C y), F and y in feet, C a
//! dimensional coefficient from 1.5 for a capacity of 20 ft³/s to 2.5 for
//! 3 000 ft³/s or more; as given in Chow (1959), *Open-Channel Hydraulics*,
//! §7-8 (from memory of the section number). In metres, with y_ft =
//! y/0.3048 and F = 0.3048 F_ft, F = √(0.3048 C y) exactly. Between 20 and
//! 3 000 ft³/s C is interpolated linearly in discharge (common practice;
//! the source gives only the end points), and it is held at 1.5 below
//! 20 ft³/s.

use super::FT_TO_M;

/// Cubic feet per second to cubic metres per second (exact: 0.3048³).
pub const CFS_TO_M3S: f64 = FT_TO_M * FT_TO_M * FT_TO_M;

/// USBR coefficient C (ft) for a canal capacity `capacity_m3s`.
#[must_use]
pub fn usbr_coefficient_c(capacity_m3s: f64) -> f64 {
    let q_cfs = capacity_m3s / CFS_TO_M3S;
    if q_cfs <= 20.0 {
        1.5
    } else if q_cfs >= 3000.0 {
        2.5
    } else {
        1.5 + (q_cfs - 20.0) / (3000.0 - 20.0)
    }
}

/// USBR freeboard F = √(0.3048 C y) (m) for water depth `depth_m` and the
/// capacity that sets C.
#[must_use]
pub fn usbr_freeboard_m(depth_m: f64, capacity_m3s: f64) -> f64 {
    (FT_TO_M * usbr_coefficient_c(capacity_m3s) * depth_m).sqrt() // USBR F = √(C y), in metres
}
