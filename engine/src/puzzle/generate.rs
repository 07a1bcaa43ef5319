//! Puzzle generation from seeded self-play.
//!
//! Games are played by the seeded [`crate::play::Player`] from varied seeded openings; every
//! position from the eighth stone on is a candidate. A candidate is kept when the solver proves
//! that it fits the theme (see [`analyse`]), when it passes the quality filters (nobody has a
//! five to make or to block, no faster win than the theme claims, the stone counts fit the side
//! to move, a unique answer preferred) and when its estimated rating is in the requested band.
//! Positions equal under a symmetry are kept once. The same options give the same puzzles, in
//! the same order, on every platform: all randomness comes from one ChaCha8 stream.

use std::collections::HashSet;
use std::fmt;

use super::difficulty::{self, Features};
use super::{Goal, Puzzle, Theme};
use crate::board::{threat, Board};
use crate::geometry::Point;
use crate::play::{self, Player, PlayerConfig};
use crate::search::{Asking, Budget, Mode, Solver, Verdict};
use crate::types::Rule;
use crate::types::Stone;

/// What to generate.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Options {
    /// The theme of every puzzle.
    pub theme: Theme,
    /// The rule.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// How many puzzles.
    pub count: usize,
    /// The rating band, inclusive.
    pub rating: (u32, u32),
    /// The seed.
    pub seed: u64,
}

/// Why generation could not run or finish.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum GenerateError {
    /// The options are inconsistent; the message says how.
    BadOptions(String),
    /// Not enough puzzles were found within the game limit.
    NotEnough {
        /// Puzzles found.
        found: usize,
        /// Puzzles asked for.
        wanted: usize,
        /// Games played.
        games: u64,
    },
}

impl fmt::Display for GenerateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            GenerateError::BadOptions(m) => f.write_str(m),
            GenerateError::NotEnough {
                found,
                wanted,
                games,
            } => write!(
                f,
                "found only {found} of {wanted} puzzles in {games} games; \
                 widen the rating band or ask for fewer"
            ),
        }
    }
}

impl std::error::Error for GenerateError {}

impl Options {
    /// Checks the options, with a message a user can act on.
    pub fn check(&self) -> Result<(), GenerateError> {
        let bad = |m: String| Err(GenerateError::BadOptions(m));
        if self.count == 0 {
            return bad("count must be at least 1".into());
        }
        if self.count > 5000 {
            return bad(format!(
                "count {} is too many for one set (at most 5000)",
                self.count
            ));
        }
        if !(9..=19).contains(&self.size) {
            return bad(format!(
                "size {} is not supported for puzzles (9 to 19; 15 is usual)",
                self.size
            ));
        }
        if !self.theme.allowed(self.rule) {
            return bad(format!(
                "the theme {} exists only under renju, not {}",
                self.theme, self.rule
            ));
        }
        let (lo, hi) = self.rating;
        if lo > hi {
            return bad(format!("the rating range {lo}-{hi} is backwards"));
        }
        if hi < 600 || lo > 2600 {
            return bad(format!(
                "the rating range {lo}-{hi} lies outside 600-2600, where ratings fall"
            ));
        }
        Ok(())
    }
}

/// Games to play per puzzle asked for before giving up (the forbidden-point themes are rare).
fn games_per_puzzle(theme: Theme) -> u64 {
    match theme {
        Theme::ForbiddenTrap | Theme::ForbiddenWin => 600,
        _ => 150,
    }
}

/// Progress of a generation: puzzles kept and games played so far.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Progress {
    /// Puzzles kept.
    pub kept: usize,
    /// Games played.
    pub games: u64,
}

/// Generates puzzles. `progress` is called after every game.
pub fn generate(
    options: &Options,
    mut progress: impl FnMut(Progress),
) -> Result<Vec<Puzzle>, GenerateError> {
    options.check()?;
    let mut solver = Solver::default();
    let mut rng = play::rng(options.seed);
    let mut seen = HashSet::new();
    let mut out = Vec::new();
    let max_games = games_per_puzzle(options.theme) * options.count as u64 + 50;
    let mut games = 0;
    while out.len() < options.count {
        if games >= max_games {
            return Err(GenerateError::NotEnough {
                found: out.len(),
                wanted: options.count,
                games,
            });
        }
        games += 1;
        let extra = 2 + play::below(&mut rng, 4) as usize;
        let mut game = play::opening(options.size, options.rule, &mut rng, 1 + extra, 50);
        let config = PlayerConfig {
            depth: 2,
            width: 8,
            noise: 50 + play::below(&mut rng, 60) as i32,
        };
        let mut player = Player::new(play::next_seed(&mut rng), config);
        let max_stones = 40 + play::below(&mut rng, 50) as usize;
        while !game.is_over() && game.board().stones() < max_stones && out.len() < options.count {
            if game.board().stones() >= 8 {
                let key = (
                    game.board().canonical_hash(),
                    game.to_move(),
                    game.board().rule(),
                );
                if !seen.contains(&key) {
                    if let Some(p) =
                        analyse(&mut solver, game.board(), game.to_move(), options.theme)
                    {
                        let (lo, hi) = options.rating;
                        // Several correct answers are allowed, but less often.
                        let n = p.first_moves.len() as u32;
                        let keep_shared = play::below(&mut rng, n * n) == 0;
                        if (lo..=hi).contains(&p.rating) && keep_shared {
                            seen.insert(key);
                            out.push(p);
                            // One puzzle per game, so that a set does not repeat one fight.
                            break;
                        }
                    }
                }
            }
            let Some(m) = player.choose(&game) else { break };
            if game.play(m).is_err() {
                break;
            }
        }
        progress(Progress {
            kept: out.len(),
            games,
        });
    }
    Ok(out)
}

