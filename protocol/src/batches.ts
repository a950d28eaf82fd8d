import { z } from 'zod';
import { loginRequestSchema } from './auth.js';
import { benchIdSchema } from './benches.js';
import { batchCostSchema } from './cost.js';
import { lotWarningSchema, materialIdSchema } from './materials.js';
import { roleSchema } from './roles.js';
import { positiveMeasure } from './mix/cavity.js';
import { pageOf } from './page.js';
import { recordIdSchema, text } from './text.js';

/** A batch number as it appears in an address: PostgreSQL `integer` ids, 1 to 2³¹ − 1. */
export const batchNumberSchema = z.coerce
  .number({ error: 'A batch number is a whole number' })
  .int({ error: 'A batch number is a whole number' })
  .positive({ error: 'A batch number is a whole number' })
  .max(2_147_483_647, { error: 'No batch has a number that large' });

export const batchStateSchema = z.enum([
  'weighing-a',
  'weighing-b',
  'weighing-c',
  'saved',
  'abandoned',
  'interrupted',
]);
export type BatchState = z.infer<typeof batchStateSchema>;
export const WEIGHING_STATES = ['weighing-a', 'weighing-b', 'weighing-c'] as const;

/** GO: every part within the band. NO-GO: saved outside it, on purpose. */
export const batchVerdictSchema = z.enum(['GO', 'NO-GO']);
export type BatchVerdict = z.infer<typeof batchVerdictSchema>;

export const pourVerdictSchema = z.enum(['UNDER', 'SETTLING', 'GO', 'OVER']);

/** The total mass of a batch, g. */
export const batchTotalMassSchema = positiveMeasure('total mass').max(100_000, {
  error: 'A batch above 100 kg is surely a typing mistake',
});

/**
 * Body of `POST /api/batches`: a material and a total mass, or a saved pour plan (whose material
 * and total the hub takes, the total recomputed with the material as it is now).
 */
export const createBatchSchema = z
  .object({
    benchId: benchIdSchema,
    materialId: materialIdSchema.optional(),
    totalMassG: batchTotalMassSchema.optional(),
    planId: recordIdSchema('pour plan', 'Choose a pour plan').optional(),
    /** Lot codes as scanned from the labels, one per part at most. */
    lots: z
      .array(
        z.object({
          part: z.number().int().min(0).max(2),
          code: text().trim().min(1, { error: 'Scan or enter the lot code' }).max(80),
        }),
      )
      .max(3)
      .default([]),
    /**
     * A lead's e-mail and password, to start a batch whose parts are below what the bench's scale
     * weighs within the band (refused otherwise with {@link SCALE_TOO_COARSE_PATH}).
     */
    override: loginRequestSchema.optional(),
  })
  .superRefine((b, ctx) => {
    if (b.planId !== undefined) {
      for (const key of ['materialId', 'totalMassG'] as const) {
        if (b[key] !== undefined) {
          ctx.addIssue({
            code: 'custom',
            path: [key],
            message: "A batch from a pour plan takes the plan's material and total",
          });
        }
      }
      return;
    }
    if (b.materialId === undefined) {
      ctx.addIssue({ code: 'custom', path: ['materialId'], message: 'Choose the material' });
    }
    if (b.totalMassG === undefined) {
      ctx.addIssue({ code: 'custom', path: ['totalMassG'], message: 'Enter the total mass' });
    }
  });
export type CreateBatch = z.input<typeof createBatchSchema>;
export type CreateBatchBody = z.output<typeof createBatchSchema>;

/**
 * The `path` of the 409 that refuses a batch too small for the bench's scale: some part's target
 * is below the scale's minimum net mass for the band. A lead's override lets it start.
 */
export const SCALE_TOO_COARSE_PATH = 'SCALE_TOO_COARSE';

export const abandonBatchSchema = z.object({
  reason: text({ error: 'Say why the batch is abandoned', multiline: true })
    .trim()
    .min(3, { error: 'Say why the batch is abandoned' })
    .max(500),
});

/** How a lead orders the batch list: newest first unless asked; `absDeviation` is |off ratio|. */
export const batchSortSchema = z.enum([
  '-createdAt',
  'createdAt',
  'ratioDeviationPct',
  '-ratioDeviationPct',
  'absDeviation',
  '-absDeviation',
]);
export type BatchSort = z.infer<typeof batchSortSchema>;

/** What a lead decided about a saved batch. */
export const dispositionDecisionSchema = z.enum(['release', 'hold', 'scrap']);
export type DispositionDecision = z.infer<typeof dispositionDecisionSchema>;

/** A decision to filter by, or `none`: not decided yet. */
export const batchDispositionFilterOptions = z.enum([...dispositionDecisionSchema.options, 'none']);

/** A time in a query: ISO 8601 with its offset (`2026-12-02T08:00:00Z`). */
const queryTime = (field: string) =>
  text()
    .max(40)
    .pipe(
      z.iso.datetime({
        offset: true,
        error: `Give ${field} as an ISO time with its offset, like 2026-12-02T08:00:00Z`,
      }),
    );

