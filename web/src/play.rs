//! The play board's game layer: one engine [`Game`] and the plain-words replies the page shows.
//!
//! Nothing here knows about the browser, so it is tested natively. Every rule decision is the
//! engine's: this module only turns the engine's answers into sentences.

use std::str::FromStr;

use engine::{Board, Game, MoveError, Outcome, Point, Rule, Stone};
use serde::{Deserialize, Serialize};

/// The side of the play board.
pub const SIZE: u8 = 15;

/// What an action led to.
#[derive(Clone, Copy, PartialEq, Eq, Debug, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Kind {
    /// A stone was placed and the game goes on.
    Placed,
    /// A stone was placed and it won the game.
    Won,
    /// A stone was placed and filled the board with nobody winning.
    Drawn,
    /// The move was refused; nothing changed.
    Refused,
    /// The last move was taken back.
    Undone,
    /// A new game was started.
    New,
    /// Nothing happened (a tap outside the grid, an undo with no moves).
    Nothing,
}

/// The answer to one action: what happened, the sentences to announce, and the status line.
#[derive(Clone, PartialEq, Eq, Debug, Serialize, Deserialize)]
pub struct Reply {
    /// What happened.
    pub kind: Kind,
    /// Sentences for the move log, in order (a move is written like `Black h8`).
    pub say: Vec<String>,
    /// The status line after the action ("Renju. Black to move (move 1).").
    pub status: String,
}

/// A game on the play board.
#[derive(Clone, Debug)]
pub struct Play {
    game: Game,
}

/// `"Black"` or `"White"`, for the start of a sentence.
pub fn colour_word(c: Stone) -> &'static str {
    match c {
        Stone::Black => "Black",
        Stone::White => "White",
    }
}

fn rule_word(r: Rule) -> &'static str {
    match r {
        Rule::Freestyle => "Freestyle",
        Rule::Standard => "Standard",
        Rule::Renju => "Renju",
    }
}

fn new_game(rule: Rule) -> Game {
    // SIZE is a supported gomoku size, so the board can always be made.
    let board = Board::new(SIZE, rule).unwrap_or_else(|e| panic!("{e}"));
    Game::new(board)
}

impl Play {
    /// A new game under `rule`, black to move.
    pub fn new(rule: Rule) -> Play {
        Play {
            game: new_game(rule),
        }
    }

    /// The engine's game.
    pub fn game(&self) -> &Game {
        &self.game
    }

    /// The rule of the current game.
    pub fn rule(&self) -> Rule {
        self.game.board().rule()
    }

    /// The status line: the rule, and whose move it is or how the game ended.
    pub fn status(&self) -> String {
        let rule = rule_word(self.rule());
        if let Some(w) = self.game.winner() {
            return format!("{rule}. {} has won.", colour_word(w));
        }
        if self.game.is_over() {
            return format!("{rule}. Draw: the board is full.");
        }
        format!(
            "{rule}. {} to move (move {}).",
            colour_word(self.game.to_move()),
            self.game.moves().len() + 1
        )
    }

    fn reply(&self, kind: Kind, say: Vec<String>) -> Reply {
        Reply {
            kind,
            say,
            status: self.status(),
        }
    }

    /// Plays the next stone on `p`. An illegal move is refused and changes nothing.
    pub fn play(&mut self, p: Point) -> Reply {
        let mover = self.game.to_move();
        match self.game.play(p) {
            Ok(outcome) => {
                let mut say = vec![format!("{} {p}", colour_word(mover))];
                let kind = match outcome {
                    Outcome::Continue => Kind::Placed,
                    Outcome::Win(c) => {
                        say.push(format!("{} wins with five in a row.", colour_word(c)));
                        Kind::Won
                    }
                    Outcome::Draw => {
                        say.push("The board is full: the game is a draw.".to_string());
                        Kind::Drawn
                    }
                };
                self.reply(kind, say)
            }
            Err(e) => self.refuse(&e),
        }
    }

    fn refuse(&self, e: &MoveError) -> Reply {
        self.reply(Kind::Refused, vec![format!("Not played: {e}.")])
    }

    /// Plays the next stone on a point named like `h8`.
    pub fn play_named(&mut self, name: &str) -> Reply {
        match Point::from_str(name.trim()) {
            Ok(p) => self.play(p),
            Err(e) => self.reply(Kind::Refused, vec![format!("Not played: {e}.")]),
        }
    }

    /// Takes back the last move.
    pub fn undo(&mut self) -> Reply {
        let mover = self.game.to_move().opponent();
        match self.game.undo() {
            Some(p) => self.reply(
                Kind::Undone,
                vec![format!("Took back {} {p}.", colour_word(mover))],
            ),
            None => self.reply(Kind::Nothing, vec!["There is no move to take back.".into()]),
        }
    }

