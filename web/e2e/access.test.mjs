// End-to-end: every screen on a phone held upright and on its side, at 150 % and 200 % text
// (the root font size, as a browser's text-size setting changes it), and in the dark theme.
// On each screen: nothing is wider than the screen; on a board screen the board and the buttons
// under it are on screen together, above the bottom bar; on the phone every control is at least
// 44 by 44 CSS pixels (the size WCAG 2.1's success criterion 2.5.5 asks for); walking the page
// with Tab, every focused control shows a focus ring whose contrast with what is behind it is at
// least 3:1 (WCAG 2.2, 2.4.13 and 1.4.11); and axe-core (the npm package) finds no violation of
// the WCAG 2.0/2.1 A and AA rules. Screenshots go to web/artefacts/ as <condition>-<screen>.png.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import {
  PHONE,
  addFromLibrary,
  artefact,
  context,
  goTo,
  librarySet,
  open,
  openSettings,
  ready,
  settled,
  tap,
  useBrowser,
  wrongMove,
} from './support.mjs';

const AXE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const CLUB = librarySet('fours-freestyle-club');
const env = useBrowser();

const DAY = 86_400_000;
const START = new Date('2026-12-02T10:00:00').getTime();

const LANDSCAPE = { width: 844, height: 390, dpr: 2, touch: true };

// axe-core rules that are not checked, each with its reason. Empty: every rule of the tags runs.
const AXE_SKIPPED = {};

/** A tap, twice on a touch screen (the first shows where the stone would go). */
async function play(page, board, point, touch) {
  await tap(page, board, point, { touch });
  if (touch) await tap(page, board, point, { touch });
}

/**
 * Walks every screen, calling `visit(name, board)` on each (`board`: the id of the screen's
 * board canvas, if it has one). The page's clock is fixed, so that a puzzle failed today is
 * due in Revisit tomorrow.
 */
async function walk(page, { touch }, visit) {
  await visit('tonight-empty');
  await addFromLibrary(page, CLUB.title);
  await visit('tonight-puzzle', 'tonight-board');
  await page.click('#tonight-marks li:nth-child(2) button');
  await play(page, 'tonight-board', wrongMove(CLUB.puzzles[1]), touch);
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]');
  await visit('tonight-wrong', 'tonight-board');
  await page.click(`#tonight-marks li:nth-child(${CLUB.puzzles.length}) button`);
  await page.click('#tonight-play [data-act="next"]');
  // The question before finishing takes the focus: it and its buttons are what must show
  // (measured before the visit's Tab walk moves the page).
  const q = await page.$eval('#tonight-finish', (n) => {
    const r = n.getBoundingClientRect();
    const rail = document.querySelector('.rail').getBoundingClientRect();
    return { top: r.top, bottom: r.bottom, end: rail.top > innerHeight / 2 ? rail.top : innerHeight };
  });
  assert.ok(q.top >= -0.5 && q.bottom <= q.end + 0.5, `the question before finishing is on screen: ${JSON.stringify(q)}`);
  await visit('tonight-finish');
  await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  await visit('tonight-summary');
  await page.click('#summary-sets');
  await visit('tonight-sets');

  await goTo(page, 'drill');
  await page.waitForSelector('#drill-board[data-mode="puzzle"]', { timeout: 90000 });
  await visit('drill', 'drill-board');

  await goTo(page, 'study');
  await page.fill('#study-moves', 'h8 h9 i8 i9 g8 j10 f7 e6');
  await page.click('#study-setup');
  await page.click('[data-ask="vcf"]');
  await page.waitForSelector('#study[data-line]');
  await page.click('#study-next');
  await visit('study', 'study-board');

  // Tomorrow: the failed puzzle is due.
  await page.clock.setFixedTime(START + DAY);
  await page.reload();
  await ready(page);
  await goTo(page, 'revisit');
  await visit('revisit-list');
  await page.click('#revisit-start');
  await page.waitForSelector('#revisit-board[data-mode="puzzle"]');
  await visit('revisit-puzzle', 'revisit-board');

  for (const screen of ['coach', 'progress', 'games']) {
    await goTo(page, screen);
    await visit(screen);
  }
  await openSettings(page);
  await visit('settings');
  await page.click('#close-settings');
  if (await page.isVisible('#nav-more')) {
    await page.click('#nav-more');
    await visit('more');
    await page.click('#close-more');
  }
}

