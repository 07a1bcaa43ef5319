//! The starter library in `puzzles/`: every shipped puzzle proves again, a set regenerates
//! byte for byte from the seed written in it, keys are unique, deep lines are long and direct,
//! and a small fixture set (also checked in the
//! browser by `web/tests/browser.rs`) comes out the same natively.

use std::path::PathBuf;

use engine::formats::setfile::{self, PuzzleSet};
use engine::puzzle::generate::{self, Options};
use engine::puzzle::verify;
use engine::puzzle::{Goal, Theme};
use engine::Rule;

fn puzzles_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../puzzles")
}

pub(crate) fn shipped() -> Vec<(String, String, PuzzleSet)> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(puzzles_dir())
        .expect("puzzles/ exists")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "json"))
        .collect();
    files.sort();
    files
        .into_iter()
        .map(|f| {
            let name = f.file_name().unwrap().to_string_lossy().to_string();
            let text = std::fs::read_to_string(&f).unwrap();
            let set = setfile::parse(&text).unwrap_or_else(|e| panic!("{name}: {e}"));
            (name, text, set)
        })
        .collect()
}

/// Regenerates a set from the generator block it carries (its first `count` puzzles when
/// given: a game's puzzle depends only on its number, so a shorter set is the start of the
/// longer one).
fn regenerate_first(set: &PuzzleSet, count: Option<usize>) -> String {
    let g = set
        .generator
        .as_ref()
        .expect("shipped sets record how they were made");
    let options = Options {
        theme: g.theme,
        rule: g.rule,
        size: g.size,
        count: count.unwrap_or(g.count),
        rating: g.rating,
        seed: g.seed,
        min_moves: g.min_moves,
        unique: g.unique,
    };
    let puzzles = generate::generate_on(&options, 2, |_| {}).expect("regeneration succeeds");
    setfile::to_json(&PuzzleSet {
        title: set.title.clone(),
        created: set.created.clone(),
        puzzles,
        generator: set.generator.clone(),
    })
}

fn regenerate(set: &PuzzleSet) -> String {
    regenerate_first(set, None)
}

fn full() -> bool {
    std::env::var("FIVEFOLD_FULL").is_ok_and(|v| v == "1")
}

/// Panics with the first differing line when `again` is not `text`.
fn same_bytes(name: &str, again: &str, text: &str) {
    if again != text {
        let line = again
            .lines()
            .zip(text.lines())
            .position(|(a, b)| a != b)
            .unwrap_or(again.lines().count().min(text.lines().count()));
        panic!(
            "{name} no longer regenerates from its seed: first difference at line {} \
             (regenerate the library with puzzles/regenerate.sh after a deliberate change)",
            line + 1
        );
    }
}

/// The deep sets: made with a minimum line length.
fn deep_sets() -> Vec<(String, String, PuzzleSet)> {
    shipped()
        .into_iter()
        .filter(|s| s.2.generator.as_ref().is_some_and(|g| g.min_moves > 0))
        .collect()
}

/// At least 90 % of every theme's puzzles have exactly one correct first move (the figures are
/// printed for the puzzles README), and every set made with `unique` has only such puzzles.
#[test]
fn keys_are_unique_in_nine_of_ten_puzzles_of_every_theme() {
    let sets = shipped();
    for theme in Theme::ALL {
        let of: Vec<&engine::puzzle::Puzzle> = sets
            .iter()
            .flat_map(|s| s.2.puzzles.iter())
            .filter(|p| p.theme == theme)
            .collect();
        let one = of.iter().filter(|p| p.first_moves.len() == 1).count();
        eprintln!("{theme}: {one} of {} with one answer", of.len());
        assert!(
            one * 10 >= of.len() * 9,
            "{theme}: only {one} of {} puzzles have one answer",
            of.len()
        );
    }
    for (name, _, set) in &sets {
        if set.generator.as_ref().is_some_and(|g| g.unique) {
            for p in &set.puzzles {
                assert_eq!(p.first_moves.len(), 1, "{name} {}", p.id);
            }
        }
    }
}

