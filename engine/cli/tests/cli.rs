//! The `fivefold` binary, run as a user or a script would run it: flags in, JSON or one line
//! of error out.
//!
//! Sources of the expected values: the rules of thumb in DESIGN section 1 (an open four wins
//! in two ways; an open three must be answered at its ends: common practice), the published
//! value of the 4,4,4-game (a draw: Uiterwijk and van den Herik, "The advantage of the
//! initiative", 2000, from memory), and the renju rule that a double three is forbidden for
//! black (RIF 1996). Each position is built by hand.

use std::process::{Command, Output};

use serde_json::Value;

fn fivefold(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_fivefold"))
        .args(args)
        .output()
        .expect("the fivefold binary runs")
}

/// Runs a command that must succeed and print JSON.
fn json(args: &[&str]) -> Value {
    let out = fivefold(args);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(out.status.success(), "{args:?} failed: {stderr}");
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| {
        panic!(
            "{args:?}: not JSON ({e}): {}",
            String::from_utf8_lossy(&out.stdout)
        )
    })
}

fn strings(v: &Value, key: &str) -> Vec<String> {
    v[key]
        .as_array()
        .unwrap_or_else(|| panic!("'{key}' is not a list in {v}"))
        .iter()
        .map(|x| x.as_str().expect("a point name").to_string())
        .collect()
}

/// Whether `stones` (point names) hold five in a row: our own scan of columns and rows.
fn five_in_a_row(stones: &[String]) -> bool {
    let cells: Vec<(i32, i32)> = stones
        .iter()
        .map(|s| {
            let col = s.as_bytes()[0] as i32 - 'a' as i32;
            let row: i32 = s[1..].parse().expect("a row number");
            (col, row)
        })
        .collect();
    cells.iter().any(|&(x, y)| {
        [(1, 0), (0, 1), (1, 1), (1, -1)]
            .iter()
            .any(|&(dx, dy)| (0..5).all(|k| cells.contains(&(x + k * dx, y + k * dy))))
    })
}

#[test]
fn solve_vcf_json_reports_the_win_its_line_and_both_first_moves() {
    // h8 i8 j8 on an open row: g8 or k8 makes an open four (common practice).
    let v = json(&[
        "solve",
        "--rule",
        "freestyle",
        "--size",
        "15",
        "--black",
        "h8,i8,j8",
        "--white",
        "a1,a2",
        "--to-move",
        "black",
        "--search",
        "vcf",
        "--json",
    ]);
    assert_eq!(v["result"], "win", "{v}");
    assert_eq!(v["search"], "vcf");
    assert_eq!(v["to_move"], "black");
    let line = strings(&v, "line");
    assert_eq!(
        line.len() % 2,
        1,
        "the line ends with black's move: {line:?}"
    );
    let mut black: Vec<String> = ["h8", "i8", "j8"].iter().map(|s| s.to_string()).collect();
    black.extend(line.iter().step_by(2).cloned());
    let before: Vec<String> = black[..black.len() - 1].to_vec();
    assert!(!five_in_a_row(&before), "a five before the end: {line:?}");
    assert!(
        five_in_a_row(&black),
        "the line does not end with a five: {line:?}"
    );
    let firsts = strings(&v, "first_moves");
    assert!(
        firsts.contains(&"g8".to_string()) && firsts.contains(&"k8".to_string()),
        "{firsts:?}"
    );
    assert!(
        v["nodes"].is_u64() && v["nodes"].as_u64().unwrap() > 0,
        "{v}"
    );
    assert!(v["ms"].is_u64(), "{v}");
}

#[test]
fn solve_takes_a_move_list() {
    // The same three, reached by moves: black h8 i8 j8, white a1 a2 a3; black to move.
    let v = json(&[
        "solve",
        "--moves",
        "h8 a1 i8 a2 j8 a3",
        "--search",
        "vcf",
        "--json",
    ]);
    assert_eq!(v["to_move"], "black");
    assert_eq!(v["result"], "win", "{v}");
    // With white to move after "h8 a1 i8 a2 j8", white has no fours at all: no VCF.
    let v = json(&[
        "solve",
        "--moves",
        "h8,a1,i8,a2,j8",
        "--search",
        "vcf",
        "--json",
    ]);
    assert_eq!(v["to_move"], "white");
    assert_eq!(v["result"], "no-win", "{v}");
    assert!(strings(&v, "line").is_empty());
}

#[test]
fn solve_exact_four_by_four_k4_is_a_draw() {
    // The 4,4,4-game is a draw (Uiterwijk and van den Herik 2000, from memory).
    let v = json(&[
        "solve", "--search", "exact", "--width", "4", "--height", "4", "--k", "4", "--json",
    ]);
    assert_eq!(v["search"], "exact");
    assert_eq!(v["result"], "draw", "{v}");
    // And the 4,3,3-game is a first-player win.
    let v = json(&[
        "solve", "--search", "exact", "--width", "4", "--height", "3", "--k", "3", "--json",
    ]);
    assert_eq!(v["result"], "win", "{v}");
    assert!(!strings(&v, "first_moves").is_empty());
}

