// End-to-end: the result code travels as a QR code. The Tonight summary draws it on a canvas
// that Fivefold's own QR reader reads back, and offers it to the device's share sheet; the
// camera scanner (web/scan.js) reads a student's code from Chromium's fake camera, fed with a
// video made here from that code's QR modules, and says why when there is no camera.

import { after, test } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  addFromLibrary,
  artefact,
  context,
  launch,
  librarySet,
  ready,
  solve,
  useBrowser,
  y4m,
  resultCode,
  settled,
  tap,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');
const BOARD = 'tonight-board';
const PHONE_360 = { width: 360, height: 740, dpr: 2, touch: true };

const env = useBrowser();
const tmp = mkdtempSync(join(tmpdir(), 'fivefold-scan-'));
after(() => rmSync(tmp, { recursive: true, force: true }));

/** A stub share sheet: records what it was given. */
function stubShare() {
  window.__shared = [];
  Object.defineProperty(Navigator.prototype, 'share', {
    configurable: true,
    value: async (data) => {
      window.__shared.push(data);
    },
  });
  Object.defineProperty(Navigator.prototype, 'canShare', { configurable: true, value: () => true });
}

/** No share sheet, as in most desktop browsers. */
function noShare() {
  delete Navigator.prototype.share;
  delete Navigator.prototype.canShare;
}

/** The app in a fresh context with `init` run before the page's scripts. */
async function openWith(browser, url, options, init) {
  const c = await context(browser, options);
  if (init) await c.page.addInitScript(init);
  c.requested = [];
  c.page.on('request', (r) => c.requested.push(new URL(r.url()).pathname));
  await c.page.goto(url);
  await ready(c.page);
  return c;
}

/** From the set's last puzzle, Finish; with untried puzzles, the page asks first. */
async function finish(page) {
  await page.click(`#tonight-marks li:nth-child(${CLUB.puzzles.length}) button`);
  await page.click('#tonight-play [data-act="next"]');
}

/** Reads the QR code on a canvas of the page with Fivefold's wasm QR reader (web/scan). */
function readCanvas(page, selector) {
  return page.evaluate(async (sel) => {
    const c = document.querySelector(sel);
    const image = c.getContext('2d').getImageData(0, 0, c.width, c.height);
    const { decodeImage } = await import(new URL('scan.js', location.href).href);
    return decodeImage(image);
  }, selector);
}

