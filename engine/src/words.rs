//! Every sentence the player reads about the game, in one place.
//!
//! The engine decides in values (a [`Grade`] with its [`ReplyNote`] or [`WrongReason`], a
//! [`Hint`], a [`StudyAnswer`], an [`Attempt`]); this module turns them into plain English, so
//! the wording can be read, tidied and tested in one file, natively. Error types keep their own
//! `Display` (they say what is wrong with an input); here they only get the frame the app shows
//! them in ("Not played: ...").
//!
//! [`Grade`]: crate::puzzle::grade::Grade

use crate::geometry::Point;
use crate::puzzle::attempt::Attempt;
use crate::puzzle::grade::{ReplyNote, SolvedBy, WrongReason};
use crate::puzzle::hints::Hint;
use crate::puzzle::{Puzzle, Theme};
use crate::review::{Finding, FindingKind, ForcedWin, GameReview};
use crate::rules::{Forbidden, MoveError};
use crate::search::Mode;
use crate::study::{Study, StudyAnswer, StudySearch};
use crate::types::Stone;

/// "Black" or "White".
pub const fn colour(c: Stone) -> &'static str {
    match c {
        Stone::Black => "Black",
        Stone::White => "White",
    }
}

/// The theme in a few words, as a noun phrase: "a win with fours".
pub const fn theme(t: Theme) -> &'static str {
    match t {
        Theme::FourThree => "a four-three",
        Theme::Vcf => "a win with fours",
        Theme::Vct => "a win with threes and fours",
        Theme::Defend => "a defence",
        Theme::ForbiddenTrap => "a forbidden-point trap",
        Theme::ForbiddenWin => "a win past the forbidden points",
    }
}

/// The theme as a label for a menu, without an article: "Win with fours".
pub const fn theme_label(t: Theme) -> &'static str {
    match t {
        Theme::FourThree => "Four-three",
        Theme::Vcf => "Win with fours",
        Theme::Vct => "Win with threes and fours",
        Theme::Defend => "Defence",
        Theme::ForbiddenTrap => "Forbidden-point trap",
        Theme::ForbiddenWin => "Win past forbidden points",
    }
}

/// How a try went, for marks and summaries: "not tried", "in progress", "solved", "solved
/// with help", "failed".
pub const fn attempt(a: Attempt) -> &'static str {
    match a {
        Attempt::Untried => "not tried",
        Attempt::Trying => "in progress",
        Attempt::Clean => "solved",
        Attempt::Helped => "solved with help",
        Attempt::Failed => "failed",
    }
}

/// The goal of a puzzle, for the player: "Black to play and win with fours".
pub fn goal(p: &Puzzle) -> String {
    let me = colour(p.to_move);
    let them = colour(p.to_move.opponent());
    match p.theme {
        Theme::FourThree => format!("{me} to play: find the four-three and win"),
        Theme::Vcf => format!("{me} to play and win with fours"),
        Theme::Vct => format!("{me} to play and win with threes and fours"),
        Theme::Defend => format!("{me} to play: stop {them}'s win"),
        Theme::ForbiddenTrap => {
            format!("{me} to play and win: drive {them} onto a forbidden point")
        }
        Theme::ForbiddenWin => {
            format!("{me} to play and win with fours; mind the forbidden points")
        }
    }
}

/// A puzzle's answer key in two sentences, for an instructor previewing a set: "Correct first
/// moves: h8. Main line: h8 h9 i8 i9 j8." (for a defence: "Defences: ... The threat: ...").
pub fn answer_key(p: &Puzzle) -> String {
    let (first, line) = match p.goal() {
        crate::puzzle::Goal::Win => ("Correct first moves", "Main line"),
        crate::puzzle::Goal::Defend => ("Defences", "The threat"),
    };
    let spaced = |v: &[Point]| {
        v.iter()
            .map(|q| q.to_string())
            .collect::<Vec<_>>()
            .join(" ")
    };
    format!(
        "{first}: {}. {line}: {}.",
        commas(&p.first_moves),
        spaced(&p.line)
    )
}

/// "a double three" (what a forbidden point would make).
pub const fn forbidden(why: Forbidden) -> &'static str {
    why.words()
}

