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
    /// Library Kc curves of the plantings' crops (FAO-56 eq. 66).
    pub kc_curves: Vec<KcCurveResult>,
    /// Area commanded by the whole scheme (ha).
    pub scheme_area_ha: f64,
    /// Area commanded by each canal (ha), by canal id, in document order.
    pub canal_area_ha: Vec<(String, f64)>,
}

/// The library Kc curve of one crop over one season length.
#[derive(Debug, Clone, PartialEq)]
pub struct KcCurveResult {
    /// Crop id in the library.
    pub crop: String,
    /// Crop display name.
    pub crop_name: String,
    /// Season length used (days): the planting's override or the library's.
    pub season_days: u32,
    /// Ids of the plantings that use this curve.
    pub plantings: Vec<String>,
    /// Kc on days 1..=season_days (FAO-56 eq. 66, library values before the
    /// climate adjustment of eq. 62/65).
    pub kc: Vec<f64>,
    /// Last day of the initial, development, mid and late stages.
    pub stage_ends: [u32; 4],
}

/// Library Kc curves of every planting's crop, one per (crop, season length).
pub fn kc_curves(project: &Project, libraries: &Libraries) -> (Vec<KcCurveResult>, Vec<String>) {
    use offtake_core::crop::kc_curve::KcCurve;
    let mut out: Vec<KcCurveResult> = Vec::new();
    let mut problems = Vec::new();
    for p in &project.plantings {
        let Some(crop) = libraries.crop(&p.crop) else {
            continue;
        };
        let days = p
            .season_length_days
            .unwrap_or_else(|| crop.stages.total_days());
        if let Some(existing) = out
            .iter_mut()
            .find(|c| c.crop == crop.id && c.season_days == days)
        {
            existing.plantings.push(p.id.clone());
            continue;
        }
        let curve = crop
            .stages
            .scaled_to(days)
            .and_then(|lengths| KcCurve::new(lengths, crop.kc));
        match curve {
            Ok(curve) => {
                let l = curve.lengths;
                let ends = [
                    l.ini_days,
                    l.ini_days + l.dev_days,
                    l.ini_days + l.dev_days + l.mid_days,
                    l.total_days(),
                ];
                out.push(KcCurveResult {
                    crop: crop.id.clone(),
                    crop_name: crop.name.clone(),
                    season_days: days,
                    plantings: vec![p.id.clone()],
                    kc: curve.daily(),
                    stage_ends: ends,
                });
            }
            Err(e) => problems.push(format!("planting {:?}: {e}", p.id)),
        }
    }
    (out, problems)
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
    let (kc_curves, kc_problems) = kc_curves(project, libraries);
    warnings.extend(kc_problems);
    warnings.dedup();
    Computed {
        warnings,
        kc_curves,
        scheme_area_ha: project.scheme_area_ha(),
        canal_area_ha,
    }
}
