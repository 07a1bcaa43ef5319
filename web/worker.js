// The app's worker, on the workshop module: generates Drill puzzles and runs Study board
// searches off the page's thread, so the page stays responsive. Messages in:
// - {type: "init", module} (optional: a compiled wasm module, used by the single-file build);
// - {id, type: "generate", options};
// - {id, type: "game", options, number}: one game of a one-puzzle generation, answered with
//   {puzzle, limit, exhausted} (see playGame; Coach spreads one puzzle's games over workers);
// - {id, type: "solve", query};
// - {id, type: "prove", puzzle};
// - {id, type: "grade", puzzle, trusted, moves, move}: a move the page could not settle within
//   a frame, answered with the grade as JSON;
// - {id, type: "review", query}: a game's task, checked move by move with progress {checked,
//   total, move}, or its puzzles, or a finding's defences (query.task);
// - {id, type: "memory"}: the engine's linear memory in bytes, for web/tools/measure-drill.mjs.
// Messages out: {id, progress}, {id, result} or {id, error, code, fatal} (code "not-enough" when a
// generation's games ran out before enough puzzles were found, else null).

import init, { checkGame, generateSet, gradeMove, playGame, provePuzzle, solvePosition } from './workshop/fivefold_web.js';

let ready = null;

function start(module) {
  if (!ready) ready = init(module ? { module_or_path: module } : undefined);
  return ready;
}

self.onmessage = async (event) => {
  const m = event.data;
  if (m.type === 'init') {
    start(m.module);
    return;
  }
  try {
    await start();
    if (m.type === 'generate') {
      const result = generateSet(m.options, (kept, games) => {
        self.postMessage({ id: m.id, progress: { kept, games } });
      });
      self.postMessage({ id: m.id, result });
    } else if (m.type === 'game') {
      self.postMessage({ id: m.id, result: playGame(m.options, m.number) });
    } else if (m.type === 'solve') {
      const result = solvePosition(m.query, (nodes) => {
        self.postMessage({ id: m.id, progress: { nodes } });
      });
      self.postMessage({ id: m.id, result });
    } else if (m.type === 'review') {
      const result = checkGame(m.query, (checked, total, move) => {
        self.postMessage({ id: m.id, progress: { checked, total, move } });
      });
      self.postMessage({ id: m.id, result });
    } else if (m.type === 'memory') {
      // The engine's linear memory in bytes: it never shrinks, so this is its peak so far.
      self.postMessage({ id: m.id, result: (await start()).memory.buffer.byteLength });
    } else if (m.type === 'grade') {
      // A move the page left undecided within its frame's work: settled here, off its thread.
      self.postMessage({ id: m.id, result: gradeMove(m.puzzle, m.trusted, m.moves, m.move) });
    } else if (m.type === 'prove') {
      self.postMessage({ id: m.id, result: provePuzzle(m.puzzle) });
    } else {
      self.postMessage({ id: m.id, error: `unknown job '${m.type}'` });
    }
  } catch (e) {
    // A trap (a panic, or memory running out) leaves the module unusable: say so, so that the
    // page starts a fresh worker for the next job.
    const fatal = e instanceof WebAssembly.RuntimeError;
    // A generation whose games ran out before enough puzzles were found (generateSet's
    // `NotEnough`) is told apart, so that Coach can pass that seed over and go on (the code is
    // jobs.js's NOT_ENOUGH; this worker does not import jobs.js, which starts workers).
    const code = e?.name === 'NotEnough' ? 'not-enough' : null;
    self.postMessage({ id: m.id, error: String(e?.message ?? e), code, fatal });
  }
};