/** The filters of the batch list and of its CSV export. `from` is inclusive, `to` exclusive. */
export const batchFilterSchema = z.object({
  from: queryTime('from').optional(),
  to: queryTime('to').optional(),
  materialId: materialIdSchema.optional(),
  benchId: benchIdSchema.optional(),
  operatorId: text().trim().min(1).max(80).optional(),
  verdict: batchVerdictSchema.optional(),
  state: batchStateSchema.optional(),
  /** The latest decision on the batch; `none`: not decided yet. */
  disposition: batchDispositionFilterOptions.optional(),
  /** Matches the lot code of any part, letter case aside. */
  lot: text().trim().min(1).max(80).optional(),
  sort: batchSortSchema.default('-createdAt'),
});
export type BatchFilter = z.input<typeof batchFilterSchema>;

/** Query of `GET /api/batches`: the filters, and a page of them after `cursor`. */
export const batchListQuerySchema = batchFilterSchema.extend({
  /** `nextCursor` of the page before, as the hub gave it. */
  cursor: text().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
});
export type BatchListQuery = z.input<typeof batchListQuerySchema>;

/** Query of `GET /api/batches/current`: the bench whose open batch is asked for. */
export const currentBatchQuerySchema = z.object({
  benchId: benchIdSchema,
});

export const batchPartSchema = z.object({
  label: z.string(),
  /** Planned mass at the start; for later parts recomputed from part A as poured. */
  targetG: z.number(),
  /** What went into the cup, all pours of this part together; null before it was poured. */
  actualG: z.number().nullable(),
});
export type BatchPart = z.infer<typeof batchPartSchema>;

/** The pour the scale is judged against right now. */
export const activePourSchema = z.object({
  part: z.number().int(),
  /** `first`: the part's own pour; `top-up`: adding to it as a rescue. */
  kind: z.enum(['first', 'top-up']),
  /** Net grams to pour now (on a freshly tared scale). */
  targetG: z.number(),
  /**
   * The band the net reading must end in. Part A's own pour has one as advice (it sets the scale
   * of the rest); null only on records written before part A had a band.
   */
  band: z.object({ lowG: z.number(), highG: z.number() }).nullable(),
  /** Net grams from which the gauge shows the slow-down zone. */
  slowDownFromG: z.number(),
  /** Whether the scale was tared for this pour; no verdict before it is. */
  tared: z.boolean(),
});
export type ActivePour = z.infer<typeof activePourSchema>;

export const rescueSchema = z.object({
  /** Grams of each part to add; 0 where nothing is needed. */
  addG: z.array(z.number()),
  totalAfterG: z.number(),
  /** Whether the additions fit on the scale; null when its capacity is unknown. */
  fits: z.boolean().nullable(),
});
export type Rescue = z.infer<typeof rescueSchema>;

/** A decision on a batch, as recorded: who signed it and when. Never edited or deleted. */
export const dispositionSchema = z.object({
  decision: dispositionDecisionSchema,
  reason: z.string().nullable(),
  by: z.object({ id: z.string(), name: z.string() }),
  at: z.string(),
});
export type Disposition = z.infer<typeof dispositionSchema>;

/** Body of `POST /api/batches/:id/dispositions`: the decision, signed with the lead's password. */
export const createDispositionSchema = z
  .object({
    decision: dispositionDecisionSchema,
    reason: text({ multiline: true }).trim().max(500).optional(),
    password: text({ error: 'Enter your password to sign' })
      .min(1, {
        error: 'Enter your password to sign',
      })
      .max(200),
  })
  .superRefine((body, ctx) => {
    if (body.decision !== 'release' && !body.reason) {
      ctx.addIssue({
        code: 'custom',
        path: ['reason'],
        message: `Say why the batch is ${body.decision === 'hold' ? 'held' : 'scrapped'}`,
      });
    }
  });
export type CreateDisposition = z.input<typeof createDispositionSchema>;

