//! The study board: a position being set up and studied.
//!
//! Taps edit the position with the chosen [`Tool`]: play (stones alternate, by the rules of
//! the board's rule, checked by the engine's one legality test), place black, place white, or
//! erase. Every edit can be undone. An answer line from a study search can be shown on top of
//! the position and stepped through; any edit, a new side to move or a new position hides it.

use serde::Serialize;

use super::{
    describe, winning_stones, Answer, AnswerKind, Cursor, LineStep, Marks, Settings, View,
};
use crate::board::{Board, BoardError};
use crate::geometry::Point;
use crate::notation::{self, PositionError};
use crate::rules::MoveError;
use crate::types::{Rule, Stone};
use crate::words;

/// How the study board's taps edit the position.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Tool {
    /// Stones alternate by the rules, like a game.
    Play,
    /// Place black stones.
    Black,
    /// Place white stones.
    White,
    /// Remove stones.
    Erase,
}

impl Tool {
    /// `"play"`, `"black"`, `"white"` or `"erase"`.
    pub const fn name(self) -> &'static str {
        match self {
            Tool::Play => "play",
            Tool::Black => "black",
            Tool::White => "white",
            Tool::Erase => "erase",
        }
    }

    /// The tool of a name, if it is one.
    pub fn named(name: &str) -> Option<Tool> {
        [Tool::Play, Tool::Black, Tool::White, Tool::Erase]
            .into_iter()
            .find(|t| t.name() == name)
    }
}

/// One edit, so that it can be undone.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct Edit {
    point: Point,
    /// What was there before.
    before: Option<Stone>,
    /// Whether it was a move of the play tool (undoing it gives the turn back).
    played: bool,
}

/// Where a study board stands, for the page.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct StudyStatus {
    /// Points per side.
    pub size: u8,
    /// The rule.
    pub rule: Rule,
    /// The side to move.
    pub to_move: Stone,
    /// "Black to move" or "White to move", or, with a five on the board, who made it.
    pub goal: String,
    /// The points edited, in order.
    pub moves: Vec<Point>,
    /// Whether the position is a game played out from the empty board (every edit a move of
    /// the play tool, black first, in turn): then `moves` is its move list.
    pub game: bool,
    /// The tool in use.
    pub tool: Tool,
    /// Black stones, row by row from a1.
    pub black: Vec<Point>,
    /// White stones, row by row from a1.
    pub white: Vec<Point>,
}

/// A position being studied.
#[derive(Clone, Debug)]
pub struct StudyBoard {
    board: Board,
    to_move: Stone,
    tool: Tool,
    edits: Vec<Edit>,
    /// An answer line being stepped through, the side that starts it, and how much is shown.
    line: Vec<Point>,
    line_first: Stone,
    line_shown: usize,
    options: Settings,
    cursor: Cursor,
    /// A stone previewed by a first tap (the play tool on a touch screen).
    ghost: Option<Point>,
    /// The position before the last paste or clear, which undo brings back once the edits
    /// since are all undone.
    previous: Option<Box<StudyBoard>>,
}

impl StudyBoard {
    /// An empty board of side `size` under `rule`, black to move.
    pub fn new(size: u8, rule: Rule) -> Result<StudyBoard, BoardError> {
        Ok(StudyBoard::on(Board::new(size, rule)?, Stone::Black))
    }

    /// A board with the given stones and side to move (as from [`StudyBoard::status`], e.g.
    /// after a reload). A bad position is refused with a message.
    pub fn load(
        size: u8,
        rule: Rule,
        black: &[Point],
        white: &[Point],
        to_move: Stone,
    ) -> Result<StudyBoard, PositionError> {
        let names = |v: &[Point]| notation::format_points(v);
        let board = notation::setup(size, rule, &names(black), &names(white))?;
        Ok(StudyBoard::on(board, to_move))
    }

    fn on(board: Board, to_move: Stone) -> StudyBoard {
        StudyBoard {
            board,
            to_move,
            tool: Tool::Play,
            edits: Vec::new(),
            line: Vec::new(),
            line_first: Stone::Black,
            line_shown: 0,
            options: Settings::default(),
            cursor: Cursor::default(),
            ghost: None,
            previous: None,
        }
    }

