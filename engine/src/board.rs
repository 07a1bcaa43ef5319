//! The board: stones on a padded grid, Zobrist hashes under all symmetries, and the incremental
//! threat-shape state of [`crate::patterns`].
//!
//! Cells live in a grid with a margin of five wall cells on every side, so that every point
//! within five steps of an on-board point has an index and no bounds check is needed on the hot
//! path. Public methods take [`Point`]s; the `*_at` methods of the crate take padded cell indices
//! (`usize`) for the solver.
//!
//! Boards are generic over the width, the height and `k`, the number in a row that wins, so the
//! same win detection serves tic-tac-toe, small m,n,k-games and gomoku. Threat shapes are kept
//! only when `k` is five.

use std::fmt;

use crate::bitset::CellSet;
use crate::geometry::{Direction, Point, Symmetry, MAX_SIDE};
use crate::patterns::{self, LineInfo, LineShape, ShapeTable, BLOCKED, OWN};
use crate::types::{Rule, Stone};
use crate::zobrist::stone_key;

/// Wall cells on each side of the board.
pub(crate) const MARGIN: usize = 5;

const EMPTY: u8 = 0;
const WALL: u8 = 3;

/// Bit flags summing up what a stone on an empty point makes, over its four lines.
pub mod threat {
    /// A five (a winning one: exactly five under exact-five rules).
    pub const FIVE: u8 = 1;
    /// At least one four of any kind.
    pub const FOUR: u8 = 2;
    /// At least one three or broken three (line-local; renju's recursive test is separate).
    pub const THREE: u8 = 4;
    /// At least one closed three.
    pub const CLOSED_THREE: u8 = 8;
    /// At least one two.
    pub const TWO: u8 = 16;
    /// Number of flag kinds, each with its own set of points.
    pub const KINDS: usize = 5;
}

/// Why a board could not be made.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum BoardError {
    /// A gomoku board must be square, from 5x5 to 19x19.
    BadSize(u8),
    /// An m,n,k board must have sides from 1 to 19 and `k` from 1 to the longer side.
    BadShape {
        /// Columns.
        width: u8,
        /// Rows.
        height: u8,
        /// Stones in a row that win.
        k: u8,
    },
}

impl fmt::Display for BoardError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            BoardError::BadSize(n) => write!(
                f,
                "board size {n} is not supported (gomoku boards are square, from 5 to 19)"
            ),
            BoardError::BadShape { width, height, k } => write!(
                f,
                "a {width}x{height} board with {k} in a row is not supported \
                 (sides 1 to 19, k from 1 to the longer side)"
            ),
        }
    }
}

impl std::error::Error for BoardError {}

/// The shape state of one cell, for both colours (kept together for locality).
#[derive(Clone, Copy, Default)]
struct CellShapes {
    /// Per direction: the ternary keys of the ten neighbours (see [`crate::patterns`]) from
    /// both colours' points of view, black's in the low 16 bits and white's in the high 16,
    /// so that one addition updates both (a key never leaves `0..65536`, so no carry or
    /// borrow crosses from one half to the other).
    keys: [u32; 4],
    /// Per colour, per direction: the shape number for the key (stale on occupied cells).
    lines: [[u8; 4]; 2],
    /// Per colour: the [`threat`] flags (zero on occupied cells).
    flags: [u8; 2],
}

impl CellShapes {
    /// The key of direction `d` from colour `ci`'s point of view.
    #[inline]
    fn key(&self, ci: usize, d: usize) -> u16 {
        (self.keys[d] >> (16 * ci)) as u16
    }

    fn set_key(&mut self, ci: usize, d: usize, key: u16) {
        let shift = 16 * ci;
        self.keys[d] = (self.keys[d] & !(0xffff << shift)) | (key as u32) << shift;
    }
}

/// How far a stone's digits reach along a line, given what it adds to each slot (`deltas`):
/// the cells five steps away only when the outer slots count (exact-five rules, an own stone).
#[inline(always)]
fn reach(deltas: &[u32; patterns::SLOTS]) -> isize {
    if deltas[0] | deltas[patterns::SLOTS - 1] == 0 {
        4
    } else {
        5
    }
}

/// The [`threat`] flag of each [`LineShape`], by its number (a whole byte's worth of entries,
/// so that a lookup by a shape byte needs no bounds check).
const FLAG_OF: [u8; 256] = {
    let mut t = [0u8; 256];
    t[LineShape::Two as usize] = threat::TWO;
    t[LineShape::ClosedThree as usize] = threat::CLOSED_THREE;
    t[LineShape::BrokenThree as usize] = threat::THREE;
    t[LineShape::Three as usize] = threat::THREE;
    t[LineShape::Four as usize] = threat::FOUR;
    t[LineShape::StraightFour as usize] = threat::FOUR;
    t[LineShape::DoubleFour as usize] = threat::FOUR;
    t[LineShape::Five as usize] = threat::FIVE;
    t
};

/// Per colour, per [`threat`] kind (its bit number): a count of empty cells (see
/// [`Board::flag_counts`]).
pub type FlagCounts = [[i32; threat::KINDS]; 2];

#[derive(Clone)]
struct Shapes {
    tables: [&'static ShapeTable; 2],
    /// Per stone colour, per slot: what a stone adds to the keys of both points of view
    /// (packed as in [`CellShapes::keys`]).
    deltas: [[u32; patterns::SLOTS]; 2],
    cells: Vec<CellShapes>,
    /// Per colour, per flag kind: the empty points with that flag.
    sets: [[CellSet; threat::KINDS]; 2],
}

/// A board position: stones, hashes and threat shapes. It does not know whose turn it is; see
/// [`crate::rules::Game`] for a game with a side to move.
#[derive(Clone)]
pub struct Board {
    width: u8,
    height: u8,
    k: u8,
    rule: Rule,
    stride: usize,
    dirs: [isize; 4],
    cells: Vec<u8>,
    /// On-board point index (`y * 19 + x`) of each symmetry's image, per padded cell.
    images: Vec<[u16; 8]>,
    symmetries: u8,
    /// Whether every symmetry's hash is kept up to date (see `all_hashes`).
    track_symmetries: bool,
    hashes: [u64; 8],
    counts: [u16; 2],
    shapes: Option<Box<Shapes>>,
}

impl Board {
    /// An empty square gomoku board (five in a row) of side `size`, from 5 to 19.
    pub fn new(size: u8, rule: Rule) -> Result<Board, BoardError> {
        if !(5..=MAX_SIDE).contains(&size) {
            return Err(BoardError::BadSize(size));
        }
        Ok(Board::build(size, size, 5, rule))
    }

