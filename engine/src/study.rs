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
        /// Whether every move that could defend was tried (see
        /// `engine::search::Defences::complete`): false against a threat with threes and no
        /// win with fours behind it, where only the points near its line are searched.
        complete: bool,
    },
    /// The opponent has no forced win (VCT or VCF) to stop.
    NoThreat,
    /// The budget ran out before an answer.
    Undecided,
}

impl StudyAnswer {
    /// The answer in one word, as `fivefold solve --json` writes it in `result`: for a win
    /// question `win`, `no-win` or `unknown`; for a defence question `defended` (some move
    /// is proved to stop the threat), `lost` (none does), `no-threat` or `unknown` (the threat
    /// is there, but no defence could be proved within the budget).
    pub fn result(&self) -> &'static str {
        match self {
            StudyAnswer::Win { .. } => "win",
            StudyAnswer::NoWin => "no-win",
            StudyAnswer::Threat {
                defences,
                undecided,
                ..
            } if defences.is_empty() && undecided.is_empty() => "lost",
            StudyAnswer::Threat { defences, .. } if defences.is_empty() => "unknown",
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
    /// The nodes the question was allowed in all (its budget's total).
    pub budget: u64,
    /// Nodes the question spent in all (every search, sub-searches and reading lines back
    /// included): at most the budget's total and a few nodes.
    pub nodes: u64,
}

/// Answers a study question about `board` with `to_move` to play, within `budget` (one total
/// for the whole question); `stop` is polled during every search, with the nodes spent so far
/// (a cancel button, a clock, a progress report).
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
    let mut out = ask.question(|ask| {
        let mut out = Study {
            search,
            to_move,
            answer: StudyAnswer::Undecided,
            threat: None,
            budget: budget.total,
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
                        threat: d.line,
                        defences: d.moves.proved,
                        undecided: d.moves.unknown,
                        complete: d.complete,
                    },
                    Verdict::NoWin => StudyAnswer::NoThreat,
                    Verdict::Unknown => StudyAnswer::Undecided,
                };
            }
        }
        out
    });
    out.nodes = ask.spent();
    out
}
