//! Solver benchmark: every position of the suite (`benches/suite.txt`), solved from a cleared
//! table, timed one by one. Prints the median, 95th percentile and maximum time and the nodes
//! per second, for VCF and VCT, and checks every verdict against the one recorded in the suite
//! (so a faster solver that answers differently fails instead of looking good).
//!
//!     cargo bench -p fivefold-engine --bench solver
//!
//! Set `FIVEFOLD_SUITE` to use another suite file and `FIVEFOLD_REPEAT` to time each position
//! more than once (the fastest run counts).

use std::time::{Duration, Instant};

use engine::search::{Mode, Solver, Verdict};
use engine::suite;

struct Sample {
    time: Duration,
    nodes: u64,
}

fn percentile(sorted: &[Duration], p: f64) -> Duration {
    if sorted.is_empty() {
        return Duration::ZERO;
    }
    let i = ((sorted.len() as f64 - 1.0) * p).round() as usize;
    sorted[i.min(sorted.len() - 1)]
}

fn report(name: &str, samples: &[Sample]) {
    let mut times: Vec<Duration> = samples.iter().map(|s| s.time).collect();
    times.sort();
    let nodes: u64 = samples.iter().map(|s| s.nodes).sum();
    let total: Duration = samples.iter().map(|s| s.time).sum();
    let nps = nodes as f64 / total.as_secs_f64().max(1e-9);
    println!(
        "{name:<14} {:>4} positions  median {:>9.3} ms  p95 {:>9.3} ms  max {:>9.3} ms  {:>6.2} M nodes/s",
        samples.len(),
        percentile(&times, 0.5).as_secs_f64() * 1e3,
        percentile(&times, 0.95).as_secs_f64() * 1e3,
        times.last().copied().unwrap_or_default().as_secs_f64() * 1e3,
        nps / 1e6
    );
}

fn main() {
    // `cargo bench` passes "--bench"; any other argument filters nothing here.
    let path = std::env::var("FIVEFOLD_SUITE")
        .unwrap_or_else(|_| concat!(env!("CARGO_MANIFEST_DIR"), "/benches/suite.txt").to_string());
    let repeat: usize = std::env::var("FIVEFOLD_REPEAT")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1);
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("cannot read {path}: {e}"));
    let cases = suite::parse(&text).unwrap_or_else(|e| panic!("{path}: {e}"));
    let mut solver = Solver::default();
    let mut by_kind: Vec<(String, Vec<Sample>)> = Vec::new();
    let mut mismatches = 0;
    for case in &cases {
        let board = case.board();
        let mut best: Option<Sample> = None;
        for _ in 0..repeat {
            solver.clear();
            let start = Instant::now();
            let sol = solver.solve(&board, case.to_move, case.mode, None);
            let time = start.elapsed();
            if sol.verdict != case.verdict
                || (sol.verdict == Verdict::Win && sol.depth != case.fours)
            {
                mismatches += 1;
                eprintln!(
                    "mismatch: {case}\n  now {} depth {} ({} nodes)",
                    sol.verdict.name(),
                    sol.depth,
                    sol.nodes
                );
            }
            if best.as_ref().is_none_or(|b| time < b.time) {
                best = Some(Sample {
                    time,
                    nodes: sol.nodes,
                });
            }
        }
        let mode = match case.mode {
            Mode::Vcf => "vcf",
            Mode::Vct => "vct",
        };
        for key in [mode.to_string(), format!("{mode} {}", case.verdict.name())] {
            let sample = best
                .as_ref()
                .map(|b| Sample {
                    time: b.time,
                    nodes: b.nodes,
                })
                .unwrap();
            match by_kind.iter_mut().find(|(k, _)| *k == key) {
                Some((_, v)) => v.push(sample),
                None => by_kind.push((key, vec![sample])),
            }
        }
    }
    by_kind.sort_by(|a, b| a.0.cmp(&b.0));
    println!("suite: {path} ({} positions)", cases.len());
    for (k, v) in &by_kind {
        report(k, v);
    }
    assert_eq!(mismatches, 0, "{mismatches} verdicts differ from the suite");
}
