//! "My games" for the page and its worker: game records read from pasted text or file bytes
//! (our move lists or SGF, through `engine::formats::games::read_games`), and the worker's
//! three tasks on a game: the check move by move (`engine::review::review`, each move sent
//! with the progress, so that a check the player stops keeps what was done), the findings'
//! puzzles, and every defence of one missed defence (both made only when the player asks).
//!
//! The browser checks with [`Budget::GRADING`] for every question (the command line uses the
//! generator's budget): a question that budget cannot settle leaves its move undecided, shown
//! as undecided, never guessed. The findings' puzzles are made and proved by the generator's
//! own analysis with its own budget (see `engine::review`), so a puzzle from a game is as
//! sound as a generated one.
//!
//! Values cross the boundary as plain objects (points as names like `h8`, colours and rules by
//! name); the puzzles go out as set-file JSON text, like every set the page holds.

use engine::board::Board;
use engine::formats::games::{read_games, Choices, GameRecord};
use engine::formats::setfile;
use engine::review::{
    every_defence, finding_puzzle, review, Finding, FindingKind, ForcedWin, GameReview, MoveReview,
    PuzzleAim, ReviewProgress,
};
use engine::search::{Budget, Mode, StopCheck};
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
    /// The task: "check" (the default), "puzzles" (the findings' puzzles) or "defences"
    /// (every defence of one missed defence).
    #[serde(default)]
    pub task: Option<String>,
    /// The findings, as the check gave them (tasks "puzzles" and "defences").
    #[serde(default)]
    pub findings: Vec<FindingJs>,
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
    /// "fine", "finding", "undecided" or "unchecked".
    pub verdict: &'static str,
    /// Its findings (sent with the progress; the whole check lists them apart).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub findings: Vec<FindingJs>,
}

/// One finding, ready to show, and enough of it to make its puzzle or list its defences
/// later.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct FindingJs {
    /// The move it is about, from 1.
    pub number: usize,
    /// Who played that move.
    pub colour: Stone,
    /// The point played.
    pub played: Point,
    /// "missed-win", "blunder", "missed-defence" or "forbidden-point".
    pub kind: String,
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
    /// Whether `defences` is every defence (else the first found).
    #[serde(default = "yes")]
    pub all: bool,
    /// Whether every move that could defend was tried.
    #[serde(default)]
    pub complete: bool,
    /// The class of the win shown ("vcf" or "vct"), if any.
    #[serde(default)]
    pub mode: Option<String>,
    /// The win's length in the search's measure.
    #[serde(default)]
    pub depth: u16,
    /// Renju: the win ends on a point black may not take.
    #[serde(default)]
    pub onto: bool,
    /// Whether the finding made a puzzle (false until the puzzles are made).
    pub puzzle: bool,
}

const fn yes() -> bool {
    true
}

fn finding_js(f: &Finding) -> FindingJs {
    let (line, first) = f.shown_line();
    let (defences, all, complete) = match &f.kind {
        FindingKind::MissedDefence {
            defences,
            all,
            complete,
            ..
        } => (defences.clone(), *all, *complete),
        _ => (Vec::new(), true, false),
    };
    let win = match &f.kind {
        FindingKind::MissedWin { win } | FindingKind::Blunder { win } => Some(win),
        FindingKind::MissedDefence { threat, .. } => Some(threat),
        FindingKind::ForbiddenPoint { .. } => None,
    };
    FindingJs {
        number: f.number,
        colour: f.colour,
        played: f.played,
        kind: f.kind.name().into(),
        words: words::finding(f),
        at: f.at,
        line: line.to_vec(),
        first,
        defences,
        all,
        complete,
        mode: win.map(|w| w.mode_name().into()),
        depth: win.map_or(0, |w| w.depth),
        onto: win.is_some_and(|w| w.onto_forbidden),
        puzzle: f.puzzle.is_some(),
    }
}

