//! How a player's try at one puzzle went: the one vocabulary of outcomes that the puzzle
//! screens, saved progress, result codes and (later) the review schedule all share.
//!
//! An attempt is [`Attempt::Untried`] until the player does anything, [`Attempt::Trying`] while
//! moves, hints or wrong tries are on record but the puzzle is not finished, and ends as
//! [`Attempt::Clean`] (solved with no wrong move and no hint), [`Attempt::Helped`] (solved after a
//! wrong move or with a hint) or [`Attempt::Failed`] (the last move was wrong and its refutation
//! was played). A puzzle tried again keeps its record by [`Attempt::merge`]; a result code records
//! [`Attempt::recorded`], where an unfinished try counts as not solved.

use std::fmt;
use std::str::FromStr;

use super::grade::State;

/// How a try at one puzzle went.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug, PartialOrd, Ord)]
pub enum Attempt {
    /// Nothing done yet.
    Untried,
    /// Moves, hints or a wrong try on record, not finished.
    Trying,
    /// Solved with no wrong move and no hint.
    Clean,
    /// Solved after a wrong move or with a hint.
    Helped,
    /// The last move was wrong and its refutation is on the board; not solved since.
    Failed,
}

impl Attempt {
    /// Every attempt, in the order above.
    pub const ALL: [Attempt; 5] = [
        Attempt::Untried,
        Attempt::Trying,
        Attempt::Clean,
        Attempt::Helped,
        Attempt::Failed,
    ];

    /// The name stored in saved progress: `untried`, `trying`, `clean`, `helped`, `failed`.
    pub const fn name(self) -> &'static str {
        match self {
            Attempt::Untried => "untried",
            Attempt::Trying => "trying",
            Attempt::Clean => "clean",
            Attempt::Helped => "helped",
            Attempt::Failed => "failed",
        }
    }

    /// The attempt as the live puzzle stands: the session's state, the wrong tries and hint
    /// steps counted so far, and the moves on the board since the start.
    pub fn of(state: State, wrong: u32, hints: u8, moves: usize) -> Attempt {
        match state {
            State::Solved if wrong == 0 && hints == 0 => Attempt::Clean,
            State::Solved => Attempt::Helped,
            State::Failed => Attempt::Failed,
            State::Playing if wrong == 0 && hints == 0 && moves == 0 => Attempt::Untried,
            State::Playing => Attempt::Trying,
        }
    }

    /// Whether the puzzle was solved (clean or with help).
    pub const fn solved(self) -> bool {
        matches!(self, Attempt::Clean | Attempt::Helped)
    }

    /// Whether the try is over (solved or failed).
    pub const fn finished(self) -> bool {
        matches!(self, Attempt::Clean | Attempt::Helped | Attempt::Failed)
    }

    /// The record after a puzzle with record `self` was played again and now stands at `now`.
    /// The first solve counts: a solved puzzle stays as it was solved. Otherwise a finished
    /// try replaces the record (a failure, or a solve after it, which is then `Helped`, since
    /// the wrong tries stay counted), and an untried puzzle becomes `Trying` once touched.
    pub fn merge(self, now: Attempt) -> Attempt {
        if self.solved() {
            return self;
        }
        match now {
            Attempt::Clean | Attempt::Helped | Attempt::Failed => now,
            Attempt::Trying if self == Attempt::Untried => Attempt::Trying,
            _ => self,
        }
    }

    /// What a result code records for it: an unfinished try counts as failed, since the
    /// puzzle was seen and not solved.
    pub const fn recorded(self) -> Attempt {
        match self {
            Attempt::Trying => Attempt::Failed,
            other => other,
        }
    }
}

/// An attempt serialises as its name, like `"helped"`.
impl serde::Serialize for Attempt {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

impl fmt::Display for Attempt {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Text that names no attempt.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct AttemptParseError(pub String);

impl fmt::Display for AttemptParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "unknown outcome '{}' (expected untried, trying, clean, helped or failed)",
            self.0
        )
    }
}

impl std::error::Error for AttemptParseError {}

impl FromStr for Attempt {
    type Err = AttemptParseError;
    fn from_str(s: &str) -> Result<Attempt, AttemptParseError> {
        Attempt::ALL
            .into_iter()
            .find(|a| a.name() == s)
            .ok_or_else(|| AttemptParseError(s.to_string()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_live_state_gives_the_attempt() {
        assert_eq!(Attempt::of(State::Playing, 0, 0, 0), Attempt::Untried);
        assert_eq!(Attempt::of(State::Playing, 0, 0, 2), Attempt::Trying);
        assert_eq!(Attempt::of(State::Playing, 1, 0, 0), Attempt::Trying);
        assert_eq!(Attempt::of(State::Playing, 0, 1, 0), Attempt::Trying);
        assert_eq!(Attempt::of(State::Solved, 0, 0, 7), Attempt::Clean);
        assert_eq!(Attempt::of(State::Solved, 1, 0, 7), Attempt::Helped);
        assert_eq!(Attempt::of(State::Solved, 0, 3, 7), Attempt::Helped);
        assert_eq!(Attempt::of(State::Failed, 1, 0, 2), Attempt::Failed);
    }

    #[test]
    fn the_first_solve_counts_and_a_failure_can_be_made_good() {
        use Attempt::*;
        for a in Attempt::ALL {
            // A solved record never changes.
            assert_eq!(Clean.merge(a), Clean);
            assert_eq!(Helped.merge(a), Helped);
            // Nothing new happened: the record stays.
            assert_eq!(a.merge(Untried), a);
        }
        assert_eq!(Untried.merge(Trying), Trying);
        assert_eq!(Failed.merge(Trying), Failed);
        assert_eq!(Trying.merge(Failed), Failed);
        assert_eq!(Failed.merge(Helped), Helped);
        assert_eq!(Untried.merge(Clean), Clean);
    }

    #[test]
    fn a_result_code_counts_an_unfinished_try_as_failed() {
        let recorded: Vec<Attempt> = Attempt::ALL.iter().map(|a| a.recorded()).collect();
        use Attempt::*;
        assert_eq!(recorded, vec![Untried, Failed, Clean, Helped, Failed]);
    }

    #[test]
    fn names_round_trip() {
        for a in Attempt::ALL {
            assert_eq!(a.name().parse::<Attempt>(), Ok(a));
        }
        assert!("solved".parse::<Attempt>().is_err());
    }
}
