//! The computation the background worker runs, and the results it caches.
//!
//! The app sends a snapshot of the project to [`crate::worker::Worker`]; the
//! compute function turns it into [`Computed`]. Views read only the cached
//! [`Computed`] of the last finished run; nothing is computed in a frame.

use std::path::PathBuf;
use std::sync::Arc;

use chrono::NaiveDate;
use offtake_core::balance::BalanceDay;
use offtake_core::engine::{self, Comparison, PreparedWeather, Results};
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
    /// The whole chain (offtake-core `engine::run`): demand at every node,
    /// design values, plantings, roster. `None` without weather; the error
    /// text when the engine cannot compute the project.
    pub engine: Option<Result<EngineRun, String>>,
    /// The daily balance of one planting's season, when a tab asked for it.
    pub season: Option<Result<SeasonView, String>>,
    /// Every scenario side by side (offtake-core `engine::compare`), when the
    /// project has scenarios.
    pub comparison: Option<Comparison>,
    /// The validation errors that stopped the last computation (offtake-core
    /// `EngineError::Invalid`). When not empty nothing was computed from the
    /// project as it stands: `engine` holds the last good results, now out
    /// of date (or the error, if there were none).
    pub out_of_date: Vec<String>,
}

/// One engine run, shared without copying between the worker and the tabs.
#[derive(Clone)]
pub struct EngineRun {
    /// Everything the engine computed.
    pub results: Arc<Results>,
}

impl PartialEq for EngineRun {
    fn eq(&self, other: &Self) -> bool {
        Arc::ptr_eq(&self.results, &other.results)
    }
}

impl std::fmt::Debug for EngineRun {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("EngineRun")
            .field("scheme", &self.results.scheme_name)
            .field("days", &self.results.days)
            .finish_non_exhaustive()
    }
}

/// A planting and the year its season starts, asked for by the Water
/// balance and Crop curves tabs.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SeasonRequest {
    /// Planting id.
    pub planting: String,
    /// Calendar year of the season's first planting day (`None` = the
    /// start year of the headworks design year).
    pub year: Option<i32>,
}

/// The daily balance of one season of one planting (area-weighted over its
/// cohorts), from offtake-core `planting::season_detail`.
#[derive(Debug, Clone, PartialEq)]
pub struct SeasonView {
    /// What was asked.
    pub request: SeasonRequest,
    /// The year shown (the one asked, or the design year's).
    pub year: i32,
    /// Date of `days[0]`.
    pub first_date: NaiveDate,
    /// Whether the whole season is inside the weather record.
    pub complete: bool,
    /// One row per day: ET₀, Kc (climate-adjusted), ETc, rain, irrigation,
    /// depletion, TAW, RAW, Ks.
    pub days: Vec<BalanceDay>,
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
    /// The season whose daily balance a tab shows, if any.
    pub season: Option<SeasonRequest>,
    /// The scenario whose results the tabs show (`None` = the base plan).
    pub scenario: Option<String>,
    /// Whether to run every scenario for the Compare tab (only while it is
    /// shown: the comparison costs one engine run per scenario).
    pub compare: bool,
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
    /// Per day: ET₀ rests on a FAO-56 missing-data procedure (estimated Rs,
    /// ea from Tmin or default wind).
    pub estimated: Vec<bool>,
    /// Quality flags of the series (offtake-core `quality::check_series`
    /// with the FAO-56 Rso and daylight-hours rules), as (date, text).
    pub flags: Vec<(NaiveDate, String)>,
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
    key: Option<WeatherKey>,
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
    let mut engine_cache = EngineCache::default();
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
        if let (Some(_), Ok(days)) = (&out.weather, &cache.days) {
            let key = cache.key.clone();
            engine_cache.update(&snap, key, days, &libraries);
            if snap.compare {
                engine_cache.compare(&snap.project, days, &libraries);
            }
            out.engine = engine_cache.run.clone();
            out.out_of_date.clone_from(&engine_cache.errors);
            out.comparison = engine_cache.comparison.clone();
            if let Some(Ok(run)) = &out.engine {
                out.warnings.extend(run.results.warnings.iter().cloned());
            } else if let Some(Err(e)) = &out.engine {
                out.warnings.push(format!("computation: {e}"));
            }
            if let Some(req) = &snap.season {
                out.season = Some(engine_cache.season(&snap.project, days, &libraries, req));
            }
        }
        out.warnings.dedup();
        out
    })
}

