import { requireNonNegative, requirePositive } from './errors.js';

/** USP <41>: when the repeatability s is below 0.41 d, 0.41 d is used instead. */
export const USP41_MIN_S_PER_D = 0.41;
/** USP <41>: the coverage factor in 2 s / m ≤ tolerance. */
export const USP41_COVERAGE = 2;

export interface ScaleFigures {
  /** Readability d (scale interval), g. */
  readabilityG: number;
  /** Repeatability s (standard deviation of repeated weighings), g. */
  repeatabilityG: number;
}

/**
 * Smallest net mass a scale weighs within ± tolerancePct, by the rule of USP General Chapter <41>
 * applied to our band instead of its 0.10 %: 2 × max(s, 0.41 d) / (tolerance / 100). At 0.10 %
 * this is 2000 s (820 d at the floor); at a 1 % band, 82 d at the floor.
 */
export function minNetWeightG(scale: ScaleFigures, tolerancePct: number): number {
  const d = requirePositive(scale.readabilityG, 'scale.readabilityG', 'readability');
  const s = requireNonNegative(scale.repeatabilityG, 'scale.repeatabilityG', 'repeatability');
  requirePositive(tolerancePct, 'tolerancePct', 'tolerance');
  return (USP41_COVERAGE * Math.max(s, USP41_MIN_S_PER_D * d)) / (tolerancePct / 100);
}
