import type { ScaleCheck } from '@tareline/protocol/scale-checks';
import { gramsText } from '../../../lib/grams';

/** A signed error to the scale's decimals: "+0.05 g", "−0.21 g". */
export function signedGrams(grams: number, readabilityG: number): string {
  const text = gramsText(grams, readabilityG);
  // A plus sign only where a digit shows: never "+0.00 g".
  return grams > 0 && /[1-9]/.test(text) ? `+${text}` : text;
}

/** s to one more decimal than the scale shows: it is usually below d. */
export function sdText(grams: number, readabilityG: number): string {
  return gramsText(grams, readabilityG / 10);
}

export const STATE_WORDS: Record<ScaleCheck['state'], string> = {
  waiting: 'Running',
  passed: 'Passed',
  failed: 'Failed',
  cancelled: 'Cancelled',
  interrupted: 'Interrupted',
};

export const KIND_WORDS: Record<ScaleCheck['kind'], string> = {
  routine: 'Routine check',
  repeatability: 'Repeatability test',
};

/** What the check found, in one line. */
export function outcomeText(check: ScaleCheck): string {
  const d = check.readabilityG;
  if (check.kind === 'routine') {
    if (check.readingG === null || check.errorG === null) return check.note ?? '—';
    return `Read ${gramsText(check.readingG, d)}, error ${signedGrams(check.errorG, d)} (±${gramsText(check.toleranceG ?? 0, d)} allowed)`;
  }
  if (check.sdG === null)
    return check.note ?? `${check.readings.length} of ${check.placementsNeeded} placements read`;
  const band = check.bandPct === null ? '' : ` at ±${check.bandPct} %`;
  return `s = ${sdText(check.sdG, d)}; smallest net mass${band}: ${gramsText(check.minNetG ?? 0, d)}`;
}
