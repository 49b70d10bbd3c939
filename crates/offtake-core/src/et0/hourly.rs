//! Hourly (and shorter-period) reference ET: FAO-56 eq. 53 (pp. 74–76) and the
//! ASCE-EWRI (2005) hourly standardized equation.

use super::asce;
use super::atmosphere::{
    psychrometric_constant_kpa_c, saturation_slope_kpa_c, saturation_vapour_pressure_kpa,
};
use super::combination::{
    ASCE_SHORT_HOURLY_DAY, ASCE_SHORT_HOURLY_NIGHT, ASCE_TALL_HOURLY_DAY, ASCE_TALL_HOURLY_NIGHT,
    CombinationInputs, FAO56_HOURLY, aerodynamic_term_mm, radiation_term_mm,
};
use super::radiation::{
    REFERENCE_ALBEDO, clear_sky_radiation_mj, extraterrestrial_radiation_period_mj,
    net_longwave_radiation_hourly_mj, net_radiation_mj, net_shortwave_radiation_mj,
    period_solar_time_angles_rad, relative_shortwave_radiation, solar_time_angle_rad,
};
use super::soil_heat::{soil_heat_flux_hourly_day_mj, soil_heat_flux_hourly_night_mj};

/// The combination-equation reference for an hourly step.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HourlyReference {
    /// FAO-56 eq. 53: Cn 37, Cd 0.34; G = 0.1 Rn while the sun is up (Ra > 0), 0.5 Rn otherwise.
    Fao56,
    /// ASCE-EWRI (2005) short reference: Cn 37, Cd 0.24 (Rn > 0) / 0.96; G = 0.1 / 0.5 Rn.
    AsceShort,
    /// ASCE-EWRI (2005) tall reference: Cn 66, Cd 0.25 (Rn > 0) / 1.7; G = 0.04 / 0.2 Rn.
    AsceTall,
}

/// The inputs of one hourly (or shorter) period.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HourlyInputs {
    /// Latitude φ (rad), south negative.
    pub latitude_rad: f64,
    /// Station elevation z (m).
    pub elevation_m: f64,
    /// Day of the year J.
    pub day_of_year: u32,
    /// Standard clock time at the midpoint of the period t (hour), e.g. 14.5 for 14:00–15:00.
    pub clock_time_mid_h: f64,
    /// Length of the period tl (hour): 1 for hourly, 0.5 for 30-minute periods.
    pub period_h: f64,
    /// Longitude of the centre of the local time zone Lz (degrees west of Greenwich).
    pub lz_deg_west: f64,
    /// Longitude of the site Lm (degrees west of Greenwich).
    pub lm_deg_west: f64,
    /// Mean air temperature of the period Thr (°C).
    pub temperature_c: f64,
    /// Actual vapour pressure ea (kPa), e.g. eq. 54: e°(Thr) RHhr/100.
    pub ea_kpa: f64,
    /// Wind speed at 2 m u2 (m/s).
    pub wind_2m_ms: f64,
    /// Incoming solar radiation Rs for the period (MJ m⁻² per period).
    pub rs_mj: f64,
    /// Rs/Rso to use while the sun is down (FAO-56 p. 75: the value 2–3 hours
    /// before sunset, or 0.4–0.6 humid / 0.7–0.8 arid).
    pub night_relative_shortwave: f64,
}

/// Every intermediate of one hourly evaluation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HourlySteps {
    /// γ (kPa °C⁻¹), FAO-56 eq. 8.
    pub psychrometric_kpa_c: f64,
    /// Δ at Thr (kPa °C⁻¹), FAO-56 eq. 13.
    pub slope_kpa_c: f64,
    /// e°(Thr) (kPa), FAO-56 eq. 11.
    pub es_kpa: f64,
    /// Solar time angle at the midpoint ω (rad), eq. 31.
    pub omega_rad: f64,
    /// ω1 (rad), eq. 29.
    pub omega1_rad: f64,
    /// ω2 (rad), eq. 30.
    pub omega2_rad: f64,
    /// Ra for the period (MJ m⁻² per period), eq. 28.
    pub ra_mj: f64,
    /// Rso for the period (MJ m⁻² per period), eq. 37.
    pub rso_mj: f64,
    /// Rs/Rso used in Rnl.
    pub relative_shortwave: f64,
    /// Rns (MJ m⁻² per period), eq. 38.
    pub rns_mj: f64,
    /// Rnl (MJ m⁻² per period), eq. 39 with hourly σ (or ASCE eq. 44).
    pub rnl_mj: f64,
    /// Rn (MJ m⁻² per period), eq. 40.
    pub rn_mj: f64,
    /// G (MJ m⁻² per period), eq. 45/46 (or ASCE Table 1).
    pub soil_heat_flux_mj: f64,
    /// Radiation term (mm per period).
    pub radiation_term_mm: f64,
    /// Aerodynamic term (mm per period).
    pub aerodynamic_term_mm: f64,
    /// Reference ET for the period (mm), unclipped.
    pub et_mm: f64,
}

