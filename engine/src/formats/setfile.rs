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

use std::fmt;

use serde::Serialize;
use serde_json::{Map, Value};

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
        }),
    };
    let mut s = serde_json::to_string_pretty(&wire).expect("set serialisation cannot fail");
    s.push('\n');
    s
}

/// Reads a set file. Either the whole set is returned, or an error naming what is wrong.
pub fn parse(text: &str) -> Result<PuzzleSet, SetError> {
    let top = |field: &str, message: String| SetError {
        puzzle: None,
        field: field.to_string(),
        message,
    };
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
    let title = string(obj, "title").map_err(|m| top("title", m))?;
    let created = string(obj, "created").map_err(|m| top("created", m))?;
    if !is_date(&created) {
        return Err(top(
            "created",
            format!("'{created}' is not a date like 2026-12-01"),
        ));
    }
    let list = obj
        .get("puzzles")
        .and_then(Value::as_array)
        .ok_or_else(|| top("puzzles", "missing or not a list".into()))?;
    if list.is_empty() {
        return Err(top("puzzles", "the set has no puzzles".into()));
    }
    let mut puzzles = Vec::with_capacity(list.len());
    for (i, v) in list.iter().enumerate() {
        let p = parse_puzzle(i + 1, v)?;
        if let Some(j) = puzzles.iter().position(|q: &Puzzle| q.id == p.id) {
            return Err(SetError {
                puzzle: Some((i + 1, p.id.clone())),
                field: "id".into(),
                message: format!("the same id as puzzle {}", j + 1),
            });
        }
        puzzles.push(p);
    }
    let generator = match obj.get("generator") {
        None | Some(Value::Null) => None,
        Some(g) => Some(parse_generator(g).map_err(|(f, m)| top(&format!("generator.{f}"), m))?),
    };
    Ok(PuzzleSet {
        title,
        created,
        puzzles,
        generator,
    })
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
    if id.chars().count() > 64 {
        return Err(err("id", "longer than 64 characters".into()));
    }
    let rule: Rule = string(obj, "rule")
        .map_err(|m| err("rule", m))?
        .parse()
        .map_err(|e| err("rule", format!("{e}")))?;
    let size = obj
        .get("size")
        .and_then(Value::as_u64)
        .ok_or_else(|| err("size", "missing or not a whole number".into()))?;
    if !(5..=19).contains(&size) {
        return Err(err("size", format!("{size} is not a board size (5 to 19)")));
    }
    let size = size as u8;
    let to_move: Stone = string(obj, "to_move")
        .map_err(|m| err("to_move", m))?
        .parse()
        .map_err(|e: crate::StoneParseError| err("to_move", e.to_string()))?;
    let points =
        |field: &str, v: Option<&Value>, seen: &mut Vec<Point>| -> Result<Vec<Point>, SetError> {
            let arr = v
                .and_then(Value::as_array)
                .ok_or_else(|| err(field, "missing or not a list".into()))?;
            let mut out = Vec::with_capacity(arr.len());
            for (i, x) in arr.iter().enumerate() {
                let f = format!("{field}[{i}]");
                let s = x.as_str().ok_or_else(|| err(&f, "not text".into()))?;
                let p: Point = s.parse().map_err(|e| err(&f, format!("{e}")))?;
                if p.x >= size || p.y >= size {
                    return Err(err(&f, format!("{p} is off the {size}x{size} board")));
                }
                if seen.contains(&p) || out.contains(&p) {
                    return Err(err(&f, format!("{p} is given twice")));
                }
                out.push(p);
            }
            Ok(out)
        };
    let mut stones = Vec::new();
    let black = points("black", obj.get("black"), &mut stones)?;
    stones.extend(&black);
    let white = points("white", obj.get("white"), &mut stones)?;
    stones.extend(&white);
    let theme: Theme = string(obj, "theme")
        .map_err(|m| err("theme", m))?
        .parse()
        .map_err(|e| err("theme", format!("{e}")))?;
    if !theme.allowed(rule) {
        return Err(err(
            "theme",
            format!("{theme} puzzles exist only under renju"),
        ));
    }
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
    let mut no_repeat = Vec::new();
    let first_moves = points(
        "solution.first_moves",
        sol.get("first_moves"),
        &mut no_repeat,
    )?;
    if first_moves.is_empty() {
        return Err(err(
            "solution.first_moves",
            "empty: a puzzle needs at least one answer".into(),
        ));
    }
    if let Some(p) = first_moves.iter().find(|p| stones.contains(p)) {
        return Err(err("solution.first_moves", format!("{p} is already taken")));
    }
    let mut no_repeat = Vec::new();
    let line = points("solution.line", sol.get("line"), &mut no_repeat)?;
    if let Some(p) = line.iter().find(|p| stones.contains(p)) {
        return Err(err("solution.line", format!("{p} is already taken")));
    }
    let rating = obj
        .get("rating")
        .and_then(Value::as_u64)
        .ok_or_else(|| err("rating", "missing or not a whole number".into()))?;
    if rating > 4000 {
        return Err(err(
            "rating",
            format!("{rating} is not a rating (0 to 4000)"),
        ));
    }
    let length = match obj.get("length") {
        None => 0,
        Some(v) => v
            .as_u64()
            .filter(|&l| l <= 200)
            .ok_or_else(|| err("length", "not a whole number up to 200".into()))?
            as u16,
    };
    Ok(Puzzle {
        id: id.clone(),
        rule,
        size,
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
    let rating = obj
        .get("rating")
        .and_then(Value::as_array)
        .filter(|a| a.len() == 2)
        .and_then(|a| Some((a[0].as_u64()? as u32, a[1].as_u64()? as u32)))
        .ok_or_else(|| {
            (
                "rating".to_string(),
                "not a pair of whole numbers".to_string(),
            )
        })?;
    Ok(GeneratorInfo {
        seed: num("seed")?,
        theme: text("theme")?
            .parse()
            .map_err(|e| ("theme".to_string(), format!("{e}")))?,
        rule: text("rule")?
            .parse()
            .map_err(|e| ("rule".to_string(), format!("{e}")))?,
        size: num("size")?.min(255) as u8,
        count: num("count")? as usize,
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
