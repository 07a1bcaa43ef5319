//! The starter library, built into the app: every set of `puzzles/`, minified, in file-name
//! order (made by `build.rs`).

// (file stem, set-file JSON) for every shipped set.
include!(concat!(env!("OUT_DIR"), "/library.rs"));

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
}
