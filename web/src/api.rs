//! Plain functions for the page and its worker: sets in and out, share and result codes,
//! ratings, generation and solving. Sets cross the boundary as set-file JSON text (the wire
//! format of `engine::formats::setfile`), so the page never holds an engine type.

use engine::formats::result;
#[cfg(feature = "workshop")]
use engine::formats::result::{PuzzleResult, TimeBucket};
use engine::formats::{setfile, share};
use engine::puzzle::attempt::Attempt;
use engine::puzzle::{grade, Theme};
use engine::rating::Rating;
use engine::search::Solver;
use engine::study::StudySearch;
use engine::words;
use engine::Rule;
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

/// Why a set being added to Tonight (set-file JSON: from a file, a link, Coach, My games or the
/// library) cannot be played, or an empty string: a puzzle whose position already has a five
/// has nothing to play (every grade of it would mean nothing), and is named. Saved sets are not
/// asked, so none is dropped at start. The file format allows such a position; `fivefold
/// inspect` reports it.
#[wasm_bindgen(js_name = finishedPuzzle)]
pub fn finished_puzzle(set_json: &str) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    let over = set
        .puzzles
        .iter()
        .position(|p| p.board().find_winner().is_some());
    Ok(over.map_or(String::new(), |i| {
        format!(
            "puzzle {} ({}): the position already has a five, so there is nothing to play",
            i + 1,
            set.puzzles[i].id
        )
    }))
}

/// The starter library's index: a JSON array with, per set, `{file, title, count, rating, key,
/// generator}` (`rating` the median of its puzzles', which orders the array, easiest first;
/// `generator` null or `{theme, rule, min_moves}`). The page fetches a set's file,
/// `library/<file>.json`, when it needs the puzzles.
#[wasm_bindgen(js_name = libraryIndex)]
pub fn library_index() -> String {
    library::INDEX.to_string()
}

/// The built-in starter library: a JSON array of set-file objects (workshop module).
#[cfg(feature = "workshop")]
#[wasm_bindgen(js_name = librarySets)]
pub fn library_sets() -> String {
    let parts: Vec<String> = library::set_files().into_iter().map(|s| s.1).collect();
    format!("[{}]", parts.join(","))
}

/// The share code of a set given as set-file JSON (workshop module: the page loads it to write
/// a code; reading one is the page's own).
#[cfg(feature = "workshop")]
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
#[cfg(feature = "workshop")]
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
/// not timed). A name or a set the code cannot hold is refused with a message. Workshop module:
/// the page loads it for the summary.
#[cfg(feature = "workshop")]
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
