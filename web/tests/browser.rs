//! The bindings and the renderer in a real browser (headless Chromium through
//! wasm-bindgen-test-runner). Natively these compile to no tests.

use fivefold_web::play::{Kind, Reply};
use fivefold_web::render::{BOARD, STONE};
use fivefold_web::Session;
use wasm_bindgen::{JsCast, JsValue};
use wasm_bindgen_test::*;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement};

wasm_bindgen_test_configure!(run_in_browser);

fn canvas(css_width: u32, css_height: u32) -> HtmlCanvasElement {
    let document = web_sys::window().unwrap().document().unwrap();
    let canvas: HtmlCanvasElement = document
        .create_element("canvas")
        .unwrap()
        .dyn_into()
        .unwrap();
    canvas
        .set_attribute(
            "style",
            &format!("display:block;width:{css_width}px;height:{css_height}px"),
        )
        .unwrap();
    document.body().unwrap().append_child(&canvas).unwrap();
    canvas
}

fn reply(v: Result<JsValue, JsValue>) -> Reply {
    serde_wasm_bindgen::from_value(v.expect("the call failed")).expect("not a reply")
}

fn number(canvas: &HtmlCanvasElement, name: &str) -> f64 {
    canvas
        .get_attribute(name)
        .unwrap_or_else(|| panic!("no {name}"))
        .parse()
        .unwrap()
}

fn rgb(canvas: &HtmlCanvasElement, x: f64, y: f64) -> [u8; 3] {
    let ctx: CanvasRenderingContext2d = canvas
        .get_context("2d")
        .unwrap()
        .unwrap()
        .dyn_into()
        .unwrap();
    let data = ctx
        .get_image_data(x.floor(), y.floor(), 1.0, 1.0)
        .unwrap()
        .data();
    [data[0], data[1], data[2]]
}

fn hex(colour: &str) -> [u8; 3] {
    let v = u32::from_str_radix(colour.trim_start_matches('#'), 16).unwrap();
    [(v >> 16) as u8, (v >> 8) as u8, v as u8]
}

/// The colour inside the stone at (`col`, `row`), off the grid lines and clear of any marker,
/// in device pixels at ratio `dpr`.
fn inside(canvas: &HtmlCanvasElement, dpr: f64, col: f64, row: f64) -> [u8; 3] {
    let step = number(canvas, "data-step");
    let x = number(canvas, "data-x0") + (col + 0.3) * step;
    let y = number(canvas, "data-y0") - (row - 0.2) * step;
    rgb(canvas, x * dpr, y * dpr)
}

fn brightness(c: [u8; 3]) -> u32 {
    (u32::from(c[0]) + u32::from(c[1]) + u32::from(c[2])) / 3
}

#[wasm_bindgen_test]
fn refuses_a_forbidden_renju_point() {
    let c = canvas(320, 320);
    let mut s = Session::new(c.clone(), "renju").unwrap();
    s.fit(1.0).unwrap();
    for m in ["i8", "a1", "j8", "a3", "h9", "a5", "h10", "a7"] {
        assert_eq!(reply(s.play(m)).kind, Kind::Placed, "{m}");
    }
    let r = reply(s.play("h8"));
    assert_eq!(r.kind, Kind::Refused);
    assert_eq!(
        r.say,
        vec!["Not played: h8 is forbidden for black: it makes a double three."]
    );
    assert_eq!(s.stone_at("h8"), "");
    assert_eq!(s.moves(), "i8 a1 j8 a3 h9 a5 h10 a7");
    assert_eq!(c.get_attribute("data-moves").unwrap(), s.moves());
    assert_eq!(c.get_attribute("data-to-move").unwrap(), "black");
    // White has no forbidden points: after a black move elsewhere white may take h8.
    assert_eq!(reply(s.play("o15")).kind, Kind::Placed);
    assert_eq!(reply(s.play("h8")).kind, Kind::Placed);
    assert_eq!(s.stone_at("h8"), "white");
    // An unknown rule is refused, and the game goes on.
    assert_eq!(reply(s.new_game("chess")).kind, Kind::Refused);
    assert_eq!(c.get_attribute("data-rule").unwrap(), "renju");
    assert!(Session::new(c.clone(), "chess").is_err());
    c.remove();
}

