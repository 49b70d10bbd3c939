//! The `canal_sections.csv` table (and workbook sheet): each canal's
//! section at its required capacity. The first eighteen columns are the
//! issue's contract; columns after `checks` are additions at the end.

use offtake_core::engine::Results;

use crate::export::{Cell, Table};

/// Canal sections file.
pub const CANAL_SECTIONS_CSV: &str = "canal_sections.csv";

/// Canal sections table name (also the workbook sheet).
pub const CANAL_SECTIONS_TABLE: &str = "canal sections";

/// Canal sections header.
pub const CANAL_SECTIONS_HEADERS: [&str; 24] = [
    "node",
    "basis",
    "required_capacity_ls",
    "shape",
    "bed_width_m",
    "water_depth_m",
    "side_slope_h_per_v",
    "freeboard_m",
    "top_width_m",
    "area_m2",
    "wetted_perimeter_m",
    "hydraulic_radius_m",
    "velocity_ms",
    "froude",
    "manning_n",
    "bed_slope",
    "seepage_ls",
    "checks",
    "section_capacity_ls",
    "entered_capacity_ls",
    "proposal",
    "note",
    "seepage_efficiency_season",
    "seepage_efficiency_min_day",
];

/// Daily conveyance efficiency file (canals whose seepage replaces Ec).
pub const CANAL_EFFICIENCY_DAILY_CSV: &str = "canal_efficiency_daily.csv";

/// Daily conveyance efficiency table name.
pub const CANAL_EFFICIENCY_DAILY_TABLE: &str = "canal efficiency daily";

/// Daily conveyance efficiency of each canal whose seepage by wetted
/// perimeter replaces its fixed Ec (`date,node,conveyance_efficiency`);
/// `None` when no canal does.
#[must_use]
pub fn canal_efficiency_daily_table(r: &Results) -> Option<Table> {
    let net = r.demand.network();
    let canals: Vec<usize> = (0..net.canals().len())
        .filter(|&i| net.seepage(i).is_some())
        .collect();
    if canals.is_empty() {
        return None;
    }
    let mut t = Table::with_headers(
        CANAL_EFFICIENCY_DAILY_TABLE,
        &["date", "node", "conveyance_efficiency"],
    );
    for day in 0..r.days {
        for &i in &canals {
            t.push_row(vec![
                Cell::Date(r.demand.date(day)),
                Cell::Text(net.canals()[i].id.clone()),
                Cell::rounded(r.demand.canal_efficiency_day(i)[day], 4),
            ]);
        }
    }
    Some(t)
}

/// Builds the canal sections table of a run.
#[must_use]
pub fn canal_sections_table(r: &Results) -> Table {
    let mut t = Table::with_headers(CANAL_SECTIONS_TABLE, &CANAL_SECTIONS_HEADERS);
    for row in &r.sections {
        let mut cells = vec![
            Cell::Text(row.node.clone()),
            Cell::Text(row.basis.label().to_owned()),
            Cell::rounded(row.required_capacity_ls, 1),
        ];
        match &row.section {
            Some(s) => cells.extend([
                Cell::Text(s.prism.shape.as_str().to_owned()),
                Cell::rounded(s.prism.bed_width_m, 3),
                Cell::rounded(s.water_depth_m, 3),
                Cell::rounded(s.prism.side_slope_h_per_v, 2),
                Cell::rounded(s.freeboard_m, 3),
                Cell::rounded(s.top_width_m, 3),
                Cell::rounded(s.area_m2, 4),
                Cell::rounded(s.wetted_perimeter_m, 3),
                Cell::rounded(s.hydraulic_radius_m, 4),
                Cell::rounded(s.velocity_ms, 3),
                Cell::rounded(s.froude, 3),
                Cell::rounded(s.manning_n, 4),
                Cell::rounded(s.bed_slope, 7),
                Cell::rounded_opt(row.seepage_ls, 2),
                Cell::Text(s.failed_text()),
            ]),
            None => cells.extend((0..15).map(|_| Cell::Empty)),
        }
        cells.extend([
            Cell::rounded_opt(row.section_capacity_ls, 1),
            Cell::rounded_opt(row.entered_capacity_ls, 1),
            Cell::Text(row.proposal.clone().unwrap_or_default()),
            Cell::Text(row.note.clone()),
            Cell::rounded_opt(row.seepage_efficiency_season, 4),
            Cell::rounded_opt(row.seepage_efficiency_min_day, 4),
        ]);
        t.push_row(cells);
    }
    t
}
