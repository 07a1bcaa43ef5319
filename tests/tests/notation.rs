//! Bad input to the text formats: typed errors that name the token and where it is, never a
//! panic (DESIGN section 7, "Inputs are untrusted"; naming the offending token and its
//! position is common practice for any parser a person types into).
//!
//! The move-list cases live in `tests/data/bad_move_lists.txt`, one a line, with the problem
//! each must produce; the renju cases there are positions built by hand for these tests. The
//! coordinate convention (`a1` bottom left, columns `a`-`s`, rows `1`-`19`) is that of the
//! threat-space search paper and of renju rules (DESIGN section 3).

use engine::notation::{
    parse_diagram, parse_points, play_moves, setup, ListError, PositionError, TokenProblem,
};
use engine::{Forbidden, MoveError, Point, Rule};
use proptest::prelude::*;

use crate::common::p;

/// One line of the data file.
#[derive(Debug)]
struct Case {
    line: usize,
    size: u8,
    rule: Rule,
    moves: String,
    problem: String,
    index: Option<usize>,
    column: Option<usize>,
    token: Option<String>,
}

fn cases() -> Vec<Case> {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/data/bad_move_lists.txt");
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{path}: {e}"));
    let mut out = Vec::new();
    for (n, raw) in text.lines().enumerate() {
        if raw.trim().is_empty() || raw.starts_with('#') {
            continue;
        }
        let f: Vec<&str> = raw.split('|').map(str::trim).collect();
        assert_eq!(f.len(), 7, "{path}:{}: expected 7 fields: {raw}", n + 1);
        let opt = |s: &str| (s != "-").then(|| s.to_string());
        out.push(Case {
            line: n + 1,
            size: f[0]
                .parse()
                .unwrap_or_else(|_| panic!("line {}: size", n + 1)),
            rule: f[1]
                .parse()
                .unwrap_or_else(|e| panic!("line {}: {e}", n + 1)),
            moves: f[2].to_string(),
            problem: f[3].to_string(),
            index: opt(f[4]).map(|s| s.parse().unwrap()),
            column: opt(f[5]).map(|s| s.parse().unwrap()),
            token: opt(f[6]),
        });
    }
    out
}

/// The data file's name for a problem.
fn problem_name(p: &TokenProblem) -> String {
    match p {
        TokenProblem::Garbage => "garbage".into(),
        TokenProblem::OffBoard { .. } => "off-board".into(),
        TokenProblem::Duplicate { first } => format!("duplicate:{first}"),
        TokenProblem::Illegal(MoveError::Forbidden(_, why)) => format!("forbidden:{}", why.name()),
        TokenProblem::Illegal(MoveError::GameOver) => "game-over".into(),
        TokenProblem::Illegal(e) => format!("illegal:{e:?}"),
    }
}

fn check_list_error(case: &Case, e: &ListError) {
    let at = format!("data line {}: {:?}", case.line, case.moves);
    assert_eq!(e.list, "moves", "{at}");
    assert_eq!(problem_name(&e.problem), case.problem, "{at}");
    assert_eq!(Some(e.index), case.index, "{at}: move number");
    assert_eq!(Some(e.column), case.column, "{at}: character");
    assert_eq!(Some(&e.token), case.token.as_ref(), "{at}: token");
    // The message names the move, the token and the (1-based) character.
    let msg = e.to_string();
    let want = format!(
        "move {} ('{}', at character {})",
        e.index,
        e.token,
        e.column + 1
    );
    assert!(msg.contains(&want), "{at}: message {msg:?}");
    // The token really is at that character of the input.
    let from: String = case.moves.chars().skip(e.column).collect();
    assert!(from.starts_with(&e.token), "{at}: token not at its column");
    if let TokenProblem::OffBoard { width, height } = e.problem {
        assert_eq!((width, height), (case.size, case.size), "{at}");
    }
    if let TokenProblem::Illegal(MoveError::Forbidden(q, _)) = e.problem {
        assert_eq!(q.to_string(), e.token.to_lowercase(), "{at}");
    }
}

#[test]
fn bad_move_lists_from_the_data_file() {
    let cases = cases();
    assert!(cases.len() >= 20, "the data file lost its cases");
    for case in &cases {
        let result = play_moves(&case.moves, case.size, case.rule);
        let at = format!("data line {}", case.line);
        match (case.problem.as_str(), result) {
            ("bad-size", Err(PositionError::Board(_))) => {}
            (_, Err(PositionError::List(e))) => {
                check_list_error(case, &e);
                // Problems in the text itself are found by the plain parser too, with the same
                // error; rule problems only by playing.
                let parsed = parse_points(&case.moves, "moves", case.size, case.size);
                match e.problem {
                    TokenProblem::Illegal(_) => assert!(parsed.is_ok(), "{at}"),
                    _ => assert_eq!(parsed, Err(e.clone()), "{at}"),
                }
            }
            (want, got) => panic!("{at}: expected {want}, got {got:?}"),
        }
    }
}

#[test]
fn every_problem_kind_is_in_the_data_file() {
    let cases = cases();
    for kind in [
        "garbage",
        "off-board",
        "duplicate:",
        "forbidden:double-three",
        "forbidden:double-four",
        "forbidden:overline",
        "game-over",
        "bad-size",
    ] {
        assert!(
            cases.iter().any(|c| c.problem.starts_with(kind)),
            "no {kind} case"
        );
    }
}

