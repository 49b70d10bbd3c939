//! Effective rainfall on period totals, and the net irrigation requirement
//! they give.
//!
//! The default in Offtake is the daily root-zone water balance itself
//! ([`crate::balance`]): effective rain is the infiltrated rain stored in the
//! root zone, day by day. The methods here are the simpler period-total
//! alternatives, labelled so:
//!
//! * USDA-SCS (USDA Soil Conservation Service 1970, Technical Release 21;
//!   restated in NEH Part 623 Chapter 2) — monthly rain, monthly ETc and the
//!   usable soil storage;
//! * a fixed percentage of the rain;
//! * the dependable-rain formula of FAO Irrigation Water Management Training
//!   Manual No. 3 (Brouwer & Heibloem 1986): Pe = 0.8 P − 25 for P > 75 mm,
//!   0.6 P − 10 otherwise (mm/month, not below 0).
//!
//! All three are monthly methods. For 10-day periods (days 1–10, 11–20,
//! 21–end) we use the common practice of rescaling: the period's depths are
//! scaled to a month (× days in month / days in period), the monthly formula
//! applied, and the result scaled back (× days in period / days in month).
//! For the fixed percentage the rescaling changes nothing.
//!
//! With any of them the net irrigation requirement of a period is
//! NIR = max(0, ETc − Pe), spread evenly over the period's days.

use chrono::NaiveDate;
use serde::{Deserialize, Serialize};

use crate::calendar::{TenDayPeriod, YearMonth};

/// Millimetres per inch.
pub const MM_PER_INCH: f64 = 25.4;

/// Error in effective-rain inputs.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum RainError {
    /// A value is not finite or outside its range.
    #[error("{name}: found {value}, expected {expected}")]
    BadValue {
        /// What the value is.
        name: &'static str,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// The water-balance method was asked for a period total.
    #[error(
        "the water-balance method of effective rain runs day by day in the balance, not on period totals"
    )]
    NotAPeriodMethod,
}

fn check(
    name: &'static str,
    value: f64,
    ok: bool,
    expected: &'static str,
) -> Result<(), RainError> {
    if value.is_finite() && ok {
        Ok(())
    } else {
        Err(RainError::BadValue {
            name,
            value,
            expected,
        })
    }
}

/// USDA-SCS soil water storage factor SF (dimensionless).
///
/// SF = 0.531747 + 0.295164 D − 0.057697 D² + 0.003804 D³, with D the usable
/// soil water storage in inches (normally the net depth of application);
/// SF(3 in) ≈ 1. Source: USDA-SCS (1970) TR-21, as restated in NEH Part 623
/// Ch. 2 (§623.0207) [primary text not retrieved; formula as quoted in the
/// project's reference file] — the polynomial differs from the NEH table's
/// 2-decimal values by up to about 0.01 [table values from memory]. Meant for D of about 0.75–7 in (19–178 mm).
pub fn usda_scs_storage_factor(storage_in: f64) -> f64 {
    let d = storage_in;
    0.531_747 + 0.295_164 * d - 0.057_697 * d * d + 0.003_804 * d * d * d
}

/// USDA-SCS monthly effective rain (mm/month).
///
/// Pe = SF (0.70917 P^0.82416 − 0.11556) 10^(0.02426 ETc) in inches, with P
/// the monthly rain and ETc the monthly crop ET (USDA-SCS 1970 TR-21; NEH
/// Part 623 Ch. 2). Inputs here in mm (converted at 25.4 mm/in); `storage_mm`
/// is the usable soil storage D. The result is limited to 0 ≤ Pe ≤ min(P,
/// ETc).
///
/// # Errors
/// [`RainError::BadValue`] for negative or non-finite depths or storage ≤ 0.
pub fn usda_scs_effective_rain_mm(
    rain_mm: f64,
    etc_mm: f64,
    storage_mm: f64,
) -> Result<f64, RainError> {
    check("rain_mm", rain_mm, rain_mm >= 0.0, "a finite depth ≥ 0 mm")?;
    check("etc_mm", etc_mm, etc_mm >= 0.0, "a finite depth ≥ 0 mm")?;
    check(
        "storage_mm",
        storage_mm,
        storage_mm > 0.0,
        "a finite depth > 0 mm",
    )?;
    if rain_mm <= 0.0 {
        return Ok(0.0);
    }
    let p_in = rain_mm / MM_PER_INCH;
    let etc_in = etc_mm / MM_PER_INCH;
    let sf = usda_scs_storage_factor(storage_mm / MM_PER_INCH);
    let pe_in = sf * (0.709_17 * p_in.powf(0.824_16) - 0.115_56) * 10f64.powf(0.024_26 * etc_in);
    Ok((pe_in * MM_PER_INCH).min(rain_mm).min(etc_mm).max(0.0))
}

