//! A whole day of the combination equation, step by step, from resolved inputs.
//!
//! "Resolved" means the FAO-56 missing-data procedures have already been
//! applied: the caller supplies ea, u2 and Rs (measured or estimated). The
//! day-series API in [`super::series`] does that resolution.

use super::asce;
use super::atmosphere::{
    mean_air_temperature_c, psychrometric_constant_kpa_c, saturation_slope_kpa_c,
    saturation_vapour_pressure_kpa,
};
use super::combination::{
    ASCE_SHORT_DAILY, ASCE_TALL_DAILY, CombinationInputs, FAO56_DAILY, SurfaceConstants,
};
use super::radiation::{
    REFERENCE_ALBEDO, daylight_hours, extraterrestrial_radiation_mj, net_longwave_radiation_mj,
    net_radiation_mj, net_shortwave_radiation_mj, relative_shortwave_radiation,
    solar_declination_rad, sunset_hour_angle_rad,
};
use crate::units::MM_DAY_PER_MJ_M2_DAY;

/// Rs/Rso used when Rso = 0 (polar night), where the ratio is undefined.
///
/// FAO-56 p. 75 suggests 0.4–0.6 for night-time in humid and subhumid
/// climates; the midpoint 0.5 is used (ASCE-EWRI 2005 then raises it to its
/// lower limit 0.3 → no change). It only affects Rnl on days without sunrise.
pub const POLAR_NIGHT_RELATIVE_SHORTWAVE: f64 = 0.5;

/// The combination-equation reference for a daily step.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum DailyReference {
    /// FAO-56 grass reference (eq. 6; σ = 4.903×10⁻⁹; Rs/Rso ≤ 1).
    Fao56,
    /// ASCE-EWRI (2005) short reference ETos (Cn 900, Cd 0.34; σ = 4.901×10⁻⁹; fcd limits).
    AsceShort,
    /// ASCE-EWRI (2005) tall reference ETrs (Cn 1600, Cd 0.38; σ = 4.901×10⁻⁹; fcd limits).
    AsceTall,
}

impl DailyReference {
    /// Cn and Cd of the reference (FAO-56 eq. 6; ASCE-EWRI 2005 Table 1).
    pub fn constants(self) -> SurfaceConstants {
        match self {
            Self::Fao56 => FAO56_DAILY,
            Self::AsceShort => ASCE_SHORT_DAILY,
            Self::AsceTall => ASCE_TALL_DAILY,
        }
    }
}

/// The astronomical quantities of one day of year at one latitude.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DaySun {
    /// Extraterrestrial radiation Ra (MJ m⁻² day⁻¹), FAO-56 eq. 21.
    pub ra_mj: f64,
    /// Daylight hours N (hour), FAO-56 eq. 34.
    pub daylight_h: f64,
}

impl DaySun {
    /// Ra and N for a latitude (rad) and day of year J (FAO-56 eqs. 21–25, 34).
    pub fn new(latitude_rad: f64, day_of_year: u32) -> Self {
        let delta = solar_declination_rad(day_of_year);
        let ws = sunset_hour_angle_rad(latitude_rad, delta);
        Self {
            ra_mj: extraterrestrial_radiation_mj(latitude_rad, day_of_year),
            daylight_h: daylight_hours(ws),
        }
    }
}

/// Daily inputs after the missing-data procedures.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DailyInputs {
    /// Daily maximum air temperature (°C).
    pub tmax_c: f64,
    /// Daily minimum air temperature (°C).
    pub tmin_c: f64,
    /// Actual vapour pressure ea (kPa).
    pub ea_kpa: f64,
    /// Wind speed at 2 m u2 (m/s).
    pub wind_2m_ms: f64,
    /// Incoming solar radiation Rs (MJ m⁻² day⁻¹).
    pub rs_mj: f64,
    /// Clear-sky solar radiation Rso (MJ m⁻² day⁻¹), FAO-56 eq. 36 or 37.
    pub rso_mj: f64,
    /// Soil heat flux G (MJ m⁻² day⁻¹): 0 for days (eq. 42), eq. 43/44 for months.
    pub soil_heat_flux_mj: f64,
}

/// Every intermediate of one daily combination-equation evaluation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DailySteps {
    /// γ (kPa °C⁻¹), FAO-56 eq. 8.
    pub psychrometric_kpa_c: f64,
    /// Tmean (°C), FAO-56 eq. 9.
    pub tmean_c: f64,
    /// Δ at Tmean (kPa °C⁻¹), FAO-56 eq. 13.
    pub slope_kpa_c: f64,
    /// es (kPa), FAO-56 eq. 12.
    pub es_kpa: f64,
    /// Rs/Rso as used in Rnl (after limiting).
    pub relative_shortwave: f64,
    /// Rns (MJ m⁻² day⁻¹), FAO-56 eq. 38.
    pub rns_mj: f64,
    /// Rnl (MJ m⁻² day⁻¹), FAO-56 eq. 39 or ASCE-EWRI eq. 17.
    pub rnl_mj: f64,
    /// Rn (MJ m⁻² day⁻¹), FAO-56 eq. 40.
    pub rn_mj: f64,
    /// Radiation term (mm/day).
    pub radiation_term_mm: f64,
    /// Aerodynamic term (mm/day).
    pub aerodynamic_term_mm: f64,
    /// Reference ET (mm/day), unclipped.
    pub et_mm_day: f64,
}

