import { sql } from 'drizzle-orm';
import {
  boolean,
  date,
  doublePrecision,
  integer,
  jsonb,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core';

/** A material system from a maker's data sheet. */
export const materials = pgTable('materials', {
  id: text('id')
    .primaryKey()
    .default(sql`gen_random_uuid()::text`),
  name: text('name').notNull(),
  ratioBasis: text('ratio_basis', { enum: ['weight', 'volume'] }).notNull(),
  ratioParts: jsonb('ratio_parts').$type<number[]>().notNull(),
  specificGravity: doublePrecision('specific_gravity'),
  yieldIn3PerLb: doublePrecision('yield_in3_per_lb'),
  partSpecificGravities: jsonb('part_specific_gravities').$type<number[]>(),
  partLabels: jsonb('part_labels').$type<string[]>(),
  tolerancePct: doublePrecision('tolerance_pct').notNull(),
  potLifeMin: doublePrecision('pot_life_min'),
  potLifeMassG: doublePrecision('pot_life_mass_g'),
  agitateMin: doublePrecision('agitate_min').notNull().default(0),
  cautions: jsonb('cautions').$type<string[]>().notNull().default([]),
  sdsRef: text('sds_ref'),
  openShelfLifeDays: integer('open_shelf_life_days'),
  active: boolean('active').notNull().default(true),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** A lot (production batch of the maker) of one part of a material, as printed on its label. */
export const lots = pgTable(
  'lots',
  {
    id: text('id')
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    materialId: text('material_id')
      .notNull()
      .references(() => materials.id),
    part: integer('part').notNull(),
    code: text('code').notNull(),
    expiresOn: date('expires_on', { mode: 'string' }),
    openedOn: date('opened_on', { mode: 'string' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('lots_material_part_code').on(t.materialId, t.part, t.code)],
);
