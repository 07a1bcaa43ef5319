//! Consistency of the solver's answers with each other, with the board's symmetries, and with
//! the three rules.
//!
//! Sources:
//! * every VCF is a VCT: a four is a threat, so the VCT class contains the VCF class (Allis,
//!   van den Herik and Huntjens, "Go-Moku and Threat-Space Search", 1993: threat sequences
//!   made only of fours are threat sequences);
//! * the rules of five-in-a-row do not depend on the board's orientation, so rotating or
//!   reflecting a position rotates or reflects its answers (common practice);
//! * the rule differences of DESIGN section 3: under standard rules an overline does not win,
//!   so a "four" whose only completion makes six is no four; under renju black may not block on
//!   a forbidden point (RIF 1996/1998), so a white four whose block is forbidden wins.
//!
//! Sizes: `VCT_POSITIONS` seeded 9x9 positions from `samples.rs` (seed `SEED`) for the class
//! inclusion, and every `SYMMETRY_STEP`-th of them under all eight symmetries; a solver with
//! small tables, cleared before every question so that no answer depends on what was asked
//! before (see `solver_determinism` for why that matters).

use engine::notation::format_points;
use engine::search::{Budget, Mode, Solver, SolverConfig, Verdict};
use engine::{Board, Forbidden, Point, Rule, Stone, Symmetry};

use crate::common::{p, stones};
use crate::referee::Referee;
use crate::samples::positions;

const SEED: u64 = 0xC0_5157_E27C;
const VCT_POSITIONS: usize = 600;
const SYMMETRY_STEP: usize = 6;

/// The budget of these questions.
const BUDGET: Budget = Budget::nodes(400_000);

fn solver() -> Solver {
    Solver::new(SolverConfig {
        table_megabytes: 4,
        vcf_table_megabytes: 2,
        ..SolverConfig::default()
    })
}

/// Solves with cleared tables.
fn solve(s: &mut Solver, b: &Board, c: Stone, mode: Mode) -> engine::search::Solution {
    solve_within(s, BUDGET, b, c, mode)
}

/// Solves with cleared tables within `budget`.
fn solve_within(
    s: &mut Solver,
    budget: Budget,
    b: &Board,
    c: Stone,
    mode: Mode,
) -> engine::search::Solution {
    s.clear();
    s.ask(budget).solve(b, c, mode)
}

#[test]
fn every_vcf_win_is_a_vct_win() {
    let mut s = solver();
    let (mut vcf_wins, mut vct_only) = (0, 0);
    for sample in positions(SEED, VCT_POSITIONS, 9) {
        let vcf = solve(&mut s, &sample.board, sample.to_move, Mode::Vcf);
        let vct = solve(&mut s, &sample.board, sample.to_move, Mode::Vct);
        match (vcf.verdict, vct.verdict) {
            (Verdict::Win, Verdict::Win) => vcf_wins += 1,
            (Verdict::Win, other) => panic!(
                "{}: VCF wins ({}) but VCT says {other:?} on\n{:?}",
                sample.label,
                format_points(&vcf.line),
                sample.board
            ),
            (Verdict::NoWin, Verdict::Win) => vct_only += 1,
            _ => {}
        }
        // A VCT win is never longer in threats than ... nothing more to compare: the VCT line
        // may use threes where the VCF needs more fours.
    }
    eprintln!("class inclusion: {vcf_wins} VCF wins all found by VCT; {vct_only} VCT-only wins");
    assert!(vcf_wins >= 50 && vct_only >= 20, "{vcf_wins} {vct_only}");
}

/// The image of a point under a symmetry of a `n` x `n` board.
fn image(s: Symmetry, q: Point, n: u8) -> Point {
    s.apply(q, n, n)
}

