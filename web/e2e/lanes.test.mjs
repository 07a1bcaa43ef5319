// The in-order runner behind Coach's making on several workers (web/lanes.js), under node: the
// results taken must be those of running the tasks one after another, for any number of lanes
// and any order in which the lanes finish. No browser is needed.

import { test } from 'node:test';
import assert from 'node:assert/strict';
import { inOrder } from '../lanes.js';

/** A made-up recipe in the manner of Coach's: task n makes "item n" of the theme the input
 * names, except that every fourth task makes item 10 of the first theme again (a repeat of
 * the first item kept, which takes no place); themes are taken in turn by place. A task's
 * result depends on its number and input only, as a puzzle does on its seed and kind.
 * Returns what was taken, in order. */
async function make({ lanes, count, themes, delays, failAt = -1, abandonable = false, repeat = everyFourth, stopAfter = 0 }) {
  const kept = [];
  const log = [];
  const started = new Set();
  const runs = new Map();
  const stops = new Map(); // lane -> stops its task at once
  const abandoned = [];
  let running = 0;
  let most = 0;
  const themeAt = (place) => themes[place % themes.length];
  await inOrder({
    lanes,
    first: 10,
    input: (n, ahead) => themeAt(kept.length + ahead),
    work: async (lane, n, theme) => {
      running++;
      most = Math.max(most, running);
      started.add(n);
      runs.set(n, (runs.get(n) ?? 0) + 1);
      const stopped = await new Promise((ok) => {
        const timer = setTimeout(() => ok(false), delays(n, lane));
        stops.set(lane, () => {
          clearTimeout(timer);
          // A stop may take a while to come through (a worker being ended).
          if (stopAfter) setTimeout(() => ok(true), stopAfter);
          else ok(true);
        });
      });
      stops.delete(lane);
      running--;
      if (stopped) throw new Error(`task ${n} stopped`);
      if (n === failAt) throw new Error(`task ${n} failed`);
      return item(n, theme, themes, repeat);
    },
    abandon: abandonable
      ? (lane, n) => {
        abandoned.push(n);
        stops.get(lane)();
      }
      : null,
    take: (n, theme, outcome) => {
      if (outcome.error) {
        log.push(`error ${n}`);
        return false;
      }
      log.push(`${n} ${outcome.value}`);
      if (!kept.includes(outcome.value)) kept.push(outcome.value);
      return kept.length < count;
    },
    wanted: () => count - kept.length,
  });
  return { kept, log, most, left: running, started, runs, abandoned };
}

function everyFourth(n) {
  return n % 4 === 3;
}

function item(n, theme, themes, repeat = everyFourth) {
  return repeat(n) ? `${themes[0]}:10` : `${theme}:${n}`;
}

// The same recipe run one task at a time, by hand: what the runner must reproduce.
function oneByOne(count, themes, repeat = everyFourth) {
  const kept = [];
  for (let n = 10; kept.length < count; n++) {
    const theme = themes[kept.length % themes.length];
    const value = item(n, theme, themes, repeat);
    if (!kept.includes(value)) kept.push(value);
  }
  return kept;
}

// Lanes finishing in every kind of order: later tasks first, by lane, by a fixed scramble.
const ORDERS = {
  even: () => 1,
  'later first': (n) => 40 - n,
  'lane 0 slow': (n, lane) => (lane === 0 ? 12 : 1),
  scrambled: (n) => (n * 7919) % 13,
};

// Tasks stopped for a wrong guess over the runs below (the runs with `abandon` must stop some).
let stoppedInOrders = 0;

for (const [name, delays] of Object.entries(ORDERS)) {
  test(`the same items for 1 to 4 lanes, finishing ${name}`, async () => {
    for (const themes of [['a'], ['a', 'b', 'c']]) {
      const want = oneByOne(9, themes);
      for (const lanes of [1, 2, 3, 4]) {
        for (const abandonable of [false, true]) {
          const { kept, most, abandoned } = await make({ lanes, count: 9, themes, delays, abandonable });
          assert.deepEqual(kept, want, `${lanes} lanes, themes ${themes}, abandon ${abandonable}`);
          assert.ok(most <= lanes, `at most ${lanes} tasks at once, saw ${most}`);
          stoppedInOrders += abandoned.length;
        }
      }
    }
  });
}

test('the runs above stopped some tasks running ahead (so they checked the stopping too)', () => {
  assert.ok(stoppedInOrders > 0, `stopped ${stoppedInOrders}`);
});

test('a task run ahead with a theme that turned out wrong is run again with the right one', async () => {
  // Task 11 repeats item 10 (11 % 4 === 3), so task 12 guessed the wrong place's theme.
  const { kept, log, runs } = await make({ lanes: 3, count: 3, themes: ['a', 'b'], delays: () => 1 });
  assert.deepEqual(kept, ['a:10', 'b:12', 'a:13']);
  assert.deepEqual(log, ['10 a:10', '11 a:10', '12 b:12', '13 a:13']);
  assert.equal(runs.get(12), 2, 'task 12 ran with theme a ahead of its turn, then with b');
  assert.equal(runs.get(13), 1);
});

