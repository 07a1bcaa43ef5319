//! Benchmarks of the threat-shape state (criterion). How to run them and the latest numbers:
//! `benches/README.md`.
//!
//! * `incremental`: the cost of the incremental shape update, one stone placed and removed
//!   again on a fixed 15x15 middle-game position.
//! * `scan`: a full threat scan of the same position: for every empty point and both colours,
//!   the shapes a stone there makes (`Board::threats`), plus the renju forbidden-point check
//!   for black.
//!
//! Each benchmark checks its answer before it is timed and again afterwards, so a change that
//! made it faster by computing something else fails instead of looking good.

use criterion::{black_box, criterion_group, criterion_main, Criterion, Throughput};
use engine::board::threat;
use engine::notation::play_moves;
use engine::{Board, Forbidden, Point, Rule, Stone};

/// A made-up renju game of 40 moves (black first), legal throughout, with nobody able to make
/// five on the next move:
///
/// ```text
/// 10 . . . X . . . . X . . . . . .
///  9 . . . X O . X X . . . O . . .
///  8 . . . . . O X X O . X . . . .
///  7 . . . . . O O . O X O . . . .
///  6 . . . . . X X O O X . . . . .
///  5 . . . . X O . O X O . . . . .
///  4 . . . O X O O X X O . . . . .
///  3 . . . . . . X O O . . . . . .
///  2 . . . . . O . X X . . . . . .
///    a b c d e f g h i j k l m n o      (rows 1 and 11-15 are empty)
/// ```
const MOVES: &str = "h8 i7 j6 j5 h9 i6 i4 i8 j7 h5 g8 f8 h4 h6 i5 j4 k8 e9 g6 i3 \
                     i2 f7 g9 f5 e5 f4 f6 h3 g3 f2 h2 k7 i10 g4 e4 d4 d9 g7 d10 l9";

fn position() -> Board {
    let game = play_moves(MOVES, 15, Rule::Renju).expect("the bench game is legal under renju");
    assert_eq!(game.moves().len(), 40);
    assert_eq!(game.winner(), None);
    let board = game.board().clone();
    for c in Stone::ALL {
        assert!(
            board.cells_with(c, threat::FIVE).is_empty(),
            "{c} can make five"
        );
    }
    board
}

fn p(s: &str) -> Point {
    s.parse().unwrap()
}

/// The empty points next to a stone (where a search places its stones), in board order.
fn near_points(board: &Board) -> Vec<usize> {
    board
        .points()
        .filter(|&q| board.get(q).is_none())
        .filter(|&q| {
            board
                .points()
                .any(|r| board.get(r).is_some() && q.x.abs_diff(r.x) <= 1 && q.y.abs_diff(r.y) <= 1)
        })
        .map(|q| board.index(q))
        .collect()
}

/// For each point, the number of black and white four points after a stone of the point's
/// colour is placed there: the answer the incremental update has to keep right.
fn fours_after(board: &mut Board, points: &[usize]) -> Vec<(usize, usize)> {
    points
        .iter()
        .enumerate()
        .map(|(n, &i)| {
            board.place_at(i, Stone::ALL[n % 2]);
            let r = (
                board.cells_with(Stone::Black, threat::FOUR).len(),
                board.cells_with(Stone::White, threat::FOUR).len(),
            );
            board.remove_at(i);
            r
        })
        .collect()
}

fn incremental(c: &mut Criterion) {
    let mut board = position();
    let start = board.hash();
    let points = near_points(&board);
    assert!(points.len() >= 40, "{} near points", points.len());
    let want = fours_after(&mut board, &points);
    // The placements do change the shape state: some of them create new four points.
    let before = (
        board.cells_with(Stone::Black, threat::FOUR).len(),
        board.cells_with(Stone::White, threat::FOUR).len(),
    );
    assert!(want.iter().any(|&w| w != before));

    let mut group = c.benchmark_group("incremental");
    // One element = one stone placed and removed again (two incremental updates).
    group.throughput(Throughput::Elements(1));
    let one = board.index(p("h7"));
    assert!(board.is_empty_at(one));
    group.bench_function("place_remove_h7", |b| {
        b.iter(|| {
            board.place_at(black_box(one), Stone::Black);
            board.remove_at(black_box(one));
        })
    });
    group.throughput(Throughput::Elements(points.len() as u64));
    group.bench_function("place_remove_every_near_point", |b| {
        b.iter(|| {
            for (n, &i) in points.iter().enumerate() {
                board.place_at(black_box(i), Stone::ALL[n % 2]);
                board.remove_at(i);
            }
        })
    });
    group.finish();

    assert_eq!(
        board.hash(),
        start,
        "place and remove must restore the hash"
    );
    board
        .check_invariants()
        .expect("incremental state matches a rebuild");
    assert_eq!(fours_after(&mut board, &points), want);
}

/// What a full scan finds.
#[derive(Debug, PartialEq, Eq)]
struct Scan {
    /// Per colour: empty points where a stone makes at least one four.
    fours: [usize; 2],
    /// Per colour: empty points where a stone makes at least one (line-local) three.
    threes: [usize; 2],
    /// Black's forbidden points under renju.
    forbidden: usize,
}

fn scan(board: &mut Board, points: &[Point]) -> Scan {
    let mut s = Scan {
        fours: [0; 2],
        threes: [0; 2],
        forbidden: 0,
    };
    for &q in points {
        let idx = board.index(q);
        if !board.is_empty_at(idx) {
            continue;
        }
        for c in Stone::ALL {
            let t = board.threats(q, c);
            s.fours[c.index()] += usize::from(t.fours() > 0);
            s.threes[c.index()] += usize::from(t.threes() > 0);
        }
        s.forbidden += usize::from(board.forbidden_at(idx).is_some());
    }
    s
}

fn full_scan(c: &mut Criterion) {
    let mut board = position();
    let all: Vec<Point> = board.points().collect();
    let got = scan(&mut board, &all);
    // The scan agrees with the engine's incremental point sets and with forbidden_points.
    for colour in Stone::ALL {
        assert_eq!(
            got.fours[colour.index()],
            board.cells_with(colour, threat::FOUR).len()
        );
        assert_eq!(
            got.threes[colour.index()],
            board.cells_with(colour, threat::THREE).len()
        );
    }
    // Checked by hand on the diagram: h11 makes the broken threes h11 . h9 h8 (column h) and
    // h11 i10 . k8 (anti-diagonal); j9 makes the broken three g9 h9 . j9 (row 9) and the
    // three i10 j9 k8 (anti-diagonal): both double threes, and no other point is forbidden.
    assert_eq!(
        board.forbidden_points(),
        vec![
            (p("j9"), Forbidden::DoubleThree),
            (p("h11"), Forbidden::DoubleThree)
        ]
    );
    assert_eq!(got.forbidden, 2);
    assert!(got.fours[0] > 0 && got.fours[1] > 0, "{got:?}");

    let empties = all.iter().filter(|&&q| board.get(q).is_none()).count() as u64;
    let mut group = c.benchmark_group("scan");
    group.throughput(Throughput::Elements(empties));
    group.bench_function("threats_and_forbidden_15x15", |b| {
        b.iter(|| black_box(scan(&mut board, black_box(&all))))
    });
    group.finish();
    assert_eq!(scan(&mut board, &all), got);
    board.check_invariants().unwrap();
}

criterion_group!(benches, incremental, full_scan);
criterion_main!(benches);
