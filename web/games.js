// My games: the player's own games, pasted or opened (our move lists or SGF), checked move by
// move in the worker (missed wins, blunders, missed defences, renju forbidden points), shown
// as a timeline beside a board, and turned into puzzles for Tonight (and so for Revisit) or a
// set file. Games checked are kept on this device. Names and titles from a record are shown
// as text only.

import { parseSet, readGames } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs } from './jobs.js';
import { save } from './store.js';
import { $, POINT_NAME, RULES, announce, banner, bringBoard, download, el, fill, isInt, keepFocus } from './ui.js';

const GAMES_KEPT = 40;
const GAME_FILE_BYTES = 2_000_000;
const GAME_TEXT_MAX = 200;
const FINDING_KINDS = ['missed-win', 'blunder', 'missed-defence', 'forbidden-point'];
const MOVE_VERDICTS = ['fine', 'finding', 'undecided'];
const GAME_PLAYERS = ['black', 'white', 'both'];
const GAME_COLOURS = ['black', 'white'];
const MOVE_VERDICT_WORDS = { fine: 'fine', finding: 'a finding', undecided: 'undecided' };

const isPointList = (a, max = 361) => Array.isArray(a) && a.length <= max && a.every((p) => typeof p === 'string' && POINT_NAME.test(p));
const isGameText = (v) => v === null || (typeof v === 'string' && v.length <= GAME_TEXT_MAX);

/** Why one stored finding cannot be used, or null. */
function checkStoredFinding(f, moves) {
  if (!f || typeof f !== 'object') return 'is empty';
  if (!isInt(f.number, 1, moves) || !GAME_COLOURS.includes(f.colour) || !POINT_NAME.test(f.played ?? '')) return 'names no move';
  if (!FINDING_KINDS.includes(f.kind) || typeof f.words !== 'string' || f.words.length > 2000) return 'has no words';
  if (!isInt(f.at, 0, moves) || !isPointList(f.line) || !GAME_COLOURS.includes(f.first) || !isPointList(f.defences)) return 'has a malformed line';
  if (typeof f.puzzle !== 'boolean') return 'is malformed';
  return null;
}

/** Why the stored games cannot be used, or null. */
export function checkGames(d) {
  if (!d || !Array.isArray(d.list)) return 'it has no list of games';
  if (d.list.length > GAMES_KEPT) return 'it holds too many games';
  const ids = new Set();
  for (const g of d.list) {
    if (!g || typeof g.id !== 'string' || !/^[a-z0-9-]{1,40}$/.test(g.id) || ids.has(g.id)) return 'a game has no id';
    ids.add(g.id);
    const what = `game ${g.id}`;
    if (![15, 19].includes(g.size) || !RULES.includes(g.rule) || !GAME_PLAYERS.includes(g.player)) return `the settings of ${what} are unknown`;
    if (!isGameText(g.title) || !isGameText(g.black) || !isGameText(g.white) || !isGameText(g.date)) return `the names of ${what} are malformed`;
    if (!isPointList(g.moves) || !g.moves.length) return `the moves of ${what} are malformed`;
    if (!Array.isArray(g.verdicts) || g.verdicts.length > g.moves.length || !g.verdicts.every((v) => MOVE_VERDICTS.includes(v))) {
      return `the verdicts of ${what} are malformed`;
    }
    if (!Array.isArray(g.findings) || g.findings.length > 4 * g.moves.length) return `the findings of ${what} are malformed`;
    for (const f of g.findings) {
      const why = checkStoredFinding(f, g.moves.length);
      if (why) return `a finding of ${what} ${why}`;
    }
    if (typeof g.summary !== 'string' || typeof g.checked !== 'string' || typeof g.budget !== 'string') return `${what} is incomplete`;
    if (g.set !== null) {
      if (typeof g.set !== 'string') return `the puzzles of ${what} are malformed`;
      try {
        parseSet(g.set);
      } catch (e) {
        return `the puzzles of ${what} are not valid (${e})`;
      }
    }
  }
  return null;
}

