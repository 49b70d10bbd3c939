//! The computation the background worker runs, and the results it caches.
//!
//! The app sends a snapshot of the project to [`crate::worker::Worker`]; the
//! compute function turns it into [`Computed`]. Views read only the cached
//! [`Computed`] of the last finished run; nothing is computed in a frame.

use std::path::PathBuf;

use chrono::NaiveDate;
use offtake_core::project::{Project, ValidationContext};
use offtake_core::weather::WeatherDay;
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
    /// Daily ET₀ and rain of the weather series, if one is attached and readable.
    pub weather: Option<WeatherResult>,
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

/// What the worker receives: an owned copy of the project and the file it
/// lives in (weather paths are relative to the project's folder).
#[derive(Debug, Clone, PartialEq)]
pub struct Snapshot {
    /// The project as it is after the last edit.
    pub project: Project,
    /// The project file, if the project was opened or saved.
    pub project_path: Option<PathBuf>,
}

/// The compute function the worker runs: a snapshot in, results out.
pub type ComputeFn = Box<dyn FnMut(Snapshot) -> Computed + Send>;

/// Daily ET₀ and rain of the project's weather series.
#[derive(Debug, Clone, PartialEq)]
pub struct WeatherResult {
    /// The weather file read.
    pub file: PathBuf,
    /// Dates of the accepted records.
    pub dates: Vec<NaiveDate>,
    /// ET₀ per day (mm/day); `None` where it cannot be computed.
    pub et0_mm: Vec<Option<f64>>,
    /// Rain per day (mm); `None` where missing.
    pub rain_mm: Vec<Option<f64>>,
    /// Days whose ET₀ used a FAO-56 missing-data procedure (estimated Rs,
    /// ea from Tmin, default wind).
    pub estimated_days: usize,
    /// Day-of-year climatology of daily ET₀ (10/50/90 % non-exceedance,
    /// Weibull positions), from offtake-core `climate_stats`; empty if the
    /// record has no complete year.
    pub et0_band: Vec<offtake_core::climate_stats::DayOfYearBand>,
}

/// Day-of-year ET₀ bands of a series whose dates may have gaps: the gaps
/// become missing days of a consecutive series.
fn et0_band(
    dates: &[NaiveDate],
    et0: &[Option<f64>],
) -> Result<Vec<offtake_core::climate_stats::DayOfYearBand>, String> {
    use offtake_core::calendar::YearStart;
    use offtake_core::climate_stats::{DailySeries, series_statistics};
    let (Some(&first), Some(&last)) = (dates.first(), dates.last()) else {
        return Ok(Vec::new());
    };
    let n = (last - first).num_days() as usize + 1;
    let mut values = vec![None; n];
    for (d, v) in dates.iter().zip(et0) {
        if let Some(slot) = values.get_mut((*d - first).num_days() as usize) {
            *slot = *v;
        }
    }
    let series = DailySeries::new(first, &values, None).map_err(|e| e.to_string())?;
    let stats = series_statistics(&series, YearStart::JANUARY, &[]).map_err(|e| e.to_string())?;
    Ok(stats.day_of_year)
}

/// A weather file read once and kept while its path and modification time
/// stay the same.
struct WeatherCache {
    key: Option<(PathBuf, Option<std::time::SystemTime>, String)>,
    days: Result<Vec<WeatherDay>, String>,
    warnings: Vec<String>,
    /// ET₀ results of the last run and the station and method they used:
    /// edits of the scheme do not change them, so they are reused.
    et0: Option<(String, WeatherResult, Vec<String>)>,
}

/// The compute function the app runs by default: [`summarize`] plus the
/// daily ET₀ of the weather series (read from file, cached between runs).
pub fn default_compute(libraries: std::sync::Arc<Libraries>) -> ComputeFn {
    let mut cache = WeatherCache {
        key: None,
        days: Err(String::new()),
        warnings: Vec::new(),
        et0: None,
    };
    Box::new(move |snap: Snapshot| {
        // The project's own crops and soils replace library entries with the same id.
        let libraries = if snap.project.user_crops.is_empty() && snap.project.user_soils.is_empty()
        {
            std::sync::Arc::clone(&libraries)
        } else {
            std::sync::Arc::new(libraries.for_project(&snap.project))
        };
        let mut out = summarize(&snap.project, &libraries);
        // The project's own crops and soils are checked like library files.
        for c in &snap.project.user_crops {
            if let Err(e) = c.validate() {
                out.warnings.push(format!("my crop {}: {e}", c.id));
            }
        }
        for s in &snap.project.user_soils {
            if let Err(e) = s.validate() {
                out.warnings.push(format!("my soil {}: {e}", s.id));
            }
        }
        if let Some(w) = weather(&snap, &mut cache) {
            match w {
                Ok((result, warnings)) => {
                    out.warnings.extend(warnings);
                    out.weather = Some(result);
                }
                Err(e) => out.warnings.push(e),
            }
        }
        out
    })
}

