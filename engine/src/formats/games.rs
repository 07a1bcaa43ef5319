//! The player's own game records: one type for a game taken in from outside, a reader and a
//! writer for files of our move lists, and one entry point that takes any such file.
//!
//! A [`GameRecord`] is a game as it was played: the board size, the moves in order with black
//! first and the colours alternating, the rule if the record names one, and what the record
//! says about the game (the players' names, a title, a date) kept as plain text. It also says
//! where it came from ([`Origin`]: which game of which kind of file, and the line it starts
//! on), so that the "My games" screen can point back to it.
//!
//! A record is valid by construction: every move is on the board and no point is taken twice
//! ([`GameRecord::new`] checks both). It is deliberately *not* checked against a rule when it is
//! read. The rule is often unknown until the player chooses it, and the same moves can be
//! legal under freestyle and illegal under renju (a black double three, say). So the check is a
//! separate step, [`GameRecord::replay`], which plays the moves through [`Game`] under a given
//! rule and names the first illegal move by number and point.
//!
//! # Files of move lists
//!
//! A move list is what the Study board reads (`h8 h9 i8 ...`, see [`crate::notation`]):
//! coordinates separated by spaces, commas or semicolons, black first. A file may hold several
//! games, one after another, separated as follows (our own convention):
//!
//! * a **blank line** (empty, or only spaces) ends the game before it, if that game has moves;
//! * a line whose first non-space character is **`#`** starts a new game, and the rest of that
//!   line, trimmed, is the game's title;
//! * every other line holds moves of the current game; a game may run over several lines.
//!
//! Every game needs at least one move, so a `#` line followed by another `#` line (or by the end
//! of the file) is an error rather than a silently empty game. The text must be UTF-8; lines
//! may end with LF or CR LF. A file of move lists says nothing about the board size or the
//! rule: the caller passes them in ([`Choices`]; the size defaults to 15x15).
//!
//! Errors name the game (its number in the file, counted from 1, and its title if it has one),
//! the move (its number in that game), the token and where it is: the line of the file and the
//! character on that line, both counted from 1.
//!
//! The moves themselves are read by [`notation::parse_points`], the Study board's own reader,
//! so both give the same messages. That reader looks at every token of its text once per
//! token, so a very long text would cost time quadratic in its length; since a game of `n x n`
//! points cannot have more than `n x n` valid moves, each game's text is cut after its
//! `n x n + 1`-th token before it is handed over. The cut changes no answer: the reader stops at
//! its first bad token, and among `n x n + 1` tokens there is always one.
//!
//! # One entry point
//!
//! [`read_games`] takes the bytes of a file the player opened or pasted and decides what it is:
//! text whose first non-space character is `(` is SGF (see [`super::sgf`]), anything else is a
//! file of move lists. Either every game of the file is returned, or an error and no game: a
//! file is never half-loaded.

use std::fmt;

use crate::board::BoardError;
use crate::geometry::{Point, MAX_SIDE};
use crate::notation::{self, ListError};
use crate::rules::{Game, MoveError};
use crate::types::Rule;
use crate::types::Stone;

use super::sgf::{self, SgfError, SgfWarning};

/// The board size of a game whose record does not give one, unless the caller chooses another:
/// 15x15, the board of the renju rules and the app's default.
pub const DEFAULT_SIZE: u8 = 15;

/// A place in a file: the line and the character on that line, both counted from 1.
///
/// A line ends at LF, CR LF or a lone CR. Characters are counted as UTF-8 characters, so a
/// name with accents does not shift the column; in bytes that are not UTF-8 every byte that is
/// not a UTF-8 continuation byte counts as one character.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Location {
    /// The line, from 1.
    pub line: usize,
    /// The character on the line, from 1.
    pub column: usize,
}

impl Location {
    /// The start of a file.
    pub const START: Location = Location { line: 1, column: 1 };

    /// The position of byte `offset` of `bytes` (an offset past the end gives the position
    /// just after the last byte).
    pub fn of_byte(bytes: &[u8], offset: usize) -> Location {
        Cursor::new(bytes).at(offset)
    }
}

