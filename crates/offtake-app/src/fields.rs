//! Inspector form fields with units and inline validation.
//!
//! Each field shows its label, a text box and its unit. The text the user
//! types is kept while the box has focus; it is committed (returned to the
//! caller, who turns it into an undoable edit) when the box loses focus or on
//! Enter. Validation runs on every keystroke and its message sits under the
//! field. A value outside its allowed range is **kept and shown** with the
//! reason and the range ("Application efficiency must be between 1 % and
//! 100 %"); text that is not a number is kept in the box and never reaches
//! the document.

use chrono::NaiveDate;
use egui::{Id, RichText, TextEdit, Ui};

/// The allowed range of a numeric field, in the units shown to the user.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bounds {
    /// What the value is, capitalised ("Application efficiency").
    pub what: &'static str,
    /// Unit shown after the field ("%", "ha", "l/s"); empty for none.
    pub unit: &'static str,
    /// Lowest allowed value (display units).
    pub min: f64,
    /// Highest allowed value (display units).
    pub max: f64,
    /// Display value = stored value × factor (100 for a fraction shown in %).
    pub factor: f64,
}

impl Bounds {
    /// A range in the stored units (factor 1).
    pub const fn new(what: &'static str, unit: &'static str, min: f64, max: f64) -> Self {
        Self {
            what,
            unit,
            min,
            max,
            factor: 1.0,
        }
    }

    /// The physical range of a limit of the core's table
    /// (`offtake_core::limits`), shown as `what` in `unit`, display value =
    /// stored value × `factor`. Open ends are shown as their end value; the
    /// core's validation refuses the end itself.
    pub const fn from_limit(
        what: &'static str,
        unit: &'static str,
        limit: &offtake_core::limits::Limit,
        factor: f64,
    ) -> Self {
        Self {
            what,
            unit,
            min: limit.physical.min.value() * factor,
            max: limit.physical.max.value() * factor,
            factor,
        }
    }

    /// The same range for a value stored as a fraction and shown in %.
    #[must_use]
    pub const fn percent_of_fraction(mut self) -> Self {
        self.factor = 100.0;
        self
    }

    fn with_unit(&self, v: f64) -> String {
        let n = format_number(v, 6);
        match self.unit {
            "" => n,
            "%" => format!("{n} %"),
            u => format!("{n} {u}"),
        }
    }

    /// Checks a value in display units; the error names the allowed range.
    ///
    /// # Errors
    /// A message like "Application efficiency must be between 1 % and 100 %".
    pub fn check(&self, display_value: f64) -> Result<(), String> {
        if !display_value.is_finite() {
            return Err(format!("{} must be a finite number", self.what));
        }
        if display_value < self.min || display_value > self.max {
            return Err(format!(
                "{} must be between {} and {}",
                self.what,
                self.with_unit(self.min),
                self.with_unit(self.max)
            ));
        }
        Ok(())
    }
}

/// Formats a number with at most `decimals` decimals and no trailing zeros.
pub fn format_number(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    if s.contains('.') {
        let t = s.trim_end_matches('0').trim_end_matches('.');
        if t == "-0" {
            "0".to_owned()
        } else {
            t.to_owned()
        }
    } else {
        s
    }
}

/// A number to `sig` significant figures, without exponent, keeping the
/// trailing zeros that are significant so a column reads alike (5575 →
/// "5580", 1.9163 → "1.92", 32.0 → "32.0", 0.0412 → "0.0412"). Non-finite
/// values show as "—".
pub fn format_sig(v: f64, sig: i32) -> String {
    if !v.is_finite() {
        return "—".to_owned();
    }
    if v == 0.0 {
        return "0".to_owned();
    }
    let magnitude = v.abs().log10().floor() as i32;
    let factor = 10f64.powi(sig - 1 - magnitude);
    let rounded = (v * factor).round() / factor;
    // Rounding may add a digit (99.96 → 100.0 at 3 figures → "100").
    let magnitude = rounded.abs().log10().floor() as i32;
    let decimals = usize::try_from((sig - 1 - magnitude).max(0)).unwrap_or(0);
    format!("{rounded:.decimals$}")
}

/// Parses what the user typed as a number in display units.
///
/// # Errors
/// "Not a number" with the text, for text that does not parse.
pub fn parse_number(text: &str) -> Result<f64, String> {
    let t = text.trim().replace(['\u{202f}', ' '], "");
    t.parse::<f64>()
        .ok()
        .filter(|v| v.is_finite())
        .ok_or_else(|| format!("“{}” is not a number", text.trim()))
}

/// Result of drawing a field this frame.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldOutcome<T> {
    /// A value to commit (the field lost focus or Enter was pressed with a new value).
    pub committed: Option<T>,
    /// The validation message shown under the field, if any.
    pub error: Option<String>,
}

