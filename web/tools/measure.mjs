// Measures the built app (web/dist) here, in headless Chromium:
//   1. page weight: each file gzip -9 compressed (HTML, JS, CSS, WASM), and the single-file
//      build apart; what is loaded on first use (the camera scanner, scan.js and scan/; the
//      workshop module, workshop/, with the worker that runs on it; coach.js and games.js) is
//      listed apart and not counted in the page's total, nor are the library's set files
//      (web/tools/weight.mjs weighs what a first visit fetches);
//   2. first board on screen: from navigation to the first puzzle board drawn (the page's
//      performance mark "fivefold:first-board"), for a returning student (a set open, the
//      service worker installed) and for a first visit from a share link;
//   3. grading latency: PuzzleBoard.play on every player move of every starter-library puzzle's
//      solution (median, 95th percentile, worst), the defender's reply included, and the
//      page's WebAssembly linear memory after it (its peak); a move the page's allowance
//      cannot settle is counted with its page time, and the worker's time (gradeMove on the
//      workshop module, then PuzzleBoard.settle) is reported apart;
//   4. WebAssembly against native: the solver benchmark suite (engine/benches/suite.txt) timed
//      in the page by benchSuite and natively by `cargo bench -p fivefold-engine --bench
//      solver` (the same engine::suite::time_all in both), and the ratio of the times.
// Run after a build (web/tools/serve.sh or test.sh builds web/dist):
//   node web/tools/measure.mjs [--runs 7] [--no-native]
// It prints a report and writes web/artefacts/measure.json.

import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';
import { ARTEFACTS, DIST, launch, serve } from '../e2e/support.mjs';

const RUNS = Number(process.argv[process.argv.indexOf('--runs') + 1]) || 7;
const OPEN_SET = 'Deep threats (standard)';
const NATIVE = !process.argv.includes('--no-native');
const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const SUITE = readFileSync(join(ROOT, 'engine/benches/suite.txt'), 'utf8');

const quantile = (xs, q) => {
  const s = [...xs].sort((a, b) => a - b);
  if (!s.length) return NaN;
  const i = Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1));
  return s[i];
};
const ms = (x) => `${x.toFixed(1)} ms`;
const kb = (x) => `${(x / 1024).toFixed(1)} KiB`;

// ---- 1. page weight ----

function gz9(file) {
  const r = spawnSync('gzip', ['-9', '-c', file], { maxBuffer: 1 << 28 });
  if (r.status === 0) return r.stdout.length;
  return gzipSync(readFileSync(file), { level: 9 }).length;
}