test('finishing with untried puzzles asks first; the summary shows the code as a QR code that reads back, and sends it', async () => {
  const { page, context: ctx, errors, requested } = await openWith(env.browser, env.server.url, PHONE_360, stubShare);
  await addFromLibrary(page, CLUB.title);
  await solve(page, BOARD, CLUB.puzzles[0].solution.line, { touch: true, confirm: true });

  // Finish asks, naming the untried puzzles; the player can go to the first of them.
  await finish(page);
  assert.ok(await page.isVisible('#tonight-finish'));
  assert.ok(await page.isHidden('#tonight-summary'));
  const untried = CLUB.puzzles.length - 1;
  const ask = await page.textContent('#tonight-finish-text');
  assert.match(ask, new RegExp(`^${untried} puzzles are not tried yet: 2, 3`));
  assert.match(ask, /Finish the set anyway\?/);
  assert.equal(await page.textContent('#finish-go'), 'Go to puzzle 2');
  assert.equal(await page.evaluate(() => document.activeElement.id), 'finish-anyway');
  await artefact(page, 'tonight-finish-phone');
  await page.click('#finish-go');
  assert.equal(await page.textContent('#tonight-count'), `Puzzle 2 of ${CLUB.puzzles.length}`);
  assert.ok(await page.isHidden('#tonight-finish'), 'the question goes with the puzzle');
  // Puzzle 2 begun (its first move, and the reply) and left: the question names it too, and
  // says it counts as failed, as the summary then does.
  await tap(page, BOARD, CLUB.puzzles[1].solution.line[0], { touch: true });
  await tap(page, BOARD, CLUB.puzzles[1].solution.line[0], { touch: true });
  await settled(page, BOARD, 2);
  await finish(page);
  const left = Array.from({ length: untried - 1 }, (_, i) => String(i + 3));
  const listed = new Intl.ListFormat('en', { type: 'conjunction' })
    .format(left.length > 8 ? [...left.slice(0, 7), `${left.length - 7} more`] : left);
  assert.equal(await page.textContent('#tonight-finish-text'),
    `${untried - 1} puzzles are not tried yet: ${listed}. Puzzle 2 is begun and not finished: it counts as failed. Finish the set anyway?`);
  assert.equal(await page.textContent('#finish-go'), 'Go to puzzle 2');
  await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  assert.equal(await page.textContent('#tonight-summary .count-failed dd'), '1');
  assert.equal(await page.textContent('#tonight-summary .count-untried dd'), String(untried - 1));

  await page.fill('#student-name', 'Mira Okafor');
  const code = await resultCode(page);
  assert.match(code, /^[0-9A-Z]{4}(-[0-9A-Z]{1,4})+$/);
  // What the student's page fetched, before this test loads the reader itself.
  const fetched = [...requested];
  assert.ok(fetched.includes('/tonight.js') && !fetched.some((p) => p.startsWith('/scan')), `the page loaded ${fetched}`);

  // The QR code: drawn, large enough for a camera at arm's length, and it reads back as the
  // code shown; a new name gives a new picture.
  assert.ok(await page.isVisible('#result-qr'));
  const box = await page.locator('#result-qr').boundingBox();
  const qr = await page.$eval('#result-qr', (c) => ({ modules: Number(c.dataset.modules), version: Number(c.dataset.version) }));
  assert.equal(qr.modules, 17 + 4 * qr.version);
  assert.ok(box.width >= 200 && box.width <= 360 && Math.abs(box.width - box.height) < 1, `QR box ${box.width}x${box.height}`);
  assert.ok(box.width / (qr.modules + 8) >= 4, 'a module is at least 4 CSS pixels');
  assert.ok(box.x >= 0 && box.x + box.width <= PHONE_360.width, 'the QR code fits the phone');
  assert.equal(await readCanvas(page, '#result-qr'), code);
  await page.fill('#student-name', 'Tomas Reyne');
  const other = await resultCode(page);
  assert.notEqual(other, code);
  assert.equal(await readCanvas(page, '#result-qr'), other);
  await page.fill('#student-name', 'Mira Okafor');
  await page.waitForFunction((c) => document.getElementById('result-code').textContent === c, code);

  // The share sheet gets the code itself.
  assert.ok(await page.isVisible('#share-code'));
  await page.click('#share-code');
  assert.deepEqual(await page.evaluate(() => window.__shared), [{ title: 'Fivefold result code', text: code }]);

  await page.locator('#tonight-summary').scrollIntoViewIfNeeded();
  await artefact(page, 'summary-qr-phone', { fullPage: true });
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('without a share sheet the send button is hidden and copying stays', async () => {
  const { page, context: ctx, errors, requested } = await openWith(env.browser, env.server.url, {}, noShare);
  await addFromLibrary(page, CLUB.title);
  await finish(page);
  await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  const fetched = [...requested];
  assert.ok(await page.isHidden('#share-code'));
  assert.ok(await page.isVisible('#copy-code'));
  assert.ok(await page.isVisible('#result-qr'));
  const shown = await resultCode(page);
  assert.equal(await readCanvas(page, '#result-qr'), shown);
  await artefact(page, 'summary-qr-desktop');
  assert.ok(fetched.length > 5 && !fetched.some((p) => p.startsWith('/scan')), `the page loaded ${fetched}`);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('after a first visit the scanner\'s files come from the cache: offline, the QR code still reads', async () => {
  const { page, context: ctx, errors } = await openWith(env.browser, env.server.url, {});
  await page.evaluate(() => navigator.serviceWorker.ready);
  await page.reload();
  await ready(page);
  const cached = await page.evaluate(async () => {
    const keys = await caches.keys();
    const c = await caches.open(keys.find((k) => k.startsWith('fivefold-')));
    return (await c.keys()).map((r) => new URL(r.url).pathname);
  });
  for (const f of ['/scan.js', '/scan/fivefold_scan.js', '/scan/fivefold_scan_bg.wasm']) assert.ok(cached.includes(f), `${f} is cached`);

  await ctx.setOffline(true);
  const served = env.server.requests.length;
  await page.reload();
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  await finish(page);
  await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  const shown = await resultCode(page);
  // Loaded the way the app loads it (platform.js), from the cache.
  const read = await page.evaluate(async () => {
    const { loadScanner } = await import(new URL('platform.js', location.href).href);
    const { decodeImage } = await loadScanner();
    const c = document.getElementById('result-qr');
    return decodeImage(c.getContext('2d').getImageData(0, 0, c.width, c.height));
  });
  assert.equal(read, shown);
  assert.equal(env.server.requests.length, served, 'nothing was fetched from the server while offline');
  assert.deepEqual(errors, []);
  await ctx.close();
});

// ---- the scanner ----

/** A page that opens the scanner in `#host` and collects what it reads in `window.read`. */
const SCAN_PAGE = `<!doctype html><meta charset="utf-8"><title>Scanner</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="stylesheet" href="style.css">
<main style="padding: 1rem"><div id="host"></div></main>
<script type="module">
  import { openScanner } from './scan.js';
  window.read = [];
  window.scanner = await openScanner(document.getElementById('host'), (t) => window.read.push(t));
  window.stream = document.querySelector('.scanner video')?.srcObject ?? null;
  window.opened = true;
</script>`;

async function scanPage(browser, init, options = {}) {
  const c = await context(browser, options);
  if (init) await c.page.addInitScript(init);
  c.requested = [];
  c.page.on('request', (r) => c.requested.push(new URL(r.url()).pathname));
  await c.page.route('**/scan-test.html', (route) => route.fulfill({ contentType: 'text/html', body: SCAN_PAGE }));
  await c.page.goto(`${env.server.url}scan-test.html`);
  await c.page.waitForFunction(() => window.opened === true);
  return c;
}

test('the scanner reads a student\'s result code from the camera, once, and stop releases the camera', async () => {
  // A real result code and its QR modules, from the app's own engine.
  const app = await openWith(env.browser, env.server.url, {});
  const made = await app.page.evaluate(async () => {
    // The code writers are the workshop module's (the page loads it for the summary).
    const m = await import(new URL('workshop/fivefold_web.js', location.href).href);
    await m.default();
    const set = JSON.parse(m.librarySets()).find((x) => x.title === 'Deep fours (freestyle)');
    const results = set.puzzles.map((_, i) => ({ attempt: ['clean', 'helped', 'failed', 'untried'][i % 4], hints: i % 3, seconds: 20 + 50 * i }));
    const code = m.resultCode(JSON.stringify(set), 'Ines Halloran', results);
    const qr = m.qrMatrix(code);
    return { code, size: qr.size, quiet: qr.quiet, dark: Array.from(qr.dark) };
  });
  await app.context.close();
  assert.match(made.code, /^[0-9A-Z]{4}(-[0-9A-Z]{1,4})+$/);
  assert.equal(made.dark.length, made.size * made.size);
  const video = join(tmp, 'code.y4m');
  writeFileSync(video, y4m(made));

  const browser = await launch({
    args: ['--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream', `--use-file-for-fake-video-capture=${video}`],
  });
  try {
    const { page, errors, requested } = await scanPage(browser, null, PHONE_360);
    assert.equal(await page.evaluate(() => window.scanner.error), null);
    assert.ok(await page.isVisible('.scanner video'));
    await page.waitForFunction(() => window.read.length > 0, null, { timeout: 20000 });
    // The video loops: the same code seen again is not reported again.
    await page.waitForTimeout(1500);
    assert.deepEqual(await page.evaluate(() => window.read), [made.code]);
    const decoder = await page.getAttribute('.scanner', 'data-decoder');
    const native = await page.evaluate(() => typeof window.BarcodeDetector === 'function');
    if (!native) {
      assert.equal(decoder, 'wasm');
      assert.ok(requested.includes('/scan/fivefold_scan_bg.wasm'), 'the wasm reader was loaded on first use');
    }
    assert.match(await page.textContent('.scan-status'), /Codes read so far: 1\.$/);
    await artefact(page, 'scan-panel-phone');
    await page.evaluate(() => window.scanner.stop());
    assert.equal(await page.$('.scanner'), null, 'the panel is gone');
    assert.ok(await page.evaluate(() => window.stream.getTracks().every((t) => t.readyState === 'ended')), 'the camera is released');
    assert.deepEqual(errors, []);
  } finally {
    await browser.close();
  }
});

test('the scanner uses the browser\'s own QR detector where there is one, and loads no wasm', async () => {
  const browser = await launch({ args: ['--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream'] });
  try {
    const { page, errors, requested } = await scanPage(browser, () => {
      let calls = 0;
      window.BarcodeDetector = class {
        static async getSupportedFormats() { return ['qr_code', 'ean_13']; }
        constructor(o) { window.__formats = o.formats; }
        async detect() {
          calls++;
          return calls < 3 ? [] : [{ rawValue: calls < 6 ? 'AAAA-BBBB' : 'CCCC-DDDD', format: 'qr_code' }];
        }
      };
    });
    await page.waitForFunction(() => window.read.length >= 2, null, { timeout: 10000 });
    assert.deepEqual(await page.evaluate(() => window.read), ['AAAA-BBBB', 'CCCC-DDDD']);
    assert.deepEqual(await page.evaluate(() => window.__formats), ['qr_code']);
    assert.equal(await page.getAttribute('.scanner', 'data-decoder'), 'detector');
    assert.ok(!requested.some((p) => p.startsWith('/scan/')), 'no wasm reader was fetched');
    assert.match(await page.textContent('.scan-status'), /Codes read so far: 2\.$/);
    // The Stop button releases the camera too.
    await page.click('.scanner button');
    assert.equal(await page.$('.scanner'), null);
    assert.ok(await page.evaluate(() => window.stream.getTracks().every((t) => t.readyState === 'ended')));
    assert.deepEqual(errors, []);
  } finally {
    await browser.close();
  }
});

test('a refused camera and a missing camera each get a clear message', async () => {
  for (const [name, want] of [
    ['NotAllowedError', /^The camera was not allowed\. .*paste the codes instead\.$/],
    ['NotFoundError', /^No camera was found on this device\. Paste the codes instead\.$/],
  ]) {
    const { page, context: ctx, errors } = await scanPage(env.browser, `(() => {
      navigator.mediaDevices.getUserMedia = async () => { throw new DOMException('no', ${JSON.stringify(name)}); };
    })()`);
    assert.equal(await page.getAttribute('.scanner', 'data-state'), 'error');
    assert.match(await page.textContent('.scan-status'), want);
    assert.match(await page.evaluate(() => window.scanner.error), want);
    assert.equal(await page.textContent('.scanner button'), 'Close');
    await page.click('.scanner button');
    assert.equal(await page.$('.scanner'), null);
    assert.deepEqual(errors, []);
    await ctx.close();
  }
});
