//! Storage losses: open-water evaporation from the reservoir feeding the
//! scheme, reported beside the headworks demand (the reservoir supplies both;
//! the canals carry only the demand).
//!
//! The three open-water methods (Meyer, Penman, Rohwer) are computed side by
//! side on the same weather so that their spread shows how uncertain the
//! loss is; the reservoir's chosen method gives the scheme's losses. FAO-56's
//! open-water coefficient (Table 12, open water < 2 m deep: Kc 1.05) times
//! ET₀ is given beside them as a plausibility line, not as a fourth method.
//!
//! Scenario temperature change: a scenario's `temperature_shift_c` is added
//! to the reservoir's monthly water-surface temperatures as well as to the
//! air (assumption: over a planning horizon the surface of a reservoir warms
//! with the air, degree for degree; without it a warmer scenario would
//! shrink the vapour-pressure difference and lower evaporation). Where no
//! water temperature is given, the (already shifted) air temperature stands
//! in, as before.

use chrono::Datelike;

use super::EngineError;
use super::plantings::complete_range;
use super::weather_prep::PreparedWeather;
use crate::calendar::IrrigationYear;
use crate::openwater::{
    FAO56_SHALLOW_OPEN_WATER_KC, MeyerWater, OpenWaterInputs, meyer_evaporation_mm_day,
    penman_open_water_mm_day, rohwer_evaporation_mm_day,
};
use crate::project::{OpenWaterMethod, Reservoir};
use crate::scheme::storage_losses_m3_day;

/// The three open-water methods, in the order they are shown.
pub const OPEN_WATER_METHODS: [OpenWaterMethod; 3] = [
    OpenWaterMethod::Meyer,
    OpenWaterMethod::Penman,
    OpenWaterMethod::Rohwer,
];

/// One method's evaporation from the reservoir, as a mean over the complete
/// irrigation years.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MethodLoss {
    /// The method.
    pub method: OpenWaterMethod,
    /// Mean yearly evaporation depth (mm/year); condensation days count as 0.
    pub mean_yearly_mm: f64,
    /// Mean yearly loss volume (m³/year) = depth × the month's surface area.
    pub mean_yearly_m3: f64,
    /// Depth ÷ the station's ET₀ over the same days (–).
    pub ratio_to_et0: f64,
}

/// Reservoir evaporation over the record.
#[derive(Debug, Clone, PartialEq)]
pub struct StorageLosses {
    /// Reservoir name.
    pub reservoir: String,
    /// Method used for the scheme's losses (the reservoir's setting).
    pub method: OpenWaterMethod,
    /// Open-water evaporation depth by the method used (mm/day);
    /// condensation days count as 0.
    pub evaporation_mm_day: Vec<f64>,
    /// Loss volume by the method used (m³/day) = depth × the month's surface area.
    pub loss_m3_day: Vec<f64>,
    /// Mean yearly loss by the method used over the complete irrigation years (m³).
    pub mean_yearly_m3: f64,
    /// Every method side by side (Meyer, Penman, Rohwer), the used one included.
    pub methods: Vec<MethodLoss>,
    /// Mean yearly ET₀ over the complete irrigation years (mm/year).
    pub et0_mean_yearly_mm: f64,
    /// The plausibility line: FAO-56 Table 12 open water (< 2 m deep)
    /// Kc × ET₀, mean yearly depth (mm/year).
    pub kc_line_mean_yearly_mm: f64,
    /// The plausibility line as a volume over the reservoir (m³/year).
    pub kc_line_mean_yearly_m3: f64,
    /// Temperature change added to the water-surface temperatures (°C),
    /// the scenario's air-temperature change.
    pub water_temperature_shift_c: f64,
}

impl StorageLosses {
    /// Smallest and largest mean yearly loss of the three methods (m³/year).
    pub fn spread_m3(&self) -> (f64, f64) {
        self.methods
            .iter()
            .fold((f64::INFINITY, 0.0_f64), |(lo, hi), m| {
                (lo.min(m.mean_yearly_m3), hi.max(m.mean_yearly_m3))
            })
    }

    /// The spread (largest − smallest) as a percentage of the loss by the
    /// method used (%); 0 when that loss is 0.
    pub fn spread_pct_of_used(&self) -> f64 {
        let (lo, hi) = self.spread_m3();
        if self.mean_yearly_m3 > 0.0 && lo.is_finite() {
            100.0 * (hi - lo) / self.mean_yearly_m3
        } else {
            0.0
        }
    }
}

