//! Threat shapes on real boards, against the definitions of the threat-space search paper.
//!
//! Source: L. V. Allis, H. J. van den Herik and M. P. H. Huntjens, "Go-Moku and Threat-Space
//! Search" (1993), the definitions of the threats (paraphrased from memory):
//!
//! * five: a line of five squares, all occupied by the attacker;
//! * straight four: a line of six squares, the attacker on the four centre squares, the two
//!   outer squares empty;
//! * four: a line of five squares, the attacker on four of them, the fifth empty;
//! * three: a line of seven squares, the attacker on the three centre squares and the other
//!   four empty; or a line of six squares, the attacker on three consecutive squares of the
//!   four centre ones, the other three empty;
//! * broken three: a line of six squares, the attacker on three non-consecutive squares of the
//!   four centre ones, the other three empty.
//!
//! The board edge and an opponent stone both end a line: a shape whose squares would lie off
//! the board, or on an opponent stone, is not there. Under exact-five rules (standard, and black
//! in renju: DESIGN section 3, RIF 1996) a "five" of six or more does not count, so a four whose
//! only completion makes six is no four, and a straight four with an own stone just beyond one
//! end is only a four; under freestyle both are what the paper calls them. Combined threats
//! (four-three, double four, double three) are named as in the paper and in renju practice.
//!
//! Each shape is written as a picture of one 15-point line (`X` the mover, `O` the opponent,
//! `.` empty, `?` the empty point asked about) and laid, in turn, along row 8, column h, the
//! long diagonal a1-o15 and the long anti-diagonal a15-o1 of a 15x15 board, for each colour as
//! the mover and under each rule. The ends of the picture are the board's edges.

use engine::board::threat;
use engine::{Board, Direction, LineShape, Point, PointThreats, Rule, Stone};

use crate::common::{p, stones};

/// Point `i` (0..15) of the long line in direction `d` through a 15x15 board.
fn along(d: Direction, i: u8) -> Point {
    match d {
        Direction::Horizontal => Point::new(i, 7),
        Direction::Vertical => Point::new(7, i),
        Direction::Diagonal => Point::new(i, i),
        Direction::AntiDiagonal => Point::new(i, 14 - i),
    }
}

/// Lays a picture along direction `d` with `mover` as `X`; returns the board and the `?` point.
fn lay(rule: Rule, d: Direction, mover: Stone, picture: &str) -> (Board, Point) {
    assert_eq!(picture.len(), 15, "a picture spans the board: {picture}");
    let mut board = Board::new(15, rule).unwrap();
    let mut at = None;
    for (i, ch) in picture.bytes().enumerate() {
        let q = along(d, i as u8);
        match ch {
            b'X' => board.place(q, mover),
            b'O' => board.place(q, mover.opponent()),
            b'?' => at = Some(q),
            b'.' => {}
            other => panic!("bad picture cell {:?} in {picture}", other as char),
        }
    }
    board.check_invariants().unwrap();
    (board, at.expect("a picture has a '?'"))
}

/// The threat flags that a set of line shapes implies (the engine's summary must agree).
fn flags_of(t: &PointThreats) -> u8 {
    t.lines.iter().fold(0, |f, l| {
        f | match l {
            LineShape::Five => threat::FIVE,
            l if l.is_four() => threat::FOUR,
            l if l.is_three() => threat::THREE,
            LineShape::ClosedThree => threat::CLOSED_THREE,
            LineShape::Two => threat::TWO,
            _ => 0,
        }
    })
}

/// Checks one picture: `free` is the shape under five-or-more rules, `exact` under exact-five
/// rules. Every direction, both colours as the mover, every rule.
fn check(picture: &str, free: LineShape, exact: LineShape) {
    for rule in Rule::ALL {
        for mover in Stone::ALL {
            let want = if rule.exact_five(mover) { exact } else { free };
            for d in Direction::ALL {
                let (board, at) = lay(rule, d, mover, picture);
                let t = board.threats(at, mover);
                let mut expected = [LineShape::None; 4];
                expected[d.index()] = want;
                assert_eq!(
                    t.lines, expected,
                    "{picture} as {mover} along {d:?} under {rule}"
                );
                let idx = board.index(at);
                assert_eq!(board.flags_at(idx, mover), flags_of(&t), "{picture} flags");
                assert_eq!(
                    board.wins_at(idx, mover),
                    want == LineShape::Five,
                    "{picture} wins_at as {mover} under {rule}"
                );
            }
        }
    }
}

/// A picture whose shape is the same under every rule.
fn same(picture: &str, shape: LineShape) {
    check(picture, shape, shape);
}

