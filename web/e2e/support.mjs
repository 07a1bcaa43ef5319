// Helpers for the end-to-end tests: a static server over web/dist, a headless Chromium, and
// the board's geometry as the page exposes it on the canvas.

import { createServer } from 'node:http';
import { readFile, stat } from 'node:fs/promises';
import { extname, join, normalize, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';

export const DIST = fileURLToPath(new URL('../dist/', import.meta.url));

const TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.wasm': 'application/wasm',
  '.json': 'application/json',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
};

/** Serves `root` on 127.0.0.1 at a free port. Resolves to { url, close }. */
export async function serve(root = DIST) {
  await stat(join(root, 'index.html')).catch(() => {
    throw new Error(`${root} has no index.html: build the app first (web/tools/test.sh does)`);
  });
  const server = createServer(async (req, res) => {
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
    close: () => new Promise((ok) => server.close(ok)),
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

export function launch() {
  return chromium.launch({
    executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_ARGS,
  });
}

/**
 * Opens the app in a fresh context. Returns { page, errors }, where errors collects uncaught
 * page errors and console errors so that a test can assert there were none.
 */
export async function open(browser, url, { dpr = 1, width = 1000, height = 800 } = {}) {
  const context = await browser.newContext({
    deviceScaleFactor: dpr,
    viewport: { width, height },
  });
  const page = await context.newPage();
  const errors = [];
  page.on('pageerror', (e) => errors.push(`page error: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console error: ${m.text()}`);
  });
  await page.goto(url);
  await page.waitForSelector('html[data-ready="true"]', { timeout: 15000 });
  return { page, context, errors };
}

/** The grid geometry written on the canvas by the Rust side, in CSS pixels. */
export async function geometry(page) {
  return page.$eval('#board', (c) => {
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

/** Clicks the canvas at a point. */
export async function tap(page, name) {
  const g = await geometry(page);
  const { x, y } = at(g, name);
  await page.mouse.click(x, y);
}

/**
 * The colour inside the stone at `name`, away from the grid lines and markers: 0.3 step right
 * of and 0.2 step below the centre. Read from the canvas's backing store.
 */
export async function colourAt(page, name) {
  const g = await geometry(page);
  const { x, y } = at(g, name, 0.3, 0.2);
  const bx = Math.floor(((x - g.left) * g.backingWidth) / g.width);
  const by = Math.floor(((y - g.top) * g.backingHeight) / g.height);
  return page.$eval(
    '#board',
    (c, [px, py]) => Array.from(c.getContext('2d').getImageData(px, py, 1, 1).data.slice(0, 3)),
    [bx, by],
  );
}

export const brightness = ([r, g, b]) => (r + g + b) / 3;

/** The lines of the aria-live log. */
export function logLines(page) {
  return page.$$eval('#log li', (items) => items.map((li) => li.textContent));
}
