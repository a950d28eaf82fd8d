import { Inject, Injectable } from '@nestjs/common';
import type { AlertEvent, Role } from '@tareline/protocol';
import {
  and,
  asc,
  desc,
  eq,
  gte,
  inArray,
  isNotNull,
  lte,
  or,
  isNull,
  sql,
  type SQL,
} from 'drizzle-orm';
import { ADVISORY_LOCKS, Database, type DbOrTx } from '../database/database.js';
import { alertSubscriptions, benches, outbox, people } from '../database/schema/index.js';

export type OutboxRow = typeof outbox.$inferSelect;
export type NewOutboxRow = typeof outbox.$inferInsert;

/** A person who may get alert mails. */
export interface Recipient {
  id: string;
  email: string | null;
  role: Role;
  /** Their own choice, or null: the default of their role. */
  events: AlertEvent[] | null;
}

/** The only place that talks SQL about alerts: the outbox and who wants which alert. */
@Injectable()
export class AlertsRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  /** Runs an outbox pass while no other hub on the same server runs one (none twice the mail). */
  oneSenderAtATime<T>(pass: () => Promise<T>): Promise<T> {
    return this.database.underLock(ADVISORY_LOCKS.outbox, pass);
  }

  private get db() {
    return this.database.db;
  }

  // Methods taking `db` join the caller's transaction (a batch write) when given one.

  /** Queues rows; a row whose key is already there (the event was seen before) is skipped. */
  async enqueue(rows: NewOutboxRow[], db: DbOrTx = this.db): Promise<number> {
    if (!rows.length) return 0;
    const inserted = await db
      .insert(outbox)
      .values(rows)
      .onConflictDoNothing({ target: outbox.key })
      .returning({ id: outbox.id });
    return inserted.length;
  }

  /** Drops still-unsent rows of these keys (an interrupted batch resumed in time). */
  async dropQueued(keys: string[], db: DbOrTx = this.db): Promise<void> {
    if (!keys.length) return;
    await db
      .delete(outbox)
      .where(and(inArray(outbox.key, keys), eq(outbox.status, 'queued'), eq(outbox.attempts, 0)));
  }

  /** Keys of queued interruption alerts of one batch. */
  async queuedInterruptionKeys(batchId: number, db: DbOrTx = this.db): Promise<string[]> {
    const rows = await db
      .select({ key: outbox.key })
      .from(outbox)
      .where(
        and(
          eq(outbox.batchId, batchId),
          eq(outbox.event, 'batch.interrupted'),
          eq(outbox.status, 'queued'),
        ),
      );
    return rows.map((r) => r.key);
  }

  /** Queued rows whose time has come, oldest first. */
  due(now: Date): Promise<OutboxRow[]> {
    return this.db
      .select()
      .from(outbox)
      .where(
        and(
          eq(outbox.status, 'queued'),
          or(isNull(outbox.nextAttemptAt), lte(outbox.nextAttemptAt, now)),
        ),
      )
      .orderBy(asc(outbox.id));
  }

  /** How many alerts went to or wait for this address since `since` (the flood check). */
  async countSince(to: string, since: Date, db: DbOrTx = this.db): Promise<number> {
    const [row] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(outbox)
      .where(and(eq(outbox.to, to), gte(outbox.createdAt, since)));
    return row?.n ?? 0;
  }

  async markSent(ids: number[], at: Date): Promise<void> {
    await this.db
      .update(outbox)
      .set({
        status: 'sent',
        sentAt: at,
        nextAttemptAt: null,
        attempts: sql`${outbox.attempts} + 1`,
        firstTriedAt: sql`coalesce(${outbox.firstTriedAt}, ${at})`,
      })
      .where(inArray(outbox.id, ids));
  }

  /** Records a failed attempt: retried at `nextAttemptAt`, or failed for good when it is null. */
  async markFailed(
    ids: number[],
    error: string,
    at: Date,
    nextAttemptAt: Date | null,
  ): Promise<void> {
    await this.db
      .update(outbox)
      .set({
        firstTriedAt: sql`coalesce(${outbox.firstTriedAt}, ${at})`,
        status: nextAttemptAt ? 'queued' : 'failed',
        lastError: error,
        nextAttemptAt,
        attempts: sql`${outbox.attempts} + 1`,
      })
      .where(inArray(outbox.id, ids));
  }

  list(limit: number): Promise<OutboxRow[]> {
    return this.db.select().from(outbox).orderBy(desc(outbox.id)).limit(limit);
  }

  /** Active people with an e-mail address and their chosen alerts (null: not chosen yet). */
  recipients(db: DbOrTx = this.db): Promise<Recipient[]> {
    return this.peopleWithChoices(and(eq(people.active, true), isNotNull(people.email))!, db);
  }

  async recipient(personId: string): Promise<Recipient | undefined> {
    const [row] = await this.peopleWithChoices(eq(people.id, personId));
    return row;
  }

  private async peopleWithChoices(where: SQL, db: DbOrTx = this.db): Promise<Recipient[]> {
    const rows = await db
      .select({
        id: people.id,
        email: people.email,
        role: people.role,
        events: alertSubscriptions.events,
      })
      .from(people)
      .leftJoin(alertSubscriptions, eq(alertSubscriptions.personId, people.id))
      .where(where);
    return rows.map((r) => ({ ...r, events: r.events ?? null }));
  }

  async setSubscription(personId: string, events: AlertEvent[]): Promise<void> {
    await this.db
      .insert(alertSubscriptions)
      .values({ personId, events, updatedAt: new Date() })
      .onConflictDoUpdate({
        target: alertSubscriptions.personId,
        set: { events, updatedAt: new Date() },
      });
  }

  async benchName(benchId: string, db: DbOrTx = this.db): Promise<string> {
    const [row] = await db
      .select({ name: benches.name })
      .from(benches)
      .where(eq(benches.id, benchId));
    return row?.name ?? benchId;
  }
}
