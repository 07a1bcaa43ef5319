// End-to-end: the state and wording defects found when the app was tried as a new user would
// (one test per defect or per screen's group of them). Each test states the defect it guards.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  PHONE,
  addFromLibrary,
  banners,
  boardState,
  colourAt,
  isBlack,
  librarySet,
  logLines,
  open,
  settled,
  tap,
  useBrowser,
  wrongMove,
} from './support.mjs';

const env = useBrowser();
const CLUB = librarySet('fours-freestyle-club');
const STUDY = 'study-board';
const answer = (page) => page.$$eval('#study-answer p', (ps) => ps.map((p) => p.textContent));

async function askVcf(page) {
  await page.click('#study [data-ask="vcf"]');
  await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false' &&
    document.getElementById('study-answer').childElementCount > 0);
}

test('Study board: an answer goes when the position changes; an empty paste changes nothing; Undo takes back a paste and a clear', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await page.click('[data-go="study"]');
  // Black has three in a row and the move: a win with fours.
  await page.fill('#study-moves', 'h8 a1 i8 a3 j8 a5');
  await page.click('#study-setup');
  assert.equal(await page.textContent('#study-message'), 'Set up 6 moves.');
  await askVcf(page);
  assert.match((await answer(page))[0], /^Black wins with fours/);

  // Defect: the old answer stayed on screen after the position changed.
  await tap(page, STUDY, 'o15');
  await page.waitForFunction(() => document.getElementById('study-answer').childElementCount === 0);
  assert.ok(!(await page.isVisible('#study-stepper')), 'the line of the old position is gone');

  // Defect: "Set up" with an empty box wiped the position.
  await page.fill('#study-moves', '   ');
  await page.click('#study-setup');
  assert.match(await page.textContent('#study-message'), /^Nothing to set up: paste a move list first/);
  assert.ok(isBlack(await colourAt(page, STUDY, 'h8')), 'the position is kept');
  assert.equal((await boardState(page, STUDY)).moves.split(' ').length, 7);

  // Defect: Undo could not bring back a position replaced by a paste or a clear.
  await page.fill('#study-moves', 'c3 d4');
  await page.click('#study-setup');
  assert.equal((await boardState(page, STUDY)).moves, 'c3 d4');
  await page.click('#study-undo');
  await page.click('#study-undo');
  await page.click('#study-undo');
  assert.equal((await boardState(page, STUDY)).moves.split(' ').length, 7, 'the position before the paste is back');
  await page.click('#study-clear');
  assert.equal((await boardState(page, STUDY)).moves ?? '', '');
  await page.click('#study-undo');
  assert.equal((await boardState(page, STUDY)).moves.split(' ').length, 7, 'the position before the clear is back');
  assert.ok(isBlack(await colourAt(page, STUDY, 'h8')));
  assert.deepEqual(errors, []);
  await context.close();
});

test('Study board on a touch screen: the first tap shows a ghost, the second plays (as on the puzzle screens)', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url, PHONE);
  await page.click('[data-go="study"]');
  await tap(page, STUDY, 'h8', { touch: true });
  assert.equal((await boardState(page, STUDY)).moves ?? '', '', 'one tap plays nothing');
  await tap(page, STUDY, 'h8', { touch: true });
  assert.equal((await boardState(page, STUDY)).moves, 'h8');
  assert.ok(isBlack(await colourAt(page, STUDY, 'h8')));
  assert.deepEqual(errors, []);
  await context.close();
});

test('puzzles: a reply is logged once, hints stop at the third, and Study opens the position', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await addFromLibrary(page, CLUB.title);
  const p = CLUB.puzzles[0];
  const [first, reply] = p.solution.line;
  await tap(page, 'tonight-board', first);
  await settled(page, 'tonight-board', 2);
  const log = await logLines(page, 'tonight-log');
  // Defect: every reply was logged twice ("White blocks at d9." then "White d9.").
  const mentions = log.filter((l) => new RegExp(`\\b${reply}\\b`).test(l));
  assert.equal(mentions.length, 1, `the reply ${reply} is in the log once: ${JSON.stringify(log)}`);

  // Defect: after the third hint, Hint stayed enabled and repeated the third hint.
  await page.click('#tonight-marks li:nth-child(2) button');
  await page.waitForFunction(() => document.getElementById('tonight-count').textContent.startsWith('Puzzle 2 '));
  const hint = '#tonight-play [data-act="hint"]';
  for (let i = 1; i <= 3; i++) {
    assert.ok(await page.isEnabled(hint), `hint ${i} can be asked`);
    await page.click(hint);
  }
  assert.equal(await page.getAttribute('#tonight-board', 'data-hints'), '3');
  assert.ok(await page.isDisabled(hint), 'no fourth hint');

  // Defect: no way to open a puzzle's position on the Study board.
  const stones = CLUB.puzzles[1].black.length + CLUB.puzzles[1].white.length;
  await page.click('#tonight-play [data-act="study"]');
  await page.waitForSelector('#study:not([hidden])');
  const s = await boardState(page, STUDY);
  assert.equal(s.toMove, CLUB.puzzles[1].to_move);
  assert.ok(isBlack(await colourAt(page, STUDY, CLUB.puzzles[1].black[0])));
  assert.match(await page.textContent('#study-message'), /./);
  assert.ok(stones > 0);
  assert.deepEqual(errors, []);
  await context.close();
});

