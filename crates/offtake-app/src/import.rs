//! The weather import window.
//!
//! File › Import weather… picks a CSV; the file is read on a background
//! thread (lines read are shown while it runs, and the read can be
//! cancelled). The window then shows, for confirmation:
//!
//! - the column mapping offtake-io guesses from the header
//!   (`offtake_io::weather::guess_mapping`) as an editable table — each file
//!   column → quantity and unit — with the wind measurement height, the date
//!   order, the delimiter, the decimal separator and the missing-value
//!   markers; **Re-read** applies them. A file whose dates do not decide
//!   between day/month and month/day order is never guessed: the user must
//!   choose the order;
//! - a preview of the first days converted to Offtake's units (units in the
//!   headers);
//! - the import problems (`file:line:column: …`) and warnings;
//! - the quality report (`offtake_core::quality::check_series` with the
//!   station's clear-sky radiation and day length): flag counts by rule, the
//!   first flagged days, completeness of each variable;
//! - the gap filling the computation applies (the engine's default, which
//!   the project does not store yet).
//!
//! **Use this weather** returns the file, the [`ImportSettings`] and the
//! station fields the user typed; the app stores them as one undoable edit.

use std::path::{Path, PathBuf};
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::mpsc::{self, Receiver, TryRecvError};
use std::time::Duration;

use chrono::NaiveDate;
use egui::{RichText, Ui};
use offtake_core::gapfill::{GapFillOptions, LongGapMethod};
use offtake_core::quality::{QualityRules, SiteAstronomy, Variable, check_series};
use offtake_core::weather::{StationSite, WeatherDay};
use offtake_core::weather_import::units::{
    DepthUnit, HumidityUnit, PressureUnit, RadiationUnit, TemperatureUnit, WindUnit,
};
use offtake_core::weather_import::{
    ColumnMapping, DateFormat, DecimalSeparator, Delimiter, ImportSettings, MappedColumn,
    OWN_COLUMNS, Quantity,
};
use offtake_io::weather::{ImportError, ImportOptions, WeatherReader, guess_mapping};

use crate::fields::{format_number, parse_number};

/// Most rejected rows listed in the window (the rest are counted).
const MAX_PROBLEMS_LISTED: usize = 200;
/// Days shown in the preview.
const PREVIEW_DAYS: usize = 8;
/// Flagged values listed.
const FLAGS_LISTED: usize = 12;

/// The role of one column of the file.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ColumnRole {
    /// The date column.
    Date,
    /// Not imported.
    Ignore,
    /// A measured quantity in the file's unit.
    Measure(Quantity),
}

/// What the background read found.
#[derive(Debug, Clone, Default)]
pub struct ReadResult {
    /// Header names of the file, in order.
    pub headers: Vec<String>,
    /// The mapping guessed from the header (first read only).
    pub guessed: Option<ColumnMapping>,
    /// Accepted days (SI units).
    pub days: Vec<WeatherDay>,
    /// Rejected cells and rows (`file:line:column: …`), at most
    /// [`MAX_PROBLEMS_LISTED`].
    pub problems: Vec<String>,
    /// Rejected rows beyond those listed.
    pub problems_omitted: usize,
    /// Warnings (`file:line:column: warning: …`).
    pub warnings: Vec<String>,
    /// An error that stopped the read.
    pub fatal: Option<String>,
    /// The dates do not decide between day/month and month/day order.
    pub ambiguous_dates: bool,
    /// The date format used (stated or detected).
    pub date_format: Option<DateFormat>,
    /// Fields present (Offtake names).
    pub fields: Vec<&'static str>,
    /// Quality report lines: flag counts by rule.
    pub flag_counts: Vec<(String, usize)>,
    /// The first flagged values.
    pub first_flags: Vec<String>,
    /// Completeness of each variable over the record (0–1).
    pub completeness: Vec<(String, f64)>,
    /// Why the quality check could not run, if it could not.
    pub quality_error: Option<String>,
    /// Missing days inside the record, in gaps up to the interpolation limit.
    pub short_gap_days: usize,
    /// Missing days inside the record, in longer gaps.
    pub long_gap_days: usize,
    /// Data lines read (progress).
    pub lines: u64,
}

/// A running or finished read.
#[derive(Debug)]
struct ReadJob {
    rx: Option<Receiver<ReadResult>>,
    lines: Arc<AtomicU64>,
    cancel: Arc<AtomicBool>,
}