/// Walks a file forward and names the positions of byte offsets asked for in ascending order,
/// so that naming many places costs one pass over the file (an offset before the last one
/// asked for starts the walk again from the top).
pub(crate) struct Cursor<'a> {
    bytes: &'a [u8],
    i: usize,
    here: Location,
    /// Bytes stepped over so far, restarts included.
    pub(crate) steps: usize,
}

impl<'a> Cursor<'a> {
    /// A cursor at the start of `bytes`.
    pub(crate) fn new(bytes: &'a [u8]) -> Cursor<'a> {
        Cursor {
            bytes,
            i: 0,
            here: Location::START,
            steps: 0,
        }
    }

    /// The position of byte `offset` (clamped to the end of the file).
    pub(crate) fn at(&mut self, offset: usize) -> Location {
        let target = offset.min(self.bytes.len());
        if target < self.i {
            self.i = 0;
            self.here = Location::START;
        }
        while self.i < target {
            let b = self.bytes[self.i];
            let next = self.bytes.get(self.i + 1);
            if b == b'\n' || (b == b'\r' && next != Some(&b'\n')) {
                self.here = Location {
                    line: self.here.line + 1,
                    column: 1,
                };
            } else if b != b'\r' && (b & 0xC0) != 0x80 {
                // A byte that starts a character (not a UTF-8 continuation byte).
                self.here.column += 1;
            }
            self.i += 1;
            self.steps += 1;
        }
        self.here
    }
}

impl fmt::Display for Location {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "line {}, column {}", self.line, self.column)
    }
}

/// The kind of file a game came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum RecordFormat {
    /// A file of our move lists (see the module documentation).
    MoveList,
    /// An SGF file (FF\[4\], game type GM\[4\]).
    Sgf,
}

impl RecordFormat {
    /// `"move list"` or `"SGF"`.
    pub const fn name(self) -> &'static str {
        match self {
            RecordFormat::MoveList => "move list",
            RecordFormat::Sgf => "SGF",
        }
    }
}

/// Where a game came from: which game of which kind of file, and where in the file it starts.
/// The file's own name is the caller's to keep, since the engine never sees files.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct Origin {
    /// The kind of file.
    pub format: RecordFormat,
    /// The game's number in its file, counted from 1.
    pub game: usize,
    /// Where the game starts in the file.
    pub at: Location,
}

impl Origin {
    /// The origin of a game that was not read from a file (made by hand or by a program): an
    /// only game of a move list, at the start.
    pub const MADE_HERE: Origin = Origin {
        format: RecordFormat::MoveList,
        game: 1,
        at: Location::START,
    };
}

impl fmt::Display for Origin {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "game {} of the {} file (line {})",
            self.game,
            self.format.name(),
            self.at.line
        )
    }
}

/// What a record says about a game besides its moves. Every field is text from outside the
/// program: show it as text, never as markup.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct GameInfo {
    /// The name of the player who had black.
    pub black: Option<String>,
    /// The name of the player who had white.
    pub white: Option<String>,
    /// A title for the game (SGF: the game name GN, else the event EV; a move-list file: the
    /// text of the game's `#` line).
    pub title: Option<String>,
    /// When the game was played, as the record writes it (SGF asks for `YYYY-MM-DD`, but the
    /// text is kept as it is).
    pub date: Option<String>,
}

/// What the player chose for the things a file may leave open. Each choice is used only where
/// the file is silent or unclear; what a file says plainly is kept.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash)]
pub struct Choices {
    /// The board size: for every game of a move-list file (default 15), and for an SGF game
    /// without an SZ property (SGF gives no default size for GM\[4\], so without a choice such
    /// a game is refused with a message asking for one).
    pub size: Option<u8>,
    /// The rule for games whose record names none, or names one that cannot be mapped to
    /// freestyle, standard or renju (without a choice such an SGF game is refused with a
    /// message asking the player to choose).
    pub rule: Option<Rule>,
}

/// Why a list of moves is not a valid game record.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum RecordError {
    /// The board size is not supported.
    Size(BoardError),
    /// A move is off the board.
    OffBoard {
        /// The move's number, counted from 1.
        number: usize,
        /// The point.
        point: Point,
    },
    /// A move is on a point an earlier move took.
    Taken {
        /// The move's number, counted from 1.
        number: usize,
        /// The point.
        point: Point,
        /// The number of the move that took it first.
        first: usize,
    },
}