    /// An empty `width` x `height` board on which `k` or more in a row wins (an m,n,k-game).
    pub fn mnk(width: u8, height: u8, k: u8) -> Result<Board, BoardError> {
        let ok = (1..=MAX_SIDE).contains(&width)
            && (1..=MAX_SIDE).contains(&height)
            && k >= 1
            && k <= width.max(height);
        if !ok {
            return Err(BoardError::BadShape { width, height, k });
        }
        Ok(Board::build(width, height, k, Rule::Freestyle))
    }

    fn build(width: u8, height: u8, k: u8, rule: Rule) -> Board {
        let stride = width as usize + 2 * MARGIN;
        let rows = height as usize + 2 * MARGIN;
        let mut cells = vec![WALL; stride * rows];
        let mut images = vec![[0u16; 8]; stride * rows];
        let mut symmetries = 0u8;
        for (i, s) in Symmetry::ALL.iter().enumerate() {
            if s.applies_to(width, height) {
                symmetries |= 1 << i;
            }
        }
        for y in 0..height {
            for x in 0..width {
                let idx = (y as usize + MARGIN) * stride + x as usize + MARGIN;
                cells[idx] = EMPTY;
                for (i, s) in Symmetry::ALL.iter().enumerate() {
                    if symmetries >> i & 1 == 1 {
                        let q = s.apply(Point::new(x, y), width, height);
                        images[idx][i] = q.y as u16 * 19 + q.x as u16;
                    }
                }
            }
        }
        let stride_i = stride as isize;
        let mut board = Board {
            width,
            height,
            k,
            rule,
            stride,
            dirs: [1, stride_i, stride_i + 1, stride_i - 1],
            cells,
            images,
            symmetries,
            track_symmetries: k != 5,
            hashes: [0; 8],
            counts: [0; 2],
            shapes: None,
        };
        if k == 5 {
            board.shapes = Some(Box::new(board.fresh_shapes()));
        }
        board
    }

    /// The shape state computed from scratch (used at construction and by invariant checks).
    fn fresh_shapes(&self) -> Shapes {
        let n = self.cells.len();
        let tables = [
            table_for(self.rule, Stone::Black),
            table_for(self.rule, Stone::White),
        ];
        let mut deltas = [[0u32; patterns::SLOTS]; 2];
        for (stone, per_slot) in deltas.iter_mut().enumerate() {
            for (slot, d) in per_slot.iter_mut().enumerate() {
                for (view, table) in tables.iter().enumerate() {
                    let digit = if view == stone { OWN } else { BLOCKED };
                    *d |= (table.weight(slot, digit) as u32) << (16 * view);
                }
            }
        }
        let mut s = Shapes {
            tables,
            deltas,
            cells: vec![CellShapes::default(); n],
            sets: [[CellSet::new(); threat::KINDS]; 2],
        };
        for idx in 0..n {
            if self.cells[idx] == WALL {
                continue;
            }
            for c in Stone::ALL {
                for d in 0..4 {
                    let mut key = 0u16;
                    for slot in 0..patterns::SLOTS {
                        let off = patterns::offset_of(slot) as isize;
                        let q = (idx as isize + off * self.dirs[d]) as usize;
                        key += s.tables[c.index()].weight(slot, digit(self.cells[q], c));
                    }
                    s.cells[idx].set_key(c.index(), d, key);
                }
                if self.cells[idx] == EMPTY {
                    s.refresh(c, idx);
                }
            }
        }
        s
    }

    /// Columns.
    #[inline]
    pub fn width(&self) -> u8 {
        self.width
    }

    /// Rows.
    #[inline]
    pub fn height(&self) -> u8 {
        self.height
    }

    /// The side of a square board (its width).
    #[inline]
    pub fn size(&self) -> u8 {
        self.width
    }

    /// Stones in a row that win.
    #[inline]
    pub fn k(&self) -> u8 {
        self.k
    }

    /// The rule the board counts fives under.
    #[inline]
    pub fn rule(&self) -> Rule {
        self.rule
    }

    /// Whether the point lies on this board.
    #[inline]
    pub fn contains(&self, p: Point) -> bool {
        p.x < self.width && p.y < self.height
    }

    /// The padded cell index of an on-board point.
    #[inline]
    pub fn index(&self, p: Point) -> usize {
        debug_assert!(self.contains(p));
        (p.y as usize + MARGIN) * self.stride + p.x as usize + MARGIN
    }

    /// The point of a padded cell index.
    #[inline]
    pub fn point(&self, idx: usize) -> Point {
        Point::new(
            (idx % self.stride - MARGIN) as u8,
            (idx / self.stride - MARGIN) as u8,
        )
    }

    /// Number of padded cells (an upper bound on every cell index).
    #[inline]
    pub fn cell_count(&self) -> usize {
        self.cells.len()
    }

    /// The cell `n` steps from `idx` in direction `d` (may be a wall cell; `|n| <= 5`).
    #[inline]
    pub(crate) fn offset(&self, idx: usize, d: usize, n: isize) -> usize {
        (idx as isize + n * self.dirs[d]) as usize
    }

