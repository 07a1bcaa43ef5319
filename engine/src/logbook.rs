//! The logbook: the player's practice history, and what the Progress screen computes from it.
//!
//! Every finished attempt, on any screen, is one [`Entry`]: the day, rule, theme, puzzle id
//! and the rating it was rated against, the outcome, hints, wrong tries, time taken, the
//! player's rating and deviation for that rule after it (a player has one rating per rule),
//! the source, and whether it was a Drill skip that counted as a failure. From the entries the
//! logbook computes:
//!
//! * the rating series of a rule ([`Logbook::rating_series`]): one point per day with rated
//!   attempts (Drill's; the other screens carry the rating unchanged) under that rule, the
//!   rating and deviation after the day's last of them, for a chart with an uncertainty band;
//! * accuracy by theme and by rule ([`Logbook::accuracy_by_theme`],
//!   [`Logbook::accuracy_by_rule`]): clean, helped and failed counts ([`Tally`]) and the
//!   percentages;
//! * puzzles per day for a calendar ([`Logbook::days`], [`Logbook::calendar`]);
//! * the current and best streaks ([`Logbook::streaks`]). A day counts when at least one
//!   puzzle was finished on it. The current streak is the run of counted days that ends today;
//!   if today has none yet but yesterday counted, the run ending yesterday is still current,
//!   because the day is not over (common practice in habit trackers: a streak is lost only when
//!   a whole day passes without practice). [`Streaks::today_done`] says which case it is, so the
//!   page can ask for one puzzle to keep the streak.
//!
//! # Bounds
//!
//! The logbook keeps the latest [`ENTRY_CAP`] (1,000) entries, about 300 KB of JSON. When an
//! entry beyond the cap arrives, the oldest entry is folded into aggregates instead of being
//! lost: its day's counts (for the calendar and streaks), its rule's rating on that day (for
//! the chart), and the all-time clean, helped and failed counts of its theme and rule (for
//! accuracy). Every computation above merges the aggregates with the entries kept, so it gives
//! the same answer as if nothing had been dropped (a test checks this). The aggregates keep at
//! most [`DAY_CAP`] (1,000) days per list, several years of daily practice; older days are
//! dropped from the calendar and the chart, and their streaks survive as two numbers (the
//! best run among them and the run that ended with the newest of them), so the best streak
//! and a streak running across the cut stay right.
//!
//! # Storage
//!
//! The logbook is JSON with `"version": 1`, read back by [`Logbook::from_json`], which refuses
//! a newer version and anything malformed (naming where), and ignores unknown fields. Ratings
//! are kept to six decimal places so that the text reads back exactly.

use std::fmt;

use serde_json::Value;

use crate::puzzle::attempt::Attempt;
use crate::puzzle::Theme;
use crate::rating::drill::{self, Skip};
use crate::schedule::deck::{source_from, source_value, Screen, Source, TITLE_CHARS};
use crate::schedule::stored::{
    self, build, field, flag, list, name, number, object, opt, opt_uint, six_places, text, uint,
    Object,
};
use crate::schedule::Day;
use crate::types::Rule;

/// The version of the stored logbook this code writes and reads.
pub const VERSION: u64 = 1;

/// The most entries kept; older ones are folded into aggregates.
pub const ENTRY_CAP: usize = 1_000;

/// The most days kept in each aggregate list.
pub const DAY_CAP: usize = 1_000;

/// One finished attempt.
#[derive(Clone, Debug, PartialEq)]
pub struct Entry {
    /// The day it finished.
    pub day: Day,
    /// The rule.
    pub rule: Rule,
    /// The theme.
    pub theme: Theme,
    /// The puzzle's id.
    pub puzzle: String,
    /// The puzzle's rating the attempt was rated against.
    pub puzzle_rating: f64,
    /// How it ended: `clean`, `helped` or `failed`.
    pub outcome: Attempt,
    /// Hint steps taken.
    pub hints: u8,
    /// Wrong tries.
    pub wrong: u32,
    /// Time taken, in milliseconds.
    pub millis: u32,
    /// The player's rating under this rule after the attempt.
    pub rating: f64,
    /// Its deviation.
    pub deviation: f64,
    /// Where the puzzle came from.
    pub source: Source,
    /// A Drill puzzle left unfinished that counted as failed (see `rating::drill`).
    pub skipped: bool,
}

/// Clean, helped and failed counts.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Tally {
    /// Solved with no wrong move and no hint.
    pub clean: u32,
    /// Solved with help.
    pub helped: u32,
    /// Failed.
    pub failed: u32,
}

impl Tally {
    /// Every finished attempt counted.
    pub fn total(&self) -> u32 {
        self.clean + self.helped + self.failed
    }

    /// The share solved clean, in whole percent (rounded half up; 0 when empty).
    pub fn clean_percent(&self) -> u32 {
        percent(self.clean, self.total())
    }

    /// The share solved at all (clean or helped), in whole percent.
    pub fn solved_percent(&self) -> u32 {
        percent(self.clean + self.helped, self.total())
    }

    fn add(&mut self, outcome: Attempt) {
        match outcome {
            Attempt::Clean => self.clean += 1,
            Attempt::Helped => self.helped += 1,
            _ => self.failed += 1,
        }
    }

    fn value(&self) -> Value {
        build(vec![
            ("clean", self.clean.into()),
            ("helped", self.helped.into()),
            ("failed", self.failed.into()),
        ])
    }

    fn from(o: &Object) -> Result<Tally, String> {
        Ok(Tally {
            clean: uint(o, "clean")?,
            helped: uint(o, "helped")?,
            failed: uint(o, "failed")?,
        })
    }
}

