//! Quality checks of a daily weather series.
//!
//! The checks flag suspicious values and never change data. Each [`Flag`]
//! names the day, the variable and the [`Rule`] that raised it; the
//! [`QualitySummary`] gives completeness per variable and year, flag counts
//! and the worst runs of missing days.
//!
//! The clear-sky radiation and daylight-hours rules need Rso and N for each
//! day; the caller supplies them (see [`DayAstronomy`]) so the checks stay
//! independent of the ET₀ method used. With no astronomy those two rules are
//! skipped, and the report says so ([`QualityReport::radiation_rules_applied`]).

use std::collections::BTreeMap;
use std::fmt;

use chrono::{Datelike, NaiveDate};

use crate::et0::Et0Error;
use crate::et0::daily::DaySun;
use crate::et0::radiation::clear_sky_radiation_mj;
use crate::weather::{StationSite, WeatherDay};

/// A daily weather variable (a field of [`WeatherDay`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
#[non_exhaustive]
pub enum Variable {
    /// Maximum air temperature (°C).
    Tmax,
    /// Minimum air temperature (°C).
    Tmin,
    /// Mean air temperature (°C).
    Tmean,
    /// Maximum relative humidity (%).
    RhMax,
    /// Minimum relative humidity (%).
    RhMin,
    /// Mean relative humidity (%).
    RhMean,
    /// Dewpoint temperature (°C).
    Tdew,
    /// Actual vapour pressure (kPa).
    Ea,
    /// Wind speed (m/s).
    Wind,
    /// Solar radiation (MJ m⁻² day⁻¹).
    Solar,
    /// Sunshine duration (h).
    Sunshine,
    /// Precipitation (mm).
    Rain,
}

impl Variable {
    /// All variables, in the order of the weather CSV columns.
    pub const ALL: [Self; 12] = [
        Self::Tmax,
        Self::Tmin,
        Self::Tmean,
        Self::RhMax,
        Self::RhMin,
        Self::RhMean,
        Self::Tdew,
        Self::Ea,
        Self::Wind,
        Self::Solar,
        Self::Sunshine,
        Self::Rain,
    ];

    /// The weather CSV column (and `WeatherDay` field) name.
    pub fn name(self) -> &'static str {
        match self {
            Self::Tmax => "tmax_c",
            Self::Tmin => "tmin_c",
            Self::Tmean => "tmean_c",
            Self::RhMax => "rhmax_pct",
            Self::RhMin => "rhmin_pct",
            Self::RhMean => "rhmean_pct",
            Self::Tdew => "tdew_c",
            Self::Ea => "ea_kpa",
            Self::Wind => "wind_ms",
            Self::Solar => "solar_mj",
            Self::Sunshine => "sunshine_h",
            Self::Rain => "rain_mm",
        }
    }

    /// Position in [`Variable::ALL`].
    pub fn index(self) -> usize {
        self as usize
    }

    /// The day's value of this variable.
    pub fn get(self, day: &WeatherDay) -> Option<f64> {
        match self {
            Self::Tmax => day.tmax_c,
            Self::Tmin => day.tmin_c,
            Self::Tmean => day.tmean_c,
            Self::RhMax => day.rhmax_pct,
            Self::RhMin => day.rhmin_pct,
            Self::RhMean => day.rhmean_pct,
            Self::Tdew => day.tdew_c,
            Self::Ea => day.ea_kpa,
            Self::Wind => day.wind_ms,
            Self::Solar => day.solar_mj,
            Self::Sunshine => day.sunshine_h,
            Self::Rain => day.rain_mm,
        }
    }

    /// Sets the day's value of this variable.
    pub fn set(self, day: &mut WeatherDay, value: Option<f64>) {
        let slot = match self {
            Self::Tmax => &mut day.tmax_c,
            Self::Tmin => &mut day.tmin_c,
            Self::Tmean => &mut day.tmean_c,
            Self::RhMax => &mut day.rhmax_pct,
            Self::RhMin => &mut day.rhmin_pct,
            Self::RhMean => &mut day.rhmean_pct,
            Self::Tdew => &mut day.tdew_c,
            Self::Ea => &mut day.ea_kpa,
            Self::Wind => &mut day.wind_ms,
            Self::Solar => &mut day.solar_mj,
            Self::Sunshine => &mut day.sunshine_h,
            Self::Rain => &mut day.rain_mm,
        };
        *slot = value;
    }
}

