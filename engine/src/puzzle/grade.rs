//! Grading a player's moves in a puzzle, live.
//!
//! A [`Session`] holds the position as it stands. [`Session::play`] takes the player's move and
//! answers with a [`Grade`]: the move is illegal (and nothing changes), wrong (with the
//! refutation and one sentence of why), accepted (and the opponent's reply, the one that resists
//! longest, is already on the board) or the puzzle is solved. Any move that keeps a proved
//! forced win is accepted, not only the stored one; in a defence puzzle any move after which
//! the opponent has no forced win is.

use super::{capitalised, Goal, Puzzle, Theme};
use crate::board::{threat, Board, Stone};
use crate::geometry::Point;
use crate::rules::Forbidden;
use crate::search::{Mode, Solver, SolverConfig, Verdict};

/// The node budget of one grading search: what a phone answers within a frame or two for
/// nearly every move (see engine/benches/README.md for the measured latencies).
pub const NODE_LIMIT: u64 = 50_000;

/// Nodes the VCF questions inside one grading search may use together.
pub const VCF_SPEND_LIMIT: u64 = 150_000;

/// How many defender replies a refutation tries before it settles for the plain answer.
const REFUTATION_TRIES: usize = 8;

/// The solver settings moves are graded with, in the browser and in the tests that stand for
/// it: 12 + 4 MB of tables, [`NODE_LIMIT`] nodes per search and [`VCF_SPEND_LIMIT`] for the
/// VCF questions inside one.
pub fn solver_config() -> SolverConfig {
    SolverConfig {
        table_megabytes: 12,
        vcf_table_megabytes: 4,
        node_limit: NODE_LIMIT,
        vcf_spend_limit: Some(VCF_SPEND_LIMIT),
        ..SolverConfig::default()
    }
}

/// The answer to one move.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Grade {
    /// The move is good; the opponent's reply (already played) and a note for the player.
    Accepted {
        /// The opponent's reply.
        reply: Point,
        /// Plain words about the reply, e.g. "White blocks at g8."
        note: String,
    },
    /// The puzzle is solved.
    Solved {
        /// Plain words, e.g. "Five in a row."
        note: String,
    },
    /// The move is wrong. The refutation starts with the opponent's answer.
    Wrong {
        /// The opponent's moves that refute it, to be shown one by one.
        refutation: Vec<Point>,
        /// One sentence of why.
        reason: String,
    },
    /// The move is not allowed; nothing changed.
    Illegal {
        /// Why, in plain words.
        reason: String,
    },
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

/// One of the three hint steps.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Hint {
    /// The theme and the length, in words.
    Theme(String),
    /// The area of the key move: the corners of a square of points, inclusive.
    Area {
        /// Lower-left corner.
        from: Point,
        /// Upper-right corner.
        to: Point,
    },
    /// The move itself.
    Move(Point),
}