fn percent(part: u32, total: u32) -> u32 {
    if total == 0 {
        return 0;
    }
    let (part, total) = (u64::from(part), u64::from(total));
    ((200 * part + total) / (2 * total)) as u32
}

/// The puzzles finished on one day.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DayTotal {
    /// The day.
    pub day: Day,
    /// The day's counts.
    pub tally: Tally,
}

/// A point of a rating chart: the rating and deviation after a day's last attempt.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RatingPoint {
    /// The day.
    pub day: Day,
    /// The rating.
    pub rating: f64,
    /// The deviation (the uncertainty band is rating ± deviation, or ± twice it).
    pub deviation: f64,
}

/// The current and best streaks of practice days.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Streaks {
    /// Days in the current run (see the module documentation); 0 if none.
    pub current: u32,
    /// The longest run ever.
    pub best: u32,
    /// Whether today already counts.
    pub today_done: bool,
}

/// What remains of aggregate days dropped beyond [`DAY_CAP`]: enough for the streaks.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
struct Gone {
    /// The longest run of practice days among them.
    best: u32,
    /// The run ending with the newest of them.
    run: u32,
    /// The newest of them.
    last: Option<Day>,
}

/// The entries folded out of the log. Ratings and tallies are indexed like [`Rule::ALL`] and
/// [`Theme::ALL`].
#[derive(Clone, Debug, Default, PartialEq)]
struct Earlier {
    days: Vec<DayTotal>,
    ratings: [Vec<RatingPoint>; 3],
    themes: [Tally; 6],
    rules: [Tally; 3],
    gone: Gone,
}

fn rule_index(rule: Rule) -> usize {
    Rule::ALL.iter().position(|&r| r == rule).unwrap_or(0)
}

fn theme_index(theme: Theme) -> usize {
    Theme::ALL.iter().position(|&t| t == theme).unwrap_or(0)
}

/// Free Drill skips used on a day.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
struct Skips {
    day: Day,
    used: u32,
}

/// Why an entry cannot be recorded, or a stored logbook cannot be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum LogbookError {
    /// The entry's attempt is not finished.
    Unfinished(Attempt),
    /// The stored text is not a logbook.
    NotALogbook(String),
    /// The stored logbook was written by a newer version.
    Newer(u64),
    /// The stored logbook has no usable version.
    Version,
    /// A field is malformed: where (like `entries[3]` or `earlier`) and what is wrong (which
    /// starts with the field inside it, like `'rating': not a number`).
    Field {
        /// Where.
        at: String,
        /// What is wrong.
        message: String,
    },
}

impl fmt::Display for LogbookError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            LogbookError::Unfinished(a) => {
                write!(
                    f,
                    "an attempt that is {a} is not finished and is not logged"
                )
            }
            LogbookError::NotALogbook(why) => write!(f, "not a practice history: {why}"),
            LogbookError::Newer(v) => write!(
                f,
                "this practice history was saved by a newer version of Fivefold (version {v}); \
                 this version reads version {VERSION}"
            ),
            LogbookError::Version => f.write_str("the practice history has no version 1"),
            LogbookError::Field { at, message } => {
                write!(f, "practice history, {at}: {message}")
            }
        }
    }
}

impl std::error::Error for LogbookError {}

/// The practice history.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Logbook {
    entries: Vec<Entry>,
    earlier: Earlier,
    skips: Skips,
}

impl Logbook {
    /// An empty logbook.
    pub fn new() -> Logbook {
        Logbook::default()
    }

    /// The entries kept, in the order they were recorded.
    pub fn entries(&self) -> &[Entry] {
        &self.entries
    }

    /// Records a finished attempt. The title is cut to the deck's [`TITLE_CHARS`] characters
    /// and the ratings rounded to six decimal places; beyond [`ENTRY_CAP`] the oldest entry is
    /// folded into the aggregates. An entry that could not be stored and read back (an
    /// unfinished attempt, a rating that is not a number of zero or more, an empty or overlong
    /// puzzle id) is refused and changes nothing.
    pub fn record(&mut self, mut entry: Entry) -> Result<(), LogbookError> {
        if !entry.outcome.finished() {
            return Err(LogbookError::Unfinished(entry.outcome));
        }
        entry.source = Source::new(entry.source.origin, &entry.source.title);
        entry.puzzle_rating = six_places(entry.puzzle_rating);
        entry.rating = six_places(entry.rating);
        entry.deviation = six_places(entry.deviation);
        check_entry(&entry).map_err(|message| LogbookError::Field {
            at: "entry".into(),
            message,
        })?;
        self.entries.push(entry);
        if self.entries.len() > ENTRY_CAP {
            let oldest = self.entries.remove(0);
            self.fold(&oldest);
        }
        Ok(())
    }

    /// Folds one entry into the aggregates.
    fn fold(&mut self, e: &Entry) {
        let earlier = &mut self.earlier;
        add_to_day(&mut earlier.days, e);
        let points = &mut earlier.ratings[rule_index(e.rule)];
        if rated(e) {
            put_point(points, e);
            if points.len() > DAY_CAP {
                points.remove(0);
            }
        }
        earlier.themes[theme_index(e.theme)].add(e.outcome);
        earlier.rules[rule_index(e.rule)].add(e.outcome);
        while earlier.days.len() > DAY_CAP {
            let d = earlier.days.remove(0).day;
            let gone = &mut earlier.gone;
            gone.run = match gone.last {
                Some(last) if d == last.saturating_add(1) => gone.run + 1,
                _ => 1,
            };
            gone.last = Some(d);
            gone.best = gone.best.max(gone.run);
        }
    }

