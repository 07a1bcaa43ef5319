//! Points, line directions and the symmetries of a rectangular board.
//!
//! Coordinates follow the convention of the threat-space search paper (Allis, van den Herik and
//! Huntjens 1993) and of the renju rules: columns are lettered from `a` at the left, rows are
//! numbered from `1` at the bottom, so `h8` is the centre of a 15x15 board. A [`Point`] does not
//! know the board it lives on; whether it is on the board is checked by the board, so that parse
//! errors ("not a coordinate") and placement errors ("off this board") stay distinct.

use std::fmt;
use std::str::FromStr;

/// The largest side length of any board (19x19 is the largest gomoku board in use).
pub const MAX_SIDE: u8 = 19;

/// A point on a board: `x` is the column (0 = `a`), `y` the row (0 = row `1`).
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug, PartialOrd, Ord)]
pub struct Point {
    /// Column, 0-based from the left.
    pub x: u8,
    /// Row, 0-based from the bottom.
    pub y: u8,
}

impl Point {
    /// Makes a point from a column and a row, both 0-based.
    pub const fn new(x: u8, y: u8) -> Self {
        Point { x, y }
    }

    /// Puts points in reading order from a1: by row, then by column.
    pub fn sort_by_rows(points: &mut [Point]) {
        sort_keys(
            points,
            |p| u64::from(p.y) << 8 | u64::from(p.x),
            |k| Point::new(k as u8, (k >> 8) as u8),
        );
    }

    /// Puts points in their own order: by column, then by row.
    pub fn sort_by_columns(points: &mut [Point]) {
        sort_keys(
            points,
            |p| u64::from(p.x) << 8 | u64::from(p.y),
            |k| Point::new((k >> 8) as u8, k as u8),
        );
    }
}

/// The sort key of a scored cell: the higher score first, the lower cell first on a tie (the
/// sign bit flipped keeps the order of `i32`s; the complement reverses it). The cell is the
/// key's low 16 bits.
pub fn best_first_key(score: i32, cell: u16) -> u64 {
    u64::from(!(score as u32 ^ 0x8000_0000)) << 16 | u64::from(cell)
}

/// The score and the cell of a [`best_first_key`].
pub fn best_first_parts(key: u64) -> (i32, u16) {
    ((!(key >> 16) as u32 ^ 0x8000_0000) as i32, key as u16)
}

/// Sorts `items` by the `u64` key each one packs into, which `unpack` turns back into the item
/// (so the key holds the whole item and equal keys are equal items). Every sort of the engine
/// is a sort of `u64`s: the wasm modules then hold one sort routine, not one per item type and
/// order (each is several kilobytes).
pub fn sort_keys<T>(items: &mut [T], pack: impl Fn(&T) -> u64, unpack: impl Fn(u64) -> T) {
    let mut keys: Vec<u64> = items.iter().map(pack).collect();
    keys.sort_unstable();
    for (item, k) in items.iter_mut().zip(keys) {
        *item = unpack(k);
    }
}

impl fmt::Display for Point {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{}", (b'a' + self.x) as char, u32::from(self.y) + 1)
    }
}

/// A point serialises as its name, like `"h8"` (the app's answers carry points this way).
impl serde::Serialize for Point {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// And reads back from its name (a name that does not parse is the reader's error).
impl<'de> serde::Deserialize<'de> for Point {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let name = String::deserialize(d)?;
        name.trim().parse().map_err(serde::de::Error::custom)
    }
}

/// Why a piece of text is not a coordinate.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct PointParseError {
    /// The text that was rejected.
    pub text: String,
}

impl fmt::Display for PointParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "'{}' is not a coordinate (expected a column letter and a row number, like h8)",
            self.text
        )
    }
}

impl std::error::Error for PointParseError {}

impl FromStr for Point {
    type Err = PointParseError;

