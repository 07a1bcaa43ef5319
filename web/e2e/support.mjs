// Helpers for the end-to-end tests: a static server over web/dist, a headless Chromium, the
// starter library's sets (read from puzzles/), and the boards' geometry as the page writes it
// on each canvas (data-step, data-x0, data-y0, in CSS pixels from the canvas's corner).

import { after, before } from 'node:test';
import { createServer } from 'node:http';
import { mkdirSync, readFileSync } from 'node:fs';
import { readFile, stat } from 'node:fs/promises';
import { extname, join, normalize, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';

export const DIST = fileURLToPath(new URL('../dist/', import.meta.url));
export const PUZZLES = fileURLToPath(new URL('../../puzzles/', import.meta.url));
export const ARTEFACTS = fileURLToPath(new URL('../artefacts/', import.meta.url));

const TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.wasm': 'application/wasm',
  '.json': 'application/json',
  '.webmanifest': 'application/manifest+json',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
};

/** Serves `root` on 127.0.0.1 at a free port. Resolves to { url, close, requests }. */
export async function serve(root = DIST) {
  await stat(join(root, 'index.html')).catch(() => {
    throw new Error(`${root} has no index.html: build the app first (web/tools/test.sh does)`);
  });
  const requests = [];
  const server = createServer(async (req, res) => {
    requests.push(req.url);
    try {
      const path = decodeURIComponent(new URL(req.url, 'http://x').pathname);
      const file = normalize(join(root, path.endsWith('/') ? `${path}index.html` : path));
      if (!file.startsWith(normalize(root + sep)) && file !== normalize(root)) {
        res.writeHead(403).end();
        return;
      }
      const body = await readFile(file);
      res.writeHead(200, {
        'content-type': TYPES[extname(file)] ?? 'application/octet-stream',
        'cache-control': 'no-store',
      });
      res.end(body);
    } catch {
      res.writeHead(404, { 'content-type': 'text/plain' }).end('not found');
    }
  });
  await new Promise((ok, fail) => {
    server.once('error', fail);
    server.listen(0, '127.0.0.1', ok);
  });
  const { port } = server.address();
  return {
    url: `http://127.0.0.1:${port}/`,
    requests,
    close: () => new Promise((ok) => {
      server.closeAllConnections?.();
      server.close(ok);
    }),
  };
}

export const CHROMIUM_ARGS = [
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** A headless Chromium; `args` are added to the usual flags (a fake camera, say). */
export function launch({ args = [] } = {}) {
  return chromium.launch({
    executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: [...CHROMIUM_ARGS, ...args],
  });
}

// Registers the file's before/after hooks: one static server over web/dist and one browser
// (launched with the extra `args`, if any), shared by the file's tests. Returns an object
// whose `server` and `browser` are set once the hooks have run.
export function useBrowser(root = DIST, { args = [] } = {}) {
  const env = {};
  before(async () => {
    env.server = await serve(root);
    env.browser = await launch({ args });
  });
  after(async () => {
    await env.browser?.close();
    await env.server?.close();
  });
  return env;
}

export const PHONE = { width: 390, height: 844, dpr: 3, touch: true };
export const DESKTOP = { width: 1280, height: 800, dpr: 1, touch: false };

/** A fresh context and page, with uncaught errors and console errors collected. */
export async function context(browser, { dpr = 1, width = 1280, height = 800, touch = false, serviceWorkers = 'allow' } = {}) {
  const ctx = await browser.newContext({
    serviceWorkers,
    deviceScaleFactor: dpr,
    viewport: { width, height },
    hasTouch: touch,
    isMobile: touch,
    acceptDownloads: true,
  });
  const page = await ctx.newPage();
  const errors = [];
  page.on('pageerror', (e) => errors.push(`page error: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console error: ${m.text()}`);
  });
  return { page, context: ctx, errors };
}

/** Waits until the app has started. */
export async function ready(page) {
  await page.waitForSelector('html[data-ready="true"]', { timeout: 20000 });
}

