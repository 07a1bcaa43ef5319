//! The board handle of the app: one canvas, and what is on it: a puzzle being played (Tonight,
//! Drill) or a position being studied (Study board).
//!
//! The page forwards taps, keys and buttons, and gets small JSON answers back; every rule, grade
//! and sentence is decided here or in the engine. Moves that the app plays (a defender's reply,
//! a refutation) are added to the position at once but shown one by one: the page calls
//! [`Trainer::reveal`] after a pause for each, so a refutation plays out slowly.

use std::str::FromStr;

use engine::formats::setfile;
use engine::notation;
use engine::puzzle::attempt::Attempt;
use engine::puzzle::grade::{Grade, Hint, Session, State};
use engine::puzzle::Puzzle;
use engine::{Board, Point, Rule, Stone};
use serde::Serialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement};

use crate::api::{err, with_solver};
use crate::layout::Layout;
use crate::render::{self, Marks};
use crate::words::colour_word;

fn to_js<T: Serialize>(v: &T) -> Result<JsValue, JsValue> {
    v.serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(err)
}

/// How the study board's taps edit the position.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
enum Tool {
    /// Stones alternate by the rules, like a game.
    Play,
    /// Place black stones.
    Black,
    /// Place white stones.
    White,
    /// Remove stones.
    Erase,
}

struct PuzzleState {
    session: Session,
    /// How many moves of the session's history are shown.
    revealed: usize,
    hints: u8,
    hint_area: Option<(Point, Point)>,
    hint_move: Option<Point>,
    wrong: u32,
    refuted: Option<Point>,
}

struct StudyState {
    board: Board,
    to_move: Stone,
    tool: Tool,
    /// Every edit, so that it can be undone: the point and what was there before.
    edits: Vec<(Point, Option<Stone>, Stone)>,
    /// An answer line being stepped through, the side that starts it, and how much is shown.
    line: Vec<Point>,
    line_first: Stone,
    line_shown: usize,
}

enum Mode {
    Empty,
    Puzzle(Box<PuzzleState>),
    Study(Box<StudyState>),
}

/// What a tap, a key or a move did, for the page.
#[derive(Serialize, Default)]
#[serde(rename_all = "camelCase")]
struct Answer {
    /// "none", "ghost", "accepted", "solved", "wrong", "illegal", "finished", "placed",
    /// "refused".
    kind: &'static str,
    /// The point played or previewed.
    #[serde(skip_serializing_if = "Option::is_none")]
    point: Option<String>,
    /// Sentences for the screen reader and the message line, in order.
    say: Vec<String>,
    /// The one-sentence reason of a wrong move.
    #[serde(skip_serializing_if = "Option::is_none")]
    reason: Option<String>,
    /// Moves played by the app that are still to be revealed.
    pending: usize,
}

#[derive(Serialize)]
#[serde(rename_all = "camelCase")]
struct Status {
    mode: &'static str,
    size: u8,
    rule: &'static str,
    to_move: &'static str,
    goal: String,
    state: &'static str,
    moves: Vec<String>,
    /// The player's own moves since the start (for [`Trainer::restore`] after a reload).
    played: Vec<String>,
    wrong: u32,
    hints: u8,
    pending: usize,
    /// How the puzzle went (an [`Attempt`] name); "" on a study board.
    outcome: &'static str,
}

#[derive(Serialize)]
#[serde(rename_all = "camelCase")]
struct Revealed {
    point: String,
    colour: &'static str,
    say: String,
    more: bool,
}

/// One board on one canvas.
#[wasm_bindgen]
pub struct Trainer {
    canvas: HtmlCanvasElement,
    ctx: CanvasRenderingContext2d,
    layout: Layout,
    dpr: f64,
    mode: Mode,
    confirm: bool,
    show_forbidden: bool,
    numbers: bool,
    ghost: Option<Point>,
    cursor: Option<Point>,
    /// A stone that is appearing, and when it started (set by the first frame).
    growing: Option<(Point, Option<f64>)>,
}

/// How long a new stone takes to appear, in milliseconds.
const GROW_MS: f64 = 140.0;

#[wasm_bindgen]
impl Trainer {
    /// A board on `canvas`; nothing on it until a puzzle or a study position is loaded.
    #[wasm_bindgen(constructor)]
    pub fn new(canvas: HtmlCanvasElement) -> Result<Trainer, JsValue> {
        let ctx = canvas
            .get_context("2d")?
            .ok_or_else(|| err("this browser cannot draw on a canvas"))?
            .dyn_into::<CanvasRenderingContext2d>()?;
        Ok(Trainer {
            canvas,
            ctx,
            layout: Layout::new(15, 0.0, 0.0),
            dpr: 1.0,
            mode: Mode::Empty,
            confirm: true,
            show_forbidden: false,
            numbers: false,
            ghost: None,
            cursor: None,
            growing: None,
        })
    }

