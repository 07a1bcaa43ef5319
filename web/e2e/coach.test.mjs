// End-to-end: the Coach screen's class round trip. An instructor of the Harbour Street
// Five-in-a-Row Circle makes a seeded set of 6 in the worker, hands out its link (and its QR
// code); three students open the link in their own browsers (one on a 360x740 phone) and
// finish with different outcomes; two result codes are pasted into Results and one is
// scanned with the camera (Chromium's fake camera fed a video of the student's QR code), where the
// table must match cell by cell, the CSV download must match, and a damaged code and a code
// for another set are reported by line. The printed sheet has its answer key on a page of
// its own. Screenshots of every part go to web/artefacts/coach-*.png.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  artefact,
  banners,
  context,
  goTo,
  launch,
  ready,
  librarySet,
  makeCoachSet as makeSet,
  open,
  openOnCores,
  settled,
  solve,
  tap,
  useBrowser,
  wrongFour,
  wrongMove,
  y4m,
  resultCode,
} from './support.mjs';

const BOARD = 'tonight-board';
const SMALL_PHONE = { width: 360, height: 740, dpr: 2, touch: true };
const env = useBrowser();

/** A Coach set's puzzles as a single worker makes them: the seeds taken in turn from `from`
 * (the set's seed), one puzzle each, `themes` (the set's) in turn by place, a puzzle already
 * made or among `taken` skipped, until there are `count` (the set's). Made here straight from
 * the workshop module, without Coach's workers (not for the Expert band, whose deep-line
 * options this leaves out). */
function oneByOne(page, set, { from = set.seed, count = set.count, themes = set.themes, taken = [] } = {}) {
  return page.evaluate(async ([s, from, count, themes, taken]) => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const { COACH_BANDS } = await import('./coach-data.js');
    const band = COACH_BANDS.find((b) => b.name === s.band);
    const out = [];
    for (let seed = from; out.length < count; seed++) {
      const options = { theme: themes[out.length % themes.length], rule: s.rule, size: s.size, ratingLo: band.lo, ratingHi: band.hi, seed, count: 1 };
      const p = JSON.parse(m.generateSet(options)).puzzles[0];
      if (![...taken, ...out].some((q) => q.id === p.id)) out.push(p);
    }
    return out;
  }, [set, from, count, themes, taken]);
}

/**
 * A student opens the link and works through the set: `plan[i]` is "clean" (solve it),
 * "hint" (one hint, then solve), "wrong" (a wrong four first, then retry and solve) or
 * "stop" (finish the set here, leaving the rest untried). Returns the result code.
 */
async function student(link, name, puzzles, plan, viewport) {
  const { page, context, errors } = await open(env.browser, link, viewport);
  page.on('dialog', (d) => d.accept());
  await page.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  // A set from a link has its answer keys proved first; the banners (the set added, the keys
  // checked) float over the top of the board, so they are dismissed before play.
  await page.waitForSelector('#banners .banner[data-id="check"]', { timeout: 60000 });
  assert.match(await page.textContent('#banners .banner[data-id="check"] p'), /^All 6 answer keys of .* check out\.$/);
  await page.$$eval('#banners .banner button', (bs) => bs.forEach((b) => b.click()));
  const touch = !!viewport.touch;
  for (let i = 0; i < puzzles.length; i++) {
    const p = puzzles[i];
    await page.waitForFunction((n) => document.getElementById('tonight-count').textContent.startsWith(`Puzzle ${n} `), i + 1);
    if (plan[i] === 'stop') {
      await page.click(`#tonight-marks li:nth-child(${puzzles.length}) button`);
      await page.waitForFunction((n) => document.getElementById('tonight-count').textContent.startsWith(`Puzzle ${n} `), puzzles.length);
      break;
    }
    if (plan[i] === 'hint') {
      await page.click('#tonight-play [data-act="hint"]');
      await page.waitForSelector(`#${BOARD}[data-hints="1"]`);
    }
    if (plan[i] === 'wrong') {
      // A four that is not an answer if there is one (refuted by the block), else any point.
      let wrong;
      try {
        wrong = wrongFour(p);
      } catch {
        wrong = wrongMove(p);
      }
      await tap(page, BOARD, wrong, { touch });
      if (touch) await tap(page, BOARD, wrong, { touch });
      await page.waitForSelector(`#${BOARD}[data-state="failed"][data-pending="0"]`);
      await page.click('#tonight-play [data-act="retry"]');
      await settled(page, BOARD, 0);
    }
    try {
      await solve(page, BOARD, p.solution.line, { touch, confirm: touch });
    } catch (e) {
      const seen = await page.$eval(`#${BOARD}`, (c) => JSON.stringify(c.dataset));
      throw new Error(`${name}, puzzle ${i + 1} (${plan[i]}): line ${p.solution.line.join(' ')}; board ${seen}; message ${await page.textContent('#tonight-message')}: ${e.message}`);
    }
    if (i + 1 < puzzles.length) await page.click('#tonight-play [data-act="next"]');
  }
  await page.click('#tonight-play [data-act="next"]');
  // With puzzles left untried, the page asks first.
  await page.waitForSelector('#tonight-summary:not([hidden]), #finish-anyway:visible');
  if (plan.includes('stop')) await page.click('#finish-anyway');
  await page.waitForSelector('#tonight-summary:not([hidden])');
  await page.fill('#student-name', name);
  const code = await resultCode(page);
  assert.match(code, /^[0-9A-Z]{4}(-[0-9A-Z]{1,4})+$/, `${name}'s code`);
  if (touch) {
    await artefact(page, 'coach-student-phone');
    // A message (the code copied) never covers the QR code held up to a camera: with the QR
    // code at the foot of the screen, the banner stands at the top.
    await page.$eval('#result-qr', (q) => q.scrollIntoView({ block: 'end' }));
    await page.$eval('#copy-code', (b) => b.click());
    await page.waitForSelector('#banners .banner[data-id="copied"]');
    const [qr, msg] = await page.$$eval('#result-qr, #banners .banner[data-id="copied"]', (l) => l.map((x) => {
      const r = x.getBoundingClientRect();
      return { top: r.top, bottom: r.bottom };
    }));
    assert.ok(msg.bottom <= qr.top || msg.top >= qr.bottom, `the message ${JSON.stringify(msg)} is clear of the QR code ${JSON.stringify(qr)}`);
    await artefact(page, 'coach-student-copied-phone');
  }
  assert.deepEqual(errors, [], `${name}: no errors`);
  await context.close();
  return code;
}