/// The weather import window's state.
#[derive(Debug)]
pub struct ImportJob {
    /// The file.
    pub path: PathBuf,
    /// File size (bytes), for the progress line.
    pub size_bytes: u64,
    /// The settings being edited (applied by Re-read).
    pub settings: ImportSettings,
    /// Role of each file column (header order), edited in the table.
    pub roles: Vec<(String, ColumnRole)>,
    /// Wind measurement height typed by the user (m); empty = not stated.
    pub wind_height_text: String,
    /// Missing-value markers typed by the user, comma-separated.
    pub missing_text: String,
    /// Station latitude typed (decimal degrees, north positive).
    pub latitude_text: String,
    /// Station elevation typed (m).
    pub elevation_text: String,
    /// The read in progress, if any.
    job: Option<ReadJob>,
    /// The result of the last finished read.
    pub result: Option<ReadResult>,
    /// The form as it was when the last read finished (settings, roles,
    /// wind height and markers text): Use needs the form unchanged since.
    read_with: Option<FormState>,
}

/// What the form held at the end of a read.
type FormState = (ImportSettings, Vec<(String, ColumnRole)>, String, String);

/// What the user chose in the window.
#[derive(Debug, Clone, PartialEq)]
pub enum ImportAnswer {
    /// Use this file with these settings.
    Use {
        /// The weather file.
        path: PathBuf,
        /// How to read it.
        settings: ImportSettings,
        /// Station latitude typed in the window (decimal degrees).
        latitude_deg: Option<f64>,
        /// Station elevation typed in the window (m).
        elevation_m: Option<f64>,
    },
    /// Close the window.
    Cancel,
}

/// Reads the header line through offtake-io's one header reader (the
/// importer's own: same delimiter detection, quoting, byte-order mark and
/// caps), so the mapping table shows the columns that will be imported.
fn read_header(path: &Path, delimiter: Option<Delimiter>) -> Result<Vec<String>, String> {
    offtake_io::weather::read_header(path, delimiter)
        .map(|h| h.names)
        .map_err(|e| e.to_string())
}

fn rule_label(r: offtake_core::quality::Rule) -> String {
    r.name().replace('_', " ")
}

/// Counts missing days between consecutive dates, split at the interpolation limit.
fn gap_days(days: &[WeatherDay], limit: u32) -> (usize, usize) {
    let (mut short, mut long) = (0, 0);
    for w in days.windows(2) {
        let missing = usize::try_from((w[1].date - w[0].date).num_days() - 1).unwrap_or(0);
        if missing == 0 {
            continue;
        }
        if missing <= limit as usize {
            short += missing;
        } else {
            long += missing;
        }
    }
    (short, long)
}

/// The background read: header, guess (first read), the streaming import
/// with progress, then the quality report.
fn read(
    path: &Path,
    settings: &ImportSettings,
    first: bool,
    site: Option<StationSite>,
    lines: &AtomicU64,
    cancel: &AtomicBool,
) -> ReadResult {
    let mut out = ReadResult::default();
    match read_header(path, settings.delimiter) {
        Ok(h) => out.headers = h,
        Err(e) => {
            out.fatal = Some(e);
            return out;
        }
    }
    let mut settings = settings.clone();
    if first {
        let own = out
            .headers
            .iter()
            .all(|h| OWN_COLUMNS.contains(&h.to_lowercase().as_str()));
        if !own {
            let headers: Vec<&str> = out.headers.iter().map(String::as_str).collect();
            let guess = guess_mapping(&headers).mapping;
            settings.mapping = Some(guess.clone());
            out.guessed = Some(guess);
        }
    }
    let options = ImportOptions::from_settings(&settings);
    let mut reader = match WeatherReader::open(path, &options) {
        Ok(r) => r,
        Err(e) => {
            out.fatal = Some(e.to_string());
            return out;
        }
    };
    let mut n: u64 = 0;
    // `while let` rather than `for`: the reader's line count is read between items.
    while let Some(item) = reader.next() {
        n += 1;
        if n.is_multiple_of(512) {
            lines.store(reader.last_line(), Ordering::Relaxed);
            if cancel.load(Ordering::Relaxed) {
                out.fatal = Some("reading cancelled".to_owned());
                return out;
            }
        }
        match item {
            Ok(r) => out.days.push(r.day),
            Err(ImportError::Row(p)) => {
                if out.problems.len() < MAX_PROBLEMS_LISTED {
                    out.problems.push(p.to_string());
                } else {
                    out.problems_omitted += 1;
                }
            }
            Err(e) => {
                out.ambiguous_dates = matches!(e, ImportError::AmbiguousDates { .. });
                out.fatal = Some(e.to_string());
                break;
            }
        }
    }
    out.lines = reader.last_line();
    lines.store(out.lines, Ordering::Relaxed);
    out.warnings = reader.warnings().iter().map(ToString::to_string).collect();
    out.date_format = reader.date_format();
    out.fields = reader.fields();
    if out.fatal.is_none() && out.days.is_empty() {
        out.fatal = Some(format!(
            "{}: found no data rows, expected at least one day after the header",
            path.display()
        ));
    }
    let (short, long) = gap_days(&out.days, GapFillOptions::default().max_interpolation_days);
    out.short_gap_days = short;
    out.long_gap_days = long;
    quality(&mut out, site);
    out
}

