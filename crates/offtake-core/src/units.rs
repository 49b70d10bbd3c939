//! Unit conversions used at the edges of the core.
//!
//! Conversion factors are from FAO-56 (Allen et al. 1998) Annex 1 unless
//! stated otherwise. Inside the core every quantity is SI (or the trade's
//! customary mm/day, ha, l/s) with the unit in its name.

/// Degrees to radians.
pub fn deg_to_rad(deg: f64) -> f64 {
    deg.to_radians()
}

/// Millimetres per day of water depth per litre per second per hectare.
///
/// 1 l s⁻¹ ha⁻¹ = 8.640 mm/day (FAO-56 Annex 1, p. 211).
pub const MM_DAY_PER_L_S_HA: f64 = 8.64;

/// Converts a continuous flow per unit area (l/s/ha) to a depth rate (mm/day).
pub fn l_s_ha_to_mm_day(duty_l_s_ha: f64) -> f64 {
    duty_l_s_ha * MM_DAY_PER_L_S_HA
}

/// Converts a depth rate (mm/day) to a continuous flow per unit area (l/s/ha).
pub fn mm_day_to_l_s_ha(depth_mm_day: f64) -> f64 {
    depth_mm_day / MM_DAY_PER_L_S_HA
}

/// Volume in m³ of a water depth in mm over an area in ha (1 mm on 1 ha = 10 m³).
pub fn depth_mm_over_area_ha_to_m3(depth_mm: f64, area_ha: f64) -> f64 {
    depth_mm * area_ha * 10.0
}

/// Seconds per day.
pub const SECONDS_PER_DAY: f64 = 86_400.0;

/// Converts a daily volume (m³/day) to a continuous flow (l/s).
pub fn m3_day_to_l_s(volume_m3_day: f64) -> f64 {
    volume_m3_day * 1000.0 / SECONDS_PER_DAY
}

/// Converts a continuous flow (l/s) to a daily volume (m³/day).
pub fn l_s_to_m3_day(flow_l_s: f64) -> f64 {
    flow_l_s * SECONDS_PER_DAY / 1000.0
}

/// Equivalent evaporation of one MJ m⁻² day⁻¹ of energy, in mm/day:
/// 1 / λ with λ = 2.45 MJ kg⁻¹ (FAO-56 eq. 20).
pub const MM_DAY_PER_MJ_M2_DAY: f64 = 0.408;

#[cfg(test)]
mod tests {
    use super::*;

    /// FAO-56 Annex 1: 1 l s⁻¹ ha⁻¹ = 8.640 mm/day.
    #[test]
    fn duty_identity_fao56_annex1() {
        assert!((l_s_ha_to_mm_day(1.0) - 8.640).abs() < 1e-12);
        assert!((mm_day_to_l_s_ha(8.64) - 1.0).abs() < 1e-12);
    }

    /// 1 mm over 1 ha is 10 m³ (FAO-56 Annex 1: 1 m³ ha⁻¹ day⁻¹ = 0.1 mm/day).
    #[test]
    fn depth_volume_fao56_annex1() {
        assert!((depth_mm_over_area_ha_to_m3(0.1, 1.0) - 1.0).abs() < 1e-12);
    }

    #[test]
    fn flow_round_trip() {
        let q = 123.4;
        assert!((m3_day_to_l_s(l_s_to_m3_day(q)) - q).abs() < 1e-9);
    }
}
