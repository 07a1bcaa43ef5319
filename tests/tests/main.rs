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
//! Run it with `cargo test -p fivefold-tests`, or faster with `--release`: the reference
//! modules take a few seconds; the solver modules (`solver_*`) about 40 s in release on two
//! cores and several minutes in the default profile, most of it the soundness sweep. Tests
//! on minimal positions guard the engine bugs this suite found (all fixed).
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

/// `game_records`: the player's own game records read from `tests/data/` (hand-written SGF
/// collections and move-list files): SGF FF[4] syntax, escapes, old lower-case names, the
/// coordinate conversion at both corners, variations, every refusal with its place, replay
/// under a rule, round trips through our writers, and arbitrary bytes.
mod game_records;

/// `solver_exact`: exact solving of small m,n,k boards against the published game values
/// (Uiterwijk and van den Herik, "The advantage of the initiative", 2000).
mod solver_exact;

/// `referee`: an independent, deliberately simple judge of forcing lines (own five and four
/// detection, renju legality through `renju::reading`, an exhaustive VCF search, and a
/// confirmation of claimed wins against every defender reply). Used by the solver checks.
mod referee;

/// `samples`: seeded middle-game positions on small boards for the solver checks.
mod samples;

/// `solver_sound`: every VCF and VCT win the solver claims on 2,000 seeded positions is
/// confirmed by the referee, and every VCF no-win by its exhaustive fours-only search.
mod solver_sound;

/// `solver_trade`: hand-built positions from the trade: a four-three wins, a four-three
/// loses to a counter-four made by the forced block, an open three and a broken three must
/// be answered at their ends (and gap), no threat means nothing to defend; and the engine
/// bugs found, on minimal positions (all fixed; the tests guard them).
mod solver_trade;

/// `solver_consistency`: every VCF win is a VCT win; answers are invariant under the eight
/// symmetries; the rules give the expected different answers (an overline four under
/// freestyle and standard; renju's forbidden-point traps against freestyle).
mod solver_consistency;

/// `solver_determinism`: the same question under the same node budget gives the same
/// answer, node count and line; a reused solver gives the verdicts of a fresh one.
mod solver_determinism;

/// `library`: the starter library in `puzzles/` proves again puzzle by puzzle; a shipped set
/// regenerates byte for byte from its seed (every set with `FIVEFOLD_FULL=1`, the first deep
/// puzzle otherwise); nine in ten keys of every theme are unique; the deep sets' lines are
/// long, unique and take no detour; ratings follow line length; the fixture set (checked in
/// the browser too) is what the generator makes.
mod library;

/// `budgets`: a budget of N nodes is a hard limit on a whole study question (sub-searches
/// included) on the slowest suite positions and a library position that once ran far past
/// it; a stop check hears the nodes spent and ends the question.
mod budgets;

/// `formats`: every set the set-file reader accepts round-trips through a share code
/// (proptest over generated sets); a set at every limit fits each format, and one step over
/// a limit is refused with the limit named.
mod formats;

/// `refutations`: every refutation the grader shows (for every point near the stones of a
/// sample of the library) is checked by the Study board's own question at the verification
/// budget: the reply leaves no win, the opponent's win is a win, a "not forcing" move forces
/// nothing.
mod refutations;

/// `review`: hand-built games checked move by move (a missed win with fours, an allowed
/// four-three, a missed only defence, a renju forbidden point played after a blunder, a game
/// with nothing to find), each finding reasoned from the trade's rules of thumb and the renju
/// rules; every puzzle made from them proves again.
mod review;

/// `tidy`: guards on the code's shape: every engine module in the DEVELOPERS.md code map with
/// an invariant, no web crate in the engine, no two public types with one name, no `unsafe`.
mod tidy;

/// `schedule`: the FSRS-6 review scheduler against 425 reviews computed by the reference
/// scheduler of the open-spaced-repetition project (py-fsrs 6.3.2), stored in
/// `tests/data/fsrs6_vectors.txt` with the script that wrote them; the starter library through
/// a stored review deck and back.
mod schedule;
