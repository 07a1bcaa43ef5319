// My games: the player's own games, pasted or opened (our move lists or SGF), checked move by
// move in the worker (missed wins, blunders, missed defences, renju forbidden points), shown
// as a timeline beside a board, and turned into puzzles for Tonight (and so for Revisit) or a
// set file. A check stopped half-way keeps the moves it checked. The puzzles and a missed
// defence's whole list are made in the worker when the player asks for them. Games checked
// are kept on this device. Names and titles from a record are shown as text only.

import { parseSet } from './pkg/fivefold_web.js';
import { BoardView } from './board.js';
import { Cancelled, Jobs } from './jobs.js';
import { loadWorkshop } from './platform.js';
import { save } from './store.js';
import { GAMES_KEPT, emptyGames } from './games-data.js';
import { $, announce, banner, bringBoard, download, el, fill, keepFocus } from './ui.js';

const GAME_FILE_BYTES = 2_000_000;
const MOVE_VERDICT_WORDS = { fine: 'fine', finding: 'a finding', undecided: 'undecided', unchecked: 'not checked' };

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

// Why a finding makes no puzzle, for the note under a game.
const MAKES_NONE = '(a five to make or block, or too many answers, makes none)';

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

  /** The workshop module's functions (the game reader and the check's words), loaded on
   * first use: a student who never opens My games never loads them. */
  async workshop() {
    try {
      this.ws ??= await loadWorkshop();
      return this.ws;
    } catch (e) {
      this.note(`My games could not start: ${e?.message ?? e}. Reload the page to try again.`, 'refused');
      return null;
    }
  }

  /** Reads games from bytes; on an error nothing changes but the message. */
  async read(bytes, source) {
    const ws = await this.workshop();
    if (!ws) return;
    let got;
    try {
      got = ws.readGames(bytes, Number($('games-size').value));
    } catch (e) {
      this.note(`${source[0].toUpperCase()}${source.slice(1)} cannot be read: ${e}. Nothing was loaded.`, 'refused');
      announce(`Not loaded: ${e}.`);
      return;
    }
    this.offer(got, source);
  }

  /** Shows what was read (`{games, warnings}`) for the player to pick, set up and check. */
  offer(got, source) {
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

  /** Offers one game (`{size, rule, moves}`, from the Study board) to be checked. */
  takeGame(game, source) {
    this.app.go('games');
    this.showList();
    this.offer({ games: [{ title: null, black: null, white: null, date: null, ...game }], warnings: [] }, source);
    $('games-setup').scrollIntoView?.({ block: 'nearest' });
    $('games-check').focus({ preventScroll: true });
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
    if (!g || this.jobs.busy || !(await this.workshop())) return;
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
    // Every move as the worker checks it: kept if the player stops the check.
    const kept = [];
    let r;
    try {
      const query = { size: g.size, rule, moves: g.moves, player, created: gameDay() };
      r = await this.jobs.run('review', { query }, (p) => {
        if (p.move) kept.push(p.move);
        show(p.checked, p.total);
      });
    } catch (e) {
      this.busy(false);
      if (this.discard) {
        this.discard = false;
        return;
      }
      if (!(e instanceof Cancelled)) {
        this.note(`The game could not be checked: ${e.message}. Nothing was saved.`, 'refused');
        announce(`Not checked: ${e.message}.`);
        return;
      }
      if (!kept.length) {
        this.note('The check was stopped before its first move was done; nothing was saved. Check the game again when you like.', 'info');
        announce('Check stopped.');
        return;
      }
      r = this.stoppedResult(g, kept);
    }
    this.busy(false);
    const secs = (performance.now() - started) / 1000;
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
      set: null,
      made: false,
      stopped: r.stopped,
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
    this.note(`${r.stopped ? 'Stopped after' : 'Checked in'} ${secs.toFixed(1)} s: ${r.summary}${dropped}`, 'info');
    this.openGame(entry.id);
  }

  /** What a stopped check kept: the moves checked, in order; the rest not checked. */
  stoppedResult(g, kept) {
    const verdicts = g.moves.map((_, i) => kept[i]?.verdict ?? 'unchecked');
    const findings = kept.flatMap((m) => m.findings ?? []);
    return {
      moves: verdicts.map((verdict) => ({ verdict })),
      findings,
      summary: this.ws.stoppedSummary(verdicts, findings.length, g.moves.length),
      stopped: true,
      budget: this.ws.checkBudget(),
    };
  }

  /** Stops the check in flight (the moves checked so far are kept, unless `discard`: the
   * games are being replaced) or the puzzles' work. */
  cancel(discard = false) {
    this.discard = discard && this.jobs.busy;
    this.jobs.cancel();
    this.busy(false);
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
    if (this.open && this.jobs.busy) this.jobs.cancel();
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
    this.renderPuzzles();
    this.renderTimeline();
    const first = g.findings[0];
    this.go(first ? first.number : 0);
  }

  /** The findings the puzzles may come from: the player's (or both sides'), not a forbidden point. */
  puzzleFindings(g) {
    return g.findings.filter((f) => f.kind !== 'forbidden-point' && (g.player === 'both' || f.colour === g.player));
  }

  renderPuzzles(making = null) {
    const g = this.open;
    const made = g.made !== false;
    const n = made && g.set ? JSON.parse(g.set).puzzles.length : 0;
    const can = made ? n > 0 : this.puzzleFindings(g).length > 0;
    $('games-play').disabled = !can || !!making;
    $('games-export').disabled = !can || !!making;
    const whose = g.player === 'both' ? 'both sides' : `${g.player === 'black' ? 'Black' : 'White'}'s moves`;
    let say;
    if (making) say = `Making puzzles from the findings of ${whose}: ${making.done} of ${making.total} done…`;
    else if (!made) {
      say = can
        ? `The findings of ${whose} become puzzles when you play or save them (each is proved first, which takes a moment).`
        : `No finding of ${g.player === 'both' ? 'either side' : whose} can become a puzzle.`;
    } else {
      const all = this.puzzleFindings(g).length;
      say = n
        ? `${n < all ? `${n} of the ${all} findings` : n === 1 ? 'The finding' : `All ${n} findings`} of ${whose} became ${n === 1 ? 'a puzzle' : 'puzzles'}, filed in Revisit${n < all ? `; the others could not ${MAKES_NONE}` : ''}.`
        : `No finding of ${g.player === 'both' ? 'either side' : whose} became a puzzle ${MAKES_NONE}.`;
    }
    const stopped = g.stopped ? ' The check was stopped: the moves not checked are marked so.' : '';
    $('games-puzzles').textContent = `${say} Checked under ${g.rule} rules with ${g.budget}; a move that budget could not settle is marked undecided, never guessed.${stopped}`;
  }

  /** Makes the open game's puzzles in the worker if they are not made yet; true when done. */
  async makePuzzles() {
    const g = this.open;
    if (!g || g.made !== false) return true;
    if (this.jobs.busy) return false;
    const findings = this.puzzleFindings(g);
    this.renderPuzzles({ done: 0, total: findings.length });
    let r;
    try {
      const query = { size: g.size, rule: g.rule, moves: g.moves, player: g.player, created: g.checked.slice(0, 10), task: 'puzzles', findings };
      r = await this.jobs.run('review', { query }, (p) => {
        if (this.open === g) this.renderPuzzles({ done: p.checked, total: p.total });
      });
    } catch (e) {
      if (this.open === g) this.renderPuzzles();
      if (!(e instanceof Cancelled)) banner(`The puzzles could not be made: ${e.message}.`, { kind: 'error', id: 'games' });
      return false;
    }
    let set = r.set;
    if (set) {
      // The set's title says which game it came from (the same title for every game would
      // leave Tonight with several sets of one name).
      const s = JSON.parse(set);
      s.title = `${s.title}: ${gameHeading(g)}`.slice(0, 120);
      set = parseSet(JSON.stringify(s));
    }
    findings.forEach((f, i) => { f.puzzle = r.made[i]; });
    g.set = set ?? null;
    g.made = true;
    this.save();
    // Each puzzle is a miss in the player's own game: it goes to Revisit, as a puzzle missed
    // here does (not to Progress, which counts tries made in the app).
    for (const p of set ? JSON.parse(set).puzzles : []) {
      this.app.practice.finished({ origin: 'games', title: gameHeading(g), puzzle: JSON.stringify(p), attempt: 'failed', outside: true });
    }
    if (this.open === g) this.renderPuzzles();
    return true;
  }

  /** Every defence of a missed defence, from the worker; the stored finding is updated. */
  async listDefences(f) {
    const g = this.open;
    if (!g || this.jobs.busy) return;
    const button = document.querySelector(`#games-finding [data-defences="${f.number}"]`);
    if (button) {
      button.disabled = true;
      button.textContent = 'Looking for every defence…';
    }
    let r;
    try {
      const query = { size: g.size, rule: g.rule, moves: g.moves, player: g.player, created: g.checked.slice(0, 10), task: 'defences', findings: [f] };
      r = await this.jobs.run('review', { query });
    } catch (e) {
      if (!(e instanceof Cancelled)) banner(`The defences could not be listed: ${e.message}.`, { kind: 'error', id: 'games' });
      if (this.open === g) this.renderFindings();
      return;
    }
    const i = g.findings.indexOf(f);
    if (i >= 0) g.findings[i] = { ...r.finding, puzzle: f.puzzle };
    this.save();
    if (this.open === g) this.renderFindings();
    announce(r.finding.words);
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
      const say = {
        undecided: `Move ${this.at} is undecided: the check's budget could not settle it.`,
        unchecked: `Move ${this.at} was not checked: the check was stopped first.`,
        fine: `Move ${this.at}: nothing found.`,
      }[v] ?? '';
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
      if (f.kind === 'missed-defence' && f.all === false) {
        parts.push(el('button', {
          type: 'button',
          class: 'secondary',
          'data-defences': String(f.number),
          onclick: () => this.listDefences(f),
        }, 'List every defence'));
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

  async play() {
    const g = this.open;
    if (!g || !(await this.makePuzzles()) || this.open !== g) return;
    if (!g.set) return;
    let got;
    try {
      got = this.app.tonight.addSet(g.set, 'games');
    } catch (e) {
      banner(`The puzzles could not be added to Tonight: ${e.message ?? e}.`, { kind: 'error', id: 'games' });
      return;
    }
    banner(got.added ? `Added "${got.title}" to Tonight. Its puzzles are in Revisit too.`
      : `"${got.title}" is already in Tonight: opened it.`, { id: 'games' });
    this.app.go('tonight');
    this.app.tonight.openSet(got.key);
  }

  async exportSet() {
    const g = this.open;
    if (!g || !(await this.makePuzzles()) || this.open !== g) return;
    if (!g.set) return;
    download(`from-my-games-${g.checked.slice(0, 10)}.json`, g.set);
    announce('The set file is downloaded.');
  }
}