use LineShape::{
    BrokenThree, ClosedThree, DoubleFour, Five, Four, None as Nothing, Overline, StraightFour,
    Three,
};

#[test]
fn five() {
    // Five: five squares all occupied, here with the move in the middle.
    same("....XX?XX......", Five);
    // The edge right against it changes nothing.
    same("XX?XX..........", Five);
    same("..........XXXX?", Five);
    // Nor do opponent stones at both ends.
    same("...OXX?XXO.....", Five);
}

#[test]
fn straight_four() {
    // Six squares, the four centre ones occupied, both outer ones empty.
    same(".....X?XX......", StraightFour);
    same(".X?XX..........", StraightFour);
    // With the edge as one of the outer squares it is only a four.
    same("X?XX...........", Four);
    same("...........XX?X", Four);
    // With an opponent stone as one of them, likewise.
    same("....OX?XX......", Four);
    same(".....X?XXO.....", Four);
    // Closed at both ends no five can be made at all: no threat.
    same("....OX?XXO.....", Nothing);
    same("X?XXO..........", Nothing);
}

#[test]
fn four() {
    // Five squares, four occupied, the fifth (here inside) empty; the ends do not matter.
    same("....XX?.X......", Four);
    same("....X.?XX......", Four);
    same("XX?.X..........", Four);
    same("...OXX?.XO.....", Four);
    // The gap filled by an opponent, and the other side closed too: a dead line.
    same("...OXX?OX......", Nothing);
    // With room on the other side it is still one stone from a four (a closed three).
    same("....XX?OX......", ClosedThree);
}

#[test]
fn three() {
    // Seven squares: the three centre ones occupied, the other four empty.
    same(".....X?X.......", Three);
    // Six squares: three consecutive of the four centre ones occupied, the others empty; here
    // the seventh square would be the edge.
    same(".X?X...........", Three);
    same("...........X?X.", Three);
    // ...or an opponent stone.
    same("...O.X?X.......", Three);
    // Hard against the edge or an opponent stone there is no six-square frame: no three (one
    // more stone still makes a four, which the engine calls a closed three).
    same("X?X............", ClosedThree);
    same("............X?X", ClosedThree);
    same("....OX?X.......", ClosedThree);
    // Five free squares in all (O.XXX.O, or the edge and O): no three.
    same("...O.X?X.O.....", ClosedThree);
    same(".X?X.O.........", ClosedThree);
}

#[test]
fn broken_three() {
    // Six squares: three non-consecutive of the four centre ones occupied, the others empty.
    same("....X.?X.......", BrokenThree);
    same("....?.XX.......", BrokenThree);
    same("....X?.X.......", BrokenThree);
    // The six-square frame may have the edge or an opponent stone just outside it.
    same(".X.?X..........", BrokenThree);
    same("...O.X.?X.O....", BrokenThree);
    // With the edge or an opponent stone as an outer square it is no broken three.
    same("...OX.?X.O.....", ClosedThree);
    same("X.?X...........", ClosedThree);
    same("...........X.?X", ClosedThree);
    same("....OX.?X......", ClosedThree);
    same("....X.?XO......", ClosedThree);
    // X.X.X does not fit in four centre squares: no broken three (a stone in a gap makes a
    // four, not a straight four).
    same("....X.?.X......", ClosedThree);
}

#[test]
fn exact_five_rules_change_shapes() {
    // Six in a row: a five under freestyle (five or more wins), an overline under exact-five
    // rules (DESIGN section 3; RIF for black).
    check("...XXX?XX......", Five, Overline);
    check("XXXXX?.........", Five, Overline);
    // A four whose only completion makes six: X.XXXX with an opponent stone after it. Under
    // freestyle the gap completes six, which wins; under exact-five rules nothing completes a
    // five, so it is no four.
    check("....X.X?XXO....", Four, Nothing);
    // A straight four with an own stone one beyond an end: that end makes six, so under exact
    // fives only the other end completes, and it is a plain four.
    check("...X.X?XX......", StraightFour, Four);
    // A three whose straight fours would all be spoiled by an own stone two beyond each end:
    // X..XXX..X. Under exact fives either extension leaves one end making six: no three.
    check("..X..XX?..X....", Three, ClosedThree);
    // X.XXX.X (the one-line double four) with an own stone beyond one side: that side's gap
    // makes six, so under exact fives only one four is left.
    check("...XX.X?X.X....", DoubleFour, Four);
    check("....X.X?X.X....", DoubleFour, DoubleFour);
}

/// The threats of black on `at` in a 15x15 position given by stone lists.
fn black_threats(rule: Rule, black: &str, white: &str, at: &str) -> PointThreats {
    stones(rule, black, white).threats(p(at), Stone::Black)
}