test('a task running ahead with a guess proved wrong is stopped at once and started again', async () => {
  // As above, but task 12 (guessed theme a, needs b once task 11 repeats an item) runs long:
  // it is stopped when task 11 is taken, not left to finish, and made again with b.
  const delays = (n) => (n === 12 ? 200 : 5);
  const { kept, log, runs, abandoned } = await make({ lanes: 3, count: 3, themes: ['a', 'b'], delays, abandonable: true });
  assert.deepEqual(kept, ['a:10', 'b:12', 'a:13']);
  assert.deepEqual(log, ['10 a:10', '11 a:10', '12 b:12', '13 a:13'], 'the stopped run is never taken');
  assert.deepEqual(abandoned, [12]);
  assert.equal(runs.get(12), 2);
});

test('a task stopped for a wrong guess is made again even when the guess turns right again', async () => {
  // Tasks 11 and 12 both repeat item 10. Task 12 ends first, guessing place 2 (a). Task 13
  // starts ahead guessing place 3 (b). When 11 is taken, 12's guess is wrong (place 1, b) and
  // it is made again; 13's is wrong too (place 2, a), so it is stopped, and its stop takes a
  // while to come through. Meanwhile 12 is made again and taken, and 13 is place 1 (b) again,
  // its first guess: the stopped run must still not be taken as its outcome.
  const repeat = (n) => n === 11 || n === 12;
  const themes = ['a', 'b'];
  const delays = (n) => ({ 10: 1, 11: 5, 12: 2, 13: 100 })[n] ?? 1;
  const { kept, log, abandoned, runs } = await make({ lanes: 4, count: 4, themes, delays, abandonable: true, repeat, stopAfter: 30 });
  assert.deepEqual(kept, oneByOne(4, themes, repeat));
  assert.deepEqual(abandoned, [13]);
  assert.equal(runs.get(12), 2);
  assert.ok(!log.some((l) => l.startsWith('error')), log.join(', '));
});

test('uses every lane while enough is wanted, and starts no more tasks than are wanted', async () => {
  const { most, started } = await make({ lanes: 4, count: 2, themes: ['a'], delays: () => 5 });
  assert.equal(most, 2, 'two wanted: two at once');
  assert.deepEqual([...started].sort(), [10, 11, 12], 'task 11 repeats an item, so 12 is needed');
  const many = await make({ lanes: 4, count: 12, themes: ['a'], delays: () => 5 });
  assert.equal(many.most, 4);
});

test('an error is taken in its turn; the results after it are not, and busy lanes are handed back', async () => {
  const { kept, log, left } = await make({
    lanes: 2,
    count: 9,
    themes: ['a'],
    delays: (n) => (n === 14 ? 5 : n === 15 ? 30 : 1),
    failAt: 14,
  });
  assert.deepEqual(kept, ['a:10', 'a:12', 'a:13']);
  assert.deepEqual(log.at(-1), 'error 14');
  assert.equal(left, 1, 'the lane running task 15 is still busy when the run ends');
});

test('nothing wanted: resolves at once without starting a task', async () => {
  const { kept, started } = await make({ lanes: 2, count: 0, themes: ['a'], delays: () => 1 });
  assert.deepEqual(kept, []);
  assert.equal(started.size, 0);
});

test('a throw from take ends the run with that error', async () => {
  await assert.rejects(
    inOrder({
      lanes: 2,
      first: 0,
      input: () => 'a',
      work: async (lane, n) => n,
      take: (n) => {
        if (n === 1) throw new Error('storage full');
        return true;
      },
      wanted: () => 5,
    }),
    /storage full/,
  );
});

test('cancelled as Coach cancels: no task starts afterwards, not even one to be made again', async () => {
  // Task 11 repeats item 10, so task 12, started ahead with theme a, must be made again with
  // b; it is still running when Cancel comes. Cancel as Coach does: wanted() says 0, work
  // rejects at once, and the running tasks are stopped (rejected).
  const themes = ['a', 'b'];
  const kept = [];
  const running = new Map(); // task -> its reject
  let cancelled = false;
  let startedAfter = 0;
  const run = inOrder({
    lanes: 4,
    first: 10,
    input: (n, ahead) => themes[(kept.length + ahead) % themes.length],
    work: (lane, n, theme) => {
      if (cancelled) return Promise.reject(new Error('cancelled'));
      return new Promise((ok, fail) => {
        const timer = setTimeout(() => {
          running.delete(n);
          ok(item(n, theme, themes));
        }, n === 10 ? 1 : n === 11 ? 5 : 60);
        running.set(n, (e) => {
          clearTimeout(timer);
          fail(e);
        });
      });
    },
    take: (n, theme, outcome) => {
      if (outcome.error) return false;
      if (!kept.includes(outcome.value)) kept.push(outcome.value);
      return kept.length < 9;
    },
    wanted: () => (cancelled ? 0 : 9 - kept.length),
    abandon: (lane, n) => running.get(n)?.(new Error('abandoned')),
  });
  await new Promise((ok) => setTimeout(ok, 25));
  cancelled = true;
  const before = new Set(running.keys());
  for (const fail of running.values()) fail(new Error('cancelled'));
  await run;
  for (const n of running.keys()) if (!before.has(n)) startedAfter++;
  assert.ok(before.has(12), 'task 12 was running when Cancel came');
  assert.deepEqual(kept, ['a:10'], 'nothing kept after the cancel');
  assert.equal(startedAfter, 0, 'no task started after the cancel');
});
