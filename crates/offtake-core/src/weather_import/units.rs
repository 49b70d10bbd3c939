//! Units a weather file may use, and their conversion to the SI units of
//! [`crate::weather::WeatherDay`].
//!
//! Every factor is a named constant with its source. FAO-56 is Allen, Pereira,
//! Raes and Smith (1998), *Crop evapotranspiration*, FAO Irrigation and
//! Drainage Paper 56, Annex 1 (unit conversions). NIST SP 811 is Thompson and
//! Taylor (2008), *Guide for the Use of the International System of Units*,
//! NIST Special Publication 811, Appendix B.8 (factors for units listed
//! alphabetically).

use serde::{Deserialize, Serialize};

/// Kelvin to degrees Celsius offset: °C = K − 273.15 (NIST SP 811, B.8,
/// "kelvin"; definition of the Celsius scale).
pub const KELVIN_AT_ZERO_CELSIUS: f64 = 273.15;

/// Degrees Fahrenheit at 0 °C: °C = (°F − 32) / 1.8 (NIST SP 811, B.8,
/// "degree Fahrenheit").
pub const FAHRENHEIT_AT_ZERO_CELSIUS: f64 = 32.0;

/// Fahrenheit degrees per Celsius degree (NIST SP 811, B.8: t/°C = (t/°F − 32)/1.8).
pub const FAHRENHEIT_PER_CELSIUS_DEGREE: f64 = 1.8;

/// Metres per second in one kilometre per hour: 1000 m / 3600 s (exact;
/// NIST SP 811, B.8 lists 2.777 778 E−01).
pub const MS_PER_KMH: f64 = 1000.0 / 3600.0;

/// Metres per second in one mile per hour: 4.4704 E−01 (exact; NIST SP 811, B.8,
/// "mile per hour").
pub const MS_PER_MPH: f64 = 0.447_04;

/// Metres per second in one knot (one nautical mile, 1852 m, per hour):
/// 5.144 444 E−01 (NIST SP 811, B.8, "knot").
pub const MS_PER_KNOT: f64 = 1852.0 / 3600.0;

/// Millimetres in one inch: 25.4 (exact; NIST SP 811, B.8, "inch" = 2.54 E−02 m).
pub const MM_PER_INCH: f64 = 25.4;

/// MJ m⁻² day⁻¹ for a daily-mean irradiance of 1 W m⁻²: 0.0864
/// (FAO-56 Annex 1: 1 W m⁻² = 0.0864 MJ m⁻² day⁻¹).
pub const MJ_M2_DAY_PER_W_M2: f64 = 0.0864;

/// MJ in one kWh: 3.6 (exact; NIST SP 811, B.8, "kilowatt hour" = 3.6 E+06 J).
pub const MJ_PER_KWH: f64 = 3.6;

/// kPa in one hPa or one mbar: 0.1 (FAO-56 Annex 1: 1 mbar = 0.1 kPa;
/// 1 hPa = 1 mbar by definition).
pub const KPA_PER_HPA: f64 = 0.1;

/// A temperature unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum TemperatureUnit {
    /// Degrees Celsius.
    Celsius,
    /// Degrees Fahrenheit.
    Fahrenheit,
    /// Kelvin.
    Kelvin,
}

impl TemperatureUnit {
    /// Converts a value in this unit to °C.
    pub fn to_celsius(self, value: f64) -> f64 {
        match self {
            Self::Celsius => value,
            Self::Fahrenheit => {
                (value - FAHRENHEIT_AT_ZERO_CELSIUS) / FAHRENHEIT_PER_CELSIUS_DEGREE
            }
            Self::Kelvin => value - KELVIN_AT_ZERO_CELSIUS,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Celsius => "°C",
            Self::Fahrenheit => "°F",
            Self::Kelvin => "K",
        }
    }
}

/// A wind speed unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum WindUnit {
    /// Metres per second.
    MetresPerSecond,
    /// Kilometres per hour.
    KilometresPerHour,
    /// Statute miles per hour.
    MilesPerHour,
    /// Knots (nautical miles per hour).
    Knots,
}

impl WindUnit {
    /// Converts a value in this unit to m/s.
    pub fn to_ms(self, value: f64) -> f64 {
        match self {
            Self::MetresPerSecond => value,
            Self::KilometresPerHour => value * MS_PER_KMH,
            Self::MilesPerHour => value * MS_PER_MPH,
            Self::Knots => value * MS_PER_KNOT,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::MetresPerSecond => "m/s",
            Self::KilometresPerHour => "km/h",
            Self::MilesPerHour => "mph",
            Self::Knots => "knots",
        }
    }
}

/// How relative humidity is written.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum HumidityUnit {
    /// Percent, 0–100.
    Percent,
    /// Fraction, 0–1.
    Fraction,
}

impl HumidityUnit {
    /// Converts a value in this unit to percent.
    pub fn to_pct(self, value: f64) -> f64 {
        match self {
            Self::Percent => value,
            Self::Fraction => value * 100.0,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Percent => "%",
            Self::Fraction => "fraction 0–1",
        }
    }
}

/// A vapour pressure unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum PressureUnit {
    /// Kilopascal.
    Kilopascal,
    /// Hectopascal.
    Hectopascal,
    /// Millibar (equal to the hectopascal).
    Millibar,
}

impl PressureUnit {
    /// Converts a value in this unit to kPa.
    pub fn to_kpa(self, value: f64) -> f64 {
        match self {
            Self::Kilopascal => value,
            Self::Hectopascal | Self::Millibar => value * KPA_PER_HPA,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Kilopascal => "kPa",
            Self::Hectopascal => "hPa",
            Self::Millibar => "mbar",
        }
    }
}

