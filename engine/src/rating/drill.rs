//! Drill honesty: what a skipped puzzle costs, and which rating band a drill asks for.
//!
//! # Skips
//!
//! Drill is endless, so a player could skip every puzzle that looks hard and keep a flattering
//! rating. The policy ([`skip`]): moving on from a finished puzzle is not a skip; a puzzle
//! that was touched (a move, a hint or a wrong try) and then left counts as failed, as it does
//! in a result code (`Attempt::recorded`); an untouched puzzle may be skipped for free
//! [`FREE_SKIPS_PER_DAY`] times a day (3: for a puzzle already seen elsewhere, a slip of the
//! finger, a position the player does not want to train now), and the page shows how many free
//! skips are left; beyond them a skip counts as failed. A skip that counts is a loss against
//! the puzzle's rating, exactly as if the player had failed it, and goes into the practice
//! history as a failure marked as skipped.
//!
//! # The rating band
//!
//! A drill asks the generator for puzzles rated within a band ([`band`]). The band is centred
//! on the player's rating and is as wide as the rating is uncertain: half-width equal to the
//! rating deviation, but at least [`HALF_WIDTH_MIN`] (100, so that a settled player still
//! meets some variety) and at most [`HALF_WIDTH_MAX`] (300, so that a new player's band still
//! says something). One deviation either side covers about two thirds of where the player's
//! true strength may lie under the Glicko model. The band is then moved inside the range where
//! puzzles of the theme are known to fall (the ratings of the starter library's puzzles of the
//! theme, widened by [`KNOWN_MARGIN`] either side), because the generator finds puzzles far
//! outside that range slowly or not at all: a player far below the range gets its easiest
//! end, one far above its hardest end, and a range narrower than the band is taken whole.
//! The structured [`BandReason`] says which of these happened, with the numbers, so that the
//! page's words can explain the choice in a sentence.

use super::Rating;
use crate::puzzle::attempt::Attempt;

/// Free skips of untouched Drill puzzles per day.
pub const FREE_SKIPS_PER_DAY: u32 = 3;

/// The narrowest half-width of a drill band.
pub const HALF_WIDTH_MIN: u32 = 100;

/// The widest half-width of a drill band.
pub const HALF_WIDTH_MAX: u32 = 300;

/// How far beyond the known ratings of a theme a band may reach.
pub const KNOWN_MARGIN: u32 = 50;

/// The rating scale puzzles live on (the difficulty estimate's clamp).
pub const SCALE_RANGE: (u32, u32) = (600, 2600);

/// What a skip costs.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Skip {
    /// The puzzle was finished: moving on is not a skip.
    NotASkip,
    /// A free skip of an untouched puzzle; `left` free skips remain today after it.
    Free {
        /// Free skips left today.
        left: u32,
    },
    /// The skip counts as a failed attempt (a loss in the rating).
    Counted(SkipReason),
}

/// Why a skip counts.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SkipReason {
    /// The puzzle was touched before it was left.
    Touched,
    /// Today's free skips are used up.
    NoFreeSkips,
}

/// The cost of leaving a Drill puzzle whose attempt stands at `attempt`, when
/// `free_used_today` free skips were already used today.
pub fn skip(attempt: Attempt, free_used_today: u32) -> Skip {
    match attempt {
        Attempt::Clean | Attempt::Helped | Attempt::Failed => Skip::NotASkip,
        Attempt::Trying => Skip::Counted(SkipReason::Touched),
        Attempt::Untried if free_used_today < FREE_SKIPS_PER_DAY => Skip::Free {
            left: FREE_SKIPS_PER_DAY - free_used_today - 1,
        },
        Attempt::Untried => Skip::Counted(SkipReason::NoFreeSkips),
    }
}

/// A drill's rating band and why it is where it is.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Band {
    /// The lowest puzzle rating asked for.
    pub low: u32,
    /// The highest puzzle rating asked for.
    pub high: u32,
    /// Why.
    pub reason: BandReason,
}

/// The numbers behind a band, for a sentence.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BandReason {
    /// The player's rating the band was made for (a default player's if the one given was
    /// unusable).
    pub rating: f64,
    /// Its deviation.
    pub deviation: f64,
    /// The half-width taken from the deviation.
    pub half_width: u32,
    /// The lowest and highest known rating of the theme's puzzles, if any are known.
    pub known: Option<(u32, u32)>,
    /// Where the band sits.
    pub placement: Placement,
}

/// Where a band sits against the player's rating.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Placement {
    /// Centred on the player's rating.
    AroundRating,
    /// At the easy end of the theme's range: the player's rating is below it.
    EasiestKnown,
    /// At the hard end of the theme's range: the player's rating is above it.
    HardestKnown,
    /// The theme's whole range, which is narrower than the band.
    WholeRange,
}

