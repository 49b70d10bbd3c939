//! Storage losses: open-water evaporation from the reservoir feeding the
//! scheme, reported beside the headworks demand (the reservoir supplies both;
//! the canals carry only the demand).

use chrono::Datelike;

use super::EngineError;
use super::plantings::complete_range;
use super::weather_prep::PreparedWeather;
use crate::calendar::IrrigationYear;
use crate::openwater::{
    MeyerWater, OpenWaterInputs, meyer_evaporation_mm_day, penman_open_water_mm_day,
    rohwer_evaporation_mm_day,
};
use crate::project::{OpenWaterMethod, Reservoir};
use crate::scheme::storage_losses_m3_day;

/// Reservoir evaporation over the record.
#[derive(Debug, Clone, PartialEq)]
pub struct StorageLosses {
    /// Reservoir name.
    pub reservoir: String,
    /// Method used.
    pub method: OpenWaterMethod,
    /// Open-water evaporation depth (mm/day); condensation days count as 0.
    pub evaporation_mm_day: Vec<f64>,
    /// Loss volume (m³/day) = depth × the month's surface area.
    pub loss_m3_day: Vec<f64>,
    /// Mean yearly loss over the complete irrigation years (m³).
    pub mean_yearly_m3: f64,
}

/// Evaporation losses of `reservoir` on the prepared weather.
///
/// Meyer (1915, coefficient of large deep waters) and Rohwer (1931)
/// use the water temperature of the month where given, else the air
/// temperature; Penman (1948) uses the air temperature and the net radiation
/// over water (albedo 0.08). A negative value (condensation) counts as no
/// loss.
///
/// # Errors
/// [`EngineError::Storage`] naming the day and the cause.
pub fn reservoir_losses(
    reservoir: &Reservoir,
    w: &PreparedWeather,
    years: &[IrrigationYear],
) -> Result<StorageLosses, EngineError> {
    let err = |cause: String| EngineError::Storage {
        reservoir: reservoir.name.clone(),
        cause,
    };
    let mut depth = Vec::with_capacity(w.days());
    for i in 0..w.days() {
        let month0 = w.date(i).month0() as usize;
        let inputs = OpenWaterInputs {
            water_temperature_c: reservoir.water_temperature_c.map(|t| t[month0]),
            air_temperature_c: w.tmean_c[i],
            ea_kpa: w.ea_kpa[i],
            wind_ms: w.wind_ms[i],
            wind_height_m: w.wind_height_m[i],
            pressure_kpa: w.pressure_kpa,
        };
        let e = match reservoir.method {
            OpenWaterMethod::Meyer => meyer_evaporation_mm_day(&inputs, MeyerWater::LargeDeep),
            OpenWaterMethod::Rohwer => rohwer_evaporation_mm_day(&inputs),
            OpenWaterMethod::Penman => penman_open_water_mm_day(w.rn_open_water_mj[i], &inputs),
        }
        .map_err(|e| err(format!("{}: {e}", w.date(i))))?;
        depth.push(e.max(0.0));
    }
    let loss = storage_losses_m3_day(w.start, &reservoir.surface_area_ha, &depth)
        .map_err(|e| err(e.to_string()))?;
    let range = complete_range(w, years);
    let mean_yearly_m3 = loss[range].iter().sum::<f64>() / years.len().max(1) as f64;
    Ok(StorageLosses {
        reservoir: reservoir.name.clone(),
        method: reservoir.method,
        evaporation_mm_day: depth,
        loss_m3_day: loss,
        mean_yearly_m3,
    })
}
