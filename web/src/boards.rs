//! The two board handles the page holds: [`PuzzleBoardHandle`] (a puzzle being played, in
//! Tonight and Drill) and [`StudyBoardHandle`] (the Study board). Each is a thin shell over
//! the engine's controller (`engine::trainer`) and a [`Surface`]: it turns taps into points,
//! forwards events, redraws, and hands the controller's answers to the page as plain objects.
//! Every decision and sentence is the controller's.

use std::str::FromStr;

use engine::formats::setfile;
use engine::puzzle::attempt::Attempt;
use engine::puzzle::grade::{self, Grade};
use engine::trainer::{
    Answer, AnswerKind, PuzzleBoard, Record, Retold, Settings, StudyBoard, Tool, View,
};
use engine::{Point, Rule, Stone};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;
use web_sys::HtmlCanvasElement;

use crate::api::{err, with_solver};
use crate::surface::Surface;

pub(crate) fn to_js<T: Serialize>(v: &T) -> Result<JsValue, JsValue> {
    v.serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(err)
}

fn point(name: &str) -> Result<Point, JsValue> {
    Point::from_str(name.trim()).map_err(err)
}

fn points(names: &[String]) -> Result<Vec<Point>, JsValue> {
    names.iter().map(|n| point(n)).collect()
}

/// An answer for a tap off the grid.
fn nothing() -> Result<JsValue, JsValue> {
    to_js(&serde_json::json!({ "kind": "none", "say": [], "pending": 0 }))
}

/// One set-file puzzle object (JSON text), read with the set file's own checks.
pub(crate) fn parse_puzzle(puzzle_json: &str) -> Result<engine::puzzle::Puzzle, JsValue> {
    let wrapped = format!(
        "{{\"format\":\"fivefold-set\",\"version\":1,\"title\":\"\",\"created\":\"2026-12-01\",\"puzzles\":[{puzzle_json}]}}"
    );
    let set = setfile::parse(&wrapped).map_err(err)?;
    set.puzzles
        .into_iter()
        .next()
        .ok_or_else(|| err("no puzzle"))
}

/// The answer to a point name that is not one: nothing changes.
fn refused(e: impl std::fmt::Display) -> Answer {
    Answer {
        kind: AnswerKind::Refused,
        point: None,
        say: vec![format!("Not played: {e}.")],
        reason: None,
        pending: 0,
        grow: None,
    }
}

/// A status with the kind of board it is, for the page.
#[derive(Serialize)]
struct Tagged<'a, T: Serialize> {
    mode: &'a str,
    #[serde(flatten)]
    status: T,
}

/// A saved record as the page stores it (see `engine::trainer::Record`).
#[derive(Deserialize)]
struct RecordJs {
    #[serde(default)]
    played: Vec<String>,
    #[serde(default)]
    wrong: u32,
    #[serde(default)]
    hints: u8,
    #[serde(default)]
    attempt: Option<String>,
}

impl RecordJs {
    fn record(&self) -> Result<Record, JsValue> {
        Ok(Record {
            played: points(&self.played)?,
            wrong: self.wrong,
            hints: self.hints.min(3),
            attempt: match &self.attempt {
                Some(a) => a.parse::<Attempt>().map_err(err)?,
                None => Attempt::Untried,
            },
        })
    }
}

/// A board on which puzzles are played.
#[wasm_bindgen(js_name = PuzzleBoard)]
pub struct PuzzleBoardHandle {
    surface: Surface,
    board: Option<PuzzleBoard>,
    options: Settings,
    /// What the loaded record's try said (see `restoredSay`).
    restored: Retold,
}

impl PuzzleBoardHandle {
    fn view(&self) -> View {
        match &self.board {
            Some(b) => b.view(),
            None => View {
                size: 15,
                stones: Vec::new(),
                marks: Default::default(),
            },
        }
    }

    fn redraw(&self) -> Result<(), JsValue> {
        self.surface.draw(&self.view())
    }

    fn answer(&mut self, a: Answer) -> Result<JsValue, JsValue> {
        self.surface.grow(a.grow);
        self.redraw()?;
        to_js(&a)
    }
}

#[wasm_bindgen(js_class = PuzzleBoard)]
impl PuzzleBoardHandle {
    /// A board on `canvas`, empty until a puzzle is loaded.
    #[wasm_bindgen(constructor)]
    pub fn new(canvas: HtmlCanvasElement) -> Result<PuzzleBoardHandle, JsValue> {
        Ok(PuzzleBoardHandle {
            surface: Surface::new(canvas)?,
            board: None,
            options: Settings::default(),
            restored: Retold::default(),
        })
    }

