// Tonight: the sets a student has been given (from a link, a file or the starter library),
// played puzzle by puzzle with progress, and a summary with a result code at the end.

import { attemptWords, finishedPuzzle, parseSet, recordedAttempt, setKey, shareDecode } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs } from './jobs.js';
import { isLibraryKey, library, librarySet } from './library.js';
import { loadWorkshop, workshopNow } from './platform.js';
import { save } from './store.js';
import { $, POINT_NAME, announce, banner, clearBanner, el, fill, isInt, own, paintQr, put, keepFocus } from './ui.js';

/** Starts loading the code writer as a finger or the focus reaches a Share button, so that the
 * click finds it ready; a failure here is reported by the click itself. */
function warmWorkshop() {
  loadWorkshop().catch(() => {});
}

// Attempt names and their words, from the engine (read once the engine has started).
let outcomeWords = null;
const OUTCOME_WORDS = () => (outcomeWords ??= JSON.parse(attemptWords()));
const MAX_SET_BYTES = 2_000_000;

/** Why a stored list of sets cannot be used, or null. */
export function checkSets(d) {
  if (!d || !Array.isArray(d.list)) return 'it has no list of sets';
  for (const s of d.list) {
    if (!s || typeof s.key !== 'string' || !/^[0-9a-f]{8}$/.test(s.key)) return 'a set has no key';
    if (typeof s.title !== 'string' || typeof s.json !== 'string') return `set ${s.key} is incomplete`;
    try {
      parseSet(s.json);
    } catch (e) {
      return `set ${s.key} is not valid (${e})`;
    }
    if (s.checks !== undefined) {
      if (!s.checks || typeof s.checks !== 'object') return `the answer checks of set ${s.key} are malformed`;
      for (const c of Object.values(s.checks)) {
        if (!c || !['ok', 'corrected', 'unproved'].includes(c.state) || !Array.isArray(c.problems) ||
            !c.problems.every((t) => typeof t === 'string') || (c.state === 'corrected' && !onePuzzle(c.puzzle))) {
          return `the answer checks of set ${s.key} are malformed`;
        }
      }
    }
  }
  return null;
}

/** Whether `p` is one puzzle a set file could hold. */
function onePuzzle(p) {
  if (!p || typeof p !== 'object') return false;
  try {
    parseSet(JSON.stringify({ format: 'fivefold-set', version: 1, title: '', created: '2026-12-01', puzzles: [p] }));
    return true;
  } catch {
    return false;
  }
}

/** Why stored Tonight progress cannot be used, or null. */
export function checkTonight(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  if (d.open !== null && typeof d.open !== 'string') return 'the open set is not a key';
  if (!['list', 'play', 'summary'].includes(d.view)) return 'the view is unknown';
  if (typeof d.name !== 'string' || d.name.length > 64) return 'the name is not text';
  if (!d.progress || typeof d.progress !== 'object') return 'there is no progress';
  for (const [key, p] of Object.entries(d.progress)) {
    if (!p || !isInt(p.index, 0, 10000) || !p.puzzles || typeof p.puzzles !== 'object') {
      return `the progress of set ${key} is malformed`;
    }
    for (const [id, r] of Object.entries(p.puzzles)) {
      if (!r || !Array.isArray(r.played) || !r.played.every((m) => typeof m === 'string' && POINT_NAME.test(m)) ||
          !isInt(r.wrong, 0, 1e6) || !isInt(r.hints, 0, 3) || !Object.hasOwn(OUTCOME_WORDS(), r.outcome) ||
          (r.seconds !== undefined && !isInt(r.seconds, 0, 1e7))) {
        return `the record of puzzle ${id} is malformed`;
      }
    }
  }
  return null;
}

export function emptyTonight() {
  return { open: null, view: 'list', name: '', progress: {} };
}

/** What adding a set did (`addSet`'s answer), in words; `opened` follows a set already here. */
function addedWords({ added, title, was }, opened = '') {
  if (added) return `Added "${title}" to Tonight.`;
  return was ? `"${was}" is already in Tonight with the same puzzles, now called "${title}"${opened}.`
    : `"${title}" is already in Tonight${opened}.`;
}

