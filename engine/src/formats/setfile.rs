//! The set file, version 1: one puzzle set as JSON (UTF-8).
//!
//! ```text
//! { "format": "fivefold-set", "version": 1, "title": "...", "created": "2026-12-01",
//!   "puzzles": [ { "id": "...", "rule": "freestyle|standard|renju", "size": 15,
//!                  "to_move": "black|white", "black": ["h8", ...], "white": ["i9", ...],
//!                  "theme": "...", "goal": "win|defend",
//!                  "solution": { "first_moves": [...], "line": [...] },
//!                  "rating": 1500, "length": 3 } ],
//!   "generator": { "seed": 42, "theme": "vcf", "rule": "freestyle", "size": 15,
//!                  "count": 20, "rating": [1200, 1600] } }
//! ```
//!
//! The set file is a compatibility boundary, so it has its own wire types here, converted by
//! hand to and from [`Puzzle`]. Reading is strict about what it knows and lenient about what it
//! does not: unknown fields are ignored; a known field that is missing or malformed fails the
//! whole read with an error naming the puzzle and the field, so nothing is ever half-loaded. A
//! file of a newer version is refused with a message saying so. `length` and `generator` are
//! our extensions of version 1; `length` defaults to 0 and `generator` is optional.

use std::collections::HashMap;
use std::fmt;

use serde::Serialize;
use serde_json::{Map, Value};

use super::limits;
use crate::geometry::Point;
use crate::puzzle::{Puzzle, Theme};
use crate::types::Rule;
use crate::types::Stone;

/// The value of the `format` field.
pub const FORMAT: &str = "fivefold-set";
/// The version this code writes and reads.
pub const VERSION: u64 = 1;

/// How a set was generated, so that it can be made again.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct GeneratorInfo {
    /// The seed.
    pub seed: u64,
    /// The theme.
    pub theme: Theme,
    /// The rule.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// Puzzles asked for.
    pub count: usize,
    /// The rating band.
    pub rating: (u32, u32),
    /// Deep lines: the fewest attacker moves before the winning one (0: any length).
    pub min_moves: u16,
    /// Whether only puzzles with one correct first move were kept.
    pub unique: bool,
}

/// A puzzle set.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct PuzzleSet {
    /// The title, shown as text.
    pub title: String,
    /// The date it was made, `YYYY-MM-DD`.
    pub created: String,
    /// The puzzles, in order.
    pub puzzles: Vec<Puzzle>,
    /// How it was generated, when it was.
    pub generator: Option<GeneratorInfo>,
}

/// Why a set file could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SetError {
    /// The puzzle, by number from 1 and id when known; `None` for the set's own fields.
    pub puzzle: Option<(usize, String)>,
    /// The field, e.g. `black[2]` or `solution.first_moves`.
    pub field: String,
    /// What is wrong.
    pub message: String,
}

impl fmt::Display for SetError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.puzzle {
            Some((n, id)) if !id.is_empty() => {
                write!(
                    f,
                    "puzzle {n} (id '{id}'), field '{}': {}",
                    self.field, self.message
                )
            }
            Some((n, _)) => write!(f, "puzzle {n}, field '{}': {}", self.field, self.message),
            None if self.field.is_empty() => f.write_str(&self.message),
            None => write!(f, "field '{}': {}", self.field, self.message),
        }
    }
}

impl std::error::Error for SetError {}

#[derive(Serialize)]
struct WireSolution {
    first_moves: Vec<String>,
    line: Vec<String>,
}

#[derive(Serialize)]
struct WirePuzzle<'a> {
    id: &'a str,
    rule: &'static str,
    size: u8,
    to_move: &'static str,
    black: Vec<String>,
    white: Vec<String>,
    theme: &'static str,
    goal: &'static str,
    solution: WireSolution,
    rating: u32,
    length: u16,
}

#[derive(Serialize)]
struct WireGenerator {
    seed: u64,
    theme: &'static str,
    rule: &'static str,
    size: u8,
    count: usize,
    rating: [u32; 2],
    #[serde(skip_serializing_if = "is_zero")]
    min_moves: u16,
    #[serde(skip_serializing_if = "is_false")]
    unique: bool,
}

