//! Weather CSV import with column and unit mapping.
//!
//! Files using Offtake's own column names (DESIGN.md: `date,tmax_c,tmin_c,
//! tmean_c,rhmax_pct,rhmin_pct,rhmean_pct,tdew_c,ea_kpa,wind_ms,solar_mj,
//! sunshine_h,rain_mm`, any case, any order, blank = missing) are read
//! directly. Any other layout is read through a [`ColumnMapping`] naming each
//! column's quantity and unit; [`guess_mapping`] proposes one from header names
//! for the user to confirm.
//!
//! Dates may be ISO, day/month/year or month/day/year; the delimiter comma,
//! semicolon or tab; numbers with decimal point or (with a non-comma
//! delimiter) decimal comma; UTF-8 with or without byte-order mark.
//!
//! The document types (mapping, units, date format, delimiter, decimal
//! separator, gathered as [`ImportSettings`]) live in
//! [`offtake_core::weather_import`] so a project can hold them; they are
//! re-exported here. [`load_project_weather`] reads a project's weather file
//! with the project's saved settings.
//!
//! [`WeatherReader`] streams one day at a time; [`import_weather_file`]
//! collects a whole series and every problem up to a cap. Every rejected cell
//! is reported as `file:line:column: column: found "...", expected ...`.
//! Duplicate and out-of-order dates reject their row; missing days are
//! reported as warnings. Nothing is silently fixed.

mod date;
mod error;
mod lines;
mod mapping;
mod project;
mod reader;
pub mod units;

pub use date::{DateFormat, parse_date};
pub use error::{
    ImportError, ImportProblem, ImportWarning, ProblemKind, SourceLocation, WarningKind,
};
pub use mapping::{
    ColumnMapping, MappedColumn, MappingGuess, OWN_COLUMNS, Quantity, guess_mapping,
    mapping_from_ron_str, mapping_to_ron_string,
};
pub use offtake_core::weather_import::{ImportSettings, ImportSettingsProblem};
pub use project::{ProjectWeather, ProjectWeatherError, load_project_weather};
pub use reader::{
    DEFAULT_MAX_PROBLEMS, DecimalSeparator, Delimiter, HeaderLine, ImportOptions, ImportedSeries,
    MAGNITUDE_LIMIT, MAX_COLUMNS, MAX_LINE_BYTES, MAX_SERIES_DAYS, MAX_SHOWN_CELL_CHARS, ReadDay,
    WeatherReader, import_weather_file, import_weather_reader, load_mapping, read_header,
    read_header_from, shown_cell,
};
