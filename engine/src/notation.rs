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

/// The tokens of a list with the character offset at which each starts, found in one pass:
/// the offset is counted as the text is walked, never recounted from the start, so reading a
/// list is linear in its length, and a caller that stops at the first bad token reads no
/// further than that token.
struct Tokens<'a> {
    text: &'a str,
    /// The byte offset where the walk stands.
    at: usize,
    /// The number of characters before `at`.
    chars: usize,
}

impl<'a> Tokens<'a> {
    fn new(text: &'a str) -> Self {
        Tokens {
            text,
            at: 0,
            chars: 0,
        }
    }
}

fn is_separator(ch: char) -> bool {
    ch.is_whitespace() || ch == ',' || ch == ';'
}

impl<'a> Iterator for Tokens<'a> {
    /// The token's character offset (from 0) and its text.
    type Item = (usize, &'a str);

    fn next(&mut self) -> Option<(usize, &'a str)> {
        let rest = &self.text[self.at..];
        let mut start = None;
        for (i, ch) in rest.char_indices() {
            match (is_separator(ch), start) {
                (true, Some((byte, column))) => {
                    self.at += i;
                    return Some((column, &rest[byte..i]));
                }
                (false, None) => start = Some((i, self.chars)),
                _ => {}
            }
            self.chars += 1;
        }
        self.at = self.text.len();
        start.map(|(byte, column)| (column, &rest[byte..]))
    }
}

/// Parses a list of distinct on-board points (`h8, i9 j10`), stopping at the first bad entry.
/// The work is linear in the length of the text up to that entry: a point seen before is found
/// in a table of the board's points, not by searching the list so far.
pub fn parse_points(
    text: &str,
    list: &'static str,
    width: u8,
    height: u8,
) -> Result<Vec<Point>, ListError> {
    parse_tokens(text, list, width, height)
        .map(|entries| entries.into_iter().map(|e| e.0).collect())
}

/// The points of a list with each one's character offset and token, for callers that report a
/// later problem with an entry (as [`play_moves`] does for an illegal move).
fn parse_tokens<'a>(
    text: &'a str,
    list: &'static str,
    width: u8,
    height: u8,
) -> Result<Vec<(Point, usize, &'a str)>, ListError> {
    let mut out = Vec::new();
    // For each point of the board, the entry (from 1) that gave it, or 0.
    let mut first = vec![0usize; width as usize * height as usize];
    for (i, (column, token)) in Tokens::new(text).enumerate() {
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
        let seen = &mut first[p.y as usize * width as usize + p.x as usize];
        if *seen != 0 {
            return Err(err(TokenProblem::Duplicate { first: *seen }));
        }
        *seen = i + 1;
        out.push((p, column, token));
    }
    Ok(out)
}

/// Plays a move list (black first) on an empty board under `rule`, enforcing the rules: a
/// forbidden point or a move after the game is over is an error naming the move.
pub fn play_moves(text: &str, size: u8, rule: Rule) -> Result<Game, PositionError> {
    let board = Board::new(size, rule).map_err(PositionError::Board)?;
    let entries = parse_tokens(text, "moves", size, size).map_err(PositionError::List)?;
    let mut game = Game::new(board);
    for (i, (p, column, token)) in entries.into_iter().enumerate() {
        if let Err(e) = game.play(p) {
            return Err(PositionError::List(ListError {
                list: "moves",
                index: i + 1,
                column,
                token: token.to_string(),
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
    fn positions_count_characters_not_bytes() {
        // "é" and "✓" take 2 and 3 bytes of UTF-8 but one character each.
        let e = parse_points("h8 é ✓ i9 zz", "moves", 15, 15).unwrap_err();
        assert_eq!((e.index, e.column, e.token.as_str()), (2, 3, "é"));
        let e = parse_points("h8,é✓;i9 zz", "moves", 15, 15).unwrap_err();
        assert_eq!((e.index, e.column, e.token.as_str()), (2, 3, "é✓"));
        let e = parse_points("é, h8 i9 ✓ zz", "black", 15, 15);
        assert_eq!(e.unwrap_err().column, 0);
        let e = parse_points("h8 i9 ✓✓ j10\tq", "black", 15, 15).unwrap_err();
        assert_eq!((e.index, e.column, e.token.as_str()), (3, 6, "✓✓"));
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
