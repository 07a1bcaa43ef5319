//! The review deck behind Revisit: the puzzles the player missed, each with its FSRS card.
//!
//! A puzzle enters the deck when the player fails it, or solves it only with help, wherever
//! that happened (Tonight, Drill or the player's own games: [`Screen`]), through
//! [`Deck::add`]. It comes back when its card is due ([`Deck::due`], oldest due first), and
//! every later try is a review of the card ([`Deck::record`], which returns the day it comes
//! back). A puzzle met again outside Revisit (the same puzzle in another set, say) is reviewed
//! the same way by [`Deck::add`], clean solves included, since the player recalled it.
//!
//! # From a try to a grade
//!
//! [`grade`] maps a finished [`Attempt`] to FSRS's four grades: failed is Again, helped is
//! Hard, clean is Good, and clean and quick is Easy. "Quick" ([`quick`]) means the whole
//! puzzle took at most [`QUICK_MS_PER_MOVE`] (10 seconds) for each move the player had to
//! make: the player's moves of the main line in a win puzzle (attacker moves, the five
//! included), one move in a defence. Ten seconds a move is our own choice, not a published
//! figure: a player who remembers a line plays it at about the pace of placing stones, while
//! one who reads it out again takes much longer per move; a line of six moves recalled in a
//! minute is recall rather than fresh reading.
//!
//! # Storage and its bounds
//!
//! The deck is stored as JSON (`{"version": 1, "items": [...]}`) and read back with
//! [`Deck::from_json`], which checks everything (unknown fields are ignored, anything
//! malformed is refused with the item and what is wrong, and a deck from a newer version is
//! refused rather than misread). Each item keeps its puzzle as the set file's puzzle object
//! (see `formats::setfile`), so a stored deck stays readable by the same strict reader as a set
//! file, plus the set's title (cut to [`TITLE_CHARS`] characters) and the last
//! [`KEPT_REVIEWS`] tries.
//!
//! The deck holds at most [`CAPACITY`] (300) puzzles, about 300 KB of JSON when full (each item
//! is about 1 KB, most of it the position); with the practice history it stays well inside
//! what a browser's local storage allows, with room for the page's last good copy of each. When a new miss
//! arrives at a full deck, the puzzle the player knows best makes room: the one with the
//! highest stability (the longest memory FSRS credits the player with); among equals, the one
//! added earliest. A fresh miss matters more than a puzzle the schedule already sends months
//! away, and a puzzle missed long ago and still not learned has had its chances.

use std::fmt;

use serde_json::Value;

use super::fsrs::{Card, Recall, Scheduler, Stage};
use super::stored::{self, build, flag, list, name, number, object, opt, opt_uint, text, uint};
use super::Day;
use crate::formats::setfile::{self, PuzzleSet, SetError};
use crate::puzzle::attempt::Attempt;
use crate::puzzle::{Goal, Puzzle};

/// The version of the stored deck this code writes and reads.
pub const VERSION: u64 = 1;

/// The most puzzles the deck holds.
pub const CAPACITY: usize = 300;

/// The tries kept per puzzle (the latest ones).
pub const KEPT_REVIEWS: usize = 5;

/// A set title longer than this (in characters) is cut when stored.
pub const TITLE_CHARS: usize = 100;

/// The time per player move under which a clean solve counts as quick (10 seconds).
pub const QUICK_MS_PER_MOVE: u32 = 10_000;

/// Where a puzzle was met.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Screen {
    /// The set the instructor assigned.
    Tonight,
    /// Generated practice.
    Drill,
    /// A finding in the player's own games.
    Games,
    /// Revisit itself (for the practice history; the deck's puzzles come from the others).
    Revisit,
}

impl Screen {
    /// Every origin.
    pub const ALL: [Screen; 4] = [
        Screen::Tonight,
        Screen::Drill,
        Screen::Games,
        Screen::Revisit,
    ];

    /// `tonight`, `drill`, `games` or `revisit`.
    pub const fn name(self) -> &'static str {
        match self {
            Screen::Tonight => "tonight",
            Screen::Drill => "drill",
            Screen::Games => "games",
            Screen::Revisit => "revisit",
        }
    }
}

