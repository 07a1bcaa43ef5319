//! Threat shapes: what a stone placed on an empty point makes along one line.
//!
//! The shape of a line through a point depends only on the ten cells within five steps of it on
//! that line (a five through the point lies within four steps; the cells one further decide
//! whether it is an overline, and whether a four is straight). Each of those ten cells is, from
//! the mover's point of view, empty, own or blocked (an opponent stone or the board edge), so the
//! line is summed up by a ten-digit base-3 key and every answer is looked up in a table of 3^10 =
//! 59,049 entries. The board keeps the key of every (point, direction, colour) up to date as
//! stones come and go, so a placement touches 40 keys and 80 table entries and never rescans the
//! board.
//!
//! Definitions, following the threat-space search paper (L. V. Allis, H. J. van den Herik and
//! M. P. H. Huntjens, "Go-Moku and Threat-Space Search", 1993), stated here for a stone that the
//! attacker places at the point, and always counting only shapes that include that stone:
//! * **five**: five own stones in a row (under exact-five rules, exactly five);
//! * **overline**: six or more in a row (only distinguished under exact-five rules);
//! * **straight four**: four in a row whose two end points both complete a five;
//! * **four**: exactly one empty point completes a five (the paper's "line of five squares, four
//!   occupied"); two such points that are not the ends of one run of four make a
//!   **double four** in one line (renju counts it as two fours);
//! * **three**: one more stone makes a straight four, and the three stones are consecutive (the
//!   paper's `..XXX..` and `.XXX..` shapes); **broken three**: the same with a gap (`.X.XX.`);
//! * **closed three** (our name for a line that one more stone turns into a four but not a
//!   straight four) and **two** (one more stone makes a three), used by move ordering and by the
//!   playing engine.
//!
//! The tables are derived, never hand-edited: they are built at first use by a short dynamic
//! programme that asks, for each key, what the shapes of the keys with one more own stone are.

use std::sync::OnceLock;

/// Number of neighbour cells summed up in a key (five on each side).
pub const SLOTS: usize = 10;
/// Number of distinct keys, 3^10.
pub const KEYS: usize = 59_049;

/// Digit of an empty cell in a key.
pub const EMPTY: u16 = 0;
/// Digit of a cell holding the mover's own stone.
pub const OWN: u16 = 1;
/// Digit of a cell holding an opponent stone or lying off the board.
pub const BLOCKED: u16 = 2;

/// Powers of three: the weight of each slot in a key.
pub const POW3: [u16; SLOTS] = [1, 3, 9, 27, 81, 243, 729, 2187, 6561, 19683];

/// The slot of a neighbour `offset` steps away (`-5..=-1` and `1..=5`).
#[inline]
pub const fn slot_of(offset: i8) -> usize {
    if offset < 0 {
        (offset + 5) as usize
    } else {
        (offset + 4) as usize
    }
}

/// The offset of the neighbour in `slot`.
#[inline]
pub const fn offset_of(slot: usize) -> i8 {
    if slot < 5 {
        slot as i8 - 5
    } else {
        slot as i8 - 4
    }
}

/// What a stone makes along one line. Variants are ordered from weakest to strongest, except
/// that [`LineShape::Overline`] is its own case (a win under freestyle counts as `Five`).
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Debug)]
#[repr(u8)]
pub enum LineShape {
    /// Nothing that threatens.
    None = 0,
    /// One more stone makes a three or a broken three.
    Two = 1,
    /// One more stone makes a four, but no straight four.
    ClosedThree = 2,
    /// One more stone makes a straight four; the three stones have a gap.
    BrokenThree = 3,
    /// One more stone makes a straight four; the three stones are consecutive.
    Three = 4,
    /// Exactly one point completes a five.
    Four = 5,
    /// Four in a row, both ends complete a five.
    StraightFour = 6,
    /// Two points complete a five and they are not the ends of one run of four.
    DoubleFour = 7,
    /// A five (exactly five under exact-five rules).
    Five = 8,
    /// Six or more in a row under exact-five rules.
    Overline = 9,
}

impl LineShape {
    /// All shapes, in order.
    pub const ALL: [LineShape; 10] = [
        LineShape::None,
        LineShape::Two,
        LineShape::ClosedThree,
        LineShape::BrokenThree,
        LineShape::Three,
        LineShape::Four,
        LineShape::StraightFour,
        LineShape::DoubleFour,
        LineShape::Five,
        LineShape::Overline,
    ];

