//! The position flags shared by every subcommand that takes a position.

use clap::{value_parser, Args};
use engine::notation::{self, side_to_move_by_count};
use engine::{Board, Rule, Stone};

use crate::out;

/// A position given as a move list or as stone lists.
#[derive(Args, Clone, Debug)]
pub struct PositionArgs {
    /// Rule: freestyle, standard or renju [default: freestyle].
    #[arg(long)]
    pub rule: Option<String>,
    /// Board side, 5 to 19 [default: 15].
    #[arg(long, value_parser = value_parser!(u8).range(5..=19), allow_negative_numbers = true)]
    pub size: Option<u8>,
    /// Moves in order, black first ("h8 h9 i8" or "h8,h9,i8"); the rules are enforced.
    #[arg(long, conflicts_with_all = ["black", "white", "to_move"])]
    pub moves: Option<String>,
    /// Black stones ("h8,i9").
    #[arg(long, default_value = "")]
    pub black: String,
    /// White stones ("h9").
    #[arg(long, default_value = "")]
    pub white: String,
    /// Side to move with --black/--white (default: by stone count, black when equal).
    #[arg(long)]
    pub to_move: Option<String>,
}

/// A position ready for the engine.
pub struct Position {
    pub board: Board,
    pub to_move: Stone,
}

impl PositionArgs {
    /// Parses the flags into a position, or a one-line message.
    pub fn position(&self) -> Result<Position, String> {
        let rule: Rule = match &self.rule {
            Some(r) => r.parse().map_err(|e| format!("--rule: {e}"))?,
            None => Rule::Freestyle,
        };
        let size = self.size.unwrap_or(15);
        if let Some(moves) = &self.moves {
            let game = notation::play_moves(moves, size, rule).map_err(|e| e.to_string())?;
            return Ok(Position {
                to_move: game.to_move(),
                board: game.board().clone(),
            });
        }
        let board =
            notation::setup(size, rule, &self.black, &self.white).map_err(|e| e.to_string())?;
        let to_move = match self.to_move.as_deref() {
            None => side_to_move_by_count(&board),
            Some(s) => parse_stone(s).map_err(|e| format!("--to-move: {e}"))?,
        };
        Ok(Position { board, to_move })
    }
}

/// Parses `black` or `white`.
pub fn parse_stone(s: &str) -> Result<Stone, String> {
    match s.to_ascii_lowercase().as_str() {
        "black" | "b" => Ok(Stone::Black),
        "white" | "w" => Ok(Stone::White),
        _ => Err(format!("unknown side '{s}' (expected black or white)")),
    }
}

/// `fivefold show`: the text diagram and the side to move.
pub fn show(args: &PositionArgs) -> Result<(), String> {
    let pos = args.position()?;
    out::print(&format!(
        "{}{} to move ({})\n",
        notation::diagram(&pos.board),
        pos.to_move,
        pos.board.rule()
    ))
}
