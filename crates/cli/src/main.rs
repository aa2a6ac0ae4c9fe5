//! `saltwise-cli`: the chemistry core from a terminal — pH, dose curves, doses, QC titrations, batch sheets and the library.
//!
//! Exit codes: 0 success; 1 a problem with the input (message on stderr); 2 bad usage.

mod args;
mod compare;
mod design;
mod fit;
mod input;
mod output;
mod report;
mod sweep;
mod titrate;
mod tolerance;
mod user_lib;

use std::process::ExitCode;

use clap::Parser;

fn main() -> ExitCode {
    let cli = args::Cli::parse();
    match run(cli) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("error: {e:#}");
            ExitCode::from(1)
        }
    }
}

fn run(cli: args::Cli) -> anyhow::Result<ExitCode> {
    match cli.command {
        args::Command::Ph(a) => output::ph(&a),
        args::Command::Curve(a) => output::curve(&a),
        args::Command::Dose(a) => output::dose(&a),
        args::Command::Library(a) => output::library(&a),
        args::Command::Water(a) => output::water(&a),
        args::Command::Sweep(a) => sweep::run(&a),
        args::Command::Tolerance(a) => tolerance::run(&a),
        args::Command::Design(a) => design::run(&a),
        args::Command::Compare(a) => compare::run(&a),
        args::Command::Titrate(a) => titrate::run(&a),
        args::Command::Report(a) => report::run(&a),
        args::Command::Fit(a) => fit::run(&a),
    }
}
