// End-to-end: the Study board. A position is set up by tapping or by pasting a move list; the
// engine, in the worker, answers VCF, VCT and defence questions in words, and the line is
// stepped through; a long search can be cancelled.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  boardState,
  colourAt,
  isBlack,
  isWhite,
  librarySet,
  logLines,
  open,
  ready,
  tap,
  useBrowser,
} from './support.mjs';

const BOARD = 'study-board';

const env = useBrowser();

const answer = (page) => page.$$eval('#study-answer p', (ps) => ps.map((p) => p.textContent));

test('a position set up by taps and by a pasted move list, with the rules enforced', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url, { dpr: 2 });
  await page.click('[data-go="study"]');
  await tap(page, BOARD, 'h8');
  await tap(page, BOARD, 'h9');
  assert.ok(isBlack(await colourAt(page, BOARD, 'h8')));
  assert.ok(isWhite(await colourAt(page, BOARD, 'h9')));
  assert.deepEqual(await logLines(page, 'study-log'), ['Black h8.', 'White h9.']);
  // The set-up tools.
  await page.click('#study-tools label:has(input[value="white"])');
  await tap(page, BOARD, 'c3');
  assert.ok(isWhite(await colourAt(page, BOARD, 'c3')));
  await page.click('#study-tools label:has(input[value="erase"])');
  await tap(page, BOARD, 'c3');
  assert.equal(await page.getAttribute(`#${BOARD}`, 'data-to-move'), 'black');
  assert.ok(!isWhite(await colourAt(page, BOARD, 'c3')));

  // A bad move list names the bad token and changes nothing.
  await page.fill('#study-moves', 'h8 h9 i8 q77');
  await page.click('#study-setup');
  assert.match(await page.textContent('#study-message'), /^Not set up: .*q77/);
  assert.ok(isBlack(await colourAt(page, BOARD, 'h8')));
  // Renju: a forbidden double three is refused, and the board keeps it empty.
  await page.selectOption('#study-rule', 'renju');
  await page.fill('#study-moves', 'i8 a1 j8 a3 h9 a5 h10 a7');
  await page.click('#study-setup');
  assert.equal(await page.textContent('#study-message'), 'Set up 8 moves.');
  await tap(page, BOARD, 'h8');
  assert.equal(await page.textContent('#study-message'), 'Not played: h8 is forbidden for Black: it makes a double three.');
  assert.ok(!isBlack(await colourAt(page, BOARD, 'h8')));
  // The position is kept over a reload.
  await page.reload();
  await ready(page);
  assert.equal(await page.getAttribute(`#${BOARD}`, 'data-rule'), 'renju');
  assert.ok(isBlack(await colourAt(page, BOARD, 'h10')));
  assert.equal(await page.inputValue('#study-rule'), 'renju');
  assert.deepEqual(errors, []);
  await context.close();
});

test('VCF, VCT and defence questions are answered in words and the line is stepped through', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await page.click('[data-go="study"]');
  const p = librarySet('fours-freestyle-club').puzzles[0];
  // The puzzle's position, set up stone by stone with the tools.
  await page.click('#study-tools label:has(input[value="black"])');
  for (const s of p.black) await tap(page, BOARD, s);
  await page.click('#study-tools label:has(input[value="white"])');
  for (const s of p.white) await tap(page, BOARD, s);
  await page.click('#study-side label:has(input[value="black"])');

  await page.click('[data-ask="vcf"]');
  await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false' &&
    document.getElementById('study-answer').childElementCount > 0);
  const words = await answer(page);
  assert.match(words[0], new RegExp(`^Black wins with fours: \\d+ fours? and the five, \\d+ moves in all: ${p.solution.line[0]} `));
  const line = /: ([a-o0-9 ]+)\.$/.exec(words[0])[1].split(' ');
  assert.ok(words.some((w) => /positions searched/.test(w)));
  assert.ok(await page.isVisible('#study-stepper'));
  assert.equal(await page.textContent('#study-step'), `0 of ${line.length}`);
  await page.click('#study-next');
  assert.equal(await page.textContent('#study-step'), `1 of ${line.length}: Black ${line[0]}`);
  assert.ok(isBlack(await colourAt(page, BOARD, line[0])));
  await page.click('#study-next');
  assert.ok(isWhite(await colourAt(page, BOARD, line[1])));
  await page.click('#study-prev');
  assert.equal(await page.textContent('#study-step'), `1 of ${line.length}: Black ${line[0]}`);
  assert.ok(!isWhite(await colourAt(page, BOARD, line[1])));

  await page.click('[data-ask="vct"]');
  await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false' &&
    /threes and fours/.test(document.getElementById('study-answer').textContent));
  assert.match((await answer(page))[0], /^Black wins with threes and fours, \d+ moves in all: /);

  // White to move: which moves stop Black?
  await page.click('#study-side label:has(input[value="white"])');
  await page.click('[data-ask="defend"]');
  await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false' &&
    /threatens/.test(document.getElementById('study-answer').textContent));
  const d = await answer(page);
  assert.match(d[0], /^Black threatens to win: [a-o0-9 ]+ \(step through it below\)\.$/);
  assert.match(d[1], /^(\d+ moves? stops? it: .+|No move stops it: White loses)\.$/);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a long search runs in the worker and can be cancelled', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await page.click('[data-go="study"]');
  // A position where the side not to move asks for a VCT of its own: a wide search (about
  // 4 s of CPU natively with `fivefold solve --search vct`, and it runs out of budget at
  // 2,000,002 nodes). If the library is regenerated, pick another such puzzle.
  const p = librarySet('threats-freestyle').puzzles[11];
  await page.click('#study-tools label:has(input[value="black"])');
  for (const s of p.black) await tap(page, BOARD, s);
  await page.click('#study-tools label:has(input[value="white"])');
  for (const s of p.white) await tap(page, BOARD, s);
  await page.click(`#study-side label:has(input[value="${p.to_move === 'black' ? 'white' : 'black'}"])`);
  await page.click('[data-ask="vct"]');
  assert.equal(await page.getAttribute('#study', 'data-busy'), 'true');
  assert.ok(await page.isVisible('#study-cancel'));
  // The page answers while the worker searches.
  await tap(page, BOARD, 'a1');
  assert.ok(isWhite(await colourAt(page, BOARD, 'a1')));
  await page.click('#study-cancel');
  assert.equal(await page.getAttribute('#study', 'data-busy'), 'false');
  assert.deepEqual(await answer(page), ['Search cancelled. Ask again, or ask a smaller question.']);
  // A fresh worker answers the next question.
  await page.click('#study-side label:has(input[value="black"])');
  await page.click('[data-ask="vcf"]');
  await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false');
  assert.notDeepEqual(await answer(page), ['Search cancelled. Ask again, or ask a smaller question.']);
  assert.equal((await boardState(page, BOARD)).mode, 'study');
  assert.deepEqual(errors, []);
  await context.close();
});
