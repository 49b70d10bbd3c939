//! The Penman–Monteith combination equation in its standardized form.
//!
//! FAO-56 eq. 6 (daily, p. 24) and eq. 53 (hourly, p. 74) and ASCE-EWRI (2005)
//! eq. 1 are one formula with different numerator and denominator constants:
//!
//! ET = [0.408 Δ (Rn − G) + γ (Cn/(T + 273)) u2 (es − ea)] / [Δ + γ (1 + Cd u2)]
//!
//! This module holds that formula, split into its radiation and aerodynamic
//! terms (as the FAO-56 worked examples print them), and the constants of each
//! reference surface and time step as named data.

use crate::units::MM_DAY_PER_MJ_M2_DAY;

/// Numerator constant Cn (K mm s³ Mg⁻¹ per time step) and denominator constant Cd (s m⁻¹)
/// of the standardized combination equation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfaceConstants {
    /// Cn, numerator constant for the reference type and time step.
    pub cn: f64,
    /// Cd, denominator constant for the reference type and time step.
    pub cd: f64,
}

/// FAO-56 grass reference, daily or monthly: Cn = 900, Cd = 0.34 (FAO-56 eq. 6, p. 24).
pub const FAO56_DAILY: SurfaceConstants = SurfaceConstants {
    cn: 900.0,
    cd: 0.34,
};
/// FAO-56 grass reference, hourly: Cn = 37, Cd = 0.34 (FAO-56 eq. 53, p. 74).
pub const FAO56_HOURLY: SurfaceConstants = SurfaceConstants { cn: 37.0, cd: 0.34 };
/// ASCE-EWRI (2005) Table 1, short reference ETos, daily: Cn = 900, Cd = 0.34.
pub const ASCE_SHORT_DAILY: SurfaceConstants = SurfaceConstants {
    cn: 900.0,
    cd: 0.34,
};
/// ASCE-EWRI (2005) Table 1, tall reference ETrs, daily: Cn = 1600, Cd = 0.38.
pub const ASCE_TALL_DAILY: SurfaceConstants = SurfaceConstants {
    cn: 1600.0,
    cd: 0.38,
};
/// ASCE-EWRI (2005) Table 1, short reference, hourly daytime (Rn > 0): Cn = 37, Cd = 0.24.
pub const ASCE_SHORT_HOURLY_DAY: SurfaceConstants = SurfaceConstants { cn: 37.0, cd: 0.24 };
/// ASCE-EWRI (2005) Table 1, short reference, hourly night-time: Cn = 37, Cd = 0.96.
pub const ASCE_SHORT_HOURLY_NIGHT: SurfaceConstants = SurfaceConstants { cn: 37.0, cd: 0.96 };
/// ASCE-EWRI (2005) Table 1, tall reference, hourly daytime (Rn > 0): Cn = 66, Cd = 0.25.
pub const ASCE_TALL_HOURLY_DAY: SurfaceConstants = SurfaceConstants { cn: 66.0, cd: 0.25 };
/// ASCE-EWRI (2005) Table 1, tall reference, hourly night-time: Cn = 66, Cd = 1.7.
pub const ASCE_TALL_HOURLY_NIGHT: SurfaceConstants = SurfaceConstants { cn: 66.0, cd: 1.7 };

/// Inputs of the combination equation, all for the same time step.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CombinationInputs {
    /// Δ, slope of the vapour pressure curve at the mean temperature (kPa °C⁻¹), FAO-56 eq. 13.
    pub slope_kpa_c: f64,
    /// γ, psychrometric constant (kPa °C⁻¹), FAO-56 eq. 8.
    pub psychrometric_kpa_c: f64,
    /// Rn, net radiation at the crop surface (MJ m⁻² per time step), FAO-56 eq. 40.
    pub net_radiation_mj: f64,
    /// G, soil heat flux density (MJ m⁻² per time step), FAO-56 eqs. 42–46.
    pub soil_heat_flux_mj: f64,
    /// T, mean air temperature at 2 m (°C): (Tmax + Tmin)/2 daily, Thr hourly.
    pub temperature_c: f64,
    /// u2, wind speed at 2 m (m/s), FAO-56 eq. 47.
    pub wind_2m_ms: f64,
    /// es, saturation vapour pressure (kPa), FAO-56 eq. 12 (daily) or e°(Thr) (hourly).
    pub es_kpa: f64,
    /// ea, actual vapour pressure (kPa), FAO-56 eqs. 14–19, 48 or 54.
    pub ea_kpa: f64,
}

