import fc from 'fast-check';
import { unit as mathUnit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  CM3_PER_VOLUME_UNIT,
  convertLength,
  convertMass,
  convertVolume,
  GRAMS_PER_MASS_UNIT,
  LENGTH_UNITS,
  lengthCm,
  MASS_UNITS,
  massG,
  MixInputError,
  VOLUME_UNITS,
  volumeCm3,
  type LengthUnit,
  type MassUnit,
  type VolumeUnit,
} from '../index.js';

describe('unit definitions', () => {
  it('takes the inch and the pound from the 1959 agreement', () => {
    // International yard and pound agreement (1959): 1 yd = 0.9144 m, so 1 in = 2.54 cm exactly.
    expect(lengthCm({ value: 1, unit: 'in' })).toBe(2.54);
    // Same agreement: 1 lb = 0.453 592 37 kg exactly.
    expect(massG({ value: 1, unit: 'lb' })).toBe(453.59237);
    // 1 oz avoirdupois = 1/16 lb = 28.349 523 125 g (derived from the 1959 pound).
    expect(massG({ value: 1, unit: 'oz' })).toBeCloseTo(28.349523125, 12);
    // 1 in³ = 2.54³ cm³ = 16.387 064 cm³ (derived).
    expect(volumeCm3({ value: 1, unit: 'in3' })).toBeCloseTo(16.387064, 12);
  });

  it('takes the US gallon as 231 in³ and the fluid ounce as 1/128 gallon', () => {
    // NIST Handbook 44, Appendix C: 1 US gallon = 231 in³ exactly.
    expect(convertVolume({ value: 1, unit: 'gal' }, 'in3').value).toBeCloseTo(231, 12);
    // Derived: 231 × 16.387 064 = 3 785.411 784 mL.
    expect(volumeCm3({ value: 1, unit: 'gal' })).toBeCloseTo(3785.411784, 9);
    // Derived: 3 785.411 784 / 128 = 29.573 529 562 5 mL.
    expect(convertVolume({ value: 1, unit: 'floz' }, 'mL').value).toBeCloseTo(29.5735295625, 10);
    // The litre is 1 dm³ exactly (12th CGPM, 1964).
    expect(convertVolume({ value: 2.5, unit: 'L' }, 'cm3').value).toBe(2500);
  });

  it('refuses an unknown unit with a message that lists the known ones', () => {
    const bad = () => volumeCm3({ value: 1, unit: 'ft3' as VolumeUnit }, 'cavity.unit');
    expect(bad).toThrow(MixInputError);
    expect(bad).toThrow(
      '"ft3" is not a volume unit we know; use one of in3, cm3, mL, L, gal, floz',
    );
    try {
      bad();
    } catch (err) {
      expect((err as MixInputError).field).toBe('cavity.unit');
    }
    expect(() => lengthCm({ value: Number.NaN, unit: 'in' })).toThrow('must be a number');
    // An object's own prototype names are not units.
    expect(() => massG({ value: 1, unit: 'toString' as MassUnit })).toThrow(MixInputError);
  });
});

// An independent oracle: mathjs's unit tables, written by other people from the same
// definitions. Its names for our units:
const MATHJS_LENGTH: Record<LengthUnit, string> = { in: 'in', mm: 'mm', cm: 'cm' };
const MATHJS_VOLUME: Record<VolumeUnit, string> = {
  in3: 'in^3',
  cm3: 'cm^3',
  mL: 'mL',
  L: 'L',
  gal: 'gal',
  floz: 'floz',
};
const MATHJS_MASS: Record<MassUnit, string> = { g: 'g', kg: 'kg', lb: 'lbm', oz: 'oz' };

describe('conversions agree with mathjs', () => {
  it('for every factor to the base unit', () => {
    for (const u of VOLUME_UNITS) {
      expect(CM3_PER_VOLUME_UNIT[u]).toBeCloseTo(mathUnit(1, MATHJS_VOLUME[u]).toNumber('cm^3'), 9);
    }
    for (const u of MASS_UNITS) {
      expect(GRAMS_PER_MASS_UNIT[u]).toBeCloseTo(mathUnit(1, MATHJS_MASS[u]).toNumber('g'), 9);
    }
    for (const u of LENGTH_UNITS) {
      expect(lengthCm({ value: 1, unit: u })).toBeCloseTo(
        mathUnit(1, MATHJS_LENGTH[u]).toNumber('cm'),
        12,
      );
    }
  });

  it('for any value between any two units', () => {
    const value = fc.double({ min: 1e-3, max: 1e6, noNaN: true });
    fc.assert(
      fc.property(
        value,
        fc.constantFrom(...VOLUME_UNITS),
        fc.constantFrom(...VOLUME_UNITS),
        (v, from, to) => {
          const ours = convertVolume({ value: v, unit: from }, to).value;
          const theirs = mathUnit(v, MATHJS_VOLUME[from]).toNumber(MATHJS_VOLUME[to]);
          expect(Math.abs(ours - theirs) / theirs).toBeLessThan(1e-12);
        },
      ),
    );
    fc.assert(
      fc.property(
        value,
        fc.constantFrom(...MASS_UNITS),
        fc.constantFrom(...MASS_UNITS),
        (v, from, to) => {
          const ours = convertMass({ value: v, unit: from }, to).value;
          const theirs = mathUnit(v, MATHJS_MASS[from]).toNumber(MATHJS_MASS[to]);
          expect(Math.abs(ours - theirs) / theirs).toBeLessThan(1e-12);
        },
      ),
    );
    fc.assert(
      fc.property(
        value,
        fc.constantFrom(...LENGTH_UNITS),
        fc.constantFrom(...LENGTH_UNITS),
        (v, from, to) => {
          const ours = convertLength({ value: v, unit: from }, to).value;
          const theirs = mathUnit(v, MATHJS_LENGTH[from]).toNumber(MATHJS_LENGTH[to]);
          expect(Math.abs(ours - theirs) / theirs).toBeLessThan(1e-12);
        },
      ),
    );
  });
});
