//! The first project layout (schema 0), kept so old files still open.
//! It migrates to schema 1 ([`super::v1`]), which migrates to the current
//! schema.
//!
//! Differences from schema 1:
//! * efficiencies were percentages: `conveyance_efficiency_pct`,
//!   `application_efficiency_pct`, `field_canal_efficiency_pct`;
//! * a block named its canal `outlet_on`, and held one method name
//!   (`method`) beside the application efficiency;
//! * planting areas were always hectares (`area_ha`), the first planting
//!   day was `planting_month` + `planting_day`, and there was no season
//!   length override;
//! * the design probability was called `dependability_pct`;
//!   there were no reservoir, ET₀ method choice, supply or scenarios.

use offtake_core::project as cur;
use serde::Deserialize;

use super::v1;

/// Schema-0 project.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields, rename = "Project")]
pub struct Project {
    /// Always 0.
    pub schema: u32,
    /// Scheme name and notes (unchanged since).
    pub scheme: cur::SchemeInfo,
    /// Canals.
    pub canals: Vec<Canal>,
    /// Blocks.
    pub blocks: Vec<Block>,
    /// Plantings.
    pub plantings: Vec<Planting>,
    /// Weather source (unchanged in schema 1).
    pub weather: v1::WeatherSource,
    /// Options.
    pub options: Options,
}

/// Schema-0 canal.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Canal {
    /// Id.
    pub id: String,
    /// Name.
    pub name: String,
    /// Parent canal id.
    #[serde(default)]
    pub parent: Option<String>,
    /// Kind.
    pub kind: cur::CanalKind,
    /// Conveyance efficiency in percent.
    pub conveyance_efficiency_pct: f64,
    /// Existing capacity, m³/s.
    #[serde(default)]
    pub existing_capacity_m3s: Option<f64>,
    /// Hours per day.
    pub operating_hours_per_day: f64,
}

/// Schema-0 block.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Block {
    /// Id.
    pub id: String,
    /// Name.
    pub name: String,
    /// Canal id (renamed `canal` in schema 1).
    pub outlet_on: String,
    /// Area, ha.
    pub area_ha: f64,
    /// Soil id.
    pub soil: String,
    /// Irrigation method name.
    pub method: String,
    /// Field application efficiency in percent.
    pub application_efficiency_pct: f64,
    /// Field-canal efficiency in percent.
    pub field_canal_efficiency_pct: f64,
}

/// Schema-0 planting.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Planting {
    /// Id.
    pub id: String,
    /// Block id.
    pub block: String,
    /// Crop id.
    pub crop: String,
    /// Area, ha.
    pub area_ha: f64,
    /// First planting month.
    pub planting_month: u32,
    /// First planting day.
    pub planting_day: u32,
    /// Spread, days.
    pub spread_days: u32,
    /// Season label.
    pub season: String,
    /// Strategy (unchanged since).
    pub strategy: cur::Strategy,
}

/// Schema-0 options.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Options {
    /// Effective rain method.
    pub effective_rain: cur::EffectiveRain,
    /// Reporting step.
    pub reporting_step: cur::ReportingStep,
    /// Irrigation year start month.
    pub irrigation_year_start_month: u32,
    /// Design probability (renamed `design_probability_pct`).
    pub dependability_pct: f64,
    /// Design basis.
    pub design_basis: cur::DesignBasis,
    /// Rotation period, days.
    pub rotation_period_days: u32,
}

/// Converts a schema-0 project to schema 1.
pub fn migrate(old: Project) -> v1::Project {
    v1::Project {
        schema: 1,
        scheme: old.scheme,
        canals: old
            .canals
            .into_iter()
            .map(|c| cur::Canal {
                id: c.id,
                name: c.name,
                parent: c.parent,
                kind: c.kind,
                conveyance_efficiency: c.conveyance_efficiency_pct / 100.0,
                existing_capacity_m3s: c.existing_capacity_m3s,
                operating_hours_per_day: c.operating_hours_per_day,
                section: cur::CanalSectionSpec::default(),
            })
            .collect(),
        blocks: old
            .blocks
            .into_iter()
            .map(|b| cur::Block {
                id: b.id,
                name: b.name,
                canal: b.outlet_on,
                area_ha: b.area_ha,
                soil: b.soil,
                method: cur::IrrigationMethod {
                    name: b.method,
                    application_efficiency: b.application_efficiency_pct / 100.0,
                },
                field_canal_efficiency: b.field_canal_efficiency_pct / 100.0,
                delivery: cur::DeliveryMode::OnDemand,
                outlet_stream_size_ls: None,
            })
            .collect(),
        plantings: old
            .plantings
            .into_iter()
            .map(|p| cur::Planting {
                id: p.id,
                block: p.block,
                crop: p.crop,
                area: cur::PlantingArea::Hectares(p.area_ha),
                first_planting: cur::MonthDay {
                    month: p.planting_month,
                    day: p.planting_day,
                },
                spread_days: p.spread_days,
                season: p.season,
                strategy: p.strategy,
                season_length_days: None,
                paddy: None,
                coefficients: offtake_core::project::CoefficientChoice::Single,
            })
            .collect(),
        weather: old.weather,
        reservoir: None,
        options: cur::Options {
            et0_method: cur::Et0Method::PenmanMonteith,
            effective_rain: old.options.effective_rain,
            reporting_step: old.options.reporting_step,
            irrigation_year_start_month: old.options.irrigation_year_start_month,
            design_probability_pct: old.options.dependability_pct,
            design_basis: old.options.design_basis,
            rotation_period_days: old.options.rotation_period_days,
            available_supply: None,
            gap_filling: cur::GapFilling::default(),
            design_confidence_pct: cur::Options::default().design_confidence_pct,
            station_limits: offtake_core::station_limits::StationLimits::default(),
        },
        scenarios: Vec::new(),
    }
}
