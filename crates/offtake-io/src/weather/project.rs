//! Reading a project's weather series with the project's saved import
//! settings: the one call `offtake run`, `offtake compare` and the app use.

use std::path::{Path, PathBuf};

use offtake_core::project::Project;
use offtake_core::weather::StationSite;
use thiserror::Error;

use super::error::ImportError;
use super::reader::{ImportOptions, ImportedSeries, import_weather_file};
use crate::project_file::weather_path;

/// A project's weather series as read with its saved import settings.
#[derive(Debug, Clone, PartialEq)]
pub struct ProjectWeather {
    /// The weather file, resolved against the project file's folder.
    pub path: PathBuf,
    /// The imported days (SI units), warnings, date format used.
    pub series: ImportedSeries,
    /// The station: the project's latitude, elevation and wind height (which
    /// equals any height the import mapping states; see
    /// [`load_project_weather`]).
    pub site: StationSite,
}

/// Why a project's weather series could not be read.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ProjectWeatherError {
    /// The project names no weather file.
    #[error("{}: the project names no weather file (weather.path is empty)", project.display())]
    NoWeatherFile {
        /// The project file.
        project: PathBuf,
    },
    /// The import mapping states a wind height other than the project's.
    #[error(
        "{}: weather.wind_height_m = {project_m} m but the import mapping's wind column {column:?} states {mapping_m} m; make them equal (the computation uses wind_height_m)",
        project.display()
    )]
    WindHeightMismatch {
        /// The project file.
        project: PathBuf,
        /// The project's wind height (m).
        project_m: f64,
        /// The wind column's header.
        column: String,
        /// The mapping's stated height (m).
        mapping_m: f64,
    },
    /// The saved import settings contradict themselves.
    #[error("{}: {problem}", project.display())]
    Settings {
        /// The project file.
        project: PathBuf,
        /// The contradiction.
        problem: offtake_core::weather_import::ImportSettingsProblem,
    },
    /// The weather file could not be read (every problem with
    /// `file:line:column`).
    #[error(transparent)]
    Import(#[from] ImportError),
}

/// Reads the weather series of `project` (loaded from `project_path`),
/// applying its saved import settings (`project.weather.import`; `None`
/// reads Offtake's own column names with delimiter, decimal separator and
/// date format detected).
///
/// The wind height of the returned site is the project's
/// `weather.wind_height_m`; import settings that state a different height
/// for their wind column are refused rather than silently overridden
/// (`WeatherSource::set_import` adopts the stated height when settings are
/// attached, so this only happens in a hand-edited file).
///
/// # Errors
/// [`ProjectWeatherError`]: no file named, contradictory settings, a
/// wind-height mismatch, or the importer's errors with `file:line:column`.
pub fn load_project_weather(
    project_path: &Path,
    project: &Project,
) -> Result<ProjectWeather, ProjectWeatherError> {
    let w = &project.weather;
    if w.path.trim().is_empty() {
        return Err(ProjectWeatherError::NoWeatherFile {
            project: project_path.to_path_buf(),
        });
    }
    let options = match &w.import {
        Some(settings) => {
            if let Some(problem) = settings.problems().into_iter().next() {
                return Err(ProjectWeatherError::Settings {
                    project: project_path.to_path_buf(),
                    problem,
                });
            }
            ImportOptions::from_settings(settings)
        }
        None => ImportOptions::default(),
    };
    if let Some((column, mapping_m)) = w.wind_height_mismatch() {
        return Err(ProjectWeatherError::WindHeightMismatch {
            project: project_path.to_path_buf(),
            project_m: w.wind_height_m,
            column: column.to_owned(),
            mapping_m,
        });
    }
    let path = weather_path(project_path, project);
    let series = import_weather_file(&path, &options)?;
    Ok(ProjectWeather {
        path,
        series,
        site: StationSite {
            latitude_deg: w.latitude_deg,
            elevation_m: w.elevation_m,
            wind_height_m: w.wind_height_m,
        },
    })
}
