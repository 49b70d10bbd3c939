//! Range checks of every numeric input against the table of limits
//! ([`crate::limits`]): outside the physical range an error, outside the
//! usual range a warning naming the value and the usual range.

use super::ValidationProblem;
use crate::limits::{self, Limit, Verdict};
use crate::project::{PaddyInputs, Strategy};

/// Checks `value` against `limit`; `subject` names the item (`block "B1"`)
/// and `field` the field as the file spells it.
pub(super) fn check_limit(
    subject: &str,
    field: &'static str,
    limit: &'static Limit,
    value: f64,
    out: &mut Vec<ValidationProblem>,
) {
    match limit.verdict(value) {
        Verdict::Usual => {}
        Verdict::Unusual => out.push(ValidationProblem::Unusual {
            subject: subject.to_owned(),
            field,
            label: limit.label,
            value,
            usual: limit.usual_text(),
            range_source: limit.source,
        }),
        Verdict::Impossible => out.push(ValidationProblem::OutOfRange {
            subject: subject.to_owned(),
            field,
            label: limit.label,
            value,
            expected: limit.physical_text(),
        }),
    }
}

/// As [`check_limit`] for a whole number of days or a count.
pub(super) fn check_count(
    subject: &str,
    field: &'static str,
    limit: &'static Limit,
    value: u32,
    out: &mut Vec<ValidationProblem>,
) {
    check_limit(subject, field, limit, f64::from(value), out);
}

/// The paddy inputs of a planting.
pub(super) fn check_paddy(subject: &str, p: &PaddyInputs, out: &mut Vec<ValidationProblem>) {
    use limits::{
        BUND_HEIGHT_MM, DRAIN_DAYS_BEFORE_HARVEST, LAND_PREPARATION_DAYS, LAND_PREPARATION_MM,
        NURSERY_DAYS, NURSERY_SHARE, PADDY_FIELD_EFFICIENCY, PERCOLATION_SEEPAGE_MM_DAY,
        TARGET_PONDING_MM,
    };
    check_limit(
        subject,
        "paddy field_efficiency",
        &PADDY_FIELD_EFFICIENCY,
        p.field_efficiency,
        out,
    );
    check_limit(
        subject,
        "paddy bund_height_mm",
        &BUND_HEIGHT_MM,
        p.bund_height_mm,
        out,
    );
    check_limit(
        subject,
        "paddy target_ponding_mm",
        &TARGET_PONDING_MM,
        p.target_ponding_mm,
        out,
    );
    if p.target_ponding_mm.is_finite()
        && p.bund_height_mm.is_finite()
        && p.target_ponding_mm > p.bund_height_mm
    {
        out.push(ValidationProblem::BadValue {
            subject: subject.to_owned(),
            field: "paddy target_ponding_mm",
            value: p.target_ponding_mm,
            expected: "at most the bund height (paddy bund_height_mm)",
        });
    }
    check_limit(
        subject,
        "paddy percolation_seepage_mm_day",
        &PERCOLATION_SEEPAGE_MM_DAY,
        p.percolation_seepage_mm_day,
        out,
    );
    check_limit(
        subject,
        "paddy land_preparation_mm",
        &LAND_PREPARATION_MM,
        p.land_preparation_mm,
        out,
    );
    check_count(
        subject,
        "paddy land_preparation_days",
        &LAND_PREPARATION_DAYS,
        p.land_preparation_days,
        out,
    );
    check_limit(
        subject,
        "paddy nursery_share",
        &NURSERY_SHARE,
        p.nursery_share,
        out,
    );
    // The nursery's days matter only when there is a nursery.
    if p.nursery_share > 0.0 {
        check_count(
            subject,
            "paddy nursery_days",
            &NURSERY_DAYS,
            p.nursery_days,
            out,
        );
    }
    check_count(
        subject,
        "paddy drain_days_before_harvest",
        &DRAIN_DAYS_BEFORE_HARVEST,
        p.drain_days_before_harvest,
        out,
    );
}

/// The parameters of a planting's irrigation strategy.
pub(super) fn check_strategy(subject: &str, s: &Strategy, out: &mut Vec<ValidationProblem>) {
    match *s {
        Strategy::Refill { trigger_pct_of_raw } => {
            check_limit(
                subject,
                "strategy.trigger_pct_of_raw",
                &limits::TRIGGER_PCT_OF_RAW,
                trigger_pct_of_raw,
                out,
            );
        }
        Strategy::Interval { days } => {
            check_count(subject, "strategy.days", &limits::INTERVAL_DAYS, days, out);
        }
        Strategy::Depth { net_mm } => {
            check_limit(
                subject,
                "strategy.net_mm",
                &limits::NET_DEPTH_MM,
                net_mm,
                out,
            );
        }
        Strategy::Deficit {
            trigger_pct_of_taw,
            refill_pct_of_depletion,
        } => {
            check_limit(
                subject,
                "strategy.trigger_pct_of_taw",
                &limits::TRIGGER_PCT_OF_TAW,
                trigger_pct_of_taw,
                out,
            );
            check_limit(
                subject,
                "strategy.refill_pct_of_depletion",
                &limits::REFILL_PCT_OF_DEPLETION,
                refill_pct_of_depletion,
                out,
            );
        }
        Strategy::Rainfed => {}
    }
}
