// Drill: an endless stream of puzzles at the player's level, filtered by theme and rule,
// generated a few ahead in the worker so that the next one is ready when it is wanted.

import { attemptWords, drillChoice, parseSet, rateTry, themes } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs } from './jobs.js';
import { allLibrarySets, library } from './library.js';
import { save } from './store.js';
import { today } from './practice.js';
import { $, POINT_NAME, RULES, announce, el, fill, isInt, own, put, randomSeed } from './ui.js';

// Puzzles kept ready ahead of the one being played.
const AHEAD = 3;

// Puzzles kept on the device for the other theme and rule pairs (at most STOCK each): what was
// made for a filter stays when the filter changes, so going back to it starts at once.
const STOCK = AHEAD + 1;
const stockKey = (theme, rule) => `${theme}/${rule}`;

// Deep lines for strong players: the starter library's deep sets (made with a minimum line
// length; a deep puzzle takes the generator up to a minute) are Drill's stock for them, one
// choice per kind, served nearest the player's rating first; when a player has been through
// them all, new ones are made in the worker like any other drill.
const DEEP_LABELS = {
  vcf: 'Deep fours (10 to 20 fours)',
  vct: 'Deep threats (6 to 10 threats)',
  defend: 'Hard defences (long threats)',
};
const DEEP_BAND = [1900, 2600];

// How long Drill waits for the starter library's puzzles before it makes its own (ms), and how
// long after a failed load it tries again.
const LIBRARY_WAIT = 4000;
const LIBRARY_RETRY = 30000;

/** The deep choices: `{name, label, rules, theme, minMoves, files, puzzles}` from the library's
 * index (`puzzles` filled when the library's sets are loaded). */
function deepChoices(index) {
  const out = [];
  for (const entry of index) {
    const g = entry.generator;
    if (!g || !(g.min_moves > 0) || !DEEP_LABELS[g.theme]) continue;
    let c = out.find((x) => x.theme === g.theme);
    if (!c) {
      c = { name: `deep-${g.theme}`, label: DEEP_LABELS[g.theme], rules: [], theme: g.theme, minMoves: g.min_moves, files: [], puzzles: [] };
      out.push(c);
    }
    if (!c.rules.includes(g.rule)) c.rules.push(g.rule);
    c.minMoves = Math.min(c.minMoves, g.min_moves);
    c.files.push(entry.file);
  }
  // In the order of DEEP_LABELS, whatever the index's order (easiest set first).
  const at = (c) => Object.keys(DEEP_LABELS).indexOf(c.theme);
  return out.sort((a, b) => at(a) - at(b));
}

function checkRating(r) {
  return r === null || (r && [r.rating, r.deviation, r.volatility].every(Number.isFinite));
}

// Puzzle ratings kept on this device (Glicko-2 both ways: a puzzle's rating moves with the
// players' tries at it), at most this many, the oldest dropped first.
const PUZZLE_RATINGS = 300;

/** Brings stored Drill data of an earlier version up to date (one rating for every rule
 * becomes the rating of the rule drilled last; the other rules start afresh). */
export function upgradeDrill(d) {
  if (!d || typeof d !== 'object') return d;
  if (!d.ratings) {
    d.ratings = {};
    if (d.rating && RULES.includes(d.rule)) d.ratings[d.rule] = d.rating;
  }
  delete d.rating;
  d.puzzleRatings ??= {};
  d.stock ??= {};
  return d;
}

