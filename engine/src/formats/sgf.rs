//! SGF game records: a reader of the subset a five-in-a-row game needs, and a writer.
//!
//! SGF (the Smart Game Format) is an open standard; this module follows its fourth version,
//! FF\[4\], as published at `red-bean.com/sgf/`: the basic definition (`sgf4.html`: the EBNF of
//! section 2.1, the Text and SimpleText types of sections 3.2 and 3.3), the property index
//! (`properties.html`), and the notes on converting older files (`converting.html`). Citations
//! below name those pages.
//!
//! # Why our own reader
//!
//! A general SGF crate was weighed first. `sgf-parse` 4.2.8 added 109,378 bytes (41,164
//! gzipped) to a release wasm32 build of a two-line test crate, and 98,547 bytes (28,917
//! gzipped, after `wasm-bindgen` as the page is built) to the app's own module when it was
//! only asked for each game's main line; its parse errors do not say where in the file they
//! are, either. The subset needed here is small: the tree syntax, a dozen properties and one
//! coordinate type. So this is a reader of that subset, written from the specification, with
//! every error naming the property and its line and column, and with its work counted in a
//! test to show that it is linear in the length of the file. This module and
//! [`super::games`] together (reading, replaying and writing) added 37,788 bytes (15,872
//! gzipped) to the app's module in the same measurement. The code avoids what would pull
//! large library code into the page: no Unicode case tables, no sorting, no maps.
//!
//! # What is read
//!
//! * **Syntax** (sgf4.html 2.1): `Collection = GameTree { GameTree }`, `GameTree = "("
//!   Sequence { GameTree } ")"`, `Sequence = Node { Node }`, `Node = ";" { Property }`,
//!   `Property = PropIdent PropValue { PropValue }`, with white space allowed between values,
//!   properties, nodes and trees. Each game tree of a collection is one game. Trees may nest to
//!   any depth: the reader keeps its own stack, never recursion. A UTF-8 byte order mark at the
//!   start is skipped (common practice); any other text outside a game tree is refused.
//! * **Variations.** A node with more than one child holds variations. The first child is the
//!   main line (sgf4.html 1: "the first line is the main line of play, the other lines are
//!   variations"), and the main line is what was played, so it is read; the other lines are
//!   checked for syntax only and skipped, and the result carries an [`SgfWarning::Variations`]
//!   naming the game and where its first skipped line starts, for the caller to show.
//! * **FF** (file format): 4, or 1 to 3, read alike. A file without FF is FF\[1\] by the
//!   standard's default. Older versions allowed lower-case letters in property names, which
//!   are to be removed (converting.html: `Black[qd]` is `B[qd]`), so in FF\[1\] to FF\[3\] files
//!   they are removed; in an FF\[4\] file, whose property names are capital letters only
//!   (sgf4.html 2.2), a lower-case letter is an error. Any other FF value is refused.
//! * **GM** (game type) must be 4, "Gomoku+Renju" in the property index. A game without GM is
//!   Go by the standard's default (GM\[1\]), so it is refused too.
//! * **SZ** (board size): a square board from 5x5 to 19x19 (`SZ[15]`; `SZ[15:15]` is taken as
//!   the same square, a rectangle is refused). The property index gives a default size only
//!   for Go (19) and chess (8), "game specific" otherwise, and FF\[4\] has no GM\[4\] page, so
//!   there is no default for five-in-a-row: without SZ, the size the player chose
//!   ([`Choices::size`]) is used, and without a choice the game is refused with a message
//!   asking for one.
//! * **CA** (character set) must be UTF-8 (or its subset US-ASCII); any other is refused with a
//!   message asking for the file in UTF-8. Without CA the standard's default is ISO-8859-1;
//!   this reader takes such a file as UTF-8 instead, because that is what files without CA
//!   hold today (common practice), and a value that is not valid UTF-8 is refused rather than
//!   guessed. Only the values that are used are decoded.
//! * **B** and **W** (moves). FF\[4\] leaves the point type to each game and has no GM\[4\]
//!   page (sgf4.html 3.5 lists "Gomoku, Renju" without a definition); five-in-a-row files use
//!   the Go point type (common practice): two letters, the first the column from the left, the
//!   second the row from the *top*, `a` being the first (go.html). Our points count rows from
//!   the bottom, so on a 15x15 board `aa` is `a15`, `ao` is `a1` and `oo` is `o1`. Black moves
//!   first and the colours alternate; a pass (`[]`, or `[tt]` as FF\[3\] wrote it) is refused,
//!   since five-in-a-row has none, as is a move on a taken point or off the board.
//! * **RU** (rules): `freestyle`, `standard` and `renju` (and a few unambiguous spellings, see
//!   [`rule_from_name`]) name our rules. Any other text is refused with a message asking the
//!   player to choose the rule, unless the player already has ([`Choices::rule`]).
//! * **Game information**: PB and PW (the players' names), GN (the game's name, our title; EV,
//!   the event, when there is no GN) and DT (the date), as text (SimpleText: escapes removed,
//!   line breaks and tabs turned into spaces, sgf4.html 3.3), trimmed. The other
//!   game-information properties, comments, markup, annotations and timing (every other
//!   property of the FF\[4\] index) change nothing in the game and are passed over.
//! * **Refused**: setup properties (AB, AW, AE) and PL, since a game record here starts from
//!   an empty board with black to move; FF, GM, SZ or CA anywhere but in a game's first node
//!   (they are root properties); a property we read given twice in a game, or with more than
//!   one value.
//! * **Unknown properties** (outside the FF\[4\] general property list, such as private ones
//!   or another game's own) are skipped with an [`SgfWarning::SkippedProperty`], as sgf4.html
//!   2.2 asks of a reader that does not keep them.
//!
//! Nothing is half-loaded: a file with one error anywhere gives the error and no game.

use std::fmt;

use crate::geometry::{Point, MAX_SIDE};
use crate::types::Rule;
use crate::types::Stone;

use super::games::{
    first_move_at, skip_bom, Choices, Cursor, GameInfo, GameRecord, Loaded, Location, Origin,
    RecordFormat, Taken,
};

