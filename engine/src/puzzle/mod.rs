//! Puzzles: what a puzzle is, how it is made from seeded self-play, how hard it is, and how a
//! player's moves are graded.
//!
//! A [`Puzzle`] is a position with a goal ("win" or "defend"), a theme, the proved correct first
//! moves and one shortest main line. Puzzles are made by [`generate::generate`], re-proved by
//! [`verify`] and graded live by [`grade::Session`], which accepts any move that keeps a proved
//! forced win of the puzzle's kind (with fours, in a puzzle about fours; or, in a defence
//! puzzle, any move after which the opponent has none), not only
//! the stored ones; `refute.rs` says why a wrong move fails and [`hints`] gives the three hint
//! steps. [`attempt::Attempt`] is how a try went.

pub mod attempt;
pub mod deep;
pub mod difficulty;
pub mod generate;
pub mod grade;
pub mod hints;
mod refute;
pub mod verify;

use std::fmt;
use std::str::FromStr;

use crate::board::Board;
use crate::geometry::Point;
use crate::search::Mode;
use crate::types::Rule;
use crate::types::Stone;

/// What a puzzle trains. The names are the trade's.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug, PartialOrd, Ord)]
pub enum Theme {
    /// One move makes a four and an open three at once and wins.
    FourThree,
    /// Win with fours (VCF).
    Vcf,
    /// Win with threats, threes and fours (VCT); there is no VCF.
    Vct,
    /// The opponent threatens to win by VCF or VCT: stop it.
    Defend,
    /// Renju, white to play: win by driving black onto a forbidden point.
    ForbiddenTrap,
    /// Renju, black to play: win with fours although some tempting points are forbidden.
    ForbiddenWin,
}

impl Theme {
    /// Every theme.
    pub const ALL: [Theme; 6] = [
        Theme::FourThree,
        Theme::Vcf,
        Theme::Vct,
        Theme::Defend,
        Theme::ForbiddenTrap,
        Theme::ForbiddenWin,
    ];

    /// The name used in set files and on the command line.
    pub const fn name(self) -> &'static str {
        match self {
            Theme::FourThree => "four-three",
            Theme::Vcf => "vcf",
            Theme::Vct => "vct",
            Theme::Defend => "defend",
            Theme::ForbiddenTrap => "forbidden-trap",
            Theme::ForbiddenWin => "forbidden-win",
        }
    }

    /// The goal of puzzles of this theme.
    pub const fn goal(self) -> Goal {
        match self {
            Theme::Defend => Goal::Defend,
            _ => Goal::Win,
        }
    }

    /// The forcing class the player's win must stay in, for grading.
    pub const fn mode(self) -> Mode {
        match self {
            Theme::Vct | Theme::Defend => Mode::Vct,
            _ => Mode::Vcf,
        }
    }

    /// Whether the theme exists under a rule (the forbidden-point themes are renju only).
    pub const fn allowed(self, rule: Rule) -> bool {
        match self {
            Theme::ForbiddenTrap | Theme::ForbiddenWin => matches!(rule, Rule::Renju),
            _ => true,
        }
    }
}

impl fmt::Display for Theme {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Text that names no theme.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ThemeParseError(pub String);

impl fmt::Display for ThemeParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let names: Vec<&str> = Theme::ALL.iter().map(|t| t.name()).collect();
        write!(
            f,
            "unknown theme '{}' (expected one of: {})",
            self.0,
            names.join(", ")
        )
    }
}

impl std::error::Error for ThemeParseError {}

impl FromStr for Theme {
    type Err = ThemeParseError;
    fn from_str(s: &str) -> Result<Theme, ThemeParseError> {
        let t = s.to_ascii_lowercase();
        Theme::ALL
            .into_iter()
            .find(|th| th.name() == t)
            .ok_or_else(|| ThemeParseError(s.to_string()))
    }
}

/// What the player must do.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Goal {
    /// Win by force.
    Win,
    /// Stop the opponent's forced win.
    Defend,
}

impl Goal {
    /// `"win"` or `"defend"`.
    pub const fn name(self) -> &'static str {
        match self {
            Goal::Win => "win",
            Goal::Defend => "defend",
        }
    }
}

/// A puzzle: a position, its goal, and its proved answer.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Puzzle {
    /// A stable identifier (derived from the position).
    pub id: String,
    /// The rule.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// The side to move: the player.
    pub to_move: Stone,
    /// Black stones.
    pub black: Vec<Point>,
    /// White stones.
    pub white: Vec<Point>,
    /// The theme.
    pub theme: Theme,
    /// Every correct first move (for a defence puzzle, every defence), in row order from `a1`.
    pub first_moves: Vec<Point>,
    /// One shortest main line, attacker and defender moves alternating. For a win puzzle it
    /// starts with the player's move and ends with the five; for a defence puzzle it is the
    /// opponent's threat (what happens if the player does nothing useful).
    pub line: Vec<Point>,
    /// The length in the theme's measure: fours before the five (VCF themes), threats that are
    /// not fours (VCT), or the opponent's threat length (defend).
    pub length: u16,
    /// Estimated difficulty on the Glicko scale (1500 is an average club player).
    pub rating: u32,
}

impl Puzzle {
    /// The goal (from the theme).
    pub fn goal(&self) -> Goal {
        self.theme.goal()
    }

    /// The position as a board.
    pub fn board(&self) -> Board {
        let mut b = Board::new(self.size, self.rule).expect("puzzle sizes are checked on load");
        for &p in &self.black {
            b.place(p, Stone::Black);
        }
        for &p in &self.white {
            b.place(p, Stone::White);
        }
        b
    }

    /// The side that attacks in this puzzle (the player in a win puzzle, the opponent in a
    /// defence puzzle).
    pub fn attacker(&self) -> Stone {
        match self.goal() {
            Goal::Win => self.to_move,
            Goal::Defend => self.to_move.opponent(),
        }
    }
}