impl fmt::Display for Variable {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// The rule that raised a flag.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
#[non_exhaustive]
pub enum Rule {
    /// Tmin above Tmax. `value` = Tmin, `limit` = Tmax.
    TminAboveTmax,
    /// A temperature outside the plausible limits. `limit` = the limit crossed.
    TemperatureOutOfRange,
    /// Relative humidity above 100 % or below 0 % beyond the tolerance.
    /// `limit` = the limit crossed (tolerance included).
    HumidityOutOfRange,
    /// Dewpoint above Tmax. `limit` = Tmax.
    DewpointAboveTmax,
    /// Solar radiation above clear-sky radiation Rso (times the tolerance).
    /// `limit` = the limit in MJ m⁻² day⁻¹.
    SolarAboveClearSky,
    /// Solar radiation below the low fraction of Rso. `limit` = that value.
    SolarImplausiblyLow,
    /// Sunshine hours above the daylight hours N (plus tolerance). `limit` = N + tolerance.
    SunshineAboveDaylight,
    /// A negative wind, rain, radiation, sunshine or vapour pressure. `limit` = 0.
    Negative,
    /// A day-to-day jump beyond the threshold. `value` = today's value,
    /// `limit` = yesterday's value.
    Spike,
    /// The same value on at least the configured number of consecutive days
    /// (every day of the run is flagged). `limit` = the run's length in days.
    FlatRun,
}

impl Rule {
    /// All rules.
    pub const ALL: [Self; 10] = [
        Self::TminAboveTmax,
        Self::TemperatureOutOfRange,
        Self::HumidityOutOfRange,
        Self::DewpointAboveTmax,
        Self::SolarAboveClearSky,
        Self::SolarImplausiblyLow,
        Self::SunshineAboveDaylight,
        Self::Negative,
        Self::Spike,
        Self::FlatRun,
    ];

    /// Short snake_case name used in reports.
    pub fn name(self) -> &'static str {
        match self {
            Self::TminAboveTmax => "tmin_above_tmax",
            Self::TemperatureOutOfRange => "temperature_out_of_range",
            Self::HumidityOutOfRange => "humidity_out_of_range",
            Self::DewpointAboveTmax => "dewpoint_above_tmax",
            Self::SolarAboveClearSky => "solar_above_clear_sky",
            Self::SolarImplausiblyLow => "solar_implausibly_low",
            Self::SunshineAboveDaylight => "sunshine_above_daylight",
            Self::Negative => "negative",
            Self::Spike => "spike",
            Self::FlatRun => "flat_run",
        }
    }
}

impl fmt::Display for Rule {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Thresholds of the quality rules.
///
/// Defaults are screening values of common practice (marked so), chosen to
/// catch gross errors and stuck sensors while rarely flagging real weather;
/// tighten them for a known climate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct QualityRules {
    /// Lowest plausible air or dewpoint temperature (°C). Default −60 °C
    /// (common practice; below the coldest temperatures of any irrigated region).
    pub temperature_min_c: f64,
    /// Highest plausible air or dewpoint temperature (°C). Default 60 °C
    /// (common practice; above the highest reliably measured air temperatures,
    /// about 57 °C \[from memory\]).
    pub temperature_max_c: f64,
    /// Relative humidity tolerance beyond 0–100 % (percentage points).
    /// Default 3 (common practice: capacitive sensors in fog read up to about 103 %).
    pub humidity_tolerance_pct: f64,
    /// Rs may exceed Rso by this factor before it is flagged. Default 1.05
    /// (common practice: Rso of FAO-56 eq. 37 is an estimate, and cloud-edge
    /// reflections briefly raise Rs).
    pub solar_above_rso_factor: f64,
    /// Rs below this fraction of Rso is flagged as implausibly low. Default
    /// 0.10 (common practice; for a sunless day FAO-56 eq. 35 with as = 0.25
    /// gives Rs = 0.25 Ra ≈ 0.33 Rso, so 0.10 leaves room for dense overcast
    /// and dust).
    pub solar_low_fraction_of_rso: f64,
    /// Sunshine may exceed daylight hours N by this many hours (recorder
    /// reading tolerance). Default 0.2 h (common practice).
    pub sunshine_tolerance_h: f64,
    /// Largest plausible day-to-day change of Tmax, Tmin, Tmean or dewpoint
    /// (°C). Default 15 °C (common practice for daily screening).
    pub spike_temperature_c: f64,
    /// A value repeated on this many consecutive days or more is a flat run
    /// (stuck sensor). Applies to temperatures, humidity, vapour pressure,
    /// wind and solar radiation; not to rain or sunshine, where runs of zero
    /// are normal. Default 5 days (common practice).
    pub flat_run_days: u32,
    /// How many of the longest missing runs the summary lists. Default 5.
    pub worst_runs_listed: usize,
}

