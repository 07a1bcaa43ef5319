//! The sentences and small decisions the page shows, apart from the bindings so that they are
//! tested natively: what a study search found, which rating band a drill
//! asks the generator for.

use engine::puzzle::Theme;
use engine::{Point, Rule, Stone};

pub use engine::puzzle::capitalised as colour_word;

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

fn list(points: &[Point]) -> String {
    points
        .iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(" ")
}

fn commas(points: &[Point]) -> String {
    points
        .iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(", ")
}

/// What a study search found, in sentences. `search` is "vcf", "vct" or "defend"; for "vcf"
/// and "vct" `side` is the attacker and `verdict` its result, `line` the main line and `firsts`
/// every winning first move; for "defend" `side` is the defender, `verdict` whether the
/// opponent threatens a win, `line` that threat and `firsts` the defences. `unknown` holds the
/// moves the budget left undecided.
pub fn solve_words(
    search: &str,
    side: Stone,
    verdict: &str,
    line: &[Point],
    firsts: &[Point],
    unknown: &[Point],
    nodes: u64,
) -> Vec<String> {
    let me = colour_word(side);
    let them = colour_word(side.opponent());
    let mut out = Vec::new();
    let budget = format!(
        "The search stopped at its budget ({nodes} positions) without an answer; a smaller \
         question (VCF) may still be answered."
    );
    match (search, verdict) {
        ("vcf" | "vct", "win") => {
            let how = if search == "vcf" {
                "with fours"
            } else {
                "with threes and fours"
            };
            let moves = line.len().div_ceil(2);
            out.push(format!(
                "{me} wins {how} in {moves} move{}: {}.",
                if moves == 1 { "" } else { "s" },
                list(line)
            ));
            let others: Vec<Point> = firsts
                .iter()
                .copied()
                .filter(|p| Some(p) != line.first())
                .collect();
            if !others.is_empty() {
                out.push(format!("Other first moves that win: {}.", commas(&others)));
            }
            if !unknown.is_empty() {
                out.push(format!(
                    "Not decided within the budget: {}.",
                    commas(unknown)
                ));
            }
        }
        ("vcf", "no-win") => out.push(format!("{me} has no win with fours here.")),
        ("vct", "no-win") => out.push(format!(
            "{me} has no win with threes and fours here (the search allows up to six threes)."
        )),
        ("defend", "threat") => {
            out.push(format!(
                "{them} threatens to win: {} (step through it below).",
                list(line)
            ));
            if firsts.is_empty() && unknown.is_empty() {
                out.push(format!("No move stops it: {me} loses."));
            } else if !firsts.is_empty() {
                let n = firsts.len();
                out.push(format!(
                    "{n} move{} stop{} it: {}.",
                    if n == 1 { "" } else { "s" },
                    if n == 1 { "s" } else { "" },
                    commas(firsts)
                ));
            }
            if !unknown.is_empty() {
                out.push(format!(
                    "Not decided within the budget: {}.",
                    commas(unknown)
                ));
            }
        }
        ("defend", "no-threat") => out.push(format!(
            "{them} has no win with threes and fours to stop: {me} is free to play anywhere."
        )),
        _ => out.push(budget),
    }
    out
}

/// The themes a rule allows, in the engine's order.
pub fn themes_for(rule: Rule) -> Vec<Theme> {
    Theme::ALL.into_iter().filter(|t| t.allowed(rule)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::str::FromStr;

    fn pts(s: &str) -> Vec<Point> {
        s.split_whitespace()
            .map(|t| Point::from_str(t).unwrap())
            .collect()
    }

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
    fn study_results_in_words() {
        let w = solve_words(
            "vcf",
            Stone::Black,
            "win",
            &pts("d8 d9 f10 h10 g11"),
            &pts("d8 f10"),
            &[],
            120,
        );
        assert_eq!(
            w,
            vec![
                "Black wins with fours in 3 moves: d8 d9 f10 h10 g11.",
                "Other first moves that win: f10."
            ]
        );
        let w = solve_words("vct", Stone::White, "no-win", &[], &[], &[], 9);
        assert_eq!(
            w,
            vec![
                "White has no win with threes and fours here (the search allows up to six threes)."
            ]
        );
        let w = solve_words(
            "defend",
            Stone::Black,
            "threat",
            &pts("h8 h9 h10"),
            &pts("h9"),
            &pts("j9"),
            9,
        );
        assert_eq!(
            w,
            vec![
                "White threatens to win: h8 h9 h10 (step through it below).",
                "1 move stops it: h9.",
                "Not decided within the budget: j9."
            ]
        );
        let w = solve_words("defend", Stone::Black, "threat", &pts("h8"), &[], &[], 9);
        assert_eq!(w[1], "No move stops it: Black loses.");
        let w = solve_words("defend", Stone::White, "no-threat", &[], &[], &[], 9);
        assert_eq!(
            w,
            vec!["Black has no win with threes and fours to stop: White is free to play anywhere."]
        );
        let w = solve_words("vct", Stone::Black, "unknown", &[], &[], &[], 500);
        assert!(w[0].starts_with("The search stopped at its budget (500 positions)"));
    }

    #[test]
    fn renju_has_every_theme_and_the_others_four() {
        assert_eq!(themes_for(Rule::Renju).len(), 6);
        assert_eq!(themes_for(Rule::Freestyle).len(), 4);
        assert!(!themes_for(Rule::Standard).contains(&Theme::ForbiddenTrap));
    }
}
