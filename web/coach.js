// Coach: the instructor's screen. A set is made in the worker puzzle by puzzle (so that Cancel
// keeps what was made) or picked from the starter library and Tonight's sets, previewed on a
// board, handed out (a link on the club's address and its QR code, a set file, a printed
// sheet, Tonight), and the class's result codes are read into a table kept with the set.
// Every sentence about a puzzle, every code and the table itself come from Rust; titles and
// names from outside are only ever written as text.

import { setKey, themes } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs, NOT_ENOUGH } from './jobs.js';
import { inOrder } from './lanes.js';
import { loadScanner, loadWorkshop } from './platform.js';
import { save } from './store.js';
import {
  COACH_BANDS, COACH_DEEP_MOVES, COACH_MAX_CODES, COACH_MAX_PUZZLES, COACH_MOST_WORKERS, COACH_MAX_SETS, COACH_TABS, coachSetFile, earlierOf, emptyCoach,
} from './coach-data.js';
import { $, announce, banner, clearBanner, download, el, fill, isInt, keepFocus, paintQr, randomSeed } from './ui.js';

// Seeds are whole numbers; six digits are easy to read out and write down.
const newCoachSeed = () => 100000 + (randomSeed() % 900000);
const coachToday = () => new Date().toISOString().slice(0, 10);

const bandWords = (b) => `${b.words}, ${b.lo} to ${b.hi}`;
// A set's band (Any level for a name no longer known).
const bandOf = (s) => COACH_BANDS.find((b) => b.name === s.band) ?? COACH_BANDS[0];
// How many seeds in a row gave no puzzle, in words.
const fromSeeds = (n) => (n === 1 ? 'from its seed' : `from ${n} seeds in a row`);

/** The address a link is built on: the one set in Coach, else the page's own when it is
 * served over http(s); null from a file with none set. */
function coachBase(address) {
  if (address) return address;
  return /^https?:$/.test(location.protocol) ? location.href.split('#')[0] : null;
}

/** A club address as typed, checked: an http(s) address without a fragment; throws why not. */
export function cleanAddress(text) {
  const t = text.trim();
  if (!t) return '';
  let u;
  try {
    u = new URL(t);
  } catch {
    throw new Error('it is not a web address (it should start with https://)');
  }
  if (!/^https?:$/.test(u.protocol)) throw new Error('it should start with https:// or http://');
  u.hash = '';
  return u.href;
}

export class Coach {
  constructor(app) {
    this.app = app;
    this.data = emptyCoach();
    this.jobs = new Jobs();
    // The workers beside this.jobs that make a set's puzzles (see workers()).
    this.extra = [];
    this.making = null;
    this.sel = 0;
    this.scanner = null;
    this.ws = null;
    this.themeList = JSON.parse(themes());
    this.sources = null;
    this.board = new BoardView($('coach-board'), { message: $('coach-goal') });
    $('coach-new').addEventListener('click', () => this.newSet());
    $('coach-back').addEventListener('click', () => this.showList());
    for (const b of document.querySelectorAll('#coach-tabs [data-tab]')) {
      b.addEventListener('click', () => this.tab(b.dataset.tab));
    }
    // The recipe: every change is kept with the set at once.
    $('coach-name').addEventListener('input', (e) => this.edit((s) => { s.title = e.target.value.slice(0, 200); }, false));
    $('coach-rule').addEventListener('change', (e) => this.edit((s) => {
      s.rule = e.target.value;
      s.themes = s.themes.filter((t) => this.allowed(t, s.rule));
      if (!s.themes.length) s.themes = ['vcf'];
    }));
    $('coach-size').addEventListener('change', (e) => this.edit((s) => { s.size = Number(e.target.value); }));
    $('coach-count').addEventListener('change', (e) => this.edit((s) => {
      const n = Math.round(Number(e.target.value));
      s.count = Number.isFinite(n) ? Math.min(COACH_MAX_PUZZLES, Math.max(1, n)) : s.count;
    }));
    $('coach-band').addEventListener('change', (e) => this.edit((s) => { s.band = e.target.value; }));
    $('coach-seed').addEventListener('change', (e) => this.edit((s) => {
      const n = Number(e.target.value.trim());
      if (isInt(n, 0, Number.MAX_SAFE_INTEGER - 100000)) s.seed = n;
      else banner('A seed is a whole number, like 120517.', { kind: 'warn', id: 'coach' });
    }));
    $('coach-new-seed').addEventListener('click', () => this.edit((s) => { s.seed = newCoachSeed(); }));
    $('coach-themes').addEventListener('change', () => this.edit((s) => {
      const picked = [...$('coach-themes').querySelectorAll('input:checked')].map((i) => i.value);
      if (picked.length) s.themes = picked;
      else banner('A set needs at least one theme.', { kind: 'warn', id: 'coach' });
    }));
    $('coach-make-go').addEventListener('click', () => this.make());
    $('coach-cancel').addEventListener('click', () => this.cancelMaking());
    $('coach-show-answer').addEventListener('click', () => {
      const box = $('coach-answer');
      box.hidden = !box.hidden;
      $('coach-show-answer').textContent = box.hidden ? 'Show the answer' : 'Hide the answer';
    });
    $('coach-up').addEventListener('click', () => this.move(-1));
    $('coach-down').addEventListener('click', () => this.move(1));
    $('coach-drop').addEventListener('click', () => this.drop());
    $('coach-more').addEventListener('click', () => this.oneMore());
    $('coach-library').addEventListener('toggle', () => this.renderSources());
    $('coach-source').addEventListener('change', () => this.renderSource());
    // Handing out.
    $('coach-address-save').addEventListener('click', () => this.saveAddress());
    $('coach-copy-link').addEventListener('click', () => this.copy($('coach-link').value, 'The link'));
    $('coach-download').addEventListener('click', () => this.downloadSet());
    $('coach-print-sheet').addEventListener('click', () => this.printSheet());
    $('coach-try').addEventListener('click', () => this.tryInTonight());
    window.addEventListener('resize', () => {
      if (!$('coach-handout').hidden && this.current()) this.drawQr();
    });
    window.addEventListener('afterprint', () => delete document.documentElement.dataset.print);
    // Results.
    $('coach-read').addEventListener('click', () => this.readCodes($('coach-codes').value, 'paste'));
    $('coach-scan').addEventListener('click', () => this.scan());
    $('coach-sort').addEventListener('change', (e) => this.edit((s) => { s.sort = e.target.value; }));
    $('coach-csv').addEventListener('click', () => this.exportCsv());
    $('coach-print-table').addEventListener('click', () => this.printTable());
  }

