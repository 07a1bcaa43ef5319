//! Forcing-line search: VCF, VCT, defences and exact solving of small boards.
//!
//! One proof-number core ([`dfpn`]) is driven by move generators ([`threats`] for VCF and VCT,
//! `exact` for small m,n,k boards). A [`Solver`] owns the bounded tables and answers the
//! questions the rest of Fivefold asks:
//! * [`Solver::solve`]: does the side to move win by VCF (or VCT), and the shortest main line;
//! * [`Solver::wins_after`]: after a move, does the attacker still have a forced win (grading);
//! * [`Solver::winning_moves`]: every winning first move;
//! * [`Solver::defences`]: every move that stops the opponent's forced win;
//! * [`Solver::proof_tree`]: the proof with every searched defender reply and its refutation;
//! * [`Solver::exact`]: the game-theoretic value of a small m,n,k board.
//!
//! Results are [`Verdict::Win`] (proved), [`Verdict::NoWin`] (disproved within the class) or
//! [`Verdict::Unknown`] (a budget ran out), never a guess. Under a node budget every answer is
//! deterministic.

pub mod dfpn;
mod exact;
pub mod threats;
pub mod tt;

use crate::board::{threat, Board, Stone};
use crate::geometry::Point;
use dfpn::{Dfpn, Node, Space, Status};
use exact::ExactSpace;
use threats::{defence_candidates, ThreatSpace, VcfOracle};
pub use threats::{Mode, VcfLine, UNLIMITED};
use tt::Table;

/// The longest line, in attacker moves, that iterative deepening looks for.
const MAX_LINE: u16 = 60;

/// Limits and memory of a [`Solver`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SolverConfig {
    /// Memory of the main table, in megabytes.
    pub table_megabytes: usize,
    /// Memory of the table for VCF questions asked inside a VCT, in megabytes.
    pub vcf_table_megabytes: usize,
    /// Nodes one search may expand (the VCF questions inside a VCT are counted apart).
    pub node_limit: u64,
    /// Nodes one VCF question inside a VCT may expand.
    pub vcf_node_limit: u64,
    /// The most threats (attacker moves that are not fours) a VCT may use.
    pub vct_depth: u16,
    /// Nodes all the VCF questions inside one VCT search may expand together; past it every
    /// further question counts as unknown (so the search ends soon, as `Unknown` unless it
    /// was already proved). `None`: only the per-question limit applies. This bounds the
    /// time of one question, which the node limit alone does not.
    pub vcf_spend_limit: Option<u64>,
}

impl Default for SolverConfig {
    /// 24 + 8 = 32 MB of tables, a million nodes per search.
    fn default() -> Self {
        SolverConfig {
            table_megabytes: 24,
            vcf_table_megabytes: 8,
            node_limit: 1_000_000,
            vcf_node_limit: 100_000,
            vct_depth: 6,
            vcf_spend_limit: None,
        }
    }
}

/// The answer to "does the attacker win?".
#[derive(Clone, Copy, PartialEq, Eq, Debug, Hash)]
pub enum Verdict {
    /// Proved.
    Win,
    /// Proved that there is no win within the search class.
    NoWin,
    /// A budget ran out before either could be proved.
    Unknown,
}

impl Verdict {
    /// `"win"`, `"no-win"` or `"unknown"`.
    pub const fn name(self) -> &'static str {
        match self {
            Verdict::Win => "win",
            Verdict::NoWin => "no-win",
            Verdict::Unknown => "unknown",
        }
    }
}

/// A solved position.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Solution {
    /// Whether the side to move wins.
    pub verdict: Verdict,
    /// The shortest main line when it wins: attacker and defender moves alternating, ending
    /// with the attacker's five.
    pub line: Vec<Point>,
    /// The length of the win in the search's own measure: for a VCF the fours before the five,
    /// for a VCT the threats that are not fours (0 when there is no win).
    pub depth: u16,
    /// Nodes searched, the VCF questions of a VCT included.
    pub nodes: u64,
}

