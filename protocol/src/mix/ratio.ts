import { z } from 'zod';
import { positiveMeasure } from './cavity.js';
import { MixInputError, requireNonNegative, requirePositive } from './errors.js';

export const PART_NAMES = ['A', 'B', 'C'] as const;

/** A maker's mix ratio: 2 or 3 positive parts, by weight or by volume, part A first. */
export const mixRatioSchema = z.object(
  {
    basis: z.enum(['weight', 'volume'], { error: () => 'Choose by weight or by volume' }),
    parts: z
      .array(positiveMeasure('ratio part'), { error: () => 'Enter the parts of the ratio' })
      .min(2, { error: 'A mix ratio has 2 or 3 parts' })
      .max(3, { error: 'A mix ratio has 2 or 3 parts' }),
  },
  { error: () => 'Enter the mix ratio' },
);
export type MixRatio = z.infer<typeof mixRatioSchema>;
export type RatioBasis = MixRatio['basis'];

/** Checks a list of ratio parts: 2 or 3 finite numbers above zero. */
export function checkParts(parts: readonly number[], field = 'material.ratio.parts'): number[] {
  if (!Array.isArray(parts) || parts.length < 2 || parts.length > 3) {
    throw new MixInputError(field, 'A mix ratio has 2 or 3 parts');
  }
  return parts.map((p, i) =>
    requirePositive(p, `${field}.${i}`, `part ${PART_NAMES[i]} of the ratio`),
  );
}

/** Checks one specific gravity per part. */
export function checkPartSpecificGravities(
  sgs: readonly number[] | undefined,
  count: number,
  field = 'material.partSpecificGravities',
): number[] {
  if (sgs === undefined) {
    throw new MixInputError(field, "A ratio by volume needs each part's specific gravity");
  }
  if (sgs.length !== count) {
    throw new MixInputError(field, `Give one specific gravity for each of the ${count} parts`);
  }
  return sgs.map((s, i) =>
    requirePositive(s, `${field}.${i}`, `specific gravity of part ${PART_NAMES[i]}`),
  );
}

/**
 * The ratio as parts by weight. By volume, each part's volume is multiplied by its specific
 * gravity (mass = volume × SG) and the result scaled so that part A keeps its number, so 1:1 by
 * volume with SGs 1.10 and 0.98 is 1 : 0.891 by weight.
 */
export function weightRatio(ratio: MixRatio, partSpecificGravities?: readonly number[]): number[] {
  const parts = checkParts(ratio.parts);
  if (ratio.basis === 'weight') return parts;
  const sgs = checkPartSpecificGravities(partSpecificGravities, parts.length);
  return parts.map((v, i) => (v * sgs[i]!) / sgs[0]!);
}

/** The ratio as parts by volume (the inverse of {@link weightRatio}); part A keeps its number. */
export function volumeRatio(ratio: MixRatio, partSpecificGravities?: readonly number[]): number[] {
  const parts = checkParts(ratio.parts);
  if (ratio.basis === 'volume') return parts;
  const sgs = checkPartSpecificGravities(partSpecificGravities, parts.length);
  return parts.map((w, i) => (w / sgs[i]!) * sgs[0]!);
}

/** The same ratio expressed on the other basis. */
export function convertRatio(
  ratio: MixRatio,
  to: RatioBasis,
  partSpecificGravities: readonly number[],
): MixRatio {
  return {
    basis: to,
    parts:
      to === 'weight'
        ? weightRatio(ratio, partSpecificGravities)
        : volumeRatio(ratio, partSpecificGravities),
  };
}

/**
 * Split a total mass into the parts of a by-weight ratio. The last part takes what is left, so
 * the parts always sum to the total exactly as it was given.
 */
export function splitTotalG(totalG: number, weightParts: readonly number[]): number[] {
  requirePositive(totalG, 'totalG', 'total mass');
  const parts = checkParts(weightParts, 'weightParts');
  const sum = parts.reduce((a, b) => a + b, 0);
  const masses = parts.slice(0, -1).map((p) => (totalG * p) / sum);
  masses.push(totalG - masses.reduce((a, b) => a + b, 0));
  return masses;
}

function checkActuals(actualsG: readonly number[], count: number, field = 'actualsG'): number[] {
  if (actualsG.length < 1 || actualsG.length > count) {
    throw new MixInputError(field, `Give between 1 and ${count} poured masses, part A first`);
  }
  return actualsG.map((a, i) =>
    requireNonNegative(a, `${field}.${i}`, `poured mass of part ${PART_NAMES[i]}`),
  );
}

/**
 * Target of the next part (index `actualsG.length`), from the part A actually poured: part A is
 * the reference every later part is weighed against, so an over- or under-pour of A carries
 * into the others and the ratio stays right.
 */
export function nextPartTargetG(
  weightParts: readonly number[],
  actualsG: readonly number[],
): number {
  const parts = checkParts(weightParts, 'weightParts');
  if (actualsG.length >= parts.length) {
    throw new MixInputError('actualsG', 'Every part has been poured already');
  }
  const actuals = checkActuals(actualsG, parts.length - 1);
  if (actuals[0] === 0) {
    throw new MixInputError('actualsG.0', 'Pour part A before the next part');
  }
  const k = actuals.length;
  return (actuals[0]! * parts[k]!) / parts[0]!;
}

/**
 * How far each poured part is from the ratio, in per cent, relative to part A (part A is 0):
 * (actual_i / actual_A) / (part_i / part_A) − 1.
 */
export function ratioDeviationsPct(
  weightParts: readonly number[],
  actualsG: readonly number[],
): number[] {
  const parts = checkParts(weightParts, 'weightParts');
  const actuals = checkActuals(actualsG, parts.length);
  if (actuals[0] === 0) throw new MixInputError('actualsG.0', 'Part A has not been poured');
  return actuals.map((a, i) =>
    i === 0 ? 0 : (a / actuals[0]! / (parts[i]! / parts[0]!) - 1) * 100,
  );
}

/** The largest deviation by magnitude, with its sign. */
export function ratioDeviationPct(
  weightParts: readonly number[],
  actualsG: readonly number[],
): number {
  return ratioDeviationsPct(weightParts, actualsG).reduce(
    (worst, d) => (Math.abs(d) > Math.abs(worst) ? d : worst),
    0,
  );
}
