//! Renju's forbidden points, on hand-built positions.
//!
//! Source: the International Rules of Renju of the Renju International Federation (RIF), as
//! adopted in 1996 with the 1998 correction to the definition of a three. The clauses are quoted
//! by their content below rather than by number (the numbering is not recalled reliably; the
//! content is from memory of the published text):
//!
//! * (five) black wins with exactly five stones in a row; white wins with five or more;
//! * (forbidden) black may not make a double three, a double four or an overline; a forbidden
//!   move by black loses (our `Game` refuses it, which is how a trainer enforces it);
//! * (five first) a five made together with a double three, a double four (or both) wins;
//! * (four) a "four" is a line of stones that one more stone turns into a five; a straight four
//!   is a four that can become a five in two ways (both ends open); two fours made by one stone
//!   are a double four even when they lie in one line;
//! * (three) a "three" is a line that one more stone turns into a straight four; since the 1998
//!   correction that stone must itself be allowed (not forbidden), judged with the first stone
//!   already on the board, and the same test applies again to the threes it makes (recursion);
//! * (white) white has no forbidden moves, and white's overline wins.
//!
//! Every position is built by hand: on a 15x15 board from stone lists (`h8` is the centre, `a1`
//! the bottom left), a few from diagrams. Each check goes through `Board::forbidden`, agrees with
//! `Board::forbidden_points`, and plays the move in a `Game`: a forbidden move is refused with
//! `MoveError::Forbidden` and leaves the game exactly as it was.
//!
//! Last, `reading` is a second, slow implementation of the same clauses written straight from
//! the text (it scans stones, and shares no code with the engine's tables or incremental
//! state); the engine's forbidden points must equal its answers on 400 generated positions.

use engine::notation::diagram as print_diagram;
use engine::{Board, Forbidden, Game, MoveError, Played, Rule, Stone};

use crate::common::{diagram, game, p, stones};

/// Checks that black's move `at` is forbidden for the given reason (or allowed, for `None`)
/// by every way the engine can say so, and what `Game::play` does with it. Returns the outcome
/// of an allowed move.
fn expect(board: &Board, at: &str, want: Option<Forbidden>) -> Option<Played> {
    let q = p(at);
    assert_eq!(
        board.get(q),
        None,
        "{at} must be empty in the test position"
    );
    board.check_invariants().unwrap();
    assert_eq!(
        board.forbidden(q),
        want,
        "forbidden({at}) on\n{}",
        print_diagram(board)
    );
    // `forbidden_points` must list the point with the same reason, and agree with
    // `forbidden` everywhere else too.
    let listed = board.forbidden_points();
    assert_eq!(
        listed.iter().find(|(r, _)| *r == q).map(|(_, f)| *f),
        want,
        "forbidden_points and {at}"
    );
    for (r, f) in &listed {
        assert_eq!(board.forbidden(*r), Some(*f), "forbidden_points lists {r}");
    }
    // The query must not disturb the board.
    board.check_invariants().unwrap();

    let mut g = game(board.clone(), Stone::Black);
    let before = g.board().hash();
    let result = g.play(q);
    match want {
        Some(why) => {
            assert_eq!(result, Err(MoveError::Forbidden(q, why)), "play({at})");
            assert_eq!(g.board().hash(), before, "a refused move changed the board");
            assert_eq!(g.board().get(q), None);
            assert!(g.moves().is_empty());
            assert_eq!(g.to_move(), Stone::Black);
            assert_eq!(g.winner(), None);
            g.board().check_invariants().unwrap();
            None
        }
        None => {
            let outcome = result.unwrap_or_else(|e| panic!("play({at}) refused: {e}"));
            assert_eq!(g.board().get(q), Some(Stone::Black));
            assert_eq!(g.to_move(), Stone::White);
            assert_eq!(g.moves(), &[q]);
            g.board().check_invariants().unwrap();
            Some(outcome)
        }
    }
}

/// The same stones under another rule: nothing is forbidden outside renju.
fn nothing_forbidden_under(rule: Rule, black: &str, white: &str, at: &str) {
    let b = stones(rule, black, white);
    assert_eq!(b.forbidden(p(at)), None, "{rule}: {at}");
    assert!(b.forbidden_points().is_empty(), "{rule}: forbidden points");
    let mut g = game(b, Stone::Black);
    assert!(g.play(p(at)).is_ok(), "{rule}: {at} refused");
}

// ---------------------------------------------------------------------------------------------
// Double three.

#[test]
fn plain_double_three_is_forbidden() {
    // RIF (forbidden): h8 makes the three h8-i8-j8 (g8, k8 open) and the three h8-h9-h10
    // (h7, h11 open) at once.
    let (black, white) = ("i8 j8 h9 h10", "");
    let b = stones(Rule::Renju, black, white);
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // One of the two threes alone is allowed.
    expect(&stones(Rule::Renju, "i8 j8 h9", ""), "h8", None);
    // Freestyle and standard have no forbidden points (DESIGN section 3).
    nothing_forbidden_under(Rule::Freestyle, black, white, "h8");
    nothing_forbidden_under(Rule::Standard, black, white, "h8");
}