    /// The empty points within `r` points (king moves) of a stone of either colour, as padded
    /// cell indices, row by row from `a1` (the points [`Board::indices`] lists that are empty
    /// and have a stone in the square of side `2r + 1` around them). Read from one bit mask of
    /// stones per row, widened by `r` along the row and then across `r` rows either way.
    pub(crate) fn empties_near(&self, r: usize) -> Vec<usize> {
        debug_assert!(r < 8);
        let (w, h) = (self.width as usize, self.height as usize);
        let all = (1u32 << w) - 1;
        let mut stones = [0u32; MAX_SIDE as usize];
        let mut wide = [0u32; MAX_SIDE as usize];
        for y in 0..h {
            let row = (y + MARGIN) * self.stride + MARGIN;
            let m = self.cells[row..row + w]
                .iter()
                .enumerate()
                .fold(0u32, |m, (x, &c)| m | ((c != EMPTY) as u32) << x);
            stones[y] = m;
            wide[y] = (0..=r).fold(m, |acc, k| acc | m << k | m >> k) & all;
        }
        let mut out = Vec::new();
        for y in 0..h {
            let near = wide[y.saturating_sub(r)..=(y + r).min(h - 1)]
                .iter()
                .fold(0u32, |acc, &m| acc | m);
            let mut free = near & !stones[y];
            let row = (y + MARGIN) * self.stride + MARGIN;
            while free != 0 {
                out.push(row + free.trailing_zeros() as usize);
                free &= free - 1;
            }
        }
        out
    }

    /// Every on-board point, row by row from `a1`.
    pub fn points(&self) -> impl Iterator<Item = Point> + '_ {
        (0..self.height).flat_map(move |y| (0..self.width).map(move |x| Point::new(x, y)))
    }

