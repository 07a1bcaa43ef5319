//! Move lists, stone lists and text diagrams.
//!
//! A move list is `h8 h9 i8`: coordinates separated by spaces and/or commas, black first. Its
//! errors say which move (counted from 1), what the token was and at which character it starts.
//! A diagram prints rows from the top, `X` for black, `O` for white, `.` for empty, with row
//! numbers on the left and column letters underneath; [`parse_diagram`] reads it back.

use std::fmt;

use crate::board::Board;
use crate::geometry::Point;
use crate::rules::{Game, MoveError};
use crate::types::Rule;
use crate::types::Stone;

/// What is wrong with one token of a move or stone list.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum TokenProblem {
    /// Not a coordinate at all.
    Garbage,
    /// A coordinate, but not on this board.
    OffBoard {
        /// Columns of the board.
        width: u8,
        /// Rows of the board.
        height: u8,
    },
    /// The point already appeared, as the given (1-based) entry.
    Duplicate {
        /// Where it first appeared.
        first: usize,
    },
    /// The move is not allowed at that point in the game.
    Illegal(MoveError),
}

/// An error in a move list or a stone list, naming the entry.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ListError {
    /// Which list ("moves", "black" or "white").
    pub list: &'static str,
    /// The entry's number, counted from 1.
    pub index: usize,
    /// The character offset of the token in the text, counted from 0.
    pub column: usize,
    /// The token as written.
    pub token: String,
    /// What is wrong with it.
    pub problem: TokenProblem,
}

impl fmt::Display for ListError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let what = if self.list == "moves" {
            "move"
        } else {
            "stone"
        };
        let list = if self.list == "moves" {
            String::new()
        } else {
            format!(" of the {} list", self.list)
        };
        write!(
            f,
            "{what} {}{list} ('{}', at character {}): ",
            self.index,
            self.token,
            self.column + 1
        )?;
        match &self.problem {
            TokenProblem::Garbage => write!(
                f,
                "not a coordinate (expected a column letter and a row number, like h8)"
            ),
            TokenProblem::OffBoard { width, height } => {
                write!(f, "off the {width}x{height} board")
            }
            TokenProblem::Duplicate { first } => {
                write!(f, "that point was already given as entry {first}")
            }
            TokenProblem::Illegal(e) => write!(f, "{e}"),
        }
    }
}

impl std::error::Error for ListError {}

/// Splits a list into tokens with their character offsets.
fn tokens(text: &str) -> Vec<(usize, &str)> {
    let mut out = Vec::new();
    let mut start = None;
    for (i, ch) in text.char_indices() {
        let sep = ch.is_whitespace() || ch == ',' || ch == ';';
        match (sep, start) {
            (true, Some(s)) => {
                out.push((s, &text[s..i]));
                start = None;
            }
            (false, None) => start = Some(i),
            _ => {}
        }
    }
    if let Some(s) = start {
        out.push((s, &text[s..]));
    }
    out.into_iter()
        .map(|(byte, t)| (text[..byte].chars().count(), t))
        .collect()
}

/// Parses a list of distinct on-board points (`h8, i9 j10`).
pub fn parse_points(
    text: &str,
    list: &'static str,
    width: u8,
    height: u8,
) -> Result<Vec<Point>, ListError> {
    let mut out: Vec<Point> = Vec::new();
    for (i, (column, token)) in tokens(text).into_iter().enumerate() {
        let err = |problem| ListError {
            list,
            index: i + 1,
            column,
            token: token.to_string(),
            problem,
        };
        let p: Point = token.parse().map_err(|_| err(TokenProblem::Garbage))?;
        if p.x >= width || p.y >= height {
            return Err(err(TokenProblem::OffBoard { width, height }));
        }
        if let Some(first) = out.iter().position(|&q| q == p) {
            return Err(err(TokenProblem::Duplicate { first: first + 1 }));
        }
        out.push(p);
    }
    Ok(out)
}

/// Plays a move list (black first) on an empty board under `rule`, enforcing the rules: a
/// forbidden point or a move after the game is over is an error naming the move.
pub fn play_moves(text: &str, size: u8, rule: Rule) -> Result<Game, PositionError> {
    let board = Board::new(size, rule).map_err(PositionError::Board)?;
    let points = parse_points(text, "moves", size, size).map_err(PositionError::List)?;
    let mut game = Game::new(board);
    let toks = tokens(text);
    for (i, p) in points.into_iter().enumerate() {
        if let Err(e) = game.play(p) {
            return Err(PositionError::List(ListError {
                list: "moves",
                index: i + 1,
                column: toks[i].0,
                token: toks[i].1.to_string(),
                problem: TokenProblem::Illegal(e),
            }));
        }
    }
    Ok(game)
}

/// Why a position could not be set up.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum PositionError {
    /// The board size or shape is not supported.
    Board(crate::board::BoardError),
    /// A list entry is wrong.
    List(ListError),
    /// The same point is in both stone lists.
    Overlap(Point),
    /// A diagram could not be read.
    Diagram {
        /// The line, counted from 1.
        line: usize,
        /// What is wrong.
        message: String,
    },
}

impl fmt::Display for PositionError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PositionError::Board(e) => write!(f, "{e}"),
            PositionError::List(e) => write!(f, "{e}"),
            PositionError::Overlap(p) => write!(f, "{p} is in both the black and the white list"),
            PositionError::Diagram { line, message } => write!(f, "diagram line {line}: {message}"),
        }
    }
}

impl std::error::Error for PositionError {}