    fn size(&self) -> u8 {
        match &self.mode {
            Mode::Empty => 15,
            Mode::Puzzle(p) => p.session.board().size(),
            Mode::Study(s) => s.board.size(),
        }
    }

    /// Sizes the canvas's backing store to its CSS size times `dpr` and redraws.
    pub fn fit(&mut self, dpr: f64) -> Result<(), JsValue> {
        let dpr = if dpr.is_finite() && dpr > 0.0 {
            dpr.min(4.0)
        } else {
            1.0
        };
        let rect = self.canvas.get_bounding_client_rect();
        self.dpr = dpr;
        self.layout = Layout::new(self.size(), rect.width(), rect.height());
        let w = (rect.width() * dpr).round().max(1.0) as u32;
        let h = (rect.height() * dpr).round().max(1.0) as u32;
        if self.canvas.width() != w {
            self.canvas.set_width(w);
        }
        if self.canvas.height() != h {
            self.canvas.set_height(h);
        }
        self.redraw()
    }

    /// Turns an option on or off: "confirm" (two taps on touch screens), "forbidden" (mark
    /// black's forbidden points under renju), "numbers" (move numbers on the moves played).
    #[wasm_bindgen(js_name = setOption)]
    pub fn set_option(&mut self, name: &str, on: bool) -> Result<(), JsValue> {
        match name {
            "confirm" => self.confirm = on,
            "forbidden" => self.show_forbidden = on,
            "numbers" => self.numbers = on,
            other => return Err(err(format!("unknown option '{other}'"))),
        }
        self.ghost = None;
        self.redraw()
    }

    /// Loads a puzzle given as one set-file puzzle object (JSON text). Returns the status.
    #[wasm_bindgen(js_name = loadPuzzle)]
    pub fn load_puzzle(&mut self, puzzle_json: &str) -> Result<JsValue, JsValue> {
        let wrapped = format!(
            "{{\"format\":\"fivefold-set\",\"version\":1,\"title\":\"\",\"created\":\"2026-12-01\",\"puzzles\":[{puzzle_json}]}}"
        );
        let set = setfile::parse(&wrapped).map_err(err)?;
        let puzzle = set
            .puzzles
            .into_iter()
            .next()
            .ok_or_else(|| err("no puzzle"))?;
        self.start_puzzle(puzzle);
        self.fit(self.dpr)?;
        self.status()
    }

    /// Says whether the loaded puzzle's answer key was proved by this program: true for the
    /// built-in library and for Drill's generated puzzles, false (the default) for sets from
    /// a file or a link. See `Session::trust_key`. Call it before `restore`.
    #[wasm_bindgen(js_name = trustKey)]
    pub fn trust_key(&mut self, trusted: bool) {
        if let Mode::Puzzle(state) = &mut self.mode {
            state.session.trust_key(trusted);
        }
    }

    fn start_puzzle(&mut self, puzzle: Puzzle) {
        self.mode = Mode::Puzzle(Box::new(PuzzleState {
            session: Session::new(puzzle),
            revealed: 0,
            hints: 0,
            hint_area: None,
            hint_move: None,
            wrong: 0,
            refuted: None,
        }));
        self.ghost = None;
        self.cursor = None;
        self.growing = None;
    }

    /// Replays the player's moves of a puzzle in progress (after a reload): each is graded
    /// again, replies included, and everything is shown at once. `wrong` and `hints` bring
    /// back the wrong tries and hint steps counted before (they decide the outcome).
    pub fn restore(
        &mut self,
        moves: Vec<String>,
        wrong: Option<u32>,
        hints: Option<u8>,
    ) -> Result<JsValue, JsValue> {
        for m in moves {
            let p = Point::from_str(&m).map_err(err)?;
            let a = self.play_point(p, false)?;
            if matches!(a.kind, "wrong" | "illegal" | "finished") {
                break;
            }
        }
        while self.reveal_one().is_some() {}
        if let Mode::Puzzle(state) = &mut self.mode {
            state.wrong = state.wrong.max(wrong.unwrap_or(0));
            state.hints = state.hints.max(hints.unwrap_or(0).min(3));
        }
        self.growing = None;
        self.redraw()?;
        self.status()
    }