/// Draws `label`, a text box with `text`, and `unit`, with the in-progress
/// text kept in egui's temporary memory under `id` while the box is focused.
/// Returns the response and the current text.
fn text_box(ui: &mut Ui, id: Id, label: &str, unit: &str, shown: &str) -> (egui::Response, String) {
    let mut text = ui
        .data(|d| d.get_temp::<String>(id))
        .unwrap_or_else(|| shown.to_owned());
    let response = ui
        .horizontal(|ui| {
            let label_resp = ui.label(label);
            let r = ui
                .add(
                    TextEdit::singleline(&mut text)
                        .id(id)
                        .desired_width(if unit.is_empty() { 170.0 } else { 90.0 }),
                )
                .labelled_by(label_resp.id);
            if !unit.is_empty() {
                ui.label(unit);
            }
            r
        })
        .inner;
    if response.has_focus() {
        ui.data_mut(|d| d.insert_temp(id, text.clone()));
    } else {
        ui.data_mut(|d| d.remove::<String>(id));
    }
    (response, text)
}

fn error_line(ui: &mut Ui, error: Option<&String>) {
    if let Some(e) = error {
        ui.label(RichText::new(e).color(ui.visuals().error_fg_color));
    }
}

/// A numeric field. `stored` is the document value (stored units).
/// Returns the value to commit in stored units, and the validation message.
pub fn number_field(
    ui: &mut Ui,
    id: Id,
    label: &str,
    stored: f64,
    bounds: &Bounds,
    decimals: usize,
) -> FieldOutcome<f64> {
    let display = stored * bounds.factor;
    let (response, text) = text_box(
        ui,
        id,
        label,
        bounds.unit,
        &format_number(display, decimals),
    );
    let parsed = parse_number(&text);
    let error = match &parsed {
        Ok(v) => bounds.check(*v).err(),
        Err(e) => Some(e.clone()),
    };
    error_line(ui, error.as_ref());
    let committed = match parsed {
        Ok(v) if response.lost_focus() && format_number(v, 12) != format_number(display, 12) => {
            Some(v / bounds.factor)
        }
        _ => None,
    };
    FieldOutcome { committed, error }
}

/// A text field (names). Empty names are an error, kept and shown.
pub fn name_field(ui: &mut Ui, id: Id, label: &str, stored: &str) -> FieldOutcome<String> {
    let (response, text) = text_box(ui, id, label, "", stored);
    let error = text
        .trim()
        .is_empty()
        .then(|| format!("{label} must not be empty"));
    error_line(ui, error.as_ref());
    let committed = (response.lost_focus() && text != stored).then_some(text);
    FieldOutcome { committed, error }
}

/// A date field in ISO form (2031-04-15).
pub fn date_field(ui: &mut Ui, id: Id, label: &str, stored: NaiveDate) -> FieldOutcome<NaiveDate> {
    let (response, text) = text_box(ui, id, label, "(YYYY-MM-DD)", &stored.to_string());
    let parsed = NaiveDate::parse_from_str(text.trim(), "%Y-%m-%d").map_err(|_| {
        format!(
            "“{}” is not a date; write it as YYYY-MM-DD, e.g. 2031-04-15",
            text.trim()
        )
    });
    let error = parsed.as_ref().err().cloned();
    error_line(ui, error.as_ref());
    let committed = match parsed {
        Ok(d) if response.lost_focus() && d != stored => Some(d),
        _ => None,
    };
    FieldOutcome { committed, error }
}

#[cfg(test)]
mod tests {
    use super::{Bounds, format_number, format_sig, parse_number};

    #[test]
    fn three_significant_figures() {
        assert_eq!(format_sig(5575.0, 3), "5580");
        assert_eq!(format_sig(19_355.0, 3), "19400");
        assert_eq!(format_sig(1.9163, 3), "1.92");
        assert_eq!(format_sig(0.041_23, 3), "0.0412");
        assert_eq!(format_sig(120.04, 3), "120");
        assert_eq!(format_sig(0.0, 3), "0");
        assert_eq!(format_sig(f64::NAN, 3), "—");
        assert_eq!(format_sig(32.0, 3), "32.0");
        assert_eq!(format_sig(99.96, 3), "100");
        assert_eq!(format_sig(1.5, 3), "1.50");
        assert_eq!(format_sig(-0.5, 2), "-0.50");
    }

    #[test]
    fn range_message_names_quantity_range_and_unit() {
        let b = Bounds::new("Application efficiency", "%", 1.0, 100.0).percent_of_fraction();
        assert_eq!(
            b.check(120.0),
            Err("Application efficiency must be between 1 % and 100 %".to_owned())
        );
        assert_eq!(b.check(65.0), Ok(()));
        let area = Bounds::new("Area", "ha", 0.0, 1.0e6);
        assert_eq!(
            area.check(-2.0),
            Err("Area must be between 0 ha and 1000000 ha".to_owned())
        );
    }

