//! Drawing the board on a 2D canvas.
//!
//! Everything is drawn in device pixels: the caller sizes the backing store to the CSS size
//! times the device pixel ratio, and grid lines are snapped to whole device pixels so that they
//! stay sharp at any ratio.
//!
//! The look is Fivefold's own: a pale sea-glass board with deep green-black ink. Markers differ
//! by shape as well as by colour, so that they read in sunlight and for colour-blind players:
//! small squares for the reference points, a diamond for the last move, a ring on each stone of
//! a winning line, and a cross on black's forbidden points.

use engine::trainer::View;
use engine::{Point, Stone};
use wasm_bindgen::JsValue;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement};

use crate::layout::Layout;

/// The board surface.
pub const BOARD: &str = "#a9c9bf";
/// Grid lines, the frame and the coordinates.
pub const INK: &str = "#14302a";
/// Black stones.
pub const BLACK: &str = "#111312";
/// White stones.
pub const WHITE: &str = "#fbfbf6";
/// Crosses on forbidden points.
pub const FORBIDDEN: &str = "#7d1235";
/// Hints: the dashed area and the target rings.
pub const HINT: &str = "#9a4a00";
/// The keyboard cursor.
pub const CURSOR: &str = "#1d4fa3";

/// Stone radius, in grid steps.
pub const STONE: f64 = 0.46;

/// The reference points of a board of side `size`.
pub fn star_points(size: u8) -> Vec<Point> {
    if size < 9 {
        return Vec::new();
    }
    let (lo, hi) = if size >= 13 {
        (3, size - 4)
    } else {
        (2, size - 3)
    };
    let mut out = vec![
        Point::new(lo, lo),
        Point::new(hi, lo),
        Point::new(lo, hi),
        Point::new(hi, hi),
    ];
    if size % 2 == 1 {
        out.push(Point::new(size / 2, size / 2));
    }
    out
}

/// A device-pixel position for a line of width `lw`, on a pixel boundary or a pixel centre.
fn snap(v: f64, lw: f64) -> f64 {
    if (lw as i64) % 2 == 1 {
        v.floor() + 0.5
    } else {
        v.round()
    }
}

struct Pen<'a> {
    ctx: &'a CanvasRenderingContext2d,
    layout: &'a Layout,
    dpr: f64,
    /// The grid line width in device pixels.
    lw: f64,
}

