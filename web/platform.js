// How the app starts its engine and its workers when it is served over http(s) (the usual
// case): the wasm modules and the worker are files next to the page. The page starts on the
// small module in pkg/; the worker and the instructor's screens use the workshop module. The single-file build
// (web/tools/single.mjs) swaps this module for web/tools/platform-inline.js.

import init from './pkg/fivefold_web.js';

/** Loads and starts the engine on the page. */
export async function startEngine() {
  await init();
}

/** The workshop module (web/dist/workshop: the engine with generation, searches, reviews and
 * Coach's sheet and class table), started on first use: the worker runs on it, and the page
 * loads it only for the screens that need it, so that a student's first visit does not. */
let workshop = null;
let workshopModule = null;
export function loadWorkshop() {
  workshop ??= import('./workshop/fivefold_web.js')
    .then(async (m) => {
      await m.default();
      workshopModule = m;
      return m;
    })
    .catch((e) => {
      // A failed load (no signal, say) is tried again on the next use, not remembered.
      workshop = null;
      throw e;
    });
  return workshop;
}

/** The workshop module if it is already started, else null: lets a click use it at once (a
 * browser lets a page copy to the clipboard only within the click itself). */
export function workshopNow() {
  return workshopModule;
}

/** The set-file text of the starter library's set `file` (dist/library/<file>.json). */
export async function loadLibraryFile(file) {
  const r = await fetch(new URL(`./library/${encodeURIComponent(file)}.json`, import.meta.url));
  if (!r.ok) throw new Error(`${r.status} ${r.statusText}`);
  return r.text();
}

/** A new worker running web/worker.js. */
export function makeWorker() {
  return new Worker(new URL('./worker.js', import.meta.url), { type: 'module', name: 'fivefold' });
}

/** Whether this build can work offline through a service worker (not from file://). */
export const SERVED = true;

/** The screens a student's first visit does not need, each loaded when first opened:
 * `await loadScreen('Coach')` gives the class of Coach (web/coach.js), My games (web/games.js),
 * Revisit (web/revisit.js) or Progress (web/progress.js). */
const LATER_SCREENS = {
  Coach: () => import('./coach.js'),
  Games: () => import('./games.js'),
  Revisit: () => import('./revisit.js'),
  Progress: () => import('./progress.js'),
};
export function loadScreen(kind) {
  return LATER_SCREENS[kind]().then((m) => m[kind]);
}

/** The camera scanner (web/scan.js), loaded on first use so that the page does not grow:
 * `const { openScanner } = await loadScanner()`. */
export function loadScanner() {
  return import('./scan.js');
}
