import { MixInputError, requirePositive } from './errors.js';
import { checkPartSpecificGravities, weightRatio, type MixRatio } from './ratio.js';
import { CM3_PER_IN3, GRAMS_PER_POUND } from './units.js';

/**
 * Volumetric yield of a material of specific gravity 1, in in³/lb: 453.592 37 / 16.387 064 =
 * 27.6799 (NIST SP 811, App. B.8: 1 lb/in³ = 27 679.9 kg/m³). Specific gravity is taken against
 * water at 1 g/cm³, as material data sheets use it.
 */
export const IN3_PER_LB_AT_SG1 = GRAMS_PER_POUND / CM3_PER_IN3;

/** Yield (in³/lb) = 27.68 / SG. */
export function yieldFromSpecificGravity(
  specificGravity: number,
  field = 'material.specificGravity',
): number {
  return IN3_PER_LB_AT_SG1 / requirePositive(specificGravity, field, 'specific gravity');
}

/** SG = 27.68 / yield (in³/lb). */
export function specificGravityFromYield(
  yieldIn3PerLb: number,
  field = 'material.yieldIn3PerLb',
): number {
  return IN3_PER_LB_AT_SG1 / requirePositive(yieldIn3PerLb, field, 'yield');
}

export type Density = { specificGravity: number } | { yieldIn3PerLb: number };

/** Mass in grams of a volume in cm³: volume × SG (or volume in in³ / yield, in lb). */
export function massFromVolumeG(volumeCm3: number, density: Density): number {
  requirePositive(volumeCm3, 'volume', 'volume');
  const sg =
    'specificGravity' in density
      ? requirePositive(density.specificGravity, 'material.specificGravity', 'specific gravity')
      : specificGravityFromYield(density.yieldIn3PerLb);
  return volumeCm3 * sg;
}

/**
 * SG of the mixed material from the parts' SGs and the ratio, assuming the volumes add (no
 * shrinkage on mixing): total mass / total volume = Σ w / Σ (w / SG).
 */
export function mixSpecificGravity(
  ratio: MixRatio,
  partSpecificGravities: readonly number[],
): number {
  const sgs = checkPartSpecificGravities(partSpecificGravities, ratio.parts.length);
  const w = weightRatio(ratio, sgs);
  const mass = w.reduce((a, b) => a + b, 0);
  const volume = w.reduce((a, wi, i) => a + wi / sgs[i]!, 0);
  if (!(volume > 0)) throw new MixInputError('material.ratio.parts', 'The ratio has no volume');
  return mass / volume;
}
