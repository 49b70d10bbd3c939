//! Soil and water salinity: the leaching requirement (FAO-29) and the
//! salinity stress coefficient (FAO-56 Chapter 8, p.176–182; equation pages
//! not in our shared reference file are recalled from memory).

use thiserror::Error;

/// Errors of salinity computations.
#[derive(Debug, Clone, PartialEq, Error)]
#[non_exhaustive]
pub enum SalinityError {
    /// A numeric input out of its valid domain or not finite.
    #[error("{what} = {found} is outside the valid range {expected}")]
    OutOfRange {
        /// Name of the input.
        what: &'static str,
        /// Value found.
        found: f64,
        /// Description of the valid range.
        expected: &'static str,
    },
    /// The water is too saline for the crop: 5 ECe ≤ ECw, no leaching can keep
    /// the soil at the crop's threshold.
    #[error(
        "irrigation water ECw {ecw_ds_m} dS/m is too saline for a soil threshold ECe {ece_ds_m} dS/m (needs ECw < 5 ECe)"
    )]
    WaterTooSaline {
        /// ECw found (dS/m).
        ecw_ds_m: f64,
        /// ECe threshold (dS/m).
        ece_ds_m: f64,
    },
}

fn check(
    what: &'static str,
    v: f64,
    lo: f64,
    hi: f64,
    expected: &'static str,
) -> Result<f64, SalinityError> {
    if v.is_finite() && v >= lo && v <= hi {
        Ok(v)
    } else {
        Err(SalinityError::OutOfRange {
            what,
            found: v,
            expected,
        })
    }
}

/// Leaching requirement LR (fraction of applied water that must pass the root zone).
///
/// FAO-29 (Ayers and Westcot 1985) as quoted in FAO-56 p.180:
/// LR = ECw / (5 ECe − ECw), for a 40-30-20-10 % water extraction pattern
/// from the upper to the lower quarters of the root zone. Inputs: salinity of
/// the irrigation water ECw (dS/m) and the soil salinity to hold, normally
/// the crop's threshold ECe (Table 23) (dS/m).
///
/// # Errors
/// [`SalinityError::OutOfRange`] for a negative or non-finite input;
/// [`SalinityError::WaterTooSaline`] when 5 ECe ≤ ECw.
pub fn leaching_requirement(ecw_ds_m: f64, ece_ds_m: f64) -> Result<f64, SalinityError> {
    check("ECw (dS/m)", ecw_ds_m, 0.0, 100.0, "0 to 100 dS/m")?;
    check("ECe (dS/m)", ece_ds_m, 0.01, 100.0, "0.01 to 100 dS/m")?;
    let denom = 5.0 * ece_ds_m - ecw_ds_m;
    if denom <= 0.0 || ecw_ds_m / denom >= 1.0 {
        return Err(SalinityError::WaterTooSaline { ecw_ds_m, ece_ds_m });
    }
    Ok(ecw_ds_m / denom)
}

/// Average root-zone ECe (dS/m) that results from a leaching fraction.
///
/// FAO-56 eq. 93 (p.181): ECe = ECiw (1 + LF)/(5 LF). Inputs: ECiw (dS/m),
/// LF in (0, 1]. FAO-56: it "predicts ECe = 1.5 ECiw" for LF 15–20 %.
///
/// # Errors
/// [`SalinityError::OutOfRange`] for LF outside 0.01..=1 or a negative ECiw.
pub fn ece_from_leaching_fraction_ds_m(
    eciw_ds_m: f64,
    leaching_fraction: f64,
) -> Result<f64, SalinityError> {
    check("ECiw (dS/m)", eciw_ds_m, 0.0, 100.0, "0 to 100 dS/m")?;
    check(
        "leaching fraction",
        leaching_fraction,
        0.01,
        1.0,
        "0.01 to 1",
    )?;
    Ok(eciw_ds_m * (1.0 + leaching_fraction) / (5.0 * leaching_fraction))
}

