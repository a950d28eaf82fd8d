import { MixInputError, requireNonNegative, requirePositive } from './errors.js';

export const DEFAULT_TOLERANCE_PCT = 1;

export interface ToleranceBand {
  targetG: number;
  lowG: number;
  highG: number;
}

/** The band ± t % of the target (default 1 %, common practice for uneven-ratio epoxies). */
export function toleranceBand(
  targetG: number,
  tolerancePct = DEFAULT_TOLERANCE_PCT,
): ToleranceBand {
  requirePositive(targetG, 'targetG', 'target');
  requirePositive(tolerancePct, 'tolerancePct', 'tolerance');
  if (tolerancePct >= 100) {
    throw new MixInputError('tolerancePct', 'The tolerance must be below 100 %');
  }
  const half = (targetG * tolerancePct) / 100;
  return { targetG, lowG: targetG - half, highG: targetG + half };
}

export type PourVerdict = 'UNDER' | 'SETTLING' | 'GO' | 'OVER';

/**
 * The verdict for a net reading against a band (edges inclusive). Inside the band the reading
 * must also be stable to be GO; until then it is SETTLING.
 */
export function judgeReading(
  netG: number,
  stable: boolean,
  band: Pick<ToleranceBand, 'lowG' | 'highG'>,
): PourVerdict {
  if (!Number.isFinite(netG)) throw new MixInputError('netG', 'The reading is not a number');
  requireNonNegative(band.lowG, 'band.lowG', 'low edge of the band');
  if (!(band.highG >= band.lowG)) {
    throw new MixInputError('band.highG', 'The high edge of the band is below the low edge');
  }
  if (netG < band.lowG) return 'UNDER';
  if (netG > band.highG) return 'OVER';
  return stable ? 'GO' : 'SETTLING';
}
