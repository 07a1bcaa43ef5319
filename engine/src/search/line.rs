//! Reading answers back from the table: the main line of a proved node (the attacker's
//! shortest win against the defender's longest resistance), the proof as a tree, and the main
//! line of a small board solved exactly.

use super::dfpn::{Dfpn, Node, Space, Status};
use super::exact::ExactSpace;
use super::threats::{Mode, ThreatSpace, UNLIMITED};
use super::vcf::VcfOracle;
use super::{Asking, Verdict};
use crate::board::{threat, Board};
use crate::geometry::Point;
use crate::types::Stone;

/// One attacker move of a proof and what follows it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ProofStep {
    /// The attacker's move.
    pub attack: Point,
    /// Whether the move is the five that ends the game.
    pub five: bool,
    /// Every defender reply that the search had to refute, each with the attacker's answer.
    pub replies: Vec<(Point, ProofStep)>,
    /// When replies were left out because they cannot stop it: the attacker's VCF that wins
    /// against all of them (as if the defender had passed).
    pub otherwise: Vec<Point>,
    /// Replies whose refutation could not be shown within the step budget (or, if the budget
    /// was ample, a sign of a bug): never silently dropped.
    pub unrefuted: Vec<Point>,
}

impl Asking<'_, '_> {
    /// Reads the main line of a node proved at `depth`: the attacker takes its shortest proved
    /// move, the defender the reply whose refutation is longest.
    pub(super) fn extract_line(
        &mut self,
        b: &mut Board,
        attacker: Stone,
        mode: Mode,
        depth: u16,
    ) -> Vec<u16> {
        let mut line: Vec<u16> = Vec::new();
        let node_limit = self.budget.nodes;
        let (left, base, stop) = (self.left(), self.spent, self.stop);
        let s = &mut *self.solver;
        let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
        let mut sp = ThreatSpace::new(b, attacker, attacker, mode, depth, oracle)
            .with_history(&self.history)
            .watched(stop);
        let mut dfpn = Dfpn::new(&mut s.tt, node_limit, stop).within(left, base);
        let mut moves = Vec::new();
        let mut played = 0usize;
        // The VCF questions of the expansions made here, outside the search (counted apart).
        let mut direct = 0u64;
        for _ in 0..400 {
            moves.clear();
            let used = dfpn.spent() + direct;
            sp.allow(left.saturating_sub(used), base + used);
            let node = sp.expand(&mut moves);
            direct += sp.take_spent();
            let m = match node {
                Node::Loss => break,
                Node::Win(_) => {
                    if sp.to_move() == attacker
                        && sp.board.cells_with(attacker, threat::FIVE).is_empty()
                    {
                        // A VCT node won by a VCF: append the VCF.
                        let vcf = sp.oracle_vcf();
                        direct += sp.take_spent();
                        if let Some(v) = vcf {
                            for &mv in &v.moves {
                                line.push(mv);
                                sp.play(mv);
                                played += 1;
                            }
                        }
                    }
                    finish(&mut sp, attacker, &mut line, &mut played);
                    break;
                }
                Node::Or => {
                    let mut best: Option<(u16, u16)> = None;
                    for &m in &moves {
                        if let Some(e) = dfpn.entry(sp.child_key(m)) {
                            if e.pn == 0 && best.is_none_or(|(_, d)| e.depth < d) {
                                best = Some((m, e.depth));
                            }
                        }
                    }
                    if best.is_none() {
                        for &m in &moves {
                            sp.play(m);
                            let s = dfpn.solve(&mut sp);
                            sp.undo(m);
                            if s == Status::Proved {
                                best = Some((m, 0));
                                break;
                            }
                        }
                    }
                    match best {
                        Some((m, _)) => m,
                        None => break,
                    }
                }
                Node::And => {
                    if moves.is_empty() {
                        finish(&mut sp, attacker, &mut line, &mut played);
                        break;
                    }
                    let mut best: Option<(u16, u16)> = None;
                    for &m in &moves {
                        let d = dfpn
                            .entry(sp.child_key(m))
                            .filter(|e| e.pn == 0)
                            .map_or(0, |e| e.depth);
                        if best.is_none_or(|(_, bd)| d > bd) {
                            best = Some((m, d));
                        }
                    }
                    match best {
                        Some((m, _)) => m,
                        None => break,
                    }
                }
            };
            line.push(m);
            sp.play(m);
            played += 1;
        }
        let spent = dfpn.spent() + direct;
        drop(dfpn);
        for &m in line[..played].iter().rev() {
            sp.undo(m);
        }
        drop(sp);
        self.solver.oracle.allowance = u64::MAX;
        self.spent += spent;
        line
    }

    /// The proof of a won node as a tree (bounded to `max_steps` attacker moves in all).
    pub fn proof_tree(
        &mut self,
        board: &Board,
        to_move: Stone,
        mode: Mode,
        max_steps: usize,
    ) -> Option<ProofStep> {
        let sol = self.solve(board, to_move, mode);
        if sol.verdict != Verdict::Win {
            return None;
        }
        let mut b = board.clone();
        let mut budget = max_steps;
        self.proof_step(&mut b, to_move, mode, &mut budget)
    }

