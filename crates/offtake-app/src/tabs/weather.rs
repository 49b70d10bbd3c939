//! The Weather & ET₀ tab: daily ET₀ and rain of a chosen year over the
//! day-of-year ET₀ climatology (10 % and 90 % of years), computed in the
//! background from the project's weather series.

use chrono::Datelike;
use egui::{RichText, Ui};

use super::{View, empty_state, no_project};
use crate::command::Command;
use crate::palette::OKABE_ITO;
use crate::plot::{self, PlotSpec, Series, SeriesKind, XAxis, date_to_x};

/// View state of the Weather & ET₀ tab.
#[derive(Debug, Default)]
pub struct WeatherTab {
    /// The year shown; `None` = the last complete one in the record.
    pub year: Option<i32>,
}

impl WeatherTab {
    /// Draws the tab from the cached results.
    pub fn ui(&mut self, ui: &mut Ui, view: &View<'_>, commands: &mut Vec<Command>) {
        let Some(project) = view.project else {
            no_project(
                ui,
                "This tab shows the weather series: daily ET₀ (mm/day) and rain (mm) for a chosen year.",
            );
            return;
        };
        if project.weather.path.trim().is_empty() {
            empty_state(
                ui,
                "No weather yet — File › Import weather…",
                "Daily ET₀ and rain appear here once a weather series is attached to the project.",
            );
            return;
        }
        let Some(w) = view.computed.and_then(|c| c.weather.as_ref()) else {
            empty_state(
                ui,
                &format!("Weather series: {}", project.weather.path),
                "The series could not be read or is being computed; the status bar counts the problems and the Scheme inspector lists them.",
            );
            return;
        };
        let mut years: Vec<i32> = w.dates.iter().map(Datelike::year).collect();
        years.dedup();
        let Some(&last) = years.last() else {
            empty_state(
                ui,
                "The weather series has no days",
                "Check the file in a text editor.",
            );
            return;
        };
        let year = self.year.filter(|y| years.contains(y)).unwrap_or(last);
        ui.horizontal(|ui| {
            let mut chosen = year;
            egui::ComboBox::from_label("Year")
                .selected_text(chosen.to_string())
                .show_ui(ui, |ui| {
                    for y in &years {
                        ui.selectable_value(&mut chosen, *y, y.to_string());
                    }
                });
            if chosen != year {
                self.year = Some(chosen);
            }
            ui.label(
                RichText::new(format!(
                    "{} days from {} to {}; {} day(s) with ET₀ from FAO-56 missing-data procedures",
                    w.dates.len(),
                    w.dates
                        .first()
                        .map_or_else(String::new, ToString::to_string),
                    w.dates.last().map_or_else(String::new, ToString::to_string),
                    w.estimated_days
                ))
                .weak(),
            );
        });
        let in_year = |i: &usize| w.dates[*i].year() == year;
        let et0: Vec<[f64; 2]> = (0..w.dates.len())
            .filter(in_year)
            .filter_map(|i| w.et0_mm[i].map(|v| [date_to_x(w.dates[i]), v]))
            .collect();
        // Days whose ET₀ rests on a FAO-56 missing-data procedure, marked on
        // the ET₀ line; flagged days (quality rules) marked at their ET₀, or
        // at 0 where ET₀ could not be computed.
        let estimated: Vec<[f64; 2]> = (0..w.dates.len())
            .filter(in_year)
            .filter(|i| w.estimated.get(*i).copied().unwrap_or(false))
            .filter_map(|i| w.et0_mm[i].map(|v| [date_to_x(w.dates[i]), v]))
            .collect();
        let et0_on = |date: chrono::NaiveDate| {
            w.dates
                .binary_search(&date)
                .ok()
                .and_then(|i| w.et0_mm[i])
                .unwrap_or(0.0)
        };
        let mut flagged: Vec<[f64; 2]> = w
            .flags
            .iter()
            .filter(|(d, _)| d.year() == year)
            .map(|(d, _)| [date_to_x(*d), et0_on(*d)])
            .collect();
        flagged.dedup();
        let flags_this_year: Vec<&str> = w
            .flags
            .iter()
            .filter(|(d, _)| d.year() == year)
            .map(|(_, t)| t.as_str())
            .collect();
        let rain: Vec<[f64; 2]> = (0..w.dates.len())
            .filter(in_year)
            .filter_map(|i| {
                w.rain_mm[i]
                    .filter(|r| *r > 0.0)
                    .map(|v| [date_to_x(w.dates[i]), v])
            })
            .collect();
        let band = |pick: fn(&offtake_core::climate_stats::DayOfYearBand) -> f64| -> Vec<[f64; 2]> {
            w.et0_band
                .iter()
                .filter_map(|b| {
                    chrono::NaiveDate::from_ymd_opt(year, b.month, b.day)
                        .map(|d| [date_to_x(d), pick(b)])
                })
                .collect()
        };
        let grey = egui::Color32::from_gray(150);
        let spec = PlotSpec {
            id: format!("weather-{year}"),
            x: XAxis::Date,
            y_title: "ET₀ and rain (mm/day)".to_owned(),
            y_unit: "mm/day".to_owned(),
            series: vec![
                Series {
                    name: "Rain".to_owned(),
                    points: rain,
                    colour: OKABE_ITO[1],
                    style: egui_plot::LineStyle::Solid,
                    kind: SeriesKind::Bars { width: 1.0 },
                },
                // The band of the day-of-year climatology: one span per
                // day from the 10 % to the 90 % value of all years.
                Series {
                    name: "ET₀ of the record, 10–90 % of years (day of year)".to_owned(),
                    points: band(|b| b.p10)
                        .iter()
                        .zip(band(|b| b.p90))
                        .flat_map(|(lo, hi)| [[lo[0] - 0.5, hi[1] - lo[1]], [lo[0] + 0.5, lo[1]]])
                        .collect(),
                    colour: grey,
                    style: egui_plot::LineStyle::Solid,
                    kind: SeriesKind::Spans,
                },
                Series::line(format!("ET₀ {year}"), et0, OKABE_ITO[0]),
                Series {
                    name: "ET₀ from FAO-56 missing-data procedures".to_owned(),
                    points: estimated,
                    colour: OKABE_ITO[3],
                    style: egui_plot::LineStyle::Solid,
                    kind: SeriesKind::Points { radius: 2.5 },
                },
                Series {
                    name: "Flagged by the quality checks".to_owned(),
                    points: flagged,
                    colour: OKABE_ITO[5],
                    style: egui_plot::LineStyle::Solid,
                    kind: SeriesKind::Points { radius: 4.0 },
                },
            ],
        };
        if !flags_this_year.is_empty() {
            let mut shown: Vec<&str> = flags_this_year.clone();
            shown.dedup();
            ui.label(
                RichText::new(format!(
                    "{} quality flag(s) in {year}: {}",
                    flags_this_year.len(),
                    shown.into_iter().take(4).collect::<Vec<_>>().join(", ")
                ))
                .color(ui.visuals().warn_fg_color),
            );
        }
        plot::show(ui, &spec, commands);
    }
}
