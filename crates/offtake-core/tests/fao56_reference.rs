//! Published check values, read as data from `tests/reference/`:
//! FAO-56 (Allen et al. 1998) Examples 2–20 step by step and Annex 2 Tables
//! 2.1–2.5, 2.8, 2.9; Hargreaves–Samani (FAO-56 Ex 20; Peace Corps 1994);
//! ASCE-EWRI (2005) partial P, γ, Δ; open-water e_w in mm Hg. Each row names
//! its source; rows tagged [COMPUTED] are computed from the published formula.

#![allow(clippy::unwrap_used, clippy::expect_used)]

mod common;

use common::{Chain, Check, eval_daily_chain, eval_hourly_chain, eval_single, load};

#[test]
fn single_quantity_checks() {
    let checks: Vec<Check> = load("fao56_single_checks.ron");
    assert!(checks.len() > 150, "data file truncated?");
    let mut failures = Vec::new();
    for c in &checks {
        let (expected, implied) = common::printed_value_and_tolerance(&c.printed, 0.0);
        let tol = c.tolerance.unwrap_or(implied);
        let got = eval_single(&c.quantity, &c.inputs);
        if !got.is_finite() || (got - expected).abs() > tol {
            failures.push(format!(
                "{} {:?} = {got} (printed {}, tol {tol}) — {}",
                c.quantity, c.inputs, c.printed, c.source
            ));
        }
    }
    assert!(
        failures.is_empty(),
        "{} failures:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

#[test]
fn worked_examples_step_by_step() {
    let chains: Vec<Chain> = load("fao56_chains.ron");
    assert!(chains.len() >= 16, "data file truncated?");
    let mut failures = Vec::new();
    for chain in &chains {
        let computed = match chain.kind.as_str() {
            "daily" => eval_daily_chain(&chain.inputs),
            "hourly" => eval_hourly_chain(&chain.inputs),
            other => panic!("unknown chain kind {other}"),
        };
        for (name, printed) in &chain.expected {
            let extra = chain.extra_units.get(name).copied().unwrap_or(0.0);
            let (expected, implied) = common::printed_value_and_tolerance(printed, extra);
            let tol = chain.tolerance.get(name).copied().unwrap_or(implied);
            let got = *computed
                .get(name)
                .unwrap_or_else(|| panic!("{}: quantity {name} not computed", chain.source));
            if !got.is_finite() || (got - expected).abs() > tol {
                failures.push(format!(
                    "{name} = {got} (printed {printed}, tol {tol}) — {}",
                    chain.source
                ));
            }
        }
    }
    assert!(
        failures.is_empty(),
        "{} failures:\n{}",
        failures.len(),
        failures.join("\n")
    );
}
