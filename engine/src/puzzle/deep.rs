//! Deep lines: long forcing lines made from played positions, and the checks that a stored
//! line takes no detour.
//!
//! Long VCFs are rare in self-play, but short ones are common, and every forcing exchange a
//! game played can be taken back: [`deepen`] removes one attacker stone and one defender stone
//! such that the attacker's stone, played again, is a four that the defender's stone alone
//! blocks, and keeps the smaller position when its shortest win is longer. Repeated, this walks
//! a played position back along forcing exchanges to one with a long line; every stone left
//! was played in the game, so the position stays one that play reaches.
//!
//! [`detours`] checks a stored line: at every attacker move of it, the position before that
//! move has no win of the class that is shorter than the rest of the line (so no move of the
//! line can be skipped and no shorter win exists), and, for a line of fours, the line with any
//! one exchange left out no longer replays as a line of fours ending in a five.

use std::collections::HashSet;

use super::{Goal, Puzzle};
use crate::board::{threat, Board};
use crate::geometry::Point;
use crate::search::{Asking, Budget, Mode, Solver, Verdict};
use crate::types::Stone;

/// The longest line a deep puzzle may have, in attacker moves before the winning move: twenty
/// fours make 41 plies with the five.
pub const MAX_MOVES: u16 = 20;

/// Attacker moves of a main line before its last (winning) move.
pub fn moves_before_win(line: &[Point]) -> u16 {
    line.len().div_ceil(2).saturating_sub(1) as u16
}

/// Takes forcing exchanges back from `board` until `attacker`'s shortest win of `mode` has at
/// least `want` attacker moves before the winning one (and at most `max`). Returns up to
/// `keep` such smaller positions with their lines, the longest first (none when no sequence
/// of exchanges found within [`SEARCHES`] searches lengthens the win enough). A depth-first
/// walk: every exchange whose removal lengthens the win is followed, in the board's stone
/// order, before the next is tried, and a position reached again by the same exchanges in
/// another order is skipped; so the result is deterministic.
pub fn deepen(
    ask: &mut Asking,
    board: &Board,
    attacker: Stone,
    mode: Mode,
    (want, max): (u16, u16),
    keep: usize,
) -> Vec<(Board, Vec<Point>)> {
    let first = ask.solve(board, attacker, mode);
    if first.verdict != Verdict::Win {
        return Vec::new();
    }
    let n = moves_before_win(&first.line);
    if n > max {
        return Vec::new();
    }
    if n >= want {
        return vec![(board.clone(), first.line)];
    }
    let mut walk = Walk {
        attacker,
        mode,
        want,
        max,
        keep,
        searches: SEARCHES,
        seen: HashSet::new(),
        found: Vec::new(),
    };
    walk.back(ask, board, n);
    // Longest first; a stable sort keeps the walk's order among equals.
    walk.found
        .sort_by_key(|(_, line)| std::cmp::Reverse(moves_before_win(line)));
    walk.found
}

/// The state of [`deepen`]'s walk.
struct Walk {
    attacker: Stone,
    mode: Mode,
    want: u16,
    max: u16,
    keep: usize,
    /// Searches left.
    searches: u32,
    /// Positions reached (the same exchanges taken back in another order reach one again).
    seen: HashSet<u64>,
    found: Vec<(Board, Vec<Point>)>,
}

/// The most searches one [`deepen`] makes.
pub const SEARCHES: u32 = 400;

impl Walk {
    /// Whether the walk is over: enough found, or no searches left.
    fn done(&self) -> bool {
        self.found.len() >= self.keep || self.searches == 0
    }

