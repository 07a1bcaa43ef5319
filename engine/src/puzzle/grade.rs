//! Grading a player's moves in a puzzle, live.
//!
//! A [`Session`] holds the position as it stands. [`Session::play`] takes the player's move and
//! answers with a [`Grade`]: the move is illegal (and nothing changes), wrong (with the
//! refutation and the reason, see `refute.rs`), accepted (and the opponent's reply, the one that
//! resists longest, is already on the board) or the puzzle is solved. Any move that keeps a
//! proved forced win of the puzzle's kind is accepted, not only the stored one (in a puzzle
//! about fours, a win with fours: a four after which only a win with threes is left is wrong,
//! as every move after it would be); in a defence puzzle any move after which the opponent
//! has no forced win is. Hints are in `hints.rs`.
//!
//! Grades carry structured reasons ([`ReplyNote`], [`WrongReason`], [`SolvedBy`], and the
//! engine's [`MoveError`] for an illegal move); [`crate::words`] turns them into sentences.
//!
//! Every question is asked with [`Budget::GRADING`] and the moves since the puzzle's start, so
//! that a question in the middle of a line searches the same VCT class as the proof from the
//! start did, and all the questions of one move together spend at most the session's
//! allowance ([`MOVE_NODES`] unless set): a grade is bounded, whatever it has to ask.

use super::{Goal, Puzzle};
use crate::board::{threat, Board};
use crate::geometry::Point;
use crate::rules::{Forbidden, MoveError};
use crate::search::{Asking, Budget, Mode, Solver, SolverConfig, Verdict};
use crate::types::Stone;

/// What one move's grade may spend in all, unless set (see [`Session::set_allowance`]):
/// the per-question total of [`Budget::GRADING`] twice over. No move of the starter library's
/// grading benchmark spends a tenth of it (engine/benches/README.md, "grading within a
/// frame").
pub const MOVE_NODES: u64 = 2 * Budget::GRADING.total;

/// What the page spends on a move before it hands the move to its worker: about a frame's
/// work in the browser here (engine/benches/README.md, "grading within a frame"). 99 % of the
/// starter library's benchmark moves are settled within it.
pub const PAGE_NODES: u64 = 3_000;

/// The tables moves are graded with, in the browser and in the tests that stand for it:
/// 12 + 4 MB. Each question is asked with [`Budget::GRADING`].
pub fn solver_config() -> SolverConfig {
    SolverConfig {
        table_megabytes: 12,
        vcf_table_megabytes: 4,
        ..SolverConfig::default()
    }
}

/// What the opponent's reply to an accepted move does.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum ReplyNote {
    /// Blocks the player's four.
    Blocks,
    /// Blocks one of two five points; the other stays open.
    BlocksOneOfTwo,
    /// Blocks the four, and the block makes a four of its own.
    BlocksWithFour,
    /// Cannot block the four at `at`: the point is forbidden for black; the reply is the
    /// nearest legal point.
    CannotBlock {
        /// The five point black may not take.
        at: Point,
        /// Why it is forbidden.
        why: Forbidden,
    },
    /// Answers the player's threat with a four of its own.
    AnswersWithFour,
    /// Defends against the player's threat.
    Defends,
    /// The player's defence made a four: the opponent must block it, and the player defends
    /// again.
    MustBlock,
}

/// How a puzzle was solved.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum SolvedBy {
    /// The player made five.
    Five,
    /// The player's move stopped the opponent's forced win (a defence puzzle).
    Stopped,
}

