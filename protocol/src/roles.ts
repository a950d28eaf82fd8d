import { z } from 'zod';

/** operator: pours at a bench; lead: reviews batches, materials, lots; admin: everything. */
export const roleSchema = z.enum(['operator', 'lead', 'admin']);
export type Role = z.infer<typeof roleSchema>;
export const ROLES = roleSchema.options;
