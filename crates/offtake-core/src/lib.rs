//! # offtake-core
//!
//! The pure computation core of Offtake: every step from a day of weather to a
//! canal's design flow is a function of its inputs here, with no file access,
//! no printing and no GUI types. The application crates gather inputs, call
//! these functions and present the results.
//!
//! Each published equation is one function named for the quantity it returns,
//! with units in the name (`et0_mm_day`, `wind_2m_ms`) and the source and
//! equation number in its doc comment.
//!
//! Results are planning estimates: canal and structure designs must be checked
//! by a qualified engineer against local codes and measured data.

pub mod balance;
pub mod calendar;
pub mod climate_stats;
pub mod crop;
pub mod engine;
pub mod et0;
pub mod gapfill;
pub mod limits;
pub mod openwater;
pub mod paddy;
pub mod planting;
pub mod project;
pub mod quality;
pub mod rain;
pub mod rotation;
pub mod salinity;
pub mod scheme;
pub mod section;
pub mod soil;
pub mod station_limits;
pub mod stats;
pub mod units;
pub mod weather;
pub mod weather_gen;
pub mod weather_import;
pub mod yield_response;