/// The finding a [`FindingJs`] describes (a win, a blunder or a missed defence; a forbidden
/// point has nothing to make).
fn to_finding(f: &FindingJs) -> Result<Finding, String> {
    let mode = match f.mode.as_deref() {
        Some("vcf") => Mode::Vcf,
        Some("vct") => Mode::Vct,
        _ => {
            return Err(format!(
                "the finding of move {} has no class of win",
                f.number
            ))
        }
    };
    let win = ForcedWin {
        side: f.first,
        mode,
        line: f.line.clone(),
        depth: f.depth,
        onto_forbidden: f.onto,
    };
    let kind = match f.kind.as_str() {
        "missed-win" => FindingKind::MissedWin { win },
        "blunder" => FindingKind::Blunder { win },
        "missed-defence" => FindingKind::MissedDefence {
            threat: win,
            defences: f.defences.clone(),
            complete: f.complete,
            all: f.all,
        },
        k => return Err(format!("a finding of the kind '{k}' makes nothing")),
    };
    Ok(Finding {
        number: f.number,
        colour: f.colour,
        played: f.played,
        kind,
        at: f.at,
        puzzle: None,
    })
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
    /// Whether the check was stopped before the end.
    pub stopped: bool,
    /// The winner of the game as played.
    pub winner: Option<Stone>,
    /// Nodes spent.
    pub nodes: f64,
    /// The budget of each question, in words.
    pub budget: String,
}

fn move_js(m: &MoveReview, with_findings: bool) -> MoveJs {
    MoveJs {
        number: m.number,
        colour: m.colour,
        point: m.point,
        verdict: m.verdict.name(),
        findings: if with_findings {
            m.findings.iter().map(finding_js).collect()
        } else {
            Vec::new()
        },
    }
}

/// The review's values as the page shows them.
fn to_checked(r: &GameReview) -> CheckedJs {
    CheckedJs {
        rule: r.rule,
        size: r.size,
        moves: r.moves.iter().map(|m| move_js(m, false)).collect(),
        findings: r.findings().map(finding_js).collect(),
        summary: words::review_summary(r),
        stopped: r.stopped,
        winner: r.winner,
        nodes: r.nodes as f64,
        budget: words::searched(r.budget.total) + " at most per question",
    }
}

/// The findings' puzzles, made on request.
#[derive(Serialize, Debug)]
pub struct PuzzlesJs {
    /// The player's findings' puzzles as set-file JSON ("From my games"), or null.
    pub set: Option<String>,
    /// How many puzzles the set holds.
    pub puzzles: usize,
    /// For each finding sent, whether it made a puzzle.
    pub made: Vec<bool>,
}

/// Every defence of one missed defence, on request.
#[derive(Serialize, Debug)]
pub struct DefencesJs {
    /// The finding with its whole list (and its words saying so).
    pub finding: FindingJs,
}

/// A query's rule, player, record and budget.
fn parts(q: &CheckQuery) -> Result<(Rule, Option<Stone>, GameRecord, Budget), String> {
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
    Ok((rule, player, record, budget))
}

/// The position after a game's first `at` moves (which the rule must allow).
fn position(record: &GameRecord, rule: Rule, at: usize) -> Result<Board, String> {
    let first = GameRecord::new(
        record.size(),
        record.moves()[..at.min(record.moves().len())].to_vec(),
    )
    .map_err(|e| e.to_string())?;
    let game = first.replay(rule).map_err(|e| e.to_string())?;
    Ok(game.board().clone())
}

/// Checks a game: the plain Rust behind [`check_game`]'s task "check", with the progress
/// callback (moves checked, of all, the move just checked) and stop check as closures
/// (natively testable).
pub fn check(
    q: &CheckQuery,
    stop: Option<StopCheck>,
    mut progress: impl FnMut(usize, usize, MoveJs),
) -> Result<CheckedJs, String> {
    let (rule, _, record, budget) = parts(q)?;
    let r = with_solver(|s| {
        review(s, &record, rule, budget, stop, |p: ReviewProgress| {
            progress(p.checked, p.total, move_js(&p.latest, true))
        })
    })
    .map_err(|e| e.to_string())?;
    Ok(to_checked(&r))
}