#[test]
fn triple_three_is_forbidden() {
    // RIF (forbidden): three threes are "two or more" threes: row 8, column h, diagonal i9-j10.
    let b = stones(Rule::Renju, "i8 j8 h9 h10 i9 j10", "");
    expect(&b, "h8", Some(Forbidden::DoubleThree));
}

#[test]
fn broken_three_counts_for_the_double_three() {
    // RIF (three): a three need not be consecutive. f8 . h8 i8 becomes the straight four
    // f8-i8 by g8, so it is a three; with h8-h9-h10 that is a double three.
    let b = stones(Rule::Renju, "f8 i8 h9 h10", "");
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // Two broken threes: f8 . h8 i8 and h8 h9 . h11.
    let b = stones(Rule::Renju, "f8 i8 h9 h11", "");
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // The stone played may be the lone stone of the broken three: h8 . j8 k8.
    let b = stones(Rule::Renju, "j8 k8 h9 h10", "");
    expect(&b, "h8", Some(Forbidden::DoubleThree));
}

#[test]
fn double_three_on_a_diagram() {
    // The plain double three again, on a 9x9 diagram: e5 makes e5-f5-g5 and e5-e6-e7. The
    // position is read from the diagram and compared with the same stones from a list.
    let b = diagram(
        Rule::Renju,
        "
        9 . . . . . . . . .
        8 . . . . . . . . .
        7 . . . . X . . . .
        6 . . . . X . . . .
        5 . . . . . X X . .
        4 . . . . . . . . .
        3 . . . . . . . . .
        2 . . . . . . . . .
        1 . . . . . . . . .
          a b c d e f g h i
        ",
    );
    let listed = engine::notation::setup(9, Rule::Renju, "f5 g5 e6 e7", "").unwrap();
    assert_eq!(b.hash(), listed.hash());
    expect(&b, "e5", Some(Forbidden::DoubleThree));
    // h5 and i5 lie between g5 and the edge, so h5 makes the straight four e5-h5 (d5 and i5
    // open) and e5-f5-g5 is a three.
}

// ---------------------------------------------------------------------------------------------
// What is not a three: the edge, a white stone, and the 1998 correction.

#[test]
fn a_three_against_the_edge_is_no_three() {
    // RIF (three): m8 n8 o8 touches the right edge (column o is the last on 15x15). l8 makes
    // the four l8-o8, closed by the edge, and k8 makes k8 . m8 n8 o8, a four with a gap: no
    // straight four can be made, so this is no three, and m8 with m9-m10 is only one three.
    expect(&stones(Rule::Renju, "n8 o8 m9 m10", ""), "m8", None);
    // One column further from the edge, l8 m8 n8 with k8 and o8 open is a three (k8 makes the
    // straight four k8-n8, whose ends j8 and o8 are open): a double three with l9-l10.
    expect(
        &stones(Rule::Renju, "m8 n8 l9 l10", ""),
        "l8",
        Some(Forbidden::DoubleThree),
    );
}

#[test]
fn a_three_blocked_by_a_white_stone_is_no_three() {
    // RIF (three): with white on g8, h8 i8 j8 can only become the four h8-k8 closed at g8.
    expect(&stones(Rule::Renju, "i8 j8 h9 h10", "g8"), "h8", None);
    // White one point away on both sides (f8 and l8): g8 or k8 makes a four closed on one
    // side; no straight four, no three.
    expect(&stones(Rule::Renju, "i8 j8 h9 h10", "f8 l8"), "h8", None);
    // White one point away on one side only (f8): k8 still makes the straight four h8-k8
    // (g8 and l8 open), so it is a three and the double three is forbidden.
    expect(
        &stones(Rule::Renju, "i8 j8 h9 h10", "f8"),
        "h8",
        Some(Forbidden::DoubleThree),
    );
}