  init(data) {
    this.cancelMaking(true);
    // The same data again (a backup without Coach's part): its set being made is still live.
    const live = data === this.data ? this.making?.set : null;
    this.data = data ?? emptyCoach();
    this.cutShort = this.recover(live);
    if (this.cutShort) this.save();
    this.show();
  }

  /** Called when the screen opens: the sheet and the class table come from the workshop
   * module, loaded here on first use (a student who never opens Coach never loads it). */
  async activate() {
    if (this.ws) return;
    try {
      this.ws = await loadWorkshop();
    } catch (e) {
      banner(`Coach could not start: ${e?.message ?? e}. Reload the page to try again.`, { kind: 'error', id: 'coach' });
      return;
    }
    this.show();
  }

  show() {
    if (!this.ws) return; // activate() shows the screen once the module is there
    if (this.cutShort) {
      banner(this.cutShort, { kind: 'warn', id: 'coach' });
      this.cutShort = '';
    }
    if (this.current()) this.openSet(this.data.open, this.data.tab);
    else this.showList();
  }

  applySettings(s) {
    this.board.setOptions(s);
  }

  save() {
    save('coach', this.data);
  }

  current() {
    return this.data.sets.find((s) => s.id === this.data.open) ?? null;
  }

  allowed(theme, rule) {
    return this.themeList.some((t) => t.name === theme && t.rules.includes(rule));
  }

  /** Changes the open set with `f`, keeps it, and shows it again. */
  edit(f, render = true) {
    const s = this.current();
    if (!s) return;
    f(s);
    this.save();
    if (render) this.render();
    else this.renderHead();
  }

  // ---- the list of sets ----

  showList() {
    this.stopScanning();
    this.data.open = null;
    $('coach-list').hidden = false;
    $('coach-set').hidden = true;
    this.save();
    this.renderList();
    keepFocus($('coach-title'));
  }

  renderList() {
    $('coach-none').hidden = this.data.sets.length > 0;
    fill($('coach-sets'), this.data.sets.map((s) => {
      const students = this.tableOf(s)?.students.length ?? 0;
      return el('li', { class: 'card', 'data-id': s.id },
        el('h2', { class: 'set-title', text: s.title || 'Untitled set' }),
        el('p', { class: 'meta', text: `${s.puzzles.length} puzzles · ${s.rule} · made ${s.created} · ${students} result${students === 1 ? '' : 's'}` }),
        el('div', { class: 'row' },
          el('button', { type: 'button', class: 'primary', onclick: () => this.openSet(s.id, 'make') }, 'Open'),
          el('button', { type: 'button', class: 'secondary', onclick: () => this.openSet(s.id, 'results') }, 'Results'),
          el('button', { type: 'button', class: 'quiet', onclick: () => this.deleteSet(s.id) }, 'Delete')));
    }));
  }

  newSet() {
    if (this.data.sets.length >= COACH_MAX_SETS) {
      banner(`Coach keeps at most ${COACH_MAX_SETS} sets; delete one first.`, { kind: 'warn', id: 'coach' });
      return;
    }
    const id = `c${Date.now().toString(36)}${this.data.sets.length.toString(36)}`;
    const n = this.data.sets.length + 1;
    this.data.sets.push({
      id, title: `Club night ${coachToday()}${n > 1 ? ` (${n})` : ''}`, created: coachToday(), rule: 'freestyle', size: 15,
      themes: ['vcf'], count: 12, band: 'any', seed: newCoachSeed(), next: 0, puzzles: [], codes: [], sort: 'added',
    });
    this.openSet(id, 'make');
    $('coach-name').focus();
  }

  deleteSet(id) {
    const at = this.data.sets.findIndex((s) => s.id === id);
    if (at < 0) return;
    const [gone] = this.data.sets.splice(at, 1);
    if (this.data.open === id) this.data.open = null;
    this.save();
    this.renderList();
    this.undoBanner(`Deleted "${gone.title || 'Untitled set'}".`, () => {
      this.data.sets.splice(Math.min(at, this.data.sets.length), 0, gone);
      this.save();
      this.renderList();
      announce(`"${gone.title || 'Untitled set'}" is back.`);
    });
  }

  /** A banner with an Undo button that calls `undo` once. */
  undoBanner(message, undo) {
    const b = banner(message, { kind: 'info', id: 'coach-undo' });
    let done = false;
    b.insertBefore(el('button', {
      type: 'button',
      class: 'secondary',
      onclick: () => {
        if (done) return;
        done = true;
        b.remove();
        undo();
      },
    }, 'Undo'), b.lastElementChild);
  }

  // ---- one set ----

  openSet(id, tab = 'make') {
    if (!this.data.sets.some((s) => s.id === id)) return this.showList();
    this.data.open = id;
    this.sel = 0;
    $('coach-list').hidden = true;
    $('coach-set').hidden = false;
    this.tab(tab);
  }

  tab(name) {
    if (!COACH_TABS.includes(name)) name = 'make';
    if (name !== 'results') this.stopScanning();
    this.data.tab = name;
    for (const t of COACH_TABS) $(`coach-${t}`).hidden = t !== name;
    for (const b of document.querySelectorAll('#coach-tabs [data-tab]')) {
      if (b.dataset.tab === name) b.setAttribute('aria-current', 'true');
      else b.removeAttribute('aria-current');
    }
    $('coach').dataset.tab = name;
    this.save();
    this.render();
  }

  render() {
    const s = this.current();
    if (!s) return;
    this.renderHead();
    if (this.data.tab === 'make') this.renderMake();
    else if (this.data.tab === 'handout') this.renderHandout();
    else this.renderResults();
  }

  renderHead() {
    const s = this.current();
    $('coach-set-title').textContent = s.title || 'Untitled set';
    const n = s.puzzles.length;
    $('coach').dataset.made = String(n);
    $('coach-set-count').textContent = `${n} puzzle${n === 1 ? '' : 's'} · ${s.rule} · ${s.size} × ${s.size}`;
  }