impl fmt::Display for RecordError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RecordError::Size(e) => write!(f, "{e}"),
            RecordError::OffBoard { number, point } => {
                write!(f, "move {number}: {point} is off the board")
            }
            RecordError::Taken {
                number,
                point,
                first,
            } => write!(
                f,
                "move {number}: {point} was already taken by move {first}"
            ),
        }
    }
}

impl std::error::Error for RecordError {}

/// The first move of a record that the rule does not allow, found by [`GameRecord::replay`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ReplayError {
    /// Where the game came from.
    pub origin: Origin,
    /// The rule it was replayed under.
    pub rule: Rule,
    /// The move's number, counted from 1.
    pub number: usize,
    /// Who played it.
    pub colour: Stone,
    /// The point.
    pub point: Point,
    /// Why the rule refuses it (a forbidden point, or a move after the game was over).
    pub error: MoveError,
}

impl fmt::Display for ReplayError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{}, under {}: move {} ({} {}) is not allowed: {}",
            self.origin, self.rule, self.number, self.colour, self.point, self.error
        )
    }
}

impl std::error::Error for ReplayError {}

/// The points taken so far on a board of side at most 19, one bit each: small enough to make
/// afresh for every game of a file with many games, so that checking costs no more than the
/// moves themselves.
#[derive(Default)]
pub(crate) struct Taken([u64; 6]);

impl Taken {
    /// Marks `p` (with both coordinates below 19) as taken; `false` if it already was.
    pub(crate) fn take(&mut self, p: Point) -> bool {
        let i = usize::from(p.y) * usize::from(MAX_SIDE) + usize::from(p.x);
        let (word, bit) = (i / 64, 1u64 << (i % 64));
        let fresh = self.0[word] & bit == 0;
        self.0[word] |= bit;
        fresh
    }
}

/// The number (from 1) of the move among `earlier` that took `p` (0 if none did).
pub(crate) fn first_move_at(earlier: &[Point], p: Point) -> usize {
    earlier.iter().position(|&q| q == p).map_or(0, |i| i + 1)
}

/// A game taken in from outside: the board size, the moves (black first, alternating), the
/// rule if known, what the record says about the game, and where it came from.
///
/// Every move is on the board and no point is taken twice; nothing else is promised until
/// [`GameRecord::replay`] has played the moves under a rule.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct GameRecord {
    size: u8,
    moves: Vec<Point>,
    rule: Option<Rule>,
    info: GameInfo,
    origin: Origin,
}

impl GameRecord {
    /// A record of `moves` (black first, alternating) on a `size` x `size` board, with no rule,
    /// no information and [`Origin::MADE_HERE`]. Fails if the size is not supported (5 to 19),
    /// a move is off the board, or a point is taken twice.
    pub fn new(size: u8, moves: Vec<Point>) -> Result<GameRecord, RecordError> {
        GameRecord::check(size, &moves)?;
        Ok(GameRecord::checked(size, moves))
    }

    /// Why `moves` on a `size` x `size` board is not a valid record, if it is not.
    fn check(size: u8, moves: &[Point]) -> Result<(), RecordError> {
        if !(5..=MAX_SIDE).contains(&size) {
            return Err(RecordError::Size(BoardError::BadSize(size)));
        }
        let mut taken = Taken::default();
        for (i, &p) in moves.iter().enumerate() {
            if p.x >= size || p.y >= size {
                return Err(RecordError::OffBoard {
                    number: i + 1,
                    point: p,
                });
            }
            if !taken.take(p) {
                return Err(RecordError::Taken {
                    number: i + 1,
                    point: p,
                    first: first_move_at(&moves[..i], p),
                });
            }
        }
        Ok(())
    }

    /// A record whose moves the caller has already checked as [`GameRecord::new`] would.
    pub(crate) fn checked(size: u8, moves: Vec<Point>) -> GameRecord {
        debug_assert!(GameRecord::check(size, &moves).is_ok());
        GameRecord {
            size,
            moves,
            rule: None,
            info: GameInfo::default(),
            origin: Origin::MADE_HERE,
        }
    }