function ruleWords(puzzles) {
  const rules = [...new Set(puzzles.map((p) => p.rule))];
  return rules.join(', ');
}

/** Whether the device's share sheet can take `text`. */
function canShare(text) {
  if (typeof navigator.share !== 'function') return false;
  try {
    return typeof navigator.canShare !== 'function' || navigator.canShare({ text });
  } catch {
    return false;
  }
}

// The smallest width of a QR code's module on screen, in CSS pixels, and the code's width
// (quiet zone included) that the page aims for: about 5 cm on a phone, which a phone's camera
// reads at arm's length.
const QR_MODULE_MIN = 4;
const QR_WIDTH = 288;

/** Draws the QR code of `text` on `canvas`, dark on white with its quiet zone, whole device
 * pixels a module (so its edges stay sharp); false if the text cannot be a QR code. `qrMatrix`
 * is the workshop module's. */
function drawQr(canvas, text, qrMatrix) {
  let m;
  try {
    m = qrMatrix(text);
  } catch {
    return false;
  }
  const side = m.size + 2 * m.quiet;
  const dpr = window.devicePixelRatio || 1;
  const px = Math.max(Math.round(QR_MODULE_MIN * dpr), Math.floor((QR_WIDTH * dpr) / side));
  paintQr(canvas, m, px);
  // Whole device pixels a module on screen too (the style sheet lets it shrink to fit).
  canvas.style.width = `${(side * px) / dpr}px`;
  canvas.dataset.version = String(m.version);
  canvas.dataset.modules = String(m.size);
  return true;
}

export class Tonight {
  constructor(app) {
    this.app = app;
    this.sets = { list: [] };
    this.data = emptyTonight();
    this.parsed = new Map();
    // The worker that proves the answer keys of sets from outside (files and links).
    this.checker = new Jobs();
    this.checking = null;
    this.board = new BoardView($('tonight-board'), {
      log: $('tonight-log'),
      message: $('tonight-message'),
      onChange: (s, why) => this.changed(s, why),
      onFinish: (s, millis) => this.finished(s, millis),
    });
    for (const b of $('tonight-play').querySelectorAll('[data-act]')) {
      b.addEventListener('click', () => this.act(b.dataset.act));
    }
    $('tonight-back').addEventListener('click', () => this.showList());
    $('tonight-check-stop').addEventListener('click', () => this.stopChecking(true));
    $('tonight-share').addEventListener('click', () => this.share());
    for (const on of ['pointerdown', 'focus']) $('tonight-share').addEventListener(on, warmWorkshop);
    $('set-file').addEventListener('change', (e) => this.pickFile(e.target));
    $('summary-back').addEventListener('click', () => this.openSet(this.data.open));
    $('summary-sets').addEventListener('click', () => this.showList());
    $('student-name').addEventListener('input', (e) => {
      this.data.name = e.target.value.slice(0, 24);
      this.saveProgress();
      this.renderCode();
    });
    $('copy-code').addEventListener('click', () => {
      if (this.code) this.copy(this.code, 'The result code');
    });
    $('share-code').addEventListener('click', () => this.sendCode());
    $('finish-anyway').addEventListener('click', () => this.showSummary());
    $('finish-go').addEventListener('click', () => {
      const first = this.unfinished(this.data.open)[0];
      if (first !== undefined) this.openSet(this.data.open, first);
    });
    $('library').addEventListener('toggle', () => this.renderLibrary());
    const list = $('tonight-list');
    list.addEventListener('dragover', (e) => e.preventDefault());
    list.addEventListener('drop', (e) => {
      e.preventDefault();
      const f = e.dataTransfer?.files?.[0];
      if (f) this.readFile(f);
    });
  }

  init(sets, data) {
    this.sets = sets ?? { list: [] };
    this.data = data ?? emptyTonight();
    this.parsed.clear();
    const key = this.data.open;
    if (key && this.set(key)) {
      if (this.data.view === 'summary') this.showSummary();
      else if (this.data.view === 'play') this.openSet(key);
      else this.showList();
    } else {
      this.data.open = null;
      this.showList();
    }
  }

