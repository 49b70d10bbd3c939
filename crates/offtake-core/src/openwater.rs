//! Evaporation from open water (storage reservoirs feeding a scheme).
//!
//! * Meyer (1915) and Rohwer (1931) mass-transfer formulas in the SI handbook
//!   form of Subramanya, K. (2009), *Engineering Hydrology*, 3rd ed., Tata
//!   McGraw-Hill, New Delhi, §3.5, eq. 3.3 (Meyer) and the Rohwer formula that follows it, p. 63 — vapour pressures in
//!   mm of mercury, wind in km/h — with the 1/7 power law for wind at another
//!   height (§3.5, eq. 3.5, [MEMORY] equation number).
//! * Penman (1948) open-water evaporation in the form of Shuttleworth, W.J.
//!   (1993), "Evaporation", chapter 4 in Maidment, D.R. (ed.), *Handbook of
//!   Hydrology*, McGraw-Hill, New York: E = Δ/(Δ + γ) Rn/λ + γ/(Δ + γ) · 6.43
//!   (1 + 0.536 u2)(es − ea)/λ, open-water albedo 0.08 ([MEMORY] equation numbers
//!   4.2.30–4.2.31; check against the printed handbook).
//!
//! The public functions take SI inputs (°C, kPa, m/s, m, MJ m⁻² day⁻¹) and
//! convert internally: 1 mmHg = 101.325/760 kPa (FAO-56 Annex 1, p. 209, prints
//! 0.1333 kPa) and
//! 1 m/s = 3.6 km/h.
//!
//! Water-surface temperature is an input (monthly values are usual); when it
//! is not known the air temperature is used instead (documented fallback: it
//! overstates evaporation in spring and understates it in autumn for deep
//! reservoirs, whose surface lags the air).
//!
//! Results are planning estimates.

use thiserror::Error;

use crate::et0::atmosphere::{
    psychrometric_constant_kpa_c, saturation_slope_kpa_c, saturation_vapour_pressure_kpa,
};

/// kPa in one millimetre of mercury: 101.325 kPa / 760 = 0.133322 kPa.
///
/// FAO-56 Annex 1 (p. 209) prints this rounded as 1 mmHg = 0.1333 kPa. The
/// exact definition (1 atm = 101.325 kPa = 760 mmHg, also FAO-56 Annex 1) is
/// used because it reproduces the tabulated e_w of the handbook at 35–40 °C
/// (55.32 mm Hg at 40 °C; 0.1333 would give 55.33). The two differ by 0.017 %.
pub const KPA_PER_MMHG: f64 = 101.325 / 760.0;
/// km/h in one m/s.
pub const KMH_PER_MS: f64 = 3.6;
/// Height of the wind in Meyer's formula (m): "about 9 m above ground" (Subramanya p. 63).
pub const MEYER_WIND_HEIGHT_M: f64 = 9.0;
/// Height of the "ground-level" wind in Rohwer's formula (m): taken as 0.6 m (Subramanya p. 63).
pub const ROHWER_WIND_HEIGHT_M: f64 = 0.6;
/// Albedo of open water (–), Shuttleworth (1993) in Maidment's Handbook of Hydrology.
pub const OPEN_WATER_ALBEDO: f64 = 0.08;
/// FAO-56 Table 12 (pp. 110–114), "Open water, < 2 m depth or in subhumid climates
/// or tropics": Kc mid = Kc end = 1.05 (–). Kc × ET₀ (FAO-56 eq. 56) serves
/// as a plausibility line beside the open-water formulas, not as a method of
/// its own (a deep reservoir stores and releases heat, which Kc ignores).
pub const FAO56_SHALLOW_OPEN_WATER_KC: f64 = 1.05;