impl Default for QualityRules {
    fn default() -> Self {
        Self {
            temperature_min_c: -60.0,
            temperature_max_c: 60.0,
            humidity_tolerance_pct: 3.0,
            solar_above_rso_factor: 1.05,
            solar_low_fraction_of_rso: 0.10,
            sunshine_tolerance_h: 0.2,
            spike_temperature_c: 15.0,
            flat_run_days: 5,
            worst_runs_listed: 5,
        }
    }
}

/// Clear-sky radiation and daylight hours of one day, from the site and date.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DayAstronomy {
    /// Clear-sky solar radiation Rso (MJ m⁻² day⁻¹), FAO-56 eq. 36/37.
    pub rso_mj: f64,
    /// Daylight hours N (h), FAO-56 eq. 34.
    pub daylight_h: f64,
}

/// Rso (FAO-56 eq. 37) and N (eq. 34) of every day of the year for a station,
/// from the ET₀ module's Ra (eq. 21) and sunset hour angle (eq. 25).
#[derive(Debug, Clone, PartialEq)]
pub struct SiteAstronomy {
    /// Indexed by day of year 1..=366 (index 0 unused).
    table: Vec<DayAstronomy>,
}

impl SiteAstronomy {
    /// Builds the table for a station.
    ///
    /// Rso uses eq. 37, Rso = (0.75 + 2×10⁻⁵ z) Ra (FAO-56 p. 51), the form
    /// for uncalibrated Ångström coefficients.
    ///
    /// # Errors
    /// [`QualityError::Site`] for a latitude outside −90..=90° or a
    /// non-finite elevation.
    pub fn new(site: &StationSite) -> Result<Self, QualityError> {
        if !(-90.0..=90.0).contains(&site.latitude_deg) {
            return Err(QualityError::Site(Et0Error::LatitudeOutOfRange {
                latitude_deg: site.latitude_deg,
            }));
        }
        if !site.elevation_m.is_finite() {
            return Err(QualityError::Site(Et0Error::NotFinite {
                quantity: "elevation_m",
                value: site.elevation_m,
            }));
        }
        let latitude_rad = site.latitude_deg.to_radians();
        let table = (0..=366u32)
            .map(|j| {
                let sun = DaySun::new(latitude_rad, j.max(1));
                DayAstronomy {
                    rso_mj: clear_sky_radiation_mj(sun.ra_mj, site.elevation_m), // Eq. 37
                    daylight_h: sun.daylight_h,                                  // Eq. 34
                }
            })
            .collect();
        Ok(Self { table })
    }

    /// Rso and N of a date.
    pub fn for_date(&self, date: NaiveDate) -> Option<DayAstronomy> {
        self.table.get(date.ordinal() as usize).copied()
    }
}

/// One flagged value.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Flag {
    /// The day.
    pub date: NaiveDate,
    /// The variable flagged.
    pub variable: Variable,
    /// The rule that raised the flag.
    pub rule: Rule,
    /// The flagged value (in the variable's unit).
    pub value: f64,
    /// The limit or reference value; its meaning is given on each [`Rule`].
    pub limit: f64,
}

impl fmt::Display for Flag {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let what = match self.rule {
            Rule::TminAboveTmax | Rule::DewpointAboveTmax => "tmax",
            Rule::Spike => "previous",
            Rule::FlatRun => "run_days",
            _ => "limit",
        };
        write!(
            f,
            "{} {} {} value={} {what}={}",
            self.date,
            self.variable,
            self.rule,
            round4(self.value),
            round4(self.limit)
        )
    }
}

fn round4(x: f64) -> f64 {
    (x * 1e4).round() / 1e4
}

/// Completeness of each variable in one calendar year of the record.
#[derive(Debug, Clone, PartialEq)]
pub struct YearCompleteness {
    /// Calendar year.
    pub year: i32,
    /// Days of this year inside the record's span (first to last date).
    pub days_in_span: u32,
    /// Days with a value, per variable (indexed as [`Variable::ALL`]).
    pub present: [u32; 12],
}

impl YearCompleteness {
    /// Share of the year's days in the span that have a value of `variable`, 0–1.
    pub fn fraction(&self, variable: Variable) -> f64 {
        if self.days_in_span == 0 {
            0.0
        } else {
            f64::from(self.present[variable.index()]) / f64::from(self.days_in_span)
        }
    }
}

/// A run of consecutive days without a value of one variable.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct MissingRun {
    /// The variable.
    pub variable: Variable,
    /// First missing day.
    pub first: NaiveDate,
    /// Last missing day.
    pub last: NaiveDate,
    /// Number of days.
    pub days: u32,
}

