//! A playing engine for seeded self-play: a shallow, threat-aware alpha-beta with controlled
//! randomness, so that generated games look like games between club players rather than noise.
//!
//! It sees what a club player sees: it always takes a five, always blocks a four, answers an open
//! three, and evaluates a position by the threat shapes each side could make (fours, threes,
//! closed threes, twos). The root moves get seeded noise, so two seeds give two different
//! games and the same seed always gives the same game, natively and in WebAssembly
//! (ChaCha8 is portable).

use rand_chacha::rand_core::{RngCore, SeedableRng};
use rand_chacha::ChaCha8Rng;

use crate::bitset::CellSet;
use crate::board::{threat, Board, FlagCounts};
use crate::geometry::{best_first_key, best_first_parts, Point};
use crate::patterns::LineShape;
use crate::rules::Game;
use crate::types::Rule;
use crate::types::Stone;

/// How the player chooses.
#[derive(Clone, Debug, PartialEq)]
pub struct PlayerConfig {
    /// Alpha-beta depth in plies (1 or 2 is club strength; 3 is slow).
    pub depth: u8,
    /// Candidate moves looked at per node, best by the quick score first.
    pub width: usize,
    /// Noise added to root scores, in evaluation units (0: deterministic best play).
    pub noise: i32,
}

impl Default for PlayerConfig {
    fn default() -> Self {
        PlayerConfig {
            depth: 2,
            width: 10,
            noise: 40,
        }
    }
}

const WIN: i32 = 1_000_000;

/// A seeded player.
pub struct Player {
    rng: ChaCha8Rng,
    config: PlayerConfig,
}

/// A seeded stream of random numbers, the same on every platform.
pub fn rng(seed: u64) -> ChaCha8Rng {
    ChaCha8Rng::seed_from_u64(seed)
}

/// A random number below `n` (n > 0), from a seeded stream.
pub fn below(rng: &mut ChaCha8Rng, n: u32) -> u32 {
    // Multiply-shift keeps the result free of modulo bias for all practical purposes.
    ((rng.next_u32() as u64 * n as u64) >> 32) as u32
}

/// A seeded opening on an empty board of `size` under `rule`: black's stone on the centre,
/// then stones of alternating colour at random points within two of it, until the board
/// holds `stones` stones or `tries` points have been drawn (a drawn point that is taken is
/// skipped). Generation and the benchmark suite's harvest both start their games here.
pub fn opening(size: u8, rule: Rule, rng: &mut ChaCha8Rng, stones: usize, tries: u32) -> Game {
    let board = Board::new(size, rule).expect("opening sizes are checked by the caller");
    let mut game = Game::new(board);
    let c = size / 2;
    let _ = game.play(Point::new(c, c));
    let mut drawn = 0;
    while game.board().stones() < stones && drawn < tries {
        drawn += 1;
        let dx = below(rng, 5) as i32 - 2;
        let dy = below(rng, 5) as i32 - 2;
        let p = Point::new((c as i32 + dx) as u8, (c as i32 + dy) as u8);
        let _ = game.play(p);
    }
    game
}

/// The next 64 bits of a seeded stream (a seed for a sub-stream, such as a player's).
pub fn next_seed(rng: &mut ChaCha8Rng) -> u64 {
    rng.next_u64()
}

impl Player {
    /// A player with its own seeded stream.
    pub fn new(seed: u64, config: PlayerConfig) -> Player {
        Player {
            rng: rng(seed),
            config,
        }
    }

    /// The player's move for the side to move, or `None` if no legal move is left.
    pub fn choose(&mut self, game: &Game) -> Option<Point> {
        let mut board = game.board().clone();
        let me = game.to_move();
        let m = self.choose_at(&mut board, me)?;
        Some(board.point(m))
    }

