// End-to-end: share links carry a set in the URL fragment; a valid link adds the set to
// Tonight and opens it, a damaged or cut-short one is refused with a message and loads
// nothing; a title made of markup is shown as text and runs nothing; set files open too.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  addFromLibrary,
  banners,
  boardState,
  context as newContext,
  librarySet,
  open,
  ready,
  settled,
  solve,
  tap,
  useBrowser,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');
const BOARD = 'tonight-board';

const env = useBrowser();

const setCount = (page) => page.$$eval('#tonight-sets li', (l) => l.length);

// A share code made by the app's own engine (the workshop module, which writes codes) for a
// set object.
function encode(page, set) {
  return page.evaluate(async (json) => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    return m.shareEncode(json);
  }, JSON.stringify(set));
}

test('a share link round-trips: Share makes it, opening it adds the set to Tonight', async () => {
  const a = await open(env.browser, env.server.url);
  await addFromLibrary(a.page, CLUB.title);
  await a.page.click('#tonight-share');
  // The link is written by the workshop module, loaded on the first Share.
  await a.page.waitForFunction(() => document.getElementById('tonight-share-link').value !== '');
  const link = await a.page.inputValue('#tonight-share-link');
  assert.ok(link.startsWith(`${env.server.url}#set=`), link);
  const code = link.slice(link.indexOf('#set=') + 5);
  // Share code version 2: QR's alphanumeric characters that survive in a URL fragment.
  assert.match(code, /^[0-9A-Z$./:-]+$/, 'QR-alphanumeric and safe in a link');
  const json = Buffer.byteLength(JSON.stringify(CLUB));
  assert.ok(code.length < json / 4, `compact: ${code.length} characters for ${json} bytes of set file`);
  // The note says what the link does (not its length: a defect found by trying the app).
  assert.equal(await a.page.textContent('#tonight-share-note'), 'Whoever opens this link gets the set on their own device.');
  assert.deepEqual(a.errors, []);
  await a.context.close();

  // A second device opens the link: the set is added, opened, and playable.
  const b = await open(env.browser, link);
  await b.page.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  assert.equal(await b.page.textContent('#tonight-set-title'), CLUB.title);
  assert.deepEqual(await banners(b.page), [`Added "${CLUB.title}" to Tonight.`]);
  assert.equal(b.page.url(), env.server.url, 'the fragment is cleared once read');
  await solve(b.page, BOARD, CLUB.puzzles[0].solution.line);
  // Opening the same link again finds the set already there.
  await b.page.goto(link);
  await ready(b.page);
  assert.match((await banners(b.page)).at(-1), /is already in Tonight: opened it\./);
  await b.page.click('#tonight-back');
  assert.equal(await setCount(b.page), 1);
  assert.equal((await b.page.$$eval('#tonight-sets .meta', (m) => m.map((x) => x.textContent)))[0],
    `${CLUB.puzzles.length} puzzles · freestyle · 1 solved`);
  assert.deepEqual(b.errors, []);
  await b.context.close();
});

test('a Share that cannot load the link writer says so; the next Share, with the network back, writes the link', async () => {
  const { page, context } = await newContext(env.browser, { serviceWorkers: 'block' });
  await page.goto(env.server.url);
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  await context.route('**/workshop/**', (r) => r.abort());
  await page.click('#tonight-share');
  await page.waitForFunction(() => document.querySelectorAll('#banners .banner').length > 0);
  assert.match((await banners(page)).join(' '), /^The link writer could not be loaded \(.*\)\. Check the connection and press Share again\.$/);
  assert.ok(await page.isHidden('#tonight-share-box'));
  await context.unroute('**/workshop/**');
  await page.click('#tonight-share');
  await page.waitForFunction(() => document.getElementById('tonight-share-link').value !== '');
  assert.match(await page.inputValue('#tonight-share-link'), /#set=[0-9A-Z$./:-]+$/);
  assert.ok(!(await banners(page)).some((b) => /could not be loaded/.test(b)), 'the failure banner goes once the link is written');
  await context.close();
});

test('a damaged or truncated link is refused with a message and loads nothing', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  const code = await encode(page, CLUB);
  const flip = (c) => (c === 'A' ? 'B' : 'A');
  const mid = Math.floor(code.length / 2);
  const damaged = code.slice(0, mid) + flip(code[mid]) + code.slice(mid + 1);
  for (const bad of [damaged, code.slice(0, code.length - 7), code.slice(0, 12)]) {
    await page.goto(`${env.server.url}#set=${bad}`);
    await ready(page);
    const b = await banners(page);
    assert.equal(b.length, 1);
    assert.match(b[0], /^This link cannot be opened: the set in this link is damaged or cut short, so nothing was loaded; ask for the link again, or for the set file$/);
    assert.equal(await page.getAttribute('#banners .banner', 'role'), 'alert');
    assert.equal(await setCount(page), 0, 'nothing was loaded');
    assert.ok(await page.isVisible('#tonight-list'));
  }
  await page.goto(`${env.server.url}#set=${encodeURIComponent('<not a code>')}`);
  await ready(page);
  assert.match((await banners(page))[0], /^This link cannot be opened: this is not a Fivefold share code/);
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.sets')), null);
  // A link arriving while the app is open (hashchange) is read too.
  await page.evaluate((c) => { location.hash = `set=${c}`; }, code);
  await page.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  assert.equal(await page.textContent('#tonight-set-title'), CLUB.title);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a set whose title is markup shows the title as plain text and runs no script', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  const title = '<img src=x onerror="window.__pwned=1;document.title=\'pwned\'">';
  const set = { ...CLUB, title, puzzles: CLUB.puzzles.slice(0, 2) };
  const code = await encode(page, set);
  await page.goto(`${env.server.url}#set=${code}`);
  await ready(page);
  await page.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  assert.equal(await page.textContent('#tonight-set-title'), title);
  // The set came from a link, so its answer keys are proved as it opens; every message shows
  // the title as text.
  await page.waitForFunction(() => document.querySelector('#banners [data-id="check"]'));
  assert.deepEqual(await banners(page), [
    `Added "${title}" to Tonight.`,
    `All 2 answer keys of "${title}" check out.`,
  ]);
  await page.click('#tonight-back');
  assert.equal(await page.textContent('#tonight-sets .set-title'), title);
  await page.click('#tonight-sets button.primary');
  await page.click('#tonight-play [data-act="next"]');
  await page.click('#tonight-play [data-act="next"]');
  await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  assert.equal(await page.textContent('#summary-title'), title);
  assert.equal(await page.$$eval('img', (i) => i.length), 0, 'no element was made from the title');
  assert.equal(await page.evaluate(() => window.__pwned), undefined, 'no script ran');
  assert.equal(await page.title(), 'Fivefold');
  assert.deepEqual(errors, []);
  await context.close();
});

