//! The starter library, built into the app: every set of `puzzles/`, minified, in file-name
//! order (made by `build.rs`).

use std::cell::OnceCell;

use engine::formats::setfile;
use engine::puzzle::Theme;
use engine::Rule;

// (file stem, set-file JSON) for every shipped set.
include!(concat!(env!("OUT_DIR"), "/library.rs"));

thread_local! {
    /// (theme, rule, rating) of every library puzzle, read once.
    static RATINGS: OnceCell<Vec<(Theme, Rule, u32)>> = const { OnceCell::new() };
}

/// The ratings of the library's puzzles of `theme` under `rule` (under any rule if the library
/// has none under that one), deep sets left out.
pub fn ratings(theme: Theme, rule: Rule) -> Vec<u32> {
    RATINGS.with(|cell| {
        let all = cell.get_or_init(|| {
            SETS.iter()
                .filter_map(|(_, json)| setfile::parse(json).ok())
                // Deep sets are made with a minimum line length, which plain generation (what
                // these ratings steer) does not ask for.
                .filter(|set| set.generator.as_ref().is_none_or(|g| g.min_moves == 0))
                .flat_map(|set| set.puzzles)
                .map(|p| (p.theme, p.rule, p.rating))
                .collect()
        });
        let of = |same_rule: bool| -> Vec<u32> {
            all.iter()
                .filter(|(t, r, _)| *t == theme && (!same_rule || *r == rule))
                .map(|x| x.2)
                .collect()
        };
        let v = of(true);
        if v.is_empty() {
            of(false)
        } else {
            v
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_shipped_set_is_built_in_and_valid() {
        assert!(SETS.len() >= 14);
        let total: usize = SETS
            .iter()
            .map(|(name, json)| {
                engine::formats::setfile::parse(json)
                    .unwrap_or_else(|e| panic!("{name}: {e}"))
                    .puzzles
                    .len()
            })
            .sum();
        assert!(total >= 300);
    }

    #[test]
    fn ratings_are_known_for_every_theme_under_every_rule_it_allows() {
        for rule in [Rule::Freestyle, Rule::Standard, Rule::Renju] {
            for theme in crate::drill::themes_for(rule) {
                let r = ratings(theme, rule);
                assert!(!r.is_empty(), "{theme} under {rule}");
                assert!(r.iter().all(|&x| (600..=2600).contains(&x)));
            }
        }
    }
}
