//! The player's practice, for the page: the Revisit deck (`engine::schedule`), the logbook
//! (`engine::logbook`) and the Drill's honest ratings (`engine::rating`), behind one handle
//! that the page keeps for the whole visit and saves as two documents after every change.
//! Days cross the boundary as day numbers (days since 1970-01-01 of the player's own calendar
//! day): the engine reads no clock, the page passes today.

use engine::formats::setfile;
use engine::logbook::{Entry, Logbook};
use engine::puzzle::attempt::Attempt;
use engine::puzzle::Puzzle;
use engine::rating::{drill, rate_attempt, Rating};
use engine::schedule::deck::{self, Filed, Screen, Source};
use engine::schedule::{Day, Deck};
use engine::{words, Rule};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use crate::api::err;
use crate::boards::to_js;

/// One set-file puzzle object (JSON text), read with the set file's own checks.
pub(crate) fn one_puzzle(puzzle_json: &str) -> Result<Puzzle, JsValue> {
    let wrapped = format!(
        "{{\"format\":\"fivefold-set\",\"version\":1,\"title\":\"\",\"created\":\"2026-12-01\",\"puzzles\":[{puzzle_json}]}}"
    );
    let set = setfile::parse(&wrapped).map_err(err)?;
    set.puzzles
        .into_iter()
        .next()
        .ok_or_else(|| err("no puzzle"))
}

/// A rating as the page stores it.
#[derive(Serialize, Deserialize, Clone, Copy)]
pub(crate) struct RatingJs {
    pub rating: f64,
    pub deviation: f64,
    pub volatility: f64,
}

impl RatingJs {
    pub(crate) fn of(r: Rating) -> RatingJs {
        RatingJs {
            rating: r.rating,
            deviation: r.deviation,
            volatility: r.volatility,
        }
    }

    pub(crate) fn rating(self) -> Rating {
        Rating {
            rating: self.rating,
            deviation: self.deviation,
            volatility: self.volatility,
        }
        .checked()
        .unwrap_or_default()
    }
}

/// A finished try, as the page reports it.
#[derive(Deserialize)]
#[serde(rename_all = "camelCase")]
struct FinishJs {
    /// "tonight", "drill", "revisit" or "games".
    origin: String,
    /// The set's title (outside text).
    #[serde(default)]
    title: String,
    /// The puzzle as set-file puzzle JSON text.
    puzzle: String,
    /// How it ended: "clean", "helped" or "failed".
    attempt: String,
    #[serde(default)]
    hints: u8,
    #[serde(default)]
    wrong: u32,
    #[serde(default)]
    millis: u32,
    /// The player's rating under the puzzle's rule after the try (unchanged for unrated
    /// screens).
    rating: Option<RatingJs>,
    /// The puzzle's rating the try was rated against.
    #[serde(default)]
    puzzle_rating: Option<f64>,
    #[serde(default)]
    skipped: bool,
    /// A miss found outside the app (a finding of My games, made a puzzle): filed in the deck
    /// as a new card due today, with no review, and not logged, since the player has not tried
    /// it here (`Deck::file`).
    #[serde(default)]
    outside: bool,
    today: Day,
}

#[derive(Serialize)]
struct FinishOut {
    /// The day the puzzle comes back in Revisit, if it is (or stays) there.
    due: Option<Day>,
    /// What happened, in words ("Comes back in 4 days (...)."), or "".
    say: String,
}

/// The Revisit deck and the logbook of one player.
#[wasm_bindgen]
pub struct Practice {
    deck: Deck,
    log: Logbook,
}

#[wasm_bindgen]
impl Practice {
    /// The practice stored as `deck` and `log` (the texts `deckJson` and `logJson` wrote), or
    /// empty ones for null. A stored text that cannot be read is refused with a message.
    #[wasm_bindgen(constructor)]
    pub fn new(deck: Option<String>, log: Option<String>) -> Result<Practice, JsValue> {
        Ok(Practice {
            deck: match deck {
                Some(t) => Deck::from_json(&t).map_err(err)?,
                None => Deck::new(),
            },
            log: match log {
                Some(t) => Logbook::from_json(&t).map_err(err)?,
                None => Logbook::new(),
            },
        })
    }

    /// Why a stored deck cannot be used, or null.
    #[wasm_bindgen(js_name = checkDeck)]
    pub fn check_deck(text: &str) -> Option<String> {
        Deck::from_json(text).err().map(|e| e.to_string())
    }

    /// Why a stored logbook cannot be used, or null.
    #[wasm_bindgen(js_name = checkLog)]
    pub fn check_log(text: &str) -> Option<String> {
        Logbook::from_json(text).err().map(|e| e.to_string())
    }

