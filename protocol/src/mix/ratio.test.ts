import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  convertRatio,
  judgeReading,
  MixInputError,
  mixRatioSchema,
  nextPartTargetG,
  ratioDeviationPct,
  ratioDeviationsPct,
  rescueOverPour,
  splitTotalG,
  toleranceBand,
  volumeRatio,
  weightRatio,
} from '../index.js';

const part = fc.double({ min: 0.01, max: 1000, noNaN: true });
const sg = fc.double({ min: 0.5, max: 3, noNaN: true });
const ratioParts = fc.oneof(fc.array(part, { minLength: 2, maxLength: 3 }));
const relClose = (a: number, b: number, rel = 1e-9) =>
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));

describe('ratio split', () => {
  it('splits a total by weight', () => {
    // Arithmetic: 100:14 of 114 g is 100 g and 14 g.
    expect(splitTotalG(114, [100, 14])).toEqual([100, 14]);
    const [a, b, c] = splitTotalG(500, [100, 50, 10]);
    expect(a).toBeCloseTo(312.5, 10);
    expect(b).toBeCloseTo(156.25, 10);
    expect(c).toBeCloseTo(31.25, 10);
  });

  it('refuses a ratio with a zero part, or one part, or four', () => {
    expect(() => splitTotalG(100, [100, 0])).toThrow(MixInputError);
    expect(() => splitTotalG(100, [100])).toThrow('A mix ratio has 2 or 3 parts');
    expect(() => splitTotalG(100, [1, 1, 1, 1])).toThrow('A mix ratio has 2 or 3 parts');
    expect(mixRatioSchema.safeParse({ basis: 'weight', parts: [100, 0] }).success).toBe(false);
  });

  it('property: the parts of a split sum to the total', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 1e5, noNaN: true }), ratioParts, (total, parts) => {
        const masses = splitTotalG(total, parts);
        relClose(
          masses.reduce((s, m) => s + m, 0),
          total,
          1e-12,
        );
        masses.forEach((m, i) => relClose(m / masses[0]!, parts[i]! / parts[0]!, 1e-9));
      }),
    );
  });
});

describe('by weight and by volume', () => {
  it('converts 1:1 by volume into parts by weight through the SGs', () => {
    // mass = volume × SG: 1 × 1.10 : 1 × 0.98, scaled to keep part A at 1 → 1 : 0.8909.
    const w = weightRatio({ basis: 'volume', parts: [1, 1] }, [1.1, 0.98]);
    expect(w[0]).toBe(1);
    expect(w[1]).toBeCloseTo(0.98 / 1.1, 12);
    expect(volumeRatio({ basis: 'weight', parts: w }, [1.1, 0.98])[1]).toBeCloseTo(1, 12);
  });

  it("refuses a ratio by volume without each part's SG", () => {
    expect(() => weightRatio({ basis: 'volume', parts: [1, 1] })).toThrow(
      "A ratio by volume needs each part's specific gravity",
    );
    expect(() => weightRatio({ basis: 'volume', parts: [1, 1] }, [1.1])).toThrow(
      'Give one specific gravity for each of the 2 parts',
    );
  });

  it('property: by weight → by volume → by weight returns the ratio', () => {
    fc.assert(
      fc.property(
        ratioParts.chain((parts) =>
          fc.tuple(
            fc.constant(parts),
            fc.array(sg, { minLength: parts.length, maxLength: parts.length }),
          ),
        ),
        ([parts, sgs]) => {
          const byVolume = convertRatio({ basis: 'weight', parts }, 'volume', sgs);
          const back = convertRatio(byVolume, 'weight', sgs);
          back.parts.forEach((p, i) => relClose(p, parts[i]!, 1e-12));
        },
      ),
    );
  });
});

