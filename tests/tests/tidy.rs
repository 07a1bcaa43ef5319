//! Guards on the shape of the code, checked from the sources: every module of the engine is
//! named in the code map of DEVELOPERS.md (with an invariant line in its paragraph); the
//! engine's manifest has no web crate (it must stay a plain library); no two public types of
//! the project share a name (one vocabulary); and every crate forbids `unsafe` through the
//! workspace lints. These are checks of our own conventions, in the manner of a tidy test
//! (common practice in large Rust workspaces).

use std::fs;
use std::path::{Path, PathBuf};

/// The repository root (this crate lives in `tests/`).
fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("tests/ has a parent")
        .to_path_buf()
}

/// Every `.rs` file under `dir`, in a stable order.
fn rust_files(dir: &Path) -> Vec<PathBuf> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        let mut entries: Vec<PathBuf> = fs::read_dir(&d)
            .unwrap_or_else(|e| panic!("{}: {e}", d.display()))
            .map(|e| e.expect("a directory entry").path())
            .collect();
        entries.sort();
        for p in entries {
            if p.is_dir() {
                stack.push(p);
            } else if p.extension().is_some_and(|x| x == "rs") {
                out.push(p);
            }
        }
    }
    out.sort();
    out
}

fn relative(p: &Path) -> String {
    p.strip_prefix(root())
        .expect("under the root")
        .to_string_lossy()
        .replace('\\', "/")
}

#[test]
fn every_engine_module_is_in_the_code_map() {
    let map = fs::read_to_string(root().join("DEVELOPERS.md")).expect("DEVELOPERS.md");
    let mut missing = Vec::new();
    for f in rust_files(&root().join("engine/src")) {
        let path = relative(&f);
        // A module is named by its file (`engine/src/board.rs`) or, for a module directory,
        // by its folder (`engine/src/search/`), whose paragraph names its files.
        let name = f.file_name().unwrap().to_string_lossy().to_string();
        let folder = format!("{}/", relative(f.parent().unwrap()));
        let named = map.contains(&format!("`{path}`"))
            || (map.contains(&format!("`{folder}`")) && map.contains(&format!("`{name}`")));
        if !named && path != "engine/src/lib.rs" {
            missing.push(path);
        }
    }
    assert!(
        missing.is_empty(),
        "modules missing from the DEVELOPERS.md code map: {missing:?}"
    );
    // Every paragraph of the engine's code map states its invariant.
    let engine_part = map
        .split("### Code map")
        .nth(1)
        .and_then(|s| s.split("\n**`engine/cli/`**").next())
        .expect("a code map section with the engine first");
    for para in engine_part
        .split("\n\n")
        .filter(|p| p.starts_with("**`engine/src"))
    {
        assert!(
            para.contains("Invariant"),
            "no invariant in the code map paragraph: {}",
            para.lines().next().unwrap_or("")
        );
    }
}

#[test]
fn the_engine_has_no_web_dependency() {
    let manifest = fs::read_to_string(root().join("engine/Cargo.toml")).expect("manifest");
    for web in [
        "wasm-bindgen",
        "web-sys",
        "js-sys",
        "getrandom",
        "serde-wasm-bindgen",
    ] {
        assert!(
            !manifest.contains(web),
            "engine/Cargo.toml must not depend on {web}"
        );
    }
}

#[test]
fn no_two_public_types_share_a_name() {
    let mut seen: Vec<(String, String)> = Vec::new();
    let mut clashes = Vec::new();
    for dir in ["engine/src", "engine/cli/src", "web/src", "web/scan/src"] {
        for f in rust_files(&root().join(dir)) {
            let text = fs::read_to_string(&f).expect("a source file");
            for line in text.lines() {
                let t = line.trim_start();
                for kind in ["pub struct ", "pub enum ", "pub trait ", "pub type "] {
                    let Some(rest) = t.strip_prefix(kind) else {
                        continue;
                    };
                    let name: String = rest
                        .chars()
                        .take_while(|c| c.is_alphanumeric() || *c == '_')
                        .collect();
                    let at = relative(&f);
                    if let Some((_, first)) = seen.iter().find(|(n, _)| *n == name) {
                        clashes.push(format!("{name}: {first} and {at}"));
                    } else {
                        seen.push((name, at));
                    }
                }
            }
        }
    }
    assert!(
        clashes.is_empty(),
        "public types sharing a name: {clashes:?}"
    );
    assert!(
        seen.len() > 40,
        "the scan found too few types: {}",
        seen.len()
    );
}

#[test]
fn every_crate_forbids_unsafe_code() {
    let workspace = fs::read_to_string(root().join("Cargo.toml")).expect("manifest");
    assert!(workspace.contains("unsafe_code = \"forbid\""));
    for krate in ["engine", "engine/cli", "web", "web/scan", "tests"] {
        let m = fs::read_to_string(root().join(krate).join("Cargo.toml")).expect("manifest");
        assert!(
            m.contains("[lints]\nworkspace = true"),
            "{krate}/Cargo.toml does not take the workspace lints"
        );
    }
}
