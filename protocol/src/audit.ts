import { z } from 'zod';
import { pageOf } from './page.js';
import { text } from './text.js';

/** One entry of the audit trail; `hash` chains it to the entry before it. */
export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: z.string(),
  /** Who did it; null for what the hub did by itself or could not attribute. */
  actor: z.object({ id: z.string(), name: z.string() }).nullable(),
  entity: z.string(),
  entityId: z.string(),
  action: z.string(),
  data: z.unknown(),
  prevHash: z.string(),
  hash: z.string(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

/** Query of `GET /api/audit`: the entries of one entity (or all), oldest first, by page. */
export const auditQuerySchema = z.object({
  entity: text().trim().min(1).max(40).optional(),
  entityId: text().trim().min(1).max(80).optional(),
  cursor: text().max(40).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

export const auditPageSchema = pageOf(auditEntrySchema);
export type AuditPage = z.infer<typeof auditPageSchema>;

/** Answer of `GET /api/audit/verify`: the chain recomputed from the first entry. */
export const auditVerifySchema = z.object({
  ok: z.boolean(),
  checked: z.number().int(),
  firstBrokenId: z.number().int().nullable(),
});
export type AuditVerify = z.infer<typeof auditVerifySchema>;