impl CombinationInputs {
    fn denominator(&self, surface: SurfaceConstants) -> f64 {
        self.slope_kpa_c + self.psychrometric_kpa_c * (1.0 + surface.cd * self.wind_2m_ms)
    }
}

/// Radiation term of the combination equation (mm per time step).
///
/// 0.408 Δ (Rn − G) / [Δ + γ (1 + Cd u2)] — the first part of FAO-56 eq. 6 / 53
/// and ASCE-EWRI (2005) eq. 1, printed separately in FAO-56 Examples 17–20.
/// 0.408 = 1/λ, λ = 2.45 MJ kg⁻¹ (FAO-56 eq. 20).
#[inline]
pub fn radiation_term_mm(inputs: &CombinationInputs, surface: SurfaceConstants) -> f64 {
    MM_DAY_PER_MJ_M2_DAY * inputs.slope_kpa_c * (inputs.net_radiation_mj - inputs.soil_heat_flux_mj)
        / inputs.denominator(surface)
}

/// Aerodynamic term of the combination equation (mm per time step).
///
/// γ (Cn/(T + 273)) u2 (es − ea) / [Δ + γ (1 + Cd u2)] — the second part of
/// FAO-56 eq. 6 / 53 and ASCE-EWRI (2005) eq. 1.
#[inline]
pub fn aerodynamic_term_mm(inputs: &CombinationInputs, surface: SurfaceConstants) -> f64 {
    inputs.psychrometric_kpa_c * surface.cn / (inputs.temperature_c + 273.0)
        * inputs.wind_2m_ms
        * (inputs.es_kpa - inputs.ea_kpa)
        / inputs.denominator(surface)
}

/// Reference evapotranspiration from the standardized combination equation (mm per time step).
///
/// ET = [0.408 Δ (Rn − G) + γ (Cn/(T + 273)) u2 (es − ea)] / [Δ + γ (1 + Cd u2)].
/// FAO-56 eq. 6 (p. 24) with [`FAO56_DAILY`], eq. 53 (p. 74) with
/// [`FAO56_HOURLY`]; ASCE-EWRI (2005) eq. 1 with its Table 1 constants.
///
/// The result is not clipped: it may be slightly negative when Rn − G is
/// negative and the air is near saturation (night-time hours, polar winter).
#[inline]
pub fn combination_et_mm(inputs: &CombinationInputs, surface: SurfaceConstants) -> f64 {
    radiation_term_mm(inputs, surface) + aerodynamic_term_mm(inputs, surface) // Eq. 6 / 53
}

/// FAO-56 Penman–Monteith reference ET₀ for a day, month or ten-day period (mm/day).
///
/// FAO-56 eq. 6 (p. 24): ET₀ = [0.408 Δ (Rn − G) + γ (900/(T + 273)) u2 (es − ea)]
/// / [Δ + γ (1 + 0.34 u2)]. For monthly steps G comes from eq. 43 or 44.
#[inline]
pub fn et0_penman_monteith_mm_day(inputs: &CombinationInputs) -> f64 {
    combination_et_mm(inputs, FAO56_DAILY) // Eq. 6
}

/// FAO-56 Penman–Monteith reference ET₀ for an hour (mm/hour).
///
/// FAO-56 eq. 53 (p. 74): ET₀ = [0.408 Δ (Rn − G) + γ (37/(Thr + 273)) u2 (e°(Thr) − ea)]
/// / [Δ + γ (1 + 0.34 u2)].
#[inline]
pub fn et0_penman_monteith_hourly_mm(inputs: &CombinationInputs) -> f64 {
    combination_et_mm(inputs, FAO56_HOURLY) // Eq. 53
}