/// Summary of a series' quality.
#[derive(Debug, Clone, PartialEq)]
pub struct QualitySummary {
    /// First date of the record.
    pub first: NaiveDate,
    /// Last date of the record.
    pub last: NaiveDate,
    /// Variables with at least one value in the record.
    pub variables: Vec<Variable>,
    /// Completeness per calendar year.
    pub completeness: Vec<YearCompleteness>,
    /// Number of flags per rule (rules with no flag omitted).
    pub flag_counts: BTreeMap<Rule, usize>,
    /// The longest runs of missing days (of variables in `variables`),
    /// longest first.
    pub worst_missing_runs: Vec<MissingRun>,
}

/// Flags and summary of a series.
#[derive(Debug, Clone, PartialEq)]
pub struct QualityReport {
    /// Flags in date order (then variable, then rule).
    pub flags: Vec<Flag>,
    /// The summary.
    pub summary: QualitySummary,
    /// Whether the Rso and daylight-hours rules were applied (astronomy given).
    pub radiation_rules_applied: bool,
}

/// Why a series could not be checked.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum QualityError {
    /// The station site cannot give Rso and N.
    #[error("station site: {0}")]
    Site(#[source] Et0Error),
    /// The series is empty.
    #[error("the weather series is empty; expected at least one day")]
    Empty,
    /// Dates are not strictly increasing.
    #[error("found {date} after {previous}; expected strictly increasing dates")]
    NotIncreasing {
        /// The offending date.
        date: NaiveDate,
        /// The date before it.
        previous: NaiveDate,
    },
}

/// Checks a series (strictly increasing dates, gaps allowed) against `rules`.
///
/// `astronomy` gives Rso and N for a day; `None` skips the two rules that need
/// them. The data are not changed.
///
/// # Errors
/// [`QualityError`] if the series is empty or its dates are not strictly increasing.
pub fn check_series(
    days: &[WeatherDay],
    rules: &QualityRules,
    astronomy: Option<&dyn Fn(NaiveDate) -> Option<DayAstronomy>>,
) -> Result<QualityReport, QualityError> {
    let (Some(first_day), Some(last_day)) = (days.first(), days.last()) else {
        return Err(QualityError::Empty);
    };
    for pair in days.windows(2) {
        if pair[1].date <= pair[0].date {
            return Err(QualityError::NotIncreasing {
                date: pair[1].date,
                previous: pair[0].date,
            });
        }
    }
    let mut flags = Vec::new();
    for day in days {
        check_day(day, rules, astronomy, &mut flags);
    }
    check_spikes(days, rules, &mut flags);
    check_flat_runs(days, rules, &mut flags);
    flags.sort_by_key(|f| (f.date, f.variable, f.rule));
    let mut flag_counts = BTreeMap::new();
    for f in &flags {
        *flag_counts.entry(f.rule).or_insert(0) += 1;
    }
    let variables: Vec<Variable> = Variable::ALL
        .into_iter()
        .filter(|v| days.iter().any(|d| v.get(d).is_some()))
        .collect();
    let summary = QualitySummary {
        first: first_day.date,
        last: last_day.date,
        completeness: completeness(days, first_day.date, last_day.date),
        worst_missing_runs: worst_missing_runs(days, &variables, rules.worst_runs_listed),
        variables,
        flag_counts,
    };
    Ok(QualityReport {
        flags,
        summary,
        radiation_rules_applied: astronomy.is_some(),
    })
}

const TEMPERATURES: [Variable; 4] = [
    Variable::Tmax,
    Variable::Tmin,
    Variable::Tmean,
    Variable::Tdew,
];
const HUMIDITIES: [Variable; 3] = [Variable::RhMax, Variable::RhMin, Variable::RhMean];
const NON_NEGATIVE: [Variable; 5] = [
    Variable::Ea,
    Variable::Wind,
    Variable::Solar,
    Variable::Sunshine,
    Variable::Rain,
];
const FLAT_RUN_VARIABLES: [Variable; 10] = [
    Variable::Tmax,
    Variable::Tmin,
    Variable::Tmean,
    Variable::RhMax,
    Variable::RhMin,
    Variable::RhMean,
    Variable::Tdew,
    Variable::Ea,
    Variable::Wind,
    Variable::Solar,
];

