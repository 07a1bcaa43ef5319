//! Hand-built games checked move by move (`engine::review`), each with the findings it must
//! give, reasoned below from the trade's rules of thumb (common practice: a four must be
//! blocked; a four-three wins unless it is stopped before it is made) and, for renju, from the
//! International Rules of Renju (RIF 1996: black may not make two open threes with one stone,
//! and a black player who can only block on a forbidden point loses).
//!
//! Two facts shape what can be found. A stone only ever helps its own side in freestyle (more
//! stones never take a win away), so "the move let the opponent in" (a blunder) cannot happen
//! in freestyle: if the opponent wins after the move, it already threatened to win before it,
//! and the move is a missed defence (or the game was lost). And a win a side lets go must
//! have been let in by the opponent's move before: so a missed win comes after the opponent's
//! missed defence. Renju is different: a black stone can make black's own block forbidden,
//! which is the blunder the renju game shows.
//!
//! Every game is on 15x15, checked with three million nodes per question, so that no move of
//! these short games is left undecided; every missed defence's list is then completed and the
//! findings' puzzles made (as a player asks for them), and each puzzle is re-proved the way
//! `fivefold verify` re-proves a set.

use engine::formats::games::GameRecord;
use engine::puzzle::{verify, Theme};
use engine::review::{review, FindingKind, GameReview, MoveVerdict, ReviewProgress};
use engine::search::{Budget, Mode, Solver};
use engine::{Forbidden, Rule, Stone};

use crate::common::p;

fn pts(text: &str) -> Vec<engine::Point> {
    text.split_whitespace().map(p).collect()
}

/// The review, then (as a player asks for them) every defence of a missed defence and the
/// findings' puzzles.
fn check(moves: &str, rule: Rule) -> GameReview {
    let points = pts(moves);
    let record = GameRecord::new(15, points).unwrap();
    let mut solver = Solver::default();
    let mut heard = Vec::new();
    let budget = Budget::total(3_000_000);
    let mut r = review(
        &mut solver,
        &record,
        rule,
        budget,
        None,
        |p: ReviewProgress| heard.push((p.checked, p.total, p.latest)),
    )
    .unwrap();
    // Progress is heard once a move, in order, ending at the total, with the move as checked.
    let n = r.moves.len();
    assert_eq!(heard.len(), n);
    for (i, (c, t, latest)) in heard.iter().enumerate() {
        assert_eq!((*c, *t), (i + 1, n));
        assert_eq!(latest, &r.moves[i]);
    }
    // The check makes no puzzle, and a missed defence holds one proved defence.
    assert!(r.findings().all(|f| f.puzzle.is_none()));
    let first: Vec<_> = r
        .findings()
        .filter_map(|f| match &f.kind {
            FindingKind::MissedDefence { defences, .. } => Some((f.number, defences.clone())),
            _ => None,
        })
        .collect();
    assert!(first.iter().all(|(_, d)| d.len() == 1), "{first:?}");
    r.list_defences(&mut solver, budget);
    let mut done = Vec::new();
    r.make_puzzles(&mut solver, None, None, |k, of| done.push((k, of)));
    assert!(done.iter().enumerate().all(|(i, &(k, _))| k == i + 1));
    // The defence the check found is one of the list.
    for f in r.findings() {
        if let FindingKind::MissedDefence { defences, all, .. } = &f.kind {
            assert!(all, "move {}", f.number);
            let (_, d) = first.iter().find(|(n, _)| *n == f.number).unwrap();
            assert!(
                defences.contains(&d[0]),
                "move {}: {d:?} {defences:?}",
                f.number
            );
        }
    }
    r
}

/// The findings as (move number, kind name), in order.
fn found(r: &GameReview) -> Vec<(usize, &'static str)> {
    r.findings().map(|f| (f.number, f.kind.name())).collect()
}

fn undecided(r: &GameReview) -> Vec<usize> {
    r.moves
        .iter()
        .filter(|m| m.verdict == MoveVerdict::Undecided)
        .map(|m| m.number)
        .collect()
}

