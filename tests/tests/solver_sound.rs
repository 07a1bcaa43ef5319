//! Soundness of the solver on seeded random middle-game positions, against the referee.
//!
//! Source of the definitions: the VCF and VCT classes as the threat-space search paper
//! defines the threats (L. V. Allis, H. J. van den Herik and M. P. H. Huntjens, "Go-Moku and
//! Threat-Space Search", 1993), the rules of DESIGN section 3 (RIF 1996/1998 for renju), and
//! what a "win" means in the game itself: the attacker makes five whatever the defender does.
//! The referee (`referee.rs`) judges all of this with its own scans.
//!
//! What is checked, on `POSITIONS` positions of `samples.rs` (9x9, the three rules in turn,
//! three in four random stones and one in four from self-play), with the side to move as the
//! attacker:
//! * every VCF **win** the solver claims: the line alternates, starts with the attacker, every
//!   move is legal for its mover, every attacker move before the last is a four by the
//!   referee's own test and the last is a five; the referee's exhaustive search finds a VCF
//!   too; and the referee confirms the win letting the defender play every legal empty point
//!   at every defender node, following the claimed line while play stays on it;
//! * every VCF **no-win**: the referee's exhaustive fours-only search finds no VCF either;
//! * every VCT **win**: the same line checks (without the four test), and the referee confirms
//!   it as above. Off the main line the attacker continues with the referee's own VCF when it
//!   has one, else with the move the solver suggests when re-solving from that node; if that
//!   does not settle it, a second run may also use one threat of the referee's own choosing
//!   per path (re-solving from a node loses the original search's context: under the
//!   dependency rule a threat may rest on a stone played before that node).
//!
//! Two engine bugs were found by this sweep and fixed: VCT once dismissed defender
//! counter-fours (`solver_trade::a_counter_four_that_wins_is_not_dismissed` now guards it;
//! `TOLERATE_COUNTER_FOUR_BUG` stays `false`, so any such refutation fails the sweep), and a
//! line could show a renju black defender blocking on a forbidden point
//! (`solver_trade::line_never_shows_a_forbidden_block`; such lines are counted and must stay
//! at zero). A third, a reused solver giving advice a fresh one would not, is guarded by
//! `solver_determinism::winning_moves_do_not_depend_on_an_earlier_search`.
//!
//! Sizes, chosen so that the module runs in well under a minute with `cargo test --release
//! -p fivefold-tests` on two cores: 16 s when written (about 210 s in the default test
//! profile, where this crate's referee is not optimised; the engine always is):
//! * `POSITIONS` = 2,000 positions, seed `SEED`;
//! * the solver under test has a node limit of `NODE_LIMIT` per search and a VCT depth of
//!   `VCT_DEPTH` threats that are not fours (the default is 6): a VCT of depth d makes the
//!   referee try every reply at d nested full-width defender nodes, so the cost grows like
//!   (empty points)^d; depth 2 keeps every claim fully verifiable. Verdicts the budget leaves
//!   Unknown are counted and not checked (there were none when this was written);
//! * the referee may visit `REFEREE_NODES` attacker nodes per claim (`REFEREE_NODES_OWN` in
//!   the second run); running out is a test failure (a claim we could not confirm is not a
//!   confirmed claim).
//!
//! When written, the sweep found 519 VCF wins (all confirmed), 1,481 VCF no-wins (all
//! confirmed), and 745 VCT wins, of which 693 were confirmed and 52 failed on a path through
//! a defender counter-four (the known bug; in the first of them, seed #26, black's reply e4
//! is a four-three and black wins outright).

use std::time::Instant;

use engine::search::{Budget, Mode, Solver, SolverConfig, Verdict};
use engine::{Board, Point, Stone};

use crate::referee::{path_text, through_counter_four, Fail, Referee};
use crate::samples::{positions, Sample};

