import { sql, type SQL } from 'drizzle-orm';
import {
  customType,
  type AnyPgColumn,
  doublePrecision,
  index,
  jsonb,
  pgTable,
  serial,
  text,
  timestamp,
} from 'drizzle-orm/pg-core';
import { benches } from './benches.js';
import { materials } from './materials.js';
import { pourPlans } from './pour-plans.js';

/** A batch's lot codes, lower-cased, as a JSON array of strings (what the GIN index holds). */
export const lotCodesKey = (detail: AnyPgColumn | SQL) =>
  sql`(lower(jsonb_path_query_array(${detail}, '$.lots[*].code')::text)::jsonb)`;

const bytea = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => 'bytea',
});

/** One row per batch, written at every change of state so a restart never loses it. */
export const batches = pgTable(
  'batches',
  {
    id: serial('id').primaryKey(),
    benchId: text('bench_id')
      .notNull()
      .references(() => benches.id),
    operatorId: text('operator_id').notNull(),
    /** Who poured, as named when they poured (people get renamed). */
    operatorName: text('operator_name').notNull(),
    materialId: text('material_id')
      .notNull()
      .references(() => materials.id),
    materialName: text('material_name').notNull(),
    /** The pour plan the batch was started from, if any. */
    planId: text('plan_id').references(() => pourPlans.id),
    state: text('state', {
      enum: ['weighing-a', 'weighing-b', 'weighing-c', 'saved', 'abandoned', 'interrupted'],
    }).notNull(),
    /** The weighing state to go back to when an interrupted batch is resumed. */
    resumeState: text('resume_state'),
    verdict: text('verdict', { enum: ['GO', 'NO-GO'] }),
    totalMassG: doublePrecision('total_mass_g').notNull(),
    weightRatio: jsonb('weight_ratio').$type<number[]>().notNull(),
    tolerancePct: doublePrecision('tolerance_pct').notNull(),
    readabilityG: doublePrecision('readability_g').notNull(),
    /** The batch's working data (parts, active pour, rescue, lots, steps): see BatchRecord. */
    detail: jsonb('detail').notNull(),
    ratioDeviationPct: doublePrecision('ratio_deviation_pct'),
    abandonReason: text('abandon_reason'),
    interruptedReason: text('interrupted_reason'),
    /** The pour trace: (uint32 ms since start, int32 net mg) pairs, little-endian. */
    trace: bytea('trace'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    savedAt: timestamp('saved_at', { withTimezone: true }),
  },
  (t) => [
    index('batches_bench_state').on(t.benchId, t.state),
    index('batches_created').on(t.createdAt),
    // A bench's batches newest first (the lead's list filtered by bench, the default order).
    index('batches_bench_created').on(t.benchId, t.createdAt, t.id),
    // The lead's lot search: the search filters on the same `lotCodesKey` expression (`@>`).
    index('batches_lot_codes').using('gin', lotCodesKey(t.detail)),
    index('batches_plan').on(t.planId, t.createdAt),
    // The lead's list sorted by deviation: the sort keys of `batches.repository.ts` exactly
    // (a batch without a deviation at the far end each way), with the number that breaks ties.
    index('batches_dev_up').on(sql`coalesce(${t.ratioDeviationPct}, 'Infinity'::float8)`, t.id),
    index('batches_dev_down').on(sql`coalesce(${t.ratioDeviationPct}, '-Infinity'::float8)`, t.id),
    index('batches_absdev_up').on(
      sql`coalesce(abs(${t.ratioDeviationPct}), 'Infinity'::float8)`,
      t.id,
    ),
    index('batches_absdev_down').on(
      sql`coalesce(abs(${t.ratioDeviationPct}), '-Infinity'::float8)`,
      t.id,
    ),
  ],
);
