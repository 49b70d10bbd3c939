//! Units a weather file may use, and their conversion to SI.
//!
//! The unit enums and their conversion factors (each with its source) are
//! document types of the computation crate, re-exported here so the
//! importer's paths keep working: see [`offtake_core::weather_import::units`].

pub use offtake_core::weather_import::units::*;
