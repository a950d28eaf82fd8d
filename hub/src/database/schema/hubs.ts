import { bigserial, customType, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

const payloadBytes = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => 'bytea',
});

/**
 * The hubs sharing this database, one row each. A running hub writes `heartbeatAt` every second
 * (database time, so the hubs' own clocks do not matter) with what its scales show; a row not
 * refreshed for a few seconds is a hub that stopped, and its benches show offline elsewhere.
 */
export const hubs = pgTable('hubs', {
  id: text('id').primaryKey(),
  /** Where the other hubs reach this one to hand on an intent at one of its benches. */
  internalUrl: text('internal_url'),
  startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
  heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }).notNull().defaultNow(),
  /** Set by the hub that found this one gone and interrupted its open batches. */
  downNotedAt: timestamp('down_noted_at', { withTimezone: true }),
  /** Each of its benches' scale as of the last heartbeat (state, readability, newest reading). */
  scales: jsonb('scales').$type<Record<string, unknown>>().notNull().default({}),
});

/**
 * Large live events between hubs, written by `@socket.io/postgres-adapter` (its own table name
 * and columns): an event too big for a NOTIFY travels as a row here.
 */
export const socketIoAttachments = pgTable('socket_io_attachments', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  payload: payloadBytes('payload'),
});