fn is_zero(n: &u16) -> bool {
    *n == 0
}

fn is_false(b: &bool) -> bool {
    !*b
}

#[derive(Serialize)]
struct WireSet<'a> {
    format: &'static str,
    version: u64,
    title: &'a str,
    created: &'a str,
    puzzles: Vec<WirePuzzle<'a>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    generator: Option<WireGenerator>,
}

fn names(points: &[Point]) -> Vec<String> {
    points.iter().map(|p| p.to_string()).collect()
}

/// Writes a set as pretty-printed JSON with a final newline. The output depends only on the
/// set, so regenerating a set gives the same bytes.
pub fn to_json(set: &PuzzleSet) -> String {
    let wire = WireSet {
        format: FORMAT,
        version: VERSION,
        title: &set.title,
        created: &set.created,
        puzzles: set
            .puzzles
            .iter()
            .map(|p| WirePuzzle {
                id: &p.id,
                rule: p.rule.name(),
                size: p.size,
                to_move: p.to_move.name(),
                black: names(&p.black),
                white: names(&p.white),
                theme: p.theme.name(),
                goal: p.goal().name(),
                solution: WireSolution {
                    first_moves: names(&p.first_moves),
                    line: names(&p.line),
                },
                rating: p.rating,
                length: p.length,
            })
            .collect(),
        generator: set.generator.as_ref().map(|g| WireGenerator {
            seed: g.seed,
            theme: g.theme.name(),
            rule: g.rule.name(),
            size: g.size,
            count: g.count,
            rating: [g.rating.0, g.rating.1],
            min_moves: g.min_moves,
            unique: g.unique,
        }),
    };
    let mut s = serde_json::to_string_pretty(&wire).expect("set serialisation cannot fail");
    s.push('\n');
    s
}

/// Reads a set file. Either the whole set is returned, or an error naming what is wrong.
///
/// The work is linear in the length of the text: the JSON is read once, list lengths are
/// checked against [`limits`] before their entries are read, and every duplicate check looks in
/// a table (a hash set of ids, a grid of the board's points) instead of searching the entries
/// read so far. The set that comes back has passed [`check`].
pub fn parse(text: &str) -> Result<PuzzleSet, SetError> {
    if text.len() > limits::MAX_FILE_BYTES {
        return Err(top(
            "",
            format!(
                "the file is {} bytes; a set file is at most {} bytes",
                text.len(),
                limits::MAX_FILE_BYTES
            ),
        ));
    }
    let value: Value = serde_json::from_str(text).map_err(|e| SetError {
        puzzle: None,
        field: String::new(),
        message: format!("not valid JSON ({e})"),
    })?;
    let obj = value
        .as_object()
        .ok_or_else(|| top("", "a set file is one JSON object".into()))?;
    match obj.get("format").and_then(Value::as_str) {
        Some(FORMAT) => {}
        Some(other) => {
            return Err(top(
                "format",
                format!("'{other}' is not a Fivefold set ('{FORMAT}')"),
            ))
        }
        None => {
            return Err(top(
                "format",
                format!("missing; a set file says \"{FORMAT}\""),
            ))
        }
    }
    let version = obj
        .get("version")
        .and_then(Value::as_u64)
        .ok_or_else(|| top("version", "missing or not a whole number".into()))?;
    if version > VERSION {
        return Err(top(
            "version",
            format!(
                "this set was made by a newer version of Fivefold (set version {version}); \
                 this version reads set version {VERSION}: update Fivefold to open it"
            ),
        ));
    }
    if version < 1 {
        return Err(top("version", format!("{version} is not a set version")));
    }
    let title = super::plain(&string(obj, "title").map_err(|m| top("title", m))?).into_owned();
    let created = string(obj, "created").map_err(|m| top("created", m))?;
    let list = obj
        .get("puzzles")
        .and_then(Value::as_array)
        .ok_or_else(|| top("puzzles", "missing or not a list".into()))?;
    check_count(list.len())?;
    let puzzles = list
        .iter()
        .enumerate()
        .map(|(i, v)| parse_puzzle(i + 1, v))
        .collect::<Result<Vec<_>, _>>()?;
    let generator = match obj.get("generator") {
        None | Some(Value::Null) => None,
        Some(g) => Some(parse_generator(g).map_err(|(f, m)| top(&format!("generator.{f}"), m))?),
    };
    let set = PuzzleSet {
        title,
        created,
        puzzles,
        generator,
    };
    check(&set)?;
    Ok(set)
}