/// Errors of the open-water formulas.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum OpenWaterError {
    /// A value that must be a finite number was NaN or infinite.
    #[error("{quantity} is not a finite number (found {value})")]
    NotFinite {
        /// The quantity and its unit.
        quantity: &'static str,
        /// The value found.
        value: f64,
    },
    /// A height that must be positive was zero or negative.
    #[error("{quantity} must be above 0 m (found {value_m} m)")]
    NonPositiveHeight {
        /// Which height.
        quantity: &'static str,
        /// The value found (m).
        value_m: f64,
    },
    /// A value that must not be negative was negative.
    #[error("{quantity} must not be negative (found {value})")]
    Negative {
        /// The quantity and its unit.
        quantity: &'static str,
        /// The value found.
        value: f64,
    },
}

/// Meyer's coefficient K_M (Subramanya 2009, p. 63).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MeyerWater {
    /// Large, deep waters: K_M = 0.36.
    LargeDeep,
    /// Small, shallow waters: K_M = 0.50.
    SmallShallow,
}

impl MeyerWater {
    /// K_M (mm day⁻¹ mmHg⁻¹).
    pub fn coefficient(self) -> f64 {
        match self {
            Self::LargeDeep => 0.36,
            Self::SmallShallow => 0.50,
        }
    }
}

/// Converts kPa to mm of mercury (1 mmHg = 101.325/760 kPa, see [`KPA_PER_MMHG`]).
pub fn kpa_to_mmhg(kpa: f64) -> f64 {
    kpa / KPA_PER_MMHG
}

/// Converts mm of mercury to kPa (1 mmHg = 101.325/760 kPa, see [`KPA_PER_MMHG`]).
pub fn mmhg_to_kpa(mmhg: f64) -> f64 {
    mmhg * KPA_PER_MMHG
}

/// Converts m/s to km/h.
pub fn ms_to_kmh(ms: f64) -> f64 {
    ms * KMH_PER_MS
}

/// Converts km/h to m/s.
pub fn kmh_to_ms(kmh: f64) -> f64 {
    kmh / KMH_PER_MS
}

/// Saturation vapour pressure over water at temperature T, in mm of mercury.
///
/// FAO-56 eq. 11 (kPa) divided by [`KPA_PER_MMHG`]. Matches the
/// e_w column of Subramanya's Table 3.3 to its two decimals ([MEMORY] for the table).
pub fn saturation_vapour_pressure_mmhg(temperature_c: f64) -> f64 {
    kpa_to_mmhg(saturation_vapour_pressure_kpa(temperature_c))
}

/// Wind speed at another height by the 1/7 power law (m/s or any speed unit).
///
/// * `wind` — speed at `from_height_m`; `to_height_m` — target height (m).
///
/// u_h = C h^(1/7) (Subramanya 2009 §3.5, eq. 3.5 [MEMORY eq. no.]), so
/// u_to = u_from (to/from)^(1/7). Meant for heights of about 0.5–20 m over
/// open ground or water.
///
/// # Errors
/// [`OpenWaterError::NonPositiveHeight`] for heights ≤ 0; [`OpenWaterError::NotFinite`].
pub fn wind_power_law(
    wind: f64,
    from_height_m: f64,
    to_height_m: f64,
) -> Result<f64, OpenWaterError> {
    finite("wind", wind)?;
    for (quantity, h) in [
        ("from_height_m", from_height_m),
        ("to_height_m", to_height_m),
    ] {
        finite(quantity, h)?;
        if h <= 0.0 {
            return Err(OpenWaterError::NonPositiveHeight {
                quantity,
                value_m: h,
            });
        }
    }
    Ok(wind * (to_height_m / from_height_m).powf(1.0 / 7.0)) // Eq. 3.5
}

