/**
 * Where the gauge's track ends: a little beyond the band (so OVER stays visible), or beyond the
 * weight itself when there is no target.
 */
export function trackEndG(netG: number, targetG?: number, highG?: number): number {
  if (targetG !== undefined && targetG > 0) return Math.max(highG ?? targetG, targetG) * 1.15;
  return Math.max(100, niceCeiling(Math.abs(netG) * 1.25));
}

function niceCeiling(grams: number): number {
  const magnitude = 10 ** Math.floor(Math.log10(Math.max(grams, 1)));
  for (const step of [1, 2, 5, 10]) if (grams <= step * magnitude) return step * magnitude;
  return 10 * magnitude;
}

/** A weight's position on the track, 0 (track start, empty by default) to 1 (track end), clamped. */
export function trackFraction(grams: number, endG: number, startG = 0): number {
  if (!(endG > startG)) return 0;
  return Math.min(1, Math.max(0, (grams - startG) / (endG - startG)));
}

/** Share of the fine view's width the band takes: at least a quarter, with room either side. */
export const FINE_BAND_SHARE = 0.3;

/**
 * The stretch of grams the gauge shows near the target: centred on the target, wide enough that
 * the band takes {@link FINE_BAND_SHARE} of it (never starting below zero).
 */
export function fineWindow(targetG: number, band: { lowG: number; highG: number }) {
  const width = (band.highG - band.lowG) / FINE_BAND_SHARE;
  const startG = Math.max(0, targetG - width / 2);
  return { startG, endG: startG + width };
}