/// Decides whether the position, with `to_move` to play, is a puzzle of the theme, and if so
/// makes it (with its proved answers, main line and rating). Every search is asked with
/// [`Budget::GENERATION`]: a puzzle whose proof needs more is not kept.
pub fn analyse(solver: &mut Solver, board: &Board, to_move: Stone, theme: Theme) -> Option<Puzzle> {
    if !theme.allowed(board.rule()) || board.find_winner().is_some() {
        return None;
    }
    // Quality: nobody has a five to make or to block; the counts fit the side to move.
    let them = to_move.opponent();
    if !board.cells_with(to_move, threat::FIVE).is_empty()
        || !board.cells_with(them, threat::FIVE).is_empty()
    {
        return None;
    }
    let counts_fit = match to_move {
        Stone::Black => board.count(Stone::Black) == board.count(Stone::White),
        Stone::White => board.count(Stone::Black) == board.count(Stone::White) + 1,
    };
    if !counts_fit {
        return None;
    }
    let mut ask = solver.ask(Budget::GENERATION);
    match theme.goal() {
        Goal::Win => analyse_win(&mut ask, board, to_move, theme),
        Goal::Defend => analyse_defence(&mut ask, board, to_move),
    }
}

fn analyse_win(ask: &mut Asking, board: &Board, me: Stone, theme: Theme) -> Option<Puzzle> {
    let vcf = ask.solve(board, me, Mode::Vcf);
    let sol = match theme {
        Theme::Vct => {
            if vcf.verdict != Verdict::NoWin {
                return None;
            }
            let vct = ask.solve(board, me, Mode::Vct);
            if vct.verdict != Verdict::Win || vct.depth < 1 {
                return None;
            }
            vct
        }
        _ => {
            if vcf.verdict != Verdict::Win {
                return None;
            }
            vcf
        }
    };
    let mode = theme.mode();
    let depth = sol.depth;
    let first = *sol.line.first()?;
    match theme {
        Theme::FourThree => {
            let t = board.threats(first, me);
            if depth != 2 || !(t.fours() == 1 && t.threes() >= 1) {
                return None;
            }
        }
        Theme::Vcf => {
            if depth < 3 {
                return None;
            }
        }
        Theme::ForbiddenTrap => {
            if me != Stone::White || depth < 1 || !ends_on_forbidden_point(board, &sol.line) {
                return None;
            }
        }
        Theme::ForbiddenWin => {
            if me != Stone::Black || depth < 2 || !has_forbidden_four(board) {
                return None;
            }
        }
        Theme::Vct | Theme::Defend => {}
    }
    // More than three correct answers make a poor puzzle: stop counting there.
    let wins = ask.winning_moves_up_to(board, me, mode, 3);
    if !wins.unknown.is_empty() || wins.proved.is_empty() || wins.proved.len() > 3 {
        return None;
    }
    let mut first_moves = wins.proved.clone();
    first_moves.sort_by_key(|p| (p.y, p.x));
    let features = Features {
        length: depth as u32,
        tempting: (wins.tried.saturating_sub(wins.proved.len())) as u32,
        branching: ask.line_branching(board, me, mode, &sol.line),
        counter_fours: counter_four_traps(board, me),
        spread: spread(&sol.line),
        answers: first_moves.len() as u32,
    };
    Some(make(
        board,
        me,
        theme,
        first_moves,
        sol.line,
        depth,
        &features,
    ))
}