/** Why stored Drill data cannot be used, or null. */
export function checkDrill(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  if (typeof d.theme !== 'string' || !RULES.includes(d.rule)) return 'the filters are unknown';
  if (d.rating !== undefined && !checkRating(d.rating)) return 'the rating is malformed';
  if (d.ratings !== undefined) {
    if (!d.ratings || typeof d.ratings !== 'object') return 'the ratings are malformed';
    for (const [rule, r] of Object.entries(d.ratings)) {
      if (!RULES.includes(rule) || !checkRating(r)) return 'the ratings are malformed';
    }
  }
  if (d.puzzleRatings !== undefined) {
    if (!d.puzzleRatings || typeof d.puzzleRatings !== 'object') return 'the puzzle ratings are malformed';
    for (const r of Object.values(d.puzzleRatings)) if (!checkRating(r)) return 'the puzzle ratings are malformed';
  }
  if (!Array.isArray(d.queue) || d.queue.length > 20) return 'the queue is malformed';
  const stock = d.stock ?? {};
  if (!stock || typeof stock !== 'object' || Array.isArray(stock)) return 'the stock is malformed';
  for (const [key, list] of Object.entries(stock)) {
    const [theme, rule, more] = key.split('/');
    if (more !== undefined || !/^[a-z-]{1,20}$/.test(theme) || !RULES.includes(rule) ||
        !Array.isArray(list) || list.length > STOCK) {
      return 'the stock is malformed';
    }
  }
  if (!d.stats || !isInt(d.stats.played, 0, 1e9) || !isInt(d.stats.clean, 0, 1e9)) return 'the counts are malformed';
  const c = d.current;
  if (c !== null) {
    if (!c || typeof c.puzzle !== 'object' || !Array.isArray(c.played) ||
        !c.played.every((m) => typeof m === 'string' && POINT_NAME.test(m)) ||
        !isInt(c.wrong, 0, 1e6) || !isInt(c.hints, 0, 3) || typeof c.rated !== 'boolean' ||
        (c.attempt !== undefined && !Object.hasOwn(JSON.parse(attemptWords()), c.attempt))) {
      return 'the current puzzle is malformed';
    }
  }
  // Every puzzle must be one a set file could hold (each checked alone: two drill puzzles
  // may share an id, which a set could not).
  for (const p of [...d.queue, ...Object.values(stock).flat(), ...(c ? [c.puzzle] : [])]) {
    try {
      parseSet(JSON.stringify({ format: 'fivefold-set', version: 1, title: 'Drill', created: '2026-12-01', puzzles: [p] }));
    } catch (e) {
      return `a puzzle is not valid (${e})`;
    }
  }
  return null;
}

export function emptyDrill() {
  return { theme: 'vcf', rule: 'freestyle', ratings: {}, puzzleRatings: {}, current: null, queue: [], stock: {}, stats: { played: 0, clean: 0 } };
}

export class Drill {
  constructor(app) {
    this.app = app;
    this.data = emptyDrill();
    this.jobs = new Jobs();
    this.generating = null;
    this.active = false;
    // The starter library: the deep choices come from its deep sets, and a theme's first
    // puzzle from the others (fromLibrary); their puzzles are loaded when Drill first fills.
    this.deep = deepChoices(library());
    this.library = null;
    this.themes = [...JSON.parse(themes()), ...this.deep];
    this.board = new BoardView($('drill-board'), {
      log: $('drill-log'),
      message: $('drill-message'),
      onChange: (s, why) => this.changed(s, why),
      onFinish: (s, millis) => this.finished(s, millis),
    });
    for (const b of $('drill').querySelectorAll('[data-act]')) {
      b.addEventListener('click', () => this.act(b.dataset.act));
    }
    $('drill-theme').addEventListener('change', (e) => this.filter(e.target.value, this.data.rule));
    $('drill-rule').addEventListener('change', (e) => this.filter(this.data.theme, e.target.value));
  }

  init(data) {
    this.jobs.cancel();
    this.generating = null;
    this.data = upgradeDrill(data) ?? emptyDrill();
    if (!this.allowed(this.data.theme, this.data.rule)) this.data.theme = 'vcf';
    this.renderFilters();
    this.renderRating();
    if (this.data.current) this.loadCurrent();
    else this.waiting(true);
    if (this.active) this.fill();
  }

  applySettings(s) {
    this.board.setOptions(s);
  }

  allowed(theme, rule) {
    return this.themes.some((t) => t.name === theme && t.rules.includes(rule));
  }

  renderFilters() {
    $('drill-rule').value = this.data.rule;
    fill($('drill-theme'), this.themes.filter((t) => t.rules.includes(this.data.rule)).map((t) =>
      el('option', { value: t.name, text: t.label })));
    $('drill-theme').value = this.data.theme;
  }

  /** The player's rating under a rule (null for a new player). */
  ratingFor(rule) {
    return own(this.data.ratings ?? {}, rule) ?? null;
  }

  renderRating() {
    const rule = this.data.rule;
    const r = this.ratingFor(rule);
    const st = this.data.stats;
    $('drill-rating').textContent = r
      ? `Your ${rule} rating ${Math.round(r.rating)} ± ${Math.round(2 * r.deviation)} · ${st.played} played, ${st.clean} solved clean`
      : `Your ${rule} rating: not yet known (1500 to start)`;
  }

  /** The Drill screen is shown: keep puzzles coming. */
  activate() {
    this.active = true;
    this.fill();
    if (!this.data.current && this.data.queue.length) this.next();
  }