test('a set file picked from the device opens; a bad one says what is wrong and loads nothing', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  const file = (name, body) => page.setInputFiles('#set-file', {
    name,
    mimeType: 'application/json',
    buffer: Buffer.from(body),
  });
  const broken = structuredClone(CLUB);
  broken.puzzles[3].black[0] = 'z99';
  await file('broken.json', JSON.stringify(broken));
  await page.waitForFunction(() => document.querySelector('#banners .banner'));
  const msg = (await banners(page))[0];
  assert.match(msg, /^"broken\.json" cannot be opened: .*z99.*Nothing was loaded\.$/);
  assert.match(msg, new RegExp(CLUB.puzzles[3].id), 'the message names the puzzle');
  assert.equal(await setCount(page), 0);
  // A position that already has a five has nothing to play: refused, naming the puzzle.
  const over = structuredClone(CLUB);
  over.puzzles[1].black.push('a1', 'a2', 'a3', 'a4', 'a5');
  await file('over.json', JSON.stringify(over));
  await page.waitForFunction(() => [...document.querySelectorAll('#banners .banner p')].some((p) => p.textContent.includes('over.json')));
  assert.ok((await banners(page)).includes(`"over.json" cannot be opened: puzzle 2 (${CLUB.puzzles[1].id}): the position already has a five, so there is nothing to play. Nothing was loaded.`),
    (await banners(page)).join(' | '));
  assert.equal(await setCount(page), 0);
  await file('not-json.json', 'hello');
  await page.waitForFunction(() => document.querySelectorAll('#banners .banner').length === 1 &&
    document.querySelector('#banners .banner p').textContent.includes('not-json.json'));
  assert.equal(await setCount(page), 0);

  const set = librarySet('fours-renju');
  set.title = 'Harbour Street Circle: renju fours, week 3';
  await file('week3.json', JSON.stringify(set, null, 2));
  await page.waitForSelector(`#${BOARD}[data-mode="puzzle"][data-rule="renju"]`);
  assert.equal(await page.textContent('#tonight-set-title'), set.title);
  await tap(page, BOARD, set.puzzles[0].solution.line[0]);
  await settled(page, BOARD, 2);
  assert.equal((await boardState(page, BOARD)).state, 'playing');
  // The same puzzles again under another title: the set keeps its progress and takes the
  // new title, and the message says which set that was.
  const again = { ...set, title: 'Harbour Street Circle: renju fours, corrected' };
  await file('week3-corrected.json', JSON.stringify(again));
  await page.waitForFunction((t) => document.getElementById('tonight-set-title').textContent === t, again.title);
  assert.equal((await banners(page)).at(-1),
    `"${set.title}" is already in Tonight with the same puzzles, now called "${again.title}".`);
  const stored = await page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.sets')).data.list.map((x) => x.title));
  assert.deepEqual(stored, [again.title]);
  assert.equal((await boardState(page, BOARD)).moves.split(' ').length, 2, 'the progress is kept');
  assert.deepEqual(errors, []);
  await context.close();
});
