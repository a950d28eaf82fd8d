import { PART_NAMES, type MixRatio } from './ratio.js';

/**
 * How far a by-weight and a by-volume statement of the same ratio may disagree before one of
 * them is taken for a typing mistake, in per cent (common practice, no published source: data
 * sheets round both ratios and the SGs to two or three figures, which alone moves them ~1 %).
 */
export const RATIO_AGREEMENT_PCT = 2;

export interface RatioDisagreement {
  /** Index of the part that is off (1 = part B, 2 = part C); part A is the reference. */
  part: number;
  /** (by weight) / (by volume × SG) − 1, relative to part A, in per cent. */
  differencePct: number;
  message: string;
}

const fmt = (n: number) => Number(n.toPrecision(4)).toString();

/**
 * Checks a ratio stated both by weight and by volume against the parts' specific gravities.
 * Mass = volume × density, and a specific gravity is a density relative to water (ASTM D792 §3,
 * "specific gravity"), so part i by weight relative to part A must equal
 * (v_i × SG_i) / (v_A × SG_A). Returns each part (B, C) whose two statements differ by more than
 * `tolerancePct`; empty when they agree or when the SGs or part counts are missing.
 */
export function ratioDisagreements(
  byWeight: readonly number[],
  byVolume: readonly number[],
  partSpecificGravities: readonly number[],
  tolerancePct = RATIO_AGREEMENT_PCT,
): RatioDisagreement[] {
  const n = byWeight.length;
  if (byVolume.length !== n || partSpecificGravities.length !== n || n < 2) return [];
  const all = [...byWeight, ...byVolume, ...partSpecificGravities];
  if (!all.every((x) => Number.isFinite(x) && x > 0)) return [];
  const out: RatioDisagreement[] = [];
  for (let i = 1; i < n; i++) {
    const stated = byWeight[i]! / byWeight[0]!;
    const fromVolume =
      (byVolume[i]! * partSpecificGravities[i]!) / (byVolume[0]! * partSpecificGravities[0]!);
    const differencePct = (stated / fromVolume - 1) * 100;
    if (Math.abs(differencePct) > tolerancePct) {
      const name = PART_NAMES[i]!;
      out.push({
        part: i,
        differencePct,
        message:
          `Part ${name} is off: ${fmt(byWeight[0]!)} : ${fmt(byWeight[i]!)} by weight, but ` +
          `${fmt(byVolume[0]!)} : ${fmt(byVolume[i]!)} by volume with these SGs gives ` +
          `${fmt(byWeight[0]!)} : ${fmt(byWeight[0]! * fromVolume)} ` +
          `(${fmt(Math.abs(differencePct))} % apart, more than ${tolerancePct} %)`,
      });
    }
  }
  return out;
}

/** {@link ratioDisagreements} for a material's ratio and the one also stated on the other basis. */
export function statedRatiosDisagree(
  ratio: MixRatio,
  alsoStated: MixRatio,
  partSpecificGravities: readonly number[],
): RatioDisagreement[] {
  if (ratio.basis === alsoStated.basis) return [];
  const [w, v] = ratio.basis === 'weight' ? [ratio, alsoStated] : [alsoStated, ratio];
  return ratioDisagreements(w.parts, v.parts, partSpecificGravities);
}