fn check_day(
    day: &WeatherDay,
    rules: &QualityRules,
    astronomy: Option<&dyn Fn(NaiveDate) -> Option<DayAstronomy>>,
    flags: &mut Vec<Flag>,
) {
    let mut flag = |variable, rule, value, limit| {
        flags.push(Flag {
            date: day.date,
            variable,
            rule,
            value,
            limit,
        });
    };
    if let (Some(tmax), Some(tmin)) = (day.tmax_c, day.tmin_c)
        && tmin > tmax
    {
        flag(Variable::Tmin, Rule::TminAboveTmax, tmin, tmax);
    }
    for v in TEMPERATURES {
        if let Some(t) = v.get(day) {
            if t < rules.temperature_min_c {
                flag(v, Rule::TemperatureOutOfRange, t, rules.temperature_min_c);
            } else if t > rules.temperature_max_c {
                flag(v, Rule::TemperatureOutOfRange, t, rules.temperature_max_c);
            }
        }
    }
    for v in HUMIDITIES {
        if let Some(rh) = v.get(day) {
            let high = 100.0 + rules.humidity_tolerance_pct;
            let low = -rules.humidity_tolerance_pct;
            if rh > high {
                flag(v, Rule::HumidityOutOfRange, rh, high);
            } else if rh < low {
                flag(v, Rule::HumidityOutOfRange, rh, low);
            }
        }
    }
    if let (Some(tdew), Some(tmax)) = (day.tdew_c, day.tmax_c)
        && tdew > tmax
    {
        flag(Variable::Tdew, Rule::DewpointAboveTmax, tdew, tmax);
    }
    for v in NON_NEGATIVE {
        if let Some(x) = v.get(day)
            && x < 0.0
        {
            flag(v, Rule::Negative, x, 0.0);
        }
    }
    let Some(astro) = astronomy.and_then(|f| f(day.date)) else {
        return;
    };
    if let Some(rs) = day.solar_mj
        && rs >= 0.0
    {
        let high = astro.rso_mj * rules.solar_above_rso_factor;
        let low = astro.rso_mj * rules.solar_low_fraction_of_rso;
        if rs > high {
            flag(Variable::Solar, Rule::SolarAboveClearSky, rs, high);
        } else if rs < low {
            flag(Variable::Solar, Rule::SolarImplausiblyLow, rs, low);
        }
    }
    if let Some(n) = day.sunshine_h {
        let high = astro.daylight_h + rules.sunshine_tolerance_h;
        if n > high {
            flag(Variable::Sunshine, Rule::SunshineAboveDaylight, n, high);
        }
    }
}

fn consecutive(a: &WeatherDay, b: &WeatherDay) -> bool {
    a.date.succ_opt() == Some(b.date)
}

fn check_spikes(days: &[WeatherDay], rules: &QualityRules, flags: &mut Vec<Flag>) {
    for pair in days.windows(2) {
        if !consecutive(&pair[0], &pair[1]) {
            continue;
        }
        for v in TEMPERATURES {
            if let (Some(before), Some(now)) = (v.get(&pair[0]), v.get(&pair[1]))
                && (now - before).abs() > rules.spike_temperature_c
            {
                flags.push(Flag {
                    date: pair[1].date,
                    variable: v,
                    rule: Rule::Spike,
                    value: now,
                    limit: before,
                });
            }
        }
    }
}

fn check_flat_runs(days: &[WeatherDay], rules: &QualityRules, flags: &mut Vec<Flag>) {
    let min_len = rules.flat_run_days.max(2) as usize;
    for v in FLAT_RUN_VARIABLES {
        let mut start = 0;
        while start < days.len() {
            let Some(value) = v.get(&days[start]) else {
                start += 1;
                continue;
            };
            let mut end = start + 1;
            while end < days.len()
                && consecutive(&days[end - 1], &days[end])
                && v.get(&days[end])
                    .is_some_and(|x| x.total_cmp(&value).is_eq())
            {
                end += 1;
            }
            let len = end - start;
            if len >= min_len {
                for d in &days[start..end] {
                    flags.push(Flag {
                        date: d.date,
                        variable: v,
                        rule: Rule::FlatRun,
                        value,
                        limit: len as f64,
                    });
                }
            }
            start = end;
        }
    }
}

fn days_between(a: NaiveDate, b: NaiveDate) -> u32 {
    u32::try_from((b - a).num_days() + 1).unwrap_or(0)
}

fn completeness(days: &[WeatherDay], first: NaiveDate, last: NaiveDate) -> Vec<YearCompleteness> {
    let mut out: Vec<YearCompleteness> = (first.year()..=last.year())
        .map(|year| {
            let start = NaiveDate::from_ymd_opt(year, 1, 1).map_or(first, |d| d.max(first));
            let end = NaiveDate::from_ymd_opt(year, 12, 31).map_or(last, |d| d.min(last));
            YearCompleteness {
                year,
                days_in_span: days_between(start, end),
                present: [0; 12],
            }
        })
        .collect();
    for day in days {
        let idx = (day.date.year() - first.year()) as usize;
        if let Some(y) = out.get_mut(idx) {
            for v in Variable::ALL {
                if v.get(day).is_some() {
                    y.present[v.index()] += 1;
                }
            }
        }
    }
    out
}