/// An error in the set's own fields.
fn top(field: &str, message: String) -> SetError {
    SetError {
        puzzle: None,
        field: field.to_string(),
        message,
    }
}

fn check_count(n: usize) -> Result<(), SetError> {
    if n == 0 {
        return Err(top("puzzles", "the set has no puzzles".into()));
    }
    if n > limits::MAX_PUZZLES {
        return Err(top(
            "puzzles",
            format!(
                "{n} puzzles; a set holds at most {} (split it into several sets)",
                limits::MAX_PUZZLES
            ),
        ));
    }
    Ok(())
}

/// Checks a set against every rule a set file must keep: the [`limits`], a valid date, at
/// least one puzzle, unique ids, and for each puzzle its board size, distinct stones on the
/// board, answers and a line on empty points, a theme that exists under its rule, and rating
/// and length in range. [`parse`] and the share code's reader return only sets that pass it;
/// writers call it before they write (a set made in the page, a generated set), so that
/// nothing is written that its reader would refuse. The error names the puzzle and field.
pub fn check(set: &PuzzleSet) -> Result<(), SetError> {
    if set.title.len() > limits::MAX_TITLE_BYTES {
        return Err(top(
            "title",
            format!(
                "{} bytes long; a title is at most {} bytes",
                set.title.len(),
                limits::MAX_TITLE_BYTES
            ),
        ));
    }
    if !is_date(&set.created) {
        return Err(top(
            "created",
            format!("'{}' is not a date like 2026-12-01", set.created),
        ));
    }
    check_count(set.puzzles.len())?;
    // The first puzzle (from 1) with each id; looked up, never iterated, so the order of the
    // hash map cannot reach the output.
    let mut ids: HashMap<&str, usize> = HashMap::with_capacity(set.puzzles.len());
    for (i, p) in set.puzzles.iter().enumerate() {
        check_puzzle(i + 1, p)?;
        if let Some(j) = ids.insert(&p.id, i + 1) {
            return Err(SetError {
                puzzle: Some((i + 1, p.id.clone())),
                field: "id".into(),
                message: format!("the same id as puzzle {j}"),
            });
        }
    }
    if let Some(g) = &set.generator {
        check_generator(g).map_err(|(f, m)| top(&format!("generator.{f}"), m))?;
    }
    Ok(())
}