/// Short name of an open-water method, as shown in tables.
pub fn method_label(m: OpenWaterMethod) -> &'static str {
    match m {
        OpenWaterMethod::Meyer => "Meyer (1915)",
        OpenWaterMethod::Penman => "Penman (1948) open water",
        OpenWaterMethod::Rohwer => "Rohwer (1931)",
    }
}

/// Daily evaporation depth (mm/day, condensation as 0) by `method`.
fn depth_series(
    reservoir: &Reservoir,
    w: &PreparedWeather,
    method: OpenWaterMethod,
    water_temperature_shift_c: f64,
) -> Result<Vec<f64>, String> {
    let mut depth = Vec::with_capacity(w.days());
    for i in 0..w.days() {
        let month0 = w.date(i).month0() as usize;
        let inputs = OpenWaterInputs {
            water_temperature_c: reservoir
                .water_temperature_c
                .map(|t| t[month0] + water_temperature_shift_c),
            air_temperature_c: w.tmean_c[i],
            ea_kpa: w.ea_kpa[i],
            wind_ms: w.wind_ms[i],
            wind_height_m: w.wind_height_m[i],
            pressure_kpa: w.pressure_kpa,
        };
        let e = match method {
            OpenWaterMethod::Meyer => meyer_evaporation_mm_day(&inputs, MeyerWater::LargeDeep),
            OpenWaterMethod::Rohwer => rohwer_evaporation_mm_day(&inputs),
            OpenWaterMethod::Penman => penman_open_water_mm_day(w.rn_open_water_mj[i], &inputs),
        }
        .map_err(|e| format!("{} ({}): {e}", w.date(i), method_label(method)))?;
        depth.push(e.max(0.0));
    }
    Ok(depth)
}

/// Evaporation losses of `reservoir` on the prepared weather, by every
/// method, with the reservoir's method giving the scheme's losses.
///
/// Meyer (1915, coefficient of large deep waters) and Rohwer (1931)
/// use the water temperature of the month (plus `water_temperature_shift_c`,
/// the scenario's temperature change) where given, else the air
/// temperature; Penman (1948) uses the air temperature and the net radiation
/// over water (albedo 0.08). A negative value (condensation) counts as no
/// loss.
///
/// # Errors
/// [`EngineError::Storage`] naming the day, the method and the cause.
pub fn reservoir_losses(
    reservoir: &Reservoir,
    w: &PreparedWeather,
    years: &[IrrigationYear],
    water_temperature_shift_c: f64,
) -> Result<StorageLosses, EngineError> {
    let err = |cause: String| EngineError::Storage {
        reservoir: reservoir.name.clone(),
        cause,
    };
    let range = complete_range(w, years);
    let n_years = years.len().max(1) as f64;
    let per_year = |v: &[f64]| v[range.clone()].iter().sum::<f64>() / n_years;
    let et0_mean_yearly_mm = per_year(&w.et0_mm);
    let mut used = None;
    let mut methods = Vec::with_capacity(OPEN_WATER_METHODS.len());
    for method in OPEN_WATER_METHODS {
        let depth = depth_series(reservoir, w, method, water_temperature_shift_c).map_err(err)?;
        let loss = storage_losses_m3_day(w.start, &reservoir.surface_area_ha, &depth)
            .map_err(|e| err(e.to_string()))?;
        let mean_yearly_mm = per_year(&depth);
        methods.push(MethodLoss {
            method,
            mean_yearly_mm,
            mean_yearly_m3: per_year(&loss),
            ratio_to_et0: if et0_mean_yearly_mm > 0.0 {
                mean_yearly_mm / et0_mean_yearly_mm
            } else {
                0.0
            },
        });
        if method == reservoir.method {
            used = Some((depth, loss));
        }
    }
    let (depth, loss) = used.unwrap_or_default();
    // FAO-56 eq. 56 (ETc = Kc ET0) with the Table 12 open-water Kc.
    let kc_depth: Vec<f64> = w
        .et0_mm
        .iter()
        .map(|e| FAO56_SHALLOW_OPEN_WATER_KC * e.max(0.0))
        .collect();
    let kc_loss = storage_losses_m3_day(w.start, &reservoir.surface_area_ha, &kc_depth)
        .map_err(|e| err(e.to_string()))?;
    Ok(StorageLosses {
        reservoir: reservoir.name.clone(),
        method: reservoir.method,
        mean_yearly_m3: per_year(&loss),
        evaporation_mm_day: depth,
        loss_m3_day: loss,
        methods,
        et0_mean_yearly_mm,
        kc_line_mean_yearly_mm: per_year(&kc_depth),
        kc_line_mean_yearly_m3: per_year(&kc_loss),
        water_temperature_shift_c,
    })
}