export function emptyGames() {
  return { list: [] };
}

function newGameId() {
  const v = new Uint32Array(2);
  crypto.getRandomValues(v);
  return `g-${v[0].toString(36)}${v[1].toString(36)}`;
}

const gameDay = () => new Date().toISOString().slice(0, 10);

/** A game's heading: its title, else its players, else its length. */
function gameHeading(g) {
  if (g.title) return g.title;
  if (g.black || g.white) return `${g.black ?? 'Black'} – ${g.white ?? 'White'}`;
  return `A game of ${g.moves.length} moves`;
}

export class Games {
  constructor(app) {
    this.app = app;
    this.data = emptyGames();
    this.jobs = new Jobs();
    this.loaded = null; // the games of the last paste or file: {games, warnings, source}
    this.open = null; // the game on show
    this.at = 0; // moves on the board
    this.board = new BoardView($('games-board'), { kind: 'study', readOnly: true, message: $('games-message') });
    this.t = this.board.trainer;
    $('games-read').addEventListener('click', () => this.readText());
    $('games-file').addEventListener('change', (e) => this.pickFile(e.target));
    $('games-pick').addEventListener('change', () => this.renderSetup());
    $('games-check').addEventListener('click', () => this.check());
    $('games-cancel').addEventListener('click', () => this.cancel());
    $('games-back').addEventListener('click', () => this.showList());
    $('games-prev').addEventListener('click', () => this.go(this.at - 1));
    $('games-next').addEventListener('click', () => this.go(this.at + 1));
    $('games-line-prev').addEventListener('click', () => this.lineStep(-1));
    $('games-line-next').addEventListener('click', () => this.lineStep(1));
    $('games-play').addEventListener('click', () => this.play());
    $('games-export').addEventListener('click', () => this.exportSet());
  }

  init(data) {
    this.cancel(true);
    this.data = data ?? emptyGames();
    this.loaded = null;
    $('games-setup').hidden = true;
    this.showList();
  }

  applySettings(s) {
    this.board.setOptions({ ...s, confirm: false });
  }

  save() {
    save('games', this.data);
  }

  note(text, kind = 'info') {
    $('games-note').textContent = text;
    $('games-note').dataset.kind = kind;
  }

  // ---- Taking a game in ----

  readText() {
    const text = $('games-text').value;
    if (!text.trim()) {
      this.note('Nothing to read: paste a move list (black first, like h8 h9 i8) or an SGF record first.', 'refused');
      return;
    }
    this.read(new TextEncoder().encode(text), 'the pasted text');
  }

  async pickFile(input) {
    const f = input.files?.[0];
    input.value = '';
    if (!f) return;
    if (f.size > GAME_FILE_BYTES) {
      this.note(`"${f.name}" is too large to be a game file; nothing was loaded.`, 'refused');
      return;
    }
    this.read(new Uint8Array(await f.arrayBuffer()), `"${f.name}"`);
  }

  /** Reads games from bytes; on an error nothing changes but the message. */
  read(bytes, source) {
    let got;
    try {
      got = readGames(bytes, Number($('games-size').value));
    } catch (e) {
      this.note(`${source[0].toUpperCase()}${source.slice(1)} cannot be read: ${e}. Nothing was loaded.`, 'refused');
      announce(`Not loaded: ${e}.`);
      return;
    }
    this.loaded = { ...got, source };
    const n = got.games.length;
    const warn = got.warnings.length ? ` Note: ${got.warnings.join(' ')}` : '';
    this.note(`Read ${n === 1 ? 'one game' : `${n} games`} from ${source}.${warn}`, got.warnings.length ? 'warn' : 'info');
    fill($('games-pick'), got.games.map((g, i) => el('option', { value: String(i) },
      `${i + 1}. ${gameHeading(g)} (${g.moves.length} moves)`)));
    $('games-pick-box').hidden = n < 2;
    $('games-setup').hidden = false;
    this.renderSetup();
  }

