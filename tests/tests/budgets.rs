//! A budget is a hard limit on everything one question does. On the slowest positions of the
//! solver suite and on a position of an earlier starter library whose defence question once
//! ran far past its budget (`OVERRUN`, Black to move: the Study board's "Defences?" searched
//! 203 million positions against 3 million), every study question (VCF, VCT, defences) with a total of N
//! nodes spends at most N plus a small stated slack, counted by the solver's own meter, which
//! includes the VCF questions inside a VCT, the search for each candidate of a list and the
//! reading back of lines. The stop check is told the nodes spent, and a stop ends the question.

use engine::search::{Budget, Solver, SolverConfig};
use engine::study::{study, StudyAnswer, StudySearch};
use engine::suite;
use engine::{Board, Rule, Stone};

/// What a question may spend past its total: each search stops at the first node past what
/// is left, and the question stops starting new ones once nothing is left.
const SLACK: u64 = 16;

/// The suite's slowest positions (most nodes at the verification budget), each kind.
fn slowest() -> Vec<(String, Board, Stone)> {
    let text = include_str!("../../engine/benches/suite.txt");
    let cases = suite::parse(text).expect("the suite reads");
    let mut solver = Solver::default();
    let mut timed: Vec<(u64, String, Board, Stone)> = cases
        .iter()
        .map(|c| {
            let b = c.board();
            let n = solver
                .ask(Budget::VERIFICATION)
                .solve(&b, c.to_move, c.mode)
                .nodes;
            (n, c.to_string(), b, c.to_move)
        })
        .collect();
    timed.sort_by_key(|t| std::cmp::Reverse(t.0));
    timed
        .into_iter()
        .take(4)
        .map(|(_, label, b, c)| (label, b, c))
        .collect()
}

/// The position of a VCT puzzle of an earlier starter library (freestyle, Black to move),
/// kept here since the library was regenerated.
const OVERRUN: (&str, &str) = ("g6 f7 g8 h8 i8 k8 j9 h10", "f6 g7 h7 e8 f8 j8 h9 f10");

fn overrun_position() -> (String, Board, Stone) {
    let mut b = Board::new(15, Rule::Freestyle).unwrap();
    for (list, c) in [(OVERRUN.0, Stone::Black), (OVERRUN.1, Stone::White)] {
        for p in list.split(' ') {
            b.place(p.parse().unwrap(), c);
        }
    }
    ("the overrun position".to_string(), b, Stone::Black)
}

#[test]
fn a_budget_of_n_nodes_spends_at_most_n() {
    let mut positions = slowest();
    positions.push(overrun_position());
    let mut solver = Solver::new(SolverConfig {
        table_megabytes: 8,
        vcf_table_megabytes: 4,
        ..SolverConfig::default()
    });
    let mut worst = 0i64;
    let mut undecided = 0;
    for (label, board, to_move) in &positions {
        for total in [2_000u64, 30_000, 300_000] {
            for search in [StudySearch::Vcf, StudySearch::Vct, StudySearch::Defend] {
                solver.clear();
                let s = study(
                    &mut solver,
                    board,
                    *to_move,
                    search,
                    Budget::total(total),
                    None,
                );
                worst = worst.max(s.nodes as i64 - total as i64);
                assert!(
                    s.nodes <= total + SLACK,
                    "{label} {search:?} with {total}: spent {}",
                    s.nodes
                );
                undecided += matches!(s.answer, StudyAnswer::Undecided) as u32;
            }
        }
    }
    eprintln!(
        "budgets: {} positions, worst overshoot {worst} nodes, {undecided} questions undecided",
        positions.len()
    );
    assert!(undecided > 0, "the small budgets should run out somewhere");
}

#[test]
fn a_stop_ends_the_question_and_hears_the_nodes_spent() {
    let (_, board, to_move) = overrun_position();
    let mut solver = Solver::default();
    let heard = std::cell::Cell::new(0u64);
    let stop = |spent: u64| {
        assert!(spent >= heard.get(), "the count goes down: {spent}");
        heard.set(spent);
        spent > 20_000
    };
    let s = study(
        &mut solver,
        &board,
        to_move,
        StudySearch::Defend,
        Budget::total(50_000_000),
        Some(&stop),
    );
    assert!(heard.get() > 20_000, "the stop check heard {}", heard.get());
    // Stopped soon after 20,000: the check is polled every 1,024 nodes of every search.
    assert!(s.nodes < 200_000, "spent {} after the stop", s.nodes);
}
