//! Checking a player's own game move by move ("My games").
//!
//! [`review`] replays a [`GameRecord`] under a rule and asks the solver, before and after every
//! move, the questions a coach would ask:
//!
//! * **missed win**: the side to move had a forced win (a five, a VCF, or a VCT in the class the
//!   puzzles use: the default [`crate::search::SolverConfig`]) and the move played is not a
//!   winning first move: after it the side has no win any more (asked as the grader asks it,
//!   with the move as part of the line);
//! * **blunder**: after the move the opponent has a forced win that it did not have before
//!   (had the side passed instead, the opponent would have had none);
//! * **missed defence**: the opponent threatened a forced win (it would win if the side
//!   passed), some defence existed ([`crate::search::Asking::defences`], the Study board's
//!   answer), and the move played is not one of them (after it the opponent still wins);
//! * **forbidden point** (renju): black played a forbidden point and lost there; the finding
//!   says whether black was forced onto it (the point was the only block of white's four). A
//!   win of white's that ends by driving black onto a forbidden point is a missed win or a
//!   blunder like any other, marked by [`ForcedWin::onto_forbidden`].
//!
//! Every finding carries its proved line (or the proved defences), and every move gets one
//! [`MoveVerdict`]: fine, a finding, or undecided when a question it rests on ran out of
//! budget. Nothing is guessed: a move is fine only when every question it rests on was
//! answered.
//!
//! Findings become puzzles through [`crate::puzzle::generate::analyse`], the generator's own
//! proof and quality filters (with [`Budget::GENERATION`], whatever the review's budget): a
//! finding whose position the generator would not keep (a five to make or block, too many
//! answers, a proof too dear) makes no puzzle. [`GameReview::puzzles`] collects them in a set
//! titled "From my games".

use crate::board::{threat, Board};
use crate::formats::games::{GameRecord, ReplayError};
use crate::formats::setfile::PuzzleSet;
use crate::geometry::Point;
use crate::puzzle::generate::analyse;
use crate::puzzle::{Puzzle, Theme};
use crate::rules::{Forbidden, Game, MoveError};
use crate::search::{Budget, Mode, Solution, Solver, StopCheck, Verdict};
use crate::types::{Rule, Stone};

/// The title of the set made from a game's findings.
pub const SET_TITLE: &str = "From my games";

/// A forced win found by the solver: whose, of which class, and its main line.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ForcedWin {
    /// The side that wins (plays the line's first move).
    pub side: Stone,
    /// The class the win was proved in: [`Mode::Vcf`] (fours only; a five on the board is a
    /// VCF of length 0) or [`Mode::Vct`] (threes and fours; no VCF exists).
    pub mode: Mode,
    /// The shortest main line, the winner first, ending with the five (or, for a win that
    /// drives black onto a forbidden point, with the point black cannot take).
    pub line: Vec<Point>,
    /// The length in the search's measure: fours before the five (VCF), threats that are not
    /// fours (VCT).
    pub depth: u16,
    /// Renju: the line ends on a point black must take and may not (white wins there).
    pub onto_forbidden: bool,
}

impl ForcedWin {
    /// Whether the win is a five to make at once.
    pub fn is_five(&self) -> bool {
        self.line.len() == 1
    }

    /// `"vcf"` or `"vct"`: the class of the win.
    pub const fn mode_name(&self) -> &'static str {
        match self.mode {
            Mode::Vcf => "vcf",
            Mode::Vct => "vct",
        }
    }

    /// The line's first move.
    pub fn first(&self) -> Option<Point> {
        self.line.first().copied()
    }
}

/// What was found about one move.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum FindingKind {
    /// The side that moved had a forced win before the move, and lost it with this move.
    MissedWin {
        /// The win it had (from the position before the move).
        win: ForcedWin,
    },
    /// After the move the opponent has a forced win it did not have before.
    Blunder {
        /// The opponent's win (from the position after the move).
        win: ForcedWin,
    },
    /// The opponent threatened a forced win; some moves stopped it; the move played did not.
    MissedDefence {
        /// The opponent's threat (from the position before the move, the opponent first).
        threat: ForcedWin,
        /// Every defence proved.
        defences: Vec<Point>,
        /// Whether every move that could defend was tried (see
        /// [`crate::search::Defences::complete`]).
        complete: bool,
    },
    /// Renju: black played a forbidden point and lost there.
    ForbiddenPoint {
        /// Why the point is forbidden.
        why: Forbidden,
        /// Whether the point was the only block of a white four (black was forced onto it).
        forced: bool,
    },
}