    /// A tap or click at viewport coordinates. With `touch` and the confirm option on, the
    /// first tap on a point only previews the stone and a second tap on it plays it.
    pub fn tap(&mut self, client_x: f64, client_y: f64, touch: bool) -> Result<JsValue, JsValue> {
        let rect = self.canvas.get_bounding_client_rect();
        let Some(p) = self
            .layout
            .hit(client_x - rect.left(), client_y - rect.top())
        else {
            return to_js(&Answer {
                kind: "none",
                ..Default::default()
            });
        };
        self.cursor = None;
        let answer = self.touch_point(p, touch)?;
        to_js(&answer)
    }

    fn touch_point(&mut self, p: Point, touch: bool) -> Result<Answer, JsValue> {
        let previewing = self.confirm && touch && matches!(self.mode, Mode::Puzzle(_));
        if previewing && self.ghost != Some(p) {
            let occupied = match &self.mode {
                Mode::Puzzle(s) => s.session.board().get(p).is_some(),
                _ => false,
            };
            if !occupied {
                self.ghost = Some(p);
                self.redraw()?;
                return Ok(Answer {
                    kind: "ghost",
                    point: Some(p.to_string()),
                    say: vec![format!("{p} selected: tap it again to play.")],
                    ..Default::default()
                });
            }
        }
        self.ghost = None;
        self.play_point(p, true)
    }

    /// Plays the point named `name` (like `h8`), as a confirmed move.
    pub fn play(&mut self, name: &str) -> Result<JsValue, JsValue> {
        let answer = match Point::from_str(name.trim()) {
            Ok(p) => self.play_point(p, true)?,
            Err(e) => Answer {
                kind: "refused",
                say: vec![format!("Not played: {e}.")],
                ..Default::default()
            },
        };
        to_js(&answer)
    }

    fn play_point(&mut self, p: Point, animate: bool) -> Result<Answer, JsValue> {
        if !matches!(self.mode, Mode::Puzzle(_)) {
            return self.study_edit(p);
        }
        let Mode::Puzzle(state) = &mut self.mode else {
            unreachable!("checked above")
        };
        // Everything the app already played is on show once the player moves again.
        state.revealed = state.session.history().len();
        let me = state.session.to_move();
        let grade = with_solver(|solver| state.session.play(solver, p));
        let mut a = Answer {
            point: Some(p.to_string()),
            ..Default::default()
        };
        match grade {
            Grade::Illegal { reason } => {
                a.kind = "illegal";
                a.say.push(format!("Not played: {reason}"));
            }
            Grade::Finished => {
                a.kind = "finished";
                a.say.push("The puzzle is over: undo or try again.".into());
            }
            Grade::Solved { note } => {
                a.kind = "solved";
                a.say.push(format!("{} {p}.", colour_word(me)));
                a.say.push(format!("Solved. {note}"));
                state.revealed = state.session.history().len();
            }
            Grade::Accepted { note, .. } => {
                a.kind = "accepted";
                a.say.push(format!("{} {p}: correct.", colour_word(me)));
                a.say.push(note);
                state.revealed += 1;
            }
            Grade::Wrong { reason, .. } => {
                a.kind = "wrong";
                state.wrong += 1;
                state.refuted = Some(p);
                a.say.push(format!("{} {p}: not right.", colour_word(me)));
                a.say.push(reason.clone());
                a.reason = Some(reason);
                state.revealed += 1;
            }
        }
        if a.kind != "illegal" {
            state.hint_area = None;
            state.hint_move = None;
        }
        a.pending = state.session.history().len().saturating_sub(state.revealed);
        if animate && matches!(a.kind, "accepted" | "solved" | "wrong") {
            self.growing = Some((p, None));
        }
        self.redraw()?;
        Ok(a)
    }

    fn reveal_one(&mut self) -> Option<Revealed> {
        let Mode::Puzzle(state) = &mut self.mode else {
            return None;
        };
        let history = state.session.history();
        if state.revealed >= history.len() {
            return None;
        }
        let (p, c) = history[state.revealed];
        state.revealed += 1;
        let more = state.revealed < history.len();
        self.growing = Some((p, None));
        Some(Revealed {
            point: p.to_string(),
            colour: c.name(),
            say: format!("{} {p}.", colour_word(c)),
            more,
        })
    }

    /// Shows the next move the app has played (a reply, or the next move of a refutation).
    /// Returns `{point, colour, say, more}`, or null when nothing is left to show.
    pub fn reveal(&mut self) -> Result<JsValue, JsValue> {
        match self.reveal_one() {
            Some(r) => {
                self.redraw()?;
                to_js(&r)
            }
            None => Ok(JsValue::NULL),
        }
    }