  // ---- making ----

  renderMake() {
    const s = this.current();
    const locked = s.codes.length > 0;
    $('coach-name').value = s.title;
    $('coach-rule').value = s.rule;
    $('coach-size').value = String(s.size);
    $('coach-count').value = String(s.count);
    fill($('coach-band'), COACH_BANDS.map((b) => el('option', { value: b.name, text: bandWords(b) })));
    $('coach-band').value = s.band;
    $('coach-seed').value = String(s.seed);
    const box = $('coach-theme-list');
    fill(box, this.themeList.filter((t) => t.rules.includes(s.rule)).map((t) =>
      el('label', {}, el('input', { type: 'checkbox', value: t.name, checked: s.themes.includes(t.name) }), el('span', { text: t.label }))));
    this.renderBandNote();
    const busy = !!this.making;
    for (const id of ['coach-rule', 'coach-size', 'coach-count', 'coach-band', 'coach-seed', 'coach-new-seed', 'coach-make-go']) {
      $(id).disabled = busy || locked;
    }
    for (const i of box.querySelectorAll('input')) i.disabled = busy || locked;
    $('coach-locked').hidden = !locked;
    const what = s.count === 1 ? 'puzzle' : 'puzzles';
    $('coach-make-go').textContent = s.puzzles.length ? `Make ${s.count} new ${what}` : `Make ${s.count} ${what}`;
    this.renderBusy();
    this.renderPuzzles();
  }

  /** Says where the chosen themes' puzzles usually rate (the library's, which have one
   * correct answer each), and warns when the band misses that range. A set may hold puzzles
   * with two or three correct answers, which rate lower (difficulty.rs: 160 less for two, 254
   * for three), so a band below the range is still reached, by those alone: rarer, so slower,
   * and sometimes not at all (benchmark notes, 2026-12-04: Club threes-and-fours sets are made
   * in about 10 s, Starting-out ones in freestyle come out empty, and in a set of several
   * themes such a theme is left out: see generate). Several answers never rate higher, so a
   * band above the range finds few or none (and in a set of several themes, that theme is
   * left out too). */
  renderBandNote() {
    const s = this.current();
    const band = bandOf(s);
    const notes = [];
    let warn = false;
    const noneFound = s.themes.length > 1 ? 'a theme that keeps giving none is left out of the rest of the set' : 'the set may come out short or empty';
    for (const t of s.themes) {
      let r;
      try {
        r = this.ws.themeRatings(t, s.rule);
      } catch {
        continue;
      }
      const label = this.themeLabel(t);
      const rangeBelow = r[1] < band.lo;
      const rangeAbove = r[0] > band.hi;
      warn ||= rangeBelow || rangeAbove;
      notes.push(rangeBelow
        ? `${label}: usually ${r[0]} to ${r[1]}, below this band: few or none will be found${s.themes.length > 1 ? `, and ${noneFound}` : ''}.`
        : rangeAbove
          ? `${label}: usually ${r[0]} to ${r[1]} with one correct answer. At this level only puzzles with two or three are found: they are rarer, so making them takes longer, and ${noneFound}.`
          : `${label}: usually ${r[0]} to ${r[1]}.`);
    }
    $('coach-band-note').textContent = notes.join(' ');
    $('coach-band-note').dataset.kind = warn ? 'warn' : '';
  }

  /** How many seeds in a row may give no puzzle of a kind's theme (under its rule) at the set's
   * band before the theme is left out (or, alone, stops the making). A seed that gives none
   * is passed over and the next is tried for the same place. Measured with the command line,
   * five seeds each, one puzzle, Coach's options (engine/benches/README.md, 2026-12-04, 15:05
   * to 15:56):
   * - where the library's range of the theme lies below the band, no seed gave one (four-three
   *   at Strong club and Expert: 0 of 20), and several answers only rate lower: one try;
   * - threes and fours take 15 to 25 s to give none, and Expert's deep lines up to 35 s
   *   (Expert fours: 1 of 5 missed; threes and fours at Starting out: 5 of 5 missed in
   *   freestyle, 2 of 5 in renju); defences, whose searches are as dear, missed none of 40:
   *   two tries;
   * - the others give none within a second, and some seeds miss where others give one (a
   *   four-three at Club: 1 of 5; a forbidden trap at Expert: 11 of 15; a forbidden win at
   *   Starting out: 5 of 15): sixteen tries, after which a forbidden trap at Expert is still
   *   left out 0.7 % of the times, at a cost of about 11 s here where a theme gives none at
   *   all (a forbidden win at Expert: 0 of 15). */
  triesFor(s, { theme, rule }) {
    const band = bandOf(s);
    let r = null;
    try {
      r = this.ws.themeRatings(theme, rule);
    } catch {
      // No range known: judged by the cost of a try alone.
    }
    if (r && r[1] < band.lo) return 1;
    const dear = theme === 'vct' || theme === 'defend' || (band.name === 'expert' && COACH_DEEP_MOVES[theme]);
    return dear ? 2 : 16;
  }

  /** A theme's name as the theme list shows it. */
  themeLabel(theme) {
    return this.themeList.find((x) => x.name === theme)?.label ?? theme;
  }