  applySettings(s) {
    this.board.setOptions(s);
  }

  set(key) {
    return this.sets.list.find((s) => s.key === key) ?? null;
  }

  puzzlesOf(key) {
    if (!this.parsed.has(key)) {
      const s = this.set(key);
      this.parsed.set(key, s ? JSON.parse(s.json) : { puzzles: [] });
    }
    return this.parsed.get(key).puzzles;
  }

  /** The proof of a puzzle's answer key, if it has been checked: {state, puzzle, problems}. */
  checkOf(key, id) {
    const checks = this.set(key)?.checks;
    return checks ? own(checks, id) : undefined;
  }

  /** The puzzle as it is played: with the proved answers when its key was corrected. */
  playedPuzzle(key, p) {
    const c = this.checkOf(key, p.id);
    return c?.state === 'corrected' && c.puzzle ? c.puzzle : p;
  }

  /** Proves the answer keys of a set from outside, puzzle by puzzle in the worker; each
   * result is kept with the set, so a check stopped half-way goes on where it stopped. */
  async checkSet(key) {
    const s = this.set(key);
    if (!s || this.fromLibrary(key) || this.checking === key) return;
    this.stopChecking(false);
    const puzzles = this.puzzlesOf(key);
    s.checks ??= {};
    const todo = puzzles.filter((p) => !this.checkOf(key, p.id));
    if (!todo.length) return;
    this.checking = key;
    const line = (done) => {
      if (this.data.open !== key) return;
      $('tonight-check').hidden = false;
      $('tonight-check-text').textContent =
        `Checking the answer keys of this set: ${done} of ${puzzles.length} proved…`;
    };
    let done = puzzles.length - todo.length;
    line(done);
    for (const p of todo) {
      let r;
      try {
        r = await this.checker.run('prove', { puzzle: JSON.stringify(p) });
      } catch (e) {
        if (e instanceof Cancelled) return;
        r = { state: 'unproved', puzzle: null, problems: [`it could not be checked (${e.message})`] };
      }
      if (this.checking !== key || !this.set(key)) return;
      put(s.checks, p.id, r);
      this.saveSets();
      line(++done);
    }
    this.checking = null;
    $('tonight-check').hidden = true;
    this.reportChecks(key);
    if (this.data.open === key && this.data.view === 'play') this.renderPlay(this.board.status());
  }

  stopChecking(say) {
    if (!this.checking) return;
    this.checker.cancel();
    this.checking = null;
    $('tonight-check').hidden = true;
    if (say) announce('Checking stopped; it goes on the next time the set is opened.');
  }

  /** Tells the player which answer keys did not hold, and what Fivefold does about it. */
  reportChecks(key) {
    const s = this.set(key);
    const puzzles = this.puzzlesOf(key);
    const bad = puzzles.map((p, i) => [i, this.checkOf(key, p.id)]).filter(([, c]) => c && c.state !== 'ok');
    const title = s.title || 'Untitled set';
    if (!bad.length) {
      banner(puzzles.length === 1 ? `The answer key of "${title}" checks out.`
        : `All ${puzzles.length} answer keys of "${title}" check out.`, { id: 'check' });
      return;
    }
    const lines = bad.map(([i, c]) => `puzzle ${i + 1}: ${c.problems.join('; ')}`);
    const what = bad.some(([, c]) => c.state === 'corrected')
      ? ' Fivefold grades and hints these with its own proved answers.' : '';
    banner(`${bad.length} of ${puzzles.length} answer key${puzzles.length === 1 ? '' : 's'} of "${title}" ${bad.length === 1 ? 'does' : 'do'} not hold: ${lines.join('. ')}.${what}`,
      { kind: 'warn', id: 'check', sticky: true });
  }

  progressOf(key) {
    this.data.progress[key] ??= { index: 0, puzzles: {} };
    return this.data.progress[key];
  }

