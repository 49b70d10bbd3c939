//! Season plausibility: is a crop's stage-length row fit for the station?
//!
//! FAO-56 Table 11 gives stage lengths for a planting month in a named region
//! ("Mediterranean", "Idaho, USA", "low latitudes"…); the same crop runs
//! faster where it is warmer. FAO-56 (Chapter 6, "Length of growth stages")
//! asks for local observations where possible. A library row used far from
//! its region, or a season stretched or squeezed far from the row, gives
//! crop water use that may be badly off (a 240-day Mediterranean winter wheat
//! at 18° N adds up to far more ET than a tropical wheat season). This module
//! warns, naming the plantings, when:
//!
//! - the station's latitude lies more than [`LATITUDE_MARGIN_DEG`] outside
//!   the latitude band of the row's region (bands in [`REGION_BANDS`]:
//!   geography, common practice; several regions widen the band);
//! - the record's temperatures are unlike the row's region: a row from
//!   outside the tropics at a station whose coldest month averages at least
//!   [`TROPICAL_COLDEST_MONTH_C`] (the tropical climates of the Köppen
//!   classification, from memory), or a tropical row at a station whose
//!   coldest month is cooler than that;
//! - a planting's season length departs from its row's total by more than
//!   [`SEASON_DEPARTURE_PCT`] %.
//!
//! These are warnings for the engineer to weigh, not errors: the stage
//! lengths stay as given.

use std::fmt::Write as _;

use chrono::Datelike;

use super::Project;
use crate::crop::Crop;
use crate::weather::WeatherDay;

/// Degrees of latitude beyond a region's band before a warning (our choice).
pub const LATITUDE_MARGIN_DEG: f64 = 5.0;
/// Mean temperature of the coldest month (°C) at and above which a climate is
/// tropical (Köppen classification; from memory).
pub const TROPICAL_COLDEST_MONTH_C: f64 = 18.0;
/// Departure of a season from its row's total length that warns (%).
pub const SEASON_DEPARTURE_PCT: f64 = 25.0;
/// Latitude of the tropics' edge (°), the Tropic of Cancer / Capricorn.
const TROPIC_DEG: f64 = 23.4;

/// Region words of the Table 11 rows and the band of absolute latitude they
/// cover (°), geography (common practice). Longer phrases come first so that
/// "Central USA" is read before "USA".
pub const REGION_BANDS: [(&str, f64, f64); 15] = [
    ("low latitudes", 0.0, TROPIC_DEG),
    ("tropics", 0.0, TROPIC_DEG),
    ("mediterranean", 30.0, 45.0),
    ("california desert", 32.0, 35.0),
    ("california", 32.0, 42.0),
    ("idaho, usa", 42.0, 49.0),
    ("idaho", 42.0, 49.0),
    ("central usa", 35.0, 45.0),
    ("usa", 25.0, 49.0),
    ("europe", 35.0, 60.0),
    ("italy", 36.0, 47.0),
    ("spain", 36.0, 44.0),
    ("egypt", 22.0, 32.0),
    ("pakistan", 24.0, 37.0),
    ("arid", 15.0, 35.0),
];

/// The band of absolute latitude (°) a row's region label covers: the
/// envelope of every region it names, plus an explicit "A-B deg latitude";
/// `None` when the label names no known region.
pub fn region_band(stages_region: &str) -> Option<(f64, f64)> {
    let mut text = stages_region.to_lowercase();
    let mut band: Option<(f64, f64)> = None;
    let mut widen = |lo: f64, hi: f64| {
        band = Some(band.map_or((lo, hi), |(a, b)| (a.min(lo), b.max(hi))));
    };
    if let Some(pos) = text.find(" deg latitude") {
        let head = &text[..pos];
        let range = head.rsplit(' ').next().unwrap_or("");
        if let Some((a, b)) = range.split_once('-')
            && let (Ok(a), Ok(b)) = (a.parse::<f64>(), b.parse::<f64>())
        {
            widen(a.min(b), a.max(b));
        }
    }
    for (word, lo, hi) in REGION_BANDS {
        if let Some(pos) = text.find(word) {
            widen(lo, hi);
            // Blank the phrase so that "usa" is not read again inside
            // "central usa".
            text.replace_range(pos..pos + word.len(), &" ".repeat(word.len()));
        }
    }
    band
}

/// Mean air temperature of the record's coldest calendar month (°C): the
/// mean of (Tmax + Tmin)/2 (FAO-56 eq. 9) over every day of that month in
/// the record; months with fewer than 20 such days are left out. `None` when
/// no month qualifies.
pub fn coldest_month_mean_c(days: &[WeatherDay]) -> Option<f64> {
    let mut sum = [0.0_f64; 12];
    let mut n = [0_usize; 12];
    for d in days {
        if let (Some(x), Some(m)) = (d.tmax_c, d.tmin_c)
            && x.is_finite()
            && m.is_finite()
        {
            let k = d.date.month0() as usize;
            sum[k] += f64::midpoint(x, m);
            n[k] += 1;
        }
    }
    (0..12)
        .filter(|&k| n[k] >= 20)
        .map(|k| sum[k] / n[k] as f64)
        .reduce(f64::min)
}