  renderPuzzles() {
    const s = this.current();
    const n = s.puzzles.length;
    this.sel = Math.min(Math.max(0, this.sel), Math.max(0, n - 1));
    $('coach-empty').hidden = n > 0;
    $('coach-preview').hidden = n === 0;
    fill($('coach-marks'), s.puzzles.map((p, i) => el('li', {},
      el('button', {
        type: 'button',
        class: 'mark',
        'aria-label': `Puzzle ${i + 1}`,
        'aria-current': i === this.sel ? 'step' : null,
        onclick: () => {
          this.sel = i;
          this.renderPuzzles();
        },
      }, String(i + 1)))));
    if (!n) return;
    const p = s.puzzles[this.sel];
    let w;
    try {
      w = this.ws.puzzleWords(JSON.stringify(p));
    } catch (e) {
      w = { goal: '', answer: `The answer cannot be shown (${e}).`, theme: p.theme };
    }
    // The board is loaded again only for another puzzle (a load brings the board into view).
    const shownKey = `${s.id}:${p.id}`;
    if (this.previewed !== shownKey || this.board.canvas.dataset.mode !== 'puzzle') {
      this.previewed = shownKey;
      this.board.load(JSON.stringify(p), { trusted: true });
    }
    $('coach-about').textContent = `Puzzle ${this.sel + 1} of ${n} · ${w.theme} · ${p.rule} · difficulty ${p.rating}`;
    $('coach-answer').textContent = w.answer;
    $('coach-answer').hidden = true;
    $('coach-show-answer').textContent = 'Show the answer';
    const locked = s.codes.length > 0 || !!this.making;
    $('coach-up').disabled = locked || this.sel === 0;
    $('coach-down').disabled = locked || this.sel >= n - 1;
    $('coach-drop').disabled = locked;
    $('coach-more').disabled = locked || n >= COACH_MAX_PUZZLES;
  }

  /** The generation options of one puzzle of `kind` ({theme, rule, size}) from the set's seed
   * plus `index`. */
  optionsFor(s, kind, index) {
    const band = bandOf(s);
    const deep = band.name === 'expert' && COACH_DEEP_MOVES[kind.theme];
    return {
      ...kind, ratingLo: band.lo, ratingHi: band.hi, seed: s.seed + index, count: 1,
      ...(deep ? { minMoves: deep, unique: true } : {}),
    };
  }

  /** Makes one puzzle of `kind` from the set's seed plus `index`, on `jobs` (a worker);
   * resolves to the puzzle. */
  async makeOne(s, kind, index, jobs) {
    const json = await jobs.run('generate', { options: this.optionsFor(s, kind, index) });
    return JSON.parse(json).puzzles[0];
  }

  /** The same puzzle as makeOne, its games spread over `lanes` (workers): the seed's games are
   * played on the free workers and taken in number order (web/lanes.js) until one gives a
   * puzzle, so it is the puzzle makeOne makes; the games still running then are stopped.
   * `cancelled()` says when to start no more. */
  async makeSpread(s, kind, index, lanes, cancelled) {
    const options = this.optionsFor(s, kind, index);
    let limit = Infinity;
    let taken = 0;
    let found = null;
    let failed = null;
    try {
      await inOrder({
        lanes: lanes.length,
        first: 0,
        input: () => null,
        work: (lane, game) => lanes[lane].run('game', { options, number: game }),
        take: (game, _, outcome) => {
          taken = game + 1;
          if (outcome.error) {
            failed = outcome.error;
            return false;
          }
          const { puzzle, limit: most, exhausted } = outcome.value;
          limit = most;
          if (puzzle) {
            found = puzzle;
            return false;
          }
          if (taken >= limit) {
            failed = Object.assign(new Error(exhausted), { code: NOT_ENOUGH });
            return false;
          }
          return true;
        },
        wanted: () => (found || failed || cancelled() ? 0 : limit - taken),
      });
    } finally {
      for (const jobs of lanes) if (jobs.busy) jobs.cancel();
    }
    if (failed) throw failed;
    return found;
  }

  /** The workers a set's puzzles are made on: one per core the device reports, at most
   * COACH_MOST_WORKERS, and at most two on a device that says it has 2 GB of memory or less
   * (each worker holds the solver's 32 MB of tables); the first is this.jobs. */
  workers() {
    const small = navigator.deviceMemory !== undefined && navigator.deviceMemory <= 2;
    const most = small ? Math.min(2, COACH_MOST_WORKERS) : COACH_MOST_WORKERS;
    const cores = Math.max(1, Math.min(most, navigator.hardwareConcurrency || 1));
    while (this.extra.length < cores - 1) this.extra.push(new Jobs());
    return [this.jobs, ...this.extra.slice(0, cores - 1)];
  }

  /** Makes the set's puzzles afresh from its recipe: puzzle i from seed + i, the themes taken
   * in turn; each puzzle is kept as it comes, so Cancel keeps what was made. */
  async make() {
    const s = this.current();
    if (!s || this.making || s.codes.length) return;
    if (s.puzzles.length && !window.confirm(`Replace the ${s.puzzles.length} puzzles of this set with ${s.count} new ones?`)) return;
    const old = { puzzles: s.puzzles, next: s.next };
    const n = old.puzzles.length;
    s.puzzles = [];
    s.next = 0;
    // The earlier puzzles are kept with the set until the new ones are there: a making that
    // gives none gives them back, and so does Coach after one a closed page cut short
    // (`recover`).
    if (n) s.earlier = old;
    this.sel = 0;
    this.save();
    let made = 0;
    try {
      made = await this.generate(s, s.count);
    } finally {
      if (n) {
        delete s.earlier;
        if (!made) Object.assign(s, old);
        this.save();
      }
    }
    // (A set deleted, or the data restored from a backup, while it was made: nothing to say.)
    if (!n || !this.data.sets.includes(s)) return;
    const puzzles = n === 1 ? 'puzzle' : 'puzzles';
    if (!made) {
      this.render();
      banner(`The set keeps its ${n} earlier ${puzzles}.`, { kind: 'info', id: 'coach-undo' });
      return;
    }
    this.undoBanner(`The new puzzles replaced the ${n} earlier ${n === 1 ? 'one' : 'ones'}.`, () => {
      // Not under a making, nor once the set is handed out (its codes fit these puzzles).
      if (this.making || s.codes.length || !this.data.sets.includes(s)) return;
      Object.assign(s, old);
      this.save();
      this.render();
    });
  }

  /** A making cut short by a closed or reloaded page (its set still says it is being made, or
   * still holds the puzzles it replaces): the set gets its earlier puzzles back, if it was
   * made again (the new ones come again from the same seed), or keeps those it has. `live`:
   * the set this page is making now, left alone. Returns what to tell the instructor. */
  recover(live = null) {
    const said = [];
    for (const s of this.data.sets) {
      if (s.id === live || (s.making === undefined && s.earlier === undefined)) continue;
      const earlier = s.earlier === undefined ? undefined : earlierOf(s);
      delete s.making;
      delete s.earlier;
      if (earlier) Object.assign(s, earlier);
      const n = s.puzzles.length;
      const kept = earlier
        ? `the set keeps its ${n} earlier ${n === 1 ? 'puzzle' : 'puzzles'}`
        : `the set keeps the ${n} ${n === 1 ? 'puzzle' : 'puzzles'} it has${earlier === null ? ' (its earlier ones could not be read)' : ''}`;
      said.push(`Making “${s.title || 'Untitled set'}” was cut short (the page was closed or reloaded, or Fivefold opened in another tab, while it ran); ${kept}.`);
    }
    return said.join(' ');
  }

