//! Benchmarks of the readers of outside text (criterion), each at 64 KiB and at 1 MiB of
//! input, so that the two throughputs show whether the work grows linearly with the input (the
//! same MiB/s at both sizes) or faster. How to run them and the latest numbers:
//! `benches/README.md`.
//!
//! * `moves`: a move list whose error is its last token (every character is read), and one
//!   whose error is its second token (the reader must stop there, whatever follows).
//! * `setfile`: a valid set file (synthetic puzzles with many stones, under the limits), and
//!   a file of many small puzzles over the puzzle limit (refused by count).
//! * `share`: a valid share code of a large set, and a code of the given length with its
//!   checksum broken.
//! * `class`: pasted text of result codes, one per line, and text of words that are not codes
//!   (also at 4 MiB, to see how the time grows past the processor's caches).
//!
//! Each input is checked for its expected answer before it is timed.

use criterion::{black_box, criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use engine::formats::class::{find_codes, ClassTable};
use engine::formats::result::{self, PuzzleResult, TimeBucket};
use engine::formats::setfile::{self, PuzzleSet};
use engine::formats::share;
use engine::notation::{parse_points, TokenProblem};
use engine::puzzle::attempt::Attempt;
use engine::puzzle::{Puzzle, Theme};
use engine::{Point, Rule, Stone};

const SIZES: [(&str, usize); 2] = [("64KiB", 64 << 10), ("1MiB", 1 << 20)];

fn moves(c: &mut Criterion) {
    let mut g = c.benchmark_group("moves");
    g.sample_size(10);
    for (name, n) in SIZES {
        // "h8" then separators, then a bad token at the very end.
        let late = format!("h8{} zz", " ,".repeat((n - 6) / 2));
        let e = parse_points(&late, "moves", 15, 15).unwrap_err();
        assert_eq!((e.index, e.problem.clone()), (2, TokenProblem::Garbage));
        assert_eq!(e.column, late.chars().count() - 2);
        g.throughput(Throughput::Bytes(late.len() as u64));
        g.bench_with_input(BenchmarkId::new("error_last", name), &late, |b, t| {
            b.iter(|| parse_points(black_box(t), "moves", 15, 15).unwrap_err())
        });
        // A bad second token, then a megabyte the reader must not look at.
        let early = format!("h8 zz {}", "a1 ".repeat((n - 6) / 3));
        let e = parse_points(&early, "moves", 15, 15).unwrap_err();
        assert_eq!((e.index, e.column), (2, 3));
        g.throughput(Throughput::Bytes(early.len() as u64));
        g.bench_with_input(BenchmarkId::new("error_second", name), &early, |b, t| {
            b.iter(|| parse_points(black_box(t), "moves", 15, 15).unwrap_err())
        });
    }
    g.finish();
}

/// A synthetic puzzle with many stones (valid, not a real position), number `i`.
fn puzzle(i: usize, stones: usize) -> Puzzle {
    let size = 19u8;
    let at = |c: usize| Point::new((c % 19) as u8, (c / 19) as u8);
    Puzzle {
        id: format!("vf-{i:012x}"),
        rule: Rule::Freestyle,
        size,
        to_move: Stone::Black,
        black: (0..stones)
            .step_by(2)
            .map(|c| at((c * 7 + i) % 361))
            .collect(),
        white: (1..stones)
            .step_by(2)
            .map(|c| at((c * 7 + i) % 361))
            .collect(),
        theme: Theme::Vcf,
        first_moves: vec![at((stones * 7 + i) % 361)],
        line: (stones..stones + 9)
            .map(|c| at((c * 7 + i) % 361))
            .collect(),
        length: 4,
        rating: 1500,
    }
}

/// The set of `count` puzzles of `stones` stones each.
fn set(count: usize, stones: usize) -> PuzzleSet {
    PuzzleSet {
        title: "Harbour Street Circle: the long list".into(),
        created: "2026-12-02".into(),
        puzzles: (0..count).map(|i| puzzle(i, stones)).collect(),
        generator: None,
    }
}

/// The set file closest to `bytes` long from puzzles of `stones` stones each.
fn set_file(bytes: usize, stones: usize) -> String {
    let one = setfile::to_json(&set(1, stones)).len();
    let two = setfile::to_json(&set(2, stones)).len();
    setfile::to_json(&set(1 + (bytes - one) / (two - one), stones))
}

fn setfile_bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("setfile");
    g.sample_size(10);
    for (name, n) in SIZES {
        let text = set_file(n, 100);
        let count = setfile::parse(&text).unwrap().puzzles.len();
        assert!(count <= engine::formats::limits::MAX_PUZZLES, "{count}");
        g.throughput(Throughput::Bytes(text.len() as u64));
        g.bench_with_input(BenchmarkId::new("valid", name), &text, |b, t| {
            b.iter(|| setfile::parse(black_box(t)).unwrap())
        });
        let many = set_file(n, 2);
        if setfile::parse(&many).is_err() {
            g.throughput(Throughput::Bytes(many.len() as u64));
            g.bench_with_input(BenchmarkId::new("too_many_puzzles", name), &many, |b, t| {
                b.iter(|| setfile::parse(black_box(t)).unwrap_err())
            });
        }
    }
    g.finish();
}

