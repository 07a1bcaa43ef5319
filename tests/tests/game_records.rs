//! The player's own game records, read from files in `tests/data/`: SGF collections and files
//! of our move lists, the refusals, the warnings, the replay under a rule, and round trips.
//!
//! The SGF files are hand-written games of the Harbour Street Five-in-a-Row Circle (made up
//! for these tests). What they must give comes from the SGF FF\[4\] specification
//! (red-bean.com/sgf/): the tree syntax and the SimpleText escapes of `sgf4.html` (2.1, 3.3),
//! the properties of `properties.html`, the Go point type that five-in-a-row files use
//! (`go.html`: the first letter is the column from the left, the second the row from the top),
//! and the removal of lower-case letters from old property names (`converting.html`). The
//! expected move lists were written first in our notation; the SGF coordinates were derived
//! from them by the rule of `go.html` (row letter = `a` + size - row).
//!
//! The renju expectations rest on the International Rules of Renju (RIF 1996): black may not
//! make two open threes with one stone.

use engine::formats::games::{
    read_games, read_move_lists, write_move_lists, Choices, GameRecord, Location, MoveListProblem,
    ReadError, RecordFormat,
};
use engine::formats::sgf::{read_sgf, write_sgf, SgfError, SgfProblem, SgfWarning};
use engine::{Forbidden, MoveError, Rule, Stone};
use proptest::prelude::*;

use crate::common::p;

fn data(name: &str) -> Vec<u8> {
    let path = format!("{}/data/{name}", env!("CARGO_MANIFEST_DIR"));
    std::fs::read(&path).unwrap_or_else(|e| panic!("{path}: {e}"))
}

fn sgf(name: &str) -> Result<engine::formats::games::Loaded, SgfError> {
    read_sgf(&data(&format!("games/{name}")), Choices::default())
}

fn at(line: usize, column: usize) -> Location {
    Location { line, column }
}

#[test]
fn a_collection_is_several_games() {
    let loaded = sgf("circle_ladder.sgf").unwrap();
    assert_eq!(loaded.games.len(), 2);

    let g = &loaded.games[0];
    assert_eq!(g.size(), 15);
    assert_eq!(g.move_list(), "h8 h9 i8 i9 j8 g9 k8 j9 l8");
    assert_eq!(g.rule(), Some(Rule::Renju));
    let info = g.info();
    assert_eq!(info.black.as_deref(), Some("Ines Harrow"));
    // UTF-8 text (CA[UTF-8]) is kept as written.
    assert_eq!(info.white.as_deref(), Some("Odile Quévy"));
    // `\]` is an escaped bracket (sgf4.html 3.3).
    assert_eq!(
        info.title.as_deref(),
        Some("Autumn ladder, round 3 [board 2]")
    );
    assert_eq!(info.date.as_deref(), Some("2026-10-14"));
    assert_eq!(g.origin().format, RecordFormat::Sgf);
    assert_eq!((g.origin().game, g.origin().at), (1, at(1, 1)));

    let g = &loaded.games[1];
    assert_eq!(g.size(), 19);
    // Both corners of the top row and of the bottom row (go.html: rows from the top).
    assert_eq!(g.move_list(), "j10 a19 k11 s1 l12 a1 m13 s19 i9");
    assert_eq!(g.rule(), Some(Rule::Freestyle));
    // Without GN, the event (EV) is the title.
    assert_eq!(
        g.info().title.as_deref(),
        Some("Harbour Street Circle open evening")
    );
    assert_eq!((g.origin().game, g.origin().at), (2, at(18, 1)));

    // The private property HX is skipped, and said so (sgf4.html 2.2.3); markup (LB), the
    // result (RE), the application (AP) and comments (C) change nothing and are not reported.
    assert_eq!(
        loaded.warnings,
        vec![SgfWarning::SkippedProperty {
            property: "HX".into(),
            at: at(5, 25),
            count: 2
        }]
    );
}

#[test]
fn the_games_replay_under_their_rules() {
    let loaded = sgf("circle_ladder.sgf").unwrap();
    // Game 1: black's open four on row 8 (h8 i8 j8 k8) becomes five at l8, exactly five, so
    // a renju win for black.
    let game = loaded.games[0].replay(Rule::Renju).unwrap();
    assert_eq!(game.winner(), Some(Stone::Black));
    assert_eq!(game.moves().len(), 9);
    // Game 2: i9 completes the diagonal i9 j10 k11 l12 m13.
    let game = loaded.games[1].replay(Rule::Freestyle).unwrap();
    assert_eq!(game.winner(), Some(Stone::Black));
}