async function openAt(options, { font = null, dark = false } = {}) {
  const c = await context(env.browser, options);
  await c.page.clock.setFixedTime(START);
  if (dark) await c.page.emulateMedia({ colorScheme: 'dark' });
  await c.page.goto(env.server.url);
  await ready(c.page);
  if (font) await c.page.evaluate((f) => { document.documentElement.style.fontSize = f; }, font);
  return c;
}

/** Nothing wider than the screen. */
async function noOverflow(page, where) {
  const { wide, width } = await page.evaluate(() => ({
    wide: document.documentElement.scrollWidth,
    width: window.innerWidth,
  }));
  assert.ok(wide <= width, `${where}: the page is ${wide} px wide on a ${width} px screen`);
}

/** The board and the first row of buttons after it, on screen together above the bottom bar. */
async function boardInView(page, board, where) {
  const r = await page.$eval(`#${board}`, (canvas) => {
    const frame = canvas.closest('.board-frame');
    const actions = frame.parentElement.querySelector('.actions:not([hidden])');
    const rail = document.querySelector('.rail').getBoundingClientRect();
    const bottom = rail.top > innerHeight / 2 ? rail.top : innerHeight;
    const f = frame.getBoundingClientRect();
    const a = actions.getBoundingClientRect();
    return { top: f.top, boardBottom: f.bottom, left: f.left, right: f.right, actionsTop: a.top, actionsBottom: a.bottom, bottom, width: innerWidth };
  });
  assert.ok(r.top >= -0.5 && r.boardBottom <= r.bottom + 0.5, `${where}: the board is on screen (${JSON.stringify(r)})`);
  assert.ok(r.actionsTop >= -0.5 && r.actionsBottom <= r.bottom + 0.5, `${where}: the buttons are on screen (${JSON.stringify(r)})`);
  assert.ok(r.left >= -0.5 && r.right <= r.width + 0.5, `${where}: the board fits across`);
}

/** Every control on show is at least 44 x 44 CSS pixels (a hidden input: its label). */
async function targets(page, where) {
  const small = await page.evaluate(() => {
    const shown = (n) => n.getClientRects().length > 0 && getComputedStyle(n).visibility !== 'hidden';
    const found = [];
    const all = document.querySelectorAll('a[href], button, input, select, textarea, summary, [tabindex]:not([tabindex="-1"])');
    for (const node of all) {
      if (!shown(node) || node.closest('[hidden], dialog:not([open])')) continue;
      if (node.id === 'skip') continue; // off screen until focused; measured in its own test
      let target = node;
      // A hidden input is used through the label beside or around it.
      if (node.tagName === 'INPUT' && (node.type === 'checkbox' || node.type === 'radio' || node.type === 'file')) {
        target = node.closest('label') ?? node.nextElementSibling ?? node;
      }
      const r = target.getBoundingClientRect();
      if (r.width < 44 - 0.5 || r.height < 44 - 0.5) {
        found.push(`${node.tagName.toLowerCase()}#${node.id}.${node.className} "${(node.textContent || node.getAttribute('aria-label') || '').trim().slice(0, 30)}" ${r.width.toFixed(1)}x${r.height.toFixed(1)}`);
      }
    }
    return found;
  });
  assert.deepEqual(small, [], `${where}: controls smaller than 44 x 44`);
}

