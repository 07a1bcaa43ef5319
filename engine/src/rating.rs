//! Ratings: the Glicko-2 system (M. E. Glickman, "Example of the Glicko-2 system", 2013), on
//! the Glicko scale where 1500 is an average player, for players and for puzzles.
//!
//! An attempt is a game between the player and the puzzle. A solved puzzle is a win for the
//! player and a loss for the puzzle; a failed one the other way round. Both sides are rated
//! ([`rate_attempt`]): the player's rating moves as usual, and the puzzle's rating, which
//! starts at the generator's difficulty estimate with a wide deviation ([`Rating::puzzle`]),
//! moves towards the strength of the players who solve or fail it. So a puzzle the estimate
//! rated too easy becomes harder as players fail it, and a player's rating is measured against
//! puzzle ratings that players' results keep honest. Each attempt is one rating period with one
//! game; the two updates use each other's ratings from before the attempt, as the system's
//! simultaneous updates within a period do.
//!
//! The Drill screen's honesty rules (skips, the choice of rating band) are in [`drill`].
//!
//! The transcendental functions come from `libm` (a pure-Rust port of musl's), so that a rating
//! computed in the browser and one computed natively are the same to the last bit.

pub mod drill;

/// The system constant tau, which limits how fast the volatility moves (0.3 to 1.2 in the
/// paper; 0.5 is its example).
pub const TAU: f64 = 0.5;

/// The Glicko-2 scale factor (173.7178 in the paper).
const SCALE: f64 = 173.7178;

/// The deviation [`Rating::after_puzzle`] assumes for every puzzle.
pub const PUZZLE_DEVIATION: f64 = 100.0;

/// The deviation of a puzzle's rating before anyone has tried it: the difficulty estimate is a
/// first guess (see `puzzle::difficulty`), so it starts as uncertain as a player with a few
/// games behind them (our choice; the paper starts unknown players at 350).
pub const PUZZLE_START_DEVIATION: f64 = 200.0;

/// A new player's rating, deviation and volatility (the paper's defaults).
const START: Rating = Rating {
    rating: 1500.0,
    deviation: 350.0,
    volatility: 0.06,
};

/// A rating with its deviation and volatility.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rating {
    /// The rating, 1500 for a new player.
    pub rating: f64,
    /// The rating deviation (uncertainty), 350 for a new player.
    pub deviation: f64,
    /// The volatility, 0.06 for a new player.
    pub volatility: f64,
}

impl Default for Rating {
    fn default() -> Self {
        START
    }
}

/// One encounter of a rating period (a game, or a puzzle tried): the opponent's rating and
/// deviation, and the score (1 win, 0.5 draw, 0 loss).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Encounter {
    /// The opponent's rating.
    pub rating: f64,
    /// The opponent's rating deviation.
    pub deviation: f64,
    /// The score.
    pub score: f64,
}

impl Encounter {
    /// The player's game in an attempt at a puzzle rated `puzzle`: a win if solved.
    pub fn against_puzzle(puzzle: &Rating, solved: bool) -> Encounter {
        Encounter {
            rating: puzzle.rating,
            deviation: puzzle.deviation,
            score: if solved { 1.0 } else { 0.0 },
        }
    }

    /// The puzzle's game in an attempt by a player rated `player`: a win if the player failed.
    pub fn against_player(player: &Rating, solved: bool) -> Encounter {
        Encounter {
            rating: player.rating,
            deviation: player.deviation,
            score: if solved { 0.0 } else { 1.0 },
        }
    }
}

fn g(phi: f64) -> f64 {
    1.0 / (1.0 + 3.0 * phi * phi / (std::f64::consts::PI * std::f64::consts::PI)).sqrt()
}

fn exp(x: f64) -> f64 {
    libm::exp(x)
}

fn ln(x: f64) -> f64 {
    libm::log(x)
}

/// One attempt, rated both ways: the player's and the puzzle's ratings after it, each updated
/// from the other's rating before it.
pub fn rate_attempt(player: Rating, puzzle: Rating, solved: bool) -> (Rating, Rating) {
    (
        player.update(&[Encounter::against_puzzle(&puzzle, solved)]),
        puzzle.update(&[Encounter::against_player(&player, solved)]),
    )
}