    fn choose_at(&mut self, board: &mut Board, me: Stone) -> Option<usize> {
        let (cands, root) = candidates(board, me, self.config.width.max(1) * 2);
        if cands.is_empty() {
            return None;
        }
        if let Some(f) = forced(board, me) {
            return Some(f);
        }
        let opp = me.opponent();
        let mut best = None;
        let mut best_score = i32::MIN;
        for &(m, _) in cands.iter().take(self.config.width) {
            let noise = if self.config.noise > 0 {
                below(&mut self.rng, self.config.noise as u32 * 2 + 1) as i32 - self.config.noise
            } else {
                0
            };
            // Only a value above `best_score - noise` changes the choice, so the search is
            // told that as its alpha: it stops once it shows the value is not above it, and
            // gives the value exactly when it is.
            let alpha = match best {
                None => -WIN * 2,
                // Clamped to the window of every value (a narrower clamp would only be
                // looser), so that no noise can overflow it.
                Some(_) => best_score.saturating_sub(noise).clamp(-WIN * 2, WIN * 2),
            };
            board.place_at(m, me);
            let s = -self.search(
                board,
                opp,
                self.config.depth.saturating_sub(1),
                (-WIN * 2, -alpha),
                Some((&root, m)),
            );
            board.remove_at(m);
            let s = s.saturating_add(noise);
            if s > best_score {
                best_score = s;
                best = Some(m);
            }
        }
        best
    }

    /// Negamax alpha-beta from the view of `me`, to move, within `(alpha, beta)`. `parent`
    /// is the scored points of the position before the last stone and where it went (so
    /// that only what the stone changed is scored again), when the caller has them.
    fn search(
        &mut self,
        board: &mut Board,
        me: Stone,
        depth: u8,
        (mut alpha, beta): (i32, i32),
        parent: Option<(&Scored, usize)>,
    ) -> i32 {
        if depth == 0 {
            return leaf(&board.flag_counts(), me);
        }
        let opp = me.opponent();
        if !board.cells_with(me, threat::FIVE).is_empty() {
            return WIN;
        }
        let opp_fives = board.cells_with(opp, threat::FIVE).len();
        if opp_fives >= 2 {
            return -WIN;
        }
        if board.is_full() {
            return evaluate(board, me);
        }
        let (moves, here): (Vec<usize>, Option<Scored>) = if opp_fives == 1 {
            (board.cells_with(opp, threat::FIVE).iter().collect(), None)
        } else {
            let width = self.config.width;
            let (list, here) = match parent {
                Some((scored, r)) => {
                    let here = scored_after(board, scored, r);
                    (ranked(board, &here, me, width), here)
                }
                None => candidates(board, me, width),
            };
            (list.into_iter().map(|c| c.0).collect(), Some(here))
        };
        // One ply from the leaves, a move's value is read from the flag counts it would
        // leave, without placing it (the same value as placing it and searching on).
        let counts = (depth == 1).then(|| board.flag_counts());
        let mut best = -WIN * 2;
        for m in moves {
            if !board.legal_at(m, me) {
                continue;
            }
            let s = match &counts {
                Some(counts) => -leaf(&board.flag_counts_after(m, me, counts), opp),
                None => {
                    board.place_at(m, me);
                    let after = here.as_ref().map(|h| (h, m));
                    let s = -self.search(board, opp, depth - 1, (-beta, -alpha), after);
                    board.remove_at(m);
                    s
                }
            };
            if s > best {
                best = s;
            }
            if s > alpha {
                alpha = s;
            }
            if alpha >= beta {
                break;
            }
        }
        if best == -WIN * 2 {
            evaluate(board, me)
        } else {
            best
        }
    }
}

/// The move `me` must play, if any: its five, or else a legal block of the opponent's five.
fn forced(board: &mut Board, me: Stone) -> Option<usize> {
    if let Some(f) = board.cells_with(me, threat::FIVE).first() {
        return Some(f);
    }
    let b = board.cells_with(me.opponent(), threat::FIVE).first()?;
    board.legal_at(b, me).then_some(b)
}

/// What [`Player::search`] returns at depth 0 for `me`, to move, given the board's
/// [`Board::flag_counts`]: a won or lost position, or else its [`evaluate`] value.
fn leaf(counts: &FlagCounts, me: Stone) -> i32 {
    let five = threat::FIVE.trailing_zeros() as usize;
    if counts[me.index()][five] > 0 {
        WIN
    } else if counts[me.opponent().index()][five] >= 2 {
        -WIN
    } else {
        evaluate_counts(counts, me)
    }
}

/// The value of a position for `me`, to move, from the threat shapes of both sides.
pub fn evaluate(board: &Board, me: Stone) -> i32 {
    evaluate_counts(&board.flag_counts(), me)
}