/// Effective rain as a fixed fraction of the rain (mm): Pe = f P.
///
/// A planning convention (e.g. "80 % effective"); `fraction` in 0..=1.
///
/// # Errors
/// [`RainError::BadValue`] for a negative rain or a fraction outside 0..=1.
pub fn fixed_percentage_effective_rain_mm(rain_mm: f64, fraction: f64) -> Result<f64, RainError> {
    check("rain_mm", rain_mm, rain_mm >= 0.0, "a finite depth ≥ 0 mm")?;
    check(
        "fraction",
        fraction,
        (0.0..=1.0).contains(&fraction),
        "a fraction 0..1",
    )?;
    Ok(rain_mm * fraction)
}

/// Dependable-rain formula of FAO Training Manual No. 3 (Brouwer & Heibloem
/// 1986, *Irrigation Water Needs*, Part II): monthly effective rain (mm)
///
/// Pe = 0.8 P − 25 for P > 75 mm/month; Pe = 0.6 P − 10 for P ≤ 75 mm/month;
/// not below 0. (The two branches meet at P = 75: 35 mm.)
///
/// # Errors
/// [`RainError::BadValue`] for a negative or non-finite rain.
pub fn dependable_rain_fao_tm3_mm(rain_month_mm: f64) -> Result<f64, RainError> {
    check(
        "rain_mm",
        rain_month_mm,
        rain_month_mm >= 0.0,
        "a finite depth ≥ 0 mm",
    )?;
    let pe = if rain_month_mm > 75.0 {
        0.8 * rain_month_mm - 25.0
    } else {
        0.6 * rain_month_mm - 10.0
    };
    Ok(pe.max(0.0))
}

/// Method for effective rain.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[non_exhaustive]
pub enum EffectiveRainMethod {
    /// From the daily root-zone water balance (default; see
    /// [`crate::balance`]). Not a period-total method.
    #[default]
    WaterBalance,
    /// USDA-SCS (TR-21) with the usable soil storage (mm).
    UsdaScs {
        /// Usable soil storage D (mm), normally the net application depth.
        storage_mm: f64,
    },
    /// A fixed fraction of the rain.
    FixedPercentage {
        /// Effective fraction 0..=1.
        fraction: f64,
    },
    /// FAO Training Manual No. 3 dependable-rain formula.
    DependableFaoTm3,
}

/// Rain and crop ET totals of one period (a month or a 10-day period).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PeriodTotals {
    /// Days in the period (28–31 for a month, 8–11 for a 10-day period).
    pub days: u32,
    /// Days in the calendar month containing the period.
    pub days_in_month: u32,
    /// Rain over the period (mm).
    pub rain_mm: f64,
    /// Crop ET over the period (mm).
    pub etc_mm: f64,
}

/// Effective rain (mm) of one period by a period-total method, with the
/// 10-day rescaling of the module documentation.
///
/// # Errors
/// [`RainError::BadValue`] for bad depths or day counts;
/// [`RainError::NotAPeriodMethod`] for [`EffectiveRainMethod::WaterBalance`]
/// (computed by the daily balance).
pub fn effective_rain_period_mm(
    method: EffectiveRainMethod,
    period: &PeriodTotals,
) -> Result<f64, RainError> {
    check(
        "days",
        f64::from(period.days),
        period.days > 0 && period.days <= period.days_in_month,
        "1 ≤ days ≤ days in month",
    )?;
    check(
        "days_in_month",
        f64::from(period.days_in_month),
        (28..=31).contains(&period.days_in_month),
        "28..31",
    )?;
    let to_month = f64::from(period.days_in_month) / f64::from(period.days);
    let p_month = period.rain_mm * to_month;
    let etc_month = period.etc_mm * to_month;
    let pe_month = match method {
        EffectiveRainMethod::WaterBalance => return Err(RainError::NotAPeriodMethod),
        EffectiveRainMethod::UsdaScs { storage_mm } => {
            usda_scs_effective_rain_mm(p_month, etc_month, storage_mm)?
        }
        EffectiveRainMethod::FixedPercentage { fraction } => {
            fixed_percentage_effective_rain_mm(p_month, fraction)?
        }
        EffectiveRainMethod::DependableFaoTm3 => dependable_rain_fao_tm3_mm(p_month)?,
    };
    Ok(pe_month / to_month)
}

/// Calendar periods for the period-total methods.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum PeriodKind {
    /// Calendar months.
    Month,
    /// 10-day periods: days 1–10, 11–20 and 21–end of each month (8 to 11
    /// days), as DESIGN.md defines them.
    TenDay,
}

fn period_key(date: NaiveDate, kind: PeriodKind) -> (YearMonth, Option<TenDayPeriod>) {
    let ten_day = match kind {
        PeriodKind::Month => None,
        PeriodKind::TenDay => Some(TenDayPeriod::containing(date)),
    };
    (YearMonth::containing(date), ten_day)
}