    /// The same record with the given rule (`None`: the rule is not known).
    pub fn with_rule(mut self, rule: Option<Rule>) -> GameRecord {
        self.rule = rule;
        self
    }

    /// The same record with the given information.
    pub fn with_info(mut self, info: GameInfo) -> GameRecord {
        self.info = info;
        self
    }

    /// The same record with the given origin.
    pub fn with_origin(mut self, origin: Origin) -> GameRecord {
        self.origin = origin;
        self
    }

    /// The side of the board.
    pub fn size(&self) -> u8 {
        self.size
    }

    /// The moves in order, black first.
    pub fn moves(&self) -> &[Point] {
        &self.moves
    }

    /// Who played move `index` (counted from 0): black for even indices.
    pub fn colour_of_move(index: usize) -> Stone {
        if index.is_multiple_of(2) {
            Stone::Black
        } else {
            Stone::White
        }
    }

    /// The rule the record names (or the player chose when reading it), if any.
    pub fn rule(&self) -> Option<Rule> {
        self.rule
    }

    /// What the record says about the game.
    pub fn info(&self) -> &GameInfo {
        &self.info
    }

    /// What the record says about the game, to change (for example when the player corrects a
    /// name).
    pub fn info_mut(&mut self) -> &mut GameInfo {
        &mut self.info
    }

    /// Where the record came from.
    pub fn origin(&self) -> Origin {
        self.origin
    }

    /// The colour played by the player called `name`, if exactly one of the record's two
    /// names is that name (compared without surrounding spaces and without regard to the case
    /// of ASCII letters; other letters must match as written, which spares the page the
    /// Unicode case tables). This is a suggestion for the "who played which colour" choice,
    /// never a decision.
    pub fn colour_of(&self, name: &str) -> Option<Stone> {
        let wanted = name.trim();
        if wanted.is_empty() {
            return None;
        }
        let is = |n: &Option<String>| {
            n.as_deref()
                .is_some_and(|s| s.trim().eq_ignore_ascii_case(wanted))
        };
        match (is(&self.info.black), is(&self.info.white)) {
            (true, false) => Some(Stone::Black),
            (false, true) => Some(Stone::White),
            _ => None,
        }
    }

    /// The moves as a move list (`h8 h9 i8`), as the Study board reads it.
    pub fn move_list(&self) -> String {
        notation::format_points(&self.moves)
    }

    /// Plays the moves from an empty board under `rule` and returns the game at the end, or
    /// the first move the rule does not allow (a forbidden point for black under renju, or a
    /// move after the game was already won), by number and point.
    pub fn replay(&self, rule: Rule) -> Result<Game, ReplayError> {
        let Ok(board) = crate::board::Board::new(self.size, rule) else {
            unreachable!("a record's size is checked when it is made");
        };
        let mut game = Game::new(board);
        for (i, &p) in self.moves.iter().enumerate() {
            if let Err(error) = game.play(p) {
                return Err(ReplayError {
                    origin: self.origin,
                    rule,
                    number: i + 1,
                    colour: GameRecord::colour_of_move(i),
                    point: p,
                    error,
                });
            }
        }
        Ok(game)
    }
}

/// What a file of move lists gets wrong.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum MoveListProblem {
    /// A move is not a coordinate, is off the board, or takes a point already taken. The
    /// entry's `column` is counted from 0 on its line of the file (not in the game's text), so
    /// that its message names the character a person finds in an editor.
    Move(Box<ListError>),
    /// A `#` line starts a game that has no moves.
    NoMoves,
    /// There is no game in the text at all.
    Empty,
    /// The board size chosen is not supported.
    Size(BoardError),
}

/// Why a file of move lists could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct MoveListFileError {
    /// The game's number in the file, counted from 1 (`None` when the problem is not one
    /// game's).
    pub game: Option<usize>,
    /// The game's title, if it has one.
    pub title: Option<String>,
    /// Where the problem is.
    pub at: Location,
    /// What the problem is.
    pub problem: MoveListProblem,
}