fn worst_missing_runs(
    days: &[WeatherDay],
    variables: &[Variable],
    listed: usize,
) -> Vec<MissingRun> {
    let mut runs = Vec::new();
    for &v in variables {
        // Walk the calendar: a missing date and a blank value are both missing.
        let mut open: Option<NaiveDate> = None;
        let mut previous: Option<NaiveDate> = None;
        let close = |first: NaiveDate, last: NaiveDate, runs: &mut Vec<MissingRun>| {
            runs.push(MissingRun {
                variable: v,
                first,
                last,
                days: days_between(first, last),
            });
        };
        for day in days {
            if let Some(prev) = previous
                && let Some(gap_start) = prev.succ_opt()
                && gap_start < day.date
            {
                open.get_or_insert(gap_start);
            }
            if v.get(day).is_some() {
                if let (Some(first), Some(last)) = (open.take(), day.date.pred_opt()) {
                    close(first, last, &mut runs);
                }
            } else {
                open.get_or_insert(day.date);
            }
            previous = Some(day.date);
        }
        if let (Some(first), Some(last)) = (open, previous) {
            close(first, last, &mut runs);
        }
    }
    runs.sort_by(|a, b| b.days.cmp(&a.days).then(a.first.cmp(&b.first)));
    runs.truncate(listed);
    runs
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used)]
mod tests {
    use super::*;

    fn date(m: u32, d: u32) -> NaiveDate {
        NaiveDate::from_ymd_opt(2021, m, d).unwrap()
    }

    /// A plausible day: every rule quiet.
    fn ok_day(m: u32, d: u32) -> WeatherDay {
        WeatherDay {
            tmax_c: Some(30.0 + f64::from(d % 3)),
            tmin_c: Some(18.0 + f64::from(d % 2)),
            tmean_c: None,
            rhmax_pct: Some(80.0 + f64::from(d % 4)),
            rhmin_pct: Some(35.0 + f64::from(d % 3)),
            rhmean_pct: None,
            tdew_c: Some(14.0 + f64::from(d % 2)),
            ea_kpa: Some(1.6 + 0.01 * f64::from(d % 3)),
            wind_ms: Some(2.0 + 0.1 * f64::from(d % 4)),
            solar_mj: Some(22.0 + 0.2 * f64::from(d % 3)),
            sunshine_h: Some(10.0),
            rain_mm: Some(0.0),
            ..WeatherDay::empty(date(m, d))
        }
    }

    fn ok_series() -> Vec<WeatherDay> {
        (1..=10).map(|d| ok_day(3, d)).collect()
    }

    /// FAO-56 Example 10 (p. 50), Rio de Janeiro, 15 May: N = 10.9 h
    /// ([COMPUTED] 10.895 in published-check-values.md); Ra = 25.1 MJ m⁻² day⁻¹,
    /// so Rso = 0.75 Ra = 18.8 (FAO-56 Example 11, eq. 36).
    fn rio_may() -> impl Fn(NaiveDate) -> Option<DayAstronomy> {
        |_| {
            Some(DayAstronomy {
                rso_mj: 18.8,
                daylight_h: 10.895,
            })
        }
    }

    fn rules_hit(
        days: &[WeatherDay],
        astro: Option<&dyn Fn(NaiveDate) -> Option<DayAstronomy>>,
    ) -> Vec<(NaiveDate, Variable, Rule)> {
        check_series(days, &QualityRules::default(), astro)
            .unwrap()
            .flags
            .iter()
            .map(|f| (f.date, f.variable, f.rule))
            .collect()
    }

    #[test]
    fn plausible_series_raises_no_flag() {
        assert!(rules_hit(&ok_series(), None).is_empty());
    }

    #[test]
    fn checks_do_not_change_data() {
        let days = ok_series();
        let copy = days.clone();
        let _ = check_series(&days, &QualityRules::default(), None).unwrap();
        assert_eq!(days, copy);
    }

    #[test]
    fn tmin_above_tmax() {
        let mut days = ok_series();
        days[2].tmin_c = Some(33.0);
        days[2].tmax_c = Some(32.9);
        assert_eq!(
            rules_hit(&days, None),
            vec![(date(3, 3), Variable::Tmin, Rule::TminAboveTmax)]
        );
        days[2].tmin_c = Some(32.9); // equal is allowed
        assert!(rules_hit(&days, None).is_empty());
    }