/// The weather file, its modification time and the project's import
/// settings (column mapping, units, date format), as text.
type WeatherKey = (PathBuf, Option<std::time::SystemTime>, String);

/// What engine results depend on: the project, the scenario shown, the
/// weather file.
type EngineKey = (Project, Option<String>, Option<WeatherKey>);

/// Engine results kept while the project and the weather file stay the same
/// (a selection change asks only for a season's balance).
#[derive(Default)]
struct EngineCache {
    key: Option<EngineKey>,
    run: Option<Result<EngineRun, String>>,
    /// Validation errors of the project as it stands (empty when `run` is
    /// its results).
    errors: Vec<String>,
    comparison: Option<Comparison>,
    /// Weather prepared as the engine prepares it (gaps filled), for season
    /// details; kept while the weather file, station, ET₀ method and weather
    /// perturbation stay the same (edits of the scheme do not change it).
    prepared: Option<(String, Result<Arc<PreparedWeather>, String>)>,
}

impl EngineCache {
    fn update(
        &mut self,
        snap: &Snapshot,
        weather_key: Option<WeatherKey>,
        days: &[WeatherDay],
        libraries: &Libraries,
    ) {
        let scenario = snap
            .scenario
            .clone()
            .filter(|name| snap.project.scenario(name).is_some());
        let key = (snap.project.clone(), scenario.clone(), weather_key);
        if self.key.as_ref() == Some(&key) {
            return;
        }
        let same_base = self
            .key
            .as_ref()
            .is_some_and(|k| k.0 == key.0 && k.2 == key.2);
        self.key = Some(key);
        let results = engine::run_scenario(
            &snap.project,
            scenario.as_deref(),
            &libraries.crops,
            &libraries.soils,
            days,
        );
        match results {
            Ok(r) => {
                self.errors.clear();
                self.run = Some(Ok(EngineRun {
                    results: Arc::new(r),
                }));
            }
            // The project has errors: nothing is computed from it; the last
            // good results stay, marked out of date by `errors`.
            Err(engine::EngineError::Invalid { errors }) => {
                self.errors = errors.iter().map(ToString::to_string).collect();
                if !matches!(self.run, Some(Ok(_))) {
                    self.run = Some(Err(format!(
                        "the project has {} error(s); correct them to compute",
                        errors.len()
                    )));
                }
            }
            Err(e) => {
                self.errors.clear();
                self.run = Some(Err(e.to_string()));
            }
        }
        if !same_base {
            self.comparison = None;
        }
    }

    /// The comparison of every scenario, computed once per project.
    fn compare(&mut self, project: &Project, days: &[WeatherDay], libraries: &Libraries) {
        if self.comparison.is_none() && !project.scenarios.is_empty() {
            // Every scenario that computes is compared; one made invalid in
            // the editor is listed with its reason instead of hiding the rest.
            self.comparison = Some(engine::compare_scenarios_each(
                project,
                &libraries.crops,
                &libraries.soils,
                days,
            ));
        }
    }

    fn season(
        &mut self,
        project: &Project,
        days: &[WeatherDay],
        libraries: &Libraries,
        req: &SeasonRequest,
    ) -> Result<SeasonView, String> {
        // The scenario shown applies to the season too.
        let scenario = self.key.as_ref().and_then(|k| k.1.clone());
        let (project, perturbation) = match scenario.as_deref() {
            Some(name) => (
                project.apply_scenario(name).map_err(|e| e.to_string())?,
                project
                    .scenario(name)
                    .map(|s| s.weather)
                    .unwrap_or_default(),
            ),
            None => (
                project.clone(),
                offtake_core::project::WeatherPerturbation::default(),
            ),
        };
        let key = format!(
            "{:?} {:?} {:?} {:?}",
            self.key.as_ref().map(|k| &k.2),
            engine::site_of(&project),
            project.options.et0_method,
            perturbation
        );
        if self.prepared.as_ref().is_none_or(|p| p.0 != key) {
            let w = prepared_weather(&project, days, &perturbation).map(Arc::new);
            self.prepared = Some((key, w));
        }
        let prepared = self
            .prepared
            .as_ref()
            .map_or_else(|| Err(String::new()), |p| p.1.clone())?;
        let project = &project;
        let design_year = self
            .run
            .as_ref()
            .and_then(|r| r.as_ref().ok())
            .and_then(|r| r.results.headworks().map(|h| h.design_year.start_year()));
        season_view(project, libraries, &prepared, req, design_year)
    }
}