fn check_puzzle(n: usize, p: &Puzzle) -> Result<(), SetError> {
    let err = |field: &str, message: String| SetError {
        puzzle: Some((n, p.id.clone())),
        field: field.to_string(),
        message,
    };
    if p.id.is_empty() {
        return Err(err("id", "missing or empty".into()));
    }
    if p.id.len() > limits::MAX_ID_BYTES {
        return Err(err(
            "id",
            format!("longer than {} bytes", limits::MAX_ID_BYTES),
        ));
    }
    let size = p.size;
    if !(limits::MIN_SIZE..=limits::MAX_SIZE).contains(&size) {
        return Err(err("size", format!("{size} is not a board size (5 to 19)")));
    }
    if !p.theme.allowed(p.rule) {
        return Err(err(
            "theme",
            format!("{} puzzles exist only under renju", p.theme),
        ));
    }
    if p.black.len() + p.white.len() > limits::MAX_STONES {
        return Err(err(
            "white",
            format!(
                "{} stones in all; a puzzle has at most {}",
                p.black.len() + p.white.len(),
                limits::MAX_STONES
            ),
        ));
    }
    if p.line.len() > limits::MAX_LINE {
        return Err(err(
            "solution.line",
            format!(
                "{} moves; a line has at most {}",
                p.line.len(),
                limits::MAX_LINE
            ),
        ));
    }
    // Each point of the board: 0 if empty, 1 if it holds a stone; a list's own repeats are
    // found with a second grid.
    let cells = size as usize * size as usize;
    let mut stones = vec![false; cells];
    let mut listed = vec![false; cells];
    let index = |q: &Point| q.y as usize * size as usize + q.x as usize;
    let mut points = |field: &str, list: &[Point], stone: bool| -> Result<(), SetError> {
        listed.iter_mut().for_each(|c| *c = false);
        for (i, q) in list.iter().enumerate() {
            let f = || format!("{field}[{i}]");
            if q.x >= size || q.y >= size {
                return Err(err(&f(), format!("{q} is off the {size}x{size} board")));
            }
            let at = index(q);
            if listed[at] || (stone && stones[at]) {
                return Err(err(&f(), format!("{q} is given twice")));
            }
            if !stone && stones[at] {
                return Err(err(field, format!("{q} is already taken")));
            }
            listed[at] = true;
        }
        if stone {
            list.iter().for_each(|q| stones[index(q)] = true);
        }
        Ok(())
    };
    points("black", &p.black, true)?;
    points("white", &p.white, true)?;
    if p.first_moves.is_empty() {
        return Err(err(
            "solution.first_moves",
            "empty: a puzzle needs at least one answer".into(),
        ));
    }
    points("solution.first_moves", &p.first_moves, false)?;
    points("solution.line", &p.line, false)?;
    if p.rating > limits::MAX_RATING {
        return Err(err(
            "rating",
            format!("{} is not a rating (0 to {})", p.rating, limits::MAX_RATING),
        ));
    }
    if p.length > limits::MAX_LENGTH {
        return Err(err(
            "length",
            format!("{} is more than {}", p.length, limits::MAX_LENGTH),
        ));
    }
    Ok(())
}

fn check_generator(g: &GeneratorInfo) -> Result<(), (String, String)> {
    let bad = |f: &str, m: String| Err((f.to_string(), m));
    if !(limits::MIN_SIZE..=limits::MAX_SIZE).contains(&g.size) {
        return bad("size", format!("{} is not a board size (5 to 19)", g.size));
    }
    if g.count == 0 || g.count > limits::MAX_PUZZLES {
        return bad(
            "count",
            format!(
                "{} is not a count from 1 to {}",
                g.count,
                limits::MAX_PUZZLES
            ),
        );
    }
    if g.rating.0 > limits::MAX_RATING || g.rating.1 > limits::MAX_RATING {
        return bad(
            "rating",
            format!("ratings run from 0 to {}", limits::MAX_RATING),
        );
    }
    if g.min_moves > limits::MAX_LENGTH {
        return bad(
            "min_moves",
            format!("{} is more than {}", g.min_moves, limits::MAX_LENGTH),
        );
    }
    Ok(())
}

fn string(obj: &Map<String, Value>, key: &str) -> Result<String, String> {
    match obj.get(key) {
        Some(Value::String(s)) => Ok(s.clone()),
        Some(_) => Err("not text".into()),
        None => Err("missing".into()),
    }
}

fn is_date(s: &str) -> bool {
    let b = s.as_bytes();
    if b.len() != 10 || b[4] != b'-' || b[7] != b'-' {
        return false;
    }
    let digits = |r: std::ops::Range<usize>| s[r].bytes().all(|c| c.is_ascii_digit());
    if !(digits(0..4) && digits(5..7) && digits(8..10)) {
        return false;
    }
    let month: u32 = s[5..7].parse().unwrap_or(0);
    let day: u32 = s[8..10].parse().unwrap_or(0);
    (1..=12).contains(&month) && (1..=31).contains(&day)
}