    /// The rating series of `rule`: one point per day with a rated attempt under that rule,
    /// the rating and deviation after the day's last, oldest day first.
    pub fn rating_series(&self, rule: Rule) -> Vec<RatingPoint> {
        // The folded points are in order of day; each entry, in the order recorded, replaces
        // its day's point or is put in its place, so the last of each day stays.
        let mut series = self.earlier.ratings[rule_index(rule)].clone();
        for e in self.entries.iter().filter(|e| e.rule == rule && rated(e)) {
            put_point(&mut series, e);
        }
        series
    }

    /// The player's latest rating and deviation under `rule`, if any rated attempt was logged.
    pub fn latest(&self, rule: Rule) -> Option<RatingPoint> {
        match self
            .entries
            .iter()
            .rev()
            .find(|e| e.rule == rule && rated(e))
        {
            Some(e) => Some(point(e)),
            None => self.earlier.ratings[rule_index(rule)].last().copied(),
        }
    }

    /// Clean, helped and failed counts by theme, for the themes with any attempt, in the
    /// order of [`Theme::ALL`].
    pub fn accuracy_by_theme(&self) -> Vec<(Theme, Tally)> {
        accuracy(Theme::ALL, &self.earlier.themes, &self.entries, |e| e.theme)
    }

    /// Clean, helped and failed counts by rule, for the rules with any attempt, in the order of
    /// [`Rule::ALL`].
    pub fn accuracy_by_rule(&self) -> Vec<(Rule, Tally)> {
        accuracy(Rule::ALL, &self.earlier.rules, &self.entries, |e| e.rule)
    }

    /// Every day with a finished puzzle, oldest first, with its counts.
    pub fn days(&self) -> Vec<DayTotal> {
        let mut days = self.earlier.days.clone();
        for e in &self.entries {
            add_to_day(&mut days, e);
        }
        days
    }

    /// The days from `from` to `to` (both included) with a finished puzzle, for a calendar.
    pub fn calendar(&self, from: Day, to: Day) -> Vec<DayTotal> {
        self.days()
            .into_iter()
            .filter(|d| (from..=to).contains(&d.day))
            .collect()
    }

    /// The current and best streaks as of `today` (see the module documentation). Days after
    /// `today` (a clock set back) count for the best streak only.
    pub fn streaks(&self, today: Day) -> Streaks {
        let gone = self.earlier.gone;
        let mut best = gone.best;
        // The run ending on each day, starting from the run that ended with the dropped days.
        let mut prev: Option<(Day, u32)> = gone.last.map(|d| (d, gone.run));
        let yesterday = today.checked_sub(1);
        let (mut on_today, mut on_yesterday) = (None, None);
        if let Some((d, run)) = prev {
            if d == today {
                on_today = Some(run);
            } else if Some(d) == yesterday {
                on_yesterday = Some(run);
            }
        }
        for d in self.days() {
            let run = match prev {
                Some((p, r)) if d.day == p.saturating_add(1) => r + 1,
                Some((p, r)) if d.day == p => r,
                _ => 1,
            };
            best = best.max(run);
            prev = Some((d.day, run));
            if d.day == today {
                on_today = Some(run);
            } else if Some(d.day) == yesterday {
                on_yesterday = Some(run);
            }
        }
        Streaks {
            current: on_today.or(on_yesterday).unwrap_or(0),
            best,
            today_done: on_today.is_some(),
        }
    }

    /// Free Drill skips used on `day`.
    pub fn free_skips_used(&self, day: Day) -> u32 {
        if self.skips.day == day {
            self.skips.used
        } else {
            0
        }
    }

    /// Leaving a Drill puzzle whose attempt stands at `attempt` on `day`: applies the skip
    /// policy of `rating::drill::skip` and counts a free skip. A skip that counts as failed is
    /// for the caller to rate and to record as an entry with `skipped` set.
    pub fn note_skip(&mut self, day: Day, attempt: Attempt) -> Skip {
        let verdict = drill::skip(attempt, self.free_skips_used(day));
        if let Skip::Free { .. } = verdict {
            self.skips = Skips {
                day,
                used: self.free_skips_used(day) + 1,
            };
        }
        verdict
    }

