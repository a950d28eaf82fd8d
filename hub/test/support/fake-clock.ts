import type { Clock } from '../../src/common/clock.js';

/** A clock that moves only when a test says so; repeating tasks run as time passes them. */
export class FakeClock implements Clock {
  private tasks: Array<{ ms: number; due: number; task: () => void; stopped: boolean }> = [];

  constructor(private ms = Date.UTC(2026, 11, 2, 8, 0, 0)) {}

  now(): number {
    return this.ms;
  }

  every(ms: number, task: () => void): () => void {
    const entry = { ms, due: this.ms + ms, task, stopped: false };
    this.tasks.push(entry);
    return () => {
      entry.stopped = true;
      this.tasks = this.tasks.filter((t) => t !== entry);
    };
  }

  /** Moves time on by `ms`, running each repeating task as many times as its period passes. */
  advance(ms: number): void {
    const until = this.ms + ms;
    for (;;) {
      const next = this.tasks
        .filter((t) => !t.stopped && t.due <= until)
        .sort((a, b) => a.due - b.due)[0];
      if (!next) break;
      this.ms = next.due;
      next.due += next.ms;
      next.task();
    }
    this.ms = until;
  }
}