impl<'a> Pen<'a> {
    /// A pen for this layout, or `None` when the grid is too small to draw on (under four
    /// device pixels a step: only the board's colour is painted then).
    fn new(ctx: &'a CanvasRenderingContext2d, layout: &'a Layout, dpr: f64) -> Option<Pen<'a>> {
        (layout.step * dpr >= 4.0).then(|| Pen {
            ctx,
            layout,
            dpr,
            lw: dpr.round().max(1.0),
        })
    }

    fn step(&self) -> f64 {
        self.layout.step * self.dpr
    }

    fn at(&self, p: Point) -> (f64, f64) {
        let (x, y) = self.layout.centre(p);
        (snap(x * self.dpr, self.lw), snap(y * self.dpr, self.lw))
    }

    fn disc(&self, x: f64, y: f64, r: f64, fill: &str) -> Result<(), JsValue> {
        self.ctx.begin_path();
        self.ctx.arc(x, y, r, 0.0, std::f64::consts::TAU)?;
        self.ctx.set_fill_style_str(fill);
        self.ctx.fill();
        Ok(())
    }

    fn grid(&self) {
        let n = self.layout.size;
        let ctx = self.ctx;
        ctx.set_stroke_style_str(INK);
        let first = self.at(Point::new(0, n - 1));
        let last = self.at(Point::new(n - 1, 0));
        ctx.set_line_width(self.lw);
        ctx.begin_path();
        for i in 0..n {
            let (x, _) = self.at(Point::new(i, 0));
            ctx.move_to(x, first.1);
            ctx.line_to(x, last.1);
            let (_, y) = self.at(Point::new(0, i));
            ctx.move_to(first.0, y);
            ctx.line_to(last.0, y);
        }
        ctx.stroke();
        // A heavier frame, drawn outside the outer lines so that it does not crowd the edge
        // points.
        let frame = self.lw * 2.0;
        let off = (self.lw + frame) / 2.0;
        ctx.set_line_width(frame);
        ctx.stroke_rect(
            first.0 - off,
            first.1 - off,
            last.0 - first.0 + 2.0 * off,
            last.1 - first.1 + 2.0 * off,
        );
        ctx.set_fill_style_str(INK);
        let half = (0.075 * self.step()).max(self.lw);
        for p in star_points(n) {
            let (x, y) = self.at(p);
            ctx.fill_rect(x - half, y - half, 2.0 * half, 2.0 * half);
        }
    }

    fn coordinates(&self) -> Result<(), JsValue> {
        let n = self.layout.size;
        let ctx = self.ctx;
        // The layout sizes the font (it follows the page's text size) and the margins for it.
        let px = self.layout.label * self.dpr;
        ctx.set_font(&format!(
            "600 {px:.1}px system-ui, 'Segoe UI', Roboto, sans-serif"
        ));
        ctx.set_fill_style_str(INK);
        ctx.set_text_baseline("middle");
        ctx.set_text_align("center");
        let below = self.at(Point::new(0, 0)).1 + self.layout.letters * self.dpr;
        for i in 0..n {
            let (x, _) = self.at(Point::new(i, 0));
            let letter = char::from(b'a' + i).to_string();
            ctx.fill_text(&letter, x, below)?;
        }
        ctx.set_text_align("right");
        let left = self.at(Point::new(0, 0)).0 - self.layout.numbers * self.dpr;
        for i in 0..n {
            let (_, y) = self.at(Point::new(0, i));
            ctx.fill_text(&(u32::from(i) + 1).to_string(), left, y)?;
        }
        Ok(())
    }

    fn cross(&self, p: Point) {
        let (x, y) = self.at(p);
        let a = 0.16 * self.step();
        let ctx = self.ctx;
        ctx.set_stroke_style_str(FORBIDDEN);
        ctx.set_line_width((0.075 * self.step()).max(1.5 * self.lw));
        ctx.begin_path();
        ctx.move_to(x - a, y - a);
        ctx.line_to(x + a, y + a);
        ctx.move_to(x - a, y + a);
        ctx.line_to(x + a, y - a);
        ctx.stroke();
    }

    fn stone(&self, p: Point, c: Stone) -> Result<(), JsValue> {
        self.stone_scaled(p, c, 1.0)
    }

    fn stone_scaled(&self, p: Point, c: Stone, scale: f64) -> Result<(), JsValue> {
        let (x, y) = self.at(p);
        let r = STONE * self.step() * scale;
        match c {
            Stone::Black => self.disc(x, y, r, BLACK),
            Stone::White => {
                self.disc(x, y, r, WHITE)?;
                self.ctx.set_stroke_style_str(INK);
                self.ctx.set_line_width(self.lw.max(0.06 * self.step()));
                self.ctx.stroke();
                Ok(())
            }
        }
    }

    /// The colour that stands out on a stone of colour `c`.
    fn on(c: Stone) -> &'static str {
        match c {
            Stone::Black => WHITE,
            Stone::White => BLACK,
        }
    }

    fn ring(&self, p: Point, c: Stone) -> Result<(), JsValue> {
        let (x, y) = self.at(p);
        let ctx = self.ctx;
        ctx.begin_path();
        ctx.arc(x, y, 0.3 * self.step(), 0.0, std::f64::consts::TAU)?;
        ctx.set_stroke_style_str(Self::on(c));
        ctx.set_line_width((0.06 * self.step()).max(self.lw));
        ctx.stroke();
        Ok(())
    }

    fn diamond(&self, p: Point, c: Stone) {
        let (x, y) = self.at(p);
        let a = 0.17 * self.step();
        let ctx = self.ctx;
        ctx.begin_path();
        ctx.move_to(x, y - a);
        ctx.line_to(x + a, y);
        ctx.line_to(x, y + a);
        ctx.line_to(x - a, y);
        ctx.close_path();
        ctx.set_fill_style_str(Self::on(c));
        ctx.fill();
    }
}