/// Relative yield Ya/Ym under soil salinity (no water stress).
///
/// FAO-56 eq. 89 (p.177): Ya/Ym = 1 − (b/100)(ECe − ECe,threshold) for
/// ECe > threshold, 1 below; clamped to 0..=1.
pub fn salinity_relative_yield(ece_ds_m: f64, threshold_ds_m: f64, slope_b_pct: f64) -> f64 {
    let excess = (ece_ds_m - threshold_ds_m).max(0.0);
    let y = 1.0 - slope_b_pct / 100.0 * excess;
    if y.is_finite() {
        y.clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// Salinity stress coefficient Ks with no water stress (Dr ≤ RAW).
///
/// FAO-56 eq. 91 (p.178): Ks = 1 − b/(Ky 100)(ECe − ECe,threshold) for
/// ECe > threshold, 1 below. Valid for ECe < ECe,threshold + 50/b (FAO-56
/// p.178); outside that the result is clamped to 0..=1.
///
/// # Errors
/// [`SalinityError::OutOfRange`] for Ky ≤ 0 or a non-finite input.
pub fn salinity_ks(
    ece_ds_m: f64,
    threshold_ds_m: f64,
    slope_b_pct: f64,
    ky: f64,
) -> Result<f64, SalinityError> {
    check("ECe (dS/m)", ece_ds_m, 0.0, 100.0, "0 to 100 dS/m")?;
    check(
        "ECe threshold (dS/m)",
        threshold_ds_m,
        0.0,
        100.0,
        "0 to 100 dS/m",
    )?;
    check("slope b (%/(dS/m))", slope_b_pct, 0.0, 100.0, "0 to 100")?;
    check("Ky", ky, 0.05, 5.0, "0.05 to 5")?;
    let excess = (ece_ds_m - threshold_ds_m).max(0.0);
    Ok((1.0 - slope_b_pct / (ky * 100.0) * excess).clamp(0.0, 1.0))
}

/// Combined salinity and water stress coefficient.
///
/// FAO-56 eq. 92 (p.178): Ks = [1 − b/(Ky 100)(ECe − ECe,threshold)]
/// (TAW − Dr)/(TAW − RAW) for Dr > RAW; eq. 91 alone for Dr ≤ RAW.
/// Inputs: depletion Dr, TAW and RAW in mm.
///
/// # Errors
/// As [`salinity_ks`], or RAW ≥ TAW, or Dr outside 0..=TAW.
pub fn salinity_water_ks(
    ece_ds_m: f64,
    threshold_ds_m: f64,
    slope_b_pct: f64,
    ky: f64,
    taw_mm: f64,
    raw_mm: f64,
    depletion_mm: f64,
) -> Result<f64, SalinityError> {
    let ks_salt = salinity_ks(ece_ds_m, threshold_ds_m, slope_b_pct, ky)?;
    check("TAW (mm)", taw_mm, 1e-9, 1.0e5, "above 0 mm")?;
    check("RAW (mm)", raw_mm, 0.0, taw_mm - 1e-9, "0 to below TAW")?;
    check("depletion Dr (mm)", depletion_mm, 0.0, taw_mm, "0 to TAW")?;
    if depletion_mm <= raw_mm {
        Ok(ks_salt)
    } else {
        Ok(ks_salt * (taw_mm - depletion_mm) / (taw_mm - raw_mm))
    }
}

/// Gross requirement including the leaching requirement (mm).
///
/// FAO-29 (via FAO-56 p.180 and section 9 of our reference file):
/// gross = NIR / (1 − LR).
///
/// # Errors
/// [`SalinityError::OutOfRange`] for LR outside 0..1 or a negative NIR.
pub fn requirement_with_leaching_mm(
    nir_mm: f64,
    leaching_requirement: f64,
) -> Result<f64, SalinityError> {
    check("NIR (mm)", nir_mm, 0.0, 1.0e6, "0 or more mm")?;
    check(
        "leaching requirement",
        leaching_requirement,
        0.0,
        0.95,
        "0 to 0.95",
    )?;
    Ok(nir_mm / (1.0 - leaching_requirement))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn too_saline_water_is_an_error() {
        assert!(matches!(
            leaching_requirement(5.0, 1.0),
            Err(SalinityError::WaterTooSaline { .. })
        ));
        assert!(leaching_requirement(f64::NAN, 1.0).is_err());
        assert!((salinity_relative_yield(0.5, 1.0, 19.0) - 1.0).abs() < 1e-12);
    }
}
