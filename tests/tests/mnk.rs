//! Complete enumeration of small m,n,k-games with the engine's own win detection.
//!
//! Sources:
//! * Tic-tac-toe game and position counts: the widely published combinatorics of tic-tac-toe
//!   (quoted, for example, in the Wikipedia article "Tic-tac-toe", section "Combinatorics").
//!   Values from memory of those published figures: 255,168 games (131,184 won by the first player, 77,904
//!   by the second, 46,080 drawn); 26,830 games when rotations and reflections are considered
//!   the same; 5,478 distinct positions reachable in play, 765 up to symmetry; 958 terminal
//!   positions (626 first-player wins, 316 second-player wins, 16 draws), 138 up to symmetry
//!   (91, 44 and 3).
//! * Game values: tic-tac-toe is a draw with best play (common practice, and every published
//!   analysis); the (4,3,3)-game is a first-player win (from memory of the Wikipedia article
//!   "m,n,k-game", which lists every (m,n,3) with m >= 4 and n >= 3 as a first-player win).
//! * The k = 1 and k = 2 counts are derived by hand in comments next to them.
//!
//! A game ends at the first winning move or when the board is full. The enumeration asks the
//! engine, before each move, whether it wins (`Board::wins_at`), and after it, whether the stone
//! is part of a winning line (`Board::is_winning_stone`); the two must agree at every node.

use std::collections::{HashMap, HashSet};

use engine::{Board, Point, Stone, Symmetry};

/// A position as a base-3 number, one digit per point in board order (0 empty, 1 first
/// player, 2 second): our own key, independent of the engine's hashes.
fn layout(board: &Board) -> u64 {
    board.points().fold(0u64, |acc, q| {
        acc * 3
            + match board.get(q) {
                None => 0,
                Some(Stone::Black) => 1,
                Some(Stone::White) => 2,
            }
    })
}

/// The smallest layout over the symmetries of a `w` x `h` board: our own canonical form,
/// computed from the layout alone with `Symmetry::apply`.
fn smallest_layout(code: u64, w: u8, h: u8) -> u64 {
    let n = usize::from(w) * usize::from(h);
    let mut digits = vec![0u64; n];
    let mut c = code;
    for d in digits.iter_mut().rev() {
        *d = c % 3;
        c /= 3;
    }
    let points: Vec<Point> = (0..h)
        .flat_map(|y| (0..w).map(move |x| Point::new(x, y)))
        .collect();
    Symmetry::ALL
        .into_iter()
        .filter(|s| s.applies_to(w, h))
        .map(|s| {
            let mut image = vec![0u64; n];
            for (i, q) in points.iter().enumerate() {
                let r = s.apply(*q, w, h);
                image[usize::from(r.y) * usize::from(w) + usize::from(r.x)] = digits[i];
            }
            image.iter().fold(0u64, |acc, d| acc * 3 + d)
        })
        .min()
        .expect("the identity always applies")
}

fn empty_points(board: &Board) -> Vec<usize> {
    board
        .points()
        .filter(|&q| board.get(q).is_none())
        .map(|q| board.index(q))
        .collect()
}

/// Game counts: every game, and the terminal positions by (layout, result), where the result
/// is 1 or 2 for a win by the first or second player and 0 for a draw.
#[derive(Default, Debug)]
struct Games {
    games: u64,
    by_result: [u64; 3],
    terminal: HashSet<(u64, u8)>,
}

fn result_of(wins: bool, mover: Stone) -> u8 {
    if wins {
        1 + mover.index() as u8
    } else {
        0
    }
}

/// Plays out every game. Before a move the engine says whether it wins (`wins_at`); after it,
/// whether the stone is part of a winning line (`is_winning_stone`); they must agree.
fn walk(board: &mut Board, to_move: Stone, g: &mut Games) {
    for idx in empty_points(board) {
        let wins = board.wins_at(idx, to_move);
        board.place_at(idx, to_move);
        assert_eq!(
            board.is_winning_stone(idx),
            wins,
            "wins_at and is_winning_stone disagree on\n{board:?}"
        );
        if wins || board.is_full() {
            if !wins {
                assert_eq!(board.find_winner(), None, "a full board with a winner");
            }
            let r = result_of(wins, to_move);
            g.games += 1;
            g.by_result[r as usize] += 1;
            g.terminal.insert((layout(board), r));
        } else {
            walk(board, to_move.opponent(), g);
        }
        board.remove_at(idx);
    }
}

