//! `fivefold review`, run as a user would: a game file in, the findings in words or JSON, and
//! the set "From my games" written with `--out`, which `fivefold verify` proves again.
//!
//! The game is the hand-built missed win of `tests/tests/review.rs` (reasoned there): after
//! White's 12. c3 lets it in, Black has a win with fours starting at k8 or k9 (three fours)
//! and lets it go with 13. m3.

use std::process::{Command, Output};

use serde_json::Value;

const GAME: &str = "# Harbour Street Circle, Mira Okafor v Tomas Reyne\n\
                    h8 g8 i8 i9 j8 h7 i7 j6 h6 g5\n\
                    k10 c3 m3 k8\n";

fn fivefold(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_fivefold"))
        .args(args)
        .output()
        .expect("the fivefold binary runs")
}

fn game_file(dir: &tempfile::TempDir, text: &str) -> String {
    let path = dir.path().join("game.txt");
    std::fs::write(&path, text).unwrap();
    path.to_str().unwrap().to_string()
}

#[test]
fn findings_in_words_json_and_a_set_that_verifies() {
    let dir = tempfile::tempdir().unwrap();
    let path = game_file(&dir, GAME);
    let out = fivefold(&["review", &path, "--quiet", "--nodes", "3000000"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(
        text.starts_with("Game 1 (Harbour Street Circle, Mira Okafor v Tomas Reyne), freestyle rules: 14 moves checked: 2 findings."),
        "{text}"
    );
    assert!(
        text.contains("Move 13: Black had a win with fours starting at k8: 3 fours."),
        "{text}"
    );

    let out = fivefold(&["review", &path, "--quiet", "--json", "--nodes", "3000000"]);
    assert!(out.status.success());
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    let g = &v[0];
    assert_eq!(g["moves"], 14);
    assert_eq!(g["undecided"], 0);
    let kinds: Vec<(u64, &str)> = g["findings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| (f["number"].as_u64().unwrap(), f["kind"].as_str().unwrap()))
        .collect();
    assert_eq!(kinds, vec![(12, "missed-defence"), (13, "missed-win")]);
    assert_eq!(g["findings"][1]["win"]["class"], "vcf");
    assert_eq!(g["findings"][1]["win"]["depth"], 3);
    assert_eq!(g["verdicts"][12], "finding");
    assert_eq!(g["verdicts"][0], "fine");
    // The check proves one defence of White's missed defence; --all-defences lists them all.
    let one = &g["findings"][0];
    assert_eq!(one["all_defences"], false);
    assert_eq!(one["defences"].as_array().unwrap().len(), 1);
    assert!(one["puzzle"].is_null(), "puzzles are made with --out only");
    let out = fivefold(&[
        "review",
        &path,
        "--quiet",
        "--json",
        "--nodes",
        "3000000",
        "--all-defences",
    ]);
    assert!(out.status.success());
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    let all = &v[0]["findings"][0];
    assert_eq!(all["all_defences"], true);
    assert_eq!(
        all["defences"],
        serde_json::json!(["k8", "k9", "l8", "l10"])
    );
    assert!(all["defences"]
        .as_array()
        .unwrap()
        .contains(&one["defences"][0]));

    let set = dir.path().join("mine.json");
    let set = set.to_str().unwrap();
    let out = fivefold(&[
        "review",
        &path,
        "--quiet",
        "--nodes",
        "3000000",
        "--out",
        set,
        "--created",
        "2026-12-01",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let written: Value = serde_json::from_str(&std::fs::read_to_string(set).unwrap()).unwrap();
    assert_eq!(written["title"], "From my games");
    assert_eq!(written["puzzles"][0]["theme"], "vcf");
    let out = fivefold(&["verify", set, "--quiet"]);
    assert!(
        out.status.success(),
        "verify: {}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn bad_games_are_refused_with_where_and_nothing_is_written() {
    let dir = tempfile::tempdir().unwrap();
    let set = dir.path().join("never.json");
    let set = set.to_str().unwrap();
    let path = game_file(&dir, "h8 h9 z99\n");
    let out = fivefold(&["review", &path, "--quiet", "--out", set]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("z99") && err.contains("line 1"), "{err}");
    assert!(!std::path::Path::new(set).exists());
    // A move after the five.
    let path = game_file(&dir, "h8 a1 i8 a2 j8 a3 k8 a4 l8 a5\n");
    let out = fivefold(&["review", &path, "--quiet"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("move 10") && err.contains("game is over"),
        "{err}"
    );
    // A node budget out of range is refused before any work.
    let out = fivefold(&["review", &path, "--nodes", "0"]);
    assert_eq!(out.status.code(), Some(2));
}