/// What is wrong with an SGF file.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum SgfProblem {
    /// The file holds no game tree.
    NoGame,
    /// Text outside any game tree.
    Stray(char),
    /// A character that cannot start a node, a property or a tree here.
    Unexpected(char),
    /// A value's `[` is never closed.
    UnclosedValue,
    /// A game tree's `(` is never closed.
    UnclosedTree,
    /// A `)` that closes no game tree.
    UnmatchedClose,
    /// A game tree without a node.
    NoNode,
    /// A node after the variations of its tree.
    NodeAfterVariation,
    /// A property name with no value after it.
    NoValue,
    /// A property name that is not valid in this file's format version.
    Identifier {
        /// The format version (FF) of the game.
        version: u32,
    },
    /// A value used by the reader is not UTF-8.
    NotUtf8,
    /// A character set other than UTF-8.
    Charset(String),
    /// A file format other than 1 to 4.
    FileFormat(String),
    /// No game type: by the standard, Go.
    MissingGameType,
    /// A game type other than five-in-a-row (4).
    GameType(String),
    /// A board size that is not a square from 5 to 19.
    Size(String),
    /// No board size, and none chosen.
    MissingSize,
    /// A root property outside a game's first node.
    RootOnly,
    /// Setup stones (AB, AW, AE).
    Setup,
    /// PL, the player to move.
    PlayerToPlay,
    /// A pass.
    Pass {
        /// The move's number, from 1.
        number: usize,
    },
    /// A move value that is not two letters.
    BadCoordinate {
        /// The move's number, from 1.
        number: usize,
        /// The value as written (shortened if long).
        value: String,
    },
    /// A move off the board.
    OffBoard {
        /// The move's number, from 1.
        number: usize,
        /// The value as written.
        value: String,
        /// The board's side.
        size: u8,
    },
    /// A move on a point already taken.
    Taken {
        /// The move's number, from 1.
        number: usize,
        /// The point, in our notation.
        point: Point,
        /// The move that took it first.
        first: usize,
    },
    /// A move of the colour that has just moved.
    OutOfTurn {
        /// The move's number, from 1.
        number: usize,
        /// The colour the record gives it.
        colour: Stone,
    },
    /// A node with both a black and a white move.
    BothColours,
    /// A property the reader uses, given more than once in a game.
    Duplicate,
    /// A property the reader uses, with more than one value.
    TooManyValues,
    /// RU names no rule the engine knows, and the player has not chosen one.
    UnknownRule(String),
}

/// Why an SGF file could not be read: the game, where, the property, and what is wrong.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SgfError {
    /// The game's number in the file, from 1, when the problem is inside a game.
    pub game: Option<usize>,
    /// Where the problem is.
    pub at: Location,
    /// The property concerned, as its name is written in the file, if any.
    pub property: Option<String>,
    /// What is wrong.
    pub problem: SgfProblem,
}

impl fmt::Display for SgfError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(game) = self.game {
            write!(f, "game {game}, ")?;
        }
        write!(f, "{}: ", self.at)?;
        let prop = self.property.as_deref().unwrap_or("");
        match &self.problem {
            SgfProblem::NoGame => write!(
                f,
                "there is no game in this file (an SGF game starts with '(;')"
            ),
            SgfProblem::Stray(c) => write!(
                f,
                "'{c}' outside a game (an SGF file holds only game trees, each in parentheses)"
            ),
            SgfProblem::Unexpected(c) => write!(
                f,
                "'{c}' cannot stand here (expected a property name, ';', '(' or ')')"
            ),
            SgfProblem::UnclosedValue => write!(
                f,
                "the value of {prop} opened here with '[' is never closed: the file may be cut \
                 short, or a ']' inside a text is not written as '\\]'"
            ),
            SgfProblem::UnclosedTree => write!(
                f,
                "the game tree opened here with '(' is never closed with ')': the file may be \
                 cut short"
            ),
            SgfProblem::UnmatchedClose => write!(f, "this ')' closes no game tree"),
            SgfProblem::NoNode => write!(
                f,
                "the game tree opened here has no node (a tree starts with ';')"
            ),
            SgfProblem::NodeAfterVariation => write!(
                f,
                "a node after the variations of its tree (the nodes of a tree come before its \
                 variations)"
            ),
            SgfProblem::NoValue => write!(f, "{prop} has no value in brackets"),
            SgfProblem::Identifier { version } if *version == 4 => write!(
                f,
                "the property name {prop} has lower-case letters, which FF[4] does not allow"
            ),
            SgfProblem::Identifier { .. } => {
                write!(f, "the property name {prop} has no capital letter")
            }
            SgfProblem::NotUtf8 => write!(
                f,
                "the value of {prop} is not UTF-8 text (only UTF-8 is read; a file without CA \
                 is read as UTF-8): save the file as UTF-8"
            ),
            SgfProblem::Charset(name) => write!(
                f,
                "the file's character set is '{name}', but only UTF-8 is read: save the file as \
                 UTF-8 (CA[UTF-8])"
            ),
            SgfProblem::FileFormat(v) => {
                write!(f, "FF[{v}]: only SGF file formats 1 to 4 are read")
            }
            SgfProblem::MissingGameType => write!(
                f,
                "this game has no GM property, which by the SGF standard makes it a game of Go; \
                 five-in-a-row records say GM[4]"
            ),
            SgfProblem::GameType(v) => {
                write!(
                    f,
                    "GM[{v}] is not five-in-a-row, which SGF numbers 4 (GM[4])"
                )
            }
            SgfProblem::Size(v) => write!(
                f,
                "SZ[{v}]: the board must be a square from 5x5 to 19x19, like SZ[15]"
            ),
            SgfProblem::MissingSize => write!(
                f,
                "this game does not give its board size (SZ), and SGF has no default size for \
                 five-in-a-row: choose the board size (15x15 or 19x19)"
            ),
            SgfProblem::RootOnly => {
                write!(f, "{prop} belongs in the first node of a game, not here")
            }
            SgfProblem::Setup => write!(
                f,
                "{prop} sets up stones, which is not read: a game record here starts from an \
                 empty board, with moves only"
            ),
            SgfProblem::PlayerToPlay => write!(
                f,
                "PL (who is to play) is not read: black moves first and the players alternate"
            ),
            SgfProblem::Pass { number } => {
                write!(
                    f,
                    "move {number} is a pass, and five-in-a-row has no passes"
                )
            }
            SgfProblem::BadCoordinate { number, value } => write!(
                f,
                "move {number}: '{value}' is not a point (two letters, column then row from the \
                 top, like 'hh')"
            ),
            SgfProblem::OffBoard {
                number,
                value,
                size,
            } => write!(f, "move {number}: '{value}' is off the {size}x{size} board"),
            SgfProblem::Taken {
                number,
                point,
                first,
            } => write!(
                f,
                "move {number}: {point} was already taken by move {first}"
            ),
            SgfProblem::OutOfTurn { number, colour } => write!(
                f,
                "move {number} is {colour}'s, but it is {}'s turn (black moves first and the \
                 players alternate)",
                colour.opponent()
            ),
            SgfProblem::BothColours => {
                write!(f, "this node holds both a black and a white move")
            }
            SgfProblem::Duplicate => write!(f, "{prop} is given more than once in this game"),
            SgfProblem::TooManyValues => write!(f, "{prop} has more than one value"),
            SgfProblem::UnknownRule(text) => write!(
                f,
                "RU[{text}]: this rule name does not say whether the game was freestyle, \
                 standard or renju: choose the rule"
            ),
        }
    }
}