    #[test]
    fn temperature_out_of_range() {
        let mut days = ok_series();
        days[4].tmax_c = Some(61.0);
        assert_eq!(
            rules_hit(&days, None),
            vec![
                (date(3, 5), Variable::Tmax, Rule::TemperatureOutOfRange),
                (date(3, 5), Variable::Tmax, Rule::Spike),
                (date(3, 6), Variable::Tmax, Rule::Spike),
            ]
        );
        let mut days = ok_series();
        days[4].tmin_c = Some(-61.0);
        days[4].tmax_c = Some(-50.0);
        let hits = rules_hit(&days, None);
        assert!(hits.contains(&(date(3, 5), Variable::Tmin, Rule::TemperatureOutOfRange)));
        assert!(!hits.contains(&(date(3, 5), Variable::Tmax, Rule::TemperatureOutOfRange)));
    }

    #[test]
    fn humidity_out_of_range_with_tolerance() {
        let mut days = ok_series();
        days[1].rhmax_pct = Some(103.0); // within tolerance
        days[3].rhmin_pct = Some(-2.0); // within tolerance
        assert!(rules_hit(&days, None).is_empty());
        days[1].rhmax_pct = Some(103.5);
        days[3].rhmin_pct = Some(-3.5);
        assert_eq!(
            rules_hit(&days, None),
            vec![
                (date(3, 2), Variable::RhMax, Rule::HumidityOutOfRange),
                (date(3, 4), Variable::RhMin, Rule::HumidityOutOfRange),
            ]
        );
    }

    #[test]
    fn dewpoint_above_tmax() {
        let mut days = ok_series();
        days[5].tdew_c = days[5].tmax_c;
        assert!(rules_hit(&days, None).is_empty());
        days[5].tdew_c = days[5].tmax_c.map(|t| t + 0.5);
        let hits = rules_hit(&days, None);
        assert!(hits.contains(&(date(3, 6), Variable::Tdew, Rule::DewpointAboveTmax)));
    }

    #[test]
    fn negative_wind_and_rain() {
        let mut days = ok_series();
        days[0].wind_ms = Some(0.0);
        days[0].rain_mm = Some(0.0);
        assert!(rules_hit(&days, None).is_empty());
        days[0].wind_ms = Some(-0.1);
        days[1].rain_mm = Some(-1.0);
        assert_eq!(
            rules_hit(&days, None),
            vec![
                (date(3, 1), Variable::Wind, Rule::Negative),
                (date(3, 2), Variable::Rain, Rule::Negative),
            ]
        );
    }

    #[test]
    fn solar_against_clear_sky() {
        let astro = rio_may();
        let mut days = ok_series();
        for d in &mut days {
            d.solar_mj = Some(14.5); // FAO-56 Example 11 measured Rs, below Rso 18.8
            d.sunshine_h = Some(7.1); // FAO-56 Example 10 n = 7.1 h
        }
        days[3].solar_mj = Some(14.6);
        days[7].solar_mj = Some(14.7);
        assert!(rules_hit(&days, Some(&astro)).is_empty());
        days[2].solar_mj = Some(18.8 * 1.05 + 0.01);
        days[6].solar_mj = Some(1.8);
        let hits = rules_hit(&days, Some(&astro));
        assert_eq!(
            hits,
            vec![
                (date(3, 3), Variable::Solar, Rule::SolarAboveClearSky),
                (date(3, 7), Variable::Solar, Rule::SolarImplausiblyLow),
            ]
        );
        // Without astronomy the rules are skipped and the report says so.
        let r = check_series(&days, &QualityRules::default(), None).unwrap();
        assert!(r.flags.is_empty());
        assert!(!r.radiation_rules_applied);
    }

    #[test]
    fn sunshine_above_daylight() {
        let astro = rio_may();
        let mut days = ok_series();
        for d in &mut days {
            d.sunshine_h = Some(11.0); // N 10.895 + 0.2 tolerance = 11.095
            d.solar_mj = Some(15.0 + 0.1 * f64::from(d.date.day() % 3));
        }
        days[3].sunshine_h = Some(10.0);
        assert!(rules_hit(&days, Some(&astro)).is_empty());
        days[4].sunshine_h = Some(11.2);
        assert_eq!(
            rules_hit(&days, Some(&astro)),
            vec![(date(3, 5), Variable::Sunshine, Rule::SunshineAboveDaylight)]
        );
    }

    #[test]
    fn spike_needs_consecutive_days() {
        let mut days = ok_series();
        days[5].tmin_c = Some(days[4].tmin_c.unwrap() + 15.0); // exactly the threshold
        days[5].tmax_c = Some(days[5].tmin_c.unwrap() + 5.0);
        // Tmax jumps too; only check Tmin behaviour here.
        let hits = rules_hit(&days, None);
        assert!(!hits.contains(&(date(3, 6), Variable::Tmin, Rule::Spike)));
        days[5].tmin_c = Some(days[4].tmin_c.unwrap() + 15.5);
        let hits = rules_hit(&days, None);
        assert!(hits.contains(&(date(3, 6), Variable::Tmin, Rule::Spike)));
        // Across a missing day the jump is not a spike.
        days.remove(4);
        let hits = rules_hit(&days, None);
        assert!(!hits.contains(&(date(3, 6), Variable::Tmin, Rule::Spike)));
    }

