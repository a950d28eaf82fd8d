import { z } from 'zod';
import { measure, positiveMeasure } from './mix/cavity.js';
import { planMaterialSchema } from './mix/plan.js';
import { statedRatiosDisagree } from './mix/ratio-agreement.js';
import { mixRatioSchema } from './mix/ratio.js';
import { DEFAULT_TOLERANCE_PCT } from './mix/targets.js';
import { recordIdSchema, text } from './text.js';

const isoDate = z.iso.date({ error: 'Use a date like 2027-03-31' });

/** Path parameter of `GET /api/materials/:id`, and the material a lot or batch names. */
export const materialIdSchema = recordIdSchema('material', 'Choose the material');

/**
 * A two-part (or three-part) material system as a lead enters it from the maker's data sheet:
 * its ratio and density (as the pour plan takes them) plus what the bench needs around a pour.
 */
export const materialInputSchema = planMaterialSchema
  .safeExtend({
    name: text({ error: 'Enter a name' })
      .trim()
      .min(1, { error: 'Enter a name' })
      .max(120, { error: 'Keep the name under 120 characters' }),
    /** What the bench calls each part, part A first (e.g. "Resin", "Hardener"). */
    partLabels: z.array(text().trim().min(1).max(40)).min(2).max(3).optional(),
    tolerancePct: positiveMeasure('tolerance')
      .max(50, { error: 'The tolerance must be 50 % or less' })
      .default(DEFAULT_TOLERANCE_PCT),
    /** Working time from the data sheet, minutes, for the mass below. */
    potLifeMin: positiveMeasure('pot life')
      .max(24 * 60)
      .optional(),
    /** Mass the pot life was rated at (data sheets commonly quote 100 g at 25 °C). */
    potLifeMassG: positiveMeasure('pot life mass').optional(),
    /** Minutes of mechanical agitation a filled part needs before weighing; 0 = none. */
    agitateMin: measure('agitation time')
      .nonnegative({ error: 'The agitation time cannot be negative' })
      .max(120)
      .default(0),
    /** Cautions to show before weighing, in the material's own words (from its SDS). */
    cautions: z.array(text().trim().min(1).max(300)).max(20).default([]),
    /** Where its safety data sheet is: a URL or a document number in the shop's binder. */
    sdsRef: text().trim().max(500).optional(),
    /** Days a container may stay open before its lot warns (common practice, no published source). */
    openShelfLifeDays: z.number().int().positive().max(3650).optional(),
    /**
     * The ratio as the data sheet also states it on the other basis (by volume when `ratio` is by
     * weight, or the reverse). Only checked against the parts' SGs; the bench uses `ratio`.
     */
    alsoStatedRatio: mixRatioSchema.optional(),
    /** Minutes from mixing until the part can come out of the mold. */
    demoldMin: positiveMeasure('demold time')
      .max(60 * 24 * 30, { error: 'A demold time above 30 days is surely a typing mistake' })
      .optional(),
    /** How to store the containers (temperature, keep dry, shake before use). */
    storageNote: text({ multiline: true }).trim().max(1000).optional(),
    /** Cost of each part per kg, part A first, in the shop's currency. */
    costPerKg: z
      .array(
        measure('cost per kg').nonnegative({ error: 'A cost cannot be negative' }).max(1_000_000),
      )
      .max(3, { error: 'A material has at most three parts' })
      .optional(),
    /** A lot of part i with less than `lowStockG[i]` grams on hand warns. */
    lowStockG: z
      .array(
        measure('low-stock threshold')
          .nonnegative({ error: 'A threshold cannot be negative' })
          .max(10_000_000),
      )
      .max(3, { error: 'A material has at most three parts' })
      .optional(),
  })
  .superRefine((m, ctx) => {
    const count = m.ratio?.parts?.length;
    if (count === undefined) return;
    for (const key of ['partLabels', 'costPerKg', 'lowStockG'] as const) {
      const list = m[key];
      if (list !== undefined && list.length !== count) {
        ctx.addIssue({
          code: 'custom',
          path: [key],
          message: `Give one value for each of the ${count} parts`,
        });
      }
    }
    const other = m.alsoStatedRatio;
    if (other === undefined) return;
    if (other.basis === m.ratio.basis) {
      ctx.addIssue({
        code: 'custom',
        path: ['alsoStatedRatio', 'basis'],
        message: `The second ratio must be by ${m.ratio.basis === 'weight' ? 'volume' : 'weight'}`,
      });
    } else if (other.parts.length !== count) {
      ctx.addIssue({
        code: 'custom',
        path: ['alsoStatedRatio', 'parts'],
        message: `Give ${count} parts, as in the ratio`,
      });
    } else if (m.partSpecificGravities === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['partSpecificGravities'],
        message: "Checking the two ratios needs each part's specific gravity",
      });
    } else if (m.partSpecificGravities.length === count) {
      for (const d of statedRatiosDisagree(m.ratio, other, m.partSpecificGravities)) {
        ctx.addIssue({
          code: 'custom',
          path: ['alsoStatedRatio', 'parts', d.part],
          message: d.message,
        });
      }
    }
  });
export type MaterialInput = z.input<typeof materialInputSchema>;

