//! The Coach screen's light functions: a set's link, a puzzle's answer key in words, and where
//! a theme's puzzles rate. The printable sheet and the class table are in [`crate::classroom`]
//! (the workshop module). Sets cross the boundary as set-file JSON text.

use engine::formats::{setfile, share};
use engine::puzzle::Theme;
use engine::words;
use engine::Rule;
use wasm_bindgen::prelude::*;

use crate::api::err;
use crate::boards::{parse_puzzle, to_js};
use crate::library;

/// The link that opens a set (set-file JSON) on the club's address `base`.
#[wasm_bindgen(js_name = shareLink)]
pub fn share_link(base: &str, set_json: &str) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    let code = share::encode(&set).map_err(err)?;
    Ok(share::link(base, &code))
}

/// A puzzle's goal and answer key in words: `{goal, answer}` (`puzzleJson` is one set-file
/// puzzle object).
#[wasm_bindgen(js_name = puzzleWords)]
pub fn puzzle_words(puzzle_json: &str) -> Result<JsValue, JsValue> {
    let p = parse_puzzle(puzzle_json)?;
    to_js(&serde_json::json!({
        "goal": words::goal(&p),
        "answer": words::answer_key(&p),
        "theme": words::theme_label(p.theme),
    }))
}

/// The lowest and highest rating of the built-in library's puzzles of `theme` under `rule`:
/// where the generator finds that theme's puzzles.
#[wasm_bindgen(js_name = themeRatings)]
pub fn theme_ratings(theme: &str, rule: &str) -> Result<Vec<u32>, JsValue> {
    let theme: Theme = theme.parse().map_err(err)?;
    let rule: Rule = rule.parse().map_err(err)?;
    let r = library::ratings(theme, rule);
    match (r.iter().min(), r.iter().max()) {
        (Some(&lo), Some(&hi)) => Ok(vec![lo, hi]),
        _ => Err(err(format!("no puzzles of the theme {theme} under {rule}"))),
    }
}