function walk(dir) {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

const weight = { files: [], total: { raw: 0, gz: 0 }, byKind: {}, scanner: { files: [], raw: 0, gz: 0 } };
for (const p of walk(DIST).sort()) {
  const name = relative(DIST, p);
  if (name === 'fivefold.html') continue;
  const kind = name.endsWith('.wasm') ? 'wasm' : name.endsWith('.js') ? 'js' : name.endsWith('.css') ? 'css'
    : name.endsWith('.html') ? 'html' : 'other';
  if (kind === 'other') continue; // icons and the manifest are fetched by the installer, not the page
  const raw = statSync(p).size;
  const gz = gz9(p);
  if (name === 'scan.js' || name.startsWith('scan/') || name.startsWith('workshop/') || name === 'worker.js' ||
    name === 'coach.js' || name === 'lanes.js' || name === 'games.js') {
    // Loaded on first use: the camera scanner when scanning starts, the workshop module by
    // the worker (Drill, the Study board's searches), by Coach, My games and a code written
    // (Share, a set's summary), and Coach's (with lanes.js) and My games' scripts when first
    // opened.
    weight.scanner.files.push({ name, raw, gz });
    weight.scanner.raw += raw;
    weight.scanner.gz += gz;
    continue;
  }
  weight.files.push({ name, raw, gz });
  weight.total.raw += raw;
  weight.total.gz += gz;
  weight.byKind[kind] = (weight.byKind[kind] ?? 0) + gz;
}
const single = join(DIST, 'fivefold.html');
weight.single = { raw: statSync(single).size, gz: gz9(single) };

// ---- 2 and 3: in the browser ----

const server = await serve();
const browser = await launch();
const firstBoard = { returning: [], link: [] };
const grading = [];
const wrongGrading = [];
const hints = [];
const shares = [];
let wasmSuite = null;
let pageMemory = null;

async function mark(page) {
  await page.waitForFunction(() => performance.getEntriesByName('fivefold:first-board').length > 0, null, { timeout: 20000 });
  return page.evaluate(() => performance.getEntriesByName('fivefold:first-board')[0].startTime);
}

try {
  // A returning student: a set open in Tonight, the app cached by the service worker.
  const ctx = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 3 });
  const page = await ctx.newPage();
  await page.goto(server.url);
  await page.waitForSelector('html[data-ready="true"]');
  if (!(await page.$eval('#library', (d) => d.open))) await page.click('#library > summary');
  // The set measured before the library was ordered easiest first (it was sixth by file name).
  await page.locator('#library-sets li', { hasText: OPEN_SET }).getByRole('button').click();
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]');
  await page.evaluate(() => navigator.serviceWorker.ready);
  for (let i = 0; i < RUNS; i++) {
    await page.reload();
    firstBoard.returning.push(await mark(page));
  }
  // Share codes of the library's sets (the one open is used for first visits).
  shares.push(...await page.evaluate(async () => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    return JSON.parse(m.librarySets()).map((set) => {
      const json = JSON.stringify(set);
      return { title: set.title, puzzles: set.puzzles.length, json: json.length, code: m.shareEncode(json) };
    });
  }));
  const code = shares.find((s) => s.title === OPEN_SET).code;
  await ctx.close();
  for (let i = 0; i < RUNS; i++) {
    const c = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 3 });
    const p = await c.newPage();
    await p.goto(`${server.url}#set=${code}`);
    firstBoard.link.push(await mark(p));
    await c.close();
  }

  // Grading latency over the starter library.
  const g = await browser.newContext({ viewport: { width: 800, height: 800 } });
  const gp = await g.newPage();
  await gp.goto(server.url);
  await gp.waitForSelector('html[data-ready="true"]');
  const out = await gp.evaluate(async () => {
    const m = await import('./pkg/fivefold_web.js');
    // A move the page leaves undecided goes to the worker, which grades it on the workshop
    // module (gradeMove); here the workshop module is called on this thread so that its time
    // is measured apart from the page's.
    const w = await import('./workshop/fivefold_web.js');
    await w.default();
    let json = null;
    let trusted = true;
    const frame = () => new Promise((ok) => requestAnimationFrame(() => ok()));
    const grade = (t, mv) => {
      const t0 = performance.now();
      const a = t.play(mv);
      const page = performance.now() - t0;
      if (a.kind !== 'undecided') return { a, page, worker: null };
      const t1 = performance.now();
      const g = w.gradeMove(json, trusted, t.gradedMoves(), mv);
      const b = t.settle(mv, g);
      return { a: b ?? a, page, worker: performance.now() - t1 };
    };
    const canvas = document.createElement('canvas');
    canvas.style.width = '600px';
    canvas.style.height = '600px';
    document.body.append(canvas);
    const t = new m.PuzzleBoard(canvas);
    t.fit(2, 16);
    const plays = [];
    const wrongs = [];
    const hintTimes = [];
    const sets = JSON.parse(w.librarySets());
    for (const set of sets) {
      for (const p of set.puzzles) {
        json = JSON.stringify(p);
        t.load(json, trusted, null); // trusted, as Tonight grades the built-in library
        const moves = p.goal === 'defend' ? [p.solution.first_moves[0]] : p.solution.line.filter((_, i) => i % 2 === 0);
        for (const mv of moves) {
          // Where the app's reply left the stored line, the line's next move may be taken.
          if (t.stoneAt(mv) !== '') break;
          const { a, page, worker } = grade(t, mv);
          plays.push({ theme: p.theme, rule: p.rule, id: p.id, move: mv, kind: a.kind, ms: page, worker, reason: a.reason });
          while (t.reveal()) { /* show the reply */ }
          // A frame between moves, as between a player's taps: the canvas's drawing is
          // rasterised at frames, and a loop that never yields piles up thousands of redraws
          // for one raster pass inside some later call.
          await frame();
          if (a.kind !== 'accepted') break;
        }
        // One wrong first move: the empty point nearest the key move that is not an answer
        // (as the native grading benchmark picks it).
        t.load(JSON.stringify(p), true, null);
        const col = (n) => n.charCodeAt(0) - 97;
        const row = (n) => Number(n.slice(1)) - 1;
        const key = p.solution.first_moves[0];
        const taken = new Set([...p.black, ...p.white, ...p.solution.first_moves]);
        let wrong = null;
        let best = Infinity;
        for (let y = 0; y < p.size; y++) {
          for (let x = 0; x < p.size; x++) {
            const n = `${String.fromCharCode(97 + x)}${y + 1}`;
            if (taken.has(n)) continue;
            const d = Math.max(Math.abs(x - col(key)), Math.abs(y - row(key)));
            if (d < best) { best = d; wrong = n; }
          }
        }
        if (wrong) {
          await frame();
          const { a, page, worker } = grade(t, wrong);
          wrongs.push({ theme: p.theme, id: p.id, move: wrong, kind: a.kind, ms: page, worker });
        }
      }
    }
    // Hints, in a second pass (the tables hold other positions by then).
    for (const set of sets) {
      for (const p of set.puzzles) {
        t.load(JSON.stringify(p), true, null);
        for (let step = 0; step < 3; step++) {
          await frame();
          const h0 = performance.now();
          t.hint();
          hintTimes.push(performance.now() - h0);
        }
      }
    }
    // The page's linear memory (it never shrinks: the peak of all the grading above).
    const memory = (await m.default()).memory.buffer.byteLength;
    return { plays, wrongs, hintTimes, memory };
  });
  pageMemory = out.memory;
  grading.push(...out.plays);
  wrongGrading.push(...out.wrongs);
  hints.push(...out.hintTimes);
  wasmSuite = JSON.parse(await gp.evaluate(async (text) => {
    // The suite's timer is in the workshop module (the worker's engine).
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    return m.benchSuite(text);
  }, SUITE));
  await g.close();
} finally {
  await browser.close();
  await server.close();
}