/// Draws a board's [`View`] on a canvas whose backing store is `layout`'s CSS size times
/// `dpr`; `growing` is a stone still appearing, and how far (0 to 1). Every marker of the
/// view's [`engine::trainer::Marks`] has its own shape, so none depends on colour alone: a
/// diamond for the last move, rings on a winning line, a cross on a forbidden point, a dashed
/// square for a hint's area, a double ring for a hinted move, corner brackets for the keyboard
/// cursor, a hollow square on a refuted move, and a half-clear stone for a preview.
/// Paints what stays the same from one move to the next on a board of this layout: the
/// board's colour, the grid with its star points, and the coordinates. [`draw`] copies it from
/// a canvas it was painted on once (text is the dearest thing a canvas draws: in headless
/// Chromium thirty labels a redraw cost up to a second now and then, web/tools/measure.mjs).
pub fn backdrop(ctx: &CanvasRenderingContext2d, layout: &Layout, dpr: f64) -> Result<(), JsValue> {
    ctx.set_transform(1.0, 0.0, 0.0, 1.0, 0.0, 0.0)?;
    ctx.set_fill_style_str(BOARD);
    ctx.fill_rect(
        0.0,
        0.0,
        (layout.width * dpr).round(),
        (layout.height * dpr).round(),
    );
    match Pen::new(ctx, layout, dpr) {
        Some(pen) => {
            pen.grid();
            pen.coordinates()
        }
        None => Ok(()),
    }
}

/// Draws the board: the backdrop (copied from `backdrop` when given, a canvas of the same size
/// that [`backdrop`] painted for this layout; else painted here), then the stones and marks.
pub fn draw(
    ctx: &CanvasRenderingContext2d,
    layout: &Layout,
    dpr: f64,
    view: &View,
    growing: Option<(Point, f64)>,
    painted: Option<&HtmlCanvasElement>,
) -> Result<(), JsValue> {
    let stones = &view.stones;
    let marks = &view.marks;
    match painted {
        Some(b) => {
            ctx.set_transform(1.0, 0.0, 0.0, 1.0, 0.0, 0.0)?;
            ctx.draw_image_with_html_canvas_element(b, 0.0, 0.0)?;
        }
        None => backdrop(ctx, layout, dpr)?,
    }
    let Some(pen) = Pen::new(ctx, layout, dpr) else {
        return Ok(());
    };
    if let Some((a, b)) = marks.hint_area {
        pen.area(a, b);
    }
    for &p in &marks.forbidden {
        pen.cross(p);
    }
    let colour_at = |p: Point| stones.iter().find(|s| s.0 == p).map(|s| s.1);
    for &(p, c) in stones {
        match growing {
            Some((g, f)) if g == p => pen.stone_scaled(p, c, 0.55 + 0.45 * f.clamp(0.0, 1.0))?,
            _ => pen.stone(p, c)?,
        }
    }
    if let Some((p, c)) = marks.ghost {
        if colour_at(p).is_none() {
            ctx.set_global_alpha(0.45);
            pen.stone(p, c)?;
            ctx.set_global_alpha(1.0);
        }
    }
    for &p in &marks.winning {
        if let Some(c) = colour_at(p) {
            pen.ring(p, c)?;
        }
    }
    for &(p, n) in &marks.numbers {
        if let Some(c) = colour_at(p) {
            pen.number(p, c, n)?;
        }
    }
    if let Some(p) = marks.last {
        if let Some(c) = colour_at(p) {
            let numbered = marks.numbers.iter().any(|x| x.0 == p);
            if !marks.winning.contains(&p) && !numbered {
                pen.diamond(p, c);
            }
        }
    }
    if let Some(p) = marks.refuted {
        if let Some(c) = colour_at(p) {
            pen.square(p, c);
        }
    }
    if let Some(p) = marks.hint_move {
        pen.target(p)?;
    }
    if let Some(p) = marks.cursor {
        pen.brackets(p);
    }
    Ok(())
}