/** The class table as shown: rows of [name, score, ...cells as "outcome|words"], the footer. */
function shownTable(page) {
  return page.$eval('#coach-table', (t) => ({
    rows: [...t.tBodies[0].rows].map((r) => [
      r.cells[0].textContent,
      r.cells[1].textContent,
      ...[...r.cells].slice(2).map((c) => `${c.dataset.outcome}|${c.dataset.words}|${c.querySelector('.mark').dataset.outcome}`),
    ]),
    foot: [...t.tFoot.rows[0].cells].map((c) => c.textContent),
  }));
}

// What each student's plan gives, puzzle by puzzle, in the table's words (Tonight does not
// time puzzles, so no time is shown).
const CELL = { clean: 'clean|clean|clean', hint: 'helped|helped, 1 hint|helped', wrong: 'helped|helped|helped', untried: 'untried|untried|untried' };

test('the class round trip: make, hand out, three students, read the codes back', async () => {
  // The instructor's device has three cores, whatever this machine has: Coach makes the set
  // on three workers.
  const coach = await openOnCores(env.browser, env.server.url, 3);
  const { page, errors } = coach;
  const { set, ms } = await makeSet(page, { title: 'Harbour Street: Tuesday', theme: 'four-three', count: 6, seed: 20261 });
  console.log(`    made a set of 6 four-threes on three workers in ${ms} ms`);
  assert.equal(set.puzzles.length, 6);
  assert.ok(set.puzzles.every((p) => p.theme === 'four-three' && p.rule === 'freestyle'));
  assert.equal(new Set(set.puzzles.map((p) => p.id)).size, 6, 'no puzzle twice');
  // The progress said how far it got, and the preview shows puzzle 1 with its goal.
  assert.equal(await page.$$eval('#coach-marks li', (l) => l.length), 6);
  assert.match(await page.textContent('#coach-goal'), /to play: find the four-three and win/);
  assert.ok(await page.isHidden('#coach-answer'));
  await page.click('#coach-show-answer');
  assert.match(await page.textContent('#coach-answer'), new RegExp(`^Correct first moves: .*${set.puzzles[0].solution.first_moves[0]}.*Main line: ${set.puzzles[0].solution.line.join(' ')}\\.$`));
  await artefact(page, 'coach-make-desktop', { fullPage: true });

  // The same seed makes the same set again (in a second set).
  const again = await makeSet(page, { title: 'Again', theme: 'four-three', count: 6, seed: 20261 });
  assert.deepEqual(again.set.puzzles, set.puzzles, 'the seed makes the same puzzles');
  // Coach made them on one worker per core; the set is the one a single worker makes.
  assert.equal(await page.getAttribute('#coach', 'data-workers'), '3');
  assert.deepEqual(set.puzzles, await oneByOne(page, set), 'the workers make the set one worker makes');
  // ...which is then deleted, and brought back by Undo, and deleted again.
  await page.click('#coach-back');
  assert.equal(await page.$$eval('#coach-sets li', (l) => l.length), 2);
  await page.locator('#coach-sets li', { hasText: 'Again' }).getByRole('button', { name: 'Delete' }).click();
  assert.equal(await page.$$eval('#coach-sets li', (l) => l.length), 1);
  await page.locator('#banners .banner', { hasText: 'Deleted "Again"' }).getByRole('button', { name: 'Undo' }).click();
  assert.equal(await page.$$eval('#coach-sets li', (l) => l.length), 2);
  await page.locator('#coach-sets li', { hasText: 'Again' }).getByRole('button', { name: 'Delete' }).click();
  await page.locator('#coach-sets li', { hasText: 'Harbour Street' }).getByRole('button', { name: 'Open' }).click();

  // Hand out: the link is on the page's own address (no club address set) with a QR code.
  await page.click('#coach-tabs [data-tab="handout"]');
  const link = await page.inputValue('#coach-link');
  assert.ok(link.startsWith(`${env.server.url}#set=`), link);
  const version = Number(await page.getAttribute('#coach-qr', 'data-version'));
  assert.ok(version >= 1 && version <= 25, `QR version ${version}`);
  assert.match(await page.textContent('#coach-qr-note'), new RegExp(`version ${version}\\b`));
  const qrWidth = await page.$eval('#coach-qr', (c) => c.getBoundingClientRect().width);
  assert.ok(qrWidth >= 300, `the QR code is ${qrWidth} px wide`);
  await artefact(page, 'coach-handout-desktop', { fullPage: true });

  // Three students, each in a browser context of their own.
  const plans = {
    'Mira Okafor': ['clean', 'clean', 'clean', 'clean', 'clean', 'clean'],
    'Tomas Reyne': ['hint', 'wrong', 'clean', 'clean', 'clean', 'clean'],
    '=Ines Varga': ['clean', 'clean', 'clean', 'stop', 'stop', 'stop'],
  };
  const codes = {};
  codes['Mira Okafor'] = await student(link, 'Mira Okafor', set.puzzles, plans['Mira Okafor'], {});
  codes['Tomas Reyne'] = await student(link, 'Tomas Reyne', set.puzzles, plans['Tomas Reyne'], SMALL_PHONE);
  codes['=Ines Varga'] = await student(link, '=Ines Varga', set.puzzles, plans['=Ines Varga'], {});

  // A code for another set (a library set) and a damaged code (one character changed).
  const other = await page.evaluate(async (json) => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const n = JSON.parse(json).puzzles.length;
    return m.resultCode(json, 'Tomas Reyne', Array.from({ length: n }, () => ({ attempt: 'clean', hints: 0, seconds: null })));
  }, JSON.stringify(librarySet('four-threes-freestyle')));
  const good = codes['Mira Okafor'];
  const at = good.length - 2;
  const damaged = good.slice(0, at) + (good[at] === '7' ? '8' : '7') + good.slice(at + 1);

  await page.click('#coach-tabs [data-tab="results"]');
  // With the words students write around their codes, which are text, not damaged codes.
  const pasted = `${codes['Mira Okafor']} (Mira)\n${damaged}\n${other}, ${codes['Tomas Reyne']}\nThanks, see you Tuesday! It’s Mira’s turn.`;
  await page.fill('#coach-codes', pasted);
  await page.click('#coach-read');
  const reports = await page.$$eval('#coach-reports li', (l) => l.map((li) => [li.dataset.kind, li.dataset.line, li.textContent]));
  assert.equal(reports[0][2], '2 new students, 0 replaced, 2 to look at.');
  const refused = reports.filter((r) => r[0] === 'refused' && r[1] !== '0');
  assert.equal(refused.length, 2, JSON.stringify(reports));
  assert.equal(refused[0][1], '2', 'the damaged code is on line 2');
  assert.match(refused[0][2], /^line 2, /);
  assert.equal(refused[1][1], '3', 'the other set\'s code is on line 3');
  assert.match(refused[1][2], /another set/);
  assert.deepEqual(reports.at(-1), ['skipped', '1',
    'Skipped as text, not codes: line 1 ‘Mira’, line 4 ‘Thanks’, line 4 ‘see you Tuesday! It’s Mira’s turn’.']);
  assert.equal(reports.length, 4, JSON.stringify(reports));
  assert.equal(await page.inputValue('#coach-codes'), pasted,
    'the pasted text stays while some of it was refused');
  await page.$eval('#coach-reports', (r) => r.scrollIntoView());
  await artefact(page, 'coach-reports-desktop');
  // The same code again changes nothing, and is no problem to look at; here it comes wrapped
  // onto two lines, as a mail program may send it.
  const half = good.indexOf('-', good.length / 2) + 1;
  await page.fill('#coach-codes', `Mira again: ${good.slice(0, half)}\n${good.slice(half)}.`);
  await page.click('#coach-read');
  assert.equal(await page.textContent('#coach-reports li:first-child'), '0 new students, 0 replaced, 1 unchanged.');

  // The third code comes in by the camera, as at a venue with no signal: a second browser
  // whose fake camera shows the student's QR code (a Y4M video made from the app's own QR
  // modules), holding the instructor's saved data; what it reads is then taken back.
  const saved = (p) => p.evaluate(() => Object.fromEntries(Object.keys(localStorage)
    .filter((k) => k.startsWith('fivefold.')).map((k) => [k, localStorage.getItem(k)])));
  const qr = await page.evaluate(async (code) => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const q = m.qrMatrix(code);
    return { size: q.size, quiet: q.quiet, dark: Array.from(q.dark) };
  }, codes['=Ines Varga']);
  const tmp = mkdtempSync(join(tmpdir(), 'fivefold-coach-'));
  const video = join(tmp, 'code.y4m');
  writeFileSync(video, y4m(qr));
  const camera = await launch({
    args: ['--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream', `--use-file-for-fake-video-capture=${video}`],
  });
  try {
    const cam = await context(camera, {});
    await cam.page.addInitScript((items) => {
      if (sessionStorage.getItem('seeded')) return;
      for (const [k, v] of Object.entries(items)) localStorage.setItem(k, v);
      sessionStorage.setItem('seeded', '1');
    }, await saved(page));
    await cam.page.goto(env.server.url);
    await ready(cam.page);
    await goTo(cam.page, 'coach');
    await cam.page.waitForSelector('#coach-codes:visible');
    await cam.page.click('#coach-scan');
    await cam.page.waitForSelector('#coach-scanner:not([hidden])');
    await cam.page.waitForFunction(() => document.querySelectorAll('#coach-table tbody tr').length === 3, null, { timeout: 30000 });
    assert.equal(await cam.page.textContent('#coach-reports li'), '1 new student, 0 replaced.');
    await artefact(cam.page, 'coach-scan-desktop');
    await cam.page.click('#coach-scan');
    assert.ok(await cam.page.isHidden('#coach-scanner'), 'the scanner closes');
    const back = await saved(cam.page);
    assert.deepEqual(cam.errors, []);
    await page.evaluate((items) => { for (const [k, v] of Object.entries(items)) localStorage.setItem(k, v); }, back);
    await page.reload();
    await ready(page);
    await page.waitForFunction(() => document.querySelectorAll('#coach-table tbody tr').length === 3);
  } finally {
    await camera.close();
    rmSync(tmp, { recursive: true, force: true });
  }
  // The third code pasted again, in lower case with spaces, changes nothing.
  await page.fill('#coach-codes', `  ${codes['=Ines Varga'].toLowerCase()}  `);
  await page.click('#coach-read');
  assert.match(await page.textContent('#coach-reports li:nth-child(2)'), /nothing changed/);
  await page.fill('#coach-codes', codes['Mira Okafor']);
  await page.click('#coach-read');
  assert.match(await page.textContent('#coach-reports li:nth-child(2)'), /the same result for Mira Okafor again; nothing changed/);

  // The table, cell by cell, in the order the codes came in.
  const expectRow = (name) => {
    const plan = plans[name];
    const solved = plan.filter((x) => x !== 'stop').length;
    return [name, `${solved} of 6`, ...plan.map((x) => CELL[x === 'stop' ? 'untried' : x])];
  };
  let shown = await shownTable(page);
  // A time bucket follows the words when Tonight timed the puzzle; the rest is exact.
  const untimed = (row) => row.map((c) => c.replace(/, (under 30 s|under 2 min|under 5 min|5 min or more)(?=\|)/, ''));
  assert.deepEqual(shown.rows.map(untimed), ['Mira Okafor', 'Tomas Reyne', '=Ines Varga'].map(expectRow));
  const cellWords = Object.fromEntries(shown.rows.map((r) => [r[0], r.slice(2).map((c) => c.split('|')[1])]));
  assert.deepEqual(shown.foot, ['Solved by', '', '3 of 3 (100%)', '3 of 3 (100%)', '3 of 3 (100%)', '2 of 3 (67%)', '2 of 3 (67%)', '2 of 3 (67%)']);
  // The marks are drawn as Tonight draws them (the same styles).
  const look = await page.$eval('#coach-table tbody tr:nth-child(1) td:nth-child(3) .mark', (m) => getComputedStyle(m).backgroundColor);
  const tonightLook = await page.evaluate(() => {
    const probe = document.createElement('ol');
    probe.className = 'marks';
    probe.innerHTML = '<li><button class="mark" data-outcome="clean">1</button></li>';
    document.body.append(probe);
    const c = getComputedStyle(probe.querySelector('.mark')).backgroundColor;
    probe.remove();
    return c;
  });
  assert.equal(look, tonightLook, 'a clean mark looks as in Tonight');

  // Sorted by name, then by score.
  await page.selectOption('#coach-sort', 'name');
  shown = await shownTable(page);
  assert.deepEqual(shown.rows.map((r) => r[0]), ['=Ines Varga', 'Mira Okafor', 'Tomas Reyne']);
  await page.selectOption('#coach-sort', 'score');
  shown = await shownTable(page);
  assert.deepEqual(shown.rows.map((r) => r[0]), ['Mira Okafor', 'Tomas Reyne', '=Ines Varga']);
  await artefact(page, 'coach-results-desktop', { fullPage: true });

  // The CSV download matches the table (rows by score), with the formula guard on the name.
  const [download] = await Promise.all([page.waitForEvent('download'), page.click('#coach-csv')]);
  assert.match(download.suggestedFilename(), /\.csv$/);
  const csv = await readFile(await download.path(), 'utf8');
  const field = (f) => (/[",\r\n]/.test(String(f)) ? `"${String(f).replace(/"/g, '""')}"` : String(f));
  const line = (name, shownName) => {
    const plan = plans[name];
    return [shownName, plan.filter((x) => x !== 'stop').length, plan.filter((x) => x === 'clean').length, ...cellWords[name]]
      .map(field).join(',');
  };
  assert.equal(csv, [
    'Student,Solved,Clean,Puzzle 1,Puzzle 2,Puzzle 3,Puzzle 4,Puzzle 5,Puzzle 6',
    line('Mira Okafor', 'Mira Okafor'),
    line('Tomas Reyne', 'Tomas Reyne'),
    line('=Ines Varga', "'=Ines Varga"),
    'Solved by,,,3 of 3 (100%),3 of 3 (100%),3 of 3 (100%),2 of 3 (67%),2 of 3 (67%),2 of 3 (67%)',
    '',
  ].join('\r\n'));

  // The table is kept with the set: after a reload it is all there.
  await page.reload();
  await page.waitForSelector('html[data-ready="true"]');
  // Coach's script loads after the app is ready (on first opening): wait for its table.
  await page.waitForSelector('#coach-table tbody tr');
  shown = await shownTable(page);
  assert.deepEqual(shown.rows.map((r) => r[0]), ['Mira Okafor', 'Tomas Reyne', '=Ines Varga']);

  // Tuesday's code pasted into another of the instructor's sets is refused, naming the set it
  // belongs to.
  await makeSet(page, { title: 'Harbour Street: Thursday', theme: 'four-three', count: 1, seed: 3 });
  await page.click('#coach-tabs [data-tab="results"]');
  await page.fill('#coach-codes', codes['Mira Okafor']);
  await page.click('#coach-read');
  const wrongSet = await page.textContent('#coach-reports li:nth-child(2)');
  assert.match(wrongSet, /a result for your set “Harbour Street: Tuesday” \(set key [0-9a-f]{8}\), not this one; skipped$/);
  assert.equal(await page.$$eval('#coach-table tbody tr', (l) => l.length), 0, 'nothing was added');

  assert.deepEqual(errors, []);
  await coach.context.close();
});

test('a set of two themes made on four workers is the set one worker makes, and Cancel stops it', async () => {
  const { page, context: ctx, errors } = await openOnCores(env.browser, env.server.url, 4);
  // Themes in turn: each puzzle started ahead of its turn is given its place's theme.
  const { set } = await makeSet(page, { title: 'Harbour Street: mixed', themes: ['four-three', 'vcf'], count: 7, seed: 31 });
  assert.equal(await page.getAttribute('#coach', 'data-workers'), '4');
  assert.deepEqual(set.puzzles.map((p) => p.theme), ['four-three', 'vcf', 'four-three', 'vcf', 'four-three', 'vcf', 'four-three']);
  assert.deepEqual(set.puzzles, await oneByOne(page, set), 'the four workers make the set one worker makes');
  // One more like puzzle 1: a single puzzle, its games spread over the four workers; it is the
  // puzzle one worker makes from the next seed (the one after, if that repeats a puzzle).
  await page.click('#coach-more');
  await page.waitForSelector('#coach[data-made="8"]:not([data-making])', { timeout: 120000 });
  assert.equal(await page.getAttribute('#coach', 'data-workers'), '4');
  const more = await page.evaluate(() => {
    const d = JSON.parse(localStorage.getItem('fivefold.coach')).data;
    return d.sets.find((s) => s.id === d.open).puzzles.at(-1);
  });
  const [expected] = await oneByOne(page, set, { from: set.seed + set.next, count: 1, themes: [set.puzzles[0].theme], taken: set.puzzles });
  assert.deepEqual(more, expected, 'one more like it, on four workers, is the puzzle one worker makes');
  // Cancel while defence puzzles are being made: the busy line goes, the puzzles made so far
  // stay, and no more come afterwards.
  await makeSet(page, { title: 'Harbour Street: stopped', theme: 'defend', count: 12, seed: 5, wait: false });
  await page.waitForFunction(() => Number((document.getElementById('coach').dataset.making ?? '0/0').split('/')[0]) >= 1, null, { timeout: 120000 });
  await page.click('#coach-cancel');
  await page.waitForSelector('#coach:not([data-making])');
  const kept = Number(await page.getAttribute('#coach', 'data-made'));
  assert.ok(kept >= 1 && kept < 12, `kept ${kept}`);
  await page.waitForTimeout(1500);
  assert.equal(Number(await page.getAttribute('#coach', 'data-made')), kept, 'nothing more after Cancel');
  const stored = await page.evaluate(() => {
    const d = JSON.parse(localStorage.getItem('fivefold.coach')).data;
    return d.sets.find((s) => s.id === d.open).puzzles.length;
  });
  assert.equal(stored, kept);
  assert.match(await page.textContent('#banners'), new RegExp(`Stopped: made ${kept} of 12 puzzles; they are kept\\.`));
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a set made again keeps its earlier puzzles until the new ones are there', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  const title = 'Harbour Street: made again';
  const { set } = await makeSet(page, { title, theme: 'four-three', count: 3, seed: 7 });
  const earlier = set.puzzles.map((p) => p.id);
  const stored = () => page.evaluate(() => {
    const d = JSON.parse(localStorage.getItem('fivefold.coach')).data;
    return d.sets.find((s) => s.id === d.open);
  });
  // Forty Expert threes and fours instead (deep lines, many seconds each), stopped before
  // the first is made: the set keeps the three it had.
  page.once('dialog', (d) => d.accept());
  await makeSet(page, { title, theme: 'vct', band: 'expert', count: 40, seed: 7, keep: true, wait: false });
  await page.waitForSelector('#coach[data-making]');
  await page.click('#coach-cancel');
  await page.waitForSelector('#coach:not([data-making])');
  let now = await stored();
  assert.deepEqual(now.puzzles.map((p) => p.id), earlier);
  assert.equal(now.next, set.next, 'and the seed One more like it goes on from');
  assert.equal(now.earlier, undefined);
  assert.equal(now.making, undefined);
  assert.equal(await page.getAttribute('#coach', 'data-made'), '3');
  const said = await page.textContent('#banners');
  assert.match(said, /Stopped before any puzzle was made\./);
  assert.match(said, /The set keeps its 3 earlier puzzles\./);
  // Again, and the page is closed while the first is being made: opened again, Coach gives
  // the earlier puzzles back and says what happened.
  page.once('dialog', (d) => d.accept());
  await page.click('#coach-make-go');
  await page.waitForSelector('#coach[data-making]');
  now = await stored();
  assert.deepEqual(now.earlier.puzzles.map((p) => p.id), earlier, 'kept with the set while it is made');
  assert.equal(now.earlier.next, set.next);
  assert.deepEqual(now.making, { count: 40 });
  await page.reload();
  await ready(page);
  await goTo(page, 'coach');
  await page.waitForSelector('#banners .banner[data-id="coach"]');
  assert.equal(await page.textContent('#banners .banner[data-id="coach"] p'),
    `Making “${title}” was cut short (the page was closed or reloaded, or Fivefold opened in another tab, while it ran); the set keeps its 3 earlier puzzles.`);
  await artefact(page, 'coach-cut-short-desktop');
  now = await stored();
  assert.deepEqual(now.puzzles.map((p) => p.id), earlier);
  assert.equal(now.next, set.next);
  assert.equal(now.earlier, undefined);
  assert.equal(now.making, undefined);
  await page.waitForSelector('#coach[data-made="3"]');
  // A making that ends replaces them, with an Undo that gives them back.
  page.once('dialog', (d) => d.accept());
  await makeSet(page, { title, theme: 'four-three', band: 'any', count: 2, seed: 8, keep: true, wait: false });
  await page.waitForSelector('#coach[data-made="2"]:not([data-making])', { timeout: 60000 });
  const undo = page.locator('#banners .banner[data-id="coach-undo"]');
  assert.match(await undo.textContent(), /The new puzzles replaced the 3 earlier ones\./);
  await undo.getByRole('button', { name: 'Undo' }).click();
  now = await stored();
  assert.deepEqual(now.puzzles.map((p) => p.id), earlier);
  assert.equal(now.next, set.next);
  assert.equal(now.earlier, undefined);
  // A damaged `earlier` or `making` is dropped where it is used, never the set or the rest.
  await page.evaluate(async () => {
    const { checksum } = await import('./store.js');
    const doc = JSON.parse(localStorage.getItem('fivefold.coach'));
    const s = doc.data.sets.find((x) => x.id === doc.data.open);
    s.earlier = { puzzles: 'junk', next: -1 };
    s.making = { count: 'many' };
    doc.sum = checksum(JSON.stringify(doc.data));
    localStorage.setItem('fivefold.coach', JSON.stringify(doc));
  });
  await page.reload();
  await ready(page);
  await goTo(page, 'coach');
  await page.waitForSelector('#banners .banner[data-id="coach"]');
  assert.equal(await page.textContent('#banners .banner[data-id="coach"] p'),
    `Making “${title}” was cut short (the page was closed or reloaded, or Fivefold opened in another tab, while it ran); the set keeps the 3 puzzles it has (its earlier ones could not be read).`);
  now = await stored();
  assert.deepEqual(now.puzzles.map((p) => p.id), earlier);
  assert.equal(now.earlier, undefined);
  assert.equal(now.making, undefined);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('the band note says where each theme rates, and what a band below that finds', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url, SMALL_PHONE);
  await goTo(page, 'coach');
  if (await page.isVisible('#coach-back')) await page.click('#coach-back');
  await page.click('#coach-new');
  await page.selectOption('#coach-rule', 'freestyle');
  const note = async (band, ...themes) => {
    await page.selectOption('#coach-band', band);
    for (const theme of themes) await page.check(`#coach-theme-list input[value="${theme}"]`);
    for (const other of await page.$$eval('#coach-theme-list input:checked', (l) => l.map((i) => i.value))) {
      if (!themes.includes(other)) await page.uncheck(`#coach-theme-list input[value="${other}"]`);
    }
    return page.$eval('#coach-band-note', (n) => ({ text: n.textContent, kind: n.dataset.kind }));
  };
  // The ranges are the library's (one correct answer each): threes and fours rate 1650 and up.
  const { lo, hi } = await page.evaluate(async () => {
    const { COACH_BANDS } = await import('./coach-data.js');
    return COACH_BANDS.find((b) => b.name === 'club');
  });
  const any = await note('any', 'vct');
  assert.match(any.text, /^Win with threes and fours: usually (\d+) to (\d+)\.$/, any.text);
  assert.equal(any.kind, '');
  const [, from] = any.text.match(/usually (\d+)/);
  assert.ok(Number(from) > hi, `the library's threes and fours start above the Club band (${from})`);
  // Below the range: only puzzles with two or three answers fit, and the note says so; a
  // Club set is made, and each of its puzzles has two or three correct answers.
  const club = await note('club', 'vct');
  assert.match(club.text, /with one correct answer\. At this level only puzzles with two or three are found/);
  assert.equal(club.kind, 'warn');
  await page.$eval('#coach-band-note', (n) => n.scrollIntoView({ block: 'center' }));
  await artefact(page, 'coach-band-note-phone');
  const { set } = await makeSet(page, { title: 'Harbour Street: club threats', theme: 'vct', count: 2, seed: 11, band: 'club', keep: true, timeout: 180000 });
  for (const p of set.puzzles) {
    assert.ok(p.rating >= lo && p.rating <= hi, `rating ${p.rating}`);
    assert.ok([2, 3].includes(p.solution.first_moves.length), `${p.id}: ${p.solution.first_moves}`);
  }
  // Above the range: several answers only rate lower, so few or none will be found.
  const strong = await note('strong', 'four-three');
  assert.match(strong.text, /^Four-three: usually \d+ to \d+, below this band: few or none will be found\.$/, strong.text);
  assert.equal(strong.kind, 'warn');
  // In a set of several themes, such a theme is left out when it gives none (as one below its
  // range is); the other theme's note is plain.
  const mixed = await note('strong', 'four-three', 'vct');
  assert.match(mixed.text, /^Four-three: usually \d+ to \d+, below this band: few or none will be found, and a theme that keeps giving none is left out of the rest of the set\. Win with threes and fours: usually \d+ to \d+\.$/, mixed.text);
  assert.equal(mixed.kind, 'warn');
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a theme that gives no puzzle at the band is left out, and the set is made of the others', async () => {
  const { page, context: ctx, errors } = await openOnCores(env.browser, env.server.url, 4);
  // Threes and fours never rate as low as Starting out (engine/benches/README.md: none of 1,000
  // made over the whole range rated under 1456), so the games of its two tries (seeds 405 and
  // 406) run out; the set goes on with four-threes, from the seeds after them. On four workers,
  // seed 406 starts ahead as a four-three and must be made again as threes and fours, and seed
  // 407 starts ahead as threes and fours and must be made again as a four-three.
  const seed = 404;
  const { set } = await makeSet(page, { title: 'Harbour Street: first steps', themes: ['four-three', 'vct'], count: 4, seed, rule: 'freestyle', band: 'starting', timeout: 240000 });
  assert.equal(await page.getAttribute('#coach', 'data-workers'), '4');
  assert.deepEqual(set.themes, ['four-three', 'vct'], 'the recipe keeps both themes');
  const expected = await page.evaluate(async (seeds) => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const { COACH_BANDS } = await import('./coach-data.js');
    const band = COACH_BANDS.find((b) => b.name === 'starting');
    return seeds.map((seed) => JSON.parse(m.generateSet({ theme: 'four-three', rule: 'freestyle', size: 15, ratingLo: band.lo, ratingHi: band.hi, seed, count: 1 })).puzzles[0]);
  }, [seed, seed + 3, seed + 4, seed + 5]);
  assert.deepEqual(set.puzzles, expected, 'four-threes from the seeds before and after the two that gave none');
  assert.ok(set.puzzles.every((p) => p.rating <= 1250), set.puzzles.map((p) => p.rating).join(' '));
  assert.match(await page.textContent('#banners'), /Made 4 puzzles in [^.]*\. “Win with threes and fours” gave no puzzle at this difficulty from 2 seeds in a row, so it was left out of the rest of the set\./);
  assert.equal(set.next, 6, 'seeds 404 to 409 were used');
  assert.equal(await page.getAttribute('#banners .banner[data-id="coach"]', 'data-kind'), 'warn');
  await artefact(page, 'coach-left-out-desktop');
  // The note said so before the making.
  assert.match(await page.textContent('#coach-band-note'), /a theme that keeps giving none is left out of the rest of the set\./);
  // With that theme alone there is nothing to go on with: the making stops and says why.
  await makeSet(page, { title: 'Harbour Street: threats only', theme: 'vct', count: 1, seed, rule: 'freestyle', band: 'starting', wait: false });
  assert.equal(await page.textContent('#coach-make-go'), 'Make 1 puzzle');
  assert.equal(await page.$('#banners .banner[data-id="coach"]'), null, 'the last making\'s message is gone');
  // While its second seed is tried, the progress line says why nothing has come yet.
  await page.waitForFunction(() => /^Made 0 of 1 · \d+:\d\d · 1 seed gave none · 4 at a time$/.test(document.querySelector('#coach-busy-text').textContent), null, { timeout: 120000 });
  await artefact(page, 'coach-busy-passed-desktop');
  await page.waitForSelector('#coach:not([data-making])', { timeout: 240000 });
  assert.equal(await page.getAttribute('#coach', 'data-made'), '0');
  assert.match(await page.textContent('#banners'), /Made 0 of 1 puzzle; then it stopped: no puzzle came at this difficulty \(“Win with threes and fours”: none from 2 seeds in a row\); choose another difficulty\./);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a seed that gives no puzzle at the band is passed over, and the next seed takes its place', async () => {
  const { page, context: ctx, errors } = await open(env.browser, env.server.url);
  // Club four-threes: most seeds give one, seed 3 does not (engine/benches/README.md,
  // 2026-12-04, 15:05 to 15:56: 4 of seeds 1 to 5; the library's four-threes rate up to 1320,
  // inside the band). A one-theme set from seed 1 used to stop there.
  const made = await page.evaluate(async () => {
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const { COACH_BANDS } = await import('./coach-data.js');
    const band = COACH_BANDS.find((b) => b.name === 'club');
    return [1, 2, 3, 4, 5].map((seed) => {
      try {
        return JSON.parse(m.generateSet({ theme: 'four-three', rule: 'freestyle', size: 15, ratingLo: band.lo, ratingHi: band.hi, seed, count: 1 })).puzzles[0];
      } catch (e) {
        return e.name;
      }
    });
  });
  assert.equal(made[2], 'NotEnough', 'seed 3 gives no Club four-three');
  const { set } = await makeSet(page, { title: 'Harbour Street: club four-threes', theme: 'four-three', count: 4, seed: 1, rule: 'freestyle', band: 'club' });
  assert.deepEqual(set.puzzles, [made[0], made[1], made[3], made[4]], 'the puzzles of seeds 1, 2, 4 and 5');
  assert.match(await page.textContent('#banners'), /Made 4 puzzles in [^.]*\. 1 seed gave no puzzle at this difficulty and was passed over\./);
  assert.equal(await page.getAttribute('#banners .banner[data-id="coach"]', 'data-kind'), 'info');
  await artefact(page, 'coach-passed-over-desktop');
  // One more like it goes on from seed 6, as the set would have.
  assert.equal(set.next, 5);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('the printed sheet: diagrams, goals and answer boxes, the answer key on a page of its own', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url);
  const { set } = await makeSet(page, { title: 'Harbour Street: <b>sheet</b>', theme: 'vcf', count: 5, seed: 7 });
  await page.click('#coach-tabs [data-tab="handout"]');
  await page.evaluate(() => {
    window.printed = 0;
    window.print = () => { window.printed++; };
  });
  await page.click('#coach-print-sheet');
  assert.equal(await page.evaluate(() => window.printed), 1);
  const sheet = await page.$eval('#coach-print', (p) => ({
    title: p.querySelector('h1').textContent,
    bold: p.querySelectorAll('h1 b').length,
    figures: [...p.querySelectorAll('figure')].map((f) => f.querySelector('figcaption').textContent),
    boxes: p.querySelectorAll('figure .answer').length,
    key: [...p.querySelectorAll('.key li')].map((li) => li.textContent),
    who: p.querySelector('p.who')?.textContent,
    text: p.textContent,
  }));
  assert.equal(sheet.title, 'Harbour Street: <b>sheet</b>', 'the title is text');
  assert.equal(sheet.bold, 0);
  assert.equal(sheet.figures.length, 5);
  sheet.figures.forEach((f, i) => assert.ok(f.startsWith(`${i + 1}. `), f));
  assert.equal(sheet.boxes, 5);
  assert.equal(sheet.key.length, 5);
  assert.match(sheet.who, /Name:.*Date:/);
  for (const p of set.puzzles) assert.ok(!sheet.text.includes(p.id), `no id ${p.id} on the sheet`);
  set.puzzles.forEach((p, i) => assert.ok(sheet.key[i].includes(p.solution.first_moves[0]), `key ${i + 1}`));
  // Coordinates print at least 8 pt: the font size in the diagram's units, times its printed
  // width over its width in units.
  await page.emulateMedia({ media: 'print' });
  const pt = await page.$eval('#coach-print svg.board', (svg) => {
    const units = svg.viewBox.baseVal.width;
    const mm = svg.getBoundingClientRect().width / 96 * 25.4;
    return Number(svg.getAttribute('font-size')) * (mm / units) / 25.4 * 72;
  });
  assert.ok(pt >= 8, `coordinates print at ${pt.toFixed(2)} pt`);
  // The key's two columns: the second column's numbers stand in the gap between them, which
  // leaves room for "40." at the key's type size (about 7 mm at 11 pt), clear of the first
  // column's text.
  await page.evaluate(() => { document.documentElement.dataset.print = 'sheet'; });
  const gap = await page.$eval('#coach-print .key ol', (ol) => {
    const boxes = [...ol.children].map((li) => li.getBoundingClientRect());
    const second = boxes.filter((b) => b.left > boxes[0].right);
    return second.length ? (second[0].left - boxes[0].right) / 96 * 25.4 : null;
  });
  assert.ok(gap !== null && gap >= 10, `the key's columns are ${gap?.toFixed(1)} mm apart`);
  await page.evaluate(() => { delete document.documentElement.dataset.print; });
  await page.emulateMedia({ media: null });
  // The page prints the sheet until the print is over ('afterprint'); each PDF here is a print.
  const printing = () => page.evaluate(() => { document.documentElement.dataset.print = 'sheet'; });
  await printing();
  const pages = (pdf) => (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
  const pdf = await page.pdf({ format: 'A4' });
  if (process.env.COACH_PDF) (await import('node:fs')).writeFileSync(process.env.COACH_PDF, pdf);
  const whole = pages(pdf);
  // The same sheet without its key: the key took pages of its own.
  await page.evaluate(() => { document.querySelector('#coach-print .key').hidden = true; });
  await printing();
  const noKey = pages(await page.pdf({ format: 'A4' }));
  assert.ok(noKey >= 1 && whole === noKey + 1, `${whole} pages with the key, ${noKey} without`);
  assert.deepEqual(errors, []);
  await context.close();
});

test('Coach on a phone: make, preview, hand out and results fit 360 px', async () => {
  const { page, context, errors } = await open(env.browser, env.server.url, SMALL_PHONE);
  await makeSet(page, { title: 'Harbour Street: phone', theme: 'vcf', count: 8, seed: 99 });
  const wide = () => page.evaluate(() => document.documentElement.scrollWidth);
  assert.ok(await wide() <= 360, 'nothing is wider than the phone (make)');
  await artefact(page, 'coach-make-phone', { fullPage: true });
  await page.click('#coach-marks li:nth-child(2) button');
  await page.click('#coach-show-answer');
  await artefact(page, 'coach-preview-phone');
  await page.click('#coach-tabs [data-tab="handout"]');
  assert.ok(await wide() <= 360, 'nothing is wider than the phone (hand out)');
  await artefact(page, 'coach-handout-phone', { fullPage: true });
  await page.click('#coach-tabs [data-tab="results"]');
  // A damaged code (its report is the longest line), and a word that is no code.
  await page.fill('#coach-codes', 'HELLO\n0B5G-X7SV-1D6P-JWK1-417P-PRB6-DXS0-C022-GM51-8A20-ZR8C-780');
  await page.click('#coach-read');
  assert.match(await page.textContent('#coach-reports li:nth-child(2)'), /^line 2, ‘0B5G-X7SV-1D6P-JWK1-417P-PRB6-DXS0-C022-…’: this result code does not check out/);
  assert.equal(await page.textContent('#coach-reports li:nth-child(3)'), 'Skipped as text, not codes: line 1 ‘HELLO’.');
  assert.ok(await wide() <= 360, 'nothing is wider than the phone (results)');
  // Two students' codes: the table's cells carry words for a screen reader, which must not
  // widen the page, read or drawn again after a reload.
  const codes = await page.evaluate(async () => {
    const d = JSON.parse(localStorage.getItem('fivefold.coach')).data;
    const s = d.sets.find((x) => x.id === d.open);
    const json = JSON.stringify({ format: 'fivefold-set', version: 1, title: s.title, created: s.created, puzzles: s.puzzles });
    const m = await import('./workshop/fivefold_web.js');
    await m.default();
    const results = (attempt) => s.puzzles.map(() => ({ attempt, hints: 0, seconds: 20 }));
    return [m.resultCode(json, 'Mira Okafor', results('clean')), m.resultCode(json, 'Tomas Reyne', results('failed'))];
  });
  await page.fill('#coach-codes', codes.join('\n'));
  await page.click('#coach-read');
  await page.waitForSelector('#coach-table tbody tr:nth-child(2)');
  assert.ok(await wide() <= 360, 'nothing is wider than the phone (the class table)');
  await page.reload();
  await page.waitForSelector('#coach-table tbody tr:nth-child(2)');
  assert.ok(await wide() <= 360, 'nothing is wider than the phone (the class table after a reload)');
  await artefact(page, 'coach-results-phone', { fullPage: true });
  // Every control has a name and a target of at least 44 px.
  const small = await page.$$eval('#coach button, #coach input, #coach select, #coach textarea', (all) => all
    .filter((e) => e.getClientRects().length && !e.closest('[hidden]'))
    .filter((e) => e.getBoundingClientRect().height < 44 && e.type !== 'checkbox')
    .map((e) => e.id || e.textContent));
  assert.deepEqual(small, []);
  assert.deepEqual(errors, []);
  await context.close();
});
