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
//! Every finding carries its proved line (or a proved defence), and every move gets one
//! [`MoveVerdict`]: fine, a finding, undecided when a question it rests on ran out of budget,
//! or not checked when the review was stopped first. Nothing is guessed: a move is fine only
//! when every question it rests on was answered.
//!
//! The check asks only what the verdicts need, cheapest first: the side's own win at a
//! position is the answer the previous move's check already gave about the opponent's win
//! after it (one question serves both moves); whether the opponent threatened a win before
//! the move is asked only when it has one after it; and a missed defence needs one proved
//! defence, not the list ([`crate::search::Asking::first_defence`]). The rest is asked when a
//! player wants it: [`GameReview::list_defences`] (or [`every_defence`]) for every defence,
//! and [`GameReview::make_puzzles`] (or [`finding_puzzle`]) for the puzzles.
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
        /// The defences proved: the first one found, or every one when `all` says so.
        defences: Vec<Point>,
        /// Whether every move that could defend was tried (see
        /// [`crate::search::Defences::complete`]); meaningful when `all`.
        complete: bool,
        /// Whether `defences` is the whole list (every candidate tried), not only the first
        /// defence found ([`GameReview::list_defences`] completes it).
        all: bool,
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
    /// The finding as a puzzle, when the generator's filters keep its position (made by
    /// [`GameReview::make_puzzles`]; `None` before).
    pub puzzle: Option<Puzzle>,
}

