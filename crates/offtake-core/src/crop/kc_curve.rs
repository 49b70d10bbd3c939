//! The four-stage crop coefficient curve (FAO-56 Chapter 6, p.127–133).
//!
//! The curve is built from straight lines: Kc ini constant through the
//! initial stage, a linear rise to Kc mid over the development stage, Kc mid
//! constant through the mid-season, a linear fall to Kc end over the late
//! season (FAO-56 Figure 34). The same construction serves the basal
//! coefficient Kcb (FAO-56 Chapter 7, Example 30).

use super::{CoefficientSet, CropError, StageLengths, check_range};

/// A piecewise-linear crop coefficient curve over one cycle.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct KcCurve {
    /// Stage lengths of the cycle (days).
    pub lengths: StageLengths,
    /// The anchor values (ini, mid, end), already climate-adjusted if wanted.
    pub values: CoefficientSet,
}

impl KcCurve {
    /// A curve from stage lengths and anchor values.
    ///
    /// # Errors
    /// A zero stage length, or a coefficient that is not finite or outside 0..=2.
    pub fn new(lengths: StageLengths, values: CoefficientSet) -> Result<Self, CropError> {
        lengths.validate("Kc curve")?;
        check_range("Kc ini", values.ini, 0.0, 2.0, "0 to 2")?;
        check_range("Kc mid", values.mid, 0.0, 2.0, "0 to 2")?;
        check_range("Kc end", values.end, 0.0, 2.0, "0 to 2")?;
        Ok(Self { lengths, values })
    }

    /// Kc at a continuous time `t_days` since the start of the cycle.
    ///
    /// FAO-56 eq. 66: Kc,i = Kc,prev + [(i − ΣLprev)/Lstage](Kc,next − Kc,prev),
    /// with i read as a continuous time. Before 0 the value is Kc ini, after
    /// the end Kc end.
    pub fn kc_at(&self, t_days: f64) -> f64 {
        let l = &self.lengths;
        let v = &self.values;
        let a = f64::from(l.ini_days);
        let b = a + f64::from(l.dev_days);
        let c = b + f64::from(l.mid_days);
        let d = c + f64::from(l.late_days);
        if t_days <= a {
            v.ini
        } else if t_days <= b {
            // Eq. 66, development stage.
            v.ini + (t_days - a) / f64::from(l.dev_days) * (v.mid - v.ini)
        } else if t_days <= c {
            v.mid
        } else if t_days <= d {
            // Eq. 66, late-season stage.
            v.mid + (t_days - c) / f64::from(l.late_days) * (v.end - v.mid)
        } else {
            v.end
        }
    }

    /// Kc on season day `day` (1-based; day 1 is the first day of the cycle).
    ///
    /// FAO-56 eq. 66 with i = `day`, as in Example 28 (p.133): day 40 of a
    /// 25/25/30/20 curve gives 0.15 + [(40 − 25)/25](1.19 − 0.15) = 0.77.
    pub fn kc_on_day(&self, day: u32) -> f64 {
        self.kc_at(f64::from(day))
    }

    /// Mean Kc over the period from `t0_days` to `t1_days` (continuous times
    /// since the start of the cycle, `t1 > t0`).
    ///
    /// This is the exact integral of the piecewise-linear curve divided by
    /// the period length, which is how FAO-56 Figure 36 (p.132) averages ten
    /// days: the June second decade (days 20–30 of the season, stage change
    /// at day 25) is 5/10(0.15) + 5/10(0.15 + 0.36)/2 = 0.20. The integral is
    /// evaluated exactly with the trapezoid rule between the curve's break
    /// points. Returns Kc at `t0` if `t1 <= t0`.
    pub fn mean_kc_between(&self, t0_days: f64, t1_days: f64) -> f64 {
        if t1_days <= t0_days {
            return self.kc_at(t0_days);
        }
        let l = &self.lengths;
        let a = f64::from(l.ini_days);
        let b = a + f64::from(l.dev_days);
        let c = b + f64::from(l.mid_days);
        let d = c + f64::from(l.late_days);
        let mut points = vec![t0_days];
        points.extend(
            [a, b, c, d]
                .into_iter()
                .filter(|&x| x > t0_days && x < t1_days),
        );
        points.push(t1_days);
        let area: f64 = points
            .windows(2)
            .map(|w| (w[1] - w[0]) * (self.kc_at(w[0]) + self.kc_at(w[1])) / 2.0)
            .sum();
        area / (t1_days - t0_days)
    }

    /// Daily values for days 1..=total of the cycle.
    pub fn daily(&self) -> Vec<f64> {
        (1..=self.lengths.total_days())
            .map(|d| self.kc_on_day(d))
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn mean_of_constant_stage_is_the_constant() {
        let c = KcCurve::new(
            StageLengths::new(10, 10, 10, 10),
            CoefficientSet {
                ini: 0.3,
                mid: 1.2,
                end: 0.6,
            },
        )
        .expect("valid");
        assert!((c.mean_kc_between(0.0, 10.0) - 0.3).abs() < 1e-12);
        assert!((c.mean_kc_between(10.0, 20.0) - 0.75).abs() < 1e-12);
        assert!((c.kc_at(45.0) - 0.6).abs() < 1e-12);
    }
}
