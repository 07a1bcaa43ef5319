//! The part of a board handle that knows the canvas: its size in device pixels, where the grid
//! sits on it, which point a tap lands on, and the animation of a stone appearing. Both board
//! handles ([`crate::boards`]) draw through one of these.

use std::cell::RefCell;

use engine::trainer::View;
use engine::Point;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement};

use crate::api::err;
use crate::layout::Layout;
use crate::render;

/// How long a new stone takes to appear, in milliseconds.
const GROW_MS: f64 = 140.0;

/// One canvas and what is needed to draw a board on it.
pub(crate) struct Surface {
    canvas: HtmlCanvasElement,
    ctx: CanvasRenderingContext2d,
    layout: Layout,
    dpr: f64,
    /// The page's root font size in CSS pixels (the coordinates grow with it).
    text: f64,
    /// A stone that is appearing, and when it started (set by the first frame).
    growing: Option<(Point, Option<f64>)>,
    /// The backdrop painted once for a layout, ratio and size (see [`render::backdrop`]), on
    /// a canvas of its own that each redraw copies; `None` until the first redraw, or where
    /// no canvas can be made (then each redraw paints it).
    backdrop: RefCell<Option<Backdrop>>,
}

/// A backdrop canvas and what it was painted for: the layout, the pixel ratio and the size in
/// device pixels.
struct Backdrop {
    layout: Layout,
    dpr: f64,
    size: (u32, u32),
    canvas: HtmlCanvasElement,
}

impl Surface {
    /// The surface of `canvas`.
    pub(crate) fn new(canvas: HtmlCanvasElement) -> Result<Surface, JsValue> {
        let ctx = canvas
            .get_context("2d")?
            .ok_or_else(|| err("this browser cannot draw on a canvas"))?
            .dyn_into::<CanvasRenderingContext2d>()?;
        Ok(Surface {
            canvas,
            ctx,
            layout: Layout::new(15, 0.0, 0.0, 16.0),
            dpr: 1.0,
            text: 16.0,
            growing: None,
            backdrop: RefCell::new(None),
        })
    }

    /// Sizes the backing store to the canvas's CSS size times `dpr` for a page whose root font
    /// size is `text` CSS pixels (the last ones given when `None`), and draws `view`.
    pub(crate) fn fit(
        &mut self,
        dpr: Option<f64>,
        text: Option<f64>,
        view: &View,
    ) -> Result<(), JsValue> {
        let dpr = match dpr {
            Some(d) if d.is_finite() && d > 0.0 => d.min(4.0),
            Some(_) => 1.0,
            None => self.dpr,
        };
        let rect = self.canvas.get_bounding_client_rect();
        self.dpr = dpr;
        if let Some(t) = text.filter(|t| t.is_finite() && *t > 0.0) {
            self.text = t;
        }
        self.layout = Layout::new(view.size, rect.width(), rect.height(), self.text);
        let w = (rect.width() * dpr).round().max(1.0) as u32;
        let h = (rect.height() * dpr).round().max(1.0) as u32;
        if self.canvas.width() != w {
            self.canvas.set_width(w);
        }
        if self.canvas.height() != h {
            self.canvas.set_height(h);
        }
        self.draw(view)
    }

    /// The point under viewport coordinates, if any.
    pub(crate) fn hit(&self, client_x: f64, client_y: f64) -> Option<Point> {
        let rect = self.canvas.get_bounding_client_rect();
        self.layout
            .hit(client_x - rect.left(), client_y - rect.top())
    }

    /// The centre of a point as `[x, y]` in CSS pixels from the canvas's top-left corner;
    /// empty if the point is not on a board of side `size`.
    pub(crate) fn centre(&self, p: Point, size: u8) -> Vec<f64> {
        if p.x < size && p.y < size {
            let (x, y) = self.layout.centre(p);
            vec![x, y]
        } else {
            Vec::new()
        }
    }

    /// Starts the animation of a stone appearing on `p` (the next frame starts its clock).
    pub(crate) fn grow(&mut self, p: Option<Point>) {
        if let Some(p) = p {
            self.growing = Some((p, None));
        }
    }

    /// Stops any animation.
    pub(crate) fn still(&mut self) {
        self.growing = None;
    }

    /// Advances the animation to `now` (milliseconds, as from `performance.now()`) and draws
    /// `view`; returns whether more frames are wanted.
    pub(crate) fn frame(&mut self, now: f64, view: &View) -> Result<bool, JsValue> {
        let Some((p, start)) = self.growing else {
            return Ok(false);
        };
        let start = start.unwrap_or(now);
        let t = ((now - start) / GROW_MS).clamp(0.0, 1.0);
        self.growing = (t < 1.0).then_some((p, Some(start)));
        self.paint(view, Some((p, t)))?;
        Ok(self.growing.is_some())
    }

    /// Draws `view`, a growing stone at its start.
    pub(crate) fn draw(&self, view: &View) -> Result<(), JsValue> {
        self.paint(view, self.growing.map(|(p, _)| (p, 0.0)))
    }

    fn paint(&self, view: &View, growing: Option<(Point, f64)>) -> Result<(), JsValue> {
        let l = self.layout;
        for (name, value) in [("data-step", l.step), ("data-x0", l.x0), ("data-y0", l.y0)] {
            self.canvas.set_attribute(name, &format!("{value:.3}"))?;
        }
        self.canvas
            .set_attribute("data-size", &view.size.to_string())?;
        let (w, h) = (self.canvas.width(), self.canvas.height());
        let mut cache = self.backdrop.borrow_mut();
        let fresh = cache
            .as_ref()
            .is_some_and(|b| b.layout == self.layout && b.dpr == self.dpr && b.size == (w, h));
        if !fresh {
            *cache = self.paint_backdrop(w, h).ok().map(|canvas| Backdrop {
                layout: self.layout,
                dpr: self.dpr,
                size: (w, h),
                canvas,
            });
        }
        let painted = cache.as_ref().map(|b| &b.canvas);
        render::draw(&self.ctx, &self.layout, self.dpr, view, growing, painted)
    }

    /// A canvas of `w` by `h` device pixels with the backdrop of the current layout on it.
    fn paint_backdrop(&self, w: u32, h: u32) -> Result<HtmlCanvasElement, JsValue> {
        let canvas = self
            .canvas
            .owner_document()
            .ok_or_else(|| err("no document"))?
            .create_element("canvas")?
            .dyn_into::<HtmlCanvasElement>()?;
        canvas.set_width(w);
        canvas.set_height(h);
        let ctx = canvas
            .get_context("2d")?
            .ok_or_else(|| err("no 2d context"))?
            .dyn_into::<CanvasRenderingContext2d>()?;
        render::backdrop(&ctx, &self.layout, self.dpr)?;
        Ok(canvas)
    }
}