/// What a finding's puzzle is asked about: the side to play from the finding's position, and
/// whether it is to win (with the class of the win found) or to defend.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PuzzleAim {
    /// `side` to play and win; `mode` is the class of the win the review proved.
    Win {
        /// The side to play.
        side: Stone,
        /// The class of the win.
        mode: Mode,
    },
    /// `side` to play and stop the opponent's win.
    Defend {
        /// The side to play.
        side: Stone,
    },
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

    /// What the finding's puzzle would ask, from the position after [`Finding::at`] moves;
    /// `None` for a forbidden point (the game is over there).
    pub fn aim(&self) -> Option<PuzzleAim> {
        match &self.kind {
            FindingKind::MissedWin { win } | FindingKind::Blunder { win } => Some(PuzzleAim::Win {
                side: win.side,
                mode: win.mode,
            }),
            FindingKind::MissedDefence { .. } => Some(PuzzleAim::Defend { side: self.colour }),
            FindingKind::ForbiddenPoint { .. } => None,
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
    /// A question the verdict rests on ran out of budget: nothing is claimed either way.
    Undecided,
    /// The review was stopped before this move's check was done: nothing is claimed.
    Unchecked,
}

impl MoveVerdict {
    /// `"fine"`, `"finding"`, `"undecided"` or `"unchecked"`.
    pub const fn name(self) -> &'static str {
        match self {
            MoveVerdict::Fine => "fine",
            MoveVerdict::Finding => "finding",
            MoveVerdict::Undecided => "undecided",
            MoveVerdict::Unchecked => "unchecked",
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

/// How far a review has got: moves checked of all the moves to check, and the move just
/// checked (so that a caller that may be stopped keeps every move checked so far).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ReviewProgress {
    /// Moves checked so far.
    pub checked: usize,
    /// Moves to check.
    pub total: usize,
    /// The move just checked, with its verdict and findings.
    pub latest: MoveReview,
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
    /// game, are not checked; when the review was stopped, the moves not done are
    /// [`MoveVerdict::Unchecked`]).
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

    /// How many moves have each verdict: (fine, with a finding, undecided); the moves not
    /// checked are the rest ([`GameReview::unchecked`]).
    pub fn counts(&self) -> (usize, usize, usize) {
        let n = |v| self.moves.iter().filter(|m| m.verdict == v).count();
        (
            n(MoveVerdict::Fine),
            n(MoveVerdict::Finding),
            n(MoveVerdict::Undecided),
        )
    }

    /// How many moves were not checked (the review was stopped first).
    pub fn unchecked(&self) -> usize {
        self.moves
            .iter()
            .filter(|m| m.verdict == MoveVerdict::Unchecked)
            .count()
    }

    /// The position after the game's first `at` moves (at most the moves the rule allows).
    fn position(&self, at: usize) -> Board {
        let board = Board::new(self.size, self.rule).expect("a review's size is a record's");
        let mut game = Game::new(board);
        for &m in &self.game[..at.min(self.game.len())] {
            if game.play(m).is_err() {
                break;
            }
        }
        game.board().clone()
    }

    /// Makes the findings' puzzles (of both sides, or of `side` only) that are not made yet,
    /// each proved by the generator's own analysis ([`finding_puzzle`]); `progress` hears
    /// (findings done, findings to do) after each, and `stop`, polled between findings, ends
    /// the work early (the findings not reached keep no puzzle).
    pub fn make_puzzles(
        &mut self,
        solver: &mut Solver,
        side: Option<Stone>,
        stop: Option<StopCheck>,
        mut progress: impl FnMut(usize, usize),
    ) {
        let todo: Vec<(usize, usize)> = self
            .moves
            .iter()
            .enumerate()
            .flat_map(|(i, m)| (0..m.findings.len()).map(move |j| (i, j)))
            .filter(|&(i, j)| {
                let f = &self.moves[i].findings[j];
                side.is_none_or(|s| s == f.colour) && f.puzzle.is_none() && f.aim().is_some()
            })
            .collect();
        let total = todo.len();
        for (k, (i, j)) in todo.into_iter().enumerate() {
            if stop.is_some_and(|s| s(0)) {
                return;
            }
            let f = &self.moves[i].findings[j];
            let (at, aim) = (f.at, f.aim());
            let board = self.position(at);
            if let Some(aim) = aim {
                self.moves[i].findings[j].puzzle = finding_puzzle(solver, &board, aim);
            }
            progress(k + 1, total);
        }
    }

    /// Completes every missed defence's list of defences ([`every_defence`], each asked with
    /// `budget`); a list that budget cannot complete keeps what it had.
    pub fn list_defences(&mut self, solver: &mut Solver, budget: Budget) {
        for i in 0..self.moves.len() {
            for j in 0..self.moves[i].findings.len() {
                let f = &self.moves[i].findings[j];
                let (at, colour) = (f.at, f.colour);
                if !matches!(f.kind, FindingKind::MissedDefence { all: false, .. }) {
                    continue;
                }
                let board = self.position(at);
                if let Some((list, done)) = every_defence(solver, &board, colour, budget, None) {
                    if let FindingKind::MissedDefence {
                        defences,
                        complete,
                        all,
                        ..
                    } = &mut self.moves[i].findings[j].kind
                    {
                        *defences = list;
                        *complete = done;
                        *all = true;
                    }
                }
            }
        }
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
/// during every search and between moves, and `progress` hears after every move (with the
/// move's verdict, so that a caller keeps what was checked whatever happens next). Fails only
/// when the record has a move after the game was over (a five made earlier): such a record is
/// not a game, and the error names the move. A forbidden point played by black under renju is
/// a finding, not an error. No puzzle is made here ([`GameReview::make_puzzles`]), and a
/// missed defence holds the first defence found ([`GameReview::list_defences`]).
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
    let mut q = Questions {
        solver,
        budget,
        stop,
        nodes: 0,
    };
    // The side to move's own win at the next position: the answer about the opponent's win
    // after the move just checked (the same position, the same side to move).
    let mut own_next: Option<Answer> = None;
    for (i, &m) in record.moves()[..legal].iter().enumerate() {
        let me = game.to_move();
        let number = i + 1;
        let unchecked = MoveReview {
            number,
            colour: me,
            point: m,
            verdict: MoveVerdict::Unchecked,
            findings: Vec::new(),
        };
        if out.stopped || stopped() {
            out.stopped = true;
            out.moves.push(unchecked);
            continue;
        }
        let before = game.board().clone();
        let five = before.wins_at(before.index(m), me);
        if game.play(m).is_err() {
            unreachable!("the replay allowed this move");
        }
        let after = game.board().clone();
        let (verdict, findings, now) = if five {
            // The game ends here, won: nothing after it to ask.
            out.winner = Some(me);
            (MoveVerdict::Fine, Vec::new(), None)
        } else {
            let own = match own_next.take() {
                Some(a) => a,
                None => q.win_of(&before, me),
            };
            let (verdict, findings, now) = q.check_move(&before, &after, me, m, i, own);
            (verdict, findings, Some(now))
        };
        own_next = now;
        if stopped() {
            // Stopped during this move's questions: its answers may be cut short.
            out.stopped = true;
            out.moves.push(unchecked);
            continue;
        }
        let checked = MoveReview {
            number,
            colour: me,
            point: m,
            verdict,
            findings,
        };
        out.moves.push(checked.clone());
        progress(ReviewProgress {
            checked: number,
            total,
            latest: checked,
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
        let mut checked = MoveReview {
            number,
            colour: Stone::Black,
            point: p,
            verdict: MoveVerdict::Unchecked,
            findings: Vec::new(),
        };
        if !out.stopped {
            out.winner = Some(Stone::White);
            checked.verdict = MoveVerdict::Finding;
            checked.findings.push(Finding {
                number,
                colour: Stone::Black,
                played: p,
                kind: FindingKind::ForbiddenPoint { why, forced },
                at: legal,
                puzzle: None,
            });
        }
        out.moves.push(checked.clone());
        if !out.stopped {
            progress(ReviewProgress {
                checked: number,
                total,
                latest: checked,
            });
        }
    }
    out.nodes = q.nodes;
    Ok(out)
}

/// The solver and what every question of one review shares.
struct Questions<'a, 's> {
    solver: &'a mut Solver,
    budget: Budget,
    stop: Option<StopCheck<'s>>,
    nodes: u64,
}

impl Questions<'_, '_> {
    /// One move: `me` played `m` (the game's move `i + 1`, not a five) from `before` to
    /// `after`, where `own` is `me`'s win before it. Answers the verdict, the findings, and
    /// the opponent's win after the move (the next move's own win).
    fn check_move(
        &mut self,
        before: &Board,
        after: &Board,
        me: Stone,
        m: Point,
        i: usize,
        own: Answer,
    ) -> (MoveVerdict, Vec<Finding>, Answer) {
        let them = me.opponent();
        let number = i + 1;
        let finding = |kind, at| Finding {
            number,
            colour: me,
            played: m,
            kind,
            at,
            puzzle: None,
        };
        let mut findings = Vec::new();
        let mut undecided = false;
        if let Answer::Win(win) = &own {
            match self.kept_win(before, after, me, m) {
                Verdict::Win => {}
                Verdict::NoWin => {
                    findings.push(finding(FindingKind::MissedWin { win: win.clone() }, i))
                }
                Verdict::Unknown => undecided = true,
            }
        } else {
            undecided |= matches!(own, Answer::Unknown);
        }
        let now = self.win_of(after, them);
        if matches!(own, Answer::Win(_)) && findings.is_empty() {
            // The side kept its win (or that was undecided): the opponent's win after the
            // move is no finding of this move's.
            return (verdict(&findings, undecided), findings, now);
        }
        let Answer::Win(win) = &now else {
            // Nothing let in (and so nothing to defend, or defended); after a win let go,
            // nothing more to find.
            undecided |= findings.is_empty() && matches!(now, Answer::Unknown);
            return (verdict(&findings, undecided), findings, now);
        };
        // The opponent wins after the move: did it threaten to win before it?
        match self.win_of(before, them) {
            Answer::NoWin => {
                // A blunder (for a renju black stone that makes its own block forbidden,
                // besides the win let go).
                findings.push(finding(FindingKind::Blunder { win: win.clone() }, number));
            }
            Answer::Win(threat) if findings.is_empty() => {
                // A threat the move did not stop: a missed defence if some defence existed.
                let mut ask = self.solver.ask(self.budget);
                if let Some(s) = self.stop {
                    ask = ask.watch(s);
                }
                let d = ask.first_defence(before, me, Mode::Vct);
                self.nodes += ask.spent();
                if d.threat == Verdict::Win && !d.moves.proved.is_empty() {
                    if !d.moves.proved.contains(&m) {
                        let complete = d.complete && d.moves.unknown.is_empty();
                        findings.push(finding(
                            FindingKind::MissedDefence {
                                threat,
                                defences: d.moves.proved,
                                complete,
                                all: d.every,
                            },
                            i,
                        ));
                    }
                } else if d.threat != Verdict::Win || !d.moves.unknown.is_empty() {
                    // No defence proved, but one may exist: say nothing.
                    undecided = true;
                }
                // Otherwise the position was lost whatever the move: nothing to find.
            }
            Answer::Win(_) => {}
            Answer::Unknown => undecided |= findings.is_empty(),
        }
        (verdict(&findings, undecided), findings, now)
    }

    /// Does `side`, to move on `board`, have a forced win: a VCF (a five counts, as a VCF of
    /// length 0), else a VCT?
    fn win_of(&mut self, board: &Board, side: Stone) -> Answer {
        win_of(
            self.solver,
            board,
            side,
            self.budget,
            self.stop,
            &mut self.nodes,
        )
    }

    fn kept_win(&mut self, before: &Board, after: &Board, me: Stone, m: Point) -> Verdict {
        kept_win(
            self.solver,
            before,
            after,
            me,
            m,
            self.budget,
            self.stop,
            &mut self.nodes,
        )
    }
}

fn verdict(findings: &[Finding], undecided: bool) -> MoveVerdict {
    if !findings.is_empty() {
        MoveVerdict::Finding
    } else if undecided {
        MoveVerdict::Undecided
    } else {
        MoveVerdict::Fine
    }
}

/// Every defence `defender` (to move on `board`) has against the opponent's forced win, asked
/// with `budget`: the defences proved, and whether the list is complete (every move that could
/// defend was tried, see [`crate::search::Defences::complete`], and none was left unknown);
/// `None` when the budget proved no threat or no defence.
pub fn every_defence(
    solver: &mut Solver,
    board: &Board,
    defender: Stone,
    budget: Budget,
    stop: Option<StopCheck>,
) -> Option<(Vec<Point>, bool)> {
    let mut ask = solver.ask(budget);
    if let Some(s) = stop {
        ask = ask.watch(s);
    }
    let d = ask.defences(board, defender, Mode::Vct);
    let complete = d.complete && d.moves.unknown.is_empty();
    (d.threat == Verdict::Win && !d.moves.proved.is_empty()).then_some((d.moves.proved, complete))
}

/// The puzzle a finding makes from `board` (the position after the finding's
/// [`Finding::at`] moves), made and proved by the generator's own analysis; `None` when the
/// generator's filters would not keep the position.
pub fn finding_puzzle(solver: &mut Solver, board: &Board, aim: PuzzleAim) -> Option<Puzzle> {
    match aim {
        PuzzleAim::Win { side, mode } => win_puzzle(solver, board, side, mode),
        PuzzleAim::Defend { side } => analyse(solver, board, side, Theme::Defend),
    }
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

/// The themes a win can be a puzzle of, the most specific first.
fn win_puzzle(solver: &mut Solver, board: &Board, side: Stone, mode: Mode) -> Option<Puzzle> {
    let mut themes = Vec::new();
    if board.rule() == Rule::Renju {
        themes.push(match side {
            Stone::White => Theme::ForbiddenTrap,
            Stone::Black => Theme::ForbiddenWin,
        });
    }
    match mode {
        Mode::Vcf => themes.extend([Theme::FourThree, Theme::Vcf]),
        Mode::Vct => themes.push(Theme::Vct),
    }
    themes
        .into_iter()
        .find_map(|t| analyse(solver, board, side, t))
}