#[wasm_bindgen_test]
fn reports_a_win_and_then_refuses_moves() {
    let c = canvas(320, 320);
    let mut s = Session::new(c.clone(), "freestyle").unwrap();
    s.fit(1.0).unwrap();
    for m in ["h8", "a1", "i8", "a2", "j8", "a3", "k8", "a4"] {
        assert_eq!(reply(s.play(m)).kind, Kind::Placed, "{m}");
    }
    let r = reply(s.play("l8"));
    assert_eq!(r.kind, Kind::Won);
    assert_eq!(r.say, vec!["Black l8", "Black wins with five in a row."]);
    assert_eq!(r.status, "Freestyle. Black has won.");
    assert_eq!(s.status(), r.status);
    assert_eq!(c.get_attribute("data-to-move").unwrap(), "");
    assert_eq!(reply(s.play("m8")).kind, Kind::Refused);
    let r = reply(s.undo());
    assert_eq!(r.kind, Kind::Undone);
    assert_eq!(r.say, vec!["Took back Black l8."]);
    assert_eq!(s.stone_at("l8"), "");
    let r = reply(s.new_game("standard"));
    assert_eq!(r.kind, Kind::New);
    assert_eq!(s.moves(), "");
    assert_eq!(c.get_attribute("data-rule").unwrap(), "standard");
    c.remove();
}

#[wasm_bindgen_test]
fn backing_store_is_css_size_times_the_pixel_ratio() {
    let c = canvas(300, 300);
    let mut s = Session::new(c.clone(), "renju").unwrap();
    for (dpr, want) in [(1.0, 300), (2.0, 600), (1.5, 450), (3.0, 900)] {
        s.fit(dpr).unwrap();
        assert_eq!((c.width(), c.height()), (want, want), "at ratio {dpr}");
    }
    c.set_attribute("style", "display:block;width:420px;height:260px")
        .unwrap();
    s.fit(2.0).unwrap();
    assert_eq!((c.width(), c.height()), (840, 520));
    assert_eq!(number(&c, "data-size"), 15.0);
    // The grid fits the short side: 14 steps plus the margins.
    let step = number(&c, "data-step");
    assert!(step > 10.0 && step < 260.0 / 14.0, "step {step}");
    let centre = s.centre("h8");
    assert_eq!(centre.len(), 2);
    assert!((centre[0] - (number(&c, "data-x0") + 7.0 * step)).abs() < 0.01);
    assert!((centre[1] - (number(&c, "data-y0") - 7.0 * step)).abs() < 0.01);
    assert!(s.centre("p16").is_empty());
    c.remove();
}

