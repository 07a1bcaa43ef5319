// Study board: set up any position (tap stones, or paste a move list), choose the rule, and ask
// the engine in the worker: a VCF? a VCT? which moves defend? The answer is given in words and
// its line can be stepped through. A long search can be cancelled.

import { searchingWords } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs } from './jobs.js';
import { save } from './store.js';
import { $, POINT_NAME, RULES, announce, bringBoard } from './ui.js';

const TOOLS = ['play', 'black', 'white', 'erase'];
// The node budget of a study search (the worker's searches stop there with "unknown").
const NODES = 3_000_000;

/** Why stored Study board data cannot be used, or null. */
export function checkStudy(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  if (![15, 19].includes(d.size) || !RULES.includes(d.rule) || !TOOLS.includes(d.tool)) return 'the board settings are unknown';
  if (!['black', 'white'].includes(d.toMove)) return 'the side to move is unknown';
  for (const list of [d.black, d.white]) {
    if (!Array.isArray(list) || list.length > 361 || !list.every((m) => typeof m === 'string' && POINT_NAME.test(m))) {
      return 'the stones are malformed';
    }
  }
  return null;
}

export function emptyStudy() {
  return { size: 15, rule: 'freestyle', tool: 'play', toMove: 'black', black: [], white: [] };
}

export class Study {
  constructor(app) {
    this.app = app;
    this.data = emptyStudy();
    this.jobs = new Jobs();
    this.board = new BoardView($('study-board'), {
      kind: 'study',
      log: $('study-log'),
      message: $('study-message'),
      onChange: (s, why) => this.changed(s, why),
    });
    this.t = this.board.trainer;
    $('study-size').addEventListener('change', (e) => this.setSize(Number(e.target.value)));
    $('study-rule').addEventListener('change', (e) => this.setRule(e.target.value));
    for (const r of document.querySelectorAll('#study-tools input')) {
      r.addEventListener('change', () => {
        this.data.tool = r.value;
        this.t.setTool(r.value);
        this.save();
      });
    }
    for (const r of document.querySelectorAll('#study-side input')) {
      r.addEventListener('change', () => {
        this.t.setToMove(r.value);
        this.board.changed('side');
      });
    }
    for (const b of document.querySelectorAll('#study [data-ask]')) {
      b.addEventListener('click', () => this.ask(b.dataset.ask));
    }
    $('study-cancel').addEventListener('click', () => this.cancel());
    $('study-prev').addEventListener('click', () => this.step(-1));
    $('study-next').addEventListener('click', () => this.step(1));
    $('study-undo').addEventListener('click', () => {
      this.board.undo();
    });
    $('study-clear').addEventListener('click', () => {
      this.t.clear();
      this.board.say(['The board is cleared.'], 'info');
      this.board.changed('clear');
    });
    $('study-setup').addEventListener('click', () => this.paste());
    $('study-to-games').addEventListener('click', () => this.toGames());
  }

  /** Takes the game played out on the board (its moves, size and rule) into My games. */
  toGames() {
    const s = this.t.status();
    if (!s.game) {
      this.board.say(['Only a game played out from an empty board can be checked: play the moves in turn with the Play tool, black first, or paste a move list.'], 'refused');
      return;
    }
    const game = { size: s.size, rule: s.rule, moves: s.moves };
    // My games' script loads on its first opening: the button waits with it.
    const button = $('study-to-games');
    button.disabled = true;
    button.setAttribute('aria-busy', 'true');
    this.app.games.get().then((g) => g.takeGame(game, 'the Study board'), (e) => {
      this.board.say([`My games could not be opened (${e?.message ?? e}).`], 'refused');
    }).finally(() => {
      button.disabled = false;
      button.removeAttribute('aria-busy');
    });
  }

  init(data) {
    this.cancel(true);
    this.data = data ?? emptyStudy();
    const d = this.data;
    try {
      this.t.load(d.size, d.rule, d.black, d.white, d.toMove);
    } catch (e) {
      this.board.note(`The saved position could not be set up (${e}); the board is empty.`, 'refused');
      this.data = emptyStudy();
      this.t.reset(15, 'freestyle');
    }
    this.t.setTool(this.data.tool);
    this.board.clearLog();
    this.board.changed('load');
    this.renderControls();
  }

  applySettings(s) {
    this.board.setOptions(s);
  }

  save() {
    save('study', this.data);
  }

  renderControls() {
    const d = this.data;
    $('study-size').value = String(d.size);
    $('study-rule').value = d.rule;
    for (const r of document.querySelectorAll('#study-tools input')) r.checked = r.value === d.tool;
    for (const r of document.querySelectorAll('#study-side input')) r.checked = r.value === d.toMove;
  }

  changed(s, why) {
    if (s.mode !== 'study') return;
    Object.assign(this.data, { size: s.size, rule: s.rule, black: s.black, white: s.white, toMove: s.toMove, tool: s.tool });
    for (const r of document.querySelectorAll('#study-side input')) r.checked = r.value === s.toMove;
    if (why !== 'step') {
      // A search under way answers for the position it was asked about, not this one, and
      // an answer on show belongs to the position before.
      this.edits = (this.edits ?? 0) + 1;
      this.hideLine();
      $('study-answer').replaceChildren();
      delete $('study-answer').dataset.kind;
    }
    this.save();
  }

