//! Multi-year statistics of a daily series (ET₀, rain): totals per year,
//! month and 10-day period, their values at chosen probabilities, the design
//! year, and a day-of-year climatology with 10/50/90 % bands for plots.
//!
//! # Rules
//!
//! - Years are irrigation years starting in a chosen month
//!   ([`YearStart`]; January gives calendar years). Years cut by the first or
//!   last day of the record are reported in [`SeriesTotals::coverage`] and
//!   left out of every statistic, together with their months, 10-day periods
//!   and days.
//! - A missing day (`None`) makes its year, month and 10-day period totals
//!   missing; those periods are listed with their count of missing days and
//!   left out of that level's statistics. A gap in March therefore removes
//!   that year from the yearly statistics and that March from the March
//!   statistics, but not the year's other months.
//! - Days resting on filled or estimated data (a per-day flag slice) are
//!   counted in every period, so a table can show how much of a total is
//!   measured.
//! - Probabilities follow [`crate::stats`]: Weibull plotting positions
//!   m/(n+1), linear interpolation between ranks, clamped to the extreme
//!   observed values outside [1/(n+1), n/(n+1)]. Each value carries its
//!   [`Probability`], which says whether it is a non-exceedance value (ET₀,
//!   demand) or an exceedance value (dependable rain).
//! - Leap days are ordinary days: they count in their year, month and
//!   10-day period, and the day-of-year climatology has a slot for 29 February
//!   (see [`crate::calendar::leap_calendar_day`]).

use chrono::NaiveDate;
use serde::{Deserialize, Serialize};

use crate::calendar::{
    CalendarError, IrrigationYear, TenDayPeriod, YearCoverage, YearMonth, YearStart,
    leap_calendar_day, leap_calendar_month_day, year_coverage,
};
use crate::stats::{Probability, RankedSample, StatsError, design_year};

/// Errors of the multi-year statistics.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ClimateStatsError {
    /// The series has no days.
    #[error("the daily series is empty")]
    EmptySeries,
    /// The per-day flag slice is not as long as the values.
    #[error("{flags} filled-day flags given for {values} daily values; expected one flag per day")]
    FlagLengthMismatch {
        /// Number of daily values.
        values: usize,
        /// Number of flags.
        flags: usize,
    },
    /// A daily value is NaN or infinite.
    #[error("value on {date} is {value}, not a finite number")]
    NotFinite {
        /// Day of the value.
        date: NaiveDate,
        /// The value found.
        value: f64,
    },
    /// The series runs past the last date the calendar can represent.
    #[error("a series of {days} days starting {start} runs past the supported date range")]
    DateOutOfRange {
        /// First day.
        start: NaiveDate,
        /// Number of days.
        days: usize,
    },
    /// Not one year of the record is complete.
    #[error(
        "no complete year between {first} and {last} (years starting in month {start_month}); \
         statistics need at least one"
    )]
    NoCompleteYear {
        /// First day of the record.
        first: NaiveDate,
        /// Last day of the record.
        last: NaiveDate,
        /// Start month of the years.
        start_month: u32,
    },
    /// A calendar error.
    #[error(transparent)]
    Calendar(#[from] CalendarError),
    /// A probability error (a probability outside 0..=1).
    #[error(transparent)]
    Stats(#[from] StatsError),
}

/// A daily series: one value per day from `start`, consecutive, `None` for a
/// missing day, with optional per-day "filled or estimated" flags.
#[derive(Debug, Clone, Copy)]
pub struct DailySeries<'a> {
    start: NaiveDate,
    values: &'a [Option<f64>],
    filled: Option<&'a [bool]>,
}

