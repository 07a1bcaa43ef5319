//! `reference`: the Fivefold engine checked against the outside world.
//!
//! This is the one integration-test binary of the `fivefold-tests` crate. Every check in it
//! compares what the engine computes with a value or a definition that comes from outside the
//! engine, and every module names where its values come from:
//!
//! * a published source, cited by author, title and year (and the clause or section where
//!   there is one);
//! * a value recalled from a published source rather than looked up while writing the test is
//!   marked "from memory";
//! * a fact of the trade with no single published source is marked "common practice";
//! * a count we derive ourselves is derived in a comment next to it, so a reader can redo it.
//!
//! Run it with `cargo test -p fivefold-tests`; the whole binary takes a few seconds.
//!
//! Modules:

/// Small helpers shared by the modules: coordinates, stone lists, diagrams.
mod common;

/// `mnk`: complete enumeration of tic-tac-toe (the 3,3,3-game) with the engine's own win
/// detection, against the published game and position counts; and small k-variants whose
/// counts are derived by hand.
mod mnk;

/// `lines`: the number of five-cell lines on 15x15 (572) and 19x19 (1,020), and the count
/// for every size from a derivation.
mod lines;

/// `renju`: hand-built positions for each clause of the International Rules of Renju (RIF
/// 1996, with the 1998 correction) on forbidden points, checked through `Board::forbidden`,
/// `Board::forbidden_points` and `Game::play`; and the engine against a direct, independent
/// reading of those clauses on generated positions.
mod renju;

/// `shapes`: threat shapes on real boards against the definitions of Allis, van den Herik and
/// Huntjens, "Go-Moku and Threat-Space Search" (1993), with and without the edge or an
/// opponent stone blocking; combined threats; and the rule-aware cases (exact five).
mod shapes;

/// `properties`: randomised checks (proptest) of make/unmake, hashing, the eight symmetries
/// and the text formats.
mod properties;

/// `notation`: bad move lists, stone lists and diagrams give typed errors that name the token
/// and where it is, never a panic; driven in part by `tests/data/bad_move_lists.txt`.
mod notation;