impl Pen<'_> {
    /// A dashed square around a block of points.
    fn area(&self, a: Point, b: Point) {
        let (x0, y0) = self.at(Point::new(a.x.min(b.x), a.y.max(b.y)));
        let (x1, y1) = self.at(Point::new(a.x.max(b.x), a.y.min(b.y)));
        let m = 0.45 * self.step();
        let ctx = self.ctx;
        ctx.set_global_alpha(0.16);
        ctx.set_fill_style_str(HINT);
        ctx.fill_rect(x0 - m, y0 - m, x1 - x0 + 2.0 * m, y1 - y0 + 2.0 * m);
        ctx.set_global_alpha(1.0);
        ctx.set_stroke_style_str(HINT);
        ctx.set_line_width((0.06 * self.step()).max(1.5 * self.lw));
        let dash = js_sys::Array::of2(&(0.25 * self.step()).into(), &(0.15 * self.step()).into());
        let _ = ctx.set_line_dash(&dash);
        ctx.stroke_rect(x0 - m, y0 - m, x1 - x0 + 2.0 * m, y1 - y0 + 2.0 * m);
        let _ = ctx.set_line_dash(&js_sys::Array::new());
    }

    /// Two rings around a hinted point.
    fn target(&self, p: Point) -> Result<(), JsValue> {
        let (x, y) = self.at(p);
        let ctx = self.ctx;
        ctx.set_stroke_style_str(HINT);
        ctx.set_line_width((0.07 * self.step()).max(1.5 * self.lw));
        for r in [0.5, 0.3] {
            ctx.begin_path();
            ctx.arc(x, y, r * self.step(), 0.0, std::f64::consts::TAU)?;
            ctx.stroke();
        }
        Ok(())
    }

    /// Corner brackets around the keyboard cursor.
    fn brackets(&self, p: Point) {
        let (x, y) = self.at(p);
        let a = 0.5 * self.step();
        let l = 0.22 * self.step();
        let ctx = self.ctx;
        ctx.set_stroke_style_str(CURSOR);
        ctx.set_line_width((0.08 * self.step()).max(2.0 * self.lw));
        ctx.begin_path();
        for (sx, sy) in [(-1.0, -1.0), (1.0, -1.0), (-1.0, 1.0), (1.0, 1.0)] {
            let (cx, cy) = (x + sx * a, y + sy * a);
            ctx.move_to(cx - sx * l, cy);
            ctx.line_to(cx, cy);
            ctx.line_to(cx, cy - sy * l);
        }
        ctx.stroke();
    }

    /// A hollow square on a refuted move.
    fn square(&self, p: Point, c: Stone) {
        let (x, y) = self.at(p);
        let a = 0.2 * self.step();
        let ctx = self.ctx;
        ctx.set_stroke_style_str(Self::on(c));
        ctx.set_line_width((0.07 * self.step()).max(self.lw));
        ctx.stroke_rect(x - a, y - a, 2.0 * a, 2.0 * a);
    }

    /// A move number on a stone.
    fn number(&self, p: Point, c: Stone, n: u16) -> Result<(), JsValue> {
        let (x, y) = self.at(p);
        let ctx = self.ctx;
        let px = if n >= 100 { 0.36 } else { 0.46 } * self.step();
        ctx.set_font(&format!(
            "700 {px:.1}px system-ui, 'Segoe UI', Roboto, sans-serif"
        ));
        ctx.set_fill_style_str(Self::on(c));
        ctx.set_text_align("center");
        ctx.set_text_baseline("middle");
        ctx.fill_text(&n.to_string(), x, y + 0.03 * self.step())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn star_points_of_common_sizes() {
        let names = |n| {
            star_points(n)
                .iter()
                .map(|p| p.to_string())
                .collect::<Vec<_>>()
                .join(" ")
        };
        assert_eq!(names(15), "d4 l4 d12 l12 h8");
        assert_eq!(names(19), "d4 p4 d16 p16 j10");
        assert_eq!(names(7), "");
    }

    #[test]
    fn snapping_keeps_lines_on_whole_pixels() {
        assert_eq!(snap(10.3, 1.0), 10.5);
        assert_eq!(snap(10.3, 2.0), 10.0);
        assert_eq!(snap(10.7, 3.0), 10.5);
    }
}
