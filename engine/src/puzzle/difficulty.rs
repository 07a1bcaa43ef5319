//! The difficulty estimate: a rating on the Glicko scale (1500 is an average club player) from
//! features of the proof.
//!
//! The formula is an estimate, to be calibrated against players' results:
//!
//! ```text
//! rating = base(theme)
//!        + depth(n)
//!        +  25 * min(tempting forcing moves that fail, 12)
//!        +  45 * defender replies beyond the first, summed over the main line (at most 10)
//!        +  70 * counter-four traps (at most 4)
//!        +  10 * spread (mean king-move distance between consecutive attacker moves)
//!        - 160 * log2(correct first moves)
//! ```
//!
//! clamped to 600..=2600, where `n` is the attacker's moves in the main line before the winning
//! move (fours and threats alike; for a defence, the opponent's threat's moves plus one) and
//!
//! ```text
//! depth(n) = 110 * (n - 1)               for n <= 6
//!          = 550 + 60 * (n - 6)          for n > 6
//! ```
//!
//! (each of the first moves of a line adds much; past six, each further forced move adds a
//! steady 60, so that a 10-four VCF rates about 1850 and a 20-four one about 2450 before the
//! other terms), with `base` 1050 for a four-three, 1100 for a VCF, 1250 for a VCT, 1250 for a
//! defence, 1400 for a forbidden-point trap and 1350 for a win past forbidden points.
//! A longer line, more plausible moves that fail, a defender with more ways to resist, traps in
//! which a block makes a four, and moves far apart all make a puzzle harder; several correct
//! answers make it easier.

use super::Theme;

/// What the estimate is computed from.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Features {
    /// Attacker moves in the main line before the five (for a defence: the threat's).
    pub length: u32,
    /// Forcing moves the attacker could try at the start that do not win.
    pub tempting: u32,
    /// Defender replies beyond the first at the defender's turns of the main line, summed.
    pub branching: u32,
    /// Root forcing moves whose forced reply gives the defender a four.
    pub counter_fours: u32,
    /// Mean king-move distance between consecutive attacker moves of the main line.
    pub spread: f64,
    /// Correct first moves (at least 1).
    pub answers: u32,
}

/// The base rating of a theme.
pub const fn base(theme: Theme) -> f64 {
    match theme {
        Theme::FourThree => 1050.0,
        Theme::Vcf => 1100.0,
        Theme::Vct => 1250.0,
        Theme::Defend => 1250.0,
        Theme::ForbiddenTrap => 1400.0,
        Theme::ForbiddenWin => 1350.0,
    }
}

/// The length term: 110 per attacker move up to six, 60 per move after that.
pub fn depth(moves: u32) -> f64 {
    let n = moves.max(1) as f64;
    if n <= 6.0 {
        110.0 * (n - 1.0)
    } else {
        550.0 + 60.0 * (n - 6.0)
    }
}

/// The lowest rating the estimate gives.
pub const FLOOR: u32 = 600;
/// The highest rating the estimate gives.
pub const CEILING: u32 = 2600;

/// The estimated rating.
pub fn rating(theme: Theme, f: &Features) -> u32 {
    let r = base(theme)
        + depth(f.length)
        + 25.0 * f.tempting.min(12) as f64
        + 45.0 * f.branching.min(10) as f64
        + 70.0 * f.counter_fours.min(4) as f64
        + 10.0 * f.spread
        - 160.0 * (f.answers.max(1) as f64).log2();
    r.round().clamp(f64::from(FLOOR), f64::from(CEILING)) as u32
}

/// The fewest of a puzzle's correct answers with which it would still rate at most `top`,
/// the others then counting as tempting moves that fail (fewer answers rate higher): 1 when
/// it rates at most `top` with one answer, [`Features::answers`] at most (the puzzle's own
/// rating, if that is at most `top`).
pub fn fewest_answers(theme: Theme, f: &Features, top: u32) -> u32 {
    let n = f.answers.max(1);
    let tried = f.tempting + n;
    (1..n)
        .find(|&k| rating(theme, &answering(f, tried, k)) <= top)
        .unwrap_or(n)
}

/// `known` as the features of a puzzle whose `tried` first moves hold `answers` correct
/// ones, the others being tempting moves that fail.
pub(super) fn answering(known: &Features, tried: u32, answers: u32) -> Features {
    Features {
        answers,
        tempting: tried.saturating_sub(answers),
        ..*known
    }
}

/// Whether a win puzzle with these features could still rate within `band` once its answers
/// are proved: `tried` first moves will be tried, and a kept puzzle has one to three correct
/// ones (the generator keeps no more), each of which is a tried move that is not tempting.
/// Exact: it is the estimate itself for every count of answers still possible, so a
/// candidate it refuses is one the band would refuse after the proofs (the generator asks it
/// before the proofs of the answers, three quarters of a banded generation's time).
pub fn may_rate_within(theme: Theme, known: &Features, tried: u32, band: (u32, u32)) -> bool {
    if tried == 0 {
        // A five on the board: its answers are the fives, not tried moves.
        return true;
    }
    (1..=tried.min(3)).any(|answers| {
        (band.0..=band.1).contains(&rating(theme, &answering(known, tried, answers)))
    })
}