fn quality(out: &mut ReadResult, site: Option<StationSite>) {
    if out.days.is_empty() {
        return;
    }
    let astronomy = match site.map(|s| SiteAstronomy::new(&s)) {
        Some(Ok(a)) => Some(a),
        Some(Err(e)) => {
            out.quality_error = Some(format!(
                "station: {e}; the radiation and day-length rules were skipped"
            ));
            None
        }
        None => {
            out.quality_error = Some(
                "type the station latitude and elevation for the radiation and day-length rules"
                    .to_owned(),
            );
            None
        }
    };
    let lookup = astronomy
        .as_ref()
        .map(|a| move |d: NaiveDate| a.for_date(d));
    let dyn_lookup: Option<&dyn Fn(NaiveDate) -> _> = lookup.as_ref().map(|f| f as &dyn Fn(_) -> _);
    match check_series(&out.days, &QualityRules::default(), dyn_lookup) {
        Ok(report) => {
            out.flag_counts = report
                .summary
                .flag_counts
                .iter()
                .map(|(r, n)| (rule_label(*r), *n))
                .collect();
            out.first_flags = report
                .flags
                .iter()
                .take(FLAGS_LISTED)
                .map(ToString::to_string)
                .collect();
            let span: u32 = report
                .summary
                .completeness
                .iter()
                .map(|y| y.days_in_span)
                .sum();
            out.completeness = report
                .summary
                .variables
                .iter()
                .map(|v: &Variable| {
                    let present: u32 = report
                        .summary
                        .completeness
                        .iter()
                        .map(|y| y.present[v.index()])
                        .sum();
                    let share = if span == 0 {
                        0.0
                    } else {
                        f64::from(present) / f64::from(span)
                    };
                    (v.name().to_owned(), share)
                })
                .collect();
        }
        Err(e) => out.quality_error = Some(e.to_string()),
    }
}

fn roles_of(headers: &[String], mapping: Option<&ColumnMapping>) -> Vec<(String, ColumnRole)> {
    let own = ColumnMapping::own_format();
    let m = mapping.unwrap_or(&own);
    headers
        .iter()
        .map(|h| {
            let key = h.trim().to_lowercase();
            let role = if m.date_column.trim().to_lowercase() == key {
                ColumnRole::Date
            } else if let Some(c) = m
                .columns
                .iter()
                .find(|c| c.header.trim().to_lowercase() == key)
            {
                ColumnRole::Measure(c.quantity)
            } else {
                ColumnRole::Ignore
            };
            (h.clone(), role)
        })
        .collect()
}

impl ImportJob {
    /// Starts reading `path` on a background thread; `station` fills the
    /// latitude and elevation fields (the project's current values).
    pub fn start(path: PathBuf, station: &offtake_core::project::WeatherSource) -> Self {
        let size_bytes = std::fs::metadata(&path).map_or(0, |m| m.len());
        let mut job = Self {
            path,
            size_bytes,
            settings: ImportSettings::default(),
            roles: Vec::new(),
            wind_height_text: String::new(),
            missing_text: String::new(),
            latitude_text: format_number(station.latitude_deg, 6),
            elevation_text: format_number(station.elevation_m, 2),
            job: None,
            result: None,
            read_with: None,
        };
        job.spawn(true);
        job
    }

    fn site(&self) -> Option<StationSite> {
        let lat = parse_number(&self.latitude_text).ok()?;
        let elev = parse_number(&self.elevation_text).ok()?;
        Some(StationSite {
            latitude_deg: lat,
            elevation_m: elev,
            wind_height_m: 2.0,
        })
    }

    fn spawn(&mut self, first: bool) {
        let (tx, rx) = mpsc::channel();
        let lines = Arc::new(AtomicU64::new(0));
        let cancel = Arc::new(AtomicBool::new(false));
        let (l, c) = (Arc::clone(&lines), Arc::clone(&cancel));
        let path = self.path.clone();
        let settings = self.settings.clone();
        let site = self.site();
        let spawned = std::thread::Builder::new()
            .name("offtake-weather-import".to_owned())
            .spawn(move || {
                // The window may be closed before the read ends.
                let _ = tx.send(read(&path, &settings, first, site, &l, &c));
            });
        match spawned {
            Ok(_) => {
                self.job = Some(ReadJob {
                    rx: Some(rx),
                    lines,
                    cancel,
                });
            }
            Err(e) => {
                self.result = Some(ReadResult {
                    fatal: Some(format!("could not start the import thread: {e}")),
                    ..ReadResult::default()
                });
            }
        }
    }

