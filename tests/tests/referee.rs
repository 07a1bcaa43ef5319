//! An independent, deliberately simple referee for forcing lines, used to check the solver.
//!
//! Nothing here asks the engine's search or its shape tables for a verdict. The referee keeps
//! its own copy of the stones and decides everything by scanning them:
//!
//! * **five**: a run of the mover's stones through the point, counted cell by cell. Exactly
//!   five wins under standard rules (both colours) and for black under renju; five or more
//!   wins under freestyle and for white under renju (DESIGN section 3; RIF 1996/1998).
//! * **four**: a stone makes a four when, with it placed, some empty point on one of its four
//!   lines, within four steps, would complete a five along that line (found by trying each
//!   such point). That is the definition of a four ("one more stone makes a five") applied by
//!   brute force.
//! * **legal**: any empty point, except for black under renju, where a point is legal when it
//!   makes a five or when the slow, independent reading of the RIF clauses in `renju.rs`
//!   (`renju::reading`) finds it not forbidden.
//!
//! On top of these the referee has two searches:
//!
//! * [`Referee::vcf`]: an exhaustive fours-only search (the VCF class of the solver: the
//!   attacker tries every legal empty point that makes a four, by our own test; the defender's
//!   reply is forced; a defender five refutes; a defender four must be blocked by a move that
//!   is itself a four; a renju black defender that cannot legally block loses). It is
//!   memoised by position. A "no" from it means no VCF exists at all.
//! * [`Referee::confirm`]: confirms that the attacker really wins, letting the defender play
//!   every legal empty point at every defender node (not only the replies a threat analysis
//!   would pick). At attacker nodes it takes, in order: an immediate five; the forced block of
//!   a defender five; the claimed main line's next move while play is on that line; its own
//!   VCF move; then the move a caller-supplied adviser (the solver, re-solving from that
//!   node) suggests; and, if the caller allows it and none of these works, threats of its own
//!   (a four, or a move after which its own VCF search wins if the defender passes). Only the
//!   referee's own five detection ends a line as won, so the adviser can propose moves but
//!   never decide anything. Successes are memoised by position.

use std::collections::HashMap;

use engine::{Board, Point, Rule, Stone};

use crate::renju::reading;

/// The four line directions as steps.
const STEPS: [(i32, i32); 4] = [(1, 0), (0, 1), (1, 1), (1, -1)];

/// The cell value of a colour (the same encoding as `renju::reading`).
fn value(c: Stone) -> u8 {
    match c {
        Stone::Black => 1,
        Stone::White => 2,
    }
}

/// Whether colour `c` needs exactly five under `rule` (our own table of DESIGN section 3).
fn exact_five(rule: Rule, c: Stone) -> bool {
    match rule {
        Rule::Freestyle => false,
        Rule::Standard => true,
        Rule::Renju => c == Stone::Black,
    }
}

/// Why a claimed win could not be confirmed.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Fail {
    /// The referee found a defence, or the line breaks the rules: the claim is wrong.
    Refuted {
        /// The moves from the root to the node where the attack failed, in order.
        path: Vec<(Stone, Point)>,
        /// What happened there.
        why: String,
    },
    /// The verification budget ran out first: nothing is known.
    Budget,
}

impl Fail {
    fn refuted(why: String) -> Fail {
        Fail::Refuted {
            path: Vec::new(),
            why,
        }
    }

    /// Adds the move played on the way to the failure (callers unwind from the leaf).
    fn after(self, c: Stone, p: Point) -> Fail {
        match self {
            Fail::Refuted { mut path, why } => {
                path.insert(0, (c, p));
                Fail::Refuted { path, why }
            }
            Fail::Budget => Fail::Budget,
        }
    }
}

/// A position as the referee sees it: the stones, the rule, and memo tables.
pub struct Referee {
    grid: reading::Grid,
    rule: Rule,
    n: i32,
    vcf_memo: HashMap<(Vec<u8>, u8), Option<usize>>,
    confirm_memo: HashMap<(Vec<u8>, u8), bool>,
    /// Nodes visited by `confirm` since the last `reset_budget`.
    pub nodes: u64,
    /// The most nodes `confirm` may visit before giving up with [`Fail::Budget`].
    pub node_budget: u64,
    /// Nodes visited by `vcf` in all.
    pub vcf_nodes: u64,
}