/// A daily solar radiation unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum RadiationUnit {
    /// MJ m⁻² day⁻¹ (daily total).
    MegajoulesPerSquareMetreDay,
    /// W m⁻² averaged over the 24 hours of the day.
    WattsPerSquareMetreDailyMean,
    /// kWh m⁻² day⁻¹ (daily total).
    KilowattHoursPerSquareMetreDay,
}

impl RadiationUnit {
    /// Converts a value in this unit to MJ m⁻² day⁻¹.
    pub fn to_mj_m2_day(self, value: f64) -> f64 {
        match self {
            Self::MegajoulesPerSquareMetreDay => value,
            Self::WattsPerSquareMetreDailyMean => value * MJ_M2_DAY_PER_W_M2,
            Self::KilowattHoursPerSquareMetreDay => value * MJ_PER_KWH,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::MegajoulesPerSquareMetreDay => "MJ m⁻² day⁻¹",
            Self::WattsPerSquareMetreDailyMean => "W m⁻² daily mean",
            Self::KilowattHoursPerSquareMetreDay => "kWh m⁻² day⁻¹",
        }
    }
}

/// A precipitation depth unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum DepthUnit {
    /// Millimetres.
    Millimetres,
    /// Inches.
    Inches,
}

impl DepthUnit {
    /// Converts a value in this unit to mm.
    pub fn to_mm(self, value: f64) -> f64 {
        match self {
            Self::Millimetres => value,
            Self::Inches => value * MM_PER_INCH,
        }
    }

    /// Unit symbol for messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Millimetres => "mm",
            Self::Inches => "in",
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: f64, b: f64, tol: f64) -> bool {
        (a - b).abs() <= tol
    }

    /// NIST SP 811, Appendix B.8: t/°C = (t/°F − 32)/1.8; T/K = t/°C + 273.15.
    /// Check points: water freezes at 32 °F = 0 °C, boils at 212 °F = 100 °C.
    #[test]
    fn temperature_nist_sp811() {
        assert!(close(
            TemperatureUnit::Fahrenheit.to_celsius(32.0),
            0.0,
            1e-12
        ));
        assert!(close(
            TemperatureUnit::Fahrenheit.to_celsius(212.0),
            100.0,
            1e-12
        ));
        assert!(close(
            TemperatureUnit::Fahrenheit.to_celsius(-40.0),
            -40.0,
            1e-12
        ));
        assert!(close(
            TemperatureUnit::Kelvin.to_celsius(273.15),
            0.0,
            1e-12
        ));
        assert!(close(
            TemperatureUnit::Kelvin.to_celsius(300.0),
            26.85,
            1e-12
        ));
        assert!(close(TemperatureUnit::Celsius.to_celsius(21.5), 21.5, 0.0));
    }

    /// NIST SP 811, Appendix B.8: km/h = 2.777 778 E−01 m/s; mph = 4.4704 E−01 m/s
    /// (exact); knot = 5.144 444 E−01 m/s.
    #[test]
    fn wind_nist_sp811() {
        assert!(close(
            WindUnit::KilometresPerHour.to_ms(1.0),
            2.777_778e-1,
            5e-8
        ));
        assert!(close(WindUnit::MilesPerHour.to_ms(1.0), 4.4704e-1, 1e-15));
        assert!(close(WindUnit::Knots.to_ms(1.0), 5.144_444e-1, 5e-8));
        assert!(close(WindUnit::KilometresPerHour.to_ms(36.0), 10.0, 1e-12));
        assert!(close(WindUnit::MetresPerSecond.to_ms(2.5), 2.5, 0.0));
    }

    /// FAO-56 Annex 1: 1 W m⁻² = 0.0864 MJ m⁻² day⁻¹. NIST SP 811, B.8:
    /// 1 kWh = 3.6 E+06 J.
    #[test]
    fn radiation_fao56_annex1_and_nist() {
        assert!(close(
            RadiationUnit::WattsPerSquareMetreDailyMean.to_mj_m2_day(1.0),
            0.0864,
            1e-15
        ));
        // 250 W m⁻² over 86 400 s = 21.6 MJ m⁻².
        assert!(close(
            RadiationUnit::WattsPerSquareMetreDailyMean.to_mj_m2_day(250.0),
            21.6,
            1e-12
        ));
        assert!(close(
            RadiationUnit::KilowattHoursPerSquareMetreDay.to_mj_m2_day(6.0),
            21.6,
            1e-12
        ));
    }

    /// FAO-56 Annex 1: 1 mbar = 0.1 kPa; 1 hPa = 1 mbar.
    #[test]
    fn pressure_fao56_annex1() {
        assert!(close(PressureUnit::Millibar.to_kpa(1.0), 0.1, 1e-15));
        assert!(close(PressureUnit::Hectopascal.to_kpa(17.0), 1.7, 1e-12));
        assert!(close(PressureUnit::Kilopascal.to_kpa(1.7), 1.7, 0.0));
    }

    /// NIST SP 811, B.8: inch = 2.54 E−02 m (exact).
    #[test]
    fn depth_nist_sp811() {
        assert!(close(DepthUnit::Inches.to_mm(1.0), 25.4, 1e-12));
        assert!(close(DepthUnit::Inches.to_mm(0.5), 12.7, 1e-12));
    }

    #[test]
    fn humidity_fraction() {
        assert!(close(HumidityUnit::Fraction.to_pct(0.55), 55.0, 1e-12));
        assert!(close(HumidityUnit::Percent.to_pct(55.0), 55.0, 0.0));
    }
}