#[test]
fn the_same_lists_play_when_corrected() {
    // Sanity for the renju cases: without their last move each list is a legal game, so the
    // error really is about that move.
    for case in cases()
        .iter()
        .filter(|c| c.problem.starts_with("forbidden:"))
    {
        let idx = case.index.unwrap();
        let head: Vec<&str> = case.moves.split_whitespace().take(idx - 1).collect();
        let g = play_moves(&head.join(" "), case.size, case.rule)
            .unwrap_or_else(|e| panic!("data line {}: {e}", case.line));
        assert_eq!(g.winner(), None);
        // Under freestyle the last move is legal.
        assert!(play_moves(&case.moves, case.size, Rule::Freestyle).is_ok());
    }
}

#[test]
fn stone_list_errors_name_the_list() {
    let e = setup(15, Rule::Standard, "h8 i9", "j10 zz").unwrap_err();
    let PositionError::List(e) = e else {
        panic!("{e:?}")
    };
    assert_eq!(
        (e.list, e.index, e.column, e.token.as_str()),
        ("white", 2, 4, "zz")
    );
    assert_eq!(e.problem, TokenProblem::Garbage);
    assert!(
        e.to_string().contains("stone 2 of the white list ('zz'"),
        "{e}"
    );

    let e = setup(9, Rule::Renju, "a1 j9", "").unwrap_err();
    assert!(
        matches!(&e, PositionError::List(l) if l.list == "black" && l.index == 2
            && l.problem == TokenProblem::OffBoard { width: 9, height: 9 }),
        "{e:?}"
    );
    // A point in both lists.
    assert_eq!(
        setup(15, Rule::Freestyle, "h8 i9", "a1 i9").err(),
        Some(PositionError::Overlap(p("i9")))
    );
    // A repeat inside one list.
    let e = setup(15, Rule::Freestyle, "h8", "a1 b2 a1").unwrap_err();
    assert!(
        matches!(&e, PositionError::List(l) if l.list == "white"
            && l.problem == TokenProblem::Duplicate { first: 1 } && l.index == 3 && l.column == 6),
        "{e:?}"
    );
}

#[test]
fn forbidden_move_in_a_list_names_the_reason() {
    let e = play_moves("i8 a1 j8 a3 h9 a5 h10 a7 h8", 15, Rule::Renju).unwrap_err();
    let msg = e.to_string();
    assert!(msg.contains("move 9 ('h8', at character 26)"), "{msg}");
    assert!(
        msg.contains("forbidden") && msg.contains("double three"),
        "{msg}"
    );
    assert_eq!(
        e,
        PositionError::List(ListError {
            list: "moves",
            index: 9,
            column: 25,
            token: "h8".into(),
            problem: TokenProblem::Illegal(MoveError::Forbidden(p("h8"), Forbidden::DoubleThree)),
        })
    );
}

#[test]
fn bad_diagrams_name_the_line() {
    let line_of = |text: &str| match parse_diagram(text, Rule::Standard) {
        Err(PositionError::Diagram { line, message }) => (line, message),
        other => panic!("{text:?}: {other:?}"),
    };
    // A character that is neither a stone nor an empty point, on line 3.
    let (line, msg) = line_of(".....\n.....\n..#..\n.....\n.....\n");
    assert_eq!(line, 3);
    assert!(msg.contains("'#'"), "{msg}");
    // A short row, on line 2.
    let (line, msg) = line_of(".....\n....\n.....\n.....\n.....\n");
    assert_eq!(line, 2);
    assert!(msg.contains("4 points"), "{msg}");
    // Too few rows for any board.
    let (_, msg) = line_of("....\n....\n....\n....\n");
    assert!(msg.contains("4 rows"), "{msg}");
    // Too many.
    let big = ".".repeat(20) + "\n";
    let (_, msg) = line_of(&big.repeat(20));
    assert!(msg.contains("20 rows"), "{msg}");
    // Nothing at all.
    assert!(parse_diagram("", Rule::Renju).is_err());
}

#[test]
fn coordinates_reject_garbage_with_the_text() {
    for bad in [
        "", "h", "8", "h0", "h08", "t1", "h20", "hh", "h8x", "é8", "h-1", "h 8",
    ] {
        let e = bad.parse::<Point>().unwrap_err();
        assert_eq!(e.text, bad);
        assert!(e.to_string().contains(&format!("'{bad}'")), "{e}");
    }
    assert_eq!(p("a1"), Point::new(0, 0));
    assert_eq!(p("H8"), Point::new(7, 7));
    assert_eq!(p("s19"), Point::new(18, 18));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// No input makes a parser panic; whatever a parser accepts is well formed.
    #[test]
    fn parsers_never_panic(text in "[a-uA-U0-9 ,;.xXoO+\\-\n]{0,40}|\\PC{0,24}", n in 0u8..=22, r in 0usize..3) {
        let rule = Rule::ALL[r];
        if let Ok(points) = parse_points(&text, "moves", n, n) {
            for (i, q) in points.iter().enumerate() {
                prop_assert!(q.x < n && q.y < n);
                prop_assert!(!points[..i].contains(q));
            }
        }
        if let Ok(g) = play_moves(&text, n, rule) {
            prop_assert_eq!(g.board().stones(), g.moves().len());
        }
        let _ = setup(n, rule, &text, "a1");
        if let Ok(b) = parse_diagram(&text, rule) {
            prop_assert_eq!(b.check_invariants(), Ok(()));
        }
        let _ = text.parse::<Point>();
    }
}