impl Referee {
    /// The referee's copy of a board (square, five in a row).
    pub fn of(board: &Board) -> Referee {
        let grid = reading::Grid::of(board);
        Referee {
            n: grid.n,
            grid,
            rule: board.rule(),
            vcf_memo: HashMap::new(),
            confirm_memo: HashMap::new(),
            nodes: 0,
            node_budget: u64::MAX,
            vcf_nodes: 0,
        }
    }

    /// The cell index of a point.
    pub fn idx(&self, p: Point) -> usize {
        (i32::from(p.y) * self.n + i32::from(p.x)) as usize
    }

    /// The point of a cell index.
    pub fn point(&self, i: usize) -> Point {
        Point::new((i as i32 % self.n) as u8, (i as i32 / self.n) as u8)
    }

    fn xy(&self, i: usize) -> (i32, i32) {
        (i as i32 % self.n, i as i32 / self.n)
    }

    /// The cell at (x, y): 0 empty, 1 black, 2 white, 3 off the board.
    fn at(&self, x: i32, y: i32) -> u8 {
        if x < 0 || y < 0 || x >= self.n || y >= self.n {
            3
        } else {
            self.grid.cells[(y * self.n + x) as usize]
        }
    }

    /// Whether the cell holds no stone.
    pub fn is_empty(&self, i: usize) -> bool {
        self.grid.cells[i] == 0
    }

    /// The empty cells, in index order.
    pub fn empties(&self) -> Vec<usize> {
        (0..self.grid.cells.len())
            .filter(|&i| self.grid.cells[i] == 0)
            .collect()
    }

    /// Puts a stone on an empty cell.
    pub fn place(&mut self, i: usize, c: Stone) {
        assert_eq!(self.grid.cells[i], 0, "referee: {} is taken", self.point(i));
        self.grid.cells[i] = value(c);
    }

    /// Empties a cell.
    pub fn remove(&mut self, i: usize) {
        assert_ne!(self.grid.cells[i], 0, "referee: {} is empty", self.point(i));
        self.grid.cells[i] = 0;
    }

    /// The length of the run of `c` through cell `i` along step `d`, counting `i` as `c`.
    fn run(&self, i: usize, c: Stone, (dx, dy): (i32, i32)) -> usize {
        let v = value(c);
        let (x, y) = self.xy(i);
        let mut len = 1;
        for s in [-1, 1] {
            let mut k = 1;
            while self.at(x + s * k * dx, y + s * k * dy) == v {
                len += 1;
                k += 1;
            }
        }
        len
    }

    fn run_wins(&self, len: usize, c: Stone) -> bool {
        if exact_five(self.rule, c) {
            len == 5
        } else {
            len >= 5
        }
    }

    /// Whether a stone of `c` on the empty cell `i` makes a winning five.
    pub fn makes_five(&self, i: usize, c: Stone) -> bool {
        STEPS.iter().any(|&d| self.run_wins(self.run(i, c, d), c))
    }

    /// The empty cells where `c` would make a winning five.
    pub fn five_points(&self, c: Stone) -> Vec<usize> {
        self.empties()
            .into_iter()
            .filter(|&i| self.makes_five(i, c))
            .collect()
    }

    /// The colour with a winning five on the board, if any (stones are scanned one by one).
    pub fn winner(&self) -> Option<Stone> {
        (0..self.grid.cells.len()).find_map(|i| {
            let c = match self.grid.cells[i] {
                1 => Stone::Black,
                2 => Stone::White,
                _ => return None,
            };
            STEPS
                .iter()
                .any(|&d| self.run_wins(self.run(i, c, d), c))
                .then_some(c)
        })
    }

    /// Whether `c` may play on the empty cell `i`.
    pub fn legal(&mut self, i: usize, c: Stone) -> bool {
        if self.rule != Rule::Renju || c == Stone::White || self.makes_five(i, c) {
            return true;
        }
        let (x, y) = self.xy(i);
        self.grid.forbidden(x, y).is_none()
    }