/// Why a crop's row is unlike the station, in words; `None` when it fits.
///
/// `latitude_deg` is the station's latitude (° N positive); `coldest_c` the
/// record's coldest-month mean ([`coldest_month_mean_c`]).
pub fn row_mismatch(crop: &Crop, latitude_deg: f64, coldest_c: Option<f64>) -> Option<String> {
    let (lo, hi) = region_band(&crop.stages_region)?;
    let lat = latitude_deg.abs();
    let mut why = Vec::new();
    if lat < lo - LATITUDE_MARGIN_DEG || lat > hi + LATITUDE_MARGIN_DEG {
        why.push(format!(
            "the row's region lies at about {lo:.0}–{hi:.0}° latitude and the station at {:.1}° {}",
            lat,
            if latitude_deg < 0.0 { "S" } else { "N" }
        ));
    }
    if let Some(c) = coldest_c {
        let row_tropical = hi <= TROPIC_DEG;
        let row_temperate = lo >= TROPIC_DEG;
        let station_tropical = c >= TROPICAL_COLDEST_MONTH_C;
        if (row_temperate && station_tropical) || (row_tropical && !station_tropical) {
            why.push(format!(
                "the record's coldest month averages {c:.1} °C ({} climate, whose coldest month is {TROPICAL_COLDEST_MONTH_C:.0} °C or more) while the row is from {} latitudes",
                if station_tropical {
                    "a tropical"
                } else {
                    "not a tropical"
                },
                if row_tropical { "tropical" } else { "temperate" }
            ));
        }
    }
    (!why.is_empty()).then(|| why.join("; "))
}

/// Names of up to six items, then "and N more".
fn some_names(names: &[&str]) -> String {
    let mut s = names.iter().take(6).copied().collect::<Vec<_>>().join(", ");
    if names.len() > 6 {
        let _ = write!(s, " and {} more", names.len() - 6);
    }
    s
}

/// The season plausibility warnings of a project computed on `weather`
/// with `crops`: one per crop whose row is unlike the station (naming its
/// plantings), and one per planting whose season departs from its row by
/// more than [`SEASON_DEPARTURE_PCT`] %.
pub fn season_warnings(project: &Project, crops: &[Crop], weather: &[WeatherDay]) -> Vec<String> {
    let coldest = coldest_month_mean_c(weather);
    let mut out = Vec::new();
    let mut seen: Vec<&str> = Vec::new();
    for p in &project.plantings {
        let Some(crop) = crops.iter().find(|c| c.id == p.crop) else {
            continue; // validation reports an unknown crop
        };
        if !seen.contains(&crop.id.as_str()) {
            seen.push(&crop.id);
            if let Some(why) = row_mismatch(crop, project.weather.latitude_deg, coldest) {
                let names: Vec<&str> = project
                    .plantings
                    .iter()
                    .filter(|q| q.crop == crop.id)
                    .map(|q| q.id.as_str())
                    .collect();
                out.push(format!(
                    "season plausibility: planting {} ({}): stage lengths are the FAO-56 Table 11 row \"{}\"; {why}. The season may be much longer or shorter at this station: check the stage lengths against local observations or a row for the station's region",
                    some_names(&names),
                    crop.id,
                    crop.stages_region
                ));
            }
        }
        if let Some(days) = p.season_length_days {
            let row = f64::from(crop.stages.total_days());
            let dep = 100.0 * (f64::from(days) - row) / row;
            if dep.abs() > SEASON_DEPARTURE_PCT {
                out.push(format!(
                    "season plausibility: planting {} ({}): season of {days} days departs {dep:+.0} % from its FAO-56 Table 11 row of {row:.0} days (\"{}\"); more than {SEASON_DEPARTURE_PCT:.0} %: check it",
                    p.id, crop.id, crop.stages_region
                ));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn region_bands_of_library_labels() {
        assert_eq!(
            region_band("240 days; November planting; Mediterranean"),
            Some((30.0, 45.0))
        );
        assert_eq!(
            region_band(
                "135 days; March/April planting; 35-45 deg latitude (Barley/Oats/Wheat row)"
            ),
            Some((35.0, 45.0))
        );
        assert_eq!(
            region_band("150 days; Dec/May planting; Tropics, Mediterranean"),
            Some((0.0, 45.0))
        );
        assert_eq!(
            region_band("140 days; May planting; Central USA"),
            Some((35.0, 45.0))
        );
        assert_eq!(
            region_band("100 days; June planting; Idaho, USA"),
            Some((42.0, 49.0))
        );
        assert_eq!(region_band("100 days; somewhere"), None);
    }

    #[test]
    fn coldest_month_needs_twenty_days() {
        let start = chrono::NaiveDate::from_ymd_opt(2001, 1, 1).expect("date");
        let days: Vec<WeatherDay> = (0..59_u64)
            .map(|i| WeatherDay {
                tmax_c: Some(if i < 31 { 20.0 } else { 30.0 }),
                tmin_c: Some(10.0),
                ..WeatherDay::empty(start + chrono::Days::new(i))
            })
            .collect();
        assert_eq!(coldest_month_mean_c(&days), Some(15.0));
        assert_eq!(coldest_month_mean_c(&days[..19]), None);
    }
}
