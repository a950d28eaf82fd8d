import { describe, expect, it } from 'vitest';
import {
  boxVolumeCm3,
  cavityVolumeCm3,
  CM3_PER_IN3,
  cylinderVolumeCm3,
  fillVolumeCm3,
  frustumVolumeCm3,
  MixInputError,
  netVolumeCm3,
} from '../index.js';

const in3 = (cm3: number) => cm3 / CM3_PER_IN3;

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    if (err instanceof MixInputError) return err.field;
    throw err;
  }
  return undefined;
}

describe('cavity volumes', () => {
  it('box: length × width × height', () => {
    // Common practice, no published source: a 6 × 5 × 1.5 in box holds 45 in³.
    expect(in3(boxVolumeCm3(6, 5, 1.5, 'in'))).toBeCloseTo(45, 10);
    // Same box in mm: 152.4 × 127 × 38.1 mm = 737.41788 cm³ (derived, 1 in = 25.4 mm exactly).
    expect(boxVolumeCm3(152.4, 127, 38.1, 'mm')).toBeCloseTo(737.41788, 8);
  });

  it('cylinder: π r² h, by radius or by diameter', () => {
    // Common practice, no published source: radius 2 in, height 1.5 in holds about 18.8 in³
    // (π × 4 × 1.5 = 18.85).
    const byRadius = in3(cylinderVolumeCm3({ radius: 2 }, 1.5, 'in'));
    expect(byRadius).toBeCloseTo(18.85, 2);
    expect(in3(cylinderVolumeCm3({ diameter: 4 }, 1.5, 'in'))).toBeCloseTo(byRadius, 10);
    // A worked request: Ø 100 mm × 50 mm = π × 5² × 5 cm³ = 392.699 cm³.
    expect(
      cavityVolumeCm3({ shape: 'cylinder', diameter: 100, height: 50, unit: 'mm' }),
    ).toBeCloseTo(392.699, 3);
  });

  it('frustum: π h (R² + R r + r²) / 3', () => {
    // Solid-mensuration formula (REFERENCES.md, Geometry): top Ø 4 in, bottom Ø 3 in, 5 in tall:
    // π × 5 × (2² + 2 × 1.5 + 1.5²) / 3 = π × 5 × 9.25 / 3 = 48.433 in³.
    expect(in3(frustumVolumeCm3(4, 3, 5, 'in'))).toBeCloseTo(48.433, 3);
    // Either end may be the wide one.
    expect(frustumVolumeCm3(3, 4, 5, 'in')).toBeCloseTo(frustumVolumeCm3(4, 3, 5, 'in'), 10);
    // Equal ends: a cylinder.
    expect(frustumVolumeCm3(4, 4, 1.5, 'in')).toBeCloseTo(
      cylinderVolumeCm3({ diameter: 4 }, 1.5, 'in'),
      10,
    );
  });

  it('a known volume in any volume unit', () => {
    // NIST Handbook 44, Appendix C: 1 US gal = 231 in³.
    expect(in3(cavityVolumeCm3({ shape: 'volume', volume: 1, unit: 'gal' }))).toBeCloseTo(231, 10);
    expect(cavityVolumeCm3({ shape: 'volume', volume: 500, unit: 'cm3' })).toBe(500);
  });

  it('names the bad dimension for zero, negative or NaN sizes', () => {
    expect(fieldOf(() => boxVolumeCm3(6, 0, 1.5, 'in'))).toBe('cavity.width');
    expect(fieldOf(() => boxVolumeCm3(6, 5, -1, 'in'))).toBe('cavity.height');
    expect(fieldOf(() => cylinderVolumeCm3({ radius: Number.NaN }, 1, 'in'))).toBe('cavity.radius');
    expect(fieldOf(() => frustumVolumeCm3(4, 0, 5, 'in'))).toBe('cavity.bottomDiameter');
    expect(fieldOf(() => boxVolumeCm3(6, 5, 1, 'ft' as 'in'))).toBe('cavity.unit');
    expect(() => boxVolumeCm3(6, 0, 1.5, 'in')).toThrow('The width must be more than zero');
    expect(
      fieldOf(() =>
        cavityVolumeCm3({ shape: 'cylinder', radius: 1, diameter: 2, height: 1, unit: 'in' }),
      ),
    ).toBe('cavity.radius');
  });
});

describe('net and fill volume', () => {
  it('subtracts the model, then adds the overage to the net volume', () => {
    // A worked box: 10 × 8 × 3 in = 240 in³; a 60 in³ model leaves 180 in³;
    // 10 % overage on the net gives 198 in³ (arithmetic on the definitions).
    const cavity = boxVolumeCm3(10, 8, 3, 'in');
    const net = netVolumeCm3(cavity, 60 * CM3_PER_IN3);
    expect(in3(net)).toBeCloseTo(180, 10);
    expect(in3(fillVolumeCm3(net, 10))).toBeCloseTo(198, 10);
    expect(fillVolumeCm3(net)).toBe(net);
  });

  it('refuses a model as large as the cavity or larger', () => {
    expect(fieldOf(() => netVolumeCm3(100, 100))).toBe('displacement.volume');
    expect(() => netVolumeCm3(100, 120)).toThrow(/as much room as the cavity or more/);
    expect(fieldOf(() => fillVolumeCm3(100, -5))).toBe('overagePct');
  });
});