/// Hourly reference ET with every intermediate (FAO-56 eq. 53 or ASCE-EWRI 2005 hourly).
///
/// FAO-56 Chapter 3–4, pp. 47–48 and 74–76: Ra by eq. 28 (ω from eqs. 29–33),
/// Rso by eq. 37, Rnl by eq. 39 with σ/24 and T = Thr, G by eqs. 45–46.
/// ASCE-EWRI (2005): the same Ra and Rso, Rnl by eq. 44 (σ = 2.042×10⁻¹⁰, fcd
/// limits) and Cd, G from Table 1 by the sign of Rn. Periods longer than one
/// hour scale Cn (37 or 66 per hour) linearly with `period_h`.
pub fn hourly_steps(inputs: &HourlyInputs, reference: HourlyReference) -> HourlySteps {
    let pressure = super::atmosphere::atmospheric_pressure_kpa(inputs.elevation_m); // Eq. 7
    let gamma = psychrometric_constant_kpa_c(pressure); // Eq. 8
    let slope = saturation_slope_kpa_c(inputs.temperature_c); // Eq. 13
    let es = saturation_vapour_pressure_kpa(inputs.temperature_c); // Eq. 11
    let omega = solar_time_angle_rad(
        inputs.clock_time_mid_h,
        inputs.lz_deg_west,
        inputs.lm_deg_west,
        inputs.day_of_year,
    ); // Eq. 31
    let (w1, w2) = period_solar_time_angles_rad(omega, inputs.period_h); // Eqs. 29-30
    let ra = extraterrestrial_radiation_period_mj(inputs.latitude_rad, inputs.day_of_year, w1, w2); // Eq. 28
    let rso = clear_sky_radiation_mj(ra, inputs.elevation_m); // Eq. 37
    let ratio = relative_shortwave_radiation(inputs.rs_mj, rso, inputs.night_relative_shortwave);
    let rns = net_shortwave_radiation_mj(inputs.rs_mj, REFERENCE_ALBEDO); // Eq. 38
    let rnl = match reference {
        HourlyReference::Fao56 => {
            net_longwave_radiation_hourly_mj(inputs.temperature_c, inputs.ea_kpa, ratio)
        }
        HourlyReference::AsceShort | HourlyReference::AsceTall => {
            asce::net_longwave_radiation_hourly_mj(inputs.temperature_c, inputs.ea_kpa, ratio)
        }
    };
    let rn = net_radiation_mj(rns, rnl); // Eq. 40
    let (g, mut constants) = match reference {
        HourlyReference::Fao56 => {
            let g = if ra > 0.0 {
                soil_heat_flux_hourly_day_mj(rn) // Eq. 45
            } else {
                soil_heat_flux_hourly_night_mj(rn) // Eq. 46
            };
            (g, FAO56_HOURLY)
        }
        HourlyReference::AsceShort => (
            asce::soil_heat_flux_hourly_mj(rn, false),
            if rn > 0.0 {
                ASCE_SHORT_HOURLY_DAY
            } else {
                ASCE_SHORT_HOURLY_NIGHT
            },
        ),
        HourlyReference::AsceTall => (
            asce::soil_heat_flux_hourly_mj(rn, true),
            if rn > 0.0 {
                ASCE_TALL_HOURLY_DAY
            } else {
                ASCE_TALL_HOURLY_NIGHT
            },
        ),
    };
    constants.cn *= inputs.period_h;
    let combination = CombinationInputs {
        slope_kpa_c: slope,
        psychrometric_kpa_c: gamma,
        net_radiation_mj: rn,
        soil_heat_flux_mj: g,
        temperature_c: inputs.temperature_c,
        wind_2m_ms: inputs.wind_2m_ms,
        es_kpa: es,
        ea_kpa: inputs.ea_kpa,
    };
    let radiation_term = radiation_term_mm(&combination, constants);
    let aerodynamic_term = aerodynamic_term_mm(&combination, constants);
    HourlySteps {
        psychrometric_kpa_c: gamma,
        slope_kpa_c: slope,
        es_kpa: es,
        omega_rad: omega,
        omega1_rad: w1,
        omega2_rad: w2,
        ra_mj: ra,
        rso_mj: rso,
        relative_shortwave: ratio,
        rns_mj: rns,
        rnl_mj: rnl,
        rn_mj: rn,
        soil_heat_flux_mj: g,
        radiation_term_mm: radiation_term,
        aerodynamic_term_mm: aerodynamic_term,
        et_mm: radiation_term + aerodynamic_term, // Eq. 53
    }
}