/// The findings' puzzles (the player's, or both sides' when the query's player is "both"):
/// [`check_game`]'s task "puzzles". `progress(done, of)` hears after each finding.
pub fn puzzles(
    q: &CheckQuery,
    mut progress: impl FnMut(usize, usize),
) -> Result<PuzzlesJs, String> {
    let (rule, player, record, _) = parts(q)?;
    let total = q.findings.len();
    let mut made = Vec::with_capacity(total);
    let mut list: Vec<engine::puzzle::Puzzle> = Vec::new();
    for (k, f) in q.findings.iter().enumerate() {
        let mut got = None;
        if player.is_none_or(|s| s == f.colour) && f.kind != "forbidden-point" {
            let aim = to_finding(f)?.aim();
            if f.at > record.moves().len() {
                return Err(format!(
                    "the finding of move {} is past the game's end",
                    f.number
                ));
            }
            let board = position(&record, rule, f.at)?;
            got = aim.and_then(|aim: PuzzleAim| with_solver(|s| finding_puzzle(s, &board, aim)));
        }
        made.push(got.is_some());
        if let Some(p) = got {
            if !list.iter().any(|q| q.id == p.id) {
                list.push(p);
            }
        }
        progress(k + 1, total);
    }
    let set = (!list.is_empty()).then(|| setfile::PuzzleSet {
        title: engine::review::SET_TITLE.to_string(),
        created: q.created.clone(),
        puzzles: list,
        generator: None,
    });
    if let Some(s) = &set {
        setfile::check(s).map_err(|e| format!("the puzzles would not read back: {e}"))?;
    }
    Ok(PuzzlesJs {
        puzzles: set.as_ref().map_or(0, |s| s.puzzles.len()),
        set: set.as_ref().map(setfile::to_json),
        made,
    })
}

/// Every defence of the query's one finding, a missed defence: [`check_game`]'s task
/// "defences". The finding comes back with its whole list and its words, or unchanged when
/// the budget proved no more.
pub fn defences(q: &CheckQuery, stop: Option<StopCheck>) -> Result<DefencesJs, String> {
    let (rule, _, record, budget) = parts(q)?;
    let [f] = q.findings.as_slice() else {
        return Err("one finding at a time".into());
    };
    if f.kind != "missed-defence" || f.at > record.moves().len() {
        return Err(format!("move {} holds no missed defence", f.number));
    }
    let mut finding = to_finding(f)?;
    let board = position(&record, rule, f.at)?;
    if let Some((list, done)) = with_solver(|s| every_defence(s, &board, f.colour, budget, stop)) {
        if let FindingKind::MissedDefence {
            defences,
            complete,
            all,
            ..
        } = &mut finding.kind
        {
            *defences = list;
            *complete = done;
            *all = true;
        }
    }
    Ok(DefencesJs {
        finding: finding_js(&finding),
    })
}

/// A game's task in the worker. `query` is `{size, rule, moves, player, created, nodes,
/// task, findings}`:
/// * task "check" (the default): checks the game move by move; returns `{rule, size, moves:
///   [{number, colour, point, verdict}], findings: [{number, colour, played, kind, words, at,
///   line, first, defences, all, complete, mode, depth, onto, puzzle}], summary, stopped,
///   winner, nodes, budget}`; `progress(checked, total, move)` is called after every move with
///   the move as checked (`{number, colour, point, verdict, findings}`);
/// * task "puzzles": makes the puzzles of `findings`; returns `{set, puzzles, made}`;
///   `progress(done, total)` after each finding;
/// * task "defences": every defence of the one missed defence in `findings`; returns
///   `{finding}`.
///
/// `stop()`, if given, is polled during the searches and ends the work when it returns true.
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
    let stop_check = stop.as_ref().map(|_| &stop_check as StopCheck);
    let tell = |a: u32, b: u32, m: Option<&MoveJs>| -> Result<(), JsValue> {
        if let Some(f) = &progress {
            let m = match m {
                Some(m) => crate::boards::to_js(m)?,
                None => JsValue::UNDEFINED,
            };
            let _ = f.call3(&JsValue::NULL, &JsValue::from(a), &JsValue::from(b), &m);
        }
        Ok(())
    };
    match q.task.as_deref().unwrap_or("check") {
        "check" => {
            let out = check(&q, stop_check, |c, t, m| {
                let _ = tell(c as u32, t as u32, Some(&m));
            })
            .map_err(err)?;
            crate::boards::to_js(&out)
        }
        "puzzles" => {
            let out = puzzles(&q, |d, t| {
                let _ = tell(d as u32, t as u32, None);
            })
            .map_err(err)?;
            crate::boards::to_js(&out)
        }
        "defences" => crate::boards::to_js(&defences(&q, stop_check).map_err(err)?),
        t => Err(err(format!("unknown task '{t}'"))),
    }
}

/// The sentence for a check the player stopped, from the verdicts of the moves it kept
/// ("fine", "finding", "undecided"; the rest of the game's `total` moves were not checked)
/// and its findings' count.
#[wasm_bindgen(js_name = stoppedSummary)]
pub fn stopped_summary(verdicts: Vec<String>, findings: usize, total: usize) -> String {
    let undecided = verdicts.iter().filter(|v| *v == "undecided").count();
    let checked = verdicts.iter().filter(|v| *v != "unchecked").count();
    words::review_counts(
        checked,
        findings,
        undecided,
        Some(total.saturating_sub(checked)),
    )
}

