//! The worker's jobs (in the workshop module only, see `Cargo.toml`): puzzle generation for
//! Drill and Coach, the Study board's searches, and the proof of an answer key from outside.
//! Each runs off the page's thread, with progress reported through a JavaScript callback.

use engine::formats::setfile;
use engine::notation;
use engine::puzzle::generate::{self, Options};
use engine::puzzle::grade::Session;
use engine::puzzle::verify;
use engine::search::{Budget, Solver};
use engine::study::{study, StudyAnswer, StudySearch};
use engine::words;
use engine::{Point, Rule, Stone};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use crate::api::{err, with_solver};

#[derive(Serialize)]
#[serde(rename_all = "camelCase")]
struct ProvedJs {
    /// "ok" (the key holds), "corrected" (the key was wrong or incomplete: `puzzle` has the
    /// proved answers) or "unproved" (no answer could be proved).
    state: &'static str,
    /// The puzzle with the proved answers, as set-file puzzle JSON (for "corrected").
    puzzle: Option<serde_json::Value>,
    /// What was wrong, in words.
    problems: Vec<String>,
}

/// Proves a puzzle's answer key from scratch (in the worker, for a set from a file or a
/// link): `puzzleJson` is one set-file puzzle object; returns `{state, puzzle, problems}`.
#[wasm_bindgen(js_name = provePuzzle)]
pub fn prove_puzzle(puzzle_json: &str) -> Result<JsValue, JsValue> {
    let wrapped = format!(
        "{{\"format\":\"fivefold-set\",\"version\":1,\"title\":\"\",\"created\":\"2026-12-01\",\"puzzles\":[{puzzle_json}]}}"
    );
    let set = setfile::parse(&wrapped).map_err(err)?;
    let p = set.puzzles.first().ok_or_else(|| err("no puzzle"))?;
    let out = match with_solver(|s| verify::prove(s, p)) {
        Ok(proved) if proved.problems.is_empty() => ProvedJs {
            state: "ok",
            puzzle: None,
            problems: Vec::new(),
        },
        Ok(proved) => ProvedJs {
            state: "corrected",
            puzzle: Some(puzzle_value(proved.puzzle)?),
            problems: proved.problems,
        },
        Err(why) => ProvedJs {
            state: "unproved",
            puzzle: None,
            problems: vec![why.to_string()],
        },
    };
    crate::boards::to_js(&out)
}

/// A puzzle as the set file writes it, as a JSON value (one set-file puzzle object).
fn puzzle_value(puzzle: engine::puzzle::Puzzle) -> Result<serde_json::Value, JsValue> {
    let one = setfile::PuzzleSet {
        title: String::new(),
        created: "2026-12-01".into(),
        puzzles: vec![puzzle],
        generator: None,
    };
    let v: serde_json::Value = serde_json::from_str(&setfile::to_json(&one)).map_err(err)?;
    Ok(v["puzzles"][0].clone())
}

/// Settles a move the page could not within its frame's allowance (in the worker): the
/// puzzle as one set-file puzzle object, whether its key is trusted (as the page loaded it),
/// the moves since its start (`[[point, colour], ...]`, the page's `gradedMoves`) and the
/// player's move. Grades it as the page would, with the whole allowance of a move
/// (`grade::MOVE_NODES`), and returns the grade as JSON for the page's `settle`.
#[wasm_bindgen(js_name = gradeMove)]
pub fn grade_move(
    puzzle_json: &str,
    trusted: bool,
    moves_json: &str,
    mv: &str,
) -> Result<String, JsValue> {
    let puzzle = crate::boards::parse_puzzle(puzzle_json)?;
    let moves: Vec<(Point, Stone)> = serde_json::from_str(moves_json).map_err(err)?;
    let p: Point = mv.trim().parse().map_err(err)?;
    let mut session = Session::new(puzzle);
    session.trust_key(trusted);
    if !session.replay(&moves) {
        return Err(err("the moves do not fit the puzzle"));
    }
    let grade = with_solver(|s| session.play(s, p));
    serde_json::to_string(&grade).map_err(err)
}

