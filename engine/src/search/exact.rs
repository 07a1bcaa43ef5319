//! The all-moves generator for exact solving of small m,n,k boards.
//!
//! Every empty point is a candidate, with two sound shortcuts: a side that can complete `k` in a
//! row does so, and a side facing exactly one such point must take it (facing two, it loses).
//! Positions are keyed by their canonical hash, so the table merges the images of a position
//! under the board's symmetries (eight on a square board, four on a rectangle).

use super::dfpn::{Node, Space};
use super::threats::side_key;
use crate::board::Board;
use crate::types::Stone;

pub(crate) struct ExactSpace<'b> {
    board: &'b mut Board,
    attacker: Stone,
    to_move: Stone,
    salt: u64,
    /// Candidate order: cells sorted by distance from the centre.
    order: Vec<u16>,
    /// Every line of `k` cells on the board.
    windows: Vec<Vec<u16>>,
}

impl<'b> ExactSpace<'b> {
    pub(crate) fn new(board: &'b mut Board, attacker: Stone, to_move: Stone) -> ExactSpace<'b> {
        let (w, h) = (board.width() as i32, board.height() as i32);
        // Keys: the squared distance from the centre (doubled coordinates), then the cell.
        let mut order: Vec<u64> = board
            .points()
            .map(|p| {
                let (dx, dy) = (2 * p.x as i32 - (w - 1), 2 * p.y as i32 - (h - 1));
                ((dx * dx + dy * dy) as u64) << 16 | board.index(p) as u64
            })
            .collect();
        order.sort_unstable();
        let salt = 0x6A09_E667_F3BC_C908
            ^ (attacker.index() as u64) << 60
            ^ (board.width() as u64) << 8
            ^ (board.height() as u64) << 16
            ^ (board.k() as u64) << 24;
        let k = board.k();
        let windows = board
            .windows(k)
            .map(|(p, d)| {
                let (dx, dy) = d.step();
                (0..k as i16)
                    .map(|i| {
                        let q = crate::geometry::Point::new(
                            (p.x as i16 + dx as i16 * i) as u8,
                            (p.y as i16 + dy as i16 * i) as u8,
                        );
                        board.index(q) as u16
                    })
                    .collect()
            })
            .collect();
        ExactSpace {
            board,
            attacker,
            to_move,
            salt,
            order: order.into_iter().map(|k| k as u16).collect(),
            windows,
        }
    }

    /// The moves that end a won node: the winning point, or (with the defender to move facing
    /// two winning points) the defender's block of one and the attacker's other.
    pub(crate) fn finishing_moves(&self) -> Vec<u16> {
        let a = self.attacker;
        let wins: Vec<u16> = self
            .order
            .iter()
            .copied()
            .filter(|&i| self.board.is_empty_at(i as usize) && self.board.wins_at(i as usize, a))
            .collect();
        match (self.to_move == a, wins.as_slice()) {
            (true, [w, ..]) => vec![*w],
            (false, [x, y, ..]) => vec![*x, *y],
            _ => Vec::new(),
        }
    }

    /// Whether the defender has a pairing strategy: disjoint pairs of empty cells such that
    /// every line the attacker could still complete contains one pair. Answering each attacker
    /// stone in a pair with the other cell then stops every line, so the attacker cannot win
    /// (the classical pairing argument for maker-breaker games; common practice, and easy to
    /// check by hand). The search for pairs is bounded; giving up only means no shortcut.
    fn pairing_blocks(&self) -> bool {
        let defender = self.attacker.opponent();
        let mut live: Vec<Vec<u16>> = Vec::new();
        for w in &self.windows {
            if w.iter()
                .any(|&i| self.board.is_stone_at(i as usize, defender))
            {
                continue;
            }
            let empty: Vec<u16> = w
                .iter()
                .copied()
                .filter(|&i| self.board.is_empty_at(i as usize))
                .collect();
            if empty.len() < 2 {
                return false;
            }
            live.push(empty);
        }
        let mut used = vec![false; self.board.cell_count()];
        let mut steps = 0u32;
        fn cover(
            live: &[Vec<u16>],
            done: &mut Vec<bool>,
            used: &mut Vec<bool>,
            steps: &mut u32,
        ) -> bool {
            *steps += 1;
            if *steps > 4000 {
                return false;
            }
            // The uncovered line with the fewest usable pairs first.
            let mut pick: Option<(usize, usize)> = None;
            for (i, w) in live.iter().enumerate() {
                if done[i] {
                    continue;
                }
                let free = w.iter().filter(|&&c| !used[c as usize]).count();
                let options = free * free.saturating_sub(1) / 2;
                if options == 0 {
                    return false;
                }
                if pick.is_none_or(|(_, o)| options < o) {
                    pick = Some((i, options));
                }
            }
            let Some((i, _)) = pick else { return true };
            let w = &live[i];
            for a in 0..w.len() {
                for b in a + 1..w.len() {
                    let (x, y) = (w[a], w[b]);
                    if used[x as usize] || used[y as usize] {
                        continue;
                    }
                    used[x as usize] = true;
                    used[y as usize] = true;
                    let newly: Vec<usize> = (0..live.len())
                        .filter(|&j| !done[j] && live[j].contains(&x) && live[j].contains(&y))
                        .collect();
                    for &j in &newly {
                        done[j] = true;
                    }
                    if cover(live, done, used, steps) {
                        return true;
                    }
                    for &j in &newly {
                        done[j] = false;
                    }
                    used[x as usize] = false;
                    used[y as usize] = false;
                }
            }
            false
        }
        let mut done = vec![false; live.len()];
        cover(&live, &mut done, &mut used, &mut steps)
    }

    /// Up to two points where `c` would complete a winning line.
    fn win_points(&self, c: Stone) -> (usize, Option<u16>) {
        let mut n = 0;
        let mut first = None;
        for &i in &self.order {
            if self.board.is_empty_at(i as usize) && self.board.wins_at(i as usize, c) {
                n += 1;
                first.get_or_insert(i);
                if n == 2 {
                    break;
                }
            }
        }
        (n, first)
    }
}

impl Space for ExactSpace<'_> {
    fn key(&self) -> u64 {
        self.board.canonical_hash() ^ self.salt ^ side_key(self.to_move)
    }