    /// Every window of `len` consecutive on-board points along a line, as its first point and
    /// direction (the window runs from the first point in the direction's step). Each window is
    /// listed once.
    pub fn windows(&self, len: u8) -> impl Iterator<Item = (Point, Direction)> + '_ {
        let (w, h) = (self.width as i16, self.height as i16);
        let span = len as i16 - 1;
        self.points().flat_map(move |p| {
            Direction::ALL.into_iter().filter_map(move |d| {
                let (dx, dy) = d.step();
                let (ex, ey) = (p.x as i16 + dx as i16 * span, p.y as i16 + dy as i16 * span);
                (len >= 1 && (0..w).contains(&ex) && (0..h).contains(&ey)).then_some((p, d))
            })
        })
    }

    /// Padded indices of every on-board cell.
    pub(crate) fn indices(&self) -> impl Iterator<Item = usize> + '_ {
        self.points().map(move |p| self.index(p))
    }

    /// The stone on a point, if any. Off-board points are empty.
    pub fn get(&self, p: Point) -> Option<Stone> {
        if !self.contains(p) {
            return None;
        }
        self.stone_at(self.index(p))
    }

    /// The stone on a padded cell, if any.
    #[inline]
    pub fn stone_at(&self, idx: usize) -> Option<Stone> {
        match self.cells[idx] {
            1 => Some(Stone::Black),
            2 => Some(Stone::White),
            _ => None,
        }
    }

    /// Whether a padded cell is an empty on-board point.
    #[inline]
    pub fn is_empty_at(&self, idx: usize) -> bool {
        self.cells[idx] == EMPTY
    }

    /// Whether a padded cell holds a stone of colour `c`.
    #[inline]
    pub(crate) fn is_stone_at(&self, idx: usize, c: Stone) -> bool {
        self.cells[idx] == c.cell()
    }

    /// Number of stones of a colour.
    #[inline]
    pub fn count(&self, c: Stone) -> usize {
        self.counts[c.index()] as usize
    }

    /// Number of stones on the board.
    #[inline]
    pub fn stones(&self) -> usize {
        self.count(Stone::Black) + self.count(Stone::White)
    }

    /// Whether every point is occupied.
    #[inline]
    pub fn is_full(&self) -> bool {
        self.stones() == self.width as usize * self.height as usize
    }

    /// All stones of a colour, row by row from `a1`.
    pub fn stones_of(&self, c: Stone) -> Vec<Point> {
        self.points().filter(|&p| self.get(p) == Some(c)).collect()
    }

    /// The Zobrist hash of the position.
    #[inline]
    pub fn hash(&self) -> u64 {
        self.hashes[0]
    }

    /// The hash the position would have after a stone of `c` on the empty cell `idx`.
    #[inline]
    pub fn hash_after(&self, idx: usize, c: Stone) -> u64 {
        self.hashes[0] ^ stone_key(c.index(), self.images[idx][0] as usize)
    }

    /// The canonical hash ([`Board::canonical_hash`]) the position would have after a stone of
    /// `c` on the empty cell `idx`.
    pub fn canonical_hash_after(&self, idx: usize, c: Stone) -> u64 {
        let hashes = self.all_hashes();
        (0..8)
            .filter(|i| self.symmetries >> i & 1 == 1)
            .map(|i| hashes[i] ^ stone_key(c.index(), self.images[idx][i] as usize))
            .min()
            .unwrap_or(0)
    }

    /// The Zobrist hash of the position's image under a symmetry that applies to the board.
    pub fn hash_under(&self, s: Symmetry) -> u64 {
        let i = Symmetry::ALL.iter().position(|&t| t == s).unwrap_or(0);
        debug_assert!(self.symmetries >> i & 1 == 1);
        self.all_hashes()[i]
    }

    /// The smallest hash over every symmetry of the board: equal for positions that are the
    /// same up to rotation and reflection.
    pub fn canonical_hash(&self) -> u64 {
        let hashes = self.all_hashes();
        (0..8)
            .filter(|i| self.symmetries >> i & 1 == 1)
            .map(|i| hashes[i])
            .min()
            .unwrap_or(hashes[0])
    }

    /// The symmetry whose image has the canonical hash (the first such, in [`Symmetry::ALL`]
    /// order).
    pub fn canonical_symmetry(&self) -> Symmetry {
        let best = self.canonical_hash();
        let hashes = self.all_hashes();
        (0..8)
            .find(|&i| self.symmetries >> i & 1 == 1 && hashes[i] == best)
            .map(|i| Symmetry::ALL[i])
            .unwrap_or(Symmetry::Identity)
    }

    /// The image of the board under a symmetry that applies to it.
    pub fn transformed(&self, s: Symmetry) -> Board {
        let mut out = Board::build(self.width, self.height, self.k, self.rule);
        for p in self.points() {
            if let Some(c) = self.get(p) {
                out.place(s.apply(p, self.width, self.height), c);
            }
        }
        out
    }

    /// Places a stone on an empty on-board point. Panics if the point is off the board or taken;
    /// rules (turns, forbidden points) are checked by [`crate::rules::Game`], not here.
    pub fn place(&mut self, p: Point, c: Stone) {
        assert!(self.contains(p), "{p} is off the board");
        let idx = self.index(p);
        assert!(self.is_empty_at(idx), "{p} is taken");
        self.place_at(idx, c);
    }

    /// Removes the stone from a point. Panics if the point holds no stone.
    pub fn remove(&mut self, p: Point) {
        assert!(self.contains(p), "{p} is off the board");
        let idx = self.index(p);
        assert!(self.stone_at(idx).is_some(), "{p} is empty");
        self.remove_at(idx);
    }

    /// The position before a forcing exchange: this board without the attacker's stone `a` and
    /// the defender's stone `d`, when the two lie within four steps on one line, `a` played
    /// again by `attacker` makes a four, and `d` is then that four's only five point (so the
    /// exchange can be taken back and replayed). `None` otherwise. Legality under renju is the
    /// caller's question.
    pub fn taken_back(&self, a: Point, d: Point, attacker: Stone) -> Option<Board> {
        let (dx, dy) = (a.x as i32 - d.x as i32, a.y as i32 - d.y as i32);
        let collinear = dx == 0 || dy == 0 || dx.abs() == dy.abs();
        if !collinear || dx.abs().max(dy.abs()) > 4 {
            return None;
        }
        let mut b = self.clone();
        b.remove(a);
        b.remove(d);
        let ia = b.index(a);
        if b.flags_at(ia, attacker) & threat::FOUR == 0 {
            return None;
        }
        b.place_at(ia, attacker);
        let fives: Vec<usize> = b.cells_with(attacker, threat::FIVE).iter().collect();
        b.remove_at(ia);
        (fives == [b.index(d)]).then_some(b)
    }

    /// Places a stone of `c` on an empty padded cell.
    #[inline]
    pub fn place_at(&mut self, idx: usize, c: Stone) {
        debug_assert_eq!(self.cells[idx], EMPTY);
        self.cells[idx] = c.cell();
        self.counts[c.index()] += 1;
        self.toggle_hash(idx, c);
        if let Some(mut s) = self.shapes.take() {
            s.clear(idx);
            self.shift_keys(&mut s, idx, c, true);
            self.shapes = Some(s);
        }
    }

    /// Removes the stone from a padded cell.
    #[inline]
    pub fn remove_at(&mut self, idx: usize) {
        let c = self.stone_at(idx).expect("remove_at on an empty cell");
        self.cells[idx] = EMPTY;
        self.counts[c.index()] -= 1;
        self.toggle_hash(idx, c);
        if let Some(mut s) = self.shapes.take() {
            self.shift_keys(&mut s, idx, c, false);
            for col in Stone::ALL {
                s.refresh(col, idx);
            }
            self.shapes = Some(s);
        }
    }

    #[inline]
    fn toggle_hash(&mut self, idx: usize, c: Stone) {
        let img = &self.images[idx];
        if !self.track_symmetries {
            self.hashes[0] ^= stone_key(c.index(), img[0] as usize);
            return;
        }
        for (i, (h, &at)) in self.hashes.iter_mut().zip(img).enumerate() {
            if self.symmetries >> i & 1 == 1 {
                *h ^= stone_key(c.index(), at as usize);
            }
        }
    }

    /// The hashes under every symmetry: kept up to date on small m,n,k boards (the exact
    /// solver asks for them at every node), recomputed from the stones on gomoku boards (asked
    /// for rarely, and not worth eight updates per move on the search's hot path).
    fn all_hashes(&self) -> [u64; 8] {
        if self.track_symmetries {
            return self.hashes;
        }
        let mut h = [0u64; 8];
        for idx in self.indices() {
            if let Some(c) = self.stone_at(idx) {
                for (i, hv) in h.iter_mut().enumerate() {
                    if self.symmetries >> i & 1 == 1 {
                        *hv ^= stone_key(c.index(), self.images[idx][i] as usize);
                    }
                }
            }
        }
        h
    }

    /// The two cells `n` steps from `idx` along direction `d` whose windows hold `idx`, with
    /// the slot `idx` fills in each: the cell n steps back sees it at offset +n, the cell n
    /// steps on at -n.
    #[inline(always)]
    fn window_cells(&self, idx: usize, d: usize, n: isize) -> [(usize, usize); 2] {
        let step = self.dirs[d];
        [
            ((idx as isize - n * step) as usize, n as usize + 4),
            ((idx as isize + n * step) as usize, 5 - n as usize),
        ]
    }

    /// Adds (or removes) the digits of a stone at `idx` to the keys of the 40 cells whose
    /// windows contain it, and refreshes the shapes of those that are empty. The cells five
    /// steps away are skipped when the stone adds nothing to their keys (the outer slots count
    /// only under exact-five rules, and only an own stone).
    #[inline]
    fn shift_keys(&self, s: &mut Shapes, idx: usize, c: Stone, add: bool) {
        let deltas = s.deltas[c.index()];
        let reach = reach(&deltas);
        let tables = s.tables;
        for d in 0..4 {
            for n in 1..=reach {
                for (q, slot) in self.window_cells(idx, d, n) {
                    let cell = self.cells[q];
                    if cell == WALL {
                        continue;
                    }
                    let delta = deltas[slot];
                    let cs = &mut s.cells[q];
                    let keys = &mut cs.keys[d];
                    if add {
                        *keys += delta;
                    } else {
                        *keys -= delta;
                    }
                    if cell != EMPTY {
                        continue;
                    }
                    let keys = *keys;
                    let mut reflag = [false; 2];
                    for (ci, table) in tables.iter().enumerate() {
                        let shape = table.shape_of((keys >> (16 * ci)) as u16);
                        let old = cs.lines[ci][d];
                        if old != shape {
                            cs.lines[ci][d] = shape;
                            reflag[ci] = FLAG_OF[old as usize] != FLAG_OF[shape as usize];
                        }
                    }
                    for (ci, &r) in reflag.iter().enumerate() {
                        if r {
                            s.reflag(ci, q);
                        }
                    }
                }
            }
        }
    }

    /// Whether the empty cell `q` makes a double four or a four-three for `c` (four counts of
    /// every direction summed, threes counted; forbidden points not considered), with the
    /// shape of direction `d` replaced by `shape_d` when given.
    #[inline]
    fn double_threat_at(&self, q: usize, c: Stone, d_shape: Option<(usize, u8)>) -> bool {
        let lines = &self.shapes().cells[q].lines[c.index()];
        let (mut n4, mut n3) = (0, 0);
        for (d, &l) in lines.iter().enumerate() {
            let l = match d_shape {
                Some((dd, sh)) if dd == d => sh,
                _ => l,
            };
            let s = LineShape::from_u8(l);
            n4 += s.four_count();
            n3 += s.is_three() as u32;
        }
        n4 >= 2 || (n4 == 1 && n3 >= 1)
    }

    /// The empty points where a stone of `c` makes a double four or a four-three now
    /// (forbidden points not considered): what [`Board::double_threat_after`] is given.
    pub fn double_threat_points(&self, c: Stone) -> Vec<usize> {
        self.cells_with(c, threat::FOUR)
            .iter()
            .filter(|&q| self.double_threat_at(q, c, None))
            .collect()
    }

    /// Whether a stone of `c` on the empty cell `idx` would leave `c` an empty point that
    /// makes a double four or a four-three (forbidden points not considered), read from the
    /// shape tables as they would be after the stone, without placing it: the same answer
    /// as placing it and looking, for a fraction of the work. `before` is
    /// [`Board::double_threat_points`] of the board as it is: those points keep their shapes
    /// unless they lie on a line through `idx` within the stone's reach, which are read
    /// afresh.
    pub fn double_threat_after(&self, idx: usize, c: Stone, before: &[usize]) -> bool {
        let s = self.shapes();
        let deltas = s.deltas[c.index()];
        let reach = reach(&deltas);
        let table = s.tables[c.index()];
        let shift = 16 * c.index();
        let mut seen = [usize::MAX; 40];
        let mut n = 0;
        for d in 0..4 {
            for k in 1..=reach {
                for (q, slot) in self.window_cells(idx, d, k) {
                    let cell = self.cells[q];
                    if cell == WALL {
                        continue;
                    }
                    seen[n] = q;
                    n += 1;
                    if cell != EMPTY {
                        continue;
                    }
                    let key = ((s.cells[q].keys[d] + deltas[slot]) >> shift) as u16;
                    if self.double_threat_at(q, c, Some((d, table.shape_of(key)))) {
                        return true;
                    }
                }
            }
        }
        before.iter().any(|&q| q != idx && !seen[..n].contains(&q))
    }

    /// How many empty cells carry each [`threat`] flag, per colour (`[colour][kind]`, the
    /// kind being the flag's bit number): the lengths of the [`Board::cells_with`] sets.
    pub fn flag_counts(&self) -> FlagCounts {
        let s = self.shapes();
        let mut out = [[0; threat::KINDS]; 2];
        for (ci, sets) in s.sets.iter().enumerate() {
            for (kind, set) in sets.iter().enumerate() {
                out[ci][kind] = set.len() as i32;
            }
        }
        out
    }

    /// [`Board::flag_counts`] as it would be after a stone of `c` on the empty cell `idx`,
    /// read from the shape tables without placing it (the cells whose keys the stone would
    /// change are the (up to) 40 that [`Board::place_at`] updates, each on one line through
    /// `idx`).
    /// `counts` is [`Board::flag_counts`] of the board as it is.
    pub fn flag_counts_after(&self, idx: usize, c: Stone, counts: &FlagCounts) -> FlagCounts {
        debug_assert!(self.is_empty_at(idx));
        debug_assert_eq!(*counts, self.flag_counts());
        let s = self.shapes();
        let mut out = *counts;
        let mut change = |ci: usize, old: u8, new: u8| {
            let mut changed = old ^ new;
            while changed != 0 {
                let kind = changed.trailing_zeros() as usize;
                out[ci][kind] += if new >> kind & 1 == 1 { 1 } else { -1 };
                changed &= changed - 1;
            }
        };
        for ci in 0..2 {
            change(ci, s.cells[idx].flags[ci], 0);
        }
        let deltas = s.deltas[c.index()];
        let reach = reach(&deltas);
        for d in 0..4 {
            for k in 1..=reach {
                for (q, slot) in self.window_cells(idx, d, k) {
                    // Walls have no flags, and stones have none before or after.
                    if self.cells[q] != EMPTY {
                        continue;
                    }
                    let cs = &s.cells[q];
                    let keys = cs.keys[d] + deltas[slot];
                    for (ci, table) in s.tables.iter().enumerate() {
                        let shape = table.shape_of((keys >> (16 * ci)) as u16);
                        let lines = &cs.lines[ci];
                        // The flags change only if this direction's flag does.
                        if FLAG_OF[shape as usize] == FLAG_OF[lines[d] as usize] {
                            continue;
                        }
                        let f = (0..4).fold(0, |f, dd| {
                            f | FLAG_OF[if dd == d { shape } else { lines[dd] } as usize]
                        });
                        change(ci, cs.flags[ci], f);
                    }
                }
            }
        }
        out
    }

    fn shapes(&self) -> &Shapes {
        self.shapes
            .as_deref()
            .expect("threat shapes exist only on boards with five in a row")
    }

    /// Whether this board keeps threat shapes (it does when five in a row wins).
    #[inline]
    pub fn has_shapes(&self) -> bool {
        self.shapes.is_some()
    }

    /// What a stone of `c` on the empty cell `idx` makes along direction `d`.
    #[inline]
    pub fn line_at(&self, idx: usize, c: Stone, d: usize) -> LineInfo {
        let s = self.shapes();
        s.tables[c.index()].get(s.cells[idx].key(c.index(), d))
    }

    /// The shape a stone of `c` on the empty cell `idx` makes along direction `d` (cheaper
    /// than [`Board::line_at`] when the points are not needed).
    #[inline]
    pub fn shape_at(&self, idx: usize, c: Stone, d: usize) -> LineShape {
        LineShape::from_u8(self.shapes().cells[idx].lines[c.index()][d])
    }

    /// The shape numbers ([`LineShape`] as `u8`) of [`Board::shape_at`] in the four
    /// directions at once.
    #[inline]
    pub(crate) fn shape_numbers_at(&self, idx: usize, c: Stone) -> [u8; 4] {
        self.shapes().cells[idx].lines[c.index()]
    }

    /// The [`threat`] flags of a stone of `c` on the empty cell `idx` (zero on occupied cells).
    #[inline]
    pub fn flags_at(&self, idx: usize, c: Stone) -> u8 {
        self.shapes().cells[idx].flags[c.index()]
    }

    /// The empty cells where a stone of `c` would have the flag kind `kind` (a [`threat`] bit).
    #[inline]
    pub fn cells_with(&self, c: Stone, kind: u8) -> &CellSet {
        &self.shapes().sets[c.index()][kind.trailing_zeros() as usize]
    }

    /// Length of the run of `c` stones through `idx` in direction `d`, counting `idx` itself as
    /// a `c` stone whatever it holds.
    pub fn run_through(&self, idx: usize, c: Stone, d: usize) -> usize {
        let step = self.dirs[d];
        let mut n = 1;
        for sign in [-1isize, 1] {
            let mut q = idx as isize + sign * step;
            while self.cells[q as usize] == c.cell() {
                n += 1;
                q += sign * step;
            }
        }
        n
    }

    /// Whether a stone of `c` on the empty cell `idx` wins under the board's rule (a five, or
    /// for an m,n,k board `k` or more in a row).
    #[inline]
    pub fn wins_at(&self, idx: usize, c: Stone) -> bool {
        match &self.shapes {
            Some(s) => s.cells[idx].flags[c.index()] & threat::FIVE != 0,
            None => (0..4).any(|d| self.run_through(idx, c, d) >= self.k as usize),
        }
    }

    /// Whether the stone on `idx` is part of a winning line (used after a move).
    pub fn is_winning_stone(&self, idx: usize) -> bool {
        let Some(c) = self.stone_at(idx) else {
            return false;
        };
        let exact = self.k == 5 && self.rule.exact_five(c);
        (0..4).any(|d| {
            let run = self.run_through(idx, c, d);
            if exact {
                run == 5
            } else {
                run >= self.k as usize
            }
        })
    }

    /// The winner, if any stone on the board is part of a winning line.
    pub fn find_winner(&self) -> Option<Stone> {
        self.indices()
            .find(|&i| self.is_winning_stone(i))
            .and_then(|i| self.stone_at(i))
    }

    /// Compares the incremental shape state and the hashes with a recomputation from scratch.
    /// Tests call this after every change; it returns a description of the first difference.
    pub fn check_invariants(&self) -> Result<(), String> {
        let fresh = Board::build(self.width, self.height, self.k, self.rule);
        let mut rebuilt = fresh.clone();
        for p in self.points() {
            if let Some(c) = self.get(p) {
                rebuilt.place(p, c);
            }
        }
        if rebuilt.all_hashes() != self.all_hashes() || rebuilt.hashes[0] != self.hashes[0] {
            return Err("hashes differ from a rebuild".into());
        }
        if let Some(s) = &self.shapes {
            let scratch = self.fresh_shapes();
            for idx in self.indices() {
                for c in Stone::ALL {
                    let ci = c.index();
                    let (mine, theirs) = (&s.cells[idx], &scratch.cells[idx]);
                    if (0..4).any(|d| mine.key(ci, d) != theirs.key(ci, d)) {
                        return Err(format!("key at {} for {c} differs", self.point(idx)));
                    }
                    if mine.flags[ci] != theirs.flags[ci] {
                        return Err(format!("flags at {} for {c} differ", self.point(idx)));
                    }
                    if self.is_empty_at(idx) && mine.lines[ci] != theirs.lines[ci] {
                        return Err(format!("shapes at {} for {c} differ", self.point(idx)));
                    }
                }
            }
            if s.sets != scratch.sets {
                return Err("threat sets differ from a rebuild".into());
            }
        }
        Ok(())
    }
}

