//! The puzzle board: a puzzle being played, with the app's replies revealed one by one, the
//! three hints, the wrong tries, and the record the page saves.
//!
//! Moves that the app plays (a defender's reply, a refutation) are added to the position at
//! once but shown one by one: the shell calls [`PuzzleBoard::reveal`] after a pause for each,
//! so a refutation plays out slowly. The record ([`Record`]) is what saved progress holds: the
//! player's own moves (to replay after a reload), the wrong tries and hint steps counted, and
//! the attempt merged over every try ([`Attempt::merge`]), so the page stores what this
//! returns and decides nothing.

use serde::Serialize;

use super::{
    describe, winning_stones, Answer, AnswerKind, Cursor, HintAnswer, Marks, Revealed, Settings,
    View,
};
use crate::geometry::Point;
use crate::puzzle::attempt::Attempt;
use crate::puzzle::grade::{Grade, Session, State};
use crate::puzzle::hints::Hint;
use crate::puzzle::Puzzle;
use crate::search::Solver;
use crate::types::{Rule, Stone};
use crate::words;

/// What saved progress keeps of a puzzle.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Record {
    /// The player's own moves since the start, in order (replayed after a reload).
    pub played: Vec<Point>,
    /// Wrong tries so far (over every try).
    pub wrong: u32,
    /// Hint steps seen (0 to 3, over every try).
    pub hints: u8,
    /// How the puzzle went, merged over every try.
    pub attempt: Attempt,
}

impl Default for Record {
    fn default() -> Self {
        Record {
            played: Vec::new(),
            wrong: 0,
            hints: 0,
            attempt: Attempt::Untried,
        }
    }
}

/// Where a puzzle board stands, for the page.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct PuzzleStatus {
    /// Points per side.
    pub size: u8,
    /// The rule.
    pub rule: Rule,
    /// The side to move now.
    pub to_move: Stone,
    /// The goal in words.
    pub goal: String,
    /// Playing, solved or failed.
    pub state: State,
    /// The moves on show since the start (the player's and the app's).
    pub moves: Vec<Point>,
    /// Moves the app played that are still to be revealed.
    pub pending: usize,
    /// How this try stands.
    pub attempt: Attempt,
    /// What saved progress keeps.
    pub record: Record,
    /// Whether the solution is being shown (after a failure): moves are refused until a retry.
    pub solution: bool,
}

/// What a restored try said ([`PuzzleBoard::restore`]).
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Retold {
    /// The sentences of its moves and replies, in order (hints, and moves taken back, are not
    /// in a record, so not here).
    pub log: Vec<String>,
    /// The answer that ended it, in one line; `None` for a try still going.
    pub ended: Option<String>,
}

/// A puzzle being played.
#[derive(Clone, Debug)]
pub struct PuzzleBoard {
    session: Session,
    /// How many moves of the session's history are shown.
    revealed: usize,
    hints: u8,
    hint_area: Option<(Point, Point)>,
    hint_move: Option<Point>,
    wrong: u32,
    refuted: Option<Point>,
    /// The attempt merged over every try, including those before a reload.
    attempt: Attempt,
    options: Settings,
    ghost: Option<Point>,
    cursor: Cursor,
    /// The sentence that describes the app's reply, said when the reply at this index of the
    /// history is revealed ("White blocks at d9.").
    reply_note: Option<(usize, String)>,
    /// The solution being shown after a failure, move by move (see
    /// [`PuzzleBoard::show_solution`]); `revealed` counts into it while it is shown.
    solution: Option<Vec<(Point, Stone)>>,
}

impl PuzzleBoard {
    /// A board at the puzzle's start. `trusted`: the puzzle's answer key was proved by this
    /// program (see [`Session::trust_key`]).
    pub fn new(puzzle: Puzzle, trusted: bool) -> PuzzleBoard {
        let mut session = Session::new(puzzle);
        session.trust_key(trusted);
        PuzzleBoard {
            session,
            revealed: 0,
            hints: 0,
            hint_area: None,
            hint_move: None,
            wrong: 0,
            refuted: None,
            attempt: Attempt::Untried,
            options: Settings::default(),
            ghost: None,
            cursor: Cursor::default(),
            reply_note: None,
            solution: None,
        }
    }