#[test]
fn a_three_whose_straight_four_point_is_forbidden_is_no_three() {
    // RIF (three, 1998 correction). Row 8: g8 h8 i8 with white on k8. The only straight-four
    // point of that three is f8 (f8-i8 with e8 and j8 open); j8 makes g8-j8 closed by k8.
    // Column f holds f5 f6 f7 . f9 f10, so a black stone on f8 makes six in a row: f8 is
    // forbidden (overline), the row-8 "three" cannot become a straight four by an allowed
    // move, and h8 makes only one real three (h8-h9-h10). h8 is allowed.
    let row = "g8 i8 h9 h10";
    let column = "f5 f6 f7 f9 f10";
    let b = stones(Rule::Renju, &format!("{row} {column}"), "k8");
    // The same position as a diagram (h8 is the empty point between g8 and i8).
    let drawn = diagram(
        Rule::Renju,
        "
        15 . . . . . . . . . . . . . . .
        14 . . . . . . . . . . . . . . .
        13 . . . . . . . . . . . . . . .
        12 . . . . . . . . . . . . . . .
        11 . . . . . . . . . . . . . . .
        10 . . . . . X . X . . . . . . .
         9 . . . . . X . X . . . . . . .
         8 . . . . . . X . X . O . . . .
         7 . . . . . X . . . . . . . . .
         6 . . . . . X . . . . . . . . .
         5 . . . . . X . . . . . . . . .
         4 . . . . . . . . . . . . . . .
         3 . . . . . . . . . . . . . . .
         2 . . . . . . . . . . . . . . .
         1 . . . . . . . . . . . . . . .
           a b c d e f g h i j k l m n o
        ",
    );
    assert_eq!(drawn.hash(), b.hash(), "diagram and stone list differ");
    assert_eq!(b.forbidden(p("f8")), Some(Forbidden::Overline));
    assert_eq!(
        b.threats(p("h8"), Stone::Black).threes(),
        2,
        "line by line, h8 still shows two threes"
    );
    expect(&b, "h8", None);
    // Without column f, f8 is an ordinary point and h8 is a double three.
    expect(
        &stones(Rule::Renju, row, "k8"),
        "h8",
        Some(Forbidden::DoubleThree),
    );
    // With f6 f7 . f9 f10 instead, f8 makes exactly five. A five is never forbidden, but the
    // stone that turns the row-8 three into a straight four must make no five at the same
    // time (RIF section 3, the definition of a three: "a row with three stones to which you,
    // without at the same time a five in a row is made, can add one more stone to attain a
    // straight four"). So the row-8 "three" is no three and h8 is allowed.
    let b = stones(Rule::Renju, &format!("{row} f6 f7 f9 f10"), "k8");
    assert_eq!(b.forbidden(p("f8")), None);
    expect(&b, "h8", None);
    // With f9 f10 f11 and white on f7, f8 would make a four in column f as well as the
    // straight four f8-i8 in row 8: a double four, so again the three is not real.
    let b = stones(Rule::Renju, &format!("{row} f9 f10 f11"), "k8 f7");
    expect(&b, "h8", None);
}

#[test]
fn the_three_test_recurses() {
    // RIF (three, 1998 correction), two levels deep. Black: row 8 g8 . i8 (white k8) and
    // column h h9 h10 as before, so h8 is a double three exactly when the row-8 three's only
    // straight-four point, f8, is allowed. With h8 on the board, f8 makes the straight four
    // f8-i8 and two threes of its own: f8-f9-f10 (column f) and d10-e9-f8 (anti-diagonal). A
    // four with two threes is still a double three, so f8 is forbidden if both of those threes
    // are real, and then h8 is allowed.
    let base = "g8 i8 h9 h10 f9 f10 e9 d10";
    let b = stones(Rule::Renju, base, "k8");
    let mut after = b.clone();
    after.place(p("h8"), Stone::Black);
    assert_eq!(after.forbidden(p("f8")), Some(Forbidden::DoubleThree));
    expect(&b, "h8", None);

    // Now close the anti-diagonal at h6 with a white stone, so that d10-e9-f8's only
    // straight-four point is c11, and put c8 c9 c10 . c12 c13 in column c, so that c11 is an
    // overline. The anti-diagonal three is then not real, f8 makes only one real three (and a
    // four), f8 is allowed, the row-8 three through h8 is real, and h8 is a double three.
    let b = stones(Rule::Renju, &format!("{base} c8 c9 c10 c12 c13"), "k8 h6");
    let drawn = diagram(
        Rule::Renju,
        "
        15 . . . . . . . . . . . . . . .
        14 . . . . . . . . . . . . . . .
        13 . . X . . . . . . . . . . . .
        12 . . X . . . . . . . . . . . .
        11 . . . . . . . . . . . . . . .
        10 . . X X . X . X . . . . . . .
         9 . . X . X X . X . . . . . . .
         8 . . X . . . X . X . O . . . .
         7 . . . . . . . . . . . . . . .
         6 . . . . . . . O . . . . . . .
         5 . . . . . . . . . . . . . . .
         4 . . . . . . . . . . . . . . .
         3 . . . . . . . . . . . . . . .
         2 . . . . . . . . . . . . . . .
         1 . . . . . . . . . . . . . . .
           a b c d e f g h i j k l m n o
        ",
    );
    assert_eq!(drawn.hash(), b.hash(), "diagram and stone list differ");
    let mut after = b.clone();
    after.place(p("h8"), Stone::Black);
    after.place(p("f8"), Stone::Black);
    assert_eq!(after.forbidden(p("c11")), Some(Forbidden::Overline));
    after.remove(p("f8"));
    assert_eq!(after.forbidden(p("f8")), None);
    expect(&b, "h8", Some(Forbidden::DoubleThree));
}