/// Why a move is wrong. The refutation that shows it is in [`Grade::Wrong`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum WrongReason {
    /// The move was a four; the forced block at `block` leaves no winning follow-up of the
    /// puzzle's kind.
    NoFollowUp {
        /// The opponent's block.
        block: Point,
        /// Whether the block makes a four of the opponent's own.
        counter_four: bool,
        /// Whether the puzzle asks for fours (so the follow-up missing is one with fours: a
        /// win with threes may still be there, and is not this puzzle's answer).
        fours: bool,
    },
    /// The opponent answers with a win of its own by fours, starting at `first`.
    OpponentWins {
        /// The opponent's first move.
        first: Point,
        /// Whether the puzzle asks for fours (so the point is that the move was no four).
        not_a_four: bool,
    },
    /// The opponent's reply at `at` stops the attack (proved: the attacker has no forced
    /// win after it).
    Stopped {
        /// The reply.
        at: Point,
        /// Whether the reply is a four of the opponent's own.
        counter_four: bool,
        /// Whether the puzzle asks for fours (so the point is that the move was no four).
        not_a_four: bool,
    },
    /// The move is not a forcing move of the puzzle's class (not a four in a puzzle about
    /// fours, no threat in a puzzle about threats), so the opponent is free: no refutation is
    /// shown, since any reply would be an arbitrary one.
    NotForcing {
        /// Whether the puzzle asks for fours (so a forcing move is a four).
        fours: bool,
    },
    /// A defence puzzle: the move does not stop the opponent, who plays `first` and wins.
    DoesNotStop {
        /// The opponent's first move of its win.
        first: Point,
        /// Whether the opponent's win is by fours alone.
        with_fours: bool,
    },
}

/// The answer to one move. It travels as JSON (serde) from the worker that settles a move the
/// page could not, to the page's session ([`Session::apply`]).
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum Grade {
    /// The move is good; the opponent's reply is already played.
    Accepted {
        /// The opponent's reply.
        reply: Point,
        /// What the reply does.
        note: ReplyNote,
    },
    /// The puzzle is solved.
    Solved {
        /// How.
        by: SolvedBy,
    },
    /// The move is wrong. The refutation starts with the opponent's answer.
    Wrong {
        /// The opponent's moves that refute it, to be shown one by one.
        refutation: Vec<Point>,
        /// Why.
        reason: WrongReason,
    },
    /// The move is not allowed; nothing changed.
    Illegal {
        /// Why.
        reason: MoveError,
    },
    /// Neither a win after the move nor a refutation of it could be proved within the
    /// grading budget; the move is taken back and nothing changed.
    Undecided,
    /// The puzzle is over (solved or failed): undo or retry first.
    Finished,
}

/// Where a session stands.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub enum State {
    /// The player is to move.
    Playing,
    /// Solved.
    Solved,
    /// The last move was wrong; its refutation is on the board.
    Failed,
}

impl State {
    /// `"playing"`, `"solved"` or `"failed"`.
    pub const fn name(self) -> &'static str {
        match self {
            State::Playing => "playing",
            State::Solved => "solved",
            State::Failed => "failed",
        }
    }
}

/// A state serialises as its name, like `"failed"`.
impl serde::Serialize for State {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

/// A puzzle being played.
#[derive(Clone, Debug)]
pub struct Session {
    pub(super) puzzle: Puzzle,
    /// The position at the start, which every question is told the moves since.
    pub(super) start: Board,
    pub(super) board: Board,
    pub(super) to_move: Stone,
    /// Every move on the board since the start, with its colour, and how many of them belong
    /// to each of the player's turns (so that undo takes back a whole turn).
    pub(super) history: Vec<(Point, Stone)>,
    turns: Vec<usize>,
    pub(super) state: State,
    /// Whether the answer key may settle a move the grading budget cannot decide (see
    /// [`Session::trust_key`]).
    pub(super) trusted: bool,
    /// Nodes one move's grade may spend in all (see [`Session::set_allowance`]).
    allowance: u64,
    /// Nodes the last move's grade spent.
    spent: u64,
}

impl Session {
    /// A session at the puzzle's start.
    pub fn new(puzzle: Puzzle) -> Session {
        let board = puzzle.board();
        let to_move = puzzle.to_move;
        Session {
            puzzle,
            start: board.clone(),
            board,
            to_move,
            history: Vec::new(),
            turns: Vec::new(),
            state: State::Playing,
            trusted: false,
            allowance: MOVE_NODES,
            spent: 0,
        }
    }

    /// Sets what one move's grade may spend in all, every question it asks together (the
    /// win, the class of the line and afresh, the refutation's tries); [`MOVE_NODES`] unless
    /// set. A move that cannot be settled within it is [`Grade::Undecided`] and nothing of it
    /// stays, so a caller may ask again with a larger allowance (the page grades within a
    /// frame's worth and hands what that cannot settle to its worker).
    pub fn set_allowance(&mut self, nodes: u64) {
        self.allowance = nodes;
    }

