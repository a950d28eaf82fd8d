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

/**
 * The repeatability s to judge a scale by: its measured sample standard deviation where there is
 * one, never below USP <41>'s floor of 0.41 d; 0.41 d alone without a measurement.
 */
export function effectiveRepeatabilityG(
  readabilityG: number,
  repeatabilitySdG?: number | null,
): { sG: number; source: 'measured' | 'readability' } {
  const d = requirePositive(readabilityG, 'readabilityG', 'readability');
  const floor = USP41_MIN_S_PER_D * d;
  if (repeatabilitySdG === undefined || repeatabilitySdG === null) {
    return { sG: floor, source: 'readability' };
  }
  const s = requireNonNegative(repeatabilitySdG, 'repeatabilitySdG', 'repeatability');
  return s > floor ? { sG: s, source: 'measured' } : { sG: floor, source: 'readability' };
}

export interface BatchFitnessInput {
  /** Parts by weight, part A first. */
  weightRatio: readonly number[];
  /** The planned batch, grams. */
  totalMassG: number;
  /** The band, ± % of each part's target. */
  tolerancePct: number;
  /** Scale interval d, g. */
  readabilityG: number;
  /** The bench's measured repeatability, g; absent or null when none was measured. */
  repeatabilitySdG?: number | null;
}

export interface BatchFitness {
  /** The s used: measured, or 0.41 d. */
  sG: number;
  sSource: 'measured' | 'readability';
  /** Smallest net mass this scale weighs within the band: 2 s / (tolerance / 100). */
  minNetG: number;
  /** Each part's planned target, g, part A first. */
  targetsG: number[];
  /** Parts whose target is below {@link BatchFitness.minNetG}, with their targets. */
  tooSmall: { part: number; targetG: number }[];
  /**
   * The smallest batch whose every part reaches the minimum net mass, rounded up to the scale
   * interval: minNetG × (sum of the ratio) / (its smallest part).
   */
  smallestBatchG: number;
}

/**
 * Whether a planned batch is within what the scale can weigh to the band. Each part is weighed
 * on its own tare, so each part's target must reach the minimum net mass (USP General Chapter
 * <41>, coverage 2, applied to our band).
 */
export function batchFitness(input: BatchFitnessInput): BatchFitness {
  requirePositive(input.totalMassG, 'totalMassG', 'total mass');
  const { sG, source } = effectiveRepeatabilityG(input.readabilityG, input.repeatabilitySdG);
  const minNetG = minNetWeightG(
    { readabilityG: input.readabilityG, repeatabilityG: sG },
    input.tolerancePct,
  );
  const ratio = input.weightRatio.map((r, i) => requirePositive(r, `weightRatio.${i}`, 'ratio'));
  const sum = ratio.reduce((a, b) => a + b, 0);
  const targetsG = ratio.map((r) => (input.totalMassG * r) / sum);
  const tooSmall = targetsG
    .map((targetG, part) => ({ part, targetG }))
    .filter(({ targetG }) => targetG < minNetG);
  const exact = (minNetG * sum) / Math.min(...ratio);
  // Up to the next whole interval; the small epsilon keeps an exact multiple where it is.
  const d = input.readabilityG;
  const smallestBatchG = Math.ceil(exact / d - 1e-9) * d;
  return {
    sG,
    sSource: source,
    minNetG,
    targetsG,
    tooSmall,
    smallestBatchG: Number(smallestBatchG.toFixed(10)),
  };
}
