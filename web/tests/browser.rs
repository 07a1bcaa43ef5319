//! The bindings and the renderer in a real browser (headless Chromium through
//! wasm-bindgen-test-runner): the two board handles (puzzles, study boards, hints, the two-tap
//! preview, the keyboard cursor) as the page drives them, with taps at pixel positions, the
//! plain functions of `api`, and what is drawn on the canvas at several device pixel ratios.
//! The controllers' decisions are tested natively in `engine::trainer`; these tests check that
//! the handles carry them across the boundary and onto the canvas. Natively these compile to
//! no tests.

use fivefold_web::api;
use fivefold_web::boards::{PuzzleBoardHandle as Trainer, StudyBoardHandle as Study};
use fivefold_web::render::{BOARD, FORBIDDEN, HINT, STONE};
use serde_json::Value;
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

fn json(v: Result<JsValue, JsValue>) -> Value {
    let v = v.unwrap_or_else(|e| panic!("the call failed: {e:?}"));
    serde_wasm_bindgen::from_value(v).expect("not JSON-like")
}

/// Plays `name` as the app does: the page grades within its allowance of a move, and a move it
/// leaves undecided is settled by the worker's `gradeMove` (called on this thread here) and
/// put on the board with `settle` (web/board.js).
fn play_as_app(t: &mut Trainer, puzzle: &Value, trusted: bool, name: &str) -> Value {
    let a = json(t.play(name));
    if a["kind"] != "undecided" {
        return a;
    }
    let moves = t.graded_moves().unwrap();
    let grade =
        fivefold_web::worker::grade_move(&puzzle.to_string(), trusted, &moves, name).unwrap();
    let settled = json(t.settle(name, &grade));
    if settled.is_null() {
        a
    } else {
        settled
    }
}

fn err_text(v: Result<impl std::fmt::Debug, JsValue>) -> String {
    v.expect_err("should fail").as_string().expect("a message")
}

fn strs(v: &Value) -> Vec<String> {
    v.as_array()
        .unwrap_or_else(|| panic!("not an array: {v}"))
        .iter()
        .map(|s| s.as_str().unwrap().to_string())
        .collect()
}

/// The first puzzle of a starter-library set, by title prefix, as set-file JSON text.
fn library_puzzle(title: &str, index: usize) -> Value {
    let sets: Value = serde_json::from_str(&api::library_sets()).unwrap();
    let set = sets
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["title"].as_str().unwrap().starts_with(title))
        .unwrap_or_else(|| panic!("no library set '{title}'"));
    set["puzzles"][index].clone()
}