/// Every puzzle made from the review proves again from a fresh table.
fn puzzles_reprove(r: &GameReview) -> usize {
    let mut solver = Solver::default();
    let list = r.puzzle_list(None);
    for q in &list {
        let problems = verify::check(&mut solver, q);
        assert!(problems.is_empty(), "{}: {problems:?}", q.id);
    }
    list.len()
}

#[test]
fn a_missed_win_with_fours() {
    // Black builds a row h8 i8 j8 (closed at g8 by White's second move) and a diagonal
    // h6 i7 j8 (closed at g5), sharing j8. White's stones i9, h7, j6 and g5 each take a point
    // Black's shapes needed, so until move 11 Black threatens nothing White cannot meet.
    // 11. k10 makes a win with fours: k8 (row four, White must take l8), k9 (diagonal four,
    // White must take l10, and k8 k9 k10 is now an open three), then k7 or k11, a straight
    // four. So:
    // * move 12, White c3: a missed defence (k8, k9, l8 or l10 would each have stopped it);
    // * move 13, Black m3: a missed win with fours, three fours before the five; after m3
    //   White can still defend, and does: 14. k8.
    let r = check(
        "h8 g8 i8 i9 j8 h7 i7 j6 h6 g5 k10 c3 m3 k8",
        Rule::Freestyle,
    );
    assert_eq!(found(&r), vec![(12, "missed-defence"), (13, "missed-win")]);
    assert!(undecided(&r).is_empty(), "{:?}", undecided(&r));
    let f: Vec<_> = r.findings().collect();
    match &f[0].kind {
        FindingKind::MissedDefence { defences, .. } => {
            assert_eq!(defences, &pts("k8 k9 l8 l10"))
        }
        k => panic!("{k:?}"),
    }
    match &f[1].kind {
        FindingKind::MissedWin { win } => {
            assert_eq!(
                (win.side, win.mode, win.depth),
                (Stone::Black, Mode::Vcf, 3)
            );
            assert!([p("k8"), p("k9")].contains(&win.line[0]), "{:?}", win.line);
            assert_eq!(win.line.len(), 7, "three fours, three blocks, the five");
        }
        k => panic!("{k:?}"),
    }
    // The missed win is a puzzle of the theme "vcf", from the position before move 13.
    let q = f[1].puzzle.as_ref().expect("a vcf puzzle");
    assert_eq!(
        (q.theme, q.to_move, q.length),
        (Theme::Vcf, Stone::Black, 3)
    );
    assert_eq!(q.black.len() + q.white.len(), 12);
    assert_eq!(f[1].at, 12);
    assert_eq!(puzzles_reprove(&r), 1);
    assert_eq!(
        engine::words::finding(f[1]),
        "Move 13: Black had a win with fours starting at k8: 3 fours. Black's m3 lets it go."
    );
    let set = r.puzzles(Some(Stone::Black), "2026-12-01").unwrap();
    assert_eq!(set.title, "From my games");
    assert_eq!(set.puzzles.len(), 1);
    engine::formats::setfile::check(&set).unwrap();
    // White's findings made no puzzle (four defences are too many for one).
    assert!(r.puzzles(Some(Stone::White), "2026-12-01").is_none());
}

#[test]
fn an_allowed_four_three() {
    // Black: the row h8 i8 j8 closed at g8, and k10. 8. l10 is one of White's defences (it
    // spoils the diagonal j8-k9-l10). 9. k9 makes k9 k10 a pair under which k8 is a
    // four-three point: k8 would make the row four (l8 to block) and the open three k8 k9
    // k10 at once. White had three ways to stop it (k7, k8 or l8: take the point, the row's
    // last point, or the lower end of the column) and played 10. c3 instead: a missed
    // defence, and the only finding. Black then plays the four-three out and wins with the
    // five at k12; none of Black's moves let anything go.
    let r = check(
        "h8 g8 i8 i9 j8 h7 k10 l10 k9 c3 k8 l8 k11 k7 k12",
        Rule::Freestyle,
    );
    assert_eq!(found(&r), vec![(10, "missed-defence")]);
    assert!(undecided(&r).is_empty());
    assert_eq!(r.winner, Some(Stone::Black));
    let f = r.findings().next().unwrap();
    match &f.kind {
        FindingKind::MissedDefence {
            threat, defences, ..
        } => {
            assert_eq!(threat.line[0], p("k8"));
            assert_eq!((threat.mode, threat.depth), (Mode::Vcf, 2));
            assert_eq!(defences, &pts("k7 k8 l8"));
        }
        k => panic!("{k:?}"),
    }
    // Three defences make a defence puzzle, from the position before move 10.
    let q = f.puzzle.as_ref().expect("a defence puzzle");
    assert_eq!((q.theme, q.to_move), (Theme::Defend, Stone::White));
    assert_eq!(q.first_moves, pts("k7 k8 l8"));
    assert_eq!(puzzles_reprove(&r), 1);
}