    /// Sizes the canvas's backing store to its CSS size times `dpr` and redraws, with the
    /// coordinates sized for a root font size of `text` CSS pixels.
    pub fn fit(&mut self, dpr: f64, text: f64) -> Result<(), JsValue> {
        let view = self.view();
        self.surface.fit(Some(dpr), Some(text), &view)
    }

    /// The display settings: `confirm` (two taps on touch screens), `forbidden` (mark black's
    /// forbidden points under renju), `numbers` (move numbers on the moves played).
    #[wasm_bindgen(js_name = setOptions)]
    pub fn set_options(
        &mut self,
        confirm: bool,
        forbidden: bool,
        numbers: bool,
    ) -> Result<(), JsValue> {
        self.options = Settings {
            confirm,
            forbidden,
            numbers,
        };
        if let Some(b) = &mut self.board {
            b.set_options(self.options);
        }
        self.redraw()
    }

    /// Loads a puzzle given as one set-file puzzle object (JSON text). `trusted`: its answer
    /// key was proved by this program (the built-in library, Drill). `record`: its saved
    /// record (`{played, wrong, hints, attempt}`) or null. Returns the status.
    pub fn load(
        &mut self,
        puzzle_json: &str,
        trusted: bool,
        record: JsValue,
    ) -> Result<JsValue, JsValue> {
        let puzzle = parse_puzzle(puzzle_json)?;
        let record = if record.is_null() || record.is_undefined() {
            None
        } else {
            let r: RecordJs = serde_wasm_bindgen::from_value(record).map_err(err)?;
            Some(r.record()?)
        };
        let mut board = PuzzleBoard::new(puzzle, trusted);
        board.set_options(self.options);
        self.restored = match record {
            Some(r) => with_solver(|s| board.restore(s, &r)),
            None => Retold::default(),
        };
        // A move the page cannot settle within a frame's work goes to the worker
        // (`gradedMoves`, then `settle`).
        board.set_allowance(grade::PAGE_NODES);
        self.board = Some(board);
        self.surface.still();
        let view = self.view();
        self.surface.fit(None, None, &view)?;
        self.status()
    }

    /// What the try of the record given to `load` said, one sentence a line: first the
    /// answer that ended it (a wrong move's reason, or the solve; an empty line for a try still
    /// going), then its log of moves and replies, to be shown again.
    #[wasm_bindgen(js_name = restoredSay)]
    pub fn restored_say(&self) -> String {
        let r = &self.restored;
        let mut lines = vec![r.ended.as_deref().unwrap_or("")];
        lines.extend(r.log.iter().map(String::as_str));
        lines.join("\n")
    }

    /// A tap or click at viewport coordinates (see `PuzzleBoard::touch`).
    pub fn tap(&mut self, client_x: f64, client_y: f64, touch: bool) -> Result<JsValue, JsValue> {
        let (Some(p), Some(b)) = (self.surface.hit(client_x, client_y), self.board.as_mut()) else {
            return nothing();
        };
        let a = with_solver(|s| b.touch(s, p, touch));
        self.answer(a)
    }

    /// Plays the point named `name` (like `h8`), as a confirmed move.
    pub fn play(&mut self, name: &str) -> Result<JsValue, JsValue> {
        let Some(b) = self.board.as_mut() else {
            return nothing();
        };
        let a = match Point::from_str(name.trim()) {
            Ok(p) => with_solver(|s| b.play(s, p)),
            Err(e) => refused(e),
        };
        self.answer(a)
    }

    /// The moves since the puzzle's start, `[[point, colour], ...]` as JSON: with the puzzle
    /// and the move, what the worker needs to settle a move the page left undecided (its
    /// `gradeMove` job).
    #[wasm_bindgen(js_name = gradedMoves)]
    pub fn graded_moves(&self) -> Result<String, JsValue> {
        let moves = self.board.as_ref().map_or(&[][..], |b| b.graded_moves());
        serde_json::to_string(moves).map_err(err)
    }

    /// Shows the player's stone on the point named `name` faintly while the worker settles
    /// its grade; an empty name takes it away.
    pub fn preview(&mut self, name: &str) -> Result<(), JsValue> {
        let p = if name.trim().is_empty() {
            None
        } else {
            Some(point(name)?)
        };
        if let Some(b) = self.board.as_mut() {
            b.preview(p);
        }
        self.redraw()
    }