    /// Whether a stone of `c` on the empty cell `i` makes a four: with it placed, some empty
    /// point on one of its lines within four steps completes a five along that line.
    pub fn makes_four(&mut self, i: usize, c: Stone) -> bool {
        let (x, y) = self.xy(i);
        self.grid.cells[i] = value(c);
        let mut four = false;
        'lines: for &d in &STEPS {
            for k in (-4..=4).filter(|&k| k != 0) {
                let (qx, qy) = (x + k * d.0, y + k * d.1);
                if self.at(qx, qy) == 0 {
                    let q = (qy * self.n + qx) as usize;
                    if self.run_wins(self.run(q, c, d), c) {
                        four = true;
                        break 'lines;
                    }
                }
            }
        }
        self.grid.cells[i] = 0;
        four
    }

    fn key(&self, c: Stone) -> (Vec<u8>, u8) {
        (self.grid.cells.clone(), value(c))
    }

    // -----------------------------------------------------------------------------------------
    // The exhaustive fours-only search.

    /// The attacker's winning first move by continuous fours (a five point, or a four), with
    /// the attacker to move; `None` if there is no VCF at all.
    pub fn vcf(&mut self, a: Stone) -> Option<usize> {
        let key = self.key(a);
        if let Some(&m) = self.vcf_memo.get(&key) {
            return m;
        }
        self.vcf_nodes += 1;
        let result = self.vcf_search(a);
        self.vcf_memo.insert(key, result);
        result
    }

    fn vcf_search(&mut self, a: Stone) -> Option<usize> {
        let d = a.opponent();
        if let Some(&f) = self.five_points(a).first() {
            return Some(f);
        }
        let dfives = self.five_points(d);
        let cands: Vec<usize> = match dfives.as_slice() {
            [] => {
                let mut v = Vec::new();
                for i in self.empties() {
                    if self.legal(i, a) && self.makes_four(i, a) {
                        v.push(i);
                    }
                }
                v
            }
            // A defender four must be blocked, and in a VCF by a four.
            [b] if self.legal(*b, a) && self.makes_four(*b, a) => vec![*b],
            _ => Vec::new(),
        };
        for m in cands {
            self.place(m, a);
            let wins = self.vcf_defender(a);
            self.remove(m);
            if wins {
                return Some(m);
            }
        }
        None
    }

    /// After an attacker four, the defender to move: whether the attacker wins by VCF.
    fn vcf_defender(&mut self, a: Stone) -> bool {
        let d = a.opponent();
        if !self.five_points(d).is_empty() {
            return false; // The defender makes five first.
        }
        match self.five_points(a).as_slice() {
            [] => false,
            [b] => {
                let b = *b;
                if !self.legal(b, d) {
                    return true; // Black cannot block (renju): any other move loses.
                }
                self.place(b, d);
                let wins = self.vcf(a).is_some();
                self.remove(b);
                wins
            }
            _ => true, // Two five points: one block cannot stop both.
        }
    }

    // -----------------------------------------------------------------------------------------
    // Confirming a claimed win against every defender reply.

    /// Starts a new node count for [`Referee::confirm`].
    pub fn reset_budget(&mut self, budget: u64) {
        self.nodes = 0;
        self.node_budget = budget;
    }

    /// Confirms that `a`, to move, wins against every defence. `line` is the claimed main line
    /// (attacker first); `board` mirrors the referee's stones for the adviser, which gets the
    /// board and the attacker and may suggest a move. Where neither the line, the referee's
    /// own VCF nor the adviser gives a move that works, the referee tries threats of its own
    /// (a four, or a move after which it would win by VCF if the defender passed), at most
    /// `own_moves` of them on any path.
    pub fn confirm(
        &mut self,
        board: &mut Board,
        a: Stone,
        line: &[Point],
        own_moves: u8,
        adviser: &mut dyn FnMut(&Board, Stone) -> Option<Point>,
    ) -> Result<(), Fail> {
        let line: Vec<usize> = line.iter().map(|&p| self.idx(p)).collect();
        self.confirm_attacker(board, a, Some((&line, 0)), own_moves, adviser)
    }

    fn play(&mut self, board: &mut Board, i: usize, c: Stone) {
        self.place(i, c);
        board.place(self.point(i), c);
    }

    fn unplay(&mut self, board: &mut Board, i: usize) {
        self.remove(i);
        board.remove(self.point(i));
    }

    fn confirm_attacker(
        &mut self,
        board: &mut Board,
        a: Stone,
        on_line: Option<(&[usize], usize)>,
        own: u8,
        adviser: &mut dyn FnMut(&Board, Stone) -> Option<Point>,
    ) -> Result<(), Fail> {
        let key = self.key(a);
        if self.confirm_memo.get(&key) == Some(&true) {
            return Ok(());
        }
        self.nodes += 1;
        if self.nodes > self.node_budget {
            return Err(Fail::Budget);
        }
        let result = self.confirm_attacker_move(board, a, on_line, own, adviser);
        if result.is_ok() {
            self.confirm_memo.insert(key, true);
        }
        result
    }

    /// The attacker's threats of the referee's own choosing at this node: fours, and moves
    /// after which the attacker would win by VCF if the defender passed.
    fn own_threats(&mut self, a: Stone, skip: &[usize]) -> Vec<usize> {
        let mut out = Vec::new();
        for m in self.empties() {
            if skip.contains(&m) || !self.legal(m, a) {
                continue;
            }
            let threat = self.makes_four(m, a) || {
                self.place(m, a);
                let t = self.vcf(a).is_some();
                self.remove(m);
                t
            };
            if threat {
                out.push(m);
            }
        }
        out
    }

    fn confirm_attacker_move(
        &mut self,
        board: &mut Board,
        a: Stone,
        on_line: Option<(&[usize], usize)>,
        own: u8,
        adviser: &mut dyn FnMut(&Board, Stone) -> Option<Point>,
    ) -> Result<(), Fail> {
        let d = a.opponent();
        let planned = on_line.and_then(|(l, k)| l.get(k).copied());
        if !self.five_points(a).is_empty() {
            return Ok(()); // The attacker makes five (found by our own scan).
        }
        let dfives = self.five_points(d);
        let forced = match dfives.as_slice() {
            [] => None,
            [b] => Some(*b),
            _ => {
                return Err(Fail::refuted(format!(
                    "{a} to move faces two fives of {d} ({}, {})",
                    self.point(dfives[0]),
                    self.point(dfives[1])
                )))
            }
        };
        // Candidate moves, each with the own-move budget left after it.
        let mut cands: Vec<(usize, u8)> = Vec::new();
        let mut fallback = false;
        if let Some(b) = forced {
            if let Some(p) = planned {
                if p != b {
                    return Err(Fail::refuted(format!(
                        "the line plays {} but {d}'s five at {} must be blocked",
                        self.point(p),
                        self.point(b)
                    )));
                }
            }
            cands.push((b, own));
        } else if let Some(p) = planned {
            cands.push((p, own));
        } else if let Some(v) = self.vcf(a) {
            cands.push((v, own));
        } else {
            if let Some(p) = adviser(board, a) {
                cands.push((self.idx(p), own));
            }
            fallback = own > 0;
        }
        let mut first_err = None;
        let mut k = 0;
        loop {
            if k == cands.len() {
                if !fallback {
                    break;
                }
                fallback = false;
                let skip: Vec<usize> = cands.iter().map(|c| c.0).collect();
                for m in self.own_threats(a, &skip) {
                    cands.push((m, own - 1));
                }
                if k == cands.len() {
                    break;
                }
            }
            let (m, left) = cands[k];
            k += 1;
            let next = if Some(m) == planned {
                on_line.map(|(l, i)| (l, i + 1))
            } else {
                None
            };
            match self.try_attacker_move(board, a, m, next, left, adviser) {
                Ok(()) => return Ok(()),
                Err(Fail::Budget) => return Err(Fail::Budget),
                Err(e) => {
                    first_err.get_or_insert(e);
                }
            }
        }
        Err(first_err.unwrap_or_else(|| {
            Fail::refuted(format!(
                "{a} has no move to continue with (no VCF, no advice, no threat of its own) on\n{}",
                engine::notation::diagram(board)
            ))
        }))
    }

    fn try_attacker_move(
        &mut self,
        board: &mut Board,
        a: Stone,
        m: usize,
        next: Option<(&[usize], usize)>,
        own: u8,
        adviser: &mut dyn FnMut(&Board, Stone) -> Option<Point>,
    ) -> Result<(), Fail> {
        if !self.is_empty(m) {
            return Err(Fail::refuted(format!(
                "{a}'s move {} is on a stone",
                self.point(m)
            )));
        }
        if !self.legal(m, a) {
            return Err(Fail::refuted(format!(
                "{a}'s move {} is forbidden",
                self.point(m)
            )));
        }
        self.play(board, m, a);
        let r = self.confirm_defender(board, a, next, own, adviser);
        self.unplay(board, m);
        r.map_err(|e| e.after(a, self.point(m)))
    }

    /// The defender to move after an attacker move that was not a five: every legal reply
    /// must lose.
    fn confirm_defender(
        &mut self,
        board: &mut Board,
        a: Stone,
        on_line: Option<(&[usize], usize)>,
        own: u8,
        adviser: &mut dyn FnMut(&Board, Stone) -> Option<Point>,
    ) -> Result<(), Fail> {
        let d = a.opponent();
        // The attacker's five points now. A defender stone can only take a five point away
        // by being put on it (a run of attacker stones does not change when a defender stone
        // lands elsewhere), so after any other reply the attacker makes five there; that is
        // still checked by our own scan, reply by reply.
        let fives = self.five_points(a);
        // Every empty point, the defender's fours first when the attacker has no five point:
        // a refutation, if there is one, is most often a counter-four, and finding it first
        // saves time (the order changes nothing else, since every reply is tried).
        let mut replies = self.empties();
        if replies.is_empty() {
            return Err(Fail::refuted("the board is full: a draw".into()));
        }
        if fives.is_empty() {
            let fours: Vec<bool> = replies.iter().map(|&r| self.makes_four(r, d)).collect();
            let mut order: Vec<usize> = (0..replies.len()).collect();
            order.sort_by_key(|&k| !fours[k]);
            replies = order.into_iter().map(|k| replies[k]).collect();
        }
        let planned = on_line.and_then(|(l, k)| l.get(k).copied());
        let mut any_legal = false;
        for r in replies {
            if !self.legal(r, d) {
                continue;
            }
            any_legal = true;
            if self.makes_five(r, d) {
                return Err(Fail::refuted(format!("{d} makes five")).after(d, self.point(r)));
            }
            if let Some(&q) = fives.iter().find(|&&q| q != r) {
                self.place(r, d);
                let five = self.makes_five(q, a);
                self.remove(r);
                assert!(
                    five,
                    "referee: a defender stone on {} undid a five",
                    self.point(r)
                );
                continue;
            }
            let next = match (planned, on_line) {
                (Some(p), Some((l, k))) if p == r => Some((l, k + 1)),
                _ => None,
            };
            self.play(board, r, d);
            let res = self.confirm_attacker(board, a, next, own, adviser);
            self.unplay(board, r);
            if let Err(e) = res {
                return Err(e.after(d, self.point(r)));
            }
        }
        if !any_legal {
            return Err(Fail::refuted(format!("{d} has no legal move")));
        }
        Ok(())
    }
}

/// Whether some defender move on `path` (played from `board`, attacker `a` first) made a four
/// for the defender when it was played: the refutation went through a counter-four.
pub fn through_counter_four(board: &Board, a: Stone, path: &[(Stone, Point)]) -> bool {
    let mut r = Referee::of(board);
    path.iter().any(|&(c, p)| {
        let i = r.idx(p);
        let four = c != a && r.makes_four(i, c);
        r.place(i, c);
        four
    })
}

/// A path as text: `c8 (white) e4 (black) ...`.
pub fn path_text(path: &[(Stone, Point)]) -> String {
    path.iter()
        .map(|(c, p)| format!("{p} ({c})"))
        .collect::<Vec<_>>()
        .join(" ")
}