  saveSets() {
    save('sets', this.sets);
  }

  saveProgress() {
    save('tonight', this.data);
  }

  /** Adds a set (set-file JSON text) to Tonight; returns its key. Throws a message if invalid. */
  addSet(text, source) {
    if (text.length > MAX_SET_BYTES) throw new Error('the file is too large to be a set');
    const json = parseSet(text);
    const over = finishedPuzzle(json);
    if (over) throw new Error(over);
    const key = setKey(json);
    const have = this.set(key);
    if (have) {
      // The same puzzles under a new title: the title the sender gives now is the one shown.
      const title = JSON.parse(json).title;
      if (title !== have.title) {
        const was = have.title;
        have.title = title;
        this.saveSets();
        return { key, added: false, title, was };
      }
      return { key, added: false, title: have.title };
    }
    const title = JSON.parse(json).title;
    this.sets.list.push({ key, title, json, source, added: new Date().toISOString() });
    this.saveSets();
    return { key, added: true, title };
  }

  /** Opens a share code from a link: adds its set and opens it, or says why not. */
  fromLink(code) {
    let json;
    try {
      json = shareDecode(code);
    } catch (e) {
      banner(`This link cannot be opened: ${e}`, { kind: 'error', id: 'link' });
      announce(`This link cannot be opened: ${e}`);
      return false;
    }
    let got;
    try {
      got = this.addSet(json, 'link');
    } catch (e) {
      banner(`This link cannot be opened: ${e.message ?? e}. Nothing was loaded.`, { kind: 'error', id: 'link' });
      announce(`This link cannot be opened: ${e.message ?? e}.`);
      return false;
    }
    banner(addedWords(got, ': opened it'), { kind: 'info', id: 'link' });
    this.app.go('tonight');
    this.openSet(got.key);
    return true;
  }

  async pickFile(input) {
    const f = input.files?.[0];
    input.value = '';
    if (f) await this.readFile(f);
  }

  async readFile(file) {
    if (file.size > MAX_SET_BYTES) {
      banner(`"${file.name}" is too large to be a set file; nothing was loaded.`, { kind: 'error', id: 'file' });
      return;
    }
    try {
      const text = await file.text();
      const got = this.addSet(text, 'file');
      banner(addedWords(got), { id: 'file' });
      this.openSet(got.key);
    } catch (e) {
      banner(`"${file.name}" cannot be opened: ${e.message ?? e}. Nothing was loaded.`, { kind: 'error', id: 'file' });
    }
  }

  remove(key) {
    const s = this.set(key);
    if (!s || !window.confirm(`Remove "${s.title}" and its progress from Tonight?`)) return;
    this.sets.list = this.sets.list.filter((x) => x.key !== key);
    delete this.data.progress[key];
    this.parsed.delete(key);
    if (this.data.open === key) this.data.open = null;
    this.saveSets();
    this.saveProgress();
    this.renderList();
  }

  view(name) {
    // A new view starts at the top of the page.
    if (name !== this.data.view && !$('tonight').hidden) window.scrollTo(0, 0);
    $('tonight-list').hidden = name !== 'list';
    $('tonight-play').hidden = name !== 'play';
    $('tonight-summary').hidden = name !== 'summary';
    $('tonight').dataset.view = name;
    this.data.view = name;
    keepFocus({ list: $('tonight-title'), play: $('tonight-board'), summary: $('summary-heading') }[name]);
  }

  showList() {
    this.board.cancelPacing();
    this.view('list');
    this.saveProgress();
    this.renderList();
  }

  counts(key) {
    const c = { clean: 0, helped: 0, failed: 0, untried: 0 };
    for (const o of this.outcomes(key)) c[o]++;
    return c;
  }