    #[test]
    fn flat_run() {
        let mut days = ok_series();
        for d in &mut days[2..6] {
            d.wind_ms = Some(1.5); // 4 days: below the 5-day default
        }
        assert!(rules_hit(&days, None).is_empty());
        days[6].wind_ms = Some(1.5); // 5 days
        let hits = rules_hit(&days, None);
        assert_eq!(hits.len(), 5);
        assert!(
            hits.iter()
                .all(|h| h.1 == Variable::Wind && h.2 == Rule::FlatRun)
        );
        // Rain runs of zero are normal.
        assert!(days.iter().all(|d| d.rain_mm == Some(0.0)));
    }

    #[test]
    fn summary_completeness_and_missing_runs() {
        let mut days: Vec<WeatherDay> = (1..=10).map(|d| ok_day(12, d)).collect();
        for d in &mut days {
            d.date = NaiveDate::from_ymd_opt(2020, 12, d.date.day() + 21).unwrap();
        }
        // 2020-12-22 ..= 2020-12-31, then 2021-01-01 ..= 2021-01-05 with a gap.
        let mut next: Vec<WeatherDay> = (1..=5).map(|d| ok_day(1, d)).collect();
        next.remove(2); // 2021-01-03 missing entirely
        next[0].tmax_c = None; // 2021-01-01 Tmax missing
        days.extend(next);
        days[9].tmax_c = None; // 2020-12-31
        let r = check_series(&days, &QualityRules::default(), None).unwrap();
        let s = &r.summary;
        assert_eq!(s.completeness.len(), 2);
        assert_eq!(s.completeness[0].days_in_span, 10);
        assert_eq!(s.completeness[0].present[Variable::Tmax.index()], 9);
        assert_eq!(s.completeness[1].days_in_span, 5);
        assert_eq!(s.completeness[1].present[Variable::Tmin.index()], 4);
        assert!((s.completeness[1].fraction(Variable::Tmax) - 0.6).abs() < 1e-12);
        let worst = s.worst_missing_runs[0];
        assert_eq!(worst.variable, Variable::Tmax);
        assert_eq!(
            (worst.first, worst.last, worst.days),
            (
                NaiveDate::from_ymd_opt(2020, 12, 31).unwrap(),
                NaiveDate::from_ymd_opt(2021, 1, 1).unwrap(),
                2
            )
        );
        assert!(!s.variables.contains(&Variable::Tmean));
    }

    #[test]
    fn unsorted_and_empty_series_are_errors() {
        let mut days = ok_series();
        days.swap(1, 2);
        assert!(matches!(
            check_series(&days, &QualityRules::default(), None),
            Err(QualityError::NotIncreasing { .. })
        ));
        assert_eq!(
            check_series(&[], &QualityRules::default(), None),
            Err(QualityError::Empty)
        );
    }

    /// FAO-56 Examples 8 and 9 (pp. 47, 49): 20° S, 3 September (J = 246):
    /// Ra = 32.2 MJ m⁻² day⁻¹, N = 11.7 h. [COMPUTED] full precision Ra = 32.194,
    /// N = 11.6656 (published-check-values.md §1.7–1.8); Rso at sea level by
    /// eq. 37 = 0.75 × 32.194 = 24.146 (computed from the published formula).
    #[test]
    fn site_astronomy_fao56_examples_8_9() {
        let site = StationSite {
            latitude_deg: -20.0,
            elevation_m: 0.0,
            wind_height_m: 2.0,
        };
        let a = SiteAstronomy::new(&site).unwrap();
        let d = a
            .for_date(NaiveDate::from_ymd_opt(2021, 9, 3).unwrap())
            .unwrap();
        assert!((d.daylight_h - 11.6656).abs() < 5e-4, "{}", d.daylight_h);
        assert!((d.rso_mj - 0.75 * 32.194).abs() < 2e-3, "{}", d.rso_mj);
        let bad = StationSite {
            latitude_deg: 91.0,
            ..site
        };
        assert!(matches!(
            SiteAstronomy::new(&bad),
            Err(QualityError::Site(_))
        ));
    }

    #[test]
    fn flag_line_format() {
        let f = Flag {
            date: date(3, 1),
            variable: Variable::Tmin,
            rule: Rule::TminAboveTmax,
            value: 35.0,
            limit: 31.2,
        };
        assert_eq!(
            f.to_string(),
            "2021-03-01 tmin_c tmin_above_tmax value=35 tmax=31.2"
        );
    }
}
