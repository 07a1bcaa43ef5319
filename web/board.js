// One board on the page: a canvas and the Rust board handle that draws on it (a PuzzleBoard,
// which grades, or a StudyBoard). This file forwards taps, keys and resizes, paces the moves the
// app plays (a reply after a short pause, a refutation slowly, one move at a time), runs the
// stone animation and writes every sentence the handle returns to the message line, the move
// log and the live region.

import { PuzzleBoard, StudyBoard } from './pkg/fivefold_web.js';
import { Jobs } from './jobs.js';
import { announce, bringBoard, el } from './ui.js';
import { sound } from './sounds.js';

// The worker that settles the moves a board could not within a frame's work (rare: about one
// move in a hundred of the starter library's benchmark). Its own worker, so that it never
// waits behind a Drill puzzle being made; started the first time a move needs it.
let graders = null;

// Pauses before the app's moves are shown, in milliseconds.
const REPLY_MS = 320;
const REFUTE_FIRST_MS = 450;
const REFUTE_NEXT_MS = 750;
const LOG_KEEP = 200;

let firstBoardMarked = false;

export class BoardView {
  /**
   * `canvas`: the board's canvas; `kind`: "puzzle" or "study"; `log`: an element for the move
   * log; `message`: the message line; `onChange(status, why)`: called after every change the
   * player or the app makes.
   */
  constructor(canvas, { kind = 'puzzle', log, message, onChange = () => {}, onFinish = () => {}, readOnly = false }) {
    this.canvas = canvas;
    // A board that only shows (My games): taps and Enter place nothing; the arrow keys still
    // move the cursor, which reads the points out.
    this.readOnly = readOnly;
    this.log = log;
    this.message = message;
    this.onChange = onChange;
    // Called once when a try ends (solved or failed), with the status and the milliseconds
    // since the puzzle was shown; what it returns (a line or none) is said once the app's
    // replies are all on show.
    this.onFinish = onFinish;
    this.shownAt = performance.now();
    this.reported = false;
    this.afterReplies = [];
    this.trainer = kind === 'study' ? new StudyBoard(canvas) : new PuzzleBoard(canvas);
    this.token = 0;
    this.animating = false;
    this.lastPointer = 'mouse';
    this.reduced = window.matchMedia?.('(prefers-reduced-motion: reduce)').matches ?? false;
    this.fit = this.fit.bind(this);
    new ResizeObserver(this.fit).observe(canvas);
    window.addEventListener('resize', this.fit);
    this.watchRatio();
    canvas.addEventListener('pointerdown', (e) => {
      this.lastPointer = e.pointerType || 'mouse';
    });
    canvas.addEventListener('click', (e) => this.click(e));
    canvas.addEventListener('keydown', (e) => this.key(e));
  }

  // A change of devicePixelRatio (browser zoom, a move to another screen) refits the canvas.
  watchRatio() {
    const q = window.matchMedia?.(`(resolution: ${window.devicePixelRatio || 1}dppx)`);
    q?.addEventListener('change', () => {
      this.fit();
      this.watchRatio();
    }, { once: true });
  }

  fit() {
    const r = this.canvas.getBoundingClientRect();
    if (r.width < 1 || r.height < 1) return;
    // The coordinates grow with the page's text size (the root font size, in CSS pixels).
    const text = parseFloat(getComputedStyle(document.documentElement).fontSize) || 16;
    this.trainer.fit(window.devicePixelRatio || 1, text);
    this.markFirstBoard();
  }

  markFirstBoard() {
    if (firstBoardMarked || this.canvas.dataset.mode !== 'puzzle') return;
    if (this.canvas.width < 2) return;
    firstBoardMarked = true;
    performance.mark('fivefold:first-board');
  }

  setOptions({ confirm, forbidden, numbers }) {
    this.trainer.setOptions(!!confirm, !!forbidden, !!numbers);
  }

  /** Stops any pacing of the app's moves (a new puzzle, undo, retry), and stops waiting for
   * a move the worker is checking: its answer is dropped and the board takes moves again. */
  cancelPacing() {
    this.token++;
    if (this.checking) {
      this.checking = null;
      delete this.canvas.dataset.checking;
    }
  }

  status() {
    return this.trainer.status();
  }