    fn proof_step(
        &mut self,
        b: &mut Board,
        attacker: Stone,
        mode: Mode,
        budget: &mut usize,
    ) -> Option<ProofStep> {
        if *budget == 0 {
            return None;
        }
        *budget -= 1;
        let sol = self.solve(b, attacker, mode);
        let first = *sol.line.first()?;
        let idx = b.index(first);
        let five = b.flags_at(idx, attacker) & threat::FIVE != 0;
        let mut step = ProofStep {
            attack: first,
            five,
            replies: Vec::new(),
            otherwise: Vec::new(),
            unrefuted: Vec::new(),
        };
        if five {
            return Some(step);
        }
        b.place_at(idx, attacker);
        let defender = attacker.opponent();
        let mut replies = Vec::new();
        {
            let depth = self.solver.config.vct_depth;
            let (left, spent, stop) = (self.left(), self.spent, self.stop);
            let s = &mut *self.solver;
            let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
            let mut sp = ThreatSpace::new(b, attacker, defender, mode, depth, oracle)
                .with_history(&self.history)
                .watched(stop);
            sp.allow(left, spent);
            let node = sp.expand(&mut replies);
            let used = sp.take_spent();
            drop(sp);
            self.solver.oracle.allowance = u64::MAX;
            self.spent += used;
            if node != Node::And {
                replies.clear();
            }
        }
        if mode == Mode::Vct && b.cells_with(attacker, threat::FIVE).is_empty() {
            let mut o = VcfOracle::new(1, self.budget.vcf_question);
            o.allowance = self.left();
            o.spent = self.spent;
            let found = o.find(b, attacker, UNLIMITED, self.stop);
            self.spent += o.used;
            if let Some(v) = found {
                step.otherwise = v.moves.iter().map(|&m| b.point(m as usize)).collect();
            }
        }
        for r in replies {
            let r = r as usize;
            b.place_at(r, defender);
            if let Some(sub) = self.proof_step(b, attacker, mode, budget) {
                step.replies.push((b.point(r), sub));
            } else {
                step.unrefuted.push(b.point(r));
            }
            b.remove_at(r);
        }
        b.remove_at(idx);
        Some(step)
    }

    /// The main line and the winning first moves of a small board won by `attacker` (to move).
    pub(super) fn exact_line(
        &mut self,
        b: &mut Board,
        attacker: Stone,
    ) -> (Vec<Point>, Vec<Point>, u64) {
        let mut first_moves = Vec::new();
        let mut line = Vec::new();
        let node_limit = self.budget.nodes;
        let (left, base) = (self.left(), self.spent);
        let mut sp = ExactSpace::new(b, attacker, attacker);
        let mut dfpn = Dfpn::new(&mut self.solver.tt, node_limit, self.stop).within(left, base);
        let mut moves = Vec::new();
        // Winning first moves: every root move whose position is proved.
        sp.expand(&mut moves);
        for &m in &moves {
            sp.play(m);
            let s = dfpn.solve(&mut sp);
            sp.undo(m);
            if s == Status::Proved {
                first_moves.push(m);
            }
        }
        let mut played = 0;
        for _ in 0..400 {
            moves.clear();
            let pick = match sp.expand(&mut moves) {
                Node::Win(_) | Node::Loss => {
                    line.extend(sp.finishing_moves());
                    break;
                }
                Node::Or => moves
                    .iter()
                    .copied()
                    .filter(|&m| dfpn.entry(sp.child_key(m)).is_some_and(|e| e.pn == 0))
                    .min_by_key(|&m| dfpn.entry(sp.child_key(m)).map_or(u16::MAX, |e| e.depth)),
                Node::And => moves
                    .iter()
                    .copied()
                    .max_by_key(|&m| dfpn.entry(sp.child_key(m)).map_or(0, |e| e.depth)),
            };
            let Some(m) = pick else { break };
            line.push(m);
            sp.play(m);
            played += 1;
        }
        let nodes = dfpn.nodes;
        for &m in line[..played].iter().rev() {
            sp.undo(m);
        }
        drop(sp);
        drop(dfpn);
        self.spent += nodes;
        let to_points = |v: &[u16]| v.iter().map(|&m| b.point(m as usize)).collect::<Vec<_>>();
        (to_points(&line), to_points(&first_moves), nodes)
    }
}

/// Ends a line whose attacker has won: the defender blocks one five point if it can (or plays
/// the legal point nearest to it if it cannot), then the attacker plays the five.
fn finish(sp: &mut ThreatSpace, attacker: Stone, line: &mut Vec<u16>, played: &mut usize) {
    let fives = sp.attacker_fives();
    let Some(&first) = fives.first() else { return };
    if sp.to_move() == attacker {
        line.push(first);
        return;
    }
    let defender = attacker.opponent();
    let board = &mut *sp.board;
    // The defender blocks a five point it may legally take; if it may take none (renju black
    // facing forbidden points), it plays its legal point nearest to the first.
    let legal_block = fives.iter().copied().find(|&f| {
        board.flags_at(f as usize, defender) & threat::FIVE != 0
            || board.legal_at(f as usize, defender)
    });
    let reply = if let Some(b) = legal_block.filter(|_| fives.len() >= 2) {
        Some(b)
    } else {
        // The defender cannot block: show its nearest legal move.
        let fp = board.point(first as usize);
        // Keys: the distance, then the cell.
        let mut cands: Vec<u64> = board
            .indices()
            .filter(|&i| board.is_empty_at(i) && !fives.contains(&(i as u16)))
            .map(|i| {
                let p = board.point(i);
                let d = (p.x as i32 - fp.x as i32)
                    .unsigned_abs()
                    .max((p.y as i32 - fp.y as i32).unsigned_abs());
                u64::from(d) << 32 | i as u64
            })
            .collect();
        cands.sort_unstable();
        cands
            .into_iter()
            .map(|k| k as u32 as usize)
            .find(|&i| board.legal_at(i, defender))
            .map(|i| i as u16)
    };
    let Some(r) = reply else { return };
    line.push(r);
    sp.play(r);
    *played += 1;
    let five = sp.attacker_fives().into_iter().next();
    if let Some(f) = five {
        line.push(f);
    }
}
