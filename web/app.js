// Fivefold in the browser: starts the engine, loads saved progress, and wires the screens
// (Tonight, Drill, Revisit, Study board, Coach, Progress, My games), the settings, backups, share links and offline support.
// The rules, the grading, the drawing and every sentence about the game come from Rust; these
// scripts pass events in and write the returned text out, always as text, never as markup.

import { SERVED, loadScreen, startEngine } from './platform.js';
import { claimSaving, handOver, hasSaved, keepAside, load, makeBackup, onStorageEvents, readBackup, save, savingHere } from './store.js';
import { Tonight, checkSets, checkTonight } from './tonight.js';
import { Drill, checkDrill } from './drill.js';
import { Study, checkStudy } from './study.js';
import { PracticeStore, checkPractice } from './practice.js';
import { checkCoach, emptyCoach } from './coach-data.js';
import { checkGames, emptyGames } from './games-data.js';
import { $, banner, clearBanner, download, el, shown } from './ui.js';
import { setSounds } from './sounds.js';

const SCREENS = ['tonight', 'drill', 'revisit', 'study', 'coach', 'progress', 'games'];
const DEFAULT_SETTINGS = {
  confirm: true, forbidden: true, numbers: false, coachBar: false, sounds: false, theme: 'auto', screen: 'tonight',
};
const THEMES = ['auto', 'light', 'dark'];

function checkSettings(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  for (const k of ['confirm', 'forbidden', 'numbers']) {
    if (typeof d[k] !== 'boolean') return `the setting "${k}" is not on or off`;
  }
  for (const k of ['coachBar', 'sounds']) {
    if (d[k] !== undefined && typeof d[k] !== 'boolean') return `the setting "${k}" is not on or off`;
  }
  if (d.theme !== undefined && !THEMES.includes(d.theme)) return 'the colour setting is unknown';
  if (!SCREENS.includes(d.screen)) return 'the screen is unknown';
  return null;
}

const VALIDATORS = {
  settings: checkSettings,
  sets: checkSets,
  tonight: checkTonight,
  drill: checkDrill,
  study: checkStudy,
  practice: checkPractice,
  coach: checkCoach,
  games: checkGames,
};

const WHAT = {
  settings: 'settings',
  sets: 'list of sets',
  tonight: 'Tonight progress',
  drill: 'Drill progress',
  study: 'Study board position',
  practice: 'Revisit schedule and practice history',
  coach: 'Coach sets and results',
  games: 'games checked in My games',
};

/** Coach, My games, Revisit or Progress until its script is loaded, on first opening
 * (platform.js, loadScreen): it holds the screen's saved document (Revisit and Progress have
 * none of their own; they read the practice store), checked at start like every other, and
 * hands it over with the settings when the screen is made. */
class Later {
  constructor(app, kind, empty) {
    this.app = app;
    this.kind = kind;
    this.empty = empty;
    this.stored = empty();
    this.screen = null;
    this.making = null;
  }

  get data() {
    return this.screen ? this.screen.data : this.stored;
  }

  init(data) {
    if (this.screen) this.screen.init(data);
    else this.stored = data ?? this.empty();
  }

  applySettings(s) {
    this.screen?.applySettings?.(s);
  }

  /** The screen, made on first use; a failed load is tried again on the next call. */
  get() {
    this.making ??= loadScreen(this.kind)
      .then((Screen) => {
        // The screen is kept only once it is whole: a failure here leaves the stored data in
        // charge and the next call tries again.
        const screen = new Screen(this.app);
        screen.applySettings?.(this.app.settings);
        screen.init?.(this.stored);
        this.screen = screen;
        return screen;
      })
      .catch((e) => {
        this.making = null;
        throw e;
      });
    return this.making;
  }
}

class App {
  constructor() {
    this.settings = { ...DEFAULT_SETTINGS };
    this.quotaWarned = false;
  }

