import {
  judgeReading,
  nextPartTargetG,
  PART_NAMES,
  ratioDeviationPct,
  rescueOverPour,
  splitTotalG,
  toleranceBand,
  type ActivePour,
  type BatchPart,
  type BatchState,
  type BatchVerdict,
  type LotWarning,
  type PourVerdict,
  type Rescue,
} from '@tareline/protocol';

/**
 * The batch state machine, pure: every operation takes a record and returns the next one, or
 * throws {@link BatchRefusal} with words an operator understands. The service persists each
 * result before telling anyone about it.
 *
 *   weighing-a → weighing-b (→ weighing-c) → saved
 *   any weighing state → abandoned | interrupted;  interrupted → the weighing state it left
 */
export interface BatchRecord {
  state: BatchState;
  /** The weighing state an interrupted batch goes back to. */
  resumeState: BatchState | null;
  verdict: BatchVerdict | null;
  weightRatio: number[];
  tolerancePct: number;
  readabilityG: number;
  totalMassG: number;
  parts: BatchPart[];
  active: ActivePour | null;
  /** Parts still to top up in the rescue being taken, in order. */
  topUpQueue: number[];
  rescue: Rescue | null;
  ratioDeviationPct: number | null;
  abandonReason: string | null;
  interruptedReason: string | null;
  /**
   * Why this batch cannot end GO whatever the scale shows (its contents could not be established
   * after a restart); null for an ordinary batch.
   */
  noGoReason: string | null;
  steps: Record<string, string>;
  lots: { part: number; code: string; lotId: string | null; warnings: LotWarning[] }[];
}

export class BatchRefusal extends Error {
  constructor(
    message: string,
    readonly code:
      | 'WRONG_STATE'
      | 'NOT_TARED'
      | 'NOT_STABLE'
      | 'NOTHING_POURED'
      | 'NOT_IN_BAND'
      | 'NOT_OVER'
      | 'RESCUE_DOES_NOT_FIT',
  ) {
    super(message);
    this.name = 'BatchRefusal';
  }
}

/** A reading as the machine needs it: net grams and the stability flag. */
export interface NetReading {
  netG: number;
  stable: boolean;
}

/** Below this share of the target the gauge shows the slow-down zone (common practice, no published source). */
export const SLOW_DOWN_FRACTION = 0.9;

/** Tolerance for comparing the achieved ratio with the band, against float rounding. */
const EPS = 1e-9;

const weighingState = (part: number): BatchState =>
  (['weighing-a', 'weighing-b', 'weighing-c'] as const)[part]!;

export const isWeighing = (state: BatchState): boolean => state.startsWith('weighing-');

function requireWeighing(rec: BatchRecord): void {
  if (!isWeighing(rec.state) || !rec.active) {
    throw new BatchRefusal(
      rec.state === 'interrupted'
        ? 'The batch is interrupted: resume it first'
        : `The batch is ${rec.state} and takes no more pours`,
      'WRONG_STATE',
    );
  }
}

function requireReading(rec: BatchRecord, reading: NetReading | undefined): NetReading {
  if (!rec.active?.tared) throw new BatchRefusal('Tare the scale first', 'NOT_TARED');
  if (!reading) throw new BatchRefusal('The scale gives no reading', 'NOT_STABLE');
  if (!reading.stable) {
    throw new BatchRefusal('Wait until the reading is steady', 'NOT_STABLE');
  }
  return reading;
}

function firstPour(rec: BatchRecord, part: number, targetG: number, tared: boolean): ActivePour {
  return {
    part,
    kind: 'first',
    targetG,
    // Part A's band is shown and judged for the operator, but does not hold the batch: every
    // later part follows part A as poured (see confirmPour).
    band: bandOf(toleranceBand(targetG, rec.tolerancePct)),
    slowDownFromG: targetG * SLOW_DOWN_FRACTION,
    tared,
  };
}

const bandOf = (b: { lowG: number; highG: number }) => ({ lowG: b.lowG, highG: b.highG });

const actualsOf = (rec: BatchRecord): number[] =>
  rec.parts.filter((p) => p.actualG !== null).map((p) => p.actualG!);

/** Starts a batch: targets split from the total by the ratio, part A first. */
/**
 * Records a step at `now` without losing an earlier one of the same name: a second tare or a
 * second interruption is kept as `taredB.2`, `interrupted.2`, … so the record shows each one.
 */
export function stamp(
  steps: Record<string, string>,
  name: string,
  now: string,
): Record<string, string> {
  let key = name;
  for (let n = 2; key in steps; n += 1) key = `${name}.${n}`;
  return { ...steps, [key]: now };
}

