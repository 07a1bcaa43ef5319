//! Helpers shared by the test modules. Nothing here asserts a reference value; it only builds
//! positions and reads the engine's answers.

use engine::notation::{self, parse_diagram};
use engine::{Board, Game, Point, Rule, Stone};

/// A coordinate such as `h8` (`a1` is the bottom left).
pub fn p(text: &str) -> Point {
    text.parse()
        .unwrap_or_else(|e| panic!("test coordinate {text:?}: {e}"))
}

/// A 15x15 board under `rule` with the given black and white stones (space-separated lists).
pub fn stones(rule: Rule, black: &str, white: &str) -> Board {
    notation::setup(15, rule, black, white)
        .unwrap_or_else(|e| panic!("test position ({black} / {white}): {e}"))
}

/// A board read from a diagram (rows from the top, `X` black, `O` white, `.` empty).
pub fn diagram(rule: Rule, text: &str) -> Board {
    let board = parse_diagram(text, rule).unwrap_or_else(|e| panic!("test diagram: {e}"));
    board
        .check_invariants()
        .unwrap_or_else(|e| panic!("test diagram breaks invariants: {e}"));
    board
}

/// A game from a position with `to_move` to play.
pub fn game(board: Board, to_move: Stone) -> Game {
    Game::from_position(board, to_move)
}
