//! Player ratings: the Glicko-2 system (M. E. Glickman, "Example of the Glicko-2 system",
//! 2013), on the Glicko scale where 1500 is an average player. A solved puzzle counts as a win
//! against a player of the puzzle's rating, a failed one as a loss.

/// The system constant tau, which limits how fast the volatility moves (0.3 to 1.2 in the
/// paper; 0.5 is its example).
pub const TAU: f64 = 0.5;

/// The Glicko-2 scale factor (173.7178 in the paper).
const SCALE: f64 = 173.7178;

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
        Rating {
            rating: 1500.0,
            deviation: 350.0,
            volatility: 0.06,
        }
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

fn g(phi: f64) -> f64 {
    1.0 / (1.0 + 3.0 * phi * phi / (std::f64::consts::PI * std::f64::consts::PI)).sqrt()
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
            let e = 1.0 / (1.0 + (-gj * (mu - mu_j)).exp());
            v_inv += gj * gj * e * (1.0 - e);
            delta_sum += gj * (game.score - e);
        }
        let v = 1.0 / v_inv;
        let delta = v * delta_sum;
        // Step 5: the new volatility, by the Illinois algorithm.
        let a = (sigma * sigma).ln();
        let f = |x: f64| {
            let ex = x.exp();
            ex * (delta * delta - phi * phi - v - ex) / (2.0 * (phi * phi + v + ex).powi(2))
                - (x - a) / (TAU * TAU)
        };
        let mut big_a = a;
        let mut big_b = if delta * delta > phi * phi + v {
            (delta * delta - phi * phi - v).ln()
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
        let sigma_new = (big_a / 2.0).exp();
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
    /// Puzzles are taken to have a deviation of 100.
    pub fn after_puzzle(self, puzzle_rating: f64, solved: bool) -> Rating {
        self.update(&[Encounter {
            rating: puzzle_rating,
            deviation: 100.0,
            score: if solved { 1.0 } else { 0.0 },
        }])
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

    #[test]
    fn solving_raises_and_failing_lowers() {
        let r = Rating::default();
        assert!(r.after_puzzle(1500.0, true).rating > 1500.0);
        assert!(r.after_puzzle(1500.0, false).rating < 1500.0);
        assert!(r.update(&[]).deviation >= r.deviation.min(350.0) - 1e-9);
    }
}