  save() {
    save('drill', this.data);
  }

  filter(theme, rule) {
    if (!this.allowed(theme, rule)) theme = this.themes.find((t) => t.rules.includes(rule)).name;
    if (theme === this.data.theme && rule === this.data.rule) return;
    // What was made for the filters before stays in stock for them: the puzzle on the board
    // too, when it is untouched (changing the filters is not a way to skip a puzzle that was
    // started: that one counts as before).
    const d = this.data;
    const kept = [...d.queue];
    const c = d.current;
    if (c && !c.rated && !c.played.length && !c.wrong && !c.hints && !c.attempt) kept.unshift(c.puzzle);
    else this.leave();
    d.stock ??= {};
    if (kept.length) d.stock[stockKey(d.theme, d.rule)] = kept.slice(0, STOCK);
    d.theme = theme;
    d.rule = rule;
    d.queue = d.stock[stockKey(theme, rule)] ?? [];
    delete d.stock[stockKey(theme, rule)];
    this.jobs.cancel();
    this.generating = null;
    this.renderFilters();
    if (d.queue.length) {
      d.current = null;
      this.next();
      return;
    }
    this.data.current = null;
    this.save();
    this.waiting(true);
    this.fill();
  }

  waiting(on, text) {
    $('drill-wait').hidden = !on;
    if (on) {
      // Nothing to play while a puzzle is being made: no goal, no actions.
      $('drill-message').textContent = '';
      for (const b of $('drill').querySelectorAll('[data-act]')) b.disabled = true;
    }
    $('drill').dataset.waiting = on ? 'true' : 'false';
    if (text) $('drill-wait-text').textContent = text;
    else if (on) $('drill-wait-text').textContent = 'Making a puzzle at your level…';
    if (on) $('drill-progress').removeAttribute('value');
    this.renderQueue();
  }

  renderQueue() {
    const n = this.data.queue.length;
    $('drill-queue').textContent = this.generating
      ? `${n} puzzle${n === 1 ? '' : 's'} ready; making another in the background.`
      : `${n} puzzle${n === 1 ? '' : 's'} ready.`;
    $('drill').dataset.ready = String(n);
  }

  /** The ids of the puzzles this player has had in Drill (rated), or has waiting (on the
   * board, in the queue, in stock). */
  had() {
    const d = this.data;
    const waiting = [...d.queue, ...(d.current ? [d.current.puzzle] : []), ...Object.values(d.stock ?? {}).flat()];
    return new Set([...Object.keys(d.puzzleRatings ?? {}), ...waiting.map((p) => p.id)]);
  }

  /** A starter-library puzzle of the filters that this player has not had in Drill, in the
   * band [lo, hi] if there is one (else the nearest rating), or null: the first puzzle of a
   * theme starts at once while the worker makes the next ones. */
  fromLibrary(theme, rule, lo, hi) {
    const had = this.had();
    const fresh = (this.library ?? []).filter((p) => p.theme === theme && p.rule === rule && !had.has(p.id));
    if (!fresh.length) return null;
    const off = (p) => Math.max(0, lo - p.rating, p.rating - hi);
    const best = Math.min(...fresh.map(off));
    const near = fresh.filter((p) => off(p) === best);
    return near[randomSeed() % near.length];
  }

  /** A deep choice: fills the queue from the library's deep puzzles not yet played here,
   * nearest the player's rating first. False when none is left. */
  fillDeep(deep, rule) {
    const d = this.data;
    const seen = this.had();
    const r = this.ratingFor(rule)?.rating ?? 1500;
    const left = deep.puzzles.filter((p) => p.rule === rule && !seen.has(p.id))
      .sort((a, b) => Math.abs(a.rating - r) - Math.abs(b.rating - r) || (a.id < b.id ? -1 : 1));
    $('drill-band').textContent = left.length
      ? `${deep.label}: ${left.length} from the library not yet played, rated ${DEEP_BAND[0]} and up.`
      : this.library
        ? `${deep.label}: every library puzzle played; new ones are made here (up to a minute each).`
        : `${deep.label}: the library could not be loaded just now, so puzzles are made here (up to a minute each).`;
    if (!left.length) return false;
    d.queue.push(...left.slice(0, AHEAD - d.queue.length));
    this.save();
    if (!d.current) this.next();
    this.renderQueue();
    return true;
  }