export function startBatch(input: {
  weightRatio: number[];
  partLabels: string[];
  tolerancePct: number;
  readabilityG: number;
  totalMassG: number;
  lots: BatchRecord['lots'];
  now: string;
}): BatchRecord {
  const targets = splitTotalG(input.totalMassG, input.weightRatio);
  const rec: BatchRecord = {
    state: 'weighing-a',
    resumeState: null,
    verdict: null,
    weightRatio: input.weightRatio,
    tolerancePct: input.tolerancePct,
    readabilityG: input.readabilityG,
    totalMassG: input.totalMassG,
    parts: targets.map((targetG, i) => ({
      label: input.partLabels[i] ?? `Part ${PART_NAMES[i]}`,
      targetG,
      actualG: null,
    })),
    active: null,
    topUpQueue: [],
    rescue: null,
    ratioDeviationPct: null,
    abandonReason: null,
    interruptedReason: null,
    noGoReason: null,
    steps: { created: input.now },
    lots: input.lots,
  };
  rec.active = firstPour(rec, 0, targets[0]!, false);
  return rec;
}

/** The scale was tared for the active pour. */
export function markTared(rec: BatchRecord, now: string): BatchRecord {
  requireWeighing(rec);
  const letter = PART_NAMES[rec.active!.part];
  return {
    ...rec,
    active: { ...rec.active!, tared: true },
    steps: stamp(rec.steps, `tared${letter}${rec.active!.kind === 'top-up' ? 'TopUp' : ''}`, now),
  };
}

/** The hub's verdict on a reading for the active pour; null when there is nothing to judge. */
export function judge(rec: BatchRecord, reading: NetReading): PourVerdict | null {
  if (!isWeighing(rec.state) || !rec.active?.tared || !rec.active.band) return null;
  return judgeReading(reading.netG, reading.stable, rec.active.band);
}

/**
 * Part A's own pour: its band is advice (a verdict on the gauge), never a condition, because
 * every later part is recomputed from part A as poured. A top-up of part A must be in its band.
 */
export const isAdvisoryPour = (active: ActivePour): boolean =>
  active.part === 0 && active.kind === 'first';

/** Where a reading sits against the band, whatever its stability. */
export type BandZone = 'under' | 'in' | 'over';

/** The zone shown, and the last reading that agreed with it. */
export interface HeldZone {
  zone: BandZone;
  atG: number;
}

const zoneOf = (netG: number, band: { lowG: number; highG: number }): BandZone =>
  netG < band.lowG ? 'under' : netG > band.highG ? 'over' : 'in';

/**
 * The verdict without flicker. The zone shown (UNDER, in the band, OVER) changes only when the
 * reading has moved by more than one scale interval d from the last reading that agreed with it;
 * a reading dithering by one interval across an edge keeps the zone it had. Inside the band the
 * verdict is GO when the reading is stable, SETTLING while it moves (stability is not held).
 * Pure: the caller keeps `held` between readings and starts afresh (null) for every pour.
 */
export function judgeSteady(
  held: HeldZone | null,
  reading: NetReading,
  band: { lowG: number; highG: number },
  intervalG: number,
): { verdict: PourVerdict; held: HeldZone } {
  const raw = zoneOf(reading.netG, band);
  let next: HeldZone;
  if (!held || raw === held.zone) next = { zone: raw, atG: reading.netG };
  else if (Math.abs(reading.netG - held.atG) > intervalG + EPS)
    next = { zone: raw, atG: reading.netG };
  else next = held;
  const verdict: PourVerdict =
    next.zone === 'under'
      ? 'UNDER'
      : next.zone === 'over'
        ? 'OVER'
        : reading.stable
          ? 'GO'
          : 'SETTLING';
  return { verdict, held: next };
}

function withDeviation(rec: BatchRecord): BatchRecord {
  const actuals = actualsOf(rec);
  const deviation =
    actuals.length >= 2 && actuals[0]! > 0 ? ratioDeviationPct(rec.weightRatio, actuals) : null;
  return { ...rec, ratioDeviationPct: deviation };
}

function save(rec: BatchRecord, verdict: BatchVerdict, now: string): BatchRecord {
  return withDeviation({
    ...rec,
    state: 'saved',
    verdict,
    active: null,
    topUpQueue: [],
    steps: stamp(rec.steps, 'saved', now),
  });
}