#[test]
fn answers_are_invariant_under_the_eight_symmetries() {
    let mut s = solver();
    let mut checked = [0usize; 2];
    let mut undecided = 0;
    let mut vct_notes: Vec<String> = Vec::new();
    for (k, sample) in positions(SEED, VCT_POSITIONS, 9).into_iter().enumerate() {
        if k % SYMMETRY_STEP != 0 {
            continue;
        }
        let n = sample.board.size();
        for mode in [Mode::Vcf, Mode::Vct] {
            let base = solve(&mut s, &sample.board, sample.to_move, mode);
            let firsts = |s: &mut Solver, b: &Board, back: Symmetry| -> (Vec<Point>, bool) {
                s.clear();
                let w = s.ask(BUDGET).winning_moves(b, sample.to_move, mode);
                let mut v: Vec<Point> = w.proved.iter().map(|&q| image(back, q, n)).collect();
                v.sort();
                (v, w.unknown.is_empty())
            };
            // Winning first moves are compared for VCF only (for VCT that is a search per
            // candidate move and image, too slow here).
            let (base_firsts, base_complete) = if base.verdict == Verdict::Win && mode == Mode::Vcf
            {
                firsts(&mut s, &sample.board, Symmetry::Identity)
            } else {
                (Vec::new(), false)
            };
            for sym in Symmetry::ALL {
                let b = sample.board.transformed(sym);
                let got = solve(&mut s, &b, sample.to_move, mode);
                let what = format!("{} {mode:?} under {sym:?}", sample.label);
                // The search order follows the board's cell order, so under a node budget one
                // image may run out where another finishes: only decided answers must agree.
                if got.verdict == Verdict::Unknown || base.verdict == Verdict::Unknown {
                    undecided += 1;
                    continue;
                }
                assert_eq!(got.verdict, base.verdict, "{what}: verdict");
                assert_eq!(got.depth, base.depth, "{what}: depth");
                if got.verdict != Verdict::Win {
                    continue;
                }
                checked[(mode == Mode::Vct) as usize] += 1;
                let back: Vec<Point> = got
                    .line
                    .iter()
                    .map(|&q| image(sym.inverse(), q, n))
                    .collect();
                let (got_firsts, got_complete) = if mode == Mode::Vcf {
                    firsts(&mut s, &b, sym.inverse())
                } else {
                    (Vec::new(), false)
                };
                let same_length = got.line.len() == base.line.len();
                let first_ok = base_firsts.contains(&back[0]);
                let firsts_ok = !(base_complete && got_complete) || got_firsts == base_firsts;
                if mode == Mode::Vcf {
                    // A VCF line has 2d + 1 moves for the least number d of fours, which the
                    // rotation cannot change; the winning first moves map onto each other.
                    assert!(
                        same_length,
                        "{what}: line {} against {}",
                        format_points(&got.line),
                        format_points(&base.line)
                    );
                    assert!(
                        first_ok,
                        "{what}: first move {} (mapped back) not among {}",
                        back[0],
                        format_points(&base_firsts)
                    );
                    assert!(
                        firsts_ok,
                        "{what}: winning first moves {} against {}",
                        format_points(&got_firsts),
                        format_points(&base_firsts)
                    );
                } else if !same_length {
                    // A known engine issue: the VCT line is shortest in threats that are not
                    // fours (its depth, checked above), not in moves, and which line comes
                    // out depends on the search order. Counted, not failed.
                    vct_notes.push(format!(
                        "{what}: line {} against {}",
                        format_points(&got.line),
                        format_points(&base.line)
                    ));
                }
            }
        }
    }
    eprintln!(
        "symmetry: {} VCF wins and {} VCT wins compared in all their images ({undecided} images \
         skipped as undecided); VCT images whose line length differs: \
         {}{}",
        checked[0],
        checked[1],
        vct_notes.len(),
        vct_notes
            .first()
            .map(|n| format!(", the first: {n}"))
            .unwrap_or_default()
    );
    assert!(checked[0] >= 8 * 15 && checked[1] >= 8 * 15, "{checked:?}");
    assert!(undecided <= 40, "too many undecided images: {undecided}");
}

// ---------------------------------------------------------------------------------------------
// The rules give different answers.