/// Sets up a board from stone lists. Any counts are accepted; the side to move is the
/// caller's business.
pub fn setup(size: u8, rule: Rule, black: &str, white: &str) -> Result<Board, PositionError> {
    let mut board = Board::new(size, rule).map_err(PositionError::Board)?;
    let b = parse_points(black, "black", size, size).map_err(PositionError::List)?;
    let w = parse_points(white, "white", size, size).map_err(PositionError::List)?;
    for &p in &b {
        board.place(p, Stone::Black);
    }
    for &p in &w {
        if board.get(p).is_some() {
            return Err(PositionError::Overlap(p));
        }
        board.place(p, Stone::White);
    }
    Ok(board)
}

/// The side to move by the usual count: black if the counts are equal, white otherwise.
pub fn side_to_move_by_count(board: &Board) -> Stone {
    if board.count(Stone::Black) > board.count(Stone::White) {
        Stone::White
    } else {
        Stone::Black
    }
}

/// Joins points as a move list (`h8 h9 i8`).
pub fn format_points(points: &[Point]) -> String {
    points
        .iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(" ")
}

/// A board prints as its text diagram (see [`diagram`]).
impl fmt::Debug for Board {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&diagram(self))
    }
}

/// A text diagram of the board: rows from the top, `X` black, `O` white, `.` empty.
pub fn diagram(board: &Board) -> String {
    let mut s = String::new();
    let w = board.width();
    for y in (0..board.height()).rev() {
        s.push_str(&format!("{:>2}", y + 1));
        for x in 0..w {
            s.push(' ');
            s.push(match board.get(Point::new(x, y)) {
                Some(Stone::Black) => 'X',
                Some(Stone::White) => 'O',
                None => '.',
            });
        }
        s.push('\n');
    }
    s.push_str("  ");
    for x in 0..w {
        s.push(' ');
        s.push((b'a' + x) as char);
    }
    s.push('\n');
    s
}

/// Reads a square diagram as printed by [`diagram`]: one line per row from the top, an optional
/// row number, then one character per point (`X`/`x` black, `O`/`o` white, `.` or `+` empty),
/// optionally separated by spaces. A final line of column letters and blank lines are ignored.
pub fn parse_diagram(text: &str, rule: Rule) -> Result<Board, PositionError> {
    let mut rows: Vec<(usize, Vec<Option<Stone>>)> = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let t = line.trim();
        if t.is_empty() {
            continue;
        }
        let body = t.trim_start_matches(|c: char| c.is_ascii_digit()).trim();
        let letters: String = body.chars().filter(|c| !c.is_whitespace()).collect();
        if !letters.is_empty() && "abcdefghijklmnopqrs".starts_with(&letters) {
            continue; // The line of column letters.
        }
        let mut cells = Vec::new();
        for c in body.chars().filter(|c| !c.is_whitespace()) {
            cells.push(match c {
                'X' | 'x' => Some(Stone::Black),
                'O' | 'o' => Some(Stone::White),
                '.' | '+' => None,
                other => {
                    return Err(PositionError::Diagram {
                        line: n + 1,
                        message: format!("'{other}' is not a stone or an empty point"),
                    })
                }
            });
        }
        rows.push((n + 1, cells));
    }
    let size = rows.len();
    if !(5..=19).contains(&size) {
        return Err(PositionError::Diagram {
            line: rows.last().map_or(1, |r| r.0),
            message: format!("{size} rows; a diagram needs 5 to 19"),
        });
    }
    let mut board = Board::new(size as u8, rule).map_err(PositionError::Board)?;
    for (r, (line, cells)) in rows.iter().enumerate() {
        if cells.len() != size {
            return Err(PositionError::Diagram {
                line: *line,
                message: format!("{} points in this row, expected {size}", cells.len()),
            });
        }
        let y = (size - 1 - r) as u8;
        for (x, c) in cells.iter().enumerate() {
            if let Some(c) = c {
                board.place(Point::new(x as u8, y), *c);
            }
        }
    }
    Ok(board)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn move_lists_accept_commas_and_spaces() {
        let pts = parse_points("h8, h9  i8,j9", "moves", 15, 15).unwrap();
        assert_eq!(format_points(&pts), "h8 h9 i8 j9");
    }

    #[test]
    fn move_list_errors_name_the_token() {
        let e = parse_points("h8 h9 zz i8", "moves", 15, 15).unwrap_err();
        assert_eq!((e.index, e.column, e.token.as_str()), (3, 6, "zz"));
        assert_eq!(e.problem, TokenProblem::Garbage);
        let e = parse_points("h8 p1", "moves", 15, 15).unwrap_err();
        assert_eq!(
            e.problem,
            TokenProblem::OffBoard {
                width: 15,
                height: 15
            }
        );
        assert!(e.to_string().contains("move 2 ('p1'"), "{e}");
        let e = parse_points("h8 h9 H8", "moves", 15, 15).unwrap_err();
        assert_eq!(e.problem, TokenProblem::Duplicate { first: 1 });
    }

    #[test]
    fn played_lists_enforce_the_rules() {
        let g = play_moves("h8 h9 i8 i9 j8 j9 k8 k9 l8", 15, Rule::Freestyle).unwrap();
        assert_eq!(g.winner(), Some(Stone::Black));
        let e = play_moves("h8 h9 i8 i9 j8 j9 k8 k9 l8 a1", 15, Rule::Freestyle).unwrap_err();
        assert!(e.to_string().contains("move 10"), "{e}");
    }

    #[test]
    fn diagram_round_trips() {
        let g = play_moves("h8 h9 i8 a1 o15", 15, Rule::Standard).unwrap();
        let text = diagram(g.board());
        let back = parse_diagram(&text, Rule::Standard).unwrap();
        assert_eq!(back.hash(), g.board().hash());
        assert_eq!(diagram(&back), text);
    }
}
