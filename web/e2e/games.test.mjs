// End-to-end: My games. A pasted hand-built game (the one of tests/tests/review.rs: Black's
// 11. k10 makes a win with fours, White's 12. c3 misses the defence, Black's 13. m3 lets the
// win go) is checked in the worker with progress; the timeline marks moves 12 and 13 as
// findings; the finding's words and line are shown; its puzzle is played in Tonight, failed,
// and is due in Revisit the next day (Playwright's clock). A bad SGF record is refused with a
// message and nothing is loaded; a checked game is kept on the device, reopened and deleted.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { artefact, boardState, context, ready, tap, useBrowser, wrongMove, PHONE, DESKTOP } from './support.mjs';

const env = useBrowser();
const GAME = 'h8 g8 i8 i9 j8 h7 i7 j6 h6 g5 k10 c3 m3 k8';
const DAY = 86_400_000;
const START = new Date('2026-12-02T10:00:00');

async function openAt(when, options) {
  const c = await context(env.browser, options);
  await c.page.clock.setFixedTime(when);
  await c.page.goto(env.server.url);
  await ready(c.page);
  return c;
}

async function goGames(page) {
  if (await page.isVisible('.rail [data-go="games"]')) await page.click('.rail [data-go="games"]');
  else {
    await page.click('#nav-more');
    await page.click('#more [data-go="games"]');
  }
  await page.waitForSelector('#games:not([hidden])');
}

/** Pastes a game, reads it, and checks it; resolves once the game is on show. */
async function pasteAndCheck(page, text, { player = 'black' } = {}) {
  await page.fill('#games-text', text);
  await page.click('#games-read');
  await page.waitForSelector('#games-setup:not([hidden])');
  await page.selectOption('#games-player', player);
  await page.click('#games-check');
  await page.waitForSelector('#games-view:not([hidden])', { timeout: 60000 });
}

const storedGames = (page) => page.evaluate(() => {
  const t = localStorage.getItem('fivefold.games');
  return t ? JSON.parse(t).data.list : [];
});