/** Opens the app in a fresh context. Returns { page, context, errors }. */
export async function open(browser, url, options = {}) {
  const c = await context(browser, options);
  await c.page.goto(url);
  await ready(c.page);
  return c;
}

/** The result code on the summary, once written: the code writer is loaded on first use, and
 * until then the summary says it is writing the code. */
export async function resultCode(page) {
  await page.waitForFunction(() => /^[0-9A-Z]{4}-|^No code/.test(document.getElementById('result-code').textContent));
  return page.textContent('#result-code');
}

/** A starter-library set as shipped (puzzles/<stem>.json). */
export function librarySet(stem) {
  return JSON.parse(readFileSync(join(PUZZLES, `${stem}.json`), 'utf8'));
}

/** Adds a starter-library set to Tonight from the library picker, and waits for its board. */
export async function addFromLibrary(page, title) {
  await page.click('[data-go="tonight"]');
  if (!(await page.isVisible('#tonight-list'))) await page.click('#tonight-back');
  const lib = page.locator('#library');
  if (!(await lib.evaluate((d) => d.open))) await page.click('#library > summary');
  await page.locator('#library-sets li', { hasText: title }).getByRole('button').click();
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]');
}

/** The grid geometry written on a canvas by the Rust side, in CSS pixels. */
export async function geometry(page, board) {
  return page.$eval(`#${board}`, (c) => {
    const r = c.getBoundingClientRect();
    return {
      left: r.left,
      top: r.top,
      width: r.width,
      height: r.height,
      backingWidth: c.width,
      backingHeight: c.height,
      size: Number(c.dataset.size),
      step: Number(c.dataset.step),
      x0: Number(c.dataset.x0),
      y0: Number(c.dataset.y0),
    };
  });
}

/** `h8` -> [column, row], 0-based, row 0 at the bottom. */
export function coords(name) {
  const m = /^([a-s])(\d{1,2})$/.exec(name);
  if (!m) throw new Error(`not a point: ${name}`);
  return [m[1].charCodeAt(0) - 97, Number(m[2]) - 1];
}

/** Viewport coordinates of a point's centre, plus (dx, dy) grid steps. */
export function at(g, name, dx = 0, dy = 0) {
  const [col, row] = coords(name);
  return {
    x: g.left + g.x0 + (col + dx) * g.step,
    y: g.top + g.y0 - (row - dy) * g.step,
  };
}

/** Clicks (or, with `touch`, taps) a board at a point. */
export async function tap(page, board, name, { touch = false } = {}) {
  const g = await geometry(page, board);
  const { x, y } = at(g, name);
  if (touch) await page.touchscreen.tap(x, y);
  else await page.mouse.click(x, y);
}

/** A board's dataset (mode, state, pending, moves, outcome, hints, ...). */
export function boardState(page, board) {
  return page.$eval(`#${board}`, (c) => ({ ...c.dataset }));
}

const moveCount = (s) => (s ? s.split(' ').length : 0);

/** Waits until a board shows at least `n` moves with nothing left to reveal. */
export async function settled(page, board, n) {
  await page.waitForFunction(([id, want]) => {
    const d = document.getElementById(id).dataset;
    const have = d.moves ? d.moves.split(' ').length : 0;
    return have >= want && d.pending === '0';
  }, [board, n]);
  return boardState(page, board);
}

/**
 * Plays a win puzzle's main line: clicks (or double-taps) the player's moves, each after the
 * app's reply has been revealed. Returns the board's final state.
 */
export async function solve(page, board, line, { touch = false, confirm = false } = {}) {
  const start = moveCount((await boardState(page, board)).moves);
  for (let i = 0; i < line.length; i += 2) {
    await tap(page, board, line[i], { touch });
    if (confirm) await tap(page, board, line[i], { touch });
    await settled(page, board, start + Math.min(i + 2, line.length));
  }
  return page.waitForSelector(`#${board}[data-state="solved"]`).then(() => boardState(page, board));
}