    /// Keeps the position as it is, for undo to bring back after a paste or a clear.
    fn keep_previous(&mut self) {
        let mut before = self.clone();
        before.previous = None;
        before.ghost = None;
        self.previous = Some(Box::new(before));
    }

    /// The position as it stands.
    pub fn board(&self) -> &Board {
        &self.board
    }

    /// The side to move.
    pub fn to_move(&self) -> Stone {
        self.to_move
    }

    /// Points per side.
    pub fn size(&self) -> u8 {
        self.board.size()
    }

    /// The display settings.
    pub fn options(&self) -> Settings {
        self.options
    }

    /// Changes the display settings.
    pub fn set_options(&mut self, options: Settings) {
        self.options = options;
    }

    /// Changes the tool.
    pub fn set_tool(&mut self, tool: Tool) {
        self.tool = tool;
    }

    /// Sets the side to move (hides a line on show).
    pub fn set_to_move(&mut self, c: Stone) {
        self.to_move = c;
        self.hide_line();
    }

    /// Replaces the position with a pasted move list (black first; the rules are enforced).
    /// A bad list is refused with a message naming the move, and the position stays as it was.
    /// Returns the number of moves set up.
    pub fn paste(&mut self, text: &str) -> Result<usize, PositionError> {
        let game = notation::play_moves(text, self.board.size(), self.board.rule())?;
        self.keep_previous();
        self.board = game.board().clone();
        self.to_move = game.to_move();
        self.edits = game
            .moves()
            .iter()
            .map(|&point| Edit {
                point,
                before: None,
                played: true,
            })
            .collect();
        self.tool = Tool::Play;
        self.hide_line();
        Ok(self.edits.len())
    }

    /// Empties the board; black to move.
    pub fn clear(&mut self) {
        let empty = Board::new(self.board.size(), self.board.rule())
            .expect("the size of an existing board is valid");
        self.keep_previous();
        let previous = self.previous.take();
        *self = StudyBoard {
            options: self.options,
            tool: self.tool,
            previous,
            ..StudyBoard::on(empty, Stone::Black)
        };
    }

    /// A tap on `p`: an edit with the current tool. With `touch` and the confirm option on,
    /// a move of the play tool takes two taps: the first previews the stone.
    pub fn touch(&mut self, p: Point, touch: bool) -> Answer {
        self.cursor = Cursor::default();
        let free = self.board.contains(p) && self.board.get(p).is_none();
        if self.options.confirm && touch && self.tool == Tool::Play && free && self.ghost != Some(p)
        {
            self.ghost = Some(p);
            let mut a = Answer::saying(AnswerKind::Ghost, words::selected(p));
            a.point = Some(p);
            return a;
        }
        self.ghost = None;
        self.edit(p)
    }

    fn edit(&mut self, p: Point) -> Answer {
        if !self.board.contains(p) {
            return Answer::saying(
                AnswerKind::Illegal,
                words::not_played(&MoveError::OffBoard(p)),
            );
        }
        let before = self.board.get(p);
        let mut a = Answer::of(AnswerKind::Placed);
        a.point = Some(p);
        match self.tool {
            Tool::Erase => {
                let Some(c) = before else {
                    a.kind = AnswerKind::None;
                    return a;
                };
                self.board.remove(p);
                self.push(p, before, false);
                a.say.push(words::removed(c, p));
            }
            Tool::Black | Tool::White => {
                let c = if self.tool == Tool::Black {
                    Stone::Black
                } else {
                    Stone::White
                };
                if before.is_some() {
                    self.board.remove(p);
                }
                self.board.place(p, c);
                self.push(p, before, false);
                a.say.push(words::set_up(c, p));
            }
            Tool::Play => {
                let c = self.to_move;
                if let Err(e) = self.board.check_move(p, c) {
                    a.kind = AnswerKind::Refused;
                    a.say.push(words::not_played(&e));
                    return a;
                }
                let five = self.board.wins_at(self.board.index(p), c);
                self.board.place(p, c);
                self.push(p, None, true);
                self.to_move = c.opponent();
                a.say.push(words::played(c, p));
                if five {
                    a.say.push(words::five_made(c));
                }
            }
        }
        self.hide_line();
        a.grow = Some(p);
        a
    }