  // Writes the status onto the canvas for styles, scripts and tests, and tells the screen.
  changed(why) {
    const s = this.trainer.status();
    const d = this.canvas.dataset;
    d.mode = s.mode;
    d.state = s.state;
    d.pending = String(s.pending);
    d.moves = s.moves.join(' ');
    d.outcome = s.attempt ?? '';
    d.hints = String(s.record?.hints ?? 0);
    d.toMove = s.toMove;
    d.rule = s.rule;
    this.canvas.setAttribute('aria-label', this.trainer.describe());
    // A try ends as soon as it is solved or failed, and is reported then, once (a retry
    // starts a new try): not after the app's replies are shown, which a reload or a closed
    // page could cut short, losing the try. What the report has to say waits for the replies.
    if (s.state === 'playing') {
      this.reported = false;
      this.afterReplies = [];
    }
    const ended = why !== 'load' && !this.reported && s.state !== 'playing' && !s.solution;
    if (ended) this.reported = true;
    this.onChange(s, why);
    if (ended) {
      const said = this.onFinish(s, Math.round(performance.now() - this.shownAt));
      if (said) this.afterReplies.push(said);
    }
    const verdict = s.pending === 0 && this.afterReplies.length;
    if (verdict) this.say(this.afterReplies.splice(0));
    // The buttons under the board change with the state (a failure adds "Show the solution"):
    // keep the board and them in view together, and the verdict under them once it is said.
    if (why !== 'load' && (s.state !== this.lastState || verdict)) bringBoard(this.canvas, this.message);
    this.lastState = s.state;
    return s;
  }

  clearLog() {
    this.log?.replaceChildren();
  }

  say(lines, kind, aloud = true) {
    const list = lines.filter(Boolean);
    if (!list.length) return;
    if (this.log) {
      for (const line of list) this.log.append(el('li', { text: line }));
      while (this.log.childElementCount > LOG_KEEP) this.log.firstElementChild.remove();
    }
    if (aloud) announce(list);
    if (this.message && kind !== undefined) {
      this.message.textContent = list.join(' ');
      this.message.dataset.kind = kind;
    }
  }

  note(text, kind = 'info') {
    if (!this.message) return;
    this.message.textContent = text;
    this.message.dataset.kind = kind;
  }

  /**
   * Loads a puzzle with its saved record (`{played, wrong, hints, attempt}`, or null): the
   * player's moves so far are replayed after a reload. `trusted`: the puzzle's answer key was
   * proved by this app (the built-in library, Drill).
   */
  load(puzzleJson, { record = null, trusted = false } = {}) {
    this.cancelPacing();
    this.clearLog();
    this.afterReplies = [];
    this.trainer.load(puzzleJson, trusted, record);
    this.puzzle = { json: puzzleJson, trusted };
    this.shownAt = performance.now();
    this.reported = this.trainer.status().state !== 'playing';
    this.fit();
    const s = this.changed('load');
    this.markFirstBoard();
    bringBoard(this.canvas);
    // After a reload the log is back, and a try that had ended says again why (the wrong
    // move's reason, or the solve).
    const [end, ...log] = this.trainer.restoredSay().split('\n');
    this.say(log, undefined, false);
    if (end) {
      this.note(end, s.state === 'solved' ? 'solved' : 'wrong');
      announce(end);
    } else this.note(s.goal, 'goal');
    return s;
  }

  /**
   * The actions every puzzle screen shares: hint, solution, study (opens the position on
   * `study`, the Study board screen), undo and retry. Returns false for any other action
   * (the screen's own, such as next).
   */
  act(what, study) {
    if (what === 'hint') this.hint();
    else if (what === 'solution') this.showSolution();
    else if (what === 'study') {
      const pos = this.trainer.position();
      if (pos) study.openPosition(pos);
    } else if (what === 'undo') this.undo();
    else if (what === 'retry') this.retry();
    else return false;
    return true;
  }

  click(e) {
    if (this.readOnly || this.checking) return;
    const touch = (e.pointerType || this.lastPointer) === 'touch';
    const a = this.trainer.tap(e.clientX, e.clientY, touch);
    this.answer(a);
  }

