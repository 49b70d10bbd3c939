//! Where the seasons and cohorts of a planting fall in the weather record.

use chrono::{Datelike, Days, NaiveDate};

use super::{PlantingError, PlantingSpec, PlantingWarning};
use crate::crop::CycleKind;

/// Largest number of planting days one cohort stands for: a staggered window
/// of `spread_days` is split into ⌈spread_days / 5⌉ cohorts (our planning
/// choice: the Kc curves of sowings five days apart differ little, and the
/// count of balances stays small).
pub const MAX_DAYS_PER_COHORT: u32 = 5;

/// One sub-planting: its planting date and its share of the planting area.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Cohort {
    /// Planting date (day 1 of its crop series).
    pub start: NaiveDate,
    /// Share of the planting area (all cohorts of a planting sum to 1).
    pub area_share: f64,
}

/// Cohort planting-day offsets from the first planting date and their area
/// shares for a window of `spread_days` (0 or 1: one cohort on the first
/// day).
///
/// The window's days 0..spread_days−1 are planted uniformly; it is cut into
/// n = ⌈spread_days / 5⌉ equal parts and each cohort is planted on the middle
/// day of its part, ⌊(2k + 1)·spread_days / (2n)⌋, with area share 1/n.
pub fn cohort_offsets(spread_days: u32) -> Vec<(u32, f64)> {
    let spread = spread_days.max(1);
    let n = spread.div_ceil(MAX_DAYS_PER_COHORT);
    let share = 1.0 / f64::from(n);
    (0..n)
        .map(|k| ((2 * k + 1) * spread / (2 * n), share))
        .collect()
}

/// The date of `month`/`day` in `year`; 29 February falls on 28 February in
/// common years (with a warning).
pub(crate) fn anniversary(
    year: i32,
    month: u32,
    day: u32,
    warnings: &mut Vec<PlantingWarning>,
) -> Result<NaiveDate, PlantingError> {
    if let Some(d) = NaiveDate::from_ymd_opt(year, month, day) {
        return Ok(d);
    }
    if month == 2 && day == 29 {
        warnings.push(PlantingWarning::LeapDayPlantingMoved { year });
        if let Some(d) = NaiveDate::from_ymd_opt(year, 2, 28) {
            return Ok(d);
        }
    }
    Err(PlantingError::BadPlantingDate { month, day })
}

/// One season (annual crop: one year's planting; perennial: the whole
/// chain) and its cohorts.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct SeasonPlan {
    /// Year of the first planting date.
    pub year: i32,
    /// First planting date (the window opens).
    pub first: NaiveDate,
    /// Cohorts in planting order.
    pub cohorts: Vec<Cohort>,
    /// Crop days of each cohort (the same for all cohorts).
    pub length_days: u32,
}

/// Whether the crop runs as one continuous chain (sugarcane ratoons, alfalfa
/// cuttings, orchards and vines) rather than one season a year.
pub(crate) fn is_chain(spec: &PlantingSpec<'_>) -> bool {
    !matches!(spec.crop.cycle, CycleKind::Annual)
}

/// Lays out the seasons of an annual crop that touch the record, or the one
/// chain of a perennial.
pub(crate) fn seasons(
    spec: &PlantingSpec<'_>,
    record_start: NaiveDate,
    record_days: usize,
    warnings: &mut Vec<PlantingWarning>,
) -> Result<Vec<SeasonPlan>, PlantingError> {
    let record_end = record_start + Days::new(record_days as u64); // exclusive
    let offsets = cohort_offsets(spec.spread_days);
    let last_offset = offsets.last().map_or(0, |o| o.0);
    let make = |first: NaiveDate, length_days: u32, year: i32| SeasonPlan {
        year,
        first,
        cohorts: offsets
            .iter()
            .map(|&(off, share)| Cohort {
                start: first + Days::new(u64::from(off)),
                area_share: share,
            })
            .collect(),
        length_days,
    };
    let (m, d) = (spec.first_planting_month, spec.first_planting_day);
    let mut out = Vec::new();
    if is_chain(spec) {
        // First planting date: the given year, or the first anniversary on or
        // after the record start.
        let first = if let Some(y) = spec.only_year {
            anniversary(y, m, d, warnings)?
        } else {
            let a = anniversary(record_start.year(), m, d, warnings)?;
            if a < record_start {
                anniversary(record_start.year() + 1, m, d, warnings)?
            } else {
                a
            }
        };
        if first >= record_end {
            return Ok(out);
        }
        let to_end = (record_end - first).num_days() as u32;
        let length = spec.season_length_days.map_or(to_end, |l| l.min(to_end));
        if length < 4 + last_offset {
            return Ok(out);
        }
        // Every cohort's chain is cut at the record end.
        out.push(make(first, length - last_offset, first.year()));
        return Ok(out);
    }
    let length = match spec.season_length_days {
        Some(l) => l,
        None => spec.crop.stages.total_days(),
    };
    let years: Vec<i32> = match spec.only_year {
        Some(y) => vec![y],
        None => ((record_start.year() - 2)..=record_end.year()).collect(),
    };
    for y in years {
        let first = anniversary(y, m, d, warnings)?;
        let end = first + Days::new(u64::from(last_offset + length)); // exclusive
        if end <= record_start || first >= record_end {
            continue;
        }
        out.push(make(first, length, y));
    }
    if spec.only_year.is_none() && length + last_offset > 365 {
        warnings.push(PlantingWarning::SeasonsOverlap {
            season_days: length + last_offset,
        });
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cohorts_of_a_window() {
        assert_eq!(cohort_offsets(0), vec![(0, 1.0)]);
        assert_eq!(cohort_offsets(1), vec![(0, 1.0)]);
        assert_eq!(cohort_offsets(5), vec![(2, 1.0)]);
        assert_eq!(cohort_offsets(10), vec![(2, 0.5), (7, 0.5)]);
        let c = cohort_offsets(21);
        assert_eq!(c.len(), 5);
        assert!((c.iter().map(|x| x.1).sum::<f64>() - 1.0).abs() < 1e-12);
        assert!(c.iter().all(|x| x.0 < 21));
    }
}