    /// The logbook as JSON, for storage. The same logbook always gives the same text:
    ///
    /// ```text
    /// { "version": 1,
    ///   "entries": [ { "day": 20454, "rule": "renju", "theme": "vcf", "puzzle": "...",
    ///                  "puzzle_rating": 1250, "outcome": "clean", "hints": 0, "wrong": 0,
    ///                  "millis": 41200, "rating": 1523.4, "deviation": 87.1,
    ///                  "source": { "origin": "drill", "title": "..." }, "skipped": false } ],
    ///   "earlier": { "days": [ { "day": 20101, "clean": 2, "helped": 0, "failed": 1 } ],
    ///                "ratings": { "renju": [ { "day": 20101, "rating": 1490.2,
    ///                                          "deviation": 120.5 } ] },
    ///                "themes": { "vcf": { "clean": 2, "helped": 0, "failed": 1 } },
    ///                "rules": { "renju": { "clean": 2, "helped": 0, "failed": 1 } },
    ///                "gone": { "best": 0, "run": 0, "last": null } },
    ///   "skips": { "day": 20454, "used": 1 } }
    /// ```
    pub fn to_json(&self) -> String {
        let entries: Vec<Value> = self.entries.iter().map(entry_value).collect();
        let e = &self.earlier;
        let days: Vec<Value> = e
            .days
            .iter()
            .map(|d| {
                build(vec![
                    ("day", d.day.into()),
                    ("clean", d.tally.clean.into()),
                    ("helped", d.tally.helped.into()),
                    ("failed", d.tally.failed.into()),
                ])
            })
            .collect();
        let ratings = build(
            Rule::ALL
                .into_iter()
                .zip(&e.ratings)
                .filter(|(_, points)| !points.is_empty())
                .map(|(rule, points)| {
                    let points: Vec<Value> = points
                        .iter()
                        .map(|p| {
                            build(vec![
                                ("day", p.day.into()),
                                ("rating", p.rating.into()),
                                ("deviation", p.deviation.into()),
                            ])
                        })
                        .collect();
                    (rule.name(), points.into())
                })
                .collect(),
        );
        let tallies = |names: &mut dyn Iterator<Item = &'static str>, tallies: &[Tally]| {
            build(
                names
                    .zip(tallies)
                    .filter(|(_, t)| t.total() > 0)
                    .map(|(n, t)| (n, t.value()))
                    .collect(),
            )
        };
        let earlier = build(vec![
            ("days", days.into()),
            ("ratings", ratings),
            (
                "themes",
                tallies(&mut Theme::ALL.iter().map(|t| t.name()), &e.themes),
            ),
            (
                "rules",
                tallies(&mut Rule::ALL.iter().map(|r| r.name()), &e.rules),
            ),
            (
                "gone",
                build(vec![
                    ("best", e.gone.best.into()),
                    ("run", e.gone.run.into()),
                    ("last", opt(e.gone.last)),
                ]),
            ),
        ]);
        stored::write(&build(vec![
            ("version", VERSION.into()),
            ("entries", entries.into()),
            ("earlier", earlier),
            (
                "skips",
                build(vec![
                    ("day", self.skips.day.into()),
                    ("used", self.skips.used.into()),
                ]),
            ),
        ]))
    }

    /// Reads a stored logbook: all of it, or an error saying where it is malformed. Unknown
    /// fields are ignored; missing aggregates and skips are empty.
    pub fn from_json(text: &str) -> Result<Logbook, LogbookError> {
        use stored::Opening;
        let obj = stored::open(text, VERSION).map_err(|e| match e {
            Opening::NotJson(why) => LogbookError::NotALogbook(why),
            Opening::NotObject => LogbookError::NotALogbook("not a JSON object".into()),
            Opening::Newer(v) => LogbookError::Newer(v),
            Opening::NoVersion => LogbookError::Version,
        })?;
        let at = |at: &str| {
            let at = at.to_string();
            move |message: String| LogbookError::Field { at, message }
        };
        let list = list(&obj, "entries").map_err(at("entries"))?;
        if list.len() > ENTRY_CAP {
            return Err(at("entries")(format!(
                "{} entries, more than {ENTRY_CAP}",
                list.len()
            )));
        }
        let mut entries = Vec::with_capacity(list.len());
        for (i, v) in list.iter().enumerate() {
            let e = entry_from(v).map_err(at(&format!("entries[{i}]")))?;
            entries.push(e);
        }
        let earlier = match obj.get("earlier") {
            None => Earlier::default(),
            Some(v) => earlier_from(v).map_err(at("earlier"))?,
        };
        let skips = match obj.get("skips") {
            None => Skips::default(),
            Some(v) => {
                let o = object(v, "'skips'").map_err(at("skips"))?;
                let read = || -> Result<Skips, String> {
                    Ok(Skips {
                        day: uint(o, "day")?,
                        used: uint(o, "used")?,
                    })
                };
                read().map_err(at("skips"))?
            }
        };
        Ok(Logbook {
            entries,
            earlier,
            skips,
        })
    }
}

/// Whether an entry's try was rated: only Drill's are; the other screens log the rating as
/// it stood. (A logbook folded before this rule keeps whatever points it folded.)
fn rated(e: &Entry) -> bool {
    e.source.origin == Screen::Drill
}

/// The player's rating and deviation after an entry.
fn point(e: &Entry) -> RatingPoint {
    RatingPoint {
        day: e.day,
        rating: e.rating,
        deviation: e.deviation,
    }
}

/// Puts an entry's rating point in `series` (in order of day): it replaces the point of its
/// day, which entries recorded later do in turn, or goes in its place.
fn put_point(series: &mut Vec<RatingPoint>, e: &Entry) {
    match series.binary_search_by_key(&e.day, |p| p.day) {
        Ok(i) => series[i] = point(e),
        Err(i) => series.insert(i, point(e)),
    }
}

/// Counts an entry in its day of `days` (in order of day), adding the day if it is new.
fn add_to_day(days: &mut Vec<DayTotal>, e: &Entry) {
    match days.binary_search_by_key(&e.day, |d| d.day) {
        Ok(i) => days[i].tally.add(e.outcome),
        Err(i) => {
            let mut tally = Tally::default();
            tally.add(e.outcome);
            days.insert(i, DayTotal { day: e.day, tally });
        }
    }
}

/// The tallies of `keys` (themes or rules): the folded counts, indexed like `keys`, plus the
/// entries whose `key_of` is the key; keys with no attempt are left out.
fn accuracy<K: Copy + PartialEq, const N: usize>(
    keys: [K; N],
    folded: &[Tally; N],
    entries: &[Entry],
    key_of: fn(&Entry) -> K,
) -> Vec<(K, Tally)> {
    keys.into_iter()
        .zip(folded)
        .map(|(k, folded)| {
            let mut tally = *folded;
            for e in entries.iter().filter(|e| key_of(e) == k) {
                tally.add(e.outcome);
            }
            (k, tally)
        })
        .filter(|(_, tally)| tally.total() > 0)
        .collect()
}