impl Rating {
    /// The rating after one rating period with the given games (Glicko-2, steps 1 to 8). With no
    /// games only the deviation grows.
    pub fn update(self, games: &[Encounter]) -> Rating {
        let mu = (self.rating - 1500.0) / SCALE;
        let phi = self.deviation / SCALE;
        let sigma = self.volatility;
        if games.is_empty() {
            let phi_star = (phi * phi + sigma * sigma).sqrt();
            return Rating {
                deviation: (phi_star * SCALE).min(350.0),
                ..self
            };
        }
        // Step 3 and 4: the estimated variance and improvement.
        let mut v_inv = 0.0;
        let mut delta_sum = 0.0;
        for game in games {
            let mu_j = (game.rating - 1500.0) / SCALE;
            let phi_j = game.deviation / SCALE;
            let gj = g(phi_j);
            let e = 1.0 / (1.0 + exp(-gj * (mu - mu_j)));
            v_inv += gj * gj * e * (1.0 - e);
            delta_sum += gj * (game.score - e);
        }
        let v = 1.0 / v_inv;
        let delta = v * delta_sum;
        // Step 5: the new volatility, by the Illinois algorithm.
        let a = ln(sigma * sigma);
        let f = |x: f64| {
            let ex = exp(x);
            ex * (delta * delta - phi * phi - v - ex) / (2.0 * (phi * phi + v + ex).powi(2))
                - (x - a) / (TAU * TAU)
        };
        let mut big_a = a;
        let mut big_b = if delta * delta > phi * phi + v {
            ln(delta * delta - phi * phi - v)
        } else {
            let mut k = 1.0;
            while f(a - k * TAU) < 0.0 {
                k += 1.0;
            }
            a - k * TAU
        };
        let mut fa = f(big_a);
        let mut fb = f(big_b);
        for _ in 0..100 {
            if (big_b - big_a).abs() <= 1e-6 {
                break;
            }
            let c = big_a + (big_a - big_b) * fa / (fb - fa);
            let fc = f(c);
            if fc * fb <= 0.0 {
                big_a = big_b;
                fa = fb;
            } else {
                fa /= 2.0;
            }
            big_b = c;
            fb = fc;
        }
        let sigma_new = exp(big_a / 2.0);
        // Steps 6 to 8.
        let phi_star = (phi * phi + sigma_new * sigma_new).sqrt();
        let phi_new = 1.0 / (1.0 / (phi_star * phi_star) + 1.0 / v).sqrt();
        let mu_new = mu + phi_new * phi_new * delta_sum;
        Rating {
            rating: 1500.0 + SCALE * mu_new,
            deviation: (SCALE * phi_new).min(350.0),
            volatility: sigma_new,
        }
    }

    /// The rating after one puzzle: a win against the puzzle's rating if solved, a loss if not.
    /// Puzzles are taken to have a deviation of [`PUZZLE_DEVIATION`]; [`rate_attempt`] rates
    /// against the puzzle's own rating and deviation and moves both.
    pub fn after_puzzle(self, puzzle_rating: f64, solved: bool) -> Rating {
        self.update(&[Encounter {
            rating: puzzle_rating,
            deviation: PUZZLE_DEVIATION,
            score: if solved { 1.0 } else { 0.0 },
        }])
    }

    /// A puzzle's rating before anyone has tried it: its difficulty estimate, with deviation
    /// [`PUZZLE_START_DEVIATION`] and the paper's starting volatility.
    pub fn puzzle(estimate: u32) -> Rating {
        Rating {
            rating: f64::from(estimate),
            deviation: PUZZLE_START_DEVIATION,
            volatility: START.volatility,
        }
    }

