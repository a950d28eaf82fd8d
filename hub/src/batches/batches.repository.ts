import { Inject, Injectable } from '@nestjs/common';
import {
  WEIGHING_STATES,
  type AccuracyRow,
  type Batch,
  type BatchSort,
  type BatchState,
  type BatchVerdict,
  type Disposition,
  type DispositionDecision,
} from '@tareline/protocol';
import { and, asc, desc, eq, getTableColumns, gte, inArray, lt, sql, type SQL } from 'drizzle-orm';
import type { Tx } from '../audit/audit.repository.js';
import { ADVISORY_LOCKS, Database, lockForTransaction, type DbOrTx } from '../database/database.js';
import { batchDispositions, batches, benches } from '../database/schema/index.js';
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
  handledBy?: NonNullable<Batch['handledBy']>;
  /** The hub restarted mid-pour: the balance's tare may be gone, so resume asks again. */
  tareLost?: boolean;
  /** Gross on the balance when the active pour was tared (the cup and earlier parts). */
  tareGrossG?: number;
  noGoReason?: string | null;
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
  keep: Pick<BatchDetail, 'potLifeMin' | 'potLifeMassG' | 'handledBy' | 'tareLost' | 'tareGrossG'>,
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
    ...(keep.handledBy ? { handledBy: keep.handledBy } : {}),
    ...(keep.tareLost ? { tareLost: true } : {}),
    ...(keep.tareGrossG !== undefined ? { tareGrossG: keep.tareGrossG } : {}),
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
    operator: { id: row.operatorId, name: row.operatorName },
    ...(d.handledBy?.length ? { handledBy: d.handledBy } : {}),
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
    ...(trace ? { trace } : {}),
  };
}

export interface BatchListFilter {
  benchId?: string;
  state?: BatchState;
  limit: number;
}

/** What a lead looks for; every field narrows the list. */
export interface BatchSearch {
  from?: string;
  to?: string;
  materialId?: string;
  benchId?: string;
  operatorId?: string;
  verdict?: BatchVerdict;
  state?: BatchState;
  disposition?: DispositionDecision | 'none';
  lot?: string;
  sort: BatchSort;
  /** The sort key and id of the last row of the page before (see {@link SearchRow}). */
  after?: { key: string | null; id: number };
  limit: number;
}

/** A row of a search: the batch without its trace, its latest decision, and its sort key. */
export interface SearchRow {
  row: BatchRow;
  benchName: string | null;
  disposition: DispositionDecision | null;
  /** The sort key as PostgreSQL prints it, exact (timestamps to the microsecond). */
  key: string | null;
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
export type BatchWriteHook = (tx: DbOrTx, row: BatchRow) => Promise<void>;
const { trace: _trace, ...summaryColumns } = getTableColumns(batches);

/** The latest decision on the batch of the outer query. */
const latestDisposition = sql<DispositionDecision | null>`(
  select ${batchDispositions.decision} from ${batchDispositions}
  where ${batchDispositions.batchId} = ${batches.id}
  order by ${batchDispositions.id} desc limit 1)`;

/**
 * The key each sort orders by, ties broken by number. A batch without a deviation (abandoned,
 * still weighing) sorts last either way: its key is the infinity at the far end.
 */
function sortKey(sort: BatchSort): { key: SQL; cast: SQL; descending: boolean } {
  const descending = sort.startsWith('-');
  const last = descending ? sql`'-Infinity'::float8` : sql`'Infinity'::float8`;
  switch (sort.replace(/^-/, '')) {
    case 'createdAt':
      return { key: sql`${batches.createdAt}`, cast: sql`timestamptz`, descending };
    case 'ratioDeviationPct':
      return {
        key: sql`coalesce(${batches.ratioDeviationPct}, ${last})`,
        cast: sql`float8`,
        descending,
      };
    default:
      return {
        key: sql`coalesce(abs(${batches.ratioDeviationPct}), ${last})`,
        cast: sql`float8`,
        descending,
      };
  }
}

/** The only place that talks SQL about batches. */
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
      const row = await this.updateRecord(tx, id, rec, detail, trace);
      for (const hook of this.writeHooks) await hook(tx, row);
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