    /// Puts on the board the grade the worker settled for the move `name` (`gradeJson`, from
    /// `gradeMove`) and answers as `play` does; null if it no longer fits this board (another
    /// puzzle, or moves taken back meanwhile), and then nothing changed.
    pub fn settle(&mut self, name: &str, grade_json: &str) -> Result<JsValue, JsValue> {
        let p = point(name)?;
        let grade: Grade = serde_json::from_str(grade_json).map_err(err)?;
        match self.board.as_mut().and_then(|b| b.apply(p, grade)) {
            Some(a) => self.answer(a),
            None => Ok(JsValue::NULL),
        }
    }

    /// Shows the next move the app has played: `{point, colour, say, more}`, or null.
    pub fn reveal(&mut self) -> Result<JsValue, JsValue> {
        match self.board.as_mut().and_then(|b| b.reveal()) {
            Some(r) => {
                self.surface.grow(Some(r.point));
                self.redraw()?;
                to_js(&r)
            }
            None => Ok(JsValue::NULL),
        }
    }

    /// Advances the stone animation to `now` (milliseconds; the first call after a move starts
    /// the clock). Returns whether more frames are wanted.
    pub fn frame(&mut self, now: f64) -> Result<bool, JsValue> {
        let view = self.view();
        self.surface.frame(now, &view)
    }

    /// Takes back the player's last turn.
    pub fn undo(&mut self) -> Result<JsValue, JsValue> {
        if let Some(b) = &mut self.board {
            b.undo();
        }
        self.redraw()?;
        self.status()
    }

    /// Back to the puzzle's start; the hints already seen stay counted.
    pub fn retry(&mut self) -> Result<JsValue, JsValue> {
        if let Some(b) = &mut self.board {
            b.retry();
        }
        self.redraw()?;
        self.status()
    }

    /// After a failure: the solution, to be revealed move by move with `reveal`; returns the
    /// number of moves (0 when there is no failure to explain).
    #[wasm_bindgen(js_name = showSolution)]
    pub fn show_solution(&mut self) -> Result<u32, JsValue> {
        let n = self.board.as_mut().map_or(0, |b| b.show_solution());
        self.surface.still();
        self.redraw()?;
        Ok(n as u32)
    }

    /// The next hint: `{step, say}` (step 1 the theme and length, 2 the area, 3 the move).
    pub fn hint(&mut self) -> Result<JsValue, JsValue> {
        let Some(b) = self.board.as_mut() else {
            return to_js(&serde_json::json!({ "step": 0, "say": "" }));
        };
        let h = with_solver(|s| b.hint(s));
        self.redraw()?;
        to_js(&h)
    }

    /// Moves the keyboard cursor by (`dx`, `dy`) points (up is +1); returns its point.
    #[wasm_bindgen(js_name = moveCursor)]
    pub fn move_cursor(&mut self, dx: i32, dy: i32) -> Result<String, JsValue> {
        let p = self.board.as_mut().map(|b| b.move_cursor(dx, dy));
        self.redraw()?;
        Ok(p.map(|p| p.to_string()).unwrap_or_default())
    }

    /// Plays the point under the keyboard cursor.
    #[wasm_bindgen(js_name = placeAtCursor)]
    pub fn place_at_cursor(&mut self) -> Result<JsValue, JsValue> {
        let Some(b) = self.board.as_mut() else {
            return nothing();
        };
        let a = with_solver(|s| b.place_at_cursor(s));
        self.answer(a)
    }

    /// Where things stand: `{mode, size, rule, toMove, goal, state, moves, pending, attempt,
    /// record: {played, wrong, hints, attempt}}`; `mode` is "empty" before a puzzle is loaded.
    pub fn status(&self) -> Result<JsValue, JsValue> {
        match &self.board {
            Some(b) => to_js(&Tagged {
                mode: "puzzle",
                status: b.status(),
            }),
            None => to_js(&serde_json::json!({
                "mode": "empty", "size": 15, "rule": "freestyle", "toMove": "black",
                "goal": "", "state": "playing", "moves": [], "pending": 0,
                "attempt": "untried",
                "record": { "played": [], "wrong": 0, "hints": 0, "attempt": "untried" }
            })),
        }
    }

    /// The position on show, for the Study board: `{size, rule, black, white, toMove}`, or
    /// null before a puzzle is loaded.
    pub fn position(&self) -> Result<JsValue, JsValue> {
        let Some(b) = &self.board else {
            return Ok(JsValue::NULL);
        };
        let (black, white, to_move) = b.position();
        to_js(&serde_json::json!({
            "size": b.size(), "rule": b.puzzle().rule, "black": black, "white": white,
            "toMove": to_move,
        }))
    }