  picked() {
    return this.loaded?.games[Number($('games-pick').value) || 0] ?? null;
  }

  renderSetup() {
    const g = this.picked();
    if (!g) return;
    $('games-setup-title').textContent = gameHeading(g);
    const bits = [`${g.moves.length} moves`, `${g.size} × ${g.size}`];
    if (g.black || g.white) bits.push(`Black: ${g.black ?? 'not named'}, White: ${g.white ?? 'not named'}`);
    if (g.date) bits.push(g.date);
    $('games-setup-meta').textContent = bits.join(' · ');
    if (g.rule) $('games-rule').value = g.rule;
  }

  busy(on) {
    $('games-busy').hidden = !on;
    $('games-check').disabled = on;
    $('games').dataset.busy = on ? 'true' : 'false';
  }

  // ---- Checking ----

  async check() {
    const g = this.picked();
    if (!g || this.jobs.busy) return;
    const rule = $('games-rule').value;
    const player = $('games-player').value;
    const total = g.moves.length;
    const show = (checked, of) => {
      $('games-busy-text').textContent = `Checked ${checked} of ${of} moves…`;
      $('games-progress').max = of;
      $('games-progress').value = checked;
    };
    show(0, total);
    this.busy(true);
    const started = performance.now();
    let r;
    try {
      const query = { size: g.size, rule, moves: g.moves, player, created: gameDay() };
      r = await this.jobs.run('review', { query }, (p) => show(p.checked, p.total));
    } catch (e) {
      this.busy(false);
      if (e instanceof Cancelled) return;
      this.note(`The game could not be checked: ${e.message}. Nothing was saved.`, 'refused');
      announce(`Not checked: ${e.message}.`);
      return;
    }
    this.busy(false);
    const secs = (performance.now() - started) / 1000;
    let set = r.set;
    if (set) {
      // The set's title says which game it came from (the same title for every game would
      // leave Tonight with several sets of one name).
      const s = JSON.parse(set);
      s.title = `${s.title}: ${gameHeading(g)}`.slice(0, 120);
      set = parseSet(JSON.stringify(s));
    }
    const entry = {
      id: newGameId(),
      title: g.title ?? null,
      black: g.black ?? null,
      white: g.white ?? null,
      date: g.date ?? null,
      size: g.size,
      rule,
      player,
      moves: g.moves,
      verdicts: r.moves.map((m) => m.verdict),
      findings: r.findings,
      summary: r.summary,
      set: set ?? null,
      checked: new Date().toISOString(),
      budget: r.budget,
      seconds: Math.round(secs * 10) / 10,
    };
    this.data.list.unshift(entry);
    let dropped = '';
    if (this.data.list.length > GAMES_KEPT) {
      this.data.list.length = GAMES_KEPT;
      dropped = ` Only the latest ${GAMES_KEPT} games are kept: the oldest was removed.`;
    }
    this.save();
    this.note(`Checked in ${secs.toFixed(1)} s: ${r.summary}${dropped}`, 'info');
    this.openGame(entry.id);
  }

  cancel(quiet = false) {
    const was = this.jobs.busy;
    this.jobs.cancel();
    this.busy(false);
    if (was && !quiet) {
      this.note('The check was cancelled; nothing was saved. Check the game again when you like.', 'info');
      announce('Check cancelled.');
    }
  }

  // ---- The list of games checked ----

  view(name) {
    if (!$('games').hidden) window.scrollTo(0, 0);
    $('games-list').hidden = name !== 'list';
    $('games-view').hidden = name !== 'view';
    $('games').dataset.view = name;
    keepFocus({ list: $('games-title'), view: $('games-view-title') }[name]);
  }

  showList() {
    this.open = null;
    this.view('list');
    this.renderSaved();
  }

