//! `fivefold share` and `fivefold results`, run as an instructor would run them.
//!
//! The outside checks: the link and QR code open the same set again (through the engine's own
//! decoder: the QR image itself is read back by an independent decoder in the engine's tests),
//! the SVG is well-formed enough to start and end as one `<svg>` element, and the CSV is read
//! back by the `csv` crate, an independent RFC 4180 reader.

use std::io::Write;
use std::process::{Command, Output, Stdio};

use engine::formats::result::{self, PuzzleResult, TimeBucket};
use engine::formats::{setfile, share};
use engine::puzzle::attempt::Attempt;

const SET: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../tests/data/fixture_set.json"
);

fn fivefold(args: &[&str], stdin: Option<&str>) -> Output {
    let mut child = Command::new(env!("CARGO_BIN_EXE_fivefold"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the fivefold binary runs");
    if let Some(text) = stdin {
        child
            .stdin
            .take()
            .unwrap()
            .write_all(text.as_bytes())
            .unwrap();
    }
    drop(child.stdin.take());
    child.wait_with_output().unwrap()
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8(bytes.to_vec()).unwrap()
}

fn set() -> setfile::PuzzleSet {
    setfile::parse(&std::fs::read_to_string(SET).unwrap()).unwrap()
}

fn temp(name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("fivefold-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

#[test]
fn share_prints_a_bare_code_without_a_base_and_says_so() {
    let out = fivefold(&["share", SET], None);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let code = text(&out.stdout);
    assert!(text(&out.stderr).contains("bare share code"));
    assert_eq!(share::decode(code.trim()).unwrap(), set());
}

#[test]
fn share_prints_a_link_and_writes_its_qr_code() {
    let svg = temp("set.svg");
    let base = "https://harbour-street.example/fivefold/";
    let out = fivefold(
        &["share", SET, "--base", base, "--qr", svg.to_str().unwrap()],
        None,
    );
    assert!(out.status.success(), "{}", text(&out.stderr));
    let link = text(&out.stdout);
    let link = link.trim();
    assert!(link.starts_with(&format!("{base}#set=$")), "{link}");
    assert_eq!(share::decode(link).unwrap(), set());
    let image = std::fs::read_to_string(&svg).unwrap();
    assert!(image.starts_with("<svg") && image.trim_end().ends_with("</svg>"));
    assert!(text(&out.stderr).contains("QR version"));
    let help = fivefold(&["share", "--help"], None);
    assert!(text(&help.stdout).contains("where your club hosts"));
}

fn code(name: &str, attempts: &[Attempt]) -> String {
    let s = set();
    let results: Vec<PuzzleResult> = (0..s.puzzles.len())
        .map(|i| {
            let a = attempts.get(i).copied().unwrap_or(Attempt::Untried);
            PuzzleResult::new(a, 1, TimeBucket::Under5Min)
        })
        .collect();
    result::encode(result::fingerprint(&s), name, &results).unwrap()
}

#[test]
fn results_prints_the_table_writes_csv_and_names_the_bad_lines() {
    let codes = temp("codes.txt");
    let csv_out = temp("class.csv");
    let mira = code("Mira", &[Attempt::Clean, Attempt::Helped]);
    let tomas = code("Tomas", &[Attempt::Failed]);
    let mut damaged: Vec<char> = tomas.chars().collect();
    damaged[3] = if damaged[3] == 'Z' { 'Y' } else { 'Z' };
    let damaged: String = damaged.into_iter().collect();
    std::fs::write(&codes, format!("{mira}\n{damaged}\n{tomas}, {mira}\n")).unwrap();
    let out = fivefold(
        &[
            "results",
            SET,
            codes.to_str().unwrap(),
            "--csv",
            csv_out.to_str().unwrap(),
            "--sort",
            "score",
        ],
        None,
    );
    assert!(out.status.success(), "{}", text(&out.stderr));
    let table = text(&out.stdout);
    let mira_at = table.find("Mira").unwrap();
    let tomas_at = table.find("Tomas").unwrap();
    assert!(mira_at < tomas_at, "sorted by score:\n{table}");
    assert!(table.contains("H1:5m"), "{table}");
    let errors = text(&out.stderr);
    assert!(errors.contains("line 2"), "{errors}");
    assert!(
        errors.contains("line 3") && errors.contains("same result for Mira"),
        "{errors}"
    );
    let rows: Vec<Vec<String>> = csv::ReaderBuilder::new()
        .has_headers(false)
        .from_path(&csv_out)
        .unwrap()
        .records()
        .map(|r| r.unwrap().iter().map(str::to_string).collect())
        .collect();
    assert_eq!(rows[0][0], "Student");
    assert_eq!(
        rows[1][..4],
        ["Mira", "2", "1", "clean, 1 hint, under 5 min"]
    );
    assert_eq!(
        rows[2][..4],
        ["Tomas", "0", "0", "failed, 1 hint, under 5 min"]
    );
    assert_eq!(rows.len(), 4);
}

#[test]
fn results_reads_codes_from_standard_input() {
    let out = fivefold(
        &["results", SET, "-"],
        Some(&code("Ines", &[Attempt::Clean])),
    );
    assert!(out.status.success(), "{}", text(&out.stderr));
    assert!(text(&out.stdout).contains("Ines"));
    let out = fivefold(&["results", SET, "-"], Some("not a code at all!"));
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("line 1"));
}