  /** Opens a position (`{size, rule, black, white, toMove}`, as a puzzle board gives it) on
   * the Study board; the position there before can be brought back with Undo. */
  openPosition(pos) {
    this.cancel(true);
    try {
      this.t.load(pos.size, pos.rule, pos.black, pos.white, pos.toMove);
    } catch (e) {
      this.board.say([`The position could not be opened: ${e}.`], 'refused');
      return;
    }
    this.t.setTool('play');
    this.board.clearLog();
    this.board.say(['The puzzle\'s position is on the Study board: ask for a VCF, a VCT or the defences.'], 'info');
    this.board.changed('open');
    this.renderControls();
    this.app.go('study');
  }

  setSize(size) {
    const d = this.data;
    try {
      this.t.load(size, d.rule, d.black, d.white, d.toMove);
    } catch {
      if (!window.confirm(`Some stones do not fit on ${size} × ${size}. Clear the board to change the size?`)) {
        $('study-size').value = String(d.size);
        return;
      }
      this.t.reset(size, d.rule);
      this.board.say([`The stones did not fit on ${size} × ${size}: the board is empty.`], 'info');
    }
    this.t.setTool(d.tool);
    this.board.changed('size');
    this.renderControls();
  }

  setRule(rule) {
    const d = this.data;
    try {
      this.t.load(d.size, rule, d.black, d.white, d.toMove);
    } catch (e) {
      this.board.say([`${e}`], 'refused');
      this.renderControls();
      return;
    }
    this.t.setTool(d.tool);
    this.board.changed('rule');
    this.renderControls();
  }

  paste() {
    const text = $('study-moves').value;
    if (!text.trim()) {
      this.board.say(['Nothing to set up: paste a move list first (black first, like h8 h9 i8).'], 'refused');
      return;
    }
    let n;
    try {
      n = this.t.paste(text);
    } catch (e) {
      this.board.say([`Not set up: ${e}.`], 'refused');
      return;
    }
    this.board.say([`Set up ${n} move${n === 1 ? '' : 's'}.`], 'info');
    this.board.changed('paste');
    this.renderControls();
  }

  busy(on) {
    $('study-busy').hidden = !on;
    $('study').dataset.busy = on ? 'true' : 'false';
    for (const b of document.querySelectorAll('#study [data-ask]')) b.disabled = on;
  }

  async ask(search) {
    const pos = this.t.status();
    $('study-answer').replaceChildren();
    this.hideLine();
    const started = performance.now();
    let spent = 0;
    const show = () => {
      const secs = (performance.now() - started) / 1000;
      $('study-busy-text').textContent = searchingWords(search, secs, spent, NODES);
      const bar = $('study-progress');
      bar.max = NODES;
      bar.value = Math.min(spent, NODES);
    };
    this.busy(true);
    show();
    const clock = setInterval(show, 250);
    const edits = this.edits ?? 0;
    let r;
    try {
      const query = { rule: pos.rule, size: pos.size, black: pos.black, white: pos.white, toMove: pos.toMove, search, nodes: NODES };
      r = await this.jobs.run('solve', { query }, (p) => {
        spent = p.nodes;
        show();
      });
    } catch (e) {
      clearInterval(clock);
      this.busy(false);
      if (e instanceof Cancelled) return;
      this.answer([`No answer: ${e.message}.`], 'refused');
      return;
    }
    clearInterval(clock);
    this.busy(false);
    if ((this.edits ?? 0) !== edits) {
      this.answer(['The position changed during the search, so its answer is not shown. Ask again.'], 'cancelled');
      return;
    }
    const secs = ((performance.now() - started) / 1000).toFixed(1);
    this.answer([...r.say, `(${r.searched} in ${secs} s.)`], r.result);
    if (r.line.length) {
      this.t.showLine(r.line, r.first);
      this.lineTotal = r.line.length;
      $('study-stepper').hidden = false;
      $('study-step').textContent = `0 of ${r.line.length}`;
      $('study').dataset.line = String(r.line.length);
      // The board and the stepper under it in view together (a phone, large text).
      bringBoard($('study-board'));
    }
  }

  answer(lines, kind) {
    const box = $('study-answer');
    box.replaceChildren(...lines.map((l) => {
      const p = document.createElement('p');
      p.textContent = l;
      return p;
    }));
    box.dataset.kind = kind;
  }

  hideLine() {
    $('study-stepper').hidden = true;
    delete $('study').dataset.line;
  }

  step(delta) {
    const r = this.t.step(delta);
    $('study-step').textContent = r.shown ? `${r.shown} of ${r.total}: ${r.say.replace(/^\d+\. /, '')}` : `0 of ${r.total}`;
    $('study').dataset.shown = String(r.shown);
    announce(r.say);
    this.board.animate();
    this.board.changed('step');
  }

  cancel(quiet = false) {
    const was = this.jobs.busy;
    this.jobs.cancel();
    this.busy(false);
    if (was && !quiet) {
      this.answer(['Search cancelled. Ask again, or ask a smaller question.'], 'cancelled');
      announce('Search cancelled.');
    }
  }
}