    /// The deck as stored.
    #[wasm_bindgen(js_name = deckJson)]
    pub fn deck_json(&self) -> String {
        self.deck.to_json()
    }

    /// The logbook as stored.
    #[wasm_bindgen(js_name = logJson)]
    pub fn log_json(&self) -> String {
        self.log.to_json()
    }

    /// Takes in a finished try (see the fields of `FinishJs`): it goes into the logbook (not a
    /// miss from outside the app), and a failed or helped puzzle from Tonight, Drill or My
    /// games into Revisit; a try in Revisit is a review. Returns `{due, say}`.
    pub fn finish(&mut self, finished: JsValue) -> Result<JsValue, JsValue> {
        let f: FinishJs = serde_wasm_bindgen::from_value(finished).map_err(err)?;
        let puzzle = one_puzzle(&f.puzzle)?;
        let origin: Screen = f.origin.parse().map_err(err)?;
        let attempt: Attempt = f.attempt.parse().map_err(err)?;
        let quick = deck::quick(&puzzle, f.millis);
        let source = Source::new(origin, &f.title);
        let rating = f.rating.map(RatingJs::rating).unwrap_or_default();
        if !f.outside {
            self.log
                .record(Entry {
                    day: f.today,
                    rule: puzzle.rule,
                    theme: puzzle.theme,
                    puzzle: puzzle.id.clone(),
                    puzzle_rating: f.puzzle_rating.unwrap_or(f64::from(puzzle.rating)),
                    outcome: attempt,
                    hints: f.hints,
                    wrong: f.wrong,
                    millis: f.millis,
                    rating: rating.rating,
                    deviation: rating.deviation,
                    source: source.clone(),
                    skipped: f.skipped,
                })
                .map_err(err)?;
        }
        let due = if f.outside {
            Some(self.deck.file(&puzzle, source, f.today))
        } else if origin == Screen::Revisit && self.deck.get(&puzzle.id).is_some() {
            Some(
                self.deck
                    .record(&puzzle.id, attempt, quick, f.today)
                    .map_err(err)?,
            )
        } else {
            match self
                .deck
                .add(&puzzle, source, attempt, quick, f.today)
                .map_err(err)?
            {
                Filed::New { due, .. } | Filed::Reviewed { due } => Some(due),
                Filed::NotMissed => None,
            }
        };
        to_js(&FinishOut {
            due,
            say: due.map_or(String::new(), |d| words::comes_back(f.today, d)),
        })
    }

    /// The puzzles due on `today`, oldest due first: `[{id, puzzle, origin, title, due,
    /// added, tries}]` (`puzzle` is set-file puzzle JSON text).
    pub fn due(&self, today: Day) -> Result<JsValue, JsValue> {
        #[derive(Serialize)]
        struct DueJs {
            id: String,
            puzzle: String,
            origin: &'static str,
            title: String,
            due: Day,
            added: Day,
            tries: usize,
        }
        let out: Vec<DueJs> = self
            .deck
            .due(today)
            .into_iter()
            .map(|i| DueJs {
                id: i.id.clone(),
                puzzle: i.puzzle.to_string(),
                origin: i.source.origin.name(),
                title: i.source.title.clone(),
                due: i.card.due,
                added: i.added,
                tries: i.reviews.len(),
            })
            .collect();
        to_js(&out)
    }

    /// How many puzzles are due: `{due, total, next, say}` (`next`: the next day after today
    /// when one is, or null; `say` in words).
    pub fn counts(&self, today: Day) -> Result<JsValue, JsValue> {
        let c = self.deck.counts(today);
        let say = if c.total == 0 {
            "Nothing to revisit: puzzles you miss or solve with help come back here.".to_string()
        } else if c.due == 0 {
            match c.next {
                Some(d) => format!(
                    "Nothing due today; {} in all. The next comes back on {}.",
                    c.total,
                    words::date(d)
                ),
                None => format!("Nothing due today; {} in all.", c.total),
            }
        } else {
            format!("{} due today, {} in all.", c.due, c.total)
        };
        to_js(&serde_json::json!({
            "due": c.due, "total": c.total, "next": c.next, "say": say,
        }))
    }

    /// What leaving an unfinished Drill puzzle costs today (`attempt`: how it stands):
    /// `{counted, say}`; a free skip is noted in the logbook.
    pub fn skip(&mut self, today: Day, attempt: &str) -> Result<JsValue, JsValue> {
        let a: Attempt = attempt.parse().map_err(err)?;
        let s = self.log.note_skip(today, a);
        to_js(&serde_json::json!({
            "counted": matches!(s, drill::Skip::Counted(_)),
            "say": words::skipped(s).unwrap_or_default(),
        }))
    }