impl std::error::Error for SgfError {}

/// Something the reader passed over, for the player to see.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum SgfWarning {
    /// A game has variations; only its main line was read.
    Variations {
        /// The game's number in the file, from 1.
        game: usize,
        /// Where the first line that was not read starts.
        at: Location,
    },
    /// A property outside the FF\[4\] index was skipped.
    SkippedProperty {
        /// The property's name, as written.
        property: String,
        /// Where it first appears.
        at: Location,
        /// How many times it appears on the games' main lines.
        count: usize,
    },
    /// More unknown properties were skipped than are named one by one.
    MoreSkipped {
        /// How many.
        count: usize,
    },
}

impl fmt::Display for SgfWarning {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SgfWarning::Variations { game, at } => write!(
                f,
                "game {game} has variations: only its main line was read (the first other \
                 line starts at {at})"
            ),
            SgfWarning::SkippedProperty {
                property,
                at,
                count,
            } => {
                write!(
                    f,
                    "{at}: the property {property} is not known and was skipped"
                )?;
                if *count > 1 {
                    write!(f, " ({count} times)")?;
                }
                Ok(())
            }
            SgfWarning::MoreSkipped { count } => {
                write!(f, "{count} more unknown properties were skipped")
            }
        }
    }
}

/// The rule a text names, if it names one of ours without doubt: `freestyle`, `standard`,
/// `renju` (our own names, which [`write_sgf`] writes), and `free style`, `freestyle gomoku`,
/// `gomoku freestyle`, `standard gomoku`, `gomoku standard`, `rif`, `renju rif`, `rif renju`.
/// Case, hyphens, underscores and repeated spaces do not matter. Anything else, `gomoku`
/// alone included (it names freestyle in some places and the exact-five rule in others), is
/// `None`.
pub fn rule_from_name(text: &str) -> Option<Rule> {
    // The words, lower-case, separated by single spaces.
    let mut words = String::with_capacity(text.len());
    for c in text.chars() {
        if c.is_whitespace() || c == '-' || c == '_' {
            if !words.is_empty() && !words.ends_with(' ') {
                words.push(' ');
            }
        } else {
            words.push(c.to_ascii_lowercase());
        }
    }
    const NAMES: [(&str, Rule); 11] = [
        ("freestyle", Rule::Freestyle),
        ("free style", Rule::Freestyle),
        ("freestyle gomoku", Rule::Freestyle),
        ("gomoku freestyle", Rule::Freestyle),
        ("standard", Rule::Standard),
        ("standard gomoku", Rule::Standard),
        ("gomoku standard", Rule::Standard),
        ("renju", Rule::Renju),
        ("rif", Rule::Renju),
        ("renju rif", Rule::Renju),
        ("rif renju", Rule::Renju),
    ];
    let words = words.trim_end();
    NAMES.iter().find(|n| n.0 == words).map(|n| n.1)
}

/// Every property of the FF\[4\] general property list (properties.html): move, setup, node
/// and move annotation, markup, root, game-information, timing and miscellaneous properties.
/// Any other property is reported as skipped.
const KNOWN: [&str; 63] = [
    "B", "KO", "MN", "W", "AB", "AE", "AW", "PL", "C", "DM", "GB", "GW", "HO", "N", "UC", "V",
    "BM", "DO", "IT", "TE", "AR", "CR", "DD", "LB", "LN", "MA", "SL", "SQ", "TR", "AP", "CA", "FF",
    "GM", "ST", "SZ", "AN", "BR", "BT", "CP", "DT", "EV", "GN", "GC", "ON", "OT", "PB", "PC", "PW",
    "RE", "RO", "RU", "SO", "TM", "US", "WR", "WT", "BL", "OB", "OW", "WL", "FG", "PM", "VW",
];

/// A property of a main-line node: the byte ranges of its name and of each value's content.
struct Prop {
    name: (usize, usize),
    values: Vec<(usize, usize)>,
}

/// A game tree: where it opens, the nodes of its main line, and where its first variation
/// that is not on the main line opens, if it has one.
struct Tree {
    open: usize,
    nodes: Vec<Vec<Prop>>,
    variation: Option<usize>,
}

/// An open game tree while parsing.
struct Frame {
    open: usize,
    main: bool,
    children: usize,
    nodes: usize,
}

/// An error before its position is worked out: the game, the byte offset, the property name.
struct Fail {
    game: Option<usize>,
    at: usize,
    /// The byte range of the property's name.
    property: Option<(usize, usize)>,
    problem: SgfProblem,
}

/// SGF white space (sgf4.html 2.1: space, tab, carriage return, line feed, vertical tab and
/// so on), which separates everything outside values.
fn is_space(b: u8) -> bool {
    b.is_ascii_whitespace() || b == 0x0B
}

/// The reader: the bytes, where it is, and how much work it has done (one unit per byte
/// looked at or per item handled, counted so that a test can show the work is linear).
struct Reader<'a> {
    bytes: &'a [u8],
    i: usize,
    work: u64,
}

impl<'a> Reader<'a> {
    fn fail(&self, game: Option<usize>, at: usize, problem: SgfProblem) -> Fail {
        Fail {
            game,
            at,
            property: None,
            problem,
        }
    }

    /// The character at byte `at`, for a message (the replacement character if the bytes
    /// there are not UTF-8).
    fn char_at(&self, at: usize) -> char {
        let end = (at + 4).min(self.bytes.len());
        String::from_utf8_lossy(&self.bytes[at..end])
            .chars()
            .next()
            .unwrap_or(char::REPLACEMENT_CHARACTER)
    }

    fn skip_space(&mut self) {
        while self.i < self.bytes.len() && is_space(self.bytes[self.i]) {
            self.i += 1;
            self.work += 1;
        }
    }