test('Drill: while a puzzle is being made there is no goal and nothing to press; theme names have no article', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await page.click('[data-go="drill"]');
  const labels = await page.$$eval('#drill-theme option', (os) => os.map((o) => o.textContent));
  assert.ok(labels.length >= 4);
  for (const l of labels) assert.doesNotMatch(l, /^(A|An|The) /, `"${l}" starts with an article`);
  // The first puzzle on the board, then a theme the starter library has no puzzle of (four-
  // threes under standard rules): the board waits for the worker's puzzle. The state is read
  // in the page in the same moment the wait is seen.
  await page.selectOption('#drill-rule', 'standard');
  await page.waitForSelector('#drill[data-waiting="false"]', { timeout: 120000 });
  assert.notEqual(await page.textContent('#drill-message'), '');
  await page.selectOption('#drill-theme', 'four-three');
  const during = await (await page.waitForFunction(() => {
    if (document.getElementById('drill').dataset.waiting !== 'true') return null;
    return {
      message: document.getElementById('drill-message').textContent,
      enabled: [...document.querySelectorAll('#drill [data-act]')].filter((b) => !b.disabled && !b.hidden).map((b) => b.dataset.act),
    };
  })).jsonValue();
  // Defect: the message line still showed the previous puzzle's goal and Hint looked enabled.
  assert.equal(during.message, '');
  assert.deepEqual(during.enabled, []);
  await page.waitForSelector('#drill[data-waiting="false"]', { timeout: 120000 });
  assert.match(await page.textContent('#drill-message'), /four-three/i);
  assert.deepEqual(errors, []);
  await context.close();
});

test('sharing: the note says what the link does and the copy is confirmed on screen; a set sent again under a new title takes it', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await context.grantPermissions(['clipboard-read', 'clipboard-write']);
  await addFromLibrary(page, CLUB.title);
  await page.click('#tonight-share');
  await page.waitForSelector('#tonight-share-box:not([hidden])');
  await page.waitForFunction(() => document.getElementById('tonight-share-link').value !== '');
  // Defect: the note said "2151 characters." and the copy was confirmed only to screen readers.
  const note = await page.textContent('#tonight-share-note');
  assert.doesNotMatch(note, /characters/);
  assert.match(note, /gets the set/);
  await page.waitForFunction(() => [...document.querySelectorAll('#banners .banner p')].some((p) => /copied/.test(p.textContent)));
  assert.ok((await banners(page)).some((b) => b === 'The link is copied.'));
  assert.equal(await page.evaluate(() => navigator.clipboard.readText()), await page.inputValue('#tonight-share-link'));

  // Defect: the same puzzles under a new title kept the old title.
  const renamed = { ...CLUB, title: 'Harbour Street Circle: Thursday fours' };
  await page.click('#tonight-back');
  await page.setInputFiles('#set-file', { name: 'thursday.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(renamed)) });
  await page.waitForSelector('#tonight-board[data-mode="puzzle"]');
  assert.equal(await page.textContent('#tonight-set-title'), renamed.title);
  await page.click('#tonight-back');
  const titles = await page.$$eval('#tonight-sets li', (li) => li.map((x) => x.textContent));
  assert.equal(titles.length, 1, 'one set, not two');
  assert.ok(titles[0].includes(renamed.title));
  assert.ok(!titles[0].includes(CLUB.title));
  assert.deepEqual(errors, []);
  await context.close();
});

test('a wrong move is refuted with a reason, once, and the log does not repeat it', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  await addFromLibrary(page, CLUB.title);
  const p = CLUB.puzzles[0];
  const bad = wrongMove(p);
  await tap(page, 'tonight-board', bad);
  await page.waitForSelector('#tonight-board[data-state="failed"]', { timeout: 30000 });
  await page.waitForFunction(() => document.getElementById('tonight-board').dataset.pending === '0');
  const log = await logLines(page, 'tonight-log');
  assert.equal(new Set(log).size, log.length, `no line twice: ${JSON.stringify(log)}`);
  assert.deepEqual(errors, []);
  await context.close();
});