impl Solution {
    fn without_win(verdict: Verdict, nodes: u64) -> Solution {
        Solution {
            verdict,
            line: Vec::new(),
            depth: 0,
            nodes,
        }
    }

    /// Attacker moves in the main line, the five included.
    pub fn attacker_moves(&self) -> usize {
        self.line.len().div_ceil(2)
    }
}

/// Moves sorted by what the search could prove about them.
#[derive(Clone, Debug, PartialEq, Eq, Default)]
pub struct MoveSets {
    /// Proved to do what was asked (win, or defend).
    pub proved: Vec<Point>,
    /// The search ran out of budget on these.
    pub unknown: Vec<Point>,
    /// How many candidate moves were tried.
    pub tried: usize,
    /// Nodes searched.
    pub nodes: u64,
}

/// The defences of a position against the opponent's threat.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Defences {
    /// Whether the opponent would win if the defender passed (if not, every move defends and
    /// `moves` is empty).
    pub threat: Verdict,
    /// The defences proved, and the moves whose status is unknown.
    pub moves: MoveSets,
}

/// The value of a small board for the side to move, by exact solving.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum ExactValue {
    /// The side to move wins.
    Win,
    /// Neither side can force a win.
    Draw,
    /// The side to move loses.
    Loss,
    /// A budget ran out.
    Unknown,
}

impl ExactValue {
    /// `"win"`, `"draw"`, `"loss"` or `"unknown"`.
    pub const fn name(self) -> &'static str {
        match self {
            ExactValue::Win => "win",
            ExactValue::Draw => "draw",
            ExactValue::Loss => "loss",
            ExactValue::Unknown => "unknown",
        }
    }
}

/// A solved small board.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ExactSolution {
    /// The value for the side to move.
    pub value: ExactValue,
    /// When the side to move wins: a main line ending with the winning move.
    pub line: Vec<Point>,
    /// When the side to move wins: every winning first move.
    pub first_moves: Vec<Point>,
    /// Nodes searched.
    pub nodes: u64,
}

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

/// A stop signal polled during long searches: return `true` to stop.
pub type Stop<'a> = Option<&'a mut dyn FnMut() -> bool>;

/// Owns the tables and answers forcing-line questions.
pub struct Solver {
    tt: Table,
    oracle: VcfOracle,
    config: SolverConfig,
    /// The moves since the start of the line being asked about (see [`Solver::set_history`]).
    history: Vec<(Point, Stone, bool)>,
}

impl Default for Solver {
    fn default() -> Self {
        Solver::new(SolverConfig::default())
    }
}

impl Solver {
    /// A solver with the given limits; the tables are allocated here, once.
    pub fn new(config: SolverConfig) -> Solver {
        Solver {
            tt: Table::with_megabytes(config.table_megabytes),
            oracle: VcfOracle::new(config.vcf_table_megabytes, config.vcf_node_limit),
            config,
            history: Vec::new(),
        }
    }

    /// Tells later questions which moves led from `start` to the position they are asked
    /// about (colours included, in order): a VCT's dependency rule looks back at the
    /// attacker's last threats, so a grader asking in the middle of a puzzle's line must pass
    /// the line so far to search the same class of lines the proof from the start did. Every
    /// result stays sound either way; only which lines count as inside the class changes.
    /// An empty list (the default) starts the class afresh at each question.
    pub fn set_history(&mut self, start: &Board, moves: &[(Point, Stone)]) {
        let mut b = start.clone();
        self.history.clear();
        for &(p, c) in moves {
            if !b.contains(p) || b.get(p).is_some() {
                break;
            }
            let forced = !b.cells_with(c.opponent(), threat::FIVE).is_empty();
            self.history.push((p, c, !forced));
            b.place(p, c);
        }
    }

    /// The limits in use.
    pub fn config(&self) -> &SolverConfig {
        &self.config
    }

    /// Changes the node limit of later searches.
    pub fn set_node_limit(&mut self, nodes: u64) {
        self.config.node_limit = nodes;
    }

