//! Hand-built positions from the trade, solved and checked move by move.
//!
//! Sources: the rules of thumb quoted in DESIGN section 1 (common practice among players and
//! instructors): a four-three wins unless the defender has a counter-four; an open three must be
//! answered at once, by blocking it or by a four; and the threat definitions of L. V. Allis,
//! H. J. van den Herik and M. P. H. Huntjens, "Go-Moku and Threat-Space Search" (1993): a three
//! (`..XXX..`) and a broken three (`.XX.X.`) become a straight four in one move, so the
//! defender must take one of the points that stop every straight four: the two ends of the
//! three, and for the broken three also the gap (from memory of the paper's defence squares;
//! the sets are also checked here by brute force).
//!
//! Every position is built by hand on a 15x15 board (`h8` the centre). "Filler" stones on the
//! four corners only even out the stone counts; they are too far apart to make anything.
//! Besides the solver's answers, each check asks the referee (`referee.rs`, which shares no
//! code with the engine's search) to confirm the facts it rests on.
//!
//! The last tests show engine bugs found while writing these checks, on minimal positions;
//! each says what the correct answer is. They were fixed and the tests guard them.

use engine::notation::format_points;
use engine::search::{Budget, Mode, Solver, Verdict};
use engine::{Board, Point, Rule, Stone};

use crate::common::{p, stones};
use crate::referee::{Fail, Referee};

fn pts(list: &str) -> Vec<Point> {
    list.split_whitespace().map(p).collect()
}

/// The referee confirms that `a`, to move, wins along `line` (every defender reply tried;
/// off the line the referee continues with its own VCF, else with the solver's advice).
fn referee_confirms(solver: &mut Solver, board: &Board, a: Stone, line: &[Point], mode: Mode) {
    let mut adviser = |b: &Board, c: Stone| -> Option<Point> {
        let s = solver.ask(Budget::VERIFICATION).solve(b, c, mode);
        (s.verdict == Verdict::Win).then(|| s.line[0])
    };
    let mut r = Referee::of(board);
    r.reset_budget(200_000);
    let mut b = board.clone();
    match r.confirm(&mut b, a, line, 1, &mut adviser) {
        Ok(()) => {}
        Err(Fail::Budget) => panic!("the referee ran out of budget on\n{board:?}"),
        Err(Fail::Refuted { path, why }) => panic!(
            "the referee refutes {} after {path:?}: {why}\non\n{board:?}",
            format_points(line)
        ),
    }
}

/// The referee's exhaustive VCF search for `a`, to move.
fn referee_vcf(board: &Board, a: Stone) -> Option<Point> {
    let mut r = Referee::of(board);
    r.vcf(a).map(|i| r.point(i))
}

// ---------------------------------------------------------------------------------------------
// Four-three.

/// Black h8 i8 j8 (closed at g8 by white) and k9 k10: k8 makes the four h8-k8 (its only
/// completion l8) and the three k8-k9-k10 (k7 and k11 open) at once.
const FOUR_THREE_BLACK: &str = "h8 i8 j8 k9 k10";
const FOUR_THREE_WHITE: &str = "g8 a1 o1 a15 o15";

#[test]
fn a_four_three_wins_by_vcf() {
    // Common practice: the four forces the block, then the three becomes a straight four.
    let b = stones(Rule::Freestyle, FOUR_THREE_BLACK, FOUR_THREE_WHITE);
    let t = b.threats(p("k8"), Stone::Black);
    assert!(t.four_three(), "k8 should be a four-three: {t:?}");
    let mut r = Referee::of(&b);
    let k8 = r.idx(p("k8"));
    assert!(r.makes_four(k8, Stone::Black), "referee: k8 is a four");

    let mut s = Solver::default();
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::Black, Mode::Vcf);
    assert_eq!(sol.verdict, Verdict::Win);
    // The line: k8 (four), l8 (the only block), k7 or k11 (a straight four), a block, five.
    let line = &sol.line;
    assert_eq!(line.len(), 5, "line {}", format_points(line));
    assert_eq!(
        &line[..2],
        &pts("k8 l8")[..],
        "line {}",
        format_points(line)
    );
    assert!(
        pts("k7 k11").contains(&line[2]),
        "line {}",
        format_points(line)
    );
    let straight = if line[2] == p("k7") {
        "k6 k11"
    } else {
        "k7 k12"
    };
    assert!(pts(straight).contains(&line[3]) && pts(straight).contains(&line[4]));
    assert_ne!(line[3], line[4]);
    assert_eq!(sol.depth, 2, "two fours before the five");
    referee_confirms(&mut s, &b, Stone::Black, line, Mode::Vcf);
    // k8 is the only winning first move by fours: l8 first is blocked at k8, and nothing else
    // is a four.
    let w = s
        .ask(Budget::VERIFICATION)
        .winning_moves(&b, Stone::Black, Mode::Vcf);
    assert_eq!(w.proved, pts("k8"), "{w:?}");
    assert!(w.unknown.is_empty());
    // The same stones win the same way under every rule (nothing here is an overline or a
    // forbidden point).
    for rule in [Rule::Standard, Rule::Renju] {
        let b = stones(rule, FOUR_THREE_BLACK, FOUR_THREE_WHITE);
        let sol = s
            .ask(Budget::VERIFICATION)
            .solve(&b, Stone::Black, Mode::Vcf);
        assert_eq!((sol.verdict, sol.line.len()), (Verdict::Win, 5), "{rule}");
        assert_eq!(sol.line[0], p("k8"), "{rule}");
    }
}