// ---- report ----

const lines = [];
const say = (s = '') => lines.push(s);
say('Page weight (gzip -9 per file; what the served page loads):');
for (const f of weight.files) say(`  ${f.name.padEnd(28)} ${String(f.raw).padStart(9)} B  ->  ${String(f.gz).padStart(8)} B`);
say(`  total                        ${String(weight.total.raw).padStart(9)} B  ->  ${String(weight.total.gz).padStart(8)} B (${kb(weight.total.gz)})`);
say(`  by kind: ${Object.entries(weight.byKind).map(([k, v]) => `${k} ${kb(v)}`).join(', ')}`);
say(`  single file fivefold.html    ${String(weight.single.raw).padStart(9)} B  ->  ${String(weight.single.gz).padStart(8)} B (${kb(weight.single.gz)})`);
say('  loaded on first use (not in the total): the camera scanner, the workshop module and the worker, Coach and My games:');
for (const f of weight.scanner.files) say(`    ${f.name.padEnd(26)} ${String(f.raw).padStart(9)} B  ->  ${String(f.gz).padStart(8)} B`);
say(`    first-use total              ${String(weight.scanner.raw).padStart(9)} B  ->  ${String(weight.scanner.gz).padStart(8)} B (${kb(weight.scanner.gz)})`);
say();
for (const [k, xs] of Object.entries(firstBoard)) {
  say(`First board on screen, ${k === 'returning' ? 'returning student (set open, service worker)' : 'first visit from a share link'}: ` +
    `median ${ms(quantile(xs, 0.5))}, worst ${ms(Math.max(...xs))} over ${xs.length} runs (390x844 at ratio 3)`);
}
say();
const codeLens = shares.map((x) => x.code.length);
say(`Share codes of the ${shares.length} library sets: ${Math.min(...codeLens)} to ${Math.max(...codeLens)} characters ` +
  `(${shares.map((x) => `${x.puzzles} puzzles ${x.code.length}`).join(', ')}); ` +
  `the minified set files are ${Math.min(...shares.map((x) => x.json))} to ${Math.max(...shares.map((x) => x.json))} bytes`);
