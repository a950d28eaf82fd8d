import { z } from 'zod';
import { minNetWeightG, USP41_MIN_S_PER_D } from './mix/scale-fitness.js';
import { text } from './text.js';

// ---------------------------------------------------------------------------------------------
// The arithmetic of scale checks

/**
 * Default routine check tolerance as a share of the reference: USP General Chapter <41>
 * (Balances) accepts a balance whose error on a test weight is within 0.10 % of that weight.
 */
export const CHECK_TOLERANCE_SHARE = 0.001;
/**
 * ...but never tighter than this many scale intervals: a reading is only known to ±1 d, so a
 * band under 2 d fails good scales on rounding alone. Common practice, no published source.
 */
export const CHECK_TOLERANCE_MIN_D = 2;
/** Placements of the weight in a repeatability test. */
export const REPEATABILITY_PLACEMENTS = 10;

/**
 * The largest error a routine check passes: the bench's own tolerance where one is set, else
 * max(0.1 % of the reference, 2 d).
 */
export function checkToleranceG(
  referenceG: number,
  readabilityG: number,
  benchToleranceG?: number | null,
): number {
  if (benchToleranceG != null) return benchToleranceG;
  return Math.max(CHECK_TOLERANCE_SHARE * referenceG, CHECK_TOLERANCE_MIN_D * readabilityG);
}

/** Rounds away binary tails (0.30000000000000004) from a difference of two readings. */
function clean(grams: number): number {
  return Number(grams.toFixed(9)) + 0;
}

/** A routine check's result: reading − reference, and whether it is within the tolerance. */
export function judgeRoutineCheck(
  readingG: number,
  referenceG: number,
  toleranceG: number,
): { errorG: number; passed: boolean } {
  const errorG = clean(readingG - referenceG);
  // The error of two decimal readings is compared after rounding, so 0.02 passes a 0.02 band.
  return { errorG, passed: Math.abs(errorG) <= toleranceG + 1e-9 };
}

/** Sample standard deviation, divisor n − 1 (NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.5.6). */
export function sampleStandardDeviation(values: readonly number[]): number {
  if (values.length < 2) {
    throw new RangeError(`A standard deviation needs two values or more, got ${values.length}`);
  }
  const mean = values.reduce((sum, v) => sum + v, 0) / values.length;
  const squares = values.reduce((sum, v) => sum + (v - mean) ** 2, 0);
  return Math.sqrt(squares / (values.length - 1));
}

export interface Repeatability {
  /** Sample standard deviation of the readings, g. */
  sdG: number;
  /** s as used: never below 0.41 d (USP General Chapter <41>), g. */
  sdUsedG: number;
  /** Smallest net mass weighed within the band at coverage 2: 2 s / band, g. */
  minNetG: number;
}

/**
 * A repeatability test's outcome from its readings: s, s floored at 0.41 d, and the minimum net
 * mass for a band given as a fraction (0.01 for ±1 %): m_min = 2 max(s, 0.41 d) / band.
 */
export function repeatabilityOf(
  readingsG: readonly number[],
  readabilityG: number,
  band: number,
): Repeatability {
  const sdG = sampleStandardDeviation(readingsG);
  return {
    sdG,
    sdUsedG: Math.max(sdG, USP41_MIN_S_PER_D * readabilityG),
    minNetG: minNetWeightG({ readabilityG, repeatabilityG: sdG }, band * 100),
  };
}

export const checkDueReasonSchema = z.enum(['never-checked', 'expired', 'last-failed']);
export type CheckDueReason = z.infer<typeof checkDueReasonSchema>;

export interface CheckHistory {
  /** Hours a passed check stays good; null: the bench is not asked for checks. */
  checkEveryHours: number | null;
  /** When the last passed routine check finished (epoch ms), if any. */
  lastPassedAt: number | null;
  /** Whether the latest finished routine check failed. */
  lastFailed: boolean;
}

/**
 * Whether a bench needs a routine check now: its last check failed (always, even without a
 * schedule), or it has a schedule and no passed check within `checkEveryHours`.
 */
export function checkDue(
  history: CheckHistory,
  nowMs: number,
): { due: boolean; reason: CheckDueReason | null; nextDueAt: number | null } {
  const nextDueAt =
    history.checkEveryHours !== null && history.lastPassedAt !== null
      ? history.lastPassedAt + history.checkEveryHours * 3_600_000
      : null;
  if (history.lastFailed) return { due: true, reason: 'last-failed', nextDueAt };
  if (history.checkEveryHours === null) return { due: false, reason: null, nextDueAt };
  if (nextDueAt === null) return { due: true, reason: 'never-checked', nextDueAt };
  if (nowMs >= nextDueAt) return { due: true, reason: 'expired', nextDueAt };
  return { due: false, reason: null, nextDueAt };
}

// ---------------------------------------------------------------------------------------------
// Wire shapes

/** Field path of the 409 a blocked bench answers to a new batch. */
export const SCALE_CHECK_DUE_PATH = 'SCALE_CHECK_DUE';

export const scaleCheckKindSchema = z.enum(['routine', 'repeatability']);
export type ScaleCheckKind = z.infer<typeof scaleCheckKindSchema>;