#[test]
fn a_four_three_loses_to_a_counter_four_made_by_the_block() {
    // Common practice: white l9 l10 l11 (closed at l12 by black) means that white's forced
    // block l8 makes the four l8-l11, whose only completion is l7. Black must block l7, which
    // is no four, so the fours run out: no VCF.
    let black = format!("{FOUR_THREE_BLACK} l12");
    let white = "g8 l9 l10 l11 a1 o1";
    let b = stones(Rule::Freestyle, &black, white);
    let mut s = Solver::default();
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::Black, Mode::Vcf);
    assert_eq!(
        sol.verdict,
        Verdict::NoWin,
        "line {}",
        format_points(&sol.line)
    );
    assert_eq!(
        referee_vcf(&b, Stone::Black),
        None,
        "the referee finds a VCF"
    );

    // The reason, visible move by move: after k8 the only block is l8, and l8 is a four for
    // white (by the engine's shapes and by the referee's own test) ...
    let mut after = b.clone();
    after.place(p("k8"), Stone::Black);
    let mut r = Referee::of(&after);
    assert_eq!(
        r.five_points(Stone::Black),
        vec![r.idx(p("l8"))],
        "k8 must leave l8 as the only five point"
    );
    let l8 = r.idx(p("l8"));
    assert!(
        r.makes_four(l8, Stone::White),
        "referee: l8 is a white four"
    );
    assert!(after.threats(p("l8"), Stone::White).fours() >= 1);
    // ... whose completion l7 black must take, and l7 is no four for black.
    after.place(p("l8"), Stone::White);
    let mut r = Referee::of(&after);
    assert_eq!(r.five_points(Stone::White), vec![r.idx(p("l7"))]);
    let l7 = r.idx(p("l7"));
    assert!(
        !r.makes_four(l7, Stone::Black),
        "referee: l7 is no four for black"
    );

    // Without white's l9-l11 the same four-three wins (the control).
    let control = stones(Rule::Freestyle, &black, "g8 a1 o1 a15");
    assert_eq!(
        s.ask(Budget::VERIFICATION)
            .solve(&control, Stone::Black, Mode::Vcf)
            .verdict,
        Verdict::Win
    );
}

// ---------------------------------------------------------------------------------------------
// Open threes must be answered.

/// Checks the defences against black's three on row 8 with white to move: exactly `want`,
/// none unknown; each listed defence leaves black without a VCF (referee) and without a VCT
/// (solver); every other legal point loses (the referee confirms black's win after it).
fn check_defences(rule: Rule, black: &str, white: &str, want: &str) {
    let b = stones(rule, black, white);
    let mut s = Solver::default();
    let d = s
        .ask(Budget::VERIFICATION)
        .defences(&b, Stone::White, Mode::Vct);
    assert_eq!(d.threat, Verdict::Win, "{rule}: black's three is a threat");
    assert!(d.moves.unknown.is_empty(), "{rule}: {d:?}");
    let mut got = d.moves.proved.clone();
    got.sort();
    let mut expected = pts(want);
    expected.sort();
    assert_eq!(
        format_points(&got),
        format_points(&expected),
        "{rule}: defences against {black}"
    );
    let mut losing = 0;
    for q in b.points().filter(|&q| b.get(q).is_none()) {
        let mut after = b.clone();
        after.place(q, Stone::White);
        if expected.contains(&q) {
            assert_eq!(
                referee_vcf(&after, Stone::Black),
                None,
                "{rule}: after {q} black still has a VCF"
            );
            assert_eq!(
                s.ask(Budget::VERIFICATION)
                    .solve(&after, Stone::Black, Mode::Vct)
                    .verdict,
                Verdict::NoWin,
                "{rule}: after the defence {q}"
            );
        } else {
            let sol = s
                .ask(Budget::VERIFICATION)
                .solve(&after, Stone::Black, Mode::Vct);
            assert_eq!(sol.verdict, Verdict::Win, "{rule}: {q} should not defend");
            referee_confirms(&mut s, &after, Stone::Black, &sol.line, Mode::Vct);
            losing += 1;
        }
    }
    // Every other point of the board was confirmed to lose (225 points less the stones and
    // the defences).
    assert_eq!(losing, 225 - b.stones() - expected.len(), "{rule}");
}

#[test]
fn an_open_three_is_stopped_only_at_its_ends() {
    // `..XXX..` on h8 i8 j8: only g8 and k8 stop every straight four (f8 lets k8 make the
    // straight four h8-k8, l8 lets g8 make g8-j8). White has no four to counter with.
    for rule in Rule::ALL {
        check_defences(rule, "h8 i8 j8", "a1 o1 a15", "g8 k8");
    }
}