const SEED: u64 = 0x5EED_50DE_0001;
const POSITIONS: usize = 2_000;
const NODE_LIMIT: u64 = 200_000;
const VCT_DEPTH: u16 = 2;
const REFEREE_NODES: u64 = 400_000;
/// The budget of the second run, which may add threats of the referee's own.
const REFEREE_NODES_OWN: u64 = 100_000;
/// Threats of its own choosing the referee may add on any path where the line, its own VCF
/// and the solver's advice give no working move.
const OWN_MOVES: u8 = 1;

/// While the engine dismisses defender counter-fours (see `solver_trade::
/// a_counter_four_that_wins_is_not_dismissed`, ignored until the fix), a VCT claim that the
/// referee refutes through a defender four is counted and printed instead of failing the
/// test. Every other refutation fails it. Set to `false` once the engine is fixed.
const TOLERATE_COUNTER_FOUR_BUG: bool = false;

fn solver() -> Solver {
    Solver::new(SolverConfig {
        vct_depth: VCT_DEPTH,
        table_megabytes: 16,
        vcf_table_megabytes: 4,
    })
}

#[derive(Default, Debug)]
struct Counts {
    vcf_win: usize,
    vcf_no_win: usize,
    vcf_unknown: usize,
    vct_win: usize,
    vct_no_win: usize,
    vct_unknown: usize,
    referee_nodes: u64,
    forbidden_blocks: usize,
    counter_four_refuted: usize,
    stale_advice: usize,
    failures: Vec<String>,
    needed_own_threats: usize,
    vct_failures: usize,
    t_vcf: f64,
    t_vct_solve: f64,
}

/// The line's shape: attacker first, alternating, on empty points, legal for the mover by the
/// referee's test, nobody makes five before the end, and the last move is the attacker's five.
/// For a VCF, every attacker move before the five must be a four.
///
/// One exception is counted rather than failed, because it is a known engine bug reported
/// with a minimal position in `solver_trade::line_never_shows_a_forbidden_block` (ignored
/// until fixed): after an attacker move that makes two fives, the line may show a renju
/// black defender "blocking" on a forbidden point. Nothing depends on that move (every
/// defender move loses there, and the referee's confirmation below skips illegal replies).
/// Returns the number of such moves.
fn check_line(s: &Sample, mode: Mode, line: &[Point]) -> Result<usize, String> {
    let mut forbidden_blocks = 0;
    let a = s.to_move;
    let mut r = Referee::of(&s.board);
    if line.len() % 2 != 1 {
        return Err(format!("the line {line:?} does not end with the attacker"));
    }
    for (k, &p) in line.iter().enumerate() {
        let c = if k % 2 == 0 { a } else { a.opponent() };
        if p.x >= s.board.size() || p.y >= s.board.size() {
            return Err(format!("move {} ({p}) is off the board", k + 1));
        }
        let i = r.idx(p);
        if !r.is_empty(i) {
            return Err(format!("move {} ({p}) is on a stone", k + 1));
        }
        if !r.legal(i, c) {
            if c != a && r.five_points(a).len() >= 2 {
                forbidden_blocks += 1;
            } else {
                return Err(format!("move {} ({p}) is forbidden for {c}", k + 1));
            }
        }
        let five = r.makes_five(i, c);
        let last = k + 1 == line.len();
        if five != last {
            return Err(format!(
                "move {} ({p}) {} a five",
                k + 1,
                if five { "makes" } else { "is not" }
            ));
        }
        if mode == Mode::Vcf && c == a && !last && !r.makes_four(i, c) {
            return Err(format!("attacker move {} ({p}) is not a four", k + 1));
        }
        r.place(i, c);
    }
    Ok(forbidden_blocks)
}