  /** Adds `count` generated puzzles to the set; `kindAt(i)` gives the theme, rule and size of
   * the set's puzzle number i (from 0): by default the recipe's, its themes taken in turn.
   * Seeds are tried in order, s.next on, one puzzle per seed; the workers make the next few
   * at once and their puzzles are taken in seed order (web/lanes.js), so the set is the same
   * whatever the number of workers. A seed that gives no puzzle at the band (its games run
   * out) is passed over and the next seed is tried for the same place. A recipe theme whose
   * seeds give none triesFor times in a row (threes and fours at Starting out: two) is left
   * out for the rest of this making, while another theme remains, and the set is filled with
   * the others; the making stops when none remains (for a kind given by `kindAt`, when its
   * tries are used up). A puzzle started ahead with another kind than its place turns out to
   * need is stopped and made again with the right kind (lanes.js `abandon`). Returns how
   * many puzzles were added. */
  async generate(s, count, kindAt = null) {
    // The themes left out, each with the seeds in a row that gave none.
    const left = new Map();
    // Seeds in a row that gave none for the place being made (a miss keeps the place, and so
    // its theme, until a puzzle is kept or the theme is left out).
    let dry = 0;
    const recipe = !kindAt;
    const themes = () => s.themes.filter((t) => !left.has(t));
    kindAt ??= (i) => {
      const t = themes();
      return { theme: t[i % t.length], rule: s.rule, size: s.size };
    };
    const lanes = this.workers();
    // `workers`: how many make puzzles at once; `cancelled`: set by Cancel, after which no
    // puzzle is started (not even one made again for its right theme).
    // The last making's message would cover the progress line.
    clearBanner('coach');
    const making = { set: s.id, started: performance.now(), made: 0, passed: 0, count, workers: count === 1 ? lanes.length : Math.min(lanes.length, count), cancelled: false };
    this.making = making;
    // Saved with the set until the making ends, so that a closed page is noticed (`recover`).
    s.making = { count };
    this.save();
    this.render();
    const tick = setInterval(() => this.renderBusy(), 1000);
    this.renderBusy();
    let misses = 0;
    let problem = null;
    try {
      await inOrder({
        lanes: lanes.length,
        first: s.next,
        // A puzzle made ahead of its turn is given the kind of the place it would take if
        // every puzzle before it were kept (it is made again if one was not).
        input: (index, ahead) => kindAt(s.puzzles.length + ahead),
        // One puzzle wanted (One more like it, a set of one): its games are spread over the
        // workers instead.
        work: (lane, index, kind) => {
          if (making.cancelled) return Promise.reject(new Cancelled());
          if (count === 1 && lanes.length > 1) return this.makeSpread(s, kind, index, lanes, () => making.cancelled);
          return this.makeOne(s, kind, index, lanes[lane]);
        },
        take: (index, kind, outcome) => {
          if (outcome.error) {
            if (outcome.error instanceof Cancelled) return false;
            if (outcome.error.code === NOT_ENOUGH) {
              // The seed is passed over: the next one is tried for the same place, until the
              // theme has used up its tries in a row.
              s.next = index + 1;
              making.passed++;
              this.renderBusy();
              const n = ++dry;
              if (n < this.triesFor(s, kind)) return true;
              dry = 0;
              if (!recipe) {
                problem = `no puzzle like it came at this difficulty ${fromSeeds(n)}`;
                return false;
              }
              left.set(kind.theme, n);
              return themes().length > 0;
            }
            problem = outcome.error.message;
            return false;
          }
          const p = outcome.value;
          s.next = index + 1;
          // The same position from another seed is made once only (and does not end a run of
          // seeds that gave none).
          if (s.puzzles.some((q) => q.id === p.id)) {
            if (++misses > 20) {
              problem = 'the same puzzles keep coming back; try another band or seed';
              return false;
            }
            return true;
          }
          dry = 0;
          s.puzzles.push(p);
          making.made++;
          this.save();
          if (this.data.open === s.id && this.data.tab === 'make') this.renderPuzzles();
          this.renderHead();
          this.renderBusy();
          return making.made < count && s.puzzles.length < COACH_MAX_PUZZLES;
        },
        wanted: () => (making.cancelled ? 0 : Math.min(count - making.made, COACH_MAX_PUZZLES - s.puzzles.length)),
        // A puzzle started ahead whose kind has turned out wrong (a seed before it gave none,
        // or a repeat) is stopped at once, its worker started afresh, and made again with the
        // right kind. (One puzzle spread over the workers is never started ahead.)
        abandon: (lane) => lanes[lane].cancel(),
      });
    } finally {
      clearInterval(tick);
      if (this.making === making) this.making = null;
      delete s.making;
      // Puzzles started ahead that are no longer needed are stopped, and the extra workers'
      // memory is given back (the next set starts them again).
      if (this.jobs.busy) this.jobs.cancel();
      for (const jobs of this.extra) jobs.cancel();
    }
    this.save();
    const secs = Math.round((performance.now() - making.started) / 1000);
    // Every theme of the recipe ran out of games at the band: the making stopped.
    const exhausted = left.size > 0 && !themes().length;
    const quoted = (t) => `“${this.themeLabel(t)}”`;
    if (exhausted) {
      const each = [...left].map(([t, n]) => `${quoted(t)}: none ${fromSeeds(n)}`).join(', ');
      problem = `no puzzle came at this difficulty (${each}); choose another difficulty`;
    }
    const puzzles = count === 1 ? 'puzzle' : 'puzzles';
    const outcome = problem
      ? `Made ${making.made} of ${count} ${puzzles}; then it stopped: ${problem}.`
      : making.made === 0 && count > 0 ? 'Stopped before any puzzle was made.'
        : making.made < count ? `Stopped: made ${making.made} of ${count} ${puzzles}; they are kept.` : `Made ${count} ${puzzles} in ${secs ? `${secs} s` : 'under a second'}.`;
    // The seeds passed over (the last run of misses of a theme left out is said with it).
    const over = [...left.values()].reduce((sum, n) => sum - n, making.passed);
    const passed = over && !problem
      ? ` ${over} ${over === 1 ? 'seed' : 'seeds'} gave no puzzle at this difficulty and ${over === 1 ? 'was' : 'were'} passed over.`
      : '';
    const leftOut = exhausted
      ? ''
      : [...left].map(([t, n]) => ` ${quoted(t)} gave no puzzle at this difficulty ${fromSeeds(n)}, so it was left out of the rest of the set.`).join('');
    const said = `${outcome}${passed}${leftOut}`;
    banner(said, { kind: problem || left.size ? 'warn' : 'info', id: 'coach' });
    announce(said);
    this.render();
    return making.made;
  }

