//! `fivefold generate` and `fivefold verify`: make a puzzle set from a seed, and re-prove one.

use std::time::{SystemTime, UNIX_EPOCH};

use clap::Args;
use engine::formats::setfile::{self, GeneratorInfo, PuzzleSet};
use engine::puzzle::generate::{self, Options};
use engine::puzzle::verify;
use engine::puzzle::Theme;
use engine::Rule;
use indicatif::{ProgressBar, ProgressStyle};

#[derive(Args)]
pub struct GenerateArgs {
    /// Theme: four-three, vcf, vct, defend, forbidden-trap or forbidden-win.
    #[arg(long)]
    pub theme: String,
    /// How many puzzles.
    #[arg(long, default_value_t = 20)]
    pub count: usize,
    /// Rule: freestyle, standard or renju.
    #[arg(long, default_value = "freestyle")]
    pub rule: String,
    /// Board side.
    #[arg(long, default_value_t = 15)]
    pub size: u8,
    /// Rating band, LOW-HIGH on the Glicko scale (1500 is an average club player).
    #[arg(long, default_value = "600-2600")]
    pub rating: String,
    /// Seed: the same seed and options give the same set.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Title of the set (shown to players as text).
    #[arg(long)]
    pub title: Option<String>,
    /// Date written into the set, YYYY-MM-DD (default: today).
    #[arg(long)]
    pub created: Option<String>,
    /// Output file (default: standard output).
    #[arg(long)]
    pub out: Option<String>,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
}

fn parse_band(s: &str) -> Result<(u32, u32), String> {
    let bad = || format!("--rating '{s}' is not a band like 1200-1600");
    let (a, b) = s.split_once('-').ok_or_else(bad)?;
    let lo: u32 = a.trim().parse().map_err(|_| bad())?;
    let hi: u32 = b.trim().parse().map_err(|_| bad())?;
    Ok((lo, hi))
}

/// Today's date in UTC, `YYYY-MM-DD` (days-to-civil conversion of the proleptic Gregorian
/// calendar, common practice).
pub fn today() -> String {
    let days = SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map(|d| d.as_secs() / 86_400)
        .unwrap_or(0) as i64;
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

pub fn run(args: &GenerateArgs) -> Result<(), String> {
    let theme: Theme = args.theme.parse().map_err(|e| format!("{e}"))?;
    let rule: Rule = args.rule.parse().map_err(|e| format!("{e}"))?;
    let options = Options {
        theme,
        rule,
        size: args.size,
        count: args.count,
        rating: parse_band(&args.rating)?,
        seed: args.seed,
    };
    options.check().map_err(|e| e.to_string())?;
    let created = args.created.clone().unwrap_or_else(today);
    let title = args.title.clone().unwrap_or_else(|| {
        format!(
            "{} ({rule}), seed {}",
            engine::words::theme(theme),
            args.seed
        )
    });
    let bar = if args.quiet {
        ProgressBar::hidden()
    } else {
        ProgressBar::new(args.count as u64)
    };
    bar.set_style(
        ProgressStyle::with_template("{spinner} [{bar:30}] {pos}/{len} puzzles, {msg} ({elapsed})")
            .expect("a valid template")
            .progress_chars("=> "),
    );
    let puzzles = generate::generate(&options, |p| {
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
        }),
    };
    let json = setfile::to_json(&set);
    match &args.out {
        Some(path) => {
            std::fs::write(path, json).map_err(|e| format!("cannot write {path}: {e}"))?;
            eprintln!("wrote {} puzzles to {path}", set.puzzles.len());
        }
        None => print!("{json}"),
    }
    Ok(())
}

#[derive(Args)]
pub struct VerifyArgs {
    /// The set file.
    pub file: String,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
}

/// Reads a set file, with a message naming the file on failure.
pub fn read_set(path: &str) -> Result<PuzzleSet, String> {
    let text = std::fs::read_to_string(path).map_err(|e| format!("cannot read {path}: {e}"))?;
    setfile::parse(&text).map_err(|e| format!("{path}: {e}"))
}

pub fn verify(args: &VerifyArgs) -> Result<(), String> {
    let set = read_set(&args.file)?;
    let mut solver = engine::search::Solver::default();
    let bar = if args.quiet {
        ProgressBar::hidden()
    } else {
        ProgressBar::new(set.puzzles.len() as u64)
    };
    bar.set_style(
        ProgressStyle::with_template(
            "{spinner} [{bar:30}] {pos}/{len} puzzles re-proved ({elapsed})",
        )
        .expect("a valid template")
        .progress_chars("=> "),
    );
    let mut failures = 0;
    for (i, p) in set.puzzles.iter().enumerate() {
        let problems = verify::check(&mut solver, p);
        for problem in &problems {
            bar.suspend(|| eprintln!("puzzle {} ({}): {problem}", i + 1, p.id));
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
    println!("{}: all {} puzzles verified", args.file, set.puzzles.len());
    Ok(())
}

#[derive(Args)]
pub struct SheetArgs {
    /// The set file.
    pub file: String,
    /// Output HTML file.
    #[arg(long)]
    pub out: String,
}

pub fn sheet(args: &SheetArgs) -> Result<(), String> {
    let set = read_set(&args.file)?;
    let html = engine::formats::sheet::sheet_html(&set);
    std::fs::write(&args.out, html).map_err(|e| format!("cannot write {}: {e}", args.out))?;
    eprintln!(
        "wrote a sheet of {} puzzles to {}",
        set.puzzles.len(),
        args.out
    );
    Ok(())
}
