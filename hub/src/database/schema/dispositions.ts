import { index, integer, pgTable, serial, text, timestamp } from 'drizzle-orm/pg-core';
import { batches } from './batches.js';

/** Decisions on batches, append-only: a new decision is a new row, none is edited or deleted. */
export const batchDispositions = pgTable(
  'batch_dispositions',
  {
    id: serial('id').primaryKey(),
    batchId: integer('batch_id')
      .notNull()
      .references(() => batches.id),
    decision: text('decision', { enum: ['release', 'hold', 'scrap'] }).notNull(),
    reason: text('reason'),
    byId: text('by_id').notNull(),
    /** Who signed, as named when they signed (people get renamed). */
    byName: text('by_name').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull(),
  },
  (t) => [index('batch_dispositions_batch').on(t.batchId, t.id)],
);