    #[test]
    fn numbers_parse_and_format_plainly() {
        assert_eq!(parse_number(" 12.5 "), Ok(12.5));
        assert!(parse_number("abc").is_err());
        assert!(parse_number("NaN").is_err());
        assert_eq!(format_number(0.650_000, 3), "0.65");
        assert_eq!(format_number(12.0, 2), "12");
        assert_eq!(format_number(-0.0001, 2), "0");
    }
}

/// Parses a day of the year written `MM-DD` (04-15); 29 February is refused
/// because a cropping plan must exist in every year.
///
/// # Errors
/// A message naming the expected form.
pub fn parse_month_day(text: &str) -> Result<(u32, u32), String> {
    let bad = || {
        format!(
            "“{}” is not a day of the year; write it as MM-DD, e.g. 04-15 (29 February is not allowed)",
            text.trim()
        )
    };
    let (m, d) = text.trim().split_once('-').ok_or_else(bad)?;
    let month: u32 = m.trim().parse().map_err(|_| bad())?;
    let day: u32 = d.trim().parse().map_err(|_| bad())?;
    // 2001 is not a leap year.
    NaiveDate::from_ymd_opt(2001, month, day).ok_or_else(bad)?;
    Ok((month, day))
}

/// A day-of-year field (`MM-DD`) for dates that repeat every year.
pub fn date_free_month_day(
    ui: &mut Ui,
    id: Id,
    label: &str,
    stored: (u32, u32),
) -> FieldOutcome<(u32, u32)> {
    let shown = format!("{:02}-{:02}", stored.0, stored.1);
    let (response, text) = text_box(ui, id, label, "(MM-DD, every year)", &shown);
    let parsed = parse_month_day(&text);
    let error = parsed.as_ref().err().cloned();
    error_line(ui, error.as_ref());
    let committed = match parsed {
        Ok(md) if response.lost_focus() && md != stored => Some(md),
        _ => None,
    };
    FieldOutcome { committed, error }
}

/// A calendar beside a month-day field: *Pick on a calendar* opens a month
/// chooser and the days of that month (of a common year: the planting
/// window repeats every year, so 29 February is not offered). Returns the
/// day clicked, if it differs from `stored`.
pub fn month_day_calendar(
    ui: &mut Ui,
    id: Id,
    label: &str,
    stored: (u32, u32),
) -> Option<(u32, u32)> {
    let open_id = id.with("calendar-open");
    let month_id = id.with("calendar-month");
    let mut open = ui.data(|d| d.get_temp::<bool>(open_id)).unwrap_or(false);
    let toggle = ui
        .button(if open {
            format!("Close the {label} calendar")
        } else {
            format!("Pick {label} on a calendar")
        })
        .clicked();
    if toggle {
        open = !open;
        ui.data_mut(|d| d.insert_temp(month_id, stored.0));
    }
    let mut picked = None;
    if open {
        let mut month = ui
            .data(|d| d.get_temp::<u32>(month_id))
            .unwrap_or(stored.0)
            .clamp(1, 12);
        let name = |m: u32| {
            chrono::NaiveDate::from_ymd_opt(2001, m, 1)
                .map_or_else(String::new, |d| d.format("%B").to_string())
        };
        egui::Frame::group(ui.style()).show(ui, |ui| {
            egui::ComboBox::new(month_id, "Month")
                .selected_text(name(month))
                .show_ui(ui, |ui| {
                    for m in 1..=12 {
                        ui.selectable_value(&mut month, m, name(m));
                    }
                });
            // A common (non-leap) year: 2001.
            let days = offtake_core::calendar::days_in_month(2001, month).unwrap_or(31);
            egui::Grid::new(id.with("calendar-days")).show(ui, |ui| {
                for d in 1..=days {
                    let selected = (month, d) == stored;
                    if ui
                        .selectable_label(selected, d.to_string())
                        .on_hover_text(format!("{} {d}", name(month)))
                        .clicked()
                    {
                        picked = Some((month, d));
                    }
                    if d % 7 == 0 {
                        ui.end_row();
                    }
                }
            });
        });
        ui.data_mut(|d| d.insert_temp(month_id, month));
        if picked.is_some() {
            open = false;
        }
    }
    ui.data_mut(|d| d.insert_temp(open_id, open));
    picked.filter(|md| *md != stored)
}

#[cfg(test)]
mod month_day_tests {
    use super::parse_month_day;

    #[test]
    fn month_day_parses_and_refuses_leap_day() {
        assert_eq!(parse_month_day("04-15"), Ok((4, 15)));
        assert!(parse_month_day("02-29").is_err());
        assert!(parse_month_day("13-01").is_err());
        assert!(parse_month_day("April").is_err());
    }
}
