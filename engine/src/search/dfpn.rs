//! The proof-number search core: depth-first proof-number search (df-pn, A. Nagai, "Df-pn
//! Algorithm for Searching AND/OR Trees and Its Applications", PhD thesis, University of Tokyo,
//! 2002), over any AND/OR tree described by a [`Space`].
//!
//! OR nodes are the attacker's turns (one winning move proves the node), AND nodes the
//! defender's (every reply must be refuted). Each node carries a proof number (how many leaves
//! at least must still be proved to prove it) and a disproof number; the search always descends
//! into the most-proving child while both numbers stay under thresholds inherited from the
//! parent, and stores the numbers in a bounded [`Table`] instead of keeping the tree.
//!
//! Two refinements from the literature are used: the "1 + epsilon" threshold of J. Pawlewicz and
//! L. Lew ("Improving depth-first PN-search: 1 + epsilon trick", Computers and Games 2006), which
//! lets the search stay longer in a subtree before switching, and a per-entry record of the work
//! done, used by the table to keep expensive results.
//!
//! Five-in-a-row trees have no cycles (stones are only ever added), so the graph-history
//! interaction problem of df-pn does not arise. Results are deterministic for a given node
//! budget: the tree, the move order and the table are all deterministic.

use super::tt::{Slot, Table, NO_MOVE};

/// Proof or disproof number meaning "infinite".
pub const INF: u32 = 1 << 30;

/// What a node is, once its moves are generated.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum Node {
    /// The attacker has won here (depth: attacker moves still to play, the five included).
    Win(u16),
    /// The attacker cannot win here (within the search's class).
    Loss,
    /// The attacker is to move; the moves are the attacker's candidates.
    Or,
    /// The defender is to move; the moves are every reply that needs refuting.
    And,
}

/// An AND/OR tree explored by making and unmaking moves.
pub trait Space {
    /// The key of the current node: everything its value depends on.
    fn key(&self) -> u64;
    /// The key of the node after `m`, without playing it.
    fn child_key(&self, m: u16) -> u64;
    /// Classifies the current node and, for OR and AND nodes, fills `moves` (empty on entry).
    fn expand(&mut self, moves: &mut Vec<u16>) -> Node;
    /// Plays a move generated at the current node.
    fn play(&mut self, m: u16);
    /// Takes back the move just played.
    fn undo(&mut self, m: u16);
    /// Before an expansion: the nodes the sub-searches of that expansion may still use, and
    /// the nodes the question has spent so far (for its stop check). A space without
    /// sub-searches ignores it.
    fn allow(&mut self, _left: u64, _spent: u64) {}
    /// Nodes spent by sub-searches since the last call (counted into the search's total).
    fn take_spent(&mut self) -> u64 {
        0
    }
}

/// A question's stop check: called with the nodes the question has spent so far, returns
/// `true` to stop (a wall-clock check, a cancel button, a progress report; the engine never
/// reads a clock itself).
pub type Watch<'s> = &'s dyn Fn(u64) -> bool;

/// How a search ended.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum Status {
    /// Proved: the attacker wins.
    Proved,
    /// Disproved: the attacker does not win within the class.
    Disproved,
    /// The budget ran out first.
    Unknown,
}

#[inline]
fn add(a: u32, b: u32) -> u32 {
    if a >= INF || b >= INF {
        INF
    } else {
        (a + b).min(INF - 1)
    }
}

/// The search driver: the table, the counters and the budget.
pub struct Dfpn<'t, 's> {
    tt: &'t mut Table,
    /// Nodes expanded so far.
    pub nodes: u64,
    /// Nodes the space's sub-searches spent so far.
    pub sub: u64,
    node_limit: u64,
    /// Nodes this search and its sub-searches may spend together.
    total: u64,
    /// Nodes the question spent before this search.
    base: u64,
    stop: Option<Watch<'s>>,
    aborted: bool,
    pool: Vec<Vec<(u16, u64)>>,
    scratch: Vec<u16>,
}

impl<'t, 's> Dfpn<'t, 's> {
    /// A driver over `tt` that expands at most `node_limit` nodes and polls `stop` every 8
    /// nodes (a wall-clock check supplied by the caller: the engine never reads a clock).
    pub fn new(tt: &'t mut Table, node_limit: u64, stop: Option<Watch<'s>>) -> Dfpn<'t, 's> {
        Dfpn {
            tt,
            nodes: 0,
            sub: 0,
            node_limit,
            total: u64::MAX,
            base: 0,
            stop,
            aborted: false,
            pool: Vec::new(),
            scratch: Vec::new(),
        }
    }

    /// Caps the nodes of this search and its sub-searches together at `total`, the question
    /// having spent `base` before it (what the stop check is told).
    pub fn within(mut self, total: u64, base: u64) -> Self {
        self.total = total;
        self.base = base;
        self
    }

    /// Nodes this search and its sub-searches spent together.
    pub fn spent(&self) -> u64 {
        self.nodes + self.sub
    }

    /// Whether the budget ran out.
    pub fn aborted(&self) -> bool {
        self.aborted
    }

    /// The table.
    pub fn table(&self) -> &Table {
        self.tt
    }