/// A board of `css` x `css` pixels at `dpr` with the first puzzle of the club fours set loaded:
/// the canvas, the board handle and the puzzle's set-file entry.
fn club_puzzle(css: u32, dpr: f64) -> (HtmlCanvasElement, Trainer, Value) {
    let c = canvas(css, css);
    let mut t = Trainer::new(c.clone()).unwrap();
    t.fit(dpr, 16.0).unwrap();
    let p = library_puzzle("Win with fours: club", 0);
    json(t.load(&p.to_string(), false, JsValue::NULL));
    (c, t, p)
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

/// (col, row) of a point name like `h8`.
fn cr(name: &str) -> (f64, f64) {
    let col = f64::from(name.as_bytes()[0] - b'a');
    let row: f64 = name[1..].parse::<f64>().unwrap() - 1.0;
    (col, row)
}

/// The colour at (`dx`, `dy`) grid steps from a point's centre (dy up), in device pixels.
fn near(canvas: &HtmlCanvasElement, dpr: f64, name: &str, dx: f64, dy: f64) -> [u8; 3] {
    let step = number(canvas, "data-step");
    let (col, row) = cr(name);
    let x = number(canvas, "data-x0") + (col + dx) * step;
    let y = number(canvas, "data-y0") - (row + dy) * step;
    rgb(canvas, x * dpr, y * dpr)
}

/// Inside the stone at a point, off the grid lines and clear of any marker.
fn inside(canvas: &HtmlCanvasElement, dpr: f64, name: &str) -> [u8; 3] {
    near(canvas, dpr, name, 0.3, -0.2)
}

fn brightness(c: [u8; 3]) -> u32 {
    (u32::from(c[0]) + u32::from(c[1]) + u32::from(c[2])) / 3
}

/// Finishes the stone animation.
fn settle(t: &mut Trainer) {
    t.frame(0.0).unwrap();
    t.frame(10_000.0).unwrap();
}

/// Finishes the stone animation of a study board.
fn settle_study(t: &mut Study) {
    t.frame(0.0).unwrap();
    t.frame(10_000.0).unwrap();
}

/// A saved record for `PuzzleBoard.load`.
fn record(played: &[String], wrong: u32, hints: u8) -> JsValue {
    use serde::Serialize;
    let v = serde_json::json!({ "played": played, "wrong": wrong, "hints": hints });
    v.serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .unwrap()
}

/// A tap at a point's centre, in viewport coordinates.
fn tap(t: &mut Trainer, c: &HtmlCanvasElement, name: &str, touch: bool) -> Value {
    let rect = c.get_bounding_client_rect();
    let at = t.centre(name);
    assert_eq!(at.len(), 2, "{name} is on the board");
    json(t.tap(rect.left() + at[0] + 2.0, rect.top() + at[1] - 1.0, touch))
}

#[wasm_bindgen_test]
fn a_library_vcf_puzzle_is_graded_tap_by_tap_with_replies_revealed() {
    let dpr = 2.0;
    let (c, mut t, p) = club_puzzle(420, dpr);
    let s = json(t.status());
    assert_eq!(s["mode"], "puzzle");
    assert_eq!(s["goal"], "Black to play and win with fours");
    assert_eq!(s["state"], "playing");
    assert_eq!(s["attempt"], "untried");
    let line = strs(&p["solution"]["line"]);
    let board = hex(BOARD);
    for (i, m) in line.iter().enumerate() {
        if i % 2 == 1 {
            continue;
        }
        assert_eq!(inside(&c, dpr, m), board, "{m} is empty before");
        let a = tap(&mut t, &c, m, false);
        settle(&mut t);
        assert!(brightness(inside(&c, dpr, m)) < 40, "{m} is drawn black");
        if i + 1 == line.len() {
            assert_eq!(a["kind"], "solved");
            assert_eq!(a["say"][1], "Solved. Five in a row.");
            assert_eq!(a["pending"], 0);
        } else {
            assert_eq!(a["kind"], "accepted", "{m}: {a}");
            assert_eq!(a["say"][0], format!("Black {m}: correct."));
            assert_eq!(a["pending"], 1);
            // The reply is decided but not yet shown.
            assert_eq!(t.stone_at(&line[i + 1]), "");
            assert_eq!(inside(&c, dpr, &line[i + 1]), board);
            let r = json(t.reveal());
            assert_eq!(r["point"], line[i + 1].as_str());
            assert_eq!(r["colour"], "white");
            assert_eq!(r["more"], false);
            settle(&mut t);
            assert!(brightness(inside(&c, dpr, &line[i + 1])) > 230);
            assert!(t.reveal().unwrap().is_null());
        }
    }
    let s = json(t.status());
    assert_eq!(s["state"], "solved");
    assert_eq!(s["attempt"], "clean");
    assert_eq!(strs(&s["moves"]), line);
    let played: Vec<String> = line.iter().step_by(2).cloned().collect();
    assert_eq!(strs(&s["record"]["played"]), played);
    // Solved: more taps are refused.
    let a = tap(&mut t, &c, "a1", false);
    assert_eq!(a["kind"], "finished");
    // Restoring the player's moves on a new board gives the same position at once.
    let c2 = canvas(300, 300);
    let mut t2 = Trainer::new(c2.clone()).unwrap();
    t2.fit(1.0, 16.0).unwrap();
    let s2 = json(t2.load(&p.to_string(), false, record(&played, 0, 0)));
    assert_eq!(s2["state"], "solved", "{s2}");
    assert_eq!(strs(&s2["moves"]), line);
    assert_eq!(s2["pending"], 0);
    c.remove();
    c2.remove();
}

#[wasm_bindgen_test]
fn a_wrong_move_is_refuted_one_move_at_a_time_with_a_reason() {
    let c = canvas(360, 360);
    let mut t = Trainer::new(c.clone()).unwrap();
    t.fit(1.0, 16.0).unwrap();
    let p = library_puzzle("Win with fours: club", 1);
    // A move that forces nothing is told so: a1, far from every stone (its reply, if any, is
    // the opponent's own proved win, not an arbitrary block).
    let probe = canvas(300, 300);
    let mut t0 = Trainer::new(probe.clone()).unwrap();
    t0.fit(1.0, 16.0).unwrap();
    json(t0.load(&p.to_string(), false, JsValue::NULL));
    let quiet = play_as_app(&mut t0, &p, false, "a1");
    assert_eq!(quiet["kind"], "wrong");
    let why = quiet["reason"].as_str().unwrap();
    assert!(why.contains("not a four"), "{quiet}");
    if quiet["pending"] != 0 {
        assert!(
            why.contains(" win"),
            "a reply to a quiet move is the opponent's win: {quiet}"
        );
    }
    // A wrong four is refuted by the forced block: the first such point, found on the probe.
    let taken: Vec<String> = ["black", "white"]
        .iter()
        .flat_map(|k| strs(&p[*k]))
        .chain(strs(&p["solution"]["first_moves"]))
        .collect();
    let mut four = None;
    'search: for col in 'a'..='o' {
        for row in 1..=15 {
            let name = format!("{col}{row}");
            if taken.contains(&name) {
                continue;
            }
            json(t0.retry());
            let r = play_as_app(&mut t0, &p, false, &name);
            if r["kind"] == "wrong" && r["pending"].as_u64().unwrap_or(0) >= 1 {
                four = Some(name);
                break 'search;
            }
        }
    }
    probe.remove();
    let four = four.expect("a wrong four in the first club puzzle");
    json(t.load(&p.to_string(), false, JsValue::NULL));
    let a = play_as_app(&mut t, &p, false, &four);
    assert_eq!(a["kind"], "wrong");
    let reason = a["reason"].as_str().unwrap().to_string();
    assert!(reason.ends_with('.') && reason.len() > 20, "{reason}");
    let me = if p["to_move"] == "black" {
        "Black"
    } else {
        "White"
    };
    assert_eq!(a["say"][0], format!("{me} {four}: not right.").as_str());
    assert_eq!(a["say"][1], reason.as_str());
    let pending = a["pending"].as_u64().unwrap();
    assert!(pending >= 1);
    let mut shown = 0;
    loop {
        let r = t.reveal().unwrap();
        if r.is_null() {
            break;
        }
        let r: Value = serde_wasm_bindgen::from_value(r).unwrap();
        shown += 1;
        assert_eq!(r["more"], shown < pending, "{r}");
        assert!(r["say"].as_str().unwrap().ends_with('.'));
    }
    assert_eq!(shown, pending);
    let s = json(t.status());
    assert_eq!(s["state"], "failed");
    assert_eq!(s["attempt"], "failed");
    assert_eq!(strs(&s["record"]["played"]), vec![four.clone()]);
    assert_eq!(s["record"]["wrong"], 1);
    // Undo takes back the move and its refutation; a retry then solves it "with help".
    let s = json(t.undo());
    assert_eq!(s["state"], "playing");
    assert!(strs(&s["moves"]).is_empty());
    assert_eq!(s["attempt"], "trying");
    assert_eq!(
        s["record"]["attempt"], "failed",
        "the failure stays on the record"
    );
    c.remove();
}