#[test]
fn a_three_with_one_allowed_straight_four_point_is_a_three() {
    // RIF (three, 1998 correction): one allowed way to the straight four is enough. Row 8:
    // h8 i8 j8 can become a straight four at g8 or at k8. Column g holds g5 g6 g7 . g9 g10, so
    // g8 is an overline; k8 is still allowed, the three is real, and with h8-h9-h10 h8 is a
    // double three.
    let b = stones(Rule::Renju, "i8 j8 h9 h10 g5 g6 g7 g9 g10", "");
    assert_eq!(b.forbidden(p("g8")), Some(Forbidden::Overline));
    assert_eq!(b.forbidden(p("k8")), None);
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // With column k holding k5 k6 k7 . k9 k10 as well, both ways are forbidden: the row-8
    // "three" is no three and h8 is allowed.
    let b = stones(
        Rule::Renju,
        "i8 j8 h9 h10 g5 g6 g7 g9 g10 k5 k6 k7 k9 k10",
        "",
    );
    assert_eq!(b.forbidden(p("k8")), Some(Forbidden::Overline));
    expect(&b, "h8", None);
}

#[test]
fn a_three_whose_only_straight_four_points_make_a_five_elsewhere_is_no_three() {
    // RIF section 3 (International Rules of Renju, 1996 with the 1998 correction), the
    // definition of a three: "a row with three stones to which you, without at the same time
    // a five in a row is made, can add one more stone to attain a straight four". Row 8:
    // h8 i8 j8 (h8 the point tried) reaches a straight four at g8 or at k8; column h holds
    // h9 h10 for the second three. Column g holds g6 g7 . g9 g10, so g8 also makes five in
    // column g: that way does not count, but k8 still does, the row-8 three is real, and h8 is
    // a double three.
    let b = stones(Rule::Renju, "i8 j8 h9 h10 g6 g7 g9 g10", "a1");
    assert!(
        b.threats(p("g8"), Stone::Black).five(),
        "g8 makes five in column g"
    );
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // With column k holding k6 k7 . k9 k10 as well, both straight-four points make a five
    // elsewhere: the row-8 "three" is no three and h8 is allowed (black has other ways to
    // win, but h8 is no double three).
    let b = stones(
        Rule::Renju,
        "i8 j8 h9 h10 g6 g7 g9 g10 k6 k7 k9 k10",
        "a1 a2",
    );
    assert!(b.threats(p("k8"), Stone::Black).five());
    expect(&b, "h8", None);
    assert_eq!(
        reading::Grid::of(&b).forbidden_points(),
        b.forbidden_points()
    );
}

#[test]
fn a_four_three_three_is_saved_when_one_three_can_only_become_five() {
    // RIF section 3 and section 9.3 (a double three is forbidden, whatever fours come with
    // it). h8 makes a four in column h (h5 h6 h7 h8, closed by white h4), a three in row 8
    // (i8 j8: straight-four points g8 and k8) and a three on the diagonal (i9 j10: g7 and
    // k11). That is four-three-three: forbidden as a double three.
    let base = "h5 h6 h7 i8 j8 i9 j10";
    let b = stones(Rule::Renju, base, "h4 a1");
    assert_eq!(b.threats(p("h8"), Stone::Black).fours(), 1);
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    // Put g6 g7 . g9 g10 in column g and k6 k7 . k9 k10 in column k: both straight-four points
    // of the row-8 three now make a five elsewhere, so it is no three; h8 is a four-three,
    // which is allowed. (g7 is also a straight-four point of the diagonal three, and black has
    // taken it, so the diagonal's only way is k11.)
    let b = stones(
        Rule::Renju,
        &format!("{base} g6 g9 g10 k6 k7 k9 k10"),
        "h4 a1 a2 a3 a4",
    );
    expect(&b, "h8", None);
    assert_eq!(
        reading::Grid::of(&b).forbidden_points(),
        b.forbidden_points()
    );
}

#[test]
fn the_clause_decides_an_extension_point_in_the_recursion() {
    // As in `the_three_test_recurses`: h8 makes the row-8 three g8 . i8 (white k8, only
    // straight-four point f8) and the column three h9 h10; f8, with h8 on the board, makes the
    // straight four f8-i8 and two threes of its own, f8-f9-f10 and d10-e9-f8 (anti-diagonal,
    // closed by white h6, so its only straight-four point is c11). Column c holds c8 c9 c10 .
    // c12, so c11 makes exactly five in column c. By the RIF definition of a three (section 3:
    // no five "at the same time"), c11 is no way to a straight four, the anti-diagonal is no
    // three, f8 makes one three and a four and is allowed, the row-8 three through h8 is real,
    // and h8 is a double three. Without the clause, c11 would count, f8 would be a double
    // three, and h8 would be allowed.
    let b = stones(
        Rule::Renju,
        "g8 i8 h9 h10 f9 f10 e9 d10 c8 c9 c10 c12",
        "k8 h6 a1 a2",
    );
    let mut after = b.clone();
    after.place(p("h8"), Stone::Black);
    after.place(p("f8"), Stone::Black);
    assert!(
        after.threats(p("c11"), Stone::Black).five(),
        "c11 makes five"
    );
    after.remove(p("f8"));
    assert_eq!(after.forbidden(p("f8")), None);
    expect(&b, "h8", Some(Forbidden::DoubleThree));
    assert_eq!(
        reading::Grid::of(&b).forbidden_points(),
        b.forbidden_points()
    );
}