    /// Advances the stone animation to `now` (milliseconds, as from `performance.now()`; the
    /// first call after a move starts the clock). Returns whether more frames are wanted.
    pub fn frame(&mut self, now: f64) -> Result<bool, JsValue> {
        let Some((p, start)) = self.growing else {
            return Ok(false);
        };
        let start = start.unwrap_or(now);
        let t = ((now - start) / GROW_MS).clamp(0.0, 1.0);
        self.growing = (t < 1.0).then_some((p, Some(start)));
        self.redraw_with_growth(t)?;
        Ok(self.growing.is_some())
    }

    /// Takes back the player's last turn (in a study: the last edit).
    pub fn undo(&mut self) -> Result<JsValue, JsValue> {
        match &mut self.mode {
            Mode::Puzzle(state) => {
                state.session.undo();
                state.revealed = state.session.history().len();
                state.refuted = None;
                state.hint_area = None;
                state.hint_move = None;
            }
            Mode::Study(s) => {
                if let Some((p, before, _)) = s.edits.pop() {
                    if s.board.get(p).is_some() {
                        s.board.remove(p);
                    }
                    if let Some(c) = before {
                        s.board.place(p, c);
                    }
                    if s.tool == Tool::Play {
                        s.to_move = s.to_move.opponent();
                    }
                }
                s.line.clear();
            }
            Mode::Empty => {}
        }
        self.ghost = None;
        self.redraw()?;
        self.status()
    }

    /// Back to the puzzle's start; the hints already seen stay counted.
    pub fn retry(&mut self) -> Result<JsValue, JsValue> {
        if let Mode::Puzzle(state) = &mut self.mode {
            state.session.retry();
            state.revealed = 0;
            state.refuted = None;
            state.hint_area = None;
            state.hint_move = None;
        }
        self.ghost = None;
        self.redraw()?;
        self.status()
    }

    /// The next hint: 1 the theme and length, 2 the area of the key move, 3 the move. Returns
    /// `{step, say}`.
    pub fn hint(&mut self) -> Result<JsValue, JsValue> {
        #[derive(Serialize)]
        struct HintOut {
            step: u8,
            say: String,
        }
        let out = match &mut self.mode {
            Mode::Puzzle(state) => {
                let step = (state.hints + 1).min(3);
                match with_solver(|solver| state.session.hint(solver, step)) {
                    None => HintOut {
                        step: 0,
                        say: "No hint: the puzzle is over.".into(),
                    },
                    Some(h) => {
                        state.hints = state.hints.max(step);
                        let say = match h {
                            Hint::Theme(t) => t,
                            Hint::Area { from, to } => {
                                state.hint_area = Some((from, to));
                                format!("The key move is between {from} and {to}.")
                            }
                            Hint::Move(m) => {
                                state.hint_move = Some(m);
                                format!("The key move is {m}.")
                            }
                        };
                        HintOut { step, say }
                    }
                }
            }
            _ => HintOut {
                step: 0,
                say: "Hints are for puzzles.".into(),
            },
        };
        self.redraw()?;
        to_js(&out)
    }

    /// The keyboard cursor: moves it by (`dx`, `dy`) points (up is +1) and returns its point.
    #[wasm_bindgen(js_name = moveCursor)]
    pub fn move_cursor(&mut self, dx: i32, dy: i32) -> Result<String, JsValue> {
        let n = self.size() as i32;
        let c = self
            .cursor
            .unwrap_or(Point::new((n / 2) as u8, (n / 2) as u8));
        let p = if self.cursor.is_none() {
            c
        } else {
            Point::new(
                (c.x as i32 + dx).clamp(0, n - 1) as u8,
                (c.y as i32 + dy).clamp(0, n - 1) as u8,
            )
        };
        self.cursor = Some(p);
        self.redraw()?;
        Ok(p.to_string())
    }

    /// Plays (or, in a study, edits) the point under the keyboard cursor.
    #[wasm_bindgen(js_name = placeAtCursor)]
    pub fn place_at_cursor(&mut self) -> Result<JsValue, JsValue> {
        let Some(p) = self.cursor else {
            return to_js(&Answer {
                kind: "none",
                say: vec!["Move the cursor with the arrow keys first.".into()],
                ..Default::default()
            });
        };
        let a = self.play_point(p, true)?;
        to_js(&a)
    }

