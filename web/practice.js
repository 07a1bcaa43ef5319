// The player's practice: the Revisit deck and the logbook, kept by one Rust `Practice` handle
// for the whole visit and saved as one document ("practice") after every finished try. Every
// finished try of Tonight, Drill, Revisit and My games comes through `finished`; the badge on
// the Revisit button follows the deck.

import { Practice } from './pkg/fivefold_web.js';
import { save } from './store.js';
import { $ } from './ui.js';

/** Today as a day number: days since 1970-01-01 of the player's own calendar day. */
export function today() {
  const d = new Date();
  return Math.floor(Date.UTC(d.getFullYear(), d.getMonth(), d.getDate()) / 86_400_000);
}

/** Why a stored practice document cannot be used, or null. */
export function checkPractice(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  if (typeof d.deck !== 'string' || typeof d.log !== 'string') return 'it has no deck or logbook';
  return Practice.checkDeck(d.deck) ?? Practice.checkLog(d.log) ?? null;
}

export class PracticeStore {
  constructor() {
    this.handle = new Practice(null, null);
    this.listeners = [];
  }

  /** Starts from a stored document (or nothing). */
  init(data) {
    this.handle = data ? new Practice(data.deck, data.log) : new Practice(null, null);
    this.changed();
  }

  get data() {
    return { deck: this.handle.deckJson(), log: this.handle.logJson() };
  }

  save() {
    save('practice', this.data);
  }

  /** Calls `f` after every change (a screen that shows the practice redraws). */
  onChange(f) {
    this.listeners.push(f);
  }

  changed() {
    const c = this.handle.counts(today());
    const badge = $('revisit-badge');
    badge.hidden = c.due === 0;
    badge.textContent = String(c.due);
    const nav = document.querySelector('.rail [data-go="revisit"]');
    nav?.setAttribute('aria-label', c.due ? `Revisit, ${c.due} due` : 'Revisit');
    for (const f of this.listeners) f();
  }

  /**
   * A finished try: `{origin, title, puzzle (set-file puzzle JSON text), attempt, hints, wrong,
   * millis, rating, puzzleRating, skipped, outside}` (`outside`: a miss of the player's own
   * game, filed in Revisit untried and not logged). Returns `{due, say}` (when it comes back to
   * Revisit, in words), or null if it could not be recorded.
   */
  finished(entry) {
    let out = null;
    try {
      out = this.handle.finish({ ...entry, today: today() });
    } catch (e) {
      console.warn(`a finished try was not recorded: ${e}`);
      return null;
    }
    this.save();
    this.changed();
    return out;
  }
}