fn entry_value(e: &Entry) -> Value {
    build(vec![
        ("day", e.day.into()),
        ("rule", e.rule.name().into()),
        ("theme", e.theme.name().into()),
        ("puzzle", e.puzzle.as_str().into()),
        ("puzzle_rating", e.puzzle_rating.into()),
        ("outcome", e.outcome.name().into()),
        ("hints", e.hints.into()),
        ("wrong", e.wrong.into()),
        ("millis", e.millis.into()),
        ("rating", e.rating.into()),
        ("deviation", e.deviation.into()),
        ("source", source_value(&e.source)),
        ("skipped", e.skipped.into()),
    ])
}

fn entry_from(v: &Value) -> Result<Entry, String> {
    let o = object(v, "the entry")?;
    let e = Entry {
        day: uint(o, "day")?,
        rule: name(o, "rule")?,
        theme: name(o, "theme")?,
        puzzle: text(o, "puzzle")?.to_string(),
        puzzle_rating: number(o, "puzzle_rating")?,
        outcome: name(o, "outcome")?,
        hints: u8::try_from(uint(o, "hints")?).map_err(|_| "'hints': more than 255".to_string())?,
        wrong: uint(o, "wrong")?,
        millis: uint(o, "millis")?,
        rating: number(o, "rating")?,
        deviation: number(o, "deviation")?,
        source: source_from(field(o, "source")?)?,
        skipped: flag(o, "skipped", false)?,
    };
    check_entry(&e)?;
    Ok(e)
}

fn check_entry(e: &Entry) -> Result<(), String> {
    if !e.outcome.finished() {
        return Err(format!(
            "'outcome': '{}' is not a finished attempt",
            e.outcome
        ));
    }
    if e.puzzle.is_empty() || e.puzzle.chars().count() > 64 {
        return Err("'puzzle': empty or longer than 64 characters".into());
    }
    let usable = |x: f64| x.is_finite() && x >= 0.0;
    if !(usable(e.puzzle_rating) && usable(e.rating) && usable(e.deviation)) {
        return Err("a rating or deviation is not a number of zero or more".into());
    }
    if e.source.title.chars().count() > TITLE_CHARS {
        return Err(format!("'title': longer than {TITLE_CHARS} characters"));
    }
    Ok(())
}