    /// Where things stand: mode, size, rule, side to move, goal, state, moves shown, wrong
    /// tries and hints used, moves still to reveal.
    pub fn status(&self) -> Result<JsValue, JsValue> {
        let s = match &self.mode {
            Mode::Empty => Status {
                mode: "empty",
                size: 15,
                rule: "freestyle",
                to_move: "black",
                goal: String::new(),
                state: "playing",
                moves: vec![],
                played: vec![],
                wrong: 0,
                hints: 0,
                pending: 0,
                outcome: "",
            },
            Mode::Puzzle(p) => {
                let h = p.session.history();
                Status {
                    mode: "puzzle",
                    size: p.session.board().size(),
                    rule: p.session.board().rule().name(),
                    to_move: p.session.to_move().name(),
                    goal: p.session.puzzle().goal_words(),
                    state: match p.session.state() {
                        State::Playing => "playing",
                        State::Solved => "solved",
                        State::Failed => "failed",
                    },
                    moves: h[..p.revealed.min(h.len())]
                        .iter()
                        .map(|m| m.0.to_string())
                        .collect(),
                    // Every turn of the player is one move and one reply, except the last,
                    // which may be a five or a wrong move with its refutation after it.
                    played: {
                        let mut v: Vec<Point> = h.iter().step_by(2).map(|m| m.0).collect();
                        if let (State::Failed, Some(r)) = (p.session.state(), p.refuted) {
                            if let Some(i) = v.iter().position(|&m| m == r) {
                                v.truncate(i + 1);
                            }
                        }
                        v.iter().map(|m| m.to_string()).collect()
                    },
                    wrong: p.wrong,
                    hints: p.hints,
                    pending: h.len().saturating_sub(p.revealed),
                    outcome: Attempt::of(p.session.state(), p.wrong, p.hints, h.len()).name(),
                }
            }
            Mode::Study(s) => Status {
                mode: "study",
                size: s.board.size(),
                rule: s.board.rule().name(),
                to_move: s.to_move.name(),
                goal: format!("{} to move", colour_word(s.to_move)),
                state: "playing",
                moves: s.edits.iter().map(|e| e.0.to_string()).collect(),
                played: vec![],
                wrong: 0,
                hints: 0,
                pending: 0,
                outcome: "",
            },
        };
        to_js(&s)
    }

    /// The stone on a point: "black", "white" or "" (as shown, for tests and the screen
    /// reader).
    #[wasm_bindgen(js_name = stoneAt)]
    pub fn stone_at(&self, name: &str) -> String {
        let Ok(p) = Point::from_str(name.trim()) else {
            return String::new();
        };
        self.shown_stones()
            .iter()
            .find(|s| s.0 == p)
            .map_or(String::new(), |s| s.1.name().to_string())
    }