    /// Searches the current node of `sp` until it is proved, disproved or the budget runs out.
    pub fn solve<S: Space>(&mut self, sp: &mut S) -> Status {
        if self.aborted {
            return Status::Unknown;
        }
        self.mid(sp, INF, INF);
        match self.tt.get(sp.key()) {
            Some(e) if e.pn == 0 => Status::Proved,
            Some(e) if e.dn == 0 => Status::Disproved,
            _ => Status::Unknown,
        }
    }

    /// The stored entry of a key.
    pub fn entry(&self, key: u64) -> Option<Slot> {
        self.tt.get(key).copied()
    }

    fn mid<S: Space>(&mut self, sp: &mut S, th_pn: u32, th_dn: u32) {
        if self.aborted {
            return;
        }
        self.nodes += 1;
        if self.nodes > self.node_limit || self.spent() > self.total {
            self.aborted = true;
            return;
        }
        if self.nodes & 7 == 0 {
            if let Some(stop) = self.stop {
                if stop(self.base + self.spent()) {
                    self.aborted = true;
                    return;
                }
            }
        }
        let key = sp.key();
        let start = self.nodes;
        let old_work = match self.tt.get(key) {
            // Already settled, or already over a threshold: nothing to do here.
            Some(e) if e.pn == 0 || e.dn == 0 || e.pn >= th_pn || e.dn >= th_dn => return,
            Some(e) => e.work,
            None => 0,
        };
        let mut raw = std::mem::take(&mut self.scratch);
        raw.clear();
        sp.allow(
            self.total.saturating_sub(self.spent()),
            self.base + self.spent(),
        );
        let node = sp.expand(&mut raw);
        self.sub += sp.take_spent();
        let is_or = match node {
            Node::Win(depth) => {
                self.scratch = raw;
                self.store(key, 0, INF, NO_MOVE, depth, old_work + 1);
                return;
            }
            Node::Loss => {
                self.scratch = raw;
                self.store(key, INF, 0, NO_MOVE, 0, old_work + 1);
                return;
            }
            Node::Or => true,
            Node::And => false,
        };
        if raw.is_empty() {
            self.scratch = raw;
            if is_or {
                self.store(key, INF, 0, NO_MOVE, 0, old_work + 1);
            } else {
                // The defender has no reply that needs refuting: the attacker's next move wins.
                self.store(key, 0, INF, NO_MOVE, 1, old_work + 1);
            }
            return;
        }
        let mut kids = self.pool.pop().unwrap_or_default();
        kids.clear();
        kids.extend(raw.iter().map(|&m| (m, sp.child_key(m))));
        self.scratch = raw;

        let (mut pn, mut dn, mut best, mut depth);
        loop {
            // Gather the children's numbers; phi is the number this node minimises over
            // (pn at OR nodes, dn at AND nodes), delta the one it sums.
            let mut min_phi = INF;
            let mut second = INF;
            let mut sum_delta = 0u32;
            let mut pick = 0usize;
            let mut pick_delta = 0u32;
            let mut pick_depth = 0u16;
            let mut max_depth = 0u16;
            for (i, &(_, ck)) in kids.iter().enumerate() {
                let (cpn, cdn, cdepth) = match self.tt.get(ck) {
                    Some(e) => (e.pn, e.dn, e.depth),
                    None => (1, 1, 0),
                };
                let (phi, delta) = if is_or { (cpn, cdn) } else { (cdn, cpn) };
                max_depth = max_depth.max(cdepth);
                if phi < min_phi || (phi == 0 && min_phi == 0 && cdepth < pick_depth) {
                    if phi < min_phi {
                        second = min_phi;
                    }
                    min_phi = phi;
                    pick = i;
                    pick_delta = delta;
                    pick_depth = cdepth;
                } else if phi < second {
                    second = phi;
                }
                sum_delta = add(sum_delta, delta);
            }
            if is_or {
                pn = min_phi;
                dn = sum_delta;
                depth = pick_depth.saturating_add(1);
            } else {
                pn = sum_delta;
                dn = min_phi;
                depth = max_depth;
            }
            best = kids[pick].0;
            let (th_phi, th_delta) = if is_or {
                (th_pn, th_dn)
            } else {
                (th_dn, th_pn)
            };
            let (phi, delta) = if is_or { (pn, dn) } else { (dn, pn) };
            if phi >= th_phi || delta >= th_delta || self.aborted {
                break;
            }
            // The 1 + epsilon trick: let the child run until it is a quarter worse than the
            // second-best sibling, not merely one worse.
            let child_phi = th_phi.min(add(second, 1).max(add(second, second / 4)));
            let child_delta = if th_delta >= INF {
                INF
            } else {
                add(th_delta - delta, pick_delta)
            };
            let m = kids[pick].0;
            sp.play(m);
            if is_or {
                self.mid(sp, child_phi, child_delta);
            } else {
                self.mid(sp, child_delta, child_phi);
            }
            sp.undo(m);
        }
        let work = old_work.saturating_add((self.nodes - start).min(u32::MAX as u64) as u32);
        self.pool.push(kids);
        if pn != 0 && dn != 0 {
            depth = 0;
        }
        self.store(key, pn, dn, best, depth, work);
    }

    #[inline]
    fn store(&mut self, key: u64, pn: u32, dn: u32, best: u16, depth: u16, work: u32) {
        self.tt.put(Slot {
            key,
            pn,
            dn,
            work,
            best,
            depth,
        });
    }
}