    /// The puzzle.
    pub fn puzzle(&self) -> &Puzzle {
        self.session.puzzle()
    }

    /// Points per side.
    pub fn size(&self) -> u8 {
        self.session.board().size()
    }

    /// Changes the display settings (a preview in progress is dropped).
    pub fn set_options(&mut self, options: Settings) {
        self.options = options;
        self.ghost = None;
    }

    /// Brings back a record after a reload: the player's moves are graded again, replies
    /// included, and everything is shown at once; the wrong tries, hint steps and attempt
    /// counted before are kept (they decide how the puzzle went). Returns what the try said,
    /// so that a page opened again still shows it: the log of its moves and replies, and the
    /// answer that ended it (a wrong move's reason, or the solve) in one line.
    pub fn restore(&mut self, solver: &mut Solver, record: &Record) -> Retold {
        let mut told = Retold::default();
        for &p in &record.played {
            let a = self.play_point(solver, p);
            let stop = matches!(
                a.kind,
                AnswerKind::Illegal | AnswerKind::Finished | AnswerKind::Undecided
            );
            if matches!(a.kind, AnswerKind::Wrong | AnswerKind::Solved) {
                told.ended = Some(a.say.join(" "));
            }
            if !stop {
                told.log.extend(a.say);
            }
            while let Some(r) = self.reveal() {
                told.log.push(r.say);
            }
            if stop || told.ended.is_some() {
                break;
            }
        }
        self.wrong = self.wrong.max(record.wrong);
        self.hints = self.hints.max(record.hints.min(3));
        self.attempt = record.attempt.merge(self.attempt);
        self.settle();
        told
    }

    /// Folds the live attempt into the record's.
    fn settle(&mut self) {
        self.attempt = self.attempt.merge(self.live());
    }

    /// How this try stands.
    fn live(&self) -> Attempt {
        Attempt::of(
            self.session.state(),
            self.wrong,
            self.hints,
            self.session.history().len(),
        )
    }

    /// A tap on `p`. With `touch` and the confirm option on, the first tap on a point only
    /// previews the stone and a second tap on it plays it.
    pub fn touch(&mut self, solver: &mut Solver, p: Point, touch: bool) -> Answer {
        self.cursor = Cursor::default();
        if self.options.confirm && touch && self.ghost != Some(p) {
            let free = self.session.board().contains(p) && self.session.board().get(p).is_none();
            if free && self.session.state() == State::Playing {
                self.ghost = Some(p);
                let mut a = Answer::saying(AnswerKind::Ghost, words::selected(p));
                a.point = Some(p);
                return a;
            }
        }
        self.ghost = None;
        self.play_point(solver, p)
    }

    /// Plays `p` as a confirmed move.
    pub fn play(&mut self, solver: &mut Solver, p: Point) -> Answer {
        self.ghost = None;
        self.play_point(solver, p)
    }

    fn play_point(&mut self, solver: &mut Solver, p: Point) -> Answer {
        if self.solution.is_some() {
            return Answer::saying(AnswerKind::Finished, words::SOLUTION_SHOWN);
        }
        // Everything the app already played is on show once the player moves again.
        self.revealed = self.session.history().len();
        let me = self.session.to_move();
        let grade = self.session.play(solver, p);
        self.answer(me, p, grade)
    }

    /// Shows the player's stone on `p` faintly, as a two-tap preview is shown, while its
    /// grade is settled elsewhere (the worker); `None` takes it away. Only an empty point of
    /// a puzzle still being played is shown.
    pub fn preview(&mut self, p: Option<Point>) {
        let b = self.session.board();
        self.ghost = p.filter(|&p| {
            self.solution.is_none()
                && self.session.state() == State::Playing
                && b.contains(p)
                && b.get(p).is_none()
        });
    }

    /// Sets what one move's grade may spend on this board (see [`Session::set_allowance`]).
    pub fn set_allowance(&mut self, nodes: u64) {
        self.session.set_allowance(nodes);
    }

    /// Every move since the puzzle's start, the player's and the app's, with its colour (what
    /// a worker replays to settle the next move, see [`Session::replay`]).
    pub fn graded_moves(&self) -> &[(Point, Stone)] {
        self.session.history()
    }

