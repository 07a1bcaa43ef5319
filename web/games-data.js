// What My games keeps on this device: its document's shape and check. The page checks every
// saved document when it starts; the My games screen (games.js) is loaded only when it is
// first opened.

import { parseSet } from './pkg/fivefold_web.js';
import { POINT_NAME, RULES, isInt } from './ui.js';

export const GAMES_KEPT = 40;
const GAME_TEXT_MAX = 200;
const FINDING_KINDS = ['missed-win', 'blunder', 'missed-defence', 'forbidden-point'];
const MOVE_VERDICTS = ['fine', 'finding', 'undecided', 'unchecked'];
const GAME_PLAYERS = ['black', 'white', 'both'];
const GAME_COLOURS = ['black', 'white'];
const isOptBool = (v) => v === undefined || typeof v === 'boolean';

const isPointList = (a, max = 361) => Array.isArray(a) && a.length <= max && a.every((p) => typeof p === 'string' && POINT_NAME.test(p));
const isGameText = (v) => v === null || (typeof v === 'string' && v.length <= GAME_TEXT_MAX);

/** Why one stored finding cannot be used, or null. */
function checkStoredFinding(f, moves) {
  if (!f || typeof f !== 'object') return 'is empty';
  if (!isInt(f.number, 1, moves) || !GAME_COLOURS.includes(f.colour) || !POINT_NAME.test(f.played ?? '')) return 'names no move';
  if (!FINDING_KINDS.includes(f.kind) || typeof f.words !== 'string' || f.words.length > 2000) return 'has no words';
  if (!isInt(f.at, 0, moves) || !isPointList(f.line) || !GAME_COLOURS.includes(f.first) || !isPointList(f.defences)) return 'has a malformed line';
  if (typeof f.puzzle !== 'boolean' || !isOptBool(f.all) || !isOptBool(f.complete) || !isOptBool(f.onto)) return 'is malformed';
  if (![undefined, null, 'vcf', 'vct'].includes(f.mode) || !(f.depth === undefined || isInt(f.depth, 0, 400))) return 'is malformed';
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
    if (!isOptBool(g.made) || !isOptBool(g.stopped)) return `${what} is malformed`;
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