    /// Changes the VCF spending limit of later searches (see [`SolverConfig::vcf_spend_limit`]).
    pub fn set_vcf_spend_limit(&mut self, nodes: Option<u64>) {
        self.config.vcf_spend_limit = nodes;
    }

    /// Memory of the tables in bytes.
    pub fn table_bytes(&self) -> usize {
        self.tt.bytes()
    }

    /// Forgets every stored result.
    pub fn clear(&mut self) {
        self.tt.clear();
        self.oracle.clear();
    }

    fn depth_for(&self, mode: Mode) -> u16 {
        match mode {
            Mode::Vcf => UNLIMITED,
            Mode::Vct => self.config.vct_depth,
        }
    }

    /// Runs one proof-number search from the given node. Returns the status and the nodes used.
    fn run(
        &mut self,
        board: &mut Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        depth: u16,
        stop: Stop,
    ) -> (Status, u64) {
        self.oracle.inexact = false;
        let before = self.oracle.nodes;
        self.oracle.spend_limit = self
            .config
            .vcf_spend_limit
            .map_or(u64::MAX, |l| before.saturating_add(l));
        let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
        let mut sp = ThreatSpace::new(board, attacker, to_move, mode, depth, oracle)
            .with_history(&self.history);
        let mut dfpn = Dfpn::new(&mut self.tt, self.config.node_limit, stop);
        let mut status = dfpn.solve(&mut sp);
        let nodes = dfpn.nodes + self.oracle.nodes - before;
        self.oracle.spend_limit = u64::MAX;
        if self.oracle.inexact {
            // Some VCF question ran out of nodes and was taken as "no": a disproof built on it is
            // not a proof, and the stored results that depend on it must not be reused.
            if status == Status::Disproved {
                status = Status::Unknown;
            }
            self.clear();
        }
        (status, nodes)
    }

    /// Does `to_move` win by forcing moves of `mode`? With the shortest main line when it does.
    pub fn solve(&mut self, board: &Board, to_move: Stone, mode: Mode, mut stop: Stop) -> Solution {
        let mut b = board.clone();
        let depth = self.depth_for(mode);
        let limit = self.config.node_limit;
        let mut nodes = 0;
        let found = match mode {
            Mode::Vcf => {
                // VCF trees are narrow: prove first, then deepen up to the proof's length.
                let (status, n) = self.run(&mut b, to_move, to_move, mode, depth, stop);
                nodes += n;
                if status != Status::Proved {
                    return Solution::without_win(verdict(status), nodes);
                }
                let upper = self.stored_depth(&b, to_move, to_move, mode, depth);
                let mut found = depth;
                for d in 0..=upper.min(MAX_LINE) {
                    let (s, n) = self.run(&mut b, to_move, to_move, mode, d, None);
                    nodes += n;
                    if s == Status::Proved {
                        found = d;
                        break;
                    }
                }
                found
            }
            Mode::Vct => {
                // VCT trees are wide and the full-depth search is the dearest: deepen from the
                // start, one threat at a time, within one node budget for all depths.
                let mut found = None;
                let mut unknown = false;
                for d in 0..=depth {
                    if nodes >= limit {
                        unknown = true;
                        break;
                    }
                    self.config.node_limit = limit - nodes;
                    let again = stop.as_mut().map(|f| &mut **f as &mut dyn FnMut() -> bool);
                    let (s, n) = self.run(&mut b, to_move, to_move, mode, d, again);
                    nodes += n;
                    match s {
                        Status::Proved => {
                            found = Some(d);
                            break;
                        }
                        Status::Unknown => {
                            unknown = true;
                            break;
                        }
                        Status::Disproved => {}
                    }
                }
                self.config.node_limit = limit;
                match found {
                    Some(d) => d,
                    None => {
                        let v = if unknown {
                            Verdict::Unknown
                        } else {
                            Verdict::NoWin
                        };
                        return Solution::without_win(v, nodes);
                    }
                }
            }
        };
        // Reading the line back may search again; an answer that ran out of nodes there must
        // not stay in the tables.
        self.oracle.inexact = false;
        let line = self.extract_line(&mut b, to_move, mode, found);
        if self.oracle.inexact {
            self.clear();
        }
        let line: Vec<Point> = line.iter().map(|&m| b.point(m as usize)).collect();
        let depth = if found == UNLIMITED {
            (line.len().div_ceil(2) as u16).saturating_sub(1)
        } else {
            found
        };
        Solution {
            verdict: Verdict::Win,
            line,
            depth,
            nodes,
        }
    }