    /// Puts on the board the grade of the player's move `p` that a worker settled (see
    /// [`Session::apply`]) and answers as [`PuzzleBoard::play`] would have. `None` if the
    /// grade does not fit this board any more (nothing changed then).
    pub fn apply(&mut self, p: Point, grade: Grade) -> Option<Answer> {
        self.ghost = None;
        if self.solution.is_some() {
            return None;
        }
        self.revealed = self.session.history().len();
        let me = self.session.to_move();
        if !self.session.apply(p, &grade) {
            return None;
        }
        Some(self.answer(me, p, grade))
    }

    fn answer(&mut self, me: Stone, p: Point, grade: Grade) -> Answer {
        let mut a = Answer::of(AnswerKind::None);
        a.point = Some(p);
        match grade {
            Grade::Illegal { reason } => {
                a.kind = AnswerKind::Illegal;
                a.say.push(words::not_played(&reason));
            }
            Grade::Finished => {
                a.kind = AnswerKind::Finished;
                a.say.push(words::FINISHED.into());
            }
            Grade::Undecided => {
                a.kind = AnswerKind::Undecided;
                a.say.extend(words::undecided(me, p));
            }
            Grade::Solved { by } => {
                a.kind = AnswerKind::Solved;
                a.say.push(words::played(me, p));
                a.say.push(words::solved(by, me));
                self.revealed = self.session.history().len();
            }
            Grade::Accepted { reply, note } => {
                a.kind = AnswerKind::Accepted;
                a.say.push(words::correct(me, p));
                // The reply is described when it is shown, once.
                self.reply_note = Some((
                    self.session.history().len() - 1,
                    words::reply(note, reply, me),
                ));
                self.revealed += 1;
            }
            Grade::Wrong { reason, .. } => {
                a.kind = AnswerKind::Wrong;
                self.wrong += 1;
                self.refuted = Some(p);
                let why = words::wrong(reason, p, me);
                a.say.push(words::not_right(me, p));
                a.say.push(why.clone());
                a.reason = Some(why);
                self.revealed += 1;
            }
        }
        if !matches!(a.kind, AnswerKind::Illegal | AnswerKind::Undecided) {
            self.hint_area = None;
            self.hint_move = None;
        }
        if matches!(
            a.kind,
            AnswerKind::Accepted | AnswerKind::Solved | AnswerKind::Wrong
        ) {
            a.grow = Some(p);
        }
        a.pending = self.pending();
        self.settle();
        a
    }

    fn pending(&self) -> usize {
        self.moves().len().saturating_sub(self.revealed)
    }

    /// The moves after the puzzle's start that are on the board: the session's, or the
    /// solution's while it is shown.
    fn moves(&self) -> &[(Point, Stone)] {
        match &self.solution {
            Some(line) => line,
            None => self.session.history(),
        }
    }

    /// Shows the next move the app has played (a reply, the next move of a refutation or of
    /// the solution); `None` when nothing is left to show.
    pub fn reveal(&mut self) -> Option<Revealed> {
        let moves = self.moves();
        let &(point, colour) = moves.get(self.revealed)?;
        let total = moves.len();
        let say = match (&self.solution, &self.reply_note) {
            (Some(_), _) => {
                words::solution_step(self.revealed + 1, colour, point, self.revealed + 1 == total)
            }
            (None, Some((at, note))) if *at == self.revealed => note.clone(),
            (None, _) => words::played(colour, point),
        };
        self.revealed += 1;
        Some(Revealed {
            point,
            colour,
            say,
            more: self.revealed < total,
        })
    }

    /// After a failure: back to the start, with the puzzle's solution to be revealed move by
    /// move (as a refutation is). The record keeps the failure; moves are refused until a
    /// retry. Returns the number of moves to reveal (0 when there is no failure to explain).
    pub fn show_solution(&mut self) -> usize {
        if self.session.state() != State::Failed {
            return 0;
        }
        let p = self.session.puzzle();
        let me = p.to_move;
        let line: Vec<(Point, Stone)> = match p.goal() {
            crate::puzzle::Goal::Win => p
                .line
                .iter()
                .enumerate()
                .map(|(i, &q)| (q, if i % 2 == 0 { me } else { me.opponent() }))
                .collect(),
            // A defence puzzle's line is the opponent's threat; its solution is the defence.
            crate::puzzle::Goal::Defend => p.first_moves.iter().take(1).map(|&q| (q, me)).collect(),
        };
        if line.is_empty() {
            return 0;
        }
        self.session.retry();
        self.refuted = None;
        self.clear_marks();
        self.revealed = 0;
        self.solution = Some(line);
        self.settle();
        self.pending()
    }