#[test]
fn a_three_that_could_only_make_six_is_no_three() {
    // RIF (five, three): black's five must be exactly five, so a straight four for black is
    // four in a row whose two ends each make exactly five. Row 8: c8 . . f8 g8 h8 . . k8. Both
    // ways of extending f8-h8 to four in a row (e8 or i8) leave one end that would join c8 or
    // k8 into six: neither is a straight four for black, so this is no three, and h8 with
    // h9-h10 is allowed.
    expect(&stones(Rule::Renju, "c8 f8 g8 k8 h9 h10", ""), "h8", None);
    // Without c8 and k8 it is a three, and h8 a double three.
    expect(
        &stones(Rule::Renju, "f8 g8 h9 h10", ""),
        "h8",
        Some(Forbidden::DoubleThree),
    );
}

// ---------------------------------------------------------------------------------------------
// Double four.

#[test]
fn a_four_that_could_only_make_six_does_not_count() {
    // RIF (five, four): d8 e8 . g8 h8 i8 . k8. f8 would make d8-i8, six in a row, which is not
    // a five for black; only j8 makes a five (g8-k8). So h8 makes one four, not a double four,
    // and is allowed (under freestyle the same stones are a double four in one line).
    let b = stones(Rule::Renju, "d8 e8 g8 i8 k8", "");
    assert_eq!(b.threats(p("h8"), Stone::Black).fours(), 1);
    assert_eq!(expect(&b, "h8", None), Some(Played::Continue));
    let free = stones(Rule::Freestyle, "d8 e8 g8 i8 k8", "");
    assert_eq!(free.threats(p("h8"), Stone::Black).fours(), 2);
}

#[test]
fn double_four_across_two_lines_is_forbidden() {
    // RIF (forbidden, four): h8 makes h8-k8 (closed by white g8, open at l8) and h8-h11
    // (closed by white h7, open at h12): two fours.
    let b = stones(Rule::Renju, "i8 j8 k8 h9 h10 h11", "g8 h7");
    expect(&b, "h8", Some(Forbidden::DoubleFour));
    // A straight four with a four is a double four too.
    let b = stones(Rule::Renju, "i8 j8 k8 h9 h10 h11", "h7");
    expect(&b, "h8", Some(Forbidden::DoubleFour));
    nothing_forbidden_under(Rule::Standard, "i8 j8 k8 h9 h10 h11", "g8 h7", "h8");
}

#[test]
fn double_four_in_one_line_is_forbidden() {
    // RIF (four): two fours in one line. X.XXX.X with the move in the middle: e8 . g8 h8 i8 .
    // k8; f8 makes e8-i8 and j8 makes g8-k8, two different fives.
    let b = stones(Rule::Renju, "e8 g8 i8 k8", "");
    assert_eq!(b.threats(p("h8"), Stone::Black).fours(), 2);
    expect(&b, "h8", Some(Forbidden::DoubleFour));
    // XX.XX.XX: d8 e8 . g8 h8 . j8 k8; f8 makes d8-h8, i8 makes g8-k8.
    expect(
        &stones(Rule::Renju, "d8 e8 g8 j8 k8", ""),
        "h8",
        Some(Forbidden::DoubleFour),
    );
    // XXX.X.XXX: c8 d8 e8 . g8 . i8 j8 k8 with the move on g8; f8 makes c8-g8, h8 makes g8-k8.
    expect(
        &stones(Rule::Renju, "c8 d8 e8 i8 j8 k8", ""),
        "g8",
        Some(Forbidden::DoubleFour),
    );
    // One four in the line is allowed: e8 . g8 h8 i8 with j8 white.
    expect(&stones(Rule::Renju, "e8 g8 i8 k8", "j8"), "h8", None);
}

// ---------------------------------------------------------------------------------------------
// Overline.

#[test]
fn black_overline_is_forbidden_under_renju() {
    // RIF (forbidden): six in a row, e8-j8.
    let (black, white) = ("e8 f8 g8 i8 j8", "");
    expect(
        &stones(Rule::Renju, black, white),
        "h8",
        Some(Forbidden::Overline),
    );
    // Seven in a row, d8-j8.
    expect(
        &stones(Rule::Renju, "d8 e8 f8 g8 i8 j8", ""),
        "h8",
        Some(Forbidden::Overline),
    );
}

