// A worker and the jobs sent to it, one at a time, each answered by a promise. Cancelling
// terminates the worker (a search in Rust cannot be interrupted otherwise) and the next job
// starts a fresh one.

import { makeWorker } from './platform.js';

/** The `code` of a job's error when a generation's games ran out before enough puzzles were
 * found (worker.js sets it from generateSet's `NotEnough`); other errors have none (null). */
export const NOT_ENOUGH = 'not-enough';

export class Cancelled extends Error {
  constructor() {
    super('cancelled');
    this.name = 'Cancelled';
  }
}

export class Jobs {
  constructor() {
    this.worker = null;
    this.next = 1;
    this.waiting = new Map();
  }

  ensure() {
    if (this.worker) return this.worker;
    const w = makeWorker();
    w.onmessage = (e) => {
      const m = e.data;
      const job = this.waiting.get(m.id);
      if (!job) return;
      if (m.progress) {
        job.onProgress?.(m.progress);
        return;
      }
      this.waiting.delete(m.id);
      if ('error' in m) job.fail(Object.assign(new Error(m.error), { code: m.code ?? null }));
      else job.ok(m.result);
      if (m.fatal) {
        // The worker's engine is broken: the other jobs fail too, and the next starts afresh.
        for (const other of this.waiting.values()) other.fail(new Error(m.error));
        this.waiting.clear();
        w.terminate();
        if (this.worker === w) this.worker = null;
      }
    };
    w.onerror = (e) => {
      e.preventDefault?.();
      const err = new Error(`the worker stopped: ${e.message || 'it could not start'}`);
      for (const job of this.waiting.values()) job.fail(err);
      this.waiting.clear();
      w.terminate();
      if (this.worker === w) this.worker = null;
    };
    this.worker = w;
    return w;
  }

  /** Runs a job: `type` "generate" (with `options`) or "solve" (with `query`). */
  run(type, payload, onProgress) {
    const w = this.ensure();
    const id = this.next++;
    return new Promise((ok, fail) => {
      this.waiting.set(id, { ok, fail, onProgress });
      w.postMessage({ id, type, ...payload });
    });
  }

  get busy() {
    return this.waiting.size > 0;
  }

  /** Stops every job in flight; their promises reject with `Cancelled`. */
  cancel() {
    this.worker?.terminate();
    this.worker = null;
    for (const job of this.waiting.values()) job.fail(new Cancelled());
    this.waiting.clear();
  }
}
