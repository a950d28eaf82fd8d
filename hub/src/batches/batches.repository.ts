import { Inject, Injectable } from '@nestjs/common';
import { batchCost, WEIGHING_STATES, type Batch, type BatchState } from '@tareline/protocol';
import { and, desc, eq, getTableColumns, gte, inArray, sql, type SQL } from 'drizzle-orm';
import { ADVISORY_LOCKS, Database, lockForTransaction, type DbOrTx } from '../database/database.js';
import { batches, benches } from '../database/schema/index.js';
import type { BatchRecord } from './batch-machine.js';
import { encodeTrace, type TracePoint } from './pour-trace.js';

export type BatchRow = typeof batches.$inferSelect;
export type NewBatchRow = typeof batches.$inferInsert;

/** What a batch row keeps in its `detail` column besides the record's own fields. */
export type BatchDetail = Pick<
  BatchRecord,
  'parts' | 'active' | 'topUpQueue' | 'rescue' | 'steps' | 'lots'
> & {
  potLifeMin: number | null;
  potLifeMassG: number | null;
  /** The material's price per kg of each part when the batch started; absent or null: none. */
  costPerKg?: number[] | null;
  handledBy?: NonNullable<Batch['handledBy']>;
  /** The hub restarted mid-pour: the balance's tare may be gone, so resume asks again. */
  tareLost?: boolean;
  /** Gross on the balance when the active pour was tared (the cup and earlier parts). */
  tareGrossG?: number;
  noGoReason?: string | null;
  scaleOverride?: NonNullable<Batch['scaleOverride']>;
};

export const detailOf = (row: BatchRow): BatchDetail => row.detail as BatchDetail;

/** The batch record a row holds (the state machine's view). */
export function recordOf(row: BatchRow): BatchRecord {
  const d = detailOf(row);
  return {
    state: row.state,
    resumeState: (row.resumeState as BatchState | null) ?? null,
    verdict: row.verdict ?? null,
    weightRatio: row.weightRatio,
    tolerancePct: row.tolerancePct,
    readabilityG: row.readabilityG,
    totalMassG: row.totalMassG,
    parts: d.parts,
    active: d.active,
    topUpQueue: d.topUpQueue,
    rescue: d.rescue,
    ratioDeviationPct: row.ratioDeviationPct ?? null,
    abandonReason: row.abandonReason ?? null,
    interruptedReason: row.interruptedReason ?? null,
    noGoReason: d.noGoReason ?? null,
    steps: d.steps,
    lots: d.lots,
  };
}

/** A record's working data for the `detail` column, keeping what only the row knows. */
export function detailFor(
  rec: BatchRecord,
  keep: Pick<
    BatchDetail,
    | 'potLifeMin'
    | 'potLifeMassG'
    | 'costPerKg'
    | 'handledBy'
    | 'tareLost'
    | 'tareGrossG'
    | 'scaleOverride'
  >,
): BatchDetail {
  return {
    parts: rec.parts,
    active: rec.active,
    topUpQueue: rec.topUpQueue,
    rescue: rec.rescue,
    steps: rec.steps,
    lots: rec.lots,
    potLifeMin: keep.potLifeMin,
    potLifeMassG: keep.potLifeMassG,
    ...(keep.costPerKg ? { costPerKg: keep.costPerKg } : {}),
    ...(keep.handledBy ? { handledBy: keep.handledBy } : {}),
    ...(keep.tareLost ? { tareLost: true } : {}),
    ...(keep.tareGrossG !== undefined ? { tareGrossG: keep.tareGrossG } : {}),
    ...(keep.scaleOverride ? { scaleOverride: keep.scaleOverride } : {}),
    ...(rec.noGoReason ? { noGoReason: rec.noGoReason } : {}),
  };
}

/** The wire shape of a batch: the row's identity and the record's state, the trace if asked. */
export function toBatch(row: BatchRow, rec: BatchRecord, trace?: TracePoint[]): Batch {
  const d = detailOf(row);
  return {
    id: row.id,
    state: rec.state,
    verdict: rec.verdict,
    benchId: row.benchId,
    materialId: row.materialId,
    materialName: row.materialName,
    planId: row.planId,
    operator: { id: row.operatorId, name: row.operatorName },
    ...(d.handledBy?.length ? { handledBy: d.handledBy } : {}),
    ...(d.scaleOverride ? { scaleOverride: d.scaleOverride } : {}),
    totalMassG: rec.totalMassG,
    weightRatio: rec.weightRatio,
    parts: rec.parts,
    active: rec.active,
    rescue: rec.rescue,
    ratioDeviationPct: rec.ratioDeviationPct,
    tolerancePct: rec.tolerancePct,
    readabilityG: rec.readabilityG,
    lots: rec.lots,
    potLifeMin: d.potLifeMin,
    potLifeMassG: d.potLifeMassG,
    abandonReason: rec.abandonReason,
    interruptedReason: rec.interruptedReason,
    ...(rec.noGoReason ? { noGoReason: rec.noGoReason } : {}),
    steps: rec.steps,
    createdAt: row.createdAt.toISOString(),
    savedAt: rec.state === 'saved' ? (rec.steps.saved ?? null) : null,
    cost: batchCost(
      rec.parts.map((p) => p.actualG),
      d.costPerKg ?? undefined,
    ),
    ...(trace ? { trace } : {}),
  };
}

export interface BatchListFilter {
  benchId?: string;
  state?: BatchState;
  limit: number;
}