// In the page: the contrast of the focus ring of the focused element with what is behind it
// (WCAG's relative luminance and contrast ratio formulas). A hidden file or radio input shows
// its ring on the element after it.
function focusRing() {
  const parse = (c) => {
    const m = /rgba?\(([\d.]+),\s*([\d.]+),\s*([\d.]+)(?:,\s*([\d.]+))?\)/.exec(c);
    return m ? [Number(m[1]), Number(m[2]), Number(m[3]), m[4] === undefined ? 1 : Number(m[4])] : null;
  };
  const lum = ([r, g, b]) => {
    const ch = (v) => {
      const s = v / 255;
      return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
    };
    return 0.2126 * ch(r) + 0.7152 * ch(g) + 0.0722 * ch(b);
  };
  const background = (node) => {
    for (let n = node; n; n = n.parentElement) {
      const c = parse(getComputedStyle(n).backgroundColor);
      if (c && c[3] > 0.5) return c;
    }
    return parse(getComputedStyle(document.documentElement).backgroundColor) ?? [255, 255, 255, 1];
  };
  let node = document.activeElement;
  if (!node || node === document.body) return null;
  const style0 = getComputedStyle(node);
  if (style0.opacity === '0' || node.getBoundingClientRect().width <= 1) node = node.nextElementSibling ?? node;
  const s = getComputedStyle(node);
  const ring = parse(s.outlineColor);
  const width = parseFloat(s.outlineWidth);
  const behind = parseFloat(s.outlineOffset) < 0 ? background(node) : background(node.parentElement);
  const [a, b] = [lum(ring), lum(behind)].sort((x, y) => y - x);
  return {
    what: `${node.tagName.toLowerCase()}#${node.id}.${typeof node.className === 'string' ? node.className : ''} "${(node.textContent || node.getAttribute('aria-label') || '').trim().slice(0, 24)}"`,
    style: s.outlineStyle,
    width,
    contrast: (a + 0.05) / (b + 0.05),
  };
}

/** Tabs through the page (at most `limit` stops), checking every focus ring. */
async function focusRings(page, where, limit = 60) {
  await page.evaluate(() => document.activeElement?.blur());
  const seen = new Set();
  const bad = [];
  for (let i = 0; i < limit; i++) {
    await page.keyboard.press('Tab');
    const r = await page.evaluate(focusRing);
    if (!r) continue;
    if (seen.has(r.what)) break;
    seen.add(r.what);
    if (r.style === 'none' || r.width < 2 || r.contrast < 3) bad.push(`${r.what}: ${r.style} ${r.width}px, ${r.contrast.toFixed(2)}:1`);
  }
  assert.ok(seen.size > 0, `${where}: Tab reaches something`);
  assert.deepEqual(bad, [], `${where}: focus rings`);
}

/** axe-core's WCAG 2.0/2.1 A and AA rules on the page as it is. */
async function axe(page, where) {
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(AXE);
  const violations = await page.evaluate(async (skipped) => {
    const rules = Object.fromEntries(Object.keys(skipped).map((id) => [id, { enabled: false }]));
    const r = await window.axe.run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
      rules,
    });
    return r.violations.map((v) => `${v.id} (${v.impact}): ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(', ')}`);
  }, AXE_SKIPPED);
  assert.deepEqual(violations, [], `${where}: axe-core`);
}

const CONDITIONS = [
  // name, viewport, root font size, dark, checks beyond the layout
  ['phone', PHONE, null, false, { targets: true, rings: true, axe: true }],
  ['landscape', LANDSCAPE, null, false, {}],
  ['text150', PHONE, '150%', false, {}],
  ['text200', PHONE, '200%', false, {}],
  ['dark', PHONE, null, true, { rings: true, axe: true }],
];

for (const [name, viewport, font, dark, checks] of CONDITIONS) {
  test(`every screen, ${name}: laid out on screen${Object.keys(checks).length ? `, ${Object.keys(checks).join(', ')}` : ''}`, async () => {
    const { page, context: ctx, errors } = await openAt(viewport, { font, dark });
    await walk(page, viewport, async (screen, board) => {
      const where = `${name} ${screen}`;
      await page.waitForTimeout(50);
      await artefact(page, `${name}-${screen}`);
      await noOverflow(page, where);
      if (board) await boardInView(page, board, where);
      if (checks.targets) await targets(page, where);
      if (checks.axe) await axe(page, where);
      if (checks.rings) await focusRings(page, where);
    });
    if (dark) {
      const bg = await page.evaluate(() => getComputedStyle(document.documentElement).backgroundColor);
      assert.notEqual(bg, 'rgb(238, 242, 238)', 'the dark theme is on');
    }
    assert.deepEqual(errors, []);
    await ctx.close();
  });
}

