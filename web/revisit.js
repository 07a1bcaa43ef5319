// Revisit: the puzzles the player missed (failed, or solved with help), back on a spaced
// schedule kept by the engine (FSRS, engine::schedule). The screen lists what is due today,
// plays it puzzle by puzzle, and after each says when it comes back.

import { BoardView } from './board.js';
import { dayWords, themes } from './pkg/fivefold_web.js';
import { today } from './practice.js';
import { $, el, fill, keepFocus } from './ui.js';

export class Revisit {
  constructor(app) {
    this.app = app;
    this.queue = [];
    this.index = 0;
    this.board = new BoardView($('revisit-board'), {
      log: $('revisit-log'),
      message: $('revisit-message'),
      onChange: (s) => this.renderPlay(s),
      onFinish: (s, millis) => this.finished(s, millis),
    });
    for (const b of $('revisit-play').querySelectorAll('[data-act]')) {
      b.addEventListener('click', () => this.act(b.dataset.act));
    }
    $('revisit-start').addEventListener('click', () => this.start());
    $('revisit-back').addEventListener('click', () => this.showList());
    app.practice.onChange(() => {
      if (!$('revisit-list-box').hidden) this.renderList();
    });
  }

  applySettings(s) {
    this.board.setOptions(s);
  }

  /** The Revisit screen is shown. */
  activate() {
    if ($('revisit-play').hidden) this.renderList();
  }

  showList() {
    this.board.cancelPacing();
    $('revisit-play').hidden = true;
    $('revisit-list-box').hidden = false;
    this.renderList();
    keepFocus($('revisit-title'));
  }

  renderList() {
    const practice = this.app.practice.handle;
    const day = today();
    const c = practice.counts(day);
    $('revisit-lead').textContent = c.say;
    const due = practice.due(day);
    $('revisit-start').disabled = due.length === 0;
    $('revisit').dataset.due = String(due.length);
    const labels = new Map(JSON.parse(themes()).map((t) => [t.name, t.label]));
    fill($('revisit-list'), due.map((item) => {
      const p = JSON.parse(item.puzzle);
      const from = item.origin === 'tonight' ? `Tonight: ${item.title}` : item.origin === 'games' ? 'My games' : 'Drill';
      const late = item.due < day ? `due since ${dayWords(item.due)}` : 'due today';
      // What the puzzle is, so that two from one set can be told apart.
      const side = p.to_move === 'white' ? 'White' : 'Black';
      const what = [`${side} to play`, labels.get(p.theme), Number.isInteger(p.rating) ? `difficulty ${p.rating}` : null]
        .filter(Boolean).join(' · ');
      return el('li', { class: 'card compact' },
        el('div', {},
          el('h3', { class: 'set-title', text: from }),
          el('p', { class: 'meta', text: what }),
          el('p', { class: 'meta', text: `${p.rule} · ${item.tries ? `${item.tries} ${item.tries === 1 ? 'try' : 'tries'} so far` : 'missed in a game, not tried here yet'} · ${late}` })));
    }));
  }

  start() {
    this.queue = this.app.practice.handle.due(today());
    this.index = 0;
    if (!this.queue.length) return this.renderList();
    $('revisit-list-box').hidden = true;
    $('revisit-play').hidden = false;
    window.scrollTo(0, 0);
    this.load();
    keepFocus($('revisit-board'));
  }

  load() {
    const item = this.queue[this.index];
    if (!item) return this.showList();
    $('revisit-next-time').textContent = '';
    $('revisit-source').textContent = item.origin === 'tonight' ? `From Tonight: ${item.title}` :
      item.origin === 'games' ? 'From My games' : 'From Drill';
    $('revisit-count').textContent = `Puzzle ${this.index + 1} of ${this.queue.length} due`;
    // Puzzles of the built-in library, Drill and My games were proved here; a set from a
    // file or a link keeps its key unproved until Tonight has checked it.
    this.board.load(item.puzzle, { trusted: item.origin !== 'tonight' });
    this.renderPlay(this.board.status());
  }

  finished(s, millis) {
    const item = this.queue[this.index];
    // Only the first finished try of a review counts, as in Tonight and Drill: a retry after
    // it is practice, and would review the puzzle again.
    if (!item || item.counted) return;
    item.counted = true;
    const p = JSON.parse(item.puzzle);
    const out = this.app.practice.finished({
      origin: 'revisit',
      title: item.title,
      puzzle: item.puzzle,
      attempt: s.attempt,
      hints: s.record.hints,
      wrong: s.record.wrong,
      millis,
      rating: this.app.drill.ratingFor(p.rule),
    });
    // Shown at once, and said (to screen readers too) once the app's replies are shown.
    if (out?.say) $('revisit-next-time').textContent = out.say;
    return out?.say;
  }

  renderPlay(s) {
    const root = $('revisit-play');
    const over = s.state !== 'playing';
    root.querySelector('[data-act="hint"]').disabled = over || s.pending > 0 || s.record.hints >= 3 || !!s.solution;
    root.querySelector('[data-act="hint"]').hidden = s.state === 'failed';
    root.querySelector('[data-act="solution"]').hidden = s.state !== 'failed';
    root.querySelector('[data-act="solution"]').disabled = s.pending > 0;
    root.querySelector('[data-act="undo"]').disabled = s.record.played.length === 0 && !s.solution;
    root.querySelector('[data-act="retry"]').disabled = s.moves.length === 0 && s.record.played.length === 0;
    const next = root.querySelector('[data-act="next"]');
    next.textContent = this.index + 1 >= this.queue.length ? 'Done' : 'Next';
    next.classList.toggle('ready', over && s.pending === 0);
  }

  act(what) {
    if (this.board.act(what, this.app.study)) return;
    if (what === 'next') {
      this.index += 1;
      if (this.index >= this.queue.length) this.showList();
      else this.load();
    }
  }
}
