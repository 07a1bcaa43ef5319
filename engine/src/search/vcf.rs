//! The VCF oracle: "does the attacker, to move, win by continuous fours here?", asked many
//! times by a VCT search (at every attacker node, for the threat to stop at every defender
//! node, and for the defender's own counter-chances). It has a table of its own, so the same
//! question is never searched twice while its answer is still stored, and a per-question and
//! a per-search node limit: an answer that ran out of nodes makes the oracle "inexact", which
//! the solver turns into `Unknown` rather than let a verdict rest on it.

use super::dfpn::{Dfpn, Node, Space, Status, Watch};
use super::threats::{Mode, ThreatSpace, UNLIMITED};
use super::tt::Table;
use crate::board::Board;
use crate::types::Stone;

/// A VCF found by the oracle: the moves from the attacker's first four to its last, defender
/// replies in between, and the attacker's five points at the end.
#[derive(Clone, Debug, PartialEq, Eq, Default)]
pub struct VcfLine {
    /// Attacker and defender moves alternating, attacker first.
    pub moves: Vec<u16>,
    /// The attacker's five points after the last move (one or more).
    pub fives: Vec<u16>,
}

impl VcfLine {
    /// Attacker moves in the line, the five included.
    pub fn attacker_moves(&self) -> u16 {
        (self.moves.len().div_ceil(2) + 1) as u16
    }
}

/// Answers "does the attacker, to move, have a VCF here?" with a table of its own.
pub struct VcfOracle {
    tt: Table,
    /// Nodes one question may take before its answer counts as unknown.
    pub node_limit: u64,
    /// Set when some question ran out of nodes (so a "no" is not a proof).
    pub inexact: bool,
    /// The value of `nodes` past which every question counts as unknown without a search
    /// (`u64::MAX`: never); the solver sets it for one search at a time.
    pub spend_limit: u64,
    /// Nodes searched over all questions.
    pub nodes: u64,
    /// Nodes the questions of the current expansion may still use together (set by the
    /// search that asks, from what its question has left; `u64::MAX`: no cap).
    pub allowance: u64,
    /// Nodes the asking question had spent when the allowance was set, plus what the
    /// oracle's questions spent since (what the stop check is told).
    pub spent: u64,
    /// Nodes of every kind the oracle ever searched (questions and re-searches alike).
    pub used: u64,
    /// The attacker's VCT candidates of recently expanded nodes, so that the proof-number
    /// search, which comes back to the same node many times, does not test them again.
    pub(crate) moves: MoveCache,
}

/// A direct-mapped cache of generated move lists, keyed by node key.
pub(crate) struct MoveCache {
    keys: Vec<u64>,
    lists: Vec<Vec<u16>>,
}

impl MoveCache {
    const SLOTS: usize = 1 << 14;

    fn new() -> MoveCache {
        MoveCache {
            keys: vec![0; Self::SLOTS],
            lists: vec![Vec::new(); Self::SLOTS],
        }
    }

    pub(crate) fn get(&self, key: u64) -> Option<&[u16]> {
        let i = (key as usize) & (Self::SLOTS - 1);
        (self.keys[i] == key).then(|| self.lists[i].as_slice())
    }

    pub(crate) fn put(&mut self, key: u64, moves: &[u16]) {
        let i = (key as usize) & (Self::SLOTS - 1);
        self.keys[i] = key;
        self.lists[i].clear();
        self.lists[i].extend_from_slice(moves);
    }

    fn clear(&mut self) {
        self.keys.fill(0);
    }
}

impl VcfOracle {
    /// An oracle with a table of `megabytes` and a per-question node limit.
    pub fn new(megabytes: usize, node_limit: u64) -> VcfOracle {
        VcfOracle {
            tt: Table::with_megabytes(megabytes),
            node_limit,
            inexact: false,
            spend_limit: u64::MAX,
            nodes: 0,
            allowance: u64::MAX,
            spent: 0,
            used: 0,
            moves: MoveCache::new(),
        }
    }

    /// Forgets all stored answers.
    pub fn clear(&mut self) {
        self.tt.clear();
        self.moves.clear();
        self.inexact = false;
    }