#[wasm_bindgen_test]
fn the_three_hints_are_said_and_drawn() {
    let dpr = 2.0;
    let (c, mut t, p) = club_puzzle(400, dpr);
    let firsts = strs(&p["solution"]["first_moves"]);
    let data = |c: &HtmlCanvasElement| c.to_data_url().unwrap();
    let plain = data(&c);

    let h = json(t.hint());
    assert_eq!(h["step"], 1);
    assert!(h["say"].as_str().unwrap().contains("fours"), "{h}");
    assert_eq!(data(&c), plain, "the first hint is words only");

    let h = json(t.hint());
    assert_eq!(h["step"], 2);
    let say = h["say"].as_str().unwrap();
    let words: Vec<&str> = say
        .trim_start_matches("The key move is between ")
        .trim_end_matches('.')
        .split(" and ")
        .collect();
    assert_eq!(words.len(), 2, "{say}");
    let ((c0, r0), (c1, r1)) = (cr(words[0]), cr(words[1]));
    assert!(
        firsts.iter().any(|m| {
            let (x, y) = cr(m);
            (c0..=c1).contains(&x) && (r0..=r1).contains(&y)
        }),
        "a correct first move lies in the area"
    );
    // The area's dashed edge starts at its top-left corner, half a step outside the points.
    let corner = format!("{}{}", char::from(b'a' + c0 as u8), r1 as u32 + 1);
    // (A little way along the top edge: the first dash starts at the corner.)
    let edge = near(&c, dpr, &corner, -0.35, 0.45);
    let hint = hex(HINT);
    let close = |a: [u8; 3], b: [u8; 3]| a.iter().zip(b).all(|(x, y)| x.abs_diff(y) < 40);
    assert!(close(edge, hint), "edge {edge:?} vs {hint:?}");
    let with_area = data(&c);
    assert_ne!(with_area, plain);

    let h = json(t.hint());
    assert_eq!(h["step"], 3);
    let m = h["say"]
        .as_str()
        .unwrap()
        .trim_start_matches("The key move is ")
        .trim_end_matches('.')
        .to_string();
    assert!(firsts.contains(&m), "{m} in {firsts:?}");
    assert!(
        close(near(&c, dpr, &m, 0.5, 0.0), hint),
        "the target ring is drawn"
    );
    assert_eq!(json(t.status())["record"]["hints"], 3);
    let a = json(t.play(&m));
    assert_eq!(a["kind"], "accepted");
    // Hints count: solving now is "with help", and the hint marks are gone.
    assert_eq!(json(t.status())["attempt"], "trying");
    c.remove();
}