    /// The board in words, for a screen reader: the goal or the side to move, every stone by
    /// colour, and the last move.
    pub fn describe(&self) -> String {
        let stones = self.shown_stones();
        let of = |c: Stone| {
            let mut v: Vec<Point> = stones.iter().filter(|s| s.1 == c).map(|s| s.0).collect();
            v.sort_by_key(|p| (p.y, p.x));
            v
        };
        let names = |v: &[Point]| {
            if v.is_empty() {
                "none".to_string()
            } else {
                v.iter()
                    .map(|p| p.to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            }
        };
        let head = match &self.mode {
            Mode::Empty => return "The board is empty.".into(),
            Mode::Puzzle(p) => format!("{}.", p.session.puzzle().goal_words()),
            Mode::Study(s) => format!(
                "Study board, {} rules, {n} by {n}. {} to move.",
                s.board.rule().name(),
                colour_word(s.to_move),
                n = s.board.size()
            ),
        };
        let (b, w) = (of(Stone::Black), of(Stone::White));
        let mut out = format!(
            "{head} Black stones ({}): {}. White stones ({}): {}.",
            b.len(),
            names(&b),
            w.len(),
            names(&w)
        );
        if let Some(p) = self.marks().last {
            if let Some(c) = stones.iter().find(|s| s.0 == p).map(|s| s.1) {
                out.push_str(&format!(" Last move: {} {p}.", colour_word(c)));
            }
        }
        out
    }

    /// The centre of a point as `[x, y]` in CSS pixels from the canvas's top-left corner;
    /// empty if the name is not a point of this board.
    pub fn centre(&self, name: &str) -> Vec<f64> {
        match Point::from_str(name.trim()) {
            Ok(p) if p.x < self.size() && p.y < self.size() => {
                let (x, y) = self.layout.centre(p);
                vec![x, y]
            }
            _ => Vec::new(),
        }
    }

    // ---- Study board ----

    /// Starts an empty study board of side `size` under the rule named `rule`.
    #[wasm_bindgen(js_name = studyNew)]
    pub fn study_new(&mut self, size: u8, rule: &str) -> Result<JsValue, JsValue> {
        let rule = Rule::from_str(rule).map_err(err)?;
        let board = Board::new(size, rule).map_err(err)?;
        self.start_study(board, Stone::Black)
    }

    /// A study board on `board` with `to_move` to play, nothing else carried over.
    fn start_study(&mut self, board: Board, to_move: Stone) -> Result<JsValue, JsValue> {
        self.mode = Mode::Study(Box::new(StudyState {
            board,
            to_move,
            tool: Tool::Play,
            edits: Vec::new(),
            line: Vec::new(),
            line_first: Stone::Black,
            line_shown: 0,
        }));
        self.ghost = None;
        self.growing = None;
        self.cursor = None;
        self.fit(self.dpr)?;
        self.status()
    }

    /// Replaces the study board with a position: side `size`, the rule named `rule`, the given
    /// stones and the side to move (as from [`Trainer::study_position`], e.g. after a reload).
    /// A bad position is refused with a message and the board stays as it was.
    #[wasm_bindgen(js_name = studyLoad)]
    pub fn study_load(
        &mut self,
        size: u8,
        rule: &str,
        black: Vec<String>,
        white: Vec<String>,
        to_move: &str,
    ) -> Result<JsValue, JsValue> {
        let rule = Rule::from_str(rule).map_err(err)?;
        let board = notation::setup(size, rule, &black.join(" "), &white.join(" ")).map_err(err)?;
        let to_move: Stone = to_move.parse().map_err(err)?;
        self.start_study(board, to_move)
    }

    /// The study tool: "play" (alternate by the rules), "black", "white" or "erase".
    #[wasm_bindgen(js_name = studyTool)]
    pub fn study_tool(&mut self, tool: &str) -> Result<(), JsValue> {
        let t = match tool {
            "play" => Tool::Play,
            "black" => Tool::Black,
            "white" => Tool::White,
            "erase" => Tool::Erase,
            other => return Err(err(format!("unknown tool '{other}'"))),
        };
        if let Mode::Study(s) = &mut self.mode {
            s.tool = t;
        }
        Ok(())
    }

    /// Sets the side to move in the study position: "black" or "white".
    #[wasm_bindgen(js_name = studyToMove)]
    pub fn study_to_move(&mut self, side: &str) -> Result<JsValue, JsValue> {
        let c: Stone = side.parse().map_err(err)?;
        if let Mode::Study(s) = &mut self.mode {
            s.to_move = c;
            s.line.clear();
        }
        self.redraw()?;
        self.status()
    }

    /// Replaces the study position with a pasted move list (black first; the rules are
    /// enforced). A bad list is refused with a message naming the move, and the position stays
    /// as it was.
    #[wasm_bindgen(js_name = studyPaste)]
    pub fn study_paste(&mut self, text: &str) -> Result<JsValue, JsValue> {
        let Mode::Study(s) = &mut self.mode else {
            return Err(err("not a study board"));
        };
        let size = s.board.size();
        let rule = s.board.rule();
        let game = notation::play_moves(text, size, rule).map_err(err)?;
        s.board = game.board().clone();
        s.to_move = game.to_move();
        s.edits = game
            .moves()
            .iter()
            .enumerate()
            .map(|(i, &p)| {
                let c = if i % 2 == 0 {
                    Stone::Black
                } else {
                    Stone::White
                };
                (p, None, c)
            })
            .collect();
        s.tool = Tool::Play;
        s.line.clear();
        self.redraw()?;
        self.status()
    }

    /// Empties the study board.
    #[wasm_bindgen(js_name = studyClear)]
    pub fn study_clear(&mut self) -> Result<JsValue, JsValue> {
        if let Mode::Study(s) = &mut self.mode {
            s.board = Board::new(s.board.size(), s.board.rule()).map_err(err)?;
            s.edits.clear();
            s.line.clear();
            s.to_move = Stone::Black;
        }
        self.redraw()?;
        self.status()
    }

    /// The study position as `{rule, size, black, white, toMove}` (for the worker).
    #[wasm_bindgen(js_name = studyPosition)]
    pub fn study_position(&self) -> Result<JsValue, JsValue> {
        #[derive(Serialize)]
        #[serde(rename_all = "camelCase")]
        struct Pos {
            rule: &'static str,
            size: u8,
            black: Vec<String>,
            white: Vec<String>,
            to_move: &'static str,
        }
        let Mode::Study(s) = &self.mode else {
            return Err(err("not a study board"));
        };
        let names = |c| s.board.stones_of(c).iter().map(|p| p.to_string()).collect();
        to_js(&Pos {
            rule: s.board.rule().name(),
            size: s.board.size(),
            black: names(Stone::Black),
            white: names(Stone::White),
            to_move: s.to_move.name(),
        })
    }

    /// Shows an answer line on the study board, to be stepped through with
    /// [`Trainer::study_step`]; `first` is the side that starts it.
    #[wasm_bindgen(js_name = studyShowLine)]
    pub fn study_show_line(&mut self, line: Vec<String>, first: &str) -> Result<(), JsValue> {
        let Mode::Study(s) = &mut self.mode else {
            return Err(err("not a study board"));
        };
        let mut pts = Vec::new();
        for m in line {
            let p = Point::from_str(&m).map_err(err)?;
            if p.x >= s.board.size()
                || p.y >= s.board.size()
                || s.board.get(p).is_some()
                || pts.contains(&p)
            {
                return Err(err(format!("{m} cannot be played here")));
            }
            pts.push(p);
        }
        s.line = pts;
        s.line_first = if first == "white" {
            Stone::White
        } else {
            Stone::Black
        };
        s.line_shown = 0;
        self.redraw()
    }

    /// Steps through the line shown: `delta` moves forward (negative: back). Returns the move
    /// now last shown, in words, and the count shown.
    #[wasm_bindgen(js_name = studyStep)]
    pub fn study_step(&mut self, delta: i32) -> Result<JsValue, JsValue> {
        #[derive(Serialize)]
        struct Step {
            shown: usize,
            total: usize,
            say: String,
        }
        let Mode::Study(s) = &mut self.mode else {
            return Err(err("not a study board"));
        };
        let n = (s.line_shown as i64 + delta as i64).clamp(0, s.line.len() as i64) as usize;
        s.line_shown = n;
        let say = if n == 0 {
            "The line is hidden.".to_string()
        } else {
            let c = if n % 2 == 1 {
                s.line_first
            } else {
                s.line_first.opponent()
            };
            format!("{}. {} {}", n, colour_word(c), s.line[n - 1])
        };
        let out = Step {
            shown: n,
            total: s.line.len(),
            say,
        };
        if n > 0 {
            self.growing = Some((self.study_line_point(n - 1), None));
        }
        self.redraw()?;
        to_js(&out)
    }

    fn study_line_point(&self, i: usize) -> Point {
        match &self.mode {
            Mode::Study(s) => s.line[i],
            _ => Point::new(0, 0),
        }
    }
}

impl Trainer {
    fn study_edit(&mut self, p: Point) -> Result<Answer, JsValue> {
        let Mode::Study(s) = &mut self.mode else {
            return Ok(Answer {
                kind: "none",
                ..Default::default()
            });
        };
        if !s.board.contains(p) {
            return Ok(Answer {
                kind: "illegal",
                say: vec![format!("{p} is off the board.")],
                ..Default::default()
            });
        }
        let before = s.board.get(p);
        let mut a = Answer {
            point: Some(p.to_string()),
            ..Default::default()
        };
        match s.tool {
            Tool::Erase => {
                if let Some(c) = before {
                    s.board.remove(p);
                    s.edits.push((p, before, c));
                    a.kind = "placed";
                    a.say.push(format!("Removed {} {p}.", c.name()));
                } else {
                    a.kind = "none";
                }
            }
            Tool::Black | Tool::White => {
                let c = if s.tool == Tool::Black {
                    Stone::Black
                } else {
                    Stone::White
                };
                if before.is_some() {
                    s.board.remove(p);
                }
                s.board.place(p, c);
                s.edits.push((p, before, c));
                a.kind = "placed";
                a.say.push(format!("{} {p} (set up).", colour_word(c)));
            }
            Tool::Play => {
                let c = s.to_move;
                if before.is_some() {
                    a.kind = "refused";
                    a.say.push(format!("Not played: {p} is already taken."));
                } else if s.board.rule().has_forbidden(c) && !s.board.wins_at(s.board.index(p), c) {
                    match s.board.forbidden(p) {
                        Some(why) => {
                            a.kind = "refused";
                            a.say.push(format!(
                                "Not played: {p} is forbidden for Black: it makes {}.",
                                why.words()
                            ));
                        }
                        None => {
                            s.board.place(p, c);
                            s.edits.push((p, None, c));
                            s.to_move = c.opponent();
                            a.kind = "placed";
                            a.say.push(format!("{} {p}.", colour_word(c)));
                        }
                    }
                } else {
                    let five = s.board.wins_at(s.board.index(p), c);
                    s.board.place(p, c);
                    s.edits.push((p, None, c));
                    s.to_move = c.opponent();
                    a.kind = "placed";
                    a.say.push(format!("{} {p}.", colour_word(c)));
                    if five {
                        a.say.push(format!("{} has five in a row.", colour_word(c)));
                    }
                }
            }
        }
        if a.kind == "placed" {
            s.line.clear();
            self.growing = Some((p, None));
        }
        self.redraw()?;
        Ok(a)
    }