    fn finish(&mut self, r: ReadResult) {
        if let Some(g) = &r.guessed {
            self.settings.mapping = Some(g.clone());
        }
        if self.roles.is_empty() || r.guessed.is_some() || self.headers_changed(&r) {
            self.roles = roles_of(&r.headers, self.settings.mapping.as_ref());
        }
        if let Some(h) = self.settings.stated_wind_height_m() {
            self.wind_height_text = format_number(h, 2);
        }
        self.result = Some(r);
        self.read_with = Some(self.form_state());
        self.job = None;
    }

    fn form_state(&self) -> FormState {
        (
            self.settings.clone(),
            self.roles.clone(),
            self.wind_height_text.clone(),
            self.missing_text.clone(),
        )
    }

    fn headers_changed(&self, r: &ReadResult) -> bool {
        self.roles.len() != r.headers.len()
            || self.roles.iter().zip(&r.headers).any(|((h, _), n)| h != n)
    }

    /// Collects the result if the thread finished (never blocks).
    pub fn poll(&mut self) {
        let Some(job) = self.job.as_mut() else { return };
        let Some(rx) = &job.rx else { return };
        match rx.try_recv() {
            Ok(r) => self.finish(r),
            Err(TryRecvError::Empty) => {}
            Err(TryRecvError::Disconnected) => {
                self.job = None;
                self.result = Some(ReadResult {
                    fatal: Some("the import stopped unexpectedly".to_owned()),
                    ..ReadResult::default()
                });
            }
        }
    }

    /// Blocks until the read finishes (tests only).
    pub fn wait(&mut self, timeout: Duration) {
        let received = self
            .job
            .as_ref()
            .and_then(|j| j.rx.as_ref())
            .and_then(|rx| rx.recv_timeout(timeout).ok());
        if let Some(r) = received {
            self.finish(r);
        }
    }

    /// Whether the thread is still reading.
    pub fn running(&self) -> bool {
        self.job.is_some()
    }

    /// The settings built from the table and fields, with any problem found.
    fn settings_from_form(&self) -> Result<ImportSettings, String> {
        let mut s = self.settings.clone();
        let date = self
            .roles
            .iter()
            .find(|(_, r)| *r == ColumnRole::Date)
            .map(|(h, _)| h.clone())
            .ok_or("choose which column holds the date")?;
        let wind_h = if self.wind_height_text.trim().is_empty() {
            None
        } else {
            let h = parse_number(&self.wind_height_text)?;
            if !(0.5..=100.0).contains(&h) {
                return Err("Wind measurement height must be between 0.5 m and 100 m".to_owned());
            }
            Some(h)
        };
        let columns = self
            .roles
            .iter()
            .filter_map(|(h, r)| match r {
                ColumnRole::Measure(q) => Some(MappedColumn {
                    header: h.clone(),
                    quantity: match *q {
                        Quantity::Wind { unit, .. } => Quantity::Wind {
                            unit,
                            height_m: wind_h,
                        },
                        other => other,
                    },
                }),
                _ => None,
            })
            .collect();
        s.mapping = Some(ColumnMapping {
            date_column: date,
            columns,
        });
        s.missing_markers = self
            .missing_text
            .split(',')
            .map(str::trim)
            .filter(|m| !m.is_empty())
            .map(str::to_owned)
            .collect();
        if let Some(p) = s.problems().into_iter().next() {
            return Err(p.to_string());
        }
        Ok(s)
    }

    /// Applies the table and fields and reads the file again.
    pub fn reread(&mut self) {
        match self.settings_from_form() {
            Ok(s) => {
                self.settings = s;
                self.spawn(false);
            }
            Err(e) => {
                if let Some(r) = self.result.as_mut() {
                    r.fatal = Some(e);
                }
            }
        }
    }

    /// Whether the last read can be used: days read, nothing rejected, the
    /// form unchanged since.
    pub fn usable(&self) -> bool {
        let Some(r) = &self.result else { return false };
        r.fatal.is_none()
            && r.problems.is_empty()
            && !r.days.is_empty()
            && self.read_with.as_ref() == Some(&self.form_state())
            && self.station_problems().is_empty()
    }

    /// What is wrong with the typed station latitude and elevation.
    fn station_problems(&self) -> Vec<String> {
        [
            (&self.latitude_text, "Station latitude", "°", -90.0, 90.0),
            (
                &self.elevation_text,
                "Station elevation",
                "m",
                -500.0,
                9000.0,
            ),
        ]
        .into_iter()
        .filter_map(|(text, what, unit, lo, hi)| match parse_number(text) {
            Ok(v) if (lo..=hi).contains(&v) => None,
            Ok(_) => Some(format!(
                "{what} must be between {lo} {unit} and {hi} {unit}"
            )),
            Err(e) => Some(format!("{what}: {e}")),
        })
        .collect()
    }
}