impl<'a> DailySeries<'a> {
    /// Checks and wraps a daily series.
    ///
    /// `values[i]` is the value of day `start + i` (mm for ET₀ and rain);
    /// `filled[i]`, when given, says whether that value was filled or
    /// estimated rather than measured.
    ///
    /// # Errors
    /// [`ClimateStatsError::EmptySeries`], [`ClimateStatsError::FlagLengthMismatch`],
    /// [`ClimateStatsError::NotFinite`] (the first NaN or infinite value, with
    /// its date), [`ClimateStatsError::DateOutOfRange`].
    pub fn new(
        start: NaiveDate,
        values: &'a [Option<f64>],
        filled: Option<&'a [bool]>,
    ) -> Result<Self, ClimateStatsError> {
        if values.is_empty() {
            return Err(ClimateStatsError::EmptySeries);
        }
        if let Some(flags) = filled
            && flags.len() != values.len()
        {
            return Err(ClimateStatsError::FlagLengthMismatch {
                values: values.len(),
                flags: flags.len(),
            });
        }
        let out_of_range = ClimateStatsError::DateOutOfRange {
            start,
            days: values.len(),
        };
        let days = u64::try_from(values.len() - 1).map_err(|_| out_of_range.clone())?;
        start
            .checked_add_days(chrono::Days::new(days))
            .ok_or(out_of_range)?;
        for (i, v) in values.iter().enumerate() {
            if let Some(value) = *v
                && !value.is_finite()
            {
                return Err(ClimateStatsError::NotFinite {
                    date: start + chrono::Days::new(i as u64),
                    value,
                });
            }
        }
        Ok(Self {
            start,
            values,
            filled,
        })
    }

    /// First day.
    pub fn start(&self) -> NaiveDate {
        self.start
    }

    /// Last day.
    pub fn last(&self) -> NaiveDate {
        self.date_of(self.values.len() - 1)
    }

    /// Number of days.
    pub fn len(&self) -> usize {
        self.values.len()
    }

    /// Always false: a series has at least one day.
    pub fn is_empty(&self) -> bool {
        self.values.is_empty()
    }

    /// Date of day `i` (checked in [`Self::new`] to be representable).
    fn date_of(&self, i: usize) -> NaiveDate {
        self.start + chrono::Days::new(i as u64)
    }
}

/// The total of one period (year, month or 10-day period).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PeriodTotal<P> {
    /// The period.
    pub period: P,
    /// Sum of the daily values (mm); `None` when any day is missing.
    pub total: Option<f64>,
    /// Days in the period.
    pub days: u32,
    /// Days with no value.
    pub missing_days: u32,
    /// Days whose value was filled or estimated.
    pub filled_days: u32,
}

impl<P> PeriodTotal<P> {
    /// Mean per day (mm/day) when the total is known.
    pub fn mean_per_day(&self) -> Option<f64> {
        self.total.map(|t| t / f64::from(self.days))
    }
}

/// Totals of every year, month and 10-day period of the complete years.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SeriesTotals {
    /// Start month of the years.
    pub year_start: YearStart,
    /// Complete years and the partial years left out.
    pub coverage: YearCoverage,
    /// One per complete year, in order.
    pub years: Vec<PeriodTotal<IrrigationYear>>,
    /// Twelve per complete year, in order.
    pub months: Vec<PeriodTotal<YearMonth>>,
    /// Thirty-six per complete year, in order.
    pub ten_days: Vec<PeriodTotal<TenDayPeriod>>,
}

#[derive(Debug, Clone, Copy, Default)]
struct Accumulator {
    total: f64,
    days: u32,
    missing: u32,
    filled: u32,
}

impl Accumulator {
    fn add(&mut self, value: Option<f64>, filled: bool) {
        self.days += 1;
        match value {
            Some(v) => self.total += v,
            None => self.missing += 1,
        }
        if filled {
            self.filled += 1;
        }
    }

    fn finish<P>(self, period: P) -> PeriodTotal<P> {
        PeriodTotal {
            period,
            total: (self.missing == 0).then_some(self.total),
            days: self.days,
            missing_days: self.missing,
            filled_days: self.filled,
        }
    }
}

/// Position 0..12 of a calendar month in a year starting in `start_month`.
fn month_position(month: u32, start_month: u32) -> usize {
    ((month + 12 - start_month) % 12) as usize
}

/// Calendar month of position 0..12 of a year starting in `start_month`, and
/// how many calendar years after the start year it falls (0 or 1).
fn month_at_position(position: usize, start_month: u32) -> (u32, i32) {
    let zero_based = start_month - 1 + position as u32;
    (zero_based % 12 + 1, (zero_based / 12) as i32)
}

