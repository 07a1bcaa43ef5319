//! `fivefold review`: a player's own games checked move by move (missed wins, blunders,
//! missed defences, renju forbidden points), the findings in words or JSON, and the findings'
//! puzzles written as a set "From my games".

use clap::{value_parser, Args};
use engine::formats::games::{read_games, Choices};
use engine::formats::{limits, setfile};
use engine::review::{review, Finding, FindingKind, ForcedWin, GameReview};
use engine::search::{Budget, Solver};
use engine::{words, Point, Rule, Stone};
use serde::Serialize;

use crate::date;
use crate::out;
use crate::solve::MAX_NODES;

#[derive(Args)]
pub struct ReviewArgs {
    /// The game file: move lists (one game per block, `#` lines as titles) or SGF; `-` reads
    /// standard input.
    pub game: String,
    /// The rule to check under (freestyle, standard, renju); default: the rule the record
    /// names, else freestyle.
    #[arg(long)]
    pub rule: Option<Rule>,
    /// Board size for move lists (and SGF games without SZ), 5 to 19; default 15.
    #[arg(long, value_parser = value_parser!(u8).range(5..=19), allow_negative_numbers = true)]
    pub size: Option<u8>,
    /// Which game of the file to check, from 1; default: every game.
    #[arg(long, value_parser = value_parser!(u64).range(1..=100_000), allow_negative_numbers = true)]
    pub number: Option<u64>,
    /// Node budget of each question (one side's win at one position, or the defences), 1 to
    /// 10000000000; default: the generator's budget (50,000 nodes a search, 5,000,000 a
    /// question).
    #[arg(long, value_parser = value_parser!(u64).range(1..=MAX_NODES), allow_negative_numbers = true)]
    pub nodes: Option<u64>,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
    /// Write the findings' puzzles as a set file "From my games" (written whole or not at
    /// all; nothing is written when no finding makes a puzzle). The puzzles are made and
    /// proved only with this option.
    #[arg(long)]
    pub out: Option<String>,
    /// List every defence of a missed defence (the check itself stops at the first defence
    /// it proves).
    #[arg(long)]
    pub all_defences: bool,
    /// Only the findings of this colour's moves go into the set (black or white).
    #[arg(long)]
    pub player: Option<Stone>,
    /// The set's date, YYYY-MM-DD (default: today).
    #[arg(long, value_parser = date::parse_created)]
    pub created: Option<String>,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
}

#[derive(Serialize)]
struct JsonWin {
    side: &'static str,
    class: &'static str,
    line: Vec<String>,
    depth: u16,
    onto_forbidden: bool,
}

#[derive(Serialize)]
struct JsonFinding {
    number: usize,
    colour: &'static str,
    played: String,
    kind: &'static str,
    words: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    win: Option<JsonWin>,
    #[serde(skip_serializing_if = "Option::is_none")]
    defences: Option<Vec<String>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    all_defences: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    forbidden: Option<&'static str>,
    puzzle: Option<String>,
}

#[derive(Serialize)]
struct JsonGame {
    game: usize,
    title: Option<String>,
    rule: &'static str,
    size: u8,
    moves: usize,
    verdicts: Vec<&'static str>,
    fine: usize,
    findings: Vec<JsonFinding>,
    undecided: usize,
    winner: Option<&'static str>,
    nodes: u64,
    summary: String,
}

fn names(points: &[Point]) -> Vec<String> {
    points.iter().map(|p| p.to_string()).collect()
}

fn json_win(w: &ForcedWin) -> JsonWin {
    JsonWin {
        side: w.side.name(),
        class: w.mode_name(),
        line: names(&w.line),
        depth: w.depth,
        onto_forbidden: w.onto_forbidden,
    }
}

fn json_finding(f: &Finding) -> JsonFinding {
    let (win, defences, all_defences, forbidden) = match &f.kind {
        FindingKind::MissedWin { win } | FindingKind::Blunder { win } => {
            (Some(json_win(win)), None, None, None)
        }
        FindingKind::MissedDefence {
            threat,
            defences,
            all,
            ..
        } => (
            Some(json_win(threat)),
            Some(names(defences)),
            Some(*all),
            None,
        ),
        FindingKind::ForbiddenPoint { why, .. } => (None, None, None, Some(why.name())),
    };
    JsonFinding {
        number: f.number,
        colour: f.colour.name(),
        played: f.played.to_string(),
        kind: f.kind.name(),
        words: words::finding(f),
        win,
        defences,
        all_defences,
        forbidden,
        puzzle: f.puzzle.as_ref().map(|p| p.id.clone()),
    }
}

