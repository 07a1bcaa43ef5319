//! The FSRS-6 scheduler against the reference scheduler of the open-spaced-repetition project.
//!
//! `tests/data/fsrs6_vectors.txt` holds 425 reviews in 49 sequences (every grade repeated,
//! same-day repeats, and 40 random histories with early, on-time, late and same-day reviews
//! under retentions 0.8, 0.9 and 0.95), each with the stability, difficulty and interval that
//! py-fsrs 6.3.2 computed after it, with its default weights, no learning steps, no fuzz and
//! its cap of 36,500 days. The file was written by `tests/data/fsrs6_vectors.py` (the command
//! is in the script). Fivefold's scheduler keeps stability and difficulty to six decimal
//! places, which drifts from the reference by up to about 2e-6 (relative) over a sequence, so
//! they are compared to a relative 1e-5; the intervals and due days must be equal.
//!
//! Also: every puzzle of the starter library goes into a review deck, which is stored and read
//! back through the set file's own reader, puzzle for puzzle.

use engine::formats::setfile;
use engine::puzzle::attempt::Attempt;
use engine::schedule::fsrs::{Card, Recall, Scheduler};
use engine::schedule::{deck, Deck, Screen, Source};

const VECTORS: &str = include_str!("../data/fsrs6_vectors.txt");

struct Row {
    case: u32,
    retention: f64,
    day: u32,
    grade: Recall,
    stability: f64,
    difficulty: f64,
    interval: u32,
}

fn rows() -> Vec<Row> {
    VECTORS
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let f: Vec<&str> = l.split_whitespace().collect();
            assert_eq!(f.len(), 7, "{l}");
            Row {
                case: f[0].parse().unwrap(),
                retention: f[1].parse().unwrap(),
                day: f[2].parse().unwrap(),
                grade: f[3].parse().unwrap(),
                stability: f[4].parse().unwrap(),
                difficulty: f[5].parse().unwrap(),
                interval: f[6].parse().unwrap(),
            }
        })
        .collect()
}

/// The difference relative to the reference value (absolute below 1).
fn rel(ours: f64, reference: f64) -> f64 {
    (ours - reference).abs() / reference.abs().max(1.0)
}

#[test]
fn fsrs6_matches_the_reference_scheduler() {
    let rows = rows();
    assert_eq!(rows.len(), 425, "the vector file changed");
    let mut card = Card::new(0);
    let mut case = 0;
    let mut cases = 0;
    for (n, r) in rows.iter().enumerate() {
        if r.case != case {
            case = r.case;
            cases += 1;
            card = Card::new(r.day);
        }
        let s = Scheduler::new(r.retention, 36_500).unwrap();
        card = s.review(&card, r.grade, r.day);
        let at = format!(
            "line {} (case {}, day {}, {})",
            n + 4,
            r.case,
            r.day,
            r.grade
        );
        let (ds, dd) = (
            rel(card.stability, r.stability),
            rel(card.difficulty, r.difficulty),
        );
        assert!(
            ds <= 1e-5,
            "{at}: stability {} against {}",
            card.stability,
            r.stability
        );
        assert!(
            dd <= 1e-5,
            "{at}: difficulty {} against {}",
            card.difficulty,
            r.difficulty
        );
        assert_eq!(card.interval(), r.interval, "{at}");
        assert_eq!(card.due, r.day + r.interval, "{at}");
    }
    assert_eq!(cases, 49);
}

// Shipped puzzles, missed on one day, are stored in a deck and read back unchanged (the deck
// keeps each puzzle as the set file's puzzle object and reads it with the set file's reader).
// The deck holds 300: the first 300 of the library's 320 fill it.
#[test]
fn the_library_goes_through_a_stored_deck() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../puzzles");
    let mut names: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "json"))
        .collect();
    names.sort();
    let mut deck = Deck::new();
    let mut puzzles = Vec::new();
    for path in names {
        let set = setfile::parse(&std::fs::read_to_string(&path).unwrap()).unwrap();
        for p in set.puzzles.into_iter().take(deck::CAPACITY - deck.len()) {
            let source = Source::new(Screen::Tonight, &set.title);
            let added = deck
                .add(&p, source, Attempt::Failed, false, 20_454)
                .unwrap();
            assert!(
                matches!(
                    added,
                    deck::Filed::New {
                        due: 20_455,
                        evicted: None
                    }
                ),
                "{added:?}"
            );
            puzzles.push(p);
        }
    }
    assert_eq!(puzzles.len(), deck::CAPACITY);
    let back = Deck::from_json(&deck.to_json()).unwrap();
    assert_eq!(back, deck);
    for p in &puzzles {
        assert_eq!(&back.get(&p.id).unwrap().puzzle().unwrap(), p);
    }
    assert_eq!(back.due(20_455).len(), puzzles.len());
}