/// Totals per year, month and 10-day period of the complete years of a
/// series.
///
/// # Errors
/// [`ClimateStatsError::NoCompleteYear`] when the record does not hold one
/// whole year; calendar errors for dates at the edge of the supported range.
pub fn series_totals(
    series: &DailySeries<'_>,
    year_start: YearStart,
) -> Result<SeriesTotals, ClimateStatsError> {
    let coverage = year_coverage(series.start(), series.last(), year_start)?;
    let (Some(first_year), Some(last_year)) = (
        coverage.complete.first().copied(),
        coverage.complete.last().copied(),
    ) else {
        return Err(ClimateStatsError::NoCompleteYear {
            first: series.start(),
            last: series.last(),
            start_month: year_start.month(),
        });
    };
    let n_years = coverage.complete.len();
    let mut years = vec![Accumulator::default(); n_years];
    let mut months = vec![Accumulator::default(); n_years * 12];
    let mut ten_days = vec![Accumulator::default(); n_years * 36];

    let skip = (first_year.start() - series.start()).num_days() as usize;
    let take = (last_year.end() - first_year.start()).num_days() as usize + 1;
    let start_month = year_start.month();
    for i in skip..skip + take {
        let date = series.date_of(i);
        let value = series.values[i];
        let filled = series.filled.is_some_and(|f| f[i]);
        let year = IrrigationYear::containing(date, year_start);
        let y = (year.start_year() - first_year.start_year()) as usize;
        let period = TenDayPeriod::containing(date);
        years[y].add(value, filled);
        months[y * 12 + month_position(period.month(), start_month)].add(value, filled);
        ten_days[y * 36 + (period.index_in_year(year_start) - 1) as usize].add(value, filled);
    }

    let mut totals = SeriesTotals {
        year_start,
        years: Vec::with_capacity(n_years),
        months: Vec::with_capacity(n_years * 12),
        ten_days: Vec::with_capacity(n_years * 36),
        coverage: coverage.clone(),
    };
    for (y, year) in coverage.complete.iter().enumerate() {
        totals.years.push(years[y].finish(*year));
        for position in 0..12 {
            let (month, year_offset) = month_at_position(position, start_month);
            let calendar_year = year.start_year() + year_offset;
            let ym = YearMonth::new(calendar_year, month)?;
            totals.months.push(months[y * 12 + position].finish(ym));
            for part in 0..3 {
                let period = TenDayPeriod::from_index(calendar_year, (month - 1) * 3 + part + 1)?;
                totals
                    .ten_days
                    .push(ten_days[y * 36 + position * 3 + part as usize].finish(period));
            }
        }
    }
    Ok(totals)
}

/// A value at a probability, labelled with the probability's meaning.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ValueAtProbability {
    /// Probability and kind (non-exceedance or exceedance).
    pub probability: Probability,
    /// The interpolated value (mm over the period).
    pub value: f64,
}

/// Statistics across years of one slot: the whole year, one month (say every
/// March) or one 10-day period (every 11–20 March).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SlotStatistics {
    /// Month (1..=12) for monthly slots, calendar 10-day index (1..=36) for
    /// 10-day slots, 0 for the whole year.
    pub slot: u32,
    /// Label: `"year"`, `"Mar"`, `"Mar 2"`.
    pub label: String,
    /// Number of years with a complete total for this slot.
    pub years_used: usize,
    /// Number of years left out because the slot had missing days.
    pub years_with_missing_days: usize,
    /// Mean total (mm) over the years used; `None` when no year is usable.
    pub mean: Option<f64>,
    /// Smallest total (mm).
    pub min: Option<f64>,
    /// Largest total (mm).
    pub max: Option<f64>,
    /// Values at the requested probabilities (empty when no year is usable).
    pub at: Vec<ValueAtProbability>,
}

/// The year whose total lies closest to the value at a probability.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct DesignYearOf {
    /// Probability and kind.
    pub probability: Probability,
    /// Value at the probability (mm/year).
    pub value_at_probability: f64,
    /// The design year.
    pub year: IrrigationYear,
    /// Its total (mm).
    pub total: f64,
}