  start() {
    // The documents whose last save failed for lack of space: the warning stays until every
    // one of them has been saved again.
    const unsaved = new Set();
    this.unsaved = unsaved;
    onStorageEvents({
      onFull: (name) => {
        unsaved.add(name);
        if (this.quotaWarned) return;
        this.quotaWarned = true;
        banner('This device\'s storage is full, so your latest progress is not being saved. ' +
          'Play goes on; export a backup from Settings, or free some space.', { kind: 'warn', id: 'quota', sticky: true });
      },
      onSaved: (name) => {
        unsaved.delete(name);
        // Space is back: save again what could not be saved (each document as it is now).
        for (const other of [...unsaved]) {
          const data = this.documents()[other];
          if (data !== undefined && other !== name) save(other, data);
        }
        if (this.quotaWarned && unsaved.size === 0) {
          this.quotaWarned = false;
          clearBanner('quota');
        }
      },
      onNewer: () => {
        banner('A newer version of Fivefold saved your progress on this device, so this older copy ' +
          'does not save over it. Reload the page to get the newer version.', { kind: 'warn', id: 'newer', sticky: true });
      },
      onHandedOver: () => this.handedOver(),
    });
    const claim = this.watchOtherPages();
    this.practice = new PracticeStore();
    this.tonight = new Tonight(this);
    this.drill = new Drill(this);
    this.study = new Study(this);
    this.coach = new Later(this, 'Coach', emptyCoach);
    this.games = new Later(this, 'Games', emptyGames);
    this.revisit = new Later(this, 'Revisit', () => null);
    this.progress = new Later(this, 'Progress', () => null);
    claim();
    this.loadAll();
    for (const b of document.querySelectorAll('[data-go]')) {
      b.addEventListener('click', () => {
        if ($('more').open) $('more').close();
        this.go(b.dataset.go);
      });
    }
    $('nav-more').addEventListener('click', () => $('more').showModal());
    $('close-more').addEventListener('click', () => $('more').close());
    $('more-settings').addEventListener('click', () => {
      $('more').close();
      $('open-settings').click();
    });
    this.wireSettings();
    this.wireSkip();
    window.addEventListener('hashchange', () => this.readHash());
    this.readHash();
  }

  /** One page of the app saves at a time, so that two tabs or windows never save their own
   * copies over each other's progress (web/store.js): the returned `claim`, called just before
   * the saved progress is read, makes this page the one that saves, and tells the others on a
   * channel so that they say at once that they no longer save (a page that misses the message
   * finds out at its next save). A page brought back from the browser's back-forward cache
   * missed what other pages did meanwhile, so it loads again. */
  watchOtherPages() {
    const me = `${Date.now().toString(36)}-${Math.random().toString(36).slice(2)}`;
    window.addEventListener('pageshow', (e) => {
      if (!e.persisted) return;
      handOver();
      window.location.reload();
    });
    const channel = typeof BroadcastChannel === 'function' ? new BroadcastChannel('fivefold-pages') : null;
    let at = Infinity;
    if (channel) {
      // The message can come before the other page's claim is seen in this page's storage, so
      // it is judged by the time of the claim: the later claim saves (two pages that start
      // together are told apart by name).
      channel.onmessage = (e) => {
        const d = e.data;
        if (d?.kind !== 'saving' || d.page === me || typeof d.at !== 'number') return;
        if (d.at > at || (d.at === at && d.page > me)) this.handedOver();
      };
    }
    return () => {
      at = performance.timeOrigin + performance.now();
      claimSaving(me);
      channel?.postMessage({ kind: 'saving', page: me, at });
    };
  }

  /** Another page saves from now on: this one stops its long jobs (their results could not be
   * kept), and says, in a message that stays, that nothing done here is kept, with a button
   * that loads the page again with the latest progress and makes it the one that saves. */
  handedOver() {
    handOver();
    if ($('banners').querySelector('[data-id="elsewhere"]')) return;
    this.coach.screen?.cancelMaking(true);
    this.games.screen?.cancel();
    // Nothing is saved here any more, so nothing waits for space either.
    this.unsaved.clear();
    this.quotaWarned = false;
    clearBanner('quota');
    const b = banner('Progress is now saved in another Fivefold tab or window, so nothing you do here is kept. ' +
      '"Continue here" loads this page again with the latest progress.', { kind: 'warn', id: 'elsewhere', sticky: true, dismiss: false });
    b.append(el('button', { type: 'button', class: 'secondary', onclick: () => window.location.reload() }, 'Continue here'));
  }

  // Loads every saved document (recovering damaged ones) and hands it to its screen.
  loadAll(parts) {
    const got = {};
    for (const name of Object.keys(VALIDATORS)) {
      if (parts) {
        got[name] = parts[name] ?? null;
        continue;
      }
      const { data, note } = load(name, VALIDATORS[name], WHAT[name]);
      got[name] = data;
      if (note) banner(note, { kind: 'warn', id: `recovered-${name}`, sticky: true });
    }
    this.settings = { ...DEFAULT_SETTINGS, ...(got.settings ?? {}) };
    this.applySettings();
    try {
      this.practice.init(got.practice);
    } catch (e) {
      banner(`Your Revisit schedule and practice history could not be read (${e}); they start afresh.`, { kind: 'warn', id: 'practice', sticky: true });
      this.practice.init(null);
    }
    this.tonight.init(got.sets, got.tonight);
    this.drill.init(got.drill);
    this.study.init(got.study);
    this.coach.init(got.coach);
    this.games.init(got.games);
    this.go(this.settings.screen);
  }

