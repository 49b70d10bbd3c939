//! The weather import window: the file is read on a background thread, then
//! its days, date range, columns, first rows and warnings are shown for
//! confirmation before the series is attached to the project.
//!
//! Files with Offtake's own column names (DESIGN.md) are imported directly.
//! For other headers the window shows the column mapping offtake-io guesses
//! (header, quantity and unit) so the user can see what would be needed.

use std::path::{Path, PathBuf};
use std::sync::mpsc::{self, Receiver, TryRecvError};
use std::time::Duration;

use egui::{RichText, Ui};
use offtake_core::weather::WeatherDay;

/// What the background read found.
#[derive(Debug, Clone)]
pub struct Preview {
    /// The file.
    pub path: PathBuf,
    /// Number of accepted days.
    pub days: usize,
    /// First and last date.
    pub range: Option<(chrono::NaiveDate, chrono::NaiveDate)>,
    /// Columns present (Offtake names).
    pub fields: Vec<&'static str>,
    /// The first days.
    pub first_rows: Vec<WeatherDay>,
    /// Import warnings (file:line:column: reason).
    pub warnings: Vec<String>,
}

/// Outcome of the background read.
#[derive(Debug, Clone)]
pub enum ImportOutcome {
    /// The file was read.
    Read(Preview),
    /// The file could not be read; the error and the guessed mapping of its header.
    Failed {
        /// The file.
        path: PathBuf,
        /// The error with its position.
        error: String,
        /// Header and quantity guesses.
        guesses: Vec<String>,
    },
}

/// A running or finished import.
#[derive(Debug)]
pub struct ImportJob {
    rx: Option<Receiver<ImportOutcome>>,
    /// The result, once the thread finished.
    pub outcome: Option<ImportOutcome>,
}

fn read(path: &Path) -> ImportOutcome {
    use offtake_io::weather::{ImportOptions, guess_mapping, import_weather_file};
    match import_weather_file(path, &ImportOptions::default()) {
        Ok(series) => ImportOutcome::Read(Preview {
            path: path.to_path_buf(),
            days: series.days.len(),
            range: series
                .days
                .first()
                .zip(series.days.last())
                .map(|(a, b)| (a.date, b.date)),
            fields: series.fields.clone(),
            first_rows: series.days.iter().take(5).copied().collect(),
            warnings: series.warnings.iter().map(ToString::to_string).collect(),
        }),
        Err(e) => {
            let header = std::fs::read_to_string(path)
                .ok()
                .and_then(|t| t.lines().next().map(str::to_owned))
                .unwrap_or_default();
            let headers: Vec<&str> = header.split([',', ';', '\t']).collect();
            let guess = guess_mapping(&headers);
            let mut guesses = vec![format!("date column: {:?}", guess.mapping.date_column)];
            guesses.extend(
                guess
                    .mapping
                    .columns
                    .iter()
                    .map(|c| format!("{:?} is {:?}", c.header, c.quantity)),
            );
            guesses.extend(
                guess
                    .unassigned
                    .iter()
                    .map(|h| format!("{h:?} is not recognised")),
            );
            ImportOutcome::Failed {
                path: path.to_path_buf(),
                error: e.to_string(),
                guesses,
            }
        }
    }
}

impl ImportJob {
    /// Starts reading `path` on a background thread.
    pub fn start(path: PathBuf) -> Self {
        let (tx, rx) = mpsc::channel();
        let spawned = std::thread::Builder::new()
            .name("offtake-weather-import".to_owned())
            .spawn(move || {
                // The window may be closed before the read ends.
                let _ = tx.send(read(&path));
            });
        match spawned {
            Ok(_) => Self {
                rx: Some(rx),
                outcome: None,
            },
            Err(e) => Self {
                rx: None,
                outcome: Some(ImportOutcome::Failed {
                    path: PathBuf::new(),
                    error: format!("could not start the import thread: {e}"),
                    guesses: Vec::new(),
                }),
            },
        }
    }