    fn push(&mut self, point: Point, before: Option<Stone>, played: bool) {
        self.edits.push(Edit {
            point,
            before,
            played,
        });
    }

    /// Hides the line on show, if any.
    fn hide_line(&mut self) {
        self.line.clear();
        self.line_shown = 0;
    }

    /// Takes back the last edit (hides a line on show); once no edit is left, brings back the
    /// position before the last paste or clear.
    pub fn undo(&mut self) {
        self.ghost = None;
        if self.edits.is_empty() {
            if let Some(before) = self.previous.take() {
                let options = self.options;
                *self = *before;
                self.options = options;
            }
            self.hide_line();
            return;
        }
        if let Some(e) = self.edits.pop() {
            if self.board.get(e.point).is_some() {
                self.board.remove(e.point);
            }
            if let Some(c) = e.before {
                self.board.place(e.point, c);
            }
            if e.played {
                self.to_move = self.to_move.opponent();
            }
        }
        self.hide_line();
    }

    /// Shows an answer line on the board, to be stepped through with [`StudyBoard::step`];
    /// `first` is the side that starts it. A line that does not fit the position is refused.
    pub fn show_line(&mut self, line: &[Point], first: Stone) -> Result<(), String> {
        let mut pts = Vec::new();
        for &p in line {
            if !self.board.contains(p) || self.board.get(p).is_some() || pts.contains(&p) {
                return Err(format!("{p} cannot be played here"));
            }
            pts.push(p);
        }
        self.line = pts;
        self.line_first = first;
        self.line_shown = 0;
        Ok(())
    }

    /// Steps through the line shown: `delta` moves forward (negative: back).
    pub fn step(&mut self, delta: i32) -> (LineStep, Option<Point>) {
        let n = (self.line_shown as i64 + delta as i64).clamp(0, self.line.len() as i64) as usize;
        self.line_shown = n;
        let last = n.checked_sub(1).map(|i| self.line[i]);
        let side = if n % 2 == 1 {
            self.line_first
        } else {
            self.line_first.opponent()
        };
        let step = LineStep {
            shown: n,
            total: self.line.len(),
            say: words::line_step(n, side, last),
        };
        (step, last)
    }

    /// Moves the keyboard cursor by (`dx`, `dy`) points (up is +1); returns its point.
    pub fn move_cursor(&mut self, dx: i32, dy: i32) -> Point {
        self.cursor.step(self.size(), dx, dy)
    }

    /// Edits the point under the keyboard cursor.
    pub fn place_at_cursor(&mut self) -> Answer {
        match self.cursor.0 {
            Some(p) => self.edit(p),
            None => Answer::saying(AnswerKind::None, words::NO_CURSOR),
        }
    }

    /// Whether the edits are a game played out from the empty board: each a move of the play
    /// tool on an empty point, black first and in turn, with the side to move next and no
    /// other stone on the board.
    fn is_game(&self) -> bool {
        let n = self.edits.len();
        let turn = |i: usize| {
            if i.is_multiple_of(2) {
                Stone::Black
            } else {
                Stone::White
            }
        };
        n > 0
            && self.to_move == turn(n)
            && self.board.count(Stone::Black) + self.board.count(Stone::White) == n
            && self.edits.iter().enumerate().all(|(i, e)| {
                e.played && e.before.is_none() && self.board.get(e.point) == Some(turn(i))
            })
    }

    /// Where things stand.
    pub fn status(&self) -> StudyStatus {
        StudyStatus {
            size: self.size(),
            rule: self.board.rule(),
            to_move: self.to_move,
            goal: match self.board.find_winner() {
                Some(c) => words::five_made(c),
                None => words::to_move(self.to_move),
            },
            moves: self.edits.iter().map(|e| e.point).collect(),
            game: self.is_game(),
            tool: self.tool,
            black: self.board.stones_of(Stone::Black),
            white: self.board.stones_of(Stone::White),
        }
    }

