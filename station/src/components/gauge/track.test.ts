import { describe, expect, it } from 'vitest';
import { decimalsForReadability, formatGrams } from '../../lib/grams';
import { trackEndG, trackFraction } from './track';

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