/// Quantity kinds offered for a column, with a default unit.
const KINDS: [(&str, Option<Quantity>); 14] = [
    ("Date", None),
    ("Ignore", None),
    ("Tmax", Some(Quantity::Tmax(TemperatureUnit::Celsius))),
    ("Tmin", Some(Quantity::Tmin(TemperatureUnit::Celsius))),
    ("Tmean", Some(Quantity::Tmean(TemperatureUnit::Celsius))),
    ("RHmax", Some(Quantity::RhMax(HumidityUnit::Percent))),
    ("RHmin", Some(Quantity::RhMin(HumidityUnit::Percent))),
    ("RHmean", Some(Quantity::RhMean(HumidityUnit::Percent))),
    (
        "Dewpoint",
        Some(Quantity::Dewpoint(TemperatureUnit::Celsius)),
    ),
    (
        "Vapour pressure",
        Some(Quantity::VapourPressure(PressureUnit::Kilopascal)),
    ),
    (
        "Wind speed",
        Some(Quantity::Wind {
            unit: WindUnit::MetresPerSecond,
            height_m: None,
        }),
    ),
    (
        "Solar radiation",
        Some(Quantity::Solar(RadiationUnit::MegajoulesPerSquareMetreDay)),
    ),
    ("Sunshine hours", Some(Quantity::SunshineHours)),
    ("Rain", Some(Quantity::Rain(DepthUnit::Millimetres))),
];

fn kind_label(role: ColumnRole) -> &'static str {
    match role {
        ColumnRole::Date => "Date",
        ColumnRole::Ignore => "Ignore",
        ColumnRole::Measure(q) => KINDS
            .iter()
            .find(|(_, k)| k.is_some_and(|k| k.field_name() == q.field_name()))
            .map_or("?", |(l, _)| l),
    }
}

/// The same quantity in each unit it can be written in.
fn unit_choices(q: Quantity) -> Vec<Quantity> {
    use TemperatureUnit::{Celsius, Fahrenheit, Kelvin};
    let temps = [Celsius, Fahrenheit, Kelvin];
    let hums = [HumidityUnit::Percent, HumidityUnit::Fraction];
    match q {
        Quantity::Tmax(_) => temps.map(Quantity::Tmax).to_vec(),
        Quantity::Tmin(_) => temps.map(Quantity::Tmin).to_vec(),
        Quantity::Tmean(_) => temps.map(Quantity::Tmean).to_vec(),
        Quantity::Dewpoint(_) => temps.map(Quantity::Dewpoint).to_vec(),
        Quantity::RhMax(_) => hums.map(Quantity::RhMax).to_vec(),
        Quantity::RhMin(_) => hums.map(Quantity::RhMin).to_vec(),
        Quantity::RhMean(_) => hums.map(Quantity::RhMean).to_vec(),
        Quantity::VapourPressure(_) => [
            PressureUnit::Kilopascal,
            PressureUnit::Hectopascal,
            PressureUnit::Millibar,
        ]
        .map(Quantity::VapourPressure)
        .to_vec(),
        Quantity::Wind { height_m, .. } => [
            WindUnit::MetresPerSecond,
            WindUnit::KilometresPerHour,
            WindUnit::MilesPerHour,
            WindUnit::Knots,
        ]
        .map(|unit| Quantity::Wind { unit, height_m })
        .to_vec(),
        Quantity::Solar(_) => [
            RadiationUnit::MegajoulesPerSquareMetreDay,
            RadiationUnit::WattsPerSquareMetreDailyMean,
            RadiationUnit::KilowattHoursPerSquareMetreDay,
        ]
        .map(Quantity::Solar)
        .to_vec(),
        Quantity::SunshineHours => vec![Quantity::SunshineHours],
        Quantity::Rain(_) => [DepthUnit::Millimetres, DepthUnit::Inches]
            .map(Quantity::Rain)
            .to_vec(),
    }
}

/// A unit as the window writes it (the symbols of the radiation units use
/// superscripts the UI font may not have).
fn unit_text(q: Quantity) -> &'static str {
    match q {
        Quantity::Solar(RadiationUnit::MegajoulesPerSquareMetreDay) => "MJ/m²/day",
        Quantity::Solar(RadiationUnit::WattsPerSquareMetreDailyMean) => "W/m² (daily mean)",
        Quantity::Solar(RadiationUnit::KilowattHoursPerSquareMetreDay) => "kWh/m²/day",
        other => other.unit_symbol(),
    }
}

/// A message as the window shows it (superscript minus written plainly).
fn plain(s: &str) -> String {
    s.replace('⁻', "^-")
}