/// Converts one puzzle of the file to a [`Puzzle`]: the types and the syntax of each field.
/// What the values must satisfy together (the board, the limits) is [`check_puzzle`]'s.
fn parse_puzzle(n: usize, v: &Value) -> Result<Puzzle, SetError> {
    let mut id = String::new();
    let obj = v.as_object().ok_or_else(|| SetError {
        puzzle: Some((n, String::new())),
        field: String::new(),
        message: "a puzzle is a JSON object".into(),
    })?;
    if let Some(Value::String(s)) = obj.get("id") {
        id = s.clone();
    }
    let err = |field: &str, message: String| SetError {
        puzzle: Some((n, id.clone())),
        field: field.to_string(),
        message,
    };
    if id.is_empty() {
        return Err(err("id", "missing or empty".into()));
    }
    let rule: Rule = string(obj, "rule")
        .map_err(|m| err("rule", m))?
        .parse()
        .map_err(|e| err("rule", format!("{e}")))?;
    let size = obj
        .get("size")
        .and_then(Value::as_u64)
        .ok_or_else(|| err("size", "missing or not a whole number".into()))?;
    if !(limits::MIN_SIZE as u64..=limits::MAX_SIZE as u64).contains(&size) {
        return Err(err("size", format!("{size} is not a board size (5 to 19)")));
    }
    let to_move: Stone = string(obj, "to_move")
        .map_err(|m| err("to_move", m))?
        .parse()
        .map_err(|e: crate::StoneParseError| err("to_move", e.to_string()))?;
    // The most points any list can hold: every point of the largest board.
    let most = limits::MAX_SIZE as usize * limits::MAX_SIZE as usize;
    let points = |field: &str, v: Option<&Value>| -> Result<Vec<Point>, SetError> {
        let arr = v
            .and_then(Value::as_array)
            .ok_or_else(|| err(field, "missing or not a list".into()))?;
        if arr.len() > most {
            return Err(err(
                field,
                format!("{} points; a board has at most {most}", arr.len()),
            ));
        }
        arr.iter()
            .enumerate()
            .map(|(i, x)| {
                let f = || format!("{field}[{i}]");
                let s = x.as_str().ok_or_else(|| err(&f(), "not text".into()))?;
                s.parse().map_err(|e| err(&f(), format!("{e}")))
            })
            .collect()
    };
    let black = points("black", obj.get("black"))?;
    let white = points("white", obj.get("white"))?;
    let theme: Theme = string(obj, "theme")
        .map_err(|m| err("theme", m))?
        .parse()
        .map_err(|e| err("theme", format!("{e}")))?;
    let goal = string(obj, "goal").map_err(|m| err("goal", m))?;
    if goal != theme.goal().name() {
        return Err(err(
            "goal",
            format!(
                "'{goal}' does not fit the theme {theme} (expected '{}')",
                theme.goal().name()
            ),
        ));
    }
    let sol = obj
        .get("solution")
        .and_then(Value::as_object)
        .ok_or_else(|| err("solution", "missing or not an object".into()))?;
    let first_moves = points("solution.first_moves", sol.get("first_moves"))?;
    let line = points("solution.line", sol.get("line"))?;
    let rating = obj
        .get("rating")
        .and_then(Value::as_u64)
        .ok_or_else(|| err("rating", "missing or not a whole number".into()))?;
    if rating > limits::MAX_RATING as u64 {
        return Err(err(
            "rating",
            format!("{rating} is not a rating (0 to {})", limits::MAX_RATING),
        ));
    }
    let length = match obj.get("length") {
        None => 0,
        Some(v) => v
            .as_u64()
            .filter(|&l| l <= limits::MAX_LENGTH as u64)
            .ok_or_else(|| {
                err(
                    "length",
                    format!("not a whole number up to {}", limits::MAX_LENGTH),
                )
            })? as u16,
    };
    Ok(Puzzle {
        id: id.clone(),
        rule,
        size: size as u8,
        to_move,
        black,
        white,
        theme,
        first_moves,
        line,
        length,
        rating: rating as u32,
    })
}