impl fmt::Display for Screen {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl std::str::FromStr for Screen {
    type Err = String;
    fn from_str(s: &str) -> Result<Screen, String> {
        Screen::ALL
            .into_iter()
            .find(|o| o.name() == s)
            .ok_or_else(|| format!("'{s}' is not tonight, drill, games or revisit"))
    }
}

/// Where a puzzle came from: the screen and the set's title (outside text: shown as text).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Source {
    /// The screen.
    pub origin: Screen,
    /// The set's title.
    pub title: String,
}

impl Source {
    /// A source, with the title cut to [`TITLE_CHARS`] characters.
    pub fn new(origin: Screen, title: &str) -> Source {
        Source {
            origin,
            title: title.chars().take(TITLE_CHARS).collect(),
        }
    }
}

/// One try at a puzzle of the deck.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Review {
    /// The day of the try.
    pub day: Day,
    /// How it went (`clean`, `helped` or `failed`).
    pub attempt: Attempt,
    /// Whether it was quick (see [`quick`]).
    pub quick: bool,
    /// The grade it gave.
    pub grade: Recall,
    /// The day the puzzle was due after it.
    pub due: Day,
}

/// A puzzle of the deck.
#[derive(Clone, Debug, PartialEq)]
pub struct Item {
    /// The puzzle's id, the deck's key.
    pub id: String,
    /// The puzzle as the set file's puzzle object.
    pub puzzle: Value,
    /// Where it was first missed.
    pub source: Source,
    /// The day it entered the deck.
    pub added: Day,
    /// Its FSRS card.
    pub card: Card,
    /// The last tries, oldest first (at most [`KEPT_REVIEWS`]).
    pub reviews: Vec<Review>,
}

impl Item {
    /// A puzzle entering the deck on `today`, from `source`: a new card, due that day, with
    /// no review yet.
    fn new(puzzle: &Puzzle, source: Source, today: Day) -> Item {
        Item {
            id: puzzle.id.clone(),
            puzzle: puzzle_value(puzzle),
            source: Source::new(source.origin, &source.title),
            added: today,
            card: Card::new(today),
            reviews: Vec::new(),
        }
    }

    /// The puzzle.
    pub fn puzzle(&self) -> Result<Puzzle, SetError> {
        puzzle_from_value(&self.puzzle)
    }
}

/// What [`Deck::add`] did.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Filed {
    /// The puzzle entered the deck, due on `due`; `evicted` made room for it.
    New {
        /// The day it comes back.
        due: Day,
        /// The id of the puzzle dropped to make room, if the deck was full.
        evicted: Option<String>,
    },
    /// The puzzle was already in the deck; the try was a review of it.
    Reviewed {
        /// The day it comes back.
        due: Day,
    },
    /// A clean solve of a puzzle that is not in the deck: nothing to revisit.
    NotMissed,
}

/// How many puzzles are due, for a badge.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub struct Counts {
    /// Due today or earlier.
    pub due: usize,
    /// Of those, due before today.
    pub overdue: usize,
    /// Every puzzle in the deck.
    pub total: usize,
    /// The next day after today when a puzzle is due, if any.
    pub next: Option<Day>,
}

/// Why the deck could not do what was asked, or could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum DeckError {
    /// The try is not finished, so it cannot be graded.
    Unfinished(Attempt),
    /// No puzzle of the deck has this id.
    Unknown(String),
    /// The stored text is not a deck: not JSON, not an object, or no list of items.
    NotADeck(String),
    /// The stored deck was written by a newer version.
    Newer(u64),
    /// The stored deck has no usable version.
    Version,
    /// The stored deck holds more than [`CAPACITY`] puzzles.
    TooMany(usize),
    /// A stored item is malformed: its number (from 1), its id when readable, and what is
    /// wrong.
    Item {
        /// The item's number, from 1.
        number: usize,
        /// The item's id, or empty.
        id: String,
        /// What is wrong.
        message: String,
    },
}