#[test]
fn old_files_lose_the_lower_case_letters_of_their_property_names() {
    // converting.html: "FF[1]-FF[3] ... the application has to remove all lowercase letters".
    let loaded = sgf("old_format.sgf").unwrap();
    let g = &loaded.games[0];
    assert_eq!(g.move_list(), "h8 i9 h7 h9");
    assert_eq!(g.info().black.as_deref(), Some("Tam Ferris"));
    assert_eq!(g.info().white.as_deref(), Some("Pell Brightwater"));
    assert_eq!(g.info().title.as_deref(), Some("Club night, old scorebook"));
    assert!(loaded.warnings.is_empty(), "{:?}", loaded.warnings);
}

#[test]
fn variations_leave_the_main_line_and_a_warning() {
    // sgf4.html 1: the first line is the main line of play; the pass in the other line is
    // never read.
    let loaded = sgf("variations.sgf").unwrap();
    assert_eq!(loaded.games[0].move_list(), "h8 i9 h7 h9 g8 f8 i7");
    assert_eq!(
        loaded.warnings,
        vec![SgfWarning::Variations {
            game: 1,
            at: at(5, 3)
        }]
    );
    assert!(loaded.warnings[0]
        .to_string()
        .contains("only its main line"));
}

#[test]
fn a_truncated_file_names_the_open_bracket() {
    let e = sgf("truncated.sgf").unwrap_err();
    assert_eq!(e.problem, SgfProblem::UnclosedValue);
    assert_eq!(
        (e.game, e.at, e.property.as_deref()),
        (Some(1), at(3, 8), Some("C"))
    );
    assert!(e.to_string().contains("cut short"), "{e}");
}

/// A short name for a problem, as `tests/data/bad_sgf.txt` writes it.
fn problem_name(p: &SgfProblem) -> String {
    match p {
        SgfProblem::NoGame => "no-game".into(),
        SgfProblem::Stray(_) => "stray".into(),
        SgfProblem::Unexpected(_) => "unexpected".into(),
        SgfProblem::UnclosedValue => "unclosed-value".into(),
        SgfProblem::UnclosedTree => "unclosed-tree".into(),
        SgfProblem::UnmatchedClose => "unmatched-close".into(),
        SgfProblem::NoNode => "no-node".into(),
        SgfProblem::NodeAfterVariation => "node-after-variation".into(),
        SgfProblem::NoValue => "no-value".into(),
        SgfProblem::Identifier { .. } => "identifier".into(),
        SgfProblem::NotUtf8 => "not-utf8".into(),
        SgfProblem::Charset(_) => "charset".into(),
        SgfProblem::FileFormat(_) => "file-format".into(),
        SgfProblem::MissingGameType => "missing-game-type".into(),
        SgfProblem::GameType(v) => format!("game-type:{v}"),
        SgfProblem::Size(_) => "size".into(),
        SgfProblem::MissingSize => "missing-size".into(),
        SgfProblem::RootOnly => "root-only".into(),
        SgfProblem::Setup => "setup".into(),
        SgfProblem::PlayerToPlay => "player-to-play".into(),
        SgfProblem::Pass { number } => format!("pass:{number}"),
        SgfProblem::BadCoordinate { number, .. } => format!("bad-coordinate:{number}"),
        SgfProblem::OffBoard { number, .. } => format!("off-board:{number}"),
        SgfProblem::Taken { number, first, .. } => format!("taken:{number}:{first}"),
        SgfProblem::OutOfTurn { number, colour } => format!("out-of-turn:{number}:{colour}"),
        SgfProblem::BothColours => "both-colours".into(),
        SgfProblem::Duplicate => "duplicate".into(),
        SgfProblem::TooManyValues => "too-many-values".into(),
        SgfProblem::UnknownRule(_) => "unknown-rule".into(),
    }
}

