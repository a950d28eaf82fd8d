import { z } from 'zod';

/** Answer of `GET /api/health`: is the hub up, and can it reach its database. */
export const healthResponseSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  uptimeS: z.number().nonnegative(),
  db: z.object({
    ok: z.boolean(),
    driver: z.enum(['pglite', 'postgres']),
    detail: z.string().optional(),
  }),
});

export type HealthResponse = z.infer<typeof healthResponseSchema>;
