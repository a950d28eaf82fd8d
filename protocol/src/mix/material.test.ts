import { describe, expect, it } from 'vitest';
import {
  IN3_PER_LB_AT_SG1,
  massFromVolumeG,
  mixSpecificGravity,
  specificGravityFromYield,
  yieldFromSpecificGravity,
  CM3_PER_IN3,
} from '../index.js';

describe('specific gravity and yield', () => {
  it('yields 27.68 in³/lb at SG 1', () => {
    // NIST SP 811, App. B.8: 1 lb/in³ = 27 679.9 kg/m³, so SG 1 (1000 kg/m³) yields 27.68 in³/lb.
    expect(IN3_PER_LB_AT_SG1).toBeCloseTo(27679.9 / 1000, 4);
    // ASTM D1475 uses K = 8.3454 lb/gal at SG 1; 231 / 8.3454 = 27.680 in³/lb.
    expect(yieldFromSpecificGravity(1)).toBeCloseTo(231 / 8.3454, 2);
    // Derived: yield = 27.68 / SG; SG 1.2 → 23.07 in³/lb.
    expect(yieldFromSpecificGravity(1.2)).toBeCloseTo(23.0666, 4);
    expect(specificGravityFromYield(yieldFromSpecificGravity(1.37))).toBeCloseTo(1.37, 12);
  });

  it('turns volume into mass by SG or by yield alike', () => {
    // mass = volume in cm³ × SG (water taken as 1 g/cm³): 100 cm³ at SG 1.2 = 120 g.
    expect(massFromVolumeG(100, { specificGravity: 1.2 })).toBeCloseTo(120, 12);
    // 27.68 in³ at 27.68 in³/lb is 1 lb = 453.592 37 g (1959 pound).
    expect(
      massFromVolumeG(IN3_PER_LB_AT_SG1 * CM3_PER_IN3, { yieldIn3PerLb: IN3_PER_LB_AT_SG1 }),
    ).toBeCloseTo(453.59237, 9);
    expect(() => massFromVolumeG(100, { yieldIn3PerLb: 0 })).toThrow(
      'The yield must be more than zero',
    );
  });

  it('finds the SG of the mix from the parts, volumes adding', () => {
    // Derived from mass / volume: 100 g at SG 1.10 + 18 g at SG 0.98 → 118 / (90.909 + 18.367).
    expect(mixSpecificGravity({ basis: 'weight', parts: [100, 18] }, [1.1, 0.98])).toBeCloseTo(
      118 / (100 / 1.1 + 18 / 0.98),
      12,
    );
    // 1:1 by volume: the mean of the SGs.
    expect(mixSpecificGravity({ basis: 'volume', parts: [1, 1] }, [1.1, 0.98])).toBeCloseTo(
      1.04,
      12,
    );
  });
});