impl fmt::Display for DeckError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            DeckError::Unfinished(a) => {
                write!(
                    f,
                    "a try that is {a} is not finished and cannot be scheduled"
                )
            }
            DeckError::Unknown(id) => write!(f, "no puzzle '{id}' in the review deck"),
            DeckError::NotADeck(why) => write!(f, "not a review deck: {why}"),
            DeckError::Newer(v) => write!(
                f,
                "this review deck was saved by a newer version of Fivefold (deck version {v}); \
                 this version reads deck version {VERSION}"
            ),
            DeckError::Version => f.write_str("the review deck has no version 1"),
            DeckError::TooMany(n) => write!(
                f,
                "the review deck holds {n} puzzles, more than the {CAPACITY} it can"
            ),
            DeckError::Item {
                number,
                id,
                message,
            } if id.is_empty() => write!(f, "review item {number}: {message}"),
            DeckError::Item {
                number,
                id,
                message,
            } => write!(f, "review item {number} (puzzle '{id}'): {message}"),
        }
    }
}

impl std::error::Error for DeckError {}

/// The FSRS grade of a finished try: failed is Again, helped is Hard, clean is Good, clean and
/// quick is Easy. `None` for a try that is not finished.
pub fn grade(attempt: Attempt, quick: bool) -> Option<Recall> {
    match attempt {
        Attempt::Failed => Some(Recall::Again),
        Attempt::Helped => Some(Recall::Hard),
        Attempt::Clean if quick => Some(Recall::Easy),
        Attempt::Clean => Some(Recall::Good),
        Attempt::Untried | Attempt::Trying => None,
    }
}

/// The moves the player makes in a puzzle: the attacker's moves of the main line (the five
/// included) in a win puzzle, one in a defence.
pub fn player_moves(puzzle: &Puzzle) -> u32 {
    match puzzle.goal() {
        Goal::Win => (puzzle.line.len() as u32).div_ceil(2).max(1),
        Goal::Defend => 1,
    }
}

/// Whether a solve that took `millis` milliseconds was quick: at most [`QUICK_MS_PER_MOVE`]
/// for each of the player's moves.
pub fn quick(puzzle: &Puzzle, millis: u32) -> bool {
    u64::from(millis) <= u64::from(QUICK_MS_PER_MOVE) * u64::from(player_moves(puzzle))
}

/// The deck.
#[derive(Clone, Debug, PartialEq)]
pub struct Deck {
    items: Vec<Item>,
}

impl Default for Deck {
    fn default() -> Self {
        Deck::new()
    }
}

impl Deck {
    /// An empty deck.
    pub fn new() -> Deck {
        Deck { items: Vec::new() }
    }

    /// The puzzles, in the order they entered.
    pub fn items(&self) -> &[Item] {
        &self.items
    }

    /// The puzzle with this id.
    pub fn get(&self, id: &str) -> Option<&Item> {
        self.items.iter().find(|i| i.id == id)
    }

    /// How many puzzles the deck holds.
    pub fn len(&self) -> usize {
        self.items.len()
    }

    /// Whether the deck is empty.
    pub fn is_empty(&self) -> bool {
        self.items.is_empty()
    }

    /// Takes in a finished try at `puzzle` on `today`, from `source`. A failed or helped try
    /// at a puzzle not in the deck adds it (its first review is that try, so a failure comes
    /// back tomorrow); any finished try at a puzzle already in the deck is a review of it; a
    /// clean solve of a puzzle not in the deck changes nothing.
    pub fn add(
        &mut self,
        puzzle: &Puzzle,
        source: Source,
        attempt: Attempt,
        quick: bool,
        today: Day,
    ) -> Result<Filed, DeckError> {
        let g = grade(attempt, quick).ok_or(DeckError::Unfinished(attempt))?;
        if let Some(item) = self.items.iter_mut().find(|i| i.id == puzzle.id) {
            let due = review_item(item, attempt, quick, g, today);
            return Ok(Filed::Reviewed { due });
        }
        if g >= Recall::Good {
            return Ok(Filed::NotMissed);
        }
        let evicted = if self.items.len() >= CAPACITY {
            self.evict()
        } else {
            None
        };
        let mut item = Item::new(puzzle, source, today);
        let due = review_item(&mut item, attempt, quick, g, today);
        self.items.push(item);
        Ok(Filed::New { due, evicted })
    }

    /// Files a miss found outside the app (a finding of the player's own game, made a puzzle):
    /// a puzzle not in the deck enters it as a new card, due on `today`, with no review (the
    /// player has not tried it here; the first try is its first review). A puzzle already in
    /// the deck is left as it is. Returns the day it is due.
    pub fn file(&mut self, puzzle: &Puzzle, source: Source, today: Day) -> Day {
        if let Some(item) = self.items.iter().find(|i| i.id == puzzle.id) {
            return item.card.due;
        }
        if self.items.len() >= CAPACITY {
            self.evict();
        }
        self.items.push(Item::new(puzzle, source, today));
        today
    }

