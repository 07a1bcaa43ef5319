//! `fivefold suite`: harvest the solver benchmark suite from seeded self-play.

use clap::Args;
use engine::suite::{self, Quotas};

#[derive(Args)]
pub struct SuiteArgs {
    /// Seed of the self-play games.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Most games to play.
    #[arg(long, default_value_t = 3000)]
    pub games: u64,
    /// Output file (stdout if absent).
    #[arg(long)]
    pub out: Option<String>,
}

pub fn run(args: &SuiteArgs) -> Result<(), String> {
    let cases = suite::harvest(args.seed, Quotas::default(), args.games, |g, n| {
        if g % 20 == 0 {
            eprint!("\rgames played: {g}, positions kept: {n}   ");
        }
    });
    eprintln!();
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
    match &args.out {
        Some(path) => {
            std::fs::write(path, text).map_err(|e| format!("cannot write {path}: {e}"))?
        }
        None => print!("{text}"),
    }
    eprintln!("{} positions", cases.len());
    Ok(())
}