/// The shape table a colour uses under a rule.
fn table_for(rule: Rule, c: Stone) -> &'static ShapeTable {
    if rule.exact_five(c) {
        patterns::exact_table()
    } else {
        patterns::free_table()
    }
}

/// The key digit of a cell as seen by colour `c`.
fn digit(cell: u8, c: Stone) -> u16 {
    match cell {
        EMPTY => patterns::EMPTY,
        x if x == c.cell() => OWN,
        _ => BLOCKED,
    }
}

impl Shapes {
    /// Recomputes all four lines and the flags of an empty cell for colour `c`.
    fn refresh(&mut self, c: Stone, idx: usize) {
        let ci = c.index();
        for d in 0..4 {
            self.cells[idx].lines[ci][d] = self.tables[ci].shape_of(self.cells[idx].key(ci, d));
        }
        self.reflag(ci, idx);
    }

    /// Recomputes the flags of an empty cell from its four lines and updates the sets.
    #[inline]
    fn reflag(&mut self, ci: usize, idx: usize) {
        let l = &self.cells[idx].lines[ci];
        let f = FLAG_OF[l[0] as usize]
            | FLAG_OF[l[1] as usize]
            | FLAG_OF[l[2] as usize]
            | FLAG_OF[l[3] as usize];
        self.set_flags(ci, idx, f);
    }

