//! Re-proving a puzzle: the same questions the generator asked, answered again from scratch.

use super::{Goal, Puzzle};
use crate::geometry::Point;
use crate::search::{Budget, Mode, Solver, Verdict};

/// Re-proves one puzzle with [`Budget::VERIFICATION`] (larger than the generator's, because a
/// fresh table may need more nodes than the generator's warm one did for the same answer; the
/// answers themselves do not depend on the table); the problems found, in words.
pub fn check(solver: &mut Solver, p: &Puzzle) -> Vec<String> {
    let mut problems = Vec::new();
    let board = p.board();
    if board.find_winner().is_some() {
        problems.push("the position already has a five".into());
        return problems;
    }
    let mode = p.theme.mode();
    match p.goal() {
        Goal::Win => {
            let sol = solver
                .ask(Budget::VERIFICATION)
                .solve(&board, p.to_move, mode);
            if sol.verdict != Verdict::Win {
                problems.push(format!("no forced win found ({})", sol.verdict.name()));
                return problems;
            }
            for &m in &p.first_moves {
                let mut b = board.clone();
                if b.get(m).is_some() {
                    problems.push(format!("first move {m} is taken"));
                    continue;
                }
                b.place(m, p.to_move);
                // Asked as the grader asks it: with the first move as part of the line.
                let win = b.find_winner() == Some(p.to_move)
                    || solver
                        .ask(Budget::VERIFICATION)
                        .after(&board, &[(m, p.to_move)])
                        .wins_after(&b, p.to_move, p.to_move.opponent(), mode)
                        .0
                        == Verdict::Win;
                if !win {
                    problems.push(format!("first move {m} does not keep the win"));
                }
            }
            let wins = solver
                .ask(Budget::VERIFICATION)
                .winning_moves(&board, p.to_move, mode);
            for w in &wins.proved {
                if !p.first_moves.contains(w) {
                    problems.push(format!("{w} also wins but is not listed"));
                }
            }
            if sol.depth != p.length {
                problems.push(format!(
                    "the shortest win is {} long, not {}",
                    sol.depth, p.length
                ));
            }
        }
        Goal::Defend => {
            let d = solver
                .ask(Budget::VERIFICATION)
                .defences(&board, p.to_move, Mode::Vct);
            if d.threat != Verdict::Win {
                problems.push(format!(
                    "the opponent has no forced win to stop ({})",
                    d.threat.name()
                ));
                return problems;
            }
            let mut want = p.first_moves.clone();
            Point::sort_by_columns(&mut want);
            let mut got = d.moves.proved.clone();
            Point::sort_by_columns(&mut got);
            if want != got {
                let show = |v: &[Point]| {
                    v.iter()
                        .map(|q| q.to_string())
                        .collect::<Vec<_>>()
                        .join(" ")
                };
                problems.push(format!(
                    "defences are {} but the file lists {}",
                    show(&got),
                    show(&want)
                ));
            }
            if !d.moves.unknown.is_empty() {
                problems.push(format!(
                    "{} moves could not be decided",
                    d.moves.unknown.len()
                ));
            }
        }
    }
    problems
}

/// A puzzle whose answers were proved here: the answer key as this program proves it, and
/// what differed from the key it came with.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Proved {
    /// The puzzle with the proved answers (the same position, goal and theme).
    pub puzzle: Puzzle,
    /// What was wrong with the key it came with, in words (empty when it held).
    pub problems: Vec<String>,
    /// Whether the proved answers are whole: no first move left undecided. When false the
    /// listed answers are proved, but others may exist.
    pub whole: bool,
}

/// Why a puzzle's answers could not be proved at all.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Unproved {
    /// The position already has a five.
    Over,
    /// No forced win (or, for a defence puzzle, no threat to stop) was found: `Unknown` when
    /// the budget ran out, `NoWin` when it was disproved.
    NoAnswer(Verdict),
}

impl std::fmt::Display for Unproved {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Unproved::Over => f.write_str("the position already has a five"),
            Unproved::NoAnswer(Verdict::Unknown) => {
                f.write_str("no answer could be proved within the budget")
            }
            Unproved::NoAnswer(_) => f.write_str("there is nothing to find: no forced win"),
        }
    }
}

