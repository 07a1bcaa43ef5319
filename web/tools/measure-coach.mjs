// Measures Coach making a set in the browser (the built app in web/dist, headless Chromium),
// as an instructor meets it: a fresh page opens Coach, starts a new set of one theme, and
// presses Make; the clock runs from the press to the last puzzle kept. Each theme is made
// with one worker and with `--workers` workers (the device's core count is pretended through
// navigator.hardwareConcurrency; Coach uses one worker per core, at most four), and the two
// sets must be the same puzzles in the same order.
// Run after a build:
//   node web/tools/measure-coach.mjs [--workers 2] [--count 12] [--seed 20261] [--band expert]
//     [--themes four-three,vcf,vct,defend,forbidden-trap/renju,forbidden-win/renju] [--rule freestyle]
// A theme may name its rule after a slash; `--rule` is the rule of the others. Difficulty
// "Any level" unless `--band` names another (Coach's band names), 15x15. With `--mix` the themes
// make one set together (taken in turn, as Coach's recipe does; one rule for all). With `--count 1`
// it times a single puzzle, whose games Coach spreads over its workers. It prints one line
// per theme and writes web/artefacts/measure-coach.json.

import assert from 'node:assert/strict';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ARTEFACTS, launch, makeCoachSet, openOnCores, serve } from '../e2e/support.mjs';

const arg = (name, fallback) => {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : fallback;
};
const WORKERS = Number(arg('--workers', 2));
const COUNT = Number(arg('--count', 12));
const RULE = arg('--rule', 'freestyle');
const THEMES = arg('--themes', 'four-three,vcf,vct,defend,forbidden-trap/renju,forbidden-win/renju')
  .split(',')
  .map((t) => (t.includes('/') ? t.split('/') : [t, RULE]));
const SEED = Number(arg('--seed', 20261));
const BAND = arg('--band', undefined);
const MIX = process.argv.includes('--mix');

/** Makes a set of COUNT puzzles of `theme` in Coach on a device of `cores` cores; returns
 * the milliseconds from Make to the last puzzle, the workers Coach used and the puzzles. */
async function make(browser, url, [theme, rule], cores) {
  const c = await openOnCores(browser, url, cores);
  const { page } = c;
  const themes = theme.split('+');
  const { set, ms } = await makeCoachSet(page, {
    title: `Harbour Street: ${theme}`, themes, count: COUNT, seed: SEED, rule, band: BAND, timeout: 60 * 60 * 1000,
  });
  const workers = Number(await page.getAttribute('#coach', 'data-workers'));
  await c.context.close();
  return { ms, workers, puzzles: set.puzzles };
}

const server = await serve();
const browser = await launch();
const rows = [];
try {
  const sets = MIX ? [[THEMES.map(([t]) => t).join('+'), THEMES[0][1]]] : THEMES;
  for (const [theme, rule] of sets) {
    const one = await make(browser, server.url, [theme, rule], 1);
    const many = await make(browser, server.url, [theme, rule], WORKERS);
    assert.equal(one.workers, 1);
    assert.equal(many.workers, Math.min(WORKERS, 4));
    assert.deepEqual(many.puzzles, one.puzzles, `${theme}: the same set on ${many.workers} workers`);
    const row = { theme, rule, band: BAND ?? 'any', count: COUNT, seed: SEED, oneMs: one.ms, workers: many.workers, manyMs: many.ms, speedUp: one.ms / many.ms };
    rows.push(row);
    console.log(`  ${theme.padEnd(14)} ${rule.padEnd(9)} ${COUNT} puzzles: 1 worker ${(one.ms / 1000).toFixed(1)} s, ` +
      `${many.workers} workers ${(many.ms / 1000).toFixed(1)} s (${row.speedUp.toFixed(2)}x), the same set`);
  }
} finally {
  await browser.close();
  await server.close();
}
mkdirSync(ARTEFACTS, { recursive: true });
writeFileSync(join(ARTEFACTS, 'measure-coach.json'), `${JSON.stringify(rows, null, 2)}\n`);