fn share_bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("share");
    g.sample_size(10);
    // The largest valid code: 1,000 puzzles of varied positions (they compress little).
    let big = set(engine::formats::limits::MAX_PUZZLES, 120);
    let code = share::encode(&big).unwrap();
    assert_eq!(share::decode(&code).unwrap(), big);
    g.throughput(Throughput::Bytes(code.len() as u64));
    g.bench_with_input(
        BenchmarkId::new("valid", format!("{}KiB", code.len() >> 10)),
        &code,
        |b, t| b.iter(|| share::decode(black_box(t)).unwrap()),
    );
    for (name, n) in SIZES {
        // Characters of the alphabet in whole groups, checksum wrong.
        let broken = format!("${}", "ABC".repeat(n / 3));
        assert_eq!(share::decode(&broken), Err(share::ShareError::Damaged));
        g.throughput(Throughput::Bytes(broken.len() as u64));
        g.bench_with_input(BenchmarkId::new("damaged", name), &broken, |b, t| {
            b.iter(|| share::decode(black_box(t)).unwrap_err())
        });
    }
    g.finish();
}

fn class_bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("class");
    g.sample_size(10);
    let s = set(12, 20);
    let results: Vec<PuzzleResult> = (0..12)
        .map(|i| PuzzleResult::new(Attempt::ALL[i % 5], (i % 4) as u8, TimeBucket::ALL[i % 5]))
        .collect();
    for (name, n) in SIZES.into_iter().chain([("4MiB", 4 << 20)]) {
        let mut text = String::new();
        let mut i = 0;
        while text.len() < n {
            let code = result::encode(result::fingerprint(&s), &format!("S{i}"), &results);
            text.push_str(&code.unwrap());
            text.push('\n');
            i += 1;
        }
        let mut table = ClassTable::new(&s);
        let added = table.add(&text);
        assert_eq!((added.new_students, added.notices.len()), (i, 0));
        g.throughput(Throughput::Bytes(text.len() as u64));
        g.bench_with_input(BenchmarkId::new("codes", name), &text, |b, t| {
            b.iter(|| ClassTable::new(&s).add(black_box(t)))
        });
        // Words that each start a valid header (the first 16 characters of a real code, whose
        // length then ends nowhere): every word starts a header read, none makes a code.
        let head: String = text.chars().filter(|&c| c != '-').take(16).collect();
        let words = format!("{head} ").repeat(n / 17);
        assert_eq!(find_codes(&words).len(), 1);
        g.throughput(Throughput::Bytes(words.len() as u64));
        g.bench_with_input(BenchmarkId::new("not_codes", name), &words, |b, t| {
            b.iter(|| find_codes(black_box(t)))
        });
    }
    g.finish();
}

criterion_group!(benches, moves, setfile_bench, share_bench, class_bench);
criterion_main!(benches);