  renderList() {
    const ul = $('tonight-sets');
    $('tonight-empty').hidden = this.sets.list.length > 0;
    fill(ul, this.sets.list.map((s) => {
      const puzzles = this.puzzlesOf(s.key);
      const c = this.counts(s.key);
      const done = c.clean + c.helped;
      return el('li', { class: 'card', 'data-key': s.key },
        el('h2', { class: 'set-title', text: s.title || 'Untitled set' }),
        el('p', { class: 'meta', text: `${puzzles.length} puzzles · ${ruleWords(puzzles)} · ${done} solved` }),
        el('div', { class: 'row' },
          el('button', { type: 'button', class: 'primary', onclick: () => this.openSet(s.key) }, 'Open'),
          el('button', {
            type: 'button',
            class: 'secondary',
            onclick: () => this.share(s.key),
            onpointerdown: warmWorkshop,
            onfocus: warmWorkshop,
          }, 'Share'),
          el('button', { type: 'button', class: 'quiet', onclick: () => this.remove(s.key) }, 'Remove')));
    }));
    $('library').open ||= this.sets.list.length === 0;
    this.renderLibrary();
    $('tonight-share-box').hidden = true;
  }

  renderLibrary() {
    if (!$('library').open) return;
    fill($('library-sets'), library().map((entry, i) => {
      const have = !!this.set(entry.key);
      return el('li', { class: 'card compact', 'data-library': String(i) },
        el('div', {},
          el('h3', { class: 'set-title', text: entry.title }),
          el('p', { class: 'meta', text: `${entry.count} puzzles · rated about ${Math.round(entry.rating / 10) * 10}` })),
        el('button', {
          type: 'button',
          class: have ? 'secondary' : 'primary',
          onclick: (e) => this.addFromLibrary(entry, e.currentTarget),
        }, have ? 'Open' : 'Add'));
    }));
  }

  /** Adds a starter-library set (its file is fetched on first use) and opens it; a set that is
   * here already under the library's title just opens. */
  async addFromLibrary(entry, button) {
    if (this.set(entry.key)?.title === entry.title) return this.openSet(entry.key);
    button.disabled = true;
    let r;
    try {
      const text = await librarySet(entry.file);
      // Only the very set the index names is taken as the library's (its answers are trusted).
      if (setKey(parseSet(text)) !== entry.key) {
        throw new Error(`The copy of "${entry.title}" here is not the library's; reload the page to fetch it again`);
      }
      r = this.addSet(text, 'library');
    } catch (e) {
      banner(`${e?.message ?? e}.`, { kind: 'error', id: 'library' });
      return;
    } finally {
      button.disabled = false;
    }
    // The player may have opened something else while the set was fetched.
    if (this.data.view === 'list') this.openSet(r.key);
    else banner(`Added "${r.title}" to Tonight.`, { kind: 'info', id: 'library' });
  }

  openSet(key, index) {
    if (!this.set(key)) return this.showList();
    this.data.open = key;
    const prog = this.progressOf(key);
    const puzzles = this.puzzlesOf(key);
    if (index !== undefined) prog.index = index;
    prog.index = Math.min(Math.max(0, prog.index), Math.max(0, puzzles.length - 1));
    this.view('play');
    $('tonight-set-title').textContent = this.set(key).title || 'Untitled set';
    $('tonight-share-box').hidden = true;
    $('tonight-finish').hidden = true;
    if (this.checking !== key) $('tonight-check').hidden = true;
    this.loadCurrent();
    this.checkSet(key);
  }

  /** Whether the set is one of the built-in library's (however it arrived): their answer keys
   * are proved by the tests, so grading may rely on them. */
  fromLibrary(key) {
    return this.set(key)?.source === 'library' || isLibraryKey(key);
  }

  loadCurrent() {
    const key = this.data.open;
    const prog = this.progressOf(key);
    const p = this.puzzlesOf(key)[prog.index];
    if (!p) return;
    const rec = own(prog.puzzles, p.id);
    this.loading = true;
    try {
      const record = rec ? { played: rec.played, wrong: rec.wrong, hints: rec.hints, attempt: rec.outcome } : null;
      // A key proved here (the library's, or one checked since it arrived) may settle what
      // the phone's budget cannot; a key not yet checked is re-proved when that happens.
      const check = this.checkOf(key, p.id);
      const trusted = this.fromLibrary(key) || check?.state === 'ok' || check?.state === 'corrected';
      this.board.load(JSON.stringify(this.playedPuzzle(key, p)), { record, trusted });
    } finally {
      this.loading = false;
    }
    this.saveProgress();
    this.renderPlay(this.board.status());
  }

