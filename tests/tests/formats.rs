//! The formats that carry a set outside (the set file, the share code) against each other and
//! against their documented limits.
//!
//! * Every set the set-file reader accepts round-trips through a share code: generated sets
//!   of random valid puzzles on 15x15 and 19x19 under every rule and theme, with titles up to
//!   the limit in any script, ids of the generator's shape and free-form Unicode ids, stone
//!   lists in any order. The reader and the share code are two independent encodings of one
//!   set, so each checks the other (a serialisation must round-trip: common practice).
//! * A set at every limit at once fits each format's bounds, and one step over a limit is
//!   refused by the reader, by `setfile::check` and by the share encoder, with a message that
//!   names the limit.

use engine::formats::limits;
use engine::formats::setfile::{self, GeneratorInfo, PuzzleSet};
use engine::formats::share;
use engine::puzzle::{Puzzle, Theme};
use engine::{Point, Rule, Stone};
use proptest::prelude::*;

/// Cuts a text to at most `max` bytes at a character boundary.
fn cut(mut s: String, max: usize) -> String {
    while s.len() > max {
        s.pop();
    }
    s
}

/// An id: the generator's shape (`vf-` and twelve hex digits), or any Unicode text; made
/// unique by its number in the set.
fn id(i: usize, hex: Option<u64>, text: String) -> String {
    match hex {
        Some(h) => format!("p{i}-{:012x}", h & 0xFFFF_FFFF_FFFF),
        None => cut(format!("{i}·{text}"), limits::MAX_ID_BYTES),
    }
}

fn puzzle(i: usize) -> impl Strategy<Value = Puzzle> {
    (
        (0usize..3, 0usize..6, any::<bool>(), any::<bool>()),
        (proptest::option::of(any::<u64>()), "\\PC{0,30}"),
        prop::collection::vec(any::<u16>(), 1..80),
        (0usize..40, 0usize..40, 1usize..4, 0usize..30),
        (0u32..=limits::MAX_RATING, 0u16..=limits::MAX_LENGTH),
    )
        .prop_map(
            move |((r, t, big, white), (hex, text), raw, (nb, nw, nf, nl), (rating, length))| {
                let rule = Rule::ALL[r];
                let mut theme = Theme::ALL[t];
                if !theme.allowed(rule) {
                    theme = Theme::Vcf;
                }
                let size: u8 = if big { 19 } else { 15 };
                let cells = size as usize * size as usize;
                // Distinct points in the order drawn (not board order).
                let mut seen = vec![false; cells];
                let points: Vec<Point> = raw
                    .into_iter()
                    .map(|v| v as usize % cells)
                    .filter(|&c| !std::mem::replace(&mut seen[c], true))
                    .map(|c| Point::new((c % size as usize) as u8, (c / size as usize) as u8))
                    .collect();
                let nb = nb.min(points.len().saturating_sub(1));
                let nw = nw.min(points.len() - 1 - nb);
                let rest = &points[nb + nw..];
                let nf = nf.min(rest.len());
                let nl = nl.min(rest.len());
                Puzzle {
                    id: id(i, hex, text),
                    rule,
                    size,
                    to_move: if white { Stone::White } else { Stone::Black },
                    black: points[..nb].to_vec(),
                    white: points[nb..nb + nw].to_vec(),
                    theme,
                    first_moves: rest[..nf].to_vec(),
                    // The line may pass through the answers, never through the stones.
                    line: rest.iter().rev().take(nl).copied().collect(),
                    length,
                    rating,
                }
            },
        )
}