/// A puzzle being played.
#[derive(Clone, Debug)]
pub struct Session {
    puzzle: Puzzle,
    /// The position at the start, which the solver is told the moves since (see
    /// [`Solver::set_history`]).
    start: Board,
    board: Board,
    to_move: Stone,
    /// Every move on the board since the start, with its colour, and how many of them belong
    /// to each of the player's turns (so that undo takes back a whole turn).
    history: Vec<(Point, Stone)>,
    turns: Vec<usize>,
    state: State,
    /// Whether the answer key may settle a move the grading budget cannot decide (see
    /// [`Session::trust_key`]).
    trusted: bool,
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
        }
    }

    /// Says whether this puzzle's answer key was proved by this program (the built-in library,
    /// which the tests re-prove, or a puzzle generated here). Then a key move that the grading
    /// budget cannot decide is taken as proved. Otherwise (a set from a file or a link, whose
    /// key nobody here has checked) such a move is searched again with the budget puzzles are
    /// verified with, which is slower but proves it. Off by default.
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

    fn player(&self) -> Stone {
        self.puzzle.to_move
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

    /// Grades the player's move `p` and, when it is accepted, plays the opponent's reply.
    pub fn play(&mut self, solver: &mut Solver, p: Point) -> Grade {
        if self.state != State::Playing {
            return Grade::Finished;
        }
        let me = self.player();
        if let Err(reason) = self.check_legal(p, me) {
            return Grade::Illegal { reason };
        }
        let before = self.history.len();
        let idx = self.board.index(p);
        let five = self.board.wins_at(idx, me);
        self.put(p, me);
        solver.set_history(&self.start, &self.history);
        let grade = if five {
            self.state = State::Solved;
            Grade::Solved {
                note: "Five in a row.".to_string(),
            }
        } else {
            match self.puzzle.goal() {
                Goal::Win => self.after_attack(solver, p),
                Goal::Defend => self.after_defence(solver, p),
            }
        };
        solver.set_history(&self.start, &[]);
        self.turns.push(self.history.len() - before);
        grade
    }

    fn check_legal(&self, p: Point, me: Stone) -> Result<(), String> {
        if !self.board.contains(p) {
            return Err(format!("{p} is off the board."));
        }
        if self.board.get(p).is_some() {
            return Err(format!("{p} is already taken."));
        }
        let idx = self.board.index(p);
        if self.board.rule().has_forbidden(me) && !self.board.wins_at(idx, me) {
            if let Some(why) = self.board.forbidden(p) {
                return Err(forbidden_words(p, why));
            }
        }
        Ok(())
    }

    fn mode(&self) -> Mode {
        self.puzzle.theme.mode()
    }

    /// The player attacked with `p`: does the win survive? The attacker is the player; the
    /// opponent is to move.
    fn after_attack(&mut self, solver: &mut Solver, p: Point) -> Grade {
        let me = self.player();
        let them = me.opponent();
        let mode = self.mode();
        let (mut verdict, _) = solver.wins_after(&self.board, me, them, mode, None);
        if verdict != Verdict::Win && mode == Mode::Vcf {
            // A win is a win, even with a three in a puzzle about fours.
            verdict = solver.wins_after(&self.board, me, them, Mode::Vct, None).0;
        }
        if verdict == Verdict::Unknown && self.on_key() {
            // The phone's budget cannot decide, but the move is the answer key's, which was
            // proved with a larger budget when the puzzle was made (or is proved now).
            verdict = if self.trusted {
                Verdict::Win
            } else {
                let board = self.board.clone();
                verifying(solver, |s| s.wins_after(&board, me, them, mode, None).0)
            };
        }
        if verdict == Verdict::Win {
            let reply = match self.stored_reply(solver, me, mode) {
                Some(r) => r,
                None => self.longest_defence(solver, me, mode),
            };
            self.put(reply.0, them);
            return Grade::Accepted {
                reply: reply.0,
                note: reply.1,
            };
        }
        let (refutation, reason) = self.refute_attack(solver, p);
        self.fail(refutation, reason)
    }

    /// Puts a wrong move's refutation on the board and ends the try.
    fn fail(&mut self, refutation: Vec<Point>, reason: String) -> Grade {
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
    fn next_on_line(&self) -> Option<Point> {
        let next = *self.puzzle.line.get(self.history.len())?;
        (self.on_line() && self.board.get(next).is_none()).then_some(next)
    }

    /// While the player follows the stored main line, the defender answers as the line does
    /// (so that play matches the answer key), provided that reply is one the defender could
    /// make: the block of a four, or one of the replies the search considers.
    fn stored_reply(
        &mut self,
        solver: &mut Solver,
        me: Stone,
        mode: Mode,
    ) -> Option<(Point, String)> {
        let r = self.next_on_line()?;
        let them = me.opponent();
        let t = capitalised(them);
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
                format!("{t} blocks at {r}, but cannot block both ends.")
            } else if makes_four {
                format!("{t} blocks at {r} and makes a four of its own.")
            } else {
                format!("{t} blocks at {r}.")
            };
            return Some((r, note));
        }
        if !solver.defender_replies(&self.board, me, mode).contains(&r) {
            return None;
        }
        let note = if makes_four {
            format!("{t} answers at {r} with a four.")
        } else {
            format!("{t} defends at {r}.")
        };
        Some((r, note))
    }

    /// The defender's reply after an attacking move that keeps the win: the one after which the
    /// attacker's shortest win is longest.
    fn longest_defence(&mut self, solver: &mut Solver, me: Stone, mode: Mode) -> (Point, String) {
        let them = me.opponent();
        let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
        let t = capitalised(them);
        if let Some(&f) = fives.first() {
            let fp = self.board.point(f);
            if fives.len() >= 2 {
                return (
                    fp,
                    format!("{t} blocks at {fp}, but cannot block both ends."),
                );
            }
            if self.board.rule().has_forbidden(them) && !self.board.wins_at(f, them) {
                if let Some(why) = self.board.forbidden(fp) {
                    let other = nearest_legal(&self.board, fp, them).unwrap_or(fp);
                    return (
                        other,
                        format!("{t} cannot block at {fp}: {}", forbidden_reason(why)),
                    );
                }
            }
            let note = if self.board.flags_at(f, them) & threat::FOUR != 0 {
                format!("{t} blocks at {fp} and makes a four of its own.")
            } else {
                format!("{t} blocks at {fp}.")
            };
            return (fp, note);
        }
        let replies = solver.defender_replies(&self.board, me, mode);
        let mut best: Option<(Point, u16)> = None;
        for r in replies {
            let mut b = self.board.clone();
            b.place(r, them);
            let len = solver
                .shortest_win(&b, me, me, mode, solver.config().vct_depth)
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
        let idx = self.board.index(r);
        let note = if self.board.flags_at(idx, them) & threat::FOUR != 0 {
            format!("{t} answers at {r} with a four.")
        } else {
            format!("{t} defends at {r}.")
        };
        (r, note)
    }

    /// Why the attacking move `p` fails, and the opponent's answer that shows it.
    fn refute_attack(&mut self, solver: &mut Solver, p: Point) -> (Vec<Point>, String) {
        let me = self.player();
        let them = me.opponent();
        let (m, t) = (capitalised(me), capitalised(them));
        let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
        if let Some(&f) = fives.first() {
            // The move was a four: the block is forced.
            let b = self.board.point(f);
            let reason = if self.board.flags_at(f, them) & threat::FOUR != 0 {
                format!(
                    "{t} blocks at {b} with a four of its own, and {m} has no winning follow-up."
                )
            } else {
                format!("{t} blocks at {b}, and {m} has no winning follow-up.")
            };
            return (vec![b], reason);
        }
        // Not a four: the opponent has a free move.
        let own = solver.solve(&self.board, them, Mode::Vcf, None);
        if let (Verdict::Win, Some(&first)) = (own.verdict, own.line.first()) {
            let reason = if self.mode() == Mode::Vcf {
                format!("{p} is not a four, so {t} is free to play {first} and win with fours.")
            } else {
                format!("{t} answers with a win of its own, starting at {first}.")
            };
            return (own.line, reason);
        }
        // One reply that stops the attack is enough: the key's points first (taking the point
        // the attacker needed is the plainest refutation), then the replies the search
        // considers against the attacker's threat, until one is proved to leave no win. This
        // is one search per reply tried, not the full defence list.
        let replies = solver.defender_replies(&self.board, me, Mode::Vct);
        let mut cands: Vec<Point> = Vec::new();
        for &k in self.puzzle.first_moves.iter().chain(&replies) {
            if self.board.get(k).is_none() && !cands.contains(&k) {
                cands.push(k);
            }
        }
        let pick = if replies.is_empty() {
            // No threat at all: every reply stops it; none is more of a refutation than another.
            None
        } else {
            let legal: Vec<Point> = cands
                .into_iter()
                .filter(|&r| self.check_legal(r, them).is_ok())
                .collect();
            legal.into_iter().take(REFUTATION_TRIES).find(|&r| {
                let mut b = self.board.clone();
                b.place(r, them);
                solver.wins_after(&b, me, me, Mode::Vct, None).0 == Verdict::NoWin
            })
        };
        let not_four = self.mode() == Mode::Vcf;
        match pick {
            Some(r) => {
                let idx = self.board.index(r);
                let counter = self.board.flags_at(idx, them) & threat::FOUR != 0;
                let reason = match (not_four, counter) {
                    (_, true) => {
                        format!("{t} answers at {r} with a four of its own, and the attack stalls.")
                    }
                    (true, false) => {
                        format!("{p} is not a four, so {t} has time to defend at {r}.")
                    }
                    (false, false) => {
                        format!("{t} defends at {r}, and {m} has no more threats that win.")
                    }
                };
                (vec![r], reason)
            }
            None => {
                let r = self
                    .puzzle
                    .first_moves
                    .iter()
                    .copied()
                    .find(|&k| self.board.get(k).is_none())
                    .or_else(|| nearest_legal(&self.board, p, them))
                    .unwrap_or(p);
                let reason = if replies.is_empty() {
                    format!("{p} makes no threat that wins; {t} takes {r}.")
                } else {
                    // A threat, but no forced win behind it that could be shown.
                    format!("{p} does not keep a forced win; {t} takes {r}.")
                };
                (vec![r], reason)
            }
        }
    }

    /// The player defended with `p`: is the opponent's win gone?
    fn after_defence(&mut self, solver: &mut Solver, p: Point) -> Grade {
        let me = self.player();
        let them = me.opponent();
        let (t, m) = (capitalised(them), capitalised(me));
        let (mut verdict, _) = solver.wins_after(&self.board, them, them, Mode::Vct, None);
        if verdict == Verdict::Unknown && self.on_key() {
            // As in an attack: a listed defence was proved when the puzzle was made.
            verdict = if self.trusted {
                Verdict::NoWin
            } else {
                let board = self.board.clone();
                verifying(solver, |s| {
                    s.wins_after(&board, them, them, Mode::Vct, None).0
                })
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
                        note: format!("{t} must block at {b}. Now stop the threat."),
                    };
                }
                self.state = State::Solved;
                Grade::Solved {
                    note: format!("{m} has stopped {t}'s attack."),
                }
            }
            Verdict::Win | Verdict::Unknown => {
                let sol = solver.solve(&self.board, them, Mode::Vct, None);
                let reason = match sol.line.first() {
                    Some(&f) if sol.verdict == Verdict::Win => {
                        let how = if sol.depth == 0
                            || solver.solve(&self.board, them, Mode::Vcf, None).verdict
                                == Verdict::Win
                        {
                            "wins with fours"
                        } else {
                            "wins with threes and fours"
                        };
                        format!("{p} does not stop it: {t} plays {f} and {how}.")
                    }
                    _ => format!("{p} could not be proved to stop {t}'s attack."),
                };
                self.fail(sol.line, reason)
            }
        }
    }

    /// The hint of a step (1: theme and length, 2: the area, 3: the move), for the position as
    /// it stands. `None` when the puzzle is over.
    pub fn hint(&self, solver: &mut Solver, step: u8) -> Option<Hint> {
        if self.state != State::Playing {
            return None;
        }
        solver.set_history(&self.start, &self.history);
        let key = self.key_move(solver);
        solver.set_history(&self.start, &[]);
        let key = key?;
        Some(match step {
            1 => Hint::Theme(self.theme_words()),
            2 => {
                // A 4x4 square holding the key move, placed by the move's own coordinates so
                // that the move is not always in the same corner.
                let n = self.board.size() as i32;
                let ox = (key.x as i32 * 7 + key.y as i32 * 3) % 4;
                let oy = (key.x as i32 * 5 + key.y as i32 * 11) % 4;
                let x0 = (key.x as i32 - ox).clamp(0, n - 4);
                let y0 = (key.y as i32 - oy).clamp(0, n - 4);
                Hint::Area {
                    from: Point::new(x0 as u8, y0 as u8),
                    to: Point::new((x0 + 3) as u8, (y0 + 3) as u8),
                }
            }
            _ => Hint::Move(key),
        })
    }

    fn theme_words(&self) -> String {
        let n = self.puzzle.length;
        let plural = |k: u16, one: &str, many: &str| {
            if k == 1 {
                format!("1 {one}")
            } else {
                format!("{k} {many}")
            }
        };
        match self.puzzle.theme {
            Theme::FourThree => "A four-three: one move makes a four and an open three.".into(),
            Theme::Vcf | Theme::ForbiddenWin => format!(
                "A win with fours: {}, then the five.",
                plural(n, "four", "fours")
            ),
            Theme::Vct => format!(
                "A win with threats: {} besides fours.",
                plural(n, "three or threat", "threes or threats")
            ),
            Theme::Defend => format!(
                "A defence: {} threatens a win; find the move that stops it.",
                capitalised(self.puzzle.attacker())
            ),
            Theme::ForbiddenTrap => {
                "A forbidden-point trap: make Black's only block a forbidden point.".into()
            }
        }
    }

    /// The next correct move from the position as it stands.
    fn key_move(&self, solver: &mut Solver) -> Option<Point> {
        let me = self.player();
        if self.history.is_empty() {
            if let Some(&m) = self.puzzle.line.first() {
                if self.puzzle.goal() == Goal::Win {
                    return Some(m);
                }
            }
            if self.puzzle.goal() == Goal::Defend {
                return self.puzzle.first_moves.first().copied();
            }
        }
        if self.puzzle.goal() == Goal::Win {
            if let Some(next) = self.next_on_line() {
                // Still on the answer key: its next move is proved.
                return Some(next);
            }
        }
        match self.puzzle.goal() {
            Goal::Win => {
                let sol = solver.solve(&self.board, me, self.mode(), None);
                let sol = if sol.verdict == Verdict::Win {
                    sol
                } else {
                    solver.solve(&self.board, me, Mode::Vct, None)
                };
                sol.line.first().copied()
            }
            Goal::Defend => solver
                .defences(&self.board, me, Mode::Vct)
                .moves
                .proved
                .first()
                .copied(),
        }
    }
}