    /// The stones on show: the position with the revealed moves, plus a study line's shown part.
    fn shown_stones(&self) -> Vec<(Point, Stone)> {
        match &self.mode {
            Mode::Empty => Vec::new(),
            Mode::Puzzle(state) => {
                let puzzle = state.session.puzzle();
                let mut v: Vec<(Point, Stone)> = puzzle
                    .black
                    .iter()
                    .map(|&p| (p, Stone::Black))
                    .chain(puzzle.white.iter().map(|&p| (p, Stone::White)))
                    .collect();
                let h = state.session.history();
                v.extend(h[..state.revealed.min(h.len())].iter().copied());
                v
            }
            Mode::Study(s) => {
                let mut v: Vec<(Point, Stone)> = s
                    .board
                    .points()
                    .filter_map(|p| s.board.get(p).map(|c| (p, c)))
                    .collect();
                for (i, &p) in s.line[..s.line_shown].iter().enumerate() {
                    let c = if i % 2 == 0 {
                        s.line_first
                    } else {
                        s.line_first.opponent()
                    };
                    v.push((p, c));
                }
                v
            }
        }
    }

    fn marks(&self) -> Marks {
        let mut m = Marks {
            cursor: self.cursor,
            ..Default::default()
        };
        match &self.mode {
            Mode::Empty => {}
            Mode::Puzzle(state) => {
                let h = state.session.history();
                let shown = &h[..state.revealed.min(h.len())];
                m.last = shown.last().map(|x| x.0);
                m.hint_area = state.hint_area;
                m.hint_move = state.hint_move;
                m.refuted = state
                    .refuted
                    .filter(|_| state.session.state() == State::Failed);
                if let Some(g) = self.ghost {
                    m.ghost = Some((g, state.session.to_move()));
                }
                if self.numbers {
                    m.numbers = shown
                        .iter()
                        .enumerate()
                        .map(|(i, x)| (x.0, i as u16 + 1))
                        .collect();
                }
                let b = state.session.board();
                if self.show_forbidden
                    && state.session.state() == State::Playing
                    && b.rule().has_forbidden(state.session.to_move())
                    && state.revealed >= h.len()
                {
                    m.forbidden = b.forbidden_points().into_iter().map(|x| x.0).collect();
                }
                if state.session.state() == State::Solved && state.revealed >= h.len() {
                    m.winning = b
                        .points()
                        .filter(|&p| b.get(p).is_some() && b.is_winning_stone(b.index(p)))
                        .collect();
                }
            }
            Mode::Study(s) => {
                m.last = if s.line_shown > 0 {
                    Some(s.line[s.line_shown - 1])
                } else {
                    s.edits.last().map(|e| e.0)
                };
                m.numbers = s.line[..s.line_shown]
                    .iter()
                    .enumerate()
                    .map(|(i, &p)| (p, i as u16 + 1))
                    .collect();
                if self.show_forbidden
                    && s.board.rule().has_forbidden(s.to_move)
                    && s.line_shown == 0
                {
                    m.forbidden = s
                        .board
                        .forbidden_points()
                        .into_iter()
                        .map(|x| x.0)
                        .collect();
                }
                let b = &s.board;
                m.winning = b
                    .points()
                    .filter(|&p| b.get(p).is_some() && b.is_winning_stone(b.index(p)))
                    .collect();
            }
        }
        m
    }

    fn redraw(&self) -> Result<(), JsValue> {
        self.redraw_with_growth(if self.growing.is_some() { 0.0 } else { 1.0 })
    }

    fn redraw_with_growth(&self, t: f64) -> Result<(), JsValue> {
        let mut marks = self.marks();
        if let Some((p, _)) = self.growing {
            marks.growing = Some((p, t));
        }
        let l = self.layout;
        for (name, value) in [("data-step", l.step), ("data-x0", l.x0), ("data-y0", l.y0)] {
            self.canvas.set_attribute(name, &format!("{value:.3}"))?;
        }
        self.canvas
            .set_attribute("data-size", &self.size().to_string())?;
        let stones = self.shown_stones();
        render::draw_stones(&self.ctx, &self.layout, self.dpr, &stones, &marks)
    }
}
