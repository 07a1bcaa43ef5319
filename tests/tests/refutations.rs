//! Every refutation the grader shows refutes. For a sample of the starter library (at least 8
//! puzzles of every theme; every puzzle with `FIVEFOLD_FULL=1`), every empty point within two
//! points (king moves) of a stone is graded as a first move, as the app grades it (the grading
//! tables and budget, the key trusted as for the built-in library). Each answer is then checked
//! by the Study board's search (the verdict and line `engine::study` asks for, afresh) at the
//! verification budget, which knows nothing of the grader:
//! * a wrong move shown with a reply (the forced block of a four, or a reply that stops a
//!   threat): after that reply the player has no win in the puzzle's class;
//! * a wrong move answered by the opponent's own win (with fours, or in a defence puzzle the
//!   win the move did not stop): the opponent does have that win;
//! * a move called "not forcing" is no four (in a puzzle about fours), or, in a puzzle about
//!   threats, leaves the opponent free (the player has no VCF after a pass);
//! * an accepted move: the player still wins afterwards, and a solved defence leaves the
//!   opponent no win.
//! The claim is the grader's promise (a verdict shown to a player is proved); the study
//! question is the independent check the player can make on the Study board.

use engine::board::threat;
use engine::puzzle::grade::{self, Grade, Session, WrongReason};
use engine::puzzle::{Goal, Puzzle, Theme};
use engine::search::{Budget, Mode, Solver, SolverConfig, Verdict};
use engine::study::{StudyAnswer, StudySearch};
use engine::{Board, Point, Stone};

use crate::library::shipped;

/// The puzzles to check: every `step`-th puzzle of each theme, at least 8 of each.
fn sample() -> Vec<Puzzle> {
    let full = std::env::var("FIVEFOLD_FULL").is_ok_and(|v| v == "1");
    let all: Vec<Puzzle> = shipped()
        .into_iter()
        .flat_map(|(_, _, set)| set.puzzles)
        .collect();
    let mut out = Vec::new();
    for theme in Theme::ALL {
        let of: Vec<&Puzzle> = all.iter().filter(|p| p.theme == theme).collect();
        assert!(of.len() >= 8, "{theme}: only {} puzzles", of.len());
        let step = if full { 1 } else { of.len() / 8 };
        out.extend(of.iter().step_by(step).map(|p| (*p).clone()));
    }
    out
}

/// Empty points within two points of a stone.
fn near_stones(b: &Board) -> Vec<Point> {
    b.points()
        .filter(|&q| b.get(q).is_none())
        .filter(|&q| {
            b.points().any(|s| {
                b.get(s).is_some()
                    && (s.x as i32 - q.x as i32).abs() <= 2
                    && (s.y as i32 - q.y as i32).abs() <= 2
            })
        })
        .collect()
}

fn search_of(theme: Theme) -> StudySearch {
    match theme.mode() {
        engine::search::Mode::Vcf => StudySearch::Vcf,
        engine::search::Mode::Vct => StudySearch::Vct,
    }
}

#[derive(Default, Debug)]
struct Tally {
    graded: usize,
    accepted: usize,
    wrong: usize,
    replies_checked: usize,
    wins_checked: usize,
    not_forcing: usize,
    undecided: usize,
    illegal: usize,
    /// Study answers that ran out of budget (neither confirming nor contradicting).
    inconclusive: usize,
}

/// Asks the Study board's win question for `side` to move on `b`: its verdict and main line
/// (the search `engine::study` makes first; the list of every other winning first move, which
/// these checks do not need, is left out). A proved answer does not depend on what the tables
/// hold, so they are kept between questions.
fn ask(solver: &mut Solver, b: &Board, side: Stone, search: StudySearch) -> StudyAnswer {
    let mode = match search {
        StudySearch::Vcf => Mode::Vcf,
        _ => Mode::Vct,
    };
    let sol = solver.ask(Budget::VERIFICATION).solve(b, side, mode);
    match sol.verdict {
        Verdict::Win => StudyAnswer::Win {
            line: sol.line,
            depth: sol.depth,
            first_moves: Vec::new(),
            undecided: Vec::new(),
        },
        Verdict::NoWin => StudyAnswer::NoWin,
        Verdict::Unknown => StudyAnswer::Undecided,
    }
}

