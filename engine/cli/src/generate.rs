//! `fivefold generate`, `fivefold verify` and `fivefold sheet`: make a puzzle set from a seed,
//! re-prove one, print one.
//!
//! `generate` writes only what `verify` reads: its flags are held to the set file's limits
//! before any work (the count, the board side, the rating band, the title, a calendar date),
//! and the finished set passes [`setfile::check`] before a byte of it is written.

use clap::builder::RangedU64ValueParser;
use clap::{value_parser, Args};
use engine::formats::limits;
use engine::formats::setfile::{self, GeneratorInfo, PuzzleSet};
use engine::puzzle::generate::{self, Options};
use engine::puzzle::verify;
use engine::puzzle::Theme;
use engine::Rule;

use crate::{date, out};

/// The lowest and highest rating a band may name (the set file's limit).
const MAX_RATING: u32 = limits::MAX_RATING;
/// Where the generator's ratings fall: a band must overlap this range.
const RATINGS: (u32, u32) = (600, 2600);

#[derive(Args)]
pub struct GenerateArgs {
    /// Theme: four-three, vcf, vct, defend, forbidden-trap or forbidden-win.
    #[arg(long)]
    pub theme: String,
    /// How many puzzles, 1 to 1000 (the most a set holds).
    #[arg(
        long,
        default_value_t = 20,
        value_parser = RangedU64ValueParser::<usize>::new().range(1..=limits::MAX_PUZZLES as u64),
        allow_negative_numbers = true
    )]
    pub count: usize,
    /// Rule: freestyle, standard or renju.
    #[arg(long, default_value = "freestyle")]
    pub rule: String,
    /// Board side, 9 to 19.
    #[arg(
        long,
        default_value_t = 15,
        value_parser = value_parser!(u8).range(9..=19),
        allow_negative_numbers = true
    )]
    pub size: u8,
    /// Rating band, LOW-HIGH on the Glicko scale (1500 is an average club player): whole
    /// numbers from 0 to 4000, LOW at most HIGH, overlapping 600-2600 (where the generator's
    /// ratings fall).
    #[arg(
        long,
        default_value = "600-2600",
        value_name = "LOW-HIGH",
        value_parser = parse_band,
        allow_hyphen_values = true
    )]
    pub rating: RatingRange,
    /// Seed, 0 to 18446744073709551615: the same seed and options give the same set.
    #[arg(long, default_value_t = 1, allow_negative_numbers = true)]
    pub seed: u64,
    /// Title of the set (shown to players as text), at most 200 bytes of UTF-8
    /// [default: the theme, rule and seed].
    #[arg(long, value_parser = parse_title)]
    pub title: Option<String>,
    /// Date written into the set: a calendar date YYYY-MM-DD, years 0001 to 9999, leap years
    /// by the Gregorian rule [default: today, UTC].
    #[arg(long, value_parser = date::parse_created)]
    pub created: Option<String>,
    /// Output file, written whole or not at all (default: standard output).
    #[arg(long)]
    pub out: Option<String>,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
    /// Deep lines: at least this many attacker moves before the winning one (vcf: fours, up to
    /// 20; vct: threes and fours, up to 10; defend: the opponent's threat, up to 20), made by
    /// taking forcing exchanges back from played positions; each line is checked for detours.
    #[arg(
        long,
        value_name = "MOVES",
        default_value_t = 0,
        value_parser = value_parser!(u16).range(0..=20),
        allow_negative_numbers = true
    )]
    pub min_moves: u16,
    /// Keep only puzzles with exactly one correct first move (or one defence).
    #[arg(long)]
    pub unique: bool,
    /// Threads to play games on, 1 to 256 [default: every core]. The set is the same for any
    /// number, byte for byte.
    #[arg(
        long,
        value_parser = RangedU64ValueParser::<usize>::new().range(1..=256),
        allow_negative_numbers = true
    )]
    pub jobs: Option<usize>,
}

/// A rating band, low and high ends included.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct RatingRange(pub u32, pub u32);

/// Reads `--rating`; the message says what is wrong (clap names the option).
fn parse_band(s: &str) -> Result<RatingRange, String> {
    let bad = || format!("'{s}' is not a band like 1200-1600");
    let (a, b) = s.split_once('-').ok_or_else(bad)?;
    let end = |t: &str| -> Result<u32, String> {
        let n: u64 = t.trim().parse().map_err(|_| bad())?;
        u32::try_from(n)
            .ok()
            .filter(|&n| n <= MAX_RATING)
            .ok_or_else(|| format!("{n} is not a rating (0 to {MAX_RATING})"))
    };
    let (lo, hi) = (end(a)?, end(b)?);
    if lo > hi {
        return Err(format!("the band {lo}-{hi} is backwards"));
    }
    if hi < RATINGS.0 || lo > RATINGS.1 {
        return Err(format!(
            "the band {lo}-{hi} lies outside {}-{}, where the generator's ratings fall",
            RATINGS.0, RATINGS.1
        ));
    }
    Ok(RatingRange(lo, hi))
}

