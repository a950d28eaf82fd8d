/**
 * What is in the active pour after the hub restarted, read from the balance itself. The record's
 * own figure (the last trace point written) lags the cup by up to one trace flush, and trusting
 * it once credited a few grams of part A that were not there: the cup held about 10 % more
 * resin than the record said, and the batch still saved GO.
 *
 * Before the restart the hub stored the gross at the tare of the active pour (the cup and the
 * earlier parts). After it, the hub holds no tare of its own, so a reading shows what the balance
 * displays, and that is one of two things:
 *
 * - the balance still holds the tare it was given: the display is the pour since that tare;
 * - the balance lost it (power cycle, a software tare that went with the old hub, or a balance
 *   that prints gross): the display is the gross, and the pour is display − the stored gross.
 *
 * Which one comes from what the balance prints: a line marked net (the first), a line marked
 * gross or a family that takes no tare command (the second). Where the line does not say, a
 * reading can still decide when only one meaning fits what the record already holds: a pour only
 * grows, so its contents are at least the last written trace point.
 */
export type CupContents =
  { known: true; pouredG: number; how: string } | { known: false; why: string };

export const UNCERTAIN_AFTER_RESTART = 'contents uncertain after a restart';

export interface ContentsEvidence {
  /** Gross at the tare of the active pour, stored when it was tared; undefined if never tared. */
  tareGrossG: number | undefined;
  /** The balance's display now, with the hub holding no tare of its own. */
  displayG: number;
  stable: boolean;
  /** What the line says it shows. */
  lineMode: 'gross' | 'net' | 'unknown';
  /** The line family takes no tare command: the hub's tare was its own and went with it. */
  softwareTare: boolean;
  /** The last pour trace point written before the restart, if any. */
  lastTraceNetG: number | undefined;
  /** The scale's readability d, in grams. */
  readabilityG: number;
}

/** How closely contents must be established to weigh on: max(0.5 g, 2 d). */
export const contentsToleranceG = (readabilityG: number): number => Math.max(0.5, 2 * readabilityG);

export function contentsAfterRestart(e: ContentsEvidence): CupContents {
  const tol = contentsToleranceG(e.readabilityG);
  if (e.tareGrossG === undefined) {
    return { known: false, why: 'the pour had no tare stored before the restart' };
  }
  if (!e.stable) return { known: false, why: 'the reading is not steady' };
  const keptTare = e.displayG;
  const lostTare = e.displayG - e.tareGrossG;
  const floor = (e.lastTraceNetG ?? 0) - tol;
  const fits = (g: number) => g >= floor && g >= -tol;
  const candidates: Array<{ g: number; how: string }> = [];
  if (e.lineMode === 'net' && !e.softwareTare) {
    candidates.push({ g: keptTare, how: 'the balance still holds the tare' });
  } else if (e.lineMode === 'gross' || e.softwareTare) {
    candidates.push({ g: lostTare, how: 'the balance shows gross: the stored tare applies' });
  } else {
    candidates.push({ g: keptTare, how: 'the balance still holds the tare' });
    if (Math.abs(lostTare - keptTare) > tol) {
      candidates.push({ g: lostTare, how: 'the balance lost the tare: the stored tare applies' });
    }
  }
  const fitting = candidates.filter((c) => fits(c.g));
  if (fitting.length === 1) {
    const [c] = fitting;
    return { known: true, pouredG: Math.max(0, c!.g), how: c!.how };
  }
  if (fitting.length === 0) {
    return {
      known: false,
      why: `the balance shows ${e.displayG.toFixed(2)} g, which fits neither a kept nor a lost tare (the cup was moved or the balance re-tared)`,
    };
  }
  return {
    known: false,
    why: `the balance does not say whether it kept its tare, and ${e.displayG.toFixed(2)} g fits both`,
  };
}
