import { MixInputError, requirePositive } from './errors.js';

/**
 * A round cup, straight or tapered, sizes in cm. `heightCm` is the usable height, with the
 * bottom and top diameters measured inside at the bottom and at that height.
 */
export interface CupShape {
  bottomDiameterCm: number;
  topDiameterCm: number;
  heightCm: number;
}

function cupVolumeToHeight(cup: CupShape, h: number): number {
  const rb = cup.bottomDiameterCm / 2;
  const k = (cup.topDiameterCm / 2 - rb) / cup.heightCm;
  const r = rb + k * h;
  return (Math.PI * h * (rb * rb + rb * r + r * r)) / 3;
}

/**
 * Height in cm at which a cup holds `volumeCm3`. Straight cup: V / (π r²). Tapered: the
 * frustum formula solved for the height; with the radius growing by k per cm of height,
 * V(h) = π (r(h)³ − r_b³) / (3 k), so r(h) = ∛(r_b³ + 3 k V / π) and h = (r(h) − r_b) / k.
 */
export function cupFillHeightCm(cup: CupShape, volumeCm3: number): number {
  const rb = requirePositive(cup.bottomDiameterCm, 'cup.bottomDiameterCm', 'bottom diameter') / 2;
  const rt = requirePositive(cup.topDiameterCm, 'cup.topDiameterCm', 'top diameter') / 2;
  const H = requirePositive(cup.heightCm, 'cup.heightCm', 'cup height');
  requirePositive(volumeCm3, 'volumeCm3', 'volume');
  if (volumeCm3 > cupVolumeToHeight(cup, H) * (1 + 1e-12)) {
    throw new MixInputError('volumeCm3', 'The cup is too small for this volume: use a larger cup');
  }
  const k = (rt - rb) / H;
  // Below this taper the closed form loses precision; the straight-cup formula is exact enough.
  if (Math.abs(k) < 1e-9) return volumeCm3 / (Math.PI * rb * rb);
  const r = Math.cbrt(rb ** 3 + (3 * k * volumeCm3) / Math.PI);
  return (r - rb) / k;
}

/**
 * Marks for mixing by volume without a scale: the height to fill to after each part, in
 * order (cumulative). For 1:1 in a straight cup the marks are equally spaced; in a tapered cup
 * they are not, which is why the second mark is computed rather than doubled.
 */
export function fillMarksCm(cup: CupShape, partVolumesCm3: readonly number[]): number[] {
  let total = 0;
  return partVolumesCm3.map((v, i) => {
    total += requirePositive(v, `partVolumesCm3.${i}`, 'part volume');
    return cupFillHeightCm(cup, total);
  });
}
