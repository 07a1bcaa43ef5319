// Measures Drill in the browser (the built app in web/dist, headless Chromium):
//   1. time to a playable first puzzle, as a new player meets it: a fresh page opens Drill,
//      picks the rule, then the theme; the clock runs from picking the theme to the board
//      showing a puzzle of that theme and rule (`runs` fresh pages per theme and rule);
//   2. time to a made puzzle, as a player who has had the library's puzzles of a theme waits
//      for the worker: the app's worker (web/worker.js on the workshop module) is started and
//      asked for one puzzle per theme and rule, in a new player's band, `runs` seeds each,
//      worker start included;
//   3. the worker's memory: its WebAssembly linear memory (which never shrinks, so it is the
//      peak) after those generations, per rule;
//   4. deep lines (--only deep, not part of the default run): one deep puzzle of each kind
//      under freestyle as Coach's Expert band asks for it (min moves 10, 6 and 5, unique,
//      1900-2600), `runs` seeds each, in a fresh worker.
// With --single, part 1 runs on the single-file build (web/dist/fivefold.html from a file://
// URL, whose one module is the workshop built for size) instead of the served app.
// Run after a build:
//   node web/tools/measure-drill.mjs [--runs 10] [--only first|made|deep] [--single]
// It prints a table (median, 95th percentile, worst, in ms) and writes
// web/artefacts/measure-drill.json (measure-drill-single.json with --single).

import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { ARTEFACTS, DIST, launch, open, serve } from '../e2e/support.mjs';

const arg = (name, fallback) => {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : fallback;
};
const RUNS = Number(arg('--runs', 10));
const ONLY = arg('--only', 'all');
const SINGLE = process.argv.includes('--single');
const THEMES = {
  freestyle: ['four-three', 'vcf', 'vct', 'defend'],
  standard: ['four-three', 'vcf', 'vct', 'defend'],
  renju: ['four-three', 'vcf', 'vct', 'defend', 'forbidden-trap', 'forbidden-win'],
};

const quantile = (xs, q) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))];
};
const summary = (xs) => ({ runs: xs.length, median: quantile(xs, 0.5), p95: quantile(xs, 0.95), worst: Math.max(...xs) });
const row = (name, xs) => {
  const s = summary(xs);
  return `  ${name.padEnd(26)} median ${s.median.toFixed(0).padStart(6)}  p95 ${s.p95.toFixed(0).padStart(6)}  worst ${s.worst.toFixed(0).padStart(6)}  (${s.runs} runs)`;
};

// Whether Drill shows a playable puzzle of `theme` under `rule` (run in the page).
const shows = ([theme, rule]) => {
  const d = JSON.parse(localStorage.getItem('fivefold.drill'))?.data;
  return d?.current?.puzzle.theme === theme && d.current.puzzle.rule === rule &&
    document.getElementById('drill').dataset.waiting === 'false' &&
    document.getElementById('drill-board').dataset.mode === 'puzzle';
};

// Runs `jobs` one after another in a fresh app worker (web/worker.js) in the page; each job is
// a list of messages tried in turn until one is answered without an error. Resolves to the
// answers and the milliseconds from starting the worker to the last answer.
const inWorker = (page, jobs) => page.evaluate(async (jobs) => {
  const t0 = performance.now();
  const w = new Worker('./worker.js', { type: 'module' });
  let id = 0;
  const ask = (m) => new Promise((ok, fail) => {
    w.onmessage = (e) => {
      if (e.data.progress) return;
      if ('error' in e.data) fail(new Error(e.data.error));
      else ok(e.data.result);
    };
    w.postMessage({ id: ++id, ...m });
  });
  const results = [];
  try {
    for (const tries of jobs) {
      for (const [k, m] of tries.entries()) {
        try {
          results.push(await ask(m));
          break;
        } catch (e) {
          if (k === tries.length - 1) throw e;
        }
      }
    }
  } finally {
    w.terminate();
  }
  return { results, ms: performance.now() - t0 };
}, jobs);

// The time to one made puzzle: `tries` are generate options tried in turn.
async function timeMade(page, tries) {
  const { results, ms } = await inWorker(page, [tries.map((options) => ({ type: 'generate', options }))]);
  if (!JSON.parse(results[0]).puzzles.length) throw new Error('no puzzle');
  return ms;
}

