// Screenshots of every screen on a phone (390x844) and a desktop (1280x800) viewport, written
// to web/artefacts/ (not committed) for a person to look at; and the layout checks that go
// with them: the board fits, the navigation is a bottom bar on the phone and a rail on the
// desktop, and nothing is wider than the viewport.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  DESKTOP,
  PHONE,
  addFromLibrary,
  artefact,
  geometry,
  librarySet,
  open,
  settled,
  tap,
  useBrowser,
  openSettings,
} from './support.mjs';

const CLUB = librarySet('fours-freestyle-club');

const env = useBrowser();

async function layout(page, board, name, viewport) {
  const g = await geometry(page, board);
  assert.ok(g.left >= 0 && g.left + g.width <= viewport.width + 0.5, `${name}: the board fits across`);
  assert.ok(g.width >= Math.min(330, viewport.width - 60), `${name}: the board is large (${g.width} px)`);
  assert.equal(g.backingWidth, Math.round(g.width * viewport.dpr), `${name}: crisp at ratio ${viewport.dpr}`);
  const wide = await page.evaluate(() => document.documentElement.scrollWidth);
  assert.ok(wide <= viewport.width, `${name}: nothing is wider than the screen (${wide})`);
}

for (const [label, viewport] of [['phone', PHONE], ['desktop', DESKTOP]]) {
  test(`every screen on a ${label} (${viewport.width}x${viewport.height}), as screenshots`, async () => {
    const { page, context, errors } = await open(env.browser, env.server.url, viewport);
    const rail = await page.$eval('.rail', (r) => r.getBoundingClientRect().toJSON());
    if (label === 'phone') {
      assert.ok(rail.bottom >= viewport.height - 1 && rail.height < 120, 'a bar along the bottom');
    } else {
      assert.ok(rail.left === 0 && rail.height >= viewport.height - 1 && rail.width < 150, 'a rail on the left');
    }
    await artefact(page, `${label}-tonight-empty`);

    await addFromLibrary(page, CLUB.title);
    await layout(page, 'tonight-board', 'Tonight', viewport);
    await artefact(page, `${label}-tonight-puzzle`);
    const p = CLUB.puzzles[0];
    await tap(page, 'tonight-board', p.solution.line[0], { touch: viewport.touch });
    if (viewport.touch) await tap(page, 'tonight-board', p.solution.line[0], { touch: true });
    await settled(page, 'tonight-board', 2);
    await page.click('#tonight-play [data-act="hint"]');
    await page.click('#tonight-play [data-act="hint"]');
    await artefact(page, `${label}-tonight-hint`);
    await page.click('#tonight-marks li:nth-child(2) button');
    await tap(page, 'tonight-board', 'a1', { touch: viewport.touch });
    if (viewport.touch) await tap(page, 'tonight-board', 'a1', { touch: true });
    await page.waitForSelector('#tonight-board[data-state="failed"][data-pending="0"]');
    await artefact(page, `${label}-tonight-wrong`);
    await page.click('#tonight-back');
    await artefact(page, `${label}-tonight-sets`);
    await page.click('#tonight-sets button.primary');
    await page.click(`#tonight-marks li:nth-child(${CLUB.puzzles.length}) button`);
    await page.click('#tonight-play [data-act="next"]');
    await page.click('#finish-anyway');
    await page.fill('#student-name', 'Tomas Reyes');
    await artefact(page, `${label}-tonight-summary`);

    await page.click('[data-go="drill"]');
    await artefact(page, `${label}-drill-waiting`);
    await page.waitForSelector('#drill-board[data-mode="puzzle"]', { timeout: 60000 });
    await layout(page, 'drill-board', 'Drill', viewport);
    await artefact(page, `${label}-drill`);

    await page.click('[data-go="study"]');
    await page.fill('#study-moves', 'h8 h9 i8 i9 g8 j10 f7 e6');
    await page.click('#study-setup');
    await page.click('[data-ask="vcf"]');
    await page.waitForFunction(() => document.getElementById('study').dataset.busy === 'false' &&
      document.getElementById('study-answer').childElementCount > 0);
    if (await page.isVisible('#study-stepper')) {
      await page.click('#study-next');
      await page.click('#study-next');
    }
    await layout(page, 'study-board', 'Study board', viewport);
    await artefact(page, `${label}-study`);
    await artefact(page, `${label}-study-full`, { fullPage: true });

    await openSettings(page);
    await artefact(page, `${label}-settings`);
    assert.deepEqual(errors, []);
    await context.close();
  });
}