  renderSaved() {
    $('games-none').hidden = this.data.list.length > 0;
    fill($('games-saved'), this.data.list.map((g) => {
      const found = g.findings.length;
      return el('li', { class: 'card', 'data-id': g.id },
        el('h3', { class: 'set-title', text: gameHeading(g) }),
        el('p', { class: 'meta', text: `${g.moves.length} moves · ${g.rule} · ${found === 1 ? '1 finding' : `${found} findings`} · checked ${g.checked.slice(0, 10)}` }),
        el('div', { class: 'row' },
          el('button', { type: 'button', class: 'primary', onclick: () => this.openGame(g.id) }, 'Open'),
          el('button', { type: 'button', class: 'quiet', 'aria-label': `Delete ${gameHeading(g)}`, onclick: () => this.remove(g.id) }, 'Delete')));
    }));
  }

  game(id) {
    return this.data.list.find((g) => g.id === id) ?? null;
  }

  remove(id) {
    const g = this.game(id);
    if (!g || !window.confirm(`Delete "${gameHeading(g)}" and its findings from this device? Puzzles already in Tonight stay there.`)) return;
    this.data.list = this.data.list.filter((x) => x.id !== id);
    this.save();
    this.renderSaved();
    announce('The game is deleted.');
  }

  // ---- One game ----

  openGame(id) {
    const g = this.game(id);
    if (!g) return this.showList();
    this.open = g;
    this.view('view');
    $('games-view-title').textContent = gameHeading(g);
    $('games-summary').textContent = g.summary;
    const n = g.set ? JSON.parse(g.set).puzzles.length : 0;
    $('games-play').disabled = !n;
    $('games-export').disabled = !n;
    const whose = g.player === 'both' ? 'both sides' : `${g.player === 'black' ? 'Black' : 'White'}'s moves`;
    $('games-puzzles').textContent = (n
      ? `${n === 1 ? 'One finding' : `${n} findings`} of ${whose} became ${n === 1 ? 'a puzzle' : 'puzzles'}.`
      : `No finding of ${whose} became a puzzle (a five to make or block, or too many answers, makes none).`) +
      ` Checked under ${g.rule} rules with ${g.budget}; a move that budget could not settle is marked undecided, never guessed.`;
    this.renderTimeline();
    const first = g.findings[0];
    this.go(first ? first.number : 0);
  }

  renderTimeline() {
    const g = this.open;
    fill($('games-timeline'), g.moves.map((p, i) => {
      const n = i + 1;
      const verdict = g.verdicts[i] ?? 'undecided';
      const kinds = g.findings.filter((f) => f.number === n).map((f) => f.kind);
      const colour = i % 2 === 0 ? 'Black' : 'White';
      return el('li', {},
        el('button', {
          type: 'button',
          class: 'mark',
          'data-move': String(n),
          'data-verdict': verdict,
          'data-kind': kinds[0],
          'aria-label': `Move ${n}, ${colour} ${p}: ${MOVE_VERDICT_WORDS[verdict]}`,
          onclick: () => this.go(n),
        }, String(n)));
    }));
  }

  /** Puts the position after `k` moves on the board, and the findings of move `k` below. */
  go(k) {
    const g = this.open;
    if (!g) return;
    this.at = Math.max(0, Math.min(g.moves.length, k));
    this.showPosition(this.at);
    $('games-line').hidden = true;
    $('games-stepper').hidden = false;
    $('games-prev').disabled = this.at === 0;
    $('games-next').disabled = this.at === g.moves.length;
    $('games-at').textContent = this.at
      ? `Move ${this.at} of ${g.moves.length}: ${this.at % 2 ? 'Black' : 'White'} ${g.moves[this.at - 1]}`
      : `Start of ${g.moves.length} moves`;
    for (const b of document.querySelectorAll('#games-timeline .mark')) {
      if (Number(b.dataset.move) === this.at) {
        b.setAttribute('aria-current', 'step');
        b.scrollIntoView?.({ block: 'nearest', inline: 'nearest' });
      } else b.removeAttribute('aria-current');
    }
    this.renderFindings();
  }