#[wasm_bindgen_test]
fn touch_taps_preview_a_ghost_stone_until_confirmed() {
    let dpr = 1.0;
    let (c, mut t, p) = club_puzzle(360, dpr);
    let m = p["solution"]["line"][0].as_str().unwrap().to_string();
    let board = hex(BOARD);
    let a = tap(&mut t, &c, &m, true);
    assert_eq!(a["kind"], "ghost");
    assert_eq!(a["point"], m.as_str());
    assert!(strs(&json(t.status())["moves"]).is_empty());
    let ghost = inside(&c, dpr, &m);
    assert_ne!(ghost, board, "a ghost is drawn");
    assert!(brightness(ghost) > 40, "but not as a full stone");
    let a = tap(&mut t, &c, &m, true);
    assert_eq!(a["kind"], "accepted");
    // A mouse click plays at once; so does a touch with the option off.
    json(t.retry());
    assert_eq!(tap(&mut t, &c, &m, false)["kind"], "accepted");
    json(t.retry());
    t.set_options(false, false, false).unwrap();
    assert_eq!(tap(&mut t, &c, &m, true)["kind"], "accepted");
    // A tap off the grid does nothing.
    let rect = c.get_bounding_client_rect();
    assert_eq!(
        json(t.tap(rect.left() + 1.0, rect.top() + 1.0, true))["kind"],
        "none"
    );
    c.remove();
}