const server = await serve();
const browser = await launch();
const out = { first: {}, made: {}, memory: {} };
try {
  if (ONLY === 'deep') {
    console.log('Time to a deep puzzle made by the worker (ms, freestyle, worker start included):');
    const { page, context } = await open(browser, server.url);
    for (const [theme, minMoves] of [['vcf', 10], ['vct', 6], ['defend', 5]]) {
      const times = [];
      for (let i = 0; i < RUNS; i++) {
        times.push(await timeMade(page, [{ theme, rule: 'freestyle', size: 15, ratingLo: 1900, ratingHi: 2600, seed: 601 + i, count: 1, minMoves, unique: true }]));
      }
      out.deep ??= {};
      out.deep[`${theme}/min ${minMoves}`] = summary(times);
      console.log(row(`${theme} (min ${minMoves} moves)`, times));
    }
    await context.close();
  }
  if (ONLY === 'all' || ONLY === 'first') {
    const url = SINGLE ? pathToFileURL(join(DIST, 'fivefold.html')).href : server.url;
    console.log(`Time to a playable first puzzle (ms, from picking the theme${SINGLE ? '; the single-file build' : ''}):`);
    for (const [rule, themes] of Object.entries(THEMES)) {
      for (const theme of themes) {
        const times = [];
        for (let i = 0; i < RUNS; i++) {
          const { page, context } = await open(browser, url);
          await page.click('[data-go="drill"]');
          await page.selectOption('#drill-rule', rule);
          // Start from another theme's puzzle on the board, so that picking this one changes it.
          const others = await page.$$eval('#drill-theme option', (o) => o.map((x) => x.value));
          const other = others.find((t) => t !== theme && t === 'vcf') ?? others.find((t) => t !== theme);
          await page.selectOption('#drill-theme', other);
          await page.waitForFunction(shows, [other, rule], { timeout: 600000, polling: 10 });
          const t0 = await page.evaluate(() => performance.now());
          await page.selectOption('#drill-theme', theme);
          await page.waitForFunction(shows, [theme, rule], { timeout: 600000, polling: 10 });
          times.push(await page.evaluate((t) => performance.now() - t, t0));
          await context.close();
        }
        out.first[`${theme}/${rule}`] = summary(times);
        console.log(row(`${theme}/${rule}`, times));
      }
    }
  }
  if (ONLY === 'all' || ONLY === 'made') {
    console.log('Time to a puzzle made by the worker (ms, worker start included; a new player\'s band):');
    for (const [rule, themes] of Object.entries(THEMES)) {
      const { page, context } = await open(browser, server.url);
      for (const theme of themes) {
        const times = [];
        for (let i = 0; i < RUNS; i++) {
          // The band Drill asks for a new player (rating 1500 ± its uncertainty), then any.
          const seed = 1000 + i;
          times.push(await timeMade(page, [
            { theme, rule, size: 15, ratingLo: 1250, ratingHi: 1750, seed, count: 1 },
            { theme, rule, size: 15, ratingLo: 600, ratingHi: 2600, seed, count: 1 },
          ]));
        }
        out.made[`${theme}/${rule}`] = summary(times);
        console.log(row(`${theme}/${rule}`, times));
      }
      // The worker's linear memory after one generation of each theme in a row.
      const jobs = themes.map((theme) => [{ type: 'generate', options: { theme, rule, size: 15, ratingLo: 600, ratingHi: 2600, seed: 7, count: 3 } }]);
      out.memory[rule] = (await inWorker(page, [...jobs, [{ type: 'memory' }]])).results.at(-1);
      console.log(`  worker linear memory after 3 puzzles of each ${rule} theme: ${(out.memory[rule] / 2 ** 20).toFixed(1)} MiB`);
      await context.close();
    }
  }
} finally {
  await browser.close();
  await server.close();
}
mkdirSync(ARTEFACTS, { recursive: true });
writeFileSync(join(ARTEFACTS, SINGLE ? 'measure-drill-single.json' : 'measure-drill.json'), JSON.stringify(out, null, 1));