    /// Takes back every exchange of `board` (whose win has `n` moves) in turn, following
    /// those that lengthen the win.
    fn back(&mut self, ask: &mut Asking, board: &Board, n: u16) {
        let attacker = self.attacker;
        let mine = board.stones_of(attacker);
        let theirs = board.stones_of(attacker.opponent());
        for &a in &mine {
            for &d in &theirs {
                if self.done() {
                    return;
                }
                let Some(mut b) = board.taken_back(a, d, attacker) else {
                    continue;
                };
                if !b.legal_at(b.index(a), attacker) {
                    continue;
                }
                // Nobody may have a five to make in the smaller position.
                if !b.cells_with(attacker, threat::FIVE).is_empty()
                    || !b.cells_with(attacker.opponent(), threat::FIVE).is_empty()
                    || !self.seen.insert(b.hash())
                {
                    continue;
                }
                self.searches -= 1;
                let sol = ask.solve(&b, attacker, self.mode);
                let m = moves_before_win(&sol.line);
                if sol.verdict != Verdict::Win || m <= n || m > self.max {
                    continue;
                }
                if m >= self.want {
                    self.found.push((b.clone(), sol.line));
                }
                // Deeper still, for longer lines among the ones found.
                if m < self.max {
                    self.back(ask, &b, m);
                }
            }
        }
    }
}

/// The detours in a puzzle's stored line, in words (empty when there are none): see the
/// module comment. For a defence puzzle the line checked is the opponent's threat. Every
/// search is asked with [`Budget::VERIFICATION`]; an undecided one is reported too.
pub fn detours(solver: &mut Solver, p: &Puzzle) -> Vec<String> {
    let attacker = p.attacker();
    let mode = match p.goal() {
        Goal::Win => p.theme.mode(),
        // The threat of a deep defence: its own class (a VCF when it has one).
        Goal::Defend => {
            let fours = solver
                .ask(Budget::VERIFICATION)
                .solve(&p.board(), attacker, Mode::Vcf);
            if fours.verdict == Verdict::Win {
                Mode::Vcf
            } else {
                Mode::Vct
            }
        }
    };
    detours_of(solver, &p.board(), attacker, mode, &p.line)
}

/// [`detours`] for any line of `attacker` from `start` in `mode`.
pub fn detours_of(
    solver: &mut Solver,
    start: &Board,
    attacker: Stone,
    mode: Mode,
    line: &[Point],
) -> Vec<String> {
    let mut problems = Vec::new();
    let k = moves_before_win(line) as usize;
    // The measure of the rest of the line from attacker move i: fours (VCF) or threats that are
    // not fours (VCT), as the search counts them.
    let mut b = start.clone();
    let mut measure = Vec::with_capacity(k);
    let mut colour = attacker;
    let mut history = Vec::new();
    for (j, &m) in line.iter().enumerate() {
        if j % 2 == 0 && j / 2 < k {
            let four = b.flags_at(b.index(m), attacker) & threat::FOUR != 0;
            measure.push(match mode {
                Mode::Vcf => 1u16,
                Mode::Vct => u16::from(!four),
            });
        }
        if b.get(m).is_some() {
            problems.push(format!("move {} ({m}) is on a stone", j + 1));
            return problems;
        }
        b.place(m, colour);
        history.push((m, colour));
        colour = colour.opponent();
    }
    if b.find_winner() != Some(attacker) {
        problems.push("the line does not end in a five".into());
        return problems;
    }
    for i in 0..k {
        let rest: u16 = measure[i..].iter().sum();
        if rest == 0 {
            continue;
        }
        let mut before = start.clone();
        for (&(m, c), _) in history.iter().zip(0..2 * i) {
            before.place(m, c);
        }
        let verdict = solver
            .ask(Budget::VERIFICATION)
            .after(start, &history[..2 * i])
            .wins_within(&before, attacker, mode, rest - 1);
        match verdict {
            Verdict::NoWin => {}
            Verdict::Win => problems.push(format!(
                "before attacker move {} ({}) there is a shorter win",
                i + 1,
                line[2 * i]
            )),
            Verdict::Unknown => problems.push(format!(
                "before attacker move {} ({}) a shorter win could not be ruled out",
                i + 1,
                line[2 * i]
            )),
        }
    }
    if mode == Mode::Vcf {
        for i in 0..k {
            let mut shorter = line[..2 * i].to_vec();
            shorter.extend_from_slice(&line[2 * i + 2..]);
            if replays_as_fours(start, attacker, &shorter) {
                problems.push(format!(
                    "attacker move {} ({}) can be skipped",
                    i + 1,
                    line[2 * i]
                ));
            }
        }
    }
    problems
}

