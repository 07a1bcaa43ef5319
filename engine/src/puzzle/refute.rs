//! Why an attacking move fails, and the opponent's answer that shows it, proved.
//!
//! The grader calls a move wrong only after both searches (in the class of the line so far,
//! and afresh) found no win after it. The refutation it then shows must refute: a reply after
//! which the attacker has no win in the puzzle's class, neither in the line's class nor
//! afresh (which is what the Study board asks, so the player can check it there). In turn:
//! * the move was a four: the block is forced, and is shown if the attacker has no win after
//!   it;
//! * the opponent now wins with fours of its own: that win is shown;
//! * the move is no forcing move of the puzzle's class (not a four in a puzzle about fours,
//!   no threat in a puzzle about threats): the opponent is free, any reply would be an
//!   arbitrary one, so none is shown and the reason says so;
//! * otherwise the replies are tried in order (the replies the disproofs found, read from the
//!   table, then the answer key's points, then the replies the search considers) until one is
//!   proved to stop the attack.
//!
//! When nothing can be proved within the budget there is no refutation (`None`), and the
//! grader says the move is undecided.

use super::grade::{Session, WrongReason};
use crate::board::threat;
use crate::geometry::Point;
use crate::search::{Budget, Mode, Solver, Verdict};

/// How many defender replies a refutation tries before it gives up.
const REFUTATION_TRIES: usize = 8;

impl Session {
    /// The refutation of the attacking move just played (the opponent to move), proved, with
    /// its reason; `None` when none could be proved within the grading budget.
    pub(super) fn refute_attack(&self, solver: &mut Solver) -> Option<(Vec<Point>, WrongReason)> {
        let me = self.player();
        let them = me.opponent();
        let mode = self.mode();
        let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
        if let Some(&f) = fives.first() {
            // The move was a four: the block is forced.
            let block = self.board.point(f);
            let counter_four = self.board.flags_at(f, them) & threat::FOUR != 0;
            return self.stops(solver, block).then(|| {
                (
                    vec![block],
                    WrongReason::NoFollowUp {
                        block,
                        counter_four,
                        fours: mode == Mode::Vcf,
                    },
                )
            });
        }
        let fours = mode == Mode::Vcf;
        // Not a four: the opponent has a free move. A win with fours of its own refutes.
        let own = solver
            .ask(Budget::GRADING)
            .solve(&self.board, them, Mode::Vcf);
        if let (Verdict::Win, Some(&first)) = (own.verdict, own.line.first()) {
            return Some((
                own.line,
                WrongReason::OpponentWins {
                    first,
                    not_a_four: fours,
                },
            ));
        }
        // The replies the disproofs found, afresh and in the class of the line so far.
        let (_, fresh) = solver
            .ask(Budget::GRADING)
            .refutation(&self.board, me, mode);
        let (_, in_line) = self
            .ask(solver, Budget::GRADING)
            .refutation(&self.board, me, mode);
        let replies = self
            .ask(solver, Budget::GRADING)
            .defender_replies(&self.board, me, mode);
        if fresh.is_none() && in_line.is_none() && replies.is_empty() {
            // No threat of the puzzle's class: the opponent is free, and nothing is shown.
            return Some((Vec::new(), WrongReason::NotForcing { fours }));
        }
        let mut cands: Vec<Point> = Vec::new();
        let keys = self.puzzle.first_moves.iter();
        for k in fresh.iter().chain(&in_line).chain(keys).chain(&replies) {
            if self.board.get(*k).is_none() && !cands.contains(k) {
                cands.push(*k);
            }
        }
        let at = cands
            .into_iter()
            .filter(|&r| self.board.check_move(r, them).is_ok())
            .take(REFUTATION_TRIES)
            .find(|&r| self.stops(solver, r))?;
        let idx = self.board.index(at);
        let counter_four = self.board.flags_at(idx, them) & threat::FOUR != 0;
        Some((
            vec![at],
            WrongReason::Stopped {
                at,
                counter_four,
                not_a_four: fours,
            },
        ))
    }

    /// Whether the opponent's reply `r` leaves the attacker with no win in the puzzle's class,
    /// proved in the class of the line so far and afresh.
    fn stops(&self, solver: &mut Solver, r: Point) -> bool {
        let me = self.player();
        let mode = self.mode();
        let mut b = self.board.clone();
        b.place(r, me.opponent());
        let in_line = self
            .ask(solver, Budget::GRADING)
            .wins_after(&b, me, me, mode)
            .0;
        in_line == Verdict::NoWin
            && (mode == Mode::Vcf
                || solver.ask(Budget::GRADING).wins_after(&b, me, me, mode).0 == Verdict::NoWin)
    }
}