  changed(s, why) {
    if (this.loading || s.mode !== 'puzzle') {
      this.renderPlay(s);
      return;
    }
    const key = this.data.open;
    const prog = this.progressOf(key);
    const p = this.puzzlesOf(key)[prog.index];
    // The board keeps the record, merged over every try (engine::puzzle::attempt).
    const r = s.record;
    // The time of the first try that ended, for the result code, stays over later tries.
    const seconds = own(prog.puzzles, p.id)?.seconds;
    put(prog.puzzles, p.id, { played: r.played, wrong: r.wrong, hints: r.hints, outcome: r.attempt, ...(seconds === undefined ? {} : { seconds }) });
    if (why !== 'reveal' || s.pending === 0) this.saveProgress();
    this.renderPlay(s);
  }

  /** A try ended: into the logbook, and into Revisit if it was missed. Returns what to say
   * once the app's replies are on show. */
  finished(s, millis) {
    const key = this.data.open;
    if (!key || this.loading) return;
    const prog = this.progressOf(key);
    const p = this.puzzlesOf(key)[prog.index];
    if (!p) return;
    const rec = own(prog.puzzles, p.id);
    // Only a puzzle's first finished try counts, in the logbook (so in Revisit and Progress)
    // as in the result code and the marks; a try after it is practice on a counted puzzle.
    if (rec?.seconds !== undefined) return;
    if (rec) {
      rec.seconds = Math.round(millis / 1000);
      this.saveProgress();
    }
    const out = this.app.practice.finished({
      origin: 'tonight',
      title: this.set(key)?.title ?? '',
      puzzle: JSON.stringify(this.playedPuzzle(key, p)),
      attempt: s.attempt,
      hints: s.record.hints,
      wrong: s.record.wrong,
      millis,
      rating: this.app.drill.ratingFor(p.rule),
    });
    return out?.say;
  }

  renderPlay(s) {
    const key = this.data.open;
    if (!key) return;
    const prog = this.progressOf(key);
    const puzzles = this.puzzlesOf(key);
    $('tonight-count').textContent = `Puzzle ${prog.index + 1} of ${puzzles.length}`;
    const marks = $('tonight-marks');
    if (marks.childElementCount !== puzzles.length || marks.dataset.key !== key) {
      marks.dataset.key = key;
      fill(marks, puzzles.map((p, i) => el('li', {},
        el('button', { type: 'button', class: 'mark', onclick: () => this.openSet(key, i) }, String(i + 1)))));
    }
    puzzles.forEach((p, i) => {
      const o = own(prog.puzzles, p.id)?.outcome ?? 'untried';
      const b = marks.children[i].firstElementChild;
      b.dataset.outcome = o;
      const check = this.checkOf(key, p.id)?.state;
      if (check && check !== 'ok') b.dataset.key = check;
      else delete b.dataset.key;
      const keyWords = check === 'corrected' ? ', answer key corrected' : check === 'unproved' ? ', answer key not proved' : '';
      b.setAttribute('aria-label', `Puzzle ${i + 1}: ${OUTCOME_WORDS()[o]}${keyWords}`);
      if (i === prog.index) b.setAttribute('aria-current', 'step');
      else b.removeAttribute('aria-current');
    });
    marks.children[prog.index]?.scrollIntoView?.({ block: 'nearest', inline: 'nearest' });
    const play = $('tonight-play');
    const over = s.state !== 'playing';
    play.querySelector('[data-act="hint"]').disabled = over || s.pending > 0 || s.record.hints >= 3 || !!s.solution;
    play.querySelector('[data-act="hint"]').hidden = s.state === 'failed';
    play.querySelector('[data-act="solution"]').hidden = s.state !== 'failed';
    play.querySelector('[data-act="solution"]').disabled = s.pending > 0;
    play.querySelector('[data-act="undo"]').disabled = s.record.played.length === 0;
    play.querySelector('[data-act="retry"]').disabled = s.moves.length === 0 && s.record.played.length === 0;
    const next = play.querySelector('[data-act="next"]');
    next.textContent = prog.index + 1 >= puzzles.length ? 'Finish' : 'Next';
    next.classList.toggle('ready', over && s.pending === 0);
  }

