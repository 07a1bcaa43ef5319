//! Puzzle benchmarks: generation speed per theme, and grading latency per move over the
//! starter library.
//!
//!     cargo bench -p fivefold-engine --bench puzzles
//!
//! Generation: a fixed number of puzzles per theme from each of four fixed seeds, at the
//! default options, timed whole (verified puzzles per second, on one core). Grading: for every puzzle of `puzzles/*.json`, a fresh
//! session plays the stored main line (every player move is graded and the reply chosen), then
//! a retry plays one wrong move; every `Session::play` call is timed, with the app's grading
//! settings (`grade::solver_config`). The grades are checked
//! (the main line must be accepted to the end, the wrong move refused), so a faster grader that
//! answers differently fails.

use std::time::{Duration, Instant};

use engine::formats::setfile;
use engine::puzzle::generate::{self, Options};
use engine::puzzle::grade::{self, Grade, Session};
use engine::puzzle::hints::Hint;
use engine::puzzle::{Goal, Theme};
use engine::search::Solver;
use engine::Rule;

fn pct(sorted: &[Duration], p: f64) -> f64 {
    if sorted.is_empty() {
        return 0.0;
    }
    let i = ((sorted.len() as f64 - 1.0) * p).round() as usize;
    sorted[i].as_secs_f64() * 1e3
}

fn main() {
    let only = std::env::var("FIVEFOLD_ONLY").unwrap_or_default();
    if only.is_empty() || only == "generate" {
        // Four seeds per theme: the games of one seed vary too much for a few puzzles to
        // say much.
        let seeds = [83, 84, 85, 86];
        println!(
            "generation (puzzles per second, one core; seeds {seeds:?}, the whole range, \
             several answers allowed):"
        );
        let plan = [
            (Theme::FourThree, Rule::Freestyle, 100),
            (Theme::Vcf, Rule::Freestyle, 100),
            (Theme::Vct, Rule::Freestyle, 20),
            (Theme::Defend, Rule::Freestyle, 20),
            (Theme::ForbiddenTrap, Rule::Renju, 40),
            (Theme::ForbiddenWin, Rule::Renju, 20),
        ];
        for (theme, rule, count) in plan {
            let mut times = Vec::new();
            for seed in seeds {
                let options = Options::new(theme, rule, count, (600, 2600), seed);
                let start = Instant::now();
                let set = generate::generate(&options, |_| {}).expect("generation succeeds");
                times.push(start.elapsed().as_secs_f64());
                assert_eq!(set.len(), count);
            }
            let total: f64 = times.iter().sum();
            let each: Vec<String> = times.iter().map(|t| format!("{t:.2}")).collect();
            println!(
                "  {:<15} {:<9} {:>3} puzzles x {} seeds in {:>7.2} s ({} s): {:>7.2} per second",
                theme.name(),
                rule.name(),
                count,
                seeds.len(),
                total,
                each.join(" / "),
                (count * seeds.len()) as f64 / total
            );
        }
    }
    if only.is_empty() || only == "grade" {
        grading();
    }
}

/// One move graded as the app grades it: on the page within [`grade::PAGE_NODES`]; a move
/// that allowance cannot settle goes to the worker (its own solver), which grades it within
/// the session's whole allowance [`grade::MOVE_NODES`].
struct Tiers {
    page: Solver,
    worker: Solver,
    page_nodes: u64,
    /// (page time, nodes) of every move, and the worker's time of each handed-off move.
    page_times: Vec<(Duration, u64, bool)>,
    handed: Vec<(Duration, String)>,
}

impl Tiers {
    fn play(&mut self, s: &mut Session, m: engine::Point, wrong: bool, what: String) -> Grade {
        s.set_allowance(self.page_nodes);
        let t = Instant::now();
        let g = s.play(&mut self.page, m);
        self.page_times.push((t.elapsed(), s.last_spent(), wrong));
        if g != Grade::Undecided {
            return g;
        }
        s.set_allowance(grade::MOVE_NODES);
        let t = Instant::now();
        let g = s.play(&mut self.worker, m);
        self.handed.push((t.elapsed(), what));
        g
    }
}

