//! The starter library, built into the app from every set of `puzzles/` (by `build.rs`): the
//! page's index of the sets and the ratings of their puzzles; the sets themselves are files the
//! page fetches when it opens one, and only the workshop module holds them all ([`SETS`], as
//! share codes; [`set_files`] reads them).

use engine::puzzle::Theme;
use engine::Rule;

// INDEX, RATINGS, and SETS in the workshop module.
include!(concat!(env!("OUT_DIR"), "/library.rs"));

/// Every shipped set as (file stem, set-file JSON), read from its share code in [`SETS`].
#[cfg(feature = "workshop")]
pub fn set_files() -> Vec<(&'static str, String)> {
    SETS.iter()
        .map(|&(stem, code, min_moves, unique)| {
            // build.rs wrote each code and read it back as its set.
            let mut set = engine::formats::share::decode(code).expect("a library code reads");
            if let Some(g) = &mut set.generator {
                (g.min_moves, g.unique) = (min_moves, unique);
            }
            (stem, engine::formats::setfile::to_json(&set))
        })
        .collect()
}

/// The ratings of the library's puzzles of `theme` under `rule` (under any rule if the library
/// has none under that one), deep sets left out: deep sets are made with a minimum line
/// length, which plain generation (what these ratings steer) does not ask for.
pub fn ratings(theme: Theme, rule: Rule) -> Vec<u32> {
    let (theme, rule) = (theme.to_string(), rule.to_string());
    let of = |same_rule: bool| -> Vec<u32> {
        RATINGS
            .iter()
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
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_shipped_set_is_built_in_and_valid() {
        assert!(SETS.len() >= 14);
        let total: usize = set_files()
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

    /// Each built-in set is its shipped file whole: read back from its share code, it equals
    /// what the engine's reader makes of `puzzles/<stem>.json`, and every file is built in.
    #[cfg(not(target_arch = "wasm32"))]
    #[test]
    fn the_built_in_sets_are_the_shipped_files() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../puzzles");
        let built = set_files();
        let files = std::fs::read_dir(&dir)
            .unwrap()
            .filter(|e| e.as_ref().unwrap().path().extension() == Some("json".as_ref()))
            .count();
        assert_eq!(built.len(), files);
        for (stem, json) in &built {
            let file = std::fs::read_to_string(dir.join(format!("{stem}.json"))).unwrap();
            let shipped = engine::formats::setfile::parse(&file).unwrap();
            assert_eq!(
                engine::formats::setfile::parse(json).unwrap(),
                shipped,
                "{stem}"
            );
            assert_eq!(*json, engine::formats::setfile::to_json(&shipped), "{stem}");
        }
    }

    /// The index and the ratings agree with the sets they are made from, read as the page
    /// reads them (`setKey` for the keys).
    #[test]
    fn the_index_and_the_ratings_are_the_sets() {
        let index: Vec<serde_json::Value> = serde_json::from_str(INDEX).unwrap();
        assert_eq!(index.len(), SETS.len());
        let mut want: Vec<(String, String, u32)> = Vec::new();
        let mut last = (0, "");
        for (entry, (stem, json)) in index.iter().zip(&set_files()) {
            let set = engine::formats::setfile::parse(json).unwrap();
            assert_eq!(entry["file"], *stem);
            assert_eq!(entry["title"], set.title.as_str());
            assert_eq!(entry["count"], set.puzzles.len());
            // The middle rating, which orders the index: easiest first.
            let rating = entry["rating"].as_u64().unwrap() as u32;
            let (below, above) = (
                set.puzzles.iter().filter(|p| p.rating < rating).count(),
                set.puzzles.iter().filter(|p| p.rating > rating).count(),
            );
            let n = set.puzzles.len();
            assert!(
                below <= (n - 1) / 2 && above <= n / 2,
                "{stem}: {rating} is not the median"
            );
            // Easiest first, then by file name.
            assert!(
                (rating, *stem) > last,
                "{stem}: the index is not easiest first"
            );
            last = (rating, *stem);
            assert_eq!(entry["key"], crate::api::set_key(json).unwrap());
            // The page shows no rule beside a library set: its title names each of them.
            for p in &set.puzzles {
                let rule = p.rule.to_string();
                assert!(
                    set.title.contains(&rule),
                    "{stem}: the title does not say {rule}"
                );
            }
            let g = set
                .generator
                .as_ref()
                .unwrap_or_else(|| panic!("{stem}: no generator"));
            assert_eq!(entry["generator"]["theme"], g.theme.to_string());
            assert_eq!(entry["generator"]["rule"], g.rule.to_string());
            assert_eq!(entry["generator"]["min_moves"], g.min_moves);
            if g.min_moves == 0 {
                want.extend(
                    set.puzzles
                        .iter()
                        .map(|p| (p.theme.to_string(), p.rule.to_string(), p.rating)),
                );
            }
        }
        let got: Vec<(String, String, u32)> = RATINGS
            .iter()
            .map(|&(t, r, x)| (t.to_string(), r.to_string(), x))
            .collect();
        assert_eq!(got, want);
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