fn weather(
    snap: &Snapshot,
    cache: &mut WeatherCache,
) -> Option<Result<(WeatherResult, Vec<String>), String>> {
    use offtake_core::et0::series::{
        Et0Options, HumiditySource, RadiationSource, WindSource, et0_daily_series,
    };
    use offtake_core::weather::StationSite;
    use offtake_io::weather::load_project_weather;

    let p = &snap.project;
    if p.weather.path.trim().is_empty() {
        return None;
    }
    // An unsaved project resolves its weather path against the current folder.
    let project_path = snap
        .project_path
        .clone()
        .unwrap_or_else(|| PathBuf::from("unsaved.ron"));
    let file = offtake_io::project_file::weather_path(&project_path, p);
    let modified = std::fs::metadata(&file).and_then(|m| m.modified()).ok();
    // The saved import settings are part of the key: a new mapping re-reads.
    let key = (file.clone(), modified, format!("{:?}", p.weather.import));
    if cache.key.as_ref() != Some(&key) {
        cache.key = Some(key);
        cache.et0 = None;
        match load_project_weather(&project_path, p) {
            Ok(w) => {
                cache.warnings = w.series.warnings.iter().map(ToString::to_string).collect();
                cache.days = Ok(w.series.days);
            }
            Err(e) => {
                cache.warnings = Vec::new();
                cache.days = Err(format!("weather file: {e}"));
            }
        }
    }
    let days = match &cache.days {
        Ok(d) => d,
        Err(e) => return Some(Err(e.clone())),
    };
    let site = StationSite {
        latitude_deg: p.weather.latitude_deg,
        elevation_m: p.weather.elevation_m,
        wind_height_m: p.weather.wind_height_m,
    };
    let method = match p.options.et0_method {
        offtake_core::project::Et0Method::PenmanMonteith => {
            offtake_core::et0::method::Et0Method::PenmanMonteith
        }
        offtake_core::project::Et0Method::Hargreaves => {
            offtake_core::et0::method::Et0Method::HargreavesSamani
        }
        offtake_core::project::Et0Method::AsceShort => {
            offtake_core::et0::method::Et0Method::AsceShort
        }
        offtake_core::project::Et0Method::AsceTall => {
            offtake_core::et0::method::Et0Method::AsceTall
        }
    };
    let options = Et0Options {
        method,
        ..Et0Options::default()
    };
    let et0_key = format!("{site:?} {options:?}");
    if let Some((k, result, warnings)) = &cache.et0
        && *k == et0_key
    {
        return Some(Ok((result.clone(), warnings.clone())));
    }
    let results = match et0_daily_series(&site, days, &options) {
        Ok(r) => r,
        Err(e) => return Some(Err(format!("ET₀ of the weather series: {e}"))),
    };
    let mut warnings = cache.warnings.clone();
    let not_computed = results.iter().filter(|r| r.et0_mm.is_none()).count();
    if not_computed > 0 {
        warnings.push(format!(
            "ET₀ could not be computed on {not_computed} day(s) of the weather series"
        ));
    }
    let estimated_days = results
        .iter()
        .filter(|r| {
            r.outcome.as_ref().is_ok_and(|d| {
                d.humidity == HumiditySource::FromTmin
                    || d.radiation == RadiationSource::TemperatureRange
                    || d.wind == WindSource::Default
            })
        })
        .count();
    let dates: Vec<NaiveDate> = results.iter().map(|r| r.date).collect();
    let et0_mm: Vec<Option<f64>> = results.iter().map(|r| r.et0_mm).collect();
    let band = match et0_band(&dates, &et0_mm) {
        Ok(b) => b,
        Err(e) => {
            warnings.push(format!("ET₀ climatology: {e}"));
            Vec::new()
        }
    };
    let result = WeatherResult {
        file,
        dates,
        et0_mm,
        rain_mm: days.iter().map(|d| d.rain_mm).collect(),
        estimated_days,
        et0_band: band,
    };
    cache.et0 = Some((et0_key, result.clone(), warnings.clone()));
    Some(Ok((result, warnings)))
}

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
        weather: None,
        kc_curves,
        scheme_area_ha: project.scheme_area_ha(),
        canal_area_ha,
    }
}
