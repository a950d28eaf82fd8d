import { z } from 'zod';
import { measure } from './mix/cavity.js';
import { materialInputSchema } from './materials.js';
import { recordIdSchema, text } from './text.js';

// What the desk sends and reads about the materials library and lot stock. Apart from
// materials.ts so the bench's bundle, which needs none of it, leaves it out.

/**
 * Body of `PATCH /api/materials/:id`: any fields of {@link materialInputSchema}; `null` clears an
 * optional one. The merged material is checked again as a whole. `active: false` retires it
 * (hidden at the bench, its batches kept), `true` brings it back.
 */
export const materialPatchSchema = z
  .object(
    Object.fromEntries(
      Object.entries(materialInputSchema.shape).map(([k, v]) => [k, v.nullable().optional()]),
    ) as {
      [K in keyof typeof materialInputSchema.shape]: z.ZodOptional<
        z.ZodNullable<(typeof materialInputSchema.shape)[K]>
      >;
    },
  )
  .extend({ active: z.boolean({ error: 'Say true or false' }).optional() })
  .strict();
export type MaterialPatch = z.input<typeof materialPatchSchema>;

/** Query of `GET /api/materials`: retired materials only when asked. */
export const materialListQuerySchema = z.object({
  includeRetired: z
    .enum(['true', 'false'], { error: 'Say true or false' })
    .optional()
    .transform((v) => v === 'true'),
});

/** Body of `POST /api/materials/import`: the text of a CSV file as the export writes it. */
export const materialImportSchema = z.object({
  csv: text({ multiline: true, error: 'Send the CSV text' })
    .min(1, { error: 'The file is empty' })
    .max(5_000_000, { error: 'Keep the file under 5 MB' }),
});

/** Answer of the import: how many materials were added and how many changed. */
export const materialImportResultSchema = z.object({ created: z.number(), updated: z.number() });
export type MaterialImportResult = z.infer<typeof materialImportResultSchema>;

/** Path parameter naming a lot. */
export const lotIdSchema = recordIdSchema('lot', 'Choose the lot');

/** Body of `POST /api/lots/:id/adjustments`: a spill, a count, a container found. */
export const lotAdjustmentInputSchema = z.object({
  /** Grams added (a count found more) or taken (a spill: negative). */
  deltaG: measure('change in grams')
    .refine((g) => g !== 0, { error: 'Enter a change other than zero' })
    .refine((g) => Math.abs(g) <= 10_000_000, { error: 'More than 10 t is surely a mistake' }),
  reason: text({ error: 'Say why the stock changes' })
    .trim()
    .min(1, { error: 'Say why the stock changes' })
    .max(300, { error: 'Keep the reason under 300 characters' }),
});
export type LotAdjustmentInput = z.input<typeof lotAdjustmentInputSchema>;

/** A change of a lot's stock: received, an adjustment, or a batch's weighing. */
export const stockMovementSchema = z.object({
  id: z.string(),
  lotId: z.string(),
  kind: z.enum(['adjustment', 'batch']),
  deltaG: z.number(),
  reason: z.string().optional(),
  batchId: z.number().optional(),
  by: z.object({ id: z.string(), name: z.string() }).optional(),
  at: z.string(),
});
export type StockMovement = z.infer<typeof stockMovementSchema>;