    /// Takes back the player's last turn.
    pub fn undo(&mut self) {
        if self.solution.take().is_some() {
            self.revealed = 0;
            self.settle();
            return;
        }
        self.session.undo();
        self.revealed = self.session.history().len();
        self.refuted = None;
        self.clear_marks();
        self.settle();
    }

    /// Back to the puzzle's start; the hints already seen stay counted.
    pub fn retry(&mut self) {
        self.solution = None;
        self.session.retry();
        self.revealed = 0;
        self.refuted = None;
        self.clear_marks();
        self.settle();
    }

    fn clear_marks(&mut self) {
        self.hint_area = None;
        self.hint_move = None;
        self.ghost = None;
    }

    /// The next hint: 1 the theme and length, 2 the area of the key move, 3 the move.
    pub fn hint(&mut self, solver: &mut Solver) -> HintAnswer {
        let step = (self.hints + 1).min(3);
        let h = if self.solution.is_some() {
            None
        } else {
            self.session.hint(solver, step)
        };
        let Some(h) = h else {
            return HintAnswer {
                step: 0,
                say: words::NO_HINT.into(),
            };
        };
        self.hints = self.hints.max(step);
        match h {
            Hint::Area { from, to } => self.hint_area = Some((from, to)),
            Hint::Move(m) => self.hint_move = Some(m),
            Hint::Theme { .. } => {}
        }
        self.settle();
        HintAnswer {
            step,
            say: words::hint(&h),
        }
    }

    /// Moves the keyboard cursor by (`dx`, `dy`) points (up is +1); returns its point.
    pub fn move_cursor(&mut self, dx: i32, dy: i32) -> Point {
        self.cursor.step(self.size(), dx, dy)
    }

    /// Plays the point under the keyboard cursor.
    pub fn place_at_cursor(&mut self, solver: &mut Solver) -> Answer {
        match self.cursor.0 {
            Some(p) => self.play(solver, p),
            None => Answer::saying(AnswerKind::None, words::NO_CURSOR),
        }
    }

    /// Where things stand.
    pub fn status(&self) -> PuzzleStatus {
        let h = self.moves();
        PuzzleStatus {
            size: self.size(),
            rule: self.session.board().rule(),
            to_move: self.session.to_move(),
            goal: words::goal(self.session.puzzle()),
            state: self.session.state(),
            moves: h[..self.revealed.min(h.len())]
                .iter()
                .map(|m| m.0)
                .collect(),
            pending: self.pending(),
            attempt: self.live(),
            record: Record {
                played: self.played(),
                wrong: self.wrong,
                hints: self.hints,
                attempt: self.attempt,
            },
            solution: self.solution.is_some(),
        }
    }

    /// The player's own moves since the start. Every turn of the player is one move and one
    /// reply, except the last, which may be a five or a wrong move with its refutation after
    /// it.
    fn played(&self) -> Vec<Point> {
        let h = self.session.history();
        let mut v: Vec<Point> = h.iter().step_by(2).map(|m| m.0).collect();
        if let (State::Failed, Some(r)) = (self.session.state(), self.refuted) {
            if let Some(i) = v.iter().position(|&m| m == r) {
                v.truncate(i + 1);
            }
        }
        v
    }

    /// The stones on show: the position with the revealed moves.
    fn shown_stones(&self) -> Vec<(Point, Stone)> {
        let puzzle = self.session.puzzle();
        let mut v: Vec<(Point, Stone)> = puzzle
            .black
            .iter()
            .map(|&p| (p, Stone::Black))
            .chain(puzzle.white.iter().map(|&p| (p, Stone::White)))
            .collect();
        let h = self.moves();
        v.extend(h[..self.revealed.min(h.len())].iter().copied());
        v
    }

