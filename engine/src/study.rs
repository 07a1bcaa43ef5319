//! The study question: does the side to move have a VCF? a VCT? which moves defend? One
//! function answers it, as a typed [`StudyAnswer`], for the Study board (through the web crate)
//! and for `fivefold solve` alike; [`crate::words`] says it in sentences.

use std::fmt;
use std::str::FromStr;

use crate::board::Board;
use crate::geometry::Point;
use crate::search::{Budget, Mode, Solver, StopCheck, Verdict};
use crate::types::Stone;

/// What is asked.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum StudySearch {
    /// A win with fours for the side to move.
    Vcf,
    /// A win with threes and fours for the side to move.
    Vct,
    /// The moves of the side to move that stop the opponent's forced win (VCT or VCF).
    Defend,
}

impl StudySearch {
    /// `"vcf"`, `"vct"` or `"defend"`.
    pub const fn name(self) -> &'static str {
        match self {
            StudySearch::Vcf => "vcf",
            StudySearch::Vct => "vct",
            StudySearch::Defend => "defend",
        }
    }
}

/// Text that names no study search.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct StudySearchParseError(pub String);

impl fmt::Display for StudySearchParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "unknown search '{}' (vcf, vct or defend)", self.0)
    }
}

impl std::error::Error for StudySearchParseError {}

impl FromStr for StudySearch {
    type Err = StudySearchParseError;
    fn from_str(s: &str) -> Result<StudySearch, StudySearchParseError> {
        match s {
            "vcf" => Ok(StudySearch::Vcf),
            "vct" => Ok(StudySearch::Vct),
            "defend" => Ok(StudySearch::Defend),
            other => Err(StudySearchParseError(other.to_string())),
        }
    }
}

/// The answer to a study question.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum StudyAnswer {
    /// The side to move wins (VCF or VCT).
    Win {
        /// The shortest main line, attacker first, ending with the five.
        line: Vec<Point>,
        /// Its length in the search's measure (fours before the five, or threats).
        depth: u16,
        /// Every winning first move, the line's own included.
        first_moves: Vec<Point>,
        /// First moves the budget left undecided.
        undecided: Vec<Point>,
    },
    /// No win within the searched class.
    NoWin,
    /// The opponent has a forced win if the side to move passed, and these moves stop it.
    Threat {
        /// The opponent's threat as a main line (opponent first).
        threat: Vec<Point>,
        /// The defences proved (empty with `undecided` empty: no move stops it).
        defences: Vec<Point>,
        /// Moves the budget left undecided.
        undecided: Vec<Point>,
    },
    /// The opponent has no forced win (VCT or VCF) to stop.
    NoThreat,
    /// The budget ran out before an answer.
    Undecided,
}

impl StudyAnswer {
    /// The answer in one word, as `fivefold solve --json` writes it in `result`: for a win
    /// question `win`, `no-win` or `unknown`; for a defence question `defended` (some move
    /// stops the threat), `lost` (none does), `no-threat` or `unknown`.
    pub fn result(&self) -> &'static str {
        match self {
            StudyAnswer::Win { .. } => "win",
            StudyAnswer::NoWin => "no-win",
            StudyAnswer::Threat {
                defences,
                undecided,
                ..
            } if defences.is_empty() && undecided.is_empty() => "lost",
            StudyAnswer::Threat { .. } => "defended",
            StudyAnswer::NoThreat => "no-threat",
            StudyAnswer::Undecided => "unknown",
        }
    }

    /// The line to show on the board, and the side that plays its first move.
    pub fn shown_line(&self, to_move: Stone) -> (&[Point], Stone) {
        match self {
            StudyAnswer::Win { line, .. } => (line, to_move),
            StudyAnswer::Threat { threat, .. } => (threat, to_move.opponent()),
            _ => (&[], to_move),
        }
    }
}

/// A study question answered.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Study {
    /// What was asked.
    pub search: StudySearch,
    /// The side to move (the attacker of a win question, the defender of a defence question).
    pub to_move: Stone,
    /// The answer.
    pub answer: StudyAnswer,
    /// For a defence question: the opponent's threat verdict as searched (`win`, `no-win` or
    /// `unknown`).
    pub threat: Option<Verdict>,
    /// Nodes searched.
    pub nodes: u64,
}

/// Answers a study question about `board` with `to_move` to play, within `budget`; `stop` is
/// polled during the long searches of a win question.
pub fn study(
    solver: &mut Solver,
    board: &Board,
    to_move: Stone,
    search: StudySearch,
    budget: Budget,
    stop: Option<StopCheck>,
) -> Study {
    let mut ask = match stop {
        Some(f) => solver.ask(budget).watch(f),
        None => solver.ask(budget),
    };
    let mut out = Study {
        search,
        to_move,
        answer: StudyAnswer::Undecided,
        threat: None,
        nodes: 0,
    };
    match search {
        StudySearch::Vcf | StudySearch::Vct => {
            let mode = if search == StudySearch::Vcf {
                Mode::Vcf
            } else {
                Mode::Vct
            };
            let sol = ask.solve(board, to_move, mode);
            out.nodes = sol.nodes;
            out.answer = match sol.verdict {
                Verdict::Win => {
                    let wins = ask.winning_moves(board, to_move, mode);
                    out.nodes += wins.nodes;
                    StudyAnswer::Win {
                        line: sol.line,
                        depth: sol.depth,
                        first_moves: wins.proved,
                        undecided: wins.unknown,
                    }
                }
                Verdict::NoWin => StudyAnswer::NoWin,
                Verdict::Unknown => StudyAnswer::Undecided,
            };
        }
        StudySearch::Defend => {
            let d = ask.defences(board, to_move, Mode::Vct);
            out.nodes = d.moves.nodes;
            out.threat = Some(d.threat);
            out.answer = match d.threat {
                Verdict::Win => StudyAnswer::Threat {
                    threat: ask.threat(board, to_move, Mode::Vct).line,
                    defences: d.moves.proved,
                    undecided: d.moves.unknown,
                },
                Verdict::NoWin => StudyAnswer::NoThreat,
                Verdict::Unknown => StudyAnswer::Undecided,
            };
        }
    }
    out
}