/// [`evaluate`] from the board's [`Board::flag_counts`].
fn evaluate_counts(counts: &FlagCounts, me: Stone) -> i32 {
    let opp = me.opponent();
    let count = |c: Stone, k: u8| counts[c.index()][k.trailing_zeros() as usize];
    if count(me, threat::FIVE) > 0 {
        return WIN / 2;
    }
    let side = |c: Stone| -> i32 {
        count(c, threat::FOUR) * 60
            + count(c, threat::THREE) * 40
            + count(c, threat::CLOSED_THREE) * 8
            + count(c, threat::TWO) * 3
    };
    let opp_fives = count(opp, threat::FIVE);
    let mut v = side(me) - side(opp) * 11 / 10 - opp_fives * 500;
    // Having the move with a three on the board is worth a tempo.
    if count(me, threat::THREE) > 0 && opp_fives == 0 {
        v += 80;
    }
    v
}

/// The empty points near the stones, each with its quick score for black and for white (by
/// [`Stone::index`]): what the candidates are ranked from.
type Scored = Vec<(usize, [i32; 2])>;

/// A point's quick scores for both colours.
fn both_scores(board: &Board, i: usize) -> [i32; 2] {
    let mut s = [0; 2];
    for c in Stone::ALL {
        s[c.index()] = quick_score(board, i, c);
    }
    s
}

/// Legal empty points near the stones, best by a quick score first (at most `n`), and the
/// scored points they were ranked from.
fn candidates(board: &mut Board, me: Stone, n: usize) -> (Vec<(usize, i32)>, Scored) {
    let scored: Scored = board
        .empties_near(2)
        .into_iter()
        .map(|i| (i, both_scores(board, i)))
        .collect();
    if board.stones() == 0 {
        let centre = board.index(Point::new(board.width() / 2, board.height() / 2));
        let first = (n > 0 && board.legal_at(centre, me)).then_some((centre, 1));
        return (first.into_iter().collect(), scored);
    }
    (ranked(board, &scored, me, n), scored)
}

/// The scored points of the board as it is, from `parent`, those of the board before its
/// last stone, on `r`: `r` leaves, the empty points within two of it join, the points on a
/// line through it within five cells (the farthest a stone's digits reach) are scored afresh,
/// and the rest keep their scores (a point's quick score reads only its own lines, and no
/// other point's lines change).
fn scored_after(board: &Board, parent: &Scored, r: usize) -> Scored {
    let mut on_line = CellSet::new();
    for d in 0..4 {
        for n in 1..=5 {
            on_line.insert(board.offset(r, d, n));
            on_line.insert(board.offset(r, d, -n));
        }
    }
    let mut seen = CellSet::new();
    let mut out = Vec::with_capacity(parent.len() + 16);
    for &(q, s) in parent {
        seen.insert(q);
        if q != r {
            out.push((
                q,
                if on_line.contains(q) {
                    both_scores(board, q)
                } else {
                    s
                },
            ));
        }
    }
    let (w, h) = (i32::from(board.width()), i32::from(board.height()));
    let rp = board.point(r);
    for y in (i32::from(rp.y) - 2).max(0)..=(i32::from(rp.y) + 2).min(h - 1) {
        for x in (i32::from(rp.x) - 2).max(0)..=(i32::from(rp.x) + 2).min(w - 1) {
            let q = board.index(Point::new(x as u8, y as u8));
            if board.is_empty_at(q) && !seen.contains(q) {
                out.push((q, both_scores(board, q)));
            }
        }
    }
    out
}

/// The legal points of `scored` best for `me` to move (its quick score counted five times,
/// the opponent's four), best first (at most `n`).
fn ranked(board: &mut Board, scored: &Scored, me: Stone, n: usize) -> Vec<(usize, i32)> {
    let (mine, theirs) = (me.index(), me.opponent().index());
    let mut keys: Vec<u64> = scored
        .iter()
        .map(|&(i, s)| best_first_key(s[mine] * 5 + s[theirs] * 4, i as u16))
        .collect();
    let unpack = |k: u64| {
        let (s, i) = best_first_parts(k);
        (i as usize, s)
    };
    // The `n` best, found without sorting the rest, are the answer when all are legal (as
    // they are except for renju's black); otherwise the first `n` legal ones of them all.
    let best = smallest(&keys, n);
    if best.iter().all(|&k| board.legal_at(unpack(k).0, me)) {
        return best.into_iter().map(unpack).collect();
    }
    keys.sort_unstable();
    let mut kept = Vec::with_capacity(n);
    for c in keys.into_iter().map(unpack) {
        if kept.len() >= n {
            break;
        }
        if board.legal_at(c.0, me) {
            kept.push(c);
        }
    }
    kept
}

