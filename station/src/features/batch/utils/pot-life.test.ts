import { describe, expect, it } from 'vitest';
import { formatClock, formatCountdown } from '../../../lib/countdown';
import { heavierThanRated, mixedMassG, secondsLeft, potLifeEndsAt } from './pot-life';

describe('pot life', () => {
  it('puts the use-by time one pot life after the save', () => {
    const useBy = potLifeEndsAt('2027-03-04T14:05:00.000Z', 25);
    expect(useBy.toISOString()).toBe('2027-03-04T14:30:00.000Z');
  });

  it('counts whole seconds down to zero and not below', () => {
    const useBy = new Date('2027-03-04T14:30:00.000Z');
    expect(secondsLeft(useBy, Date.parse('2027-03-04T14:05:01.000Z'))).toBe(1499);
    // 0.2 s left still shows a second: the pot life is not over yet.
    expect(secondsLeft(useBy, Date.parse('2027-03-04T14:29:59.800Z'))).toBe(1);
    expect(secondsLeft(useBy, Date.parse('2027-03-04T14:31:00.000Z'))).toBe(0);
  });

  it('shows minutes and seconds, and hours when there are any', () => {
    expect(formatCountdown(1499)).toBe('24:59');
    expect(formatCountdown(5)).toBe('00:05');
    expect(formatCountdown(2 * 3600 + 3 * 60 + 4)).toBe('2:03:04');
  });

  it('writes a time as date and 24-hour clock in local time', () => {
    expect(formatClock(new Date(2027, 2, 4, 9, 5))).toBe('2027-03-04 09:05');
  });

  it('flags a batch only when it is heavier than the rated mass', () => {
    expect(heavierThanRated(400, 100)).toBe(true);
    expect(heavierThanRated(100, 100)).toBe(false);
    expect(heavierThanRated(400, null)).toBe(false);
  });

  it('takes the mass in the cup as weighed, top-ups included, or the plan before weighing', () => {
    const parts = (...g: (number | null)[]) =>
      g.map((actualG, i) => ({ label: `Part ${i}`, targetG: 0, actualG }));
    // 103.57 g of part A after a rescue plus 14.5 g of part B: 118.07 g mixed.
    expect(mixedMassG({ totalMassG: 114, parts: parts(103.57, 14.5) })).toBeCloseTo(118.07, 6);
    expect(mixedMassG({ totalMassG: 114, parts: parts(null, null) })).toBe(114);
  });
});