    /// The rating if it is usable (finite, rating 0 to 4000, deviation above 0 up to 350,
    /// volatility above 0 up to 1), for ratings read from storage or a page; otherwise `None`.
    pub fn checked(self) -> Option<Rating> {
        let ok = |x: f64, lo: f64, hi: f64| x.is_finite() && x >= lo && x <= hi;
        (ok(self.rating, 0.0, 4000.0)
            && ok(self.deviation, f64::MIN_POSITIVE, 350.0)
            && ok(self.volatility, f64::MIN_POSITIVE, 1.0))
        .then_some(self)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // The worked example of M. E. Glickman, "Example of the Glicko-2 system" (2013): a player
    // at 1500 (RD 200, volatility 0.06) beats a 1400 (RD 30) and loses to a 1550 (RD 100) and a
    // 1700 (RD 300); with tau 0.5 the paper gets 1464.06, RD 151.52, volatility 0.05999.
    #[test]
    fn glickmans_worked_example() {
        let player = Rating {
            rating: 1500.0,
            deviation: 200.0,
            volatility: 0.06,
        };
        let games = [
            Encounter {
                rating: 1400.0,
                deviation: 30.0,
                score: 1.0,
            },
            Encounter {
                rating: 1550.0,
                deviation: 100.0,
                score: 0.0,
            },
            Encounter {
                rating: 1700.0,
                deviation: 300.0,
                score: 0.0,
            },
        ];
        let r = player.update(&games);
        assert!((r.rating - 1464.06).abs() < 0.01, "{r:?}");
        assert!((r.deviation - 151.52).abs() < 0.01, "{r:?}");
        assert!((r.volatility - 0.05999).abs() < 0.00001, "{r:?}");
    }

    // The same example with the puzzle in the player's place (the system is symmetric): a
    // puzzle rated 1500 (RD 200, volatility 0.06) is failed by a player rated 1400 (RD 30), so
    // the puzzle wins, and solved by players rated 1550 (RD 100) and 1700 (RD 300), so it
    // loses; it ends at 1464.06, RD 151.52, volatility 0.05999 (Mark E. Glickman, "Example of
    // the Glicko-2 system", 2013).
    #[test]
    fn glickmans_worked_example_for_a_puzzle() {
        let puzzle = Rating {
            rating: 1500.0,
            deviation: 200.0,
            volatility: 0.06,
        };
        let player = |rating: f64, deviation: f64| Rating {
            rating,
            deviation,
            volatility: 0.06,
        };
        let games = [
            Encounter::against_player(&player(1400.0, 30.0), false),
            Encounter::against_player(&player(1550.0, 100.0), true),
            Encounter::against_player(&player(1700.0, 300.0), true),
        ];
        let r = puzzle.update(&games);
        assert!((r.rating - 1464.06).abs() < 0.01, "{r:?}");
        assert!((r.deviation - 151.52).abs() < 0.01, "{r:?}");
        assert!((r.volatility - 0.05999).abs() < 0.00001, "{r:?}");
        // One attempt, both ways: the example's first game seen from each side.
        let (p, q) = rate_attempt(player(1400.0, 30.0), puzzle, false);
        assert!(p.rating < 1400.0 && q.rating > 1500.0, "{p:?} {q:?}");
    }

    // With equal deviations and volatilities the two sides of an attempt are mirror images:
    // the expected scores are E and 1 - E with the same g(phi), so what the player gains the
    // puzzle loses (derived from steps 3 to 7 of the paper). This holds for the uncapped
    // update; both deviations here stay below 350.
    #[test]
    fn an_attempt_moves_both_sides_by_the_same_amount() {
        for (r1, r2, rd, solved) in [
            (1500.0, 1500.0, 120.0, true),
            (1320.0, 1710.0, 80.0, false),
            (1900.0, 1250.0, 200.0, true),
        ] {
            let player = Rating {
                rating: r1,
                deviation: rd,
                volatility: 0.06,
            };
            let puzzle = Rating {
                rating: r2,
                ..player
            };
            let (p, q) = rate_attempt(player, puzzle, solved);
            assert!(
                ((p.rating - r1) + (q.rating - r2)).abs() < 1e-9,
                "{p:?} {q:?}"
            );
            assert!((p.deviation - q.deviation).abs() < 1e-9);
            assert_eq!((p.rating > r1), solved);
        }
    }

    #[test]
    fn ratings_from_outside_are_checked() {
        assert_eq!(Rating::default().checked(), Some(Rating::default()));
        let p = Rating::puzzle(1250);
        assert_eq!((p.rating, p.deviation), (1250.0, PUZZLE_START_DEVIATION));
        for bad in [
            Rating {
                rating: f64::NAN,
                ..p
            },
            Rating {
                deviation: 0.0,
                ..p
            },
            Rating {
                deviation: 351.0,
                ..p
            },
            Rating {
                volatility: f64::INFINITY,
                ..p
            },
        ] {
            assert_eq!(bad.checked(), None, "{bad:?}");
        }
    }

    #[test]
    fn solving_raises_and_failing_lowers() {
        let r = Rating::default();
        assert!(r.after_puzzle(1500.0, true).rating > 1500.0);
        assert!(r.after_puzzle(1500.0, false).rating < 1500.0);
        assert!(r.update(&[]).deviation >= r.deviation.min(350.0) - 1e-9);
    }
}