  act(what) {
    const key = this.data.open;
    if (!key) return;
    if (this.board.act(what, this.app.study)) return;
    if (what === 'next') {
      const prog = this.progressOf(key);
      if (prog.index + 1 < this.puzzlesOf(key).length) this.openSet(key, prog.index + 1);
      else if (this.unfinished(key).length) this.askFinish(key);
      else this.showSummary();
    }
  }

  /** The indices of the set's puzzles with the given raw attempt names, in set order. */
  withAttempt(key, names) {
    const recs = this.progressOf(key).puzzles;
    return this.puzzlesOf(key).flatMap((p, i) => (names.includes(own(recs, p.id)?.outcome ?? 'untried') ? [i] : []));
  }

  /** The indices of the set's puzzles not tried yet, or begun and not finished. */
  unfinished(key) {
    return this.withAttempt(key, ['untried', 'trying']);
  }

  /** Before the summary of a set with puzzles not tried or not finished: says which, and how
   * each counts, and lets the player finish anyway or go to the first of them. */
  askFinish(key) {
    const said = (indices, what, counts = '') => {
      const left = indices.map((i) => String(i + 1));
      if (!left.length) return '';
      const shown = left.length > 8 ? [...left.slice(0, 7), `${left.length - 7} more`] : left;
      const list = new Intl.ListFormat('en', { type: 'conjunction' }).format(shown);
      return left.length === 1 ? `Puzzle ${list} is ${what}${counts && `: it counts as ${counts}`}. `
        : `${left.length} puzzles are ${what}: ${list}${counts && `; they count as ${counts}`}. `;
    };
    $('tonight-finish-text').textContent = said(this.withAttempt(key, ['untried']), 'not tried yet') +
      said(this.withAttempt(key, ['trying']), 'begun and not finished', 'failed') + 'Finish the set anyway?';
    $('finish-go').textContent = `Go to puzzle ${this.unfinished(key)[0] + 1}`;
    $('tonight-finish').hidden = false;
    $('finish-anyway').focus({ preventScroll: true });
    // The whole question in view, clear of the phone's bar (its scroll margins, style.css).
    $('tonight-finish').scrollIntoView({ block: 'nearest', behavior: 'instant' });
    announce($('tonight-finish-text').textContent);
  }

  outcomes(key) {
    const recs = this.progressOf(key).puzzles;
    return this.puzzlesOf(key).map((p) => recordedAttempt(own(recs, p.id)?.outcome ?? 'untried'));
  }

  showSummary() {
    const key = this.data.open;
    if (!key || !this.set(key)) return this.showList();
    this.board.cancelPacing();
    $('tonight-finish').hidden = true;
    this.view('summary');
    this.saveProgress();
    const outs = this.outcomes(key);
    const n = (o) => outs.filter((x) => x === o).length;
    $('summary-title').textContent = this.set(key).title || 'Untitled set';
    fill($('summary-counts'),
      el('div', { class: 'count-clean' }, el('dt', { text: 'Solved clean' }), el('dd', { text: String(n('clean')) })),
      el('div', { class: 'count-helped' }, el('dt', { text: 'Solved with help' }), el('dd', { text: String(n('helped')) })),
      el('div', { class: 'count-failed' }, el('dt', { text: 'Failed' }), el('dd', { text: String(n('failed')) })),
      el('div', { class: 'count-untried' }, el('dt', { text: 'Not tried' }), el('dd', { text: String(n('untried')) })));
    $('student-name').value = this.data.name;
    this.renderCode();
    announce(`Summary: ${n('clean')} solved clean, ${n('helped')} with help, ${n('failed')} failed, ${n('untried')} not tried.`);
  }