    /// The position on show, as the study board loads one: its stones (black, white, each row
    /// by row from a1) and the side to move (the one after the last move shown).
    pub fn position(&self) -> (Vec<Point>, Vec<Point>, Stone) {
        let stones = self.shown_stones();
        let of = |c: Stone| {
            let mut v: Vec<Point> = stones.iter().filter(|s| s.1 == c).map(|s| s.0).collect();
            Point::sort_by_rows(&mut v);
            v
        };
        let h = self.moves();
        let to_move = match h[..self.revealed.min(h.len())].last() {
            Some(&(_, c)) => c.opponent(),
            None => self.session.puzzle().to_move,
        };
        (of(Stone::Black), of(Stone::White), to_move)
    }

    /// The stone on show on `p`, if any.
    pub fn stone_at(&self, p: Point) -> Option<Stone> {
        self.shown_stones().iter().find(|s| s.0 == p).map(|s| s.1)
    }

    /// What to draw.
    pub fn view(&self) -> View {
        let h = self.moves();
        let shown = &h[..self.revealed.min(h.len())];
        let state = self.session.state();
        let b = self.session.board();
        let all_shown = self.revealed >= h.len();
        let mut m = Marks {
            cursor: self.cursor.0,
            last: shown.last().map(|x| x.0),
            hint_area: self.hint_area,
            hint_move: self.hint_move,
            refuted: self.refuted.filter(|_| state == State::Failed),
            ghost: self.ghost.map(|g| (g, self.session.to_move())),
            ..Marks::default()
        };
        if self.options.numbers {
            m.numbers = shown
                .iter()
                .enumerate()
                .map(|(i, x)| (x.0, i as u16 + 1))
                .collect();
        }
        if self.options.forbidden
            && state == State::Playing
            && b.rule().has_forbidden(self.session.to_move())
            && all_shown
        {
            m.forbidden = b.forbidden_points().into_iter().map(|x| x.0).collect();
        }
        if state == State::Solved && all_shown {
            m.winning = winning_stones(b);
        }
        View {
            size: self.size(),
            stones: self.shown_stones(),
            marks: m,
        }
    }