    /// The shape with the given number (`None` for numbers out of range).
    pub const fn from_u8(v: u8) -> LineShape {
        match v {
            1 => LineShape::Two,
            2 => LineShape::ClosedThree,
            3 => LineShape::BrokenThree,
            4 => LineShape::Three,
            5 => LineShape::Four,
            6 => LineShape::StraightFour,
            7 => LineShape::DoubleFour,
            8 => LineShape::Five,
            9 => LineShape::Overline,
            _ => LineShape::None,
        }
    }

    /// A four of any kind (four, straight four, double four).
    pub const fn is_four(self) -> bool {
        matches!(
            self,
            LineShape::Four | LineShape::StraightFour | LineShape::DoubleFour
        )
    }

    /// A three of either kind (three or broken three).
    pub const fn is_three(self) -> bool {
        matches!(self, LineShape::Three | LineShape::BrokenThree)
    }

    /// How many fours this line counts for under the renju double-four rule.
    pub const fn four_count(self) -> u32 {
        match self {
            LineShape::Four | LineShape::StraightFour => 1,
            LineShape::DoubleFour => 2,
            _ => 0,
        }
    }

    /// The trade name, lower case, as used in reports and JSON.
    pub const fn name(self) -> &'static str {
        match self {
            LineShape::None => "none",
            LineShape::Two => "two",
            LineShape::ClosedThree => "closed-three",
            LineShape::BrokenThree => "broken-three",
            LineShape::Three => "three",
            LineShape::Four => "four",
            LineShape::StraightFour => "straight-four",
            LineShape::DoubleFour => "double-four",
            LineShape::Five => "five",
            LineShape::Overline => "overline",
        }
    }
}

/// A table entry: the shape plus the slots of the points that matter for it.
///
/// For a five or overline the mask is empty; for a four it holds the completion points (the
/// defender's only replies); for a three the points that make the straight four; for a closed
/// three the points that make a four; for a two the points that make a three.
#[derive(Clone, Copy, PartialEq, Eq, Debug, Default)]
pub struct LineInfo(u32);

impl LineInfo {
    const fn new(shape: LineShape, mask: u16) -> LineInfo {
        LineInfo(shape as u32 | (mask as u32) << 4)
    }

    /// The shape.
    #[inline]
    pub const fn shape(self) -> LineShape {
        LineShape::from_u8((self.0 & 15) as u8)
    }

    /// The slot mask of the points that matter (see the type's documentation).
    #[inline]
    pub const fn mask(self) -> u16 {
        (self.0 >> 4) as u16
    }

    /// The offsets (steps along the line from the point) of the points that matter.
    pub fn offsets(self) -> impl Iterator<Item = i8> {
        let mask = self.mask();
        (0..SLOTS)
            .filter(move |s| mask >> s & 1 == 1)
            .map(offset_of)
    }
}

/// The shape table for one way of counting fives, indexed by a compact key.
///
/// The table is derived from the full 3^10 classification, but the board keeps shorter keys:
/// the two cells five points away only ever matter as "own stone or not" (an own stone there
/// turns a five into an overline, or spoils a straight four's end), and under five-or-more
/// rules not at all. So the key is the eight inner cells in base 3 plus, for exact-five rules,
/// one bit for each outer cell: 26,244 entries for exact fives and 6,561 for five or more,
/// small enough to stay in the processor's nearest caches on the hot path.
pub struct ShapeTable {
    exact: bool,
    entries: Vec<LineInfo>,
    /// The shape alone, one byte per compact key.
    shapes: Vec<u8>,
    /// The key weight of each slot for an own stone and for a blocked cell.
    own: [u16; SLOTS],
    blocked: [u16; SLOTS],
}

/// Number of inner slots (offsets -4..=-1 and 1..=4) in a compact key.
const INNER: u16 = 6561;

impl ShapeTable {
    /// The entry for a compact key.
    #[inline]
    pub fn get(&self, key: u16) -> LineInfo {
        self.entries[key as usize]
    }

    /// The shape number ([`LineShape`] as `u8`) for a compact key.
    #[inline]
    pub fn shape_of(&self, key: u16) -> u8 {
        self.shapes[key as usize]
    }

