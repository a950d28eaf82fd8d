import { describe, expect, it } from 'vitest';
import { materialInputSchema } from '../materials.js';
import { ratioDisagreements, statedRatiosDisagree } from './ratio-agreement.js';

// Check values by hand from the definition of specific gravity (ASTM D792 §3: density relative
// to water), so mass = volume × SG: part i by weight / part A by weight = (v_i SG_i)/(v_A SG_A).
describe('a ratio stated by weight and by volume', () => {
  it('agrees when by weight = by volume × SG (1:1 by volume, SG 1.10 and 0.98 → 100 : 89.09)', () => {
    // 0.98 / 1.10 × 100 = 89.0909…; 89 is 0.10 % under it.
    expect(ratioDisagreements([100, 89], [1, 1], [1.1, 0.98])).toEqual([]);
  });

  it('names part B when its by-weight number is 4.6 % under what the SGs give', () => {
    // 85 / 89.0909 − 1 = −4.59 %
    const [d, ...rest] = ratioDisagreements([100, 85], [1, 1], [1.1, 0.98]);
    expect(rest).toEqual([]);
    expect(d!.part).toBe(1);
    expect(d!.differencePct).toBeCloseTo(-4.592, 2);
    expect(d!.message).toMatch(/^Part B is off: 100 : 85 by weight, but 1 : 1 by volume/);
    expect(d!.message).toContain('100 : 89.09');
  });

  it('holds the 2 % line: 1.9 % passes, 2.1 % does not', () => {
    expect(ratioDisagreements([100, 101.9], [1, 1], [1, 1])).toEqual([]);
    expect(ratioDisagreements([100, 102.1], [1, 1], [1, 1]).map((d) => d.part)).toEqual([1]);
  });

  it('finds part C off in a three-part system and leaves B alone', () => {
    // 2:1:1 by volume, SGs 1.2, 1.0, 1.5 → 2.4 : 1.0 : 1.5 = 100 : 41.67 : 62.5 by weight.
    // Stated 100 : 42 : 55 → B +0.8 % (fine), C 55 / 62.5 − 1 = −12 %.
    const out = ratioDisagreements([100, 42, 55], [2, 1, 1], [1.2, 1.0, 1.5]);
    expect(out.map((d) => d.part)).toEqual([2]);
    expect(out[0]!.differencePct).toBeCloseTo(-12, 6);
  });

  it('either basis may be the main ratio', () => {
    const w = { basis: 'weight' as const, parts: [100, 85] };
    const v = { basis: 'volume' as const, parts: [1, 1] };
    expect(statedRatiosDisagree(w, v, [1.1, 0.98])).toHaveLength(1);
    expect(statedRatiosDisagree(v, w, [1.1, 0.98])).toHaveLength(1);
  });

  it('the material form refuses disagreeing ratios and says which part is off', () => {
    const base = {
      name: 'Hollin test urethane',
      ratio: { basis: 'volume', parts: [1, 1] },
      partSpecificGravities: [1.1, 0.98],
    };
    expect(
      materialInputSchema.safeParse({
        ...base,
        alsoStatedRatio: { basis: 'weight', parts: [100, 89] },
      }).success,
    ).toBe(true);
    const bad = materialInputSchema.safeParse({
      ...base,
      alsoStatedRatio: { basis: 'weight', parts: [100, 85] },
    });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.path).toEqual(['alsoStatedRatio', 'parts', 1]);
    expect(bad.error!.issues[0]!.message).toMatch(/^Part B is off/);
  });

  it('one cost and one threshold per part', () => {
    const r = materialInputSchema.safeParse({
      name: 'x',
      ratio: { basis: 'weight', parts: [100, 50] },
      specificGravity: 1.1,
      costPerKg: [12.5],
      lowStockG: [500, 250, 10],
    });
    expect(r.error!.issues.map((i) => i.path[0])).toEqual(['costPerKg', 'lowStockG']);
  });
});