    /// The stones on show: the position, plus the shown part of a line.
    fn shown_stones(&self) -> Vec<(Point, Stone)> {
        let mut v: Vec<(Point, Stone)> = self
            .board
            .points()
            .filter_map(|p| self.board.get(p).map(|c| (p, c)))
            .collect();
        for (i, &p) in self.line[..self.line_shown].iter().enumerate() {
            let c = if i % 2 == 0 {
                self.line_first
            } else {
                self.line_first.opponent()
            };
            v.push((p, c));
        }
        v
    }

    /// The stone on show on `p`, if any.
    pub fn stone_at(&self, p: Point) -> Option<Stone> {
        self.shown_stones().iter().find(|s| s.0 == p).map(|s| s.1)
    }

    /// What to draw.
    pub fn view(&self) -> View {
        let shown = &self.line[..self.line_shown];
        let mut m = Marks {
            cursor: self.cursor.0,
            last: shown
                .last()
                .copied()
                .or_else(|| self.edits.last().map(|e| e.point)),
            numbers: shown
                .iter()
                .enumerate()
                .map(|(i, &p)| (p, i as u16 + 1))
                .collect(),
            winning: winning_stones(&self.board),
            ghost: self.ghost.map(|g| (g, self.to_move)),
            ..Marks::default()
        };
        if self.options.forbidden
            && self.board.rule().has_forbidden(self.to_move)
            && shown.is_empty()
        {
            m.forbidden = self
                .board
                .forbidden_points()
                .into_iter()
                .map(|x| x.0)
                .collect();
        }
        View {
            size: self.size(),
            stones: self.shown_stones(),
            marks: m,
        }
    }

    /// The board in words, for a screen reader.
    pub fn describe(&self) -> String {
        let head = words::study_heading(self.board.rule(), self.size(), self.to_move);
        describe(&head, &self.shown_stones(), self.view().marks.last)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn p(s: &str) -> Point {
        s.parse().unwrap()
    }

    #[test]
    fn the_play_tool_alternates_and_refuses_by_the_rules() {
        let mut b = StudyBoard::new(15, Rule::Renju).unwrap();
        for m in ["g8", "a1", "i8", "a2", "h9", "a3", "h10", "a4"] {
            assert_eq!(b.touch(p(m), false).kind, AnswerKind::Placed, "{m}");
        }
        // h8 would make black's double three.
        let a = b.touch(p("h8"), false);
        assert_eq!(a.kind, AnswerKind::Refused);
        assert_eq!(
            a.say,
            vec!["Not played: h8 is forbidden for Black: it makes a double three."]
        );
        assert_eq!(b.touch(p("g8"), false).kind, AnswerKind::Refused, "taken");
        assert_eq!(b.to_move(), Stone::Black);
        assert_eq!(b.status().moves.len(), 8);
    }

    #[test]
    fn a_game_played_out_is_told_from_a_position_set_up() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        assert!(!b.status().game, "an empty board is no game");
        for m in ["h8", "h9", "i8"] {
            b.touch(p(m), false);
        }
        let s = b.status();
        assert!(s.game);
        assert_eq!(s.moves, vec![p("h8"), p("h9"), p("i8")]);
        // A pasted move list is a game too.
        b.paste("h8 i9 j10").unwrap();
        assert!(b.status().game);
        // A stone set with the white tool is not a move of a game.
        b.set_tool(Tool::White);
        b.touch(p("a1"), false);
        assert!(!b.status().game);
        b.undo();
        assert!(b.status().game);
        // Nor is a position where the side to move was changed by hand.
        b.set_to_move(Stone::Black);
        assert!(!b.status().game);
    }

