//! Randomised checks (proptest) on random stone sets and random board sizes.
//!
//! These are properties rather than reference values; each is a fact of the trade or of the
//! mathematics behind the engine, not of the engine itself:
//! * Zobrist hashing (A. L. Zobrist, "A New Hashing Method with Application for Game Playing",
//!   1970): a position's hash is the exclusive or of one key per stone, so placing then removing
//!   a stone restores it exactly;
//! * the eight symmetries of the square (the dihedral group of order 8) map lines to lines,
//!   so the shapes a stone makes are the same at the image point (the directions permute), a
//!   renju forbidden point stays forbidden for the same reason, and every image has the same
//!   canonical hash (common practice for de-duplicating positions);
//! * the text formats round-trip (common practice for any serialisation).
//!
//! Case counts are modest so that the whole test binary runs in seconds.

use std::collections::{BTreeSet, HashSet};

use engine::notation::{diagram, format_points, parse_diagram, parse_points, play_moves};
use engine::{Board, Direction, Game, LineShape, Point, Rule, Stone, Symmetry};
use proptest::prelude::*;

fn rule_of(i: usize) -> Rule {
    Rule::ALL[i % Rule::ALL.len()]
}

/// A board of side 5 to 19 under a random rule, with up to `max` random stones of either
/// colour (points that fall off the board or repeat are skipped).
fn board(max: usize) -> impl Strategy<Value = Board> {
    (
        5u8..=19,
        0usize..3,
        prop::collection::vec((0u8..19, 0u8..19, any::<bool>()), 0..max),
    )
        .prop_map(|(n, r, stones)| {
            let mut b = Board::new(n, rule_of(r)).unwrap();
            for (x, y, black) in stones {
                let q = Point::new(x, y);
                if b.contains(q) && b.get(q).is_none() {
                    b.place(q, if black { Stone::Black } else { Stone::White });
                }
            }
            b
        })
}

/// Stones clustered near the centre, so that lines and threats actually form (random stones
/// spread over a 19x19 board seldom make more than twos).
fn crowded_board() -> impl Strategy<Value = Board> {
    (
        9u8..=15,
        0usize..3,
        prop::collection::vec((0u8..7, 0u8..7, any::<bool>()), 0..30),
    )
        .prop_map(|(n, r, stones)| {
            let mut b = Board::new(n, rule_of(r)).unwrap();
            let off = (n - 7) / 2;
            for (x, y, black) in stones {
                let q = Point::new(x + off, y + off);
                if b.get(q).is_none() {
                    b.place(q, if black { Stone::Black } else { Stone::White });
                }
            }
            b
        })
}

fn empties(b: &Board) -> Vec<Point> {
    b.points().filter(|&q| b.get(q).is_none()).collect()
}

/// What an empty point holds for both colours: black's and white's flags and line shapes.
type PointState = (Point, u8, u8, [LineShape; 4], [LineShape; 4]);

/// Every empty point's flags and shapes: the observable shape state.
fn shape_state(b: &Board) -> Vec<PointState> {
    empties(b)
        .into_iter()
        .map(|q| {
            let i = b.index(q);
            (
                q,
                b.flags_at(i, Stone::Black),
                b.flags_at(i, Stone::White),
                b.threats(q, Stone::Black).lines,
                b.threats(q, Stone::White).lines,
            )
        })
        .collect()
}

fn all_hashes(b: &Board) -> Vec<u64> {
    Symmetry::ALL
        .into_iter()
        .filter(|s| s.applies_to(b.width(), b.height()))
        .map(|s| b.hash_under(s))
        .collect()
}