pub fn run(args: &ReviewArgs) -> Result<(), String> {
    let (name, text) = if args.game == "-" {
        (
            "standard input".to_string(),
            out::read_stdin(limits::MAX_FILE_BYTES, "a game file")?,
        )
    } else {
        (
            args.game.clone(),
            out::read_text(&args.game, limits::MAX_FILE_BYTES, "a game file")?,
        )
    };
    let choices = Choices {
        size: args.size,
        rule: None,
    };
    let loaded = read_games(text.as_bytes(), choices).map_err(|e| format!("{name}: {e}"))?;
    for w in &loaded.warnings {
        out::note(&format!("{name}: {w}"));
    }
    let games: Vec<(usize, _)> = match args.number {
        Some(k) => {
            let k = k as usize;
            let g = loaded.games.get(k - 1).ok_or_else(|| {
                format!(
                    "{name} holds {} game(s); there is no game {k}",
                    loaded.games.len()
                )
            })?;
            vec![(k, g)]
        }
        None => loaded
            .games
            .iter()
            .enumerate()
            .map(|(i, g)| (i + 1, g))
            .collect(),
    };
    let budget = args.nodes.map_or(Budget::GENERATION, Budget::total);
    let mut solver = Solver::default();
    let mut reviews: Vec<(usize, Option<String>, GameReview)> = Vec::new();
    for (k, g) in games {
        let rule = args.rule.or(g.rule()).unwrap_or(Rule::Freestyle);
        let bar = out::progress(
            g.moves().len() as u64,
            args.quiet,
            "{spinner} [{bar:30}] {pos}/{len} moves checked ({elapsed})",
        );
        let r = review(&mut solver, g, rule, budget, None, |p| {
            bar.set_length(p.total as u64);
            bar.set_position(p.checked as u64);
        })
        .map_err(|e| format!("{name}: {e}"))?;
        bar.finish_and_clear();
        reviews.push((k, g.info().title.clone(), r));
    }
    for (_, _, r) in &mut reviews {
        if args.all_defences {
            r.list_defences(&mut solver, budget);
        }
        if args.out.is_some() {
            let bar = out::progress(
                r.findings().count() as u64,
                args.quiet,
                "{spinner} [{bar:30}] {pos}/{len} findings made into puzzles ({elapsed})",
            );
            r.make_puzzles(&mut solver, args.player, None, |done, of| {
                bar.set_length(of as u64);
                bar.set_position(done as u64);
            });
            bar.finish_and_clear();
        }
    }
    if let Some(path) = &args.out {
        let created = args.created.clone().unwrap_or_else(date::today);
        let mut puzzles = Vec::new();
        for (_, _, r) in &reviews {
            for p in r.puzzle_list(args.player) {
                if !puzzles
                    .iter()
                    .any(|q: &engine::puzzle::Puzzle| q.id == p.id)
                {
                    puzzles.push(p);
                }
            }
        }
        if puzzles.is_empty() {
            out::note("no finding made a puzzle: no set written");
        } else {
            puzzles.truncate(limits::MAX_PUZZLES);
            let set = setfile::PuzzleSet {
                title: engine::review::SET_TITLE.to_string(),
                created,
                puzzles,
                generator: None,
            };
            setfile::check(&set).map_err(|e| format!("the set would not read back: {e}"))?;
            out::write_file(path, setfile::to_json(&set).as_bytes())?;
            out::note(&format!(
                "wrote {} puzzle(s) \"{}\" to {path}",
                set.puzzles.len(),
                set.title
            ));
        }
    }
    if args.json {
        let list: Vec<JsonGame> = reviews
            .iter()
            .map(|(k, title, r)| {
                let (fine, _, undecided) = r.counts();
                JsonGame {
                    game: *k,
                    title: title.clone(),
                    rule: r.rule.name(),
                    size: r.size,
                    moves: r.moves.len(),
                    verdicts: r.moves.iter().map(|m| m.verdict.name()).collect(),
                    fine,
                    findings: r.findings().map(json_finding).collect(),
                    undecided,
                    winner: r.winner.map(|s| s.name()),
                    nodes: r.nodes,
                    summary: words::review_summary(r),
                }
            })
            .collect();
        let text = serde_json::to_string_pretty(&list).map_err(|e| e.to_string())?;
        return out::print(&format!("{text}\n"));
    }
    let mut text = String::new();
    for (k, title, r) in &reviews {
        let head = match title {
            Some(t) => format!("Game {k} ({t}), {} rules", r.rule.name()),
            None => format!("Game {k}, {} rules", r.rule.name()),
        };
        text.push_str(&format!("{head}: {}\n", words::review_summary(r)));
        for f in r.findings() {
            text.push_str(&format!("  {}\n", words::finding(f)));
            let (line, side) = f.shown_line();
            if !line.is_empty() {
                text.push_str(&format!(
                    "    line ({} first): {}\n",
                    side.name(),
                    engine::notation::format_points(line)
                ));
            }
            if let Some(p) = &f.puzzle {
                text.push_str(&format!("    puzzle {} ({})\n", p.id, p.theme));
            }
        }
        let undecided: Vec<String> = r
            .moves
            .iter()
            .filter(|m| m.verdict == engine::review::MoveVerdict::Undecided)
            .map(|m| m.number.to_string())
            .collect();
        if !undecided.is_empty() {
            text.push_str(&format!("  undecided: moves {}\n", undecided.join(", ")));
        }
    }
    out::print(&text)
}