/// One confirmation run: the referee with `own` threats of its own allowed per path.
fn run_referee(
    solver: &mut Solver,
    s: &Sample,
    mode: Mode,
    line: &[Point],
    own: u8,
    c: &mut Counts,
) -> Result<(), Fail> {
    let mut r = Referee::of(&s.board);
    r.reset_budget(if own == 0 {
        REFEREE_NODES
    } else {
        REFEREE_NODES_OWN
    });
    let mut board = s.board.clone();
    let mut stale = 0;
    let mut adviser = |b: &Board, a: Stone| -> Option<Point> {
        let sol = solver.ask(Budget::nodes(NODE_LIMIT)).solve(b, a, mode);
        if sol.verdict == Verdict::Win {
            return Some(sol.line[0]);
        }
        // A solver that has searched other positions could answer "no win" from its table
        // where a fresh one finds the win (an engine bug, now checked by
        // `solver_determinism::winning_moves_do_not_depend_on_an_earlier_search`): ask again
        // with cleared tables, and count it.
        solver.clear();
        let sol = solver.ask(Budget::nodes(NODE_LIMIT)).solve(b, a, mode);
        if sol.verdict == Verdict::Win {
            stale += 1;
            return Some(sol.line[0]);
        }
        None
    };
    let result = r.confirm(&mut board, s.to_move, line, own, &mut adviser);
    c.stale_advice += stale;
    c.referee_nodes += r.nodes;
    result
}

/// Confirms a claimed win with the referee: first following the line, its own VCF and the
/// solver's advice only; if that does not settle it, once more allowing one threat of its
/// own per path (the solver's advice comes from re-solving at the node, which loses the
/// context of the original search: under the dependency rule a threat may rest on a stone
/// played before that node).
fn confirm(solver: &mut Solver, s: &Sample, mode: Mode, line: &[Point], c: &mut Counts) {
    let mut result = run_referee(solver, s, mode, line, 0, c);
    let counter_four = |r: &Result<(), Fail>| match r {
        Err(Fail::Refuted { path, .. }) => {
            TOLERATE_COUNTER_FOUR_BUG
                && mode == Mode::Vct
                && through_counter_four(&s.board, s.to_move, path)
        }
        _ => false,
    };
    // A refutation through a counter-four is not run again: when this was written, the
    // second run confirmed none of those and doubled the module's time.
    let mut first = String::new();
    if matches!(result, Err(Fail::Refuted { .. })) && !counter_four(&result) {
        first = match &result {
            Err(Fail::Refuted { path, why }) => format!(
                " (without threats of its own: refuted after {}: {})",
                path_text(path),
                why.lines().next().unwrap_or("")
            ),
            _ => " (without threats of its own: out of budget)".to_string(),
        };
        result = run_referee(solver, s, mode, line, OWN_MOVES, c);
        if result.is_ok() {
            c.needed_own_threats += 1;
        }
    }
    let known = counter_four(&result);
    let message = match &result {
        Ok(()) => return,
        Err(Fail::Budget) => format!(
            "{}: the referee ran out of budget ({REFEREE_NODES} nodes) confirming the {mode:?} \
             line {}{first} on\n{:?}",
            s.label,
            engine::notation::format_points(line),
            s.board
        ),
        Err(Fail::Refuted { path, why }) => format!(
            "{}: the solver claims a {mode:?} win with the line {}, but the referee refutes \
             it: after {}: {why}\non\n{:?}",
            s.label,
            engine::notation::format_points(line),
            path_text(path),
            s.board
        ),
    };
    if !known {
        if mode == Mode::Vct {
            c.vct_failures += 1;
        }
        c.failures.push(message);
        return;
    }
    if c.counter_four_refuted == 0 {
        eprintln!("known engine bug (counter-four dismissed), first case: {message}");
    }
    c.counter_four_refuted += 1;
}