fn games(width: u8, height: u8, k: u8) -> Games {
    let mut board = Board::mnk(width, height, k).expect("a valid m,n,k board");
    let mut g = Games::default();
    walk(&mut board, Stone::Black, &mut g);
    assert_eq!(board.stones(), 0, "the walk must leave the board empty");
    assert_eq!(board.hash(), Board::mnk(width, height, k).unwrap().hash());
    g
}

/// Terminal positions up to symmetry.
fn classes(terminal: &HashSet<(u64, u8)>, w: u8, h: u8) -> HashSet<(u64, u8)> {
    terminal
        .iter()
        .map(|&(code, r)| (smallest_layout(code, w, h), r))
        .collect()
}

/// The games when, at every position, moves that lead to symmetric positions count once (the
/// usual way of counting games "up to symmetry"). Moves are grouped by the engine's
/// `canonical_hash` of the position they lead to.
fn reduced_games(board: &mut Board, to_move: Stone) -> u64 {
    let mut seen = HashSet::new();
    let mut n = 0;
    for idx in empty_points(board) {
        let wins = board.wins_at(idx, to_move);
        board.place_at(idx, to_move);
        if seen.insert(board.canonical_hash()) {
            n += if wins || board.is_full() {
                1
            } else {
                reduced_games(board, to_move.opponent())
            };
        }
        board.remove_at(idx);
    }
    n
}

/// Every position reachable in play (the empty board included), visited once each, keyed by
/// our own layout. Returns (layouts, engine hashes, our classes, engine canonical hashes).
fn positions(width: u8, height: u8, k: u8) -> [usize; 4] {
    type Sets = (HashSet<u64>, HashSet<u64>, HashSet<u64>, HashSet<u64>);
    fn record(board: &Board, sets: &mut Sets) {
        sets.1.insert(board.hash());
        sets.2.insert(smallest_layout(
            layout(board),
            board.width(),
            board.height(),
        ));
        sets.3.insert(board.canonical_hash());
    }
    fn visit(board: &mut Board, to_move: Stone, sets: &mut Sets) {
        if !sets.0.insert(layout(board)) {
            return;
        }
        record(board, sets);
        for idx in empty_points(board) {
            let wins = board.wins_at(idx, to_move);
            board.place_at(idx, to_move);
            if wins || board.is_full() {
                if sets.0.insert(layout(board)) {
                    record(board, sets);
                }
            } else {
                visit(board, to_move.opponent(), sets);
            }
            board.remove_at(idx);
        }
    }
    let mut board = Board::mnk(width, height, k).unwrap();
    let mut sets = Sets::default();
    visit(&mut board, Stone::Black, &mut sets);
    [sets.0.len(), sets.1.len(), sets.2.len(), sets.3.len()]
}

#[test]
fn tic_tac_toe_game_counts() {
    // Published: 255,168 games; 131,184 first-player wins, 77,904 second-player wins, 46,080
    // draws (from memory of the widely published tic-tac-toe combinatorics).
    let g = games(3, 3, 3);
    assert_eq!(g.games, 255_168);
    assert_eq!(g.by_result, [46_080, 131_184, 77_904]);
    // Published: 958 terminal positions (626 first-player wins, 316 second-player wins, 16
    // draws); 138 up to symmetry (91, 44 and 3) (from memory).
    let count = |set: &HashSet<(u64, u8)>, r: u8| set.iter().filter(|(_, x)| *x == r).count();
    assert_eq!(g.terminal.len(), 958);
    assert_eq!(
        [
            count(&g.terminal, 1),
            count(&g.terminal, 2),
            count(&g.terminal, 0)
        ],
        [626, 316, 16]
    );
    let terminal_classes = classes(&g.terminal, 3, 3);
    assert_eq!(terminal_classes.len(), 138);
    assert_eq!(
        [
            count(&terminal_classes, 1),
            count(&terminal_classes, 2),
            count(&terminal_classes, 0)
        ],
        [91, 44, 3]
    );
}