    #[inline]
    fn set_flags(&mut self, ci: usize, idx: usize, f: u8) {
        let old = self.cells[idx].flags[ci];
        if old == f {
            return;
        }
        self.cells[idx].flags[ci] = f;
        let changed = old ^ f;
        for kind in 0..threat::KINDS {
            if changed >> kind & 1 == 1 {
                if f >> kind & 1 == 1 {
                    self.sets[ci][kind].insert(idx);
                } else {
                    self.sets[ci][kind].remove(idx);
                }
            }
        }
    }

    /// Clears the flags of a cell that has just been taken.
    fn clear(&mut self, idx: usize) {
        self.set_flags(0, idx, 0);
        self.set_flags(1, idx, 0);
    }
}

/// What a stone of one colour on one empty point makes in each direction, with the counts that
/// name the combined threats.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub struct PointThreats {
    /// The shape in each direction, in [`Direction::ALL`] order.
    pub lines: [LineShape; 4],
}

impl PointThreats {
    /// Whether one of the lines is a five.
    pub fn five(&self) -> bool {
        self.lines.contains(&LineShape::Five)
    }

    /// Whether one of the lines is an overline (under exact-five rules).
    pub fn overline(&self) -> bool {
        self.lines.contains(&LineShape::Overline)
    }

