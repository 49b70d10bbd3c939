//! The computation the background worker runs, and the results it caches.
//!
//! The app sends a snapshot of the project to [`crate::worker::Worker`]; the
//! compute function turns it into [`Computed`]. Views read only the cached
//! [`Computed`] of the last finished run; nothing is computed in a frame.

/// Results of one run of the computation chain, cached by the app.
///
/// It holds what the core computes for the current project; fields are added
/// here as each stage of the chain (ET₀, crop curves, water balance, scheme
/// demand, design flows, rotation) is wired in.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Computed {
    /// Data warnings to show (flagged weather, plantings outside the record…).
    pub warnings: Vec<String>,
}
