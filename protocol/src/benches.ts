import { z } from 'zod';
import { scaleTransportSchema } from './scale-link.js';
import { scaleStatusEventSchema } from './scale/types.js';
import { text } from './text.js';

/** A bench's scale as `GET /api/benches` lists it: its live state and what the hub knows of it. */
export const benchScaleSchema = scaleStatusEventSchema.extend({
  /** The scale interval d in grams (configured, or read from the decimals the scale prints). */
  readabilityG: z.number().positive(),
  /** Maximum load in grams, where known (the simulator's; a real scale does not say). */
  capacityG: z.number().positive().optional(),
  transport: scaleTransportSchema,
});
export type BenchScale = z.infer<typeof benchScaleSchema>;

/** One entry of `GET /api/benches`. */
export const benchSummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  pinRequired: z.boolean(),
  idleSignOutMin: z.number().int().positive(),
  scale: benchScaleSchema,
  /**
   * The scale's repeatability s in grams from the bench's last repeatability test (ten placements
   * of one weight; never below 0.41 d, USP General Chapter <41>); null when none was run.
   */
  repeatabilitySdG: z.number().nonnegative().nullable().default(null),
  /** When that test finished (ISO 8601); null when none was run. */
  repeatabilityAt: z.string().nullable().default(null),
});
export type BenchSummary = z.infer<typeof benchSummarySchema>;

export const benchListSchema = z.array(benchSummarySchema);

/** Path parameter of the bench routes. */
export const benchIdSchema = text({ error: 'Say which bench this is' })
  .trim()
  .regex(
    /^[a-z0-9][a-z0-9-]{0,39}$/,
    'Say which bench this is: lower-case letters, digits and dashes',
  );