  /** Loads the library's puzzles once (the plain sets' for fromLibrary, the deep sets' for
   * the deep choices). Waits at most LIBRARY_WAIT ms, so that a stalled network does not hold
   * Drill up: without the library Drill makes every puzzle, and a load that arrives later is
   * used from then on. A failed load is tried again after LIBRARY_RETRY ms, not on every fill. */
  async loadLibrary() {
    if (this.library) return;
    if (!this.libraryLoad && Date.now() - (this.libraryFailed ?? -Infinity) >= LIBRARY_RETRY) {
      this.libraryLoad = allLibrarySets().then(
        (sets) => {
          this.library = sets.filter((set) => !(set.entry.generator?.min_moves > 0)).flatMap((set) => set.puzzles);
          for (const c of this.deep) {
            c.puzzles = sets.filter((set) => c.files.includes(set.entry.file)).flatMap((set) => set.puzzles);
          }
        },
        () => {
          this.libraryFailed = Date.now();
        },
      ).finally(() => {
        this.libraryLoad = null;
      });
    }
    if (!this.libraryLoad) return;
    let timer;
    await Promise.race([this.libraryLoad, new Promise((done) => { timer = setTimeout(done, LIBRARY_WAIT); })]);
    clearTimeout(timer);
  }

  async fill() {
    if (this.generating || this.data.queue.length >= AHEAD) return;
    await this.loadLibrary();
    if (this.generating || this.data.queue.length >= AHEAD) return;
    const { theme, rule } = this.data;
    const deep = this.deep.find((t) => t.name === theme);
    if (deep && this.fillDeep(deep, rule)) return;
    const choice = deep ? { low: DEEP_BAND[0], high: DEEP_BAND[1] } : drillChoice(theme, rule, this.ratingFor(rule));
    const [lo, hi] = [choice.low, choice.high];
    if (!deep) $('drill-band').textContent = choice.say;
    if (!deep && !this.data.current && !this.data.queue.length) {
      const first = this.fromLibrary(theme, rule, lo, hi);
      if (first) {
        this.data.queue.push(first);
        this.next(); // plays it, and comes back here to make the next ones
        return;
      }
    }
    const job = { theme, rule };
    this.generating = job;
    this.renderQueue();
    const kind = deep ? { theme: deep.theme, minMoves: deep.minMoves, unique: true } : { theme };
    const ask = (ratingLo, ratingHi) => this.jobs.run('generate', {
      options: { ...kind, rule, size: 15, ratingLo, ratingHi, seed: randomSeed(), count: 1 },
    }, (p) => {
      if (!$('drill-wait').hidden) {
        $('drill-wait-text').textContent = `Making a puzzle at your level… ${p.games} game${p.games === 1 ? '' : 's'} looked at.`;
      }
    });
    let json;
    try {
      try {
        json = await ask(lo, hi);
      } catch (e) {
        if (e instanceof Cancelled) throw e;
        // Nothing in the band this time: any rating will do.
        json = await ask(600, 2600);
      }
    } catch (e) {
      if (this.generating === job) this.generating = null;
      if (!(e instanceof Cancelled)) {
        this.waiting(!this.data.current, `No puzzle could be made: ${e.message}. Try another theme.`);
      }
      return;
    }
    if (this.generating !== job) return;
    this.generating = null;
    const puzzle = JSON.parse(json).puzzles[0];
    const seen = [...this.data.queue, ...(this.data.current ? [this.data.current.puzzle] : [])];
    if (seen.some((p) => p.id === puzzle.id)) {
      // The same position again (ids are position hashes): make another instead.
      this.fill();
      return;
    }
    this.data.queue.push(puzzle);
    this.save();
    if (!this.data.current) this.next();
    this.renderQueue();
    this.fill();
  }

  loadCurrent() {
    const c = this.data.current;
    this.waiting(false);
    this.loading = true;
    try {
      const record = { played: c.played, wrong: c.wrong, hints: c.hints, attempt: c.attempt ?? null };
      this.board.load(JSON.stringify(c.puzzle), { record, trusted: true });
    } finally {
      this.loading = false;
    }
    this.renderPlay(this.board.status());
  }