    /// Parses `h8`, `H8` or `s19`: one column letter `a`-`s` and a row number `1`-`19`.
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let err = || PointParseError {
            text: s.to_string(),
        };
        let mut chars = s.chars();
        let col = chars.next().ok_or_else(err)?.to_ascii_lowercase();
        if !('a'..='s').contains(&col) {
            return Err(err());
        }
        let digits = chars.as_str();
        if digits.is_empty() || digits.len() > 2 || !digits.bytes().all(|b| b.is_ascii_digit()) {
            return Err(err());
        }
        if digits.starts_with('0') {
            return Err(err());
        }
        let row: u8 = digits.parse().map_err(|_| err())?;
        if row == 0 || row > MAX_SIDE {
            return Err(err());
        }
        Ok(Point::new(col as u8 - b'a', row - 1))
    }
}

/// One of the four line directions through a point.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Direction {
    /// Along a row, left to right.
    Horizontal,
    /// Along a column, bottom to top.
    Vertical,
    /// Bottom-left to top-right.
    Diagonal,
    /// Top-left to bottom-right.
    AntiDiagonal,
}

impl Direction {
    /// All four directions, in index order.
    pub const ALL: [Direction; 4] = [
        Direction::Horizontal,
        Direction::Vertical,
        Direction::Diagonal,
        Direction::AntiDiagonal,
    ];

    /// The step `(dx, dy)` of this direction.
    pub const fn step(self) -> (i8, i8) {
        match self {
            Direction::Horizontal => (1, 0),
            Direction::Vertical => (0, 1),
            Direction::Diagonal => (1, 1),
            Direction::AntiDiagonal => (1, -1),
        }
    }

    /// The index of this direction in [`Direction::ALL`].
    pub const fn index(self) -> usize {
        self as usize
    }

    /// A short lower-case name for reports.
    pub const fn name(self) -> &'static str {
        match self {
            Direction::Horizontal => "horizontal",
            Direction::Vertical => "vertical",
            Direction::Diagonal => "diagonal",
            Direction::AntiDiagonal => "anti-diagonal",
        }
    }
}

/// One of the eight symmetries of a square (the dihedral group of order 8).
///
/// On a board that is not square only the four that keep the width and height
/// ([`Symmetry::keeps_shape`]) apply.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Symmetry {
    /// No change.
    Identity,
    /// Quarter turn anticlockwise.
    Rotate90,
    /// Half turn.
    Rotate180,
    /// Quarter turn clockwise.
    Rotate270,
    /// Mirror left to right.
    MirrorColumns,
    /// Mirror bottom to top.
    MirrorRows,
    /// Reflection in the diagonal through `a1`.
    Transpose,
    /// Reflection in the other diagonal.
    AntiTranspose,
}

impl Symmetry {
    /// All eight symmetries; the first is the identity.
    pub const ALL: [Symmetry; 8] = [
        Symmetry::Identity,
        Symmetry::Rotate90,
        Symmetry::Rotate180,
        Symmetry::Rotate270,
        Symmetry::MirrorColumns,
        Symmetry::MirrorRows,
        Symmetry::Transpose,
        Symmetry::AntiTranspose,
    ];

    /// Whether this symmetry maps a `w` x `h` board onto itself for every `w`, `h`.
    pub const fn keeps_shape(self) -> bool {
        matches!(
            self,
            Symmetry::Identity
                | Symmetry::Rotate180
                | Symmetry::MirrorColumns
                | Symmetry::MirrorRows
        )
    }

    /// Whether this symmetry applies to a `width` x `height` board.
    pub const fn applies_to(self, width: u8, height: u8) -> bool {
        width == height || self.keeps_shape()
    }

    /// The image of `p` on a `width` x `height` board. The symmetry must apply to that board.
    pub fn apply(self, p: Point, width: u8, height: u8) -> Point {
        debug_assert!(self.applies_to(width, height));
        let (mx, my) = (width - 1, height - 1);
        let (x, y) = (p.x, p.y);
        let (nx, ny) = match self {
            Symmetry::Identity => (x, y),
            Symmetry::Rotate90 => (my - y, x),
            Symmetry::Rotate180 => (mx - x, my - y),
            Symmetry::Rotate270 => (y, mx - x),
            Symmetry::MirrorColumns => (mx - x, y),
            Symmetry::MirrorRows => (x, my - y),
            Symmetry::Transpose => (y, x),
            Symmetry::AntiTranspose => (my - y, mx - x),
        };
        Point::new(nx, ny)
    }