    /// The puzzles due on `today` (or earlier), the longest overdue first; among those due on
    /// the same day, the one added first.
    pub fn due(&self, today: Day) -> Vec<&Item> {
        // Each due item is put in its place as it is found (at most CAPACITY of them; a
        // library sort would add several KB to the page for this one list).
        let key = |i: &Item| (i.card.due, i.added);
        let mut due: Vec<&Item> = Vec::new();
        for item in self.items.iter().filter(|i| i.card.is_due(today)) {
            let at = due.partition_point(|d| (key(d), &d.id) <= (key(item), &item.id));
            due.insert(at, item);
        }
        due
    }

    /// Records a finished try at the deck's puzzle `id` on `today` and returns the day it
    /// comes back.
    pub fn record(
        &mut self,
        id: &str,
        attempt: Attempt,
        quick: bool,
        today: Day,
    ) -> Result<Day, DeckError> {
        let g = grade(attempt, quick).ok_or(DeckError::Unfinished(attempt))?;
        let item = self
            .items
            .iter_mut()
            .find(|i| i.id == id)
            .ok_or_else(|| DeckError::Unknown(id.to_string()))?;
        Ok(review_item(item, attempt, quick, g, today))
    }

    /// Takes a puzzle out of the deck (the player asked to); whether it was there.
    pub fn remove(&mut self, id: &str) -> bool {
        let before = self.items.len();
        self.items.retain(|i| i.id != id);
        self.items.len() < before
    }

    /// How many puzzles are due on `today`, for a badge.
    pub fn counts(&self, today: Day) -> Counts {
        let mut c = Counts {
            total: self.items.len(),
            ..Counts::default()
        };
        for item in &self.items {
            let due = item.card.due;
            if due <= today {
                c.due += 1;
                c.overdue += usize::from(due < today);
            } else {
                c.next = Some(c.next.map_or(due, |n| n.min(due)));
            }
        }
        c
    }

    /// Drops the puzzle the player knows best (see the module documentation) and returns its id.
    fn evict(&mut self) -> Option<String> {
        let (index, _) = self.items.iter().enumerate().max_by(|(_, a), (_, b)| {
            a.card
                .stability
                .total_cmp(&b.card.stability)
                .then(b.added.cmp(&a.added))
                .then(b.id.cmp(&a.id))
        })?;
        Some(self.items.remove(index).id)
    }

    /// The deck as JSON, for storage (the shape is in the module documentation). The same
    /// deck always gives the same text.
    pub fn to_json(&self) -> String {
        let items: Vec<Value> = self.items.iter().map(item_value).collect();
        stored::write(&build(vec![
            ("version", VERSION.into()),
            ("items", items.into()),
        ]))
    }

    /// Reads a stored deck. Either the whole deck comes back, or an error naming the item and
    /// what is wrong; unknown fields are ignored.
    pub fn from_json(text: &str) -> Result<Deck, DeckError> {
        use stored::Opening;
        let obj = stored::open(text, VERSION).map_err(|e| match e {
            Opening::NotJson(why) => DeckError::NotADeck(why),
            Opening::NotObject => DeckError::NotADeck("not a JSON object".into()),
            Opening::Newer(v) => DeckError::Newer(v),
            Opening::NoVersion => DeckError::Version,
        })?;
        let list = list(&obj, "items").map_err(DeckError::NotADeck)?;
        if list.len() > CAPACITY {
            return Err(DeckError::TooMany(list.len()));
        }
        let mut items: Vec<Item> = Vec::with_capacity(list.len());
        for (n, v) in list.iter().enumerate() {
            let id = v
                .get("id")
                .and_then(Value::as_str)
                .unwrap_or_default()
                .to_string();
            let bad = |message: String| DeckError::Item {
                number: n + 1,
                id: id.clone(),
                message,
            };
            let item = item_from(v).map_err(bad)?;
            if items.iter().any(|i| i.id == item.id) {
                return Err(bad("the same puzzle twice".into()));
            }
            items.push(item);
        }
        Ok(Deck { items })
    }
}

