//! "My games" for the page and its worker: game records read from pasted text or file bytes
//! (our move lists or SGF, through `engine::formats::games::read_games`), and a game checked
//! move by move (`engine::review::review`) with progress and a stop check, in the worker.
//!
//! The browser checks with [`Budget::GRADING`] for every question (the command line uses the
//! generator's budget): a sixty-move game then takes seconds, not most of a minute, and a
//! question that budget cannot settle leaves its move undecided, shown as undecided, never
//! guessed. The findings' puzzles are still made and proved by the generator's own analysis
//! with its own budget (see `engine::review`), so a puzzle from a game is as sound as a
//! generated one.
//!
//! Values cross the boundary as plain objects (points as names like `h8`, colours and rules by
//! name); the puzzles go out as set-file JSON text, like every set the page holds.

use engine::formats::games::{read_games, Choices, GameRecord};
use engine::formats::setfile;
use engine::review::{review, FindingKind, GameReview, ReviewProgress};
use engine::search::{Budget, StopCheck};
use engine::{words, Point, Rule, Stone};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use crate::api::{err, with_solver};

/// The budget of every question when the browser checks a game (see the module comment).
pub const BROWSER_BUDGET: Budget = Budget::GRADING;

/// The most moves a checked game may have (a full 19x19 board).
const MAX_MOVES: usize = 361;

/// One game as read from a file or a paste.
#[derive(Serialize, Debug, PartialEq)]
pub struct GameJs {
    /// The title the record gives (SGF `GN`, or a move list's `#` line), if any.
    pub title: Option<String>,
    /// Black's player, if named.
    pub black: Option<String>,
    /// White's player, if named.
    pub white: Option<String>,
    /// The date the record gives, if any.
    pub date: Option<String>,
    /// The rule the record names, if any.
    pub rule: Option<Rule>,
    /// The board side.
    pub size: u8,
    /// The moves, black first.
    pub moves: Vec<Point>,
}

/// What a file or a paste held: its games, and what the reader passed over.
#[derive(Serialize, Debug, PartialEq)]
pub struct GamesJs {
    /// The games, in file order.
    pub games: Vec<GameJs>,
    /// Warnings for the player (an SGF file's variations or skipped properties).
    pub warnings: Vec<String>,
}

/// Reads game records from bytes: every game, or the engine's message saying where the input
/// is wrong. `size` is the board side for move lists (and SGF games without `SZ`).
pub fn read(bytes: &[u8], size: Option<u8>) -> Result<GamesJs, String> {
    let loaded = read_games(bytes, Choices { size, rule: None }).map_err(|e| e.to_string())?;
    if loaded.games.is_empty() {
        return Err(
            "no game was found: paste a move list (black first, like h8 h9 i8) or an SGF record"
                .into(),
        );
    }
    let games = loaded
        .games
        .iter()
        .map(|g| {
            let info = g.info();
            GameJs {
                title: info.title.clone(),
                black: info.black.clone(),
                white: info.white.clone(),
                date: info.date.clone(),
                rule: g.rule(),
                size: g.size(),
                moves: g.moves().to_vec(),
            }
        })
        .collect();
    Ok(GamesJs {
        games,
        warnings: loaded.warnings.iter().map(|w| w.to_string()).collect(),
    })
}

/// Reads game records from a pasted text or an opened file's bytes (`size`: 15 or 19, the
/// board side for move lists); returns `{games: [{title, black, white, date, rule, size,
/// moves}], warnings}`, or throws the engine's message naming where the input is wrong.
#[wasm_bindgen(js_name = readGames)]
pub fn read_games_js(bytes: &[u8], size: Option<u8>) -> Result<JsValue, JsValue> {
    crate::boards::to_js(&read(bytes, size).map_err(err)?)
}

/// A game to check, as the page sends it to the worker.
#[derive(Deserialize, Debug)]
#[serde(rename_all = "camelCase")]
pub struct CheckQuery {
    /// The board side.
    pub size: u8,
    /// The rule to check under (by name).
    pub rule: String,
    /// The moves, black first (point names).
    pub moves: Vec<String>,
    /// The player's colour ("black" or "white"); the set holds only that side's findings.
    /// `None`: both sides'.
    #[serde(default)]
    pub player: Option<String>,
    /// The set's date, `YYYY-MM-DD`.
    pub created: String,
    /// Node budget of each question; default [`BROWSER_BUDGET`] (for the tests).
    #[serde(default)]
    pub nodes: Option<u64>,
}

/// One move, checked.
#[derive(Serialize, Debug)]
pub struct MoveJs {
    /// From 1.
    pub number: usize,
    /// Who played it.
    pub colour: Stone,
    /// Where.
    pub point: Point,
    /// "fine", "finding" or "undecided".
    pub verdict: &'static str,
}