impl FindingKind {
    /// `"missed-win"`, `"blunder"`, `"missed-defence"` or `"forbidden-point"`.
    pub const fn name(&self) -> &'static str {
        match self {
            FindingKind::MissedWin { .. } => "missed-win",
            FindingKind::Blunder { .. } => "blunder",
            FindingKind::MissedDefence { .. } => "missed-defence",
            FindingKind::ForbiddenPoint { .. } => "forbidden-point",
        }
    }
}

/// One finding: the move it is about, what was found, and the puzzle made from it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Finding {
    /// The move's number in the game, counted from 1.
    pub number: usize,
    /// Who played it.
    pub colour: Stone,
    /// The point played.
    pub played: Point,
    /// What was found.
    pub kind: FindingKind,
    /// The moves of the game before the finding's line starts: `number - 1` when the line is
    /// played from the position before the move (a missed win or defence), `number` when from
    /// the position after it (a blunder, a forbidden point).
    pub at: usize,
    /// The finding as a puzzle, when the generator's filters keep its position.
    pub puzzle: Option<Puzzle>,
}

impl Finding {
    /// The line to show on the board from the position after [`Finding::at`] moves, and the
    /// side that plays its first move.
    pub fn shown_line(&self) -> (&[Point], Stone) {
        match &self.kind {
            FindingKind::MissedWin { win } | FindingKind::Blunder { win } => (&win.line, win.side),
            FindingKind::MissedDefence { threat, .. } => (&threat.line, threat.side),
            FindingKind::ForbiddenPoint { .. } => (&[], self.colour.opponent()),
        }
    }
}

/// The verdict on one move.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum MoveVerdict {
    /// Every question was answered and nothing was found.
    Fine,
    /// Something was found (see the move's findings).
    Finding,
    /// A question the verdict rests on ran out of budget (or the review was stopped): nothing
    /// is claimed either way.
    Undecided,
}

impl MoveVerdict {
    /// `"fine"`, `"finding"` or `"undecided"`.
    pub const fn name(self) -> &'static str {
        match self {
            MoveVerdict::Fine => "fine",
            MoveVerdict::Finding => "finding",
            MoveVerdict::Undecided => "undecided",
        }
    }
}

/// One move of the game, checked.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct MoveReview {
    /// The move's number in the game, counted from 1.
    pub number: usize,
    /// Who played it.
    pub colour: Stone,
    /// The point.
    pub point: Point,
    /// The verdict.
    pub verdict: MoveVerdict,
    /// What was found (empty unless the verdict is [`MoveVerdict::Finding`]).
    pub findings: Vec<Finding>,
}

/// How far a review has got: moves checked of all the moves to check.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ReviewProgress {
    /// Moves checked so far.
    pub checked: usize,
    /// Moves to check.
    pub total: usize,
}

/// A game checked move by move.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct GameReview {
    /// The rule the game was checked under.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// The moves of the game, in order, black first.
    pub game: Vec<Point>,
    /// Every move checked, in order (the moves after a forbidden point, which ends a renju
    /// game, are not checked; when the review was stopped, the moves not reached are
    /// undecided).
    pub moves: Vec<MoveReview>,
    /// Whether the stop check ended the review early.
    pub stopped: bool,
    /// The node budget of each question.
    pub budget: Budget,
    /// Nodes spent in all.
    pub nodes: u64,
    /// The winner of the game as played, if it ended with a five (or a forbidden point).
    pub winner: Option<Stone>,
}

impl GameReview {
    /// Every finding, in move order.
    pub fn findings(&self) -> impl Iterator<Item = &Finding> {
        self.moves.iter().flat_map(|m| m.findings.iter())
    }

