//! Plain functions for the page and its worker: sets in and out, share and result codes,
//! ratings, generation and solving. Sets cross the boundary as set-file JSON text (the wire
//! format of `engine::formats::setfile`), so the page never holds an engine type.

use engine::formats::result::{self, PuzzleResult, TimeBucket};
use engine::formats::{setfile, share};
use engine::notation;
use engine::puzzle::attempt::Attempt;
use engine::puzzle::generate::{self, Options};
use engine::puzzle::{grade, verify, Theme};
use engine::rating::Rating;
use engine::search::{Budget, Solver};
use engine::study::{study, StudyAnswer, StudySearch};
use engine::words;
use engine::{Point, Rule, Stone};
use serde::{Deserialize, Serialize};
use std::cell::RefCell;
use wasm_bindgen::prelude::*;

use crate::library;

/// A message for JavaScript (thrown as a string).
pub(crate) fn err(e: impl std::fmt::Display) -> JsValue {
    JsValue::from_str(&e.to_string())
}

/// Reads a set file; returns it again as normalised set-file JSON, or a message naming the
/// puzzle and field that is wrong.
#[wasm_bindgen(js_name = parseSet)]
pub fn parse_set(text: &str) -> Result<String, JsValue> {
    let set = setfile::parse(text).map_err(err)?;
    Ok(setfile::to_json(&set))
}

/// The built-in starter library: a JSON array of set-file objects.
#[wasm_bindgen(js_name = librarySets)]
pub fn library_sets() -> String {
    let parts: Vec<&str> = library::SETS.iter().map(|s| s.1).collect();
    format!("[{}]", parts.join(","))
}

/// The share code of a set given as set-file JSON.
#[wasm_bindgen(js_name = shareEncode)]
pub fn share_encode(set_json: &str) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    share::encode(&set).map_err(err)
}

/// The set in a share code, as set-file JSON, or a message saying why it cannot be read
/// (damaged or cut short, from a newer version, not a code).
#[wasm_bindgen(js_name = shareDecode)]
pub fn share_decode(code: &str) -> Result<String, JsValue> {
    let set = share::decode(code).map_err(err)?;
    Ok(setfile::to_json(&set))
}

/// One puzzle's result as the page keeps it.
#[derive(Deserialize)]
struct ResultJs {
    attempt: String,
    #[serde(default)]
    hints: u8,
    /// Seconds spent on the puzzle, if timed.
    #[serde(default)]
    seconds: Option<f64>,
}

/// The result code a student sends back: `results` holds one `{attempt, hints, seconds}` per
/// puzzle of the set, in order (`attempt` an attempt name, see `Attempt`; `seconds` null when
/// not timed). A name or a set the code cannot hold is refused with a message.
#[wasm_bindgen(js_name = resultCode)]
pub fn result_code(set_json: &str, name: &str, results: JsValue) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    let results: Vec<ResultJs> = serde_wasm_bindgen::from_value(results).map_err(err)?;
    let puzzles = results
        .iter()
        .map(|r| {
            let attempt: Attempt = r.attempt.parse().map_err(err)?;
            let time = match r.seconds {
                Some(s) if s.is_finite() && s >= 0.0 => {
                    TimeBucket::of_seconds(s.min(u32::MAX as f64) as u32)
                }
                _ => TimeBucket::NotTimed,
            };
            Ok(PuzzleResult::new(attempt, r.hints.min(3), time))
        })
        .collect::<Result<Vec<_>, JsValue>>()?;
    result::encode(result::fingerprint(&set), name, &puzzles).map_err(err)
}

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
        Ok(proved) => {
            let one = setfile::PuzzleSet {
                title: String::new(),
                created: "2026-12-01".into(),
                puzzles: vec![proved.puzzle],
                generator: None,
            };
            let v: serde_json::Value =
                serde_json::from_str(&setfile::to_json(&one)).map_err(err)?;
            ProvedJs {
                state: "corrected",
                puzzle: v["puzzles"].get(0).cloned(),
                problems: proved.problems,
            }
        }
        Err(why) => ProvedJs {
            state: "unproved",
            puzzle: None,
            problems: vec![why.to_string()],
        },
    };
    crate::boards::to_js(&out)
}

/// A study search under way, in words (`search` "vcf", "vct" or "defend").
#[wasm_bindgen(js_name = searchingWords)]
pub fn searching_words(
    search: &str,
    seconds: f64,
    spent: f64,
    budget: f64,
) -> Result<String, JsValue> {
    let search: StudySearch = search.parse().map_err(err)?;
    let n = |v: f64| {
        if v.is_finite() && v > 0.0 {
            v as u64
        } else {
            0
        }
    };
    Ok(words::searching(
        search,
        seconds.max(0.0),
        n(spent),
        n(budget),
    ))
}

/// Every attempt name with its words for the player: `{"untried": "not tried", ...}` as
/// JSON (see `engine::puzzle::attempt`).
#[wasm_bindgen(js_name = attemptWords)]
pub fn attempt_words() -> String {
    let map: serde_json::Map<String, serde_json::Value> = Attempt::ALL
        .iter()
        .map(|&a| (a.name().to_string(), words::attempt(a).into()))
        .collect();
    serde_json::Value::Object(map).to_string()
}

/// What a result code and a summary record for an attempt named `name` (an unfinished try
/// counts as failed); an unknown name is refused.
#[wasm_bindgen(js_name = recordedAttempt)]
pub fn recorded_attempt(name: &str) -> Result<String, JsValue> {
    let a: Attempt = name.parse().map_err(err)?;
    Ok(a.recorded().name().to_string())
}

