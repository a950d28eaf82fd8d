import { describe, expect, it } from 'vitest';
import { batchFitness, effectiveRepeatabilityG, MixInputError } from '../index.js';

// USP General Chapter <41> Balances: repeatability is satisfactory when 2 s / m ≤ 0.10 %, with
// s taken as at least 0.41 d. Applied to our band of t %: m_min = 2 max(s, 0.41 d) / (t / 100).
// Every expected value below is worked by hand in the comment beside it.
describe('scale fitness at the bench (USP <41>, coverage 2, our band)', () => {
  it('uses the measured s above the 0.41 d floor, and the floor below it or without one', () => {
    // d = 0.01 g: floor 0.41 × 0.01 = 0.0041 g.
    expect(effectiveRepeatabilityG(0.01).sG).toBeCloseTo(0.0041, 12);
    expect(effectiveRepeatabilityG(0.01).source).toBe('readability');
    expect(effectiveRepeatabilityG(0.01, null).sG).toBeCloseTo(0.0041, 12);
    expect(effectiveRepeatabilityG(0.01, 0.002).source).toBe('readability');
    expect(effectiveRepeatabilityG(0.01, 0.012)).toEqual({ sG: 0.012, source: 'measured' });
    expect(() => effectiveRepeatabilityG(0.01, -1)).toThrow(MixInputError);
  });

  it('flags the 2 g batch on a 0.01 g scale whose part B is 0.42 g', () => {
    // 100:27 by weight, 2 g: A = 2 × 100/127 = 1.5748 g, B = 2 × 27/127 = 0.4252 g; band ±1 %
    // → B ± 0.0043 g. m_min = 2 × 0.0041 / 0.01 = 0.82 g > 0.4252 g: B is too small.
    // Smallest batch: 0.82 × 127 / 27 = 3.857 g → 3.86 g at d = 0.01 g.
    const fit = batchFitness({
      weightRatio: [100, 27],
      totalMassG: 2,
      tolerancePct: 1,
      readabilityG: 0.01,
    });
    expect(fit.sSource).toBe('readability');
    expect(fit.minNetG).toBeCloseTo(0.82, 10);
    expect(fit.targetsG[1]).toBeCloseTo(0.4252, 4);
    expect(fit.tooSmall).toEqual([{ part: 1, targetG: fit.targetsG[1] }]);
    expect(fit.smallestBatchG).toBeCloseTo(3.86, 10);
  });

  it('takes a measured repeatability where there is one', () => {
    // s = 0.02 g measured on a 0.01 g scale (above the 0.0041 g floor), band ±1 %:
    // m_min = 2 × 0.02 / 0.01 = 4 g. 1:1 at 10 g → 5 g each, fits; smallest batch 4 × 2 / 1 = 8 g.
    const fit = batchFitness({
      weightRatio: [1, 1],
      totalMassG: 10,
      tolerancePct: 1,
      readabilityG: 0.01,
      repeatabilitySdG: 0.02,
    });
    expect(fit.sSource).toBe('measured');
    expect(fit.minNetG).toBeCloseTo(4, 10);
    expect(fit.tooSmall).toEqual([]);
    expect(fit.smallestBatchG).toBeCloseTo(8, 10);
  });

  it('judges every part of a three-part material by its own target', () => {
    // d = 0.1 g, band ±2 %: m_min = 2 × 0.041 / 0.02 = 4.1 g. 100:50:5 at 200 g:
    // A = 129.03 g, B = 64.52 g, C = 6.452 g, all ≥ 4.1 g. At 100 g, C = 3.226 g < 4.1 g.
    // Smallest batch: 4.1 × 155 / 5 = 127.1 g (a multiple of 0.1 g already).
    const base = { weightRatio: [100, 50, 5], tolerancePct: 2, readabilityG: 0.1 };
    expect(batchFitness({ ...base, totalMassG: 200 }).tooSmall).toEqual([]);
    const small = batchFitness({ ...base, totalMassG: 100 });
    expect(small.tooSmall.map((p) => p.part)).toEqual([2]);
    expect(small.smallestBatchG).toBeCloseTo(127.1, 10);
  });
});