#[test]
fn an_overline_four_wins_under_freestyle_but_not_under_standard() {
    // Row 8: white c8, black d8 e8 f8 . h8? no: black d8 e8 f8 and i8, white c8 and j8, so the
    // row holds c8(O) d8 e8 f8 g8 h8 i8 j8(O). Column h: black h9 h10 h11, white h12. Black's
    // h8 makes the column four h8-h11 (completion h7) and, in the row, d8 e8 f8 . h8 i8,
    // whose only completion g8 makes six (d8-i8).
    let black = "d8 e8 f8 i8 h9 h10 h11";
    let white = "c8 j8 h12 a1 o1 a15 o15";
    // Freestyle: six wins, so h8 is a double four and wins at once.
    let b = stones(Rule::Freestyle, black, white);
    let mut s = Solver::default();
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::Black, Mode::Vcf);
    assert_eq!(sol.verdict, Verdict::Win, "freestyle");
    assert_eq!(sol.line[0], p("h8"), "{}", format_points(&sol.line));
    assert_eq!(sol.line.len(), 3, "{}", format_points(&sol.line));
    let mut r = Referee::of(&b);
    let g8 = r.idx(p("g8"));
    r.place(r.idx(p("h8")), Stone::Black);
    assert!(
        r.makes_five(g8, Stone::Black),
        "referee: g8 makes six, a win"
    );
    // Standard: exactly five wins, so g8 completes nothing and h8 is a single four: after the
    // block h7 black has no four left.
    let b = stones(Rule::Standard, black, white);
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::Black, Mode::Vcf);
    assert_eq!(
        sol.verdict,
        Verdict::NoWin,
        "standard: {}",
        format_points(&sol.line)
    );
    let mut r = Referee::of(&b);
    assert_eq!(r.vcf(Stone::Black), None, "referee: no VCF under standard");
    r.place(r.idx(p("h8")), Stone::Black);
    assert!(!r.makes_five(g8, Stone::Black), "referee: six is no five");
    assert!(b.threats(p("h8"), Stone::Black).fours() == 1);
    // Renju judges black's five the same way (exactly five): no VCF either.
    let b = stones(Rule::Renju, black, white);
    assert_eq!(
        s.ask(Budget::VERIFICATION)
            .solve(&b, Stone::Black, Mode::Vcf)
            .verdict,
        Verdict::NoWin,
        "renju"
    );
}

/// White e5 f6 g7 (black c3 closes the diagonal below): d4 makes the four d4-g7 whose only
/// completion is h8 (i9 is black). Black's other stones make h8 forbidden for black in renju,
/// for the given reason; white has no other four worth anything. Under renju white wins by
/// d4; under freestyle black blocks h8 and white's fours run out.
fn forbidden_trap(extra_black: &str, extra_white: &str, why: Forbidden) {
    let black = format!("c3 i9 {extra_black}");
    let white = format!("e5 f6 g7 {extra_white}");
    let b = stones(Rule::Renju, &black, &white);
    assert_eq!(b.forbidden(p("h8")), Some(why), "renju: h8 on\n{b:?}");
    // The independent reading of the rules agrees that h8 is forbidden.
    let mut r = Referee::of(&b);
    let h8 = r.idx(p("h8"));
    assert!(
        !r.legal(h8, Stone::Black),
        "referee: h8 is forbidden for black"
    );
    let mut s = Solver::default();
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::White, Mode::Vcf);
    assert_eq!(sol.verdict, Verdict::Win, "renju ({why:?})");
    assert_eq!(sol.line[0], p("d4"), "{}", format_points(&sol.line));
    assert_eq!(
        sol.line.last(),
        Some(&p("h8")),
        "{}",
        format_points(&sol.line)
    );
    assert_eq!(sol.line.len(), 3, "{}", format_points(&sol.line));
    // Confirmed by the referee: after d4 every legal black reply loses to h8.
    let mut r = Referee::of(&b);
    let mut board = b.clone();
    let mut none = |_: &Board, _: Stone| -> Option<Point> { None };
    assert_eq!(
        r.confirm(&mut board, Stone::White, &sol.line, 0, &mut none),
        Ok(()),
        "referee ({why:?})"
    );
    assert!(
        s.ask(Budget::VERIFICATION)
            .winning_moves(&b, Stone::White, Mode::Vcf)
            .proved
            .contains(&p("d4")),
        "d4 among the winning first moves"
    );
    // Freestyle: the same stones, nothing forbidden, no VCF for white.
    let b = stones(Rule::Freestyle, &black, &white);
    assert_eq!(b.forbidden(p("h8")), None);
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::White, Mode::Vcf);
    assert_eq!(
        sol.verdict,
        Verdict::NoWin,
        "freestyle ({why:?}): {}",
        format_points(&sol.line)
    );
    assert_eq!(
        Referee::of(&b).vcf(Stone::White),
        None,
        "referee, freestyle"
    );
}

#[test]
fn renju_white_wins_by_a_four_whose_block_is_a_double_three() {
    // h8 would make the threes h8-i8-j8 and h8-h9-h10 for black.
    forbidden_trap("i8 j8 h9 h10", "a1 o1 o15", Forbidden::DoubleThree);
}

