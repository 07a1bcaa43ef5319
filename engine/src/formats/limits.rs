//! The limits of a puzzle set, one list for every format that carries a set (the set file, the
//! share code) and for every writer (the generator, the page's set builder).
//!
//! Every reader of outside input checks them before it allocates for what the input claims, so
//! a file or code of any size costs time and memory in proportion to what is allowed, not to
//! what is claimed; every writer checks them before it writes (through
//! [`setfile::check`](super::setfile::check)), so that nothing we write is refused when it is
//! read back. The values come from use, with room to spare:
//!
//! - A class set, handed out for one evening, holds 1 to 40 puzzles; a club's library set
//!   holds up to [`MAX_PUZZLES`] (1,000), which is also what a phone loads in well under a
//!   second. Sets larger than that are split.
//! - A title is a heading on a phone and on a printed sheet: [`MAX_TITLE_BYTES`] (200 bytes of
//!   UTF-8, some 200 Latin letters or 66 characters of a script that takes three bytes each).
//! - A puzzle id is a label for files and links: [`MAX_ID_BYTES`] (64 bytes); the generator's
//!   ids take 15.
//! - A puzzle is a position from a game in progress: at most [`MAX_STONES`] stones of both
//!   colours together (256, a game of 256 moves, more than most 19x19 games last).
//! - A main line is one forcing line: at most [`MAX_LINE`] moves (128). The deepest lines
//!   strong players read run 20 to 40 moves; the generator's are shorter still.
//! - The answers of a puzzle are distinct empty points of its board, so their number is bounded
//!   by the board (361 on 19x19) without a limit of their own.
//! - A set file is at most [`MAX_FILE_BYTES`] (16 MiB): a set at every limit above (1,000
//!   puzzles on 19x19, each with 256 stones, every other point an answer and a line of 128
//!   moves), written with the writer's indentation, takes about 8 MiB (a test checks it).

/// Puzzles in one set: at least one, at most this many.
pub const MAX_PUZZLES: usize = 1_000;
/// Bytes (UTF-8) of a set's title.
pub const MAX_TITLE_BYTES: usize = 200;
/// Bytes (UTF-8) of a puzzle's id. Ids are never empty.
pub const MAX_ID_BYTES: usize = 64;
/// Stones on a puzzle's board, black and white together.
pub const MAX_STONES: usize = 256;
/// Moves in a puzzle's main line.
pub const MAX_LINE: usize = 128;
/// Bytes of a set file.
pub const MAX_FILE_BYTES: usize = 16 << 20;
/// The largest rating a puzzle may carry (the Glicko scale; 1500 is an average club player).
pub const MAX_RATING: u32 = 4_000;
/// The largest `length` a puzzle may carry (fours, threats or threat length).
pub const MAX_LENGTH: u16 = 200;
/// The smallest board side.
pub const MIN_SIZE: u8 = 5;
/// The largest board side.
pub const MAX_SIZE: u8 = 19;
