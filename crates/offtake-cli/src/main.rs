//! `offtake`: the headless Offtake commands for batch work.
//!
//! The command names, options and output columns are a stable contract (see
//! DESIGN.md, "Headless command contract").

use std::process::ExitCode;

use clap::{Parser, Subcommand};

/// Irrigation crop water demand planner (headless).
#[derive(Debug, Parser)]
#[command(name = "offtake", version, about)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {}


fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {}
}