  showPosition(k) {
    const g = this.open;
    const moves = g.moves.slice(0, k);
    try {
      this.t.reset(g.size, g.rule);
      if (moves.length) this.t.paste(moves.join(' '));
    } catch {
      // A renju game ends on a forbidden point, which the rules would not place: shown as
      // stones all the same.
      const black = moves.filter((_, i) => i % 2 === 0);
      const white = moves.filter((_, i) => i % 2 === 1);
      this.t.load(g.size, 'freestyle', black, white, k % 2 ? 'white' : 'black');
    }
    this.board.changed('load');
    $('games-board').dataset.at = String(k);
  }

  renderFindings() {
    const g = this.open;
    const here = g.findings.filter((f) => f.number === this.at);
    const box = $('games-finding');
    if (!here.length) {
      const v = this.at ? g.verdicts[this.at - 1] ?? 'undecided' : null;
      const say = v === 'undecided'
        ? `Move ${this.at} is undecided: the check's budget could not settle it.`
        : v === 'fine' ? `Move ${this.at}: nothing found.` : '';
      box.replaceChildren(...(say ? [el('p', { text: say })] : []));
      box.dataset.kind = v ?? '';
      return;
    }
    box.dataset.kind = 'finding';
    box.replaceChildren(...here.map((f) => {
      const parts = [el('p', { text: f.words })];
      if (f.line.length) {
        parts.push(el('p', { class: 'small', text: `The line (${f.first} first): ${f.line.join(' ')}` }));
        parts.push(el('button', {
          type: 'button',
          class: 'secondary',
          'data-show-line': String(f.number),
          onclick: () => this.showLine(f),
        }, 'Show the line on the board'));
      }
      return el('div', { class: 'finding', 'data-kind': f.kind }, ...parts);
    }));
  }

  showLine(f) {
    this.showPosition(f.at);
    try {
      this.t.showLine(f.line, f.first);
    } catch (e) {
      this.board.note(`The line cannot be shown: ${e}.`, 'refused');
      return;
    }
    this.lineTotal = f.line.length;
    // The line's stepper takes the game's place under the board; a move of the timeline
    // brings the game back.
    $('games-line').hidden = false;
    $('games-stepper').hidden = true;
    $('games-line-at').textContent = `Line: 0 of ${f.line.length}, from the position after move ${f.at}`;
    this.board.changed('load');
    this.lineStep(1);
    $('games-line-next').focus({ preventScroll: true });
    bringBoard($('games-board'));
  }

  lineStep(delta) {
    const r = this.t.step(delta);
    $('games-line-at').textContent = r.shown ? `Line: ${r.shown} of ${r.total}: ${r.say.replace(/^\d+\. /, '')}` : `Line: 0 of ${r.total}`;
    $('games-board').dataset.shown = String(r.shown);
    announce(r.say);
    this.board.animate();
    this.board.changed('step');
  }

  // ---- Puzzles ----

  play() {
    const g = this.open;
    if (!g?.set) return;
    let got;
    try {
      got = this.app.tonight.addSet(g.set, 'games');
    } catch (e) {
      banner(`The puzzles could not be added to Tonight: ${e.message ?? e}.`, { kind: 'error', id: 'games' });
      return;
    }
    banner(got.added ? `Added "${got.title}" to Tonight. A puzzle you miss comes back in Revisit.`
      : `"${got.title}" is already in Tonight: opened it.`, { id: 'games' });
    this.app.go('tonight');
    this.app.tonight.openSet(got.key);
  }

  exportSet() {
    const g = this.open;
    if (!g?.set) return;
    download(`from-my-games-${g.checked.slice(0, 10)}.json`, g.set);
    announce('The set file is downloaded.');
  }
}