test('the board canvas is an application with the role description "board", and says where its cursor is', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  await addFromLibrary(page, CLUB.title);
  const board = page.locator('#tonight-board');
  assert.equal(await board.getAttribute('role'), 'application');
  assert.equal(await board.getAttribute('aria-roledescription'), 'board');
  // What a screen reader is given: the role and the board's description as its name.
  const snap = await board.ariaSnapshot();
  assert.match(snap, /^- '?application "[^"]*(Black|White) to play/, snap);
  await board.focus();
  await page.keyboard.press('ArrowRight');
  const said = await page.$$eval('#live p', (ps) => ps.map((p) => p.textContent));
  assert.match(said.at(-1), /^[a-o]\d{1,2}, (empty|black stone|white stone)$/);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('keyboard: the skip link goes to the board, adding a set with Enter focuses its board, a file button shows its focus', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  // The library is open on a first visit; its first "Add" button, pressed with Enter.
  const add = page.locator('#library-sets li', { hasText: CLUB.title }).getByRole('button');
  await add.focus();
  await page.keyboard.press('Enter');
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]');
  assert.equal(await page.evaluate(() => document.activeElement?.id), 'tonight-board');
  // The skip link is the first stop on a page just opened; Enter on it focuses the board of
  // the screen on show (the set stays open over a reload).
  await page.reload();
  await ready(page);
  await page.keyboard.press('Tab');
  assert.equal(await page.evaluate(() => document.activeElement?.id), 'skip');
  assert.equal(await page.textContent('#skip'), 'Skip to the board');
  const box = await page.locator('#skip').boundingBox();
  assert.ok(box.y >= 0 && box.height >= 44, 'the skip link shows when focused');
  await page.keyboard.press('Enter');
  assert.equal(await page.evaluate(() => document.activeElement?.id), 'tonight-board');
  // The current puzzle's mark is told apart by a bar under it, not by a ring like the focus.
  const current = await page.$eval('#tonight-marks [aria-current="step"]', (m) => ({
    outline: getComputedStyle(m).outlineStyle,
    bar: getComputedStyle(m, '::after').content,
  }));
  assert.equal(current.outline, 'none');
  assert.notEqual(current.bar, 'none');
  // The hidden file input's label shows the focus ring.
  await page.click('#tonight-back');
  await page.focus('#set-file');
  await page.keyboard.press('Shift+Tab');
  await page.keyboard.press('Tab');
  assert.equal(await page.evaluate(() => document.activeElement?.id), 'set-file');
  const ring = await page.$eval('label[for="set-file"]', (l) => getComputedStyle(l).outlineStyle);
  assert.equal(ring, 'solid');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a title of one long word fits a 360 px phone: its puzzles and the list of sets', async () => {
  const c = await openAt({ width: 360, height: 740, dpr: 2, touch: true });
  const { page, errors } = c;
  // A title of 200 characters without a space, from a set file.
  // It starts with a right-to-left override, which would turn the app's sentences round: it
  // arrives without it.
  const title = `HarbourStreet${'Tuesday'.repeat(26)}`;
  await page.setInputFiles('#set-file', { name: 'long.json', mimeType: 'application/json',
    buffer: Buffer.from(JSON.stringify({ ...CLUB, title: `\u202e${title}` })) });
  await page.waitForSelector('#tonight-board');
  const added = await page.locator('#banners .banner', { hasText: 'to Tonight' }).first().textContent();
  assert.equal(added, `Added "${title}" to Tonight.OK`);
  await noOverflow(page, 'a puzzle of the set');
  await page.click('#tonight-back');
  await page.waitForSelector('#tonight-sets .card');
  await noOverflow(page, 'the list of sets');
  assert.equal(await page.textContent('#tonight-sets .card .set-title'), title);
  assert.deepEqual(errors, []);
  await c.context.close();
});

test('on a 360 px phone, the verdict of a wrong move is brought into view with the board\'s top', async () => {
  const c = await openAt({ width: 360, height: 740, dpr: 2, touch: true });
  const { page, errors } = c;
  await addFromLibrary(page, CLUB.title);
  const wrong = wrongMove(CLUB.puzzles[0]);
  await tap(page, 'tonight-board', wrong, { touch: true });
  await tap(page, 'tonight-board', wrong, { touch: true });
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]', { timeout: 30000 });
  await page.waitForTimeout(100);
  const r = await page.evaluate(() => {
    const box = (id) => document.getElementById(id).getBoundingClientRect();
    return { board: box('tonight-board').top, message: box('tonight-message').bottom, rail: document.querySelector('.rail').getBoundingClientRect().top };
  });
  assert.ok(r.board >= 0 && r.message <= r.rail, JSON.stringify(r));
  assert.match(await page.textContent('#tonight-message'), /not right/);
  await artefact(page, 'phone-360-wrong-move');
  assert.deepEqual(errors, []);
  await c.context.close();
});

