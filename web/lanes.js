// Numbered tasks run on several lanes (workers) at once, their results taken in number order,
// so that what comes out is the same for any number of lanes. Coach makes a set's puzzles this
// way: puzzle task n is made from the set's seed plus n, on every core the device offers.
//
// A task's input may depend on the results taken before it (Coach's theme for a task is the
// recipe's theme for the set's next place, and a puzzle made twice takes no place). A task
// started ahead of its turn is given the input it would have if every task before it were
// kept; when its turn comes, its input is asked again, and if it differs the task is run
// again with the right one. A caller that can stop a running task early says how (`abandon`):
// then a task whose guess is seen to be wrong while it runs, after a result before it was
// taken, is stopped at once and started again. No DOM here: web/e2e/lanes.test.mjs runs it
// under node.

/**
 * Runs tasks `first`, `first + 1`, ... on `lanes` lanes and takes their results in order.
 * - `input(n, ahead)`: the input of task n if the `ahead` untaken tasks before it are all
 *   kept (`ahead` is 0 when n's turn has come);
 * - `same(a, b)`: whether two inputs are the same (by default, equal as JSON);
 * - `work(lane, n, input)`: a promise of task n's result, run on lane `lane` (0 to lanes - 1,
 *   one task at a time per lane);
 * - `take(n, input, outcome)`: called in number order, with `{ value }` or `{ error }`;
 *   returns whether more tasks are wanted;
 * - `wanted()`: how many more results are still wanted if every task taken so far counts;
 *   no more tasks are started ahead than that;
 * - `abandon(lane, n)` (optional): stops task n running on `lane`, whose input has turned out
 *   wrong; its promise should settle soon. Whatever it settles with is never taken: the task
 *   is started again, with the input it now needs, as soon as a lane is free.
 * Resolves once `take` has said no (or nothing more is wanted), rejects if `input`, `take` or
 * `wanted` throws. Lanes may still be running tasks started ahead then: their results will
 * never be taken, and the caller stops them. To cancel a run, make `wanted()` say 0 and
 * `work` reject at once, then stop the running tasks: a task whose input turns out wrong is
 * run again before its outcome is taken, and that run must not start real work.
 */
export function inOrder({ lanes, first, input, same = sameJson, work, take, wanted, abandon = null }) {
  return new Promise((resolve, reject) => {
    let next = first; // the next task to start
    let due = first; // the next task to take
    let again = false; // whether task `due` must be run again
    let stopped = false;
    const done = new Map(); // task -> { used, outcome }
    const idle = Array.from({ length: Math.max(1, lanes) }, (_, i) => i).reverse();
    const running = new Map(); // task -> { lane, used, abandoned }
    const redo = []; // abandoned tasks to start again, in increasing order

    const stop = () => {
      stopped = true;
      resolve();
    };
    // A throw from `input`, `take` or `wanted` ends the run: the promise rejects with it.
    const fail = (e) => {
      if (stopped) return;
      stopped = true;
      reject(e);
    };

    const claim = () => {
      if (again) {
        again = false;
        return due;
      }
      if (redo.length && redo[0] - due < wanted()) return redo.shift();
      if (next - due >= wanted()) return null;
      return next++;
    };

    const pump = () => {
      if (stopped) return;
      while (done.has(due)) {
        const { used, outcome } = done.get(due);
        done.delete(due);
        if (!same(used, input(due, 0))) {
          again = true;
          break;
        }
        const goOn = take(due, used, outcome);
        due++;
        if (!goOn) {
          stop();
          return;
        }
      }
      // Tasks ahead whose guess the results taken have proved wrong are stopped if running,
      // and made again at once if finished.
      if (abandon) {
        for (const [n, r] of running) {
          if (!r.abandoned && !same(r.used, input(n, n - due))) {
            r.abandoned = true;
            abandon(r.lane, n);
          }
        }
        for (const [n, d] of done) {
          if (!same(d.used, input(n, n - due))) {
            done.delete(n);
            redo.push(n);
          }
        }
        redo.sort((a, b) => a - b);
      }
      while (idle.length) {
        const n = claim();
        if (n === null) break;
        const lane = idle.pop();
        const used = input(n, n - due);
        const run = { lane, used, abandoned: false };
        running.set(n, run);
        Promise.resolve()
          // (Stopped before it began: a result taken in between proved its guess wrong.)
          .then(() => (run.abandoned ? Promise.reject(new Error('abandoned')) : work(lane, n, used)))
          .then((value) => ({ value }), (error) => ({ error }))
          .then((outcome) => {
            idle.push(lane);
            running.delete(n);
            if (run.abandoned) {
              redo.push(n);
              redo.sort((a, b) => a - b);
            } else {
              done.set(n, { used, outcome });
            }
            pump();
          })
          .catch(fail);
      }
      // Nothing running and nothing more wanted: done.
      if (!running.size) stop();
    };

    try {
      pump();
    } catch (e) {
      fail(e);
    }
  });
}

function sameJson(a, b) {
  return JSON.stringify(a) === JSON.stringify(b);
}
