//! Hargreaves–Samani (1985) reference ET₀ from temperature and Ra.

/// Hargreaves–Samani (1985) reference evapotranspiration (mm/day).
///
/// * `tmax_c`, `tmin_c` — daily (or mean monthly) maximum and minimum air temperature (°C);
/// * `ra_mm_day` — extraterrestrial radiation expressed as evaporation (mm/day),
///   i.e. 0.408 × Ra in MJ m⁻² day⁻¹ (FAO-56 eq. 20).
///
/// FAO-56 eq. 52 (p. 64): ET₀ = 0.0023 (Tmean + 17.8)(Tmax − Tmin)^0.5 Ra, with
/// Tmean = (Tmax + Tmin)/2. Hargreaves, G.H. & Samani, Z.A. (1985), Applied
/// Engineering in Agriculture 1(2): 96–99.
///
/// Validity: FAO-56 recommends it only where data for Penman–Monteith are
/// missing; it tends to under-predict at u2 > 3 m/s and over-predict in humid
/// climates. A negative temperature range gives 0 (no evaporative demand from
/// the range term); the day-series API rejects Tmin > Tmax before this point.
/// With Tmean < −17.8 °C the formula turns negative; the series clips ET₀ at 0.
#[inline]
pub fn et0_hargreaves_samani_mm_day(tmax_c: f64, tmin_c: f64, ra_mm_day: f64) -> f64 {
    let tmean_c = 0.5 * (tmax_c + tmin_c);
    0.0023 * (tmean_c + 17.8) * (tmax_c - tmin_c).max(0.0).sqrt() * ra_mm_day // Eq. 52
}