    /// The stored proof length (attacker moves before the five) of a proved node, as an upper
    /// bound for iterative deepening.
    fn stored_depth(
        &self,
        b: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        depth: u16,
    ) -> u16 {
        let key = b.hash()
            ^ threats::salt(mode, attacker, b.rule(), b.width(), b.height())
            ^ threats::side_key(to_move)
            ^ threats::depth_key(depth);
        self.tt
            .get(key)
            .filter(|e| e.pn == 0)
            .map_or(UNLIMITED, |e| e.depth.saturating_sub(1).max(1))
    }

    /// After the side `to_move` has played, does `attacker` still win? `to_move` is the side to
    /// move now: the defender when grading an attacker's move, the attacker when grading a
    /// defence.
    pub fn wins_after(
        &mut self,
        board: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        stop: Stop,
    ) -> (Verdict, u64) {
        let mut b = board.clone();
        let depth = self.depth_for(mode);
        let (s, n) = self.run(&mut b, attacker, to_move, mode, depth, stop);
        (verdict(s), n)
    }

    /// The fewest attacker moves before the five with which `attacker` wins from this node
    /// (`to_move` to play), trying depths up to `max`. `None` if no win within `max`.
    pub fn shortest_win(
        &mut self,
        board: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        max: u16,
    ) -> Option<u16> {
        let mut b = board.clone();
        (0..=max).find(|&d| self.run(&mut b, attacker, to_move, mode, d, None).0 == Status::Proved)
    }

    /// Every first move with which `to_move` wins by `mode`, among the moves of that class.
    pub fn winning_moves(&mut self, board: &Board, to_move: Stone, mode: Mode) -> MoveSets {
        self.winning_moves_impl(board, to_move, mode, usize::MAX, false)
    }

    /// [`Solver::winning_moves`] for a caller that only wants positions with few answers, all
    /// proved: stops as soon as more than `limit` winning moves are proved (then `proved`
    /// holds `limit + 1` of them) or one move's status is unknown; the moves after that are
    /// not tried.
    pub fn winning_moves_up_to(
        &mut self,
        board: &Board,
        to_move: Stone,
        mode: Mode,
        limit: usize,
    ) -> MoveSets {
        self.winning_moves_impl(board, to_move, mode, limit, true)
    }

    fn winning_moves_impl(
        &mut self,
        board: &Board,
        to_move: Stone,
        mode: Mode,
        limit: usize,
        stop_on_unknown: bool,
    ) -> MoveSets {
        let mut b = board.clone();
        let mut out = MoveSets::default();
        let fives: Vec<usize> = b.cells_with(to_move, threat::FIVE).iter().collect();
        if !fives.is_empty() {
            out.proved = fives.iter().map(|&i| b.point(i)).collect();
            return out;
        }
        let mut cands = Vec::new();
        {
            let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
            let mut sp = ThreatSpace::new(&mut b, to_move, to_move, mode, UNLIMITED, oracle)
                .with_history(&self.history);
            let dfives = *sp.board.cells_with(to_move.opponent(), threat::FIVE);
            match dfives.len() {
                0 => sp.attacker_moves(&mut cands),
                1 => {
                    let blk = dfives.first().unwrap_or(0);
                    if sp.board.legal_at(blk, to_move) {
                        cands.push(blk as u16);
                    }
                }
                _ => {}
            }
        }
        let depth = self.depth_for(mode);
        let forced = !b.cells_with(to_move.opponent(), threat::FIVE).is_empty();
        out.tried = cands.len();
        for m in cands {
            let m = m as usize;
            if out.proved.len() > limit || (stop_on_unknown && !out.unknown.is_empty()) {
                break;
            }
            // The depth the search itself gives the child: fours and forced blocks are free in
            // a VCT, every move counts in a depth-limited VCF.
            let four = b.flags_at(m, to_move) & threat::FOUR != 0;
            let child_depth = if depth == UNLIMITED || (mode == Mode::Vct && (four || forced)) {
                depth
            } else {
                depth.saturating_sub(1)
            };
            // The first move is part of the line, as it is when `solve` plays it from here and
            // when a grader asks after it: the dependency rule of the next threats sees it.
            self.history.push((b.point(m), to_move, !forced));
            b.place_at(m, to_move);
            let (s, n) = self.run(&mut b, to_move, to_move.opponent(), mode, child_depth, None);
            b.remove_at(m);
            self.history.pop();
            out.nodes += n;
            match s {
                Status::Proved => out.proved.push(b.point(m)),
                Status::Unknown => out.unknown.push(b.point(m)),
                Status::Disproved => {}
            }
        }
        out
    }