/** The batch store seen by the rest of the hub. A test gives the rooms a fake of it. */
export interface BatchStore {
  insert(values: NewBatchRow): Promise<BatchRow>;
  /** Writes a record's new state (and the trace so far) and answers the row as stored. */
  writeRecord(
    id: number,
    rec: BatchRecord,
    detail: BatchDetail,
    trace: readonly TracePoint[],
  ): Promise<BatchRow>;
  writeTrace(id: number, trace: readonly TracePoint[]): Promise<void>;
  findById(id: number): Promise<BatchRow | undefined>;
  /**
   * Batches being weighed or interrupted: the ones a bench still has open; with `hubId`, only
   * at the benches whose scales that hub reads.
   */
  findOpen(hubId?: string): Promise<BatchRow[]>;
  list(filter: BatchListFilter): Promise<BatchRow[]>;
}

/**
 * Work another feature stores in the same transaction as a batch's new state (alerts queue
 * their mails), so both are written or neither. It gets the row as it will be committed.
 */
export type BatchWriteHook = (
  tx: DbOrTx,
  row: BatchRow,
  /** The state the row had before this write. */
  previousState: BatchState,
) => Promise<void> | undefined;
/** The SQL of a batch's life on its bench (the lead's desk has `BatchDeskRepository`). */
@Injectable()
export class BatchesRepository implements BatchStore {
  private readonly writeHooks: BatchWriteHook[] = [];

  constructor(@Inject(Database) private readonly database: Database) {}

  /** Runs `hook` inside the transaction of every write of a batch's state. */
  onRecordWrite(hook: BatchWriteHook): void {
    this.writeHooks.push(hook);
  }

  private get db() {
    return this.database.db;
  }

  /**
   * Inserts a batch under the next number after the highest one. Numbers are printed on cup
   * labels and an auditor asks about every gap; a sequence would skip the numbers it had cached
   * whenever the hub dies. Hubs sharing one server take the numbers in turn (an advisory lock
   * held to the end of the transaction), so none is given twice and none is skipped.
   */
  async insert(values: NewBatchRow): Promise<BatchRow> {
    return this.db.transaction(async (tx) => {
      await lockForTransaction(tx, ADVISORY_LOCKS.batchNumber);
      const [row] = await tx
        .insert(batches)
        .values({
          ...values,
          id: sql`(select coalesce(max(${batches.id}), 0) + 1 from ${batches})`,
        })
        .returning();
      return row!;
    });
  }

  async writeRecord(
    id: number,
    rec: BatchRecord,
    detail: BatchDetail,
    trace: readonly TracePoint[],
  ): Promise<BatchRow> {
    if (!this.writeHooks.length) return this.updateRecord(this.db, id, rec, detail, trace);
    return this.db.transaction(async (tx) => {
      const [before] = await tx
        .select({ state: batches.state })
        .from(batches)
        .where(eq(batches.id, id));
      const row = await this.updateRecord(tx, id, rec, detail, trace);
      for (const hook of this.writeHooks) await hook(tx, row, before?.state ?? row.state);
      return row;
    });
  }

  private async updateRecord(
    db: DbOrTx,
    id: number,
    rec: BatchRecord,
    detail: BatchDetail,
    trace: readonly TracePoint[],
  ): Promise<BatchRow> {
    const [row] = await db
      .update(batches)
      .set({
        state: rec.state,
        resumeState: rec.resumeState,
        verdict: rec.verdict,
        ratioDeviationPct: rec.ratioDeviationPct,
        abandonReason: rec.abandonReason,
        interruptedReason: rec.interruptedReason,
        detail,
        trace: encodeTrace(trace),
        updatedAt: new Date(),
        savedAt: rec.state === 'saved' ? new Date(rec.steps.saved ?? Date.now()) : null,
      })
      .where(eq(batches.id, id))
      .returning();
    return row!;
  }

  async writeTrace(id: number, trace: readonly TracePoint[]): Promise<void> {
    await this.db
      .update(batches)
      .set({ trace: encodeTrace(trace), updatedAt: new Date() })
      .where(eq(batches.id, id));
  }

  async findById(id: number): Promise<BatchRow | undefined> {
    const [row] = await this.db.select().from(batches).where(eq(batches.id, id));
    return row;
  }

  findOpen(hubId?: string): Promise<BatchRow[]> {
    const open = inArray(batches.state, [...WEIGHING_STATES, 'interrupted']);
    if (hubId === undefined) return this.db.select().from(batches).where(open);
    return this.db
      .select(getTableColumns(batches))
      .from(batches)
      .innerJoin(benches, eq(benches.id, batches.benchId))
      .where(and(open, eq(benches.hubId, hubId)));
  }

  /** Number, state and verdict of the batches saved or abandoned since `since`. */
  outcomesSince(
    since: Date,
  ): Promise<Array<Pick<BatchRow, 'id' | 'state' | 'verdict' | 'benchId' | 'materialName'>>> {
    return this.db
      .select({
        id: batches.id,
        state: batches.state,
        verdict: batches.verdict,
        benchId: batches.benchId,
        materialName: batches.materialName,
      })
      .from(batches)
      .where(and(inArray(batches.state, ['saved', 'abandoned']), gte(batches.updatedAt, since)))
      .orderBy(batches.id);
  }

  list(filter: BatchListFilter): Promise<BatchRow[]> {
    const where: SQL[] = [];
    if (filter.benchId) where.push(eq(batches.benchId, filter.benchId));
    if (filter.state) where.push(eq(batches.state, filter.state));
    return this.db
      .select()
      .from(batches)
      .where(where.length ? and(...where) : undefined)
      .orderBy(desc(batches.id))
      .limit(filter.limit);
  }
}
