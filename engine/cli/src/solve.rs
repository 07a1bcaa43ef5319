//! `fivefold solve`: VCF, VCT, defences, and exact solving of small boards.

use std::time::{Duration, Instant};

use clap::builder::RangedU64ValueParser;
use clap::{value_parser, Args, ValueEnum};
use engine::search::{Budget, Solver, SolverConfig};
use engine::study::{study, StudyAnswer, StudySearch};
use engine::{notation, Board, Point, Stone};
use serde::Serialize;

use crate::out;
use crate::position::{Position, PositionArgs};

#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum SearchKind {
    /// Victory by continuous fours.
    Vcf,
    /// Victory by continuous threats (threes and fours).
    Vct,
    /// Every move that stops the opponent's VCT (or VCF).
    Defend,
    /// Exact solving of a small m,n,k board with all moves.
    Exact,
}

/// The largest `--nodes`: ten billion positions, hours of search on one core.
pub const MAX_NODES: u64 = 10_000_000_000;
/// The largest `--ms`: one day.
pub const MAX_MS: u64 = 86_400_000;
/// The smallest `--memory`: one megabyte for each of the two tables.
pub const MIN_MEMORY: u64 = 2;
/// The largest `--memory`: 2 GB of tables, more than any question here has use for.
pub const MAX_MEMORY: u64 = 2048;

#[derive(Args)]
pub struct SolveArgs {
    #[command(flatten)]
    pub position: PositionArgs,
    /// What to search for.
    #[arg(long, value_enum)]
    pub search: SearchKind,
    /// Board width for --search exact, 1 to 19.
    #[arg(long, value_parser = value_parser!(u8).range(1..=19), allow_negative_numbers = true)]
    pub width: Option<u8>,
    /// Board height for --search exact, 1 to 19.
    #[arg(long, value_parser = value_parser!(u8).range(1..=19), allow_negative_numbers = true)]
    pub height: Option<u8>,
    /// Stones in a row that win, for --search exact: 1 to 19, and at most the longer side.
    #[arg(long, value_parser = value_parser!(u8).range(1..=19), allow_negative_numbers = true)]
    pub k: Option<u8>,
    /// Node budget of the whole question (every search it makes, sub-searches included),
    /// 1 to 10000000000. The answer spends at most this many nodes and a few more.
    #[arg(
        long,
        default_value_t = 2_000_000,
        value_parser = value_parser!(u64).range(1..=MAX_NODES),
        allow_negative_numbers = true
    )]
    pub nodes: u64,
    /// Time budget in milliseconds, 0 (none) to 86400000 (a day); the search stops soon after
    /// it and answers with what it has proved.
    #[arg(
        long,
        default_value_t = 0,
        value_parser = value_parser!(u64).range(0..=MAX_MS),
        allow_negative_numbers = true
    )]
    pub ms: u64,
    /// Table memory in megabytes, 2 to 2048 (three quarters for the main table, the rest for
    /// the VCF questions inside a VCT).
    #[arg(
        long,
        default_value_t = 32,
        value_parser = RangedU64ValueParser::<usize>::new().range(MIN_MEMORY..=MAX_MEMORY),
        allow_negative_numbers = true
    )]
    pub memory: usize,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
}

#[derive(Serialize, Default)]
struct Report {
    search: &'static str,
    to_move: &'static str,
    result: &'static str,
    line: Vec<String>,
    first_moves: Vec<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    defences: Option<Vec<String>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    threat: Option<&'static str>,
    unknown: Vec<String>,
    nodes: u64,
    ms: u64,
}

fn names(v: &[Point]) -> Vec<String> {
    v.iter().map(|p| p.to_string()).collect()
}

/// The position of `--search exact`: an empty m,n,k board and the moves played on it, first
/// player first. Flags of the other searches are refused rather than ignored, and so are
/// moves after the game is won.
fn exact_position(args: &SolveArgs) -> Result<(Board, Stone), String> {
    let p = &args.position;
    let ignored = [
        ("--rule", p.rule.is_some()),
        ("--size", p.size.is_some()),
        ("--black", !p.black.is_empty()),
        ("--white", !p.white.is_empty()),
        ("--to-move", p.to_move.is_some()),
    ];
    if let Some((flag, _)) = ignored.iter().find(|(_, given)| *given) {
        return Err(format!(
            "{flag} does not go with --search exact (its board is --width by --height, with \
             --moves played on it)"
        ));
    }
    let (w, h, k) = match (args.width, args.height, args.k) {
        (Some(w), Some(h), Some(k)) => (w, h, k),
        _ => return Err("--search exact needs --width, --height and --k".into()),
    };
    if k > w.max(h) {
        return Err(format!(
            "--k {k} is longer than the board's longer side ({}): nobody could win",
            w.max(h)
        ));
    }
    let mut board = Board::mnk(w, h, k).map_err(|e| e.to_string())?;
    let mut to_move = Stone::Black;
    if let Some(moves) = &p.moves {
        let points = notation::parse_points(moves, "moves", w, h).map_err(|e| e.to_string())?;
        for (i, &q) in points.iter().enumerate() {
            if board.find_winner().is_some() {
                return Err(format!(
                    "move {} ('{q}'): the game was already won by move {i}",
                    i + 1
                ));
            }
            // `parse_points` refuses points off the board and points given twice.
            board.place(q, to_move);
            to_move = to_move.opponent();
        }
    }
    if board.find_winner().is_some() {
        return Err(format!("the game is already over: {k} in a row"));
    }
    Ok((board, to_move))
}

