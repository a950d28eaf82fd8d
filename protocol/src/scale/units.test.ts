import { describe, expect, it } from 'vitest';
import { GRAMS_PER_UNIT } from './types.js';
import { decimalsFor, fromGrams, parseUnit, toGrams } from './units.js';

describe('units', () => {
  it('uses the exact factors of the 1959 international yard and pound agreement', () => {
    // 1 lb = 0.453 592 37 kg exactly (international yard and pound agreement, 1959).
    expect(GRAMS_PER_UNIT.lb).toBe(453.59237);
    // 1 oz avoirdupois = 1/16 lb = 28.349 523 125 g (derived from the 1959 agreement).
    expect(GRAMS_PER_UNIT.oz).toBeCloseTo(28.349523125, 12);
    // 1 kg = 1000 g (SI definition).
    expect(toGrams(1.25, 'kg')).toBe(1250);
    expect(toGrams(2, 'lb')).toBeCloseTo(907.18474, 10);
    expect(toGrams(16, 'oz')).toBeCloseTo(453.59237, 10);
    expect(fromGrams(453.59237, 'lb')).toBeCloseTo(1, 12);
  });

  it('reads only the four units, in any case', () => {
    expect(parseUnit(' KG ')).toBe('kg');
    expect(parseUnit('oz')).toBe('oz');
    expect(parseUnit('ct')).toBeUndefined();
    expect(parseUnit('lbs')).toBeUndefined();
  });

  it('shows as many decimals as the scale interval needs in each unit', () => {
    expect(decimalsFor(0.01, 'g')).toBe(2);
    expect(decimalsFor(0.1, 'g')).toBe(1);
    expect(decimalsFor(1, 'g')).toBe(0);
    // 0.01 g = 0.000 01 kg.
    expect(decimalsFor(0.01, 'kg')).toBe(5);
    // 0.01 g = 0.000 022 lb and 0.000 35 oz (derived from the 1959 factors).
    expect(decimalsFor(0.01, 'lb')).toBe(5);
    expect(decimalsFor(0.01, 'oz')).toBe(4);
  });
});
