//! The section of each canal of a scheme for its required capacity: the
//! row `offtake run` writes to `canal_sections.csv`.

use serde::Serialize;

use super::design::{
    DesignRequest, Method, SectionResult, Width, check_existing, design_section, propose,
};
use super::seepage::seepage_loss_m3s;
use super::velocity::MIN_NON_SILTING_VELOCITY_MS;
use crate::project::Canal;

/// Bed-width-to-depth ratio used when a canal gives none (common practice).
pub const DEFAULT_WIDTH_RATIO: f64 = 2.0;

/// Where a canal's section comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum SectionBasis {
    /// Designed by Manning for the required capacity.
    Designed,
    /// The existing (built) section, checked at the required capacity.
    ExistingSection,
    /// No section: the canal has no bed slope, or no demand.
    NotDesigned,
}

impl SectionBasis {
    /// Text of the `basis` column.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            SectionBasis::Designed => "designed",
            SectionBasis::ExistingSection => "existing section",
            SectionBasis::NotDesigned => "not designed",
        }
    }
}

/// One canal's section at its required capacity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CanalSectionRow {
    /// Canal id.
    pub node: String,
    /// Designed, existing section, or not designed.
    pub basis: SectionBasis,
    /// Required capacity (l/s).
    pub required_capacity_ls: f64,
    /// The section at the required capacity, if any.
    pub section: Option<SectionResult>,
    /// Seepage while the canal runs at the required capacity (l/s), when a
    /// length and a seepage rate are given.
    pub seepage_ls: Option<f64>,
    /// Existing section only: its Manning capacity at full supply (l/s).
    pub section_capacity_ls: Option<f64>,
    /// The capacity entered for the canal (l/s), if any.
    pub entered_capacity_ls: Option<f64>,
    /// The nearest passing section when a check fails, in words.
    pub proposal: Option<String>,
    /// Why no section was designed, or a remark on the capacities.
    pub note: String,
    /// With seepage replacing the fixed Ec: the record's conveyance
    /// efficiency, Σ outflow ÷ Σ inflow.
    pub seepage_efficiency_season: Option<f64>,
    /// With seepage replacing the fixed Ec: the lowest daily efficiency on
    /// a day with flow.
    pub seepage_efficiency_min_day: Option<f64>,
}

/// The section row of `canal` for `required_capacity_ls`.
#[must_use]
pub fn canal_section_row(canal: &Canal, required_capacity_ls: f64) -> CanalSectionRow {
    let spec = &canal.section;
    let entered = canal.existing_capacity_m3s.map(|q| q * 1000.0);
    let mut row = CanalSectionRow {
        node: canal.id.clone(),
        basis: SectionBasis::NotDesigned,
        required_capacity_ls,
        section: None,
        seepage_ls: None,
        section_capacity_ls: None,
        entered_capacity_ls: entered,
        proposal: None,
        note: String::new(),
        seepage_efficiency_season: None,
        seepage_efficiency_min_day: None,
    };
    let Some(slope) = spec.bed_slope else {
        "no bed slope given".clone_into(&mut row.note);
        return row;
    };
    if !(required_capacity_ls.is_finite() && required_capacity_ls > 0.0) {
        "no demand: required capacity is zero".clone_into(&mut row.note);
        return row;
    }
    let flow = required_capacity_ls / 1000.0;
    let lining = spec.lining_or_default();
    let n = spec.manning_n_or_default();
    let computed: Result<SectionResult, super::SectionError> = if let Some(existing) =
        spec.existing_section()
    {
        row.basis = SectionBasis::ExistingSection;
        match existing.capacity_m3s() {
            Ok(cap) => {
                row.section_capacity_ls = Some(cap * 1000.0);
                if let Some(e) = entered {
                    row.note = format!(
                        "entered capacity {e:.1} l/s, section capacity {:.1} l/s (difference {:+.1} l/s): the section is used",
                        cap * 1000.0,
                        cap * 1000.0 - e
                    );
                }
            }
            Err(err) => row.note = format!("existing section: {err}"),
        }
        check_existing(
            &existing,
            flow,
            Some(lining),
            false,
            MIN_NON_SILTING_VELOCITY_MS,
        )
    } else {
        row.basis = SectionBasis::Designed;
        let req = DesignRequest {
            flow_m3s: flow,
            bed_slope: slope,
            manning_n: n,
            shape: spec.shape.unwrap_or_default(),
            side_slope_h_per_v: spec
                .side_slope_h_per_v
                .unwrap_or_else(|| lining.side_slope_h_per_v()),
            width: Width::Ratio(spec.width_ratio.unwrap_or(DEFAULT_WIDTH_RATIO)),
            freeboard_m: None,
            lining: Some(lining),
            colloidal_silt: false,
            min_velocity_ms: MIN_NON_SILTING_VELOCITY_MS,
            method: Method::Manning,
        };
        let s = design_section(&req);
        if let Ok(sec) = &s
            && !sec.passes()
        {
            row.proposal = Some(propose(&req, sec).map_or_else(
                || {
                    "none passes at this slope: the slope must change (falls, or another alignment)"
                        .to_owned()
                },
                |p| p.change,
            ));
        }
        s
    };
    match computed {
        Ok(sec) => {
            if let (Some(rate), Some(len)) = (spec.seepage_m3_m2_day, spec.length_m) {
                row.seepage_ls = Some(seepage_loss_m3s(rate, sec.wetted_perimeter_m, len) * 1000.0);
            }
            row.section = Some(sec);
        }
        Err(err) => {
            row.basis = SectionBasis::NotDesigned;
            row.note = err.to_string();
        }
    }
    row
}
