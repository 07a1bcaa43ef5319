//! The position flags shared by every subcommand that takes a position.

use clap::Args;
use engine::notation::{self, side_to_move_by_count};
use engine::{Board, Rule, Stone};

/// A position given as a move list or as stone lists.
#[derive(Args, Clone, Debug)]
pub struct PositionArgs {
    /// Rule: freestyle, standard or renju.
    #[arg(long, default_value = "freestyle")]
    pub rule: String,
    /// Board side, 5 to 19.
    #[arg(long, default_value_t = 15)]
    pub size: u8,
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
        let rule: Rule = self.rule.parse().map_err(|e| format!("{e}"))?;
        if let Some(moves) = &self.moves {
            let game = notation::play_moves(moves, self.size, rule).map_err(|e| e.to_string())?;
            return Ok(Position {
                to_move: game.to_move(),
                board: game.board().clone(),
            });
        }
        let board = notation::setup(self.size, rule, &self.black, &self.white)
            .map_err(|e| e.to_string())?;
        let to_move = match self.to_move.as_deref() {
            None => side_to_move_by_count(&board),
            Some(s) => parse_stone(s)?,
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
    print!("{}", notation::diagram(&pos.board));
    println!("{} to move ({})", pos.to_move, pos.board.rule());
    Ok(())
}