#[test]
fn overline_under_standard_and_freestyle() {
    // DESIGN section 3: under standard rules an overline neither wins nor ends the game (and is
    // not refused); under freestyle five or more wins.
    let (black, white) = ("e8 f8 g8 i8 j8", "a1 c1 e1 g1 i1");
    let mut g = game(stones(Rule::Standard, black, white), Stone::Black);
    assert_eq!(g.play(p("h8")), Ok(Played::Continue));
    assert_eq!(g.winner(), None);
    assert!(!g.is_over());
    assert_eq!(g.board().find_winner(), None);
    let mut g = game(stones(Rule::Freestyle, black, white), Stone::Black);
    assert_eq!(g.play(p("h8")), Ok(Played::Win(Stone::Black)));
    assert_eq!(g.winner(), Some(Stone::Black));
}

// ---------------------------------------------------------------------------------------------
// Fives made together with forbidden shapes; four-three.

#[test]
fn five_with_a_double_four_wins() {
    // RIF (five first): h8 completes e8-i8 (exactly five) and also makes the fours h8-h11 and
    // h8-k11: the five wins and the move is not forbidden.
    let b = stones(Rule::Renju, "e8 f8 g8 i8 h9 h10 h11 i9 j10 k11", "");
    let t = b.threats(p("h8"), Stone::Black);
    assert!(t.five() && t.fours() >= 2, "{t:?}");
    assert_eq!(expect(&b, "h8", None), Some(Played::Win(Stone::Black)));
}

#[test]
fn five_with_a_double_three_wins() {
    // RIF (five first): h8 completes e8-i8 and also makes the threes h8-h10 and h8-j10.
    let b = stones(Rule::Renju, "e8 f8 g8 i8 h9 h10 i9 j10", "");
    assert!(b.threats(p("h8"), Stone::Black).threes() >= 2);
    assert_eq!(expect(&b, "h8", None), Some(Played::Win(Stone::Black)));
}

#[test]
fn four_three_is_allowed() {
    // RIF (forbidden) lists only double three, double four and overline: a four with one
    // three is black's normal winning shape. h8-k8 (white g8) and h8-h9-h10.
    let b = stones(Rule::Renju, "i8 j8 k8 h9 h10", "g8");
    let t = b.threats(p("h8"), Stone::Black);
    assert!(t.four_three(), "{t:?}");
    assert_eq!(expect(&b, "h8", None), Some(Played::Continue));
    // A straight four with a three is allowed too.
    expect(&stones(Rule::Renju, "i8 j8 k8 h9 h10", ""), "h8", None);
}

// ---------------------------------------------------------------------------------------------
// White.

#[test]
fn white_has_no_forbidden_points() {
    // RIF (white): the same shapes with white stones are legal for white.
    for (white, shape) in [
        ("i8 j8 h9 h10", "double three"),
        ("i8 j8 k8 h9 h10 h11", "double four"),
        ("e8 g8 i8 k8", "double four in one line"),
    ] {
        let b = stones(Rule::Renju, "a1 c1 e1 g1 i1 k1", white);
        // `forbidden` is about black; the point is not forbidden for black either, since the
        // stones are white.
        assert_eq!(b.forbidden(p("h8")), None, "{shape}");
        let mut g = game(b, Stone::White);
        assert_eq!(g.play(p("h8")), Ok(Played::Continue), "{shape}");
        assert_eq!(g.board().get(p("h8")), Some(Stone::White));
    }
}

#[test]
fn white_overline_wins_under_renju() {
    // RIF (white, five): white's six in a row e8-j8 wins.
    let b = stones(Rule::Renju, "a1 c1 e1 g1 i1 k1", "e8 f8 g8 i8 j8");
    let mut g = game(b, Stone::White);
    assert_eq!(g.play(p("h8")), Ok(Played::Win(Stone::White)));
    assert_eq!(g.winner(), Some(Stone::White));
    assert!(g.is_over());
    // And black's reply is refused: the game is over.
    assert_eq!(g.play(p("h1")), Err(MoveError::GameOver));
}

#[test]
fn black_exact_five_wins_under_renju() {
    // RIF (five): exactly five wins for black.
    let b = stones(Rule::Renju, "e8 f8 g8 i8", "a1 c1 e1 g1");
    let mut g = game(b, Stone::Black);
    assert_eq!(g.play(p("h8")), Ok(Played::Win(Stone::Black)));
    // Undo takes the win back.
    assert_eq!(g.undo(), Some(p("h8")));
    assert_eq!(g.winner(), None);
}