test('banners float over the page without moving the board, and information goes away by itself', async () => {
  const c = await context(env.browser, PHONE);
  const { page, errors } = c;
  await page.clock.install({ time: START });
  await page.goto(env.server.url);
  await ready(page);
  await addFromLibrary(page, CLUB.title);
  const before = await page.locator('#tonight-board').boundingBox();
  // A damaged link: an error banner, which stays until it is dismissed.
  await page.evaluate(() => { location.hash = 'set=AAAAAAAAAAAAAAAAAAAAAA'; });
  await page.waitForSelector('#banners .banner[data-kind="error"]');
  const after = await page.locator('#tonight-board').boundingBox();
  assert.deepEqual(after, before, 'the board stays where it was');
  // An information banner, as the app makes them (made here through the page's own module, so
  // that the test does not depend on which action says something).
  await page.evaluate(() => import('./ui.js').then((ui) => ui.banner('A test message.', { id: 'probe' })));
  assert.equal(await page.locator('#banners [data-id="probe"]').count(), 1);
  // The page keeps room below its content for the messages: scrolled to its end, nothing of
  // the screen is left under them.
  const frame = () => page.evaluate(() => new Promise((done) => requestAnimationFrame(done)));
  await frame();
  const clear = await page.evaluate(() => new Promise((done) => requestAnimationFrame(() => {
    window.scrollTo({ top: document.scrollingElement.scrollHeight, behavior: 'instant' });
    const top = Math.min(...[...document.querySelectorAll('#banners .banner')].map((b) => b.getBoundingClientRect().top));
    const bottoms = [...document.querySelectorAll('main section:not([hidden]) *')].filter((e) => e.checkVisibility())
      .map((e) => e.getBoundingClientRect()).filter((r) => r.height > 0).map((r) => r.bottom);
    done({ top, bottom: Math.max(...bottoms), scrolled: window.scrollY, });
  })));
  assert.ok(clear.scrolled > 0 && clear.bottom <= clear.top, JSON.stringify(clear));
  await page.clock.runFor(11_000);
  assert.equal(await page.locator('#banners [data-id="probe"]').count(), 0, 'information goes after 10 s');
  await page.clock.runFor(60_000);
  assert.equal(await page.locator('#banners .banner[data-kind="error"]').count(), 1, 'an error stays');
  assert.deepEqual(errors, []);
  await c.context.close();
});

test('the dark theme follows the device and the setting; sounds are off until turned on', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url, PHONE);
  const paper = () => page.evaluate(() => getComputedStyle(document.documentElement).backgroundColor);
  const light = await paper();
  await page.emulateMedia({ colorScheme: 'dark' });
  const dark = await paper();
  assert.notEqual(dark, light, 'the device setting is followed');
  await openSettings(page);
  await page.selectOption('#opt-theme', 'light');
  assert.equal(await paper(), light, 'the setting overrides the device');
  await page.selectOption('#opt-theme', 'dark');
  await page.emulateMedia({ colorScheme: 'light' });
  assert.equal(await paper(), dark);
  await page.selectOption('#opt-theme', 'auto');
  assert.equal(await paper(), light);
  assert.equal(await page.isChecked('#opt-sounds'), false, 'sounds are off by default');
  await page.click('#close-settings');
  await addFromLibrary(page, CLUB.title);
  const p = CLUB.puzzles[0];
  await play(page, 'tonight-board', p.solution.line[0], true);
  await settled(page, 'tonight-board', 2);
  assert.equal(await page.evaluate(() => document.documentElement.dataset.lastSound ?? null), null);
  await openSettings(page);
  await page.check('#opt-sounds');
  await page.click('#close-settings');
  await page.click('#tonight-play [data-act="retry"]');
  await play(page, 'tonight-board', p.solution.line[0], true);
  await settled(page, 'tonight-board', 2);
  // The move was right, then the reply's stone was placed: the last sound is the stone's.
  assert.equal(await page.evaluate(() => document.documentElement.dataset.lastSound), 'stone');
  const wrong = wrongMove(p);
  await page.click('#tonight-play [data-act="retry"]');
  await play(page, 'tonight-board', wrong, true);
  await page.waitForFunction(() => ['wrong', 'stone'].includes(document.documentElement.dataset.lastSound));
  assert.deepEqual(errors, []);
  await ctx.close();
});