fn analyse_defence(ask: &mut Asking, board: &Board, me: Stone) -> Option<Puzzle> {
    // First the threat (cheap when it is a VCF), then the player's own chances, then the
    // defences, which cost one search per candidate.
    let threat = match ask.threat(board, me, Mode::Vcf) {
        t if t.verdict == Verdict::Win => t,
        t if t.verdict == Verdict::NoWin => {
            // Threats with threes: keep them shallow, so that the defence can be found by a
            // player (and proved quickly).
            if board.stones() < 14 {
                return None;
            }
            let t = ask.threat(board, me, Mode::Vct);
            if t.verdict != Verdict::Win || t.depth > 2 {
                return None;
            }
            t
        }
        _ => return None,
    };
    // The player must not have a win of its own: then the puzzle would not be about defending.
    for mode in [Mode::Vcf, Mode::Vct] {
        if ask.solve(board, me, mode).verdict != Verdict::NoWin {
            return None;
        }
    }
    // At most three defences, all proved: stop trying as soon as that fails.
    let d = ask.defences_up_to(board, me, Mode::Vct, 3);
    if d.threat != Verdict::Win || !d.moves.unknown.is_empty() {
        return None;
    }
    let n = d.moves.proved.len();
    if !(1..=3).contains(&n) {
        return None;
    }
    let mut first_moves = d.moves.proved.clone();
    first_moves.sort_by_key(|p| (p.y, p.x));
    let features = Features {
        length: threat.depth as u32 + 1,
        tempting: d.moves.tried.saturating_sub(n) as u32,
        branching: 0,
        counter_fours: 0,
        spread: spread(&threat.line),
        answers: n as u32,
    };
    Some(make(
        board,
        me,
        Theme::Defend,
        first_moves,
        threat.line,
        threat.depth,
        &features,
    ))
}

fn make(
    board: &Board,
    me: Stone,
    theme: Theme,
    first_moves: Vec<Point>,
    line: Vec<Point>,
    length: u16,
    f: &Features,
) -> Puzzle {
    let key = board.canonical_hash()
        ^ (me.index() as u64).wrapping_mul(0x9E37_79B9_7F4A_7C15)
        ^ (board.rule() as u64 + 1).wrapping_mul(0xC2B2_AE3D_27D4_EB4F);
    Puzzle {
        id: format!("{}-{:012x}", short(theme), key >> 16),
        rule: board.rule(),
        size: board.size(),
        to_move: me,
        black: board.stones_of(Stone::Black),
        white: board.stones_of(Stone::White),
        theme,
        first_moves,
        line,
        length,
        rating: difficulty::rating(theme, f),
    }
}

fn short(theme: Theme) -> &'static str {
    match theme {
        Theme::FourThree => "ft",
        Theme::Vcf => "vf",
        Theme::Vct => "vt",
        Theme::Defend => "df",
        Theme::ForbiddenTrap => "tp",
        Theme::ForbiddenWin => "fw",
    }
}

/// Mean king-move distance between consecutive attacker moves of a line.
fn spread(line: &[Point]) -> f64 {
    let attacker: Vec<Point> = line.iter().step_by(2).copied().collect();
    if attacker.len() < 2 {
        return 0.0;
    }
    let total: u32 = attacker
        .windows(2)
        .map(|w| {
            let dx = (w[0].x as i32 - w[1].x as i32).unsigned_abs();
            let dy = (w[0].y as i32 - w[1].y as i32).unsigned_abs();
            dx.max(dy)
        })
        .sum();
    total as f64 / (attacker.len() - 1) as f64
}

/// Root fours of `me` whose forced block gives the defender a four.
fn counter_four_traps(board: &Board, me: Stone) -> u32 {
    let mut b = board.clone();
    let them = me.opponent();
    let fours: Vec<usize> = b.cells_with(me, threat::FOUR).iter().collect();
    let mut n = 0;
    for c in fours {
        if !b.legal_at(c, me) {
            continue;
        }
        b.place_at(c, me);
        let fives = *b.cells_with(me, threat::FIVE);
        if fives.len() == 1 {
            let blk = fives.first().unwrap_or(0);
            if b.flags_at(blk, them) & threat::FOUR != 0 {
                n += 1;
            }
        }
        b.remove_at(c);
    }
    n
}

/// Whether the main line ends with black unable to block because the point is forbidden.
fn ends_on_forbidden_point(board: &Board, line: &[Point]) -> bool {
    let Some((&five, rest)) = line.split_last() else {
        return false;
    };
    let mut b = board.clone();
    let mut side = Stone::White;
    for &p in rest {
        b.place(p, side);
        side = side.opponent();
    }
    // Black's last move was not the block: the five point is forbidden for black.
    rest.last().is_some_and(|&last| last != five) && b.forbidden(five).is_some()
}

/// Whether black has a four point that is forbidden (a tempting move black may not play).
fn has_forbidden_four(board: &Board) -> bool {
    let mut b = board.clone();
    let fours: Vec<usize> = b.cells_with(Stone::Black, threat::FOUR).iter().collect();
    fours
        .into_iter()
        .any(|c| b.flags_at(c, Stone::Black) & threat::FIVE == 0 && b.forbidden_at(c).is_some())
}
