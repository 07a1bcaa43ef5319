//! Builds the starter library's tables into the app, from every `puzzles/*.json`, as
//! `$OUT_DIR/library.rs`, easiest set first (by the median rating of its puzzles, then by file
//! name):
//! - `INDEX`: what the page needs before a set is opened, as JSON: per set its file stem,
//!   title (which names its rules), puzzle count, median rating, key (the fingerprint
//!   `setKey` gives) and generator (theme, rule, minimum moves). The sets themselves are
//!   files the page fetches when it needs them (web/tools/common.sh copies them to
//!   `dist/library/`);
//! - `RATINGS`: (theme, rule, rating) of every puzzle of the plain (not deep) sets, which steer
//!   the Drill's and the generator's rating bands;
//! - `SETS`: (file stem, share code, and the two generator fields a code does not hold: the
//!   minimum moves and the unique flag) of every set, in the workshop module only (Coach's
//!   sources, the single-file build, the tests). With those two fields a code holds the whole
//!   set (the build checks that it reads back equal) in about 60 % of the set's JSON
//!   compressed, which keeps the single file within its budget.
//!
//! Every set is read with the engine's own set-file reader: a set that is not valid stops the
//! build.

use std::fmt::Write as _;
use std::path::Path;

use engine::formats::{result, setfile, share};
use serde_json::json;

fn main() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../puzzles");
    println!("cargo:rerun-if-changed={}", dir.display());
    let files: Vec<_> = std::fs::read_dir(&dir)
        .expect("the puzzles folder")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "json"))
        .collect();
    // Easiest first: by the median rating of a set's puzzles, then by file name.
    let mut files: Vec<_> = files
        .into_iter()
        .map(|f| {
            let text = std::fs::read_to_string(&f).expect("a readable set");
            let set = setfile::parse(&text).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
            (median_rating(&set), f, set)
        })
        .collect();
    files.sort_by(|a, b| (a.0, &a.1).cmp(&(b.0, &b.1)));
    let mut index = Vec::new();
    let mut ratings = String::from(
        "/// (theme, rule, rating) of every puzzle of the library's plain sets (deep sets left out).\n\
         pub const RATINGS: &[(&str, &str, u32)] = &[\n",
    );
    let mut sets = String::from(
        "/// (file stem, share code, the generator's minimum moves and unique flag) for every\n\
         /// shipped set.\n\
         #[cfg(feature = \"workshop\")]\npub const SETS: &[(&str, &str, u16, bool)] = &[\n",
    );
    for (rating, f, set) in &files {
        println!("cargo:rerun-if-changed={}", f.display());
        let stem = f.file_stem().unwrap().to_string_lossy();
        let deep = set.generator.as_ref().is_some_and(|g| g.min_moves > 0);
        index.push(json!({
            "file": stem,
            "title": set.title,
            "count": set.puzzles.len(),
            "rating": rating,
            "key": format!("{:08x}", result::fingerprint(set)),
            "generator": set.generator.as_ref().map(|g| json!({
                "theme": g.theme.to_string(),
                "rule": g.rule.to_string(),
                "min_moves": g.min_moves,
            })),
        }));
        if !deep {
            for p in &set.puzzles {
                writeln!(
                    ratings,
                    "    ({:?}, {:?}, {}),",
                    p.theme.to_string(),
                    p.rule.to_string(),
                    p.rating
                )
                .unwrap();
            }
        }
        // A share code leaves out a generator block of a deep or unique-only generation (the
        // format has no field for the minimum length or for uniqueness): the code holds the
        // block without them, and SETS keeps the two beside it.
        let (min_moves, unique) = set
            .generator
            .as_ref()
            .map_or((0, false), |g| (g.min_moves, g.unique));
        let mut plain = set.clone();
        if let Some(g) = &mut plain.generator {
            (g.min_moves, g.unique) = (0, false);
        }
        let code = share::encode(&plain).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
        let mut back = share::decode(&code).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
        if let Some(g) = &mut back.generator {
            (g.min_moves, g.unique) = (min_moves, unique);
        }
        assert!(
            back == *set,
            "{}: its share code does not read back as the set",
            f.display()
        );
        writeln!(sets, "    ({stem:?}, {code:?}, {min_moves}, {unique}),").unwrap();
    }
    ratings.push_str("];\n");
    sets.push_str("];\n");
    let index = serde_json::to_string(&index).expect("serialisable");
    let out = format!(
        "/// The library's index for the page (JSON; see build.rs).\npub const INDEX: &str = {index:?};\n{ratings}{sets}"
    );
    let dest = Path::new(&std::env::var("OUT_DIR").unwrap()).join("library.rs");
    std::fs::write(dest, out).expect("writable OUT_DIR");
}

/// The middle rating of a set's puzzles (the lower of the two middle ones for an even count).
fn median_rating(set: &setfile::PuzzleSet) -> u32 {
    let mut r: Vec<u32> = set.puzzles.iter().map(|p| p.rating).collect();
    r.sort_unstable();
    r[(r.len() - 1) / 2]
}