/// What `solve` was asked, read and checked before any table is allocated.
enum Question {
    /// An m,n,k board solved exactly, with the side to move.
    Exact(Board, Stone),
    /// A study question about a position.
    Study(Position, StudySearch),
}

/// The study question of a search kind; `None` for exact solving.
fn study_search(kind: SearchKind) -> Option<StudySearch> {
    match kind {
        SearchKind::Vcf => Some(StudySearch::Vcf),
        SearchKind::Vct => Some(StudySearch::Vct),
        SearchKind::Defend => Some(StudySearch::Defend),
        SearchKind::Exact => None,
    }
}

pub fn run(args: &SolveArgs) -> Result<(), String> {
    let question = match study_search(args.search) {
        None => {
            let (board, to_move) = exact_position(args)?;
            Question::Exact(board, to_move)
        }
        Some(search) => {
            if args.width.is_some() || args.height.is_some() || args.k.is_some() {
                return Err("--width, --height and --k go with --search exact only".into());
            }
            let pos = args.position.position()?;
            if let Some(w) = pos.board.find_winner() {
                return Err(format!("the game is already over: {w} has five"));
            }
            Question::Study(pos, search)
        }
    };
    let config = SolverConfig {
        table_megabytes: args.memory * 3 / 4,
        vcf_table_megabytes: args.memory - args.memory * 3 / 4,
        ..SolverConfig::default()
    };
    // `--nodes` caps the whole question: every search it makes, sub-searches included.
    let budget = Budget::total(args.nodes);
    let mut solver = Solver::new(config);
    let start = Instant::now();
    let deadline = (args.ms > 0).then(|| start + Duration::from_millis(args.ms));
    let stop = move |_spent: u64| deadline.is_some_and(|d| Instant::now() >= d);
    let mut report = Report::default();
    match question {
        Question::Exact(board, to_move) => {
            let sol = solver.ask(budget).watch(&stop).exact(&board, to_move);
            report.search = "exact";
            report.to_move = if to_move == Stone::Black {
                "first"
            } else {
                "second"
            };
            report.result = sol.value.name();
            report.line = names(&sol.line);
            report.first_moves = names(&sol.first_moves);
            report.nodes = sol.nodes;
        }
        Question::Study(pos, search) => {
            let s = study(
                &mut solver,
                &pos.board,
                pos.to_move,
                search,
                budget,
                Some(&stop),
            );
            report.to_move = pos.to_move.name();
            report.search = search.name();
            report.result = s.answer.result();
            report.nodes = s.nodes;
            match &s.answer {
                StudyAnswer::Win {
                    line,
                    first_moves,
                    undecided,
                    ..
                } => {
                    report.line = names(line);
                    report.first_moves = names(first_moves);
                    report.unknown = names(undecided);
                }
                StudyAnswer::Threat {
                    threat,
                    defences,
                    undecided,
                    ..
                } => {
                    report.line = names(threat);
                    report.first_moves = names(defences);
                    report.defences = Some(names(defences));
                    report.unknown = names(undecided);
                }
                StudyAnswer::NoWin | StudyAnswer::NoThreat | StudyAnswer::Undecided => {}
            }
            if search == StudySearch::Defend {
                report.threat = s.threat.map(|v| v.name());
                report.defences.get_or_insert_with(Vec::new);
            }
        }
    }
    report.ms = start.elapsed().as_millis() as u64;
    if args.json {
        let json = serde_json::to_string_pretty(&report).map_err(|e| e.to_string())?;
        return out::print(&format!("{json}\n"));
    }
    let mut text = format!(
        "{} for {}: {}\n",
        report.search, report.to_move, report.result
    );
    if !report.line.is_empty() {
        text += &format!("line: {}\n", report.line.join(" "));
    }
    if !report.first_moves.is_empty() {
        let label = if args.search == SearchKind::Defend {
            "defences"
        } else {
            "winning first moves"
        };
        text += &format!("{label}: {}\n", report.first_moves.join(" "));
    }
    if !report.unknown.is_empty() {
        text += &format!("unknown: {}\n", report.unknown.join(" "));
    }
    text += &format!("{} nodes, {} ms\n", report.nodes, report.ms);
    out::print(&text)
}