    /// The symmetry that undoes this one.
    pub const fn inverse(self) -> Symmetry {
        match self {
            Symmetry::Rotate90 => Symmetry::Rotate270,
            Symmetry::Rotate270 => Symmetry::Rotate90,
            other => other,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        /// The packed keys sort exactly as the comparisons they replace (the slice sort of the
        /// standard library is the reference).
        #[test]
        fn packed_keys_sort_as_the_comparisons(
            scores in proptest::collection::vec(any::<i32>(), 0..60),
            points in proptest::collection::hash_set((0u8..19, 0u8..19), 0..60),
        ) {
            let mut scored: Vec<(i32, u16)> =
                scores.iter().enumerate().map(|(i, &s)| (s % 50 * (i as i32 % 3), i as u16)).collect();
            let mut want = scored.clone();
            want.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)));
            sort_keys(&mut scored, |&(s, c)| best_first_key(s, c), best_first_parts);
            prop_assert_eq!(&scored, &want);
            for &s in &scores {
                prop_assert_eq!(best_first_parts(best_first_key(s, 7)), (s, 7));
            }
            let pts: Vec<Point> = points.iter().map(|&(x, y)| Point::new(x, y)).collect();
            let (mut rows, mut cols) = (pts.clone(), pts.clone());
            Point::sort_by_rows(&mut rows);
            Point::sort_by_columns(&mut cols);
            let (mut want_rows, mut want_cols) = (pts.clone(), pts);
            want_rows.sort_by_key(|p| (p.y, p.x));
            want_cols.sort();
            prop_assert_eq!(rows, want_rows);
            prop_assert_eq!(cols, want_cols);
        }
    }

    #[test]
    fn best_first_keys_keep_the_extremes() {
        for s in [i32::MIN, -1, 0, 1, i32::MAX] {
            assert_eq!(best_first_parts(best_first_key(s, u16::MAX)), (s, u16::MAX));
        }
        assert!(best_first_key(i32::MAX, 9) < best_first_key(i32::MIN, 0));
        assert!(best_first_key(0, 1) < best_first_key(0, 2));
    }

    #[test]
    fn coordinates_round_trip_and_ignore_case() {
        let p: Point = "H8".parse().unwrap();
        assert_eq!(p, Point::new(7, 7));
        assert_eq!(p.to_string(), "h8");
        assert_eq!("a1".parse::<Point>().unwrap(), Point::new(0, 0));
        assert_eq!("s19".parse::<Point>().unwrap(), Point::new(18, 18));
    }

    #[test]
    fn garbage_is_not_a_coordinate() {
        for bad in [
            "", "h", "8", "h0", "h08", "t1", "h20", "hh", "h8x", "é8", "h-1",
        ] {
            assert!(bad.parse::<Point>().is_err(), "{bad:?} parsed");
        }
    }

    #[test]
    fn symmetries_are_bijections_with_inverses() {
        for s in Symmetry::ALL {
            let mut seen = std::collections::HashSet::new();
            for x in 0..7 {
                for y in 0..7 {
                    let p = Point::new(x, y);
                    let q = s.apply(p, 7, 7);
                    assert!(q.x < 7 && q.y < 7);
                    assert_eq!(s.inverse().apply(q, 7, 7), p);
                    seen.insert(q);
                }
            }
            assert_eq!(seen.len(), 49);
        }
    }

    #[test]
    fn rectangle_symmetries_stay_on_the_board() {
        for s in Symmetry::ALL.into_iter().filter(|s| s.applies_to(4, 3)) {
            for x in 0..4 {
                for y in 0..3 {
                    let q = s.apply(Point::new(x, y), 4, 3);
                    assert!(q.x < 4 && q.y < 3, "{s:?}");
                }
            }
        }
        assert_eq!(
            Symmetry::ALL.iter().filter(|s| s.applies_to(4, 3)).count(),
            4
        );
    }
}