#[test]
fn forbidden_points_on_a_whole_board() {
    // `forbidden_points` lists a point once, with its reason; a renju position holding all
    // three kinds at once: a double three at h8 (i8 j8 h9 h10), a double four at c3
    // (d3 e3 f3 with white b3; c4 c5 c6 with white c2) and an overline at m13 (j13 k13 l13 . n13
    // o13 runs to the right edge).
    let b = stones(
        Rule::Renju,
        "i8 j8 h9 h10 d3 e3 f3 c4 c5 c6 j13 k13 l13 n13 o13",
        "b3 c2",
    );
    let listed = b.forbidden_points();
    for (at, why) in [
        ("h8", Forbidden::DoubleThree),
        ("c3", Forbidden::DoubleFour),
        ("m13", Forbidden::Overline),
    ] {
        assert!(listed.contains(&(p(at), why)), "{at} {why:?} in {listed:?}");
        expect(&b, at, Some(why));
    }
    let mut seen: Vec<_> = listed.iter().map(|(q, _)| *q).collect();
    seen.dedup();
    assert_eq!(seen.len(), listed.len(), "a point listed twice");
    // Under standard rules the same stones have none.
    let s = stones(Rule::Standard, "i8 j8 h9 h10 d3 e3 f3 c4 c5 c6", "b3 c2");
    assert!(s.forbidden_points().is_empty());
}

#[test]
fn refused_move_in_a_game_changes_nothing() {
    // Game bookkeeping around a refusal: after the refusal black can still play elsewhere,
    // and the forbidden point stays forbidden.
    let mut g = Game::new(Board::new(15, Rule::Renju).unwrap());
    for m in ["i8", "a1", "j8", "a3", "h9", "a5", "h10", "a7"] {
        assert_eq!(g.play(p(m)), Ok(Played::Continue), "{m}");
    }
    let before = (g.board().hash(), g.moves().to_vec(), g.to_move());
    assert_eq!(
        g.play(p("h8")),
        Err(MoveError::Forbidden(p("h8"), Forbidden::DoubleThree))
    );
    assert_eq!((g.board().hash(), g.moves().to_vec(), g.to_move()), before);
    assert_eq!(
        g.check(p("h8")),
        Err(MoveError::Forbidden(p("h8"), Forbidden::DoubleThree))
    );
    assert_eq!(g.play(p("o15")), Ok(Played::Continue));
    // White may take the point black may not.
    assert_eq!(g.play(p("h8")), Ok(Played::Continue));
    assert_eq!(g.board().get(p("h8")), Some(Stone::White));
}

// ---------------------------------------------------------------------------------------------
// The engine against a direct reading of the rules.

/// A direct, slow reading of the RIF clauses quoted at the top of this file, written without
/// the engine's shape tables or incremental state: it scans the stones around the point. The
/// solver referee (`referee`) reuses it for renju legality.
pub(crate) mod reading {
    use engine::{Board, Forbidden, Point, Stone};

    const STEPS: [(i32, i32); 4] = [(1, 0), (0, 1), (1, 1), (1, -1)];

    pub struct Grid {
        pub n: i32,
        /// 0 empty, 1 black, 2 white.
        pub cells: Vec<u8>,
    }

    impl Grid {
        pub fn of(board: &Board) -> Grid {
            let n = i32::from(board.size());
            let mut cells = vec![0; (n * n) as usize];
            for q in board.points() {
                cells[(i32::from(q.y) * n + i32::from(q.x)) as usize] = match board.get(q) {
                    None => 0,
                    Some(Stone::Black) => 1,
                    Some(Stone::White) => 2,
                };
            }
            Grid { n, cells }
        }

        /// The cell, or 3 off the board.
        fn at(&self, x: i32, y: i32) -> u8 {
            if x < 0 || y < 0 || x >= self.n || y >= self.n {
                3
            } else {
                self.cells[(y * self.n + x) as usize]
            }
        }

        fn set(&mut self, x: i32, y: i32, v: u8) {
            self.cells[(y * self.n + x) as usize] = v;
        }

        /// Black stones in a row through (x, y) along (dx, dy), (x, y) included.
        fn run(&self, x: i32, y: i32, (dx, dy): (i32, i32)) -> usize {
            let mut len = 1;
            for s in [-1, 1] {
                let mut k = 1;
                while self.at(x + s * k * dx, y + s * k * dy) == 1 {
                    len += 1;
                    k += 1;
                }
            }
            len
        }

        /// Empty points on the line within four steps that would give exactly five through
        /// (x, y) (a black stone is on (x, y), and it has no five yet).
        fn five_points(&mut self, x: i32, y: i32, d: (i32, i32)) -> Vec<(i32, i32)> {
            let mut out = vec![];
            for k in -4..=4 {
                let (qx, qy) = (x + k * d.0, y + k * d.1);
                if k != 0 && self.at(qx, qy) == 0 {
                    self.set(qx, qy, 1);
                    if self.run(x, y, d) == 5 {
                        out.push((qx, qy));
                    }
                    self.set(qx, qy, 0);
                }
            }
            out
        }

        /// A straight four through (x, y): four in a row whose two ends each make exactly
        /// five (with four in a row, only the two ends can complete a five).
        fn straight_four(&mut self, x: i32, y: i32, d: (i32, i32)) -> bool {
            self.run(x, y, d) == 4 && self.five_points(x, y, d).len() == 2
        }