#[test]
fn a_broken_three_is_stopped_at_its_ends_and_its_gap() {
    // `.XX.X.` on h8 i8 . k8: g8, j8 and l8. Any other point lets black fill j8 (a straight
    // four g8/l8 open) or extend to a straight four.
    for rule in Rule::ALL {
        check_defences(rule, "h8 i8 k8", "a1 o1 a15", "g8 j8 l8");
    }
}

#[test]
fn an_open_three_may_also_be_answered_with_a_four() {
    // DESIGN section 1: "an open three must be answered at once (block it or counter with a
    // four)"; section 3: a defence is any move after which the opponent no longer has a forced
    // win. White a1 a2 a3 (the edge closes a0) has two fours: a4 (completion a5) and a5
    // (completion a4). After either, black must block, and white then blocks the three:
    // black has no forced win, so both are defences. The engine lists only g8 and k8, because
    // `counter_four_fails` replays black's threat right after black's block as if black were
    // to move, when white is.
    check_defences(Rule::Freestyle, "h8 i8 j8", "a1 a2 a3", "g8 k8 a4 a5");
}

#[test]
fn no_threat_means_every_move_defends() {
    // Two black stones far apart: no VCF and no VCT, so `defences` reports no threat and
    // lists nothing (every move defends).
    let b = stones(Rule::Freestyle, "h8 j10", "a1 o15");
    let mut s = Solver::default();
    let d = s
        .ask(Budget::VERIFICATION)
        .defences(&b, Stone::White, Mode::Vct);
    assert_eq!(d.threat, Verdict::NoWin);
    assert!(
        d.moves.proved.is_empty() && d.moves.unknown.is_empty(),
        "{d:?}"
    );
    assert_eq!(referee_vcf(&b, Stone::Black), None);
    assert_eq!(
        s.ask(Budget::VERIFICATION)
            .threat(&b, Stone::White, Mode::Vct)
            .verdict,
        Verdict::NoWin
    );
}

// ---------------------------------------------------------------------------------------------
// Engine bugs found while writing these checks, shown on minimal positions (now fixed).

#[test]
fn a_counter_four_that_wins_is_not_dismissed() {
    // Freestyle, white to move. White h8 i8 j9 j10: j8 makes two open threes (row h8-j8,
    // column j8-j10). Black c3 c4 c5 (closed at c2 by white) and d6 e6: c6 is a four-three for
    // black (the four c3-c6 with its only completion c7, and the three c6-d6-e6).
    let b = stones(Rule::Freestyle, "c3 c4 c5 d6 e6", "c2 h8 i8 j9 j10");
    let mut after = b.clone();
    after.place(p("j8"), Stone::White);
    // The referee: after j8, black (to move) wins by VCF, starting with c6.
    let mut r = Referee::of(&after);
    let first = r.vcf(Stone::Black).map(|i| r.point(i));
    assert_eq!(first, Some(p("c6")), "referee: black's VCF after j8");
    // So j8 does not win for white, and c6 defends after j8. The engine claims a VCT with j8
    // (line j8 j6 k8 g8 l8) and lists no defence after it: after black's c6 and white's block
    // c7 it replays white's threat as if white were to move, but black is.
    let mut s = Solver::default();
    let sol = s
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::White, Mode::Vct);
    assert!(
        sol.verdict != Verdict::Win || sol.line[0] != p("j8"),
        "the engine claims a VCT win starting with j8: {}",
        format_points(&sol.line)
    );
    let d = s
        .ask(Budget::VERIFICATION)
        .defences(&after, Stone::Black, Mode::Vct);
    assert!(
        d.moves.proved.contains(&p("c6")),
        "c6 must be listed as a defence: {d:?}"
    );
}

#[test]
fn line_never_shows_a_forbidden_block() {
    // Renju, white to move. h8 makes two fives for white: h7 (column h4-h8) and i8 (row
    // e8-i8, closed at d8). h7 is a double three for black (h7-i7-j7 and f5-g6-h7), so black
    // may not play it. The engine's line is h8 h7 i8: it shows black "blocking" on the
    // forbidden h7. A line a player can step through must show a legal move there (i8, the
    // other five point, after which white plays h7).
    let b = stones(Rule::Renju, "i7 j7 g6 f5 d8 h3", "h4 h5 h6 e8 f8 g8");
    assert_eq!(b.forbidden(p("h7")), Some(engine::Forbidden::DoubleThree));
    let sol = Solver::default()
        .ask(Budget::VERIFICATION)
        .solve(&b, Stone::White, Mode::Vcf);
    assert_eq!(sol.verdict, Verdict::Win);
    let mut r = Referee::of(&b);
    for (k, &q) in sol.line.iter().enumerate() {
        let c = if k % 2 == 0 {
            Stone::White
        } else {
            Stone::Black
        };
        let i = r.idx(q);
        assert!(
            r.legal(i, c),
            "move {} of the line {} ({q}) is forbidden for {c}",
            k + 1,
            format_points(&sol.line)
        );
        r.place(i, c);
    }
}
