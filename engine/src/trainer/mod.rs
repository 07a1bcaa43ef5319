//! The board controllers of the app, in plain Rust: what a tap, a key or a button does to the
//! board on screen, and what is then to be drawn and said.
//!
//! There are two, one per kind of board: a [`PuzzleBoard`] (a puzzle being played in Tonight,
//! Drill or Revisit: the grading session, the app's replies revealed one by one, hints, the
//! wrong tries, the record kept for saved progress) and a [`StudyBoard`] (a position being set
//! up and studied: edits and their undo, tools, the side to move, an answer line stepped
//! through). Both answer with small values ([`Answer`], [`Revealed`], a status) whose sentences
//! come from [`crate::words`], and both describe what to draw as a [`View`]. The web crate
//! wraps each in a thin handle over a canvas; the decisions, and their tests, are here.
//!
//! Shape of the functional core: each controller is one state value with methods for events;
//! nothing reads a clock or the screen (the shell animates and times), so everything a
//! browser test could check about the boards can be checked natively.

mod puzzle;
mod study;

pub use puzzle::{PuzzleBoard, PuzzleStatus, Record, Retold};
pub use study::{StudyBoard, StudyStatus, Tool};

use serde::Serialize;

use crate::geometry::Point;
use crate::types::Stone;

/// What a tap, a key or a move did.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum AnswerKind {
    /// Nothing happened (a tap off the grid, an erase on an empty point).
    None,
    /// The first tap of a two-tap move: a stone is previewed.
    Ghost,
    /// The player's move is good and the reply is on its way.
    Accepted,
    /// The puzzle is solved.
    Solved,
    /// The player's move is wrong; the refutation is on its way.
    Wrong,
    /// The move is not allowed; nothing changed.
    Illegal,
    /// The move could not be graded within the budget and was taken back; nothing changed.
    Undecided,
    /// The puzzle is over: undo or retry first.
    Finished,
    /// A study edit was made.
    Placed,
    /// A study move or a typed point was refused; nothing changed.
    Refused,
}

/// The answer to an event.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Answer {
    /// What happened.
    pub kind: AnswerKind,
    /// The point played or previewed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub point: Option<Point>,
    /// Sentences for the screen reader and the message line, in order.
    pub say: Vec<String>,
    /// The one-sentence reason of a wrong move.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<String>,
    /// Moves played by the app that are still to be revealed.
    pub pending: usize,
    /// A stone that has just appeared (for the shell to animate).
    #[serde(skip)]
    pub grow: Option<Point>,
}

impl Answer {
    fn of(kind: AnswerKind) -> Answer {
        Answer {
            kind,
            point: None,
            say: Vec::new(),
            reason: None,
            pending: 0,
            grow: None,
        }
    }

    fn saying(kind: AnswerKind, line: impl Into<String>) -> Answer {
        let mut a = Answer::of(kind);
        a.say.push(line.into());
        a
    }
}

/// A move the app played, now shown.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Revealed {
    /// Where.
    pub point: Point,
    /// Whose.
    pub colour: Stone,
    /// In words.
    pub say: String,
    /// Whether more moves are waiting to be shown.
    pub more: bool,
}

/// A hint given, in words, with its step (0 when none was given).
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct HintAnswer {
    /// 1, 2 or 3; 0 when no hint was given.
    pub step: u8,
    /// The hint in words.
    pub say: String,
}

/// A step through a line shown on the study board.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct LineStep {
    /// Moves of the line on show.
    pub shown: usize,
    /// Moves in the line.
    pub total: usize,
    /// The last move on show, in words.
    pub say: String,
}

/// What to draw on a board besides the stones. Every marker is drawn as a distinct shape.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Marks {
    /// The last move played.
    pub last: Option<Point>,
    /// Stones that are part of a winning line.
    pub winning: Vec<Point>,
    /// Points where black may not play.
    pub forbidden: Vec<Point>,
    /// A previewed stone (first tap of a two-tap move).
    pub ghost: Option<(Point, Stone)>,
    /// The area of a hint, corner to corner.
    pub hint_area: Option<(Point, Point)>,
    /// A hinted move.
    pub hint_move: Option<Point>,
    /// The keyboard cursor.
    pub cursor: Option<Point>,
    /// Move numbers to write on stones.
    pub numbers: Vec<(Point, u16)>,
    /// A move that was refuted.
    pub refuted: Option<Point>,
}

/// What a board shows: its side, the stones on show and the marks.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct View {
    /// Points per side.
    pub size: u8,
    /// The stones on show.
    pub stones: Vec<(Point, Stone)>,
    /// The marks.
    pub marks: Marks,
}

/// The player's settings that change what a board does or shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Settings {
    /// On touch screens, a first tap previews a stone and a second tap on it plays it.
    pub confirm: bool,
    /// Mark black's forbidden points (renju).
    pub forbidden: bool,
    /// Write move numbers on the moves played.
    pub numbers: bool,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            confirm: true,
            forbidden: false,
            numbers: false,
        }
    }
}

/// The keyboard cursor: where Enter plays. It starts at the centre on the first arrow key
/// and stays on the board.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
struct Cursor(Option<Point>);

impl Cursor {
    /// Moves the cursor by (`dx`, `dy`) points (up is +1) on a board of side `size`; the
    /// first move only shows it at the centre.
    fn step(&mut self, size: u8, dx: i32, dy: i32) -> Point {
        let n = size as i32;
        let p = match self.0 {
            None => Point::new((n / 2) as u8, (n / 2) as u8),
            Some(c) => Point::new(
                (c.x as i32 + dx).clamp(0, n - 1) as u8,
                (c.y as i32 + dy).clamp(0, n - 1) as u8,
            ),
        };
        self.0 = Some(p);
        p
    }
}

/// The board in words, for a screen reader: a heading, every stone by colour, and the last
/// move.
fn describe(head: &str, stones: &[(Point, Stone)], last: Option<Point>) -> String {
    let of = |c: Stone| {
        let mut v: Vec<Point> = stones.iter().filter(|s| s.1 == c).map(|s| s.0).collect();
        Point::sort_by_rows(&mut v);
        v
    };
    let (b, w) = (of(Stone::Black), of(Stone::White));
    let last = last.and_then(|p| stones.iter().find(|s| s.0 == p).copied());
    crate::words::board(head, &b, &w, last)
}

/// Every stone on `board` that is part of a winning line.
fn winning_stones(board: &crate::board::Board) -> Vec<Point> {
    board
        .points()
        .filter(|&p| board.get(p).is_some() && board.is_winning_stone(board.index(p)))
        .collect()
}