impl fmt::Display for MoveListFileError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(game) = self.game {
            write!(f, "game {game}")?;
            if let Some(title) = &self.title {
                write!(f, " ('{title}')")?;
            }
            write!(f, ", line {}: ", self.at.line)?;
        }
        match &self.problem {
            MoveListProblem::Move(e) => write!(f, "{e}"),
            MoveListProblem::NoMoves => write!(
                f,
                "this title has no moves after it (every '#' line starts a game, and a game \
                 needs at least one move)"
            ),
            MoveListProblem::Empty => write!(
                f,
                "there is no game in this text (expected move lists like 'h8 h9 i8', one game \
                 after another, separated by blank lines or '#' title lines)"
            ),
            MoveListProblem::Size(e) => write!(f, "{e}"),
        }
    }
}

impl std::error::Error for MoveListFileError {}

/// The separator test of [`notation`]'s move lists (whitespace, commas and semicolons), used
/// here only to count tokens; it must stay the same as the one in `notation`.
fn is_separator(c: char) -> bool {
    c.is_whitespace() || c == ',' || c == ';'
}

/// The end (a byte offset into `text`) of the `limit`-th token of `text`, or the whole text if
/// it has no more than `limit` tokens.
fn cut_after_tokens(text: &str, limit: usize) -> usize {
    let mut count = 0;
    let mut in_token = false;
    for (i, c) in text.char_indices() {
        if is_separator(c) {
            if in_token && count == limit {
                return i;
            }
            in_token = false;
        } else if !in_token {
            in_token = true;
            count += 1;
        }
    }
    text.len()
}

/// A game of a move-list file being collected: its title and the byte range of its moves.
struct Pending {
    title: Option<String>,
    title_at: Option<usize>,
    moves: Option<(usize, usize)>,
}

/// Reads a file of move lists (the separators are described in the module documentation).
/// Every game is on a `size` x `size` board, `choices.size` or 15 when not chosen, and gets the
/// rule `choices.rule`. Either every game is returned or the first error, naming the game, the
/// move and where it is.
pub fn read_move_lists(text: &str, choices: Choices) -> Result<Vec<GameRecord>, MoveListFileError> {
    let size = choices.size.unwrap_or(DEFAULT_SIZE);
    if !(5..=MAX_SIDE).contains(&size) {
        return Err(MoveListFileError {
            game: None,
            title: None,
            at: Location::START,
            problem: MoveListProblem::Size(BoardError::BadSize(size)),
        });
    }
    let mut games = Vec::new();
    let mut pending: Option<Pending> = None;
    let mut offset = 0;
    // Names where each game starts, in one pass over the text.
    let mut cursor = Cursor::new(text.as_bytes());
    let mut close = |games: &mut Vec<GameRecord>, done: Pending| {
        let number = games.len() + 1;
        games.push(finish(text, &mut cursor, done, number, size, choices.rule)?);
        Ok(())
    };
    for raw in text.split_inclusive('\n') {
        let start = offset;
        offset += raw.len();
        let line = raw.trim_end_matches(['\n', '\r']);
        let body = line.trim();
        if body.is_empty() {
            if let Some(done) = pending.take_if(|p| p.moves.is_some()) {
                close(&mut games, done)?;
            }
        } else if let Some(title) = body.strip_prefix('#') {
            if let Some(done) = pending.take() {
                close(&mut games, done)?;
            }
            let title = super::plain(title);
            let title = title.trim();
            pending = Some(Pending {
                title: (!title.is_empty()).then(|| title.to_string()),
                title_at: Some(start),
                moves: None,
            });
        } else {
            let end = start + line.len();
            let p = pending.get_or_insert(Pending {
                title: None,
                title_at: None,
                moves: None,
            });
            p.moves = Some(match p.moves {
                Some((first, _)) => (first, end),
                None => (start, end),
            });
        }
    }
    if let Some(done) = pending.take() {
        close(&mut games, done)?;
    }
    if games.is_empty() {
        return Err(MoveListFileError {
            game: None,
            title: None,
            at: Location::START,
            problem: MoveListProblem::Empty,
        });
    }
    Ok(games)
}