/// A move that was not played, and why.
pub fn not_played(e: &MoveError) -> String {
    match e {
        MoveError::OffBoard(p) => format!("Not played: {p} is off the board."),
        MoveError::Occupied(p) => format!("Not played: {p} is already taken."),
        MoveError::Forbidden(p, why) => format!(
            "Not played: {p} is forbidden for Black: it makes {}.",
            forbidden(*why)
        ),
        MoveError::GameOver => "Not played: the game is over.".to_string(),
    }
}

/// A stone played: "Black h8."
pub fn played(c: Stone, p: Point) -> String {
    format!("{} {p}.", colour(c))
}

/// The player's move was accepted: "Black h8: correct."
pub fn correct(c: Stone, p: Point) -> String {
    format!("{} {p}: correct.", colour(c))
}

/// The player's move was wrong: "Black h8: not right."
pub fn not_right(c: Stone, p: Point) -> String {
    format!("{} {p}: not right.", colour(c))
}

/// A point chosen with the first of two taps.
pub fn selected(p: Point) -> String {
    format!("{p} selected: tap it again to play.")
}

/// A move whose grade could not be decided within the budget: "Black k10: not decided."
pub fn undecided(c: Stone, p: Point) -> [String; 2] {
    [
        format!("{} {p}: not decided.", colour(c)),
        format!(
            "Neither a win after {p} nor a refutation of it could be proved within the time a \
             phone allows, so it was taken back. Try another move, or study it on the Study \
             board."
        ),
    ]
}

/// A move while the solution is on the board.
pub const SOLUTION_SHOWN: &str = "The solution is on the board: try again to play it yourself.";

/// One move of a solution being shown: "3. Black j9." and, for the last, that it ends there.
pub fn solution_step(number: usize, c: Stone, p: Point, last: bool) -> String {
    if last {
        format!("{number}. {} {p}: the end of the solution.", colour(c))
    } else {
        format!("{number}. {} {p}.", colour(c))
    }
}

/// A move after the puzzle ended.
pub const FINISHED: &str = "The puzzle is over: undo or try again.";

/// Enter pressed before the keyboard cursor was moved.
pub const NO_CURSOR: &str = "Move the cursor with the arrow keys first.";

/// What the opponent's reply to an accepted move does; `player` is the side solving.
pub fn reply(note: ReplyNote, reply: Point, player: Stone) -> String {
    let t = colour(player.opponent());
    match note {
        ReplyNote::Blocks => format!("{t} blocks at {reply}."),
        ReplyNote::BlocksOneOfTwo => format!("{t} blocks at {reply}, but cannot block both ends."),
        ReplyNote::BlocksWithFour => format!("{t} blocks at {reply} and makes a four of its own."),
        ReplyNote::CannotBlock { at, why } => format!(
            "{t} cannot block at {at}: it would make {} (forbidden for Black); {t} plays {reply}.",
            forbidden(why)
        ),
        ReplyNote::AnswersWithFour => format!("{t} answers at {reply} with a four."),
        ReplyNote::Defends => format!("{t} defends at {reply}."),
        ReplyNote::MustBlock => format!("{t} must block at {reply}. Now stop the threat."),
    }
}

/// The puzzle is solved: "Solved. Five in a row."
pub fn solved(by: SolvedBy, player: Stone) -> String {
    match by {
        SolvedBy::Five => "Solved. Five in a row.".to_string(),
        SolvedBy::Stopped => format!(
            "Solved. {} has stopped {}'s attack.",
            colour(player),
            colour(player.opponent())
        ),
    }
}

/// Why the player's move `p` is wrong, in one sentence.
pub fn wrong(reason: WrongReason, p: Point, player: Stone) -> String {
    let (m, t) = (colour(player), colour(player.opponent()));
    match reason {
        WrongReason::NoFollowUp {
            block,
            counter_four,
            fours,
        } => {
            let with = if counter_four {
                " with a four of its own"
            } else {
                ""
            };
            let follow = if fours {
                "no more fours that win"
            } else {
                "no winning follow-up"
            };
            format!("{t} blocks at {block}{with}, and {m} has {follow}.")
        }
        WrongReason::OpponentWins {
            first,
            not_a_four: true,
        } => format!("{p} is not a four, so {t} is free to play {first} and win with fours."),
        WrongReason::OpponentWins {
            first,
            not_a_four: false,
        } => format!("{t} answers with a win of its own, starting at {first}."),
        WrongReason::Stopped {
            at,
            counter_four: true,
            ..
        } => format!("{t} answers at {at} with a four of its own, and the attack stalls."),
        WrongReason::Stopped {
            at,
            not_a_four: true,
            ..
        } => format!("{p} is not a four, so {t} has time to defend at {at}."),
        WrongReason::Stopped { at, .. } => {
            format!("{t} defends at {at}, and {m} has no more threats that win.")
        }
        WrongReason::NotForcing { fours: true } => {
            // True of a four-three puzzle too: its key is a four, and so is every move after.
            format!("{p} is not a four; every attacking move of this puzzle's win is a four.")
        }
        WrongReason::NotForcing { fours: false } => {
            format!("{p} is not a forcing move; this puzzle asks for a win with threes and fours.")
        }
        WrongReason::DoesNotStop { first, with_fours } => {
            let how = if with_fours {
                "wins with fours"
            } else {
                "wins with threes and fours"
            };
            format!("{p} does not stop it: {t} plays {first} and {how}.")
        }
    }
}