#[test]
fn every_refutation_shown_refutes() {
    let mut grader = Solver::new(grade::solver_config());
    let mut checker = Solver::new(SolverConfig {
        table_megabytes: 8,
        vcf_table_megabytes: 4,
        ..SolverConfig::default()
    });
    let mut t = Tally::default();
    let mut problems: Vec<String> = Vec::new();
    let puzzles = sample();
    for p in &puzzles {
        let start = p.board();
        let me = p.to_move;
        let them = me.opponent();
        for q in near_stones(&start) {
            let mut s = Session::new(p.clone());
            s.trust_key(true);
            let g = s.play(&mut grader, q);
            t.graded += 1;
            let mut after = start.clone();
            after.place(q, me);
            let at = format!("{} {q}", p.id);
            match g {
                Grade::Illegal { .. } => t.illegal += 1,
                Grade::Undecided => t.undecided += 1,
                Grade::Finished => problems.push(format!("{at}: finished at the start")),
                Grade::Solved { .. } | Grade::Accepted { .. } => {
                    t.accepted += 1;
                    if p.goal() == Goal::Defend {
                        // The opponent must have no win after the defence (VCT class).
                        if matches!(
                            ask(&mut checker, &after, them, StudySearch::Vct),
                            StudyAnswer::Win { .. }
                        ) && matches!(g, Grade::Solved { .. })
                        {
                            problems.push(format!("{at}: called a defence, but the opponent wins"));
                        }
                    }
                }
                Grade::Wrong { refutation, reason } => {
                    t.wrong += 1;
                    check_wrong(
                        &mut checker,
                        p,
                        &after,
                        &refutation,
                        reason,
                        &at,
                        &mut t,
                        &mut problems,
                    );
                }
            }
        }
    }
    eprintln!(
        "refutations: {} puzzles, {} moves graded: {} accepted, {} wrong ({} replies and {} \
         wins checked, {} not forcing), {} undecided, {} illegal; {} study answers \
         inconclusive",
        puzzles.len(),
        t.graded,
        t.accepted,
        t.wrong,
        t.replies_checked,
        t.wins_checked,
        t.not_forcing,
        t.undecided,
        t.illegal,
        t.inconclusive
    );
    assert!(
        problems.is_empty(),
        "{} problems:\n{}",
        problems.len(),
        problems.join("\n")
    );
    assert!(
        t.replies_checked + t.wins_checked > 50,
        "too little was checked: {t:?}"
    );
}

#[allow(clippy::too_many_arguments)]
fn check_wrong(
    checker: &mut Solver,
    p: &Puzzle,
    after: &Board,
    refutation: &[Point],
    reason: WrongReason,
    at: &str,
    t: &mut Tally,
    problems: &mut Vec<String>,
) {
    let me = p.to_move;
    let them = me.opponent();
    match reason {
        WrongReason::NoFollowUp { block: r, .. } | WrongReason::Stopped { at: r, .. } => {
            t.replies_checked += 1;
            if refutation.first() != Some(&r) {
                problems.push(format!("{at}: the reply shown is not the reason's"));
            }
            let mut b = after.clone();
            b.place(r, them);
            match ask(checker, &b, me, search_of(p.theme)) {
                StudyAnswer::Win { line, .. } => problems.push(format!(
                    "{at}: reply {r} is shown as a refutation, but the player still wins: {}",
                    engine::notation::format_points(&line)
                )),
                StudyAnswer::Undecided => t.inconclusive += 1,
                _ => {}
            }
        }
        WrongReason::OpponentWins { .. } => {
            t.wins_checked += 1;
            match ask(checker, after, them, StudySearch::Vcf) {
                StudyAnswer::Win { .. } => {}
                StudyAnswer::Undecided => t.inconclusive += 1,
                other => problems.push(format!("{at}: the opponent's win is not one: {other:?}")),
            }
        }
        WrongReason::DoesNotStop { .. } => {
            t.wins_checked += 1;
            match ask(checker, after, them, StudySearch::Vct) {
                StudyAnswer::Win { .. } => {}
                StudyAnswer::Undecided => t.inconclusive += 1,
                other => problems.push(format!("{at}: the opponent's win is not one: {other:?}")),
            }
        }
        WrongReason::NotForcing { fours } => {
            t.not_forcing += 1;
            if !refutation.is_empty() {
                problems.push(format!("{at}: a move that forces nothing got a refutation"));
            }
            if fours && !after.cells_with(me, threat::FIVE).is_empty() {
                problems.push(format!("{at}: called no four, but it is one"));
            }
            if !fours {
                // No threat: were the opponent to pass, the player would have no win with
                // fours (the threat a VCT's move must make).
                if let StudyAnswer::Win { .. } = ask(checker, after, me, StudySearch::Vcf) {
                    problems.push(format!("{at}: called not forcing, but it threatens a VCF"));
                }
            }
        }
    }
}
