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

/** A weight's position on the track, 0 (empty) to 1 (track end), clamped. */
export function trackFraction(grams: number, endG: number): number {
  if (!(endG > 0)) return 0;
  return Math.min(1, Math.max(0, grams / endG));
}