fn count(k: u16, one: &str, many: &str) -> String {
    if k == 1 {
        format!("1 {one}")
    } else {
        format!("{k} {many}")
    }
}

/// A hint in words.
pub fn hint(h: &Hint) -> String {
    match *h {
        Hint::Theme {
            theme,
            length,
            attacker,
        } => match theme {
            Theme::FourThree => "A four-three: one move makes a four and an open three.".into(),
            Theme::Vcf | Theme::ForbiddenWin => format!(
                "A win with fours: {}, then the five.",
                count(length, "four", "fours")
            ),
            Theme::Vct => format!(
                "A win with threats: {} besides fours.",
                count(length, "three or threat", "threes or threats")
            ),
            Theme::Defend => format!(
                "A defence: {} threatens a win; find the move that stops it.",
                colour(attacker)
            ),
            Theme::ForbiddenTrap => {
                "A forbidden-point trap: make Black's only block a forbidden point.".into()
            }
        },
        Hint::Area { from, to } => format!("The key move is between {from} and {to}."),
        Hint::Move(m) => format!("The key move is {m}."),
    }
}

/// No hint is given once the puzzle is over.
pub const NO_HINT: &str = "No hint: the puzzle is over.";

/// The heading of a study board's description: "Study board, renju rules, 15 by 15. Black to
/// move."
pub fn study_heading(rule: crate::types::Rule, size: u8, to_move: Stone) -> String {
    format!(
        "Study board, {} rules, {size} by {size}. {} to move.",
        rule.name(),
        colour(to_move)
    )
}

/// A study board's side to move: "Black to move".
pub fn to_move(c: Stone) -> String {
    format!("{} to move", colour(c))
}

/// A board in words, for a screen reader: `head`, then every stone by colour (each list in
/// row order from a1), then the last move.
pub fn board(head: &str, black: &[Point], white: &[Point], last: Option<(Point, Stone)>) -> String {
    let names = |v: &[Point]| {
        if v.is_empty() {
            "none".to_string()
        } else {
            commas(v)
        }
    };
    let mut out = format!(
        "{head} Black stones ({}): {}. White stones ({}): {}.",
        black.len(),
        names(black),
        white.len(),
        names(white)
    );
    if let Some((p, c)) = last {
        out.push_str(&format!(" Last move: {} {p}.", colour(c)));
    }
    out
}

/// A stone set up on the study board: "Black h8 (set up)."
pub fn set_up(c: Stone, p: Point) -> String {
    format!("{} {p} (set up).", colour(c))
}

/// A stone taken off the study board: "Removed black h8."
pub fn removed(c: Stone, p: Point) -> String {
    format!("Removed {} {p}.", c.name())
}

/// A five made on the study board, or one on the board it shows.
pub fn five_made(c: Stone) -> String {
    format!("{} has five in a row.", colour(c))
}

/// One step of a line shown on the study board: "3. Black h8", or that it is hidden.
pub fn line_step(shown: usize, c: Stone, p: Option<Point>) -> String {
    match p {
        Some(p) if shown > 0 => format!("{shown}. {} {p}", colour(c)),
        _ => "The line is hidden.".to_string(),
    }
}

