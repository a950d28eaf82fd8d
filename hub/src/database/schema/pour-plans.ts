import type { PourEstimate } from '@tareline/protocol';
import { sql } from 'drizzle-orm';
import { doublePrecision, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { materials } from './materials.js';

/** A saved volume-estimator result for one mold or part, to pour again without measuring. */
export const pourPlans = pgTable('pour_plans', {
  id: text('id')
    .primaryKey()
    .default(sql`gen_random_uuid()::text`),
  name: text('name').notNull(),
  moldRef: text('mold_ref'),
  materialId: text('material_id')
    .notNull()
    .references(() => materials.id),
  /** The cavity and allowances as entered (protocol `pourEstimateSchema`). */
  estimate: jsonb('estimate').$type<PourEstimate>().notNull(),
  /** The total computed when saved or last edited, g. */
  totalMassG: doublePrecision('total_mass_g').notNull(),
  createdById: text('created_by_id').notNull(),
  createdByName: text('created_by_name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
