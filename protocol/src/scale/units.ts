import { GRAMS_PER_UNIT, type ScaleUnit } from './types.js';

/** A unit as printed by a balance (any case, surrounding blanks ignored), or `undefined`. */
export function parseUnit(text: string): ScaleUnit | undefined {
  const unit = text.trim().toLowerCase();
  return unit === 'g' || unit === 'kg' || unit === 'lb' || unit === 'oz' ? unit : undefined;
}

/** A value in `unit` as grams, with the exact factor of {@link GRAMS_PER_UNIT}. */
export function toGrams(value: number, unit: ScaleUnit): number {
  return value * GRAMS_PER_UNIT[unit];
}

/** Grams expressed in `unit`. */
export function fromGrams(grams: number, unit: ScaleUnit): number {
  return grams / GRAMS_PER_UNIT[unit];
}

/**
 * Decimal places a display needs in `unit` to show a scale interval of `readabilityG` grams
 * (0.01 g → 2 in g, 5 in kg). Clamped to 0–6.
 */
export function decimalsFor(readabilityG: number, unit: ScaleUnit): number {
  const step = fromGrams(readabilityG, unit);
  if (!(step > 0) || !Number.isFinite(step)) return 2;
  // The small epsilon keeps 0.01 from becoming 3 places through binary rounding of log10.
  return Math.min(6, Math.max(0, Math.ceil(-Math.log10(step) - 1e-9)));
}