    /// How many moves have each verdict: (fine, with a finding, undecided).
    pub fn counts(&self) -> (usize, usize, usize) {
        let n = |v| self.moves.iter().filter(|m| m.verdict == v).count();
        (
            n(MoveVerdict::Fine),
            n(MoveVerdict::Finding),
            n(MoveVerdict::Undecided),
        )
    }

    /// The puzzles made from the findings (of both sides, or of `side` only), each position
    /// once, in move order.
    pub fn puzzle_list(&self, side: Option<Stone>) -> Vec<Puzzle> {
        let mut out: Vec<Puzzle> = Vec::new();
        for f in self.findings() {
            if side.is_some_and(|s| s != f.colour) {
                continue;
            }
            if let Some(p) = &f.puzzle {
                if !out.iter().any(|q| q.id == p.id) {
                    out.push(p.clone());
                }
            }
        }
        out
    }

    /// The findings' puzzles as a set titled "From my games", made on `created`
    /// (`YYYY-MM-DD`: the engine reads no clock); `None` when no finding made a puzzle.
    pub fn puzzles(&self, side: Option<Stone>, created: &str) -> Option<PuzzleSet> {
        let puzzles = self.puzzle_list(side);
        if puzzles.is_empty() {
            return None;
        }
        Some(PuzzleSet {
            title: SET_TITLE.to_string(),
            created: created.to_string(),
            puzzles,
            generator: None,
        })
    }
}

/// What a question about one side's win answered.
#[derive(Clone, Debug)]
enum Answer {
    Win(ForcedWin),
    NoWin,
    Unknown,
}