#[test]
fn double_four_in_one_line() {
    // X.XXX.X with the move in the middle: two different fives (paper: two fours at once).
    let t = black_threats(Rule::Freestyle, "e8 g8 i8 k8", "", "h8");
    assert_eq!(
        t.lines,
        [DoubleFour, Nothing, Nothing, Nothing],
        "row 8 is Direction::ALL[0]"
    );
    assert_eq!(t.fours(), 2);
    assert!(t.double_four() && !t.four_three() && !t.straight_four());
    // XX.XX.XX in a column.
    let t = black_threats(Rule::Standard, "h4 h5 h7 h10 h11", "", "h8");
    assert_eq!(t.lines, [Nothing, DoubleFour, Nothing, Nothing]);
    assert!(t.double_four());
}

#[test]
fn double_four_across_lines() {
    // h8-k8 (closed at g8) and h8-h11 (closed at h7).
    let t = black_threats(Rule::Standard, "i8 j8 k8 h9 h10 h11", "g8 h7", "h8");
    assert_eq!(t.lines, [Four, Four, Nothing, Nothing]);
    assert_eq!((t.fours(), t.threes()), (2, 0));
    assert!(t.double_four() && !t.four_three());
    // A straight four on the diagonal with a four on the anti-diagonal.
    let t = black_threats(Rule::Freestyle, "i9 j10 k11 g9 f10 e11", "i7", "h8");
    assert_eq!(t.lines, [Nothing, Nothing, StraightFour, Four]);
    assert!(t.double_four() && t.straight_four());
}

#[test]
fn four_three_and_double_three() {
    // Four-three: h8-k8 closed at g8, and the three h8-h9-h10.
    let t = black_threats(Rule::Freestyle, "i8 j8 k8 h9 h10", "g8", "h8");
    assert_eq!(t.lines, [Four, Three, Nothing, Nothing]);
    assert!(t.four_three() && !t.double_four() && !t.double_three());
    // Four-three with a broken three on the diagonal.
    let t = black_threats(Rule::Standard, "i8 j8 k8 i9 k11", "g8", "h8");
    assert_eq!(t.lines, [Four, Nothing, BrokenThree, Nothing]);
    assert!(t.four_three());
    // Double three: row 8 and column h.
    let t = black_threats(Rule::Renju, "i8 j8 h9 h10", "", "h8");
    assert_eq!(t.lines, [Three, Three, Nothing, Nothing]);
    assert!(t.double_three() && !t.four_three());
    assert_eq!(t.threes(), 2);
    // Triple: a broken three on the anti-diagonal as well.
    let t = black_threats(Rule::Renju, "i8 j8 h9 h10 g9 e11", "", "h8");
    assert_eq!(t.lines, [Three, Three, Nothing, BrokenThree]);
    assert_eq!(t.threes(), 3);
    // The same stones seen by white make nothing at h8.
    let s = stones(Rule::Renju, "i8 j8 h9 h10", "");
    assert_eq!(s.threats(p("h8"), Stone::White).lines, [Nothing; 4]);
}

#[test]
fn five_and_overline_flags() {
    let t = black_threats(Rule::Standard, "e8 f8 g8 i8", "", "h8");
    assert!(t.five() && !t.overline());
    let t = black_threats(Rule::Standard, "e8 f8 g8 i8 j8", "", "h8");
    assert!(t.overline() && !t.five());
    let t = black_threats(Rule::Freestyle, "e8 f8 g8 i8 j8", "", "h8");
    assert!(t.five() && !t.overline());
}

#[test]
fn shapes_follow_placements_and_removals() {
    // The incremental shapes must follow a line as it grows and shrinks: a two becomes a
    // three, a straight four, a five, and back again.
    let mut b = Board::new(15, Rule::Standard).unwrap();
    let row = |b: &Board| b.threats(p("h8"), Stone::Black).lines[0];
    b.place(p("i8"), Stone::Black);
    assert_eq!(row(&b), LineShape::Two);
    b.place(p("j8"), Stone::Black);
    assert_eq!(row(&b), Three);
    b.place(p("k8"), Stone::Black);
    assert_eq!(row(&b), StraightFour);
    b.place(p("g8"), Stone::White);
    assert_eq!(row(&b), Four);
    b.place(p("l8"), Stone::Black);
    assert_eq!(row(&b), Five);
    b.place(p("m8"), Stone::Black);
    assert_eq!(row(&b), Overline);
    for (q, want) in [
        ("m8", Five),
        ("l8", Four),
        ("g8", StraightFour),
        ("k8", Three),
    ] {
        b.remove(p(q));
        b.check_invariants().unwrap();
        assert_eq!(row(&b), want, "after removing {q}");
    }
}