/// Turns a collected game into a record, or the error of its first bad move.
fn finish(
    text: &str,
    cursor: &mut Cursor<'_>,
    game: Pending,
    number: usize,
    size: u8,
    rule: Option<Rule>,
) -> Result<GameRecord, MoveListFileError> {
    let Some((from, to)) = game.moves else {
        return Err(MoveListFileError {
            game: Some(number),
            at: Location::of_byte(text.as_bytes(), game.title_at.unwrap_or(0)),
            title: game.title,
            problem: MoveListProblem::NoMoves,
        });
    };
    let cells = usize::from(size) * usize::from(size);
    let body = &text[from..to];
    let body = &body[..cut_after_tokens(body, cells + 1)];
    let points = notation::parse_points(body, "moves", size, size).map_err(|mut e| {
        // The entry's column counts characters of `body`; find its byte, then its place in the
        // file, and re-base the column to its line.
        let byte = body
            .char_indices()
            .nth(e.column)
            .map_or(body.len(), |(b, _)| b);
        let at = Location::of_byte(text.as_bytes(), from + byte);
        e.column = at.column - 1;
        MoveListFileError {
            game: Some(number),
            title: game.title.clone(),
            at,
            problem: MoveListProblem::Move(Box::new(e)),
        }
    })?;
    let start = game.title_at.unwrap_or(from);
    // `parse_points` has checked that every move is on the board and no point repeats.
    Ok(GameRecord::checked(size, points)
        .with_rule(rule)
        .with_info(GameInfo {
            title: game.title,
            ..GameInfo::default()
        })
        .with_origin(Origin {
            format: RecordFormat::MoveList,
            game: number,
            at: cursor.at(start),
        }))
}

/// Writes games as a file of move lists: each game as a `#` line with its title (`#` alone
/// when it has none) followed by its moves, ten to a line, and a blank line between games.
/// Reading the text back gives the same moves and titles (sizes, rules and names are not part
/// of this format). A title's line breaks are written as spaces, since a title is one line.
pub fn write_move_lists(records: &[GameRecord]) -> String {
    let mut out = String::new();
    for (i, r) in records.iter().enumerate() {
        if i > 0 {
            out.push('\n');
        }
        out.push('#');
        if let Some(title) = &r.info.title {
            let one_line: String = title
                .chars()
                .map(|c| if c.is_control() { ' ' } else { c })
                .collect();
            let one_line = one_line.trim();
            if !one_line.is_empty() {
                out.push(' ');
                out.push_str(one_line);
            }
        }
        out.push('\n');
        for chunk in r.moves.chunks(10) {
            out.push_str(&notation::format_points(chunk));
            out.push('\n');
        }
    }
    out
}

/// What a file held: its games, and the warnings the player should see (an SGF file's
/// variations that were not read, or properties that were skipped).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Loaded {
    /// The games, in file order.
    pub games: Vec<GameRecord>,
    /// Things the reader passed over, for the player to see.
    pub warnings: Vec<SgfWarning>,
}

/// Why a file of games could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ReadError {
    /// The file is SGF and something in it is wrong.
    Sgf(SgfError),
    /// The file is a file of move lists and something in it is wrong.
    MoveList(MoveListFileError),
    /// The file is neither SGF nor UTF-8 text.
    NotText {
        /// Where the first byte that is not UTF-8 is.
        at: Location,
    },
}

impl fmt::Display for ReadError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ReadError::Sgf(e) => write!(f, "{e}"),
            ReadError::MoveList(e) => write!(f, "{e}"),
            ReadError::NotText { at } => write!(
                f,
                "{at}: this file is not UTF-8 text (expected an SGF file or move lists)"
            ),
        }
    }
}

impl std::error::Error for ReadError {}

/// The bytes of a file after a UTF-8 byte order mark, if it has one (common practice: some
/// editors write one at the start of UTF-8 files).
pub(crate) fn skip_bom(bytes: &[u8]) -> (&[u8], usize) {
    match bytes.strip_prefix(b"\xEF\xBB\xBF") {
        Some(rest) => (rest, 3),
        None => (bytes, 0),
    }
}