export const scaleCheckStateSchema = z.enum([
  'waiting',
  'passed',
  'failed',
  'cancelled',
  'interrupted',
]);
export type ScaleCheckState = z.infer<typeof scaleCheckStateSchema>;

/**
 * What a waiting check waits for: the hub zeroing the empty pan, the weight on the pan, or (in a
 * repeatability test) the weight lifted off again.
 */
export const scaleCheckStepSchema = z.enum(['zeroing', 'place', 'lift']);
export type ScaleCheckStep = z.infer<typeof scaleCheckStepSchema>;

/** `POST /api/benches/:id/checks`. */
export const startScaleCheckSchema = z.strictObject({
  kind: scaleCheckKindSchema,
  referenceG: z
    .number({ error: 'Enter the reference weight in grams' })
    .finite({ error: 'Enter the reference weight in grams' })
    .positive({ error: 'A reference weight weighs more than 0 g' })
    .max(100_000, { error: 'At most 100 000 g' }),
});
export type StartScaleCheck = z.infer<typeof startScaleCheckSchema>;

export const scaleCheckStartedSchema = z.object({
  id: z.number().int(),
  state: z.literal('waiting'),
});
export type ScaleCheckStarted = z.infer<typeof scaleCheckStartedSchema>;

/** Path parameter `:checkId`. */
export const scaleCheckIdSchema = z.coerce
  .number({ error: 'A check number is a whole number' })
  .int({ error: 'A check number is a whole number' })
  .positive({ error: 'A check number is a whole number' })
  .max(2_147_483_647, { error: 'There is no check with so large a number' });

/** One scale check as the hub keeps it. */
export const scaleCheckSchema = z.object({
  id: z.number().int(),
  benchId: z.string(),
  kind: scaleCheckKindSchema,
  state: scaleCheckStateSchema,
  /** While waiting: what the person at the bench is to do. */
  step: scaleCheckStepSchema.nullable(),
  referenceG: z.number(),
  readabilityG: z.number(),
  toleranceG: z.number().nullable(),
  readingG: z.number().nullable(),
  errorG: z.number().nullable(),
  readings: z.array(z.number()),
  placementsNeeded: z.number().int(),
  sdG: z.number().nullable(),
  sdUsedG: z.number().nullable(),
  bandPct: z.number().nullable(),
  minNetG: z.number().nullable(),
  note: z.string().nullable(),
  by: z.object({ id: z.string(), name: z.string() }),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
});
export type ScaleCheck = z.infer<typeof scaleCheckSchema>;
export const scaleCheckListSchema = z.array(scaleCheckSchema);

/** `GET /api/benches/:id/check-status`: what the bench says at sign-in. */
export const benchCheckStatusSchema = z.object({
  benchId: z.string(),
  checkEveryHours: z.number().int().nullable(),
  blockWhenDue: z.boolean(),
  checkToleranceG: z.number().nullable(),
  calibrationDueOn: z.string().nullable(),
  /** The calibration due date has come. */
  calibrationOverdue: z.boolean(),
  due: z.boolean(),
  reason: checkDueReasonSchema.nullable(),
  /** What the bench says, in words; null when nothing is due. */
  message: z.string().nullable(),
  /** Batches are refused at this bench until a check passes. */
  blocked: z.boolean(),
  lastPassedAt: z.string().nullable(),
  nextDueAt: z.string().nullable(),
  repeatabilitySdG: z.number().nullable(),
  repeatabilityAt: z.string().nullable(),
  /** From the last repeatability test: the minimum net mass, g, for the band it was taken at. */
  minNetG: z.number().nullable(),
  minNetBandPct: z.number().nullable(),
  /** A check is running at the bench now (its number). */
  runningCheckId: z.number().int().nullable(),
});
export type BenchCheckStatus = z.infer<typeof benchCheckStatusSchema>;

/** `PATCH /api/benches/:id` (admins): the bench's check policy; each field optional. */
export const benchPolicyPatchSchema = z
  .strictObject({
    checkEveryHours: z
      .number({ error: 'Enter the hours between checks, or nothing for no schedule' })
      .int({ error: 'Whole hours between checks' })
      .min(1, { error: 'At least 1 hour between checks' })
      .max(8760, { error: 'At most 8760 hours (a year) between checks' })
      .nullable(),
    blockWhenDue: z.boolean({ error: 'Say yes or no: refuse batches while a check is due' }),
    checkToleranceG: z
      .number({ error: 'Enter the check tolerance in grams, or nothing for the default' })
      .finite({ error: 'Enter the check tolerance in grams' })
      .positive({ error: 'A check tolerance is more than 0 g' })
      .max(1000, { error: 'At most 1000 g' })
      .nullable(),
    calibrationDueOn: text({ error: 'Enter the calibration due date as YYYY-MM-DD' })
      .regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Enter the calibration due date as YYYY-MM-DD' })
      .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && isRealDate(s), {
        error: 'That calibration due date is not a real date',
      })
      .nullable(),
  })
  .partial()
  .refine((p) => Object.keys(p).length > 0, { error: 'Say what to change' });
export type BenchPolicyPatch = z.infer<typeof benchPolicyPatchSchema>;

function isRealDate(s: string): boolean {
  const d = new Date(`${s}T00:00:00Z`);
  return d.toISOString().slice(0, 10) === s;
}
