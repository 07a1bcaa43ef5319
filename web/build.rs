//! Builds the starter library into the app: every `puzzles/*.json`, minified, in file-name
//! order, as `$OUT_DIR/library.rs`. A set that is not valid JSON stops the build.

use std::fmt::Write as _;
use std::path::Path;

fn main() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../puzzles");
    println!("cargo:rerun-if-changed={}", dir.display());
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .expect("the puzzles folder")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "json"))
        .collect();
    files.sort();
    let mut out = String::from(
        "/// (file stem, set-file JSON) for every shipped set.\npub const SETS: &[(&str, &str)] = &[\n",
    );
    for f in &files {
        println!("cargo:rerun-if-changed={}", f.display());
        let text = std::fs::read_to_string(f).expect("a readable set");
        let value: serde_json::Value =
            serde_json::from_str(&text).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
        let stem = f.file_stem().unwrap().to_string_lossy();
        let min = serde_json::to_string(&value).expect("serialisable");
        writeln!(out, "    ({stem:?}, {min:?}),").unwrap();
    }
    out.push_str("];\n");
    let dest = Path::new(&std::env::var("OUT_DIR").unwrap()).join("library.rs");
    std::fs::write(dest, out).expect("writable OUT_DIR");
}
