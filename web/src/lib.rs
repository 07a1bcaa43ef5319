//! The Fivefold web app's Rust side: one opaque [`Session`] handle for the page.
//!
//! The page's script only forwards events (a tap, a button, a rule choice, a resize) and shows
//! the text the session returns. The rules are the engine's; this crate turns its answers into
//! sentences ([`play`]), places the grid ([`layout`]) and draws it ([`render`]).
#![deny(missing_docs)]

pub mod api;
pub mod layout;
pub mod library;
pub mod play;
pub mod render;
pub mod trainer;

use std::str::FromStr;

use engine::notation::format_points;
use engine::{Rule, Stone};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement};

use crate::layout::Layout;
use crate::play::{Play, Reply, SIZE};
use crate::render::Marks;

/// Runs once when the module is initialised: panics are reported on the console.
#[wasm_bindgen(start)]
pub fn start() {
    console_error_panic_hook::set_once();
}

/// A game on the play board, drawn on one canvas.
///
/// The canvas carries the grid's geometry for scripts and tests as data attributes, in CSS
/// pixels from the canvas's top-left corner: `data-size`, `data-step`, `data-x0` (the x of
/// column `a`) and `data-y0` (the y of row `1`); and the game as `data-rule`, `data-to-move`
/// and `data-moves` (the move list, like `h8 i9`).
#[wasm_bindgen]
pub struct Session {
    play: Play,
    canvas: HtmlCanvasElement,
    ctx: CanvasRenderingContext2d,
    layout: Layout,
    dpr: f64,
    show_forbidden: bool,
}

fn to_js(reply: &Reply) -> Result<JsValue, JsValue> {
    serde_wasm_bindgen::to_value(reply).map_err(JsValue::from)
}

#[wasm_bindgen]
impl Session {
    /// A new game under the rule named `rule` (`freestyle`, `standard` or `renju`), drawn on
    /// `canvas`. Call [`Session::fit`] once the canvas is laid out.
    #[wasm_bindgen(constructor)]
    pub fn new(canvas: HtmlCanvasElement, rule: &str) -> Result<Session, JsValue> {
        let rule = Rule::from_str(rule).map_err(|e| JsValue::from_str(&e.to_string()))?;
        let ctx = canvas
            .get_context("2d")?
            .ok_or_else(|| JsValue::from_str("this browser cannot draw on a canvas"))?
            .dyn_into::<CanvasRenderingContext2d>()?;
        Ok(Session {
            play: Play::new(rule),
            canvas,
            ctx,
            layout: Layout::new(SIZE, 0.0, 0.0),
            dpr: 1.0,
            show_forbidden: true,
        })
    }

    /// Measures the canvas's CSS size, sizes its backing store to that size times `dpr` (the
    /// device pixel ratio), and redraws.
    pub fn fit(&mut self, dpr: f64) -> Result<(), JsValue> {
        let dpr = if dpr.is_finite() && dpr > 0.0 {
            dpr
        } else {
            1.0
        };
        let rect = self.canvas.get_bounding_client_rect();
        self.dpr = dpr;
        self.layout = Layout::new(SIZE, rect.width(), rect.height());
        let w = (rect.width() * dpr).round().max(1.0) as u32;
        let h = (rect.height() * dpr).round().max(1.0) as u32;
        if self.canvas.width() != w {
            self.canvas.set_width(w);
        }
        if self.canvas.height() != h {
            self.canvas.set_height(h);
        }
        let l = self.layout;
        for (name, value) in [("data-step", l.step), ("data-x0", l.x0), ("data-y0", l.y0)] {
            self.canvas.set_attribute(name, &format!("{value:.3}"))?;
        }
        self.canvas.set_attribute("data-size", &SIZE.to_string())?;
        self.redraw()
    }

    /// A tap or click at viewport coordinates (`clientX`, `clientY`). A tap away from the
    /// grid does nothing.
    pub fn tap(&mut self, client_x: f64, client_y: f64) -> Result<JsValue, JsValue> {
        let rect = self.canvas.get_bounding_client_rect();
        match self
            .layout
            .hit(client_x - rect.left(), client_y - rect.top())
        {
            Some(p) => {
                let reply = self.play.play(p);
                self.after(&reply)
            }
            None => Ok(JsValue::NULL),
        }
    }

    /// Plays the next stone on the point named `name` (like `h8`).
    pub fn play(&mut self, name: &str) -> Result<JsValue, JsValue> {
        let reply = self.play.play_named(name);
        self.after(&reply)
    }

    /// Takes back the last move.
    pub fn undo(&mut self) -> Result<JsValue, JsValue> {
        let reply = self.play.undo();
        self.after(&reply)
    }

    /// Starts a new game under the rule named `rule`.
    #[wasm_bindgen(js_name = newGame)]
    pub fn new_game(&mut self, rule: &str) -> Result<JsValue, JsValue> {
        let reply = self.play.restart(rule);
        self.after(&reply)
    }

    /// Whether black's forbidden points are marked (renju, black to move).
    #[wasm_bindgen(js_name = showForbidden)]
    pub fn show_forbidden(&mut self, on: bool) -> Result<(), JsValue> {
        self.show_forbidden = on;
        self.redraw()
    }

    /// The status line.
    pub fn status(&self) -> String {
        self.play.status()
    }

    /// The stone on the point named `name`: `"black"`, `"white"` or `""`.
    #[wasm_bindgen(js_name = stoneAt)]
    pub fn stone_at(&self, name: &str) -> String {
        self.play.stone_named(name).to_string()
    }

    /// The moves so far, like `h8 i9`.
    pub fn moves(&self) -> String {
        format_points(self.play.game().moves())
    }

    /// The centre of the point named `name`, as `[x, y]` in CSS pixels from the canvas's
    /// top-left corner; empty if `name` is not a point of the board.
    pub fn centre(&self, name: &str) -> Vec<f64> {
        match engine::Point::from_str(name.trim()) {
            Ok(p) if p.x < SIZE && p.y < SIZE => {
                let (x, y) = self.layout.centre(p);
                vec![x, y]
            }
            _ => Vec::new(),
        }
    }

    fn after(&mut self, reply: &Reply) -> Result<JsValue, JsValue> {
        self.redraw()?;
        to_js(reply)
    }

    fn marks(&self) -> Marks {
        let game = self.play.game();
        let board = game.board();
        let winning = if game.winner().is_some() {
            board
                .points()
                .filter(|&p| board.get(p).is_some() && board.is_winning_stone(board.index(p)))
                .collect()
        } else {
            Vec::new()
        };
        let forbidden =
            if self.show_forbidden && !game.is_over() && board.rule().has_forbidden(game.to_move())
            {
                board
                    .forbidden_points()
                    .into_iter()
                    .map(|(p, _)| p)
                    .collect()
            } else {
                Vec::new()
            };
        Marks {
            last: game.moves().last().copied(),
            winning,
            forbidden,
            ..Marks::default()
        }
    }

    fn redraw(&self) -> Result<(), JsValue> {
        let game = self.play.game();
        let to_move = if game.is_over() {
            ""
        } else {
            match game.to_move() {
                Stone::Black => "black",
                Stone::White => "white",
            }
        };
        self.canvas
            .set_attribute("data-rule", self.play.rule().name())?;
        self.canvas.set_attribute("data-to-move", to_move)?;
        self.canvas.set_attribute("data-moves", &self.moves())?;
        render::draw(
            &self.ctx,
            &self.layout,
            self.dpr,
            game.board(),
            &self.marks(),
        )
    }
}