/// Column header of a preview field, with Offtake's unit.
fn field_header(field: &str) -> &'static str {
    match field {
        "tmax_c" => "Tmax (°C)",
        "tmin_c" => "Tmin (°C)",
        "tmean_c" => "Tmean (°C)",
        "rhmax_pct" => "RHmax (%)",
        "rhmin_pct" => "RHmin (%)",
        "rhmean_pct" => "RHmean (%)",
        "tdew_c" => "Dewpoint (°C)",
        "ea_kpa" => "ea (kPa)",
        "wind_ms" => "Wind (m/s)",
        "solar_mj" => "Solar (MJ/m²/day)",
        "sunshine_h" => "Sunshine (h)",
        "rain_mm" => "Rain (mm)",
        _ => "?",
    }
}

fn field_value(d: &WeatherDay, field: &str) -> Option<f64> {
    match field {
        "tmax_c" => d.tmax_c,
        "tmin_c" => d.tmin_c,
        "tmean_c" => d.tmean_c,
        "rhmax_pct" => d.rhmax_pct,
        "rhmin_pct" => d.rhmin_pct,
        "rhmean_pct" => d.rhmean_pct,
        "tdew_c" => d.tdew_c,
        "ea_kpa" => d.ea_kpa,
        "wind_ms" => d.wind_ms,
        "solar_mj" => d.solar_mj,
        "sunshine_h" => d.sunshine_h,
        "rain_mm" => d.rain_mm,
        _ => None,
    }
}

fn mapping_table(ui: &mut Ui, job: &mut ImportJob) {
    egui::Grid::new("import-mapping")
        .striped(true)
        .num_columns(4)
        .show(ui, |ui| {
            for h in ["File column", "Quantity", "Unit in the file", "Becomes"] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
            for (i, (header, role)) in job.roles.iter_mut().enumerate() {
                let header_label = ui.label(header.as_str());
                let before = *role;
                let combo = egui::ComboBox::from_id_salt(("import-kind", i))
                    .selected_text(kind_label(*role))
                    .show_ui(ui, |ui| {
                        for (label, q) in KINDS {
                            let r = match (label, q) {
                                ("Date", _) => ColumnRole::Date,
                                (_, Some(q)) => ColumnRole::Measure(q),
                                _ => ColumnRole::Ignore,
                            };
                            if ui
                                .selectable_label(kind_label(*role) == label, label)
                                .clicked()
                                && kind_label(before) != label
                            {
                                *role = r;
                            }
                        }
                    });
                let _ = combo.response.labelled_by(header_label.id);
                if let ColumnRole::Measure(q) = *role {
                    let choices = unit_choices(q);
                    let combo = egui::ComboBox::from_id_salt(("import-unit", i))
                        .selected_text(unit_text(q))
                        .show_ui(ui, |ui| {
                            for c in choices {
                                if ui.selectable_label(c == q, unit_text(c)).clicked() {
                                    *role = ColumnRole::Measure(c);
                                }
                            }
                        });
                    let _ = combo.response.labelled_by(header_label.id);
                    ui.label(format!("as {}", field_header(q.field_name())));
                } else {
                    ui.label("");
                    ui.label(if *role == ColumnRole::Date {
                        "date"
                    } else {
                        "(not imported)"
                    });
                }
                ui.end_row();
            }
        });
}

fn radio_row<T: PartialEq + Copy>(
    ui: &mut Ui,
    label: &str,
    value: &mut Option<T>,
    options: &[(Option<T>, &str)],
) {
    ui.horizontal_wrapped(|ui| {
        ui.label(label);
        for (v, text) in options {
            ui.radio_value(value, *v, *text);
        }
    });
}

