//! Revisit's schedule: when a missed puzzle comes back.
//!
//! Every puzzle the player failed, or solved only with help, goes into a review [`deck::Deck`]
//! and comes back on a schedule made by FSRS, the Free Spaced Repetition Scheduler of the
//! open-spaced-repetition project ([`fsrs`]). FSRS predicts the probability that the player
//! still remembers a puzzle (its retrievability) from two numbers per puzzle, stability and
//! difficulty, and sets the next review for the day that probability falls to the desired
//! retention (0.9). The project's published benchmark (srs-benchmark) ranks it above SM-2 at
//! predicting recall, which is why it is used here rather than the older method.
//!
//! The schedule is a pure function of what happened and when. The engine reads no clock:
//! callers pass the day as a [`Day`], the number of whole days since 1970-01-01 in UTC (what
//! `Math.floor(Date.now() / 86400000)` gives in the browser). Whole days are enough: FSRS
//! itself measures elapsed time in whole days (the reference implementations take the day
//! part of the time between reviews), the only sub-day feature of the reference schedulers is
//! their minute-long learning steps, and Revisit has none, since a puzzle missed today comes
//! back tomorrow at the earliest. Two reviews on the same day are still told apart from
//! reviews on different days, and FSRS's short-term formula handles them.

pub mod deck;
pub mod fsrs;
pub(crate) mod stored;

pub use deck::{Deck, DeckError, Item, Screen, Source};
pub use fsrs::{Card, Recall, Scheduler, Stage};

/// A day: whole days since 1970-01-01 in UTC. Day 0 is 1970-01-01; day 20,454 is 2026-01-01.
pub type Day = u32;