  /** Every saved document as it stands now. */
  documents() {
    return {
      settings: this.settings,
      sets: this.tonight.sets,
      tonight: this.tonight.data,
      drill: this.drill.data,
      study: this.study.data,
      practice: this.practice.data,
      coach: this.coach.data,
      games: this.games.data,
    };
  }

  applySettings() {
    for (const screen of [this.tonight, this.drill, this.study, this.revisit, this.coach, this.games]) screen.applySettings(this.settings);
    $('opt-confirm').checked = this.settings.confirm;
    $('opt-forbidden').checked = this.settings.forbidden;
    $('opt-numbers').checked = this.settings.numbers;
    $('opt-coach').checked = !!this.settings.coachBar;
    $('opt-sounds').checked = !!this.settings.sounds;
    $('opt-theme').value = this.settings.theme;
    const root = document.documentElement;
    if (this.settings.coachBar) root.dataset.coachBar = 'true';
    else delete root.dataset.coachBar;
    if (this.settings.theme === 'auto') delete root.dataset.theme;
    else root.dataset.theme = this.settings.theme;
    setSounds(this.settings.sounds);
  }

  go(name) {
    if (!SCREENS.includes(name)) name = 'tonight';
    for (const s of SCREENS) $(s).hidden = s !== name;
    for (const b of document.querySelectorAll('.rail [data-go]')) {
      if (b.dataset.go === name) b.setAttribute('aria-current', 'page');
      else b.removeAttribute('aria-current');
    }
    // On a phone, "More" stands for the screens it opens.
    const extra = !['tonight', 'drill', 'revisit', 'study'].includes(name) &&
      !(name === 'coach' && this.settings.coachBar);
    if (extra) $('nav-more').setAttribute('aria-current', 'page');
    else $('nav-more').removeAttribute('aria-current');
    document.documentElement.dataset.screen = name;
    // Another screen starts at the top of the page.
    if (this.settings.screen !== name) window.scrollTo(0, 0);
    if (this.settings.screen !== name) {
      this.settings.screen = name;
      save('settings', this.settings);
    }
    if (name === 'drill') this.drill.activate();
    const later = { coach: this.coach, games: this.games, revisit: this.revisit, progress: this.progress }[name];
    if (later && !later.screen) {
      // Shown once its script is there.
      $(name).hidden = true;
      later.get().then(() => {
        clearBanner('screen');
        if (this.settings.screen !== name) return;
        $(name).hidden = false;
        later.screen.activate?.();
      }, (e) => {
        banner(`This screen could not be opened (${e?.message ?? e}). Check the connection and try again.`, { kind: 'error', id: 'screen' });
      });
    } else if (later) {
      later.screen.activate?.();
    }
  }

  // The skip link goes to the board of the screen on show (else to the screen itself), and
  // says which.
  wireSkip() {
    const skip = $('skip');
    const target = () => [...document.querySelectorAll(`#${this.settings.screen} canvas.board`)].find(shown);
    skip.addEventListener('focus', () => {
      skip.textContent = target() ? 'Skip to the board' : 'Skip to the screen';
    });
    skip.addEventListener('click', (e) => {
      e.preventDefault();
      const board = target();
      if (board) {
        board.focus({ preventScroll: true });
        board.scrollIntoView({ block: 'nearest' });
      } else {
        const heading = [...($(this.settings.screen)?.querySelectorAll('h1') ?? [])].find(shown);
        heading?.setAttribute('tabindex', '-1');
        heading?.focus();
      }
    });
  }

  readHash() {
    const m = /^#set=(.*)$/s.exec(location.hash);
    if (!m) return;
    let code = m[1];
    try {
      code = decodeURIComponent(code);
    } catch {
      // Left as it is: the decoder will refuse it with a message.
    }
    history.replaceState(null, '', location.href.split('#')[0]);
    this.tonight.fromLink(code);
  }