/// The browser's budget per question, in words (as a check's `budget` says it).
#[wasm_bindgen(js_name = checkBudget)]
pub fn check_budget() -> String {
    words::searched(BROWSER_BUDGET.total) + " at most per question"
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
            task: None,
            findings: Vec::new(),
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
    fn the_missed_win_is_found_at_the_browser_budget_and_makes_the_players_puzzle_on_request() {
        let mut heard = Vec::new();
        let r = check(&query(MISSED_VCF, Some("black")), None, |c, t, m| {
            heard.push((c, t, m))
        })
        .unwrap();
        assert_eq!(heard.len(), 14);
        assert_eq!((heard[13].0, heard[13].1), (14, 14));
        // Each move comes with its verdict and findings as it is checked.
        assert_eq!(heard[11].2.verdict, "finding");
        assert_eq!(heard[11].2.findings[0].kind, "missed-defence");
        assert_eq!(heard[12].2.findings, vec![r.findings[1].clone()]);
        assert!(heard[10].2.findings.is_empty());
        let found: Vec<_> = r
            .findings
            .iter()
            .map(|f| (f.number, f.kind.as_str()))
            .collect();
        assert_eq!(found, vec![(12, "missed-defence"), (13, "missed-win")]);
        assert_eq!(r.moves[12].verdict, "finding");
        let f = &r.findings[1];
        assert!(
            f.words.starts_with("Move 13: Black had a win with fours"),
            "{}",
            f.words
        );
        assert_eq!((f.at, f.line.len(), f.first), (12, 7, Stone::Black));
        assert_eq!(
            (f.mode.as_deref(), f.depth, f.puzzle),
            (Some("vcf"), 3, false)
        );
        // The puzzles, on request: only Black's finding goes into Black's set.
        let mut q = query(MISSED_VCF, Some("black"));
        q.task = Some("puzzles".into());
        q.findings = r.findings.clone();
        let mut done = Vec::new();
        let p = puzzles(&q, |d, t| done.push((d, t))).unwrap();
        assert_eq!(done, vec![(1, 2), (2, 2)]);
        assert_eq!((p.puzzles, p.made.clone()), (1, vec![false, true]));
        let set = setfile::parse(p.set.as_deref().unwrap()).unwrap();
        assert_eq!(set.title, "From my games");
        assert_eq!(set.puzzles[0].to_move, Stone::Black);
        // White's findings made no puzzle.
        q.player = Some("white".into());
        let w = puzzles(&q, |_, _| {}).unwrap();
        assert_eq!((w.puzzles, w.set.is_none()), (0, true));
        // Every defence of White's missed defence, on request: four, where the check found
        // one.
        let d = &r.findings[0];
        assert_eq!((d.defences.len(), d.all), (1, false));
        assert!(d.words.contains("A defence was"), "{}", d.words);
        q.findings = vec![d.clone()];
        let all = defences(&q, None).unwrap().finding;
        assert_eq!(all.defences.len(), 4);
        assert!(all.all && all.defences.contains(&d.defences[0]));
        assert!(
            all.words.contains("The defences were k8, k9, l8, l10"),
            "{}",
            all.words
        );
        // A forbidden point or a made-up kind makes nothing.
        let mut bad = d.clone();
        bad.kind = "missed-lunch".into();
        q.findings = vec![bad];
        assert!(defences(&q, None).is_err());
    }

    #[test]
    fn a_stopped_check_keeps_no_move_it_did_not_finish_and_bad_queries_are_refused() {
        let stop = |_: u64| true;
        let r = check(&query(MISSED_VCF, None), Some(&stop), |_, _, _| {}).unwrap();
        assert!(r.stopped);
        assert!(r.moves.iter().all(|m| m.verdict == "unchecked"));
        assert!(r.findings.is_empty());
        assert!(check(&query("h8 h8", None), None, |_, _, _| {}).is_err());
        let mut q = query(MISSED_VCF, None);
        q.rule = "chess".into();
        assert!(check(&q, None, |_, _, _| {}).is_err());
        let kept: Vec<String> = ["fine", "fine", "finding"].map(String::from).into();
        assert_eq!(
            stopped_summary(kept, 1, 14),
            "3 moves checked: 1 finding. The check was stopped: 11 moves not checked."
        );
    }
}
