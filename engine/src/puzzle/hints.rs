//! The three hint steps of a puzzle: the theme and the length, the area of the key move, the
//! move itself. The key move is the answer key's while the player follows it, and otherwise the
//! solver's, asked with [`Budget::GRADING`] and the moves since the start.

use super::grade::{Session, State};
use super::{Goal, Theme};
use crate::geometry::Point;
use crate::search::{Budget, Mode, Solver, Verdict};
use crate::types::Stone;

/// One of the three hint steps.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Hint {
    /// The theme and the length.
    Theme {
        /// The puzzle's theme.
        theme: Theme,
        /// Its length in the theme's measure (see [`super::Puzzle::length`]).
        length: u16,
        /// The attacking side (the opponent in a defence puzzle).
        attacker: Stone,
    },
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

impl Session {
    /// The hint of a step (1: theme and length, 2: the area, 3: the move), for the position as
    /// it stands. `None` when the puzzle is over.
    pub fn hint(&self, solver: &mut Solver, step: u8) -> Option<Hint> {
        if self.state != State::Playing {
            return None;
        }
        let key = self.key_move(solver)?;
        Some(match step {
            1 => Hint::Theme {
                theme: self.puzzle.theme,
                length: self.puzzle.length,
                attacker: self.puzzle.attacker(),
            },
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

    /// The next correct move from the position as it stands: the answer key's while the player
    /// follows it and the key was proved here (see [`Session::trust_key`]), else the solver's
    /// own (a key from outside may be wrong: a hint never repeats it unproved).
    fn key_move(&self, solver: &mut Solver) -> Option<Point> {
        let me = self.player();
        if !self.trusted {
            return self.solved_key(solver, me);
        }
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
        self.solved_key(solver, me)
    }

    /// The next correct move as the solver finds it.
    fn solved_key(&self, solver: &mut Solver, me: Stone) -> Option<Point> {
        let mut ask = self.ask(solver, Budget::GRADING);
        match self.puzzle.goal() {
            Goal::Win => {
                // The puzzle's own kind only: a win with threes named in a puzzle about fours
                // would be graded wrong.
                let sol = ask.solve(&self.board, me, self.mode());
                (sol.verdict == Verdict::Win)
                    .then(|| sol.line.first().copied())
                    .flatten()
            }
            Goal::Defend => ask
                .defences(&self.board, me, Mode::Vct)
                .moves
                .proved
                .first()
                .copied(),
        }
    }
}