    /// Nodes the last move's grade spent (every question it asked).
    pub fn last_spent(&self) -> u64 {
        self.spent
    }

    /// Says whether this puzzle's answer key was proved by this program (the built-in library,
    /// which the tests re-prove, or a puzzle generated here). Then a key move that the grading
    /// budget cannot decide is taken as proved. Otherwise (a set from a file or a link, whose
    /// key nobody here has checked) such a move is searched again with
    /// [`Budget::VERIFICATION`], which is slower but proves it. Off by default.
    pub fn trust_key(&mut self, trusted: bool) {
        self.trusted = trusted;
    }

    /// The puzzle.
    pub fn puzzle(&self) -> &Puzzle {
        &self.puzzle
    }

    /// The position as it stands.
    pub fn board(&self) -> &Board {
        &self.board
    }

    /// The side to move now.
    pub fn to_move(&self) -> Stone {
        self.to_move
    }

    /// Where the session stands.
    pub fn state(&self) -> State {
        self.state
    }

    /// The moves played since the start, with their colours.
    pub fn history(&self) -> &[(Point, Stone)] {
        &self.history
    }

    pub(super) fn player(&self) -> Stone {
        self.puzzle.to_move
    }

    pub(super) fn mode(&self) -> Mode {
        self.puzzle.theme.mode()
    }

    /// A question about the position as it stands, asked with `budget` and the moves since
    /// the start.
    pub(super) fn ask<'s>(&self, solver: &'s mut Solver, budget: Budget) -> Asking<'s, 's> {
        solver.ask(budget).after(&self.start, &self.history)
    }

    fn put(&mut self, p: Point, c: Stone) {
        self.board.place(p, c);
        self.history.push((p, c));
        self.to_move = c.opponent();
    }

    /// Takes back the player's last turn (the move and the reply or refutation after it).
    /// Returns whether anything was taken back.
    pub fn undo(&mut self) -> bool {
        let Some(n) = self.turns.pop() else {
            return false;
        };
        for _ in 0..n {
            if let Some((p, _)) = self.history.pop() {
                self.board.remove(p);
            }
        }
        self.to_move = self.player();
        self.state = State::Playing;
        true
    }

    /// Back to the start.
    pub fn retry(&mut self) {
        while self.undo() {}
    }

    /// Puts moves already graded back on the board, in order (the player's and the app's),
    /// without grading them: a worker asked to settle the next move rebuilds the page's
    /// session with them. Stops at the first move that is not a legal move of its colour
    /// here and says whether every move was put.
    pub fn replay(&mut self, moves: &[(Point, Stone)]) -> bool {
        for &(p, c) in moves {
            if self.state != State::Playing || self.board.check_move(p, c).is_err() {
                return false;
            }
            self.put(p, c);
            self.turns.push(1);
        }
        true
    }

    /// Puts on the board the grade of the player's move `p` that was settled elsewhere (by
    /// the worker, on a session replayed to this one's moves, see [`Session::replay`]): the
    /// move, and the reply or refutation, exactly as [`Session::play`] would have. A grade
    /// that changes nothing (illegal, undecided, finished) changes nothing here either.
    /// Returns whether the grade fits this session (the player to move, `p` legal, a reply on
    /// an empty point, a refutation on the board); if not, nothing changed.
    pub fn apply(&mut self, p: Point, grade: &Grade) -> bool {
        let me = self.player();
        if self.state != State::Playing || self.board.check_move(p, me).is_err() {
            return false;
        }
        let fits = match grade {
            Grade::Accepted { reply, .. } => {
                *reply != p && self.board.contains(*reply) && self.board.get(*reply).is_none()
            }
            // The refutation's stones go on the points still empty, as in `fail`.
            Grade::Wrong { refutation, .. } => refutation.iter().all(|&q| self.board.contains(q)),
            Grade::Solved { .. } => true,
            Grade::Illegal { .. } | Grade::Undecided | Grade::Finished => return true,
        };
        if !fits {
            return false;
        }
        let before = self.history.len();
        self.put(p, me);
        match grade {
            Grade::Accepted { reply, .. } => self.put(*reply, me.opponent()),
            Grade::Wrong { refutation, reason } => {
                self.fail(refutation.clone(), *reason);
            }
            _ => self.state = State::Solved,
        }
        self.turns.push(self.history.len() - before);
        true
    }