    /// Fours made, counting a double four in one line as two.
    pub fn fours(&self) -> u32 {
        self.lines.iter().map(|l| l.four_count()).sum()
    }

    /// Threes and broken threes made (line-local).
    pub fn threes(&self) -> u32 {
        self.lines.iter().filter(|l| l.is_three()).count() as u32
    }

    /// A straight four in some line.
    pub fn straight_four(&self) -> bool {
        self.lines.contains(&LineShape::StraightFour)
    }

    /// Two or more fours, in one line or across lines.
    pub fn double_four(&self) -> bool {
        self.fours() >= 2
    }

    /// A four and a three in other lines at once (line-local).
    pub fn four_three(&self) -> bool {
        self.fours() == 1 && self.threes() >= 1
    }

    /// Two or more threes at once (line-local).
    pub fn double_three(&self) -> bool {
        self.threes() >= 2
    }
}

impl Board {
    /// What a stone of `c` on an empty point makes in each of the four directions.
    pub fn threats(&self, p: Point, c: Stone) -> PointThreats {
        let idx = self.index(p);
        let mut lines = [LineShape::None; 4];
        for d in Direction::ALL {
            lines[d.index()] = self.line_at(idx, c, d.index()).shape();
        }
        PointThreats { lines }
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;

    fn p(s: &str) -> Point {
        s.parse().unwrap()
    }

    /// Seeded numbers below `n`, one per call (splitmix64 of a counter from `seed`).
    pub(crate) fn numbers(mut seed: u64) -> impl FnMut(u64) -> u64 {
        move |n| {
            seed = seed.wrapping_add(1);
            crate::zobrist::splitmix64(seed) % n
        }
    }

    /// A `size` board of `rule` with `stones` stones at random points, black and white in
    /// turn.
    pub(crate) fn random_board(
        next: &mut impl FnMut(u64) -> u64,
        rule: Rule,
        size: u8,
        stones: usize,
    ) -> Board {
        let mut b = Board::new(size, rule).unwrap();
        let mut c = Stone::Black;
        while b.stones() < stones {
            let q = Point::new(next(size.into()) as u8, next(size.into()) as u8);
            if b.get(q).is_none() {
                b.place(q, c);
                c = c.opponent();
            }
        }
        b
    }

    /// The row masks give what a plain look around every point gives: the empty points with
    /// a stone within `r` king moves, on random boards of several shapes (square and not,
    /// stones at the edges), for `r` from 0 to 3.
    #[test]
    fn the_empty_points_near_stones_are_read_from_the_row_masks() {
        let mut next = numbers(0x5EED_0002);
        let mut found = 0;
        for round in 0..40 {
            let mut b = match round % 4 {
                0 => Board::new(15, Rule::Freestyle).unwrap(),
                1 => Board::new(19, Rule::Renju).unwrap(),
                2 => Board::mnk(7, 4, 3).unwrap(),
                _ => Board::mnk(19, 5, 5).unwrap(),
            };
            let (w, h) = (b.width() as u64, b.height() as u64);
            for _ in 0..next(w * h / 3 + 1) {
                let q = Point::new(next(w) as u8, next(h) as u8);
                if b.get(q).is_none() {
                    b.place(q, Stone::ALL[next(2) as usize]);
                }
            }
            for r in 0..=3i32 {
                let plain: Vec<usize> = b
                    .points()
                    .filter(|&q| {
                        b.get(q).is_none()
                            && b.points().any(|s| {
                                b.get(s).is_some()
                                    && (s.x as i32 - q.x as i32).abs() <= r
                                    && (s.y as i32 - q.y as i32).abs() <= r
                            })
                    })
                    .map(|q| b.index(q))
                    .collect();
                assert_eq!(b.empties_near(r as usize), plain, "round {round}, r {r}");
                found += plain.len();
            }
        }
        assert!(found > 1000, "{found} points found");
        assert!(Board::new(15, Rule::Freestyle)
            .unwrap()
            .empties_near(2)
            .is_empty());
    }

    /// Reading the shape tables as they would be after a stone gives what placing it and
    /// looking gives: on random crowded positions of every rule (for a colour without
    /// forbidden points), at every empty point, with the points that qualify already.
    #[test]
    fn a_double_threat_after_a_stone_is_read_as_placing_it_shows() {
        let mut next = numbers(0x5EED_0001);
        let mut yes = 0;
        let mut checked = 0;
        for round in 0..60 {
            let rule = Rule::ALL[round % 3];
            let stones = 10 + next(50) as usize;
            let b = random_board(&mut next, rule, 15, stones);
            for a in Stone::ALL {
                if rule.has_forbidden(a) {
                    continue;
                }
                let before = b.double_threat_points(a);
                for idx in b.indices() {
                    if !b.is_empty_at(idx) {
                        continue;
                    }
                    let mut placed = b.clone();
                    placed.place_at(idx, a);
                    let want = placed
                        .cells_with(a, threat::FOUR)
                        .iter()
                        .any(|q| placed.double_threat_at(q, a, None));
                    assert_eq!(
                        b.double_threat_after(idx, a, &before),
                        want,
                        "{rule:?} {a:?} at {}",
                        b.point(idx)
                    );
                    checked += 1;
                    yes += usize::from(want);
                }
            }
        }
        assert!(
            checked > 5_000 && yes > 100 && yes < checked,
            "{yes} of {checked}"
        );
    }

    /// The flag counts after a stone, read without placing it, are the counts that placing
    /// it gives, for every empty point and both colours on random boards of every rule and
    /// three sizes (so that the windows meet the edges); and the counts themselves are what
    /// a look at every point's flags gives.
    #[test]
    fn the_flag_counts_after_a_stone_are_read_as_placing_it_shows() {
        let mut next = numbers(0x5EED_0003);
        let look = |b: &Board| {
            let mut out = [[0; threat::KINDS]; 2];
            for idx in b.indices().filter(|&i| b.is_empty_at(i)) {
                for c in Stone::ALL {
                    for (kind, n) in out[c.index()].iter_mut().enumerate() {
                        *n += i32::from(b.flags_at(idx, c) >> kind & 1);
                    }
                }
            }
            out
        };
        let (mut checked, mut changed) = (0, [0; threat::KINDS]);
        for round in 0..45 {
            let rule = Rule::ALL[round % 3];
            let size = [9, 15, 19][round / 3 % 3];
            let stones = 6 + next(u64::from(size) * 3) as usize;
            let b = random_board(&mut next, rule, size, stones);
            let counts = b.flag_counts();
            assert_eq!(counts, look(&b), "{rule:?} {size}");
            for a in Stone::ALL {
                for idx in b.indices().filter(|&i| b.is_empty_at(i)) {
                    let mut placed = b.clone();
                    placed.place_at(idx, a);
                    let want = placed.flag_counts();
                    assert_eq!(
                        b.flag_counts_after(idx, a, &counts),
                        want,
                        "{rule:?} {size} {a:?} at {}",
                        b.point(idx)
                    );
                    checked += 1;
                    for (kind, n) in changed.iter_mut().enumerate() {
                        *n += usize::from((0..2).any(|ci| want[ci][kind] != counts[ci][kind]));
                    }
                }
            }
        }
        assert!(
            checked > 10_000 && changed.iter().all(|&n| n > 100),
            "{checked} checked, changed per kind {changed:?}"
        );
    }

    #[test]
    fn sizes_are_checked() {
        assert!(Board::new(4, Rule::Freestyle).is_err());
        assert!(Board::new(20, Rule::Freestyle).is_err());
        assert!(Board::new(15, Rule::Renju).is_ok());
        assert!(Board::mnk(3, 3, 4).is_err());
        assert!(Board::mnk(4, 3, 3).is_ok());
    }

    #[test]
    fn place_remove_keeps_invariants() {
        let mut b = Board::new(15, Rule::Standard).unwrap();
        for (s, c) in [
            ("h8", Stone::Black),
            ("h9", Stone::White),
            ("i8", Stone::Black),
            ("a1", Stone::White),
            ("o15", Stone::Black),
            ("g8", Stone::Black),
            ("j8", Stone::Black),
        ] {
            b.place(p(s), c);
            b.check_invariants().unwrap();
        }
        // g8-j8 is a straight four: both f8 and k8 complete a five.
        assert!(b.wins_at(b.index(p("k8")), Stone::Black));
        assert!(b.wins_at(b.index(p("f8")), Stone::Black));
        assert_eq!(b.threats(p("k8"), Stone::White).lines, [LineShape::None; 4]);
        for s in ["j8", "a1", "h9"] {
            b.remove(p(s));
            b.check_invariants().unwrap();
        }
    }

    /// Shapes stay what a rebuild gives through random placements and removals: mostly the
    /// last stone taken back (as a search does), sometimes any stone, sometimes a copy of the
    /// board carried on, under every rule and on three sizes, with boards filled up.
    #[test]
    fn shapes_survive_any_order_of_placing_and_taking_back() {
        let mut next = numbers(0x5EED_0004);
        let (mut in_order, mut any, mut fullest) = (0, 0, 0);
        for round in 0..18 {
            let rule = Rule::ALL[round % 3];
            let size = [9, 15, 19][round / 3 % 3];
            let mut b = Board::new(size, rule).unwrap();
            let mut placed: Vec<usize> = Vec::new();
            let mut c = Stone::Black;
            // Every other round places more than it takes back, and only last in, first out.
            let (place, last_only) = if round % 2 == 0 { (55, 90) } else { (70, 100) };
            for step in 0..400 {
                let roll = next(100);
                let empties = b.indices().filter(|&i| b.is_empty_at(i)).count();
                fullest = fullest.max(placed.len());
                if roll < place && empties > 0 || placed.is_empty() {
                    let free: Vec<usize> = b.indices().filter(|&i| b.is_empty_at(i)).collect();
                    let idx = free[next(free.len() as u64) as usize];
                    b.place_at(idx, c);
                    placed.push(idx);
                    c = c.opponent();
                } else if roll < last_only {
                    let last = placed.pop().unwrap();
                    in_order += 1;
                    b.remove_at(last);
                } else if roll < 97 {
                    let k = next(placed.len() as u64) as usize;
                    let idx = placed.remove(k);
                    any += 1;
                    b.remove_at(idx);
                } else {
                    b = b.clone();
                }
                if step % 7 == 0 || roll >= 90 {
                    b.check_invariants()
                        .unwrap_or_else(|e| panic!("{rule:?} {size} step {step}: {e}"));
                }
            }
            b.check_invariants().unwrap();
        }
        assert!(
            in_order > 1_000 && any > 100 && fullest > 150,
            "{in_order} taken back last in first out, {any} in any order, {fullest} at most"
        );
    }

    #[test]
    fn centre_is_h8() {
        let b = Board::new(15, Rule::Freestyle).unwrap();
        assert_eq!(b.point(b.index(p("h8"))), Point::new(7, 7));
        assert_eq!(b.points().count(), 225);
    }
}
