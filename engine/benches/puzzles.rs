//! Puzzle benchmarks: generation speed per theme, and grading latency per move over the
//! starter library.
//!
//!     cargo bench -p fivefold-engine --bench puzzles
//!
//! Generation: a fixed number of puzzles per theme from a fixed seed, timed whole (verified
//! puzzles per second, on one core). Grading: for every puzzle of `puzzles/*.json`, a fresh
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
        println!("generation (puzzles per second, one core):");
        let plan = [
            (Theme::FourThree, Rule::Freestyle, 20),
            (Theme::Vcf, Rule::Freestyle, 20),
            (Theme::Vct, Rule::Freestyle, 6),
            (Theme::Defend, Rule::Freestyle, 6),
            (Theme::ForbiddenTrap, Rule::Renju, 6),
            (Theme::ForbiddenWin, Rule::Renju, 6),
        ];
        for (theme, rule, count) in plan {
            let options = Options::new(theme, rule, count, (600, 2600), 77);
            let start = Instant::now();
            let set = generate::generate(&options, |_| {}).expect("generation succeeds");
            let t = start.elapsed().as_secs_f64();
            assert_eq!(set.len(), count);
            println!(
                "  {:<15} {:<9} {:>3} puzzles in {:>7.2} s: {:>7.2} per second",
                theme.name(),
                rule.name(),
                count,
                t,
                count as f64 / t
            );
        }
    }
    if only.is_empty() || only == "grade" {
        let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/../puzzles");
        let mut files: Vec<_> = std::fs::read_dir(dir)
            .expect("the puzzles folder")
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| p.extension().is_some_and(|x| x == "json"))
            .collect();
        files.sort();
        // The app's grading settings (the budget a phone can afford).
        let mut solver = Solver::new(grade::solver_config());
        let mut times = Vec::new();
        let mut wrong_times = Vec::new();
        let mut slow: Vec<(Duration, String)> = Vec::new();
        let mut puzzles = 0;
        for f in files {
            let text = std::fs::read_to_string(&f).expect("readable set");
            let set = setfile::parse(&text).expect("valid set");
            for p in set.puzzles {
                puzzles += 1;
                let mut s = Session::new(p.clone());
                // As the app grades the built-in library.
                s.trust_key(true);
                // The player follows the stored line; where the reply leaves it, the player
                // takes the move the third hint gives (what a player would do). A defence
                // puzzle is played with its first listed defence.
                let mut next = match p.goal() {
                    Goal::Win => p.line.first().copied(),
                    Goal::Defend => p.first_moves.first().copied(),
                };
                for _ in 0..40 {
                    let Some(m) = next else { break };
                    let t = Instant::now();
                    let g = s.play(&mut solver, m);
                    times.push(t.elapsed());
                    slow.push((t.elapsed(), format!("{} {m}", p.id)));
                    match g {
                        Grade::Accepted { .. } => {}
                        Grade::Solved { .. } => break,
                        other => panic!("{}: {m} graded {other:?}", p.id),
                    }
                    let k = s.history().len();
                    next = match p.line.get(k) {
                        Some(&l) if s.history().iter().zip(&p.line).all(|(h, &x)| h.0 == x) => {
                            Some(l)
                        }
                        _ => match s.hint(&mut solver, 3) {
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
                    let t = Instant::now();
                    let g = s.play(&mut solver, w);
                    wrong_times.push(t.elapsed());
                    slow.push((t.elapsed(), format!("{} {w} (wrong)", p.id)));
                    assert!(
                        matches!(
                            g,
                            Grade::Wrong { .. } | Grade::Illegal { .. } | Grade::Accepted { .. }
                        ),
                        "{}: {w} graded {g:?}",
                        p.id
                    );
                }
            }
        }
        times.sort();
        wrong_times.sort();
        println!("grading over the starter library ({puzzles} puzzles):");
        for (name, t) in [
            ("correct moves", &times),
            ("wrong first moves", &wrong_times),
        ] {
            println!(
                "  {name:<18} {:>5} moves  median {:>8.3} ms  p95 {:>8.3} ms  max {:>8.3} ms",
                t.len(),
                pct(t, 0.5),
                pct(t, 0.95),
                t.last().map_or(0.0, |d| d.as_secs_f64() * 1e3)
            );
        }
        let mut all: Vec<Duration> = times.iter().chain(wrong_times.iter()).copied().collect();
        all.sort();
        println!(
            "  {:<18} {:>5} moves  median {:>8.3} ms  p95 {:>8.3} ms",
            "all moves",
            all.len(),
            pct(&all, 0.5),
            pct(&all, 0.95)
        );
        slow.sort_by_key(|s| std::cmp::Reverse(s.0));
        let worst: Vec<String> = slow
            .iter()
            .take(5)
            .map(|(d, what)| format!("{what} {:.0} ms", d.as_secs_f64() * 1e3))
            .collect();
        println!("  slowest: {}", worst.join("; "));
    }
}
