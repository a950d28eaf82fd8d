import {
  doublePrecision,
  index,
  jsonb,
  pgTable,
  serial,
  text,
  timestamp,
} from 'drizzle-orm/pg-core';
import { benches } from './benches.js';

/**
 * Scale checks with a reference weight, one row per check: kept, never deleted, so the bench's
 * record says who checked, when, with what weight, what the scale read, and the result.
 */
export const scaleChecks = pgTable(
  'scale_checks',
  {
    id: serial('id').primaryKey(),
    benchId: text('bench_id')
      .notNull()
      .references(() => benches.id),
    kind: text('kind', { enum: ['routine', 'repeatability'] }).notNull(),
    state: text('state', {
      enum: ['waiting', 'passed', 'failed', 'cancelled', 'interrupted'],
    }).notNull(),
    /** The reference weight's mass as marked, g. */
    referenceG: doublePrecision('reference_g').notNull(),
    /** The scale interval d at the time of the check, g. */
    readabilityG: doublePrecision('readability_g').notNull(),
    /** Routine: the largest error that passes, g. */
    toleranceG: doublePrecision('tolerance_g'),
    /** Routine: the stable reading taken with the weight on, g. */
    readingG: doublePrecision('reading_g'),
    /** Routine: reading − reference, g. */
    errorG: doublePrecision('error_g'),
    /** Repeatability: the stable readings taken so far, g, in order. */
    readings: jsonb('readings').$type<number[]>().notNull().default([]),
    /** Repeatability: the sample standard deviation (n − 1) of the readings, g. */
    sdG: doublePrecision('sd_g'),
    /** Repeatability: s as used, never below 0.41 d (USP General Chapter <41>), g. */
    sdUsedG: doublePrecision('sd_used_g'),
    /** Repeatability: the band the minimum net mass is for, % (the shop's tightest). */
    bandPct: doublePrecision('band_pct'),
    /** Repeatability: the minimum net mass at that band, 2 s / band, g. */
    minNetG: doublePrecision('min_net_g'),
    /** Why a check failed, was cancelled or interrupted, in words. */
    note: text('note'),
    byId: text('by_id').notNull(),
    /** Who checked, as named when they checked (people get renamed). */
    byName: text('by_name').notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('scale_checks_bench').on(t.benchId, t.id)],
);