/// A day (days since 1970-01-01) as the player reads it: "Tuesday 8 December 2026".
pub fn date(day: crate::schedule::Day) -> String {
    // Civil date from a day count (H. Hinnant, "chrono-Compatible Low-Level Date
    // Algorithms", days_from_civil's inverse); 1970-01-01 was a Thursday.
    let z = i64::from(day) + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1_460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    const DAYS: [&str; 7] = [
        "Thursday",
        "Friday",
        "Saturday",
        "Sunday",
        "Monday",
        "Tuesday",
        "Wednesday",
    ];
    const MONTHS: [&str; 12] = [
        "January",
        "February",
        "March",
        "April",
        "May",
        "June",
        "July",
        "August",
        "September",
        "October",
        "November",
        "December",
    ];
    format!(
        "{} {d} {} {y}",
        DAYS[(day % 7) as usize],
        MONTHS[(m - 1) as usize]
    )
}

/// When a puzzle of Revisit comes back: "Comes back in 4 days (Sunday 6 December 2026)."
pub fn comes_back(today: crate::schedule::Day, due: crate::schedule::Day) -> String {
    match due.saturating_sub(today) {
        0 => "Comes back today.".to_string(),
        1 => format!("Comes back tomorrow ({}).", date(due)),
        n => format!("Comes back in {n} days ({}).", date(due)),
    }
}

/// What leaving a Drill puzzle cost.
pub fn skipped(s: crate::rating::drill::Skip) -> Option<String> {
    use crate::rating::drill::{Skip, SkipReason};
    match s {
        Skip::NotASkip => None,
        Skip::Free { left } => Some(format!(
            "Skipped without a move: a free skip ({left} left today)."
        )),
        Skip::Counted(SkipReason::Touched) => {
            Some("Left unfinished: it counts as not solved.".to_string())
        }
        Skip::Counted(SkipReason::NoFreeSkips) => {
            Some("No free skips left today, so this skip counts as not solved.".to_string())
        }
    }
}

/// Which puzzles a drill chooses from, and why: "Choosing puzzles rated 1300 to 1700, around
/// your renju rating of 1500 (give or take 700)." The "give or take" is twice the rating
/// deviation, the same figure as Drill's rating line ("1500 ± 700") and Progress: the true
/// rating lies within it 19 times in 20.
pub fn band(b: &crate::rating::drill::Band, rule: crate::types::Rule) -> String {
    use crate::rating::drill::Placement;
    let r = &b.reason;
    let you = format!(
        "your {} rating of {:.0} (give or take {:.0})",
        rule.name(),
        r.rating,
        2.0 * r.deviation
    );
    let why = match r.placement {
        Placement::AroundRating => format!("around {you}"),
        Placement::EasiestKnown => {
            format!("the easiest known for this theme, since {you} is below them")
        }
        Placement::HardestKnown => {
            format!("the hardest known for this theme, since {you} is above them")
        }
        Placement::WholeRange => format!("the whole known range of this theme, for {you}"),
    };
    format!("Choosing puzzles rated {} to {}: {why}.", b.low, b.high)
}