  key(e) {
    const moves = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, 1], ArrowDown: [0, -1] };
    if (moves[e.key]) {
      e.preventDefault();
      const p = this.trainer.moveCursor(...moves[e.key]);
      const stone = this.trainer.stoneAt(p);
      announce(`${p}${stone ? `, ${stone} stone` : ', empty'}`);
      this.canvas.dataset.cursor = p;
    } else if ((e.key === 'Enter' || e.key === ' ') && !this.readOnly && !this.checking) {
      e.preventDefault();
      this.answer(this.trainer.placeAtCursor());
    }
  }

  /** Handles a Trainer answer: sentences, animation, and the pacing of the app's moves. A
   * move the page could not settle within a frame's work goes to the worker first. */
  answer(a, settled = false) {
    if (!a || a.kind === 'none') {
      if (a?.say?.length) this.say(a.say, 'info');
      return;
    }
    if (a.kind === 'undecided' && !settled && this.puzzle && this.trainer instanceof PuzzleBoard) {
      this.settle(a);
      return;
    }
    const kind = {
      ghost: 'ghost',
      accepted: 'good',
      solved: 'solved',
      wrong: 'wrong',
      illegal: 'refused',
      refused: 'refused',
      undecided: 'refused',
      finished: 'info',
      placed: 'info',
    }[a.kind] ?? 'info';
    if (a.kind === 'ghost') {
      announce(a.say);
      this.note(a.say.join(' '), 'ghost');
      this.canvas.dataset.ghost = a.point ?? '';
      return;
    }
    delete this.canvas.dataset.ghost;
    this.say(a.say, kind);
    sound({ accepted: 'right', solved: 'solved', wrong: 'wrong', placed: 'stone' }[a.kind]);
    this.animate();
    const token = ++this.token;
    this.changed(a.kind);
    if (a.pending > 0) this.pace(token, a.kind === 'wrong');
  }

  /** Has the worker settle the move of the page's undecided answer `a`, with the whole
   * allowance of a move, and puts its grade on the board. The board takes no move meanwhile;
   * a new puzzle, an undo or a retry drops the worker's answer. */
  async settle(a) {
    const token = ++this.token;
    const point = a.point;
    this.checking = point;
    this.canvas.dataset.checking = point;
    const colour = this.trainer.status().toMove;
    this.note(`${colour[0].toUpperCase()}${colour.slice(1)} ${point}: checking it more deeply…`, 'info');
    announce(`Checking ${point}.`);
    this.trainer.preview(point);
    let settled = null;
    try {
      graders ??= new Jobs();
      const grade = await graders.run('grade', {
        puzzle: this.puzzle.json,
        trusted: this.puzzle.trusted,
        moves: this.trainer.gradedMoves(),
        move: point,
      });
      if (token === this.token) settled = this.trainer.settle(point, grade);
    } catch {
      // No worker here, or it stopped: the page's own answer stands (undecided).
    }
    if (this.checking === point) {
      this.checking = null;
      delete this.canvas.dataset.checking;
    }
    if (token !== this.token) return;
    if (!settled) this.trainer.preview('');
    this.answer(settled ?? a, true);
  }

  async pace(token, slow) {
    let wait = slow ? REFUTE_FIRST_MS : REPLY_MS;
    for (;;) {
      await new Promise((ok) => setTimeout(ok, wait));
      if (token !== this.token) return;
      const r = this.trainer.reveal();
      if (!r) break;
      this.say([r.say]);
      sound('stone');
      this.animate();
      this.changed('reveal');
      if (!r.more) break;
      wait = REFUTE_NEXT_MS;
    }
  }

  animate() {
    if (this.animating) return;
    if (this.reduced) {
      this.trainer.frame(0);
      this.trainer.frame(1e6);
      return;
    }
    this.animating = true;
    this.canvas.dataset.animating = 'true';
    const step = (now) => {
      if (this.trainer.frame(now)) {
        requestAnimationFrame(step);
      } else {
        this.animating = false;
        delete this.canvas.dataset.animating;
      }
    };
    requestAnimationFrame(step);
  }

  undo() {
    this.cancelPacing();
    this.trainer.undo();
    this.say(['Took back the last turn.'], 'info');
    return this.changed('undo');
  }

  retry() {
    this.cancelPacing();
    this.trainer.retry();
    this.clearLog();
    const s = this.changed('retry');
    this.note(s.goal, 'goal');
    return s;
  }

  /** After a failure: the solution, revealed slowly with its sentences. */
  showSolution() {
    this.cancelPacing();
    const n = this.trainer.showSolution();
    if (!n) return this.status();
    this.clearLog();
    this.say(['The solution, move by move:'], 'info');
    const token = ++this.token;
    this.changed('solution');
    this.pace(token, true);
    return this.status();
  }

  hint() {
    const h = this.trainer.hint();
    this.say([h.say], h.step ? 'hint' : 'info');
    this.changed('hint');
    return h;
  }
}
