//! `offtake`: the headless Offtake commands for batch work.
//!
//! The command names, options and output columns are a stable contract (see
//! DESIGN.md, "Headless command contract"). Each command lives in its own
//! module; this file only parses arguments and dispatches. Errors print their
//! whole cause chain and exit non-zero: 2 when the project has validation
//! errors (each listed; nothing computed), 1 for any other failure.

use std::process::ExitCode;

use clap::{Parser, Subcommand};

mod cmd_compare;
mod cmd_et0;
mod cmd_planting;
mod cmd_report;
mod cmd_run;
mod cmd_section;
mod cmd_weather_check;
mod cmd_weather_stats;

/// Irrigation crop water demand planner (headless).
#[derive(Debug, Parser)]
#[command(name = "offtake", version, about)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Reference evapotranspiration (ET0) of each day of a weather file.
    Et0(cmd_et0::Args),
    /// Compute a project: demand, design values, roster; write the tables.
    Run(cmd_run::Args),
    /// Compare the scenarios of a project side by side.
    Compare(cmd_compare::Args),
    /// Write the design report of a project as one self-contained HTML file.
    Report(cmd_report::Args),
    /// Net irrigation requirement of one planting over a weather record.
    Planting(cmd_planting::Args),
    /// One canal section: normal depth (Manning) or regime section (Lacey), with checks.
    Section(cmd_section::Args),
    /// Weather series: quality checks and multi-year statistics.
    Weather {
        #[command(subcommand)]
        command: WeatherCommand,
    },
}

#[derive(Debug, Subcommand)]
enum WeatherCommand {
    /// Read a weather file and print its quality report.
    Check(cmd_weather_check::Args),
    /// Yearly, monthly and 10-day ET0 and rain statistics with dependable values.
    Stats(cmd_weather_stats::Args),
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let result = match &cli.command {
        Command::Et0(args) => cmd_et0::run(args),
        Command::Run(args) => cmd_run::run(args),
        Command::Compare(args) => cmd_compare::run(args),
        Command::Report(args) => cmd_report::run(args),
        Command::Planting(args) => cmd_planting::run(args),
        Command::Section(args) => cmd_section::run(args),
        Command::Weather {
            command: WeatherCommand::Check(args),
        } => cmd_weather_check::run(args),
        Command::Weather {
            command: WeatherCommand::Stats(args),
        } => cmd_weather_stats::run(args),
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(err) => {
            eprintln!("{err}");
            for cause in err.chain().skip(1) {
                eprintln!("  caused by: {cause}");
            }
            // 2: the project has validation errors and nothing was computed
            // (every error is listed above); 1: any other failure.
            let invalid = err.chain().any(|c| {
                matches!(
                    c.downcast_ref::<offtake_core::engine::EngineError>(),
                    Some(offtake_core::engine::EngineError::Invalid { .. })
                )
            });
            if invalid {
                ExitCode::from(2)
            } else {
                ExitCode::FAILURE
            }
        }
    }
}