/// One slot of the day-of-year climatology.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct DayOfYearBand {
    /// Slot in the 366-day leap-year calendar (1..=366, 60 = 29 February).
    pub slot: u32,
    /// Calendar month of the slot.
    pub month: u32,
    /// Day of the month of the slot.
    pub day: u32,
    /// Number of daily values (years) in the slot.
    pub n: usize,
    /// Mean daily value (mm/day).
    pub mean: f64,
    /// 10 % non-exceedance daily value (mm/day).
    pub p10: f64,
    /// 50 % non-exceedance (median) daily value (mm/day).
    pub p50: f64,
    /// 90 % non-exceedance daily value (mm/day).
    pub p90: f64,
}

/// All multi-year statistics of one daily series.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SeriesStatistics {
    /// Totals per year, month and 10-day period.
    pub totals: SeriesTotals,
    /// Yearly totals across years.
    pub yearly: SlotStatistics,
    /// Design year for each requested probability (empty when no year has a
    /// complete total).
    pub design_years: Vec<DesignYearOf>,
    /// Twelve months, in the order of the irrigation year.
    pub monthly: Vec<SlotStatistics>,
    /// Thirty-six 10-day periods, in the order of the irrigation year.
    pub ten_day: Vec<SlotStatistics>,
    /// Day-of-year climatology, one band per slot of the leap-year calendar
    /// that has at least one value, in calendar order (January first).
    pub day_of_year: Vec<DayOfYearBand>,
    /// Days resting on filled or estimated data in the complete years.
    pub filled_days: u32,
    /// Days with no value in the complete years.
    pub missing_days: u32,
}

fn slot_statistics<'p, P: 'p>(
    slot: u32,
    label: String,
    periods: impl Iterator<Item = &'p PeriodTotal<P>>,
    probabilities: &[Probability],
) -> Result<SlotStatistics, ClimateStatsError> {
    let mut values = Vec::new();
    let mut with_missing = 0;
    for p in periods {
        match p.total {
            Some(t) => values.push(t),
            None => with_missing += 1,
        }
    }
    let mut stats = SlotStatistics {
        slot,
        label,
        years_used: values.len(),
        years_with_missing_days: with_missing,
        mean: None,
        min: None,
        max: None,
        at: Vec::new(),
    };
    if values.is_empty() {
        // Still validate the probabilities so a bad one is never silent.
        for p in probabilities {
            p.non_exceedance()?;
        }
        return Ok(stats);
    }
    let ranked = RankedSample::new(&values)?;
    stats.mean = Some(values.iter().sum::<f64>() / values.len() as f64);
    stats.min = Some(ranked.min());
    stats.max = Some(ranked.max());
    for &probability in probabilities {
        stats.at.push(ValueAtProbability {
            probability,
            value: ranked.value_at(probability)?,
        });
    }
    Ok(stats)
}

/// Multi-year statistics of a daily series: totals, yearly, monthly and
/// 10-day statistics at `probabilities`, design years and the day-of-year
/// climatology (10/50/90 % non-exceedance bands of the daily values).
///
/// Pass [`Probability::NonExceedance`] for ET₀ and demand and
/// [`Probability::Exceedance`] for dependable rain; every result keeps the
/// probability it was computed for.
///
/// # Errors
/// See [`series_totals`]; [`ClimateStatsError::Stats`] for a probability
/// outside 0..=1.
pub fn series_statistics(
    series: &DailySeries<'_>,
    year_start: YearStart,
    probabilities: &[Probability],
) -> Result<SeriesStatistics, ClimateStatsError> {
    let totals = series_totals(series, year_start)?;

    let yearly = slot_statistics(0, "year".to_owned(), totals.years.iter(), probabilities)?;

    let complete_years: Vec<(IrrigationYear, f64)> = totals
        .years
        .iter()
        .filter_map(|y| y.total.map(|t| (y.period, t)))
        .collect();
    let mut design_years = Vec::new();
    if !complete_years.is_empty() {
        let values: Vec<f64> = complete_years.iter().map(|(_, t)| *t).collect();
        for &probability in probabilities {
            let dy = design_year(&values, probability)?;
            design_years.push(DesignYearOf {
                probability,
                value_at_probability: dy.value_at_probability,
                year: complete_years[dy.index].0,
                total: dy.value,
            });
        }
    }

    let mut monthly = Vec::with_capacity(12);
    for position in 0..12 {
        let month = totals.months[position].period.month();
        monthly.push(slot_statistics(
            month,
            crate::calendar::month_abbreviation(month).to_owned(),
            totals.months.iter().skip(position).step_by(12),
            probabilities,
        )?);
    }
    let mut ten_day = Vec::with_capacity(36);
    for position in 0..36 {
        let period = totals.ten_days[position].period;
        ten_day.push(slot_statistics(
            period.index(),
            period.label(),
            totals.ten_days.iter().skip(position).step_by(36),
            probabilities,
        )?);
    }

    let day_of_year = day_of_year_bands(series, &totals)?;
    let filled_days = totals.years.iter().map(|y| y.filled_days).sum();
    let missing_days = totals.years.iter().map(|y| y.missing_days).sum();
    Ok(SeriesStatistics {
        totals,
        yearly,
        design_years,
        monthly,
        ten_day,
        day_of_year,
        filled_days,
        missing_days,
    })
}

