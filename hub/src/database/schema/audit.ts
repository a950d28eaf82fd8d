import { index, integer, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/**
 * The audit trail, append-only. Each entry's `hash` is sha256 of the previous entry's hash and
 * the canonical JSON of this entry, so a row changed or removed afterwards breaks the chain.
 * Ids are given by the appender (the last id + 1 in the same transaction): the hash covers it.
 */
export const auditEntries = pgTable(
  'audit_entries',
  {
    id: integer('id').primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull(),
    actor: jsonb('actor').$type<{ id: string; name: string } | null>(),
    entity: text('entity').notNull(),
    entityId: text('entity_id').notNull(),
    action: text('action').notNull(),
    data: jsonb('data').notNull(),
    prevHash: text('prev_hash').notNull(),
    hash: text('hash').notNull(),
  },
  (t) => [index('audit_entries_entity').on(t.entity, t.entityId, t.id)],
);
