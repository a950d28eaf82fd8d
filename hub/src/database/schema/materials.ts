import { sql } from 'drizzle-orm';
import {
  bigint,
  boolean,
  date,
  doublePrecision,
  index,
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
  /** The ratio as the data sheet also states it on the other basis (checked against the SGs). */
  alsoStatedRatio: jsonb('also_stated_ratio').$type<{
    basis: 'weight' | 'volume';
    parts: number[];
  }>(),
  demoldMin: doublePrecision('demold_min'),
  storageNote: text('storage_note'),
  /** Cost per kg of each part, part A first, in the shop's currency. */
  costPerKg: jsonb('cost_per_kg').$type<number[]>(),
  /** Low-stock threshold of each part, grams. */
  lowStockG: jsonb('low_stock_g').$type<number[]>(),
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
    /** Net milligrams received; what is on hand is this plus the lot's stock movements. */
    receivedMg: bigint('received_mg', { mode: 'number' }).notNull().default(0),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('lots_material_part_code').on(t.materialId, t.part, t.code)],
);

/**
 * Every change of a lot's stock after it was received, in whole milligrams so sums stay exact:
 * what a saved or abandoned batch weighed from it (one row per batch and lot, so writing the
 * batch again never subtracts twice), or an adjustment with who made it and why.
 */
export const stockMovements = pgTable(
  'stock_movements',
  {
    id: text('id')
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    lotId: text('lot_id')
      .notNull()
      .references(() => lots.id),
    kind: text('kind', { enum: ['adjustment', 'batch'] }).notNull(),
    deltaMg: bigint('delta_mg', { mode: 'number' }).notNull(),
    /** The batch that weighed it (kind `batch`). */
    batchId: integer('batch_id'),
    reason: text('reason'),
    personId: text('person_id'),
    personName: text('person_name'),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('stock_movements_batch_lot').on(t.batchId, t.lotId),
    index('stock_movements_lot').on(t.lotId),
  ],
);
