//! The scheme: demand up the canal tree, design values, capacity and shortfall.
//!
//! - [`network`]: the canal tree and its blocks, validated as a whole;
//! - [`demand`]: block NIR → GIR → demand at each canal head and the
//!   headworks, per day, per crop and per block, in 10-day and monthly tables;
//!   storage (reservoir evaporation) losses beside the headworks demand;
//! - [`design`]: yearly peaks, design flow at a chosen non-exceedance
//!   probability, duty, required capacity, shortfall against an existing
//!   capacity.
//!
//! Results are planning estimates: canal and structure designs must be
//! checked by a qualified engineer against local codes and measured data.

pub mod demand;
pub mod design;
pub mod network;

use std::fmt;

pub use demand::{
    DemandAccumulator, NirSeries, PeriodDemand, PeriodStep, SchemeDemand, aggregate_periods,
    storage_losses_m3_day,
};
pub use design::{
    BasisShortfallPeriod, DesignBasis, DesignOptions, NodeDesign, Shortfall, ShortfallDay,
    ShortfallPeriod, YearValues, capacity_shortfall, capacity_shortfall_on_basis, design_values,
};
pub use network::{Block, Canal, CanalSeepage, Network, NetworkProblem, Node};

/// Errors of the scheme computations.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SchemeError {
    /// The network or the demand input has problems; every one is listed.
    #[error("invalid scheme input:\n{}", ProblemList(.0))]
    Invalid(Vec<NetworkProblem>),
    /// A storage-loss input is negative or not finite.
    #[error("storage losses: {what} = {value}, expected a finite value >= 0")]
    BadStorageInput {
        /// Which input and where.
        what: String,
        /// The value found.
        value: f64,
    },
    /// Seepage by wetted perimeter could not be solved for a canal.
    #[error("canal {canal}: seepage by wetted perimeter: {source}")]
    Seepage {
        /// Canal id.
        canal: String,
        /// Why.
        source: crate::section::SectionError,
    },
    /// A design option is out of range.
    #[error("design option {what} = {value}: {expected}")]
    BadOption {
        /// The option.
        what: &'static str,
        /// The value found.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// The record holds no complete irrigation year.
    #[error(
        "no complete irrigation year (starting in month {year_start_month}) in the record {first} to {last}"
    )]
    NoCompleteYear {
        /// Month the irrigation year starts in (1–12).
        year_start_month: u32,
        /// First day of the record.
        first: chrono::NaiveDate,
        /// Last day of the record.
        last: chrono::NaiveDate,
    },
}

struct ProblemList<'a>(&'a [NetworkProblem]);

impl fmt::Display for ProblemList<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, p) in self.0.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "  - {p}")?;
        }
        Ok(())
    }
}