/// One finding, ready to show.
#[derive(Serialize, Debug)]
pub struct FindingJs {
    /// The move it is about, from 1.
    pub number: usize,
    /// Who played that move.
    pub colour: Stone,
    /// The point played.
    pub played: Point,
    /// "missed-win", "blunder", "missed-defence" or "forbidden-point".
    pub kind: &'static str,
    /// The finding in words.
    pub words: String,
    /// The game's moves before the line starts.
    pub at: usize,
    /// The line to show from there (may be empty).
    pub line: Vec<Point>,
    /// The side that plays the line's first move.
    pub first: Stone,
    /// The proved defences (a missed defence), else empty.
    pub defences: Vec<Point>,
    /// Whether the finding made a puzzle.
    pub puzzle: bool,
}

/// A game checked.
#[derive(Serialize, Debug)]
pub struct CheckedJs {
    /// The rule it was checked under.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// Every move checked.
    pub moves: Vec<MoveJs>,
    /// Every finding, in move order.
    pub findings: Vec<FindingJs>,
    /// The review in one sentence.
    pub summary: String,
    /// The player's findings' puzzles as set-file JSON ("From my games"), or null.
    pub set: Option<String>,
    /// How many puzzles the set holds.
    pub puzzles: usize,
    /// Whether the check was stopped before the end.
    pub stopped: bool,
    /// The winner of the game as played.
    pub winner: Option<Stone>,
    /// Nodes spent.
    pub nodes: f64,
    /// The budget of each question, in words.
    pub budget: String,
}

/// The review's values as the page shows them.
fn to_checked(r: &GameReview, player: Option<Stone>, created: &str) -> Result<CheckedJs, String> {
    let set = r.puzzles(player, created);
    if let Some(s) = &set {
        setfile::check(s).map_err(|e| format!("the puzzles would not read back: {e}"))?;
    }
    let findings = r
        .findings()
        .map(|f| {
            let (line, first) = f.shown_line();
            let defences = match &f.kind {
                FindingKind::MissedDefence { defences, .. } => defences.clone(),
                _ => Vec::new(),
            };
            FindingJs {
                number: f.number,
                colour: f.colour,
                played: f.played,
                kind: f.kind.name(),
                words: words::finding(f),
                at: f.at,
                line: line.to_vec(),
                first,
                defences,
                puzzle: f.puzzle.is_some(),
            }
        })
        .collect();
    Ok(CheckedJs {
        rule: r.rule,
        size: r.size,
        moves: r
            .moves
            .iter()
            .map(|m| MoveJs {
                number: m.number,
                colour: m.colour,
                point: m.point,
                verdict: m.verdict.name(),
            })
            .collect(),
        findings,
        summary: words::review_summary(r),
        puzzles: set.as_ref().map_or(0, |s| s.puzzles.len()),
        set: set.as_ref().map(setfile::to_json),
        stopped: r.stopped,
        winner: r.winner,
        nodes: r.nodes as f64,
        budget: words::searched(r.budget.total) + " at most per question",
    })
}

/// Checks a game: the plain Rust behind [`check_game`], with the progress callback and stop
/// check as closures (natively testable).
pub fn check(
    q: &CheckQuery,
    stop: Option<StopCheck>,
    progress: impl FnMut(ReviewProgress),
) -> Result<CheckedJs, String> {
    let rule: Rule = q.rule.parse().map_err(|e| format!("{e}"))?;
    let player = match q.player.as_deref() {
        None | Some("both") => None,
        Some(s) => Some(s.parse::<Stone>().map_err(|e| format!("{e}"))?),
    };
    if q.moves.len() > MAX_MOVES {
        return Err(format!("a game has at most {MAX_MOVES} moves"));
    }
    let moves = q
        .moves
        .iter()
        .map(|m| m.trim().parse::<Point>().map_err(|e| format!("{e}")))
        .collect::<Result<Vec<_>, _>>()?;
    let record = GameRecord::new(q.size, moves).map_err(|e| e.to_string())?;
    let budget = q.nodes.map_or(BROWSER_BUDGET, |n| {
        Budget::total(n.clamp(1_000, BROWSER_BUDGET.total))
    });
    let r = with_solver(|s| review(s, &record, rule, budget, stop, progress))
        .map_err(|e| e.to_string())?;
    to_checked(&r, player, &q.created)
}