#[derive(Deserialize)]
#[serde(rename_all = "camelCase")]
struct GenerateJs {
    theme: String,
    rule: String,
    #[serde(default = "fifteen")]
    size: u8,
    rating_lo: u32,
    rating_hi: u32,
    seed: u64,
    #[serde(default = "one")]
    count: usize,
    /// Deep lines: the fewest attacker moves before the winning one (0: any).
    #[serde(default)]
    min_moves: u16,
    /// Only puzzles with one correct first move.
    #[serde(default)]
    unique: bool,
}

fn fifteen() -> u8 {
    15
}

fn one() -> usize {
    1
}

/// Generates puzzles (for Drill and Coach, in the worker): options `{theme, rule, size,
/// ratingLo, ratingHi, seed, count, minMoves, unique}` (the last two optional); returns
/// set-file JSON. The same options give the same set here and natively. `progress`, if given,
/// is called after every self-play game with the puzzles kept and the games played so far.
/// When the games run out before enough puzzles are found, the error thrown is an `Error`
/// named `NotEnough` (so that Coach can tell a seed that gives nothing at a band from a
/// failure, and pass it over); any other problem is thrown as its message.
#[wasm_bindgen(js_name = generateSet)]
pub fn generate_set(
    options: JsValue,
    progress: Option<js_sys::Function>,
) -> Result<String, JsValue> {
    let options = generate_options(options)?;
    let theme = options.theme;
    let puzzles = generate::generate(&options, |p| {
        if let Some(f) = &progress {
            let _ = f.call2(
                &JsValue::NULL,
                &JsValue::from(p.kept as u32),
                &JsValue::from(p.games as f64),
            );
        }
    })
    .map_err(|e| match e {
        generate::GenerateError::NotEnough { .. } => not_enough(&e.to_string()),
        _ => err(e),
    })?;
    Ok(setfile::to_json(&setfile::PuzzleSet {
        title: format!("Drill: {}", words::theme(theme)),
        created: today(),
        puzzles,
        generator: None,
    }))
}

/// The error of a generation whose games ran out first: an `Error` named `NotEnough`.
fn not_enough(message: &str) -> JsValue {
    let e = js_sys::Error::new(message);
    e.set_name(NOT_ENOUGH);
    e.into()
}

/// The name of [`not_enough`]'s error (worker.js passes it on as the job error's `code`).
const NOT_ENOUGH: &str = "NotEnough";

/// The options of `generateSet` and `playGame`, checked.
fn generate_options(options: JsValue) -> Result<Options, JsValue> {
    let o: GenerateJs = serde_wasm_bindgen::from_value(options).map_err(err)?;
    let options = Options {
        theme: o.theme.parse().map_err(err)?,
        rule: o.rule.parse().map_err(err)?,
        size: o.size,
        count: o.count,
        rating: (o.rating_lo, o.rating_hi),
        seed: o.seed,
        min_moves: o.min_moves,
        unique: o.unique,
    };
    options.check().map_err(err)?;
    Ok(options)
}

thread_local! {
    /// The solver `playGame` plays its games with: the same settings as `generateSet`'s, so
    /// that a game gives the same puzzle in both (each game clears its tables first).
    static GAME_SOLVER: std::cell::RefCell<Option<Solver>> = const { std::cell::RefCell::new(None) };
}

/// Plays game `number` (counted from 0) of the generation `generateSet` would run with
/// `options` and count 1 (in a worker: Coach spreads one puzzle's games over its workers).
/// Returns `{puzzle, limit, exhausted}`: the puzzle that game gives, as a set-file puzzle
/// object, or null; the most games the generation plays; and what `generateSet` says when none
/// of them gives a puzzle. The first game, in number order, that gives a puzzle gives the
/// puzzle `generateSet` makes.
#[wasm_bindgen(js_name = playGame)]
pub fn play_game(options: JsValue, number: f64) -> Result<JsValue, JsValue> {
    let mut options = generate_options(options)?;
    options.count = 1;
    if !(number >= 0.0 && number.fract() == 0.0) {
        return Err(err("the game number is not a whole number"));
    }
    let found = GAME_SOLVER.with(|s| {
        let mut s = s.borrow_mut();
        let solver = s.get_or_insert_with(Solver::default);
        generate::play_game(&options, number as u64, solver)
    });
    let puzzle = match found {
        Some(f) => Some(puzzle_value(f.puzzle().clone())?),
        None => None,
    };
    let limit = generate::game_limit(&options);
    let exhausted = generate::GenerateError::NotEnough {
        found: 0,
        wanted: 1,
        games: limit,
    }
    .to_string();
    crate::boards::to_js(&GameJs {
        puzzle,
        limit: limit as f64,
        exhausted,
    })
}