fn day_of_year_bands(
    series: &DailySeries<'_>,
    totals: &SeriesTotals,
) -> Result<Vec<DayOfYearBand>, ClimateStatsError> {
    let mut slots: Vec<Vec<f64>> = vec![Vec::new(); 366];
    if let (Some(first), Some(last)) = (
        totals.coverage.complete.first(),
        totals.coverage.complete.last(),
    ) {
        let skip = (first.start() - series.start()).num_days() as usize;
        let take = (last.end() - first.start()).num_days() as usize + 1;
        for i in skip..skip + take {
            if let Some(v) = series.values[i] {
                slots[leap_calendar_day(series.date_of(i)) as usize - 1].push(v);
            }
        }
    }
    let mut bands = Vec::new();
    for (i, values) in slots.iter().enumerate() {
        if values.is_empty() {
            continue;
        }
        let slot = i as u32 + 1;
        let (month, day) = leap_calendar_month_day(slot).unwrap_or((0, 0));
        let ranked = RankedSample::new(values)?;
        bands.push(DayOfYearBand {
            slot,
            month,
            day,
            n: values.len(),
            mean: values.iter().sum::<f64>() / values.len() as f64,
            p10: ranked.non_exceedance_value(0.1)?,
            p50: ranked.non_exceedance_value(0.5)?,
            p90: ranked.non_exceedance_value(0.9)?,
        });
    }
    Ok(bands)
}

/// The probabilities used when the user chooses none: 50 % and 80 %
/// non-exceedance for ET₀ (the 80 % value is the usual design basis, DESIGN.md).
pub const DEFAULT_ET0_PROBABILITIES: [Probability; 2] = [
    Probability::NonExceedance(0.5),
    Probability::NonExceedance(0.8),
];

/// The probabilities used when the user chooses none: 50 % and 80 %
/// exceedance for rain (80 % exceedance is the usual dependable rain).
pub const DEFAULT_RAIN_PROBABILITIES: [Probability; 2] =
    [Probability::Exceedance(0.5), Probability::Exceedance(0.8)];

/// Statistics of ET₀ and rain of one weather series, side by side.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WeatherStatistics {
    /// Reference evapotranspiration ET₀ (mm), usually at non-exceedance
    /// probabilities.
    pub et0: SeriesStatistics,
    /// Rain (mm), usually at exceedance probabilities (dependable rain).
    pub rain: SeriesStatistics,
}

/// Statistics of daily ET₀ and rain over the same years.
///
/// `et0` and `rain` may start on different days or cover different spans;
/// each uses its own complete years.
///
/// # Errors
/// As [`series_statistics`], for either series.
pub fn weather_statistics(
    et0: &DailySeries<'_>,
    rain: &DailySeries<'_>,
    year_start: YearStart,
    et0_probabilities: &[Probability],
    rain_probabilities: &[Probability],
) -> Result<WeatherStatistics, ClimateStatsError> {
    Ok(WeatherStatistics {
        et0: series_statistics(et0, year_start, et0_probabilities)?,
        rain: series_statistics(rain, year_start, rain_probabilities)?,
    })
}
