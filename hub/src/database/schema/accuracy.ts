import { sql } from 'drizzle-orm';
import {
  doublePrecision,
  integer,
  pgTable,
  primaryKey,
  text,
  timestamp,
} from 'drizzle-orm/pg-core';

/** Width of one bin of the |deviation| histogram, in percentage points. */
export const ACCURACY_BIN_PCT = 0.05;
/** Bins of {@link ACCURACY_BIN_PCT} from 0 up to 3 %; one more holds everything from 3 % up. */
export const ACCURACY_BINS = 61;

/**
 * Saved batches rolled up per UTC day and per material, bench or operator, so accuracy over
 * years reads thousands of rows, not millions of batches. Kept in the transaction that saves a
 * batch (`BatchDeskRepository`), so it never disagrees with the batches table. Mean and sample
 * SD come from the exact sums; the 95th percentile of |deviation| from the histogram `hist`.
 */
export const accuracyDays = pgTable(
  'accuracy_days',
  {
    kind: text('kind', { enum: ['material', 'bench', 'operator'] }).notNull(),
    groupId: text('group_id').notNull(),
    /** Midnight UTC of the day. */
    day: timestamp('day', { withTimezone: true }).notNull(),
    /** The material's or operator's name on the latest batch counted (a bench's comes from its row). */
    groupName: text('group_name'),
    n: integer('n').notNull(),
    go: integer('go').notNull(),
    rescues: integer('rescues').notNull(),
    sumDev: doublePrecision('sum_dev').notNull(),
    sumSq: doublePrecision('sum_sq').notNull(),
    maxAbs: doublePrecision('max_abs').notNull(),
    /** Batches per |deviation| bin: element i (1-based) counts [(i−1)·w, i·w), the last ≥ 3 %. */
    hist: integer('hist')
      .array()
      .notNull()
      .default(sql`array_fill(0, array[${sql.raw(String(ACCURACY_BINS))}])`),
  },
  (t) => [primaryKey({ name: 'accuracy_days_pk', columns: [t.kind, t.groupId, t.day] })],
);