    /// Parses the whole file into game trees, keeping the main line's properties only.
    fn parse(&mut self) -> Result<Vec<Tree>, Fail> {
        let mut trees: Vec<Tree> = Vec::new();
        let mut stack: Vec<Frame> = Vec::new();
        loop {
            self.skip_space();
            let Some(&c) = self.bytes.get(self.i) else {
                break;
            };
            self.work += 1;
            let game = (!stack.is_empty()).then_some(trees.len());
            match c {
                b'(' => {
                    let main = match stack.last_mut() {
                        None => {
                            trees.push(Tree {
                                open: self.i,
                                nodes: Vec::new(),
                                variation: None,
                            });
                            true
                        }
                        Some(top) => {
                            if top.nodes == 0 {
                                return Err(self.fail(game, top.open, SgfProblem::NoNode));
                            }
                            if top.main && top.children == 1 {
                                if let Some(tree) = trees.last_mut() {
                                    tree.variation.get_or_insert(self.i);
                                }
                            }
                            top.children += 1;
                            top.main && top.children == 1
                        }
                    };
                    stack.push(Frame {
                        open: self.i,
                        main,
                        children: 0,
                        nodes: 0,
                    });
                    self.i += 1;
                }
                b')' => {
                    let Some(top) = stack.pop() else {
                        return Err(self.fail(None, self.i, SgfProblem::UnmatchedClose));
                    };
                    if top.nodes == 0 {
                        return Err(self.fail(game, top.open, SgfProblem::NoNode));
                    }
                    self.i += 1;
                }
                b';' => {
                    let Some(top) = stack.last_mut() else {
                        return Err(self.fail(None, self.i, SgfProblem::Stray(';')));
                    };
                    if top.children > 0 {
                        return Err(self.fail(game, self.i, SgfProblem::NodeAfterVariation));
                    }
                    top.nodes += 1;
                    let main = top.main;
                    self.i += 1;
                    let node = self.node(game, main)?;
                    if main {
                        if let Some(tree) = trees.last_mut() {
                            tree.nodes.push(node);
                        }
                    }
                }
                _ => {
                    let ch = self.char_at(self.i);
                    let problem = if stack.is_empty() {
                        SgfProblem::Stray(ch)
                    } else {
                        SgfProblem::Unexpected(ch)
                    };
                    return Err(self.fail(game, self.i, problem));
                }
            }
        }
        if let Some(top) = stack.last() {
            return Err(self.fail(Some(trees.len()), top.open, SgfProblem::UnclosedTree));
        }
        if trees.is_empty() {
            return Err(self.fail(None, self.bytes.len(), SgfProblem::NoGame));
        }
        Ok(trees)
    }

    /// Parses the properties of one node (after its `;`); keeps them only if `keep`.
    fn node(&mut self, game: Option<usize>, keep: bool) -> Result<Vec<Prop>, Fail> {
        let mut props = Vec::new();
        loop {
            self.skip_space();
            let start = self.i;
            while self.i < self.bytes.len() && self.bytes[self.i].is_ascii_alphabetic() {
                self.i += 1;
                self.work += 1;
            }
            if self.i == start {
                return Ok(props);
            }
            let name = (start, self.i);
            let mut values = Vec::new();
            let mut count = 0;
            loop {
                self.skip_space();
                if self.bytes.get(self.i) != Some(&b'[') {
                    break;
                }
                let open = self.i;
                self.i += 1;
                self.work += 1;
                let from = self.i;
                loop {
                    self.work += 1;
                    match self.bytes.get(self.i) {
                        None => {
                            return Err(Fail {
                                game,
                                at: open,
                                property: Some(name),
                                problem: SgfProblem::UnclosedValue,
                            })
                        }
                        Some(b']') => break,
                        Some(b'\\') => {
                            // The escaped character is taken as it is, whatever it is.
                            self.i += 2;
                            self.work += 1;
                        }
                        Some(_) => self.i += 1,
                    }
                }
                if keep {
                    values.push((from, self.i));
                }
                count += 1;
                self.i += 1;
            }
            if count == 0 {
                return Err(Fail {
                    game,
                    at: start,
                    property: Some(name),
                    problem: SgfProblem::NoValue,
                });
            }
            if keep {
                props.push(Prop { name, values });
            }
        }
    }

    /// A value as SimpleText (sgf4.html 3.3): the escape character `\` removed (a `\` before a
    /// line break removes both), every white space character (line breaks included) turned
    /// into a space, and the ends trimmed.
    fn simple_text(&mut self, game: usize, p: &Prop, value: usize) -> Result<String, Fail> {
        let range = p.values[value];
        let raw = std::str::from_utf8(&self.bytes[range.0..range.1]).map_err(|e| Fail {
            game: Some(game),
            at: range.0 + e.valid_up_to(),
            property: Some(p.name),
            problem: SgfProblem::NotUtf8,
        })?;
        let mut out = String::with_capacity(raw.len());
        let mut chars = raw.chars().peekable();
        while let Some(c) = chars.next() {
            self.work += 1;
            let c = if c == '\\' {
                match chars.next() {
                    // A soft line break: the escape and the line break (LF, CR, LF CR or
                    // CR LF) are removed.
                    Some(b @ ('\n' | '\r')) => {
                        let pair = if b == '\n' { '\r' } else { '\n' };
                        if chars.peek() == Some(&pair) {
                            chars.next();
                        }
                        continue;
                    }
                    Some(next) => next,
                    None => continue,
                }
            } else {
                c
            };
            out.push(if c.is_whitespace() { ' ' } else { c });
        }
        Ok(out.trim().to_string())
    }