/// The weather as the engine prepares it for the plantings: days that the
/// ET₀ checks reject become gaps (rain kept) and gaps are filled (offtake-core
/// `gapfill::repair_for_daily_balance`, default options, the engine's call),
/// then ET₀, u2 and RHmin per day.
///
/// # Errors
/// The engine's error text.
pub fn prepared_weather(
    project: &Project,
    days: &[WeatherDay],
    perturbation: &offtake_core::project::WeatherPerturbation,
) -> Result<PreparedWeather, String> {
    use offtake_core::et0::{Et0Context, Et0Options};
    use offtake_core::gapfill::{GapFillOptions, repair_for_daily_balance};
    let site = engine::site_of(project);
    let checker = Et0Context::new(&site, &Et0Options::default()).map_err(|e| e.to_string())?;
    let filled = repair_for_daily_balance(days, &GapFillOptions::default(), |d| {
        checker.et0_mm_day(d).map(|_| ()).map_err(|e| e.to_string())
    })
    .map_err(|e| e.to_string())?
    .filled;
    engine::weather_prep::prepare_weather(
        &filled.days,
        &site,
        project.options.et0_method,
        perturbation,
    )
    .map_err(|e| e.to_string())
}

/// One season's daily balance of a planting, set up exactly as the engine
/// sets up its planting step (`engine::planting_step::simulate_planting`).
///
/// # Errors
/// A text naming the missing planting, block, crop or soil, or the planting
/// module's error (e.g. no season starts in that year).
pub fn season_view(
    project: &Project,
    libraries: &Libraries,
    w: &PreparedWeather,
    req: &SeasonRequest,
    default_year: Option<i32>,
) -> Result<SeasonView, String> {
    use offtake_core::engine::planting_step::{planting_spec, planting_weather};
    use offtake_core::planting::season_detail;
    let p = project
        .plantings
        .iter()
        .find(|p| p.id == req.planting)
        .ok_or_else(|| format!("planting {:?} is not in the project", req.planting))?;
    let b = project
        .blocks
        .iter()
        .find(|b| b.id == p.block)
        .ok_or_else(|| format!("planting {:?}: block {:?} does not exist", p.id, p.block))?;
    let crop = libraries
        .crop(&p.crop)
        .ok_or_else(|| format!("crop {:?} is not in the crop library", p.crop))?;
    let soil = libraries
        .soil(&b.soil)
        .ok_or_else(|| format!("soil {:?} is not in the soil library", b.soil))?;
    let spec = planting_spec(crop, soil, p, b, project.options.effective_rain);
    let weather = planting_weather(w);
    let year = req.year.or(default_year).ok_or_else(|| {
        "no complete irrigation year in the weather record to take the season from".to_owned()
    })?;
    let detail = season_detail(&spec, &weather, year).map_err(|e| e.to_string())?;
    Ok(SeasonView {
        request: req.clone(),
        year,
        first_date: detail.first_date,
        complete: detail.complete,
        days: detail.days,
    })
}

fn weather(
    snap: &Snapshot,
    cache: &mut WeatherCache,
) -> Option<Result<(WeatherResult, Vec<String>), String>> {
    use offtake_core::et0::series::{
        Et0Options, HumiditySource, RadiationSource, WindSource, et0_daily_series,
    };
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
    let site = offtake_core::engine::site_of(p);
    let method = p.options.et0_method.into();
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
    let estimated: Vec<bool> = results
        .iter()
        .map(|r| {
            r.outcome.as_ref().is_ok_and(|d| {
                d.humidity == HumiditySource::FromTmin
                    || d.radiation == RadiationSource::TemperatureRange
                    || d.wind == WindSource::Default
            })
        })
        .collect();
    let estimated_days = estimated.iter().filter(|e| **e).count();
    let astronomy = offtake_core::quality::SiteAstronomy::new(&site).ok();
    let astronomy_fn = |d: NaiveDate| astronomy.as_ref().and_then(|a| a.for_date(d));
    let flags = match offtake_core::quality::check_series(
        days,
        &offtake_core::quality::QualityRules::default(),
        Some(&astronomy_fn),
    ) {
        Ok(report) => report
            .flags
            .iter()
            .map(|f| (f.date, format!("{} {}", f.variable.name(), f.rule)))
            .collect(),
        Err(e) => {
            warnings.push(format!("quality checks of the weather series: {e}"));
            Vec::new()
        }
    };
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
        estimated,
        flags,
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
        engine: None,
        season: None,
        comparison: None,
        out_of_date: Vec::new(),
    }
}
