import { describe, expect, it } from 'vitest';
import { StabilityWindow } from './scale-stability.js';

describe('StabilityWindow', () => {
  // 20 readings a second, d = 0.01 g, a 1 s window: the settings the hub uses by default.
  const every50ms = (values: number[], start = 0) =>
    values.map((g, i) => ({ t: start + i * 50, g }));

  it('is unstable until a full window of readings agrees within ± d', () => {
    const w = new StabilityWindow(1000, 0.01);
    const verdicts = every50ms(Array(25).fill(100)).map(({ t, g }) => w.push(t, g));
    expect(verdicts.slice(0, 20).every((v) => !v)).toBe(true);
    expect(verdicts[20]).toBe(true);
  });

  it('tolerates ± d of noise but not a pour', () => {
    const w = new StabilityWindow(1000, 0.01);
    const noisy = every50ms(Array.from({ length: 30 }, (_, i) => 100 + (i % 2 ? 0.01 : 0)));
    expect(noisy.map(({ t, g }) => w.push(t, g)).at(-1)).toBe(true);
    expect(w.push(1550, 100.5)).toBe(false);
    // Still unstable a moment later: the pour is inside the window.
    expect(w.push(1600, 100.5)).toBe(false);
    expect(w.push(2600, 100.5)).toBe(true);
  });

  it('names a bad option', () => {
    expect(() => new StabilityWindow(0, 0.01)).toThrow(/windowMs/);
    expect(() => new StabilityWindow(1000, -1)).toThrow(/toleranceG/);
  });
});