/// Meyer (1915) lake evaporation, handbook units (mm/day).
///
/// * `ew_mmhg` — saturation vapour pressure at the water-surface temperature (mm Hg);
/// * `ea_mmhg` — actual vapour pressure of the air (mm Hg);
/// * `wind_9m_kmh` — monthly mean wind at about 9 m (km/h); `water` — K_M.
///
/// Subramanya (2009) eq. 3.3, p. 63: E_L = K_M (e_w − e_a)(1 + u9/16).
pub fn meyer_evaporation_handbook_mm_day(
    ew_mmhg: f64,
    ea_mmhg: f64,
    wind_9m_kmh: f64,
    water: MeyerWater,
) -> f64 {
    water.coefficient() * (ew_mmhg - ea_mmhg) * (1.0 + wind_9m_kmh / 16.0) // Eq. 3.3
}

/// Rohwer (1931) lake evaporation, handbook units (mm/day).
///
/// * `pressure_mmhg` — mean barometric reading p_a (mm Hg);
/// * `wind_ground_kmh` — mean wind "at ground level", taken at 0.6 m (km/h);
/// * `ew_mmhg`, `ea_mmhg` — as in Meyer's formula (mm Hg).
///
/// Subramanya (2009) p. 63 (Rohwer formula): E_L = 0.771 (1.465 − 0.000732 p_a)(0.44 + 0.0733 u0)(e_w − e_a).
pub fn rohwer_evaporation_handbook_mm_day(
    pressure_mmhg: f64,
    wind_ground_kmh: f64,
    ew_mmhg: f64,
    ea_mmhg: f64,
) -> f64 {
    0.771
        * (1.465 - 0.000_732 * pressure_mmhg)
        * (0.44 + 0.0733 * wind_ground_kmh)
        * (ew_mmhg - ea_mmhg) // Rohwer (1931)
}

/// SI inputs for one day (or month) of open-water evaporation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OpenWaterInputs {
    /// Water-surface temperature (°C); `None` falls back to the air temperature.
    pub water_temperature_c: Option<f64>,
    /// Mean air temperature (°C).
    pub air_temperature_c: f64,
    /// Actual vapour pressure of the air (kPa).
    pub ea_kpa: f64,
    /// Mean wind speed (m/s) at `wind_height_m`.
    pub wind_ms: f64,
    /// Height of the wind measurement (m).
    pub wind_height_m: f64,
    /// Atmospheric pressure (kPa), e.g. FAO-56 eq. 7.
    pub pressure_kpa: f64,
}

impl OpenWaterInputs {
    fn validate(&self) -> Result<(), OpenWaterError> {
        finite("air_temperature_c", self.air_temperature_c)?;
        if let Some(t) = self.water_temperature_c {
            finite("water_temperature_c", t)?;
        }
        for (q, v) in [
            ("ea_kpa", self.ea_kpa),
            ("wind_ms", self.wind_ms),
            ("pressure_kpa", self.pressure_kpa),
        ] {
            finite(q, v)?;
            if v < 0.0 {
                return Err(OpenWaterError::Negative {
                    quantity: q,
                    value: v,
                });
            }
        }
        Ok(())
    }

    fn surface_temperature_c(&self) -> f64 {
        self.water_temperature_c.unwrap_or(self.air_temperature_c)
    }
}

/// Meyer (1915) lake evaporation from SI inputs (mm/day).
///
/// Converts ew (at the water-surface temperature, or air temperature when
/// missing) and ea to mm Hg, the wind to km/h at 9 m by the 1/7 power law, then
/// applies [`meyer_evaporation_handbook_mm_day`]. Condensation (ea > ew) gives a
/// negative value, returned as is.
///
/// # Errors
/// [`OpenWaterError`] for non-finite or negative inputs and bad heights.
pub fn meyer_evaporation_mm_day(
    inputs: &OpenWaterInputs,
    water: MeyerWater,
) -> Result<f64, OpenWaterError> {
    inputs.validate()?;
    let u9 = wind_power_law(inputs.wind_ms, inputs.wind_height_m, MEYER_WIND_HEIGHT_M)?;
    Ok(meyer_evaporation_handbook_mm_day(
        saturation_vapour_pressure_mmhg(inputs.surface_temperature_c()),
        kpa_to_mmhg(inputs.ea_kpa),
        ms_to_kmh(u9),
        water,
    ))
}