    /// Free Drill skips left today.
    #[wasm_bindgen(js_name = freeSkipsLeft)]
    pub fn free_skips_left(&self, today: Day) -> u32 {
        drill::FREE_SKIPS_PER_DAY.saturating_sub(self.log.free_skips_used(today))
    }

    /// Everything Progress shows, for `today`: `{ratings: {rule: [{day, rating, deviation}]},
    /// themes: [{name, words, clean, helped, failed, percent}], rules: [...], days: [{day,
    /// count}], streaks: {current, best, todayDone}, dates: {day: words}}`.
    pub fn progress(&self, today: Day) -> Result<JsValue, JsValue> {
        let ratings: serde_json::Map<String, serde_json::Value> = Rule::ALL
            .iter()
            .map(|&r| {
                let pts: Vec<serde_json::Value> = self
                    .log
                    .rating_series(r)
                    .iter()
                    .map(|p| serde_json::json!({"day": p.day, "rating": p.rating, "deviation": p.deviation}))
                    .collect();
                (r.name().to_string(), serde_json::Value::Array(pts))
            })
            .collect();
        let tally = |name: &str, label: &str, t: &engine::logbook::Tally| {
            serde_json::json!({
                "name": name, "words": label, "clean": t.clean, "helped": t.helped,
                "failed": t.failed, "total": t.total(), "solved": t.solved_percent(),
                "cleanPercent": t.clean_percent(),
            })
        };
        let themes: Vec<serde_json::Value> = self
            .log
            .accuracy_by_theme()
            .iter()
            .map(|(t, x)| tally(t.name(), words::theme_label(*t), x))
            .collect();
        let rules: Vec<serde_json::Value> = self
            .log
            .accuracy_by_rule()
            .iter()
            .map(|(r, x)| tally(r.name(), r.name(), x))
            .collect();
        let days: Vec<serde_json::Value> = self
            .log
            .days()
            .iter()
            .map(|d| serde_json::json!({"day": d.day, "count": d.tally.total()}))
            .collect();
        let s = self.log.streaks(today);
        to_js(&serde_json::json!({
            "ratings": ratings, "themes": themes, "rules": rules, "days": days,
            "streaks": {"current": s.current, "best": s.best, "todayDone": s.today_done},
            "today": today,
        }))
    }
}

/// A day number in words: "Wednesday 2 December 2026".
#[wasm_bindgen(js_name = dayWords)]
pub fn day_words(day: Day) -> String {
    words::date(day)
}

/// A Drill try rated both ways (Glicko-2): the player's rating and the puzzle's, each updated
/// from the other's before the try. `player` and `puzzle` are `{rating, deviation,
/// volatility}` or null (a new player; a puzzle at its estimate `estimate`). Returns `{player,
/// puzzle}`.
#[wasm_bindgen(js_name = rateTry)]
pub fn rate_try(
    player: JsValue,
    puzzle: JsValue,
    estimate: u32,
    solved: bool,
) -> Result<JsValue, JsValue> {
    let read = |v: JsValue| -> Result<Option<Rating>, JsValue> {
        if v.is_null() || v.is_undefined() {
            return Ok(None);
        }
        let r: RatingJs = serde_wasm_bindgen::from_value(v).map_err(err)?;
        Ok(Some(r.rating()))
    };
    let p = read(player)?.unwrap_or_default();
    let q = read(puzzle)?.unwrap_or_else(|| Rating::puzzle(estimate));
    let (p2, q2) = rate_attempt(p, q, solved);
    to_js(&serde_json::json!({"player": RatingJs::of(p2), "puzzle": RatingJs::of(q2)}))
}

/// The rating band a drill of `theme` under `rule` chooses from for a player rated `player`
/// (`{rating, deviation, volatility}` or null): `{low, high, say}`.
#[wasm_bindgen(js_name = drillChoice)]
pub fn drill_choice(theme: &str, rule: &str, player: JsValue) -> Result<JsValue, JsValue> {
    let theme: engine::puzzle::Theme = theme.parse().map_err(err)?;
    let rule: Rule = rule.parse().map_err(err)?;
    if !theme.allowed(rule) {
        return Err(err(format!(
            "the theme {theme} exists only under renju, not {rule}"
        )));
    }
    let p = if player.is_null() || player.is_undefined() {
        Rating::default()
    } else {
        let r: RatingJs = serde_wasm_bindgen::from_value(player).map_err(err)?;
        r.rating()
    };
    let b = drill::band(&p, &crate::library::ratings(theme, rule));
    to_js(&serde_json::json!({"low": b.low, "high": b.high, "say": words::band(&b, rule)}))
}
