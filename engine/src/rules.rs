//! The three rules, win detection, renju's forbidden points, and a game with a side to move.
//!
//! * **Freestyle**: five or more in a row wins, for both colours.
//! * **Standard**: exactly five wins, for both colours; an overline neither wins nor ends the game.
//! * **Renju** (International Rules of Renju, RIF 1996 with the 1998 correction): black wins only
//!   with exactly five; black's double three, double four and overline are forbidden; a five
//!   made together with a forbidden shape wins; white wins with five or more and has no
//!   restrictions. A "three", for the double-three rule, is a line that one more stone turns
//!   into a straight four, where that stone itself must not be on a forbidden point; this is
//!   checked recursively, with the earlier stones in place.

use std::fmt;
use std::str::FromStr;

use crate::board::{Board, Stone};
use crate::geometry::Point;
use crate::patterns::LineShape;

/// A rule set.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Rule {
    /// Five or more in a row wins.
    Freestyle,
    /// Exactly five in a row wins, for both colours.
    Standard,
    /// The International Rules of Renju (RIF 1996/1998).
    Renju,
}

impl Rule {
    /// All rules.
    pub const ALL: [Rule; 3] = [Rule::Freestyle, Rule::Standard, Rule::Renju];

    /// Whether colour `c` wins only with exactly five (an overline does not count).
    #[inline]
    pub const fn exact_five(self, c: Stone) -> bool {
        match self {
            Rule::Freestyle => false,
            Rule::Standard => true,
            Rule::Renju => matches!(c, Stone::Black),
        }
    }

    /// Whether colour `c` has forbidden points under this rule.
    #[inline]
    pub const fn has_forbidden(self, c: Stone) -> bool {
        matches!((self, c), (Rule::Renju, Stone::Black))
    }

    /// `"freestyle"`, `"standard"` or `"renju"`.
    pub const fn name(self) -> &'static str {
        match self {
            Rule::Freestyle => "freestyle",
            Rule::Standard => "standard",
            Rule::Renju => "renju",
        }
    }
}

impl fmt::Display for Rule {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Text that names no rule.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct RuleParseError(pub String);

impl fmt::Display for RuleParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "unknown rule '{}' (expected freestyle, standard or renju)",
            self.0
        )
    }
}

impl std::error::Error for RuleParseError {}

impl FromStr for Rule {
    type Err = RuleParseError;
    fn from_str(s: &str) -> Result<Rule, RuleParseError> {
        match s.to_ascii_lowercase().as_str() {
            "freestyle" => Ok(Rule::Freestyle),
            "standard" => Ok(Rule::Standard),
            "renju" => Ok(Rule::Renju),
            _ => Err(RuleParseError(s.to_string())),
        }
    }
}

/// Why a point is forbidden for black under renju.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Forbidden {
    /// Two or more threes at once.
    DoubleThree,
    /// Two or more fours at once (in one line or across lines).
    DoubleFour,
    /// Six or more in a row.
    Overline,
}

impl Forbidden {
    /// `"double-three"`, `"double-four"` or `"overline"`.
    pub const fn name(self) -> &'static str {
        match self {
            Forbidden::DoubleThree => "double-three",
            Forbidden::DoubleFour => "double-four",
            Forbidden::Overline => "overline",
        }
    }

    /// Plain words for a player.
    pub const fn words(self) -> &'static str {
        match self {
            Forbidden::DoubleThree => "a double three",
            Forbidden::DoubleFour => "a double four",
            Forbidden::Overline => "an overline",
        }
    }
}

impl fmt::Display for Forbidden {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl Board {
    /// Whether black's stone on the empty cell `idx` would be forbidden, and why. Always `None`
    /// unless the board's rule is renju.
    ///
    /// The board is changed while the recursive three test runs and restored before returning.
    pub fn forbidden_at(&mut self, idx: usize) -> Option<Forbidden> {
        if !self.rule().has_forbidden(Stone::Black) || !self.has_shapes() {
            return None;
        }
        debug_assert!(self.is_empty_at(idx));
        let mut fours = 0;
        let mut threes = 0;
        let mut overline = false;
        for d in 0..4 {
            let s = self.line_at(idx, Stone::Black, d).shape();
            match s {
                // A five wins, whatever else the stone makes.
                LineShape::Five => return None,
                LineShape::Overline => overline = true,
                _ => {}
            }
            fours += s.four_count();
            if s.is_three() {
                threes += 1;
            }
        }
        if overline {
            self.note_sensitive(idx);
            return Some(Forbidden::Overline);
        }
        if fours >= 2 {
            self.note_sensitive(idx);
            return Some(Forbidden::DoubleFour);
        }
        if threes < 2 {
            return None;
        }
        self.note_sensitive(idx);
        // Each candidate three is real only if one of its straight-four points is itself not
        // forbidden, with this stone on the board.
        let lines: Vec<_> = (0..4)
            .map(|d| (d, self.line_at(idx, Stone::Black, d)))
            .filter(|(_, l)| l.shape().is_three())
            .collect();
        self.place_at(idx, Stone::Black);
        let mut real = 0;
        for (d, info) in lines {
            let is_real = info.offsets().any(|off| {
                let q = self.offset(idx, d, off as isize);
                self.is_empty_at(q) && self.forbidden_at(q).is_none()
            });
            if is_real {
                real += 1;
                if real >= 2 {
                    break;
                }
            }
        }
        self.remove_at(idx);
        (real >= 2).then_some(Forbidden::DoubleThree)
    }

