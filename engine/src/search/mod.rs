//! Forcing-line search: VCF, VCT, defences and exact solving of small boards.
//!
//! One proof-number core ([`dfpn`]) is driven by move generators ([`threats`] for VCF and VCT,
//! `exact` for small m,n,k boards). A [`Solver`] owns the bounded tables; a question to it is a
//! value: [`Solver::ask`] takes the question's [`Budget`], [`Asking::after`] the moves that led
//! to the position (a VCT's dependency rule looks back at them) and [`Asking::watch`] a stop
//! check, and the [`Asking`] answers:
//! * [`Asking::solve`]: does the side to move win by VCF (or VCT), and the shortest main line;
//! * [`Asking::wins_after`]: after a move, does the attacker still have a forced win (grading);
//! * [`Asking::winning_moves`]: every winning first move;
//! * [`Asking::defences`]: every move that stops the opponent's forced win;
//! * [`Asking::proof_tree`]: the proof with every searched defender reply and its refutation;
//! * [`Asking::exact`]: the game-theoretic value of a small m,n,k board.
//!
//! Nothing a question sets outlives it, so no caller saves and restores solver settings.
//! Results are [`Verdict::Win`] (proved), [`Verdict::NoWin`] (disproved within the class) or
//! [`Verdict::Unknown`] (a budget ran out), never a guess. Under a node budget every answer is
//! deterministic.
//!
//! The module is split along its seams: [`budget`] (named budgets), [`threats`] (the VCF and
//! VCT generators), `vcf` (the VCF oracle a VCT asks), `defence` (the defender's replies and
//! their soundness argument), `line` (main lines and proof trees read back from the table),
//! `exact` (small boards), [`dfpn`] and [`tt`] (the core and its table).

pub mod budget;
mod defence;
pub mod dfpn;
mod exact;
mod line;
pub mod threats;
pub mod tt;
mod vcf;

use crate::board::{threat, Board};
use crate::geometry::Point;
use crate::types::Stone;
pub use budget::Budget;
use defence::defence_candidates;
use dfpn::{Dfpn, Node, Space, Status, Watch};
use exact::ExactSpace;
pub use line::ProofStep;
use threats::ThreatSpace;
pub use threats::{Mode, UNLIMITED};
use tt::Table;
pub use vcf::VcfLine;
use vcf::VcfOracle;

/// The longest line, in attacker moves, that iterative deepening looks for.
const MAX_LINE: u16 = 60;

/// Memory of a [`Solver`] and the class of lines a VCT searches. Node limits are not here:
/// each question carries its own [`Budget`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SolverConfig {
    /// Memory of the main table, in megabytes.
    pub table_megabytes: usize,
    /// Memory of the table for VCF questions asked inside a VCT, in megabytes.
    pub vcf_table_megabytes: usize,
    /// The most threats (attacker moves that are not fours) a VCT may use.
    pub vct_depth: u16,
}

