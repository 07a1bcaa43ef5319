//! Seeded middle-game positions on small boards for the solver checks.
//!
//! Two kinds, under the three rules in turn (freestyle, standard, renju):
//! * three in four are random stones: 8 to 24 of them, black and white alternating (so black
//!   has as many stones as white or one more, and the side to move follows from the counts),
//!   each point drawn from a distribution weighted to the centre (the mean of two uniform
//!   draws per coordinate, a triangle peaking in the middle), taken points drawn again;
//! * one in four is a position from a seeded self-play game of the engine's club-strength
//!   player (`engine::play::self_play`), stopped after 8 to 27 moves.
//!
//! A position is kept only if nobody has a five on the board, the side to move cannot make
//! five at once (that is no puzzle), and it does not face two fives of the opponent (that is
//! lost at once); facing one five, which must be blocked, is kept. All of this is decided by
//! the referee's own scans, not by the engine. The same seed always gives the same positions
//! (ChaCha8 through `engine::play::rng`).

use engine::play::{self, below, PlayerConfig};
use engine::{Board, Game, Point, Rule, Stone};

use crate::referee::Referee;

/// One test position.
pub struct Sample {
    /// The position.
    pub board: Board,
    /// The side to move, which is the attacker in the checks.
    pub to_move: Stone,
    /// Where it came from, for messages: the seed, the kind and the index.
    pub label: String,
}

/// Whether the referee accepts the position (see the module notes).
fn acceptable(board: &Board, to_move: Stone) -> bool {
    let r = Referee::of(board);
    r.winner().is_none()
        && r.five_points(to_move).is_empty()
        && r.five_points(to_move.opponent()).len() < 2
}

fn random_stones(draw: &mut dyn FnMut(u32) -> u32, size: u8, rule: Rule) -> (Board, Stone) {
    let mut b = Board::new(size, rule).expect("a valid size");
    let stones = 8 + draw(17);
    let n = u32::from(size);
    let mut colour = Stone::Black;
    let mut placed = 0;
    while placed < stones {
        let x = (draw(n) + draw(n)) / 2;
        let y = (draw(n) + draw(n)) / 2;
        let q = Point::new(x as u8, y as u8);
        if b.get(q).is_none() {
            b.place(q, colour);
            colour = colour.opponent();
            placed += 1;
        }
    }
    (b, colour)
}

fn self_play_position(draw: &mut dyn FnMut(u32) -> u32, size: u8, rule: Rule) -> (Board, Stone) {
    let mut g = Game::new(Board::new(size, rule).expect("a valid size"));
    let moves = 8 + draw(20) as usize;
    let seed = u64::from(draw(u32::MAX));
    let config = PlayerConfig {
        depth: 1,
        width: 8,
        noise: 60,
    };
    play::self_play(&mut g, seed, &config, moves);
    (g.board().clone(), g.to_move())
}

/// `count` accepted positions on `size` x `size` boards from `seed`.
pub fn positions(seed: u64, count: usize, size: u8) -> Vec<Sample> {
    let mut rng = play::rng(seed);
    let mut draw = |n: u32| below(&mut rng, n);
    let mut out = Vec::with_capacity(count);
    let mut tried = 0usize;
    while out.len() < count {
        let i = out.len();
        let rule = Rule::ALL[i % 3];
        let from_play = i % 4 == 3;
        let (board, to_move) = if from_play {
            self_play_position(&mut draw, size, rule)
        } else {
            random_stones(&mut draw, size, rule)
        };
        tried += 1;
        assert!(
            tried < count * 20,
            "the generator rejects almost everything"
        );
        if acceptable(&board, to_move) {
            out.push(Sample {
                board,
                to_move,
                label: format!(
                    "seed {seed} #{i} ({rule}, {}, {to_move} to move)",
                    if from_play { "self-play" } else { "random" }
                ),
            });
        }
    }
    out
}
