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
//! [`WeatherReader`] streams one day at a time; [`import_weather_file`]
//! collects a whole series and every problem up to a cap. Every rejected cell
//! is reported as `file:line:column: column: found "...", expected ...`.
//! Duplicate and out-of-order dates reject their row; missing days are
//! reported as warnings. Nothing is silently fixed.

mod date;
mod error;
mod mapping;
mod reader;
pub mod units;

pub use date::{DateFormat, parse_date};
pub use error::{
    ImportError, ImportProblem, ImportWarning, ProblemKind, SourceLocation, WarningKind,
};
pub use mapping::{
    ColumnMapping, MappedColumn, MappingGuess, OWN_COLUMNS, Quantity, guess_mapping,
};
pub use reader::{
    DEFAULT_MAX_PROBLEMS, DecimalSeparator, Delimiter, ImportOptions, ImportedSeries,
    MAGNITUDE_LIMIT, ReadDay, WeatherReader, import_weather_file, import_weather_reader,
    load_mapping,
};