/// Checks a game move by move (in the worker): `query` is `{size, rule, moves, player,
/// created, nodes}`; returns `{rule, size, moves: [{number, colour, point, verdict}],
/// findings: [{number, colour, played, kind, words, at, line, first, defences, puzzle}],
/// summary, set, puzzles, stopped, winner, nodes, budget}`. `progress(checked, total)` is
/// called after every move; `stop()`, if given, is polled during the searches and ends the
/// check when it returns true (the moves not reached are undecided).
#[wasm_bindgen(js_name = checkGame)]
pub fn check_game(
    query: JsValue,
    progress: Option<js_sys::Function>,
    stop: Option<js_sys::Function>,
) -> Result<JsValue, JsValue> {
    let q: CheckQuery = serde_wasm_bindgen::from_value(query).map_err(err)?;
    let polled = std::cell::Cell::new(0u64);
    let stop_check = |_: u64| {
        // Asking JavaScript costs more than a node: ask every 4096 polls.
        let n = polled.get().wrapping_add(1);
        polled.set(n);
        n.is_multiple_of(4096)
            && stop
                .as_ref()
                .and_then(|f| f.call0(&JsValue::NULL).ok())
                .is_some_and(|v| v.is_truthy())
    };
    let out = check(&q, stop.as_ref().map(|_| &stop_check as StopCheck), |p| {
        if let Some(f) = &progress {
            let _ = f.call2(
                &JsValue::NULL,
                &JsValue::from(p.checked as u32),
                &JsValue::from(p.total as u32),
            );
        }
    })
    .map_err(err)?;
    crate::boards::to_js(&out)
}

#[cfg(test)]
mod tests {
    use super::*;

    // The hand-built game of tests/tests/review.rs: Black's 11. k10 makes a win with fours;
    // White's 12. c3 misses the defence and Black's 13. m3 lets the win go.
    const MISSED_VCF: &str = "h8 g8 i8 i9 j8 h7 i7 j6 h6 g5 k10 c3 m3 k8";

    fn query(moves: &str, player: Option<&str>) -> CheckQuery {
        CheckQuery {
            size: 15,
            rule: "freestyle".into(),
            moves: moves.split_whitespace().map(String::from).collect(),
            player: player.map(String::from),
            created: "2026-12-01".into(),
            nodes: None,
        }
    }

    #[test]
    fn a_pasted_move_list_and_an_sgf_record_are_read() {
        let got = read(b"# Harbour Street, round 2\nh8 h9 i8", None).unwrap();
        assert_eq!(got.games.len(), 1);
        assert_eq!(
            got.games[0].title.as_deref(),
            Some("Harbour Street, round 2")
        );
        assert_eq!(got.games[0].moves.len(), 3);
        let sgf = read(
            b"(;FF[4]GM[4]SZ[15]PB[Mira Okafor]PW[Tomas Reyne];B[hh];W[hi])",
            None,
        )
        .unwrap();
        assert_eq!(sgf.games[0].black.as_deref(), Some("Mira Okafor"));
        assert_eq!(sgf.games[0].moves.len(), 2);
    }

    #[test]
    fn bad_input_is_refused_with_the_engines_message() {
        let e = read(b"(;GM[1]SZ[15];B[hh])", None).unwrap_err();
        assert!(e.contains("GM"), "{e}");
        let e = read(b"h8 h9 zz", None).unwrap_err();
        assert!(e.contains("zz"), "{e}");
        assert!(read(b"   ", None).is_err());
    }

    #[test]
    fn the_missed_win_is_found_at_the_browser_budget_and_makes_the_players_puzzle() {
        let mut heard = Vec::new();
        let r = check(&query(MISSED_VCF, Some("black")), None, |p| {
            heard.push((p.checked, p.total))
        })
        .unwrap();
        assert_eq!(heard.last(), Some(&(14, 14)));
        let found: Vec<_> = r.findings.iter().map(|f| (f.number, f.kind)).collect();
        assert_eq!(found, vec![(12, "missed-defence"), (13, "missed-win")]);
        assert_eq!(r.moves[12].verdict, "finding");
        let f = &r.findings[1];
        assert!(
            f.words.starts_with("Move 13: Black had a win with fours"),
            "{}",
            f.words
        );
        assert_eq!((f.at, f.line.len(), f.first), (12, 7, Stone::Black));
        // Only Black's finding goes into Black's set.
        assert_eq!(r.puzzles, 1);
        let set = setfile::parse(r.set.as_deref().unwrap()).unwrap();
        assert_eq!(set.title, "From my games");
        assert_eq!(set.puzzles[0].to_move, Stone::Black);
        // White's findings made no puzzle.
        let w = check(&query(MISSED_VCF, Some("white")), None, |_| {}).unwrap();
        assert_eq!((w.puzzles, w.set.is_none()), (0, true));
    }

    #[test]
    fn a_stopped_check_leaves_moves_undecided_and_bad_queries_are_refused() {
        let stop = |_: u64| true;
        let r = check(&query(MISSED_VCF, None), Some(&stop), |_| {}).unwrap();
        assert!(r.stopped);
        assert!(r.moves.iter().all(|m| m.verdict == "undecided"));
        assert!(r.findings.is_empty());
        assert!(check(&query("h8 h8", None), None, |_| {}).is_err());
        let mut q = query(MISSED_VCF, None);
        q.rule = "chess".into();
        assert!(check(&q, None, |_| {}).is_err());
    }
}
