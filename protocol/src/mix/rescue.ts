import { MixInputError, requireNonNegative, requirePositive } from './errors.js';
import { checkParts } from './ratio.js';

export interface RescuePlan {
  /** Grams of each part to add, 0 for the part that was over-poured the most. */
  addG: number[];
  /** Net mass of the mix once every addition is in. */
  totalAfterG: number;
  /** Whether the additions fit under the capacity; undefined when no capacity was given. */
  fits: boolean | undefined;
}

/**
 * After an over-pour, how much of each other part to add to restore the ratio: scale every part
 * up to the one that is furthest over, f = max(actual_i / part_i), add f × part_i − actual_i.
 * `capacityG` is what the cup or the scale can take; `grossBeforeG` what stands on the scale now
 * (cup included). Without it the comparison uses the mix alone.
 */
export function rescueOverPour(
  weightParts: readonly number[],
  actualsG: readonly number[],
  opts: { capacityG?: number; grossBeforeG?: number } = {},
): RescuePlan {
  const parts = checkParts(weightParts, 'weightParts');
  if (actualsG.length !== parts.length) {
    throw new MixInputError(
      'actualsG',
      `Give the poured mass of each of the ${parts.length} parts`,
    );
  }
  const actuals = actualsG.map((a, i) => requireNonNegative(a, `actualsG.${i}`, 'poured mass'));
  const scales = actuals.map((a, i) => a / parts[i]!);
  const f = Math.max(...scales);
  if (!(f > 0)) throw new MixInputError('actualsG', 'Nothing has been poured');
  // The part that sets f needs nothing: say exactly 0 rather than a rounding crumb.
  const addG = actuals.map((a, i) => (scales[i] === f ? 0 : Math.max(0, f * parts[i]! - a)));
  const totalAfterG = f * parts.reduce((a, b) => a + b, 0);
  let fits: boolean | undefined;
  if (opts.capacityG !== undefined) {
    requirePositive(opts.capacityG, 'capacityG', 'capacity');
    const before =
      opts.grossBeforeG !== undefined
        ? requireNonNegative(opts.grossBeforeG, 'grossBeforeG', 'gross mass')
        : actuals.reduce((a, b) => a + b, 0);
    fits = before + addG.reduce((a, b) => a + b, 0) <= opts.capacityG;
  }
  return { addG, totalAfterG, fits };
}