/// Reads `--title`: at most the set file's limit.
fn parse_title(s: &str) -> Result<String, String> {
    if s.len() > limits::MAX_TITLE_BYTES {
        return Err(format!(
            "{} bytes long; a title is at most {} bytes of UTF-8",
            s.len(),
            limits::MAX_TITLE_BYTES
        ));
    }
    Ok(s.to_string())
}

pub fn run(args: &GenerateArgs) -> Result<(), String> {
    let theme: Theme = args.theme.parse().map_err(|e| format!("--theme: {e}"))?;
    let rule: Rule = args.rule.parse().map_err(|e| format!("--rule: {e}"))?;
    let options = Options {
        theme,
        rule,
        size: args.size,
        count: args.count,
        rating: (args.rating.0, args.rating.1),
        seed: args.seed,
        min_moves: args.min_moves,
        unique: args.unique,
    };
    options.check().map_err(|e| e.to_string())?;
    let created = args.created.clone().unwrap_or_else(date::today);
    let title = args.title.clone().unwrap_or_else(|| {
        format!(
            "{} ({rule}), seed {}",
            engine::words::theme(theme),
            args.seed
        )
    });
    let bar = out::progress(
        args.count as u64,
        args.quiet,
        "{spinner} [{bar:30}] {pos}/{len} puzzles, {msg} ({elapsed})",
    );
    let jobs = args.jobs.unwrap_or_else(|| {
        std::thread::available_parallelism()
            .map(|n| n.get())
            .unwrap_or(1)
    });
    let puzzles = generate::generate_on(&options, jobs, |p| {
        bar.set_position(p.kept as u64);
        bar.set_message(format!("{} games", p.games));
    })
    .map_err(|e| e.to_string())?;
    bar.finish_and_clear();
    let set = PuzzleSet {
        title,
        created,
        puzzles,
        generator: Some(GeneratorInfo {
            seed: args.seed,
            theme,
            rule,
            size: args.size,
            count: args.count,
            rating: options.rating,
            min_moves: options.min_moves,
            unique: options.unique,
        }),
    };
    // Nothing is written that the set file's reader would refuse.
    setfile::check(&set).map_err(|e| format!("the set made fails the set file's rules: {e}"))?;
    let json = setfile::to_json(&set);
    match &args.out {
        Some(path) => {
            out::write_file(path, json.as_bytes())?;
            out::note(&format!("wrote {} puzzles to {path}", set.puzzles.len()));
            Ok(())
        }
        None => out::print(&json),
    }
}

#[derive(Args)]
pub struct VerifyArgs {
    /// The set file.
    pub file: String,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
}

/// Reads a set file, with a message naming the file on failure. At most a set file's limit
/// of bytes is read.
pub fn read_set(path: &str) -> Result<PuzzleSet, String> {
    let text = out::read_text(path, limits::MAX_FILE_BYTES, "a set file")?;
    setfile::parse(&text).map_err(|e| format!("{path}: {e}"))
}

pub fn verify(args: &VerifyArgs) -> Result<(), String> {
    let set = read_set(&args.file)?;
    let mut solver = engine::search::Solver::default();
    let bar = out::progress(
        set.puzzles.len() as u64,
        args.quiet,
        "{spinner} [{bar:30}] {pos}/{len} puzzles re-proved ({elapsed})",
    );
    let mut failures = 0;
    for (i, p) in set.puzzles.iter().enumerate() {
        let problems = verify::check(&mut solver, p);
        for problem in &problems {
            bar.suspend(|| out::note(&format!("puzzle {} ({}): {problem}", i + 1, p.id)));
        }
        if !problems.is_empty() {
            failures += 1;
        }
        bar.inc(1);
    }
    bar.finish_and_clear();
    if failures > 0 {
        return Err(format!(
            "{failures} of {} puzzles failed verification",
            set.puzzles.len()
        ));
    }
    out::print(&format!(
        "{}: all {} puzzles verified\n",
        args.file,
        set.puzzles.len()
    ))
}

#[derive(Args)]
pub struct SheetArgs {
    /// The set file.
    pub file: String,
    /// Output HTML file, written whole or not at all.
    #[arg(long)]
    pub out: String,
}

pub fn sheet(args: &SheetArgs) -> Result<(), String> {
    let set = read_set(&args.file)?;
    let html = engine::formats::sheet::sheet_html(&set);
    out::write_file(&args.out, html.as_bytes())?;
    out::note(&format!(
        "wrote a sheet of {} puzzles to {}",
        set.puzzles.len(),
        args.out
    ));
    Ok(())
}