    /// How much a cell in `slot` adds to a compact key: for an own stone (`OWN`), a blocked cell
    /// (`BLOCKED`) or an empty one.
    #[inline]
    pub fn weight(&self, slot: usize, digit: u16) -> u16 {
        match digit {
            OWN => self.own[slot],
            BLOCKED => self.blocked[slot],
            _ => 0,
        }
    }

    /// The compact key of a full ten-digit key.
    pub fn compact(&self, full: u16) -> u16 {
        digits(full)
            .iter()
            .enumerate()
            .map(|(slot, &d)| self.weight(slot, d))
            .sum()
    }

    /// Whether this is the exact-five table.
    pub fn is_exact(&self) -> bool {
        self.exact
    }

    fn build(exact: bool) -> ShapeTable {
        // Keys sorted by their number of own stones, most first: every key's entry depends only on
        // entries of keys with one more own stone.
        let mut by_own: Vec<Vec<u16>> = vec![Vec::new(); SLOTS + 1];
        for key in 0..KEYS as u16 {
            let own = digits(key).iter().filter(|&&d| d == OWN).count();
            by_own[own].push(key);
        }
        let mut full = vec![LineInfo::default(); KEYS];
        for keys in by_own.iter().rev() {
            for &key in keys {
                full[key as usize] = classify(key, exact, &full);
            }
        }
        // Weights: inner slots in base 3 (in slot order, skipping the outer two), outer slots one
        // bit each for an own stone under exact fives, nothing otherwise.
        let mut own = [0u16; SLOTS];
        let mut blocked = [0u16; SLOTS];
        let mut power = 1u16;
        for slot in 0..SLOTS {
            let off = offset_of(slot);
            if off.abs() == 5 {
                continue;
            }
            own[slot] = power;
            blocked[slot] = 2 * power;
            power *= 3;
        }
        if exact {
            own[slot_of(-5)] = INNER;
            own[slot_of(5)] = 2 * INNER;
        }
        let size = if exact {
            4 * INNER as usize
        } else {
            INNER as usize
        };
        let mut table = ShapeTable {
            exact,
            entries: vec![LineInfo::default(); size],
            shapes: vec![0; size],
            own,
            blocked,
        };
        // Every full key maps onto its compact key; the outer cells' "not own" states (empty or
        // blocked) classify alike, which the tests check over all keys.
        for key in 0..KEYS as u16 {
            let c = table.compact(key) as usize;
            table.entries[c] = full[key as usize];
        }
        table.shapes = table.entries.iter().map(|e| e.shape() as u8).collect();
        table
    }
}

/// The base-3 digits of a key, slot by slot.
pub fn digits(key: u16) -> [u16; SLOTS] {
    let mut d = [0; SLOTS];
    let mut k = key;
    for slot in d.iter_mut() {
        *slot = k % 3;
        k /= 3;
    }
    d
}

/// Length of the run of own stones through the centre (which counts as own).
fn centre_run(d: &[u16; SLOTS]) -> (usize, i8, i8) {
    let at = |off: i8| d[slot_of(off)];
    let mut lo = 0i8;
    while lo > -5 && at(lo - 1) == OWN {
        lo -= 1;
    }
    let mut hi = 0i8;
    while hi < 5 && at(hi + 1) == OWN {
        hi += 1;
    }
    ((hi - lo + 1) as usize, lo, hi)
}

