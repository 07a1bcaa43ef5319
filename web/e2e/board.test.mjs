// End-to-end: the built app (web/dist) in headless Chromium, driven by clicks like a player.

import { after, before, test } from 'node:test';
import assert from 'node:assert/strict';
import {
  brightness,
  colourAt,
  geometry,
  launch,
  logLines,
  open,
  serve,
  tap,
} from './support.mjs';

// The board colour of the renderer (web/src/render.rs, BOARD = #a9c9bf).
const BOARD = [0xa9, 0xc9, 0xbf];

let server;
let browser;

before(async () => {
  server = await serve();
  browser = await launch();
});

after(async () => {
  await browser?.close();
  await server?.close();
});

const isBlack = (c) => brightness(c) < 40;
const isWhite = (c) => brightness(c) > 230;

test('the page serves the app with the right types', async () => {
  for (const [path, type] of [
    ['', 'text/html'],
    ['app.js', 'text/javascript'],
    ['style.css', 'text/css'],
    ['icon.svg', 'image/svg+xml'],
    ['pkg/fivefold_web.js', 'text/javascript'],
    ['pkg/fivefold_web_bg.wasm', 'application/wasm'],
  ]) {
    const res = await fetch(server.url + path);
    assert.equal(res.status, 200, path);
    const got = res.headers.get('content-type');
    assert.ok(got.startsWith(type), `${path} is served as ${got}`);
  }
});

test('an empty board is drawn crisply at device pixel ratio 2', async () => {
  const { page, context, errors } = await open(browser, server.url, { dpr: 2 });
  const g = await geometry(page);
  assert.equal(g.size, 15);
  assert.ok(g.width > 200, `canvas is ${g.width} CSS px wide`);
  assert.equal(g.backingWidth, Math.round(g.width * 2));
  assert.equal(g.backingHeight, Math.round(g.height * 2));
  assert.ok(g.step > 10);
  for (const p of ['a1', 'h8', 'o15', 'a15', 'o1']) {
    assert.deepEqual(await colourAt(page, p), BOARD, `${p} should be empty`);
  }
  assert.match(await page.textContent('#status'), /Black to move \(move 1\)/);
  assert.equal(await page.getAttribute('#log', 'aria-live'), 'polite');
  assert.deepEqual(errors, []);
  await context.close();
});

test('two clicks place a black and a white stone, and both moves are announced', async () => {
  const { page, context, errors } = await open(browser, server.url, { dpr: 2 });
  await tap(page, 'h8');
  await tap(page, 'i9');
  const black = await colourAt(page, 'h8');
  const white = await colourAt(page, 'i9');
  assert.ok(isBlack(black), `h8 should hold a black stone, reads ${black}`);
  assert.ok(isWhite(white), `i9 should hold a white stone, reads ${white}`);
  assert.deepEqual(await colourAt(page, 'j10'), BOARD);
  assert.deepEqual(await logLines(page), ['Black h8', 'White i9']);
  assert.equal(await page.getAttribute('#board', 'data-moves'), 'h8 i9');
  assert.match(await page.textContent('#status'), /Black to move \(move 3\)/);

  // A click on a taken point is refused and changes nothing.
  await tap(page, 'h8');
  assert.equal((await logLines(page)).at(-1), 'Not played: h8 is already taken.');
  assert.equal(await page.textContent('#note'), 'Not played: h8 is already taken.');
  assert.equal(await page.getAttribute('#board', 'data-moves'), 'h8 i9');
  assert.ok(isBlack(await colourAt(page, 'h8')));

  // Undo takes back the white stone.
  await page.click('#undo');
  assert.equal((await logLines(page)).at(-1), 'Took back White i9.');
  assert.deepEqual(await colourAt(page, 'i9'), BOARD);
  assert.equal(await page.getAttribute('#board', 'data-moves'), 'h8');
  assert.deepEqual(errors, []);
  await context.close();
});

test('renju refuses a forbidden point with a message in the live region', async () => {
  const { page, context, errors } = await open(browser, server.url, { dpr: 1 });
  await page.selectOption('#rule', 'renju');
  assert.equal((await logLines(page)).at(-1), 'New game under renju rules. Black to move.');
  assert.equal(await page.getAttribute('#board', 'data-rule'), 'renju');
  const setup = ['i8', 'a1', 'j8', 'a3', 'h9', 'a5', 'h10', 'a7'];
  for (const p of setup) await tap(page, p);
  assert.equal(await page.getAttribute('#board', 'data-moves'), setup.join(' '));
  await tap(page, 'h8');
  const message = 'Not played: h8 is forbidden for black: it makes a double three.';
  const lines = await logLines(page);
  assert.equal(lines.at(-1), message);
  assert.equal(lines.filter((l) => /^(Black|White) [a-o]\d+$/.test(l)).length, 8);
  assert.equal(await page.textContent('#note'), message);
  assert.equal(await page.getAttribute('#board', 'data-moves'), setup.join(' '));
  assert.ok(!isBlack(await colourAt(page, 'h8')), 'no stone may appear on h8');
  assert.match(await page.textContent('#status'), /Renju\. Black to move \(move 9\)/);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a five wins, the win is announced, and a new game clears the board', async () => {
  const { page, context, errors } = await open(browser, server.url);
  await page.selectOption('#rule', 'freestyle');
  for (const p of ['h8', 'a1', 'i8', 'a2', 'j8', 'a3', 'k8', 'a4', 'l8']) await tap(page, p);
  const lines = await logLines(page);
  assert.deepEqual(lines.slice(-2), ['Black l8', 'Black wins with five in a row.']);
  assert.equal(await page.textContent('#note'), 'Black wins with five in a row.');
  assert.match(await page.textContent('#status'), /Black has won/);
  await tap(page, 'm8');
  assert.equal((await logLines(page)).at(-1), 'Not played: the game is over.');
  await page.click('#new');
  assert.equal(await page.getAttribute('#board', 'data-moves'), '');
  for (const p of ['h8', 'l8', 'a1']) assert.deepEqual(await colourAt(page, p), BOARD);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a move can be typed, and bad input is refused as text', async () => {
  const { page, context, errors } = await open(browser, server.url);
  await page.fill('#point', 'h8');
  await page.press('#point', 'Enter');
  assert.equal((await logLines(page)).at(-1), 'Black h8');
  await page.fill('#point', '<b>x</b>');
  await page.press('#point', 'Enter');
  const last = (await logLines(page)).at(-1);
  assert.match(last, /^Not played: '<b>x<\/b>' is not a coordinate/);
  assert.equal(await page.$$eval('#log b, #note b', (n) => n.length), 0);
  assert.deepEqual(errors, []);
  await context.close();
});

test('the board is redrawn at the new size when the window resizes', async () => {
  const { page, context, errors } = await open(browser, server.url, { dpr: 2, width: 1000 });
  await tap(page, 'h8');
  const before = await geometry(page);
  await page.setViewportSize({ width: 420, height: 800 });
  await page.waitForFunction(
    (w) => document.getElementById('board').width !== w,
    before.backingWidth,
  );
  const g = await geometry(page);
  assert.ok(g.width < before.width, `${g.width} should be narrower than ${before.width}`);
  assert.equal(g.backingWidth, Math.round(g.width * 2));
  assert.ok(isBlack(await colourAt(page, 'h8')), 'h8 is still drawn after the resize');
  await tap(page, 'g7');
  assert.equal(await page.getAttribute('#board', 'data-moves'), 'h8 g7');
  assert.deepEqual(errors, []);
  await context.close();
});