  /** Writes the result code and its QR code. The code writer is in the workshop module, loaded
   * here on first use (a student who never finishes a set never loads it). */
  async renderCode() {
    const key = this.data.open;
    if (!key) return;
    this.code = null;
    $('copy-code').disabled = true;
    $('share-code').hidden = true;
    if (!this.codeWriter) $('result-code').textContent = 'Writing the result code…';
    let ws;
    try {
      ws = await loadWorkshop();
    } catch (e) {
      $('result-code').textContent = `No code: the code writer could not be loaded (${e?.message ?? e}). Reload the page to try again.`;
      $('result-qr-box').hidden = true;
      return;
    }
    this.codeWriter = ws;
    // The player may have left the summary while the module loaded.
    if (this.data.open !== key || this.data.view !== 'summary') return;
    const { qrMatrix, resultCode } = ws;
    try {
      const recs = this.progressOf(key).puzzles;
      const results = this.puzzlesOf(key).map((p) => {
        const r = own(recs, p.id);
        return { attempt: r?.outcome ?? 'untried', hints: r?.hints ?? 0, seconds: r?.seconds ?? null };
      });
      this.code = resultCode(this.set(key).json, this.data.name, results);
      $('result-code').textContent = this.code;
    } catch (e) {
      $('result-code').textContent = `No code: ${e}`;
    }
    $('result-qr-box').hidden = !this.code || !drawQr($('result-qr'), this.code, qrMatrix);
    $('copy-code').disabled = !this.code;
    $('share-code').hidden = !this.code || !canShare(this.code);
  }

  /** Hands the result code to the device's share sheet (messages, mail, ...). */
  async sendCode() {
    if (!this.code) return;
    try {
      await navigator.share({ title: 'Fivefold result code', text: this.code });
    } catch (e) {
      // The player closed the share sheet: nothing to say.
      if (e?.name === 'AbortError') return;
      banner('The code could not be sent from here; copy it instead.', { kind: 'warn', id: 'share-code' });
    }
  }

  /** Shows and copies the set's link. The code writer is in the workshop module, loaded here on
   * first use. */
  async share(key = this.data.open) {
    const s = this.set(key);
    if (!s) return;
    if (this.data.view !== 'play' || this.data.open !== key) this.openSet(key);
    const input = $('tonight-share-link');
    input.value = '';
    $('tonight-share-note').textContent = 'Making the link…';
    $('tonight-share-box').hidden = false;
    // With the code writer already here nothing is awaited before the copy, which browsers
    // allow only within the click itself; on a first share the copy may be refused, and the
    // link is left selected to copy by hand.
    let writer = workshopNow();
    if (!writer) {
      try {
        writer = await loadWorkshop();
      } catch (e) {
        $('tonight-share-box').hidden = true;
        banner(`The link writer could not be loaded (${e?.message ?? e}). Check the connection and press Share again.`, { kind: 'error', id: 'share' });
        return;
      }
    }
    let code;
    try {
      code = writer.shareEncode(s.json);
    } catch (e) {
      $('tonight-share-box').hidden = true;
      banner(`This set cannot be shared as a link: ${e?.message ?? e}`, { kind: 'error', id: 'share' });
      return;
    }
    clearBanner('share');
    // The player may have moved on while the code writer loaded.
    if (this.data.open !== key || $('tonight-share-box').hidden) return;
    const link = `${location.href.split('#')[0]}#set=${code}`;
    input.value = link;
    input.select();
    $('tonight-share-note').textContent = link.startsWith('file:')
      ? 'This link points at a file on this device, so it opens only here. Send the set file instead, or open the app from the club\'s web address.'
      : 'Whoever opens this link gets the set on their own device.';
    this.copy(link, 'The link');
  }

  async copy(text, what) {
    try {
      await navigator.clipboard.writeText(text);
      banner(`${what} is copied.`, { kind: 'info', id: 'copied' });
    } catch {
      banner(`${what} could not be copied here; select it and copy it by hand.`, { kind: 'info', id: 'copied' });
    }
  }
}