describe('targets at the scale', () => {
  it('takes part B from the part A actually poured', () => {
    // Common practice, no published source: at 100:14 by weight, 100 g of part A takes 14 g of B.
    expect(nextPartTargetG([100, 14], [100])).toBeCloseTo(14, 12);
    // A poured 2 % heavy carries into B.
    expect(nextPartTargetG([100, 14], [102])).toBeCloseTo(14.28, 12);
    // Part C of a three-part ratio, from A.
    expect(nextPartTargetG([100, 50, 10], [200, 100.5])).toBeCloseTo(20, 12);
    expect(() => nextPartTargetG([100, 14], [100, 14])).toThrow('Every part has been poured');
    expect(() => nextPartTargetG([100, 14], [0])).toThrow('Pour part A');
  });

  it('puts a 1 % band around the target', () => {
    // Common practice, no published source: a 1 % band on 14 g is 13.86–14.14 g.
    const band = toleranceBand(14);
    expect(band.lowG).toBeCloseTo(13.86, 12);
    expect(band.highG).toBeCloseTo(14.14, 12);
    expect(toleranceBand(14, 2).lowG).toBeCloseTo(13.72, 12);
    expect(() => toleranceBand(14, 0)).toThrow('The tolerance must be more than zero');
  });

  it('judges a reading: UNDER, SETTLING, GO, OVER, edges inclusive', () => {
    const band = toleranceBand(14);
    expect(judgeReading(13.5, true, band)).toBe('UNDER');
    expect(judgeReading(13.9, false, band)).toBe('SETTLING');
    expect(judgeReading(13.9, true, band)).toBe('GO');
    expect(judgeReading(band.lowG, true, band)).toBe('GO');
    expect(judgeReading(band.highG, true, band)).toBe('GO');
    expect(judgeReading(14.2, true, band)).toBe('OVER');
    expect(judgeReading(14.2, false, band)).toBe('OVER');
  });

  it('property: the verdict is never GO for an unstable reading', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 5000, noNaN: true }),
        fc.double({ min: 0.01, max: 20, noNaN: true }),
        fc.double({ min: -100, max: 10000, noNaN: true }),
        (target, tol, reading) => {
          expect(judgeReading(reading, false, toleranceBand(target, tol))).not.toBe('GO');
        },
      ),
    );
  });
});

describe('ratio deviation', () => {
  it('measures each part against part A', () => {
    // Arithmetic on the definition: 100:14 poured as 100.0 / 14.10 g is (14.10 / 14 − 1) = +0.714 %.
    expect(ratioDeviationsPct([100, 14], [100, 14.1])[1]).toBeCloseTo(0.714, 3);
    expect(ratioDeviationPct([100, 14], [100, 14.1])).toBeCloseTo(0.714, 3);
    // The largest by magnitude keeps its sign.
    expect(ratioDeviationPct([100, 50, 10], [100, 50.2, 9.8])).toBeCloseTo(-2, 10);
    expect(ratioDeviationsPct([100, 14], [100])).toEqual([0]);
  });
});

describe('rescue', () => {
  it('adds part A after an over-pour of part B', () => {
    // Arithmetic (contracts.md): 100:14 with A 100 g and B 14.5 g → A should be 14.5 × 100 / 14 =
    // 103.571 g, so add 3.571 g of A and nothing of B.
    const r = rescueOverPour([100, 14], [100, 14.5]);
    expect(r.addG[0]).toBeCloseTo(3.571, 3);
    expect(r.addG[1]).toBe(0);
    expect(r.totalAfterG).toBeCloseTo(118.071, 3);
    expect(r.fits).toBeUndefined();
  });

  it('says whether the cup and scale can take the additions', () => {
    expect(rescueOverPour([100, 14], [100, 14.5], { capacityG: 200 }).fits).toBe(true);
    // 180 g already on the scale (cup included) + 3.571 g > 183 g.
    expect(rescueOverPour([100, 14], [100, 14.5], { capacityG: 183, grossBeforeG: 180 }).fits).toBe(
      false,
    );
  });

  it('property: a rescue restores the ratio', () => {
    fc.assert(
      fc.property(
        ratioParts.chain((parts) =>
          fc.tuple(
            fc.constant(parts),
            fc.array(fc.double({ min: 0.5, max: 1.5, noNaN: true }), {
              minLength: parts.length,
              maxLength: parts.length,
            }),
          ),
        ),
        ([parts, factors]) => {
          const actuals = parts.map((p, i) => p * factors[i]!);
          const r = rescueOverPour(parts, actuals);
          const after = actuals.map((a, i) => a + r.addG[i]!);
          r.addG.forEach((a) => expect(a).toBeGreaterThanOrEqual(0));
          ratioDeviationsPct(parts, after).forEach((d) => expect(Math.abs(d)).toBeLessThan(1e-9));
          relClose(
            after.reduce((s, a) => s + a, 0),
            r.totalAfterG,
            1e-12,
          );
        },
      ),
    );
  });
});
