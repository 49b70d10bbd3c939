//! The computation the background worker runs, and the results it caches.
//!
//! The app sends a snapshot of the project to [`crate::worker::Worker`]; the
//! compute function turns it into [`Computed`]. Views read only the cached
//! [`Computed`] of the last finished run; nothing is computed in a frame.

use offtake_core::project::{Project, ValidationContext};
use offtake_io::library::Libraries;

/// Results of one run of the computation chain, cached by the app.
///
/// It holds what the core computes for the current project; fields are added
/// here as each stage of the chain (ET₀, crop curves, water balance, scheme
/// demand, design flows, rotation) is wired in.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Computed {
    /// Data warnings to show (flagged weather, broken canal tree…).
    pub warnings: Vec<String>,
    /// Area commanded by the whole scheme (ha).
    pub scheme_area_ha: f64,
    /// Area commanded by each canal (ha), by canal id, in document order.
    pub canal_area_ha: Vec<(String, f64)>,
}

/// The compute function the worker runs: a project snapshot in, results out.
pub type ComputeFn = Box<dyn FnMut(Project) -> Computed + Send>;

/// What can be computed from the project and the crop library so far:
/// whole-project validation (offtake-core `Project::validate`, as warnings),
/// the canal tree's consistency and commanded areas. The computation chain
/// (ET₀ → balance → demand → design flows) is added here as it lands in
/// offtake-core.
pub fn summarize(project: &Project, libraries: &Libraries) -> Computed {
    let season_days = |crop: &str| libraries.crop(crop).map(|c| c.stages.total_days());
    let ctx = ValidationContext {
        crops: &season_days,
        weather_range: None,
    };
    let mut warnings: Vec<String> = project
        .validate(&ctx)
        .iter()
        .map(ToString::to_string)
        .collect();
    if let Err(e) = project.canals_leaves_first() {
        warnings.push(e.to_string());
    }
    let mut canal_area_ha = Vec::with_capacity(project.canals.len());
    for c in &project.canals {
        match project.commanded_area_ha(&c.id) {
            Ok(a) => canal_area_ha.push((c.id.clone(), a)),
            Err(e) => warnings.push(format!("canal {}: {e}", c.id)),
        }
    }
    for b in &project.blocks {
        if project.canal(&b.canal).is_none() {
            warnings.push(format!(
                "block {} is on canal {:?}, which is not in the project",
                b.id, b.canal
            ));
        }
    }
    warnings.dedup();
    Computed {
        warnings,
        scheme_area_ha: project.scheme_area_ha(),
        canal_area_ha,
    }
}