#[wasm_bindgen_test]
fn stones_change_the_pixels_at_their_points() {
    let dpr = 2.0;
    let c = canvas(360, 360);
    let mut s = Session::new(c.clone(), "standard").unwrap();
    s.fit(dpr).unwrap();
    let board = hex(BOARD);
    assert_eq!(inside(&c, dpr, 7.0, 7.0), board);
    assert_eq!(inside(&c, dpr, 8.0, 8.0), board);
    reply(s.play("h8"));
    let black = inside(&c, dpr, 7.0, 7.0);
    assert!(brightness(black) < 40, "black stone at h8 is {black:?}");
    assert_eq!(inside(&c, dpr, 8.0, 8.0), board);
    reply(s.play("i9"));
    let white = inside(&c, dpr, 8.0, 8.0);
    assert!(brightness(white) > 230, "white stone at i9 is {white:?}");
    // A tap on a point's centre (viewport coordinates) plays there.
    let rect = c.get_bounding_client_rect();
    let at = s.centre("c3");
    let r = reply(s.tap(rect.left() + at[0] + 3.0, rect.top() + at[1] - 2.0));
    assert_eq!(r.say, vec!["Black c3"]);
    assert!(brightness(inside(&c, dpr, 2.0, 2.0)) < 40);
    // A tap outside the grid does nothing.
    assert!(s
        .tap(rect.left() + 1.0, rect.top() + 1.0)
        .unwrap()
        .is_null());
    // Undo clears the point again.
    reply(s.undo());
    assert_eq!(inside(&c, dpr, 2.0, 2.0), board);
    // The stone fills its circle: a point just inside the radius is dark, one outside is not.
    let step = number(&c, "data-step");
    let (x, y) = (
        number(&c, "data-x0") + 7.0 * step,
        number(&c, "data-y0") - 7.0 * step,
    );
    let y_off = (y - 0.1 * step) * dpr;
    assert!(brightness(rgb(&c, (x + (STONE - 0.06) * step) * dpr, y_off)) < 40);
    assert_eq!(rgb(&c, (x + (STONE + 0.06) * step) * dpr, y_off), board);
    c.remove();
}

#[wasm_bindgen_test]
fn coordinates_are_drawn_on_the_edges() {
    let dpr = 2.0;
    let c = canvas(400, 400);
    let mut s = Session::new(c.clone(), "freestyle").unwrap();
    s.fit(dpr).unwrap();
    let step = number(&c, "data-step");
    let (x0, y0) = (number(&c, "data-x0"), number(&c, "data-y0"));
    let ink_in = |cx: f64, cy: f64| {
        let half = 0.3 * step;
        let mut dark = 0;
        let mut y = cy - half;
        while y < cy + half {
            let mut x = cx - half;
            while x < cx + half {
                if brightness(rgb(&c, x * dpr, y * dpr)) < 90 {
                    dark += 1;
                }
                x += 1.0;
            }
            y += 1.0;
        }
        dark
    };
    // The letter under column a, and the number left of row 1.
    assert!(ink_in(x0, y0 + 0.78 * step) > 3, "no letter under a1");
    assert!(ink_in(x0 - 0.75 * step, y0) > 3, "no number left of a1");
    // Between two letters there is no ink.
    assert!(ink_in(x0 + 0.5 * step, y0 + 0.78 * step) < 4);
    c.remove();
}

#[wasm_bindgen_test]
fn coordinates_keep_clear_of_the_canvas_edges() {
    for (css, dpr) in [(240u32, 2.0), (346, 2.0), (300, 3.0), (330, 1.0)] {
        let c = canvas(css, css);
        let mut s = Session::new(c.clone(), "freestyle").unwrap();
        s.fit(dpr).unwrap();
        let side = c.width();
        let ctx: CanvasRenderingContext2d =
            c.get_context("2d").unwrap().unwrap().dyn_into().unwrap();
        let side_f = f64::from(side);
        let data = ctx.get_image_data(0.0, 0.0, side_f, side_f).unwrap().data();
        // The box around all the ink (frame, grid, coordinates).
        let (mut left, mut top, mut right, mut bottom) = (side, side, 0, 0);
        for y in 0..side {
            for x in 0..side {
                let i = 4 * (y * side + x) as usize;
                if brightness([data[i], data[i + 1], data[i + 2]]) < 120 {
                    left = left.min(x);
                    right = right.max(x);
                    top = top.min(y);
                    bottom = bottom.max(y);
                }
            }
        }
        let margin = (3.0 * dpr) as u32;
        let at = format!("{css}px at ratio {dpr}: ink box {left},{top} to {right},{bottom}");
        assert!(left >= margin && top >= margin, "{at}");
        assert!(right + margin < side && bottom + margin < side, "{at}");
        c.remove();
    }
}