  /** Leaving the current puzzle unfinished: a touched puzzle counts as not solved; an
   * untouched one is a free skip while today's free skips last (engine::rating::drill). */
  leave() {
    const c = this.data.current;
    if (!c || c.rated) return;
    const attempt = c.attempt ?? ((c.played.length || c.wrong || c.hints) ? 'trying' : 'untried');
    const r = this.app.practice.handle.skip(today(), attempt);
    if (r.counted) {
      this.rate(false);
      this.app.practice.finished({
        origin: 'drill', title: 'Drill', puzzle: JSON.stringify(c.puzzle), attempt: 'failed',
        hints: c.hints, wrong: c.wrong, millis: 0, rating: this.ratingFor(c.puzzle.rule),
        puzzleRating: c.puzzle.rating, skipped: true,
      });
    } else {
      this.app.practice.save();
    }
    if (r.say) announce(r.say);
    $('drill-queue').dataset.skip = r.say;
  }

  /** Rates the current puzzle's try both ways: the player's rating under its rule and the
   * puzzle's own. */
  rate(clean) {
    const c = this.data.current;
    c.rated = true;
    const p = c.puzzle;
    const rule = p.rule;
    const puzzles = this.data.puzzleRatings ??= {};
    const r = rateTry(this.ratingFor(rule), own(puzzles, p.id) ?? null, p.rating, clean);
    this.data.ratings ??= {};
    put(this.data.ratings, rule, r.player);
    delete puzzles[p.id];
    put(puzzles, p.id, r.puzzle);
    const ids = Object.keys(puzzles);
    for (const id of ids.slice(0, Math.max(0, ids.length - PUZZLE_RATINGS))) delete puzzles[id];
    this.data.stats.played++;
    if (clean) this.data.stats.clean++;
    this.renderRating();
    announce($('drill-rating').textContent);
  }

  /** A try ended: rated, then into the logbook and, if missed, into Revisit. Returns what to
   * say once the app's replies are on show. Only a puzzle's first finished try counts, as in
   * Tonight: a retry is practice on a puzzle already counted (one puzzle, one outcome). */
  finished(s, millis) {
    const c = this.data.current;
    if (!c || this.loading || c.rated) return;
    this.rate(s.attempt === 'clean');
    const out = this.app.practice.finished({
      origin: 'drill', title: 'Drill', puzzle: JSON.stringify(c.puzzle), attempt: s.attempt,
      hints: s.record.hints, wrong: s.record.wrong, millis, rating: this.ratingFor(c.puzzle.rule),
      puzzleRating: c.puzzle.rating,
    });
    this.save();
    return out?.say;
  }

  next() {
    this.leave();
    const p = this.data.queue.shift();
    if (!p) {
      this.data.current = null;
      this.save();
      this.waiting(true);
      this.fill();
      return;
    }
    this.data.current = { puzzle: p, played: [], wrong: 0, hints: 0, rated: false };
    this.save();
    this.loadCurrent();
    this.fill();
  }

  changed(s, why) {
    if (this.loading || s.mode !== 'puzzle' || !this.data.current) {
      this.renderPlay(s);
      return;
    }
    const c = this.data.current;
    c.played = s.record.played;
    c.wrong = s.record.wrong;
    c.hints = s.record.hints;
    c.attempt = s.record.attempt;
    if (why !== 'reveal' || s.pending === 0) this.save();
    this.renderPlay(s);
  }

  renderPlay(s) {
    const root = $('drill');
    const over = s.state !== 'playing';
    const none = !this.data.current;
    root.querySelector('[data-act="hint"]').disabled = none || over || s.pending > 0 || s.record.hints >= 3 || !!s.solution;
    root.querySelector('[data-act="hint"]').hidden = s.state === 'failed';
    root.querySelector('[data-act="solution"]').hidden = s.state !== 'failed';
    root.querySelector('[data-act="solution"]').disabled = s.pending > 0;
    root.querySelector('[data-act="undo"]').disabled = none || s.record.played.length === 0;
    root.querySelector('[data-act="retry"]').disabled = none || s.moves.length === 0;
    const next = root.querySelector('[data-act="next"]');
    next.disabled = none;
    root.querySelector('[data-act="solution"]').disabled ||= none;
    next.classList.toggle('ready', over && s.pending === 0);
    // Leaving an unfinished puzzle is a skip, and says what it costs (engine::rating::drill).
    if (none || over) {
      next.textContent = 'Next';
    } else if (s.attempt === 'untried') {
      const left = this.app.practice.handle.freeSkipsLeft(today());
      next.textContent = left ? `Skip (${left} free today)` : 'Skip (counts as not solved)';
    } else {
      next.textContent = 'Leave (counts as not solved)';
    }
  }

  act(what) {
    if (what === 'next') return this.next();
    if (!this.data.current) return;
    this.board.act(what, this.app.study);
  }
}