/// Runs `f` with the budget puzzles are verified with ([`super::verify::NODE_LIMIT`], no VCF
/// spending limit), then puts the grading budget back.
fn verifying<T>(solver: &mut Solver, f: impl FnOnce(&mut Solver) -> T) -> T {
    let (nodes, spend) = (solver.config().node_limit, solver.config().vcf_spend_limit);
    solver.set_node_limit(super::verify::NODE_LIMIT);
    solver.set_vcf_spend_limit(None);
    let out = f(solver);
    solver.set_node_limit(nodes);
    solver.set_vcf_spend_limit(spend);
    out
}

/// The legal empty point nearest to `p` for colour `c`.
fn nearest_legal(board: &Board, p: Point, c: Stone) -> Option<Point> {
    let mut cands: Vec<(u32, Point)> = board
        .points()
        .filter(|&q| board.get(q).is_none() && q != p)
        .map(|q| {
            let d = (q.x as i32 - p.x as i32)
                .unsigned_abs()
                .max((q.y as i32 - p.y as i32).unsigned_abs());
            (d, q)
        })
        .collect();
    cands.sort_by_key(|&(d, q)| (d, q.y, q.x));
    cands
        .into_iter()
        .map(|(_, q)| q)
        .find(|&q| !board.rule().has_forbidden(c) || board.forbidden(q).is_none())
}