    /// Grades the player's move `p` and, when it is accepted, plays the opponent's reply. The
    /// grade's questions spend at most the session's allowance together.
    pub fn play(&mut self, solver: &mut Solver, p: Point) -> Grade {
        let (grade, spent) = solver.within(self.allowance, |s| self.grade(s, p));
        self.spent = spent;
        grade
    }

    fn grade(&mut self, solver: &mut Solver, p: Point) -> Grade {
        if self.state != State::Playing {
            return Grade::Finished;
        }
        let me = self.player();
        if let Err(reason) = self.board.check_move(p, me) {
            return Grade::Illegal { reason };
        }
        let before = self.history.len();
        let idx = self.board.index(p);
        let five = self.board.wins_at(idx, me);
        self.put(p, me);
        let grade = if five {
            self.state = State::Solved;
            Grade::Solved { by: SolvedBy::Five }
        } else {
            match self.puzzle.goal() {
                Goal::Win => self.after_attack(solver),
                Goal::Defend => self.after_defence(solver),
            }
        };
        if grade == Grade::Undecided {
            // Nothing is claimed about the move, so nothing of it stays.
            while self.history.len() > before {
                if let Some((q, _)) = self.history.pop() {
                    self.board.remove(q);
                }
            }
            self.to_move = me;
            return grade;
        }
        self.turns.push(self.history.len() - before);
        grade
    }

    /// The player attacked: does the win survive? The attacker is the player; the
    /// opponent is to move. A win found in the class of the line so far or afresh is a real
    /// win and the move is accepted. The move is wrong only when neither finds a win (both
    /// disproved), and then only with a refutation proved in both (see `refute.rs`); what
    /// cannot be decided within the budget is said to be undecided.
    fn after_attack(&mut self, solver: &mut Solver) -> Grade {
        let me = self.player();
        let them = me.opponent();
        let mode = self.mode();
        // A trusted key was proved when the puzzle was made (the library's keys again by its
        // tests): its moves keep the win without a search, so they grade at once.
        let mut verdict = if self.trusted && self.on_key() {
            Verdict::Win
        } else {
            self.keeps_win(solver, Budget::GRADING, mode)
        };
        if verdict == Verdict::Unknown && self.on_key() {
            // The phone's budget cannot decide, but the move is the answer key's, which was
            // proved with a larger budget when the puzzle was made (or is proved now).
            verdict = if self.trusted {
                Verdict::Win
            } else {
                self.keeps_win(solver, Budget::VERIFICATION, mode)
            };
        }
        match verdict {
            Verdict::Win => {
                let mut ask = self.ask(solver, Budget::GRADING);
                let (reply, note) = match self.stored_reply(&mut ask, me, mode) {
                    Some(r) => r,
                    None => self.longest_defence(&mut ask, me, mode),
                };
                self.put(reply, them);
                Grade::Accepted { reply, note }
            }
            Verdict::Unknown => Grade::Undecided,
            Verdict::NoWin => match self.refute_attack(solver) {
                Some((refutation, reason)) => self.fail(refutation, reason),
                None => Grade::Undecided,
            },
        }
    }

    /// Whether the player (the attacker, the opponent to move) still has a forced win in
    /// `mode`, asked in the class of the line so far and, for a VCT, afresh too: `Win` if
    /// either proves one, `NoWin` only if both disprove it, else `Unknown`.
    pub(super) fn keeps_win(&self, solver: &mut Solver, budget: Budget, mode: Mode) -> Verdict {
        let me = self.player();
        let them = me.opponent();
        let in_line = self
            .ask(solver, budget)
            .wins_after(&self.board, me, them, mode)
            .0;
        if in_line == Verdict::Win || mode == Mode::Vcf {
            // A VCF does not look back at the line: asked afresh, it is the same question.
            return in_line;
        }
        let fresh = solver.ask(budget).wins_after(&self.board, me, them, mode).0;
        match (in_line, fresh) {
            (_, Verdict::Win) => Verdict::Win,
            (Verdict::NoWin, Verdict::NoWin) => Verdict::NoWin,
            _ => Verdict::Unknown,
        }
    }

