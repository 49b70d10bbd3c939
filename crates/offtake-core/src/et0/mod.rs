//! Reference evapotranspiration ET₀ and the FAO-56 Chapter 3 auxiliaries.
//!
//! One function per published equation, named for the quantity with its unit.
//! Sources: FAO Irrigation and Drainage Paper 56 (Allen, Pereira, Raes & Smith
//! 1998); ASCE-EWRI (2005) *The ASCE Standardized Reference Evapotranspiration
//! Equation*; Hargreaves & Samani (1985) as given in FAO-56 eq. 52.
//!
//! * [`atmosphere`] — pressure, γ, vapour pressures (eqs. 7–19, 48);
//! * [`radiation`] — Ra, N, Rs, Rso, Rn (eqs. 21–40, 50);
//! * [`soil_heat`] — G (eqs. 42–46);
//! * [`wind`] — u2 (eq. 47) and the default wind;
//! * [`calendar`] — day of year (Annex 2 Table 2.5).

pub mod atmosphere;
pub mod calendar;
pub mod error;
pub mod radiation;
pub mod soil_heat;
pub mod wind;

pub use error::Et0Error;