/// Rohwer (1931) lake evaporation from SI inputs (mm/day).
///
/// As [`meyer_evaporation_mm_day`], with the wind taken to 0.6 m by the 1/7
/// power law and the pressure converted to mm Hg.
///
/// # Errors
/// [`OpenWaterError`] for non-finite or negative inputs and bad heights.
pub fn rohwer_evaporation_mm_day(inputs: &OpenWaterInputs) -> Result<f64, OpenWaterError> {
    inputs.validate()?;
    let u0 = wind_power_law(inputs.wind_ms, inputs.wind_height_m, ROHWER_WIND_HEIGHT_M)?;
    Ok(rohwer_evaporation_handbook_mm_day(
        kpa_to_mmhg(inputs.pressure_kpa),
        ms_to_kmh(u0),
        saturation_vapour_pressure_mmhg(inputs.surface_temperature_c()),
        kpa_to_mmhg(inputs.ea_kpa),
    ))
}

/// Latent heat of vaporization λ (MJ kg⁻¹) at temperature T (°C).
///
/// λ = 2.501 − 0.002361 T: Shuttleworth (1993) in Maidment's Handbook of
/// Hydrology, and FAO-56 Annex 3 eq. 3-1 (p. 223).
pub fn latent_heat_mj_kg(temperature_c: f64) -> f64 {
    2.501 - 0.002_361 * temperature_c
}

/// Penman (1948) wind function for open water (mm day⁻¹ kPa⁻¹).
///
/// f(u) = 6.43 (1 + 0.536 u2), u2 in m/s at 2 m; with (es − ea) in kPa and
/// division by λ (MJ kg⁻¹) it gives mm/day (Shuttleworth 1993).
pub fn penman_wind_function(wind_2m_ms: f64) -> f64 {
    6.43 * (1.0 + 0.536 * wind_2m_ms)
}

/// Penman (1948) open-water evaporation (mm/day), Shuttleworth (1993) form.
///
/// * `net_radiation_mj` — net radiation over the water Rn (MJ m⁻² day⁻¹),
///   computed with albedo 0.08 ([`OPEN_WATER_ALBEDO`]), less any change in heat
///   stored in the water body if known;
/// * `inputs` — air temperature, ea, wind (converted to 2 m by the 1/7 power
///   law), pressure. Penman's method does not need the water temperature; Δ,
///   λ and es are taken at the air temperature.
///
/// E = [Δ/(Δ + γ)] Rn/λ + [γ/(Δ + γ)] · 6.43 (1 + 0.536 u2)(es − ea)/λ.
///
/// # Errors
/// [`OpenWaterError`] for non-finite or negative inputs and bad heights.
pub fn penman_open_water_mm_day(
    net_radiation_mj: f64,
    inputs: &OpenWaterInputs,
) -> Result<f64, OpenWaterError> {
    inputs.validate()?;
    finite("net_radiation_mj", net_radiation_mj)?;
    let t = inputs.air_temperature_c;
    let u2 = wind_power_law(inputs.wind_ms, inputs.wind_height_m, 2.0)?;
    let delta = saturation_slope_kpa_c(t);
    let gamma = psychrometric_constant_kpa_c(inputs.pressure_kpa);
    let lambda = latent_heat_mj_kg(t);
    let deficit = saturation_vapour_pressure_kpa(t) - inputs.ea_kpa;
    Ok(delta / (delta + gamma) * net_radiation_mj / lambda
        + gamma / (delta + gamma) * penman_wind_function(u2) * deficit / lambda)
}

fn finite(quantity: &'static str, value: f64) -> Result<f64, OpenWaterError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(OpenWaterError::NotFinite { quantity, value })
    }
}