/** The band a top-up of `part` must end in, so every fixed part is within the tolerance of it. */
function topUpPour(rec: BatchRecord, part: number, queue: number[]): ActivePour {
  const t = rec.tolerancePct / 100;
  const r = rec.weightRatio;
  const actual = rec.parts[part]!.actualG ?? 0;
  let lowTotal: number;
  let highTotal: number;
  let targetTotal: number;
  if (part === 0) {
    // Part A is the reference: each fixed part j needs A within [Bj·rA/rj/(1+t), Bj·rA/rj/(1−t)].
    const fixed = rec.parts
      .map((p, j) => ({ j, g: p.actualG }))
      .filter(({ j, g }) => j !== 0 && g !== null && !queue.includes(j));
    const needs = fixed.map(({ j, g }) => (g! * r[0]!) / r[j]!);
    targetTotal = Math.max(...needs);
    lowTotal = Math.max(...needs.map((n) => n / (1 + t)));
    highTotal = Math.min(...needs.map((n) => n / (1 - t)));
  } else {
    const a = rec.parts[0]!.actualG!;
    targetTotal = (a * r[part]!) / r[0]!;
    lowTotal = targetTotal * (1 - t);
    highTotal = targetTotal * (1 + t);
  }
  const targetG = Math.max(0, targetTotal - actual);
  return {
    part,
    kind: 'top-up',
    targetG,
    band: { lowG: Math.max(0, lowTotal - actual), highG: Math.max(0, highTotal - actual) },
    slowDownFromG: targetG * SLOW_DOWN_FRACTION,
    tared: false,
  };
}

/** After a part's pour is in, what comes next: another top-up, the next part, or saving. */
function advance(rec: BatchRecord, now: string): BatchRecord {
  if (rec.topUpQueue.length > 0) {
    const [part, ...rest] = rec.topUpQueue;
    return {
      ...rec,
      state: weighingState(part!),
      topUpQueue: rest,
      active: topUpPour(rec, part!, rest),
    };
  }
  const next = rec.parts.findIndex((p) => p.actualG === null);
  if (next === -1) {
    const done = withDeviation(rec);
    const inBand = Math.abs(done.ratioDeviationPct ?? 0) <= rec.tolerancePct + EPS;
    return save(done, inBand && !rec.noGoReason ? 'GO' : 'NO-GO', now);
  }
  const actuals = actualsOf(rec);
  const targetG = nextPartTargetG(rec.weightRatio, actuals);
  // Every later part follows part A as poured, so the plan shown stays consistent.
  const a = rec.parts[0]!.actualG!;
  const parts = rec.parts.map((p, i) =>
    i >= next ? { ...p, targetG: (a * rec.weightRatio[i]!) / rec.weightRatio[0]! } : p,
  );
  return {
    ...rec,
    parts,
    state: weighingState(next),
    active: firstPour({ ...rec, parts }, next, targetG, false),
  };
}

/**
 * The operator confirms the active pour (or the hub does, after the dwell inside the band).
 * Part A is accepted at any stable weight above zero; later parts only inside their band.
 */
export function confirmPour(
  rec: BatchRecord,
  reading: NetReading | undefined,
  now: string,
): BatchRecord {
  requireWeighing(rec);
  const { netG } = requireReading(rec, reading);
  const active = rec.active!;
  // A part credited after a restart may already be complete: nothing more to pour is fine then.
  const credited = (rec.parts[active.part]!.actualG ?? 0) > 0;
  if (!(netG > 0) && !(credited && netG >= 0)) {
    throw new BatchRefusal('Nothing has been poured yet', 'NOTHING_POURED');
  }
  if (active.band && !isAdvisoryPour(active)) {
    const verdict = judgeReading(netG, true, active.band);
    if (verdict !== 'GO') {
      throw new BatchRefusal(
        verdict === 'OVER'
          ? 'Over the band: take the rescue or save the batch as NO-GO'
          : 'Under the band: pour a little more',
        'NOT_IN_BAND',
      );
    }
  }
  const letter = PART_NAMES[active.part];
  const parts = rec.parts.map((p, i) =>
    i === active.part ? { ...p, actualG: (p.actualG ?? 0) + Math.max(0, netG) } : p,
  );
  const stepName = active.kind === 'top-up' ? `topUp${letter}` : `confirmed${letter}`;
  return advance({ ...rec, parts, steps: stamp(rec.steps, stepName, now) }, now);
}

/** What the rescue would be for the current over-pour, without taking it. */
export function proposeRescue(
  rec: BatchRecord,
  reading: NetReading,
  capacity?: { capacityG: number; grossG: number },
): Rescue {
  const active = rec.active!;
  const actuals = rec.parts
    .map((p, i) => (i === active.part ? (p.actualG ?? 0) + reading.netG : p.actualG))
    .filter((g): g is number => g !== null);
  const weights = rec.weightRatio.slice(0, actuals.length);
  const plan = rescueOverPour(
    weights,
    actuals,
    capacity ? { capacityG: capacity.capacityG, grossBeforeG: capacity.grossG } : {},
  );
  return { addG: plan.addG, totalAfterG: plan.totalAfterG, fits: plan.fits ?? null };
}

/**
 * Takes the rescue after an over-pour: what is in the cup is recorded, and the gauge switches
 * to topping up the parts that fell short, each judged against its own band.
 */