/// [`may_rate_within`] before the number of first moves to try is known: whether some number
/// of them could still give a rating within `band`. Past 15 tried moves nothing changes (at
/// most three answers, and the tempting moves count up to 12). A defence puzzle knows its
/// threat's line before its candidate defences, and the line's own chances and the
/// defences are the dear part.
pub fn may_rate_within_some(theme: Theme, known: &Features, band: (u32, u32)) -> bool {
    (1..=15).any(|tried| may_rate_within(theme, known, tried, band))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The early refusal of a banded generation never refuses a puzzle the band would take:
    /// for every kept puzzle (one to three answers, the other tried moves tempting) whose
    /// rating is in the band, the features known before the proofs say it may be, and so do
    /// they before the number of tried moves is known. And both refuse, the first more: a
    /// long threat line cannot make a club-level puzzle.
    #[test]
    fn the_early_band_check_refuses_only_what_the_band_would() {
        let bands = [
            (600, 2600),
            (1200, 1600),
            (1250, 1750),
            (600, 1450),
            (1451, 2600),
            (1800, 2400),
        ];
        let (mut refused, mut refused_early) = (0, 0);
        for theme in Theme::ALL {
            for length in 1..=20 {
                for branching in [0, 3, 10] {
                    for counter_fours in [0, 2] {
                        for spread in [0.0, 2.5, 6.0] {
                            let known = Features {
                                length,
                                branching,
                                counter_fours,
                                spread,
                                ..Default::default()
                            };
                            for tried in 1..=16 {
                                for band in bands {
                                    let may = may_rate_within(theme, &known, tried, band);
                                    let some = may_rate_within_some(theme, &known, band);
                                    assert!(some || !may, "{theme:?} {known:?} {tried} {band:?}");
                                    refused += usize::from(!may);
                                    refused_early += usize::from(!some);
                                    for answers in 1..=tried.min(3) {
                                        let full = Features {
                                            answers,
                                            tempting: tried - answers,
                                            ..known
                                        };
                                        let r = rating(theme, &full);
                                        assert!(
                                            may || !(band.0..=band.1).contains(&r),
                                            "{theme:?} {full:?} rates {r}, in {band:?}, but was refused"
                                        );
                                    }
                                }
                            }
                        }
                    }
                }
            }
        }
        assert!(refused > refused_early && refused_early > 0);
        let long = Features {
            length: 12,
            branching: 6,
            ..Default::default()
        };
        assert!(!may_rate_within(Theme::Vct, &long, 10, (1200, 1600)));
        assert!(may_rate_within(Theme::Vct, &long, 10, (FLOOR, CEILING)));
    }

    /// The fewest answers a band needs, worked by hand from the formula in the module
    /// comment: a VCT of two attacker moves with three answers and no tempting move rates
    /// 1250 + 110 - 160 log2(3) = 1106; with two answers (one tempting move) 1250 + 110 + 25
    /// - 160 = 1225; with one (two tempting moves) 1250 + 110 + 50 = 1410.
    #[test]
    fn the_fewest_answers_a_band_needs_follow_the_formula() {
        let three = Features {
            length: 2,
            answers: 3,
            ..Default::default()
        };
        let with = |answers, tempting| {
            rating(
                Theme::Vct,
                &Features {
                    answers,
                    tempting,
                    ..three
                },
            )
        };
        assert_eq!((with(3, 0), with(2, 1), with(1, 2)), (1106, 1225, 1410));
        let fewest = |top| fewest_answers(Theme::Vct, &three, top);
        assert_eq!(fewest(1500), 1);
        assert_eq!(fewest(1410), 1);
        assert_eq!(fewest(1409), 2);
        assert_eq!(fewest(1250), 2);
        assert_eq!(fewest(1224), 3);
        assert_eq!(fewest(1106), 3);
        // Over every theme and feature: one answer needs one; the whole range needs one for
        // any count (so a generation of the whole range keeps a puzzle with n answers one
        // time in n², as it always did); a lower top never needs fewer.
        for theme in Theme::ALL {
            for length in 1..=12 {
                for answers in 1..=3 {
                    for tempting in [0, 2, 11] {
                        let f = Features {
                            length,
                            answers,
                            tempting,
                            spread: 2.5,
                            ..Default::default()
                        };
                        assert_eq!(fewest_answers(theme, &f, CEILING), 1);
                        let one = Features { answers: 1, ..f };
                        assert_eq!(fewest_answers(theme, &one, FLOOR), 1);
                        let tops = (FLOOR..=CEILING).step_by(50);
                        let needs: Vec<u32> = tops.map(|t| fewest_answers(theme, &f, t)).collect();
                        assert!(needs.iter().all(|&m| (1..=answers).contains(&m)));
                        assert!(needs.windows(2).all(|w| w[0] >= w[1]), "{f:?} {needs:?}");
                    }
                }
            }
        }
    }

    #[test]
    fn harder_features_rate_higher() {
        let easy = Features {
            length: 2,
            answers: 1,
            ..Default::default()
        };
        let long = Features { length: 6, ..easy };
        let many = Features { answers: 4, ..easy };
        let r = |f: &Features| rating(Theme::Vcf, f);
        assert!(r(&long) > r(&easy));
        assert!(r(&many) < r(&easy));
        assert!(rating(Theme::Vct, &easy) > rating(Theme::Vcf, &easy));
        // Depth: a 15-four line rates far above a 4-four one, and every move counts.
        let fours = |n| r(&Features { length: n, ..easy });
        assert!(fours(15) >= fours(4) + 600, "{} {}", fours(15), fours(4));
        assert!((1..20).all(|n| fours(n + 1) > fours(n)));
        assert!(
            fours(20) < 2600,
            "a plain 20-four line leaves room for the other terms"
        );
        let extreme = Features {
            length: 40,
            tempting: 99,
            branching: 99,
            counter_fours: 9,
            spread: 20.0,
            answers: 1,
        };
        assert_eq!(r(&extreme), 2600);
    }
}