impl Default for SolverConfig {
    /// 24 + 8 = 32 MB of tables, up to six threats in a VCT.
    fn default() -> Self {
        SolverConfig {
            table_megabytes: 24,
            vcf_table_megabytes: 8,
            vct_depth: 6,
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
    /// Whether the moves tried are every move that could defend: true against a threat with a
    /// VCF behind it (see `defence.rs`); against a VCT with no VCF behind it the candidates
    /// are the defender's fours and the points near the threat's main line, a practical bound,
    /// and a defence elsewhere cannot be ruled out.
    pub complete: bool,
    /// Whether every candidate was tried: false when a question that stops early
    /// ([`Asking::defences_up_to`], [`Asking::first_defence`]) stopped before the last one, so
    /// that `moves` may miss defences.
    pub every: bool,
    /// The threat as a main line (opponent first, ending with its five) when there is one:
    /// the opponent's shortest VCF if it has one, else its shortest VCT.
    pub line: Vec<Point>,
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

/// Owns the tables; questions are asked through [`Solver::ask`].
pub struct Solver {
    tt: Table,
    oracle: VcfOracle,
    config: SolverConfig,
    /// Nodes every question still may spend together, inside [`Solver::within`]; `None`
    /// outside it (each question has only its own budget).
    allowance: Option<u64>,
}

impl Default for Solver {
    fn default() -> Self {
        Solver::new(SolverConfig::default())
    }
}

impl Solver {
    /// A solver with the given tables and class; the tables are allocated here, once.
    pub fn new(config: SolverConfig) -> Solver {
        Solver {
            tt: Table::with_megabytes(config.table_megabytes),
            oracle: VcfOracle::new(
                config.vcf_table_megabytes,
                Budget::VERIFICATION.vcf_question,
            ),
            config,
            allowance: None,
        }
    }

    /// Runs `f` with at most `nodes` nodes for all the questions it asks together, each
    /// question's own budget still applying: a caller that asks several questions about one
    /// thing (a grade: does the win hold, and if not, which reply refutes it) stays within
    /// one total. A question that finds the allowance spent ends as `Unknown`, as it would at
    /// its own budget. Returns `f`'s answer and the nodes spent. Nested calls never give
    /// more than the outer one has left.
    pub fn within<T>(&mut self, nodes: u64, f: impl FnOnce(&mut Solver) -> T) -> (T, u64) {
        let outer = self.allowance;
        let given = outer.map_or(nodes, |o| o.min(nodes));
        self.allowance = Some(given);
        let out = f(self);
        let spent = given - self.allowance.unwrap_or(0);
        self.allowance = outer.map(|o| o.saturating_sub(spent));
        (out, spent)
    }

    /// The tables and class in use.
    pub fn config(&self) -> &SolverConfig {
        &self.config
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

    /// Starts a question with the given budget, asked afresh (no moves before it) and with no
    /// stop check; see [`Asking::after`] and [`Asking::watch`].
    pub fn ask<'w>(&mut self, budget: Budget) -> Asking<'_, 'w> {
        self.oracle.node_limit = budget.vcf_question;
        Asking {
            solver: self,
            budget,
            history: Vec::new(),
            stop: None,
            spent: 0,
            limit: budget.total,
            inside: false,
        }
    }
}

/// A question's stop check, polled during its searches with the nodes spent so far: return
/// `true` to stop (see [`dfpn::Watch`]).
pub type StopCheck<'w> = Watch<'w>;

/// Questions asked with one budget, about positions reached by one line. Each call is one
/// question with the whole budget; nothing it sets outlives it.
pub struct Asking<'s, 'w> {
    solver: &'s mut Solver,
    budget: Budget,
    /// The moves since the start of the line being asked about, each with its colour and
    /// whether it was a threat (not the forced block of a four).
    history: Vec<(Point, Stone, bool)>,
    stop: Option<StopCheck<'w>>,
    /// Nodes the current question has spent, sub-searches included.
    spent: u64,
    /// Nodes the current question may spend in all: the budget's total, or less inside
    /// [`Solver::within`].
    limit: u64,
    /// Whether a question is under way (an inner call is part of it, not a new one).
    inside: bool,
}

impl<'s, 'w> Asking<'s, 'w> {
    /// Says which moves led from `start` to the positions asked about (colours included, in
    /// order): a VCT's dependency rule looks back at the attacker's last threats, so a grader
    /// asking in the middle of a puzzle's line must pass the line so far to search the same
    /// class of lines the proof from the start did. Every result stays sound either way; only
    /// which lines count as inside the class changes. Moves that do not fit the board are
    /// ignored from the first one on.
    pub fn after(mut self, start: &Board, moves: &[(Point, Stone)]) -> Self {
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
        self
    }

    /// Polls `stop` during every search of these questions, sub-searches included, with the
    /// nodes the question has spent so far; when it returns `true` the question ends as
    /// `Unknown` (or, for a list of moves, with the rest undecided).
    pub fn watch<'v>(self, stop: StopCheck<'v>) -> Asking<'s, 'v> {
        Asking {
            solver: self.solver,
            budget: self.budget,
            history: self.history,
            stop: Some(stop),
            spent: self.spent,
            limit: self.limit,
            inside: self.inside,
        }
    }

    /// The budget of these questions.
    pub fn budget(&self) -> Budget {
        self.budget
    }

    /// Asks `f`'s questions with another budget, then goes back to this one. Each question
    /// asked in `f` takes the other budget's limits, but for the node limit of one VCF
    /// question inside a VCT, which stays the one the solver was asked with
    /// ([`Solver::ask`]); called inside a question, the question's total stays too.
    pub fn with_budget<T>(&mut self, budget: Budget, f: impl FnOnce(&mut Self) -> T) -> T {
        let saved = std::mem::replace(&mut self.budget, budget);
        let out = f(self);
        self.budget = saved;
        out
    }

    /// The tables and class of the solver asked.
    pub fn config(&self) -> &SolverConfig {
        &self.solver.config
    }

    fn depth_for(&self, mode: Mode) -> u16 {
        match mode {
            Mode::Vcf => UNLIMITED,
            Mode::Vct => self.solver.config.vct_depth,
        }
    }

    /// Does `to_move` win by forcing moves of `mode`? With the shortest main line when it does.
    pub fn solve(&mut self, board: &Board, to_move: Stone, mode: Mode) -> Solution {
        self.question(|q| q.solve_q(board, to_move, mode))
    }

    /// After the side `to_move` has played, does `attacker` still have a forced win? `to_move`
    /// is the side to move now: the defender when grading an attacker's move, the attacker
    /// when grading a defence.
    pub fn wins_after(
        &mut self,
        board: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
    ) -> (Verdict, u64) {
        self.question(|q| q.wins_after_q(board, attacker, to_move, mode))
    }

    /// [`Asking::wins_after`] with the defender to move, and, when the attacker has no win,
    /// the defender's reply the disproof found: a move after which the attacker has no win in
    /// this class (read from the table: the disproved child of the defender's node). `None`
    /// for the reply when the defender's node needed no reply (the attacker's last move made
    /// no threat, or the defender wins with fours of its own) or the entry was overwritten.
    pub fn refutation(
        &mut self,
        board: &Board,
        attacker: Stone,
        mode: Mode,
    ) -> (Verdict, Option<Point>) {
        self.question(|q| q.refutation_q(board, attacker, mode))
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
        self.question(|q| q.shortest_win_q(board, attacker, to_move, mode, max))
    }

    /// Whether `attacker`, to move, wins within `depth` in the class's own measure (fours
    /// before the five for a VCF; threats that are not fours for a VCT, the moves so far
    /// counting as [`Asking::after`] says). `NoWin` proves that no line that short exists.
    pub fn wins_within(
        &mut self,
        board: &Board,
        attacker: Stone,
        mode: Mode,
        depth: u16,
    ) -> Verdict {
        self.question(|q| {
            let mut b = board.clone();
            let limit = q.budget.nodes;
            let depth = depth.min(q.depth_for(mode));
            verdict(q.run(&mut b, attacker, attacker, mode, depth, limit).0)
        })
    }

    /// Every first move with which `to_move` wins by `mode`, among the moves of that class.
    pub fn winning_moves(&mut self, board: &Board, to_move: Stone, mode: Mode) -> MoveSets {
        self.question(|q| q.winning_moves_q(board, to_move, mode))
    }

    /// How many first moves [`Asking::winning_moves`] would try here (its `tried`), found by
    /// move generation alone, before any of them is searched: 0 when `to_move` has a five.
    pub fn first_move_count(&mut self, board: &Board, to_move: Stone, mode: Mode) -> usize {
        if !board.cells_with(to_move, threat::FIVE).is_empty() {
            return 0;
        }
        let mut b = board.clone();
        self.first_candidates(&mut b, to_move, mode).len()
    }

    /// [`Asking::winning_moves`] for a caller that only wants positions with few answers, all
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
        self.question(|q| q.winning_moves_up_to_q(board, to_move, mode, limit))
    }

    /// [`Asking::defences`] for a caller that needs one defence, not the list: stops at the
    /// first defence proved (`moves.proved` then holds it alone, and `every` says whether the
    /// candidates ran out there); a move whose status is unknown is passed over.
    pub fn first_defence(&mut self, board: &Board, defender: Stone, mode: Mode) -> Defences {
        self.question(|q| q.defences_impl(board, defender, mode, false, |_| Some(0)))
    }

    /// The opponent's forced win if `defender` (to move) passed, as a main line; empty if the
    /// opponent has none.
    pub fn threat(&mut self, board: &Board, defender: Stone, mode: Mode) -> Solution {
        self.question(|q| q.threat_q(board, defender, mode))
    }

    /// [`Asking::threat`] for a VCT of at most `depth` threats that are not fours: a longer
    /// one, or one the budget would have left undecided past that depth, comes out as no win
    /// (the deepening stops there, which saves the dearest depths).
    /// Up to that depth it searches exactly as [`Asking::threat`] does, so a threat it finds
    /// is the same, with the same line.
    pub fn threat_within(&mut self, board: &Board, defender: Stone, depth: u16) -> Solution {
        self.question(|q| {
            let depth = depth.min(q.depth_for(Mode::Vct));
            q.solve_within_q(board, defender.opponent(), Mode::Vct, depth)
        })
    }

    /// Every move for `defender` (to move) after which the opponent has no forced win by
    /// `mode`, counter-fours included when they work.
    pub fn defences(&mut self, board: &Board, defender: Stone, mode: Mode) -> Defences {
        self.question(|q| q.defences_q(board, defender, mode))
    }

    /// [`Asking::defences`] for a caller that only wants positions with few defences, all
    /// proved. Once the candidates are known, and before any is tried, `admit` is told how
    /// many there are (how many `moves.tried` will count if every one is tried) and gives the
    /// limit: the search stops as soon as more than that many defences are proved or one
    /// move's status is unknown (then the lists are partial and `moves.tried` counts the moves
    /// tried so far). If `admit` gives none, no move is tried: the lists are empty and `every`
    /// is false.
    pub fn defences_up_to(
        &mut self,
        board: &Board,
        defender: Stone,
        mode: Mode,
        admit: impl FnOnce(usize) -> Option<usize>,
    ) -> Defences {
        self.question(|q| q.defences_impl(board, defender, mode, true, admit))
    }

    /// The replies the search considers for the defender (to move) against `attacker`'s
    /// threat: the forced block of a four, or the defence set of a VCT node. Empty when the
    /// attacker has no threat (or has already won).
    pub fn defender_replies(&mut self, board: &Board, attacker: Stone, mode: Mode) -> Vec<Point> {
        self.question(|q| q.defender_replies_q(board, attacker, mode))
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
        self.question(|q| q.line_branching_q(board, attacker, mode, line))
    }

    /// Solves a small m,n,k board exactly for the side to move (all moves, both sides).
    pub fn exact(&mut self, board: &Board, to_move: Stone) -> ExactSolution {
        self.question(|q| q.exact_q(board, to_move))
    }

    /// Nodes the current question may still spend, sub-searches included: its budget's
    /// total, or what the solver's allowance had left when it began (see [`Solver::within`]).
    fn left(&self) -> u64 {
        self.limit.saturating_sub(self.spent)
    }

    /// Whether the stop check says stop now. Each search asks it before it starts (as well
    /// as every 8 nodes inside), so that a stopped list question does not start one short
    /// search per remaining candidate, each of which would also flush the tables it could not
    /// finish (on a wide defence list that took longer than the search before the stop).
    fn stopped(&self) -> bool {
        self.stop.is_some_and(|stop| stop(self.spent))
    }

    /// The node limit of one search among `remaining` still to make for the candidates of a
    /// list: the budget's limit per search, but no more than an even share of what the
    /// question has left (at least 1,000 nodes), so that one hard candidate cannot leave the
    /// others undecided.
    fn share(&self, remaining: usize) -> u64 {
        let even = self.left() / remaining.max(1) as u64;
        self.budget.nodes.min(even.max(1_000))
    }

    /// Nodes the last question spent, sub-searches and reading lines back included: never
    /// more than its budget's `total` and a few nodes (each search stops at the first node
    /// past it).
    pub fn spent(&self) -> u64 {
        self.spent
    }

    /// Runs `f` as one question: every call it makes counts against one budget total (unless
    /// it is itself part of a question already under way). A caller whose question takes
    /// several calls (a study question: the win, then every winning first move) asks them
    /// inside one of these.
    pub fn question<T>(&mut self, f: impl FnOnce(&mut Self) -> T) -> T {
        let outer = !self.inside;
        if outer {
            self.spent = 0;
            self.inside = true;
            self.limit = self
                .solver
                .allowance
                .map_or(self.budget.total, |a| a.min(self.budget.total));
        }
        let out = f(self);
        if outer {
            self.inside = false;
            if let Some(a) = self.solver.allowance.as_mut() {
                *a = a.saturating_sub(self.spent);
            }
        }
        out
    }

    /// Runs one proof-number search from the given node with at most `limit` nodes of its own
    /// and what the question has left in all. Returns the status and the nodes used (the VCF
    /// questions of a VCT included).
    fn run(
        &mut self,
        board: &mut Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        depth: u16,
        limit: u64,
    ) -> (Status, u64) {
        let left = self.left();
        if left == 0 || self.stopped() {
            return (Status::Unknown, 0);
        }
        let spend = self.budget.vcf_spend;
        let stop = self.stop;
        let base = self.spent;
        let s = &mut *self.solver;
        s.oracle.inexact = false;
        let before = s.oracle.nodes;
        s.oracle.spend_limit = spend.map_or(u64::MAX, |l| before.saturating_add(l));
        let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
        let mut sp = ThreatSpace::new(board, attacker, to_move, mode, depth, oracle)
            .with_history(&self.history)
            .watched(stop);
        let mut dfpn = Dfpn::new(&mut s.tt, limit, stop).within(left, base);
        let mut status = dfpn.solve(&mut sp);
        let (own, all) = (dfpn.nodes, dfpn.spent());
        drop(dfpn);
        drop(sp);
        let nodes = own + s.oracle.nodes - before;
        s.oracle.spend_limit = u64::MAX;
        s.oracle.allowance = u64::MAX;
        if s.oracle.inexact {
            // Some VCF question ran out of nodes and was taken as "no": a disproof built on it is
            // not a proof, and the stored results that depend on it must not be reused.
            if status == Status::Disproved {
                status = Status::Unknown;
            }
            s.clear();
        }
        self.spent += all;
        (status, nodes)
    }

    fn solve_q(&mut self, board: &Board, to_move: Stone, mode: Mode) -> Solution {
        self.solve_within_q(board, to_move, mode, self.depth_for(mode))
    }

    /// [`Self::solve_q`] with lines of at most `depth` (the class's own measure).
    fn solve_within_q(
        &mut self,
        board: &Board,
        to_move: Stone,
        mode: Mode,
        depth: u16,
    ) -> Solution {
        let mut b = board.clone();
        let limit = self.budget.nodes;
        let mut nodes = 0;
        let found = match mode {
            Mode::Vcf => {
                // VCF trees are narrow: prove first, then deepen up to the proof's length.
                let (status, n) = self.run(&mut b, to_move, to_move, mode, depth, limit);
                nodes += n;
                if status != Status::Proved {
                    return Solution::without_win(verdict(status), nodes);
                }
                let upper = self.stored_depth(&b, to_move, to_move, mode, depth);
                let mut found = depth;
                for d in 0..=upper.min(MAX_LINE) {
                    let (s, n) = self.run(&mut b, to_move, to_move, mode, d, limit);
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
                    let (s, n) = self.run(&mut b, to_move, to_move, mode, d, limit - nodes);
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
        self.solver.oracle.inexact = false;
        let line = self.extract_line(&mut b, to_move, mode, found);
        if self.solver.oracle.inexact {
            self.solver.clear();
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
        self.solver
            .tt
            .get(key)
            .filter(|e| e.pn == 0)
            .map_or(UNLIMITED, |e| e.depth.saturating_sub(1).max(1))
    }

    fn wins_after_q(
        &mut self,
        board: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
    ) -> (Verdict, u64) {
        let mut b = board.clone();
        let depth = self.depth_for(mode);
        let limit = self.budget.nodes;
        let (s, n) = self.run(&mut b, attacker, to_move, mode, depth, limit);
        (verdict(s), n)
    }

    fn refutation_q(
        &mut self,
        board: &Board,
        attacker: Stone,
        mode: Mode,
    ) -> (Verdict, Option<Point>) {
        let mut b = board.clone();
        let depth = self.depth_for(mode);
        let limit = self.budget.nodes;
        let defender = attacker.opponent();
        let (s, _) = self.run(&mut b, attacker, defender, mode, depth, limit);
        if s != Status::Disproved {
            return (verdict(s), None);
        }
        let key = {
            let s = &mut *self.solver;
            let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
            let sp = ThreatSpace::new(&mut b, attacker, defender, mode, depth, oracle)
                .with_history(&self.history);
            sp.key()
        };
        let reply = self
            .solver
            .tt
            .get(key)
            .map(|e| e.best as usize)
            .filter(|&m| m < b.cell_count() && b.is_empty_at(m))
            .map(|m| b.point(m));
        (Verdict::NoWin, reply)
    }

    fn shortest_win_q(
        &mut self,
        board: &Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        max: u16,
    ) -> Option<u16> {
        let mut b = board.clone();
        let limit = self.budget.nodes;
        (0..=max).find(|&d| self.run(&mut b, attacker, to_move, mode, d, limit).0 == Status::Proved)
    }

    fn winning_moves_q(&mut self, board: &Board, to_move: Stone, mode: Mode) -> MoveSets {
        self.winning_moves_impl(board, to_move, mode, usize::MAX, false)
    }

    fn winning_moves_up_to_q(
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
        let cands = self.first_candidates(&mut b, to_move, mode);
        let depth = self.depth_for(mode);
        let forced = !b.cells_with(to_move.opponent(), threat::FIVE).is_empty();
        out.tried = cands.len();
        let count = cands.len();
        for (i, m) in cands.into_iter().enumerate() {
            let node_limit = self.share(count - i);
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
            let (s, n) = self.run(
                &mut b,
                to_move,
                to_move.opponent(),
                mode,
                child_depth,
                node_limit,
            );
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

    /// The first moves [`Asking::winning_moves`] tries (when `to_move` has no five): the
    /// block of the opponent's four if there is one, else the attacker's candidates of the
    /// class, strongest first. Move generation only: no search, no table touched.
    fn first_candidates(&mut self, b: &mut Board, to_move: Stone, mode: Mode) -> Vec<u16> {
        let mut cands = Vec::new();
        let s = &mut *self.solver;
        let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
        let mut sp = ThreatSpace::new(b, to_move, to_move, mode, UNLIMITED, oracle)
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
        cands
    }

    fn threat_q(&mut self, board: &Board, defender: Stone, mode: Mode) -> Solution {
        self.solve(board, defender.opponent(), mode)
    }

    fn defences_q(&mut self, board: &Board, defender: Stone, mode: Mode) -> Defences {
        self.defences_impl(board, defender, mode, false, |_| Some(usize::MAX))
    }

    fn defences_impl(
        &mut self,
        board: &Board,
        defender: Stone,
        mode: Mode,
        stop_on_unknown: bool,
        admit: impl FnOnce(usize) -> Option<usize>,
    ) -> Defences {
        let attacker = defender.opponent();
        let mut b = board.clone();
        let mut out = Defences {
            threat: Verdict::Win,
            moves: MoveSets::default(),
            line: Vec::new(),
            complete: true,
            every: true,
        };
        // The threat the defence must stop. Any defence against a VCT also stops the
        // opponent's VCF when there is one, so the VCF's candidate set is complete.
        self.solver.oracle.inexact = false;
        self.solver.oracle.allowance = self.left();
        self.solver.oracle.spent = self.spent;
        let used = self.solver.oracle.used;
        let vcf = self
            .solver
            .oracle
            .find(&mut b, attacker, UNLIMITED, self.stop);
        self.spent += self.solver.oracle.used - used;
        self.solver.oracle.allowance = u64::MAX;
        if vcf.is_none() && self.solver.oracle.inexact {
            // The VCF question ran out of nodes: without its answer the candidate set below
            // would rest on the practical bound, so say "unknown" instead.
            out.threat = Verdict::Unknown;
            return out;
        }
        let cands: Vec<u16> = match vcf {
            Some(line) => {
                // The shortest VCF as a main line (cheap next to the defences themselves).
                let threat = self.solve(&b, attacker, Mode::Vcf);
                out.moves.nodes += threat.nodes;
                out.line = threat.line;
                defence_candidates(&mut b, attacker, &line)
            }
            None => {
                let threat = self.solve(&b, attacker, mode);
                out.moves.nodes += threat.nodes;
                out.threat = threat.verdict;
                if threat.verdict != Verdict::Win {
                    return out;
                }
                out.line = threat.line.clone();
                out.complete = false;
                near_line(&b, attacker.opponent(), &threat.line)
            }
        };
        let mut seen = vec![false; b.cell_count()];
        let distinct = cands
            .iter()
            .filter(|&&m| {
                b.is_empty_at(m as usize) && !std::mem::replace(&mut seen[m as usize], true)
            })
            .count();
        let Some(limit) = admit(distinct) else {
            out.every = false;
            return out;
        };
        seen.fill(false);
        let depth = self.depth_for(mode);
        let count = cands.len();
        for (i, m) in cands.into_iter().enumerate() {
            let node_limit = self.share(count - i);
            let m = m as usize;
            if out.moves.proved.len() > limit || (stop_on_unknown && !out.moves.unknown.is_empty())
            {
                out.every = false;
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
            let (s, n) = self.run(&mut b, attacker, attacker, mode, depth, node_limit);
            b.remove_at(m);
            out.moves.nodes += n;
            match s {
                Status::Disproved => out.moves.proved.push(b.point(m)),
                Status::Unknown => out.moves.unknown.push(b.point(m)),
                Status::Proved => {}
            }
        }
        Point::sort_by_columns(&mut out.moves.proved);
        Point::sort_by_columns(&mut out.moves.unknown);
        out
    }

    fn defender_replies_q(&mut self, board: &Board, attacker: Stone, mode: Mode) -> Vec<Point> {
        let mut b = board.clone();
        let depth = self.solver.config.vct_depth;
        let (left, spent, stop) = (self.left(), self.spent, self.stop);
        let s = &mut *self.solver;
        let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
        let mut sp = ThreatSpace::new(&mut b, attacker, attacker.opponent(), mode, depth, oracle)
            .with_history(&self.history)
            .watched(stop);
        let mut replies = Vec::new();
        sp.allow(left, spent);
        let node = sp.expand(&mut replies);
        let used = sp.take_spent();
        drop(sp);
        self.solver.oracle.allowance = u64::MAX;
        self.spent += used;
        if node != Node::And {
            return Vec::new();
        }
        replies.into_iter().map(|m| b.point(m as usize)).collect()
    }

    fn line_branching_q(
        &mut self,
        board: &Board,
        attacker: Stone,
        mode: Mode,
        line: &[Point],
    ) -> u32 {
        let mut b = board.clone();
        let defender = attacker.opponent();
        let depth = self.solver.config.vct_depth;
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
                let (left, spent, stop) = (self.left(), self.spent, self.stop);
                let s = &mut *self.solver;
                let oracle = (mode == Mode::Vct).then_some(&mut s.oracle);
                let mut sp = ThreatSpace::new(&mut b, attacker, defender, mode, depth, oracle)
                    .with_history(&self.history)
                    .watched(stop);
                let mut replies = Vec::new();
                sp.allow(left, spent);
                if sp.expand(&mut replies) == Node::And {
                    total += replies.len().saturating_sub(1) as u32;
                }
                let used = sp.take_spent();
                drop(sp);
                self.solver.oracle.allowance = u64::MAX;
                self.spent += used;
            }
            b.place_at(idx, side);
        }
        total
    }

    fn exact_q(&mut self, board: &Board, to_move: Stone) -> ExactSolution {
        let mut b = board.clone();
        let mut nodes = 0;
        let (first, n) = self.run_exact(&mut b, to_move, to_move);
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
                let (second, n) = self.run_exact(&mut b, to_move.opponent(), to_move);
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

    fn run_exact(&mut self, b: &mut Board, attacker: Stone, to_move: Stone) -> (Status, u64) {
        let left = self.left();
        if left == 0 || self.stopped() {
            return (Status::Unknown, 0);
        }
        let limit = self.budget.nodes;
        let mut sp = ExactSpace::new(b, attacker, to_move);
        let mut dfpn = Dfpn::new(&mut self.solver.tt, limit, self.stop).within(left, self.spent);
        let s = dfpn.solve(&mut sp);
        let n = dfpn.nodes;
        drop(dfpn);
        self.spent += n;
        (s, n)
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