#[wasm_bindgen_test]
fn the_keyboard_cursor_moves_and_places() {
    let c = canvas(300, 300);
    let mut t = Study::new(c.clone()).unwrap();
    t.fit(1.0, 16.0).unwrap();
    json(t.reset(15, "freestyle"));
    assert_eq!(
        json(t.place_at_cursor())["say"][0],
        "Move the cursor with the arrow keys first."
    );
    assert_eq!(
        t.move_cursor(1, 0).unwrap(),
        "h8",
        "the first key shows the cursor"
    );
    assert_eq!(t.move_cursor(1, 0).unwrap(), "i8");
    assert_eq!(t.move_cursor(0, 1).unwrap(), "i9");
    for _ in 0..20 {
        t.move_cursor(-1, -1).unwrap();
    }
    assert_eq!(
        t.move_cursor(0, 0).unwrap(),
        "a1",
        "the cursor stays on the board"
    );
    let a = json(t.place_at_cursor());
    assert_eq!(a["kind"], "placed");
    assert_eq!(a["say"][0], "Black a1.");
    assert_eq!(t.stone_at("a1"), "black");
    // A cursor left on s19 of a 19x19 board does not survive a change to 15x15 (it used to
    // point off the board, and Enter crashed the module).
    json(t.reset(19, "freestyle"));
    t.move_cursor(0, 0).unwrap();
    for _ in 0..20 {
        t.move_cursor(1, 1).unwrap();
    }
    assert_eq!(t.move_cursor(0, 0).unwrap(), "s19");
    json(t.reset(15, "freestyle"));
    assert_eq!(json(t.place_at_cursor())["kind"], "none");
    assert_eq!(
        t.move_cursor(0, 0).unwrap(),
        "h8",
        "the cursor starts again at the centre"
    );
    assert_eq!(json(t.play("s19"))["kind"], "illegal");
    c.remove();
}

#[wasm_bindgen_test]
fn study_board_edits_paste_and_lines() {
    let dpr = 2.0;
    let c = canvas(360, 360);
    let mut t = Study::new(c.clone()).unwrap();
    t.fit(dpr, 16.0).unwrap();
    json(t.reset(15, "renju"));
    assert_eq!(t.paste("i8 a1 j8 a3 h9 a5 h10 a7").unwrap(), 8);
    assert_eq!(json(t.status())["toMove"], "black");
    let a = json(t.play("h8"));
    assert_eq!(a["kind"], "refused");
    assert_eq!(
        a["say"][0],
        "Not played: h8 is forbidden for Black: it makes a double three."
    );
    // Forbidden points are marked when the option is on.
    let board = hex(BOARD);
    assert_eq!(near(&c, dpr, "h8", 0.16, 0.16), board);
    t.set_options(true, true, false).unwrap();
    let mark = near(&c, dpr, "h8", 0.1, 0.1);
    let f = hex(FORBIDDEN);
    assert!(
        mark.iter().zip(f).all(|(a, b)| a.abs_diff(b) < 50),
        "{mark:?}"
    );
    t.set_options(true, false, false).unwrap();
    // A bad paste names the token and changes nothing.
    let e = err_text(t.paste("h8 h9 zz"));
    assert!(e.contains("zz"), "{e}");
    assert_eq!(t.stone_at("i8"), "black");
    // Set-up tools and the side to move.
    t.set_tool("white").unwrap();
    assert_eq!(json(t.play("c3"))["kind"], "placed");
    assert_eq!(t.stone_at("c3"), "white");
    t.set_tool("erase").unwrap();
    json(t.play("c3"));
    assert_eq!(t.stone_at("c3"), "");
    assert!(t.set_tool("paint").is_err());
    json(t.set_to_move("white"));
    let pos = json(t.status());
    assert_eq!(pos["toMove"], "white");
    assert_eq!(pos["rule"], "renju");
    assert_eq!(strs(&pos["black"]).len(), 4);
    // A line is shown move by move, numbered, and hidden again.
    t.show_line(vec!["o15".into(), "n15".into()], "white")
        .unwrap();
    assert_eq!(t.stone_at("o15"), "");
    let st = json(t.step(1));
    assert_eq!(st["shown"], 1);
    assert_eq!(st["say"], "1. White o15");
    assert_eq!(t.stone_at("o15"), "white");
    let st = json(t.step(5));
    assert_eq!(st["shown"], 2);
    assert_eq!(t.stone_at("n15"), "black");
    json(t.step(-2));
    assert_eq!(t.stone_at("o15"), "");
    assert!(t.show_line(vec!["i8".into()], "white").is_err());
    // A saved position loads back.
    let c2 = canvas(200, 200);
    let mut t2 = Study::new(c2.clone()).unwrap();
    json(t2.load(
        15,
        "renju",
        strs(&pos["black"]),
        strs(&pos["white"]),
        "white",
    ));
    let pos2 = json(t2.status());
    assert_eq!(
        (&pos2["black"], &pos2["white"], &pos2["toMove"]),
        (&pos["black"], &pos["white"], &pos["toMove"])
    );
    assert!(t2
        .load(15, "renju", vec!["h8".into()], vec!["h8".into()], "white")
        .is_err());
    assert!(t
        .describe()
        .starts_with("Study board, renju rules, 15 by 15. White to move."));
    c.remove();
    c2.remove();
}

