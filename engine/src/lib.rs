//! The Fivefold engine: board, rules, threat shapes, forcing-line search and puzzles for
//! five-in-a-row (freestyle, standard and renju) and for small m,n,k-games.
//!
//! This crate is a plain library. It has no web dependencies, does no I/O and never reads a
//! clock, so the same code runs natively (the `fivefold` command-line program, the tests) and in
//! the browser (the `web` crate). Callers pass in text and get values back; every parser
//! returns a typed error that says where its input is wrong.
#![deny(missing_docs)]

pub mod bitset;
pub mod board;
pub mod formats;
pub mod geometry;
pub mod logbook;
pub mod notation;
pub mod patterns;
pub mod play;
pub mod puzzle;
pub mod rating;
pub mod review;
pub mod rules;
pub mod schedule;
pub mod search;
pub mod study;
pub mod suite;
pub mod trainer;
pub mod types;
pub mod words;
pub mod zobrist;

pub use board::{Board, PointThreats};
pub use geometry::{Direction, Point, Symmetry};
pub use patterns::LineShape;
pub use rules::{Forbidden, Game, MoveError, Played};
pub use types::{Rule, RuleParseError, Stone, StoneParseError};