    /// Collects the result if the thread finished (never blocks).
    pub fn poll(&mut self) {
        if let Some(rx) = &self.rx {
            match rx.try_recv() {
                Ok(o) => {
                    self.outcome = Some(o);
                    self.rx = None;
                }
                Err(TryRecvError::Empty) => {}
                Err(TryRecvError::Disconnected) => {
                    self.rx = None;
                    self.outcome = Some(ImportOutcome::Failed {
                        path: PathBuf::new(),
                        error: "the import stopped unexpectedly".to_owned(),
                        guesses: Vec::new(),
                    });
                }
            }
        }
    }

    /// Blocks until the read finishes (tests only).
    pub fn wait(&mut self, timeout: Duration) {
        if let Some(rx) = &self.rx
            && let Ok(o) = rx.recv_timeout(timeout)
        {
            self.outcome = Some(o);
            self.rx = None;
        }
    }

    /// Whether the thread is still reading.
    pub fn running(&self) -> bool {
        self.outcome.is_none()
    }
}

fn opt(v: Option<f64>) -> String {
    v.map_or_else(|| "—".to_owned(), |x| format!("{x:.1}"))
}

/// What the user chose in the window.
#[derive(Debug, Clone, PartialEq)]
pub enum ImportAnswer {
    /// Attach this file to the project.
    Attach(PathBuf),
    /// Close the window.
    Cancel,
}

/// Draws the window contents.
pub fn ui(ui: &mut Ui, job: &ImportJob) -> Option<ImportAnswer> {
    let mut answer = None;
    match &job.outcome {
        None => {
            ui.horizontal(|ui| {
                ui.label("Reading the weather file…");
            });
            ui.ctx().request_repaint_after(Duration::from_millis(50));
        }
        Some(ImportOutcome::Read(p)) => {
            ui.label(RichText::new(p.path.display().to_string()).strong());
            if let Some((a, b)) = p.range {
                ui.label(format!("{} days from {a} to {b}", p.days));
            }
            ui.label(format!("Columns: {}", p.fields.join(", ")));
            egui::Grid::new("weather-preview")
                .striped(true)
                .show(ui, |ui| {
                    for h in [
                        "Date",
                        "Tmax (°C)",
                        "Tmin (°C)",
                        "RHmean (%)",
                        "Wind (m/s)",
                        "Solar (MJ/m²/day)",
                        "Rain (mm)",
                    ] {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for d in &p.first_rows {
                        ui.label(d.date.to_string());
                        ui.label(opt(d.tmax_c));
                        ui.label(opt(d.tmin_c));
                        ui.label(opt(d.rhmean_pct));
                        ui.label(opt(d.wind_ms));
                        ui.label(opt(d.solar_mj));
                        ui.label(opt(d.rain_mm));
                        ui.end_row();
                    }
                });
            if p.warnings.is_empty() {
                ui.label("No warnings.");
            } else {
                ui.label(RichText::new(format!("{} warning(s)", p.warnings.len())).strong());
                for w in p.warnings.iter().take(8) {
                    ui.label(RichText::new(w).color(ui.visuals().warn_fg_color));
                }
            }
            ui.horizontal(|ui| {
                if ui.button("Attach to project").clicked() {
                    answer = Some(ImportAnswer::Attach(p.path.clone()));
                }
                if ui.button("Cancel").clicked() {
                    answer = Some(ImportAnswer::Cancel);
                }
            });
        }
        Some(ImportOutcome::Failed {
            path,
            error,
            guesses,
        }) => {
            ui.label(RichText::new(path.display().to_string()).strong());
            ui.label(RichText::new(error).color(ui.visuals().error_fg_color));
            if guesses.len() > 1 {
                ui.label("The columns offtake-io recognises in this header:");
                for g in guesses {
                    ui.label(g);
                }
                ui.label(
                    "Rename the columns to Offtake's names (date, tmax_c, tmin_c, rhmean_pct, wind_ms, \
                     solar_mj, rain_mm, …) to import the file here.",
                );
            }
            if ui.button("Close").clicked() {
                answer = Some(ImportAnswer::Cancel);
            }
        }
    }
    answer
}
