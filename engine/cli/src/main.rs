//! `fivefold`: the engine on the command line, for instructors, scripts and tests.
//!
//! This binary is glue: it parses flags, turns them into engine values, calls the engine and
//! prints text or JSON. Every failure is one line on stderr and a non-zero exit code.

mod generate;
mod inspect;
mod position;
mod results;
mod share;
mod solve;
mod suite;

use std::process::ExitCode;

use clap::{Parser, Subcommand};

#[derive(Parser)]
#[command(
    name = "fivefold",
    version,
    about = "Forcing-line trainer for five-in-a-row: the engine on the command line"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Describe a position: side to move, winner, forbidden points, five and four points.
    Inspect(inspect::InspectArgs),
    /// Print a position as a text diagram.
    Show(position::PositionArgs),
    /// Search a position: VCF, VCT, defences, or exact solving of a small board.
    Solve(solve::SolveArgs),
    /// Make a puzzle set from a seed.
    Generate(generate::GenerateArgs),
    /// Re-prove every puzzle of a set file; exits non-zero if any fails.
    Verify(generate::VerifyArgs),
    /// Print a set as a page: numbered diagrams with the goal under each, answers at the end.
    Sheet(generate::SheetArgs),
    /// Print the link (or bare code) that hands a set out, and write its QR code.
    Share(share::ShareArgs),
    /// Read students' result codes against a set and print the class table (or write CSV).
    Results(results::ResultsArgs),
    /// Measure the QR version (level M) of sets' links; prints a Markdown table.
    #[command(hide = true, name = "qr-versions")]
    QrVersions(share::QrVersionsArgs),
    /// Harvest the solver benchmark suite from seeded self-play.
    #[command(hide = true)]
    Suite(suite::SuiteArgs),
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let result = match cli.command {
        Command::Inspect(args) => inspect::run(&args),
        Command::Show(args) => position::show(&args),
        Command::Solve(args) => solve::run(&args),
        Command::Suite(args) => suite::run(&args),
        Command::Generate(args) => generate::run(&args),
        Command::Verify(args) => generate::verify(&args),
        Command::Sheet(args) => generate::sheet(&args),
        Command::Share(args) => share::run(&args),
        Command::Results(args) => results::run(&args),
        Command::QrVersions(args) => share::qr_versions(&args),
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("fivefold: {message}");
            ExitCode::FAILURE
        }
    }
}