    /// The attacker's VCF from this position with the attacker to move, using at most `depth`
    /// attacker moves before the five, if there is one within the node limit.
    pub fn find(
        &mut self,
        board: &mut Board,
        attacker: Stone,
        depth: u16,
        stop: Option<Watch>,
    ) -> Option<VcfLine> {
        let Some(limit) = self.question_limit() else {
            self.inexact = true;
            return None;
        };
        let mut sp = ThreatSpace::new(board, attacker, attacker, Mode::Vcf, depth, None);
        let mut dfpn = Dfpn::new(&mut self.tt, limit, stop).within(limit, self.spent);
        let status = dfpn.solve(&mut sp);
        let searched = dfpn.nodes;
        let out = match status {
            Status::Proved => {
                let line = vcf_line(&mut dfpn, &mut sp, self.node_limit);
                if line.is_none() {
                    self.inexact = true;
                }
                line
            }
            Status::Disproved => None,
            Status::Unknown => {
                self.inexact = true;
                None
            }
        };
        let all = dfpn.nodes;
        drop(dfpn);
        self.charge(searched, all);
        out
    }

    /// Counts a question's nodes: `searched` by the question itself (reported as the
    /// oracle's nodes), `all` with the re-searches of reading its line back (charged to the
    /// allowance).
    fn charge(&mut self, searched: u64, all: u64) {
        self.nodes += searched;
        self.allowance = self.allowance.saturating_sub(all);
        self.spent += all;
        self.used += all;
    }
}

impl VcfOracle {
    /// The node limit of the next question: the per-question limit, or what is left of the
    /// spending limit if that is less; `None` when nothing is left.
    fn question_limit(&self) -> Option<u64> {
        let left = self
            .spend_limit
            .saturating_sub(self.nodes)
            .min(self.allowance);
        (left > 0).then(|| self.node_limit.min(left))
    }

    /// Whether `side` (to move) has a VCF, asked of the defender of a VCT: a yes refutes the
    /// attacker's threat. When the question runs out of nodes the answer is the cautious one,
    /// yes (so that no attacker win rests on it), and the oracle becomes inexact (so that no
    /// attacker no-win rests on it either).
    pub fn has_vcf(&mut self, board: &mut Board, side: Stone, stop: Option<Watch>) -> bool {
        let Some(limit) = self.question_limit() else {
            self.inexact = true;
            return true;
        };
        let mut sp = ThreatSpace::new(board, side, side, Mode::Vcf, UNLIMITED, None);
        let mut dfpn = Dfpn::new(&mut self.tt, limit, stop).within(limit, self.spent);
        let status = dfpn.solve(&mut sp);
        let all = dfpn.nodes;
        drop(dfpn);
        self.charge(all, all);
        match status {
            Status::Proved => true,
            Status::Disproved => false,
            Status::Unknown => {
                self.inexact = true;
                true
            }
        }
    }
}

/// Reads the proved VCF of the current node back from the table, re-searching where an entry
/// was overwritten. Leaves the space as it found it.
pub(crate) fn vcf_line(
    dfpn: &mut Dfpn<'_, '_>,
    sp: &mut ThreatSpace,
    budget: u64,
) -> Option<VcfLine> {
    let mut line = VcfLine::default();
    let mut scratch = Vec::new();
    let mut result = None;
    for _ in 0..200 {
        scratch.clear();
        match sp.expand(&mut scratch) {
            Node::Win(_) => {
                line.fives = sp.attacker_fives();
                result = Some(());
                break;
            }
            Node::Loss => break,
            Node::And => {
                if scratch.is_empty() {
                    line.fives = sp.attacker_fives();
                    result = Some(());
                    break;
                }
                let m = scratch[0];
                line.moves.push(m);
                sp.play(m);
            }
            Node::Or => {
                let mut e = dfpn.entry(sp.key());
                if !matches!(e, Some(x) if x.pn == 0) {
                    let before = dfpn.nodes;
                    if dfpn.solve(sp) != Status::Proved || dfpn.nodes - before > budget {
                        break;
                    }
                    e = dfpn.entry(sp.key());
                }
                let Some(m) = e
                    .map(|x| x.best)
                    .filter(|&m| (m as usize) < sp.board.cell_count())
                else {
                    break;
                };
                line.moves.push(m);
                sp.play(m);
            }
        }
    }
    for &m in line.moves.iter().rev() {
        sp.undo(m);
    }
    result.map(|_| line)
}