#[derive(Serialize, Deserialize)]
struct RatingJs {
    rating: f64,
    deviation: f64,
    volatility: f64,
}

/// A player's rating after one puzzle (Glicko-2). `rating` is `{rating, deviation,
/// volatility}` or null for a new player.
#[wasm_bindgen(js_name = ratingAfter)]
pub fn rating_after(rating: JsValue, puzzle_rating: f64, solved: bool) -> Result<JsValue, JsValue> {
    let r: Rating = if rating.is_null() || rating.is_undefined() {
        Rating::default()
    } else {
        let r: RatingJs = serde_wasm_bindgen::from_value(rating).map_err(err)?;
        let ok = |v: f64, lo: f64, hi: f64| v.is_finite() && (lo..=hi).contains(&v);
        if !(ok(r.rating, 0.0, 4000.0) && ok(r.deviation, 1.0, 350.0) && ok(r.volatility, 0.0, 1.0))
        {
            Rating::default()
        } else {
            Rating {
                rating: r.rating,
                deviation: r.deviation,
                volatility: r.volatility,
            }
        }
    };
    let n = r.after_puzzle(puzzle_rating, solved);
    serde_wasm_bindgen::to_value(&RatingJs {
        rating: n.rating,
        deviation: n.deviation,
        volatility: n.volatility,
    })
    .map_err(err)
}

thread_local! {
    /// The worker's solver, made once: the tables are the expensive part.
    static SOLVER: RefCell<Option<Solver>> = const { RefCell::new(None) };
}

/// Runs `f` with the one solver of this thread (the page's boards share it; the worker has its
/// own), with the grading tables of [`grade::solver_config`]; each question brings its budget.
pub(crate) fn with_solver<T>(f: impl FnOnce(&mut Solver) -> T) -> T {
    SOLVER.with(|s| {
        let mut s = s.borrow_mut();
        let solver = s.get_or_insert_with(|| Solver::new(grade::solver_config()));
        f(solver)
    })
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

/// Generates puzzles (for Drill, in the worker): options `{theme, rule, size, ratingLo,
/// ratingHi, seed, count, minMoves, unique}` (the last two optional); returns set-file JSON. The same options give the same set here and
/// natively. `progress`, if given, is called after every self-play game with the puzzles kept
/// and the games played so far.
#[wasm_bindgen(js_name = generateSet)]
pub fn generate_set(
    options: JsValue,
    progress: Option<js_sys::Function>,
) -> Result<String, JsValue> {
    let o: GenerateJs = serde_wasm_bindgen::from_value(options).map_err(err)?;
    let theme: Theme = o.theme.parse().map_err(err)?;
    let rule: Rule = o.rule.parse().map_err(err)?;
    let options = Options {
        theme,
        rule,
        size: o.size,
        count: o.count,
        rating: (o.rating_lo, o.rating_hi),
        seed: o.seed,
        min_moves: o.min_moves,
        unique: o.unique,
    };
    let puzzles = generate::generate(&options, |p| {
        if let Some(f) = &progress {
            let _ = f.call2(
                &JsValue::NULL,
                &JsValue::from(p.kept as u32),
                &JsValue::from(p.games as f64),
            );
        }
    })
    .map_err(err)?;
    Ok(setfile::to_json(&setfile::PuzzleSet {
        title: format!("Drill: {}", words::theme(theme)),
        created: today(),
        puzzles,
        generator: None,
    }))
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

#[derive(Serialize)]
struct ThemeJs {
    name: &'static str,
    words: &'static str,
    /// The menu label ("Win with fours").
    label: &'static str,
    goal: &'static str,
    rules: Vec<&'static str>,
}

/// Every puzzle theme: `[{name, words, goal, rules}]` as JSON, `rules` being the rules it
/// exists under (for the Drill filters).
#[wasm_bindgen]
pub fn themes() -> String {
    let all: Vec<ThemeJs> = Theme::ALL
        .iter()
        .map(|&t| ThemeJs {
            name: t.name(),
            words: words::theme(t),
            label: words::theme_label(t),
            goal: t.goal().name(),
            rules: [Rule::Freestyle, Rule::Standard, Rule::Renju]
                .into_iter()
                .filter(|&r| t.allowed(r))
                .map(Rule::name)
                .collect(),
        })
        .collect();
    serde_json::to_string(&all).unwrap_or_else(|_| "[]".into())
}

/// The rating band `[lo, hi]` a drill of `theme` under `rule` asks the generator for, for a
/// player rated `rating` (see [`crate::drill::drill_band`]).
#[wasm_bindgen(js_name = drillBand)]
pub fn drill_band(theme: &str, rule: &str, rating: f64) -> Result<Vec<u32>, JsValue> {
    let theme: Theme = theme.parse().map_err(err)?;
    let rule: Rule = rule.parse().map_err(err)?;
    if !theme.allowed(rule) {
        return Err(err(format!(
            "the theme {theme} exists only under renju, not {rule}"
        )));
    }
    let (lo, hi) = crate::drill::drill_band(&library::ratings(theme, rule), rating);
    Ok(vec![lo, hi])
}

/// A set's identity, as eight hex digits: the fingerprint its result codes carry (a checksum
/// of its puzzles), so the same puzzles are the same set whatever the title, and two sets
/// that reuse puzzle ids are not.
#[wasm_bindgen(js_name = setKey)]
pub fn set_key(set_json: &str) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    Ok(format!("{:08x}", result::fingerprint(&set)))
}
