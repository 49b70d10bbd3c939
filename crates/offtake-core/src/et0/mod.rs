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
//! * [`calendar`] — day of year (Annex 2 Table 2.5);
//! * [`combination`] — the standardized Penman–Monteith equation (FAO-56 eqs. 6
//!   and 53, ASCE-EWRI 2005 eq. 1) with its constants;
//! * [`daily`], [`hourly`] — a whole step with every intermediate kept;
//! * [`asce`] — what ASCE-EWRI (2005) does differently (σ, fcd, G);
//! * [`hargreaves`] — Hargreaves–Samani (1985), FAO-56 eq. 52;
//! * [`method`] — [`Et0Method`] and its command-line names;
//! * [`series`] — the day-series API with the FAO-56 missing-data procedures.
//!
//! Results are planning estimates; designs built on them must be checked by a
//! qualified engineer.

pub mod atmosphere;
pub mod calendar;
pub mod error;
pub mod radiation;
pub mod soil_heat;
pub mod wind;

pub use error::Et0Error;
pub mod asce;
pub mod combination;
pub mod daily;
pub mod hargreaves;
pub mod hourly;
pub mod method;
pub mod series;

pub use error::UnknownMethodError;
pub use method::Et0Method;
pub use series::{
    DayProcedures, Et0Context, Et0DayResult, Et0Options, HumiditySource, RadiationSource,
    WindSource, et0_daily_series, et0_day,
};
