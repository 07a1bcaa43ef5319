//! Determinism of the solver under a node budget, and independence from what it was asked
//! before.
//!
//! Source: DESIGN section 4 ("deterministic under a node budget") and the engine's own
//! contract in `engine::search` ("Under a node budget every answer is deterministic"): the same
//! position and budget give the same answer, node count and line, every time; and a verdict
//! (win, no win) is a fact about the position, so a solver that has answered other questions
//! must give the same one as a fresh solver (common practice for a transposition table: it
//! may save work, never change a result).
//!
//! Positions: `POSITIONS` seeded 9x9 positions from `samples.rs` (seed `SEED`), and a
//! hand-built 15x15 one.

use engine::notation::format_points;
use engine::search::{Budget, Mode, Solver, SolverConfig, Verdict};
use engine::{Rule, Stone};

use crate::common::stones;
use crate::samples::positions;

const SEED: u64 = 0xDE7E_2415;
const POSITIONS: usize = 200;

fn config() -> SolverConfig {
    SolverConfig {
        table_megabytes: 8,
        vcf_table_megabytes: 2,
        ..SolverConfig::default()
    }
}

#[test]
fn the_same_question_gives_the_same_answer_nodes_and_line() {
    let mut decided = 0;
    for sample in positions(SEED, POSITIONS / 3, 9) {
        for mode in [Mode::Vcf, Mode::Vct] {
            let a = Solver::new(config()).ask(Budget::nodes(100_000)).solve(
                &sample.board,
                sample.to_move,
                mode,
            );
            let b = Solver::new(config()).ask(Budget::nodes(100_000)).solve(
                &sample.board,
                sample.to_move,
                mode,
            );
            assert_eq!(a, b, "{} {mode:?}: two fresh solvers differ", sample.label);
            decided += (a.verdict != Verdict::Unknown) as usize;
        }
    }
    assert!(decided >= POSITIONS / 3, "{decided}");
}

#[test]
fn a_small_budget_runs_out_the_same_way_every_time() {
    // A VCT question on a crowded 15x15 board with a budget far too small: the answer is
    // Unknown, and the node count is exactly the budget's, the same both times.
    let b = stones(
        Rule::Freestyle,
        "h8 i9 g9 h10 j7 f10 g6 k8",
        "h9 i8 g8 j9 h7 f9 i10 e11",
    );
    let mut unknown = 0;
    for budget in [50u64, 200, 1_000] {
        for mode in [Mode::Vcf, Mode::Vct] {
            let x = Solver::new(config())
                .ask(Budget::nodes(budget))
                .solve(&b, Stone::Black, mode);
            let y = Solver::new(config())
                .ask(Budget::nodes(budget))
                .solve(&b, Stone::Black, mode);
            assert_eq!(x, y, "budget {budget} {mode:?}");
            if x.verdict == Verdict::Unknown {
                unknown += 1;
                assert!(x.line.is_empty());
            }
        }
    }
    assert!(unknown >= 2, "the budgets should run out: {unknown}");
    // The seeded positions under a budget that often runs out.
    let mut unknown = 0;
    for sample in positions(SEED, 40, 9) {
        let x = Solver::new(config()).ask(Budget::nodes(300)).solve(
            &sample.board,
            sample.to_move,
            Mode::Vct,
        );
        let y = Solver::new(config()).ask(Budget::nodes(300)).solve(
            &sample.board,
            sample.to_move,
            Mode::Vct,
        );
        assert_eq!(x, y, "{}", sample.label);
        unknown += (x.verdict == Verdict::Unknown) as usize;
    }
    assert!(unknown >= 5, "too few budgets ran out: {unknown}");
}

#[test]
fn a_reused_solver_gives_the_verdicts_of_a_fresh_one_for_vcf() {
    // One solver answers every question in turn; a fresh solver answers each alone.
    let mut reused = Solver::new(config());
    let mut compared = 0;
    for sample in positions(SEED, POSITIONS, 9) {
        let again =
            reused
                .ask(Budget::nodes(200_000))
                .solve(&sample.board, sample.to_move, Mode::Vcf);
        let fresh = Solver::new(config()).ask(Budget::nodes(200_000)).solve(
            &sample.board,
            sample.to_move,
            Mode::Vcf,
        );
        assert_eq!(again.verdict, fresh.verdict, "{}: VCF", sample.label);
        assert_eq!(
            again.line.len(),
            fresh.line.len(),
            "{}: VCF line {} against {}",
            sample.label,
            format_points(&again.line),
            format_points(&fresh.line)
        );
        compared += 1;
    }
    assert_eq!(compared, POSITIONS);
}