/// Reads the aggregates and checks them: days in order, at most [`DAY_CAP`] of them, none
/// empty; rating points in order of day and at most [`DAY_CAP`] per rule; names that are
/// rules and themes; a consistent streak record.
fn earlier_from(v: &Value) -> Result<Earlier, String> {
    let o = object(v, "'earlier'")?;
    let mut earlier = Earlier::default();
    let ascending = |days: &[Day]| days.windows(2).all(|w| w[0] < w[1]) && days.len() <= DAY_CAP;
    for d in list(o, "days")? {
        let d = object(d, "a day")?;
        let day = DayTotal {
            day: uint(d, "day")?,
            tally: Tally::from(d)?,
        };
        if day.tally.total() == 0 {
            return Err("'days': a day with no puzzle".into());
        }
        earlier.days.push(day);
    }
    let days: Vec<Day> = earlier.days.iter().map(|d| d.day).collect();
    if !ascending(&days) {
        return Err("'days': not in order of day, or too many".into());
    }
    for (rule, points) in object(field(o, "ratings")?, "'ratings'")? {
        let r: Rule = rule.parse().map_err(|e| format!("'ratings': {e}"))?;
        let series = &mut earlier.ratings[rule_index(r)];
        for p in points
            .as_array()
            .ok_or_else(|| format!("'ratings.{rule}': not a list"))?
        {
            let p = object(p, "a rating point")?;
            series.push(RatingPoint {
                day: uint(p, "day")?,
                rating: number(p, "rating")?,
                deviation: number(p, "deviation")?,
            });
        }
        let days: Vec<Day> = series.iter().map(|p| p.day).collect();
        if !ascending(&days) {
            return Err(format!(
                "'ratings.{rule}': not in order of day, or too many"
            ));
        }
    }
    for (key, tally) in object(field(o, "themes")?, "'themes'")? {
        let t: Theme = key.parse().map_err(|e| format!("'themes': {e}"))?;
        earlier.themes[theme_index(t)] = Tally::from(object(tally, "a tally")?)?;
    }
    for (key, tally) in object(field(o, "rules")?, "'rules'")? {
        let r: Rule = key.parse().map_err(|e| format!("'rules': {e}"))?;
        earlier.rules[rule_index(r)] = Tally::from(object(tally, "a tally")?)?;
    }
    let g = object(field(o, "gone")?, "'gone'")?;
    earlier.gone = Gone {
        best: uint(g, "best")?,
        run: uint(g, "run")?,
        last: opt_uint(g, "last")?,
    };
    let gone = earlier.gone;
    if gone.run > gone.best || gone.last.is_some() != (gone.run > 0) {
        return Err("'gone': inconsistent streak record".into());
    }
    Ok(earlier)
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::collections::BTreeMap;

    /// An entry on `day` under `rule` and `theme` with `outcome`, leaving the player at
    /// `rating` (deviation 100 less a tenth of the rating's distance from 1500, for variety).
    fn entry(day: Day, rule: Rule, theme: Theme, outcome: Attempt, rating: f64) -> Entry {
        Entry {
            day,
            rule,
            theme,
            puzzle: format!("p{day}"),
            puzzle_rating: 1400.0,
            outcome,
            hints: u8::from(outcome == Attempt::Helped),
            wrong: u32::from(outcome == Attempt::Failed),
            millis: 30_000,
            rating,
            deviation: 100.0 - (rating - 1500.0).abs() / 10.0,
            source: Source::new(Screen::Drill, "Drill"),
            skipped: false,
        }
    }

    use Attempt::{Clean, Failed, Helped};
    use Rule::{Freestyle, Renju, Standard};
    use Theme::{Defend, Vcf, Vct};

    /// Three days of practice: day 10 (two freestyle puzzles, one renju), day 11 (one
    /// freestyle), day 13 (two standard).
    fn sample() -> Logbook {
        let mut log = Logbook::new();
        for e in [
            entry(10, Freestyle, Vcf, Clean, 1510.0),
            entry(10, Renju, Vct, Failed, 1480.0),
            entry(10, Freestyle, Vct, Helped, 1505.0),
            entry(11, Freestyle, Vcf, Failed, 1490.0),
            entry(13, Standard, Defend, Clean, 1520.0),
            entry(13, Standard, Vcf, Clean, 1540.0),
        ] {
            log.record(e).unwrap();
        }
        log
    }

    #[test]
    fn the_rating_series_has_the_last_point_of_each_day() {
        let log = sample();
        // Freestyle: day 10 ends at 1505 (its second freestyle entry), day 11 at 1490.
        let free = log.rating_series(Freestyle);
        let got: Vec<(Day, f64, f64)> = free
            .iter()
            .map(|p| (p.day, p.rating, p.deviation))
            .collect();
        assert_eq!(got, vec![(10, 1505.0, 99.5), (11, 1490.0, 99.0)]);
        // Standard: one point for day 13, the later of its two entries.
        let std: Vec<(Day, f64)> = log
            .rating_series(Standard)
            .iter()
            .map(|p| (p.day, p.rating))
            .collect();
        assert_eq!(std, vec![(13, 1540.0)]);
        assert_eq!(log.rating_series(Renju).len(), 1);
        assert_eq!(log.latest(Freestyle).map(|p| p.rating), Some(1490.0));
        // A Tonight try carries the rating as it stood: no point of its own, on a day without
        // a Drill try or on one with.
        let mut log = log;
        for day in [11, 12] {
            let mut e = entry(day, Freestyle, Vcf, Clean, 1500.0);
            e.source = Source::new(Screen::Tonight, "Harbour Street, week 3");
            log.record(e).unwrap();
        }
        assert_eq!(log.rating_series(Freestyle), free);
        assert_eq!(log.latest(Freestyle).map(|p| p.rating), Some(1490.0));
        let mut only_tonight = Logbook::new();
        let mut e = entry(12, Renju, Vcf, Clean, 1500.0);
        e.source = Source::new(Screen::Tonight, "Harbour Street, week 3");
        only_tonight.record(e).unwrap();
        assert_eq!(only_tonight.latest(Renju), None);
        assert!(only_tonight.rating_series(Renju).is_empty());
        assert_eq!(Logbook::new().latest(Renju), None);
    }

    #[test]
    fn accuracy_by_theme_and_by_rule() {
        let log = sample();
        // Themes: vcf has clean (d10), failed (d11), clean (d13): 2 of 3 clean, 67%;
        // vct has failed and helped: 0% clean, 50% solved; defend one clean: 100%.
        let t = log.accuracy_by_theme();
        type Row = (Theme, (u32, u32, u32), u32, u32);
        let t: Vec<Row> = t
            .iter()
            .map(|(th, x)| {
                (
                    *th,
                    (x.clean, x.helped, x.failed),
                    x.clean_percent(),
                    x.solved_percent(),
                )
            })
            .collect();
        assert_eq!(
            t,
            vec![
                (Vcf, (2, 0, 1), 67, 67),
                (Vct, (0, 1, 1), 0, 50),
                (Defend, (1, 0, 0), 100, 100)
            ]
        );
        // Rules: freestyle clean, helped, failed (33% clean, 67% solved); standard two clean;
        // renju one failed.
        let r: Vec<(Rule, u32, u32)> = log
            .accuracy_by_rule()
            .iter()
            .map(|(r, x)| (*r, x.total(), x.clean_percent()))
            .collect();
        assert_eq!(
            r,
            vec![(Freestyle, 3, 33), (Standard, 2, 100), (Renju, 1, 0)]
        );
        // Half up: 1 of 8 is 12.5%, shown as 13.
        let x = Tally {
            clean: 1,
            helped: 0,
            failed: 7,
        };
        assert_eq!(x.clean_percent(), 13);
        assert_eq!(Tally::default().clean_percent(), 0);
    }

    #[test]
    fn puzzles_per_day() {
        let log = sample();
        let days: Vec<(Day, u32)> = log
            .days()
            .iter()
            .map(|d| (d.day, d.tally.total()))
            .collect();
        assert_eq!(days, vec![(10, 3), (11, 1), (13, 2)]);
        let cal: Vec<Day> = log.calendar(11, 12).iter().map(|d| d.day).collect();
        assert_eq!(cal, vec![11]);
    }

    #[test]
    fn streaks_stay_alive_until_the_day_ends() {
        let log = sample();
        // Practice days 10, 11, 13. On day 13: the run is just day 13 (12 was missed).
        assert_eq!(
            log.streaks(13),
            Streaks {
                current: 1,
                best: 2,
                today_done: true
            }
        );
        // On day 14 nothing yet, but day 13 counted: the streak of 1 is still alive.
        assert_eq!(
            log.streaks(14),
            Streaks {
                current: 1,
                best: 2,
                today_done: false
            }
        );
        // On day 15 a whole day (14) passed without practice: the streak is lost.
        assert_eq!(log.streaks(15).current, 0);
        // On day 12, looking back: 10 and 11 make a run of 2 still alive.
        assert_eq!(log.streaks(12).current, 2);
        // Practising on day 14 extends 13 to a run of 2.
        let mut log = log;
        log.record(entry(14, Renju, Vcf, Failed, 1470.0)).unwrap();
        assert_eq!(
            log.streaks(14),
            Streaks {
                current: 2,
                best: 2,
                today_done: true
            }
        );
        assert_eq!(Logbook::new().streaks(5), Streaks::default());
    }

    // The streak record of dropped days joins the days kept: dropped days ended on day 99
    // with a run of 3 (97, 98, 99) and a best of 5; the aggregates keep days 100 and 101 and
    // the log has day 102, so the run is 3 + 3 = 6 on day 102 and the best is 6. With day 100
    // missing, the dropped run does not reach the kept days.
    #[test]
    fn dropped_days_keep_their_streaks() {
        let mut log = Logbook::new();
        log.earlier.gone = Gone {
            best: 5,
            run: 3,
            last: Some(99),
        };
        let one = Tally {
            clean: 1,
            helped: 0,
            failed: 0,
        };
        log.earlier.days = vec![
            DayTotal {
                day: 100,
                tally: one,
            },
            DayTotal {
                day: 101,
                tally: one,
            },
        ];
        log.record(entry(102, Freestyle, Vcf, Clean, 1500.0))
            .unwrap();
        assert_eq!(
            log.streaks(102),
            Streaks {
                current: 6,
                best: 6,
                today_done: true
            }
        );
        assert_eq!(log.streaks(103).current, 6);
        log.earlier.days.remove(0);
        assert_eq!(
            log.streaks(102),
            Streaks {
                current: 2,
                best: 5,
                today_done: true
            }
        );
        // Only the dropped run, still alive the day after it ended.
        let mut log = Logbook::new();
        log.earlier.gone = Gone {
            best: 4,
            run: 4,
            last: Some(50),
        };
        assert_eq!(log.streaks(51).current, 4);
        assert_eq!(log.streaks(52).current, 0);
        assert!(Logbook::from_json(&log.to_json()).is_ok());
    }

    #[test]
    fn unfinished_attempts_are_not_logged() {
        let mut log = Logbook::new();
        let e = entry(1, Freestyle, Vcf, Attempt::Trying, 1500.0);
        assert_eq!(
            log.record(e),
            Err(LogbookError::Unfinished(Attempt::Trying))
        );
        // A rating that JSON could not store is refused too.
        let e = entry(1, Freestyle, Vcf, Clean, f64::INFINITY);
        assert!(matches!(log.record(e), Err(LogbookError::Field { .. })));
        assert!(log.entries().is_empty());
    }

    #[test]
    fn free_skips_are_counted_per_day() {
        let mut log = Logbook::new();
        assert_eq!(log.note_skip(7, Attempt::Untried), Skip::Free { left: 2 });
        assert_eq!(log.note_skip(7, Attempt::Untried), Skip::Free { left: 1 });
        assert_eq!(
            log.note_skip(7, Attempt::Trying),
            drill::skip(Attempt::Trying, 0)
        );
        assert_eq!(log.note_skip(7, Attempt::Untried), Skip::Free { left: 0 });
        assert!(matches!(
            log.note_skip(7, Attempt::Untried),
            Skip::Counted(_)
        ));
        assert_eq!(log.free_skips_used(7), 3);
        // A new day starts afresh.
        assert_eq!(log.note_skip(8, Attempt::Untried), Skip::Free { left: 2 });
        assert_eq!(log.free_skips_used(7), 0);
    }

    /// Days with their counts, the renju rating series, (theme, clean, total), and streaks.
    type Progress = (
        Vec<(Day, u32)>,
        Vec<(Day, f64)>,
        Vec<(Theme, u32, u32)>,
        Streaks,
    );

    /// The Progress numbers computed directly from a full list of entries, with no cap: the
    /// reference the capped logbook must agree with.
    fn naive(all: &[Entry], today: Day) -> Progress {
        let mut days: BTreeMap<Day, u32> = BTreeMap::new();
        let mut series: BTreeMap<Day, f64> = BTreeMap::new();
        let mut themes: BTreeMap<Theme, (u32, u32)> = BTreeMap::new();
        for e in all {
            *days.entry(e.day).or_default() += 1;
            if e.rule == Renju {
                series.insert(e.day, e.rating);
            }
            let t = themes.entry(e.theme).or_default();
            t.0 += u32::from(e.outcome == Clean);
            t.1 += 1;
        }
        let set: Vec<Day> = days.keys().copied().collect();
        let run_ending = |d: Day| -> u32 {
            let mut n = 0;
            while d >= n && set.binary_search(&(d - n)).is_ok() {
                n += 1;
            }
            n
        };
        let best = set.iter().map(|&d| run_ending(d)).max().unwrap_or(0);
        let today_done = set.binary_search(&today).is_ok();
        let current = if today_done {
            run_ending(today)
        } else {
            run_ending(today - 1)
        };
        (
            days.into_iter().collect(),
            series.into_iter().collect(),
            themes.into_iter().map(|(t, (c, n))| (t, c, n)).collect(),
            Streaks {
                current,
                best,
                today_done,
            },
        )
    }

    fn computed(log: &Logbook, today: Day) -> Progress {
        (
            log.days()
                .iter()
                .map(|d| (d.day, d.tally.total()))
                .collect(),
            log.rating_series(Renju)
                .iter()
                .map(|p| (p.day, p.rating))
                .collect(),
            log.accuracy_by_theme()
                .iter()
                .map(|(t, x)| (*t, x.clean, x.total()))
                .collect(),
            log.streaks(today),
        )
    }

    // A long history: 4,000 entries on about 2,670 practice days, in runs of 1 to 12 days with
    // gaps of 1 or 2 days, one or two puzzles a day. The log keeps 1,000 entries (about 670
    // days) and folds the other 3,000 (about 2,000 days) into aggregates that keep 1,000 days,
    // so about 1,000 of the earliest days fall off the calendar; the Progress numbers must
    // still equal the naive ones (the calendar and chart for the days kept, the rest in full).
    #[test]
    fn the_caps_keep_the_progress_numbers() {
        let mut all = Vec::new();
        let mut log = Logbook::new();
        let mut day = 20_000;
        let mut n = 0u32;
        while all.len() < 4_000 {
            // A deterministic pattern: runs of 1 to 12 days, gaps of 1 or 2 days.
            let run = 1 + (n * 7) % 12;
            for _ in 0..run {
                for k in 0..(1 + (day % 2)) {
                    let outcome = [Clean, Helped, Failed][((day + k) % 3) as usize];
                    let theme = Theme::ALL[((day / 2 + k) % 6) as usize];
                    let rule = Rule::ALL[((day + 2 * k) % 3) as usize];
                    let e = entry(
                        day,
                        rule,
                        theme,
                        outcome,
                        1200.0 + f64::from((day * 37 + k) % 700),
                    );
                    all.push(e.clone());
                    log.record(e).unwrap();
                }
                day += 1;
            }
            day += 1 + n % 2;
            n += 1;
        }
        let today = all.last().unwrap().day + 1;
        assert_eq!(log.entries().len(), ENTRY_CAP);
        assert_eq!(log.earlier.days.len(), DAY_CAP);
        assert!(log.earlier.gone.last.is_some());
        let (days, series, themes, streaks) = computed(&log, today);
        let (all_days, all_series, all_themes, all_streaks) = naive(&all, today);
        let first = days[0].0;
        assert!(first > all_days[0].0, "some days must have been dropped");
        assert_eq!(
            days,
            all_days
                .into_iter()
                .filter(|d| d.0 >= first)
                .collect::<Vec<_>>()
        );
        let first_point = series[0].0;
        assert_eq!(
            series,
            all_series
                .into_iter()
                .filter(|p| p.0 >= first_point)
                .collect::<Vec<_>>()
        );
        assert_eq!(themes, all_themes);
        assert_eq!(streaks, all_streaks);
        assert!(streaks.best >= 12 && !streaks.today_done && streaks.current > 0);
        // And it all survives storage.
        let text = log.to_json();
        let back = Logbook::from_json(&text).unwrap();
        assert_eq!(back, log);
        assert_eq!(back.to_json(), text);
    }

    #[test]
    fn a_stored_logbook_is_checked() {
        let log = sample();
        let text = log.to_json();
        assert_eq!(Logbook::from_json(&text).unwrap(), log);
        let v: Value = serde_json::from_str(&text).unwrap();
        let with = |f: &dyn Fn(&mut Value)| {
            let mut v = v.clone();
            f(&mut v);
            Logbook::from_json(&v.to_string())
        };
        assert!(matches!(
            Logbook::from_json("nonsense"),
            Err(LogbookError::NotALogbook(_))
        ));
        assert_eq!(
            with(&|v| v["version"] = 7.into()),
            Err(LogbookError::Newer(7))
        );
        assert_eq!(
            with(&|v| v["version"] = Value::Null),
            Err(LogbookError::Version)
        );
        let at = |r: Result<Logbook, LogbookError>| match r {
            Err(LogbookError::Field { at, message }) => format!("{at}: {message}"),
            other => panic!("{other:?}"),
        };
        let e = at(with(&|v| v["entries"][2]["outcome"] = "trying".into()));
        assert!(e.starts_with("entries[2]: 'outcome': 'trying'"), "{e}");
        let e = at(with(&|v| v["entries"][1]["rule"] = "go".into()));
        assert!(
            e.starts_with("entries[1]: 'rule': unknown rule 'go'"),
            "{e}"
        );
        let e = at(with(&|v| v["entries"][0]["rating"] = (-3.0).into()));
        assert!(e.starts_with("entries[0]:"), "{e}");
        let e = at(with(&|v| {
            v["earlier"]["days"] = serde_json::json!([{"day": 5, "clean": 1, "helped": 0, "failed": 0},
                                                     {"day": 4, "clean": 1, "helped": 0, "failed": 0}])
        }));
        assert!(e.starts_with("earlier: 'days': not in order"), "{e}");
        let e =
            at(with(
                &|v| {
                    v["earlier"]["themes"] =
                        serde_json::json!({"vcx": {"clean": 1, "helped": 0, "failed": 0}})
                },
            ));
        assert!(e.contains("unknown theme 'vcx'"), "{e}");
        // Unknown fields are ignored; missing aggregates are empty.
        let ok = with(&|v| {
            v["mood"] = "sunny".into();
            v.as_object_mut().unwrap().remove("earlier");
        })
        .unwrap();
        assert_eq!(ok, log);
        assert!(LogbookError::Newer(2).to_string().contains("newer version"));
    }
}
