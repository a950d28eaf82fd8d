import { describe, expect, it } from 'vitest';
import {
  cupFillHeightCm,
  fillMarksCm,
  frustumVolumeCm3,
  minNetWeightG,
  MixInputError,
  pumpStrokes,
} from '../index.js';

describe('scale fitness (USP <41> applied to our band)', () => {
  it('gives 2000 s at 0.10 % and the 0.41 d floor', () => {
    // USP General Chapter <41>: 2 s / m ≤ 0.10 % → m ≥ 2000 s.
    expect(minNetWeightG({ readabilityG: 0.001, repeatabilityG: 0.01 }, 0.1)).toBeCloseTo(20, 10);
    // USP <41>: s below 0.41 d is taken as 0.41 d → 820 d; d = 0.01 g → 8.2 g.
    expect(minNetWeightG({ readabilityG: 0.01, repeatabilityG: 0.001 }, 0.1)).toBeCloseTo(8.2, 10);
  });

  it('gives 82 d for a ±1 % mixing band', () => {
    // REFERENCES.md, derived: the same rule at a 1 % band gives 82 d; d = 0.1 g → 8.2 g.
    expect(minNetWeightG({ readabilityG: 0.1, repeatabilityG: 0 }, 1)).toBeCloseTo(8.2, 10);
    expect(minNetWeightG({ readabilityG: 1, repeatabilityG: 0 }, 1)).toBeCloseTo(82, 10);
    expect(() => minNetWeightG({ readabilityG: 0, repeatabilityG: 0 }, 1)).toThrow(MixInputError);
  });
});

describe('fill marks for mixing by volume', () => {
  const straight = { bottomDiameterCm: 10, topDiameterCm: 10, heightCm: 15 };
  const tapered = { bottomDiameterCm: 8, topDiameterCm: 11, heightCm: 13 };

  it('in a straight cup, V / (π r²), so 1:1 marks are evenly spaced', () => {
    // π × 5² × 4 = 314.16 cm³ fills a Ø 10 cm cup to 4 cm (cylinder formula).
    expect(cupFillHeightCm(straight, Math.PI * 25 * 4)).toBeCloseTo(4, 10);
    const [a, b] = fillMarksCm(straight, [300, 300]);
    expect(b!).toBeCloseTo(2 * a!, 10);
  });

  it('in a tapered cup, the height whose frustum holds the volume', () => {
    for (const v of [50, 400, 900]) {
      const h = cupFillHeightCm(tapered, v);
      const topAtH = 8 + (3 * h) / 13;
      // Back through the frustum formula π h (R² + R r + r²) / 3.
      expect(frustumVolumeCm3(topAtH, 8, h, 'cm')).toBeCloseTo(v, 8);
    }
    // The second 1:1 mark is lower than twice the first because the cup widens upwards.
    const [a, b] = fillMarksCm(tapered, [300, 300]);
    expect(b!).toBeLessThan(2 * a!);
  });

  it('says when the cup is too small', () => {
    expect(() => cupFillHeightCm(straight, 2000)).toThrow('The cup is too small');
  });
});

describe('metered pump strokes', () => {
  it('counts strokes for a mass', () => {
    // Arithmetic: 140 g at 9.5 g per stroke is 14.74 strokes; 15 whole strokes deliver 142.5 g.
    const p = pumpStrokes(140, 9.5);
    expect(p.strokes).toBeCloseTo(14.737, 3);
    expect(p.wholeStrokes).toBe(15);
    expect(p.deliveredG).toBeCloseTo(142.5, 10);
    expect(() => pumpStrokes(140, 0)).toThrow('The mass per stroke must be more than zero');
  });
});