    /// The stone on show on a point: "black", "white" or "".
    #[wasm_bindgen(js_name = stoneAt)]
    pub fn stone_at(&self, name: &str) -> String {
        let stone = Point::from_str(name.trim())
            .ok()
            .and_then(|p| self.board.as_ref()?.stone_at(p));
        stone.map_or(String::new(), |c| c.name().to_string())
    }

    /// The board in words, for a screen reader.
    pub fn describe(&self) -> String {
        match &self.board {
            Some(b) => b.describe(),
            None => "The board is empty.".into(),
        }
    }

    /// The centre of a point as `[x, y]` in CSS pixels from the canvas's top-left corner.
    pub fn centre(&self, name: &str) -> Vec<f64> {
        match Point::from_str(name.trim()) {
            Ok(p) => self.surface.centre(p, self.view().size),
            Err(_) => Vec::new(),
        }
    }
}

/// The Study board.
#[wasm_bindgen(js_name = StudyBoard)]
pub struct StudyBoardHandle {
    surface: Surface,
    board: StudyBoard,
}

impl StudyBoardHandle {
    fn redraw(&self) -> Result<(), JsValue> {
        self.surface.draw(&self.board.view())
    }

    fn replace(&mut self, board: StudyBoard) -> Result<JsValue, JsValue> {
        let options = self.options();
        self.board = board;
        self.board.set_options(options);
        self.surface.still();
        let view = self.board.view();
        self.surface.fit(None, None, &view)?;
        self.status()
    }

    fn options(&self) -> Settings {
        self.board.options()
    }

    fn answer(&mut self, a: Answer) -> Result<JsValue, JsValue> {
        self.surface.grow(a.grow);
        self.redraw()?;
        to_js(&a)
    }
}

#[wasm_bindgen(js_class = StudyBoard)]
impl StudyBoardHandle {
    /// A study board on `canvas`: empty, 15x15, freestyle, black to move.
    #[wasm_bindgen(constructor)]
    pub fn new(canvas: HtmlCanvasElement) -> Result<StudyBoardHandle, JsValue> {
        Ok(StudyBoardHandle {
            surface: Surface::new(canvas)?,
            board: StudyBoard::new(15, Rule::Freestyle).map_err(err)?,
        })
    }

    /// Sizes the canvas's backing store to its CSS size times `dpr` and redraws, with the
    /// coordinates sized for a root font size of `text` CSS pixels.
    pub fn fit(&mut self, dpr: f64, text: f64) -> Result<(), JsValue> {
        let view = self.board.view();
        self.surface.fit(Some(dpr), Some(text), &view)
    }

    /// The display settings (see `PuzzleBoard.setOptions`).
    #[wasm_bindgen(js_name = setOptions)]
    pub fn set_options(
        &mut self,
        confirm: bool,
        forbidden: bool,
        numbers: bool,
    ) -> Result<(), JsValue> {
        self.board.set_options(Settings {
            confirm,
            forbidden,
            numbers,
        });
        self.redraw()
    }

    /// An empty board of side `size` under the rule named `rule`.
    pub fn reset(&mut self, size: u8, rule: &str) -> Result<JsValue, JsValue> {
        let rule = Rule::from_str(rule).map_err(err)?;
        let board = StudyBoard::new(size, rule).map_err(err)?;
        self.replace(board)
    }

    /// Replaces the position: side `size`, the rule named `rule`, the given stones and the side
    /// to move (as from `status`, e.g. after a reload). A bad position is refused with a
    /// message and the board stays as it was.
    pub fn load(
        &mut self,
        size: u8,
        rule: &str,
        black: Vec<String>,
        white: Vec<String>,
        to_move: &str,
    ) -> Result<JsValue, JsValue> {
        let rule = Rule::from_str(rule).map_err(err)?;
        let to_move: Stone = to_move.parse().map_err(err)?;
        let board = StudyBoard::load(size, rule, &points(&black)?, &points(&white)?, to_move)
            .map_err(err)?;
        self.replace(board)
    }

    /// The tool: "play" (alternate by the rules), "black", "white" or "erase".
    #[wasm_bindgen(js_name = setTool)]
    pub fn set_tool(&mut self, tool: &str) -> Result<(), JsValue> {
        let t = Tool::named(tool).ok_or_else(|| err(format!("unknown tool '{tool}'")))?;
        self.board.set_tool(t);
        Ok(())
    }