fn classify(key: u16, exact: bool, done: &[LineInfo]) -> LineInfo {
    let d = digits(key);
    let (run, lo, hi) = centre_run(&d);
    if run >= 5 {
        let shape = if exact && run > 5 {
            LineShape::Overline
        } else {
            LineShape::Five
        };
        return LineInfo::new(shape, 0);
    }
    // The shape after one more own stone on each empty point within four steps.
    let mut next = [LineShape::None; SLOTS];
    for (slot, n) in next.iter_mut().enumerate() {
        let off = offset_of(slot);
        if (-4..=4).contains(&off) && d[slot] == EMPTY {
            *n = done[(key + POW3[slot]) as usize].shape();
        }
    }
    let mask_of = |pred: &dyn Fn(LineShape) -> bool| -> u16 {
        (0..SLOTS)
            .filter(|&s| pred(next[s]))
            .fold(0u16, |m, s| m | 1 << s)
    };
    let fives = mask_of(&|s| s == LineShape::Five);
    match fives.count_ones() {
        0 => {}
        1 => return LineInfo::new(LineShape::Four, fives),
        _ => {
            let ends = (1u16 << slot_of(lo - 1)) | (1u16 << slot_of(hi + 1));
            let shape = if run == 4 && fives == ends {
                LineShape::StraightFour
            } else {
                LineShape::DoubleFour
            };
            return LineInfo::new(shape, fives);
        }
    }
    let threes = mask_of(&|s| s == LineShape::StraightFour);
    if threes != 0 {
        // With a run of three through the centre the straight four can only come from extending
        // that run, so the three stones are consecutive; otherwise the extension fills a gap.
        let shape = if run == 3 {
            LineShape::Three
        } else {
            LineShape::BrokenThree
        };
        return LineInfo::new(shape, threes);
    }
    let fours = mask_of(&|s| s.is_four());
    if fours != 0 {
        return LineInfo::new(LineShape::ClosedThree, fours);
    }
    let twos = mask_of(&|s| s.is_three());
    if twos != 0 {
        return LineInfo::new(LineShape::Two, twos);
    }
    LineInfo::new(LineShape::None, 0)
}

/// The table for a colour that wins only with exactly five (standard rules, and black in renju).
pub fn exact_table() -> &'static ShapeTable {
    static T: OnceLock<ShapeTable> = OnceLock::new();
    T.get_or_init(|| ShapeTable::build(true))
}

/// The table for a colour that wins with five or more (freestyle, and white in renju).
pub fn free_table() -> &'static ShapeTable {
    static T: OnceLock<ShapeTable> = OnceLock::new();
    T.get_or_init(|| ShapeTable::build(false))
}