    /// Whether a black stone on the empty point `p` would be forbidden, and why (renju only).
    pub fn forbidden(&self, p: Point) -> Option<Forbidden> {
        if !self.contains(p) || self.get(p).is_some() {
            return None;
        }
        let mut scratch = self.clone();
        let idx = scratch.index(p);
        scratch.forbidden_at(idx)
    }

    /// Every forbidden point for black, with its reason, row by row from `a1`.
    pub fn forbidden_points(&self) -> Vec<(Point, Forbidden)> {
        if !self.rule().has_forbidden(Stone::Black) {
            return Vec::new();
        }
        let mut scratch = self.clone();
        let mut out = Vec::new();
        for p in self.points() {
            let idx = scratch.index(p);
            if scratch.is_empty_at(idx) {
                if let Some(f) = scratch.forbidden_at(idx) {
                    out.push((p, f));
                }
            }
        }
        out
    }

    /// Whether colour `c` may play on the empty cell `idx` under the board's rule.
    #[inline]
    pub fn legal_at(&mut self, idx: usize, c: Stone) -> bool {
        !self.rule().has_forbidden(c) || self.forbidden_at(idx).is_none()
    }
}

/// Why a move was refused.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum MoveError {
    /// The point is not on the board.
    OffBoard(Point),
    /// A stone is already there.
    Occupied(Point),
    /// The point is forbidden for black under renju.
    Forbidden(Point, Forbidden),
    /// The game has already been won or drawn.
    GameOver,
}

impl fmt::Display for MoveError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MoveError::OffBoard(p) => write!(f, "{p} is off the board"),
            MoveError::Occupied(p) => write!(f, "{p} is already taken"),
            MoveError::Forbidden(p, why) => {
                write!(f, "{p} is forbidden for black: it makes {}", why.words())
            }
            MoveError::GameOver => write!(f, "the game is over"),
        }
    }
}

impl std::error::Error for MoveError {}

/// What a legal move led to.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum Outcome {
    /// The game goes on.
    Continue,
    /// The mover made a winning line.
    Win(Stone),
    /// The board is full and nobody won.
    Draw,
}

/// A game: a board, the side to move, the moves so far and the result.
#[derive(Clone, Debug)]
pub struct Game {
    board: Board,
    to_move: Stone,
    moves: Vec<Point>,
    winner: Option<Stone>,
}

impl Game {
    /// A new game on an empty board, black to move.
    pub fn new(board: Board) -> Game {
        Game::from_position(board, Stone::Black)
    }

    /// A game from a set-up position with the given side to move.
    pub fn from_position(board: Board, to_move: Stone) -> Game {
        let winner = board.find_winner();
        Game {
            board,
            to_move,
            moves: Vec::new(),
            winner,
        }
    }

    /// The board.
    pub fn board(&self) -> &Board {
        &self.board
    }

    /// The side to move.
    pub fn to_move(&self) -> Stone {
        self.to_move
    }

    /// The moves played since the start (or set-up).
    pub fn moves(&self) -> &[Point] {
        &self.moves
    }

    /// The winner, if the game is won.
    pub fn winner(&self) -> Option<Stone> {
        self.winner
    }

    /// Whether the game has ended (won, or the board is full).
    pub fn is_over(&self) -> bool {
        self.winner.is_some() || self.board.is_full()
    }

    /// Checks a move for the side to move without playing it.
    pub fn check(&self, p: Point) -> Result<(), MoveError> {
        if self.is_over() {
            return Err(MoveError::GameOver);
        }
        if !self.board.contains(p) {
            return Err(MoveError::OffBoard(p));
        }
        if self.board.get(p).is_some() {
            return Err(MoveError::Occupied(p));
        }
        if self.board.rule().has_forbidden(self.to_move) {
            if let Some(why) = self.board.forbidden(p) {
                return Err(MoveError::Forbidden(p, why));
            }
        }
        Ok(())
    }

    /// Plays a move for the side to move. On error nothing changes.
    pub fn play(&mut self, p: Point) -> Result<Outcome, MoveError> {
        self.check(p)?;
        let idx = self.board.index(p);
        let c = self.to_move;
        let wins = self.board.wins_at(idx, c);
        self.board.place_at(idx, c);
        self.moves.push(p);
        self.to_move = c.opponent();
        if wins {
            self.winner = Some(c);
            return Ok(Outcome::Win(c));
        }
        if self.board.is_full() {
            return Ok(Outcome::Draw);
        }
        Ok(Outcome::Continue)
    }

    /// Takes back the last move played in this game, if any.
    pub fn undo(&mut self) -> Option<Point> {
        let p = self.moves.pop()?;
        self.board.remove(p);
        self.to_move = self.to_move.opponent();
        self.winner = self.board.find_winner();
        Some(p)
    }
}