fn parse_generator(v: &Value) -> Result<GeneratorInfo, (String, String)> {
    let obj = v
        .as_object()
        .ok_or_else(|| (String::new(), "not an object".to_string()))?;
    let num = |k: &str| {
        obj.get(k)
            .and_then(Value::as_u64)
            .ok_or_else(|| (k.to_string(), "missing or not a whole number".to_string()))
    };
    let text = |k: &str| {
        obj.get(k)
            .and_then(Value::as_str)
            .ok_or_else(|| (k.to_string(), "missing or not text".to_string()))
    };
    // Numbers too large for their field are refused here (never cut down); the ranges are
    // [`check_generator`]'s.
    let small = |x: &Value| x.as_u64().and_then(|n| u32::try_from(n).ok());
    let rating = obj
        .get("rating")
        .and_then(Value::as_array)
        .filter(|a| a.len() == 2)
        .and_then(|a| Some((small(&a[0])?, small(&a[1])?)))
        .ok_or_else(|| {
            (
                "rating".to_string(),
                "not a pair of whole numbers".to_string(),
            )
        })?;
    let size = num("size")?;
    let count = num("count")?;
    // Optional: absent means a plain generation.
    let min_moves = match obj.get("min_moves") {
        None => 0,
        Some(v) => v
            .as_u64()
            .and_then(|n| u16::try_from(n).ok())
            .ok_or_else(|| {
                (
                    "min_moves".to_string(),
                    "not a small whole number".to_string(),
                )
            })?,
    };
    let unique = match obj.get("unique") {
        None => false,
        Some(v) => v
            .as_bool()
            .ok_or_else(|| ("unique".to_string(), "not true or false".to_string()))?,
    };
    Ok(GeneratorInfo {
        min_moves,
        unique,
        seed: num("seed")?,
        theme: text("theme")?
            .parse()
            .map_err(|e| ("theme".to_string(), format!("{e}")))?,
        rule: text("rule")?
            .parse()
            .map_err(|e| ("rule".to_string(), format!("{e}")))?,
        size: u8::try_from(size)
            .map_err(|_| ("size".to_string(), format!("{size} is not a board size")))?,
        count: usize::try_from(count)
            .ok()
            .filter(|&c| c <= limits::MAX_PUZZLES)
            .ok_or_else(|| {
                (
                    "count".to_string(),
                    format!("{count} is more than {} puzzles", limits::MAX_PUZZLES),
                )
            })?,
        rating,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> PuzzleSet {
        PuzzleSet {
            title: "Harbour Street Circle, Tuesday".into(),
            created: "2026-12-01".into(),
            puzzles: vec![Puzzle {
                id: "vf-1".into(),
                rule: Rule::Freestyle,
                size: 15,
                to_move: Stone::Black,
                black: vec!["h8".parse().unwrap(), "i8".parse().unwrap()],
                white: vec!["h9".parse().unwrap(), "i9".parse().unwrap()],
                theme: Theme::Vcf,
                first_moves: vec!["j8".parse().unwrap()],
                line: vec!["j8".parse().unwrap(), "k8".parse().unwrap()],
                length: 1,
                rating: 1234,
            }],
            generator: None,
        }
    }

    #[test]
    fn round_trips() {
        let s = sample();
        let text = to_json(&s);
        assert_eq!(parse(&text).unwrap(), s);
        assert_eq!(to_json(&parse(&text).unwrap()), text);
    }

    #[test]
    fn errors_name_the_puzzle_and_field() {
        let text = to_json(&sample()).replace("\"i9\"", "\"z99\"");
        let e = parse(&text).unwrap_err();
        assert_eq!(e.puzzle, Some((1, "vf-1".to_string())));
        assert_eq!(e.field, "white[1]");
        assert!(
            e.to_string()
                .contains("puzzle 1 (id 'vf-1'), field 'white[1]'"),
            "{e}"
        );
    }

    #[test]
    fn newer_versions_are_refused() {
        let text = to_json(&sample()).replace("\"version\": 1", "\"version\": 2");
        let e = parse(&text).unwrap_err();
        assert!(e.to_string().contains("newer version"), "{e}");
    }

    #[test]
    fn unknown_fields_are_ignored() {
        let text = to_json(&sample())
            .replace("\"rating\": 1234", "\"rating\": 1234, \"colour\": \"teal\"");
        assert_eq!(parse(&text).unwrap(), sample());
    }
}
