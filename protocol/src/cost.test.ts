import { describe, expect, it } from 'vitest';
import { batchCost, roundCents } from './cost.js';

describe('batchCost', () => {
  it('prices each part by what was weighed', () => {
    // Hand calculation: 100.0 g of A at 24.00 per kg = 0.1 kg × 24 = 2.40;
    // 45.3 g of B at 31.50 per kg = 0.0453 kg × 31.5 = 1.42695; total 3.82695.
    const cost = batchCost([100, 45.3], [24, 31.5]);
    expect(cost?.parts[0]).toBeCloseTo(2.4, 10);
    expect(cost?.parts[1]).toBeCloseTo(1.42695, 10);
    expect(cost?.total).toBeCloseTo(3.82695, 10);
    expect(roundCents(cost!.total)).toBe(3.83);
  });

  it('counts a part not poured yet as nothing', () => {
    // 250 g of A at 12 per kg = 3.00; B not poured.
    expect(batchCost([250, null], [12, 40])).toEqual({ parts: [3, 0], total: 3 });
  });

  it('gives no cost when a part has no price, rather than a free batch', () => {
    expect(batchCost([100, 50], undefined)).toBeNull();
    expect(batchCost([100, 50, 10], [10, 10])).toBeNull();
    expect(batchCost([100, 50], [10, -1])).toBeNull();
  });
});