#[wasm_bindgen_test]
fn backing_store_is_css_size_times_the_pixel_ratio() {
    let c = canvas(300, 300);
    let mut t = Study::new(c.clone()).unwrap();
    json(t.reset(15, "freestyle"));
    for (dpr, want) in [(1.0, 300), (2.0, 600), (1.5, 450), (3.0, 900)] {
        t.fit(dpr, 16.0).unwrap();
        assert_eq!((c.width(), c.height()), (want, want), "at ratio {dpr}");
    }
    c.set_attribute("style", "display:block;width:420px;height:260px")
        .unwrap();
    t.fit(2.0, 16.0).unwrap();
    assert_eq!((c.width(), c.height()), (840, 520));
    assert_eq!(number(&c, "data-size"), 15.0);
    // The grid fits the short side: 14 steps plus the margins.
    let step = number(&c, "data-step");
    assert!(step > 10.0 && step < 260.0 / 14.0, "step {step}");
    let centre = t.centre("h8");
    assert!((centre[0] - (number(&c, "data-x0") + 7.0 * step)).abs() < 0.01);
    assert!((centre[1] - (number(&c, "data-y0") - 7.0 * step)).abs() < 0.01);
    assert!(t.centre("p16").is_empty());
    // A 19x19 board fits the same canvas with a smaller step.
    json(t.reset(19, "freestyle"));
    assert_eq!(number(&c, "data-size"), 19.0);
    assert!(number(&c, "data-step") < step);
    assert_eq!(t.centre("s19").len(), 2);
    c.remove();
}

#[wasm_bindgen_test]
fn stones_change_the_pixels_at_their_points_at_every_ratio() {
    for dpr in [1.0, 1.5, 2.0, 3.0] {
        let c = canvas(360, 360);
        let mut t = Study::new(c.clone()).unwrap();
        t.fit(dpr, 16.0).unwrap();
        json(t.reset(15, "standard"));
        let board = hex(BOARD);
        assert_eq!(inside(&c, dpr, "h8"), board);
        json(t.play("h8"));
        // While it appears the stone is smaller; once the animation ends it is whole.
        assert_eq!(
            inside(&c, dpr, "h8"),
            board,
            "the new stone starts small at {dpr}"
        );
        settle_study(&mut t);
        let black = inside(&c, dpr, "h8");
        assert!(
            brightness(black) < 40,
            "black stone at h8 is {black:?} at {dpr}"
        );
        json(t.play("i9"));
        settle_study(&mut t);
        let white = inside(&c, dpr, "i9");
        assert!(brightness(white) > 230, "white stone at i9 is {white:?}");
        assert_eq!(inside(&c, dpr, "j10"), board);
        // The stone fills its circle: just inside the radius is dark, just outside is not.
        let edge_in = near(&c, dpr, "h8", STONE - 0.06, 0.1);
        let edge_out = near(&c, dpr, "h8", STONE + 0.06, 0.1);
        assert!(brightness(edge_in) < 40, "{edge_in:?} at {dpr}");
        assert_eq!(edge_out, board, "at {dpr}");
        // Undo clears the point again.
        json(t.undo());
        assert_eq!(inside(&c, dpr, "i9"), board);
        c.remove();
    }
}