    /// Interprets one game tree as a record; returns it with the byte where the tree opens.
    fn game(
        &mut self,
        number: usize,
        tree: &Tree,
        choices: Choices,
        skipped: &mut SkipLog,
    ) -> Result<(GameRecord, usize), Fail> {
        let bytes = self.bytes;
        self.work += 1;
        let fail = |at: usize, property: Option<(usize, usize)>, problem: SgfProblem| Fail {
            game: Some(number),
            at,
            property,
            problem,
        };
        // A property's own error: at its name, naming it.
        let at_prop = |p: &Prop, problem: SgfProblem| fail(p.name.0, Some(p.name), problem);
        let Some(root) = tree.nodes.first() else {
            return Err(fail(tree.open, None, SgfProblem::NoNode));
        };

        // Every property's name with its capital letters only (converting.html: the
        // lower-case letters of FF[1]-FF[3] names are removed).
        let mut names: Vec<Vec<String>> = Vec::with_capacity(tree.nodes.len());
        for node in &tree.nodes {
            let mut here = Vec::with_capacity(node.len());
            for p in node {
                let written = &bytes[p.name.0..p.name.1];
                self.work += written.len() as u64;
                let capitals = written.iter().filter(|b| b.is_ascii_uppercase());
                here.push(capitals.map(|&b| char::from(b)).collect::<String>());
            }
            names.push(here);
        }

        // The format version first (it decides which names are valid), then the names, then
        // the other root properties (the moves need the board size, and properties may come in
        // any order, sgf4.html 2.2), then every node of the main line in order.
        let mut version = None;
        for (p, name) in root.iter().zip(&names[0]) {
            if name == "FF" {
                if version.is_some() {
                    return Err(at_prop(p, SgfProblem::Duplicate));
                }
                if p.values.len() > 1 {
                    return Err(at_prop(p, SgfProblem::TooManyValues));
                }
                let text = self.simple_text(number, p, 0)?;
                match text.parse::<u32>() {
                    Ok(v @ 1..=4) => version = Some(v),
                    _ => return Err(at_prop(p, SgfProblem::FileFormat(text))),
                }
            }
        }
        let version = version.unwrap_or(1);
        for (node, node_names) in tree.nodes.iter().zip(&names) {
            for (p, name) in node.iter().zip(node_names) {
                let lower_case = name.len() != p.name.1 - p.name.0;
                if name.is_empty() || (version == 4 && lower_case) {
                    return Err(at_prop(p, SgfProblem::Identifier { version }));
                }
            }
        }
        let mut gm = None;
        let mut sz = None;
        let mut ca = None;
        for (p, name) in root.iter().zip(&names[0]) {
            self.work += 1;
            let slot = match name.as_str() {
                "GM" => &mut gm,
                "SZ" => &mut sz,
                "CA" => &mut ca,
                _ => continue,
            };
            if slot.is_some() {
                return Err(at_prop(p, SgfProblem::Duplicate));
            }
            if p.values.len() > 1 {
                return Err(at_prop(p, SgfProblem::TooManyValues));
            }
            *slot = Some((self.simple_text(number, p, 0)?, p));
        }
        match gm {
            None => return Err(fail(tree.open, None, SgfProblem::MissingGameType)),
            Some((text, p)) => {
                if text.trim_start_matches('+').parse::<u32>() != Ok(4) {
                    return Err(at_prop(p, SgfProblem::GameType(text)));
                }
            }
        }
        if let Some((text, p)) = ca {
            let mut name: String = text
                .chars()
                .filter(|c| !matches!(c, '-' | '_' | ' '))
                .collect();
            name.make_ascii_lowercase();
            if !matches!(name.as_str(), "utf8" | "usascii" | "ascii") {
                return Err(at_prop(p, SgfProblem::Charset(text)));
            }
        }
        let side = |s: &str| {
            s.trim()
                .parse::<u8>()
                .ok()
                .filter(|n| (5..=MAX_SIDE).contains(n))
        };
        let size = match (sz, choices.size) {
            (Some((text, p)), _) => {
                let square = match text.split_once(':') {
                    None => side(&text),
                    Some((w, h)) => side(w).filter(|&w| Some(w) == side(h)),
                };
                match square {
                    Some(n) => n,
                    None => return Err(at_prop(p, SgfProblem::Size(text))),
                }
            }
            (None, Some(n)) if (5..=MAX_SIDE).contains(&n) => n,
            (None, Some(n)) => return Err(fail(tree.open, None, SgfProblem::Size(n.to_string()))),
            (None, None) => return Err(fail(tree.open, None, SgfProblem::MissingSize)),
        };

        let mut taken = Taken::default();
        let mut moves: Vec<Point> = Vec::new();
        let mut info: [Option<(String, &Prop)>; 6] = Default::default();
        for (k, (node, node_names)) in tree.nodes.iter().zip(&names).enumerate() {
            let mut moved: Option<Stone> = None;
            for (p, name) in node.iter().zip(node_names) {
                self.work += 1;
                let refuse = |problem| Err(at_prop(p, problem));
                let colour = match name.as_str() {
                    "FF" | "GM" | "SZ" | "CA" if k > 0 => return refuse(SgfProblem::RootOnly),
                    "AB" | "AW" | "AE" => return refuse(SgfProblem::Setup),
                    "PL" => return refuse(SgfProblem::PlayerToPlay),
                    "B" => Stone::Black,
                    "W" => Stone::White,
                    other => {
                        if let Some(slot) = INFO.iter().position(|&s| s == other) {
                            if info[slot].is_some() {
                                return refuse(SgfProblem::Duplicate);
                            }
                            if p.values.len() > 1 {
                                return refuse(SgfProblem::TooManyValues);
                            }
                            info[slot] = Some((self.simple_text(number, p, 0)?, p));
                        } else if !KNOWN.contains(&other) {
                            skipped.note(&bytes[p.name.0..p.name.1], p.name.0);
                        }
                        continue;
                    }
                };
                let number = moves.len() + 1;
                match moved {
                    Some(c) if c == colour => return refuse(SgfProblem::Duplicate),
                    Some(_) => return refuse(SgfProblem::BothColours),
                    None => moved = Some(colour),
                }
                if p.values.len() > 1 {
                    return refuse(SgfProblem::TooManyValues);
                }
                if colour != GameRecord::colour_of_move(moves.len()) {
                    return refuse(SgfProblem::OutOfTurn { number, colour });
                }
                let (from, to) = p.values[0];
                self.work += (to - from) as u64;
                let point = sgf_point(&bytes[from..to], number, size).map_err(|e| at_prop(p, e))?;
                if !taken.take(point) {
                    let first = first_move_at(&moves, point);
                    return refuse(SgfProblem::Taken {
                        number,
                        point,
                        first,
                    });
                }
                moves.push(point);
            }
        }
        let [black, white, gn, ev, dt, ru] = info;
        let text = |v: Option<(String, &Prop)>| {
            v.map(|(t, _)| super::plain(&t).into_owned())
                .filter(|t| !t.is_empty())
        };
        let rule = match ru {
            Some((name, p)) if !name.is_empty() => match (rule_from_name(&name), choices.rule) {
                (Some(rule), _) | (None, Some(rule)) => Some(rule),
                (None, None) => return Err(at_prop(p, SgfProblem::UnknownRule(name))),
            },
            _ => choices.rule,
        };
        // Every move was checked above: on the board, and on a point not taken before.
        let record = GameRecord::checked(size, moves)
            .with_rule(rule)
            .with_info(GameInfo {
                black: text(black),
                white: text(white),
                title: text(gn).or(text(ev)),
                date: text(dt),
            });
        Ok((record, tree.open))
    }
}

/// The game-information properties that are read, in the order of the reader's slots.
const INFO: [&str; 6] = ["PB", "PW", "GN", "EV", "DT", "RU"];

