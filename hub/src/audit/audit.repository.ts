import { Inject, Injectable } from '@nestjs/common';
import { and, asc, desc, eq, gt, type SQL } from 'drizzle-orm';
import { ADVISORY_LOCKS, Database, lockForTransaction, type Db } from '../database/database.js';
import { auditEntries } from '../database/schema/index.js';
import { entryHash, GENESIS_HASH, type ChainedFields, type StoredEntry } from './audit-chain.js';

/** A Drizzle transaction: other repositories write in it and the trail appends in the same one. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** An entry to append: the chain gives it its id and hashes. */
export type AuditInput = Omit<ChainedFields, 'id'>;

/** Who made a change: a signed-in person, or null for the hub itself (first start, demo shop). */
export type Actor = ChainedFields['actor'];

/** The actor of a signed-in person: their id and name only (what the entry's hash covers). */
export const actorOf = (user: { id: string; name: string }): Actor => ({
  id: user.id,
  name: user.name,
});

type AuditRow = typeof auditEntries.$inferSelect;

const toStored = (row: AuditRow): StoredEntry => ({
  id: row.id,
  at: row.at.toISOString(),
  actor: row.actor ?? null,
  entity: row.entity,
  entityId: row.entityId,
  action: row.action,
  data: row.data,
  prevHash: row.prevHash,
  hash: row.hash,
});

/** The only place that talks SQL about the audit trail. */
@Injectable()
export class AuditRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  /**
   * Runs `write` and appends the entries it leads to (one, several, or none when it changed
   * nothing), in one transaction: either all are stored or none. The chain's head is locked for
   * the transaction (an advisory lock), so the last hash read here stays the last even with
   * several hubs on one server.
   */
  record<T>(
    write: (tx: Tx) => Promise<T>,
    entryOf: (result: T) => AuditInput | AuditInput[],
  ): Promise<T> {
    return this.database.db.transaction(async (tx) => {
      const result = await write(tx);
      for (const entry of [entryOf(result)].flat()) await this.appendIn(tx, entry);
      return result;
    });
  }

  /** Appends one entry on its own, unless the latest entry of its entity says the same. */
  appendUnlessSame(entry: AuditInput, same: (latest: StoredEntry) => boolean): Promise<void> {
    return this.database.db.transaction(async (tx) => {
      // Locked before the latest is read: two announcements at once (two connections of a
      // server's pool) would otherwise both find it different and both append.
      await lockForTransaction(tx, ADVISORY_LOCKS.auditHead);
      const [latest] = await tx
        .select()
        .from(auditEntries)
        .where(
          and(eq(auditEntries.entity, entry.entity), eq(auditEntries.entityId, entry.entityId)),
        )
        .orderBy(desc(auditEntries.id))
        .limit(1);
      if (latest && same(toStored(latest))) return;
      await this.appendIn(tx, entry);
    });
  }

  private async appendIn(tx: Tx, entry: AuditInput): Promise<void> {
    await lockForTransaction(tx, ADVISORY_LOCKS.auditHead);
    const [last] = await tx
      .select({ id: auditEntries.id, hash: auditEntries.hash })
      .from(auditEntries)
      .orderBy(desc(auditEntries.id))
      .limit(1);
    const prevHash = last?.hash ?? GENESIS_HASH;
    // The time kept to the millisecond, as the hash saw it.
    const fields: ChainedFields = { ...entry, id: (last?.id ?? 0) + 1 };
    await tx.insert(auditEntries).values({
      ...fields,
      at: new Date(fields.at),
      prevHash,
      hash: entryHash(prevHash, fields),
    });
  }

  /** Entries oldest first, after the id `afterId`, of one entity if asked. */
  async list(q: {
    entity?: string;
    entityId?: string;
    afterId?: number;
    limit: number;
  }): Promise<StoredEntry[]> {
    const where: SQL[] = [];
    if (q.entity) where.push(eq(auditEntries.entity, q.entity));
    if (q.entityId) where.push(eq(auditEntries.entityId, q.entityId));
    if (q.afterId !== undefined) where.push(gt(auditEntries.id, q.afterId));
    const rows = await this.database.db
      .select()
      .from(auditEntries)
      .where(where.length ? and(...where) : undefined)
      .orderBy(asc(auditEntries.id))
      .limit(q.limit);
    return rows.map(toStored);
  }
}
