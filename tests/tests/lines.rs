//! The number of distinct lines of five cells (`Board::windows(5)`).
//!
//! Sources: 572 five-cell lines on 15x15 and 1,020 on 19x19 are the figures used in the
//! threat-space search and proof-number literature on gomoku (L. V. Allis, "Searching for
//! Solutions in Games and Artificial Intelligence", 1994, and Allis, van den Herik, Huntjens,
//! "Go-Moku and Threat-Space Search", 1993; values from memory). We derive them here so that a
//! reader can check them without the sources:
//!
//! On an n x n board a window of length L along a row starts at any of the n - L + 1 columns
//! from which it still fits, in each of the n rows: n(n - L + 1) windows, the same for columns.
//! A diagonal window must fit in both directions at once: (n - L + 1)^2 start points, the same
//! for the other diagonal. For L = 5 that is n(n - 4) per orthogonal direction and (n - 4)^2 per
//! diagonal direction, 2n(n - 4) + 2(n - 4)^2 = 4(n - 2)(n - 4) in all:
//! * 15x15: 2 * 15 * 11 + 2 * 11 * 11 = 330 + 242 = 572;
//! * 19x19: 2 * 19 * 15 + 2 * 15 * 15 = 570 + 450 = 1,020.
//!
//! Tic-tac-toe has 8 lines of three (3 rows, 3 columns, 2 diagonals: common practice).

use std::collections::HashSet;

use engine::{Board, Point, Rule};

/// The windows by direction, after checking that every one lies on the board and that no
/// window (as a set of points) is listed twice.
fn windows_by_direction(board: &Board, len: u8) -> [usize; 4] {
    let mut seen: HashSet<Vec<Point>> = HashSet::new();
    let mut per = [0usize; 4];
    for (first, d) in board.windows(len) {
        let (dx, dy) = d.step();
        let mut cells: Vec<Point> = (0..i16::from(len))
            .map(|i| {
                let x = i16::from(first.x) + i16::from(dx) * i;
                let y = i16::from(first.y) + i16::from(dy) * i;
                assert!(
                    (0..i16::from(board.width())).contains(&x)
                        && (0..i16::from(board.height())).contains(&y),
                    "window from {first} {d:?} leaves the board"
                );
                Point::new(x as u8, y as u8)
            })
            .collect();
        cells.sort();
        assert!(seen.insert(cells), "window from {first} {d:?} listed twice");
        per[d.index()] += 1;
    }
    per
}

#[test]
fn five_cell_lines_on_fifteen_and_nineteen() {
    let b15 = Board::new(15, Rule::Freestyle).unwrap();
    let per = windows_by_direction(&b15, 5);
    // 15 * 11 = 165 per orthogonal direction, 11 * 11 = 121 per diagonal direction.
    assert_eq!(per, [165, 165, 121, 121]);
    assert_eq!(per.iter().sum::<usize>(), 572);

    let b19 = Board::new(19, Rule::Renju).unwrap();
    let per = windows_by_direction(&b19, 5);
    // 19 * 15 = 285 per orthogonal direction, 15 * 15 = 225 per diagonal direction.
    assert_eq!(per, [285, 285, 225, 225]);
    assert_eq!(per.iter().sum::<usize>(), 1_020);
}

#[test]
fn five_cell_lines_follow_the_formula_on_every_size() {
    for n in 5u8..=19 {
        let b = Board::new(n, Rule::Standard).unwrap();
        let n = n as usize;
        let per = windows_by_direction(&b, 5);
        let orth = n * (n - 4);
        let diag = (n - 4) * (n - 4);
        assert_eq!(per, [orth, orth, diag, diag], "{n}x{n}");
        assert_eq!(b.windows(5).count(), 4 * (n - 2) * (n - 4), "{n}x{n}");
    }
}

#[test]
fn lines_of_three_on_tic_tac_toe_and_rectangles() {
    let ttt = Board::mnk(3, 3, 3).unwrap();
    assert_eq!(windows_by_direction(&ttt, 3), [3, 3, 1, 1]);
    // A w x h rectangle: rows h(w - L + 1), columns w(h - L + 1), each diagonal
    // (w - L + 1)(h - L + 1). For 7 columns, 6 rows and L = 4: 6 * 4 = 24, 7 * 3 = 21 and
    // 4 * 3 = 12 each, 69 in all: the 69 "groups" of the 7x6 vertical four-in-a-row game
    // (L. V. Allis, master's thesis, Vrije Universiteit Amsterdam, 1988; value from memory).
    let rect = Board::mnk(7, 6, 4).unwrap();
    let per = windows_by_direction(&rect, 4);
    assert_eq!(per, [24, 21, 12, 12]);
    assert_eq!(per.iter().sum::<usize>(), 69);
    // Windows longer than the board fit nowhere.
    assert_eq!(ttt.windows(4).count(), 0);
    assert_eq!(Board::mnk(1, 5, 1).unwrap().windows(6).count(), 0);
}
