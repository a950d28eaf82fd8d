/**
 * Time as the hub's rules see it: sign-in lockouts, the batch save dwell, trace flushes. A
 * provider so tests can move it instead of waiting (`test/support/fake-clock.ts`).
 */
export interface Clock {
  now(): number;
  /** Calls `task` every `ms` until the returned function is called. */
  every(ms: number, task: () => void): () => void;
}

export const CLOCK = Symbol('CLOCK');

export const systemClock: Clock = {
  now: () => Date.now(),
  every(ms, task) {
    const timer = setInterval(task, ms);
    // A repeating chore never keeps the process alive on its own.
    timer.unref();
    return () => clearInterval(timer);
  },
};
