import {
  boolean,
  date,
  doublePrecision,
  integer,
  pgTable,
  text,
  timestamp,
} from 'drizzle-orm/pg-core';

/** A mixing bench: one scale, one shared screen. */
export const benches = pgTable('benches', {
  /** Short stable code, e.g. `bench-1`; used in URLs and on the socket. */
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  /**
   * How to reach the bench's scale, as a URL (`serial:///dev/ttyUSB0?baud=9600`,
   * `tcp://host:port`, `sim://`). Null: the default (TARELINE_SCALE, else the simulator).
   */
  scaleUrl: text('scale_url'),
  /** Every operator must enter a PIN at this bench, not only those who have one. */
  pinRequired: boolean('pin_required').notNull().default(false),
  /** Minutes without a touch before the bench signs its operator out. */
  idleSignOutMin: integer('idle_sign_out_min').notNull().default(5),
  /**
   * The hub whose process reads this bench's scale (`TARELINE_HUB_ID`); null until a hub that
   * reads scales claims it. Intents at the bench are handled by that hub.
   */
  hubId: text('hub_id'),
  active: boolean('active').notNull().default(true),
  /** Hours a passed scale check stays good; null: no routine checks asked of this bench. */
  checkEveryHours: integer('check_every_hours'),
  /** While a check is due or the last one failed, no batch starts at this bench. */
  blockWhenDue: boolean('block_when_due').notNull().default(false),
  /** Routine check tolerance in grams; null: the default, max(0.1 % of reference, 2 d). */
  checkToleranceG: doublePrecision('check_tolerance_g'),
  /** When the scale's next calibration (by whoever calibrates it) is due, as entered. */
  calibrationDueOn: date('calibration_due_on', { mode: 'string' }),
  /** Repeatability s in grams from the last repeatability test (already floored at 0.41 d). */
  repeatabilitySdG: doublePrecision('repeatability_sd_g'),
  /** When that repeatability test finished. */
  repeatabilityAt: timestamp('repeatability_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