/// A count with thousands separated by commas: "3,000,000".
pub fn thousands(n: u64) -> String {
    let digits = n.to_string();
    let mut out = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// Positions searched, in words: "1 position searched", "3,000,002 positions searched".
pub fn searched(nodes: u64) -> String {
    let s = if nodes == 1 { "" } else { "s" };
    format!("{} position{s} searched", thousands(nodes))
}

/// A search under way, in words: "Searching for the defences: 1.2 s, 340,000 of 3,000,000
/// positions." (`search` names what is searched for).
pub fn searching(search: StudySearch, seconds: f64, spent: u64, budget: u64) -> String {
    let what = match search {
        StudySearch::Vcf => "a win with fours (VCF)",
        StudySearch::Vct => "a win with threes and fours (VCT)",
        StudySearch::Defend => "the defences",
    };
    format!(
        "Searching for {what}: {seconds:.1} s, {} of {} positions.",
        thousands(spent),
        thousands(budget)
    )
}

/// A forced win as a noun phrase: "a five at j9", "a win with fours starting at j9: 7 fours",
/// "a win with threes and fours starting at j9: 2 threes, 11 moves in all", "a win starting
/// at j9 that drives Black onto a forbidden point: 9 moves".
pub fn forced_win(w: &ForcedWin) -> String {
    let Some(first) = w.first() else {
        return "a win".to_string();
    };
    if w.is_five() {
        return format!("a five at {first}");
    }
    let moves = w.line.len();
    if w.onto_forbidden {
        return format!(
            "a win starting at {first} that drives {} onto a forbidden point: {moves} moves",
            colour(w.side.opponent())
        );
    }
    match w.mode {
        Mode::Vcf => format!(
            "a win with fours starting at {first}: {}",
            count(w.depth, "four", "fours")
        ),
        Mode::Vct => format!(
            "a win with threes and fours starting at {first}: {}, {moves} moves in all",
            count(w.depth, "three", "threes")
        ),
    }
}

/// A finding of a game review in one or two sentences: "Move 23: Black had a win with fours
/// starting at j9: 7 fours. Black's k10 lets it go."
pub fn finding(f: &Finding) -> String {
    let me = colour(f.colour);
    let n = f.number;
    let played = f.played;
    match &f.kind {
        FindingKind::MissedWin { win } => format!(
            "Move {n}: {me} had {}. {me}'s {played} lets it go.",
            forced_win(win)
        ),
        FindingKind::Blunder { win } => format!(
            "Move {n}: after {me}'s {played}, {} has {}.",
            colour(win.side),
            forced_win(win)
        ),
        FindingKind::MissedDefence {
            threat,
            defences,
            complete,
            all,
        } => {
            let stops = match defences.len() {
                1 if !*all => format!("A defence was {}.", defences[0]),
                _ if !*all => format!("Defences included {}.", commas(defences)),
                1 if *complete => format!("The only defence was {}.", defences[0]),
                1 => format!("The defence found was {}.", defences[0]),
                _ => format!("The defences were {}.", commas(defences)),
            };
            format!(
                "Move {n}: {} threatened {}; {me}'s {played} does not stop it. {stops}",
                colour(threat.side),
                forced_win(threat)
            )
        }
        FindingKind::ForbiddenPoint { why, forced } => {
            let them = colour(f.colour.opponent());
            if *forced {
                format!(
                    "Move {n}: {me} had to block {them}'s four at {played}, but it is \
                     forbidden for {me} ({}): {them} wins.",
                    forbidden(*why)
                )
            } else {
                format!(
                    "Move {n}: {me}'s {played} is a forbidden point ({}): {them} wins.",
                    forbidden(*why)
                )
            }
        }
    }
}

/// A review in one sentence: "60 moves checked: 3 findings, 1 move undecided."
pub fn review_summary(r: &GameReview) -> String {
    let (_, _, undecided) = r.counts();
    let unchecked = r.unchecked();
    review_counts(
        r.moves.len() - unchecked,
        r.findings().count(),
        undecided,
        r.stopped.then_some(unchecked),
    )
}

/// A review in one sentence from its counts: moves checked, findings, moves undecided, and,
/// when the check was stopped, the moves not checked.
pub fn review_counts(
    checked: usize,
    findings: usize,
    undecided: usize,
    unchecked: Option<usize>,
) -> String {
    let n = |k: usize| k.min(u16::MAX as usize) as u16;
    let mut out = format!(
        "{} checked: {}",
        count(n(checked), "move", "moves"),
        match findings {
            0 => "nothing found".to_string(),
            k => count(n(k), "finding", "findings"),
        }
    );
    if undecided > 0 {
        out.push_str(&format!(
            ", {} undecided",
            count(n(undecided), "move", "moves")
        ));
    }
    out.push('.');
    if let Some(left) = unchecked {
        out.push_str(&format!(
            " The check was stopped: {} not checked.",
            count(n(left), "move", "moves")
        ));
    }
    out
}

fn list(points: &[Point]) -> String {
    points
        .iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(" ")
}

fn commas(points: &[Point]) -> String {
    points
        .iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(", ")
}

/// What a study search found, in sentences.
pub fn study(s: &Study) -> Vec<String> {
    let me = colour(s.to_move);
    let them = colour(s.to_move.opponent());
    let mut out = Vec::new();
    match &s.answer {
        StudyAnswer::Win {
            line,
            first_moves,
            undecided,
            ..
        } => {
            // Both sides' moves are counted: the list shows them all.
            let total = line.len();
            let fours = total.div_ceil(2).saturating_sub(1);
            if s.search == StudySearch::Vcf {
                out.push(format!(
                    "{me} wins with fours: {} and the five, {total} moves in all: {}.",
                    count(fours as u16, "four", "fours"),
                    list(line)
                ));
            } else {
                out.push(format!(
                    "{me} wins with threes and fours, {total} moves in all: {}.",
                    list(line)
                ));
            }
            let others: Vec<Point> = first_moves
                .iter()
                .copied()
                .filter(|p| Some(p) != line.first())
                .collect();
            if !others.is_empty() {
                out.push(format!("Other first moves that win: {}.", commas(&others)));
            }
            if !undecided.is_empty() {
                out.push(format!(
                    "Not decided within {} positions: {}.",
                    thousands(s.budget),
                    commas(undecided)
                ));
            }
        }
        StudyAnswer::NoWin if s.search == StudySearch::Vcf => {
            out.push(format!("{me} has no win with fours here."))
        }
        StudyAnswer::NoWin => out.push(format!(
            "{me} has no win with threes and fours here (the search allows up to six threes)."
        )),
        StudyAnswer::Threat {
            threat,
            defences,
            undecided,
            complete,
        } => {
            out.push(format!(
                "{them} threatens to win: {} (step through it below).",
                list(threat)
            ));
            let near = if *complete {
                ""
            } else {
                " among the points near the threat's line (the search tries only those \
                 against a threat with threes; a defence elsewhere is possible)"
            };
            if defences.is_empty() && undecided.is_empty() {
                if *complete {
                    out.push(format!("No move stops it: {me} loses."));
                } else {
                    out.push(format!("No move stops it{near}."));
                }
            } else if !defences.is_empty() {
                let n = defences.len();
                out.push(format!(
                    "{n} move{} stop{} it{near}: {}.",
                    if n == 1 { "" } else { "s" },
                    if n == 1 { "s" } else { "" },
                    commas(defences)
                ));
            }
            if !undecided.is_empty() {
                out.push(format!(
                    "Not decided within {} positions: {}.",
                    thousands(s.budget),
                    commas(undecided)
                ));
            }
        }
        StudyAnswer::NoThreat => out.push(format!(
            "{them} has no win with threes and fours to stop: {me} is free to play anywhere."
        )),
        StudyAnswer::Undecided => out.push(format!(
            "Not decided within {} positions; a smaller question (VCF) may still be answered.",
            thousands(s.budget)
        )),
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::str::FromStr;

    #[test]
    fn the_drill_band_says_the_rating_give_or_take_twice_its_deviation() {
        use crate::rating::drill::band as drill_band;
        use crate::rating::Rating;
        use crate::types::Rule;
        let player = Rating {
            rating: 1261.0,
            deviation: 272.6,
            volatility: 0.06,
        };
        let said = band(&drill_band(&player, &[1100, 1400, 1700]), Rule::Renju);
        assert!(
            said.contains("your renju rating of 1261 (give or take 545)"),
            "{said}"
        );
    }

    fn pts(s: &str) -> Vec<Point> {
        s.split_whitespace()
            .map(|t| Point::from_str(t).unwrap())
            .collect()
    }

    fn study_of(search: StudySearch, side: Stone, answer: StudyAnswer, budget: u64) -> Study {
        Study {
            search,
            to_move: side,
            answer,
            threat: None,
            budget,
            nodes: budget,
        }
    }

    #[test]
    fn one_position_is_singular() {
        assert_eq!(searched(1), "1 position searched");
        assert_eq!(searched(3_000_002), "3,000,002 positions searched");
    }

    #[test]
    fn an_answer_key_names_every_first_move_and_the_line() {
        let set = crate::formats::setfile::parse(include_str!("../../tests/data/fixture_set.json"))
            .unwrap();
        for p in &set.puzzles {
            let key = answer_key(p);
            let label = match p.goal() {
                crate::puzzle::Goal::Win => "Correct first moves: ",
                crate::puzzle::Goal::Defend => "Defences: ",
            };
            assert!(key.starts_with(label), "{key}");
            for m in &p.first_moves {
                assert!(key.contains(&m.to_string()), "{m} missing from {key}");
            }
            let line: Vec<String> = p.line.iter().map(|q| q.to_string()).collect();
            assert!(key.ends_with(&format!(": {}.", line.join(" "))), "{key}");
        }
    }

    #[test]
    fn study_results_in_words() {
        let w = study(&study_of(
            StudySearch::Vcf,
            Stone::Black,
            StudyAnswer::Win {
                line: pts("d8 d9 f10 h10 g11"),
                depth: 2,
                first_moves: pts("d8 f10"),
                undecided: vec![],
            },
            120,
        ));
        assert_eq!(
            w,
            vec![
                "Black wins with fours: 2 fours and the five, 5 moves in all: d8 d9 f10 h10 g11.",
                "Other first moves that win: f10."
            ]
        );
        let w = study(&study_of(
            StudySearch::Vct,
            Stone::White,
            StudyAnswer::NoWin,
            9,
        ));
        assert_eq!(
            w,
            vec![
                "White has no win with threes and fours here (the search allows up to six threes)."
            ]
        );
        let w = study(&study_of(
            StudySearch::Defend,
            Stone::Black,
            StudyAnswer::Threat {
                threat: pts("h8 h9 h10"),
                defences: pts("h9"),
                undecided: pts("j9"),
                complete: true,
            },
            9,
        ));
        assert_eq!(
            w,
            vec![
                "White threatens to win: h8 h9 h10 (step through it below).",
                "1 move stops it: h9.",
                "Not decided within 9 positions: j9."
            ]
        );
        let lost = StudyAnswer::Threat {
            threat: pts("h8"),
            defences: vec![],
            undecided: vec![],
            complete: true,
        };
        assert_eq!(lost.result(), "lost");
        let w = study(&study_of(StudySearch::Defend, Stone::Black, lost, 9));
        assert_eq!(w[1], "No move stops it: Black loses.");
        let w = study(&study_of(
            StudySearch::Defend,
            Stone::White,
            StudyAnswer::NoThreat,
            9,
        ));
        assert_eq!(
            w,
            vec!["Black has no win with threes and fours to stop: White is free to play anywhere."]
        );
        let w = study(&study_of(
            StudySearch::Vct,
            Stone::Black,
            StudyAnswer::Undecided,
            3_000_000,
        ));
        assert!(
            w[0].starts_with("Not decided within 3,000,000 positions"),
            "{}",
            w[0]
        );
        assert_eq!(thousands(999), "999");
        assert_eq!(thousands(1_000), "1,000");
    }

    #[test]
    fn dates_are_the_calendar_s() {
        // 1970-01-01 was a Thursday (common knowledge); 2026-12-02 is day 20,789 (days
        // between the two dates, counted by Python's datetime.date subtraction).
        assert_eq!(date(0), "Thursday 1 January 1970");
        assert_eq!(date(20_789), "Wednesday 2 December 2026");
        // 2024 is a leap year: day 19,782 is 29 February 2024.
        assert_eq!(date(19_782), "Thursday 29 February 2024");
        assert_eq!(
            comes_back(20_789, 20_790),
            "Comes back tomorrow (Thursday 3 December 2026)."
        );
        assert_eq!(comes_back(20_789, 20_789), "Comes back today.");
    }

    #[test]
    fn a_reply_that_cannot_block_says_where_it_went() {
        let (e9, d8): (Point, Point) = ("e9".parse().unwrap(), "d8".parse().unwrap());
        let said = reply(
            ReplyNote::CannotBlock {
                at: e9,
                why: Forbidden::DoubleFour,
            },
            d8,
            Stone::White,
        );
        assert!(
            said.starts_with("Black cannot block at e9: it would make "),
            "{said}"
        );
        assert!(
            said.ends_with(" (forbidden for Black); Black plays d8."),
            "{said}"
        );
    }

    #[test]
    fn wrong_moves_are_explained_from_the_player_side() {
        let p: Point = "k8".parse().unwrap();
        let l8: Point = "l8".parse().unwrap();
        assert_eq!(
            wrong(
                WrongReason::NoFollowUp {
                    block: l8,
                    counter_four: true,
                    fours: false,
                },
                p,
                Stone::Black
            ),
            "White blocks at l8 with a four of its own, and Black has no winning follow-up."
        );
        assert_eq!(
            wrong(
                WrongReason::NoFollowUp {
                    block: l8,
                    counter_four: false,
                    fours: true,
                },
                p,
                Stone::Black
            ),
            "White blocks at l8, and Black has no more fours that win."
        );
        assert_eq!(
            wrong(WrongReason::NotForcing { fours: true }, p, Stone::Black),
            "k8 is not a four; every attacking move of this puzzle's win is a four."
        );
        assert_eq!(
            wrong(
                WrongReason::Stopped {
                    at: l8,
                    counter_four: false,
                    not_a_four: true
                },
                p,
                Stone::White
            ),
            "k8 is not a four, so Black has time to defend at l8."
        );
        assert_eq!(
            not_played(&MoveError::Forbidden(p, Forbidden::DoubleThree)),
            "Not played: k8 is forbidden for Black: it makes a double three."
        );
    }
}
