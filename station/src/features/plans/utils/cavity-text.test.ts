import { describe, expect, it } from 'vitest';
import { cavityText } from './cavity-text';

describe('cavityText', () => {
  it('says each shape as it was measured', () => {
    expect(cavityText({ shape: 'box', length: 4, width: 2, height: 1, unit: 'in' })).toBe(
      'box 4 × 2 × 1 in',
    );
    expect(cavityText({ shape: 'cylinder', radius: 3, height: 5, unit: 'cm' })).toBe(
      'round, radius 3, height 5 cm',
    );
    expect(cavityText({ shape: 'water', waterMassG: 250, waterTempC: 21 })).toBe(
      '250 g of water at 21 °C',
    );
  });
});