#[derive(Serialize)]
struct GameJs {
    puzzle: Option<serde_json::Value>,
    limit: f64,
    exhausted: String,
}

/// Today's date, `YYYY-MM-DD`, from the browser's clock (UTC).
fn today() -> String {
    let iso: String = js_sys::Date::new_0().to_iso_string().into();
    iso.chars().take(10).collect()
}

#[derive(Deserialize)]
#[serde(rename_all = "camelCase")]
struct SolveJs {
    rule: String,
    size: u8,
    black: Vec<String>,
    white: Vec<String>,
    to_move: String,
    search: String,
    #[serde(default)]
    nodes: Option<u64>,
}

#[derive(Serialize)]
#[serde(rename_all = "camelCase")]
struct SolveOut {
    result: &'static str,
    say: Vec<String>,
    line: Vec<Point>,
    /// The side that plays the line's first move.
    first: Stone,
    first_moves: Vec<Point>,
    unknown: Vec<Point>,
    nodes: u64,
    /// The nodes in words: "3,000,002 positions searched".
    searched: String,
}

/// Answers a study question (in the worker): `{rule, size, black, white, toMove, search:
/// "vcf"|"vct"|"defend", nodes}`; returns `{result, say, line, first, firstMoves, unknown,
/// nodes}` (see `engine::study`), where for "defend" `firstMoves` are the defences and `line`
/// is the threat, and `first` is the side that starts `line`.
/// `progress`, if given, is called with the nodes spent so far, about every 50,000 nodes.
#[wasm_bindgen(js_name = solvePosition)]
pub fn solve_position(
    query: JsValue,
    progress: Option<js_sys::Function>,
) -> Result<JsValue, JsValue> {
    let q: SolveJs = serde_wasm_bindgen::from_value(query).map_err(err)?;
    let rule: Rule = q.rule.parse().map_err(err)?;
    let board =
        notation::setup(q.size, rule, &q.black.join(" "), &q.white.join(" ")).map_err(err)?;
    if let Some(w) = board.find_winner() {
        return Err(err(format!("{} has already made five", words::colour(w))));
    }
    let to_move: Stone = q.to_move.parse().map_err(err)?;
    let search: StudySearch = q.search.parse().map_err(err)?;
    // A study question asked with its own budget (in the worker, cancellable): a hard limit
    // on the whole question.
    let budget = Budget::total(
        q.nodes
            .unwrap_or(Budget::STUDY.total)
            .clamp(1_000, 20_000_000),
    );
    let next = std::cell::Cell::new(0u64);
    let report = |spent: u64| {
        if spent >= next.get() {
            next.set(spent + 50_000);
            if let Some(f) = &progress {
                let _ = f.call1(&JsValue::NULL, &JsValue::from(spent as f64));
            }
        }
        false
    };
    let s = with_solver(|solver| study(solver, &board, to_move, search, budget, Some(&report)));
    let (line, first) = s.answer.shown_line(to_move);
    let (first_moves, unknown) = match &s.answer {
        StudyAnswer::Win {
            first_moves,
            undecided,
            ..
        } => (first_moves.clone(), undecided.clone()),
        StudyAnswer::Threat {
            defences,
            undecided,
            ..
        } => (defences.clone(), undecided.clone()),
        _ => (Vec::new(), Vec::new()),
    };
    let out = SolveOut {
        result: s.answer.result(),
        say: words::study(&s),
        line: line.to_vec(),
        first,
        first_moves,
        unknown,
        nodes: s.nodes,
        searched: words::searched(s.nodes),
    };
    crate::boards::to_js(&out)
}