/// Checks every move of `record` under `rule`, each question with `budget`; `stop` is polled
/// during every search and between moves, and `progress` hears after every move. Fails only
/// when the record has a move after the game was over (a five made earlier): such a record is
/// not a game, and the error names the move. A forbidden point played by black under renju is
/// a finding, not an error.
pub fn review(
    solver: &mut Solver,
    record: &GameRecord,
    rule: Rule,
    budget: Budget,
    stop: Option<StopCheck>,
    mut progress: impl FnMut(ReviewProgress),
) -> Result<GameReview, ReplayError> {
    // The moves the rule allows, and the forbidden point that ends them, if any.
    let (legal, forbidden) = match record.replay(rule) {
        Ok(_) => (record.moves().len(), None),
        Err(e) => match e.error {
            MoveError::Forbidden(p, why) => (e.number - 1, Some((p, why))),
            _ => return Err(e),
        },
    };
    let board = Board::new(record.size(), rule).expect("a record's size is checked when made");
    let mut game = Game::new(board);
    let total = legal + usize::from(forbidden.is_some());
    let mut out = GameReview {
        rule,
        size: record.size(),
        game: record.moves().to_vec(),
        moves: Vec::with_capacity(total),
        stopped: false,
        budget,
        nodes: 0,
        winner: None,
    };
    let stopped = || stop.is_some_and(|s| s(0));
    let mut nodes = 0u64;
    let mut own_next: Option<Answer> = None;
    for (i, &m) in record.moves()[..legal].iter().enumerate() {
        let me = game.to_move();
        let them = me.opponent();
        let number = i + 1;
        if out.stopped || stopped() {
            out.stopped = true;
            out.moves.push(MoveReview {
                number,
                colour: me,
                point: m,
                verdict: MoveVerdict::Undecided,
                findings: Vec::new(),
            });
            continue;
        }
        let before = game.board().clone();
        let own = match own_next.take() {
            Some(a) => a,
            None => win_of(solver, &before, me, budget, stop, &mut nodes),
        };
        let idx = before.index(m);
        let five = before.wins_at(idx, me);
        if game.play(m).is_err() {
            unreachable!("the replay allowed this move");
        }
        let after = game.board().clone();
        let mut findings = Vec::new();
        let mut undecided = false;
        if five {
            // The game ends here, won: nothing after it to ask.
            out.winner = Some(me);
        } else {
            match &own {
                Answer::Win(win) => {
                    match kept_win(solver, &before, &after, me, m, budget, stop, &mut nodes) {
                        Verdict::Win => {}
                        Verdict::NoWin => findings.push(Finding {
                            number,
                            colour: me,
                            played: m,
                            kind: FindingKind::MissedWin { win: win.clone() },
                            at: i,
                            puzzle: None,
                        }),
                        Verdict::Unknown => undecided = true,
                    }
                    let now = win_of(solver, &after, them, budget, stop, &mut nodes);
                    if !findings.is_empty() {
                        // The win let go may also have let the opponent in (a renju black
                        // stone can make its own block forbidden).
                        if let Answer::Win(win) = &now {
                            let threat = win_of(solver, &before, them, budget, stop, &mut nodes);
                            if matches!(threat, Answer::NoWin) {
                                findings.push(Finding {
                                    number,
                                    colour: me,
                                    played: m,
                                    kind: FindingKind::Blunder { win: win.clone() },
                                    at: number,
                                    puzzle: None,
                                });
                            }
                        }
                    }
                    own_next = Some(now);
                }
                Answer::NoWin | Answer::Unknown => {
                    undecided |= matches!(own, Answer::Unknown);
                    let threat = win_of(solver, &before, them, budget, stop, &mut nodes);
                    let now = win_of(solver, &after, them, budget, stop, &mut nodes);
                    match (&threat, &now) {
                        // Defended, or nothing to defend and nothing allowed.
                        (_, Answer::NoWin) => {}
                        (Answer::NoWin, Answer::Win(win)) => findings.push(Finding {
                            number,
                            colour: me,
                            played: m,
                            kind: FindingKind::Blunder { win: win.clone() },
                            at: number,
                            puzzle: None,
                        }),
                        (Answer::Win(threat), Answer::Win(_)) => {
                            let mut ask = solver.ask(budget);
                            if let Some(s) = stop {
                                ask = ask.watch(s);
                            }
                            let d = ask.defences(&before, me, Mode::Vct);
                            nodes += ask.spent();
                            let proved = d.threat == Verdict::Win && !d.moves.proved.is_empty();
                            if proved && !d.moves.proved.contains(&m) {
                                findings.push(Finding {
                                    number,
                                    colour: me,
                                    played: m,
                                    kind: FindingKind::MissedDefence {
                                        threat: threat.clone(),
                                        defences: d.moves.proved,
                                        complete: d.complete,
                                    },
                                    at: i,
                                    puzzle: None,
                                });
                            } else if !proved
                                && (d.threat != Verdict::Win || !d.moves.unknown.is_empty())
                            {
                                // No defence proved, but one may exist: say nothing.
                                undecided = true;
                            }
                            // Otherwise the position was lost whatever the move: nothing to
                            // find.
                        }
                        _ => undecided = true,
                    }
                    own_next = Some(now);
                }
            }
        }
        for f in &mut findings {
            f.puzzle = puzzle_of(solver, f, &before, &after);
        }
        let verdict = if !findings.is_empty() {
            MoveVerdict::Finding
        } else if undecided {
            MoveVerdict::Undecided
        } else {
            MoveVerdict::Fine
        };
        out.moves.push(MoveReview {
            number,
            colour: me,
            point: m,
            verdict,
            findings,
        });
        progress(ReviewProgress {
            checked: number,
            total,
        });
        if five {
            break;
        }
    }
    if let Some((p, why)) = forbidden {
        let number = legal + 1;
        let board = game.board();
        // Forced: the point was the only block of a white four.
        let fives = board.cells_with(Stone::White, threat::FIVE);
        let forced = fives.len() == 1 && fives.first() == Some(board.index(p));
        let verdict = if out.stopped {
            MoveVerdict::Undecided
        } else {
            out.winner = Some(Stone::White);
            MoveVerdict::Finding
        };
        let findings = if out.stopped {
            Vec::new()
        } else {
            vec![Finding {
                number,
                colour: Stone::Black,
                played: p,
                kind: FindingKind::ForbiddenPoint { why, forced },
                at: legal,
                puzzle: None,
            }]
        };
        out.moves.push(MoveReview {
            number,
            colour: Stone::Black,
            point: p,
            verdict,
            findings,
        });
        progress(ReviewProgress {
            checked: number,
            total,
        });
    }
    out.nodes = nodes;
    Ok(out)
}