    /// Sets the side to move: "black" or "white".
    #[wasm_bindgen(js_name = setToMove)]
    pub fn set_to_move(&mut self, side: &str) -> Result<JsValue, JsValue> {
        let c: Stone = side.parse().map_err(err)?;
        self.board.set_to_move(c);
        self.redraw()?;
        self.status()
    }

    /// Replaces the position with a pasted move list (black first; the rules are enforced).
    /// A bad list is refused with a message naming the move; the position stays as it was.
    /// Returns the number of moves set up.
    pub fn paste(&mut self, text: &str) -> Result<u32, JsValue> {
        let n = self.board.paste(text).map_err(err)?;
        self.redraw()?;
        Ok(n as u32)
    }

    /// Empties the board.
    pub fn clear(&mut self) -> Result<JsValue, JsValue> {
        self.board.clear();
        self.redraw()?;
        self.status()
    }

    /// Shows an answer line, to be stepped through with `step`; `first` is the side that
    /// starts it.
    #[wasm_bindgen(js_name = showLine)]
    pub fn show_line(&mut self, line: Vec<String>, first: &str) -> Result<(), JsValue> {
        let first: Stone = first.parse().map_err(err)?;
        self.board.show_line(&points(&line)?, first).map_err(err)?;
        self.redraw()
    }

    /// Steps through the line shown: `delta` moves forward (negative: back). Returns
    /// `{shown, total, say}`.
    pub fn step(&mut self, delta: i32) -> Result<JsValue, JsValue> {
        let (step, last) = self.board.step(delta);
        if delta > 0 {
            self.surface.grow(last);
        }
        self.redraw()?;
        to_js(&step)
    }

    /// A tap or click at viewport coordinates: an edit with the current tool.
    pub fn tap(&mut self, client_x: f64, client_y: f64, touch: bool) -> Result<JsValue, JsValue> {
        let Some(p) = self.surface.hit(client_x, client_y) else {
            return nothing();
        };
        let a = self.board.touch(p, touch);
        self.answer(a)
    }

    /// Edits the point named `name` (like `h8`) with the current tool.
    pub fn play(&mut self, name: &str) -> Result<JsValue, JsValue> {
        let a = match Point::from_str(name.trim()) {
            Ok(p) => self.board.touch(p, false),
            Err(e) => refused(e),
        };
        self.answer(a)
    }

    /// Advances the stone animation (see `PuzzleBoard.frame`).
    pub fn frame(&mut self, now: f64) -> Result<bool, JsValue> {
        let view = self.board.view();
        self.surface.frame(now, &view)
    }

    /// Takes back the last edit.
    pub fn undo(&mut self) -> Result<JsValue, JsValue> {
        self.board.undo();
        self.redraw()?;
        self.status()
    }

    /// Moves the keyboard cursor by (`dx`, `dy`) points (up is +1); returns its point.
    #[wasm_bindgen(js_name = moveCursor)]
    pub fn move_cursor(&mut self, dx: i32, dy: i32) -> Result<String, JsValue> {
        let p = self.board.move_cursor(dx, dy);
        self.redraw()?;
        Ok(p.to_string())
    }

    /// Edits the point under the keyboard cursor.
    #[wasm_bindgen(js_name = placeAtCursor)]
    pub fn place_at_cursor(&mut self) -> Result<JsValue, JsValue> {
        let a = self.board.place_at_cursor();
        self.answer(a)
    }

    /// Where things stand: `{mode: "study", size, rule, toMove, goal, moves, tool, black,
    /// white}`.
    pub fn status(&self) -> Result<JsValue, JsValue> {
        to_js(&Tagged {
            mode: "study",
            status: self.board.status(),
        })
    }

    /// The stone on show on a point: "black", "white" or "".
    #[wasm_bindgen(js_name = stoneAt)]
    pub fn stone_at(&self, name: &str) -> String {
        let stone = Point::from_str(name.trim())
            .ok()
            .and_then(|p| self.board.stone_at(p));
        stone.map_or(String::new(), |c| c.name().to_string())
    }

    /// The board in words, for a screen reader.
    pub fn describe(&self) -> String {
        self.board.describe()
    }

    /// The centre of a point as `[x, y]` in CSS pixels from the canvas's top-left corner.
    pub fn centre(&self, name: &str) -> Vec<f64> {
        match Point::from_str(name.trim()) {
            Ok(p) => self.surface.centre(p, self.board.size()),
            Err(_) => Vec::new(),
        }
    }
}