/// Applies one graded try to an item: reviews the card and keeps the try.
fn review_item(item: &mut Item, attempt: Attempt, quick: bool, g: Recall, today: Day) -> Day {
    item.card = Scheduler::default().review(&item.card, g, today);
    item.reviews.push(Review {
        day: today,
        attempt,
        quick,
        grade: g,
        due: item.card.due,
    });
    if item.reviews.len() > KEPT_REVIEWS {
        let extra = item.reviews.len() - KEPT_REVIEWS;
        item.reviews.drain(..extra);
    }
    item.card.due
}

/// An item as stored:
///
/// ```text
/// { "id": "...", "puzzle": { set-file puzzle object }, "added": 20454,
///   "source": { "origin": "drill", "title": "..." },
///   "card": { "stability": 2.3065, "difficulty": 2.118104, "due": 20456,
///             "last_review": 20454, "reps": 1, "lapses": 0, "state": "review" },
///   "reviews": [ { "day": 20454, "attempt": "failed", "quick": false, "grade": "again",
///                  "due": 20455 } ] }
/// ```
fn item_value(item: &Item) -> Value {
    let c = &item.card;
    let reviews: Vec<Value> = item
        .reviews
        .iter()
        .map(|r| {
            build(vec![
                ("day", r.day.into()),
                ("attempt", r.attempt.name().into()),
                ("quick", r.quick.into()),
                ("grade", r.grade.name().into()),
                ("due", r.due.into()),
            ])
        })
        .collect();
    build(vec![
        ("id", item.id.as_str().into()),
        ("puzzle", item.puzzle.clone()),
        ("source", source_value(&item.source)),
        ("added", item.added.into()),
        (
            "card",
            build(vec![
                ("stability", c.stability.into()),
                ("difficulty", c.difficulty.into()),
                ("due", c.due.into()),
                ("last_review", opt(c.last_review)),
                ("reps", c.reps.into()),
                ("lapses", c.lapses.into()),
                ("state", c.state.name().into()),
            ]),
        ),
        ("reviews", reviews.into()),
    ])
}

/// A source as stored: `{ "origin": "drill", "title": "..." }`.
pub(crate) fn source_value(source: &Source) -> Value {
    build(vec![
        ("origin", source.origin.name().into()),
        ("title", source.title.as_str().into()),
    ])
}

/// Reads a stored source; the title may not be longer than [`TITLE_CHARS`].
pub(crate) fn source_from(v: &Value) -> Result<Source, String> {
    let o = object(v, "'source'")?;
    let title = text(o, "title")?;
    if title.chars().count() > TITLE_CHARS {
        return Err(format!("'title': longer than {TITLE_CHARS} characters"));
    }
    Ok(Source {
        origin: name(o, "origin")?,
        title: title.to_string(),
    })
}

/// Reads a stored item and checks it: the puzzle reads as a set-file puzzle with the item's
/// id, the card is consistent, the tries are at most [`KEPT_REVIEWS`] and graded as
/// [`grade`] grades them.
fn item_from(v: &Value) -> Result<Item, String> {
    let o = object(v, "the item")?;
    let id = text(o, "id")?.to_string();
    let puzzle = stored::field(o, "puzzle")?.clone();
    let p = puzzle_from_value(&puzzle).map_err(|e| format!("'puzzle': {e}"))?;
    if p.id != id {
        return Err(format!("holds puzzle '{}' under another id", p.id));
    }
    let c = object(stored::field(o, "card")?, "'card'")?;
    let card = Card {
        stability: number(c, "stability")?,
        difficulty: number(c, "difficulty")?,
        due: uint(c, "due")?,
        last_review: opt_uint(c, "last_review")?,
        reps: uint(c, "reps")?,
        lapses: uint(c, "lapses")?,
        state: name::<Stage>(c, "state")?,
    };
    card.check().map_err(|e| format!("'card': {e}"))?;
    let list = list(o, "reviews")?;
    if list.len() > KEPT_REVIEWS {
        return Err(format!("'reviews': more than {KEPT_REVIEWS} tries"));
    }
    let mut reviews = Vec::with_capacity(list.len());
    for r in list {
        let r = object(r, "a try")?;
        let review = Review {
            day: uint(r, "day")?,
            attempt: name(r, "attempt")?,
            quick: flag(r, "quick", false)?,
            grade: name(r, "grade")?,
            due: uint(r, "due")?,
        };
        if grade(review.attempt, review.quick) != Some(review.grade) {
            return Err(format!(
                "'reviews': a try that was {} is graded {}",
                review.attempt, review.grade
            ));
        }
        reviews.push(review);
    }
    Ok(Item {
        id,
        puzzle,
        source: source_from(stored::field(o, "source")?)?,
        added: uint(o, "added")?,
        card,
        reviews,
    })
}

