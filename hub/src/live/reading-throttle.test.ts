import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { TrailingThrottle } from './reading-throttle.js';

describe('TrailingThrottle', () => {
  beforeEach(() => {
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'performance'] });
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('passes 25 a second of a 100 a second stream and always ends on the newest value', () => {
    const emitted: number[] = [];
    const throttle = new TrailingThrottle<number>(40, (v) => emitted.push(v));
    for (let i = 0; i < 100; i += 1) {
      throttle.push(i);
      vi.advanceTimersByTime(10);
    }
    vi.advanceTimersByTime(100);
    // One second of input: 25 emits at most (1000 ms / 40 ms), plus nothing lost at the end.
    expect(emitted.length).toBeLessThanOrEqual(26);
    expect(emitted.length).toBeGreaterThanOrEqual(24);
    expect(emitted.at(-1)).toBe(99);
    // In order, never repeated.
    expect([...emitted].sort((a, b) => a - b)).toEqual(emitted);
    expect(new Set(emitted).size).toBe(emitted.length);
  });

  it('emits at once when the stream is slower than the limit', () => {
    const emitted: number[] = [];
    const throttle = new TrailingThrottle<number>(40, (v) => emitted.push(v));
    throttle.push(1);
    vi.advanceTimersByTime(50);
    throttle.push(2);
    expect(emitted).toEqual([1, 2]);
  });

  it('holds a value that came too soon and emits it when the interval is up', () => {
    const emitted: number[] = [];
    const throttle = new TrailingThrottle<number>(40, (v) => emitted.push(v));
    throttle.push(1);
    throttle.push(2);
    throttle.push(3);
    expect(emitted).toEqual([1]);
    vi.advanceTimersByTime(40);
    expect(emitted).toEqual([1, 3]);
  });

  it('drops what it holds once disposed', () => {
    const emitted: number[] = [];
    const throttle = new TrailingThrottle<number>(40, (v) => emitted.push(v));
    throttle.push(1);
    throttle.push(2);
    throttle.dispose();
    vi.advanceTimersByTime(100);
    expect(emitted).toEqual([1]);
  });
});