#[test]
fn a_reused_solver_gives_the_verdicts_of_a_fresh_one_for_vct() {
    // The same for VCT, with the default depth; every mismatch is listed in the failure.
    let mut reused = Solver::new(config());
    let (mut same, mut differ) = (0, Vec::new());
    for sample in positions(SEED, POSITIONS, 9) {
        let again =
            reused
                .ask(Budget::nodes(200_000))
                .solve(&sample.board, sample.to_move, Mode::Vct);
        let fresh = Solver::new(config()).ask(Budget::nodes(200_000)).solve(
            &sample.board,
            sample.to_move,
            Mode::Vct,
        );
        if again.verdict == fresh.verdict {
            same += 1;
        } else {
            differ.push(format!(
                "{}: reused {:?}, fresh {:?}",
                sample.label, again.verdict, fresh.verdict
            ));
        }
    }
    eprintln!(
        "reused against fresh, VCT: {same} agree, {} differ{}",
        differ.len(),
        differ
            .first()
            .map(|d| format!(", the first: {d}"))
            .unwrap_or_default()
    );
    assert!(differ.is_empty(), "{differ:?}");
}

#[test]
fn winning_moves_do_not_depend_on_an_earlier_search() {
    // A regression check for a bug found while writing these checks. Freestyle 9x9, white to
    // move. A fresh solver (VCT depth 2) finds four winning first moves: d7 (the four d5-d8,
    // then a3 and the rest), a3, c4 and g4. The same solver asked first to `solve` the
    // position, then for `winning_moves`, used to leave out d7, although d7 still wins (a
    // fresh `wins_after` proves it): a VCT node's key held the position, side, mode and
    // remaining depth but not the attacker stones played since the root, which the
    // dependency rule of threat-space search uses to restrict the attacker's threats, so a
    // disproof found under one restriction was reused under another. The same mechanism
    // could make `defences` list a move that does not defend and `wins_after` grade a winning
    // move as losing. (It passes with the played-set hash in the VCT keys.)
    let x = engine::notation::setup(
        9,
        Rule::Freestyle,
        "d4 e4 f4 e5 g5 e6 e8 f8 g8 f2",
        "c3 f3 e2 c5 d5 d6 f6 e7 d8",
    )
    .unwrap();
    let cfg = SolverConfig {
        vct_depth: 2,
        ..SolverConfig::default()
    };
    // Whatever a fresh solver says of d7 (the verdict changed when the solver learnt to try
    // every defender counter-four), a reused one must say the same.
    let mut d7 = x.clone();
    d7.place(crate::common::p("d7"), Stone::White);
    let (v, _) = Solver::new(cfg.clone())
        .ask(Budget::VERIFICATION)
        .wins_after(&d7, Stone::White, Stone::Black, Mode::Vct);
    let (v_again, _) = {
        let mut s = Solver::new(cfg.clone());
        let _ = s
            .ask(Budget::VERIFICATION)
            .solve(&x, Stone::White, Mode::Vct);
        s.ask(Budget::VERIFICATION)
            .wins_after(&d7, Stone::White, Stone::Black, Mode::Vct)
    };
    assert_eq!(
        v, v_again,
        "d7 after an earlier search, against a fresh solver"
    );
    let mut fresh = Solver::new(cfg.clone())
        .ask(Budget::VERIFICATION)
        .winning_moves(&x, Stone::White, Mode::Vct)
        .proved;
    fresh.sort();
    let fresh_verdict = Solver::new(cfg.clone())
        .ask(Budget::VERIFICATION)
        .solve(&x, Stone::White, Mode::Vct)
        .verdict;
    let mut reused = Solver::new(cfg);
    assert_eq!(
        reused
            .ask(Budget::VERIFICATION)
            .solve(&x, Stone::White, Mode::Vct)
            .verdict,
        fresh_verdict
    );
    let mut again = reused
        .ask(Budget::VERIFICATION)
        .winning_moves(&x, Stone::White, Mode::Vct)
        .proved;
    again.sort();
    assert_eq!(
        format_points(&again),
        format_points(&fresh),
        "winning first moves after a solve, against a fresh solver"
    );
}
