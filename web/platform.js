// How the app starts its engine and its workers when it is served over http(s) (the usual
// case): the wasm module and the worker are files next to the page. The single-file build
// (web/tools/single.mjs) swaps this module for web/tools/platform-inline.js.

import init from './pkg/fivefold_web.js';

/** Loads and starts the engine on the page. */
export async function startEngine() {
  await init();
}

/** A new worker running web/worker.js. */
export function makeWorker() {
  return new Worker(new URL('./worker.js', import.meta.url), { type: 'module', name: 'fivefold' });
}

/** Whether this build can work offline through a service worker (not from file://). */
export const SERVED = true;

/** The camera scanner (web/scan.js), loaded only when an instructor starts scanning, so the
 * page a student loads does not grow. Rejects when it cannot be loaded here. */
export function loadScanner() {
  return import('./scan.js');
}
