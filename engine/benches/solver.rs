//! Solver benchmark: every position of the suite (`benches/suite.txt`), solved from a cleared
//! table, timed one by one with `engine::suite::time_all` (the same code the browser's
//! `benchSuite` runs, so that the two can be compared). Prints the median, 95th percentile,
//! maximum and total time and the nodes per second, for VCF and VCT, and checks every verdict
//! against the one recorded in the suite (so a faster solver that answers differently fails
//! instead of looking good). Its last line is the node-count signature: the nodes searched
//! over the whole suite, per kind, which a refactor keeps and a change to the search changes
//! (the benchmark notes record it).
//!
//!     cargo bench -p fivefold-engine --bench solver
//!
//! Set `FIVEFOLD_SUITE` to use another suite file.

use std::time::Instant;

use engine::search::Solver;
use engine::suite::{self, Timing};

fn report(name: &str, t: &Timing) {
    println!(
        "{name:<4} {:>4} positions  median {:>8.3} ms  p95 {:>8.3} ms  max {:>8.3} ms  \
         total {:>9.1} ms  {:>5.2} M nodes/s",
        t.positions,
        t.median_ms,
        t.p95_ms,
        t.max_ms,
        t.total_ms,
        t.nodes_per_second() / 1e6
    );
}

fn main() {
    // `cargo bench` passes "--bench"; no argument changes anything here.
    let path = std::env::var("FIVEFOLD_SUITE")
        .unwrap_or_else(|_| concat!(env!("CARGO_MANIFEST_DIR"), "/benches/suite.txt").to_string());
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("cannot read {path}: {e}"));
    let cases = suite::parse(&text).unwrap_or_else(|e| panic!("{path}: {e}"));
    let origin = Instant::now();
    let run = suite::time_all(&cases, &mut Solver::default(), || {
        origin.elapsed().as_secs_f64() * 1e3
    });
    println!("suite: {path} ({} positions)", cases.len());
    report("vcf", &run.vcf);
    report("vct", &run.vct);
    // The node-count signature: a change to search behaviour changes it, a refactor keeps it.
    println!(
        "signature: vcf {} vct {} total {}",
        run.vcf.nodes,
        run.vct.nodes,
        run.vcf.nodes + run.vct.nodes
    );
    for m in &run.mismatches {
        eprintln!("mismatch: {m}");
    }
    assert!(
        run.mismatches.is_empty(),
        "{} verdicts differ from the suite",
        run.mismatches.len()
    );
}
