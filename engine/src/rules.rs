//! The three rules, win detection, renju's forbidden points, and a game with a side to move.
//!
//! * **Freestyle**: five or more in a row wins, for both colours.
//! * **Standard**: exactly five wins, for both colours; an overline neither wins nor ends the game.
//! * **Renju** (International Rules of Renju, RIF 1996 with the 1998 correction): black wins only
//!   with exactly five; black's double three, double four and overline are forbidden; a five
//!   made together with a forbidden shape wins; white wins with five or more and has no
//!   restrictions. A "three", for the double-three rule, is a line that one more stone turns
//!   into a straight four, where that stone must not make a five at the same time (in another
//!   line) and must not itself be on a forbidden point; this is checked recursively, with the
//!   earlier stones in place.

use std::fmt;

use crate::board::Board;
use crate::geometry::Point;
use crate::patterns::LineShape;
use crate::types::Stone;

/// Why a point is forbidden for black under renju.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug, serde::Serialize, serde::Deserialize)]
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
        self.forbidden_noting(idx, &mut ())
    }

    /// [`Board::forbidden_at`], telling `notes` every point at which the decision had to weigh
    /// more than one line (the recursion of the three rule included). The search's renju
    /// defence sets replay a line with a recorder; every other caller passes `()`.
    pub(crate) fn forbidden_noting<N: Notes>(
        &mut self,
        idx: usize,
        notes: &mut N,
    ) -> Option<Forbidden> {
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
            notes.note(idx);
            return Some(Forbidden::Overline);
        }
        if fours >= 2 {
            notes.note(idx);
            return Some(Forbidden::DoubleFour);
        }
        if threes < 2 {
            return None;
        }
        notes.note(idx);
        // Each candidate three is real only if one of its straight-four points, with this stone
        // on the board, makes no five at the same time (RIF section 3: a three is a row "to
        // which you, without at the same time a five in a row is made, can add one more stone
        // to attain a straight four") and is itself not forbidden.
        let lines: Vec<_> = (0..4)
            .map(|d| (d, self.line_at(idx, Stone::Black, d)))
            .filter(|(_, l)| l.shape().is_three())
            .collect();
        self.place_at(idx, Stone::Black);
        let mut real = 0;
        for (d, info) in lines {
            let is_real = info.offsets().any(|off| {
                let q = self.offset(idx, d, off as isize);
                self.is_empty_at(q)
                    && !self.wins_at(q, Stone::Black)
                    && self.forbidden_noting(q, notes).is_none()
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

    /// Whether colour `c` may play on `p` under the board's rule: on the board, free, and (for
    /// renju black) not a forbidden point, unless the stone makes five. The one legality test
    /// of the engine: games, the grader and the study board all ask it.
    pub fn check_move(&self, p: Point, c: Stone) -> Result<(), MoveError> {
        if !self.contains(p) {
            return Err(MoveError::OffBoard(p));
        }
        if self.get(p).is_some() {
            return Err(MoveError::Occupied(p));
        }
        if self.rule().has_forbidden(c) {
            if let Some(why) = self.forbidden(p) {
                return Err(MoveError::Forbidden(p, why));
            }
        }
        Ok(())
    }

    /// Whether colour `c` may play on the empty cell `idx` under the board's rule.
    #[inline]
    pub fn legal_at(&mut self, idx: usize, c: Stone) -> bool {
        self.legal_noting(idx, c, &mut ())
    }

    /// [`Board::legal_at`], telling `notes` where a renju decision weighed several lines.
    #[inline]
    pub(crate) fn legal_noting<N: Notes>(&mut self, idx: usize, c: Stone, notes: &mut N) -> bool {
        !self.rule().has_forbidden(c) || self.forbidden_noting(idx, notes).is_none()
    }
}

/// A recorder of the points a renju decision looked at (see [`Board::forbidden_noting`]).
pub(crate) trait Notes {
    /// The decision at the padded cell `idx` weighed more than one line.
    fn note(&mut self, idx: usize);
}

/// No recording: the decision is all that is wanted.
impl Notes for () {
    #[inline]
    fn note(&mut self, _idx: usize) {}
}

/// Every point noted, in order (with repeats).
impl Notes for Vec<u16> {
    fn note(&mut self, idx: usize) {
        self.push(idx as u16);
    }
}

/// Why a move was refused.
#[derive(Clone, Copy, PartialEq, Eq, Debug, serde::Serialize, serde::Deserialize)]
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
pub enum Played {
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
        self.board.check_move(p, self.to_move)
    }

    /// Plays a move for the side to move. On error nothing changes.
    pub fn play(&mut self, p: Point) -> Result<Played, MoveError> {
        self.check(p)?;
        let idx = self.board.index(p);
        let c = self.to_move;
        let wins = self.board.wins_at(idx, c);
        self.board.place_at(idx, c);
        self.moves.push(p);
        self.to_move = c.opponent();
        if wins {
            self.winner = Some(c);
            return Ok(Played::Win(c));
        }
        if self.board.is_full() {
            return Ok(Played::Draw);
        }
        Ok(Played::Continue)
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
