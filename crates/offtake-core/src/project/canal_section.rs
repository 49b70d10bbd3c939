//! The section fields of a canal in the project file: bed slope, lining,
//! shape, length, seepage and an existing section. Every field is optional
//! and left out of the file when unset, so projects without sections read
//! and write exactly as before (no schema change).

use serde::{Deserialize, Serialize};

use crate::section::{ExistingSection, Lining, Prism, Shape};

/// A canal's section data.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct CanalSectionSpec {
    /// Bed slope (m/m). Without it no section is designed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bed_slope: Option<f64>,
    /// Lining or soil (sets n, side slope and the maximum velocity).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub lining: Option<Lining>,
    /// Section shape (default trapezoidal).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shape: Option<Shape>,
    /// Side slope z (H per V); default: the lining's.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub side_slope_h_per_v: Option<f64>,
    /// Manning n; default: the lining's.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub manning_n: Option<f64>,
    /// Bed-width-to-depth ratio of the designed section (default 2).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub width_ratio: Option<f64>,
    /// Length of the reach (m).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub length_m: Option<f64>,
    /// Seepage rate (m³ per m² of wetted area per day).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub seepage_m3_m2_day: Option<f64>,
    /// Let seepage by wetted perimeter (length × rate) replace the fixed
    /// conveyance efficiency Ec, solved each day by iteration to 0.1 %.
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub seepage_replaces_ec: bool,
    /// The section as built, if any: its Manning capacity replaces the
    /// entered existing capacity.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub existing: Option<ExistingSectionSpec>,
}

impl CanalSectionSpec {
    /// True when nothing is set (the field is then left out of the file).
    #[must_use]
    pub fn is_empty(&self) -> bool {
        *self == CanalSectionSpec::default()
    }

    /// Lining, defaulting to ordinary firm loam.
    #[must_use]
    pub fn lining_or_default(&self) -> Lining {
        self.lining.unwrap_or_default()
    }

    /// Manning n: given, else the lining's.
    #[must_use]
    pub fn manning_n_or_default(&self) -> f64 {
        self.manning_n
            .unwrap_or_else(|| self.lining_or_default().manning_n())
    }

    /// The existing section with this canal's slope and n, if both a slope
    /// and an existing section are given.
    #[must_use]
    pub fn existing_section(&self) -> Option<ExistingSection> {
        let e = self.existing.as_ref()?;
        Some(ExistingSection {
            prism: Prism::new(
                e.shape.or(self.shape).unwrap_or_default(),
                e.bed_width_m,
                e.side_slope_h_per_v,
            ),
            full_supply_depth_m: e.full_supply_depth_m,
            bank_height_m: e.bank_height_m,
            manning_n: e.manning_n.unwrap_or_else(|| self.manning_n_or_default()),
            bed_slope: self.bed_slope?,
        })
    }
}

impl CanalSectionSpec {
    /// The seepage model that replaces the fixed Ec, when the user asks for
    /// it and gives a slope, a length and a rate: on the existing section if
    /// any, else on the section designed for `design_flow_m3s`.
    #[must_use]
    pub fn seepage_model(
        &self,
        design_flow_m3s: Option<f64>,
    ) -> Option<crate::scheme::CanalSeepage> {
        if !self.seepage_replaces_ec {
            return None;
        }
        let (rate, length, slope) = (self.seepage_m3_m2_day?, self.length_m?, self.bed_slope?);
        let (prism, n) = if let Some(e) = self.existing_section() {
            (e.prism, e.manning_n)
        } else {
            let lining = self.lining_or_default();
            let n = self.manning_n_or_default();
            let req = crate::section::DesignRequest {
                flow_m3s: design_flow_m3s?,
                bed_slope: slope,
                manning_n: n,
                shape: self.shape.unwrap_or_default(),
                side_slope_h_per_v: self
                    .side_slope_h_per_v
                    .unwrap_or_else(|| lining.side_slope_h_per_v()),
                width: crate::section::Width::Ratio(
                    self.width_ratio
                        .unwrap_or(crate::section::canal::DEFAULT_WIDTH_RATIO),
                ),
                freeboard_m: None,
                lining: Some(lining),
                colloidal_silt: false,
                min_velocity_ms: 0.0,
                method: crate::section::Method::Manning,
            };
            (crate::section::design_section(&req).ok()?.prism, n)
        };
        Some(crate::scheme::CanalSeepage {
            prism,
            manning_n: n,
            bed_slope: slope,
            rate_m3_m2_day: rate,
            length_m: length,
        })
    }
}

/// An existing (built) section.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ExistingSectionSpec {
    /// Shape (default: the canal's shape).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shape: Option<Shape>,
    /// Bed width (m).
    pub bed_width_m: f64,
    /// Side slope (H per V).
    pub side_slope_h_per_v: f64,
    /// Full-supply water depth (m).
    pub full_supply_depth_m: f64,
    /// Bank height above the bed (m), if surveyed.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bank_height_m: Option<f64>,
    /// Manning n of the built section (default: the canal's).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub manning_n: Option<f64>,
}