#[wasm_bindgen_test]
fn move_numbers_are_written_on_the_stones() {
    let dpr = 2.0;
    let (c, mut t, p) = club_puzzle(400, dpr);
    let m = p["solution"]["line"][0].as_str().unwrap().to_string();
    json(t.play(&m));
    settle(&mut t);
    let before = c.to_data_url().unwrap();
    t.set_options(true, false, true).unwrap();
    assert_ne!(c.to_data_url().unwrap(), before);
    // The number is written in white on the black stone's centre.
    assert!(brightness(near(&c, dpr, &m, 0.0, 0.0)) > 150);
    c.remove();
}

#[wasm_bindgen_test]
fn coordinates_are_drawn_on_the_edges() {
    let dpr = 2.0;
    let c = canvas(400, 400);
    let mut t = Trainer::new(c.clone()).unwrap();
    t.fit(dpr, 16.0).unwrap();
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
    assert!(ink_in(x0, y0 + 0.78 * step) > 3, "no letter under a1");
    assert!(ink_in(x0 - 0.75 * step, y0) > 3, "no number left of a1");
    assert!(ink_in(x0 + 0.5 * step, y0 + 0.78 * step) < 4);
    c.remove();
}

#[wasm_bindgen_test]
fn coordinates_keep_clear_of_the_canvas_edges() {
    for (css, dpr) in [(240u32, 2.0), (346, 2.0), (300, 3.0), (330, 1.0)] {
        let c = canvas(css, css);
        let mut t = Trainer::new(c.clone()).unwrap();
        t.fit(dpr, 16.0).unwrap();
        let side = c.width();
        let ctx: CanvasRenderingContext2d =
            c.get_context("2d").unwrap().unwrap().dyn_into().unwrap();
        let side_f = f64::from(side);
        let data = ctx.get_image_data(0.0, 0.0, side_f, side_f).unwrap().data();
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

#[wasm_bindgen_test]
fn sets_share_codes_and_result_codes_cross_the_boundary() {
    let sets: Value = serde_json::from_str(&api::library_sets()).unwrap();
    assert!(sets.as_array().unwrap().len() >= 14);
    let set = sets[0].to_string();
    let normal = api::parse_set(&set).unwrap();
    let e = err_text(api::parse_set(r#"{"format":"fivefold-set","version":1}"#));
    assert!(!e.is_empty());
    let mut bad: Value = sets[0].clone();
    bad["puzzles"][2]["black"][0] = "z99".into();
    let e = err_text(api::parse_set(&bad.to_string()));
    let id = sets[0]["puzzles"][2]["id"].as_str().unwrap();
    assert!(e.contains(id) && e.contains("z99"), "{e}");

    // A position that already has a five: still a valid set (saved data is read as it is),
    // but a set from outside with one is refused, naming the puzzle.
    assert_eq!(api::finished_puzzle(&normal).unwrap(), "");
    let mut over: Value = sets[0].clone();
    // Five in a row on the first column of a-o whose rows 1 to 5 are empty.
    let p1 = &over["puzzles"][1];
    let used: Vec<&Value> = [&p1["black"], &p1["white"], &p1["solution"]["line"]]
        .iter()
        .flat_map(|l| l.as_array().unwrap())
        .collect();
    let taken = |q: &str| used.iter().any(|x| *x == q);
    let five: Vec<String> = ('a'..='o')
        .map(|c| (1..=5).map(|r| format!("{c}{r}")).collect::<Vec<_>>())
        .find(|col| !col.iter().any(|q| taken(q)))
        .unwrap();
    for q in five {
        over["puzzles"][1]["black"]
            .as_array_mut()
            .unwrap()
            .push(q.into());
    }
    let over = api::parse_set(&over.to_string()).unwrap();
    let id = sets[0]["puzzles"][1]["id"].as_str().unwrap();
    let said = api::finished_puzzle(&over).unwrap();
    assert!(
        said.starts_with(&format!("puzzle 2 ({id}): the position already has a five")),
        "{said}"
    );

    let code = api::share_encode(&normal).unwrap();
    let back: Value = serde_json::from_str(&api::share_decode(&code).unwrap()).unwrap();
    let want: Value = serde_json::from_str(&normal).unwrap();
    assert_eq!(back["title"], want["title"]);
    assert_eq!(back["puzzles"], want["puzzles"]);
    let cut = &code[..code.len() - 5];
    assert!(err_text(api::share_decode(cut)).contains("ask for the link again"));
    assert_eq!(api::set_key(&normal).unwrap().len(), 8);
    assert_eq!(
        api::set_key(&normal).unwrap(),
        api::set_key(&set).unwrap(),
        "the key does not depend on formatting"
    );

    let n = sets[0]["puzzles"].as_array().unwrap().len();
    let outs: Vec<Value> = (0..n)
        .map(|i| {
            serde_json::json!({
                "attempt": (["clean", "helped", "failed", "untried"][i % 4]),
                "hints": (i % 4 == 1) as u8,
                "seconds": if i % 2 == 0 { Value::from(40.0) } else { Value::Null },
            })
        })
        .collect();
    let js = || {
        use serde::Serialize;
        outs.serialize(&serde_wasm_bindgen::Serializer::json_compatible())
            .unwrap()
    };
    let r1 = api::result_code(&normal, "Ines", js()).unwrap();
    let r2 = api::result_code(&normal, "Ines", js()).unwrap();
    assert_eq!(r1, r2);
    let long = "A name far longer than any result code can hold";
    assert!(api::result_code(&normal, long, js()).is_err());
    assert!(r1.chars().all(|ch| ch == '-' || ch.is_ascii_alphanumeric()));

    let themes: Value = serde_json::from_str(&api::themes()).unwrap();
    assert_eq!(themes.as_array().unwrap().len(), 6);
    assert_eq!(themes[1]["name"], "vcf");
    let band = api::drill_band("vcf", "freestyle", 1500.0).unwrap();
    assert!(band[0] < band[1] && band[1] - band[0] <= 400, "{band:?}");
    assert!(api::drill_band("forbidden-trap", "freestyle", 1500.0).is_err());

    let r: Value =
        serde_wasm_bindgen::from_value(api::rating_after(JsValue::NULL, 1500.0, true).unwrap())
            .unwrap();
    assert!(r["rating"].as_f64().unwrap() > 1500.0);
}

/// The same seed and options make the same puzzles here as natively: the fixture set in
/// tests/data was written by the native generator (tests/tests/library.rs checks it there).
#[wasm_bindgen_test]
fn generation_in_the_browser_matches_the_native_fixture() {
    let want: Value =
        serde_json::from_str(include_str!("../../tests/data/fixture_set.json")).unwrap();
    let options = serde_json::json!({
        "theme": "four-three",
        "rule": "renju",
        "size": 15,
        "ratingLo": 600,
        "ratingHi": 2600,
        "seed": 2027,
        "count": 3,
    });
    let options = js_sys::JSON::parse(&options.to_string()).unwrap();
    let got: Value =
        serde_json::from_str(&fivefold_web::worker::generate_set(options, None).unwrap()).unwrap();
    assert_eq!(got["puzzles"].as_array().map(Vec::len), Some(3));
    assert_eq!(got["puzzles"], want["puzzles"]);
    assert_eq!(
        got["created"].as_str().map(str::len),
        Some(10),
        "a YYYY-MM-DD date"
    );
}