export const materialSchema = z.object({
  id: z.string(),
  name: z.string(),
  ratio: z.object({ basis: z.enum(['weight', 'volume']), parts: z.array(z.number()) }),
  specificGravity: z.number().optional(),
  yieldIn3PerLb: z.number().optional(),
  partSpecificGravities: z.array(z.number()).optional(),
  /** The ratio as parts by weight, what the scale weighs to. */
  weightRatio: z.array(z.number()),
  partLabels: z.array(z.string()),
  tolerancePct: z.number(),
  potLifeMin: z.number().optional(),
  potLifeMassG: z.number().optional(),
  agitateMin: z.number(),
  cautions: z.array(z.string()),
  sdsRef: z.string().optional(),
  openShelfLifeDays: z.number().optional(),
  alsoStatedRatio: z
    .object({ basis: z.enum(['weight', 'volume']), parts: z.array(z.number()) })
    .optional(),
  demoldMin: z.number().optional(),
  storageNote: z.string().optional(),
  /** Cost of each part per kg, part A first (same order as the parts), in the shop's currency. */
  costPerKg: z.array(z.number()).optional(),
  /** Low-stock threshold of each part, grams, part A first. */
  lowStockG: z.array(z.number()).optional(),
  /** False once retired: hidden at the bench, its batches kept. */
  active: z.boolean(),
});
export type Material = z.infer<typeof materialSchema>;

export const lotInputSchema = z.object({
  materialId: materialIdSchema,
  /** 0 = part A, 1 = part B, 2 = part C. */
  part: z.number().int().min(0).max(2, { error: 'A material has at most three parts' }),
  code: text({ error: 'Enter the lot code from the label' })
    .trim()
    .min(1, { error: 'Enter the lot code from the label' })
    .max(80),
  expiresOn: isoDate.optional(),
  openedOn: isoDate.optional(),
  /** Net grams received (what the containers hold). */
  receivedG: positiveMeasure('quantity received').max(10_000_000, {
    error: 'More than 10 t in one lot is surely a typing mistake',
  }),
});
export type LotInput = z.input<typeof lotInputSchema>;

/** Query of `GET /api/lots`: every lot, or one material's. */
export const lotListQuerySchema = z.object({ materialId: materialIdSchema.optional() });

export const lotWarningSchema = z.object({
  code: z.enum([
    'LOT_EXPIRED',
    'LOT_LONG_OPEN',
    'LOT_UNKNOWN',
    'LOT_WRONG_PART',
    'LOT_LOW_STOCK',
    'LOT_OVERDRAW',
  ]),
  message: z.string(),
});
export type LotWarning = z.infer<typeof lotWarningSchema>;

export const lotSchema = z.object({
  id: z.string(),
  materialId: z.string(),
  part: z.number(),
  code: z.string(),
  expiresOn: z.string().optional(),
  openedOn: z.string().optional(),
  /** Grams received. */
  receivedG: z.number(),
  /** Grams left: received, less every batch weighed from it, plus or minus adjustments. */
  onHandG: z.number(),
  warnings: z.array(lotWarningSchema),
});
export type Lot = z.infer<typeof lotSchema>;

/** Default days a container may stay open, when the material gives none (common practice, no published source). */
export const DEFAULT_OPEN_SHELF_LIFE_DAYS = 180;

const DAY_MS = 24 * 60 * 60 * 1000;

/** Warnings for a lot on a given day: expired, or open longer than the material allows. */
export function lotWarnings(
  lot: { code: string; expiresOn?: string | undefined; openedOn?: string | undefined },
  today: string,
  openShelfLifeDays = DEFAULT_OPEN_SHELF_LIFE_DAYS,
): LotWarning[] {
  const warnings: LotWarning[] = [];
  if (lot.expiresOn && lot.expiresOn < today) {
    warnings.push({
      code: 'LOT_EXPIRED',
      message: `Lot ${lot.code} expired on ${lot.expiresOn}`,
    });
  }
  if (lot.openedOn) {
    const days = Math.floor((Date.parse(today) - Date.parse(lot.openedOn)) / DAY_MS);
    if (days > openShelfLifeDays) {
      warnings.push({
        code: 'LOT_LONG_OPEN',
        message: `Lot ${lot.code} has been open ${days} days (limit ${openShelfLifeDays})`,
      });
    }
  }
  return warnings;
}

const fmtG = (g: number) => `${Number(g.toFixed(1))} g`;

/** A lot with less on hand than its part's low-stock threshold warns. */
export function lowStockWarning(
  lot: { code: string; onHandG: number },
  thresholdG: number | undefined,
): LotWarning | undefined {
  if (thresholdG === undefined || !(lot.onHandG < thresholdG)) return undefined;
  return {
    code: 'LOT_LOW_STOCK',
    message: `Lot ${lot.code} is low: ${fmtG(lot.onHandG)} left (reorder below ${fmtG(thresholdG)})`,
  };
}

/** A lot that holds less than a pour would take from it warns before weighing. */
export function overdrawWarning(
  lot: { code: string; onHandG: number },
  needG: number,
): LotWarning | undefined {
  if (!(needG > lot.onHandG)) return undefined;
  return {
    code: 'LOT_OVERDRAW',
    message: `Lot ${lot.code} has ${fmtG(lot.onHandG)} left, this batch needs ${fmtG(needG)}`,
  };
}

/** Grams as whole milligrams, how stock is counted (sums stay exact). */
export const toMg = (g: number): number => Math.round(g * 1000);
