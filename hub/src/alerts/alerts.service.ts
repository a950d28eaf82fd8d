import { Inject, Injectable, type OnModuleInit } from '@nestjs/common';
import type {
  AlertEvent,
  AlertSubscription,
  Batch,
  CaughtMail,
  OutboxMessage,
  Role,
} from '@tareline/protocol';
import { BatchesRepository, recordOf, toBatch } from '../batches/batches.repository.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import type { DbOrTx } from '../database/database.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { NotApplicable, NotFound } from '../common/domain-errors.js';
import { OnHubEvent } from '../events/hub-events.js';
import { alertsFor } from './alert-rules.js';
import { renderBatchAlert } from './alert-mail.js';
import {
  AlertsRepository,
  type NewOutboxRow,
  type OutboxRow,
  type Recipient,
} from './alerts.repository.js';
import { MAIL_TRANSPORT, type MailTransport } from './mail-transport.js';
import { DIGEST_OVER, DIGEST_WINDOW_MS, OutboxSender } from './outbox-sender.js';

/** Alerts a person gets before choosing: leads hear of NO-GO batches and get the daily summary. */
export function defaultAlerts(role: Role): AlertEvent[] {
  return role === 'lead' ? ['batch.no-go', 'summary.daily'] : [];
}

/** A person's own choice, or the default of their role. */
export const chosenAlerts = (r: Recipient): AlertEvent[] => r.events ?? defaultAlerts(r.role);

/**
 * Turns batch changes into queued alert mails for the people who chose them, in the same
 * transaction as the batch's new state, and answers the subscription and outbox routes. The
 * outbox key names the event and the person, so one event never queues a second mail.
 */
@Injectable()
export class AlertsService implements OnModuleInit {
  constructor(
    @Inject(AlertsRepository) private readonly repo: AlertsRepository,
    @Inject(OutboxSender) private readonly sender: OutboxSender,
    @Inject(MAIL_TRANSPORT) private readonly transport: MailTransport,
    @Inject(BatchesRepository) private readonly batches: BatchesRepository,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  onModuleInit(): void {
    this.batches.onRecordWrite(async (tx, row) => {
      await this.queueFor(toBatch(row, recordOf(row)), tx);
    });
  }

  /** The batch's rows are committed by the time it is announced: send them now. */
  @OnHubEvent('batch.changed')
  onBatchChanged(): void {
    this.sender.kick();
  }

  /** Queues the alerts a batch's new state calls for; answers how many rows were new. */
  async queueFor(batch: Batch, db: DbOrTx): Promise<number> {
    if (batch.state !== 'interrupted') {
      // Resumed (or ended) in time: the interruption alert has nothing to say any more.
      await this.repo.dropQueued(await this.repo.queuedInterruptionKeys(batch.id, db), db);
    }
    const now = this.clock.now();
    const alerts = alertsFor(batch, now);
    if (!alerts.length) return 0;
    const recipients = await this.repo.recipients(db);
    const benchName = await this.repo.benchName(batch.benchId, db);
    const rows: NewOutboxRow[] = [];
    for (const alert of alerts) {
      const mail = renderBatchAlert({
        event: alert.event,
        batch,
        benchName,
        publicUrl: this.config.mail.publicUrl,
      });
      for (const person of recipients) {
        if (!person.email || !chosenAlerts(person).includes(alert.event)) continue;
        rows.push({
          key: `${alert.key}:${person.id}`,
          event: alert.event,
          personId: person.id,
          to: person.email,
          batchId: batch.id,
          ...mail,
          createdAt: new Date(now),
          nextAttemptAt: new Date(await this.notBefore(person.email, alert.notBefore, now, db)),
        });
      }
    }
    return this.repo.enqueue(rows, db);
  }

  /**
   * Past the flood limit, an alert waits for the end of the window so the ones piling up go
   * as one digest instead of a mail each.
   */
  private async notBefore(to: string, notBefore: number, now: number, db: DbOrTx): Promise<number> {
    const recent = await this.repo.countSince(to, new Date(now - DIGEST_WINDOW_MS), db);
    return recent >= DIGEST_OVER ? Math.max(notBefore, now + DIGEST_WINDOW_MS) : notBefore;
  }

  async subscription(personId: string): Promise<AlertSubscription> {
    const person = await this.repo.recipient(personId);
    if (!person) throw new NotFound('No such person');
    return { personId, email: person.email, events: chosenAlerts(person) };
  }

  async subscribe(personId: string, events: AlertEvent[]): Promise<AlertSubscription> {
    const person = await this.repo.recipient(personId);
    if (!person) throw new NotFound('No such person');
    await this.repo.setSubscription(personId, events);
    return { personId, email: person.email, events };
  }

  async outbox(): Promise<OutboxMessage[]> {
    return (await this.repo.list(200)).map(toMessage);
  }

  caughtMail(): CaughtMail[] {
    if (!this.transport.catcher) {
      throw new NotApplicable(
        'Alerts go to the configured mail server; there is no local mail catcher',
      );
    }
    return this.transport.catcher.list();
  }
}

function toMessage(row: OutboxRow): OutboxMessage {
  return {
    id: row.id,
    event: row.event,
    to: row.to,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    lastError: row.lastError,
    createdAt: row.createdAt.toISOString(),
    nextAttemptAt: row.status === 'queued' ? (row.nextAttemptAt?.toISOString() ?? null) : null,
    sentAt: row.sentAt?.toISOString() ?? null,
  };
}