    /// Puts a wrong move's refutation on the board and ends the try.
    fn fail(&mut self, refutation: Vec<Point>, reason: WrongReason) -> Grade {
        for &r in &refutation {
            if self.board.get(r).is_none() {
                let side = self.to_move;
                self.put(r, side);
            }
        }
        self.state = State::Failed;
        Grade::Wrong { refutation, reason }
    }

    /// Whether every move so far is the answer key's: a listed first move or the stored main
    /// line of a win puzzle, or one of the listed defences as the first move of a defence
    /// puzzle.
    fn on_key(&self) -> bool {
        match self.puzzle.goal() {
            Goal::Win if self.history.len() == 1 => {
                self.puzzle.first_moves.contains(&self.history[0].0)
            }
            Goal::Win => self.on_line(),
            Goal::Defend => {
                self.history.len() == 1 && self.puzzle.first_moves.contains(&self.history[0].0)
            }
        }
    }

    /// Whether the moves so far are the start of the stored main line.
    fn on_line(&self) -> bool {
        let line = &self.puzzle.line;
        self.history.len() <= line.len() && self.history.iter().zip(line).all(|(h, &l)| h.0 == l)
    }

    /// The stored main line's next move, while the moves so far follow it and that point is
    /// free.
    pub(super) fn next_on_line(&self) -> Option<Point> {
        let next = *self.puzzle.line.get(self.history.len())?;
        (self.on_line() && self.board.get(next).is_none()).then_some(next)
    }

    /// While the player follows the stored main line, the defender answers as the line does
    /// (so that play matches the answer key), provided that reply is one the defender could
    /// make: the block of a four, or, for a key not trusted, one of the replies the search
    /// considers.
    fn stored_reply(&self, ask: &mut Asking, me: Stone, mode: Mode) -> Option<(Point, ReplyNote)> {
        let r = self.next_on_line()?;
        let them = me.opponent();
        let fives: Vec<Point> = self
            .board
            .cells_with(me, threat::FIVE)
            .iter()
            .map(|i| self.board.point(i))
            .collect();
        let idx = self.board.index(r);
        let makes_four = self.board.flags_at(idx, them) & threat::FOUR != 0;
        if !fives.is_empty() {
            if !fives.contains(&r) {
                return None;
            }
            let note = if fives.len() >= 2 {
                ReplyNote::BlocksOneOfTwo
            } else if makes_four {
                ReplyNote::BlocksWithFour
            } else {
                ReplyNote::Blocks
            };
            return Some((r, note));
        }
        // A trusted line's replies come from its proof; another line's must be one the search
        // considers.
        if !self.trusted && !ask.defender_replies(&self.board, me, mode).contains(&r) {
            return None;
        }
        Some((r, self.threat_reply_note(r)))
    }

    /// The note of a reply to a threat that is not a four.
    fn threat_reply_note(&self, r: Point) -> ReplyNote {
        let idx = self.board.index(r);
        if self.board.flags_at(idx, self.player().opponent()) & threat::FOUR != 0 {
            ReplyNote::AnswersWithFour
        } else {
            ReplyNote::Defends
        }
    }

    /// The defender's reply after an attacking move that keeps the win: the one after which the
    /// attacker's shortest win is longest.
    fn longest_defence(&self, ask: &mut Asking, me: Stone, mode: Mode) -> (Point, ReplyNote) {
        let them = me.opponent();
        let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
        if let Some(&f) = fives.first() {
            let fp = self.board.point(f);
            if fives.len() >= 2 {
                return (fp, ReplyNote::BlocksOneOfTwo);
            }
            if let Err(MoveError::Forbidden(_, why)) = self.board.check_move(fp, them) {
                let other = nearest_legal(&self.board, fp, them).unwrap_or(fp);
                return (other, ReplyNote::CannotBlock { at: fp, why });
            }
            let note = if self.board.flags_at(f, them) & threat::FOUR != 0 {
                ReplyNote::BlocksWithFour
            } else {
                ReplyNote::Blocks
            };
            return (fp, note);
        }
        let replies = ask.defender_replies(&self.board, me, mode);
        let depth = ask.config().vct_depth;
        let mut best: Option<(Point, u16)> = None;
        for r in replies {
            let mut b = self.board.clone();
            b.place(r, them);
            let len = ask
                .shortest_win(&b, me, me, mode, depth)
                .unwrap_or(u16::MAX);
            if best.is_none_or(|(_, l)| len > l) {
                best = Some((r, len));
            }
        }
        let r = best.map(|b| b.0).unwrap_or_else(|| {
            nearest_legal(
                &self.board,
                self.history.last().map_or(Point::new(0, 0), |h| h.0),
                them,
            )
            .unwrap_or(Point::new(0, 0))
        });
        (r, self.threat_reply_note(r))
    }