#[test]
fn tic_tac_toe_games_up_to_symmetry() {
    // Published: 26,830 games when positions that are rotations or reflections of each other
    // are considered the same (from memory of the published count; the reduction is applied
    // position by position, as the published count does).
    let mut board = Board::mnk(3, 3, 3).unwrap();
    assert_eq!(reduced_games(&mut board, Stone::Black), 26_830);
}

#[test]
fn tic_tac_toe_position_counts_and_canonical_hash() {
    // Published: 5,478 distinct positions reachable in play, the empty board included; 765
    // essentially different ones up to symmetry (from memory).
    let [layouts, hashes, classes, canonical] = positions(3, 3, 3);
    assert_eq!(layouts, 5_478);
    assert_eq!(hashes, 5_478, "Board::hash must separate positions");
    assert_eq!(classes, 765);
    assert_eq!(
        canonical, 765,
        "Board::canonical_hash must identify exactly the symmetric positions"
    );
}

#[test]
fn k_one_on_three_by_three() {
    // Derived: with k = 1 the first stone wins, so there are 9 games, all first-player wins;
    // the positions are the empty board and the 9 one-stone boards (10), which up to symmetry
    // are the empty board, a corner, an edge and the centre (4).
    let g = games(3, 3, 1);
    assert_eq!((g.games, g.by_result), (9, [0, 9, 0]));
    assert_eq!(positions(3, 3, 1), [10, 10, 4, 4]);
    // Up to symmetry the first move is a corner, an edge or the centre: 3 games.
    assert_eq!(
        reduced_games(&mut Board::mnk(3, 3, 1).unwrap(), Stone::Black),
        3
    );
}

#[test]
fn k_two_on_two_by_two() {
    // Derived: on 2x2 every two cells share a row, a column or a diagonal, so the first
    // player's second stone (move 3) always wins and nothing earlier can: 4 * 3 * 2 = 24 games,
    // all first-player wins. Up to symmetry: the first move is any corner (1 class); the reply
    // is adjacent or opposite (2 classes); after an adjacent reply the two cells left are not
    // exchanged by any symmetry fixing the first two stones (2 games), after an opposite reply
    // they are, by the reflection in that diagonal (1 game): 3 games.
    let g = games(2, 2, 2);
    assert_eq!((g.games, g.by_result), (24, [0, 24, 0]));
    assert_eq!(
        reduced_games(&mut Board::mnk(2, 2, 2).unwrap(), Stone::Black),
        3
    );
}

/// The value of the position for the side to move with best play: 1 win, 0 draw, -1 loss.
fn value(board: &mut Board, to_move: Stone, memo: &mut HashMap<u64, i8>) -> i8 {
    if let Some(&v) = memo.get(&board.hash()) {
        return v;
    }
    let empties: Vec<usize> = board
        .points()
        .filter(|&q| board.get(q).is_none())
        .map(|q| board.index(q))
        .collect();
    let mut best = if empties.is_empty() { 0 } else { -1 };
    for &idx in &empties {
        if board.wins_at(idx, to_move) {
            best = 1;
            break;
        }
    }
    if best < 1 {
        for idx in empties {
            board.place_at(idx, to_move);
            let v = if board.is_full() {
                0
            } else {
                -value(board, to_move.opponent(), memo)
            };
            board.remove_at(idx);
            best = best.max(v);
            if best == 1 {
                break;
            }
        }
    }
    // The side to move is fixed by the stone counts, so the hash alone keys the position.
    memo.insert(board.hash(), best);
    best
}

#[test]
fn game_values_of_small_mnk_games() {
    // Tic-tac-toe is a draw with best play (common practice; every published analysis).
    let mut b = Board::mnk(3, 3, 3).unwrap();
    assert_eq!(value(&mut b, Stone::Black, &mut HashMap::new()), 0);
    // The (4,3,3)-game is a first-player win (from memory of the published m,n,k results).
    let mut b = Board::mnk(4, 3, 3).unwrap();
    assert_eq!(value(&mut b, Stone::Black, &mut HashMap::new()), 1);
    // The (3,3,4)-game cannot be built: k may not exceed the longer side, and no line of four
    // fits on 3x3 (the engine refuses it rather than playing a game nobody can win).
    assert!(Board::mnk(3, 3, 4).is_err());
}