fn check_position(solver: &mut Solver, s: &Sample, c: &mut Counts) {
    let a = s.to_move;
    let t0 = Instant::now();
    let mut referee = Referee::of(&s.board);
    let own_vcf = referee.vcf(a);

    let vcf = solver
        .ask(Budget::nodes(NODE_LIMIT))
        .solve(&s.board, a, Mode::Vcf);
    match vcf.verdict {
        Verdict::Win => {
            c.vcf_win += 1;
            match check_line(s, Mode::Vcf, &vcf.line) {
                Ok(n) => c.forbidden_blocks += n,
                Err(e) => panic!(
                    "{}: bad VCF line {:?}: {e}\non\n{:?}",
                    s.label, vcf.line, s.board
                ),
            }
            assert!(
                own_vcf.is_some(),
                "{}: the solver's VCF {:?} is not found by the exhaustive search on\n{:?}",
                s.label,
                vcf.line,
                s.board
            );
            confirm(solver, s, Mode::Vcf, &vcf.line, c);
        }
        Verdict::NoWin => {
            c.vcf_no_win += 1;
            if let Some(m) = own_vcf {
                panic!(
                    "{}: the solver says no VCF, but the exhaustive search wins starting with {} \
                     on\n{:?}",
                    s.label,
                    referee.point(m),
                    s.board
                );
            }
        }
        Verdict::Unknown => c.vcf_unknown += 1,
    }

    c.t_vcf += t0.elapsed().as_secs_f64();
    let t1 = Instant::now();
    let vct = solver
        .ask(Budget::nodes(NODE_LIMIT))
        .solve(&s.board, a, Mode::Vct);
    c.t_vct_solve += t1.elapsed().as_secs_f64();
    match vct.verdict {
        Verdict::Win => {
            c.vct_win += 1;
            match check_line(s, Mode::Vct, &vct.line) {
                Ok(n) => c.forbidden_blocks += n,
                Err(e) => panic!(
                    "{}: bad VCT line {:?}: {e}\non\n{:?}",
                    s.label, vct.line, s.board
                ),
            }
            confirm(solver, s, Mode::Vct, &vct.line, c);
        }
        Verdict::NoWin => c.vct_no_win += 1,
        Verdict::Unknown => c.vct_unknown += 1,
    }
}

#[test]
fn solver_wins_and_vcf_no_wins_are_confirmed_by_the_referee() {
    let start = Instant::now();
    let samples = positions(SEED, POSITIONS, 9);
    let generated = start.elapsed().as_secs_f64();
    let mut solver = solver();
    let mut c = Counts::default();
    for s in &samples {
        check_position(&mut solver, s, &mut c);
    }
    let vcf_confirmed = c.vcf_win;
    let vct_confirmed = c.vct_win - c.counter_four_refuted - c.vct_failures;
    eprintln!(
        "soundness: {POSITIONS} positions in {:.1} s (generated in {generated:.1} s). VCF: {} \
         wins claimed and confirmed by the referee, {} no-wins confirmed by its exhaustive \
         search, {} unknown. VCT: {} wins claimed, {vct_confirmed} confirmed ({} of them with a \
         threat of the referee's own), {} refuted through a counter-four (known bug), {} not \
         confirmed; {} no-wins and {} unknown not checked. Known bugs also seen: {} lines \
         showing a forbidden block, {} pieces of advice found only with cleared tables. \
         Referee attacker nodes: {}. Time in VCF solving and checking {:.1} s, in VCT solving \
         {:.1} s, the rest in confirming.",
        start.elapsed().as_secs_f64(),
        vcf_confirmed,
        c.vcf_no_win,
        c.vcf_unknown,
        c.vct_win,
        c.needed_own_threats,
        c.counter_four_refuted,
        c.vct_failures,
        c.vct_no_win,
        c.vct_unknown,
        c.forbidden_blocks,
        c.stale_advice,
        c.referee_nodes,
        c.t_vcf,
        c.t_vct_solve
    );
    for f in c.failures.iter() {
        eprintln!("FAILURE: {f}");
    }
    assert!(
        c.failures.is_empty(),
        "{} claims not confirmed; the first: {}",
        c.failures.len(),
        c.failures[0]
    );
    assert_eq!(samples.len(), POSITIONS);
    // Not vacuous: each kind of claim must occur, and often.
    assert!(
        vcf_confirmed >= 200,
        "too few VCF wins confirmed: {vcf_confirmed}"
    );
    assert!(
        c.vcf_no_win >= 200,
        "too few VCF no-wins confirmed: {}",
        c.vcf_no_win
    );
    assert!(
        vct_confirmed >= vcf_confirmed + 50,
        "too few VCT wins confirmed beyond the VCF ones: {vct_confirmed} against {vcf_confirmed}"
    );
}