/// The `n` smallest of `keys` (all of them if there are fewer), in ascending order.
fn smallest(keys: &[u64], n: usize) -> Vec<u64> {
    let mut out: Vec<u64> = Vec::with_capacity(n);
    for &k in keys {
        if out.len() == n {
            match out.last_mut() {
                Some(last) if k < *last => *last = k,
                _ => continue,
            }
        } else {
            out.push(k);
        }
        // Sink the new key to its place.
        let mut i = out.len() - 1;
        while i > 0 && out[i - 1] > out[i] {
            out.swap(i - 1, i);
            i -= 1;
        }
    }
    out
}

/// What a point's [`threat`] flags add to its quick score, by the flags (a whole byte's worth
/// of entries, so that a lookup needs no bounds check).
const FLAG_SCORE: [i32; 256] = {
    const fn has(f: usize, k: u8) -> i32 {
        (f as u8 & k != 0) as i32
    }
    let mut t = [0; 256];
    let mut f = 0;
    while f < 256 {
        t[f] = has(f, threat::FIVE) * 10_000
            + has(f, threat::FOUR) * 300
            + has(f, threat::THREE) * 200
            + has(f, threat::CLOSED_THREE) * 40
            + has(f, threat::TWO) * 15;
        f += 1;
    }
    t
};

/// What each direction's shape adds to a point's quick score, by shape number (a byte's worth).
const SHAPE_SCORE: [i32; 256] = {
    let mut t = [0; 256];
    t[LineShape::Two as usize] = 6;
    t[LineShape::ClosedThree as usize] = 10;
    t[LineShape::BrokenThree as usize] = 30;
    t[LineShape::Three as usize] = 30;
    t[LineShape::Four as usize] = 50;
    t
};

fn quick_score(board: &Board, i: usize, c: Stone) -> i32 {
    let lines = board.shape_numbers_at(i, c);
    FLAG_SCORE[board.flags_at(i, c) as usize]
        + lines.iter().map(|&l| SHAPE_SCORE[l as usize]).sum::<i32>()
}