say();
const times = grading.map((x) => x.ms);
say(`Grading latency on the page, PuzzleBoard.play on ${times.length} solution moves of the starter library (reply included; a move the page hands to the worker counts its page time here):`);
say(`  median ${ms(quantile(times, 0.5))}, 95th percentile ${ms(quantile(times, 0.95))}, worst ${ms(Math.max(...times))}`);
const themes = [...new Set(grading.map((x) => x.theme))];
for (const th of themes) {
  const xs = grading.filter((x) => x.theme === th).map((x) => x.ms);
  say(`  ${th.padEnd(15)} n=${String(xs.length).padStart(3)}  median ${ms(quantile(xs, 0.5)).padStart(9)}  p95 ${ms(quantile(xs, 0.95)).padStart(9)}  worst ${ms(Math.max(...xs)).padStart(9)}`);
}
const kinds = grading.reduce((a, x) => ({ ...a, [x.kind]: (a[x.kind] ?? 0) + 1 }), {});
say(`  answers: ${Object.entries(kinds).map(([k, v]) => `${k} ${v}`).join(', ')}`);
for (const x of grading.filter((g) => g.kind !== 'accepted' && g.kind !== 'solved')) {
  say(`  NOTE: ${x.id} (${x.theme}, ${x.rule}): the stored move ${x.move} was graded ${x.kind}: ${x.reason ?? ''}`);
}
const slow = [...grading].sort((a, b) => b.ms - a.ms).slice(0, 5);
say(`  slowest: ${slow.map((x) => `${x.id} ${x.move} ${ms(x.ms)}`).join('; ')}`);
{
  const xs = wrongGrading.map((x) => x.ms);
  const kinds = wrongGrading.reduce((a, x) => ({ ...a, [x.kind]: (a[x.kind] ?? 0) + 1 }), {});
  const slowest = [...wrongGrading].sort((a, b) => b.ms - a.ms).slice(0, 3);
  say(`Wrong first moves (${xs.length}, the empty point nearest the key that is no answer), refutation included:`);
  say(`  median ${ms(quantile(xs, 0.5))}, 95th percentile ${ms(quantile(xs, 0.95))}, worst ${ms(Math.max(...xs))}; ` +
    `graded ${Object.entries(kinds).map(([k, v]) => `${k} ${v}`).join(', ')}; ` +
    `slowest: ${slowest.map((x) => `${x.id} ${x.move} ${ms(x.ms)}`).join('; ')}`);
}
{
  const handed = [...grading, ...wrongGrading].filter((x) => x.worker !== null && x.worker !== undefined);
  const xs = handed.map((x) => x.worker);
  say(`Handed to the worker (the page's allowance could not settle them): ${handed.length} of ${grading.length + wrongGrading.length} moves` +
    (handed.length ? `; the worker's time median ${ms(quantile(xs, 0.5))}, worst ${ms(Math.max(...xs))}; ` +
      `graded ${Object.entries(handed.reduce((a, x) => ({ ...a, [x.kind]: (a[x.kind] ?? 0) + 1 }), {})).map(([k, v]) => `${k} ${v}`).join(', ')}` : ''));
}
say(`Hints, each step timed: median ${ms(quantile(hints, 0.5))}, p95 ${ms(quantile(hints, 0.95))}, worst ${ms(Math.max(...hints))}`);
say(`The page's WebAssembly linear memory after all the grading (its peak): ${(pageMemory / 2 ** 20).toFixed(1)} MiB`);
say();
// The native run of the same suite: the bench binary prints one line per kind.
let nativeSuite = null;
if (NATIVE) {
  const r = spawnSync('cargo', ['bench', '-q', '-p', 'fivefold-engine', '--bench', 'solver'], { cwd: ROOT, encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.status !== 0) {
    say(`Native suite run failed (exit ${r.status}): ${(r.stderr ?? '').trim().split('\n').slice(-3).join(' | ')}`);
  } else {
    nativeSuite = {};
    for (const kind of ['vcf', 'vct']) {
      const line = r.stdout.split('\n').find((l) => l.startsWith(`${kind} `)) ?? '';
      const num = (name) => Number((line.match(new RegExp(`${name}\\s+([0-9.]+)`)) ?? [])[1]);
      nativeSuite[kind] = { median_ms: num('median'), p95_ms: num('p95'), max_ms: num('max'), total_ms: num('total') };
    }
  }
}
say(`Solver suite (${wasmSuite.vcf.positions + wasmSuite.vct.positions} positions), WebAssembly in headless Chromium` +
  (nativeSuite ? ' against native (cargo bench --bench solver):' : ':'));
for (const kind of ['vcf', 'vct']) {
  const w = wasmSuite[kind];
  const nps = w.nodes / Math.max(w.total_ms, 1e-9) / 1e3;
  let row = `  ${kind}  wasm median ${ms(w.median_ms)}, p95 ${ms(w.p95_ms)}, max ${ms(w.max_ms)}, total ${ms(w.total_ms)}, ${nps.toFixed(2)} M nodes/s`;
  if (nativeSuite) {
    const n = nativeSuite[kind];
    row += `\n        native median ${ms(n.median_ms)}, p95 ${ms(n.p95_ms)}, total ${ms(n.total_ms)}; ratio of totals ${(w.total_ms / n.total_ms).toFixed(2)}, of medians ${(w.median_ms / n.median_ms).toFixed(2)}`;
  }
  say(row);
}
if (nativeSuite) {
  const wt = wasmSuite.vcf.total_ms + wasmSuite.vct.total_ms;
  const nt = nativeSuite.vcf.total_ms + nativeSuite.vct.total_ms;
  say(`  WASM : native over the whole suite: ${(wt / nt).toFixed(2)} (target at most 1.6)`);
}
if (wasmSuite.mismatches.length) say(`  MISMATCHES in the browser: ${wasmSuite.mismatches.join('; ')}`);
const report = lines.join('\n');
console.log(report);
mkdirSync(ARTEFACTS, { recursive: true });
writeFileSync(join(ARTEFACTS, 'measure.json'), JSON.stringify({ weight, pageMemory, firstBoard, grading, wrongGrading, hints, wasmSuite, nativeSuite, shares: shares.map(({ code, ...x }) => ({ ...x, code: code.length })) }, null, 1));
writeFileSync(join(ARTEFACTS, 'measure.txt'), `${report}\n`);