/// A puzzle as the set file's puzzle object.
fn puzzle_value(puzzle: &Puzzle) -> Value {
    let set = PuzzleSet {
        title: String::new(),
        created: "1970-01-01".into(),
        puzzles: vec![puzzle.clone()],
        generator: None,
    };
    let mut value: Value =
        serde_json::from_str(&setfile::to_json(&set)).expect("a written set reads back as JSON");
    value
        .get_mut("puzzles")
        .and_then(|list| list.get_mut(0))
        .map(Value::take)
        .expect("a written set has its puzzle")
}

/// A set file's puzzle object, read by the set file's own reader.
fn puzzle_from_value(value: &Value) -> Result<Puzzle, SetError> {
    let set = build(vec![
        ("format", setfile::FORMAT.into()),
        ("version", setfile::VERSION.into()),
        ("title", "".into()),
        ("created", "1970-01-01".into()),
        ("puzzles", vec![value.clone()].into()),
    ]);
    let mut set = setfile::parse(&stored::write(&set))?;
    Ok(set.puzzles.remove(0))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::puzzle::Theme;
    use crate::types::Rule;
    use crate::types::Stone;
    use crate::Point;
    use serde_json::json;

    /// A small win puzzle with the given id (the position is not checked here; the deck only
    /// stores and reads it back).
    pub(crate) fn puzzle(id: &str) -> Puzzle {
        let pts = |s: &str| -> Vec<Point> { s.split(' ').map(|p| p.parse().unwrap()).collect() };
        Puzzle {
            id: id.to_string(),
            rule: Rule::Freestyle,
            size: 15,
            to_move: Stone::Black,
            black: pts("h8 i8 j8"),
            white: pts("h9 i9"),
            theme: Theme::Vcf,
            first_moves: pts("k8"),
            line: pts("k8 l8 g8"),
            length: 1,
            rating: 1200,
        }
    }

    fn drill() -> Source {
        Source::new(Screen::Drill, "Drill: vcf")
    }

    #[test]
    fn outcomes_map_to_grades() {
        assert_eq!(grade(Attempt::Failed, true), Some(Recall::Again));
        assert_eq!(grade(Attempt::Helped, true), Some(Recall::Hard));
        assert_eq!(grade(Attempt::Clean, false), Some(Recall::Good));
        assert_eq!(grade(Attempt::Clean, true), Some(Recall::Easy));
        assert_eq!(grade(Attempt::Trying, false), None);
        assert_eq!(grade(Attempt::Untried, true), None);
    }

    #[test]
    fn quick_is_ten_seconds_a_move() {
        // The line k8 l8 g8 has two player moves (k8 and the five at g8): 20 seconds.
        let p = puzzle("a");
        assert_eq!(player_moves(&p), 2);
        assert!(quick(&p, 20_000));
        assert!(!quick(&p, 20_001));
        let d = Puzzle {
            theme: Theme::Defend,
            ..p
        };
        assert_eq!(player_moves(&d), 1);
        assert!(quick(&d, 10_000) && !quick(&d, 10_001));
    }

    #[test]
    fn a_miss_from_outside_is_due_today_with_no_review_and_filed_once() {
        let mut deck = Deck::new();
        let day = 20_454;
        let games = Source::new(Screen::Games, "From my games");
        assert_eq!(deck.file(&puzzle("a"), games.clone(), day), day);
        assert_eq!(deck.due(day).len(), 1);
        assert!(deck.get("a").unwrap().reviews.is_empty());
        // Filed again (the same game checked again): left as it is.
        assert_eq!(deck.file(&puzzle("a"), games.clone(), day + 3), day);
        assert_eq!((deck.len(), deck.get("a").unwrap().added), (1, day));
        // The first try in the app is its first review: a miss comes back tomorrow, as a miss
        // of a puzzle not in the deck does.
        let r = deck.add(&puzzle("a"), drill(), Attempt::Failed, false, day);
        assert_eq!(r, Ok(Filed::Reviewed { due: day + 1 }));
        assert_eq!(deck.get("a").unwrap().reviews.len(), 1);
        // A card without reviews reads back from storage.
        deck.file(&puzzle("b"), games, day);
        let back = Deck::from_json(&deck.to_json()).unwrap();
        assert_eq!(back.to_json(), deck.to_json());
        // Filed in a puzzle already in the deck, nothing changes.
        let before = deck.to_json();
        deck.file(&puzzle("a"), drill(), day + 5);
        assert_eq!(deck.to_json(), before);
    }

    #[test]
    fn a_miss_enters_and_comes_back_tomorrow() {
        let mut deck = Deck::new();
        let day = 20_454;
        // Failed: stability w0 = 0.212 days, so the interval is the 1-day minimum.
        let r = deck.add(&puzzle("a"), drill(), Attempt::Failed, false, day);
        assert_eq!(
            r,
            Ok(Filed::New {
                due: day + 1,
                evicted: None
            })
        );
        // Helped: stability w1 = 1.2931 days, rounded to 1.
        let r = deck.add(&puzzle("b"), drill(), Attempt::Helped, false, day);
        assert_eq!(
            r,
            Ok(Filed::New {
                due: day + 1,
                evicted: None
            })
        );
        // A clean solve of a puzzle not in the deck is nothing to revisit.
        let r = deck.add(&puzzle("c"), drill(), Attempt::Clean, false, day);
        assert_eq!(r, Ok(Filed::NotMissed));
        assert_eq!(
            deck.add(&puzzle("d"), drill(), Attempt::Trying, false, day),
            Err(DeckError::Unfinished(Attempt::Trying))
        );
        assert_eq!(deck.len(), 2);
        assert!(deck.due(day).is_empty());
        let due: Vec<&str> = deck.due(day + 1).iter().map(|i| i.id.as_str()).collect();
        assert_eq!(due, ["a", "b"]);
        assert_eq!(
            deck.counts(day),
            Counts {
                due: 0,
                overdue: 0,
                total: 2,
                next: Some(day + 1)
            }
        );
        assert_eq!(deck.counts(day + 2).overdue, 2);
        assert_eq!(deck.get("a").unwrap().puzzle().unwrap(), puzzle("a"));
    }

    #[test]
    fn recording_moves_the_due_day_and_keeps_the_tries() {
        let mut deck = Deck::new();
        deck.add(&puzzle("a"), drill(), Attempt::Failed, false, 10)
            .unwrap();
        let due = deck.record("a", Attempt::Clean, false, 11).unwrap();
        assert!(due > 12, "{due}");
        assert_eq!(deck.get("a").unwrap().card.due, due);
        assert_eq!(
            deck.record("zz", Attempt::Clean, false, 11),
            Err(DeckError::Unknown("zz".into()))
        );
        // The same puzzle missed again elsewhere is a review, not a second item.
        let r = deck
            .add(&puzzle("a"), drill(), Attempt::Failed, false, 12)
            .unwrap();
        assert_eq!(r, Filed::Reviewed { due: 13 });
        assert_eq!(deck.len(), 1);
        for day in 13..30 {
            deck.record("a", Attempt::Helped, false, day).unwrap();
        }
        let item = deck.get("a").unwrap();
        assert_eq!(item.reviews.len(), KEPT_REVIEWS);
        assert_eq!(item.reviews.last().unwrap().day, 29);
        assert_eq!(item.card.reps, 20);
        assert!(deck.remove("a") && !deck.remove("a"));
    }

    #[test]
    fn due_puzzles_come_oldest_first() {
        let mut deck = Deck::new();
        deck.add(&puzzle("late"), drill(), Attempt::Failed, false, 5)
            .unwrap();
        deck.add(&puzzle("early"), drill(), Attempt::Failed, false, 3)
            .unwrap();
        deck.add(&puzzle("same"), drill(), Attempt::Failed, false, 3)
            .unwrap();
        let order: Vec<&str> = deck.due(10).iter().map(|i| i.id.as_str()).collect();
        assert_eq!(order, ["early", "same", "late"]);
    }

    #[test]
    fn a_full_deck_drops_the_best_known_puzzle() {
        let mut deck = Deck::new();
        for n in 0..CAPACITY {
            deck.add(
                &puzzle(&format!("p{n}")),
                drill(),
                Attempt::Failed,
                false,
                0,
            )
            .unwrap();
        }
        // p7 is recalled well over a few reviews: it is the best known.
        for day in [1, 3, 10] {
            deck.record("p7", Attempt::Clean, true, day).unwrap();
        }
        let r = deck
            .add(&puzzle("new"), drill(), Attempt::Failed, false, 11)
            .unwrap();
        assert_eq!(
            r,
            Filed::New {
                due: 12,
                evicted: Some("p7".into())
            }
        );
        assert_eq!(deck.len(), CAPACITY);
        assert!(deck.get("p7").is_none() && deck.get("new").is_some());
        // Every puzzle left is equally known (one Again each): the one added first goes, p0,
        // not the fresh miss.
        let r = deck
            .add(&puzzle("newer"), drill(), Attempt::Failed, false, 11)
            .unwrap();
        assert!(
            matches!(r, Filed::New { evicted: Some(ref id), .. } if id == "p0"),
            "{r:?}"
        );
    }

    #[test]
    fn the_deck_round_trips_and_refuses_bad_input() {
        let mut deck = Deck::new();
        let long_title = "Harbour Street Circle ".repeat(10);
        deck.add(
            &puzzle("a"),
            Source::new(Screen::Tonight, &long_title),
            Attempt::Helped,
            false,
            7,
        )
        .unwrap();
        deck.add(&puzzle("b"), drill(), Attempt::Failed, false, 8)
            .unwrap();
        assert_eq!(
            deck.get("a").unwrap().source.title.chars().count(),
            TITLE_CHARS
        );
        let text = deck.to_json();
        let back = Deck::from_json(&text).unwrap();
        assert_eq!(back, deck);
        assert_eq!(back.to_json(), text);

        let v: Value = serde_json::from_str(&text).unwrap();
        let with = |f: &dyn Fn(&mut Value)| {
            let mut v = v.clone();
            f(&mut v);
            Deck::from_json(&v.to_string())
        };
        assert!(matches!(
            Deck::from_json("[1]"),
            Err(DeckError::NotADeck(_))
        ));
        assert!(matches!(Deck::from_json("{"), Err(DeckError::NotADeck(_))));
        assert_eq!(with(&|v| v["version"] = json!(2)), Err(DeckError::Newer(2)));
        assert_eq!(
            with(&|v| v["version"] = json!("1")),
            Err(DeckError::Version)
        );
        let item_error = |r: Result<Deck, DeckError>| match r {
            Err(DeckError::Item {
                number,
                id,
                message,
            }) => format!("{number} {id}: {message}"),
            other => panic!("{other:?}"),
        };
        let e = item_error(with(&|v| v["items"][1]["card"]["difficulty"] = json!(12.0)));
        assert!(
            e.starts_with("2 b: 'card': difficulty outside 1 to 10"),
            "{e}"
        );
        let e = item_error(with(&|v| {
            v["items"][0]["puzzle"]["black"][0] = json!("z99")
        }));
        assert!(e.contains("'z99' is not a coordinate"), "{e}");
        let e = item_error(with(&|v| v["items"][1]["id"] = json!("a")));
        assert!(e.starts_with("2 a:"), "{e}");
        let e = item_error(with(&|v| {
            v["items"][0]["reviews"][0]["grade"] = json!("easy")
        }));
        assert!(e.contains("graded easy"), "{e}");
        let e = item_error(with(&|v| {
            v["items"][0]["reviews"][0]["attempt"] = json!("won")
        }));
        assert!(e.contains("unknown outcome 'won'"), "{e}");
        let e = item_error(with(&|v| {
            v["items"][1] = v["items"][0].clone();
        }));
        assert!(e.contains("twice"), "{e}");
        // Unknown fields are ignored.
        let ok = with(&|v| v["items"][0]["colour"] = json!("teal")).unwrap();
        assert_eq!(ok, deck);
        // Display says where.
        let e = with(&|v| v["items"][1]["card"]["reps"] = json!(-1)).unwrap_err();
        assert!(
            e.to_string().starts_with("review item 2 (puzzle 'b'):"),
            "{e}"
        );
    }
}