fn grading() {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/../puzzles");
    let mut files: Vec<_> = std::fs::read_dir(dir)
        .expect("the puzzles folder")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "json"))
        .collect();
    files.sort();
    // FIVEFOLD_PAGE_NODES: another page allowance than the app's, to weigh a change of it.
    let page_nodes: u64 = std::env::var("FIVEFOLD_PAGE_NODES")
        .ok()
        .map_or(grade::PAGE_NODES, |n| {
            n.parse().expect("FIVEFOLD_PAGE_NODES: a number of nodes")
        });
    // The app's grading tables (the budget a phone can afford), one for the page and one for
    // the worker.
    let mut tiers = Tiers {
        page: Solver::new(grade::solver_config()),
        worker: Solver::new(grade::solver_config()),
        page_nodes,
        page_times: Vec::new(),
        handed: Vec::new(),
    };
    let mut undecided: Vec<String> = Vec::new();
    let mut puzzles = 0;
    for f in files {
        let text = std::fs::read_to_string(&f).expect("readable set");
        let set = setfile::parse(&text).expect("valid set");
        for p in set.puzzles {
            puzzles += 1;
            let mut s = Session::new(p.clone());
            // As the app grades the built-in library.
            s.trust_key(true);
            // The player follows the stored line; where the reply leaves it, the player takes
            // the move the third hint gives (what a player would do). A defence puzzle is
            // played with its first listed defence.
            let mut next = match p.goal() {
                Goal::Win => p.line.first().copied(),
                Goal::Defend => p.first_moves.first().copied(),
            };
            for _ in 0..40 {
                let Some(m) = next else { break };
                match tiers.play(&mut s, m, false, format!("{} {m}", p.id)) {
                    Grade::Accepted { .. } => {}
                    Grade::Solved { .. } => break,
                    other => panic!("{}: {m} graded {other:?}", p.id),
                }
                let k = s.history().len();
                // A defence puzzle's stored line is the threat, not the defender's moves.
                next = match p.line.get(k) {
                    Some(&l)
                        if p.goal() == Goal::Win
                            && s.history().iter().zip(&p.line).all(|(h, &x)| h.0 == x) =>
                    {
                        Some(l)
                    }
                    _ => match s.hint(&mut tiers.page, 3) {
                        Some(Hint::Move(h)) => Some(h),
                        _ => None,
                    },
                };
            }
            // One wrong move: the first empty neighbour of the key move that is not correct.
            s.retry();
            let key = p.first_moves[0];
            let wrong = s
                .board()
                .points()
                .filter(|q| s.board().get(*q).is_none() && !p.first_moves.contains(q))
                .min_by_key(|q| {
                    let d = (q.x as i32 - key.x as i32)
                        .abs()
                        .max((q.y as i32 - key.y as i32).abs());
                    (d, q.y, q.x)
                });
            if let Some(w) = wrong {
                let g = tiers.play(&mut s, w, true, format!("{} {w} (wrong)", p.id));
                if g == Grade::Undecided {
                    undecided.push(format!("{} {w}", p.id));
                }
                assert!(
                    matches!(
                        g,
                        Grade::Wrong { .. }
                            | Grade::Illegal { .. }
                            | Grade::Accepted { .. }
                            | Grade::Undecided
                    ),
                    "{}: {w} graded {g:?}",
                    p.id
                );
            }
        }
    }
    println!(
        "grading over the starter library ({puzzles} puzzles), page allowance {page_nodes} nodes:"
    );
    let of = |wrong: bool| -> Vec<Duration> {
        let mut v: Vec<Duration> = tiers
            .page_times
            .iter()
            .filter(|t| t.2 == wrong)
            .map(|t| t.0)
            .collect();
        v.sort();
        v
    };
    for (name, t) in [
        ("correct moves", of(false)),
        ("wrong first moves", of(true)),
    ] {
        println!(
            "  on the page, {name:<18} {:>5} moves  median {:>8.3} ms  p95 {:>8.3} ms  max {:>8.3} ms",
            t.len(),
            pct(&t, 0.5),
            pct(&t, 0.95),
            t.last().map_or(0.0, |d| d.as_secs_f64() * 1e3)
        );
    }
    let mut nodes: Vec<u64> = tiers.page_times.iter().map(|t| t.1).collect();
    nodes.sort_unstable();
    println!(
        "  nodes per move on the page: median {}, p95 {}, max {}",
        nodes[nodes.len() / 2],
        nodes[(nodes.len() * 95).div_ceil(100) - 1],
        nodes.last().copied().unwrap_or(0)
    );
    let mut handed = tiers.handed.clone();
    handed.sort_by_key(|h| std::cmp::Reverse(h.0));
    println!(
        "  handed to the worker: {} moves{}",
        handed.len(),
        if handed.is_empty() {
            String::new()
        } else {
            format!(
                ", the worker's time: {}",
                handed
                    .iter()
                    .map(|(d, what)| format!("{what} {:.0} ms", d.as_secs_f64() * 1e3))
                    .collect::<Vec<_>>()
                    .join("; ")
            )
        }
    );
    println!(
        "  wrong moves the worker could not settle either (shown as undecided): {} {}",
        undecided.len(),
        undecided.join("; ")
    );
}
