//! Why an attacking move fails, and the opponent's answer that shows it.
//!
//! After a wrong attacking move the opponent is to move. In turn: if the move was a four, the
//! block is forced and is the answer; if the opponent now wins by fours, that win is the
//! answer; otherwise one reply that stops the attack is enough: the answer key's points first
//! (taking the point the attacker needed is the plainest refutation), then the replies the
//! search considers against the attacker's threat, until one is proved to leave no win. This
//! is one search per reply tried, not the full defence list, so that it fits the grading
//! budget.

use super::grade::{nearest_legal, Session, WrongReason};
use crate::board::threat;
use crate::geometry::Point;
use crate::search::{Asking, Mode, Verdict};

/// How many defender replies a refutation tries before it settles for the plain answer.
const REFUTATION_TRIES: usize = 8;

impl Session {
    /// Why the attacking move `p` fails, and the opponent's answer that shows it.
    pub(super) fn refute_attack(&self, ask: &mut Asking, p: Point) -> (Vec<Point>, WrongReason) {
        let me = self.player();
        let them = me.opponent();
        let not_a_four = self.mode() == Mode::Vcf;
        let fives: Vec<usize> = self.board.cells_with(me, threat::FIVE).iter().collect();
        if let Some(&f) = fives.first() {
            // The move was a four: the block is forced.
            let block = self.board.point(f);
            let counter_four = self.board.flags_at(f, them) & threat::FOUR != 0;
            return (
                vec![block],
                WrongReason::NoFollowUp {
                    block,
                    counter_four,
                },
            );
        }
        // Not a four: the opponent has a free move.
        let own = ask.solve(&self.board, them, Mode::Vcf);
        if let (Verdict::Win, Some(&first)) = (own.verdict, own.line.first()) {
            return (own.line, WrongReason::OpponentWins { first, not_a_four });
        }
        let replies = ask.defender_replies(&self.board, me, Mode::Vct);
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
                .filter(|&r| self.board.check_move(r, them).is_ok())
                .collect();
            legal.into_iter().take(REFUTATION_TRIES).find(|&r| {
                let mut b = self.board.clone();
                b.place(r, them);
                ask.wins_after(&b, me, me, Mode::Vct).0 == Verdict::NoWin
            })
        };
        match pick {
            Some(at) => {
                let idx = self.board.index(at);
                let counter_four = self.board.flags_at(idx, them) & threat::FOUR != 0;
                (
                    vec![at],
                    WrongReason::Stopped {
                        at,
                        counter_four,
                        not_a_four,
                    },
                )
            }
            None => {
                let at = self
                    .puzzle
                    .first_moves
                    .iter()
                    .copied()
                    .find(|&k| self.board.get(k).is_none())
                    .or_else(|| nearest_legal(&self.board, p, them))
                    .unwrap_or(p);
                let reason = if replies.is_empty() {
                    WrongReason::NoThreat { at }
                } else {
                    // A threat, but no forced win behind it that could be shown.
                    WrongReason::NotKept { at }
                };
                (vec![at], reason)
            }
        }
    }
}
