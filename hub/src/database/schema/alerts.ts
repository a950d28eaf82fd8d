import { index, integer, jsonb, pgTable, serial, text, timestamp } from 'drizzle-orm/pg-core';
import type { AlertEvent, OutboxStatus } from '@tareline/protocol';
import { people } from './people.js';

/**
 * Alert mails waiting to go, sent, or given up on. A row is the durable promise of one mail to one
 * person: a hub that dies with rows queued sends them after its restart. `key` names the event
 * and the person, so one event never queues (or sends) a second mail to anyone.
 */
export const outbox = pgTable(
  'outbox',
  {
    id: serial('id').primaryKey(),
    key: text('key').notNull().unique(),
    event: text('event').$type<AlertEvent>().notNull(),
    personId: text('person_id').references(() => people.id),
    to: text('to_address').notNull(),
    subject: text('subject').notNull(),
    text: text('text_body').notNull(),
    html: text('html_body').notNull(),
    batchId: integer('batch_id'),
    status: text('status').$type<OutboxStatus>().notNull().default('queued'),
    attempts: integer('attempts').notNull().default(0),
    /** The mail server's own words at the last failed attempt. */
    lastError: text('last_error'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull(),
    /** Not before this time: the backoff after a failure, or the wait of a delayed alert. */
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }),
    /** The first attempt to send: retries stop a day after it. */
    firstTriedAt: timestamp('first_tried_at', { withTimezone: true }),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [
    index('outbox_due').on(t.status, t.nextAttemptAt),
    index('outbox_person_created').on(t.to, t.createdAt),
  ],
);

/** Which alerts a person chose. No row: the default of their role (leads get NO-GO). */
export const alertSubscriptions = pgTable('alert_subscriptions', {
  personId: text('person_id')
    .primaryKey()
    .references(() => people.id),
  events: jsonb('events').$type<AlertEvent[]>().notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
