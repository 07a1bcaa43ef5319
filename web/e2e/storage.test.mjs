// End-to-end: progress is saved after every move and survives a reload; a damaged stored copy
// is recovered from the last good one with a message; a full storage quota is reported and
// play goes on; a backup file can be exported and imported, and a bad one changes nothing.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import {
  addFromLibrary,
  artefact,
  banners,
  context,
  boardState,
  colourAt,
  isBlack,
  librarySet,
  open,
  ready,
  settled,
  tap,
  useBrowser,
  openSettings,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');
const BOARD = 'tonight-board';
const LINE = CLUB.puzzles[0].solution.line;

const env = useBrowser();

// The checksum of web/store.js (FNV-1a over UTF-16 code units), to forge a well-formed backup.
function fnv(text) {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

// Opens the club set and plays the first move of puzzle 1 (and the reply).
async function started() {
  const c = await open(env.browser, env.server.url);
  await addFromLibrary(c.page, CLUB.title);
  await tap(c.page, BOARD, LINE[0]);
  await settled(c.page, BOARD, 2);
  return c;
}

test('progress survives a reload, move by move', async () => {
  const { page, context, errors } = await started();
  const stored = await page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.tonight')));
  assert.equal(stored.format, 'fivefold-store');
  assert.equal(stored.version, 1);
  assert.equal(stored.data.view, 'play');
  assert.deepEqual(Object.values(stored.data.progress)[0].puzzles[CLUB.puzzles[0].id].played, [LINE[0]]);

  await page.reload();
  await ready(page);
  let s = await boardState(page, BOARD);
  assert.equal(s.moves, `${LINE[0]} ${LINE[1]}`);
  assert.equal(s.state, 'playing');
  assert.ok(isBlack(await colourAt(page, BOARD, LINE[0])));
  assert.equal(await page.textContent('#tonight-set-title'), CLUB.title);
  // Play on from where the reload left off, then move to puzzle 2 and reload again.
  await tap(page, BOARD, LINE[2]);
  await settled(page, BOARD, 4);
  await page.click('#tonight-marks li:nth-child(2) button');
  await page.waitForFunction(() => document.getElementById('tonight-count').textContent.startsWith('Puzzle 2 '));
  await page.reload();
  await ready(page);
  assert.equal(await page.textContent('#tonight-count'), `Puzzle 2 of ${CLUB.puzzles.length}`);
  await page.click('#tonight-marks li:nth-child(1) button');
  s = await boardState(page, BOARD);
  assert.equal(s.moves, LINE.slice(0, 4).join(' '));
  assert.deepEqual(await banners(page), []);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a second tab takes over saving: the first stops, says so, and can take it back', async () => {
  // Tab A has the club set open at puzzle 1 with a move played; tab B (the same browser)
  // opens, and saves from then on: tab A says so at once.
  const { page: a, context, errors } = await started();
  const b = await context.newPage();
  b.on('pageerror', (e) => errors.push(`page error (tab B): ${e.message}`));
  await b.goto(env.server.url);
  await ready(b);
  const notice = '#banners .banner[data-id="elsewhere"]';
  await a.waitForSelector(notice);
  assert.match(await a.textContent(`${notice} p`), /^Progress is now saved in another Fivefold tab or window, so nothing you do here is kept\./);
  assert.equal(await a.locator(`${notice} button`).count(), 1, 'the message cannot be dismissed, only acted on');
  await artefact(a, 'storage-elsewhere-desktop');
  // Tab B solves puzzle 1, from where tab A left it.
  await b.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  assert.equal((await boardState(b, BOARD)).moves, `${LINE[0]} ${LINE[1]}`);
  for (let i = 2; i < LINE.length; i += 2) {
    await tap(b, BOARD, LINE[i]);
    await b.waitForFunction(([id, n]) => {
      const d = document.getElementById(id).dataset;
      return d.pending === '0' && d.moves.split(' ').length >= n;
    }, [BOARD, i + 1]);
  }
  await b.waitForSelector(`#${BOARD}[data-state="solved"]`);
  const stored = (page) => page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.tonight')).data);
  const outcome = async (page) => Object.values((await stored(page)).progress)[0].puzzles[CLUB.puzzles[0].id]?.outcome;
  assert.equal(await outcome(b), 'clean');
  // Tab A plays on elsewhere: nothing of it is saved over tab B's progress.
  const before = await stored(a);
  await a.click('#tonight-marks li:nth-child(2) button');
  await a.waitForFunction(() => document.getElementById('tonight-count').textContent.startsWith('Puzzle 2 '));
  await tap(a, BOARD, CLUB.puzzles[1].solution.first_moves[0]);
  await a.waitForTimeout(300);
  assert.deepEqual(await stored(a), before, 'tab A saved nothing');
  assert.equal(await outcome(a), 'clean');
  // "Continue here": tab A loads again, with tab B's solve, and tab B stops saving in turn.
  await Promise.all([a.waitForEvent('load'), a.click(`${notice} button:has-text("Continue here")`)]);
  await ready(a);
  await a.click('#tonight-marks li:nth-child(1) button');
  assert.equal((await boardState(a, BOARD)).state, 'solved');
  await b.waitForSelector(notice);
  assert.equal(await a.isVisible(notice), false);
  assert.deepEqual(errors, []);
  await context.close();
});

test('without a channel between tabs, the first finds out at its next save and saves nothing', async () => {
  const { page: a, context: ctx, errors } = await context(env.browser);
  await ctx.addInitScript(() => {
    delete window.BroadcastChannel;
  });
  await a.goto(env.server.url);
  await ready(a);
  await addFromLibrary(a, CLUB.title);
  await tap(a, BOARD, LINE[0]);
  await settled(a, BOARD, 2);
  const b = await ctx.newPage();
  await b.goto(env.server.url);
  await ready(b);
  const notice = '#banners .banner[data-id="elsewhere"]';
  assert.equal(await a.isVisible(notice), false, 'nothing told tab A yet');
  // Tab A's next move is not saved, and tab A says why.
  await tap(a, BOARD, LINE[2]);
  await settled(a, BOARD, 4);
  await a.waitForSelector(notice);
  const played = await a.evaluate((id) =>
    Object.values(JSON.parse(localStorage.getItem('fivefold.tonight')).data.progress)[0].puzzles[id].played, CLUB.puzzles[0].id);
  assert.deepEqual(played, [LINE[0]]);
  assert.equal(await b.isVisible(notice), false);
  // Nor does it export a backup of its copy, which may be older than tab B's.
  await openSettings(a);
  const downloads = [];
  a.on('download', (d) => downloads.push(d));
  await a.click('#export-backup');
  assert.match(await a.textContent('#settings-note'), /could be out of date: choose "Continue here" first/);
  assert.equal(downloads.length, 0);
  assert.deepEqual(errors, []);
  await ctx.close();
});

test('a corrupted stored value is recovered from the last good copy, with a message', async () => {
  const { page, context, errors } = await started();
  // A crash mid-write: the main copy is cut short.
  await page.evaluate(() => {
    const v = localStorage.getItem('fivefold.tonight');
    localStorage.setItem('fivefold.tonight', v.slice(0, Math.floor(v.length / 2)));
  });
  await page.reload();
  await ready(page);
  const b = await banners(page);
  assert.equal(b.length, 1, `one message: ${b}`);
  assert.match(b[0], /^Your saved Tonight progress was damaged \(it is not readable \(cut short or overwritten\)\); the last good copy, from .+, was restored\.$/);
  const s = await boardState(page, BOARD);
  assert.equal(s.moves, `${LINE[0]} ${LINE[1]}`, 'the progress is back');
  // The main copy is whole again.
  const main = await page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.tonight')).version);
  assert.equal(main, 1);

  // A copy that still reads as JSON but was altered fails its checksum.
  await page.evaluate(() => {
    const v = JSON.parse(localStorage.getItem('fivefold.tonight'));
    v.data.name = 'someone else';
    localStorage.setItem('fivefold.tonight', JSON.stringify(v));
  });
  await page.reload();
  await ready(page);
  assert.match((await banners(page))[0], /checksum does not match.*last good copy/);

  // Both copies damaged: a fresh start, said so, and the damaged copy kept aside.
  await page.evaluate(() => {
    localStorage.setItem('fivefold.tonight', '{"format":"fivefold-store"');
    localStorage.setItem('fivefold.tonight.prev', 'garbage');
  });
  await page.reload();
  await ready(page);
  assert.match((await banners(page))[0], /no good copy was left; it starts afresh/);
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.tonight.damaged')), '{"format":"fivefold-store"');
  assert.ok(await page.isVisible('#tonight-list'));
  assert.deepEqual(errors, []);
  await context.close();
});

test('progress saved by a newer version of the app is never overwritten by this one', async () => {
  const { page, context, errors } = await started();
  // A newer build stored Tonight in a format this one does not read.
  const newer = await page.evaluate((sum) => {
    const data = { future: true };
    const text = JSON.stringify({ format: 'fivefold-store', version: 2, name: 'tonight', saved: new Date().toISOString(), sum, data });
    localStorage.setItem('fivefold.tonight', text);
    localStorage.setItem('fivefold.tonight.prev', text);
    return text;
  }, fnv(JSON.stringify({ future: true })));
  await page.reload();
  await ready(page);
  assert.match((await banners(page)).join(' '), /has version 2, not 1/);
  // Play on: this build keeps going, but does not save over the newer copy, and says so.
  await addFromLibrary(page, CLUB.title);
  await tap(page, BOARD, LINE[0]);
  await settled(page, BOARD, 2);
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.tonight')), newer);
  assert.match((await banners(page)).join(' '), /A newer version of Fivefold saved your progress on this device/);
  assert.deepEqual(errors, []);
  await context.close();
});

test('a full storage quota is reported and play goes on', async () => {
  const { page, context, errors } = await started();
  // Fill the origin's storage to the brim.
  const filled = await page.evaluate(() => {
    const chunk = 'x'.repeat(256 * 1024);
    let n = 0;
    for (;;) {
      try {
        localStorage.setItem(`junk.${n}`, chunk);
        n++;
      } catch (e) {
        if (e.name !== 'QuotaExceededError') throw e;
        break;
      }
    }
    for (let size = 128 * 1024; size >= 1; size = Math.floor(size / 2)) {
      try {
        localStorage.setItem(`junk.tail.${size}`, 'y'.repeat(size));
      } catch {
        // Full at this size: try a smaller piece.
      }
    }
    return n;
  });
  assert.ok(filled > 0);
  await tap(page, BOARD, LINE[2]);
  const s = await settled(page, BOARD, 4);
  assert.equal(s.state, 'playing', 'the move was graded and the reply played');
  const b = await banners(page);
  assert.equal(b.length, 1);
  assert.match(b[0], /storage is full, so your latest progress is not being saved\. Play goes on/);
  await page.waitForSelector('#banners [data-id="quota"][data-kind="warn"]');
  // Play goes on to the end, and the message is not repeated on every move.
  for (let i = 4; i < LINE.length; i += 2) {
    await tap(page, BOARD, LINE[i]);
    await settled(page, BOARD, Math.min(i + 2, LINE.length));
  }
  assert.equal((await boardState(page, BOARD)).state, 'solved');
  assert.equal((await banners(page)).length, 1);
  // Space freed: the next save succeeds and the warning goes.
  await page.evaluate(() => {
    for (const k of Object.keys(localStorage)) if (k.startsWith('junk.')) localStorage.removeItem(k);
  });
  await page.click('#tonight-play [data-act="next"]');
  await page.waitForFunction(() => !document.querySelector('#banners [data-id="quota"]'));
  assert.deepEqual(errors, []);
  await context.close();
});

test('a backup file is exported and imported; a bad one changes nothing and says why', async () => {
  const first = await started();
  await openSettings(first.page);
  const [download] = await Promise.all([
    first.page.waitForEvent('download'),
    first.page.click('#export-backup'),
  ]);
  assert.match(download.suggestedFilename(), /^fivefold-backup-\d{4}-\d{2}-\d{2}\.json$/);
  const text = readFileSync(await download.path(), 'utf8');
  const backup = JSON.parse(text);
  assert.equal(backup.format, 'fivefold-backup');
  assert.equal(backup.version, 1);
  assert.deepEqual(Object.keys(backup.data).sort(), ['coach', 'drill', 'games', 'practice', 'sets', 'settings', 'study', 'tonight']);
  await first.context.close();

  const { page, context, errors } = await open(env.browser, env.server.url);
  // Restoring over saved progress asks first; the test answers as `accept` says.
  let accept = true;
  const asked = [];
  page.on('dialog', (d) => {
    asked.push(d.message());
    return accept ? d.accept() : d.dismiss();
  });
  const importFile = async (name, body) => {
    await openSettings(page);
    await page.setInputFiles('#import-backup', { name, mimeType: 'application/json', buffer: Buffer.from(body) });
  };
  // Bad files: not JSON, a changed one, an invalid part. Each is refused and nothing changes.
  const altered = JSON.parse(text);
  altered.data.tonight.name = 'changed by hand';
  // A backup whose checksum is right but whose set is not valid.
  const invalid = JSON.parse(text);
  invalid.data.sets.list[0].json = '{"format":"fivefold-set","version":1}';
  invalid.sum = fnv(JSON.stringify(invalid.data));
  for (const [name, body, why] of [
    ['cut.json', text.slice(0, 100), /not JSON/],
    ['altered.json', JSON.stringify(altered), /checksum does not match/],
    ['other.json', '{"hello": 1}', /not a Fivefold backup/],
    ['invalid.json', JSON.stringify(invalid), /its sets part is not usable: set [0-9a-f]{8} is not valid/],
  ]) {
    await importFile(name, body);
    await page.waitForFunction((n) => document.getElementById('settings-note').textContent.includes(n), name);
    const note = await page.textContent('#settings-note');
    assert.match(note, why);
    assert.match(note, /Nothing was changed\.$/);
    await page.click('#close-settings');
    assert.equal(await page.$$eval('#tonight-sets li', (l) => l.length), 0, `${name} added nothing`);
  }
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.sets')), null);
  // The real backup brings the set and the progress back.
  await importFile('fivefold-backup.json', text);
  await page.waitForFunction(() => document.getElementById('settings-note').textContent.includes('is restored'));
  await page.click('#close-settings');
  await page.waitForSelector(`#${BOARD}[data-mode="puzzle"]`);
  assert.equal(await page.textContent('#tonight-set-title'), CLUB.title);
  assert.equal((await boardState(page, BOARD)).moves, `${LINE[0]} ${LINE[1]}`);
  await page.reload();
  await ready(page);
  assert.equal((await boardState(page, BOARD)).moves, `${LINE[0]} ${LINE[1]}`, 'and it is stored');

  // Over progress that is there now, a restore asks first: declined, nothing changes; accepted,
  // what was there is kept aside.
  const before = asked.length;
  const aside = await page.evaluate(() => localStorage.getItem('fivefold.tonight.before-import'));
  accept = false;
  await importFile('fivefold-backup.json', text);
  await page.waitForFunction(() => document.getElementById('settings-note').textContent.includes('not restored'));
  assert.equal(asked.length, before + 1);
  assert.match(asked.at(-1), /^Replace the progress on this device with the backup made .+\? The progress there now is kept aside on this device\.$/);
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.tonight.before-import')), aside, 'declined: nothing changed');
  await page.click('#close-settings');
  accept = true;
  const now = await page.evaluate(() => localStorage.getItem('fivefold.tonight'));
  await importFile('fivefold-backup.json', text);
  await page.waitForFunction(() => document.getElementById('settings-note').textContent.includes('is restored'));
  assert.equal(await page.evaluate(() => localStorage.getItem('fivefold.tonight.before-import')), now);
  await page.click('#close-settings');
  assert.deepEqual(errors, []);
  await context.close();
});