test('a pasted game is checked, its missed win is shown and played as a puzzle, and a miss comes back in Revisit', async () => {
  const { page, context: ctx, errors } = await openAt(START, DESKTOP);
  await goGames(page);
  await page.fill('#games-text', `# Harbour Street Circle, round 3\n${GAME}`);
  await page.click('#games-read');
  await page.waitForSelector('#games-setup:not([hidden])');
  assert.equal(await page.textContent('#games-setup-title'), 'Harbour Street Circle, round 3');
  assert.match(await page.textContent('#games-note'), /Read one game/);
  await page.selectOption('#games-player', 'black');
  // Progress is shown while the worker checks (moves checked of 14).
  await page.click('#games-check');
  const progress = await page.waitForFunction(() => {
    const t = document.getElementById('games-busy-text').textContent;
    return /Checked \d+ of 14 moves/.test(t) ? t : null;
  });
  assert.ok(await progress.jsonValue());
  await page.waitForSelector('#games-view:not([hidden])', { timeout: 60000 });
  await artefact(page, 'games-desktop');

  // The timeline: 14 moves; 12 and 13 are findings, by shape as well as colour.
  const marks = await page.$$eval('#games-timeline .mark', (bs) => bs.map((b) => [b.dataset.move, b.dataset.verdict, b.dataset.kind ?? '']));
  assert.equal(marks.length, 14);
  const findings = marks.filter((m) => m[1] === 'finding');
  assert.deepEqual(findings, [['12', 'finding', 'missed-defence'], ['13', 'finding', 'missed-win']]);
  const radius = await page.$eval('#games-timeline .mark[data-move="13"]', (b) => getComputedStyle(b).borderTopLeftRadius);
  const round = await page.$eval('#games-timeline .mark[data-move="1"]', (b) => getComputedStyle(b).borderTopLeftRadius);
  assert.notEqual(radius, round, 'a finding has another shape');

  // The game opens at its first finding (move 12); move 13 holds the missed win.
  assert.equal((await boardState(page, 'games-board')).at, '12');
  await page.click('#games-timeline .mark[data-move="13"]');
  const words = await page.textContent('#games-finding');
  assert.match(words, /Move 13: Black had a win with fours starting at k(8|9)/);
  const shown = await boardState(page, 'games-board');
  assert.equal(shown.moves.split(' ').length, 13);
  assert.equal(shown.moves.split(' ')[12], 'm3');
  // Prev and Next step through the game.
  await page.click('#games-prev');
  assert.equal((await boardState(page, 'games-board')).at, '12');
  await page.click('#games-next');
  assert.equal((await boardState(page, 'games-board')).at, '13');
  // The line, from the position before move 13, stepped on the board.
  await page.click('#games-finding [data-show-line="13"]');
  await page.waitForSelector('#games-line:not([hidden])');
  assert.match(await page.textContent('#games-line-at'), /^Line: 1 of 7: Black k(8|9)/);
  await page.click('#games-line-next');
  assert.match(await page.textContent('#games-line-at'), /^Line: 2 of 7: White/);
  await artefact(page, 'games-desktop-line');

  // Saved on the device, with the set of Black's one puzzle.
  const saved = await storedGames(page);
  assert.equal(saved.length, 1);
  const set = JSON.parse(saved[0].set);
  assert.equal(set.puzzles.length, 1);
  assert.match(set.title, /^From my games: Harbour Street Circle, round 3$/);
  const puzzle = set.puzzles[0];
  assert.equal(puzzle.to_move, 'black');

  // Played in Tonight, and failed.
  await page.click('#games-play');
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]');
  assert.equal(await page.textContent('#tonight-set-title'), set.title);
  await tap(page, 'tonight-board', wrongMove(puzzle));
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]', { timeout: 30000 });

  // Due in Revisit the next day.
  await page.clock.setFixedTime(new Date(START.getTime() + DAY));
  await page.reload();
  await ready(page);
  await page.click('[data-go="revisit"]');
  assert.equal(await page.$eval('#revisit', (s) => Number(s.dataset.due ?? '0')), 1);
  await page.click('#revisit-start');
  await page.waitForSelector('#revisit-board[data-mode="puzzle"]');
  const again = await boardState(page, 'revisit-board');
  assert.equal(again.toMove, 'black');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a bad SGF record is refused and nothing is loaded; a checked game is kept, reopened and deleted (phone)', async () => {
  const { page, context: ctx, errors } = await openAt(START, PHONE);
  await goGames(page);
  await page.fill('#games-text', '(;FF[4]GM[1]SZ[15];B[hh];W[hi])');
  await page.click('#games-read');
  const note = await page.textContent('#games-note');
  assert.match(note, /cannot be read: .*GM.*Nothing was loaded/);
  assert.equal(await page.isHidden('#games-setup'), true, 'no game is offered');
  assert.deepEqual(await storedGames(page), []);
  await artefact(page, 'games-phone-refused');

  // An SGF record with players' names: names are shown as text.
  const sgf = `(;FF[4]GM[4]SZ[15]PB[Mira <b>Okafor</b>]PW[Tomas Reyne]${GAME.split(' ').map((p, i) => {
    const col = p[0];
    const row = 15 - Number(p.slice(1));
    return `;${i % 2 ? 'W' : 'B'}[${col}${String.fromCharCode(97 + row)}]`;
  }).join('')})`;
  await pasteAndCheck(page, sgf, { player: 'both' });
  const title = await page.textContent('#games-view-title');
  assert.equal(title, 'Mira <b>Okafor</b> – Tomas Reyne');
  assert.equal(await page.$$eval('#games-view-title b', (b) => b.length), 0);
  const width = await page.evaluate(() => document.documentElement.scrollWidth);
  assert.ok(width <= PHONE.width, `no overflow: ${width}`);
  await artefact(page, 'games-phone');
  await page.click('#games-timeline .mark[data-move="13"]');
  await page.click('#games-finding [data-show-line="13"]');
  await artefact(page, 'games-phone-line');

  // Kept after a reload, reopened, deleted.
  await page.reload();
  await ready(page);
  await page.waitForSelector('#games:not([hidden])');
  assert.equal(await page.locator('#games-saved li').count(), 1);
  await page.click('#games-saved li button:has-text("Open")');
  await page.waitForSelector('#games-view:not([hidden])');
  assert.equal(await page.locator('#games-timeline .mark[data-verdict="finding"]').count(), 2);
  await page.click('#games-back');
  page.once('dialog', (d) => d.accept());
  await page.click('#games-saved li button:has-text("Delete")');
  assert.equal(await page.locator('#games-saved li').count(), 0);
  assert.deepEqual(await storedGames(page), []);
  assert.deepEqual(errors, []);
  await ctx.close();
});