  renderBusy() {
    const m = this.making;
    $('coach-busy').hidden = !m;
    if (!m) {
      delete $('coach').dataset.making;
      return;
    }
    const secs = Math.floor((performance.now() - m.started) / 1000);
    const time = `${Math.floor(secs / 60)}:${String(secs % 60).padStart(2, '0')}`;
    const together = m.workers > 1 ? ` · ${m.workers} at a time` : '';
    // Seeds that gave none explain a making that seems to stand still.
    const passed = m.passed ? ` · ${m.passed} ${m.passed === 1 ? 'seed' : 'seeds'} gave none` : '';
    $('coach-busy-text').textContent = `Made ${m.made} of ${m.count} · ${time}${passed}${together}`;
    $('coach').dataset.workers = String(m.workers);
    $('coach-progress').max = m.count;
    $('coach-progress').value = m.made;
    $('coach').dataset.making = `${m.made}/${m.count}`;
  }

  cancelMaking(quiet = false) {
    if (!this.making) return;
    this.making.cancelled = true;
    for (const jobs of [this.jobs, ...this.extra]) jobs.cancel();
    if (!quiet) announce('Stopping; the puzzles made so far are kept.');
  }

  move(by) {
    const s = this.current();
    const to = this.sel + by;
    if (!s || s.codes.length || to < 0 || to >= s.puzzles.length) return;
    [s.puzzles[this.sel], s.puzzles[to]] = [s.puzzles[to], s.puzzles[this.sel]];
    this.sel = to;
    this.save();
    this.renderPuzzles();
    announce(`Puzzle moved to number ${to + 1}.`);
    $(by < 0 ? 'coach-up' : 'coach-down').focus();
  }

  drop() {
    const s = this.current();
    if (!s || s.codes.length || !s.puzzles.length) return;
    const at = this.sel;
    const [gone] = s.puzzles.splice(at, 1);
    this.save();
    this.render();
    this.undoBanner(`Dropped puzzle ${at + 1}.`, () => {
      if (s.puzzles.length >= COACH_MAX_PUZZLES || s.puzzles.some((q) => q.id === gone.id)) return;
      s.puzzles.splice(at, 0, gone);
      this.sel = at;
      this.save();
      this.render();
    });
  }

  /** One more puzzle like the one on show: its theme and rule, the recipe's next seed. */
  async oneMore() {
    const s = this.current();
    if (!s || this.making || s.codes.length || !s.puzzles.length) return;
    const like = s.puzzles[this.sel];
    const at = s.puzzles.length;
    await this.generate(s, 1, () => ({ theme: like.theme, rule: like.rule, size: like.size }));
    if (s.puzzles.length > at) {
      this.sel = at;
      this.renderPuzzles();
    }
  }

  // Adding puzzles from the starter library and Tonight's sets.

  renderSources() {
    if (!$('coach-library').open) return;
    this.library ??= JSON.parse(this.ws.librarySets());
    const tonight = this.app.tonight.sets.list.map((t) => ({ title: `Tonight: ${t.title || 'Untitled set'}`, json: t.json }));
    this.sources = [...this.library.map((set) => ({ title: `Library: ${set.title}`, set })), ...tonight];
    const pick = $('coach-source');
    const was = pick.value;
    fill(pick, this.sources.map((src, i) => el('option', { value: String(i), text: src.title })));
    if (was && Number(was) < this.sources.length) pick.value = was;
    this.renderSource();
  }

  renderSource() {
    const src = this.sources?.[Number($('coach-source').value)];
    const s = this.current();
    if (!src || !s) return;
    src.set ??= JSON.parse(src.json);
    const locked = s.codes.length > 0;
    fill($('coach-source-list'), src.set.puzzles.map((p, i) => {
      const have = s.puzzles.some((q) => q.id === p.id);
      let goal = '';
      try {
        goal = this.ws.puzzleWords(JSON.stringify(p)).goal;
      } catch {
        goal = p.theme;
      }
      return el('li', { class: 'card compact' },
        el('div', {}, el('p', { class: 'meta', text: `${i + 1}. ${goal} · ${p.rule} · difficulty ${p.rating}` })),
        el('button', {
          type: 'button',
          class: 'secondary',
          disabled: have || locked || s.puzzles.length >= COACH_MAX_PUZZLES,
          'aria-label': `Add puzzle ${i + 1}`,
          onclick: (e) => {
            this.addPuzzle(p);
            e.target.disabled = true;
            e.target.textContent = 'Added';
          },
        }, have ? 'Added' : 'Add'));
    }));
  }

  addPuzzle(p) {
    const s = this.current();
    if (!s || s.codes.length || s.puzzles.length >= COACH_MAX_PUZZLES || s.puzzles.some((q) => q.id === p.id)) return;
    s.puzzles.push(structuredClone(p));
    this.sel = s.puzzles.length - 1;
    this.save();
    this.renderHead();
    this.renderPuzzles();
    announce(`Added as puzzle ${s.puzzles.length}.`);
  }

  // ---- handing out ----

  /** The open set's set-file text, or null (with a message) when it has no puzzles yet. */
  setFile(what) {
    const s = this.current();
    if (!s) return null;
    if (!s.puzzles.length) {
      banner(`Make some puzzles first; then ${what}.`, { kind: 'warn', id: 'coach' });
      return null;
    }
    return coachSetFile(s);
  }