    fn child_key(&self, m: u16) -> u64 {
        self.board.canonical_hash_after(m as usize, self.to_move)
            ^ self.salt
            ^ side_key(self.to_move.opponent())
    }

    fn expand(&mut self, moves: &mut Vec<u16>) -> Node {
        let me = self.to_move;
        let attacking = me == self.attacker;
        if self.win_points(me).0 > 0 {
            return if attacking { Node::Win(1) } else { Node::Loss };
        }
        // With every line holding a defender stone the attacker can no longer win.
        let defender = self.attacker.opponent();
        let alive = self.windows.iter().any(|w| {
            w.iter()
                .all(|&i| !self.board.is_stone_at(i as usize, defender))
        });
        if !alive || self.pairing_blocks() {
            return Node::Loss;
        }
        let kind = if attacking { Node::Or } else { Node::And };
        let (n, block) = self.win_points(me.opponent());
        if n >= 2 {
            return if attacking { Node::Loss } else { Node::Win(1) };
        }
        if let Some(b) = block {
            moves.push(b);
            return kind;
        }
        // Order by how much a stone does on its lines: for the mover's own open lines and for
        // blocking the opponent's, each weighted by the stones already in the line.
        // Keys: the score (complemented, so the highest first), then the rank in the
        // centre-first order (ties keep it), then the cell.
        let mut scored: Vec<u64> = Vec::new();
        let mut score = vec![0u32; self.board.cell_count()];
        for w in &self.windows {
            let mine = w
                .iter()
                .filter(|&&i| self.board.is_stone_at(i as usize, me))
                .count();
            let theirs = w
                .iter()
                .filter(|&&i| self.board.is_stone_at(i as usize, me.opponent()))
                .count();
            let value = match (mine, theirs) {
                (m, 0) => 1u32 << (2 * m + 1),
                (0, t) => 1u32 << (2 * t),
                _ => 0,
            };
            if value > 0 {
                for &i in w {
                    score[i as usize] += value;
                }
            }
        }
        for (rank, &i) in self.order.iter().enumerate() {
            if self.board.is_empty_at(i as usize) {
                scored
                    .push(u64::from(!score[i as usize]) << 32 | (rank as u64) << 16 | u64::from(i));
            }
        }
        scored.sort_unstable();
        moves.extend(scored.iter().map(|&k| k as u16));
        if moves.is_empty() {
            // A full board with no line: a draw, which is not a win for the attacker.
            return Node::Loss;
        }
        kind
    }

    fn play(&mut self, m: u16) {
        self.board.place_at(m as usize, self.to_move);
        self.to_move = self.to_move.opponent();
    }

    fn undo(&mut self, m: u16) {
        self.board.remove_at(m as usize);
        self.to_move = self.to_move.opponent();
    }
}
