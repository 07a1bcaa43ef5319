// Weighs the built app (web/dist) as a student's first visit loads it: headless Chromium opens
// the served page with service workers blocked (so only what the page itself asks for is
// counted), opens a starter-library set and plays its first puzzle; then every file the page
// fetched is compressed with gzip -9 and with brotli (quality 11), and summed. It also weighs
// the offline cache the service worker fills afterwards (every file of the build), the
// workshop module, and the single-file build. Run after a build:
//   node web/tools/weight.mjs [--check]
// With --check (a step of web/tools/test.sh) it exits non-zero when the first visit or the
// single file is over its budget (gzip): the budgets are kept, not only printed.

import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';
import { DIST, addFromLibrary, launch, librarySet, ready, serve, solve } from '../e2e/support.mjs';

const FIRST_VISIT_BUDGET = 250_000;
const SINGLE_FILE_BUDGET = 400_000;
const CHECK = process.argv.includes('--check');

const gz = (b) => gzipSync(b, { level: 9 }).length;
const br = (b) => brotliCompressSync(b, { params: { [constants.BROTLI_PARAM_QUALITY]: 11 } }).length;
const file = (path) => readFileSync(join(DIST, path === '/' ? 'index.html' : path.slice(1)));

const CLUB = librarySet('fours-freestyle-club');
const server = await serve();
const browser = await launch();
const paths = new Set();
try {
  const ctx = await browser.newContext({ viewport: { width: 390, height: 844 }, serviceWorkers: 'block' });
  const page = await ctx.newPage();
  ctx.on('request', (r) => {
    const u = new URL(r.url());
    if (u.origin === new URL(server.url).origin) paths.add(u.pathname);
  });
  await page.goto(server.url);
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  await solve(page, 'tonight-board', CLUB.puzzles[0].solution.line);
  await ctx.close();
} finally {
  await browser.close();
  await server.close();
}

const rows = [...paths].sort().map((p) => {
  const b = file(p);
  return { path: p, raw: b.length, gzip: gz(b), brotli: br(b) };
});
const sum = (list, k) => list.reduce((a, r) => a + r[k], 0);
console.log('first visit (the page plays a library puzzle; service workers blocked):');
for (const r of rows) console.log(`  ${String(r.gzip).padStart(8)} gz ${String(r.brotli).padStart(8)} br ${String(r.raw).padStart(9)} raw  ${r.path}`);
const words = (n) => n.toLocaleString('en-GB');
const firstVisit = sum(rows, 'gzip');
console.log(`  ${String(firstVisit).padStart(8)} gz ${String(sum(rows, 'brotli')).padStart(8)} br ${String(sum(rows, 'raw')).padStart(9)} raw  total (budget ${words(FIRST_VISIT_BUDGET)} B gzip)`);
const workshop = file('/workshop/fivefold_web_bg.wasm');
console.log(`workshop module: ${gz(workshop)} gz, ${br(workshop)} br, ${workshop.length} raw`);
const single = file('/fivefold.html');
const singleGz = gz(single);
console.log(`single-file build: ${singleGz} gz, ${br(single)} br, ${single.length} raw (budget ${words(SINGLE_FILE_BUDGET)} B gzip)`);
const sw = readFileSync(join(DIST, 'sw.js'), 'utf8');
const cached = JSON.parse(/const FILES = (\[[\s\S]*?\]);/.exec(sw)[1]);
const all = cached.map((p) => (p === './' ? '/' : `/${p}`)).map((p) => file(p));
console.log(`offline cache (${cached.length} files, filled by the service worker after the first visit): ` +
  `${all.reduce((a, b) => a + gz(b), 0)} gz, ${all.reduce((a, b) => a + b.length, 0)} raw`);

if (CHECK) {
  const over = [['the first visit', firstVisit, FIRST_VISIT_BUDGET], ['the single file', singleGz, SINGLE_FILE_BUDGET]]
    .filter(([, size, budget]) => size > budget)
    .map(([what, size, budget]) => `${what} is ${words(size)} B gzip, ${words(size - budget)} B over its budget of ${words(budget)} B`);
  if (over.length) {
    console.error(`weight.mjs: ${over.join('; ')}.`);
    process.exit(1);
  }
  console.log('weight.mjs: the first visit and the single file are within their budgets.');
}