    /// The board in words, for a screen reader.
    pub fn describe(&self) -> String {
        let head = format!("{}.", words::goal(self.session.puzzle()));
        describe(&head, &self.shown_stones(), self.view().marks.last)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::formats::setfile;
    use crate::search::SolverConfig;

    /// The fixture set (four-threes under renju), as the browser test loads it.
    fn fixture() -> Vec<Puzzle> {
        let text = include_str!("../../../tests/data/fixture_set.json");
        setfile::parse(text).unwrap().puzzles
    }

    fn solver() -> Solver {
        Solver::new(crate::puzzle::grade::solver_config())
    }

    fn touch_options() -> Settings {
        Settings {
            confirm: true,
            ..Settings::default()
        }
    }

    /// A move the page hands to the worker shows faintly until the worker's grade is put on
    /// the board, which then answers as playing it here would have.
    #[test]
    fn a_move_settled_by_the_worker_shows_faintly_then_answers_as_played() {
        let p = fixture().into_iter().next().unwrap();
        let first = p.line[0];
        let mut direct = PuzzleBoard::new(p.clone(), true);
        let want = direct.play(&mut solver(), first);
        assert_eq!(want.kind, AnswerKind::Accepted);

        let mut b = PuzzleBoard::new(p.clone(), true);
        b.preview(Some(first));
        assert_eq!(b.view().marks.ghost, Some((first, b.status().to_move)));
        assert!(b.status().moves.is_empty(), "a preview plays nothing");
        // A stone's point is not previewed.
        let taken = p.black[0];
        b.preview(Some(taken));
        assert_eq!(b.view().marks.ghost, None);
        b.preview(Some(first));

        let mut worker = Session::new(p);
        worker.trust_key(true);
        assert!(worker.replay(b.graded_moves()));
        let grade = worker.play(&mut solver(), first);
        let got = b.apply(first, grade).expect("the grade fits");
        assert_eq!(got.kind, want.kind);
        assert_eq!(got.say, want.say);
        assert_eq!(b.view().marks.ghost, None);
        assert_eq!(b.status().moves, direct.status().moves);
    }

    #[test]
    fn a_first_touch_previews_and_a_second_plays() {
        let p = fixture().into_iter().next().unwrap();
        let first = p.line[0];
        let mut b = PuzzleBoard::new(p, true);
        b.set_options(touch_options());
        let mut s = solver();
        let a = b.touch(&mut s, first, true);
        assert_eq!(a.kind, AnswerKind::Ghost);
        assert_eq!(b.view().marks.ghost, Some((first, b.status().to_move)));
        assert!(b.status().moves.is_empty(), "a preview plays nothing");
        // A tap elsewhere moves the preview; a tap on it plays.
        let other = Point::new(0, 0);
        assert_eq!(b.touch(&mut s, other, true).kind, AnswerKind::Ghost);
        assert_eq!(b.touch(&mut s, other, true).kind, AnswerKind::Wrong);
        // A mouse click plays at once, whatever the setting.
        b.retry();
        assert_eq!(b.touch(&mut s, first, false).kind, AnswerKind::Accepted);
    }

    #[test]
    fn replies_are_revealed_one_by_one_and_the_line_solves() {
        let p = fixture().into_iter().next().unwrap();
        let line = p.line.clone();
        let mut b = PuzzleBoard::new(p, true);
        let mut s = solver();
        for (i, pair) in line.chunks(2).enumerate() {
            let a = b.play(&mut s, pair[0]);
            if pair.len() == 1 {
                assert_eq!(a.kind, AnswerKind::Solved, "move {i}");
                assert_eq!(a.pending, 0);
                break;
            }
            assert_eq!(a.kind, AnswerKind::Accepted, "move {i}: {:?}", a.say);
            assert_eq!(a.pending, 1);
            assert_eq!(b.stone_at(pair[1]), None, "the reply waits to be revealed");
            let r = b.reveal().unwrap();
            assert_eq!(r.point, pair[1]);
            assert!(!r.more);
            assert!(b.reveal().is_none());
            assert!(b.stone_at(pair[1]).is_some());
        }
        let st = b.status();
        assert_eq!(st.state, State::Solved);
        assert_eq!(st.attempt, Attempt::Clean);
        assert_eq!(st.record.attempt, Attempt::Clean);
        assert!(!b.view().marks.winning.is_empty());
    }

    #[test]
    fn a_wrong_move_is_refuted_slowly_and_undo_takes_it_back() {
        // The first wrong move of the fixture (board order) that the app refutes with a
        // reply: a four whose block is forced, or a move after which the opponent wins.
        let mut s = solver();
        let (mut b, wrong, a) = fixture()
            .into_iter()
            .find_map(|p| {
                let start = p.board();
                let empty: Vec<Point> = start
                    .points()
                    .filter(|&q| start.get(q).is_none() && !p.first_moves.contains(&q))
                    .collect();
                empty.into_iter().find_map(|q| {
                    let mut b = PuzzleBoard::new(p.clone(), true);
                    let a = b.play(&mut s, q);
                    (a.kind == AnswerKind::Wrong && a.pending >= 1).then_some((b, q, a))
                })
            })
            .expect("a wrong move with a refutation in the fixture");
        assert!(a.reason.is_some());
        assert!(a.pending >= 1);
        let mut log = a.say.clone();
        while let Some(r) = b.reveal() {
            log.push(r.say);
        }
        assert_eq!(b.status().state, State::Failed);
        // Opened again (a reload), the board says the same: the reason and the replies.
        let mut again = PuzzleBoard::new(b.puzzle().clone(), true);
        let told = again.restore(&mut s, &b.status().record);
        assert_eq!(told.log, log);
        assert_eq!(told.ended, Some(a.say.join(" ")));
        assert_eq!(again.status().state, State::Failed);
        assert_eq!(b.view().marks.refuted, Some(wrong));
        assert_eq!(b.status().record.played, vec![wrong]);
        assert_eq!(b.status().record.attempt, Attempt::Failed);
        b.undo();
        assert_eq!(b.status().state, State::Playing);
        assert!(b.status().moves.is_empty());
        // The failure stays on the record; a solve after it counts as helped.
        assert_eq!(b.status().record.attempt, Attempt::Failed);
        assert_eq!(b.status().attempt, Attempt::Trying);
    }

    #[test]
    fn after_a_failure_the_solution_is_shown_slowly_and_the_failure_stays() {
        let p = fixture().into_iter().next().unwrap();
        let line = p.line.clone();
        let side = match p.to_move {
            Stone::Black => "Black",
            Stone::White => "White",
        };
        let mut b = PuzzleBoard::new(p, true);
        let mut s = solver();
        assert_eq!(b.show_solution(), 0, "nothing to show before a failure");
        b.play(&mut s, Point::new(0, 0));
        while b.reveal().is_some() {}
        assert_eq!(b.show_solution(), line.len());
        assert!(b.status().moves.is_empty(), "revealed one by one");
        let mut said = Vec::new();
        while let Some(r) = b.reveal() {
            said.push(r.say);
        }
        assert_eq!(b.status().moves, line);
        assert_eq!(said[0], format!("1. {side} {}.", line[0]));
        assert!(said.last().unwrap().ends_with("the end of the solution."));
        assert_eq!(b.play(&mut s, line[0]).kind, AnswerKind::Finished);
        assert_eq!(
            b.status().record.attempt,
            Attempt::Failed,
            "the record keeps it"
        );
        // A retry takes the solution away; solving now counts as helped.
        b.retry();
        assert!(b.status().moves.is_empty());
        assert_eq!(b.play(&mut s, line[0]).kind, AnswerKind::Accepted);
    }

    #[test]
    fn hints_go_in_three_steps_and_count() {
        let p = fixture().into_iter().next().unwrap();
        let key = p.line[0];
        let mut b = PuzzleBoard::new(p, true);
        let mut s = solver();
        let h1 = b.hint(&mut s);
        assert_eq!(h1.step, 1);
        assert!(h1.say.starts_with("A four-three"), "{}", h1.say);
        let h2 = b.hint(&mut s);
        assert_eq!(h2.step, 2);
        let (from, to) = b.view().marks.hint_area.unwrap();
        assert!((from.x..=to.x).contains(&key.x) && (from.y..=to.y).contains(&key.y));
        let h3 = b.hint(&mut s);
        assert_eq!(h3.step, 3);
        assert_eq!(h3.say, format!("The key move is {key}."));
        assert_eq!(b.view().marks.hint_move, Some(key));
        assert_eq!(b.status().record.hints, 3);
        assert_eq!(b.status().attempt, Attempt::Trying);
    }

    #[test]
    fn a_wrong_key_from_outside_never_reaches_a_hint() {
        // A set file whose key for this puzzle is a1 (it is no answer): the hints of an
        // untrusted puzzle come from the solver, not from the key.
        let mut p = fixture().into_iter().next().unwrap();
        let answers = p.first_moves.clone();
        p.first_moves = vec![Point::new(0, 0)];
        p.line = vec![Point::new(0, 0)];
        let mut b = PuzzleBoard::new(p, false);
        let mut s = solver();
        b.hint(&mut s);
        b.hint(&mut s);
        let h = b.hint(&mut s);
        assert_ne!(h.say, "The key move is a1.");
        let m = b.view().marks.hint_move.unwrap();
        assert!(answers.contains(&m), "{m} is one of {answers:?}");
    }

    #[test]
    fn a_record_restores_the_position_and_the_counts() {
        let p = fixture().into_iter().next().unwrap();
        let line = p.line.clone();
        let mut s = solver();
        let mut b = PuzzleBoard::new(p.clone(), true);
        let mut log = b.play(&mut s, line[0]).say;
        while let Some(r) = b.reveal() {
            log.push(r.say);
        }
        b.hint(&mut s);
        let rec = b.status().record;
        let mut again = PuzzleBoard::new(p, true);
        let told = again.restore(&mut s, &rec);
        assert_eq!(told.log, log, "the move and the reply, as the log had them");
        assert_eq!(told.ended, None, "a try still going");
        let st = again.status();
        assert_eq!(
            st.moves,
            line[..2].to_vec(),
            "the move and its reply, shown at once"
        );
        assert_eq!(st.pending, 0);
        assert_eq!(st.record, rec);
    }

    #[test]
    fn the_keyboard_cursor_starts_at_the_centre_and_stays_on_the_board() {
        let p = fixture().into_iter().next().unwrap();
        let mut b = PuzzleBoard::new(p, true);
        let mut s = Solver::new(SolverConfig::default());
        assert_eq!(b.place_at_cursor(&mut s).kind, AnswerKind::None);
        assert_eq!(b.move_cursor(1, 0), "h8".parse().unwrap());
        for _ in 0..20 {
            b.move_cursor(-1, 1);
        }
        assert_eq!(b.move_cursor(0, 0), "a15".parse().unwrap());
    }
}