  wireSettings() {
    const dialog = $('settings');
    $('open-settings').addEventListener('click', () => {
      $('settings-note').textContent = '';
      dialog.showModal();
    });
    $('close-settings').addEventListener('click', () => dialog.close());
    $('opt-theme').addEventListener('change', (e) => {
      this.settings.theme = THEMES.includes(e.target.value) ? e.target.value : 'auto';
      this.applySettings();
      save('settings', this.settings);
      if (!$('progress').hidden) this.progress.screen?.activate();
    });
    const settingBoxes = [['opt-confirm', 'confirm'], ['opt-forbidden', 'forbidden'], ['opt-numbers', 'numbers'],
      ['opt-coach', 'coachBar'], ['opt-sounds', 'sounds']];
    for (const [id, key] of settingBoxes) {
      $(id).addEventListener('change', (e) => {
        this.settings[key] = e.target.checked;
        this.applySettings();
        save('settings', this.settings);
      });
    }
    $('export-backup').addEventListener('click', () => this.exportBackup());
    $('import-backup').addEventListener('change', (e) => this.importBackup(e.target));
  }

  /** Whether a backup must wait because another page saves now (saying so, with `why`). */
  backupElsewhere(why) {
    if (savingHere()) return false;
    const msg = `Progress is saved in another Fivefold tab or window now, so ${why}`;
    $('settings-note').textContent = msg;
    banner(msg, { kind: 'error', id: 'backup' });
    return true;
  }

  exportBackup() {
    // This page's copy may be older than what another page has saved since.
    if (this.backupElsewhere('a backup from this one could be out of date: choose "Continue here" first.')) return;
    const parts = this.documents();
    const day = new Date().toISOString().slice(0, 10);
    download(`fivefold-backup-${day}.json`, makeBackup(parts));
    $('settings-note').textContent = 'The backup file is downloaded.';
  }

  async importBackup(input) {
    const f = input.files?.[0];
    input.value = '';
    if (!f) return;
    let parts;
    let exported;
    try {
      if (f.size > 20_000_000) throw new Error('the file is too large to be a backup');
      ({ parts, exported } = readBackup(await f.text(), VALIDATORS));
      if (!Object.keys(parts).length) throw new Error('the backup holds nothing to restore');
    } catch (e) {
      const msg = `"${f.name}" cannot be used: ${e.message}. Nothing was changed.`;
      $('settings-note').textContent = msg;
      banner(msg, { kind: 'error', id: 'backup' });
      return;
    }
    // (Asked again after the question: another page may have started while it was open.)
    const elsewhere = () => this.backupElsewhere('this one cannot restore a backup: choose "Continue here" first. Nothing was changed.');
    if (elsewhere()) return;
    const names = Object.keys(parts);
    if (hasSaved(names)) {
      const when = exported ? new Date(exported).toLocaleString() : 'an unknown date';
      if (!window.confirm(`Replace the progress on this device with the backup made ${when}? ` +
        'The progress there now is kept aside on this device.')) {
        $('settings-note').textContent = 'The backup was not restored. Nothing was changed.';
        return;
      }
      if (elsewhere()) return;
      if (!keepAside(names)) {
        const msg = 'The progress on this device could not be kept aside (storage is full), so the backup was not restored. Nothing was changed.';
        $('settings-note').textContent = msg;
        banner(msg, { kind: 'error', id: 'backup' });
        return;
      }
    }
    const failed = Object.entries(parts).filter(([name, data]) => !save(name, data)).map(([n]) => WHAT[n]);
    this.loadAll({
      settings: this.settings,
      sets: this.tonight.sets,
      tonight: this.tonight.data,
      drill: this.drill.data,
      study: this.study.data,
      practice: this.practice.data,
      coach: this.coach.data,
      games: this.games.data,
      ...parts,
    });
    const msg = failed.length
      ? `The backup is restored for now, but this device could not store: ${failed.join(', ')}.`
      : `The backup from "${f.name}" is restored.`;
    $('settings-note').textContent = msg;
    banner(msg, { kind: failed.length ? 'warn' : 'info', id: 'backup' });
  }
}

async function main() {
  try {
    await startEngine();
  } catch (e) {
    $('boot').textContent = `Fivefold could not start in this browser (${e}).`;
    return;
  }
  $('boot').hidden = true;
  const app = new App();
  try {
    app.start();
  } catch (e) {
    $('boot').hidden = false;
    $('boot').textContent = `Fivefold could not start: ${e?.message ?? e}`;
    throw e;
  }
  if (SERVED && 'serviceWorker' in navigator && /^https?:$/.test(location.protocol)) {
    navigator.serviceWorker.register('./sw.js').catch((e) => {
      console.warn(`offline support is not available: ${e}`);
    });
  }
  document.documentElement.dataset.ready = 'true';
}

main();
