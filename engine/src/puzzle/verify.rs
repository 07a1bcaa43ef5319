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
