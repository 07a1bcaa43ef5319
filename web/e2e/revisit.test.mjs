// End-to-end: Revisit and Progress with an injected clock (Playwright's clock, so the app's
// own Date is moved, not patched by the app): a failed puzzle is due the next day in Revisit,
// solving it schedules it later, and it is due again once that day comes; after a failure the
// solution is shown move by move and the record keeps the failure; Progress draws its charts
// (pixels on the canvas) and its tables match the stored history; a backup made by the
// previous version (no schedule, one Drill rating for every rule) restores into this one.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  addFromLibrary,
  artefact,
  boardState,
  goTo,
  librarySet,
  open,
  context,
  ready,
  settled,
  solve,
  tap,
  useBrowser,
  wrongFour,
  wrongMove,
  PHONE,
  openSettings,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');
const FIRST = CLUB.puzzles[0];
const env = useBrowser();

const DAY = 86_400_000;
const START = new Date('2026-12-02T10:00:00');

// The checksum of web/store.js (FNV-1a over UTF-16 code units), to forge a backup.
function fnv(text) {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

async function openAt(when, options) {
  const c = await context(env.browser, options);
  await c.page.clock.setFixedTime(when);
  await c.page.goto(env.server.url);
  await ready(c.page);
  return c;
}

async function at(page, when) {
  await page.clock.setFixedTime(when);
  await page.reload();
  await ready(page);
}

const dueCount = (page) => page.$eval('#revisit', (s) => Number(s.dataset.due ?? '0'));

test('a failed puzzle comes back on the schedule, and its solution can be shown', async () => {
  const { page, context: ctx, errors } = await openAt(START);
  await addFromLibrary(page, CLUB.title);
  // Fail puzzle 1.
  await tap(page, 'tonight-board', wrongMove(FIRST));
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]');
  assert.equal(await page.isVisible('#tonight-play [data-act="hint"]'), false, 'no hint after a failure');
  // The solution, move by move; the record keeps the failure.
  await page.click('#tonight-play [data-act="solution"]');
  const line = FIRST.solution.line;
  await page.waitForFunction((n) => {
    const d = document.getElementById('tonight-board').dataset;
    return d.pending === '0' && d.moves && d.moves.split(' ').length === n;
  }, line.length, { timeout: 30000 });
  assert.equal((await boardState(page, 'tonight-board')).moves, line.join(' '));
  assert.equal(await page.isDisabled('#tonight-play [data-act="hint"]'), true, 'no hint over a shown solution');
  const log = await page.$$eval('#tonight-log li', (l) => l.map((x) => x.textContent));
  assert.ok(log.some((t) => t.startsWith(`1. Black ${line[0]}`)), log.join(' | '));
  const stored = await page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.tonight')).data);
  assert.equal(Object.values(stored.progress)[0].puzzles[FIRST.id].outcome, 'failed');

  // Not due today (a failure comes back tomorrow); due tomorrow, with the badge.
  await goTo(page, 'revisit');
  assert.equal(await dueCount(page), 0);
  assert.match(await page.textContent('#revisit-lead'), /Nothing due today; 1 in all/);
  await at(page, new Date(START.getTime() + DAY));
  assert.equal(await page.textContent('#revisit-badge'), '1');
  await goTo(page, 'revisit');
  assert.equal(await dueCount(page), 1);
  // The entry says what the puzzle is, so that two from one set can be told apart.
  const metas = await page.$$eval('#revisit-list li .meta', (l) => l.map((x) => x.textContent));
  assert.equal(FIRST.to_move, 'black');
  assert.equal(metas[0], `Black to play · Win with fours · difficulty ${FIRST.rating}`);
  await artefact(page, 'revisit-desktop');
  await page.click('#revisit-start');
  await page.waitForSelector('#revisit-board[data-mode="puzzle"]');
  await solve(page, 'revisit-board', line);
  const next = await page.textContent('#revisit-next-time');
  const m = /Comes back in (\d+) days/.exec(next);
  assert.ok(m, next);
  const days = Number(m[1]);
  assert.ok(days >= 2, `a clean solve after a failure comes back later: ${days}`);
  await page.click('#revisit-play [data-act="next"]');
  assert.equal(await dueCount(page), 0);
  assert.equal(await page.isHidden('#revisit-badge'), true);
  // The day before it is due: nothing; on the day: due again.
  await at(page, new Date(START.getTime() + (days) * DAY));
  await goTo(page, 'revisit');
  assert.equal(await dueCount(page), 0);
  await at(page, new Date(START.getTime() + (1 + days) * DAY));
  await goTo(page, 'revisit');
  assert.equal(await dueCount(page), 1);

  // Progress: the charts draw and the tables hold the history (two days played).
  await goTo(page, 'progress');
  const inked = await page.$eval('#progress-calendar', (c) => {
    const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
    let dark = 0;
    for (let i = 0; i < d.length; i += 4) if (d[i] + d[i + 1] + d[i + 2] < 200) dark++;
    return dark;
  });
  assert.ok(inked > 100, `the calendar is drawn (${inked} dark pixels)`);
  // No Drill puzzle, so no rating: the note says so, and no empty chart is drawn.
  assert.ok(await page.isHidden('#progress-chart'), 'an empty rating chart is hidden');
  assert.match(await page.textContent('#progress-rating-note'), /^No rated /);
  const days2 = await page.$$eval('#progress-days-table tr', (rows) => rows.slice(1).map((r) => r.lastElementChild.textContent));
  const stored2 = await page.evaluate(() => JSON.parse(JSON.parse(localStorage.getItem('fivefold.practice')).data.log));
  const byDay = new Map();
  for (const e of stored2.entries) byDay.set(e.day, (byDay.get(e.day) ?? 0) + 1);
  assert.equal(days2.length, byDay.size, days2.join(' | '));
  assert.deepEqual(days2.map(Number), [...byDay.values()]);
  const themes = await page.$$eval('#progress-themes tr', (rows) => rows.map((r) => r.textContent));
  assert.ok(themes.some((t) => t.startsWith('Win with fours')), themes.join(' | '));
  // Two days played, the last some days ago: the streak is broken, and nothing says to keep it.
  assert.equal(await page.textContent('#progress-streaks'), 'No current streak (play today to start one). Best: 2.');
  await artefact(page, 'progress-desktop');

  // Due again: failed, then solved on a retry. The review counts its first try only (one
  // more entry, failed), as Tonight and Drill count a puzzle.
  const reviews = async () => (await page.evaluate(() => JSON.parse(JSON.parse(localStorage.getItem('fivefold.practice')).data.log)))
    .entries.filter((e) => e.source.origin === 'revisit').map((e) => e.outcome);
  assert.deepEqual(await reviews(), ['clean']);
  await goTo(page, 'revisit');
  await page.click('#revisit-start');
  await page.waitForSelector('#revisit-board[data-mode="puzzle"]');
  await tap(page, 'revisit-board', wrongMove(FIRST));
  await page.waitForSelector('#revisit-board[data-state="failed"][data-pending="0"]');
  await page.click('#revisit-play [data-act="retry"]');
  await solve(page, 'revisit-board', line);
  assert.deepEqual(await reviews(), ['clean', 'failed']);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a try cut short by a reload while the app shows its replies still counts', async () => {
  const { page, context: ctx, errors } = await openAt(START);
  await addFromLibrary(page, CLUB.title);
  // A wrong four fails the try at once; the replies that show why (the block, then the
  // defence's own line) follow one by one. The page is reloaded before they are all shown,
  // as a phone's closed tab would cut them.
  const four = wrongFour(CLUB.puzzles[1]);
  await page.click('#tonight-marks li:nth-child(2) button');
  await page.waitForSelector('#tonight-count:has-text("Puzzle 2 of")');
  // The page reloads itself the moment the board says failed (so a busy machine cannot let
  // the replies finish first), noting how many replies were still to be shown.
  await page.evaluate(() => {
    const c = document.getElementById('tonight-board');
    new MutationObserver(() => {
      if (c.dataset.state !== 'failed' || sessionStorage.getItem('pendingAtFail')) return;
      sessionStorage.setItem('pendingAtFail', c.dataset.pending);
      window.location.reload();
    }).observe(c, { attributes: true, attributeFilter: ['data-state'] });
  });
  await Promise.all([page.waitForEvent('load'), tap(page, 'tonight-board', four)]);
  await ready(page);
  const pending = Number(await page.evaluate(() => sessionStorage.getItem('pendingAtFail')));
  assert.ok(pending > 0, `the reload came while replies were still to be shown (${pending})`);
  // Opened again, the puzzle still says why the move failed, and the log holds the replies.
  await page.waitForSelector('#tonight-board[data-state="failed"]');
  assert.equal(await page.getAttribute('#tonight-message', 'data-kind'), 'wrong');
  assert.match(await page.textContent('#tonight-message'), new RegExp(`^(Black|White) ${four}: not right`));
  const replies = await page.$$eval('#tonight-log li', (l) => l.map((x) => x.textContent));
  assert.ok(replies.length >= 2, replies.join(' | '));
  // A retry that solves it is practice on a counted puzzle: the logbook (so Progress and
  // Revisit) keeps the first try only, as the marks and the result code do.
  await page.click('#tonight-play [data-act="retry"]');
  await settled(page, 'tonight-board', 0);
  await solve(page, 'tonight-board', CLUB.puzzles[1].solution.line);
  const logged = await page.evaluate(() => JSON.parse(JSON.parse(localStorage.getItem('fivefold.practice')).data.log).entries);
  assert.deepEqual(logged.map((e) => e.outcome), ['failed'], JSON.stringify(logged));
  // The miss was recorded: Revisit holds it, and Progress counts the try.
  await goTo(page, 'revisit');
  assert.match(await page.textContent('#revisit-lead'), /Nothing due today; 1 in all/);
  await at(page, new Date(START.getTime() + DAY));
  await goTo(page, 'revisit');
  assert.equal(await dueCount(page), 1);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('Revisit and Progress on a phone', async () => {
  const { page, context: ctx, errors } = await openAt(START, PHONE);
  await goTo(page, 'progress');
  const width = await page.evaluate(() => document.documentElement.scrollWidth);
  assert.ok(width <= PHONE.width, `no overflow: ${width}`);
  // With nothing yet, the tables say so instead of showing their headings alone.
  assert.deepEqual(await page.$$eval('#progress-rating-table tr, #progress-days-table tr', (l) => l.map((r) => r.textContent)),
    ['DayRatingGive or take', 'No rated puzzles yet', 'DayPuzzles', 'Nothing finished yet']);
  await artefact(page, 'progress-phone');
  // With a try in the history, every table of numbers fits the phone's width (the rule's
  // table once scrolled sideways), and the rule is named as in the menus.
  await addFromLibrary(page, CLUB.title);
  await tap(page, 'tonight-board', wrongMove(FIRST));
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]');
  await goTo(page, 'progress');
  const boxes = await page.$$eval('#progress .table-box', (l) => l.filter((b) => b.offsetParent)
    .map((b) => ({ table: b.firstElementChild.id, scroll: b.scrollWidth, width: b.clientWidth })));
  assert.ok(boxes.length >= 2, JSON.stringify(boxes));
  for (const b of boxes) assert.ok(b.scroll <= b.width, `${b.table} fits: ${JSON.stringify(b)}`);
  // And on a small phone, 360 px wide.
  await page.setViewportSize({ width: 360, height: 740 });
  const small = await page.$$eval('#progress .table-box', (l) => l.filter((b) => b.offsetParent)
    .map((b) => ({ table: b.firstElementChild.id, scroll: b.scrollWidth, width: b.clientWidth })));
  assert.ok(small.length >= 2, JSON.stringify(small));
  for (const b of small) assert.ok(b.scroll <= b.width, `${b.table} fits 360 px: ${JSON.stringify(b)}`);
  await page.setViewportSize({ width: PHONE.width, height: PHONE.height });
  const rules = await page.$$eval('#progress-rules tr', (rows) => rows.slice(1).map((r) => r.firstElementChild.textContent));
  assert.deepEqual(rules, ['Freestyle']);
  await page.$eval('#progress-themes', (t) => t.scrollIntoView());
  await artefact(page, 'progress-tables-phone');
  await goTo(page, 'revisit');
  await artefact(page, 'revisit-phone');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a backup of the previous format restores into this one', async () => {
  // The previous version's documents: one Drill rating for every rule, no schedule.
  const data = {
    settings: { confirm: true, forbidden: true, numbers: false, screen: 'drill' },
    drill: {
      theme: 'vcf', rule: 'renju', rating: { rating: 1620, deviation: 80, volatility: 0.06 },
      current: null, queue: [], stats: { played: 41, clean: 30 },
    },
    study: { size: 15, rule: 'freestyle', tool: 'play', toMove: 'white', black: ['h8'], white: [] },
  };
  const body = JSON.stringify(data);
  const backup = `{"format":"fivefold-backup","version":1,"exported":"2026-12-01T20:00:00.000Z","sum":"${fnv(body)}","data":${body}}\n`;
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  page.on('dialog', (d) => d.accept());
  await openSettings(page);
  await page.setInputFiles('#import-backup', { name: 'old.json', mimeType: 'application/json', buffer: Buffer.from(backup) });
  await page.waitForFunction(() => document.getElementById('settings-note').textContent.includes('restored'));
  const note = await page.textContent('#settings-note');
  assert.match(note, /is restored\.$/, note);
  await page.click('#close-settings');
  await page.click('[data-go="drill"]');
  assert.match(await page.textContent('#drill-rating'), /Your renju rating 1620/);
  assert.match(await page.textContent('#drill-rating'), /41 played, 30 solved clean/);
  await page.click('[data-go="study"]');
  assert.equal(await page.$eval('#study-board', (c) => c.dataset.toMove), 'white');
  await goTo(page, 'revisit');
  assert.match(await page.textContent('#revisit-lead'), /Nothing to revisit/);
  assert.deepEqual(errors, []);
  await ctx.close();
});
