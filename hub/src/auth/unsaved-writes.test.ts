import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { RETRY_UNSAVED_EVERY_MS, UnsavedWrites } from './unsaved-writes.js';

/** A store that refuses writes until it is told to take them. */
function flakyStore() {
  const saved = new Map<string, number>();
  let full = true;
  return {
    saved,
    free: () => {
      full = false;
    },
    write: async (key: string, value: number) => {
      if (full) throw new Error('No space left on device');
      saved.set(key, value);
    },
  };
}

describe('UnsavedWrites', () => {
  beforeEach(() => {
    vi.useFakeTimers();
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('keeps what the store refused, answers it to readers, and writes it once the store takes it', async () => {
    const store = flakyStore();
    const writes = new UnsavedWrites<number>('Test', store.write);
    await expect(writes.save('badge-a', 3)).rejects.toThrow('No space left on device');
    expect(writes.get('badge-a')).toBe(3);

    await vi.advanceTimersByTimeAsync(RETRY_UNSAVED_EVERY_MS);
    expect(store.saved.size).toBe(0);
    expect(writes.get('badge-a')).toBe(3);

    store.free();
    await vi.advanceTimersByTimeAsync(RETRY_UNSAVED_EVERY_MS);
    expect(store.saved.get('badge-a')).toBe(3);
    expect(writes.size).toBe(0);
    // Nothing left to write: no timer keeps running.
    expect(vi.getTimerCount()).toBe(0);
  });

  it('writes only the newest value of a key', async () => {
    const store = flakyStore();
    const writes = new UnsavedWrites<number>('Test', store.write);
    await writes.save('badge-a', 1).catch(() => undefined);
    await writes.save('badge-a', 2).catch(() => undefined);
    store.free();
    await writes.close();
    expect(store.saved.get('badge-a')).toBe(2);
  });
});