#[test]
fn a_missed_only_defence() {
    // As above up to 10. k7 (a defence: the column is closed below). 11. k8 is then a four
    // (h8 i8 j8 k8, closed at g8) with only l8 to complete it: the only defence is l8, and
    // White plays 12. b2. Black makes five at 13. l8. A five to block is no puzzle (the
    // generator's filter), so the finding makes none.
    let r = check("h8 g8 i8 i9 j8 h7 k10 l10 k9 k7 k8 b2 l8", Rule::Freestyle);
    assert_eq!(found(&r), vec![(12, "missed-defence")]);
    assert!(undecided(&r).is_empty());
    let f = r.findings().next().unwrap();
    match &f.kind {
        FindingKind::MissedDefence {
            threat,
            defences,
            complete,
            ..
        } => {
            assert!(threat.is_five());
            assert_eq!(defences, &vec![p("l8")]);
            assert!(complete);
        }
        k => panic!("{k:?}"),
    }
    assert!(f.puzzle.is_none());
    assert_eq!(
        engine::words::finding(f),
        "Move 12: Black threatened a five at l8; White's b2 does not stop it. The only \
         defence was l8."
    );
    assert_eq!(r.winner, Some(Stone::Black));
}

#[test]
fn a_renju_forbidden_point_played() {
    // Renju. White builds i5 j5 k5 on row 5 (Black closes it at l5); Black has h6 h7 on
    // column h and i4 on the diagonal h5-i4-j3. 9. j3 is Black's blunder: with it, h5 would
    // make two open threes for Black (h5 h6 h7 and h5 i4 j3), so h5 is forbidden for Black.
    // White plays 10. g5, a four whose only completion is h5: Black cannot block it legally,
    // and 11. h5 is a forbidden point (a double three) played, where the game ends. The
    // review finds:
    // * move 9: the blunder, a win for White that drives Black onto a forbidden point (a
    //   "forbidden-trap" puzzle), besides a win with threes and fours Black let go there;
    // * move 11: the forbidden point, forced (it was the only block of White's four);
    // * and earlier, the loose play of both sides in the opening: White's 6. k5 and 8. g8
    //   leave Black a win with threes and fours (each a missed defence), which Black's 7. l5
    //   and 9. j3 let go (missed wins). Those lines are long; this test pins only their
    //   kinds and move numbers.
    let moves = "h7 i5 h6 j5 i4 k5 l5 g8 j3 g5 h5";
    let r = check(moves, Rule::Renju);
    assert_eq!(
        found(&r),
        vec![
            (6, "missed-defence"),
            (7, "missed-win"),
            (8, "missed-defence"),
            (9, "missed-win"),
            (9, "blunder"),
            (11, "forbidden-point"),
        ]
    );
    assert_eq!(r.winner, Some(Stone::White));
    let f: Vec<_> = r.findings().collect();
    match &f[4].kind {
        FindingKind::Blunder { win } => {
            assert_eq!(win.side, Stone::White);
            assert!(win.onto_forbidden);
            assert_eq!(win.line.first(), Some(&p("g5")));
            assert_eq!(win.line.last(), Some(&p("h5")));
        }
        k => panic!("{k:?}"),
    }
    let trap = f[4].puzzle.as_ref().expect("a forbidden-trap puzzle");
    assert_eq!(
        (trap.theme, trap.to_move),
        (Theme::ForbiddenTrap, Stone::White)
    );
    match &f[5].kind {
        FindingKind::ForbiddenPoint { why, forced } => {
            assert_eq!((*why, *forced), (Forbidden::DoubleThree, true));
        }
        k => panic!("{k:?}"),
    }
    assert_eq!(f[5].played, p("h5"));
    assert!(puzzles_reprove(&r) >= 2);
    // Under freestyle the same moves are legal and h5 is no forbidden point: White's g5 four
    // is simply blocked.
    let free = check(moves, Rule::Freestyle);
    assert!(free
        .findings()
        .all(|f| !matches!(f.kind, FindingKind::ForbiddenPoint { .. })));
    assert_eq!(free.winner, None);
}

