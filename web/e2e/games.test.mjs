// End-to-end: My games. A pasted hand-built game (the one of tests/tests/review.rs: Black's
// 11. k10 makes a win with fours, White's 12. c3 misses the defence, Black's 13. m3 lets the
// win go) is checked in the worker with progress; the timeline marks moves 12 and 13 as
// findings; the finding's words and line are shown, and a missed defence's whole list on
// request; its puzzle is made when asked for, played in Tonight, failed, and is due in
// Revisit the next day (Playwright's clock). A bad SGF record is refused with a message and
// nothing is loaded; a checked game is kept on the device, reopened and deleted. A check
// stopped half-way keeps the moves it checked; a game played out on the Study board is
// checked in My games; and the single-file build checks a game from a file:// URL.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { artefact, boardState, context, goTo, ready, tap, useBrowser, wrongMove, DIST, PHONE, DESKTOP } from './support.mjs';

const env = useBrowser();
const GAME = 'h8 g8 i8 i9 j8 h7 i7 j6 h6 g5 k10 c3 m3 k8';
const DAY = 86_400_000;
const START = new Date('2026-12-02T10:00:00');
const SIXTY = readFileSync(new URL('../../engine/benches/data/sixty_moves.txt', import.meta.url), 'utf8');

async function openAt(when, options) {
  const c = await context(env.browser, options);
  await c.page.clock.setFixedTime(when);
  await c.page.goto(env.server.url);
  await ready(c.page);
  return c;
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
  await goTo(page, 'games');
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

  // Move 12, White's missed defence: the check proved one defence; the whole list on request.
  await page.click('#games-timeline .mark[data-move="12"]');
  assert.match(await page.textContent('#games-finding'), /White's c3 does not stop it\. A defence was (k8|k9|l8|l10)\./);
  await page.click('#games-finding [data-defences="12"]');
  await page.waitForFunction(() => document.getElementById('games-finding').textContent.includes('The defences were k8, k9, l8, l10.'));
  assert.equal(await page.locator('#games-finding [data-defences]').count(), 0);
  await artefact(page, 'games-desktop-defences');

  // Saved on the device; the puzzles are not made until asked for.
  let saved = await storedGames(page);
  assert.equal(saved.length, 1);
  assert.equal(saved[0].made, false);
  assert.equal(saved[0].set, null);
  assert.match(saved[0].findings[0].words, /The defences were k8, k9, l8, l10\./);
  assert.match(await page.textContent('#games-puzzles'), /become puzzles when you play or save them/);

  // Made (Black's one puzzle), played in Tonight, and failed.
  await page.click('#games-play');
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]', { timeout: 60000 });
  saved = await storedGames(page);
  assert.equal(saved[0].made, true);
  const set = JSON.parse(saved[0].set);
  assert.equal(set.puzzles.length, 1);
  assert.match(set.title, /^From my games: Harbour Street Circle, round 3$/);
  const puzzle = set.puzzles[0];
  assert.equal(puzzle.to_move, 'black');
  // Made, it is in Revisit already (a miss of the player's own game), and not in the logbook
  // (Progress counts tries made in the app).
  const practice = await page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.practice')).data);
  const deck = JSON.parse(practice.deck);
  const filed = deck.items.filter((i) => i.id === puzzle.id);
  assert.equal(filed.length, 1, 'the puzzle is in the Revisit deck');
  assert.deepEqual(filed[0].reviews, [], 'untried: the first try here is its first review');
  assert.ok(!practice.log.includes(puzzle.id), 'no try is logged');
  assert.match(await page.textContent('#games-puzzles'), /^The finding of Black's moves became a puzzle, filed in Revisit\./);
  await goTo(page, 'revisit');
  const meta = await page.$$eval('#revisit-list li .meta', (l) => l.map((x) => x.textContent));
  assert.match(meta[1], /^\w+ · missed in a game, not tried here yet · due today$/, meta.join(' | '));
  await goTo(page, 'tonight');
  assert.equal(await page.textContent('#tonight-set-title'), set.title);
  await tap(page, 'tonight-board', wrongMove(puzzle));
  await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]', { timeout: 30000 });

  // Due in Revisit the next day.
  await page.clock.setFixedTime(new Date(START.getTime() + DAY));
  await page.reload();
  await ready(page);
  await goTo(page, 'revisit');
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
  await goTo(page, 'games');
  await page.fill('#games-text', '(;FF[4]GM[1]SZ[15];B[hh];W[hi])');
  await page.click('#games-read');
  // The reader is in the workshop module, loaded on this first read: wait for its answer.
  await page.waitForFunction(() => document.getElementById('games-note').textContent !== '');
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

test('a stopped check keeps the moves it checked, the rest marked not checked (phone)', async () => {
  const { page, context: ctx, errors } = await openAt(START, PHONE);
  await goTo(page, 'games');
  await page.fill('#games-text', SIXTY);
  await page.click('#games-read');
  await page.waitForSelector('#games-setup:not([hidden])');
  await page.selectOption('#games-player', 'both');
  // Stop as soon as the fifth move is heard (from inside the page, so that the worker is
  // still checking when it is stopped).
  await page.evaluate(() => {
    const text = document.getElementById('games-busy-text');
    new MutationObserver((_, o) => {
      if (/Checked 5 of 60/.test(text.textContent)) {
        o.disconnect();
        document.getElementById('games-cancel').click();
      }
    }).observe(text, { childList: true, characterData: true, subtree: true });
  });
  await page.click('#games-check');
  await page.waitForSelector('#games-view:not([hidden])', { timeout: 60000 });
  const [g] = await storedGames(page);
  assert.equal(g.stopped, true);
  const checked = g.verdicts.filter((v) => v !== 'unchecked').length;
  assert.ok(checked >= 5 && checked < 60, `${checked} moves kept`);
  assert.deepEqual(g.verdicts.slice(checked), Array(60 - checked).fill('unchecked'), 'the moves checked are the first ones');
  assert.ok(g.findings.every((f) => f.number <= checked));
  assert.match(await page.textContent('#games-summary'), new RegExp(`^${checked} moves checked: .*The check was stopped: ${60 - checked} moves not checked\\.$`));
  assert.equal(await page.locator('#games-timeline .mark[data-verdict="unchecked"]').count(), 60 - checked);
  await page.click('#games-timeline .mark[data-move="60"]');
  assert.match(await page.textContent('#games-finding'), /Move 60 was not checked/);
  await artefact(page, 'games-phone-stopped');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a game played out on the Study board is checked in My games', async () => {
  const { page, context: ctx, errors } = await openAt(START, DESKTOP);
  await page.click('[data-go="study"]');
  // A position set up with the colour tools is no game.
  await page.click('#study-tools label:has-text("White")');
  await tap(page, 'study-board', 'a1');
  await page.click('#study-to-games');
  assert.match(await page.textContent('#study-message'), /Only a game played out from an empty board/);
  await page.click('#study-clear');
  await page.selectOption('#study-rule', 'standard');
  await page.click('#study-tools label:has-text("Play")');
  await page.fill('#study-moves', GAME.split(' ').slice(0, 12).join(' '));
  await page.click('#study-setup');
  await tap(page, 'study-board', 'm3');
  await tap(page, 'study-board', 'k8');
  await page.click('#study-to-games');
  await page.waitForSelector('#games:not([hidden]) #games-setup:not([hidden])');
  assert.match(await page.textContent('#games-note'), /Read one game from the Study board/);
  assert.equal(await page.textContent('#games-setup-title'), 'A game of 14 moves');
  assert.equal(await page.inputValue('#games-rule'), 'standard');
  await page.selectOption('#games-player', 'black');
  await page.click('#games-check');
  await page.waitForSelector('#games-view:not([hidden])', { timeout: 60000 });
  const [g] = await storedGames(page);
  assert.deepEqual(g.moves, GAME.split(' '));
  assert.equal(g.rule, 'standard');
  assert.deepEqual(g.findings.map((f) => [f.number, f.kind]), [[12, 'missed-defence'], [13, 'missed-win']]);
  await artefact(page, 'games-desktop-from-study');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('the single-file build checks a pasted game from a file:// URL', async () => {
  const { page, context: ctx, errors } = await context(env.browser, PHONE);
  await page.goto(pathToFileURL(join(DIST, 'fivefold.html')).href);
  await ready(page);
  await goTo(page, 'games');
  await pasteAndCheck(page, GAME, { player: 'black' });
  const marks = await page.$$eval('#games-timeline .mark[data-verdict="finding"]', (bs) => bs.map((b) => b.dataset.move));
  assert.deepEqual(marks, ['12', '13']);
  await page.click('#games-timeline .mark[data-move="13"]');
  assert.match(await page.textContent('#games-finding'), /Move 13: Black had a win with fours/);
  // The puzzles are made in the single file's worker too.
  await page.click('#games-play');
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]', { timeout: 60000 });
  await artefact(page, 'games-phone-single-file');
  assert.deepEqual(errors, []);
  await ctx.close();
});