/// The direction a symmetry maps `d` to (a line maps to a line; its sense may flip).
fn image_direction(s: Symmetry, d: Direction) -> Direction {
    let (dx, dy) = d.step();
    // Map the step through the symmetry's linear part using two points of a 3x3 board.
    let c = s.apply(Point::new(1, 1), 3, 3);
    let e = s.apply(Point::new((1 + dx) as u8, (1 + dy) as u8), 3, 3);
    let (mut ex, mut ey) = (e.x as i8 - c.x as i8, e.y as i8 - c.y as i8);
    if ex < 0 || (ex == 0 && ey < 0) {
        (ex, ey) = (-ex, -ey);
    }
    Direction::ALL
        .into_iter()
        .find(|d| d.step() == (ex, ey))
        .expect("a symmetry maps a line direction to a line direction")
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn place_then_remove_restores_everything(b in board(80), pick in any::<usize>(), black in any::<bool>()) {
        let mut b = b;
        let free = empties(&b);
        prop_assume!(!free.is_empty());
        let q = free[pick % free.len()];
        let c = if black { Stone::Black } else { Stone::White };
        let hashes = all_hashes(&b);
        let canonical = b.canonical_hash();
        let state = shape_state(&b);
        let counts = (b.count(Stone::Black), b.count(Stone::White));

        b.place(q, c);
        prop_assert_eq!(b.check_invariants(), Ok(()));
        prop_assert_ne!(b.hash(), hashes[0], "a stone must change the hash");
        prop_assert_eq!(b.get(q), Some(c));
        b.remove(q);

        prop_assert_eq!(b.check_invariants(), Ok(()));
        prop_assert_eq!(all_hashes(&b), hashes);
        prop_assert_eq!(b.canonical_hash(), canonical);
        prop_assert_eq!((b.count(Stone::Black), b.count(Stone::White)), counts);
        prop_assert!(shape_state(&b) == state, "shapes changed after place and remove");
    }

    #[test]
    fn shapes_are_invariant_under_the_eight_symmetries(b in crowded_board()) {
        let n = b.size();
        let forbidden: HashSet<_> = b.forbidden_points().into_iter().collect();
        for s in Symmetry::ALL {
            let t = b.transformed(s);
            prop_assert_eq!(t.check_invariants(), Ok(()));
            prop_assert_eq!(t.hash(), b.hash_under(s), "{:?}", s);
            for q in b.points() {
                let r = s.apply(q, n, n);
                prop_assert_eq!(t.get(r), b.get(q));
                if b.get(q).is_some() {
                    continue;
                }
                for c in Stone::ALL {
                    let here = b.threats(q, c).lines;
                    let there = t.threats(r, c).lines;
                    // As multisets: the four shapes, sorted.
                    let (mut x, mut y) = (here, there);
                    x.sort();
                    y.sort();
                    prop_assert_eq!(x, y, "{} {:?} at {} / {}", c, s, q, r);
                    // And direction by direction, through the image of each direction.
                    for d in Direction::ALL {
                        prop_assert_eq!(here[d.index()], there[image_direction(s, d).index()]);
                    }
                    prop_assert_eq!(b.flags_at(b.index(q), c), t.flags_at(t.index(r), c));
                }
            }
            // Renju forbidden points map to forbidden points with the same reason.
            let mapped: HashSet<_> = forbidden.iter().map(|&(q, f)| (s.apply(q, n, n), f)).collect();
            let there: HashSet<_> = t.forbidden_points().into_iter().collect();
            prop_assert_eq!(mapped, there, "{:?}", s);
        }
    }

    #[test]
    fn canonical_hash_is_the_same_for_all_eight_images(b in board(60)) {
        let canon = b.canonical_hash();
        let mut images = BTreeSet::new();
        for s in Symmetry::ALL {
            let t = b.transformed(s);
            prop_assert_eq!(t.canonical_hash(), canon, "{:?}", s);
            images.insert(t.hash());
            // Mapping back undoes the symmetry.
            prop_assert_eq!(t.transformed(s.inverse()).hash(), b.hash());
        }
        // The canonical symmetry's image has the canonical hash.
        prop_assert_eq!(b.transformed(b.canonical_symmetry()).hash(), canon);
        // The canonical hash is one of the images' hashes, and the smallest.
        prop_assert!(images.contains(&canon));
        prop_assert_eq!(images.iter().next().copied(), Some(canon));
    }

    #[test]
    fn rectangles_use_their_four_symmetries(w in 5u8..=12, h in 5u8..=12, raw in prop::collection::vec((0u8..12, 0u8..12, any::<bool>()), 0..30)) {
        prop_assume!(w != h);
        let mut b = Board::mnk(w, h, 5).unwrap();
        for (x, y, black) in raw {
            let q = Point::new(x, y);
            if b.contains(q) && b.get(q).is_none() {
                b.place(q, if black { Stone::Black } else { Stone::White });
            }
        }
        let canon = b.canonical_hash();
        for s in Symmetry::ALL.into_iter().filter(|s| s.applies_to(w, h)) {
            let t = b.transformed(s);
            prop_assert_eq!((t.width(), t.height()), (w, h));
            prop_assert_eq!(t.canonical_hash(), canon, "{:?}", s);
            prop_assert_eq!(t.check_invariants(), Ok(()));
        }
    }

    #[test]
    fn diagrams_round_trip(b in board(120)) {
        let text = diagram(&b);
        let back = parse_diagram(&text, b.rule()).unwrap();
        prop_assert_eq!(back.hash(), b.hash());
        prop_assert_eq!(back.size(), b.size());
        prop_assert_eq!(back.rule(), b.rule());
        prop_assert_eq!(diagram(&back), text.clone());
        prop_assert_eq!(back.check_invariants(), Ok(()));
        // The documented alternative spellings read the same: lower case stones, `+` for empty,
        // no spaces, no row numbers, no column letters.
        let bare: String = text
            .lines()
            .filter(|l| l.trim_start().starts_with(|c: char| c.is_ascii_digit()))
            .map(|l| {
                let body: String = l
                    .trim_start_matches(|c: char| c.is_ascii_digit() || c == ' ')
                    .chars()
                    .filter(|c| *c != ' ')
                    .map(|c| match c { 'X' => 'x', 'O' => 'o', '.' => '+', o => o })
                    .collect();
                body + "\n"
            })
            .collect();
        let again = parse_diagram(&bare, b.rule()).unwrap();
        prop_assert_eq!(again.hash(), b.hash());
    }

    #[test]
    fn move_lists_round_trip(n in 5u8..=19, raw in prop::collection::vec((0u8..19, 0u8..19), 0..60), commas in any::<bool>()) {
        let mut points: Vec<Point> = Vec::new();
        for (x, y) in raw {
            let q = Point::new(x % n, y % n);
            if !points.contains(&q) {
                points.push(q);
            }
        }
        let text = format_points(&points);
        prop_assert_eq!(parse_points(&text, "moves", n, n).unwrap(), points.clone());
        let other = if commas { text.replace(' ', ", ") } else { text.to_uppercase().replace(' ', "  \n") };
        prop_assert_eq!(parse_points(&other, "moves", n, n).unwrap(), points.clone());
        prop_assert_eq!(format_points(&parse_points(&text, "moves", n, n).unwrap()), text);
    }

    #[test]
    fn games_replay_from_their_move_lists_and_undo_to_empty(n in 7u8..=15, r in 0usize..3, picks in prop::collection::vec(any::<usize>(), 0..80)) {
        let rule = rule_of(r);
        let mut g = Game::new(Board::new(n, rule).unwrap());
        for pick in picks {
            if g.is_over() {
                break;
            }
            // Play the pick-th empty point, or the first one after it that the rules allow.
            let free = empties(g.board());
            let q = (0..free.len())
                .map(|i| free[(pick + i) % free.len()])
                .find(|&q| g.check(q).is_ok());
            prop_assume!(q.is_some());
            g.play(q.unwrap()).unwrap();
        }
        let text = format_points(g.moves());
        let replay = play_moves(&text, n, rule).unwrap();
        prop_assert_eq!(replay.board().hash(), g.board().hash());
        prop_assert_eq!(replay.winner(), g.winner());
        prop_assert_eq!(replay.to_move(), g.to_move());
        while g.undo().is_some() {}
        prop_assert_eq!(g.board().stones(), 0);
        prop_assert_eq!(g.board().hash(), Board::new(n, rule).unwrap().hash());
        prop_assert_eq!(g.board().check_invariants(), Ok(()));
        prop_assert_eq!(g.to_move(), Stone::Black);
        prop_assert_eq!(g.winner(), None);
    }
}