/// The point a move value names on a `size` x `size` board, or why it names none: a pass
/// (`[]`, or `[tt]` as FF\[3\] wrote it, go.html), a value that is not two letters, or a point
/// off the board. The letters `a` to `z` count 1 to 26 and `A` to `Z` 27 to 52 (go.html); the
/// first is the column from the left, the second the row from the top, while our rows count
/// from the bottom.
fn sgf_point(value: &[u8], number: usize, size: u8) -> Result<Point, SgfProblem> {
    if value.is_empty() || value == b"tt" {
        return Err(SgfProblem::Pass { number });
    }
    let letter = |b: u8| match b {
        b'a'..=b'z' => Some(b - b'a'),
        b'A'..=b'Z' => Some(b - b'A' + 26),
        _ => None,
    };
    let &[c, r] = value else {
        let value = shown(value);
        return Err(SgfProblem::BadCoordinate { number, value });
    };
    let (Some(x), Some(y)) = (letter(c), letter(r)) else {
        let value = shown(value);
        return Err(SgfProblem::BadCoordinate { number, value });
    };
    if x >= size || y >= size {
        let value = shown(value);
        return Err(SgfProblem::OffBoard {
            number,
            value,
            size,
        });
    }
    Ok(Point::new(x, size - 1 - y))
}

/// A move value for a message, cut after twelve bytes.
fn shown(value: &[u8]) -> String {
    let mut text = String::from_utf8_lossy(&value[..value.len().min(12)]).into_owned();
    if value.len() > 12 {
        text.push('…');
    }
    text
}

/// Reads an SGF file (see the module documentation for what is read and what is refused).
/// Either every game of the file is returned, with the warnings the player should see, or an
/// error naming the game, the property and where it is.
pub fn read_sgf(bytes: &[u8], choices: Choices) -> Result<Loaded, SgfError> {
    read_counting(bytes, choices).0
}

/// [`read_sgf`], and the work it did.
fn read_counting(bytes: &[u8], choices: Choices) -> (Result<Loaded, SgfError>, u64) {
    let (_, start) = skip_bom(bytes);
    let mut reader = Reader {
        bytes,
        i: start,
        work: 0,
    };
    let result = read_all(&mut reader, choices);
    let result = match result {
        Ok(ok) => Ok(ok),
        Err(fail) => {
            reader.work += fail.at.min(bytes.len()) as u64;
            let name = |(a, b): (usize, usize)| String::from_utf8_lossy(&bytes[a..b]).into_owned();
            Err(SgfError {
                game: fail.game,
                at: Location::of_byte(bytes, fail.at),
                property: fail.property.map(name),
                problem: fail.problem,
            })
        }
    };
    (result, reader.work)
}

/// The unknown properties skipped so far: the first [`SkipLog::NAMES`] names in order of
/// first appearance, each with where it first appears and how often, and a count of the
/// others (so that a file full of made-up names cannot make the warnings, or the work of
/// keeping them, grow beyond a few lines).
#[derive(Default)]
struct SkipLog {
    names: Vec<(String, usize, usize)>,
    more: usize,
}

impl SkipLog {
    /// How many names are reported one by one.
    const NAMES: usize = 20;

    fn note(&mut self, name: &[u8], at: usize) {
        if let Some(entry) = self.names.iter_mut().find(|e| e.0.as_bytes() == name) {
            entry.2 += 1;
        } else if self.names.len() < SkipLog::NAMES {
            let name = String::from_utf8_lossy(name).into_owned();
            self.names.push((name, at, 1));
        } else {
            self.more += 1;
        }
    }
}

/// Parses, interprets every game, and works out every position the warnings name.
fn read_all(reader: &mut Reader<'_>, choices: Choices) -> Result<Loaded, Fail> {
    let trees = reader.parse()?;
    let mut skipped = SkipLog::default();
    let mut records = Vec::with_capacity(trees.len());
    for (i, tree) in trees.iter().enumerate() {
        records.push(reader.game(i + 1, tree, choices, &mut skipped)?);
    }
    // The places to name come in file order: each game's start, then its first variation
    // (which lies inside it); the skipped properties, in order of first appearance, on a walk
    // of their own.
    let mut cursor = Cursor::new(reader.bytes);
    let mut games = Vec::with_capacity(records.len());
    let mut warnings = Vec::new();
    for (i, ((record, open), tree)) in records.into_iter().zip(&trees).enumerate() {
        games.push(record.with_origin(Origin {
            format: RecordFormat::Sgf,
            game: i + 1,
            at: cursor.at(open),
        }));
        if let Some(at) = tree.variation {
            let at = cursor.at(at);
            warnings.push(SgfWarning::Variations { game: i + 1, at });
        }
    }
    let mut names = Cursor::new(reader.bytes);
    for (property, at, count) in skipped.names {
        let at = names.at(at);
        warnings.push(SgfWarning::SkippedProperty {
            property,
            at,
            count,
        });
    }
    if skipped.more > 0 {
        warnings.push(SgfWarning::MoreSkipped {
            count: skipped.more,
        });
    }
    reader.work += (cursor.steps + names.steps) as u64;
    Ok(Loaded { games, warnings })
}

/// Writes a value as SimpleText: `\` and `]` escaped (sgf4.html 3.3), and control characters
/// (line breaks, tabs), which SimpleText turns into spaces anyway, written as spaces.
fn push_text(out: &mut String, text: &str) {
    for c in text.chars() {
        match c {
            '\\' | ']' => {
                out.push('\\');
                out.push(c);
            }
            c if c.is_control() => out.push(' '),
            c => out.push(c),
        }
    }
}