/// Does `side`, to move on `board`, have a forced win: a VCF (a five counts, as a VCF of
/// length 0), else a VCT?
fn win_of(
    solver: &mut Solver,
    board: &Board,
    side: Stone,
    budget: Budget,
    stop: Option<StopCheck>,
    nodes: &mut u64,
) -> Answer {
    let mut ask = solver.ask(budget);
    if let Some(s) = stop {
        ask = ask.watch(s);
    }
    let vcf = ask.solve(board, side, Mode::Vcf);
    *nodes += ask.spent();
    if vcf.verdict == Verdict::Win {
        return Answer::Win(forced(board, side, Mode::Vcf, vcf));
    }
    let vct = ask.solve(board, side, Mode::Vct);
    *nodes += ask.spent();
    match vct.verdict {
        Verdict::Win => Answer::Win(forced(board, side, Mode::Vct, vct)),
        // Every VCF is inside the VCT class, so a VCT disproof settles both.
        Verdict::NoWin => Answer::NoWin,
        Verdict::Unknown => Answer::Unknown,
    }
}

fn forced(board: &Board, side: Stone, mode: Mode, s: Solution) -> ForcedWin {
    let onto_forbidden = side == Stone::White && ends_on_forbidden(board, &s.line);
    ForcedWin {
        side,
        mode,
        line: s.line,
        depth: s.depth,
        onto_forbidden,
    }
}

/// Whether white's line ends on a point black had to block and could not: the five point is
/// forbidden for black, and black's last move was elsewhere.
fn ends_on_forbidden(board: &Board, line: &[Point]) -> bool {
    if board.rule() != Rule::Renju {
        return false;
    }
    let Some((&five, rest)) = line.split_last() else {
        return false;
    };
    let mut b = board.clone();
    let mut side = Stone::White;
    for &p in rest {
        if !b.contains(p) || b.get(p).is_some() {
            return false;
        }
        b.place(p, side);
        side = side.opponent();
    }
    b.forbidden(five).is_some()
}

/// After `me` played `m` (from `before` to `after`), does `me` still have a forced win? Asked
/// with the move as part of the line, as the grader asks it: fours first, then threats.
#[allow(clippy::too_many_arguments)]
fn kept_win(
    solver: &mut Solver,
    before: &Board,
    after: &Board,
    me: Stone,
    m: Point,
    budget: Budget,
    stop: Option<StopCheck>,
    nodes: &mut u64,
) -> Verdict {
    let mut out = Verdict::NoWin;
    for mode in [Mode::Vcf, Mode::Vct] {
        let mut ask = solver.ask(budget).after(before, &[(m, me)]);
        if let Some(s) = stop {
            ask = ask.watch(s);
        }
        let (v, _) = ask.wins_after(after, me, me.opponent(), mode);
        *nodes += ask.spent();
        match v {
            Verdict::Win => return Verdict::Win,
            Verdict::Unknown => out = Verdict::Unknown,
            Verdict::NoWin => {}
        }
    }
    out
}

/// The finding's position as a puzzle, made and proved by the generator's own analysis.
fn puzzle_of(solver: &mut Solver, f: &Finding, before: &Board, after: &Board) -> Option<Puzzle> {
    match &f.kind {
        FindingKind::MissedWin { win } => win_puzzle(solver, before, win),
        FindingKind::Blunder { win } => win_puzzle(solver, after, win),
        FindingKind::MissedDefence { .. } => analyse(solver, before, f.colour, Theme::Defend),
        FindingKind::ForbiddenPoint { .. } => None,
    }
}

/// The themes a win can be a puzzle of, the most specific first.
fn win_puzzle(solver: &mut Solver, board: &Board, win: &ForcedWin) -> Option<Puzzle> {
    let mut themes = Vec::new();
    if board.rule() == Rule::Renju {
        themes.push(match win.side {
            Stone::White => Theme::ForbiddenTrap,
            Stone::Black => Theme::ForbiddenWin,
        });
    }
    match win.mode {
        Mode::Vcf => themes.extend([Theme::FourThree, Theme::Vcf]),
        Mode::Vct => themes.push(Theme::Vct),
    }
    themes
        .into_iter()
        .find_map(|t| analyse(solver, board, win.side, t))
}