fn forbidden_reason(why: Forbidden) -> String {
    format!("it would make {} (forbidden for Black).", why.words())
}

fn forbidden_words(p: Point, why: Forbidden) -> String {
    format!("{p} is forbidden for Black: it makes {}.", why.words())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::notation;
    use crate::rules::Rule;

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
        let sol = s.solve(&p.board(), to_move, theme.mode(), None);
        p.line = sol.line;
        p.length = sol.depth;
        p.first_moves = s.winning_moves(&p.board(), to_move, theme.mode()).proved;
        p
    }

    #[test]
    fn an_alternative_winning_move_is_accepted() {
        // Black's open three h8-j8 plus a vertical pair: both ends of the three win.
        let p = puzzle(
            Rule::Freestyle,
            "h8 i8 j8",
            "a1 a3 o15",
            Stone::Black,
            Theme::Vcf,
        );
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
        let p = puzzle(
            Rule::Freestyle,
            "h8 i8 j8 e5 f5",
            "g8 l9 l10 l11 a1",
            Stone::Black,
            Theme::Vcf,
        );
        let mut solver = Solver::default();
        let mut s = Session::new(p);
        match s.play(&mut solver, "k8".parse().unwrap()) {
            Grade::Wrong { refutation, reason } => {
                assert_eq!(refutation[0].to_string(), "l8");
                assert!(reason.contains("four of its own"), "{reason}");
                assert_eq!(s.state(), State::Failed);
                assert!(s.undo());
                assert_eq!(s.board().get("k8".parse().unwrap()), None);
                assert_eq!(s.state(), State::Playing);
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
            Grade::Illegal { reason } => assert!(reason.contains("double three"), "{reason}"),
            other => panic!("{other:?}"),
        }
        assert_eq!(s.board().hash(), before);
        assert!(s.history().is_empty());
    }
}