    /// Starts a new game under the rule named `name` (`freestyle`, `standard` or `renju`). An
    /// unknown name is refused and the current game goes on.
    pub fn restart(&mut self, name: &str) -> Reply {
        match Rule::from_str(name.trim()) {
            Ok(rule) => {
                self.game = new_game(rule);
                let say = format!("New game under {} rules. Black to move.", rule.name());
                self.reply(Kind::New, vec![say])
            }
            Err(e) => self.reply(Kind::Refused, vec![format!("No new game: {e}.")]),
        }
    }

    /// The stone on the point named `name`: `"black"`, `"white"`, or `""` if empty or no point.
    pub fn stone_named(&self, name: &str) -> &'static str {
        Point::from_str(name.trim())
            .ok()
            .and_then(|p| self.game.board().get(p))
            .map_or("", Stone::name)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn play_all(play: &mut Play, moves: &str) -> Vec<Reply> {
        moves
            .split_whitespace()
            .map(|m| play.play_named(m))
            .collect()
    }

    #[test]
    fn moves_alternate_and_are_announced() {
        let mut play = Play::new(Rule::Freestyle);
        let r = play.play_named("h8");
        assert_eq!(r.kind, Kind::Placed);
        assert_eq!(r.say, vec!["Black h8"]);
        assert_eq!(r.status, "Freestyle. White to move (move 2).");
        let r = play.play_named("i9");
        assert_eq!(r.say, vec!["White i9"]);
        assert_eq!(play.stone_named("h8"), "black");
        assert_eq!(play.stone_named("i9"), "white");
        assert_eq!(play.stone_named("j10"), "");
    }

    #[test]
    fn occupied_point_is_refused_and_nothing_changes() {
        let mut play = Play::new(Rule::Standard);
        play.play_named("h8");
        let r = play.play_named("h8");
        assert_eq!(r.kind, Kind::Refused);
        assert_eq!(r.say, vec!["Not played: h8 is already taken."]);
        assert_eq!(play.game().moves().len(), 1);
        assert_eq!(play.game().to_move(), Stone::White);
    }

    #[test]
    fn renju_double_three_is_refused() {
        let mut play = Play::new(Rule::Renju);
        let replies = play_all(&mut play, "i8 a1 j8 a3 h9 a5 h10 a7");
        assert!(replies.iter().all(|r| r.kind == Kind::Placed));
        let r = play.play_named("h8");
        assert_eq!(r.kind, Kind::Refused);
        assert_eq!(
            r.say,
            vec!["Not played: h8 is forbidden for black: it makes a double three."]
        );
        assert_eq!(play.stone_named("h8"), "");
        assert_eq!(play.game().moves().len(), 8);
        // The same point is fine under freestyle.
        let mut free = Play::new(Rule::Freestyle);
        play_all(&mut free, "i8 a1 j8 a3 h9 a5 h10 a7");
        assert_eq!(free.play_named("h8").kind, Kind::Placed);
    }

    #[test]
    fn a_five_wins_and_ends_the_game() {
        let mut play = Play::new(Rule::Freestyle);
        play_all(&mut play, "h8 a1 i8 a2 j8 a3 k8 a4");
        let r = play.play_named("l8");
        assert_eq!(r.kind, Kind::Won);
        assert_eq!(r.say, vec!["Black l8", "Black wins with five in a row."]);
        assert_eq!(r.status, "Freestyle. Black has won.");
        let r = play.play_named("m8");
        assert_eq!(r.kind, Kind::Refused);
        assert_eq!(r.say, vec!["Not played: the game is over."]);
    }

    #[test]
    fn undo_and_restart() {
        let mut play = Play::new(Rule::Freestyle);
        assert_eq!(play.undo().kind, Kind::Nothing);
        play_all(&mut play, "h8 i9");
        let r = play.undo();
        assert_eq!(r.kind, Kind::Undone);
        assert_eq!(r.say, vec!["Took back White i9."]);
        assert_eq!(play.game().to_move(), Stone::White);
        let r = play.restart("renju");
        assert_eq!(r.kind, Kind::New);
        assert_eq!(play.rule(), Rule::Renju);
        assert_eq!(play.game().moves().len(), 0);
        assert_eq!(r.status, "Renju. Black to move (move 1).");
        let r = play.restart("chess");
        assert_eq!(r.kind, Kind::Refused);
        assert_eq!(play.rule(), Rule::Renju);
    }

    #[test]
    fn bad_coordinates_are_refused() {
        let mut play = Play::new(Rule::Freestyle);
        assert_eq!(play.play_named("z99").kind, Kind::Refused);
        let r = play.play_named("p1");
        assert_eq!(r.kind, Kind::Refused);
        assert_eq!(r.say, vec!["Not played: p1 is off the board."]);
        assert_eq!(play.game().moves().len(), 0);
    }

    #[test]
    fn replies_serialise_with_lowercase_kinds() {
        let mut play = Play::new(Rule::Renju);
        let json = serde_json::to_string(&play.play_named("h8")).unwrap();
        assert_eq!(
            json,
            r#"{"kind":"placed","say":["Black h8"],"status":"Renju. White to move (move 2)."}"#
        );
    }
}