export const batchSchema = z.object({
  id: z.number().int(),
  state: batchStateSchema,
  verdict: batchVerdictSchema.nullable(),
  benchId: z.string(),
  materialId: z.string(),
  materialName: z.string(),
  /** The pour plan the batch was started from; absent for a batch sized by hand. */
  planId: z.string().nullable().optional(),
  operator: z.object({ id: z.string(), name: z.string() }),
  /**
   * Everyone else who acted on the batch (a shift change mid-batch, a lead resuming it), each
   * with the time of their first action; absent when only the operator did.
   */
  handledBy: z
    .array(z.object({ id: z.string(), name: z.string(), role: roleSchema, at: z.string() }))
    .optional(),
  /** The lead who let this batch start on a scale too coarse for it; absent when none did. */
  scaleOverride: z
    .object({
      by: z.object({ id: z.string(), name: z.string() }),
      at: z.string(),
      /** The scale's minimum net mass for the band, g, and the smallest batch it could weigh. */
      minNetG: z.number(),
      smallestBatchG: z.number(),
    })
    .optional(),
  totalMassG: z.number(),
  weightRatio: z.array(z.number()),
  parts: z.array(batchPartSchema),
  active: activePourSchema.nullable(),
  /** Rescue on offer after an over-pour (taken or not). */
  rescue: rescueSchema.nullable(),
  ratioDeviationPct: z.number().nullable(),
  tolerancePct: z.number(),
  readabilityG: z.number(),
  lots: z.array(
    z.object({
      part: z.number(),
      code: z.string(),
      lotId: z.string().nullable(),
      warnings: z.array(lotWarningSchema),
    }),
  ),
  potLifeMin: z.number().nullable(),
  potLifeMassG: z.number().nullable(),
  abandonReason: z.string().nullable(),
  interruptedReason: z.string().nullable(),
  /**
   * Why the batch can only end NO-GO whatever the scale shows (its contents could not be
   * established after a hub restart); absent for an ordinary batch.
   */
  noGoReason: z.string().nullable().optional(),
  /** ISO times of each step: created, partConfirmed (per part), saved, abandoned… */
  steps: z.record(z.string(), z.string()),
  createdAt: z.string(),
  savedAt: z.string().nullable(),
  /**
   * What the weighed parts cost at the material's prices when the batch started; null when the
   * material had no price for every part.
   */
  cost: batchCostSchema.nullable().optional(),
  /** Every reading of the batch as [ms since start, net g]. Only on the single-batch answer. */
  trace: z.array(z.tuple([z.number(), z.number()])).optional(),
  /** The latest decision on the batch, null before any. Only on the single-batch answer. */
  disposition: dispositionDecisionSchema.nullable().optional(),
  /** Every decision on the batch, oldest first. Only on the single-batch answer. */
  dispositions: z.array(dispositionSchema).optional(),
});
export type Batch = z.infer<typeof batchSchema>;

/** One row of the batch list: a batch without its trace, pour and rescue, with its decision. */
export const batchSummarySchema = batchSchema
  .omit({ trace: true, active: true, rescue: true, dispositions: true })
  .extend({
    disposition: dispositionDecisionSchema.nullable(),
    /** The bench's name as it is now; null if the bench is gone. */
    benchName: z.string().nullable(),
  });
export type BatchSummary = z.infer<typeof batchSummarySchema>;

/** Answer of `GET /api/batches`. */
export const batchPageSchema = pageOf(batchSummarySchema);
export type BatchPage = z.infer<typeof batchPageSchema>;

/** Live socket event: the bench's batch changed state (or there is none any more). */
export const batchEventSchema = z.object({
  benchId: z.string(),
  batch: batchSchema.nullable(),
});
export type BatchEvent = z.infer<typeof batchEventSchema>;

/** Live socket event: the hub's judgement of the latest reading against the active pour. */
export const pourEventSchema = z.object({
  benchId: z.string(),
  batchId: z.number().int(),
  part: z.number().int(),
  netG: z.number(),
  stable: z.boolean(),
  /** Null while the scale is not online: no verdict is given then. */
  verdict: pourVerdictSchema.nullable(),
  /** While GO: milliseconds until the batch saves itself. */
  saveInMs: z.number().nullable(),
  /** While OVER: what the rescue would take. */
  rescue: rescueSchema.nullable(),
  /**
   * Why the last automatic save did not reach the database, while the hub keeps retrying on
   * each steady reading; absent when nothing went wrong. Nothing is shown as saved meanwhile.
   */
  saveProblem: z.string().optional(),
});
export type PourEvent = z.infer<typeof pourEventSchema>;

/** Query of `GET /api/accuracy`: saved batches grouped, by day or week (UTC), in a time range. */
export const accuracyQuerySchema = z.object({
  groupBy: z.enum(['material', 'bench', 'operator']),
  bucket: z.enum(['day', 'week']).default('week'),
  from: queryTime('from').optional(),
  to: queryTime('to').optional(),
});
export type AccuracyQuery = z.input<typeof accuracyQuerySchema>;

/** How close one group came to the ratio in one day or week. */
export const accuracyRowSchema = z.object({
  groupId: z.string(),
  groupName: z.string(),
  /** The start of the day or week (Monday), UTC. */
  bucketStart: z.string(),
  /** Saved batches. */
  count: z.number().int(),
  /** Share of them saved GO, 0 to 1. */
  goShare: z.number(),
  meanDeviationPct: z.number().nullable(),
  /** Sample standard deviation (n − 1); null for a single batch. */
  sdDeviationPct: z.number().nullable(),
  /**
   * 95th percentile of |deviation|: interpolated between the two nearest batches; over more than
   * 50,000 batches, from the hub's daily roll-up (a histogram of 0.05-point bins), to about a bin.
   */
  p95AbsDeviationPct: z.number().nullable(),
  /** Batches where a rescue was taken. */
  rescues: z.number().int(),
});
export type AccuracyRow = z.infer<typeof accuracyRowSchema>;

export const accuracyAnswerSchema = z.object({
  groupBy: accuracyQuerySchema.shape.groupBy,
  bucket: accuracyQuerySchema.shape.bucket.unwrap(),
  rows: z.array(accuracyRowSchema),
});
export type AccuracyAnswer = z.infer<typeof accuracyAnswerSchema>;
