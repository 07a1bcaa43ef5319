// End-to-end: offline use. After one visit the service worker has cached the app, so with the
// network off a reload still plays a puzzle (and Drill still makes puzzles in its worker). The
// single-file build plays a puzzle, and drills, from a file:// URL.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import {
  DIST,
  PUZZLES,
  addFromLibrary,
  boardState,
  context,
  goTo,
  librarySet,
  open,
  ready,
  solve,
  useBrowser,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');
const BOARD = 'tonight-board';

const env = useBrowser();

test('the served copies of the library sets are the sets, every number with all its digits', () => {
  const files = readdirSync(PUZZLES).filter((f) => f.endsWith('.json'));
  assert.ok(files.length >= 10, `only ${files.length} sets in puzzles/`);
  for (const f of files) {
    const source = readFileSync(join(PUZZLES, f), 'utf8');
    const served = readFileSync(join(DIST, 'library', f), 'utf8');
    assert.deepEqual(JSON.parse(served), JSON.parse(source), f);
    assert.ok(served.length < source.length, `${f} is not smaller served`);
    // A parse and re-print would round an integer past 2^53; the numbers' digits must be kept.
    const numbers = (t) => t.replace(/"(?:[^"\\]|\\.)*"/g, '""').match(/-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?/g) ?? [];
    assert.deepEqual(numbers(served), numbers(source), f);
  }
});

test('after a first visit, the app works with the network off', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  await page.evaluate(() => navigator.serviceWorker.ready);
  await page.reload();
  await ready(page);
  assert.ok(await page.evaluate(() => navigator.serviceWorker.controller !== null), 'the page is controlled');
  const cached = await page.evaluate(async () => {
    const keys = await caches.keys();
    const c = await caches.open(keys.find((k) => k.startsWith('fivefold-')));
    return (await c.keys()).map((r) => new URL(r.url).pathname);
  });
  for (const f of ['/', '/app.js', '/worker.js', '/pkg/fivefold_web_bg.wasm', '/workshop/fivefold_web_bg.wasm', '/manifest.webmanifest', '/icon-512.png']) {
    assert.ok(cached.includes(f), `${f} is cached`);
  }

  await ctx.setOffline(true);
  const served = env.server.requests.length;
  await page.reload();
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  const s = await solve(page, BOARD, CLUB.puzzles[0].solution.line);
  assert.equal(s.outcome, 'clean');
  // Drill's worker starts from the cache too.
  await page.click('[data-go="drill"]');
  await page.waitForSelector('#drill-board[data-mode="puzzle"]', { timeout: 60000 });
  assert.equal(env.server.requests.length, served, 'nothing was fetched from the server while offline');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a first visit plays a puzzle on the page module alone; Coach and the worker load the workshop module', async () => {
  // Service workers blocked: only what the page itself asks for is counted (the service
  // worker fills the offline cache afterwards, in the background).
  const ctx = await env.browser.newContext({ viewport: { width: 390, height: 844 }, serviceWorkers: 'block' });
  const page = await ctx.newPage();
  const paths = [];
  ctx.on('request', (r) => paths.push(new URL(r.url()).pathname));
  await page.goto(env.server.url);
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  const s = await solve(page, BOARD, CLUB.puzzles[0].solution.line);
  assert.equal(s.outcome, 'clean');
  assert.ok(paths.includes('/pkg/fivefold_web_bg.wasm'), 'the page module was loaded');
  assert.ok(!paths.some((p) => p.startsWith('/workshop/') || p.startsWith('/scan/')),
    `nothing but the page module was loaded: ${paths.join(' ')}`);
  await goTo(page, 'coach');
  await page.waitForSelector('#coach-list:not([hidden])');
  assert.ok(paths.includes('/workshop/fivefold_web_bg.wasm'), 'Coach loaded the workshop module');
  await ctx.close();
});

test('the single-file build plays a puzzle from a file:// URL', async () => {
  const file = join(DIST, 'fivefold.html');
  const html = readFileSync(file, 'utf8');
  const csp = /http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(html)[1];
  assert.match(csp, /script-src 'sha256-[A-Za-z0-9+/=]+' 'wasm-unsafe-eval'/);
  assert.match(csp, /worker-src blob:/);
  assert.doesNotMatch(csp, /unsafe-inline|'self'|https?:/);
  assert.doesNotMatch(html, /<script[^>]*\bsrc=|<link[^>]*rel="(stylesheet|manifest)"/, 'nothing is loaded from other files');

  const { page, context: ctx, errors } = await context(env.browser);
  await page.goto(pathToFileURL(file).href);
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  const s = await solve(page, BOARD, CLUB.puzzles[0].solution.line);
  assert.equal(s.outcome, 'clean');
  // Progress is kept on file:// too.
  await page.reload();
  await ready(page);
  assert.equal((await boardState(page, BOARD)).state, 'solved');
  // The screens the served page loads on first opening are in the file: Revisit lists the
  // missed puzzles (none), Progress counts the day just played.
  await goTo(page, 'revisit');
  assert.match(await page.textContent('#revisit-lead'), /Nothing to revisit/);
  await goTo(page, 'progress');
  assert.match(await page.textContent('#progress'), /Current streak: 1 day/);
  // The worker runs from a blob: URL.
  await page.click('[data-go="drill"]');
  await page.waitForSelector('#drill-board[data-mode="puzzle"]', { timeout: 60000 });
  await page.click('[data-go="study"]');
  await page.fill('#study-moves', 'h8 a1 i8 a3 j8 a5');
  await page.click('#study-setup');
  await page.click('[data-ask="vcf"]');
  await page.waitForFunction(() => document.getElementById('study-answer').textContent.includes('wins with fours'));
  assert.deepEqual(errors, []);
  await ctx.close();
});
