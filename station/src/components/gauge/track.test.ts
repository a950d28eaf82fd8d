import { describe, expect, it } from 'vitest';
import { decimalsForReadability, formatGrams } from '../../lib/grams';
import { fineWindow, trackEndG, trackFraction } from './track';

describe('gauge number formatting', () => {
  it('shows as many decimals as the scale interval', () => {
    expect(decimalsForReadability(0.01)).toBe(2);
    expect(decimalsForReadability(0.1)).toBe(1);
    expect(decimalsForReadability(1)).toBe(0);
    expect(decimalsForReadability(0.005)).toBe(3);
  });

  it('prints a true minus and never a negative zero', () => {
    expect(formatGrams(-12.5, 2)).toBe('\u221212.50');
    expect(formatGrams(-0.001, 2)).toBe('0.00');
    expect(formatGrams(114.1, 2)).toBe('114.10');
  });

  it('ends the track beyond the band and keeps weights on it', () => {
    expect(trackEndG(0, 100, 101)).toBeCloseTo(116.15);
    expect(trackEndG(30)).toBe(100);
    expect(trackEndG(900)).toBe(2000);
    expect(trackFraction(50, 100)).toBe(0.5);
    expect(trackFraction(-5, 100)).toBe(0);
    expect(trackFraction(500, 100)).toBe(1);
  });
});

describe('the fine view near the target', () => {
  it('magnifies so that the band spans at least a quarter of the track', () => {
    // Part B 0.42 g, band ±1 % → 0.4158–0.4242 g: the window is 0.0084 / 0.3 = 0.028 g wide,
    // 0.406–0.434 g, and the band takes 30 % of it.
    const w = fineWindow(0.42, { lowG: 0.4158, highG: 0.4242 });
    expect(w.startG).toBeCloseTo(0.406, 10);
    expect(w.endG).toBeCloseTo(0.434, 10);
    const share = trackFraction(0.4242, w.endG, w.startG) - trackFraction(0.4158, w.endG, w.startG);
    expect(share).toBeGreaterThanOrEqual(0.25);
    // The whole track at 0.42 g would show the same band at 1/(1.15 × 0.4242) × 0.0084 ≈ 1.7 %.
    expect((0.4242 - 0.4158) / trackEndG(0, 0.42, 0.4242)).toBeLessThan(0.02);
  });
});
