//! `fivefold solve`: VCF, VCT, defences, and exact solving of small boards.

use std::time::{Duration, Instant};

use clap::{Args, ValueEnum};
use engine::search::{Budget, Solver, SolverConfig};
use engine::study::{study, StudyAnswer, StudySearch};
use engine::{notation, Board, Point, Stone};
use serde::Serialize;

use crate::position::PositionArgs;

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

#[derive(Args)]
pub struct SolveArgs {
    #[command(flatten)]
    pub position: PositionArgs,
    /// What to search for.
    #[arg(long, value_enum)]
    pub search: SearchKind,
    /// Board width for --search exact.
    #[arg(long)]
    pub width: Option<u8>,
    /// Board height for --search exact.
    #[arg(long)]
    pub height: Option<u8>,
    /// Stones in a row that win, for --search exact.
    #[arg(long)]
    pub k: Option<u8>,
    /// Node budget of the whole question (every search it makes, sub-searches included).
    #[arg(long, default_value_t = 2_000_000)]
    pub nodes: u64,
    /// Time budget in milliseconds (0: none).
    #[arg(long, default_value_t = 0)]
    pub ms: u64,
    /// Table memory in megabytes (at most).
    #[arg(long, default_value_t = 32)]
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

pub fn run(args: &SolveArgs) -> Result<(), String> {
    if args.memory < 2 {
        return Err("--memory must be at least 2 (megabytes)".into());
    }
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
    if args.search == SearchKind::Exact {
        let (w, h, k) = match (args.width, args.height, args.k) {
            (Some(w), Some(h), Some(k)) => (w, h, k),
            _ => return Err("--search exact needs --width, --height and --k".into()),
        };
        let mut board = Board::mnk(w, h, k).map_err(|e| e.to_string())?;
        let mut to_move = Stone::Black;
        if let Some(moves) = &args.position.moves {
            for p in notation::parse_points(moves, "moves", w, h).map_err(|e| e.to_string())? {
                board.place(p, to_move);
                to_move = to_move.opponent();
            }
        }
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
    } else {
        if args.width.is_some() || args.height.is_some() || args.k.is_some() {
            return Err("--width, --height and --k go with --search exact only".into());
        }
        let pos = args.position.position()?;
        if let Some(w) = pos.board.find_winner() {
            return Err(format!("the game is already over: {w} has five"));
        }
        let search = match args.search {
            SearchKind::Vcf => StudySearch::Vcf,
            SearchKind::Vct => StudySearch::Vct,
            SearchKind::Defend => StudySearch::Defend,
            SearchKind::Exact => unreachable!("handled above"),
        };
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
    report.ms = start.elapsed().as_millis() as u64;
    if args.json {
        println!(
            "{}",
            serde_json::to_string_pretty(&report).map_err(|e| e.to_string())?
        );
    } else {
        println!(
            "{} for {}: {}",
            report.search, report.to_move, report.result
        );
        if !report.line.is_empty() {
            println!("line: {}", report.line.join(" "));
        }
        if !report.first_moves.is_empty() {
            let label = if args.search == SearchKind::Defend {
                "defences"
            } else {
                "winning first moves"
            };
            println!("{label}: {}", report.first_moves.join(" "));
        }
        if !report.unknown.is_empty() {
            println!("unknown: {}", report.unknown.join(" "));
        }
        println!("{} nodes, {} ms", report.nodes, report.ms);
    }
    Ok(())
}
