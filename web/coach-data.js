// What Coach keeps on this device: its document's shape and check, and the limits both share.
// The page checks every saved document when it starts; Coach's screen (coach.js) is loaded
// only when it is first opened.

import { parseSet } from './pkg/fivefold_web.js';
import { RULES, isInt } from './ui.js';

/** Difficulty bands an instructor picks from, in words and numbers (Glicko-scale ratings the
 * generator can make, 600 to 2600). */
export const COACH_BANDS = [
  { name: 'any', words: 'Any level', lo: 600, hi: 2600 },
  { name: 'starting', words: 'Starting out', lo: 600, hi: 1250 },
  { name: 'club', words: 'Club', lo: 1250, hi: 1500 },
  { name: 'strong', words: 'Strong club', lo: 1500, hi: 1900 },
  { name: 'expert', words: 'Expert', lo: 1900, hi: 2600 },
];
// The Expert band makes deep lines for the themes that have them (as the library's deep sets
// are made: at least this many attacker moves before the winning one, one answer); each such
// puzzle takes the worker up to a minute.
export const COACH_DEEP_MOVES = { vcf: 10, vct: 6, defend: 5 };
export const COACH_MAX_PUZZLES = 40;
// A set's puzzles are made on one worker per core, at most this many: each worker holds the
// solver's 32 MB of tables (its WebAssembly memory measured 33 MiB, with the compiled module
// besides), so four already take 130 MB and more of a phone's memory.
export const COACH_MOST_WORKERS = 4;
export const COACH_MAX_SETS = 100;
export const COACH_MAX_CODES = 2000;
export const COACH_TABS = ['make', 'handout', 'results'];
export const COACH_SORTS = ['added', 'name', 'score'];
export const COACH_CODE = /^[0-9A-Za-z -]{1,800}$/;

/** A set-file document of a Coach set (title, date and puzzles). */
export function coachSetFile(s) {
  return JSON.stringify({ format: 'fivefold-set', version: 1, title: s.title || 'Untitled set', created: s.created, puzzles: s.puzzles });
}

/** Why stored Coach data cannot be used, or null. */
export function checkCoach(d) {
  if (!d || typeof d !== 'object') return 'it is empty';
  if (typeof d.address !== 'string' || d.address.length > 2000) return 'the club address is not text';
  if (!Array.isArray(d.sets) || d.sets.length > COACH_MAX_SETS) return 'it has no list of sets';
  if (d.open !== null && typeof d.open !== 'string') return 'the open set is unknown';
  if (!COACH_TABS.includes(d.tab)) return 'the open part is unknown';
  const ids = new Set();
  for (const s of d.sets) {
    if (!s || typeof s.id !== 'string' || !/^c[0-9a-z]{1,20}$/.test(s.id) || ids.has(s.id)) return 'a set has no name on this device';
    ids.add(s.id);
    const what = `the set "${String(s.title).slice(0, 40)}"`;
    if (typeof s.title !== 'string' || s.title.length > 200) return `${what} has no title`;
    if (typeof s.created !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(s.created)) return `${what} has no date`;
    if (!RULES.includes(s.rule) || ![15, 19].includes(s.size)) return `${what} has an unknown rule or size`;
    if (!Array.isArray(s.themes) || !s.themes.length || !s.themes.every((t) => typeof t === 'string')) return `${what} has no themes`;
    if (!isInt(s.count, 1, COACH_MAX_PUZZLES) || !COACH_BANDS.some((b) => b.name === s.band)) return `${what} has an unknown count or band`;
    if (!isInt(s.seed, 0, Number.MAX_SAFE_INTEGER - 100000) || !isInt(s.next, 0, 1e6)) return `${what} has no seed`;
    if (!COACH_SORTS.includes(s.sort)) return `${what} has an unknown order`;
    if (!Array.isArray(s.codes) || s.codes.length > COACH_MAX_CODES || !s.codes.every((c) => typeof c === 'string' && COACH_CODE.test(c))) {
      return `the result codes of ${what} are malformed`;
    }
    if (!Array.isArray(s.puzzles) || s.puzzles.length > COACH_MAX_PUZZLES) return `the puzzles of ${what} are malformed`;
    if (s.puzzles.length) {
      try {
        parseSet(coachSetFile(s));
      } catch (e) {
        return `the puzzles of ${what} are not valid (${e})`;
      }
    }
    // A set's `making` and `earlier` (kept while it is made) are checked where they are used,
    // by `earlierOf`: a bad one is dropped there, never the document.
  }
  return null;
}

/** The puzzles and next seed a set being made again replaces (kept with it as `earlier`
 * until the new puzzles are there), if they are whole and valid; otherwise null. */
export function earlierOf(s) {
  const e = s.earlier;
  if (!e || typeof e !== 'object' || !Array.isArray(e.puzzles) || !e.puzzles.length ||
    e.puzzles.length > COACH_MAX_PUZZLES || !isInt(e.next, 0, 1e6)) return null;
  try {
    parseSet(coachSetFile({ ...s, puzzles: e.puzzles }));
  } catch {
    return null;
  }
  return { puzzles: e.puzzles, next: e.next };
}

export function emptyCoach() {
  return { address: '', open: null, tab: 'make', sets: [] };
}