  renderHandout() {
    const s = this.current();
    $('coach-address').value = this.data.address;
    const base = coachBase(this.data.address);
    const empty = !s.puzzles.length;
    $('coach-handout-empty').hidden = !empty;
    for (const id of ['coach-download', 'coach-print-sheet', 'coach-try']) $(id).disabled = empty;
    $('coach-address-note').textContent = this.data.address
      ? 'Links are built on this address.'
      : base ? `No club address is set, so links use this page's address (${base}).` : '';
    $('coach-link-box').hidden = empty || !base;
    $('coach-nolink').hidden = empty || !!base;
    if (empty || !base) return;
    let link;
    try {
      link = this.ws.shareLink(base, coachSetFile(s));
    } catch (e) {
      $('coach-link').value = '';
      $('coach-link-note').textContent = `This set cannot be shared as a link: ${e}`;
      return;
    }
    $('coach-link').value = link;
    $('coach-link-note').textContent = `${link.length} characters. Nothing is sent anywhere: the set travels inside the link.`;
    this.drawQr();
  }

  /** Draws the link's QR code on the canvas, dark on white whatever the colours, each module a
   * whole number of device pixels, with the quiet zone. */
  drawQr() {
    const link = $('coach-link').value;
    const canvas = $('coach-qr');
    if (!link || !this.ws) return;
    let q;
    try {
      q = this.ws.qrMatrix(link);
    } catch (e) {
      canvas.hidden = true;
      $('coach-qr-note').textContent = `No QR code: ${e}`;
      return;
    }
    canvas.hidden = false;
    const side = q.size + 2 * q.quiet;
    const dpr = window.devicePixelRatio || 1;
    const css = canvas.getBoundingClientRect().width || 320;
    paintQr(canvas, q, Math.max(1, Math.floor((css * dpr) / side)));
    canvas.dataset.version = String(q.version);
    canvas.dataset.size = String(q.size);
    canvas.setAttribute('aria-label', `QR code of the link to "${this.current()?.title || 'Untitled set'}"`);
    $('coach-qr-note').textContent = `QR code version ${q.version} (${q.size} × ${q.size} modules). Show it on a large screen or print it; students scan it with their phone's camera.`;
  }

  saveAddress() {
    let clean;
    try {
      clean = cleanAddress($('coach-address').value);
    } catch (e) {
      $('coach-address-note').textContent = `That address cannot be used: ${e.message}. Nothing was changed.`;
      return;
    }
    this.data.address = clean;
    this.save();
    this.renderHandout();
    announce(clean ? 'The club address is saved.' : 'The club address is cleared.');
  }

  downloadSet() {
    const text = this.setFile('download its file');
    if (!text) return;
    const name = (this.current().title || 'set').replace(/[^\p{L}\p{N}]+/gu, '-').replace(/^-|-$/g, '').slice(0, 60) || 'set';
    download(`${name}.json`, `${JSON.stringify(JSON.parse(text), null, 1)}\n`);
    announce('The set file is downloaded.');
  }

  /** Fills the print area with the engine's sheet (diagrams, goals, a name and date line,
   * answer boxes, the key on its own page) and prints it. The sheet is the engine's markup,
   * in which every text from the set is escaped; it is parsed inertly (no scripts run in a
   * parsed document) and its body moved into the page. */
  fillSheet() {
    const text = this.setFile('print its sheet');
    if (!text) return false;
    // Only the body: the sheet's own style element is for the command line's file (this page
    // prints with style.css), and the page's policy refuses inline styles even in a parsed copy.
    const html = this.ws.sheetHtml(text);
    const doc = new DOMParser().parseFromString(html.slice(html.indexOf('<body')), 'text/html');
    for (const bad of doc.querySelectorAll('script, style, link, iframe, object, embed')) bad.remove();
    fill($('coach-print'), [...doc.body.childNodes].map((n) => document.adoptNode(n)));
    $('coach-print').dataset.kind = 'sheet';
    return true;
  }

  printSheet() {
    if (!this.fillSheet()) return;
    document.documentElement.dataset.print = 'sheet';
    window.print();
  }

  tryInTonight() {
    const text = this.setFile('open it in Tonight');
    if (!text) return;
    let got;
    try {
      got = this.app.tonight.addSet(text, 'coach');
    } catch (e) {
      banner(`It cannot be opened in Tonight: ${e.message ?? e}.`, { kind: 'error', id: 'coach' });
      return;
    }
    this.app.go('tonight');
    this.app.tonight.openSet(got.key);
  }

  // ---- results ----

  /** The open set's class table (null when the set has no puzzles). */
  tableOf(s) {
    if (!s.puzzles.length) return null;
    try {
      return this.ws.classRead(coachSetFile(s), s.codes, '', s.sort).table;
    } catch {
      return null;
    }
  }

  readCodes(text, how) {
    const s = this.current();
    if (!s) return;
    if (!s.puzzles.length) {
      banner('This set has no puzzles yet, so no result can belong to it.', { kind: 'warn', id: 'coach' });
      return;
    }
    if (!text.trim()) {
      this.report([{ line: 0, kind: 'refused', message: 'Nothing to read: paste the codes your students sent first.' }]);
      return;
    }
    let r;
    try {
      r = this.ws.classRead(coachSetFile(s), s.codes, text, s.sort);
    } catch (e) {
      banner(`The codes could not be read: ${e}. Nothing was changed.`, { kind: 'error', id: 'coach' });
      return;
    }
    if (s.codes.length + r.accepted.length > COACH_MAX_CODES) {
      banner(`A set keeps at most ${COACH_MAX_CODES} codes; nothing was added.`, { kind: 'error', id: 'coach' });
      return;
    }
    s.codes.push(...r.accepted);
    this.save();
    // Words around the codes (a greeting, a name) are listed once, at the end, not as codes
    // to look at.
    const skipped = r.notices.filter((n) => n.kind === 'skipped');
    const notices = r.notices.filter((n) => n.kind !== 'skipped');
    const count = (kind) => notices.filter((n) => n.kind === kind).length;
    const same = count('repeated');
    const look = count('refused');
    const head = `${r.newStudents} new student${r.newStudents === 1 ? '' : 's'}, ${r.replaced} replaced` +
      `${same ? `, ${same} unchanged` : ''}${look ? `, ${look} to look at` : ''}.`;
    const words = skipped.length ? [{ line: skipped[0].line, kind: 'skipped',
      message: `Skipped as text, not codes: ${skipped.map((n) => `line ${n.line} ‘${n.text}’`).join(', ')}.` }] : [];
    this.report([{ line: 0, kind: look ? 'refused' : 'ok', message: head }, ...this.nameOtherSets(notices, s), ...words]);
    if (how === 'paste' && r.accepted.length && !look) $('coach-codes').value = '';
    this.renderTable(r.table);
    this.renderHead();
    announce(head);
  }