/**
 * The colour inside the stone at `name`, away from the grid lines and markers: 0.3 step right
 * of and 0.2 step below the centre. Read from the canvas's backing store, once the stone
 * animation has finished.
 */
export async function colourAt(page, board, name) {
  await page.waitForSelector(`#${board}:not([data-animating])`);
  const g = await geometry(page, board);
  const { x, y } = at(g, name, 0.3, 0.2);
  const bx = Math.floor(((x - g.left) * g.backingWidth) / g.width);
  const by = Math.floor(((y - g.top) * g.backingHeight) / g.height);
  return page.$eval(
    `#${board}`,
    (c, [px, py]) => Array.from(c.getContext('2d').getImageData(px, py, 1, 1).data.slice(0, 3)),
    [bx, by],
  );
}

export const brightness = ([r, g, b]) => (r + g + b) / 3;
export const isBlack = (c) => brightness(c) < 40;
export const isWhite = (c) => brightness(c) > 230;

/** The lines of a board's move log. */
export function logLines(page, log) {
  return page.$$eval(`#${log} li`, (items) => items.map((li) => li.textContent));
}

/** The text of every banner. */
export function banners(page) {
  return page.$$eval('#banners .banner p', (ps) => ps.map((p) => p.textContent));
}

/** An empty point of a puzzle that is not one of its correct first moves. */
export function wrongMove(puzzle) {
  const taken = new Set([...puzzle.black, ...puzzle.white, ...puzzle.solution.first_moves]);
  for (let row = 1; row <= puzzle.size; row++) {
    for (let col = 0; col < puzzle.size; col++) {
      const p = `${String.fromCharCode(97 + col)}${row}`;
      if (!taken.has(p)) return p;
    }
  }
  throw new Error('no empty point');
}

/** Saves a screenshot as a test artefact (web/artefacts/, not committed). */
export async function artefact(page, name, options = {}) {
  mkdirSync(ARTEFACTS, { recursive: true });
  await page.screenshot({ path: join(ARTEFACTS, `${name}.png`), ...options });
}

/** Opens a screen: from the rail on a wide screen, through More on a phone where the bar does
 * not hold it; waits until it is shown (Coach, My games, Revisit and Progress are shown once
 * their script has loaded, on first opening). */
export async function goTo(page, screen) {
  const direct = page.locator(`.rail [data-go="${screen}"]`);
  if (await direct.isVisible()) await direct.click();
  else {
    await page.click('#nav-more');
    await page.click(`#more [data-go="${screen}"]`);
  }
  await page.waitForSelector(`#${screen}:not([hidden])`);
}

/** Opens the app in a fresh context on a device that says it has `cores` cores (Coach makes
 * its puzzles on one worker per core). Returns { page, context, errors }. */
export async function openOnCores(browser, url, cores) {
  const c = await context(browser);
  await c.context.addInitScript((n) => {
    Object.defineProperty(Navigator.prototype, 'hardwareConcurrency', { get: () => n });
  }, cores);
  await c.page.goto(url);
  await ready(c.page);
  return c;
}

/** Makes a new set in Coach: one theme (or `themes`, taken in turn), `count` puzzles, a fixed
 * seed (and `rule` and `band`, if given); returns the set as Coach keeps it and the milliseconds from
 * Make to the last puzzle. With `keep`, the set open now is remade instead; with `wait` false,
 * returns as soon as Make is pressed. */