fn settings_ui(ui: &mut Ui, job: &mut ImportJob) {
    ui.label(RichText::new("How to read the file").strong());
    mapping_table(ui, job);
    ui.horizontal(|ui| {
        let l = ui.label("Wind measurement height");
        ui.add(egui::TextEdit::singleline(&mut job.wind_height_text).desired_width(60.0))
            .labelled_by(l.id);
        ui.label("m above ground (blank: keep the station's)");
    });
    let ambiguous = job.result.as_ref().is_some_and(|r| r.ambiguous_dates);
    if ambiguous && job.settings.date_format.is_none() {
        ui.label(
            RichText::new(
                "The dates in this file do not say whether they are day/month or month/day \
                 (no day above 12). Choose the date order, then Re-read — Offtake never guesses it.",
            )
            .color(ui.visuals().error_fg_color),
        );
    }
    radio_row(
        ui,
        "Date order:",
        &mut job.settings.date_format,
        &[
            (None, "detect"),
            (Some(DateFormat::Iso), "ISO (year-month-day)"),
            (Some(DateFormat::DayMonthYear), "day/month/year"),
            (Some(DateFormat::MonthDayYear), "month/day/year"),
        ],
    );
    radio_row(
        ui,
        "Delimiter:",
        &mut job.settings.delimiter,
        &[
            (None, "detect delimiter"),
            (Some(Delimiter::Comma), "comma"),
            (Some(Delimiter::Semicolon), "semicolon"),
            (Some(Delimiter::Tab), "tab"),
        ],
    );
    radio_row(
        ui,
        "Decimal separator:",
        &mut job.settings.decimal,
        &[
            (None, "detect decimal"),
            (Some(DecimalSeparator::Point), "point (12.5)"),
            (Some(DecimalSeparator::Comma), "comma (12,5)"),
        ],
    );
    ui.horizontal(|ui| {
        let l = ui.label("Missing-value markers");
        ui.add(egui::TextEdit::singleline(&mut job.missing_text).desired_width(160.0))
            .labelled_by(l.id);
        ui.label("comma-separated, e.g. NA, -9999 (blank cells are always missing)");
    });
    ui.horizontal(|ui| {
        let l = ui.label("Station latitude");
        ui.add(egui::TextEdit::singleline(&mut job.latitude_text).desired_width(80.0))
            .labelled_by(l.id);
        ui.label("° (north positive)");
        let l = ui.label("Station elevation");
        ui.add(egui::TextEdit::singleline(&mut job.elevation_text).desired_width(80.0))
            .labelled_by(l.id);
        ui.label("m");
    });
    for e in job.station_problems() {
        ui.label(RichText::new(e).color(ui.visuals().error_fg_color));
    }
    if let Err(e) = job.settings_from_form() {
        ui.label(RichText::new(plain(&e)).color(ui.visuals().error_fg_color));
    }
    if ui.button("Re-read").clicked() {
        job.reread();
    }
}

fn preview_ui(ui: &mut Ui, r: &ReadResult) {
    if let (Some(a), Some(b)) = (r.days.first(), r.days.last()) {
        ui.label(format!(
            "{} days from {} to {} ({} lines read; dates read as {})",
            r.days.len(),
            a.date,
            b.date,
            r.lines,
            r.date_format.map_or("?", DateFormat::describe)
        ));
    }
    if !r.days.is_empty() {
        ui.label(RichText::new("First days, in Offtake's units").strong());
        egui::Grid::new("import-preview")
            .striped(true)
            .show(ui, |ui| {
                ui.label(RichText::new("Date").strong());
                for f in &r.fields {
                    ui.label(RichText::new(field_header(f)).strong());
                }
                ui.end_row();
                for d in r.days.iter().take(PREVIEW_DAYS) {
                    ui.label(d.date.to_string());
                    for f in &r.fields {
                        ui.label(
                            field_value(d, f)
                                .map_or_else(|| "—".to_owned(), |v| format_number(v, 2)),
                        );
                    }
                    ui.end_row();
                }
            });
    }
    if !r.problems.is_empty() {
        ui.label(
            RichText::new(format!(
                "{} rejected value(s) or row(s){}",
                r.problems.len() + r.problems_omitted,
                if r.problems_omitted > 0 {
                    format!(" (first {} listed)", r.problems.len())
                } else {
                    String::new()
                }
            ))
            .color(ui.visuals().error_fg_color),
        );
        for p in r.problems.iter().take(20) {
            ui.label(RichText::new(plain(p)).color(ui.visuals().error_fg_color));
        }
    }
    if r.warnings.is_empty() {
        ui.label("No import warnings.");
    } else {
        ui.label(RichText::new(format!("{} import warning(s)", r.warnings.len())).strong());
        for w in r.warnings.iter().take(10) {
            ui.label(RichText::new(plain(w)).color(ui.visuals().warn_fg_color));
        }
    }
}

fn quality_ui(ui: &mut Ui, r: &ReadResult) {
    if r.days.is_empty() {
        return;
    }
    ui.label(RichText::new("Quality report").strong());
    if let Some(e) = &r.quality_error {
        ui.label(RichText::new(e).color(ui.visuals().warn_fg_color));
    }
    let total: usize = r.flag_counts.iter().map(|(_, n)| n).sum();
    if total == 0 {
        ui.label(
            "No values flagged by the range, consistency, radiation, spike or flat-run rules.",
        );
    } else {
        ui.label(format!("{total} flagged value(s):"));
        for (rule, n) in &r.flag_counts {
            ui.label(format!("  {rule}: {n}"));
        }
        ui.label("First flagged values:");
        for f in &r.first_flags {
            ui.label(format!("  {f}"));
        }
    }
    let completeness: Vec<String> = r
        .completeness
        .iter()
        .filter(|(_, share)| *share > 0.0)
        .map(|(v, share)| format!("{v} {} %", format_number(share * 100.0, 1)))
        .collect();
    ui.label(format!(
        "Completeness over the record: {}",
        completeness.join(", ")
    ));
    let g = GapFillOptions::default();
    let long = match g.long_gaps {
        LongGapMethod::Fao56MissingData => "the FAO-56 missing-data procedures",
        LongGapMethod::Climatology => "the day-of-year climatology",
        _ => "the engine's long-gap method",
    };
    ui.label(RichText::new("Gap filling").strong());
    ui.label(format!(
        "Missing days inside the record: {} in gaps up to {} days (filled by linear interpolation), \
         {} in longer gaps (filled by {long}).",
        r.short_gap_days, g.max_interpolation_days, r.long_gap_days
    ));
    ui.label(
        RichText::new(
            "Counted with the default limits. The project's choice (interpolation limit in days, \
             and FAO-56 Chapter 3 missing-data procedures or the series' own day-of-year \
             climatology for longer gaps) is set in the Scheme inspector under Options.",
        )
        .weak(),
    );
}