  /** A code for another set names that set when it is one of this device's (a code pasted
   * into the wrong set); the engine's words give only its key ("a result for another set
   * (set key 5c5f9877)", engine/src/formats/class.rs). The keys of the other sets are worked
   * out once, and only if a notice needs them. */
  nameOtherSets(notices, s) {
    let titles = null;
    const titlesOf = (key) => {
      titles ??= this.data.sets.reduce((map, o) => {
        if (o === s || !o.puzzles.length) return map;
        let k;
        try {
          k = setKey(coachSetFile(o));
        } catch {
          return map;
        }
        return map.set(k, [...(map.get(k) ?? []), `“${o.title || 'Untitled set'}”`]);
      }, new Map());
      return titles.get(key);
    };
    return notices.map((n) => {
      const m = /a result for another set \(set key ([0-9a-f]{8})\)/.exec(n.message);
      const named = m && titlesOf(m[1]);
      return named ? { ...n, message: n.message.replace(m[0], `a result for your set ${named.join(' or ')} (set key ${m[1]}), not this one`) } : n;
    });
  }

  report(lines) {
    fill($('coach-reports'), lines.map((n) => el('li', { 'data-kind': n.kind, 'data-line': String(n.line), text: n.message })));
  }

  renderResults() {
    const s = this.current();
    $('coach-sort').value = s.sort;
    $('coach-results-empty').hidden = s.puzzles.length > 0;
    fill($('coach-reports'));
    this.renderTable(this.tableOf(s));
  }

  renderTable(t) {
    const s = this.current();
    const table = $('coach-table');
    const has = !!t && t.students.length > 0;
    $('coach-no-results').hidden = has;
    $('coach-csv').disabled = !has;
    $('coach-print-table').disabled = !has;
    if (!has) {
      fill(table);
      return;
    }
    const head = el('tr', {},
      el('th', { scope: 'col', text: 'Student' }),
      el('th', { scope: 'col', text: 'Score' }),
      Array.from({ length: t.puzzles }, (_, i) => el('th', { scope: 'col', 'aria-label': `Puzzle ${i + 1}`, text: String(i + 1) })));
    const rows = t.students.map((st) => el('tr', {},
      el('th', { scope: 'row', class: 'name', text: st.name }),
      el('td', { class: 'score', text: `${st.solved} of ${t.puzzles}` }),
      st.results.map((r, i) => el('td', { 'data-outcome': r.attempt, 'data-words': r.words, title: r.words },
        el('span', { class: 'mark', 'data-outcome': r.attempt, 'aria-hidden': 'true' }, String(i + 1)),
        el('span', { class: 'sr-only', text: r.words })))));
    const foot = el('tr', {},
      el('th', { scope: 'row', text: 'Solved by' }),
      el('td', {}),
      t.stats.map((st) => el('td', { class: 'rate', text: st.percent === null ? '' : `${st.solved} of ${st.students} (${st.percent}%)` })));
    fill(table,
      el('caption', { text: `Class results: ${s.title || 'Untitled set'}` }),
      el('thead', {}, head), el('tbody', {}, rows), el('tfoot', {}, foot));
  }

  exportCsv() {
    const s = this.current();
    if (!s || !s.codes.length) return;
    let csv;
    try {
      csv = this.ws.classCsv(coachSetFile(s), s.codes, s.sort);
    } catch (e) {
      banner(`The table could not be exported: ${e}`, { kind: 'error', id: 'coach' });
      return;
    }
    const name = (s.title || 'results').replace(/[^\p{L}\p{N}]+/gu, '-').replace(/^-|-$/g, '').slice(0, 60) || 'results';
    download(`${name}-results.csv`, csv, 'text/csv;charset=utf-8');
    announce('The table is downloaded as CSV.');
  }

  printTable() {
    const s = this.current();
    if (!s) return;
    const copy = $('coach-table').cloneNode(true);
    copy.removeAttribute('id');
    fill($('coach-print'), el('h1', { text: s.title || 'Untitled set' }), el('p', { text: `Made ${s.created} · ${s.puzzles.length} puzzles` }), copy);
    $('coach-print').dataset.kind = 'table';
    document.documentElement.dataset.print = 'table';
    window.print();
  }

  async scan() {
    if (this.scanner) {
      this.stopScanning();
      return;
    }
    let mod;
    try {
      mod = await loadScanner();
      if (typeof mod.openScanner !== 'function') throw new Error('no scanner');
    } catch {
      banner('Scanning is not available here: paste the codes instead.', { kind: 'warn', id: 'coach-scan' });
      return;
    }
    const host = $('coach-scanner');
    host.hidden = false;
    try {
      this.scanner = await mod.openScanner(host, (text) => this.readCodes(text, 'scan'));
    } catch (e) {
      host.hidden = true;
      banner(`The camera could not start: ${e.message ?? e}`, { kind: 'warn', id: 'coach-scan' });
      return;
    }
    $('coach-scan').textContent = 'Stop scanning';
  }

  stopScanning() {
    if (!this.scanner) return;
    try {
      this.scanner.stop();
    } catch {
      // The camera is off either way.
    }
    this.scanner = null;
    $('coach-scanner').hidden = true;
    fill($('coach-scanner'));
    $('coach-scan').textContent = 'Scan codes';
  }

  async copy(text, what) {
    try {
      await navigator.clipboard.writeText(text);
      announce(`${what} is copied.`);
    } catch {
      $('coach-link').select();
      announce(`${what} is selected; copy it from there.`);
    }
  }
}