/// The deep sets: one set of each kind under each rule, every line as long as the set says
/// (and no longer than the generator allows), one answer, no detour (no shorter win before any
/// attacker move, no exchange that can be left out), and rated in the Coach's Expert band.
#[test]
fn deep_lines_are_long_unique_and_direct() {
    use engine::puzzle::deep::{self, moves_before_win};
    let sets = deep_sets();
    for rule in Rule::ALL {
        for theme in [Theme::Vcf, Theme::Vct, Theme::Defend] {
            assert!(
                sets.iter()
                    .any(|s| s.2.puzzles[0].theme == theme && s.2.puzzles[0].rule == rule),
                "no deep {theme} set under {rule}"
            );
        }
    }
    let mut solver = engine::search::Solver::default();
    let mut failures = Vec::new();
    let mut lengths: std::collections::BTreeMap<String, Vec<u16>> = Default::default();
    for (name, _, set) in &sets {
        let g = set.generator.as_ref().unwrap();
        for p in &set.puzzles {
            let moves = moves_before_win(&p.line);
            lengths.entry(name.clone()).or_default().push(moves);
            if moves < g.min_moves || moves > generate::max_moves(p.theme) {
                failures.push(format!("{name} {}: {moves} moves", p.id));
            }
            if p.first_moves.len() != 1 {
                failures.push(format!("{name} {}: {} answers", p.id, p.first_moves.len()));
            }
            if !(1900..=2600).contains(&p.rating) {
                failures.push(format!("{name} {}: rated {}", p.id, p.rating));
            }
            for problem in deep::detours(&mut solver, p) {
                failures.push(format!("{name} {}: {problem}", p.id));
            }
        }
    }
    for (name, l) in &lengths {
        eprintln!("{name}: moves before the win {l:?}");
    }
    no_failures(&failures, "problems");
}

/// The estimate follows depth over the library: the deep fours rate well above the other
/// lines of fours, and a longer line of fours rates higher on average.
#[test]
fn ratings_follow_line_length_over_the_library() {
    use engine::puzzle::deep::moves_before_win;
    let all: Vec<engine::puzzle::Puzzle> = shipped()
        .into_iter()
        .flat_map(|s| s.2.puzzles)
        .filter(|p| p.theme == Theme::Vcf)
        .collect();
    let mean = |f: &dyn Fn(u16) -> bool| {
        let r: Vec<f64> = all
            .iter()
            .filter(|p| f(moves_before_win(&p.line)))
            .map(|p| p.rating as f64)
            .collect();
        assert!(!r.is_empty());
        r.iter().sum::<f64>() / r.len() as f64
    };
    let short = mean(&|m| m <= 4);
    let deep = mean(&|m| m >= 10);
    eprintln!("vcf: mean rating {short:.0} at 4 fours or fewer, {deep:.0} at 10 or more");
    assert!(deep >= short + 500.0, "{short} {deep}");
}

/// Every deep set regenerates byte for byte; in CI its first puzzle only (the whole sets take
/// minutes: run with `FIVEFOLD_FULL=1`).
#[test]
fn the_deep_sets_regenerate_byte_for_byte() {
    let sets = deep_sets();
    assert!(sets.len() >= 6);
    if full() {
        for (name, text, set) in &sets {
            same_bytes(name, &regenerate(set), text);
        }
        return;
    }
    let (name, _, set) = &sets[0];
    let again = regenerate_first(set, Some(1));
    let first = setfile::parse(&again).expect("a set");
    assert_eq!(first.puzzles.len(), 1);
    assert_eq!(
        first.puzzles[0], set.puzzles[0],
        "{name}: the first puzzle differs"
    );
}

#[test]
fn the_library_is_large_and_covers_every_theme_and_rule() {
    let sets = shipped();
    let total: usize = sets.iter().map(|s| s.2.puzzles.len()).sum();
    assert!(total >= 300, "only {total} puzzles shipped");
    for theme in Theme::ALL {
        assert!(
            sets.iter()
                .any(|s| s.2.puzzles.iter().any(|p| p.theme == theme)),
            "no {theme} puzzle shipped"
        );
    }
    for rule in Rule::ALL {
        assert!(
            sets.iter()
                .any(|s| s.2.puzzles.iter().any(|p| p.rule == rule)),
            "no {rule} puzzle shipped"
        );
    }
}

#[test]
fn every_shipped_puzzle_proves_again() {
    let mut solver = engine::search::Solver::default();
    let mut failures = Vec::new();
    let mut n = 0;
    for (name, _, set) in shipped() {
        for p in &set.puzzles {
            n += 1;
            for problem in verify::check(&mut solver, p) {
                failures.push(format!("{name} {}: {problem}", p.id));
            }
        }
    }
    assert!(n >= 300);
    no_failures(&failures, "problems");
}

#[test]
fn a_shipped_set_regenerates_byte_for_byte() {
    let (name, text, set) = shipped()
        .into_iter()
        .find(|s| s.0 == "four-threes-freestyle.json")
        .expect("the four-three set is shipped");
    same_bytes(&name, &regenerate(&set), &text);
    // With FIVEFOLD_FULL=1, every set that is not deep as well (the deep ones have their own
    // test).
    if full() {
        for (name, text, set) in shipped() {
            if set.generator.as_ref().is_some_and(|g| g.min_moves == 0) {
                same_bytes(&name, &regenerate(&set), &text);
            }
        }
    }
}

