// Measures My games in the browser: the built app (web/dist) in headless Chromium checks the
// sixty-move game engine/benches/data/sixty_moves.txt (pasted, freestyle, both sides' findings
// in the set) at the browser's budget, `runs` times in fresh pages, and prints the time from
// "Check the game" to the game on show (worker start included), with the findings and
// undecided moves; then the time to make the findings' puzzles, which the app does when the
// player asks for them (here: "Save the puzzles as a set file"). Run after a build:
//   node web/tools/measure-games.mjs [--runs 3]

import { readFileSync } from 'node:fs';
import { launch, open, serve } from '../e2e/support.mjs';

const RUNS = Number(process.argv[process.argv.indexOf('--runs') + 1]) || 3;
const GAME = readFileSync(new URL('../../engine/benches/data/sixty_moves.txt', import.meta.url), 'utf8');

const server = await serve();
const browser = await launch();
const times = [];
try {
  for (let i = 0; i < RUNS; i++) {
    const { page, context } = await open(browser, server.url);
    await page.click('.rail [data-go="games"]');
    await page.fill('#games-text', GAME);
    await page.click('#games-read');
    await page.waitForSelector('#games-setup:not([hidden])');
    await page.selectOption('#games-rule', 'freestyle');
    await page.selectOption('#games-player', 'both');
    const t0 = Date.now();
    await page.click('#games-check');
    await page.waitForSelector('#games-view:not([hidden])', { timeout: 600000 });
    const secs = (Date.now() - t0) / 1000;
    const stored = () => page.evaluate(() => JSON.parse(localStorage.getItem('fivefold.games')).data.list[0]);
    const g = await stored();
    const undecided = g.verdicts.filter((v) => v === 'undecided').length;
    const t1 = Date.now();
    await page.click('#games-export');
    await page.waitForFunction(() => JSON.parse(localStorage.getItem('fivefold.games')).data.list[0].made === true, null, { timeout: 600000 });
    const made = (Date.now() - t1) / 1000;
    const h = await stored();
    const puzzles = h.set ? JSON.parse(h.set).puzzles.length : 0;
    console.log(`run ${i + 1}: check ${secs.toFixed(1)} s; ${g.moves.length} moves, ${g.findings.length} findings, ${undecided} undecided (${g.budget}); puzzles made on request in ${made.toFixed(1)} s: ${puzzles}`);
    times.push(secs);
    await context.close();
  }
} finally {
  await browser.close();
  await server.close();
}
times.sort((a, b) => a - b);
console.log(`median ${times[Math.floor(times.length / 2)].toFixed(1)} s over ${times.length} runs`);