export function takeRescue(
  rec: BatchRecord,
  reading: NetReading | undefined,
  now: string,
  capacity?: { capacityG: number; grossG: number },
): BatchRecord {
  requireWeighing(rec);
  const r = requireReading(rec, reading);
  const active = rec.active!;
  if (
    !active.band ||
    isAdvisoryPour(active) ||
    judgeReading(r.netG, true, active.band) !== 'OVER'
  ) {
    throw new BatchRefusal('There is no over-pour to rescue', 'NOT_OVER');
  }
  const rescue = proposeRescue(rec, r, capacity);
  if (rescue.fits === false) {
    throw new BatchRefusal(
      'The rescue does not fit on the scale: save the batch as NO-GO',
      'RESCUE_DOES_NOT_FIT',
    );
  }
  const parts = rec.parts.map((p, i) =>
    i === active.part ? { ...p, actualG: (p.actualG ?? 0) + r.netG } : p,
  );
  const queue = rescue.addG.map((g, i) => (g > 0 ? i : -1)).filter((i) => i >= 0);
  return advance(
    { ...rec, parts, rescue, topUpQueue: queue, steps: stamp(rec.steps, 'rescueTaken', now) },
    now,
  );
}

/** Saves the batch as it stands, outside the band, on purpose. */
export function saveNoGo(
  rec: BatchRecord,
  reading: NetReading | undefined,
  now: string,
): BatchRecord {
  requireWeighing(rec);
  const r = requireReading(rec, reading);
  const active = rec.active!;
  const parts = rec.parts.map((p, i) =>
    i === active.part && r.netG > 0 ? { ...p, actualG: (p.actualG ?? 0) + r.netG } : p,
  );
  return save({ ...rec, parts }, 'NO-GO', now);
}

/** Abandons the batch, keeping what was weighed (the active pour's last reading if tared). */
export function abandon(
  rec: BatchRecord,
  reason: string,
  lastReading: NetReading | undefined,
  now: string,
): BatchRecord {
  if (!isWeighing(rec.state) && rec.state !== 'interrupted') {
    throw new BatchRefusal(`The batch is ${rec.state} already`, 'WRONG_STATE');
  }
  const active = rec.active;
  const parts = rec.parts.map((p, i) =>
    active && i === active.part && active.tared && lastReading && lastReading.netG > 0
      ? { ...p, actualG: (p.actualG ?? 0) + lastReading.netG }
      : p,
  );
  return withDeviation({
    ...rec,
    parts,
    state: 'abandoned',
    active: null,
    topUpQueue: [],
    abandonReason: reason,
    steps: stamp(rec.steps, 'abandoned', now),
  });
}

/** The hub or the scale went away mid-pour. */
export function interrupt(rec: BatchRecord, reason: string, now: string): BatchRecord {
  if (!isWeighing(rec.state)) return rec;
  return {
    ...rec,
    resumeState: rec.state,
    state: 'interrupted',
    interruptedReason: reason,
    steps: stamp(rec.steps, 'interrupted', now),
  };
}

/**
 * Back to weighing. When the tare was lost (the hub restarted, the scale was power-cycled), what
 * the active pour holds — established from the balance by the caller — is credited to its part,
 * the rest of the pour is judged on a fresh tare, and its target and band shrink by the credit.
 * Contents that could not be established are credited as best known, and the batch can then
 * only end NO-GO, with the reason recorded for a lead to decide.
 */
export function resume(
  rec: BatchRecord,
  tare: { lost: false } | { lost: true; creditG: number; uncertain?: string },
  now: string,
): BatchRecord {
  if (rec.state !== 'interrupted' || !rec.resumeState || !rec.active) {
    throw new BatchRefusal('Only an interrupted batch can be resumed', 'WRONG_STATE');
  }
  let { parts, active } = rec;
  if (tare.lost) {
    const credit = active.tared && tare.creditG > 0 ? tare.creditG : 0;
    parts = parts.map((p, i) =>
      i === active.part && credit > 0 ? { ...p, actualG: (p.actualG ?? 0) + credit } : p,
    );
    const shift = (g: number) => Math.max(0, g - credit);
    active = {
      ...active,
      targetG: shift(active.targetG),
      band: active.band ? { lowG: shift(active.band.lowG), highG: shift(active.band.highG) } : null,
      slowDownFromG: shift(active.slowDownFromG),
      tared: false,
    };
  }
  return {
    ...rec,
    parts,
    active,
    state: rec.resumeState,
    resumeState: null,
    interruptedReason: null,
    noGoReason: tare.lost && tare.uncertain ? tare.uncertain : rec.noGoReason,
    steps: stamp(rec.steps, 'resumed', now),
  };
}