    /// The opponent's forced win if `defender` (to move) passed, as a main line; empty if the
    /// opponent has none.
    pub fn threat(&mut self, board: &Board, defender: Stone, mode: Mode) -> Solution {
        self.solve(board, defender.opponent(), mode, None)
    }

    /// Every move for `defender` (to move) after which the opponent has no forced win by
    /// `mode`, counter-fours included when they work.
    pub fn defences(&mut self, board: &Board, defender: Stone, mode: Mode) -> Defences {
        self.defences_impl(board, defender, mode, usize::MAX, false)
    }

    /// [`Solver::defences`] for a caller that only wants positions with few defences, all
    /// proved: stops as soon as more than `limit` defences are proved or one move's status is
    /// unknown (then the lists are partial and `moves.tried` counts the moves tried so far).
    pub fn defences_up_to(
        &mut self,
        board: &Board,
        defender: Stone,
        mode: Mode,
        limit: usize,
    ) -> Defences {
        self.defences_impl(board, defender, mode, limit, true)
    }

    fn defences_impl(
        &mut self,
        board: &Board,
        defender: Stone,
        mode: Mode,
        limit: usize,
        stop_on_unknown: bool,
    ) -> Defences {
        let attacker = defender.opponent();
        let mut b = board.clone();
        let mut out = Defences {
            threat: Verdict::Win,
            moves: MoveSets::default(),
        };
        // The threat the defence must stop. Any defence against a VCT also stops the
        // opponent's VCF when there is one, so the VCF's candidate set is complete.
        self.oracle.inexact = false;
        let vcf = self.oracle.find(&mut b, attacker, UNLIMITED);
        if vcf.is_none() && self.oracle.inexact {
            // The VCF question ran out of nodes: without its answer the candidate set below
            // would rest on the practical bound, so say "unknown" instead.
            out.threat = Verdict::Unknown;
            return out;
        }
        let cands: Vec<u16> = match vcf {
            Some(line) => defence_candidates(&mut b, attacker, &line),
            None => {
                let threat = self.solve(&b, attacker, mode, None);
                out.moves.nodes += threat.nodes;
                out.threat = threat.verdict;
                if threat.verdict != Verdict::Win {
                    return out;
                }
                near_line(&b, attacker.opponent(), &threat.line)
            }
        };
        let mut seen = vec![false; b.cell_count()];
        let depth = self.depth_for(mode);
        for m in cands {
            let m = m as usize;
            if out.moves.proved.len() > limit || (stop_on_unknown && !out.moves.unknown.is_empty())
            {
                break;
            }
            if seen[m] || !b.is_empty_at(m) {
                continue;
            }
            seen[m] = true;
            out.moves.tried += 1;
            // A defender five wins outright.
            let five = b.flags_at(m, defender) & threat::FIVE != 0;
            if five {
                out.moves.proved.push(b.point(m));
                continue;
            }
            if !b.legal_at(m, defender) {
                continue;
            }
            b.place_at(m, defender);
            let (s, n) = self.run(&mut b, attacker, attacker, mode, depth, None);
            b.remove_at(m);
            out.moves.nodes += n;
            match s {
                Status::Disproved => out.moves.proved.push(b.point(m)),
                Status::Unknown => out.moves.unknown.push(b.point(m)),
                Status::Proved => {}
            }
        }
        out.moves.proved.sort_by_key(|p| (p.x, p.y));
        out.moves.unknown.sort_by_key(|p| (p.x, p.y));
        out
    }