  /** A page of batches matching a lead's filters, in the asked order, after a cursor. */
  async search(q: BatchSearch): Promise<SearchRow[]> {
    const { key, cast, descending } = sortKey(q.sort);
    const where: SQL[] = [];
    if (q.from) where.push(gte(batches.createdAt, new Date(q.from)));
    if (q.to) where.push(lt(batches.createdAt, new Date(q.to)));
    if (q.materialId) where.push(eq(batches.materialId, q.materialId));
    if (q.benchId) where.push(eq(batches.benchId, q.benchId));
    if (q.operatorId) where.push(eq(batches.operatorId, q.operatorId));
    if (q.verdict) where.push(eq(batches.verdict, q.verdict));
    if (q.state) where.push(eq(batches.state, q.state));
    if (q.disposition === 'none') where.push(sql`${latestDisposition} is null`);
    else if (q.disposition) where.push(sql`${latestDisposition} = ${q.disposition}`);
    if (q.lot) {
      where.push(sql`exists (select 1 from jsonb_array_elements(${batches.detail}->'lots') l
        where lower(l->>'code') = lower(${q.lot}))`);
    }
    if (q.after) {
      // A null key is the sort's far infinity, which PostgreSQL reads back from its own text.
      const value = q.after.key ?? (descending ? '-Infinity' : 'Infinity');
      const op = descending ? sql`<` : sql`>`;
      where.push(sql`(${key}, ${batches.id}) ${op} (${value}::${cast}, ${q.after.id})`);
    }
    const order = descending ? desc : asc;
    const rows = await this.db
      .select({
        ...summaryColumns,
        benchName: benches.name,
        disposition: latestDisposition,
        key: sql<string | null>`${key}::text`,
      })
      .from(batches)
      .leftJoin(benches, eq(benches.id, batches.benchId))
      .where(where.length ? and(...where) : undefined)
      .orderBy(order(key), order(batches.id))
      .limit(q.limit);
    return rows.map(({ disposition, key: k, benchName, ...row }) => ({
      row: { ...row, trace: null },
      benchName,
      disposition: disposition ?? null,
      key: k === 'Infinity' || k === '-Infinity' ? null : k,
    }));
  }

  /** Appends a decision, in the caller's transaction (the audit trail appends in the same). */
  async insertDisposition(tx: Tx, values: typeof batchDispositions.$inferInsert): Promise<void> {
    await tx.insert(batchDispositions).values(values);
  }

  /**
   * Saved batches per group and UTC day or week, all figures computed by PostgreSQL: count, GO
   * share, mean and sample standard deviation of the deviation, the 95th percentile of its
   * magnitude (`percentile_cont`, interpolated), and the batches where a rescue was taken.
   */
  async accuracy(q: {
    groupBy: 'material' | 'bench' | 'operator';
    bucket: 'day' | 'week';
    from?: string | undefined;
    to?: string | undefined;
  }): Promise<AccuracyRow[]> {
    const [groupId, groupName] = {
      material: [batches.materialId, sql`max(${batches.materialName})`],
      bench: [batches.benchId, sql`coalesce(max(${benches.name}), ${batches.benchId})`],
      operator: [batches.operatorId, sql`max(${batches.operatorName})`],
    }[q.groupBy];
    // A literal, not a parameter: GROUP BY must see the same expression as the select list.
    const unit = sql.raw(q.bucket === 'day' ? `'day'` : `'week'`);
    const bucketStart = sql`date_trunc(${unit}, ${batches.createdAt}, 'UTC')`;
    const where: SQL[] = [eq(batches.state, 'saved')];
    if (q.from) where.push(gte(batches.createdAt, new Date(q.from)));
    if (q.to) where.push(lt(batches.createdAt, new Date(q.to)));
    const dev = batches.ratioDeviationPct;
    const rows = await this.db
      .select({
        groupId: sql<string>`${groupId}`,
        groupName: sql<string>`${groupName}`,
        bucketStart: sql<Date>`${bucketStart}`.mapWith((v: string | Date) => new Date(v)),
        count: sql<number>`count(*)::int`,
        goShare: sql<number>`avg(case when ${batches.verdict} = 'GO' then 1.0 else 0.0 end)::float8`,
        mean: sql<number | null>`avg(${dev})::float8`,
        sd: sql<number | null>`stddev_samp(${dev})::float8`,
        p95: sql<number | null>`percentile_cont(0.95) within group (order by abs(${dev}))`,
        rescues: sql<number>`(count(*) filter (where jsonb_exists(${batches.detail}->'steps', 'rescueTaken')))::int`,
      })
      .from(batches)
      .leftJoin(benches, eq(benches.id, batches.benchId))
      .where(and(...where))
      .groupBy(groupId, bucketStart)
      .orderBy(asc(groupId), asc(bucketStart));
    return rows.map((r) => ({
      groupId: r.groupId,
      groupName: r.groupName,
      bucketStart: r.bucketStart.toISOString(),
      count: r.count,
      goShare: Number(r.goShare),
      meanDeviationPct: r.mean === null ? null : Number(r.mean),
      sdDeviationPct: r.sd === null ? null : Number(r.sd),
      p95AbsDeviationPct: r.p95 === null ? null : Number(r.p95),
      rescues: r.rescues,
    }));
  }

  /** Every decision on a batch, oldest first. */
  async dispositions(batchId: number): Promise<Disposition[]> {
    const rows = await this.db
      .select()
      .from(batchDispositions)
      .where(eq(batchDispositions.batchId, batchId))
      .orderBy(asc(batchDispositions.id));
    return rows.map((r) => ({
      decision: r.decision,
      reason: r.reason,
      by: { id: r.byId, name: r.byName },
      at: r.at.toISOString(),
    }));
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
