//! `fivefold`: the engine on the command line, for instructors, scripts and tests.
//!
//! This binary is glue: it parses flags, turns them into engine values, calls the engine and
//! prints text or JSON. Every failure is one line on stderr and a non-zero exit code: 2 for
//! a flag that is missing, unknown or out of its range (refused before any work), 1 for
//! everything else (bad input, a failed check, an output that could not be written). Every
//! numeric flag states its range in `--help`. When the reader of standard output goes away
//! (`fivefold show ... | head -1`), the command ends quietly with status 0 (see `out.rs`).

mod date;
mod generate;
mod inspect;
mod out;
mod plot;
mod position;
mod results;
mod review;
mod share;
mod solve;
mod suite;

use std::process::ExitCode;

use clap::error::ErrorKind;
use clap::{Parser, Subcommand};

#[derive(Parser)]
#[command(
    name = "fivefold",
    version,
    about = "Forcing-line trainer for five-in-a-row: the engine on the command line",
    after_help = "Exit status: 0 on success, and also when the reader of standard output \
                  stops reading early (as `| head` does); 1 when the input is refused, a check \
                  fails or output cannot be written (a full disk); 2 when a flag is missing, \
                  unknown or outside its range. Errors are one line on standard error."
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
    /// Draw the estimated rating of set files' puzzles against their line length, as SVG.
    Plot(plot::PlotArgs),
    /// Print the link (or bare code) that hands a set out, and write its QR code.
    Share(share::ShareArgs),
    /// Check a player's own games move by move: missed wins, blunders, missed defences.
    Review(review::ReviewArgs),
    /// Read students' result codes against a set and print the class table (or write CSV).
    Results(results::ResultsArgs),
    /// Measure the QR version (level M) of sets' links; prints a Markdown table.
    #[command(hide = true, name = "qr-versions")]
    QrVersions(share::QrVersionsArgs),
    /// Harvest the solver benchmark suite from seeded self-play.
    #[command(hide = true)]
    Suite(suite::SuiteArgs),
}

/// A clap error as one line: its first paragraph (the error itself, without the usage and
/// the pointer to `--help`), with the line breaks of a list folded into spaces.
fn one_line(err: &clap::Error) -> String {
    let text = err.render().to_string();
    let first = text.split("\n\n").next().unwrap_or_default();
    let folded = first.split_whitespace().collect::<Vec<_>>().join(" ");
    folded
        .strip_prefix("error: ")
        .unwrap_or(&folded)
        .to_string()
}

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(err) => {
            // --help and --version are "errors" that print to standard output.
            if matches!(
                err.kind(),
                ErrorKind::DisplayHelp | ErrorKind::DisplayVersion
            ) {
                let Err(e) = err.print() else {
                    return ExitCode::SUCCESS;
                };
                let message = out::stdout_error(&e);
                if out::stdout_closed() {
                    return ExitCode::SUCCESS;
                }
                out::note(&format!("fivefold: {message}"));
                return ExitCode::FAILURE;
            }
            out::note(&format!("fivefold: {}", one_line(&err)));
            return ExitCode::from(u8::try_from(err.exit_code()).unwrap_or(2));
        }
    };
    let result = match cli.command {
        Command::Inspect(args) => inspect::run(&args),
        Command::Show(args) => position::show(&args),
        Command::Solve(args) => solve::run(&args),
        Command::Suite(args) => suite::run(&args),
        Command::Generate(args) => generate::run(&args),
        Command::Verify(args) => generate::verify(&args),
        Command::Sheet(args) => generate::sheet(&args),
        Command::Share(args) => share::run(&args),
        Command::Plot(args) => plot::run(&args),
        Command::Results(args) => results::run(&args),
        Command::Review(args) => review::run(&args),
        Command::QrVersions(args) => share::qr_versions(&args),
    };
    match result {
        _ if out::stdout_closed() => ExitCode::SUCCESS,
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            out::note(&format!("fivefold: {message}"));
            ExitCode::FAILURE
        }
    }
}