/// Fails with every failure listed, `what` saying what they are ("problems").
fn no_failures(failures: &[String], what: &str) {
    assert!(
        failures.is_empty(),
        "{} {what}:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

/// The options of the fixture that the browser test regenerates too. The seed is one whose
/// first puzzle has three correct answers, so that the tests reading the fixture (answer
/// keys in words, key checks, result codes) meet a key of several moves.
pub fn fixture_options() -> Options {
    Options::new(Theme::FourThree, Rule::Renju, 3, (600, 2600), 2027)
}

#[test]
fn the_fixture_set_is_what_the_generator_makes() {
    let puzzles = generate::generate(&fixture_options(), |_| {}).unwrap();
    // Several answers are allowed (not `unique`), and the set holds such a puzzle.
    assert!(
        puzzles.iter().any(|p| p.first_moves.len() > 1),
        "no puzzle with several answers"
    );
    let json = setfile::to_json(&PuzzleSet {
        title: "Fixture: native and WebAssembly must agree".into(),
        created: "2026-12-01".into(),
        puzzles,
        generator: None,
    });
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/fixture_set.json");
    if std::env::var_os("FIVEFOLD_BLESS").is_some() {
        std::fs::write(&path, &json).unwrap();
    }
    let want = std::fs::read_to_string(&path).expect("tests/data/fixture_set.json");
    assert!(
        json == want,
        "the fixture differs: set FIVEFOLD_BLESS=1 to rewrite it after a deliberate change"
    );
}

/// A student who plays the answer key move by move must be told it is right, under the budget
/// the browser grades with (not the larger one puzzles are proved with), as the app grades the
/// built-in library (its keys trusted where that budget cannot decide). Every listed first move
/// and defence is also graded as a set from outside would be (keys not trusted): then a move
/// may come out undecided, but never refuted.
#[test]
fn every_stored_line_is_accepted_by_the_grader_with_the_browser_budget() {
    use engine::puzzle::grade::{self, Grade, Session};
    use engine::search::Solver;
    let mut solver = Solver::new(grade::solver_config());
    let mut failures = Vec::new();
    let mut undecided = Vec::new();
    let mut moves = 0;
    let mut play = |p: &engine::puzzle::Puzzle, moves: &[engine::Point], trusted: bool| {
        let mut session = Session::new(p.clone());
        session.trust_key(trusted);
        let mut out = Vec::new();
        for &mv in moves {
            out.push((mv, session.play(&mut solver, mv)));
        }
        out
    };
    for (name, _, set) in shipped() {
        for p in &set.puzzles {
            // Untrusted: each listed first move (or defence) alone.
            for &mv in &p.first_moves {
                match &play(p, &[mv], false)[..] {
                    [(_, Grade::Undecided)] => undecided.push(format!("{name} {} {mv}", p.id)),
                    [(_, Grade::Wrong { reason, .. })] => {
                        failures.push(format!("{name} {} {mv} (untrusted): {reason:?}", p.id))
                    }
                    _ => {}
                }
            }
            if p.goal() == Goal::Defend {
                // Every listed defence stops the threat (a counter-four first gets its block).
                for &mv in &p.first_moves {
                    moves += 1;
                    match &play(p, &[mv], true)[..] {
                        [(_, Grade::Solved { .. } | Grade::Accepted { .. })] => {}
                        other => failures.push(format!("{name} {} defence {mv}: {other:?}", p.id)),
                    }
                }
                continue;
            }
            // The main line, as far as the defender answers as it does.
            let mine: Vec<engine::Point> = p.line.iter().copied().step_by(2).collect();
            let graded = play(p, &mine, true);
            for (i, (mv, g)) in graded.iter().enumerate() {
                moves += 1;
                match g {
                    Grade::Solved { .. } => break,
                    Grade::Accepted { reply, .. } if p.line.get(2 * i + 1) == Some(reply) => {}
                    Grade::Accepted { .. } | Grade::Finished => break,
                    other => {
                        failures.push(format!("{name} {} move {mv}: {other:?}", p.id));
                        break;
                    }
                }
            }
        }
    }
    eprintln!(
        "{} first moves undecided without trusting the key: {}",
        undecided.len(),
        undecided.join(", ")
    );
    assert!(undecided.len() <= 5, "too many undecided: {undecided:?}");
    assert!(moves >= 600, "only {moves} moves graded");
    no_failures(&failures, "stored moves graded wrong");
}