#[test]
fn every_refusal_names_the_problem_property_and_place() {
    let text = String::from_utf8(data("bad_sgf.txt")).unwrap();
    let mut cases = 0;
    for (n, raw) in text.lines().enumerate() {
        if raw.trim().is_empty() || raw.starts_with('#') {
            continue;
        }
        let f: Vec<&str> = raw.splitn(5, '|').collect();
        assert_eq!(f.len(), 5, "bad_sgf.txt:{}: expected 5 fields", n + 1);
        let sgf_text = f[4].strip_prefix(' ').unwrap_or(f[4]);
        let e = read_sgf(sgf_text.as_bytes(), Choices::default())
            .expect_err(&format!("bad_sgf.txt:{}: {sgf_text} was accepted", n + 1));
        let want_line: usize = f[1].trim().parse().unwrap();
        let want_column: usize = f[2].trim().parse().unwrap();
        let want_property = (f[3].trim() != "-").then(|| f[3].trim().to_string());
        assert_eq!(
            (problem_name(&e.problem), e.at, e.property.clone()),
            (
                f[0].trim().to_string(),
                at(want_line, want_column),
                want_property
            ),
            "bad_sgf.txt:{}: {sgf_text}: {e}",
            n + 1
        );
        // The message names the place too.
        assert!(
            e.to_string()
                .contains(&format!("line {want_line}, column {want_column}")),
            "{e}"
        );
        cases += 1;
    }
    assert!(cases >= 40, "only {cases} cases");
}

#[test]
fn other_character_sets_and_bytes_are_refused() {
    // CA names the character set (properties.html); only UTF-8 is read.
    let latin1 = b"(;FF[4]GM[4]CA[ISO-8859-1]SZ[15]PB[Ren\xe9];B[hh])";
    let e = read_sgf(latin1, Choices::default()).unwrap_err();
    assert_eq!(e.problem, SgfProblem::Charset("ISO-8859-1".into()));
    // Without CA, a name that is not UTF-8 is refused at its first bad byte, not guessed.
    let e = read_sgf(b"(;FF[4]GM[4]SZ[15]PB[Ren\xe9];B[hh])", Choices::default()).unwrap_err();
    assert_eq!(
        (e.problem, e.at, e.property.as_deref()),
        (SgfProblem::NotUtf8, at(1, 25), Some("PB"))
    );
    // A byte that is not UTF-8 in a value that is not read (a comment) changes nothing.
    let ok = read_sgf(b"(;FF[4]GM[4]SZ[15]C[\xe9];B[hh])", Choices::default()).unwrap();
    assert_eq!(ok.games[0].move_list(), "h8");
}

#[test]
fn a_file_with_one_bad_game_loads_nothing() {
    // The second game is bad, so the first, good one is not returned either.
    let text = "(;FF[4]GM[4]SZ[15];B[hh];W[ig])\n(;FF[4]GM[4]SZ[15];B[hh];W[hh])";
    let e = read_sgf(text.as_bytes(), Choices::default()).unwrap_err();
    assert_eq!((e.game, e.at), (Some(2), at(2, 26)));
}

#[test]
fn sgf_written_by_us_reads_back() {
    let loaded = sgf("circle_ladder.sgf").unwrap();
    let text = write_sgf(&loaded.games);
    let back = read_sgf(text.as_bytes(), Choices::default()).unwrap();
    assert!(back.warnings.is_empty());
    assert_eq!(back.games.len(), 2);
    for (a, b) in loaded.games.iter().zip(&back.games) {
        assert_eq!(a.size(), b.size());
        assert_eq!(a.moves(), b.moves());
        assert_eq!(a.rule(), b.rule());
        assert_eq!(a.info(), b.info());
    }
    // The escaped bracket of the title is written escaped again.
    assert!(
        text.contains(r"GN[Autumn ladder, round 3 [board 2\]]"),
        "{text}"
    );
}

#[test]
fn move_list_files_hold_several_games() {
    let text = String::from_utf8(data("games/circle_moves.txt")).unwrap();
    let games = read_move_lists(&text, Choices::default()).unwrap();
    assert_eq!(games.len(), 3);
    assert_eq!(
        games[0].info().title.as_deref(),
        Some("Ladder round 1: Ines Harrow v Odile Quévy")
    );
    // The same game as the first of circle_ladder.sgf, written in our notation.
    let from_sgf = sgf("circle_ladder.sgf").unwrap();
    assert_eq!(games[0].moves(), from_sgf.games[0].moves());
    assert_eq!(games[1].move_list(), "h8 a1 i8 a3 j9 a5 j10 a7 j8");
    assert_eq!(games[2].move_list(), "h8 i9 h7");
    assert_eq!(games[2].info().title, None);
    assert_eq!(
        (games[2].origin().game, games[2].origin().at),
        (3, at(9, 1))
    );
    assert_eq!(games[2].origin().format, RecordFormat::MoveList);

    // Game 2 is legal under freestyle; under renju black's ninth move, j8, makes two open
    // threes (h8 i8 j8 across, j8 j9 j10 up): a double three, forbidden (RIF 1996).
    assert!(games[1].replay(Rule::Freestyle).is_ok());
    let e = games[1].replay(Rule::Renju).unwrap_err();
    assert_eq!((e.number, e.point, e.colour), (9, p("j8"), Stone::Black));
    assert_eq!(
        e.error,
        MoveError::Forbidden(p("j8"), Forbidden::DoubleThree)
    );
    assert_eq!(
        e.to_string(),
        "game 2 of the move list file (line 5), under renju: move 9 (black j8) is not \
         allowed: j8 is forbidden for black: it makes a double three"
    );
}