#[test]
fn a_game_with_no_finding() {
    // Ten quiet opening moves, every stone next to the others: no side ever has three stones
    // in an open line (the longest lines are the twos h8-i8, g8-g9 and h9-h10, each already
    // touched by an opponent stone), so nobody threatens a five, a four-three or an open
    // three, and the review proves, move by move, that neither side had or let in a win.
    let r = check("h8 i9 i8 g8 j7 k6 g9 f10 h10 h9", Rule::Freestyle);
    assert_eq!(found(&r), vec![]);
    assert!(undecided(&r).is_empty());
    assert_eq!(r.counts(), (10, 0, 0));
    assert!(r.puzzles(None, "2026-12-01").is_none());
    assert_eq!(
        engine::words::review_summary(&r),
        "10 moves checked: nothing found."
    );
}

#[test]
fn a_stopped_review_keeps_what_it_checked_and_a_move_after_five_is_refused() {
    let points = pts("h8 g8 i8 i9 j8 h7 k10 l10 k9 c3");
    let record = GameRecord::new(15, points).unwrap();
    let mut solver = Solver::default();
    let stop = |_: u64| true;
    let r = review(
        &mut solver,
        &record,
        Rule::Freestyle,
        Budget::total(3_000_000),
        Some(&stop),
        |_| {},
    )
    .unwrap();
    assert!(r.stopped);
    assert_eq!(r.moves.len(), 10);
    assert!(r.moves.iter().all(|m| m.verdict == MoveVerdict::Unchecked));
    assert_eq!(r.findings().count(), 0);
    assert_eq!(
        engine::words::review_summary(&r),
        "0 moves checked: nothing found. The check was stopped: 10 moves not checked."
    );
    // Stopped once move 10 (the missed defence) has been heard: the moves before it keep
    // their verdicts, move 10 is not checked.
    let heard = std::cell::Cell::new(0usize);
    let stop_late = |_: u64| heard.get() >= 9;
    let r = review(
        &mut solver,
        &record,
        Rule::Freestyle,
        Budget::total(3_000_000),
        Some(&stop_late),
        |p| heard.set(p.checked),
    )
    .unwrap();
    assert!(r.stopped);
    assert_eq!(r.unchecked(), 1);
    assert_eq!(r.moves[9].verdict, MoveVerdict::Unchecked);
    assert_eq!(r.counts(), (9, 0, 0));
    assert_eq!(
        engine::words::review_summary(&r),
        "9 moves checked: nothing found. The check was stopped: 1 move not checked."
    );
    // A tiny budget decides nothing it cannot prove: no move is called fine or a finding
    // unless proved (here the early quiet moves are cheap to prove; the rest is undecided
    // or proved, never contradicted).
    // (A fresh solver: the tables of the reviews above would answer from memory.)
    let full = check("h8 g8 i8 i9 j8 h7 k10 l10 k9 c3", Rule::Freestyle);
    let small = review(
        &mut Solver::default(),
        &record,
        Rule::Freestyle,
        Budget::total(200),
        None,
        |_| {},
    )
    .unwrap();
    for (a, b) in small.moves.iter().zip(&full.moves) {
        if a.verdict != MoveVerdict::Undecided {
            assert_eq!(a.verdict, b.verdict, "move {}", a.number);
        }
    }
    assert!(small.counts().2 > 0, "200 nodes cannot decide every move");
    // Moves after a five are not a game.
    let points = pts("h8 a1 i8 a2 j8 a3 k8 a4 l8 a5");
    let record = GameRecord::new(15, points).unwrap();
    let e = review(
        &mut solver,
        &record,
        Rule::Freestyle,
        Budget::total(1000),
        None,
        |_| {},
    )
    .unwrap_err();
    assert_eq!(e.number, 10);
}
