//! Re-proving a puzzle: the same questions the generator asked, answered again from scratch.

use super::{Goal, Puzzle};
use crate::geometry::Point;
use crate::search::{Mode, Solver, Verdict};

/// The node budget of a re-proof: larger than the generator's, because a fresh table may need
/// more nodes than the generator's warm one did for the same answer (the answers themselves do
/// not depend on the table).
pub const NODE_LIMIT: u64 = 1_000_000;

/// The solver settings puzzles are checked (and graded) with.
pub fn solver() -> Solver {
    Solver::new(crate::search::SolverConfig {
        node_limit: NODE_LIMIT,
        ..crate::search::SolverConfig::default()
    })
}

/// Re-proves one puzzle; the problems found, in words.
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
            let sol = solver.solve(&board, p.to_move, mode, None);
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
                solver.set_history(&board, &[(m, p.to_move)]);
                let win = b.find_winner() == Some(p.to_move)
                    || solver
                        .wins_after(&b, p.to_move, p.to_move.opponent(), mode, None)
                        .0
                        == Verdict::Win;
                solver.set_history(&board, &[]);
                if !win {
                    problems.push(format!("first move {m} does not keep the win"));
                }
            }
            let wins = solver.winning_moves(&board, p.to_move, mode);
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
            let d = solver.defences(&board, p.to_move, Mode::Vct);
            if d.threat != Verdict::Win {
                problems.push(format!(
                    "the opponent has no forced win to stop ({})",
                    d.threat.name()
                ));
                return problems;
            }
            let mut want = p.first_moves.clone();
            want.sort_by_key(|q| (q.x, q.y));
            let mut got = d.moves.proved.clone();
            got.sort_by_key(|q| (q.x, q.y));
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