#[test]
fn move_list_file_errors_name_game_move_line_and_character() {
    let text = String::from_utf8(data("games/bad_move_list_file.txt")).unwrap();
    let e = read_move_lists(&text, Choices::default()).unwrap_err();
    assert_eq!(
        (e.game, e.title.as_deref(), e.at),
        (Some(2), Some("Ladder round 2"), at(6, 4))
    );
    let MoveListProblem::Move(list) = &e.problem else {
        panic!("{e:?}")
    };
    assert_eq!((list.index, list.token.as_str()), (4, "h8"));
    assert_eq!(
        e.to_string(),
        "game 2 ('Ladder round 2'), line 6: move 4 ('h8', at character 4): that point was \
         already given as entry 1"
    );
}

#[test]
fn move_lists_written_by_us_read_back() {
    let text = String::from_utf8(data("games/circle_moves.txt")).unwrap();
    let games = read_move_lists(&text, Choices::default()).unwrap();
    let back = read_move_lists(&write_move_lists(&games), Choices::default()).unwrap();
    assert_eq!(back.len(), games.len());
    for (a, b) in games.iter().zip(&back) {
        assert_eq!((a.moves(), &a.info().title), (b.moves(), &b.info().title));
    }
}

#[test]
fn one_entry_point_reads_both_kinds() {
    let choices = Choices {
        size: None,
        rule: Some(Rule::Standard),
    };
    let sgf = read_games(&data("games/variations.sgf"), choices).unwrap();
    assert_eq!(sgf.games[0].origin().format, RecordFormat::Sgf);
    // The file names no rule, so the chosen one is kept.
    assert_eq!(sgf.games[0].rule(), Some(Rule::Standard));
    assert_eq!(sgf.warnings.len(), 1);
    let text = read_games(&data("games/circle_moves.txt"), choices).unwrap();
    assert_eq!(text.games.len(), 3);
    assert_eq!(text.games[0].rule(), Some(Rule::Standard));
    match read_games(&data("games/bad_move_list_file.txt"), choices) {
        Err(ReadError::MoveList(e)) => assert_eq!(e.game, Some(2)),
        other => panic!("{other:?}"),
    }
    match read_games(&data("games/truncated.sgf"), choices) {
        Err(ReadError::Sgf(e)) => assert_eq!(e.problem, SgfProblem::UnclosedValue),
        other => panic!("{other:?}"),
    }
}

#[test]
fn records_made_by_hand_are_checked() {
    let moves = vec![p("h8"), p("h9"), p("h8")];
    assert!(GameRecord::new(15, moves).is_err());
}

proptest! {
    /// Untrusted files never panic the reader, whatever their bytes (DESIGN section 7).
    #[test]
    fn any_bytes_give_games_or_an_error(bytes in prop::collection::vec(any::<u8>(), 0..2000)) {
        let _ = read_games(&bytes, Choices::default());
        let mut sgf = b"(;FF[4]GM[4]SZ[15]".to_vec();
        sgf.extend_from_slice(&bytes);
        let _ = read_games(&sgf, Choices::default());
    }

    /// Any text read as move lists gives games whose moves are all on the board and distinct,
    /// or an error.
    #[test]
    fn any_text_gives_valid_games_or_an_error(text in "[a-t0-9 ,;#\n]{0,300}") {
        if let Ok(games) = read_move_lists(&text, Choices::default()) {
            for g in games {
                prop_assert!(GameRecord::new(g.size(), g.moves().to_vec()).is_ok());
            }
        }
    }
}
