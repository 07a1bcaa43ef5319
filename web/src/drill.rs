//! Drill's small decisions, apart from the bindings so that they are tested natively: which
//! rating band a drill asks the generator for, and which themes a rule offers.

use engine::puzzle::Theme;
use engine::Rule;

/// Half the width of a drill's rating band.
pub const BAND: u32 = 200;

/// The rating band a drill asks the generator for: about `BAND` either side of the player's
/// rating, moved inside the range where puzzles of the theme are known to fall (`known`, the
/// ratings of the starter library's puzzles of that theme), so that generation finds puzzles
/// quickly. A player far above or below the theme's range gets its hardest or easiest end.
pub fn drill_band(known: &[u32], rating: f64) -> (u32, u32) {
    let r = if rating.is_finite() {
        rating.clamp(600.0, 2600.0)
    } else {
        1500.0
    };
    let (lo, hi) = match (known.iter().min(), known.iter().max()) {
        (Some(&a), Some(&b)) => (a.saturating_sub(50).max(600), (b + 50).min(2600)),
        _ => (600, 2600),
    };
    if hi - lo <= 2 * BAND {
        return (lo, hi);
    }
    let c = (r.round() as u32).clamp(lo + BAND, hi - BAND);
    (c - BAND, c + BAND)
}

/// The themes a rule allows, in the engine's order.
pub fn themes_for(rule: Rule) -> Vec<Theme> {
    Theme::ALL.into_iter().filter(|t| t.allowed(rule)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn drill_bands_sit_inside_the_known_range() {
        let known = [1100, 1250, 1400, 1650];
        // Inside: centred on the rating.
        assert_eq!(drill_band(&known, 1400.0), (1200, 1600));
        // Far below or above: the easy or hard end of the range.
        assert_eq!(drill_band(&known, 700.0), (1050, 1450));
        assert_eq!(drill_band(&known, 2500.0), (1300, 1700));
        // A narrow range is taken whole; nothing known means everything.
        assert_eq!(drill_band(&[1200, 1300], 2000.0), (1150, 1350));
        assert_eq!(drill_band(&[], 1500.0), (1300, 1700));
        assert_eq!(drill_band(&[], f64::NAN), (1300, 1700));
        for r in [0.0, 600.0, 1500.0, 9999.0, -5.0] {
            let (lo, hi) = drill_band(&known, r);
            assert!(lo <= hi && lo >= 600 && hi <= 2600, "{r}: {lo}-{hi}");
        }
    }

    #[test]
    fn renju_has_every_theme_and_the_others_four() {
        assert_eq!(themes_for(Rule::Renju).len(), 6);
        assert_eq!(themes_for(Rule::Freestyle).len(), 4);
        assert!(!themes_for(Rule::Standard).contains(&Theme::ForbiddenTrap));
    }
}