#[test]
fn solve_defend_lists_the_defences() {
    // White to move against black's open three h8 i8 j8: the ends g8 and k8 (common
    // practice); white has no four to counter with.
    let v = json(&[
        "solve",
        "--black",
        "h8,i8,j8",
        "--white",
        "a1,o15",
        "--to-move",
        "white",
        "--search",
        "defend",
        "--json",
    ]);
    assert_eq!(v["search"], "defend");
    assert_eq!(v["threat"], "win", "{v}");
    let mut d = strings(&v, "defences");
    d.sort();
    assert_eq!(d, ["g8", "k8"], "{v}");
    // The threat's line is shown too: black's straight four and five.
    assert!(!strings(&v, "line").is_empty());
    // No threat at all: nothing to defend against.
    let v = json(&[
        "solve",
        "--black",
        "h8",
        "--white",
        "a1",
        "--to-move",
        "white",
        "--search",
        "defend",
        "--json",
    ]);
    assert_eq!(v["threat"], "no-win", "{v}");
    assert_eq!(v["result"], "no-threat");
}

#[test]
fn inspect_json_has_the_position_facts() {
    // Renju: black i8 j8 h9 h10 make h8 a double three (RIF 1996). Two stones in a row
    // make no four point yet, for either colour.
    let v = json(&[
        "inspect",
        "--rule",
        "renju",
        "--black",
        "i8,j8,h9,h10",
        "--white",
        "a1,o15,a15,o1",
        "--json",
    ]);
    for key in [
        "to_move",
        "winner",
        "forbidden",
        "five_points",
        "four_points",
    ] {
        assert!(v.get(key).is_some(), "no '{key}' in {v}");
    }
    assert_eq!(v["to_move"], "black", "equal counts: black to move");
    assert!(v["winner"].is_null());
    let forbidden = v["forbidden"].as_array().expect("a list");
    assert!(
        forbidden
            .iter()
            .any(|f| f["point"] == "h8" && f["reason"] == "double-three"),
        "{v}"
    );
    for colour in ["black", "white"] {
        assert!(
            v["five_points"][colour].as_array().unwrap().is_empty(),
            "{v}"
        );
        assert!(
            v["four_points"][colour].as_array().unwrap().is_empty(),
            "{v}"
        );
    }
    // Black g8 h8 i8 j8: f8 and k8 make five; white's three scattered stones nothing. Four
    // black stones against three: white to move.
    let v = json(&[
        "inspect",
        "--black",
        "g8,h8,i8,j8",
        "--white",
        "a1,a3,a5",
        "--json",
    ]);
    assert_eq!(v["to_move"], "white");
    let mut fives = strings(&v["five_points"], "black");
    fives.sort();
    assert_eq!(fives, ["f8", "k8"], "{v}");
    assert!(strings(&v["five_points"], "white").is_empty());
    // The open three h8 i8 j8 has four four points: g8 and k8 (four in a row), f8 and l8
    // (four stones in a window of five, with one gap).
    let v = json(&[
        "inspect", "--black", "h8,i8,j8", "--white", "a1,a3,a5", "--json",
    ]);
    let mut fours = strings(&v["four_points"], "black");
    fours.sort();
    assert_eq!(fours, ["f8", "g8", "k8", "l8"], "{v}");
    // A five on the board is a winner.
    let v = json(&[
        "inspect",
        "--black",
        "g8,h8,i8,j8,k8",
        "--white",
        "a1,a3,a5,a7",
        "--json",
    ]);
    assert_eq!(v["winner"], "black", "{v}");
}

/// Bad input: a non-zero exit, exactly one line on stderr, and no panic.
fn rejects(args: &[&str], mentions: &str) {
    let out = fivefold(args);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(!out.status.success(), "{args:?} succeeded");
    assert_ne!(out.status.code(), Some(101), "{args:?} panicked: {stderr}");
    assert!(!stderr.contains("panicked"), "{args:?} panicked: {stderr}");
    assert_eq!(
        stderr.trim_end().lines().count(),
        1,
        "{args:?}: not one line: {stderr:?}"
    );
    assert!(
        stderr.contains(mentions),
        "{args:?}: the message does not mention {mentions:?}: {stderr}"
    );
}

#[test]
fn bad_input_is_one_line_on_stderr_and_a_failure_exit() {
    rejects(&["solve", "--black", "h8,zz", "--search", "vcf"], "'zz'");
    rejects(
        &["solve", "--black", "h8,p1", "--search", "vcf"],
        "off the 15x15 board",
    );
    rejects(
        &[
            "solve", "--rule", "gomoku", "--black", "h8", "--search", "vcf",
        ],
        "gomoku",
    );
    rejects(&["inspect", "--moves", "h8 h8"], "h8");
    rejects(&["inspect", "--moves", "h8 i8 t9"], "t9");
    rejects(&["solve", "--size", "4", "--search", "vct"], "4");
    rejects(
        &[
            "solve", "--search", "exact", "--width", "4", "--height", "4",
        ],
        "--k",
    );
}