/// Proves a puzzle's answers from scratch with [`Budget::VERIFICATION`] (for a set from a file
/// or a link, whose key nobody here has checked): the winning first moves and a shortest main
/// line, or the defences and the threat, as the generator would have written them; and what
/// differed from the key the puzzle came with.
pub fn prove(solver: &mut Solver, p: &Puzzle) -> Result<Proved, Unproved> {
    let board = p.board();
    if board.find_winner().is_some() {
        return Err(Unproved::Over);
    }
    let mode = p.theme.mode();
    let mut ask = solver.ask(Budget::VERIFICATION);
    let mut out = p.clone();
    let whole;
    match p.goal() {
        Goal::Win => {
            let sol = ask.solve(&board, p.to_move, mode);
            if sol.verdict != Verdict::Win {
                return Err(Unproved::NoAnswer(sol.verdict));
            }
            let wins = ask.winning_moves(&board, p.to_move, mode);
            whole = wins.unknown.is_empty();
            let mut firsts = wins.proved;
            if let Some(&f) = sol.line.first() {
                if !firsts.contains(&f) {
                    firsts.push(f);
                }
            }
            Point::sort_by_rows(&mut firsts);
            out.first_moves = firsts;
            out.line = sol.line;
            out.length = sol.depth;
        }
        Goal::Defend => {
            let d = ask.defences(&board, p.to_move, Mode::Vct);
            if d.threat != Verdict::Win || d.moves.proved.is_empty() {
                let v = if d.threat == Verdict::Win {
                    Verdict::Unknown
                } else {
                    d.threat
                };
                return Err(Unproved::NoAnswer(v));
            }
            whole = d.moves.unknown.is_empty() && d.complete;
            let mut firsts = d.moves.proved;
            Point::sort_by_rows(&mut firsts);
            out.first_moves = firsts;
            out.line = d.line;
        }
    }
    let mut problems = Vec::new();
    let names = |v: &[Point]| {
        v.iter()
            .map(|q| q.to_string())
            .collect::<Vec<_>>()
            .join(", ")
    };
    let wrong: Vec<Point> = p
        .first_moves
        .iter()
        .copied()
        .filter(|m| !out.first_moves.contains(m))
        .collect();
    let missing: Vec<Point> = out
        .first_moves
        .iter()
        .copied()
        .filter(|m| !p.first_moves.contains(m))
        .collect();
    if !wrong.is_empty() {
        problems.push(format!(
            "the key lists {} but that is not proved to be right",
            names(&wrong)
        ));
    }
    if !missing.is_empty() && whole {
        problems.push(format!("the key leaves out {}", names(&missing)));
    }
    if p.line.first().is_some_and(|m| wrong.contains(m)) || p.line.is_empty() {
        problems.push("its main line does not start with a proved move".into());
    }
    if problems.is_empty() {
        // The key held: keep the puzzle as it came (its own line and length).
        return Ok(Proved {
            puzzle: p.clone(),
            problems,
            whole,
        });
    }
    Ok(Proved {
        puzzle: out,
        problems,
        whole,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::formats::setfile;

    #[test]
    fn a_wrong_key_is_replaced_by_the_proved_one() {
        let text = include_str!("../../../tests/data/fixture_set.json");
        let set = setfile::parse(text).unwrap();
        let good = set.puzzles[0].clone();
        let mut solver = Solver::default();
        // The key as it came holds.
        let p = prove(&mut solver, &good).unwrap();
        assert!(p.problems.is_empty(), "{:?}", p.problems);
        assert_eq!(p.puzzle, good);
        // A key of a1 is refused, and the proved answers take its place.
        let mut bad = good.clone();
        bad.first_moves = vec![Point::new(0, 0)];
        bad.line = vec![Point::new(0, 0)];
        let p = prove(&mut solver, &bad).unwrap();
        assert!(p.problems[0].contains("a1"), "{:?}", p.problems);
        for m in &good.first_moves {
            assert!(p.puzzle.first_moves.contains(m), "{m} is proved");
        }
        assert!(!p.puzzle.first_moves.contains(&Point::new(0, 0)));
        assert_eq!(p.puzzle.line.first(), good.line.first());
    }
}