/// The band a drill asks the generator for, for `player` and a theme whose known puzzles are
/// rated `known` (see the module documentation). A player rating that is not usable (see
/// [`Rating::checked`]) counts as a new player's.
pub fn band(player: &Rating, known: &[u32]) -> Band {
    let p = player.checked().unwrap_or_default();
    let half = (p.deviation.round() as u32).clamp(HALF_WIDTH_MIN, HALF_WIDTH_MAX);
    let known_range = known
        .iter()
        .min()
        .zip(known.iter().max())
        .map(|(&a, &b)| (a, b));
    let (lo, hi) = match known_range {
        Some((a, b)) => (
            a.saturating_sub(KNOWN_MARGIN).max(SCALE_RANGE.0),
            b.saturating_add(KNOWN_MARGIN).min(SCALE_RANGE.1),
        ),
        None => SCALE_RANGE,
    };
    let centre = (p.rating.round() as u32).clamp(SCALE_RANGE.0, SCALE_RANGE.1);
    let (low, high, placement) = if lo >= hi || hi - lo <= 2 * half {
        (lo.min(hi), hi.max(lo), Placement::WholeRange)
    } else if centre < lo + half {
        (lo, lo + 2 * half, Placement::EasiestKnown)
    } else if centre > hi - half {
        (hi - 2 * half, hi, Placement::HardestKnown)
    } else {
        (centre - half, centre + half, Placement::AroundRating)
    };
    Band {
        low,
        high,
        reason: BandReason {
            rating: p.rating,
            deviation: p.deviation,
            half_width: half,
            known: known_range,
            placement,
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn skips_follow_the_policy() {
        use Attempt::*;
        assert_eq!(skip(Untried, 0), Skip::Free { left: 2 });
        assert_eq!(skip(Untried, 2), Skip::Free { left: 0 });
        assert_eq!(skip(Untried, 3), Skip::Counted(SkipReason::NoFreeSkips));
        assert_eq!(skip(Untried, 99), Skip::Counted(SkipReason::NoFreeSkips));
        assert_eq!(skip(Trying, 0), Skip::Counted(SkipReason::Touched));
        for a in [Clean, Helped, Failed] {
            assert_eq!(skip(a, 0), Skip::NotASkip);
        }
    }

    fn rated(rating: f64, deviation: f64) -> Rating {
        Rating {
            rating,
            deviation,
            volatility: 0.06,
        }
    }

    #[test]
    fn the_band_follows_rating_and_deviation() {
        // Known range 1100..1650 widened by 50: 1050..1700.
        let known = [1100, 1250, 1400, 1650];
        // A settled player (RD 60) gets the narrowest band, centred on the rating.
        let b = band(&rated(1400.0, 60.0), &known);
        assert_eq!((b.low, b.high), (1300, 1500));
        assert_eq!(b.reason.placement, Placement::AroundRating);
        assert_eq!(b.reason.half_width, 100);
        assert_eq!(b.reason.known, Some((1100, 1650)));
        // Half-width follows the deviation between the limits: RD 180 gives 180 either side.
        let b = band(&rated(1380.0, 180.0), &known);
        assert_eq!((b.low, b.high, b.reason.half_width), (1200, 1560, 180));
        // Far below or above the range: its easy or hard end.
        let b = band(&rated(700.0, 60.0), &known);
        assert_eq!(
            (b.low, b.high, b.reason.placement),
            (1050, 1250, Placement::EasiestKnown)
        );
        let b = band(&rated(2400.0, 60.0), &known);
        assert_eq!(
            (b.low, b.high, b.reason.placement),
            (1500, 1700, Placement::HardestKnown)
        );
        // A new player (RD 350, half-width capped at 300) on this 650-wide range: 600 of it.
        let b = band(&Rating::default(), &known);
        assert_eq!(
            (b.low, b.high, b.reason.placement),
            (1100, 1700, Placement::HardestKnown)
        );
        // A narrow range is taken whole.
        let b = band(&rated(2000.0, 100.0), &[1200, 1300]);
        assert_eq!(
            (b.low, b.high, b.reason.placement),
            (1150, 1350, Placement::WholeRange)
        );
        // Nothing known: the whole scale is open, centred on the rating.
        let b = band(&rated(1500.0, 100.0), &[]);
        assert_eq!((b.low, b.high, b.reason.known), (1400, 1600, None));
    }

    #[test]
    fn unusable_ratings_count_as_a_new_players() {
        let b = band(&rated(f64::NAN, 50.0), &[]);
        assert_eq!((b.low, b.high), (1200, 1800));
        assert_eq!((b.reason.rating, b.reason.deviation), (1500.0, 350.0));
        for r in [-5.0, 0.0, 600.0, 1500.0, 3999.0] {
            for known in [&[][..], &[650, 700][..], &[600, 2600][..], &[2590][..]] {
                let b = band(&rated(r, 80.0), known);
                assert!(
                    b.low <= b.high && b.low >= SCALE_RANGE.0 && b.high <= SCALE_RANGE.1,
                    "{r} {known:?}: {b:?}"
                );
            }
        }
    }
}