        /// Fours through (x, y) along d: a straight four counts once, two separate completion
        /// points count twice.
        fn fours(&mut self, x: i32, y: i32, d: (i32, i32)) -> u32 {
            let n = self.five_points(x, y, d).len() as u32;
            if n == 2 && self.straight_four(x, y, d) {
                1
            } else {
                n
            }
        }

        /// A real three through (x, y) along d: one more stone on the line, itself allowed
        /// with (x, y) on the board and making no five at the same time, makes a straight four
        /// through (x, y).
        fn three(&mut self, x: i32, y: i32, d: (i32, i32)) -> bool {
            if self.fours(x, y, d) > 0 {
                return false;
            }
            for k in -4..=4 {
                let (qx, qy) = (x + k * d.0, y + k * d.1);
                if k == 0 || self.at(qx, qy) != 0 {
                    continue;
                }
                self.set(qx, qy, 1);
                let straight = self.straight_four(x, y, d);
                // RIF section 3: the stone that makes the straight four must not make a five
                // in a row at the same time (in any line through it).
                let five = STEPS.iter().any(|&e| self.run(qx, qy, e) == 5);
                self.set(qx, qy, 0);
                if straight && !five && self.forbidden(qx, qy).is_none() {
                    return true;
                }
            }
            false
        }

        /// Whether black's stone on the empty (x, y) is forbidden.
        pub fn forbidden(&mut self, x: i32, y: i32) -> Option<Forbidden> {
            self.set(x, y, 1);
            let runs: Vec<usize> = STEPS.iter().map(|&d| self.run(x, y, d)).collect();
            let result = if runs.contains(&5) {
                None
            } else if runs.iter().any(|&r| r >= 6) {
                Some(Forbidden::Overline)
            } else if STEPS.iter().map(|&d| self.fours(x, y, d)).sum::<u32>() >= 2 {
                Some(Forbidden::DoubleFour)
            } else if STEPS.iter().filter(|&&d| self.three(x, y, d)).count() >= 2 {
                Some(Forbidden::DoubleThree)
            } else {
                None
            };
            self.set(x, y, 0);
            result
        }

        pub fn forbidden_points(&mut self) -> Vec<(Point, Forbidden)> {
            let mut out = vec![];
            for y in 0..self.n {
                for x in 0..self.n {
                    if self.at(x, y) == 0 {
                        if let Some(f) = self.forbidden(x, y) {
                            out.push((Point::new(x as u8, y as u8), f));
                        }
                    }
                }
            }
            out
        }
    }
}

#[test]
fn forbidden_points_agree_with_a_direct_reading_of_the_rules() {
    // Deterministic random positions (a fixed xorshift stream), black-heavy and crowded in the
    // middle of an 11x11 or 15x15 board so that fours, threes and forbidden points are common.
    let mut state: u64 = 0x0F1F_E0F1_D5EE_D001;
    let mut next = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        state
    };
    let mut seen = [0usize; 3];
    // Points with two line-local threes (and no five, overline or double four) that are
    // nevertheless allowed: the recursive test decided them.
    let mut decided_by_recursion = 0;
    for round in 0..400 {
        let n: u8 = if round % 2 == 0 { 11 } else { 15 };
        let mut b = Board::new(n, Rule::Renju).unwrap();
        let stones = 12 + next() % 24;
        let off = (n - 8) / 2;
        for _ in 0..stones {
            let r = next();
            let q = engine::Point::new(off + (r % 8) as u8, off + (r / 8 % 8) as u8);
            if b.get(q).is_none() {
                let c = if r / 64 % 3 == 0 {
                    Stone::White
                } else {
                    Stone::Black
                };
                b.place(q, c);
            }
        }
        let engine_says = b.forbidden_points();
        let reading_says = reading::Grid::of(&b).forbidden_points();
        assert_eq!(
            engine_says,
            reading_says,
            "round {round} on\n{}",
            print_diagram(&b)
        );
        for q in b.points().filter(|&q| b.get(q).is_none()) {
            let t = b.threats(q, Stone::Black);
            if t.threes() >= 2
                && !t.five()
                && !t.overline()
                && t.fours() < 2
                && b.forbidden(q).is_none()
            {
                decided_by_recursion += 1;
            }
        }
        for (_, f) in engine_says {
            seen[match f {
                Forbidden::DoubleThree => 0,
                Forbidden::DoubleFour => 1,
                Forbidden::Overline => 2,
            }] += 1;
        }
    }
    // The sample must actually exercise every kind of forbidden point.
    assert!(
        seen.iter().all(|&k| k >= 10),
        "too few forbidden points: {seen:?}"
    );
    assert!(
        decided_by_recursion >= 5,
        "the recursion was hardly tested: {decided_by_recursion}"
    );
}