/// Runs the daily (or monthly) combination equation with every intermediate kept.
///
/// * `pressure_kpa` — P (FAO-56 eq. 7); `inputs` — resolved daily inputs;
/// * `reference` — FAO-56 (eq. 6) or ASCE-EWRI (2005) short/tall (eq. 1).
///
/// FAO-56: Rnl by eq. 39 (σ = 4.903×10⁻⁹, Rs/Rso ≤ 1). ASCE: Rnl by eq. 17
/// (σ = 4.901×10⁻⁹, Rs/Rso 0.3..=1, fcd 0.05..=1). Both: albedo 0.23, Tmean by eq. 9.
#[inline]
pub fn daily_steps(
    pressure_kpa: f64,
    inputs: &DailyInputs,
    reference: DailyReference,
) -> DailySteps {
    daily_steps_with_saturation(
        pressure_kpa,
        inputs,
        saturation_vapour_pressure_kpa(inputs.tmax_c),
        saturation_vapour_pressure_kpa(inputs.tmin_c),
        reference,
    )
}

/// As [`daily_steps`], with e°(Tmax) and e°(Tmin) (kPa, eq. 11) already computed.
#[inline]
pub(crate) fn daily_steps_with_saturation(
    pressure_kpa: f64,
    inputs: &DailyInputs,
    e_tmax_kpa: f64,
    e_tmin_kpa: f64,
    reference: DailyReference,
) -> DailySteps {
    let gamma = psychrometric_constant_kpa_c(pressure_kpa); // Eq. 8
    let tmean = mean_air_temperature_c(inputs.tmax_c, inputs.tmin_c); // Eq. 9
    let slope = saturation_slope_kpa_c(tmean); // Eq. 13
    let es = 0.5 * (e_tmax_kpa + e_tmin_kpa); // Eq. 12
    let ratio =
        relative_shortwave_radiation(inputs.rs_mj, inputs.rso_mj, POLAR_NIGHT_RELATIVE_SHORTWAVE);
    let rns = net_shortwave_radiation_mj(inputs.rs_mj, REFERENCE_ALBEDO); // Eq. 38
    let rnl = match reference {
        DailyReference::Fao56 => {
            net_longwave_radiation_mj(inputs.tmax_c, inputs.tmin_c, inputs.ea_kpa, ratio) // Eq. 39
        }
        DailyReference::AsceShort | DailyReference::AsceTall => {
            asce::net_longwave_radiation_mj(inputs.tmax_c, inputs.tmin_c, inputs.ea_kpa, ratio)
        }
    };
    let rn = net_radiation_mj(rns, rnl); // Eq. 40
    let combination = CombinationInputs {
        slope_kpa_c: slope,
        psychrometric_kpa_c: gamma,
        net_radiation_mj: rn,
        soil_heat_flux_mj: inputs.soil_heat_flux_mj,
        temperature_c: tmean,
        wind_2m_ms: inputs.wind_2m_ms,
        es_kpa: es,
        ea_kpa: inputs.ea_kpa,
    };
    let constants = reference.constants();
    // Same as radiation_term_mm / aerodynamic_term_mm, sharing one reciprocal
    // of the denominator (the hot path of the day series).
    let inv_denominator = 1.0 / (slope + gamma * (1.0 + constants.cd * combination.wind_2m_ms));
    let radiation_term = MM_DAY_PER_MJ_M2_DAY
        * slope
        * (combination.net_radiation_mj - combination.soil_heat_flux_mj)
        * inv_denominator;
    let aerodynamic_term = gamma * constants.cn / (tmean + 273.0)
        * combination.wind_2m_ms
        * (es - combination.ea_kpa)
        * inv_denominator;
    DailySteps {
        psychrometric_kpa_c: gamma,
        tmean_c: tmean,
        slope_kpa_c: slope,
        es_kpa: es,
        relative_shortwave: ratio,
        rns_mj: rns,
        rnl_mj: rnl,
        rn_mj: rn,
        radiation_term_mm: radiation_term,
        aerodynamic_term_mm: aerodynamic_term,
        et_mm_day: radiation_term + aerodynamic_term, // Eq. 6 / ASCE eq. 1
    }
}