/// Sums daily rain and ETc (series starting on `first_day`) into calendar
/// periods. A period cut by the start or end of the series keeps only the
/// days inside it (its `days` is then smaller), so the rescaling of
/// [`effective_rain_period_mm`] treats the covered days as the period.
///
/// # Errors
/// [`RainError::BadValue`] when the series differ in length or hold a
/// negative or non-finite value.
pub fn period_totals(
    first_day: NaiveDate,
    rain_mm: &[f64],
    etc_mm: &[f64],
    kind: PeriodKind,
) -> Result<Vec<PeriodTotals>, RainError> {
    check(
        "etc_mm length",
        etc_mm.len() as f64,
        etc_mm.len() == rain_mm.len(),
        "as many days as rain_mm",
    )?;
    let mut out: Vec<PeriodTotals> = Vec::new();
    let mut key = None;
    let mut date = first_day;
    for (&p, &e) in rain_mm.iter().zip(etc_mm) {
        check("rain_mm", p, p >= 0.0, "a finite depth ≥ 0 mm")?;
        check("etc_mm", e, e >= 0.0, "a finite depth ≥ 0 mm")?;
        let k = period_key(date, kind);
        match out.last_mut() {
            Some(last) if key == Some(k) => {
                last.days += 1;
                last.rain_mm += p;
                last.etc_mm += e;
            }
            _ => {
                out.push(PeriodTotals {
                    days: 1,
                    days_in_month: k.0.length_days(),
                    rain_mm: p,
                    etc_mm: e,
                });
                key = Some(k);
            }
        }
        match date.succ_opt() {
            Some(d) => date = d,
            None => break,
        }
    }
    Ok(out)
}

/// Net irrigation requirement of a period (mm): NIR = max(0, ETc − Pe).
pub fn period_net_irrigation_mm(etc_mm: f64, peff_mm: f64) -> f64 {
    (etc_mm - peff_mm).max(0.0)
}

/// Daily NIR (mm/day) over consecutive periods: each period's
/// max(0, ETc − Pe) spread evenly over its days. Returns one value per day,
/// periods concatenated.
///
/// # Errors
/// As [`effective_rain_period_mm`].
pub fn daily_nir_from_periods(
    method: EffectiveRainMethod,
    periods: &[PeriodTotals],
) -> Result<Vec<f64>, RainError> {
    let mut out = Vec::with_capacity(periods.iter().map(|p| p.days as usize).sum());
    for p in periods {
        check("etc_mm", p.etc_mm, p.etc_mm >= 0.0, "a finite depth ≥ 0 mm")?;
        let pe = effective_rain_period_mm(method, p)?;
        let per_day = period_net_irrigation_mm(p.etc_mm, pe) / f64::from(p.days);
        out.extend(std::iter::repeat_n(per_day, p.days as usize));
    }
    Ok(out)
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn ten_day_rescaling_is_neutral_for_fixed_percentage() {
        let p = PeriodTotals {
            days: 10,
            days_in_month: 30,
            rain_mm: 20.0,
            etc_mm: 50.0,
        };
        let pe =
            effective_rain_period_mm(EffectiveRainMethod::FixedPercentage { fraction: 0.8 }, &p)
                .unwrap();
        assert!((pe - 16.0).abs() < 1e-12);
    }

    /// 10-day rescaling of the TM3 formula, computed from the published
    /// formula: 30 mm in 10 days of a 30-day month → 90 mm/month →
    /// 0.8·90 − 25 = 47 → 47/3 = 15.667 mm.
    #[test]
    fn ten_day_rescaling_tm3() {
        let p = PeriodTotals {
            days: 10,
            days_in_month: 30,
            rain_mm: 30.0,
            etc_mm: 50.0,
        };
        let pe = effective_rain_period_mm(EffectiveRainMethod::DependableFaoTm3, &p).unwrap();
        assert!((pe - 47.0 / 3.0).abs() < 1e-12);
    }

    /// DESIGN.md 10-day periods: February 2024 (leap year) splits 10/10/9.
    #[test]
    fn ten_day_periods_of_a_leap_february() {
        let start = NaiveDate::from_ymd_opt(2024, 2, 1).unwrap();
        let n = 29 + 5;
        let t = period_totals(start, &vec![1.0; n], &vec![2.0; n], PeriodKind::TenDay).unwrap();
        let days: Vec<u32> = t.iter().map(|p| p.days).collect();
        assert_eq!(days, vec![10, 10, 9, 5]);
        assert_eq!(t[2].days_in_month, 29);
        assert_eq!(t[3].days_in_month, 31);
        assert!((t[2].etc_mm - 18.0).abs() < 1e-12);
        let m = period_totals(start, &vec![1.0; n], &vec![2.0; n], PeriodKind::Month).unwrap();
        assert_eq!(m.iter().map(|p| p.days).collect::<Vec<_>>(), vec![29, 5]);
    }

    #[test]
    fn bad_inputs_are_errors() {
        assert!(dependable_rain_fao_tm3_mm(-1.0).is_err());
        assert!(usda_scs_effective_rain_mm(10.0, 10.0, 0.0).is_err());
        assert!(fixed_percentage_effective_rain_mm(10.0, 1.5).is_err());
        let p = PeriodTotals {
            days: 10,
            days_in_month: 30,
            rain_mm: 30.0,
            etc_mm: 50.0,
        };
        assert!(effective_rain_period_mm(EffectiveRainMethod::WaterBalance, &p).is_err());
    }
}