/// Writes games as an SGF FF\[4\] collection in UTF-8: for each game, a root node with FF, GM
/// (4), CA (UTF-8), SZ, and RU, PB, PW, GN and DT when the record has them, then one node per
/// move, ten to a line. Reading the text back with [`read_sgf`] gives the same sizes, moves,
/// rules and information (text trimmed, with control characters as spaces).
pub fn write_sgf(records: &[GameRecord]) -> String {
    let mut out = String::new();
    for r in records {
        let n = r.size();
        out.push_str(&format!("(;FF[4]GM[4]CA[UTF-8]SZ[{n}]"));
        if let Some(rule) = r.rule() {
            out.push_str(&format!("RU[{}]", rule.name()));
        }
        let info = r.info();
        for (name, value) in [
            ("PB", &info.black),
            ("PW", &info.white),
            ("GN", &info.title),
            ("DT", &info.date),
        ] {
            if let Some(value) = value {
                out.push_str(name);
                out.push('[');
                push_text(&mut out, value);
                out.push(']');
            }
        }
        for (i, p) in r.moves().iter().enumerate() {
            if i % 10 == 0 {
                out.push('\n');
            }
            let colour = if i % 2 == 0 { 'B' } else { 'W' };
            // Columns from the left and rows from the top, `a` first (go.html).
            let x = (b'a' + p.x) as char;
            let y = (b'a' + (n - 1 - p.y)) as char;
            out.push_str(&format!(";{colour}[{x}{y}]"));
        }
        out.push_str(")\n");
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::notation::format_points;
    use proptest::prelude::*;

    fn read(text: &str) -> Result<Loaded, SgfError> {
        read_sgf(text.as_bytes(), Choices::default())
    }

    fn problem(text: &str) -> SgfProblem {
        read(text).unwrap_err().problem
    }

    #[test]
    fn corners_convert_from_the_top_left() {
        // go.html: the first letter is the column from the left, the second the row from the
        // top; our rows count from the bottom.
        let l = read("(;FF[4]GM[4]SZ[15];B[aa];W[oo];B[ao];W[oa];B[hh])").unwrap();
        assert_eq!(format_points(l.games[0].moves()), "a15 o1 a1 o15 h8");
        let l = read("(;FF[4]GM[4]SZ[19];B[aa];W[ss])").unwrap();
        assert_eq!(format_points(l.games[0].moves()), "a19 s1");
    }

    #[test]
    fn values_unescape_as_simple_text() {
        // sgf4.html 3.3: `\` escapes the next character, a `\` before a line break removes
        // both, and other white space becomes a space.
        let l = read("(;FF[4]GM[4]SZ[15]GN[Ladder \\[round 3\\]\\\nfinal]PB[Ines\tHarrow\\\\]PW[ Pell\n]\n;B[hh])")
            .unwrap();
        let info = l.games[0].info();
        assert_eq!(info.title.as_deref(), Some("Ladder [round 3]final"));
        assert_eq!(info.black.as_deref(), Some("Ines Harrow\\"));
        assert_eq!(info.white.as_deref(), Some("Pell"));
    }

    #[test]
    fn refusals_name_the_property_and_place() {
        let e = read("(;FF[4]GM[4]SZ[15]\n;B[hh]\n;W[hh])").unwrap_err();
        assert_eq!(e.property.as_deref(), Some("W"));
        assert_eq!(e.at, Location { line: 3, column: 2 });
        assert_eq!(
            e.problem,
            SgfProblem::Taken {
                number: 2,
                point: Point::new(7, 7),
                first: 1
            }
        );
        assert_eq!(
            e.to_string(),
            "game 1, line 3, column 2: move 2: h8 was already taken by move 1"
        );
        assert_eq!(problem("(;FF[4]GM[4]SZ[15]AB[hh])"), SgfProblem::Setup);
        assert_eq!(
            problem("(;FF[4]GM[1]SZ[15])"),
            SgfProblem::GameType("1".into())
        );
        assert_eq!(problem("(;FF[4]SZ[15])"), SgfProblem::MissingGameType);
        assert_eq!(problem("(;FF[4]GM[4])"), SgfProblem::MissingSize);
        assert_eq!(
            problem("(;FF[4]GM[4]SZ[15:13])"),
            SgfProblem::Size("15:13".into())
        );
        assert_eq!(
            problem("(;FF[5]GM[4]SZ[15])"),
            SgfProblem::FileFormat("5".into())
        );
        assert_eq!(
            problem("(;FF[4]GM[4]SZ[15];B[hh];B[ii])"),
            SgfProblem::OutOfTurn {
                number: 2,
                colour: Stone::Black
            }
        );
        assert_eq!(
            problem("(;FF[4]GM[4]SZ[15];W[hh])"),
            SgfProblem::OutOfTurn {
                number: 1,
                colour: Stone::White
            }
        );
        assert_eq!(
            problem("(;FF[4]GM[4]SZ[15];B[hh]W[ii])"),
            SgfProblem::BothColours
        );
        assert_eq!(
            problem("(;FF[4]GM[4]SZ[15]RU[Fivefold house rule])"),
            SgfProblem::UnknownRule("Fivefold house rule".into())
        );
    }

    #[test]
    fn a_chosen_rule_or_size_fills_what_the_file_leaves_open() {
        let choices = Choices {
            size: Some(19),
            rule: Some(Rule::Standard),
        };
        let l = read_sgf(b"(;FF[4]GM[4]RU[club rule];B[ss])", choices).unwrap();
        assert_eq!(l.games[0].size(), 19);
        assert_eq!(l.games[0].rule(), Some(Rule::Standard));
        assert_eq!(format_points(l.games[0].moves()), "s1");
        // What the file says plainly is kept.
        let l = read_sgf(b"(;FF[4]GM[4]SZ[15]RU[Renju];B[hh])", choices).unwrap();
        assert_eq!(
            (l.games[0].size(), l.games[0].rule()),
            (15, Some(Rule::Renju))
        );
    }

    #[test]
    fn rule_names_map_only_when_unambiguous() {
        assert_eq!(rule_from_name(" Free-Style "), Some(Rule::Freestyle));
        assert_eq!(rule_from_name("standard_gomoku"), Some(Rule::Standard));
        assert_eq!(rule_from_name("RIF"), Some(Rule::Renju));
        assert_eq!(rule_from_name("gomoku"), None);
        assert_eq!(rule_from_name(""), None);
    }

    #[test]
    fn writer_output_reads_back() {
        let moves = crate::notation::parse_points(
            "h8 h9 a1 o15 o1 a15 i9 j10 k11 l12 m13",
            "moves",
            15,
            15,
        )
        .unwrap();
        let record = GameRecord::new(15, moves)
            .unwrap()
            .with_rule(Some(Rule::Renju))
            .with_info(GameInfo {
                black: Some("Odile Quay".into()),
                white: Some("Rafe [the] Marlin\\".into()),
                title: Some("Harbour Street: spring ladder".into()),
                date: Some("2026-04-11".into()),
            });
        let text = write_sgf(std::slice::from_ref(&record));
        let back = read(&text).unwrap();
        assert!(back.warnings.is_empty());
        let r = &back.games[0];
        assert_eq!(
            (r.size(), r.moves(), r.rule(), r.info()),
            (15, record.moves(), Some(Rule::Renju), record.info())
        );
    }

    /// What an independent SGF reader (the `sgf-parse` crate, a test-only dependency) finds on
    /// the main line of the first game of `text`: the size, the names and title as SimpleText,
    /// and the moves as points. Its raw move values are turned into our points by the rule of
    /// go.html, restated here: column `a` + x from the left, row `a` + r from the top.
    fn oracle(text: &str) -> (u8, [Option<String>; 3], Vec<(Stone, Point)>) {
        use sgf_parse::unknown_game::Prop;
        let trees = sgf_parse::parse(text).expect("the oracle reads the text");
        let sgf_parse::GameTree::Unknown(root) = &trees[0] else {
            panic!("GM[4] is not Go");
        };
        let Some(Prop::SZ((w, h))) = root.get_property("SZ") else {
            panic!("no SZ");
        };
        assert_eq!(w, h);
        let n = *w;
        // Its lexer has already removed the escapes; its `Display` of a SimpleText removes them
        // a second time (so `\\A` would show as `A`), so the raw value is taken, with white
        // space as spaces (sgf4.html 3.3).
        let name = |id: &str| match root.get_property(id) {
            Some(Prop::PB(t) | Prop::PW(t) | Prop::GN(t)) => {
                let spaced: String = t
                    .text
                    .chars()
                    .map(|c| if c.is_whitespace() { ' ' } else { c })
                    .collect();
                Some(spaced.trim().to_string()).filter(|s| !s.is_empty())
            }
            _ => None,
        };
        let mut moves = Vec::new();
        for node in root.main_variation() {
            let (colour, v) = match node.get_move() {
                Some(Prop::B(v)) => (Stone::Black, v),
                Some(Prop::W(v)) => (Stone::White, v),
                _ => continue,
            };
            let b = v.as_bytes();
            moves.push((colour, Point::new(b[0] - b'a', n - 1 - (b[1] - b'a'))));
        }
        (n, [name("PB"), name("PW"), name("GN")], moves)
    }

    fn with_colours(r: &GameRecord) -> Vec<(Stone, Point)> {
        let moves = r.moves().iter().enumerate();
        moves
            .map(|(i, &p)| (GameRecord::colour_of_move(i), p))
            .collect()
    }

    #[test]
    fn an_independent_reader_sees_the_same_main_line() {
        let text = "(;FF[4]GM[4]CA[UTF-8]SZ[15]PB[Ines \\Harrow]PW[Odile Qu\u{e9}vy]\n\
                    GN[Autumn \\[ladder\\]]C[a comment; (with) text]\n\
                    ;B[hh] ;W [ig];B[hi]C[x]\n\
                    (;W[hg];B[aa](;W[oo])(;W[ao]))\n\
                    (;W[oa]))";
        let ours = read(text).unwrap();
        let r = &ours.games[0];
        let (size, names, moves) = oracle(text);
        assert_eq!(r.size(), size);
        let info = r.info();
        assert_eq!(
            [info.black.clone(), info.white.clone(), info.title.clone()],
            names
        );
        assert_eq!(with_colours(r), moves);
        assert_eq!(r.move_list(), "h8 i9 h7 h9 a15 o1");
    }

    fn records() -> impl Strategy<Value = GameRecord> {
        let text = || prop::option::of("[A-Za-z0-9 \\[\\]\\\\:;()\u{e9}]{1,16}");
        (5u8..=19)
            .prop_flat_map(move |n| {
                (
                    Just(n),
                    prop::collection::vec((0..n, 0..n), 0..80),
                    prop::option::of(prop::sample::select(Rule::ALL.to_vec())),
                    (text(), text(), text()),
                )
            })
            .prop_map(|(n, raw, rule, (black, white, title))| {
                let mut seen = std::collections::HashSet::new();
                let moves: Vec<Point> = raw
                    .into_iter()
                    .map(|(x, y)| Point::new(x, y))
                    .filter(|p| seen.insert(*p))
                    .collect();
                let clean =
                    |t: Option<String>| t.map(|s| s.trim().to_string()).filter(|s| !s.is_empty());
                GameRecord::new(n, moves)
                    .unwrap()
                    .with_rule(rule)
                    .with_info(GameInfo {
                        black: clean(black),
                        white: clean(white),
                        title: clean(title),
                        date: Some("2026-12-01".into()),
                    })
            })
    }

    /// Inputs made of SGF's own characters, so that the reader gets deep into its paths.
    fn sgfish() -> impl Strategy<Value = Vec<u8>> {
        let pieces = prop::sample::select(vec![
            "(", ")", ";", "[", "]", "\\", " ", "\n", "B", "W", "FF[4]", "GM[4]", "SZ[15]", "[hh]",
            "[aa]", "[]", "AB", "PB[x]", "C[", "é", "(;", ";B[", "XY[1]", "ff", "\r",
        ]);
        prop::collection::vec(pieces, 0..400).prop_map(|v| v.concat().into_bytes())
    }

    /// The most work the reader may do on `len` bytes: a fixed number of units per byte.
    fn linear_bound(len: usize) -> u64 {
        8 * len as u64 + 16
    }

    proptest! {
        #[test]
        fn written_games_read_back_here_and_in_an_independent_reader(r in records()) {
            let text = write_sgf(std::slice::from_ref(&r));
            let back = read(&text).unwrap();
            let b = &back.games[0];
            prop_assert_eq!((b.size(), b.moves(), b.rule(), b.info()), (r.size(), r.moves(), r.rule(), r.info()));
            let (size, names, moves) = oracle(&text);
            prop_assert_eq!(size, r.size());
            let info = r.info();
            prop_assert_eq!(names, [info.black.clone(), info.white.clone(), info.title.clone()]);
            prop_assert_eq!(moves, with_colours(&r));
        }

        #[test]
        fn arbitrary_bytes_never_panic_and_work_is_linear(bytes in prop::collection::vec(any::<u8>(), 0..3000)) {
            let (_, work) = read_counting(&bytes, Choices::default());
            prop_assert!(work <= linear_bound(bytes.len()), "{work} units for {} bytes", bytes.len());
        }

        #[test]
        fn sgf_like_text_never_panics_and_work_is_linear(bytes in sgfish()) {
            let (_, work) = read_counting(&bytes, Choices { size: Some(15), rule: None });
            prop_assert!(work <= linear_bound(bytes.len()), "{work} units for {} bytes", bytes.len());
        }
    }

    #[test]
    fn deep_and_long_files_take_linear_work() {
        // Deep nesting (no recursion, so no stack overflow), many variations, long values
        // full of escapes, many nodes, many small games: the same work per byte at every
        // length.
        let shapes: [fn(usize) -> String; 5] = [
            |k| format!("(;FF[4]GM[4]SZ[15]{})", "(;C[x]".repeat(k) + &")".repeat(k)),
            |k| format!("(;FF[4]GM[4]SZ[15];B[hh]{})", "(;C[v])".repeat(k)),
            |k| format!("(;FF[4]GM[4]SZ[15]GN[{}])", "\\]\\\\".repeat(k)),
            |k| format!("(;FF[4]GM[4]SZ[15]{})", ";ZZ[1]C[a]".repeat(k)),
            |k| "(;GM[4]SZ[19];B[aa])".repeat(k),
        ];
        for shape in shapes {
            for k in [10, 1_000, 100_000] {
                let text = shape(k);
                let (result, work) = read_counting(text.as_bytes(), Choices::default());
                assert!(result.is_ok(), "{:?}", result.err());
                // The count covers every byte at least once, and stays within the bound.
                assert!(
                    work >= text.len() as u64,
                    "{work} units for {} bytes",
                    text.len()
                );
                assert!(
                    work <= linear_bound(text.len()),
                    "{work} units for {} bytes",
                    text.len()
                );
            }
        }
    }
}