/// Builds a key from a picture of the line: eleven characters, the centre (index 5) being the
/// point itself (any character), `X` own, `.` empty, anything else blocked. For tests and docs.
pub fn key_from_picture(line: &str) -> u16 {
    let cells: Vec<char> = line.chars().collect();
    assert_eq!(cells.len(), 11, "a line picture has eleven cells");
    let mut key = 0;
    for (i, &c) in cells.iter().enumerate() {
        if i == 5 {
            continue;
        }
        let slot = slot_of(i as i8 - 5);
        let digit = match c {
            'X' => OWN,
            '.' => EMPTY,
            _ => BLOCKED,
        };
        key += digit * POW3[slot];
    }
    key
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A direct, slow classification of a picture, written without the table: place the centre,
    /// then try every completion by hand. Used to check the dynamic programme.
    fn brute(cells: &mut [u16; 11], exact: bool) -> LineShape {
        fn run_at(c: &[u16; 11], i: usize) -> (usize, usize, usize) {
            let (mut lo, mut hi) = (i, i);
            while lo > 0 && c[lo - 1] == OWN {
                lo -= 1;
            }
            while hi < 10 && c[hi + 1] == OWN {
                hi += 1;
            }
            (hi - lo + 1, lo, hi)
        }
        // Fives through the centre after a stone at e (the centre must be in the run).
        fn five_points(c: &mut [u16; 11], exact: bool) -> Vec<usize> {
            let mut out = vec![];
            for e in 1..10 {
                if c[e] != EMPTY {
                    continue;
                }
                c[e] = OWN;
                let (len, lo, hi) = run_at(c, 5);
                if lo <= e && e <= hi && (len == 5 || (!exact && len >= 5)) {
                    out.push(e);
                }
                c[e] = EMPTY;
            }
            out
        }
        fn straight(c: &mut [u16; 11], exact: bool) -> bool {
            let f = five_points(c, exact);
            let (len, lo, hi) = run_at(c, 5);
            len == 4 && f.len() == 2 && f[0] + 1 == lo && f[1] == hi + 1
        }
        cells[5] = OWN;
        let (len, _, _) = run_at(cells, 5);
        if len >= 5 {
            return if exact && len > 5 {
                LineShape::Overline
            } else {
                LineShape::Five
            };
        }
        let f = five_points(cells, exact);
        if f.len() >= 2 {
            return if straight(cells, exact) {
                LineShape::StraightFour
            } else {
                LineShape::DoubleFour
            };
        }
        if f.len() == 1 {
            return LineShape::Four;
        }
        let mut three = None;
        let mut closed = false;
        for e in 1..10 {
            if cells[e] != EMPTY {
                continue;
            }
            cells[e] = OWN;
            if straight(cells, exact) {
                let consecutive = run_at(cells, 5).0 == 4 && {
                    let (_, lo, hi) = run_at(cells, 5);
                    e == lo || e == hi
                };
                if consecutive || three.is_none() {
                    three = Some(if consecutive {
                        LineShape::Three
                    } else {
                        LineShape::BrokenThree
                    });
                }
            }
            if !five_points(cells, exact).is_empty() {
                closed = true;
            }
            cells[e] = EMPTY;
        }
        if let Some(t) = three {
            return t;
        }
        if closed {
            return LineShape::ClosedThree;
        }
        LineShape::None
    }

    #[test]
    fn table_agrees_with_brute_force_on_every_key() {
        for exact in [false, true] {
            let table = if exact { exact_table() } else { free_table() };
            for key in 0..KEYS as u16 {
                let d = digits(key);
                let mut cells = [0u16; 11];
                for i in 0..11 {
                    if i != 5 {
                        cells[i] = d[slot_of(i as i8 - 5)];
                    }
                }
                let want = brute(&mut cells, exact);
                let got = table.get(table.compact(key)).shape();
                // The brute force does not look for twos; everything else must match exactly.
                let got = if got == LineShape::Two {
                    LineShape::None
                } else {
                    got
                };
                assert_eq!(got, want, "key {key} exact {exact} cells {cells:?}");
            }
        }
    }

    fn shape(picture: &str, exact: bool) -> LineShape {
        let t = if exact { exact_table() } else { free_table() };
        t.get(t.compact(key_from_picture(picture))).shape()
    }

    // Shapes against the definitions of Allis, van den Herik and Huntjens (1993), "Go-Moku and
    // Threat-Space Search": the centre cell (index 5) is the stone just placed; `|` is the board
    // edge or an opponent stone, both of which block.
    #[test]
    fn threat_space_search_definitions() {
        use LineShape::*;
        let cases = [
            // five: five in a row.
            ("...XX?XX...", Five),
            // straight four: six squares, the four centre ones occupied, both ends empty.
            ("....X?XX...", StraightFour),
            // four: five squares, four occupied, one empty; here blocked on one side...
            ("...|X?XX...", Four),
            // ...or split, with both outer squares open.
            ("...X.?XX...", Four),
            // three: seven squares, the three centre ones occupied, the four others empty.
            ("....X?X....", Three),
            // three: six squares, three consecutive of the four centre ones occupied.
            ("..|.X?X....", Three),
            // not a three: only five free squares in all, so no straight four can be made.
            ("..|.X?X.|..", ClosedThree),
            // broken three: three non-consecutive of the four centre squares of six.
            ("...|.?.XX.|", BrokenThree),
            ("...X.?X....", BrokenThree),
            // with the board edge hard against the shape, the same definitions apply.
            ("||||.?XXX..", StraightFour),
            ("|||||?XXX.|", Four),
            ("||||.?XX..|", Three),
            ("|||||?XX...", ClosedThree),
            ("|||||?.XX..", ClosedThree),
            // two: one more stone makes a three.
            ("....X?.....", Two),
        ];
        for (picture, want) in cases {
            assert_eq!(shape(picture, false), want, "{picture}");
        }
    }

    #[test]
    fn exact_five_rules_see_overlines() {
        use LineShape::*;
        // Six in a row: a win in freestyle, an overline under exact-five rules.
        assert_eq!(shape("...XX?XXX..", false), Five);
        assert_eq!(shape("...XX?XXX..", true), Overline);
        // A four whose only completion makes six is no four under exact-five rules.
        assert_eq!(shape("..X.X?XX|..", true), None);
        assert_eq!(shape("..X.X?XX|..", false), Four);
        // A straight four with an own stone beyond one end is only a four under exact fives.
        assert_eq!(shape("...X.?XXX..", true), Four);
        assert_eq!(shape("...X.?XXX..", false), StraightFour);
        // The one-line double four X.XXX.X (renju counts it as two fours).
        assert_eq!(shape("..X.X?X.X..", true), DoubleFour);
        assert_eq!(shape("..X.X?X.X..", false), DoubleFour);
    }
}