fn set() -> impl Strategy<Value = PuzzleSet> {
    (
        prop::collection::vec(0usize..1, 1..40),
        ("\\PC{0,80}", 0usize..4),
        (0u32..=9999, 1u32..=12, 1u32..=31),
        proptest::option::of((
            any::<u64>(),
            0usize..6,
            0usize..3,
            5u8..=19,
            1usize..=limits::MAX_PUZZLES,
            (0u32..=4000, 0u32..=4000),
        )),
    )
        .prop_flat_map(|(slots, (title, long), (y, m, d), generator)| {
            let puzzles: Vec<_> = (0..slots.len()).map(puzzle).collect();
            // A title of up to 80 characters, or repeated up to the byte limit.
            let title = if long == 0 {
                cut(
                    title.repeat(1 + limits::MAX_TITLE_BYTES),
                    limits::MAX_TITLE_BYTES,
                )
            } else {
                cut(title, limits::MAX_TITLE_BYTES)
            };
            (
                puzzles,
                Just(title),
                Just(format!("{y:04}-{m:02}-{d:02}")),
                Just(generator),
            )
        })
        .prop_map(|(puzzles, title, created, generator)| PuzzleSet {
            title,
            created,
            puzzles,
            generator: generator.map(|(seed, t, r, size, count, rating)| GeneratorInfo {
                seed,
                theme: Theme::ALL[t],
                rule: Rule::ALL[r],
                size,
                count,
                rating,
                min_moves: 0,
                unique: false,
            }),
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// A set that the set-file reader accepts comes back the same from a share code.
    #[test]
    fn every_readable_set_round_trips_through_a_share_code(set in set()) {
        let text = setfile::to_json(&set);
        let read = setfile::parse(&text);
        prop_assert_eq!(read.as_ref(), Ok(&set), "the set file refused a generated set");
        let code = share::encode(&set).unwrap();
        prop_assert_eq!(share::decode(&code), Ok(set));
    }
}

/// A set at every limit at once: the most puzzles, the longest title and ids, and on the
/// largest board the most points a puzzle can list: the stones, every other point an answer,
/// and a line of the longest length through the answers (361 + 128 points).
fn largest_set() -> PuzzleSet {
    let size = limits::MAX_SIZE;
    let points: Vec<Point> = (0..size as usize * size as usize)
        .map(|c| Point::new((c % size as usize) as u8, (c / size as usize) as u8))
        .collect();
    let (stones, empty) = points.split_at(points.len() - limits::MAX_LINE);
    let puzzles = (0..limits::MAX_PUZZLES)
        .map(|i| Puzzle {
            id: format!("{i:0>width$}", width = limits::MAX_ID_BYTES),
            rule: Rule::Renju,
            size,
            to_move: Stone::White,
            black: stones.iter().step_by(2).copied().collect(),
            white: stones.iter().skip(1).step_by(2).copied().collect(),
            theme: Theme::ForbiddenTrap,
            first_moves: empty.to_vec(),
            line: empty.iter().rev().copied().collect(),
            length: limits::MAX_LENGTH,
            rating: limits::MAX_RATING,
        })
        .collect();
    PuzzleSet {
        title: "é".repeat(limits::MAX_TITLE_BYTES / 2),
        created: "2026-12-02".into(),
        puzzles,
        generator: None,
    }
}

#[test]
fn a_set_at_every_limit_fits_every_format() {
    let set = largest_set();
    setfile::check(&set).unwrap();
    let text = setfile::to_json(&set);
    assert!(text.len() <= limits::MAX_FILE_BYTES, "{} bytes", text.len());
    assert_eq!(setfile::parse(&text).unwrap(), set);
    // The decoder inflates a code's body through a limit and refuses a larger one, so a code
    // that opens again shows that the largest body fits `share::MAX_BODY_BYTES`.
    let code = share::encode(&set).unwrap();
    assert!(
        code.len() <= share::MAX_CODE_CHARS,
        "{} characters",
        code.len()
    );
    assert_eq!(share::decode(&code).unwrap(), set);
}

/// One step over each limit: the reader, the check and the share encoder all refuse it and
/// name the field and the limit.
#[test]
fn one_step_over_a_limit_is_refused_by_name() {
    let base = || {
        let mut s = largest_set();
        s.puzzles.truncate(3);
        s
    };
    type Change = fn(&mut PuzzleSet);
    let cases: [(Change, &str, String); 5] = [
        (
            |s| s.title.push('x'),
            "title",
            format!("at most {} bytes", limits::MAX_TITLE_BYTES),
        ),
        (
            |s| s.puzzles[1].id.push('x'),
            "id",
            format!("longer than {} bytes", limits::MAX_ID_BYTES),
        ),
        (
            |s| {
                let p = &mut s.puzzles[2];
                let room = limits::MAX_STONES - p.black.len() - p.white.len();
                let extra: Vec<Point> = p.first_moves.drain(1..room + 2).collect();
                p.line.retain(|l| !extra.contains(l));
                p.white.extend(extra);
            },
            "white",
            format!("at most {}", limits::MAX_STONES),
        ),
        (
            |s| {
                let p = &mut s.puzzles[0];
                p.black.clear();
                p.white.clear();
                p.line = (0..=limits::MAX_LINE as u8)
                    .map(|c| Point::new(c % 19, c / 19))
                    .collect();
            },
            "solution.line",
            format!("at most {}", limits::MAX_LINE),
        ),
        (
            |s| {
                let p = s.puzzles[0].clone();
                s.puzzles = (0..=limits::MAX_PUZZLES)
                    .map(|i| Puzzle {
                        id: format!("n{i}"),
                        ..p.clone()
                    })
                    .collect();
            },
            "puzzles",
            format!("at most {}", limits::MAX_PUZZLES),
        ),
    ];
    for (change, field, words) in cases {
        let mut s = base();
        change(&mut s);
        let e = setfile::check(&s).unwrap_err();
        assert_eq!(e.field, field, "{e}");
        assert!(e.to_string().contains(&words), "{e}");
        assert_eq!(share::encode(&s).unwrap_err(), e);
        let read = setfile::parse(&setfile::to_json(&s)).unwrap_err();
        assert_eq!(read.field, field, "{read}");
        assert!(read.to_string().contains(&words), "{read}");
    }
}

/// Any text given to the readers of codes gets an answer, never a panic: random text over the
/// codes' alphabets, and valid codes with random characters changed, cut or repeated.
mod untrusted {
    use super::*;
    use engine::formats::class::{find_codes, ClassTable};
    use engine::formats::result::{self, PuzzleResult, TimeBucket};
    use engine::puzzle::attempt::Attempt;

    fn fixture() -> PuzzleSet {
        setfile::parse(include_str!("../data/fixture_set.json")).unwrap()
    }

    fn share_text() -> impl Strategy<Value = String> {
        prop_oneof![
            "\\$[0-9A-Z$/.:-]{0,200}",
            "[A-Za-z0-9_-]{0,200}",
            "\\PC{0,100}",
            (any::<prop::sample::Index>(), "[0-9A-Z$/.:-]{1,3}").prop_map(|(at, with)| {
                let code = share::encode(&fixture()).unwrap();
                let i = 1 + at.index(code.len() - 1);
                format!("{}{with}{}", &code[..i], &code[i + 1..])
            }),
        ]
    }

    fn result_text() -> impl Strategy<Value = String> {
        let code = result::encode(
            result::fingerprint(&fixture()),
            "Mira",
            &[PuzzleResult::new(Attempt::Clean, 0, TimeBucket::Under30s); 3],
        )
        .unwrap();
        prop_oneof![
            "[0-9A-Za-z ,;\\n-]{0,300}",
            "\\PC{0,100}",
            (any::<prop::sample::Index>(), 0usize..4, "[0-9A-Z -]{0,3}").prop_map(
                move |(at, cut, with)| {
                    let i = at.index(code.len());
                    let end = (i + cut).min(code.len());
                    format!("{} {}{with}{} {code}", code, &code[..i], &code[end..])
                }
            ),
        ]
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(500))]

        #[test]
        fn share_codes_never_panic(text in share_text()) {
            let _ = share::decode(&text);
        }

        #[test]
        fn result_codes_and_pasted_text_never_panic(text in result_text()) {
            let _ = result::decode(&text);
            let found = find_codes(&text);
            let mut table = ClassTable::new(&fixture());
            let added = table.add(&text);
            // Every code found either adds a student or is told about (replaced, repeated,
            // refused), never both and never neither.
            prop_assert_eq!(added.new_students + added.notices.len(), found.len());
        }
    }
}