/// Draws the window contents.
pub fn ui(ui: &mut Ui, job: &mut ImportJob) -> Option<ImportAnswer> {
    let mut answer = None;
    ui.label(RichText::new(job.path.display().to_string()).strong());
    // The answer buttons sit on top, visible however long the report is.
    ui.horizontal(|ui| {
        let usable = job.usable() && !job.running();
        if ui
            .add_enabled(usable, egui::Button::new("Use this weather"))
            .on_disabled_hover_text("Read the file without errors first (Re-read after changes)")
            .clicked()
        {
            let mut settings = job.settings.clone();
            if settings.date_format.is_none() {
                // Save the order the file was read with (ISO, or decided by
                // a day above 12) so a re-import reads it the same way.
                settings.date_format = job.result.as_ref().and_then(|r| r.date_format);
            }
            answer = Some(ImportAnswer::Use {
                path: job.path.clone(),
                settings,
                latitude_deg: parse_number(&job.latitude_text).ok(),
                elevation_m: parse_number(&job.elevation_text).ok(),
            });
        }
        if ui.button("Cancel").clicked() {
            if let Some(j) = &job.job {
                j.cancel.store(true, Ordering::Relaxed);
            }
            answer = Some(ImportAnswer::Cancel);
        }
    });
    ui.separator();
    if let Some(j) = &job.job {
        ui.horizontal(|ui| {
            ui.spinner();
            ui.label(format!(
                "Reading the weather file… {} lines read of {} kB",
                j.lines.load(Ordering::Relaxed),
                job.size_bytes / 1024
            ));
            if ui.button("Cancel reading").clicked() {
                j.cancel.store(true, Ordering::Relaxed);
            }
        });
        ui.ctx().request_repaint_after(Duration::from_millis(100));
    }
    if job.result.is_some() {
        egui::ScrollArea::vertical()
            .max_height(ui.available_height().max(300.0))
            .show(ui, |ui| {
                settings_ui(ui, job);
                ui.separator();
                if let Some(r) = &job.result {
                    if let Some(e) = &r.fatal {
                        ui.label(RichText::new(plain(e)).color(ui.visuals().error_fg_color));
                    }
                    preview_ui(ui, r);
                    ui.separator();
                    quality_ui(ui, r);
                }
            });
    }
    answer
}

#[cfg(test)]
mod tests {
    use super::{ColumnRole, gap_days, roles_of};
    use chrono::NaiveDate;
    use offtake_core::weather::WeatherDay;
    use offtake_core::weather_import::units::TemperatureUnit;
    use offtake_core::weather_import::{ColumnMapping, MappedColumn, Quantity};

    fn day(y: i32, m: u32, d: u32) -> WeatherDay {
        WeatherDay::empty(NaiveDate::from_ymd_opt(y, m, d).expect("valid date"))
    }

    #[test]
    fn gaps_are_split_at_the_interpolation_limit() {
        // 2 missing days (short), then 5 missing days (long).
        let days = [day(2031, 1, 1), day(2031, 1, 4), day(2031, 1, 10)];
        assert_eq!(gap_days(&days, 3), (2, 5));
        assert_eq!(gap_days(&days, 5), (7, 0));
    }

    #[test]
    fn roles_follow_the_mapping_case_insensitively() {
        let mapping = ColumnMapping {
            date_column: "Day".into(),
            columns: vec![MappedColumn {
                header: "Max Temp (F)".into(),
                quantity: Quantity::Tmax(TemperatureUnit::Fahrenheit),
            }],
        };
        let headers = [
            "day".to_owned(),
            "max temp (f)".to_owned(),
            "Notes".to_owned(),
        ];
        let roles: Vec<ColumnRole> = roles_of(&headers, Some(&mapping))
            .into_iter()
            .map(|(_, r)| r)
            .collect();
        assert_eq!(
            roles,
            [
                ColumnRole::Date,
                ColumnRole::Measure(Quantity::Tmax(TemperatureUnit::Fahrenheit)),
                ColumnRole::Ignore
            ]
        );
    }
}