/// Reads a file the player opened or pasted: SGF if its first non-space character is `(`,
/// otherwise a file of move lists. Either every game is returned, with any warnings, or an
/// error saying where the file is wrong.
pub fn read_games(bytes: &[u8], choices: Choices) -> Result<Loaded, ReadError> {
    let (body, _) = skip_bom(bytes);
    let first = body.iter().find(|b| !b.is_ascii_whitespace());
    if first == Some(&b'(') {
        return sgf::read_sgf(bytes, choices).map_err(ReadError::Sgf);
    }
    let text = std::str::from_utf8(bytes).map_err(|e| ReadError::NotText {
        at: Location::of_byte(bytes, e.valid_up_to()),
    })?;
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let games = read_move_lists(text, choices).map_err(ReadError::MoveList)?;
    Ok(Loaded {
        games,
        warnings: Vec::new(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::rules::Forbidden;

    fn pts(list: &str) -> Vec<Point> {
        notation::parse_points(list, "moves", 19, 19).unwrap()
    }

    #[test]
    fn positions_count_lines_and_characters() {
        // "é" is two bytes in UTF-8 and one character; CR LF is one line break.
        let text = "ab\r\nxé z\rq";
        let offsets = [0, 1, 4, 7, 9, 10, 99, 4];
        let mut cursor = Cursor::new(text.as_bytes());
        let lc: Vec<(usize, usize)> = offsets
            .iter()
            .map(|&o| cursor.at(o))
            .map(|p| (p.line, p.column))
            .collect();
        // The last offset goes back, and is found again from the top.
        let want = [
            (1, 1),
            (1, 2),
            (2, 1),
            (2, 3),
            (2, 5),
            (3, 1),
            (3, 2),
            (2, 1),
        ];
        assert_eq!(lc, want);
        assert_eq!(
            Location::of_byte(text.as_bytes(), 9),
            Location { line: 2, column: 5 }
        );
    }

    #[test]
    fn records_refuse_off_board_and_repeated_points() {
        assert_eq!(
            GameRecord::new(15, pts("h8 p16")),
            Err(RecordError::OffBoard {
                number: 2,
                point: Point::new(15, 15)
            })
        );
        assert_eq!(
            GameRecord::new(
                15,
                vec![Point::new(7, 7), Point::new(7, 8), Point::new(7, 7)]
            ),
            Err(RecordError::Taken {
                number: 3,
                point: Point::new(7, 7),
                first: 1
            })
        );
        assert_eq!(
            GameRecord::new(4, Vec::new()),
            Err(RecordError::Size(BoardError::BadSize(4)))
        );
    }

    #[test]
    fn replay_names_the_first_move_the_rule_refuses() {
        // Black's ninth move j8 makes two open threes (h8 i8 j8 across, j8 j9 j10 up): a
        // double three, forbidden for black by the renju rules (RIF 1996), an ordinary move
        // under freestyle. The white moves on the a file are far from everything.
        let r = GameRecord::new(15, pts("h8 a1 i8 a3 j9 a5 j10 a7 j8")).unwrap();
        assert!(r.replay(Rule::Freestyle).is_ok());
        let e = r.replay(Rule::Renju).unwrap_err();
        assert_eq!(
            (e.number, e.colour, e.point),
            (9, Stone::Black, Point::new(9, 7))
        );
        assert_eq!(
            e.error,
            MoveError::Forbidden(Point::new(9, 7), Forbidden::DoubleThree)
        );
        assert!(e.to_string().contains("move 9 (black j8)"), "{e}");
    }

    #[test]
    fn replay_refuses_moves_after_a_win() {
        let r = GameRecord::new(15, pts("a1 b1 a2 b2 a3 b3 a4 b4 a5 b5")).unwrap();
        let e = r.replay(Rule::Freestyle).unwrap_err();
        assert_eq!((e.number, e.error), (10, MoveError::GameOver));
    }

    #[test]
    fn names_suggest_a_colour_only_when_unambiguous() {
        let mut r = GameRecord::new(15, pts("h8")).unwrap();
        r.info_mut().black = Some("Ines Harrow".into());
        r.info_mut().white = Some("Pell Brightwater".into());
        assert_eq!(r.colour_of(" ines harrow "), Some(Stone::Black));
        assert_eq!(r.colour_of("Pell Brightwater"), Some(Stone::White));
        assert_eq!(r.colour_of("Odile Quay"), None);
        r.info_mut().white = Some("Ines Harrow".into());
        assert_eq!(r.colour_of("Ines Harrow"), None);
    }

    #[test]
    fn move_list_files_split_on_blank_lines_and_titles() {
        let text = "h8 h9\ni8\n\n  \n# Round 2: Odile v Rafe\nh8, i9\n\n\nj10 k11\n";
        let games = read_move_lists(text, Choices::default()).unwrap();
        assert_eq!(games.len(), 3);
        assert_eq!(games[0].move_list(), "h8 h9 i8");
        assert_eq!(games[0].info().title, None);
        assert_eq!(games[1].move_list(), "h8 i9");
        assert_eq!(
            games[1].info().title.as_deref(),
            Some("Round 2: Odile v Rafe")
        );
        assert_eq!(games[1].origin().at.line, 5);
        assert_eq!(games[2].move_list(), "j10 k11");
        assert_eq!(games[2].origin().game, 3);
        assert_eq!(games[2].origin().at.line, 9);
    }

    #[test]
    fn move_list_errors_name_game_move_line_and_character() {
        let text = "h8 h9\n\n# Second\nh8 i9\n  j10 p16\n";
        let e = read_move_lists(text, Choices::default()).unwrap_err();
        assert_eq!(e.game, Some(2));
        assert_eq!(e.title.as_deref(), Some("Second"));
        assert_eq!(e.at, Location { line: 5, column: 7 });
        let MoveListProblem::Move(ref list) = e.problem else {
            panic!("{e:?}")
        };
        assert_eq!((list.index, list.token.as_str()), (4, "p16"));
        assert_eq!(
            e.to_string(),
            "game 2 ('Second'), line 5: move 4 ('p16', at character 7): off the 15x15 board"
        );
        let e = read_move_lists("# Lonely title\n# Next\nh8\n", Choices::default()).unwrap_err();
        assert_eq!(
            (e.game, e.problem.clone()),
            (Some(1), MoveListProblem::NoMoves)
        );
        let e = read_move_lists(" \n\n", Choices::default()).unwrap_err();
        assert_eq!(e.problem, MoveListProblem::Empty);
    }

    #[test]
    fn long_games_are_cut_without_changing_the_answer() {
        // 226 distinct tokens would need 226 points on a 15x15 board (225): the cut keeps the
        // first bad token either way.
        let mut all: Vec<String> = Vec::new();
        for y in 1..=15 {
            for x in b'a'..=b'o' {
                all.push(format!("{}{y}", x as char));
            }
        }
        all.push("h8".into());
        all.push("zz".into());
        let e = read_move_lists(&all.join(" "), Choices::default()).unwrap_err();
        let MoveListProblem::Move(list) = e.problem else {
            panic!()
        };
        assert_eq!((list.index, list.token.as_str()), (226, "h8"));
    }

    #[test]
    fn written_move_lists_read_back() {
        let mut a = GameRecord::new(15, pts("h8 h9 i8 i9 j8 j9 k8 k9 a1 a2 a3 b3")).unwrap();
        a.info_mut().title = Some("Ladder\nround 1".into());
        let b = GameRecord::new(15, pts("o15")).unwrap();
        let text = write_move_lists(&[a.clone(), b.clone()]);
        let back = read_move_lists(&text, Choices::default()).unwrap();
        assert_eq!(back.len(), 2);
        assert_eq!(back[0].moves(), a.moves());
        assert_eq!(back[0].info().title.as_deref(), Some("Ladder round 1"));
        assert_eq!(back[1].moves(), b.moves());
        assert_eq!(back[1].info().title, None);
    }

    #[test]
    fn read_games_tells_sgf_from_move_lists() {
        let sgf = read_games(
            b"\xEF\xBB\xBF (;FF[4]GM[4]SZ[15];B[hh])",
            Choices::default(),
        )
        .unwrap();
        assert_eq!(sgf.games[0].origin().format, RecordFormat::Sgf);
        assert_eq!(sgf.games[0].move_list(), "h8");
        let text = read_games(b"h8 h9", Choices::default()).unwrap();
        assert_eq!(text.games[0].origin().format, RecordFormat::MoveList);
        let e = read_games(b"h8 \xFF", Choices::default()).unwrap_err();
        assert_eq!(
            e,
            ReadError::NotText {
                at: Location { line: 1, column: 4 }
            }
        );
    }
}