#[test]
fn renju_white_wins_by_a_four_whose_block_is_a_double_four() {
    // h8 would make the fours h8-k8 (l8 white) and h8-h11 (h12 white) for black.
    forbidden_trap(
        "i8 j8 k8 h9 h10 h11",
        "l8 h12 a1 o1 o15",
        Forbidden::DoubleFour,
    );
}

#[test]
fn renju_white_wins_by_a_four_whose_block_is_an_overline() {
    // h8 would make six for black: e8 f8 g8 h8 i8 j8. Under freestyle that six wins for black,
    // so there white must block it and has no win either.
    forbidden_trap("e8 f8 g8 i8 j8", "a1 o1 o15", Forbidden::Overline);
}

/// A budget that runs out is never taken for an answer: with the VCF questions inside a VCT
/// cut off almost at once (`vcf_spend_limit`), a search that needed them ends `Unknown`, never
/// with the opposite of the full search's verdict. (The three outcomes are the solver's
/// contract, DESIGN section 4; the full search's wins are confirmed by the referee in
/// `solver_sound`.)
#[test]
fn an_exhausted_vcf_budget_never_becomes_a_verdict() {
    let mut full = solver();
    let starved = |limit| Budget {
        vcf_spend: Some(limit),
        ..Budget::VERIFICATION
    };
    let starved = [starved(300), starved(3_000), starved(30_000)];
    let mut cut = solver();
    let (mut agreed, mut unknown, mut wins) = (0, 0, 0);
    for (i, sample) in positions(SEED ^ 0x5_7A2E, 150, 9).into_iter().enumerate() {
        let (b, c) = (&sample.board, sample.to_move);
        let want = solve(&mut full, b, c, Mode::Vct).verdict;
        let got = solve_within(&mut cut, starved[i % 3], b, c, Mode::Vct).verdict;
        match (want, got) {
            (_, Verdict::Unknown) => unknown += 1,
            (w, g) if w == g => {
                agreed += 1;
                wins += (g == Verdict::Win) as u32;
            }
            (Verdict::Unknown, _) => {}
            (w, g) => panic!(
                "{}: the full search says {}, the starved one {}",
                sample.label,
                w.name(),
                g.name()
            ),
        }
    }
    eprintln!("starved VCF budgets: {unknown} unknown, {agreed} agreed ({wins} wins)");
    assert!(
        unknown > 0 && wins > 0,
        "{unknown} unknown, {agreed} agreed ({wins} wins): the starved budgets should sometimes \
         run out and sometimes still prove a win"
    );
}

/// The shortest VCF a solution reports is the least depth with a win: on every VCF win of the
/// solver suite (`engine/benches/suite.txt`, whose lengths were recorded when it was made), the
/// solution's depth is the recorded one, a win within that many fours is proved on its own,
/// and no win within one fewer exists. (The solver benchmark checks the recorded lengths too,
/// but it does not run with the tests.)
#[test]
fn the_shortest_vcf_is_the_least_depth_with_a_win() {
    let cases = engine::suite::parse(include_str!("../../engine/benches/suite.txt"))
        .expect("the suite reads");
    let mut s = Solver::default();
    let mut checked = 0;
    for case in cases
        .iter()
        .filter(|c| c.mode == Mode::Vcf && c.verdict == Verdict::Win)
    {
        let (b, c) = (case.board(), case.to_move);
        let sol = solve_within(&mut s, Budget::VERIFICATION, &b, c, Mode::Vcf);
        assert_eq!(
            (sol.verdict, sol.depth),
            (Verdict::Win, case.fours),
            "{case}"
        );
        let within = |s: &mut Solver, d: u16| {
            s.clear();
            s.ask(Budget::VERIFICATION).wins_within(&b, c, Mode::Vcf, d)
        };
        assert_eq!(within(&mut s, sol.depth), Verdict::Win, "{case}");
        if sol.depth > 0 {
            assert_eq!(within(&mut s, sol.depth - 1), Verdict::NoWin, "{case}");
        }
        // The line has that many fours before the five (attacker and defender alternate).
        assert_eq!(
            sol.line.len(),
            2 * sol.depth as usize + 1,
            "{case}: {:?}",
            sol.line
        );
        checked += 1;
    }
    assert!(checked >= 100, "only {checked} VCF wins in the suite");
}