export async function makeCoachSet(page, { title, theme, themes = [theme], count, seed, rule, band, keep = false, wait = true, timeout = 120000 }) {
  if (!keep) {
    await goTo(page, 'coach');
    if (await page.isVisible('#coach-back')) await page.click('#coach-back');
    await page.click('#coach-new');
  }
  await page.fill('#coach-name', title);
  if (rule) await page.selectOption('#coach-rule', rule);
  if (band) await page.selectOption('#coach-band', band);
  await page.fill('#coach-count', String(count));
  await page.press('#coach-count', 'Tab');
  await page.fill('#coach-seed', String(seed));
  await page.press('#coach-seed', 'Tab');
  for (const t of themes) await page.check(`#coach-theme-list input[value="${t}"]`);
  for (const other of await page.$$eval('#coach-theme-list input:checked', (l) => l.map((i) => i.value))) {
    if (!themes.includes(other)) await page.uncheck(`#coach-theme-list input[value="${other}"]`);
  }
  const started = Date.now();
  await page.click('#coach-make-go');
  if (!wait) return null;
  // Making ends with the set made, or with a banner saying why not.
  await page.waitForSelector('#coach:not([data-making])', { timeout });
  const ms = Date.now() - started;
  const made = await page.getAttribute('#coach', 'data-made');
  if (made !== String(count)) {
    throw new Error(`Coach made ${made} of ${count} puzzles: ${await page.textContent('#banners')}`);
  }
  const set = await page.evaluate(() => {
    const d = JSON.parse(localStorage.getItem('fivefold.coach')).data;
    return d.sets.find((s) => s.id === d.open);
  });
  return { set, ms };
}

/** Opens the settings: from the rail on a wide screen, through More on a phone. */
export async function openSettings(page) {
  if (await page.isVisible('#open-settings')) await page.click('#open-settings');
  else {
    await page.click('#nav-more');
    await page.click('#more-settings');
  }
  await page.waitForSelector('#settings[open]');
}

/**
 * An empty point that makes a four for the side to move of a puzzle (four of its stones and
 * that point in a window of five, the fifth point empty, no opponent stone) and is not one
 * of its correct first moves: a wrong move whose refutation is the forced block.
 */
export function wrongFour(puzzle) {
  const mine = new Set(puzzle.to_move === 'black' ? puzzle.black : puzzle.white);
  const theirs = new Set(puzzle.to_move === 'black' ? puzzle.white : puzzle.black);
  const answers = new Set(puzzle.solution.first_moves);
  const name = (c, r) => `${String.fromCharCode(97 + c)}${r + 1}`;
  const n = puzzle.size;
  for (let row = 0; row < n; row++) {
    for (let col = 0; col < n; col++) {
      const p = name(col, row);
      if (mine.has(p) || theirs.has(p) || answers.has(p)) continue;
      for (const [dx, dy] of [[1, 0], [0, 1], [1, 1], [1, -1]]) {
        for (let start = -4; start <= 0; start++) {
          let own = 0;
          let empty = 0;
          let ok = true;
          for (let k = start; k < start + 5; k++) {
            const c = col + k * dx;
            const r = row + k * dy;
            if (c < 0 || r < 0 || c >= n || r >= n) { ok = false; break; }
            const q = name(c, r);
            if (k === 0 || mine.has(q)) own++;
            else if (theirs.has(q)) { ok = false; break; }
            else empty++;
          }
          if (ok && own === 4 && empty === 1) return p;
        }
      }
    }
  }
  throw new Error('no four that is not an answer');
}

/** A YUV4MPEG2 video (4:2:0, full range): the QR modules, `scale` pixels each, centred on a
 * light grey frame, repeated for a second at 10 frames a second. */
export function y4m({ size, quiet, dark }, { width = 640, height = 480, scale = 8 } = {}) {
  const y = Buffer.alloc(width * height, 200);
  const side = (size + 2 * quiet) * scale;
  const left = Math.floor((width - side) / 2);
  const top = Math.floor((height - side) / 2);
  for (let py = 0; py < side; py++) {
    for (let px = 0; px < side; px++) {
      const mx = Math.floor(px / scale) - quiet;
      const my = Math.floor(py / scale) - quiet;
      const on = mx >= 0 && my >= 0 && mx < size && my < size && dark[my * size + mx];
      y[(top + py) * width + left + px] = on ? 20 : 235;
    }
  }
  const chroma = Buffer.alloc((width / 2) * (height / 2) * 2, 128);
  const frame = Buffer.concat([Buffer.from('FRAME\n'), y, chroma]);
  return Buffer.concat([Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`), ...Array(10).fill(frame)]);
}