    /// The replies the search considers for the defender (to move) against `attacker`'s
    /// threat: the forced block of a four, or the defence set of a VCT node. Empty when the
    /// attacker has no threat (or has already won).
    pub fn defender_replies(&mut self, board: &Board, attacker: Stone, mode: Mode) -> Vec<Point> {
        let mut b = board.clone();
        let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
        let mut sp = ThreatSpace::new(
            &mut b,
            attacker,
            attacker.opponent(),
            mode,
            self.config.vct_depth,
            oracle,
        )
        .with_history(&self.history);
        let mut replies = Vec::new();
        let node = sp.expand(&mut replies);
        drop(sp);
        if node != Node::And {
            return Vec::new();
        }
        replies.into_iter().map(|m| b.point(m as usize)).collect()
    }

    /// How much room the defender has along a main line (attacker first): at each defender
    /// turn, the replies the search had to consider beyond the first, plus one for every
    /// defender move that makes a four of its own.
    pub fn line_branching(
        &mut self,
        board: &Board,
        attacker: Stone,
        mode: Mode,
        line: &[Point],
    ) -> u32 {
        let mut b = board.clone();
        let defender = attacker.opponent();
        let mut total = 0;
        for (i, &p) in line.iter().enumerate() {
            let idx = b.index(p);
            if !b.is_empty_at(idx) {
                break;
            }
            let side = if i % 2 == 0 { attacker } else { defender };
            if side == defender {
                if b.flags_at(idx, defender) & threat::FOUR != 0 {
                    total += 1;
                }
                let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
                let mut sp = ThreatSpace::new(
                    &mut b,
                    attacker,
                    defender,
                    mode,
                    self.config.vct_depth,
                    oracle,
                )
                .with_history(&self.history);
                let mut replies = Vec::new();
                if sp.expand(&mut replies) == Node::And {
                    total += replies.len().saturating_sub(1) as u32;
                }
            }
            b.place_at(idx, side);
        }
        total
    }

