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

use crate::board::{threat, Board};
use crate::geometry::{best_first_key, best_first_parts, sort_keys, Point};
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
        let cands = candidates(board, me, self.config.width.max(1) * 2);
        if cands.is_empty() {
            return None;
        }
        // Forced moves first: a five, then a block of the opponent's five.
        if let Some(f) = board.cells_with(me, threat::FIVE).first() {
            return Some(f);
        }
        let opp = me.opponent();
        if let Some(b) = board.cells_with(opp, threat::FIVE).first() {
            if board.legal_at(b, me) {
                return Some(b);
            }
        }
        let mut best = None;
        let mut best_score = i32::MIN;
        for &(m, _) in cands.iter().take(self.config.width) {
            board.place_at(m, me);
            let s = -self.search(
                board,
                opp,
                self.config.depth.saturating_sub(1),
                -WIN * 2,
                WIN * 2,
            );
            board.remove_at(m);
            let noise = if self.config.noise > 0 {
                below(&mut self.rng, self.config.noise as u32 * 2 + 1) as i32 - self.config.noise
            } else {
                0
            };
            let s = s.saturating_add(noise);
            if s > best_score {
                best_score = s;
                best = Some(m);
            }
        }
        best
    }

    /// Negamax alpha-beta from the view of `me`, to move.
    fn search(
        &mut self,
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
            candidates(board, me, self.config.width)
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
            let s = -self.search(board, opp, depth - 1, -beta, -alpha);
            board.remove_at(m);
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

/// The value of a position for `me`, to move, from the threat shapes of both sides.
pub fn evaluate(board: &Board, me: Stone) -> i32 {
    let opp = me.opponent();
    if !board.cells_with(me, threat::FIVE).is_empty() {
        return WIN / 2;
    }
    let count = |c: Stone, k: u8| board.cells_with(c, k).len() as i32;
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

/// Legal empty points near the stones, best by a quick score first (at most `n`).
fn candidates(board: &mut Board, me: Stone, n: usize) -> Vec<(usize, i32)> {
    let opp = me.opponent();
    let mut out: Vec<(usize, i32)> = Vec::new();
    if board.stones() == 0 {
        out.push((
            board.index(Point::new(board.width() / 2, board.height() / 2)),
            1,
        ));
    }
    for i in board.empties_near(2) {
        let s = quick_score(board, i, me) * 5 + quick_score(board, i, opp) * 4;
        out.push((i, s));
    }
    sort_keys(
        &mut out,
        |&(i, s)| best_first_key(s, i as u16),
        |k| {
            let (s, i) = best_first_parts(k);
            (i as usize, s)
        },
    );
    let mut kept = Vec::with_capacity(n);
    for c in out {
        if kept.len() >= n {
            break;
        }
        if board.legal_at(c.0, me) {
            kept.push(c);
        }
    }
    kept
}

fn quick_score(board: &Board, i: usize, c: Stone) -> i32 {
    let f = board.flags_at(i, c);
    let mut s = 0;
    if f & threat::FIVE != 0 {
        s += 10_000;
    }
    if f & threat::FOUR != 0 {
        s += 300;
    }
    if f & threat::THREE != 0 {
        s += 200;
    }
    if f & threat::CLOSED_THREE != 0 {
        s += 40;
    }
    if f & threat::TWO != 0 {
        s += 15;
    }
    for d in 0..4 {
        let shape = board.shape_at(i, c, d);
        s += match shape {
            crate::patterns::LineShape::Two => 6,
            crate::patterns::LineShape::ClosedThree => 10,
            crate::patterns::LineShape::BrokenThree | crate::patterns::LineShape::Three => 30,
            crate::patterns::LineShape::Four => 50,
            _ => 0,
        };
    }
    s
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
}
