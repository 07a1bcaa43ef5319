//! `fivefold suite`: harvest the solver benchmark suite from seeded self-play.

use std::io::Write;

use clap::{value_parser, Args};
use engine::suite::{self, Quotas};

use crate::out;

/// The most games `--games` may ask for.
const MAX_GAMES: u64 = 1_000_000;

#[derive(Args)]
pub struct SuiteArgs {
    /// Seed of the self-play games, 0 to 18446744073709551615.
    #[arg(long, default_value_t = 1, allow_negative_numbers = true)]
    pub seed: u64,
    /// Most games to play, 1 to 1000000.
    #[arg(
        long,
        default_value_t = 3000,
        value_parser = value_parser!(u64).range(1..=MAX_GAMES),
        allow_negative_numbers = true
    )]
    pub games: u64,
    /// Output file, written whole or not at all (stdout if absent).
    #[arg(long)]
    pub out: Option<String>,
}

pub fn run(args: &SuiteArgs) -> Result<(), String> {
    let cases = suite::harvest(args.seed, Quotas::default(), args.games, |g, n| {
        if g % 20 == 0 {
            let mut err = std::io::stderr().lock();
            let _ = write!(err, "\rgames played: {g}, positions kept: {n}   ");
        }
    });
    out::note("");
    let mut text = format!(
        "# Fivefold solver benchmark suite, harvested from seeded self-play by\n\
         # `fivefold suite --seed {} --games {}`.\n\
         # rule size to_move search verdict fours black white\n",
        args.seed, args.games
    );
    for c in &cases {
        text.push_str(&c.to_string());
        text.push('\n');
    }
    // Nothing is written that the suite's reader would refuse.
    let read =
        suite::parse(&text).map_err(|e| format!("the suite made does not read back: {e}"))?;
    if read != cases {
        return Err("the suite made does not read back as the same positions".into());
    }
    match &args.out {
        Some(path) => out::write_file(path, text.as_bytes())?,
        None => out::print(&text)?,
    }
    out::note(&format!("{} positions", cases.len()));
    Ok(())
}
