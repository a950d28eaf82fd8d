import { z } from 'zod';
import { text } from './text.js';

/**
 * What a person can be mailed about. The batch ones come from the batch rooms; scale checks and
 * stock levels join this list as the hub learns them.
 */
export const alertEventSchema = z.enum([
  'batch.no-go',
  'batch.abandoned',
  'batch.lot-warning',
  'batch.interrupted',
  'summary.daily',
]);
export type AlertEvent = z.infer<typeof alertEventSchema>;
export const ALERT_EVENTS = alertEventSchema.options;

/** How each alert is named on the subscription form and in mail subjects. */
export const ALERT_EVENT_LABELS: Record<AlertEvent, string> = {
  'batch.no-go': 'A batch saved NO-GO',
  'batch.abandoned': 'A batch abandoned',
  'batch.lot-warning': 'A batch saved with an expired or long-open lot',
  'batch.interrupted': 'A batch interrupted and not resumed within 15 minutes',
  'summary.daily': 'A daily summary: batches, GO share, NO-GO batches',
};

/** Body of `PUT /api/me/alerts` and `PUT /api/people/:id/alerts`: the whole new choice. */
export const alertSubscriptionRequestSchema = z.object({
  events: z
    .array(
      text({ error: 'Must be an alert name' }).pipe(
        z.enum(ALERT_EVENTS, { error: `Must be one of ${ALERT_EVENTS.join(', ')}` }),
      ),
      { error: 'Must be a list of alert names' },
    )
    .max(ALERT_EVENTS.length * 4, 'Too many alert names')
    .transform((events) => [...new Set(events)]),
});
export type AlertSubscriptionRequest = z.input<typeof alertSubscriptionRequestSchema>;

/** Answer of the subscription routes; `email` null: the person has no address to mail. */
export const alertSubscriptionSchema = z.object({
  personId: z.string(),
  email: z.string().nullable(),
  events: z.array(alertEventSchema),
});
export type AlertSubscription = z.infer<typeof alertSubscriptionSchema>;

export const outboxStatusSchema = z.enum(['queued', 'sent', 'failed']);
export type OutboxStatus = z.infer<typeof outboxStatusSchema>;

/** One alert mail in the durable outbox, as `GET /api/outbox` lists it. */
export const outboxMessageSchema = z.object({
  id: z.number().int(),
  event: z.string(),
  to: z.string(),
  subject: z.string(),
  status: outboxStatusSchema,
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  nextAttemptAt: z.string().nullable(),
  sentAt: z.string().nullable(),
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;

/** A mail the hub's local mail catcher received (no SMTP server configured). */
export const caughtMailSchema = z.object({
  id: z.number().int(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  /** The plain-text part, decoded (empty when the message has none). */
  text: z.string(),
  /** The message as it arrived (headers and MIME parts). */
  raw: z.string(),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;