/// Whether `line` from `start` is a line of fours for `attacker`: every attacker move but the
/// last is a legal four with the defender's next move among its five points, and the last
/// makes five.
fn replays_as_fours(start: &Board, attacker: Stone, line: &[Point]) -> bool {
    let mut b = start.clone();
    let n = line.len();
    for (j, &m) in line.iter().enumerate() {
        if b.get(m).is_some() {
            return false;
        }
        if j % 2 == 1 {
            b.place(m, attacker.opponent());
            continue;
        }
        let im = b.index(m);
        if !b.legal_at(im, attacker) {
            return false;
        }
        b.place(m, attacker);
        if j + 1 == n {
            return b.find_winner() == Some(attacker);
        }
        let reply = b.index(line[j + 1]);
        if !b.cells_with(attacker, threat::FIVE).contains(reply) {
            return false;
        }
    }
    false
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::notation;
    use crate::types::Rule;

    fn board(black: &str, white: &str) -> Board {
        let mut b = Board::new(15, Rule::Freestyle).unwrap();
        for p in notation::parse_points(black, "black", 15, 15).unwrap() {
            b.place(p, Stone::Black);
        }
        for p in notation::parse_points(white, "white", 15, 15).unwrap() {
            b.place(p, Stone::White);
        }
        b
    }

    fn pts(s: &str) -> Vec<Point> {
        notation::parse_points(s, "line", 15, 15).unwrap()
    }

    #[test]
    fn a_detour_is_found_and_a_direct_line_passes() {
        // Black: an open three on row 8 (g8 h8 i8) and three stones on column c, blocked at c2.
        let b = board("g8,h8,i8,c3,c4,c5", "c2,a1,a3,o15,o13,n15");
        let mut solver = Solver::default();
        // Direct: the straight four, then the five.
        let direct = pts("j8,k8,f8");
        assert_eq!(
            detours_of(&mut solver, &b, Stone::Black, Mode::Vcf, &direct),
            Vec::<String>::new()
        );
        // A detour: a four on column c first (blocked at c7), then the same win.
        let detour = pts("c6,c7,j8,k8,f8");
        let problems = detours_of(&mut solver, &b, Stone::Black, Mode::Vcf, &detour);
        assert!(
            problems.iter().any(|p| p.contains("shorter win")),
            "{problems:?}"
        );
        assert!(
            problems.iter().any(|p| p.contains("(c6) can be skipped")),
            "{problems:?}"
        );
    }

    #[test]
    fn taking_back_exchanges_lengthens_a_win() {
        // Black has just made fours at e5 and j10 (blocked at d4 and k11) on the way to a
        // four-three; the position after them has a short win, the one before a longer one.
        let b = board("f6,g7,h8,i9,e5,h6,h7", "d4,k11,a15,o1,o15");
        let mut solver = Solver::default();
        let mut ask = solver.ask(Budget::GENERATION);
        let start = ask.solve(&b, Stone::Black, Mode::Vcf);
        assert_eq!(start.verdict, Verdict::Win);
        let n = moves_before_win(&start.line);
        for (deeper, line) in deepen(&mut ask, &b, Stone::Black, Mode::Vcf, (n + 1, 20), 3) {
            assert!(moves_before_win(&line) > n);
            assert_eq!(deeper.stones() + 2, b.stones());
            let again = ask.solve(&deeper, Stone::Black, Mode::Vcf);
            assert_eq!(moves_before_win(&again.line), moves_before_win(&line));
        }
        // Nothing can be asked for beyond the most.
        assert!(deepen(&mut ask, &b, Stone::Black, Mode::Vcf, (n + 1, n), 3).is_empty());
    }
}