    /// Reads the main line of a node proved at `depth`: the attacker takes its shortest proved
    /// move, the defender the reply whose refutation is longest.
    fn extract_line(&mut self, b: &mut Board, attacker: Stone, mode: Mode, depth: u16) -> Vec<u16> {
        let mut line: Vec<u16> = Vec::new();
        let node_limit = self.config.node_limit;
        let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
        let mut sp = ThreatSpace::new(b, attacker, attacker, mode, depth, oracle)
            .with_history(&self.history);
        let mut dfpn = Dfpn::new(&mut self.tt, node_limit, None);
        let mut moves = Vec::new();
        let mut played = 0usize;
        for _ in 0..400 {
            moves.clear();
            let node = sp.expand(&mut moves);
            let m = match node {
                Node::Loss => break,
                Node::Win(_) => {
                    if sp.to_move() == attacker
                        && sp.board.cells_with(attacker, threat::FIVE).is_empty()
                    {
                        // A VCT node won by a VCF: append the VCF.
                        if let Some(v) = sp.oracle_vcf() {
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
        for &m in line[..played].iter().rev() {
            sp.undo(m);
        }
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
        let sol = self.solve(board, to_move, mode, None);
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
        let sol = self.solve(b, attacker, mode, None);
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
            let oracle = (mode == Mode::Vct).then_some(&mut self.oracle);
            let mut sp =
                ThreatSpace::new(b, attacker, defender, mode, self.config.vct_depth, oracle)
                    .with_history(&self.history);
            let node = sp.expand(&mut replies);
            if let Node::And = node {
            } else {
                replies.clear();
            }
        }
        if mode == Mode::Vct && b.cells_with(attacker, threat::FIVE).is_empty() {
            let mut o = VcfOracle::new(1, self.config.vcf_node_limit);
            if let Some(v) = o.find(b, attacker, UNLIMITED) {
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

    /// Solves a small m,n,k board exactly for the side to move (all moves, both sides).
    pub fn exact(&mut self, board: &Board, to_move: Stone, stop: Stop) -> ExactSolution {
        let mut b = board.clone();
        let mut nodes = 0;
        let (first, n) = self.run_exact(&mut b, to_move, to_move, stop);
        nodes += n;
        let mut out = ExactSolution {
            value: ExactValue::Unknown,
            line: Vec::new(),
            first_moves: Vec::new(),
            nodes,
        };
        match first {
            Status::Proved => {
                out.value = ExactValue::Win;
                let (line, first_moves, n) = self.exact_line(&mut b, to_move);
                out.line = line;
                out.first_moves = first_moves;
                nodes += n;
            }
            Status::Unknown => {}
            Status::Disproved => {
                let (second, n) = self.run_exact(&mut b, to_move.opponent(), to_move, None);
                nodes += n;
                out.value = match second {
                    Status::Proved => ExactValue::Loss,
                    Status::Disproved => ExactValue::Draw,
                    Status::Unknown => ExactValue::Unknown,
                };
            }
        }
        out.nodes = nodes;
        out
    }

    fn run_exact(
        &mut self,
        b: &mut Board,
        attacker: Stone,
        to_move: Stone,
        stop: Stop,
    ) -> (Status, u64) {
        let mut sp = ExactSpace::new(b, attacker, to_move);
        let mut dfpn = Dfpn::new(&mut self.tt, self.config.node_limit, stop);
        let s = dfpn.solve(&mut sp);
        (s, dfpn.nodes)
    }

    /// The main line and the winning first moves of a small board won by `attacker` (to move).
    fn exact_line(&mut self, b: &mut Board, attacker: Stone) -> (Vec<Point>, Vec<Point>, u64) {
        let mut first_moves = Vec::new();
        let mut line = Vec::new();
        let node_limit = self.config.node_limit;
        let mut sp = ExactSpace::new(b, attacker, attacker);
        let mut dfpn = Dfpn::new(&mut self.tt, node_limit, None);
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
        let mut cands: Vec<(u32, usize)> = board
            .indices()
            .filter(|&i| board.is_empty_at(i) && !fives.contains(&(i as u16)))
            .map(|i| {
                let p = board.point(i);
                let d = (p.x as i32 - fp.x as i32)
                    .unsigned_abs()
                    .max((p.y as i32 - fp.y as i32).unsigned_abs());
                (d, i)
            })
            .collect();
        cands.sort();
        cands
            .into_iter()
            .find(|&(_, i)| board.legal_at(i, defender))
            .map(|(_, i)| i as u16)
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

/// Where a defence against a VCT (with no VCF behind it) can be: the defender's fours, and the
/// empty points within three points (king moves) of the threat's main line. A quiet defence has
/// to interfere with the attacker's winning structure, which the main line and its neighbours
/// cover; this is a practical bound, not a proof, and the documentation says so.
fn near_line(b: &Board, defender: Stone, line: &[Point]) -> Vec<u16> {
    let mut out: Vec<u16> = b
        .cells_with(defender, threat::FOUR)
        .iter()
        .map(|c| c as u16)
        .collect();
    for i in b.indices() {
        if !b.is_empty_at(i) || out.contains(&(i as u16)) {
            continue;
        }
        let p = b.point(i);
        let near = line
            .iter()
            .any(|q| (p.x as i32 - q.x as i32).abs() <= 3 && (p.y as i32 - q.y as i32).abs() <= 3);
        if near {
            out.push(i as u16);
        }
    }
    out
}

fn verdict(s: Status) -> Verdict {
    match s {
        Status::Proved => Verdict::Win,
        Status::Disproved => Verdict::NoWin,
        Status::Unknown => Verdict::Unknown,
    }
}
