//! The four FAO-56 growth stages and their lengths.
//!
//! FAO-56 (Allen et al. 1998) Chapter 6, Figure 25 and Table 11 (p.104–108):
//! initial (planting to about 10 % ground cover), crop development (to
//! effective full cover), mid-season (to the start of maturity) and late
//! season (to harvest or full senescence).

use serde::{Deserialize, Serialize};

use super::CropError;

/// One of the four growth stages.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Stage {
    /// Initial stage (Lini).
    Initial,
    /// Crop development stage (Ldev).
    Development,
    /// Mid-season stage (Lmid).
    MidSeason,
    /// Late-season stage (Llate).
    LateSeason,
}

/// Stage lengths in days (FAO-56 Table 11 order Lini / Ldev / Lmid / Llate).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct StageLengths {
    /// Initial stage length (days).
    pub ini_days: u32,
    /// Development stage length (days).
    pub dev_days: u32,
    /// Mid-season stage length (days).
    pub mid_days: u32,
    /// Late-season stage length (days).
    pub late_days: u32,
}

impl StageLengths {
    /// Stage lengths from the four Table 11 values.
    pub const fn new(ini_days: u32, dev_days: u32, mid_days: u32, late_days: u32) -> Self {
        Self {
            ini_days,
            dev_days,
            mid_days,
            late_days,
        }
    }

    /// The four lengths as an array.
    pub const fn as_array(&self) -> [u32; 4] {
        [self.ini_days, self.dev_days, self.mid_days, self.late_days]
    }

    /// Total season length (days).
    pub const fn total_days(&self) -> u32 {
        self.ini_days + self.dev_days + self.mid_days + self.late_days
    }

    /// Checks that every stage lasts at least one day.
    ///
    /// # Errors
    /// [`CropError::BadStageLengths`] naming `what`.
    pub fn validate(&self, what: &str) -> Result<(), CropError> {
        if self.as_array().contains(&0) {
            return Err(CropError::BadStageLengths {
                what: what.to_owned(),
                found: self.as_array(),
            });
        }
        Ok(())
    }

    /// Scales the lengths proportionally to a user's season length.
    ///
    /// Each stage gets `season_days × L / ΣL` days; the fractional parts are
    /// distributed by the largest-remainder rule (ties to the later stage)
    /// so that the four lengths sum exactly to `season_days`, and every stage
    /// keeps at least one day. FAO-56 (p.103) notes stage lengths vary with
    /// climate, latitude and cultivar and recommends local data; proportional
    /// scaling keeps the Table 11 shape when only the season length is known.
    ///
    /// # Errors
    /// [`CropError::SeasonTooShort`] if `season_days < 4`;
    /// [`CropError::BadStageLengths`] if a length is zero.
    pub fn scaled_to(&self, season_days: u32) -> Result<Self, CropError> {
        self.validate("stage lengths to scale")?;
        if season_days < 4 {
            return Err(CropError::SeasonTooShort { found: season_days });
        }
        let total = f64::from(self.total_days());
        let lengths = self.as_array();
        let exact: Vec<f64> = lengths
            .iter()
            .map(|&l| f64::from(season_days) * f64::from(l) / total)
            .collect();
        let mut out: [u32; 4] = [0; 4];
        for (o, e) in out.iter_mut().zip(&exact) {
            *o = (e.floor() as u32).max(1);
        }
        // Distribute remaining days to the largest remainders; take back
        // surplus (possible after the minimum of 1) from the longest stage.
        loop {
            let sum: u32 = out.iter().sum();
            if sum == season_days {
                break;
            }
            if sum < season_days {
                let mut best = 0;
                let mut best_rem = f64::NEG_INFINITY;
                for (k, e) in exact.iter().enumerate() {
                    let rem = e - f64::from(out[k]);
                    if rem >= best_rem {
                        best_rem = rem;
                        best = k;
                    }
                }
                out[best] += 1;
            } else {
                let mut longest = 0;
                for k in 1..4 {
                    if out[k] > out[longest] {
                        longest = k;
                    }
                }
                out[longest] -= 1;
            }
        }
        Ok(Self::new(out[0], out[1], out[2], out[3]))
    }

    /// Stage of season day `day` (1-based; day 1 is the planting day).
    /// Days past the end are reported as late season.
    pub fn stage_of_day(&self, day: u32) -> Stage {
        let a = self.ini_days;
        let b = a + self.dev_days;
        let c = b + self.mid_days;
        if day <= a {
            Stage::Initial
        } else if day <= b {
            Stage::Development
        } else if day <= c {
            Stage::MidSeason
        } else {
            Stage::LateSeason
        }
    }

    /// The 1-based inclusive day range of a stage.
    pub fn day_range(&self, stage: Stage) -> std::ops::RangeInclusive<u32> {
        let a = self.ini_days;
        let b = a + self.dev_days;
        let c = b + self.mid_days;
        let d = c + self.late_days;
        match stage {
            Stage::Initial => 1..=a,
            Stage::Development => a + 1..=b,
            Stage::MidSeason => b + 1..=c,
            Stage::LateSeason => c + 1..=d,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scaling_keeps_total_and_minimum() {
        let l = StageLengths::new(30, 40, 50, 30);
        let s = l.scaled_to(120).expect("scales");
        assert_eq!(s.total_days(), 120);
        assert_eq!(s, StageLengths::new(24, 32, 40, 24));
        let s = l.scaled_to(4).expect("scales");
        assert_eq!(s, StageLengths::new(1, 1, 1, 1));
        for n in 4..400 {
            let s = l.scaled_to(n).expect("scales");
            assert_eq!(s.total_days(), n);
            assert!(!s.as_array().contains(&0));
        }
        assert!(l.scaled_to(3).is_err());
    }

    #[test]
    fn stage_of_day_boundaries() {
        let l = StageLengths::new(25, 25, 30, 20);
        assert_eq!(l.stage_of_day(25), Stage::Initial);
        assert_eq!(l.stage_of_day(26), Stage::Development);
        assert_eq!(l.stage_of_day(80), Stage::MidSeason);
        assert_eq!(l.stage_of_day(81), Stage::LateSeason);
        assert_eq!(l.day_range(Stage::LateSeason), 81..=100);
    }
}