    #[test]
    fn every_edit_can_be_undone() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        b.touch(p("h8"), false);
        b.set_tool(Tool::White);
        b.touch(p("h8"), false);
        assert_eq!(b.stone_at(p("h8")), Some(Stone::White));
        b.set_tool(Tool::Erase);
        b.touch(p("h8"), false);
        assert_eq!(b.stone_at(p("h8")), None);
        assert_eq!(
            b.touch(p("h8"), false).kind,
            AnswerKind::None,
            "nothing to erase"
        );
        b.undo();
        assert_eq!(b.stone_at(p("h8")), Some(Stone::White));
        b.undo();
        assert_eq!(b.stone_at(p("h8")), Some(Stone::Black));
        assert_eq!(b.to_move(), Stone::White);
        // Undoing a played move gives the turn back, whatever tool is now in hand.
        b.undo();
        assert_eq!(b.stone_at(p("h8")), None);
        assert_eq!(b.to_move(), Stone::Black);
        b.undo();
        assert!(b.status().moves.is_empty());
    }

    #[test]
    fn a_paste_or_a_clear_can_be_undone() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        b.touch(p("a1"), false);
        b.paste("h8 h9").unwrap();
        b.undo();
        b.undo();
        assert!(b.stone_at(p("h8")).is_none());
        b.undo();
        assert_eq!(
            b.stone_at(p("a1")),
            Some(Stone::Black),
            "the position before the paste"
        );
        b.clear();
        assert!(b.status().black.is_empty());
        b.undo();
        assert_eq!(
            b.stone_at(p("a1")),
            Some(Stone::Black),
            "the position before the clear"
        );
    }

    #[test]
    fn a_position_with_a_five_says_so() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        b.paste("h8 h9").unwrap();
        assert_eq!(b.status().goal, "Black to move");
        b.paste("h8 h9 i8 i9 j8 j9 k8 k9 l8").unwrap();
        assert_eq!(b.status().goal, "Black has five in a row.");
    }

    #[test]
    fn on_a_touch_screen_a_move_takes_two_taps() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        b.set_options(Settings {
            confirm: true,
            ..Settings::default()
        });
        assert_eq!(b.touch(p("h8"), true).kind, AnswerKind::Ghost);
        assert_eq!(b.stone_at(p("h8")), None);
        assert_eq!(b.touch(p("h8"), true).kind, AnswerKind::Placed);
        assert_eq!(
            b.touch(p("h9"), false).kind,
            AnswerKind::Placed,
            "a click plays at once"
        );
    }

    #[test]
    fn a_bad_paste_changes_nothing() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        assert_eq!(b.paste("h8 h9 i8").unwrap(), 3);
        assert_eq!(b.to_move(), Stone::White);
        let before = b.status();
        assert!(b.paste("h8 h9 h9").is_err());
        assert!(b.paste("h8 z99").is_err());
        assert_eq!(b.status(), before);
    }

    #[test]
    fn a_line_is_stepped_through_and_hidden_by_an_edit() {
        let mut b = StudyBoard::new(15, Rule::Freestyle).unwrap();
        b.paste("h8 a1 i8 a2 j8 a3").unwrap();
        let line = [p("k8"), p("l8"), p("g8")];
        assert!(b.show_line(&[p("h8")], Stone::Black).is_err(), "taken");
        b.show_line(&line, Stone::Black).unwrap();
        let (s, last) = b.step(1);
        assert_eq!((s.shown, s.total, s.say.as_str()), (1, 3, "1. Black k8"));
        assert_eq!(last, Some(p("k8")));
        let (s, _) = b.step(1);
        assert_eq!(s.say, "2. White l8");
        assert_eq!(b.view().marks.numbers, vec![(p("k8"), 1), (p("l8"), 2)]);
        assert_eq!(b.stone_at(p("l8")), Some(Stone::White));
        let (s, _) = b.step(-5);
        assert_eq!((s.shown, s.say.as_str()), (0, "The line is hidden."));
        b.step(3);
        b.touch(p("o15"), false);
        assert_eq!(b.stone_at(p("k8")), None, "an edit hides the line");
        assert_eq!(b.step(1).0.total, 0);
    }

    #[test]
    fn a_saved_position_loads_and_a_bad_one_is_refused() {
        let b = StudyBoard::load(
            15,
            Rule::Standard,
            &[p("h8"), p("i8")],
            &[p("h9")],
            Stone::White,
        )
        .unwrap();
        assert_eq!(b.status().black, vec![p("h8"), p("i8")]);
        assert_eq!(b.to_move(), Stone::White);
        assert!(
            StudyBoard::load(15, Rule::Standard, &[p("h8")], &[p("h8")], Stone::White).is_err()
        );
    }
}
