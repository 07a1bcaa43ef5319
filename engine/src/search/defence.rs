//! The defender's replies a VCT search must refute, and why no other reply needs trying.
//!
//! Facing a threat that is not a four, the defender is up against the attacker's VCF `P`
//! (found as if the defender passed). The replies are: all the defender's fours (each gains a
//! tempo, after which the defender moves again), every point of `P` and its final five points,
//! and every point where a defender stone could change `P`'s outcome: under freestyle and
//! standard, the points that together with `P`'s defender stones could give the defender a
//! five; under renju, where a stone can change which points are forbidden far away, every
//! empty point whose stone makes `P` fail when `P` is replayed. Every other reply leaves `P` a
//! valid VCF, so the attacker still wins: the set is never smaller than soundness needs.

use super::vcf::VcfLine;
use crate::board::{threat, Board};
use crate::rules::Notes;
use crate::types::{Rule, Stone};

/// The defender's replies that need refuting when the attacker threatens the VCF `line` (found
/// with the defender passing). See the module documentation for why the set is sound.
pub(crate) fn defence_candidates(board: &mut Board, attacker: Stone, line: &VcfLine) -> Vec<u16> {
    let d = attacker.opponent();
    let n = board.cell_count();
    let mut mark = vec![false; n];
    let mut out: Vec<u16> = Vec::new();
    let push = |m: usize, mark: &mut Vec<bool>, out: &mut Vec<u16>| {
        if !mark[m] {
            mark[m] = true;
            out.push(m as u16);
        }
    };
    // The defender's own fours gain a tempo: the attacker must block, and then the defender
    // moves again with two more stones on the board, so every one of them is a reply to try.
    let fours: Vec<usize> = board.cells_with(d, threat::FOUR).iter().collect();
    for c in fours {
        push(c, &mut mark, &mut out);
    }
    // Every point of the line and every final five point.
    for &m in line.moves.iter().chain(line.fives.iter()) {
        push(m as usize, &mut mark, &mut out);
    }
    if board.rule() == Rule::Renju {
        // Renju: a stone can also change which points are forbidden. Whether a point is
        // forbidden depends only on the lines through it, and a stone can only change the
        // answer at a point that is forbidden or has two threes or more (a white stone removes
        // black shapes, a black stone adds them, and neither turns a point with at most one
        // three and one four into a forbidden one). The replay records every such point the
        // rules looked at, the recursion of the three rule included; a stone off all their
        // lines changes no decision of the replay. Replay the line against the stones on them.
        let mut touched: Vec<u16> = Vec::new();
        replay(board, attacker, line, &mut touched);
        let mut seen = vec![false; n];
        for x in touched {
            for dir in 0..4 {
                for t in -5isize..=5 {
                    let m = board.offset(x as usize, dir, t);
                    if seen[m] || mark[m] || !board.is_empty_at(m) {
                        continue;
                    }
                    seen[m] = true;
                    if !replay_survives(board, attacker, line, m) {
                        push(m, &mut mark, &mut out);
                    }
                }
            }
        }
    }
    // Freestyle and standard: a defender stone off the line can only break it by giving the
    // defender a five point together with the defender's replies in the line, so it must share
    // a five-window with one of them that holds no attacker stone and enough defender stones.
    let replies: Vec<usize> = line
        .moves
        .iter()
        .skip(1)
        .step_by(2)
        .map(|&m| m as usize)
        .collect();
    let (w, h) = (board.width() as i32, board.height() as i32);
    for &b in &replies {
        let pb = board.point(b);
        for dir in crate::geometry::Direction::ALL {
            let (dx, dy) = dir.step();
            // The cell k steps from b along this line, if it is on the board.
            let at = |k: i32| -> Option<usize> {
                let (x, y) = (pb.x as i32 + dx as i32 * k, pb.y as i32 + dy as i32 * k);
                ((0..w).contains(&x) && (0..h).contains(&y))
                    .then(|| board.index(crate::geometry::Point::new(x as u8, y as u8)))
            };
            for t in -4i32..=4 {
                let Some(m) = at(t) else { continue };
                if t == 0 || mark[m] || !board.is_empty_at(m) {
                    continue;
                }
                // Windows of five on this line through both b (offset 0) and m (offset t) that
                // hold no attacker stone and at least four defender stones once m and the
                // line's replies are counted.
                let (lo, hi) = (t.min(0), t.max(0));
                let threat_found = ((hi - 4)..=lo).any(|start| {
                    let mut count = 0;
                    for k in start..start + 5 {
                        match at(k) {
                            Some(c)
                                if k == t || replies.contains(&c) || board.is_stone_at(c, d) =>
                            {
                                count += 1
                            }
                            Some(c) if board.is_empty_at(c) => {}
                            _ => return false,
                        }
                    }
                    count >= 4
                });
                if threat_found {
                    push(m, &mut mark, &mut out);
                }
            }
        }
    }
    out
}

/// Whether the VCF `line` still wins for `attacker` after a defender stone on `m`, replaying it
/// under the same rules as the search (conservatively: any deviation counts as failure).
pub(crate) fn replay_survives(
    board: &mut Board,
    attacker: Stone,
    line: &VcfLine,
    m: usize,
) -> bool {
    board.place_at(m, attacker.opponent());
    let ok = replay(board, attacker, line, &mut ());
    board.remove_at(m);
    ok
}

/// Replays the VCF `line` (attacker to move) under the search's rules; any deviation from the
/// line counts as failure. Leaves the board as it found it. `notes` hears of every point at
/// which a renju legality decision of the replay weighed several lines.
fn replay<N: Notes>(board: &mut Board, attacker: Stone, line: &VcfLine, notes: &mut N) -> bool {
    let d = attacker.opponent();
    let mut placed: Vec<usize> = Vec::new();
    let ok = (|| {
        let mut i = 0;
        loop {
            // Attacker to move.
            if !board.cells_with(attacker, threat::FIVE).is_empty() {
                return true;
            }
            let Some(&mv) = line.moves.get(i) else {
                return false;
            };
            let mv = mv as usize;
            let dfives = board.cells_with(d, threat::FIVE);
            if !dfives.is_empty() && (dfives.len() >= 2 || dfives.first() != Some(mv)) {
                return false;
            }
            if !board.is_empty_at(mv)
                || board.flags_at(mv, attacker) & threat::FOUR == 0
                || !board.legal_noting(mv, attacker, notes)
            {
                return false;
            }
            board.place_at(mv, attacker);
            placed.push(mv);
            i += 1;
            // Defender to move.
            if !board.cells_with(d, threat::FIVE).is_empty() {
                return false;
            }
            let afives = *board.cells_with(attacker, threat::FIVE);
            if afives.len() >= 2 {
                return true;
            }
            let Some(b) = afives.first() else {
                return false;
            };
            if board.flags_at(b, d) & threat::FIVE == 0 && !board.legal_noting(b, d, notes) {
                return true;
            }
            if line.moves.get(i).map(|&x| x as usize) != Some(b) {
                return false;
            }
            board.place_at(b, d);
            placed.push(b);
            i += 1;
        }
    })();
    for &c in placed.iter().rev() {
        board.remove_at(c);
    }
    ok
}