/// Plays a seeded game from the given opening moves until someone wins, the board fills or
/// `max_moves` stones stand on the board. Returns the game.
pub fn self_play(game: &mut Game, seed: u64, config: &PlayerConfig, max_moves: usize) {
    let mut player = Player::new(seed, config.clone());
    while !game.is_over() && game.board().stones() < max_moves {
        let Some(m) = player.choose(game) else { break };
        if game.play(m).is_err() {
            break;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::board::tests::{numbers, random_board};
    use crate::types::Rule;

    #[test]
    fn same_seed_same_game() {
        let play = |seed| {
            let mut g = Game::new(Board::new(15, Rule::Freestyle).unwrap());
            self_play(&mut g, seed, &PlayerConfig::default(), 30);
            g.moves().to_vec()
        };
        assert_eq!(play(7), play(7));
        assert_ne!(play(7), play(8));
    }

    #[test]
    fn takes_a_five_and_blocks_a_four() {
        let mut g = Game::new(Board::new(15, Rule::Freestyle).unwrap());
        for m in ["h8", "a1", "i8", "a2", "j8", "a3", "k8", "o15"] {
            g.play(m.parse().unwrap()).unwrap();
        }
        let mut p = Player::new(1, PlayerConfig::default());
        let m = p.choose(&g).unwrap().to_string();
        assert!(m == "g8" || m == "l8", "{m}");
        g.play("g8".parse().unwrap()).unwrap();
        // White must now block... black already won; start again for the block.
        let mut g = Game::new(Board::new(15, Rule::Freestyle).unwrap());
        for m in ["a1", "h8", "a2", "i8", "o15", "j8", "o14", "k8"] {
            g.play(m.parse().unwrap()).unwrap();
        }
        let m = p.choose(&g).unwrap().to_string();
        assert!(m == "g8" || m == "l8", "{m}");
    }

    /// The search without its reading of the last ply from flag counts: every move placed,
    /// searched on and taken back, and a depth-0 node valued from the board.
    fn placing_search(
        p: &mut Player,
        board: &mut Board,
        me: Stone,
        depth: u8,
        mut alpha: i32,
        beta: i32,
    ) -> i32 {
        let opp = me.opponent();
        if !board.cells_with(me, threat::FIVE).is_empty() {
            return WIN;
        }
        let opp_fives = board.cells_with(opp, threat::FIVE).len();
        if opp_fives >= 2 {
            return -WIN;
        }
        if depth == 0 || board.is_full() {
            return evaluate(board, me);
        }
        let moves: Vec<usize> = if opp_fives == 1 {
            board.cells_with(opp, threat::FIVE).iter().collect()
        } else {
            candidates(board, me, p.config.width)
                .0
                .into_iter()
                .map(|c| c.0)
                .collect()
        };
        let mut best = -WIN * 2;
        for m in moves {
            if !board.legal_at(m, me) {
                continue;
            }
            board.place_at(m, me);
            let s = -placing_search(p, board, opp, depth - 1, -beta, -alpha);
            board.remove_at(m);
            best = best.max(s);
            alpha = alpha.max(s);
            if alpha >= beta {
                break;
            }
        }
        if best == -WIN * 2 {
            evaluate(board, me)
        } else {
            best
        }
    }

    /// The root without its window: every candidate searched in full, then its noise drawn.
    fn plain_choose(p: &mut Player, board: &mut Board, me: Stone) -> Option<usize> {
        let (cands, _) = candidates(board, me, p.config.width.max(1) * 2);
        if cands.is_empty() {
            return None;
        }
        if let Some(f) = forced(board, me) {
            return Some(f);
        }
        let opp = me.opponent();
        let (mut best, mut best_score) = (None, i32::MIN);
        for &(m, _) in cands.iter().take(p.config.width) {
            board.place_at(m, me);
            let depth = p.config.depth.saturating_sub(1);
            let s = -placing_search(p, board, opp, depth, -WIN * 2, WIN * 2);
            board.remove_at(m);
            let noise = if p.config.noise > 0 {
                below(&mut p.rng, p.config.noise as u32 * 2 + 1) as i32 - p.config.noise
            } else {
                0
            };
            if s.saturating_add(noise) > best_score {
                best_score = s.saturating_add(noise);
                best = Some(m);
            }
        }
        best
    }

    /// The player chooses what the plain root would, on every position of self-play games
    /// of every rule, for both sides, at depths 1 to 3 and several amounts of noise.
    #[test]
    fn the_player_chooses_what_searching_every_candidate_in_full_would() {
        let mut checked = 0;
        for (g, rule) in Rule::ALL.into_iter().enumerate() {
            let mut game = Game::new(Board::new(15, rule).unwrap());
            self_play(&mut game, 50 + g as u64, &PlayerConfig::default(), 70);
            for (k, (depth, noise)) in [(1, 40), (2, 0), (2, 1), (2, 50), (2, 110), (3, 40)]
                .into_iter()
                .enumerate()
            {
                let config = PlayerConfig {
                    depth,
                    width: 8,
                    noise,
                };
                let seed = 7 + k as u64;
                let (mut fast, mut plain) =
                    (Player::new(seed, config.clone()), Player::new(seed, config));
                let mut replay = Game::new(Board::new(15, rule).unwrap());
                for &m in game.moves() {
                    let mut board = replay.board().clone();
                    for me in Stone::ALL {
                        let want = plain_choose(&mut plain, &mut board, me);
                        assert_eq!(
                            fast.choose_at(&mut board, me),
                            want,
                            "{rule:?} {me:?} {depth} {noise}"
                        );
                        checked += 1;
                    }
                    if replay.play(m).is_err() || replay.is_over() {
                        break;
                    }
                }
            }
        }
        assert!(checked > 1_000, "{checked}");
    }

    /// The player's search values every position of self-play games (every rule, both
    /// sides, depths 1 to 3, full and narrow windows) as placing every move would, and its
    /// candidates are the first legal points of a full sort by the quick score.
    #[test]
    fn the_search_values_positions_as_placing_every_move_would() {
        let (mut checked, mut values) = (0, std::collections::BTreeSet::new());
        for (g, rule) in Rule::ALL.into_iter().enumerate() {
            let mut game = Game::new(Board::new(15, rule).unwrap());
            self_play(&mut game, 40 + g as u64, &PlayerConfig::default(), 60);
            let moves = game.moves().to_vec();
            let mut replay = Game::new(Board::new(15, rule).unwrap());
            let mut p = Player::new(1, PlayerConfig::default());
            for m in moves {
                let mut board = replay.board().clone();
                for me in Stone::ALL {
                    let mut full: Vec<u64> = board
                        .empties_near(2)
                        .into_iter()
                        .map(|i| {
                            let s = quick_score(&board, i, me) * 5
                                + quick_score(&board, i, me.opponent()) * 4;
                            best_first_key(s, i as u16)
                        })
                        .collect();
                    full.sort_unstable();
                    let legal: Vec<usize> = full
                        .iter()
                        .map(|&k| best_first_parts(k).1 as usize)
                        .filter(|&i| board.legal_at(i, me))
                        .take(10)
                        .collect();
                    let got: Vec<usize> = candidates(&mut board, me, 10)
                        .0
                        .into_iter()
                        .map(|c| c.0)
                        .collect();
                    // (An empty board's one candidate is its centre.)
                    if board.stones() > 0 {
                        assert_eq!(got, legal, "{rule:?} {me:?} after {}", replay.moves().len());
                    }
                    for depth in 1..=3 {
                        for (alpha, beta) in [(-WIN * 2, WIN * 2), (-50, 50)] {
                            let want = placing_search(&mut p, &mut board, me, depth, alpha, beta);
                            let got = p.search(&mut board, me, depth, (alpha, beta), None);
                            assert_eq!(
                                got, want,
                                "{rule:?} {me:?} depth {depth} ({alpha}, {beta})"
                            );
                            checked += 1;
                            values.insert(got);
                        }
                    }
                }
                if replay.play(m).is_err() || replay.is_over() {
                    break;
                }
            }
        }
        assert!(
            checked > 500 && values.len() > 50,
            "{checked} checked, {} values",
            values.len()
        );
    }

    /// The quick score's tables give what its terms say: per flag 10,000 for a five, 300 for
    /// a four, 200 for a three, 40 for a closed three and 15 for a two; per direction 6 for a
    /// two, 10 for a closed three, 30 for a three of either kind and 50 for a four.
    #[test]
    fn the_quick_score_tables_hold_its_terms() {
        for f in 0..=255u8 {
            let mut want = 0;
            for (k, w) in [
                (threat::FIVE, 10_000),
                (threat::FOUR, 300),
                (threat::THREE, 200),
                (threat::CLOSED_THREE, 40),
                (threat::TWO, 15),
            ] {
                if f & k != 0 {
                    want += w;
                }
            }
            assert_eq!(FLAG_SCORE[f as usize], want, "flags {f:#b}");
        }
        for shape in LineShape::ALL {
            let want = match shape {
                LineShape::Two => 6,
                LineShape::ClosedThree => 10,
                LineShape::BrokenThree | LineShape::Three => 30,
                LineShape::Four => 50,
                _ => 0,
            };
            assert_eq!(SHAPE_SCORE[shape as usize], want, "{shape:?}");
        }
    }

    /// The scored points after a stone, worked out from those before it, are the points and
    /// scores a fresh look gives, on random boards of every rule and three sizes, for stones
    /// of both colours on every empty point (edges included).
    #[test]
    fn the_scored_points_after_a_stone_are_those_a_fresh_look_gives() {
        let mut next = numbers(0x5EED_0005);
        let (mut checked, mut rescored) = (0, 0);
        for round in 0..18 {
            let rule = Rule::ALL[round % 3];
            let size = [9u8, 15, 19][round / 3 % 3];
            let stones = 1 + next(u64::from(size) * 2) as usize;
            let mut b = random_board(&mut next, rule, size, stones);
            let (_, parent) = candidates(&mut b, Stone::Black, 0);
            let empties: Vec<usize> = b.indices().filter(|&i| b.is_empty_at(i)).collect();
            for &r in &empties {
                for a in Stone::ALL {
                    b.place_at(r, a);
                    let mut got = scored_after(&b, &parent, r);
                    let (_, mut want) = candidates(&mut b, a, 0);
                    b.remove_at(r);
                    got.sort_unstable();
                    want.sort_unstable();
                    assert_eq!(got, want, "{rule:?} {size} {a:?} at {}", b.point(r));
                    checked += 1;
                    rescored += usize::from(got.iter().any(|p| !parent.contains(p)));
                }
            }
        }
        assert!(
            checked > 5_000 && rescored > checked / 2,
            "{checked} checked, {rescored} rescored"
        );
    }
}