    /// The player defended: is the opponent's win gone?
    fn after_defence(&mut self, solver: &mut Solver) -> Grade {
        let me = self.player();
        let them = me.opponent();
        // A trusted key's defences were proved when the puzzle was made: no search.
        let (mut verdict, _) = if self.trusted && self.on_key() {
            (Verdict::NoWin, 0)
        } else {
            self.ask(solver, Budget::GRADING)
                .wins_after(&self.board, them, them, Mode::Vct)
        };
        if verdict == Verdict::Unknown && self.on_key() {
            // As in an attack: a listed defence was proved when the puzzle was made.
            verdict = if self.trusted {
                Verdict::NoWin
            } else {
                self.ask(solver, Budget::VERIFICATION)
                    .wins_after(&self.board, them, them, Mode::Vct)
                    .0
            };
        }
        match verdict {
            Verdict::NoWin => {
                let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
                if let Some(&f) = fives.first() {
                    // A counter-four: the opponent must block, then the player defends again.
                    let b = self.board.point(f);
                    self.put(b, them);
                    return Grade::Accepted {
                        reply: b,
                        note: ReplyNote::MustBlock,
                    };
                }
                self.state = State::Solved;
                Grade::Solved {
                    by: SolvedBy::Stopped,
                }
            }
            Verdict::Unknown => Grade::Undecided,
            Verdict::Win => {
                // The opponent's win, shown move by move, is the refutation.
                let mut ask = self.ask(solver, Budget::GRADING);
                let sol = ask.solve(&self.board, them, Mode::Vct);
                match sol.line.first() {
                    Some(&first) if sol.verdict == Verdict::Win => {
                        let with_fours = sol.depth == 0
                            || ask.solve(&self.board, them, Mode::Vcf).verdict == Verdict::Win;
                        self.fail(sol.line, WrongReason::DoesNotStop { first, with_fours })
                    }
                    // Proved a win, but its line could not be read within the budget.
                    _ => Grade::Undecided,
                }
            }
        }
    }
}

/// The legal empty point nearest to `p` for colour `c`.
pub(super) fn nearest_legal(board: &Board, p: Point, c: Stone) -> Option<Point> {
    // Keys: the distance, then the row, then the column.
    let mut cands: Vec<u64> = board
        .points()
        .filter(|&q| board.get(q).is_none() && q != p)
        .map(|q| {
            let d = (q.x as i32 - p.x as i32)
                .unsigned_abs()
                .max((q.y as i32 - p.y as i32).unsigned_abs());
            u64::from(d) << 16 | u64::from(q.y) << 8 | u64::from(q.x)
        })
        .collect();
    cands.sort_unstable();
    cands
        .into_iter()
        .map(|k| Point::new(k as u8, (k >> 8) as u8))
        .find(|&q| !board.rule().has_forbidden(c) || board.forbidden(q).is_none())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::notation;
    use crate::puzzle::Theme;
    use crate::types::Rule;

    fn pts(s: &str) -> Vec<Point> {
        notation::parse_points(s, "moves", 15, 15).unwrap()
    }

    fn puzzle(rule: Rule, black: &str, white: &str, to_move: Stone, theme: Theme) -> Puzzle {
        let mut p = Puzzle {
            id: "t".into(),
            rule,
            size: 15,
            to_move,
            black: pts(black),
            white: pts(white),
            theme,
            first_moves: vec![],
            line: vec![],
            length: 0,
            rating: 1500,
        };
        let mut s = Solver::default();
        let mut ask = s.ask(Budget::VERIFICATION);
        let sol = ask.solve(&p.board(), to_move, theme.mode());
        p.line = sol.line;
        p.length = sol.depth;
        p.first_moves = ask.winning_moves(&p.board(), to_move, theme.mode()).proved;
        p
    }

    /// Black's open three h8-j8 plus a vertical pair: both ends of the three win.
    fn open_three() -> Puzzle {
        puzzle(
            Rule::Freestyle,
            "h8 i8 j8",
            "a1 a3 o15",
            Stone::Black,
            Theme::Vcf,
        )
    }

    /// Black's three h8-j8 is capped by White's g8, so k8 makes only a four, and White's
    /// forced block at l8 completes White's own four l8-l11.
    fn capped_three() -> Puzzle {
        puzzle(
            Rule::Freestyle,
            "h8 i8 j8 e5 f5",
            "g8 l9 l10 l11 a1",
            Stone::Black,
            Theme::Vcf,
        )
    }

    #[test]
    fn an_alternative_winning_move_is_accepted() {
        // Black's open three h8-j8 plus a vertical pair: both ends of the three win.
        let p = open_three();
        let mut solver = Solver::default();
        for first in ["g8", "k8"] {
            let mut s = Session::new(p.clone());
            match s.play(&mut solver, first.parse().unwrap()) {
                Grade::Accepted { reply, .. } => {
                    assert!(s.board().get(reply) == Some(Stone::White));
                }
                other => panic!("{first}: {other:?}"),
            }
            // Finish: the five.
            let five = s
                .board()
                .cells_with(Stone::Black, threat::FIVE)
                .first()
                .unwrap();
            let fp = s.board().point(five);
            assert!(matches!(s.play(&mut solver, fp), Grade::Solved { .. }));
            assert_eq!(s.state(), State::Solved);
        }
    }

    #[test]
    fn a_move_that_allows_a_counter_four_is_refuted() {
        // Black's three h8-j8 is capped by White's g8, so k8 makes only a four, and White's
        // forced block at l8 completes White's own four l8-l11.
        let p = capped_three();
        let mut solver = Solver::default();
        let mut s = Session::new(p);
        match s.play(&mut solver, "k8".parse().unwrap()) {
            Grade::Wrong { refutation, reason } => {
                assert_eq!(refutation[0].to_string(), "l8");
                assert_eq!(
                    reason,
                    WrongReason::NoFollowUp {
                        block: "l8".parse().unwrap(),
                        counter_four: true,
                        fours: true,
                    }
                );
                assert_eq!(s.state(), State::Failed);
                assert!(s.undo());
                assert_eq!(s.board().get("k8".parse().unwrap()), None);
                assert_eq!(s.state(), State::Playing);
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn in_a_puzzle_about_fours_a_four_that_keeps_only_a_win_with_threes_is_wrong() {
        // A Drill puzzle an exploratory test played: the key is d7. c7 is a four, and after
        // White's forced block at d7 Black still wins, but only with threes: the puzzle asks
        // for fours, and its next move could not be graded right (every move after it is
        // "not a four"), so the four is wrong, with the block as its refutation.
        let p = puzzle(
            Rule::Freestyle,
            "e5 f6 e7 f7 g7 h8 i8 g9 g10 g11 h11 j11 f12",
            "d4 h7 f8 g8 j8 h9 i9 f10 i10 f11 k11 g12 k12",
            Stone::Black,
            Theme::Vcf,
        );
        assert_eq!(p.first_moves, pts("d7"));
        let mut solver = Solver::default();
        let mut after = p.board();
        after.place("c7".parse().unwrap(), Stone::Black);
        after.place("d7".parse().unwrap(), Stone::White);
        let mut ask = solver.ask(Budget::VERIFICATION);
        assert_eq!(
            ask.solve(&after, Stone::Black, Mode::Vct).verdict,
            Verdict::Win
        );
        assert_eq!(
            ask.solve(&after, Stone::Black, Mode::Vcf).verdict,
            Verdict::NoWin
        );
        let mut s = Session::new(p);
        match s.play(&mut solver, "c7".parse().unwrap()) {
            Grade::Wrong { refutation, reason } => {
                assert_eq!(refutation, pts("d7"));
                assert_eq!(
                    reason,
                    WrongReason::NoFollowUp {
                        block: "d7".parse().unwrap(),
                        counter_four: false,
                        fours: true,
                    }
                );
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn a_forbidden_point_is_illegal_and_changes_nothing() {
        // Renju: black's h8 would make two open threes at once, g8-h8-i8 and h8-h9-h10.
        let p = Puzzle {
            id: "f".into(),
            rule: Rule::Renju,
            size: 15,
            to_move: Stone::Black,
            black: pts("g8 i8 h9 h10"),
            white: pts("a1 a3 o15 o13"),
            theme: Theme::Vcf,
            first_moves: pts("k8"),
            line: pts("k8"),
            length: 1,
            rating: 1500,
        };
        let mut solver = Solver::default();
        let mut s = Session::new(p);
        let before = s.board().hash();
        match s.play(&mut solver, "h8".parse().unwrap()) {
            Grade::Illegal { reason } => assert_eq!(
                reason,
                MoveError::Forbidden("h8".parse().unwrap(), Forbidden::DoubleThree)
            ),
            other => panic!("{other:?}"),
        }
        assert_eq!(s.board().hash(), before);
        assert!(s.history().is_empty());
    }

    /// The page grades with a small allowance and hands what it cannot settle to the worker,
    /// whose grade the page then applies: the result must be what grading the move with the
    /// whole allowance gives, on the board, in the history and in the state.
    #[test]
    fn a_grade_settled_elsewhere_is_applied_as_if_played_here() {
        let cases = [
            // An alternative answer: accepted, with the reply played.
            (open_three(), "g8"),
            // A four whose forced block makes a counter-four: wrong, with the refutation.
            (capped_three(), "k8"),
        ];
        for (p, mv) in cases {
            let m: Point = mv.parse().unwrap();
            let mut direct = Session::new(p.clone());
            let want = direct.play(&mut Solver::default(), m);
            assert!(direct.last_spent() > 0, "{mv}: the case must need a search");
            assert!(matches!(want, Grade::Accepted { .. } | Grade::Wrong { .. }));

            // The page: no allowance at all, so nothing is settled; nothing changes.
            let mut page = Session::new(p.clone());
            page.set_allowance(0);
            assert_eq!(
                page.play(&mut Solver::default(), m),
                Grade::Undecided,
                "{mv}"
            );
            assert!(page.last_spent() <= 1, "{mv}: spent {}", page.last_spent());
            assert!(page.history().is_empty());

            // The worker: replays the page's moves, settles the move, sends it as JSON.
            let mut worker = Session::new(p.clone());
            assert!(worker.replay(page.history()));
            let got = worker.play(&mut Solver::default(), m);
            assert_eq!(got, want, "{mv}");
            let text = serde_json::to_string(&got).unwrap();
            let got: Grade = serde_json::from_str(&text).unwrap();

            assert!(page.apply(m, &got), "{mv}");
            assert_eq!(page.history(), direct.history(), "{mv}");
            assert_eq!(page.state(), direct.state(), "{mv}");
            assert_eq!(page.board().hash(), direct.board().hash(), "{mv}");
            // One turn, taken back whole.
            assert!(page.undo());
            assert!(page.history().is_empty());
            assert_eq!(page.state(), State::Playing);
        }
    }

    #[test]
    fn a_grade_that_does_not_fit_changes_nothing() {
        let p = open_three();
        let mut s = Session::new(p);
        let before = s.board().hash();
        let g8: Point = "g8".parse().unwrap();
        // The reply on an occupied point, and the move on an occupied point.
        let onto_stone = Grade::Accepted {
            reply: "a1".parse().unwrap(),
            note: ReplyNote::Blocks,
        };
        assert!(!s.apply(g8, &onto_stone));
        assert!(!s.apply("h8".parse().unwrap(), &Grade::Solved { by: SolvedBy::Five }));
        // Moves that do not fit stop a replay.
        assert!(!Session::new(s.puzzle().clone()).replay(&[(g8, Stone::Black), (g8, Stone::White)]));
        assert_eq!(s.board().hash(), before);
        assert!(s.history().is_empty());
        assert_eq!(s.state(), State::Playing);
    }
}
