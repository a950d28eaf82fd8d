import { Inject, Injectable, type OnModuleInit } from '@nestjs/common';
import type {
  AccuracyRow,
  BatchSort,
  BatchState,
  BatchVerdict,
  Disposition,
  DispositionDecision,
} from '@tareline/protocol';
import { and, asc, desc, eq, getTableColumns, gte, lt, sql, type SQL } from 'drizzle-orm';
import type { Tx } from '../audit/audit.repository.js';
import { Database, type DbOrTx } from '../database/database.js';
import {
  ACCURACY_BIN_PCT,
  ACCURACY_BINS,
  accuracyDays,
  batchDispositions,
  batches,
  benches,
  lotCodesKey,
} from '../database/schema/index.js';
import { BatchesRepository, type BatchRow } from './batches.repository.js';

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

export interface AccuracyQuery {
  groupBy: 'material' | 'bench' | 'operator';
  bucket: 'day' | 'week';
  from?: string | undefined;
  to?: string | undefined;
}

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

/** The 1-based histogram bin of a deviation, the same expression wherever a batch is counted. */
// Multiplied, not divided by the width: 1.2 / 0.05 is 23.999… in floating point, 1.2 × 20 is 24.
const binOf = (dev: SQL) =>
  sql`least(floor(abs(${dev}) * ${sql.raw(String(1 / ACCURACY_BIN_PCT))})::int, ${sql.raw(
    String(ACCURACY_BINS - 1),
  )}) + 1`;

/** `date_trunc` of a day or week, UTC, as a literal: GROUP BY must see the select's expression. */
const truncTo = (bucket: 'day' | 'week', value: SQL | AnyTime) =>
  sql`date_trunc(${sql.raw(bucket === 'day' ? `'day'` : `'week'`)}, ${value}, 'UTC')`;
type AnyTime = typeof batches.createdAt | typeof accuracyDays.day;

const isMidnightUtc = (iso: string | undefined) =>
  iso === undefined || new Date(iso).getTime() % 86_400_000 === 0;

/**
 * Above this many saved batches in the asked range, accuracy is read from the daily roll-up
 * (p95 from its histogram); at or below it, from the batches themselves (p95 exact).
 */
export const EXACT_ACCURACY_MAX = 50_000;

/**
 * The SQL of the lead's desk: batch search (filters, sorts, keyset pages, CSV pages), decisions
 * and accuracy, with the daily roll-up that keeps accuracy over years fast.
 */
@Injectable()
export class BatchDeskRepository implements OnModuleInit {
  /** Tests lower it to take the roll-up path on a few batches. */
  exactAccuracyMax = EXACT_ACCURACY_MAX;

  constructor(
    @Inject(Database) private readonly database: Database,
    @Inject(BatchesRepository) private readonly batchStore: BatchesRepository,
  ) {}

  onModuleInit(): void {
    this.batchStore.onRecordWrite((tx, row, previousState) =>
      row.state === 'saved' && previousState !== 'saved' ? this.countSaved(tx, row) : undefined,
    );
  }

  private get db() {
    return this.database.db;
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
      // Containment on the GIN-indexed expression: any of the batch's codes, letter case folded.
      where.push(sql`${lotCodesKey(batches.detail)} @> jsonb_build_array(lower(${q.lot}::text))`);
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

  /**
   * Saved batches per group and UTC day or week, computed by PostgreSQL: count, GO share, mean
   * and sample standard deviation of the deviation, the 95th percentile of its magnitude, and
   * the batches where a rescue was taken. A range of whole UTC days holding more than
   * {@link exactAccuracyMax} saved batches is read from the daily roll-up; anything else from the
   * batches (exact `percentile_cont`).
   */
  async accuracy(q: AccuracyQuery): Promise<AccuracyRow[]> {
    if (isMidnightUtc(q.from) && isMidnightUtc(q.to)) {
      const [row] = await this.db
        .select({ n: sql<number>`coalesce(sum(${accuracyDays.n}), 0)::int` })
        .from(accuracyDays)
        .where(and(...this.rollUpWhere(q)));
      if ((row?.n ?? 0) > this.exactAccuracyMax) return this.accuracyFromRollUp(q);
    }
    return this.accuracyFromBatches(q);
  }

  private rollUpWhere(q: AccuracyQuery): SQL[] {
    const where: SQL[] = [eq(accuracyDays.kind, q.groupBy)];
    if (q.from) where.push(gte(accuracyDays.day, new Date(q.from)));
    if (q.to) where.push(lt(accuracyDays.day, new Date(q.to)));
    return where;
  }

  /** Accuracy from the batches themselves: the percentile exact (`percentile_cont`). */
  async accuracyFromBatches(q: AccuracyQuery): Promise<AccuracyRow[]> {
    const [groupId, groupName] = {
      material: [batches.materialId, sql`max(${batches.materialName})`],
      bench: [batches.benchId, sql`coalesce(max(${benches.name}), ${batches.benchId})`],
      operator: [batches.operatorId, sql`max(${batches.operatorName})`],
    }[q.groupBy];
    const bucketStart = truncTo(q.bucket, batches.createdAt);
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

  /**
   * Accuracy from the daily roll-up (whole UTC days only). Count, GO share, rescues and mean are
   * exact; the sample SD comes from the sums, √((Σx² − (Σx)²/n) / (n − 1)), exact up to floating
   * point (deviations are a few percent, so the cancellation is harmless); the 95th percentile
   * is read from the summed histogram ({@link p95FromHistogram}).
   */
  async accuracyFromRollUp(q: AccuracyQuery): Promise<AccuracyRow[]> {
    const a = accuracyDays;
    const bucketStart = truncTo(q.bucket, a.day);
    const n = sql`sum(${a.n})`;
    const histSums = sql.join(
      Array.from(
        { length: ACCURACY_BINS },
        (_, i) => sql`sum(${a.hist}[${sql.raw(String(i + 1))}])`,
      ),
      sql`, `,
    );
    const groupName =
      q.groupBy === 'bench'
        ? sql`coalesce(max(${benches.name}), ${a.groupId})`
        : sql`coalesce(max(${a.groupName}), ${a.groupId})`;
    const rows = await this.db
      .select({
        groupId: a.groupId,
        groupName: sql<string>`${groupName}`,
        bucketStart: sql<Date>`${bucketStart}`.mapWith((v: string | Date) => new Date(v)),
        count: sql<number>`${n}::int`,
        goShare: sql<number>`(sum(${a.go})::float8 / ${n})`,
        mean: sql<number>`(sum(${a.sumDev}) / ${n})::float8`,
        sd: sql<number | null>`case when ${n} > 1 then sqrt(greatest(0,
          (sum(${a.sumSq}) - sum(${a.sumDev}) ^ 2 / ${n}) / (${n} - 1)))::float8 end`,
        maxAbs: sql<number>`max(${a.maxAbs})::float8`,
        hist: sql<number[]>`array[${histSums}]::int[]`,
        rescues: sql<number>`sum(${a.rescues})::int`,
      })
      .from(a)
      .leftJoin(benches, and(eq(a.kind, 'bench'), eq(benches.id, a.groupId)))
      .where(and(...this.rollUpWhere(q)))
      .groupBy(a.groupId, bucketStart)
      .orderBy(asc(a.groupId), asc(bucketStart));
    return rows.map((r) => ({
      groupId: r.groupId,
      groupName: r.groupName,
      bucketStart: r.bucketStart.toISOString(),
      count: r.count,
      goShare: Number(r.goShare),
      meanDeviationPct: Number(r.mean),
      sdDeviationPct: r.sd === null ? null : Number(r.sd),
      p95AbsDeviationPct: p95FromHistogram(r.hist.map(Number), Number(r.maxAbs)),
      rescues: r.rescues,
    }));
  }

  /**
   * Counts a batch just saved in the roll-up, in the transaction that saves it: one upsert per
   * material, bench and operator for its UTC day.
   */
  private async countSaved(tx: DbOrTx, row: BatchRow): Promise<void> {
    const dev = row.ratioDeviationPct ?? 0;
    const go = row.verdict === 'GO' ? 1 : 0;
    const rescued = sql`jsonb_exists(${JSON.stringify(row.detail)}::jsonb->'steps', 'rescueTaken')::int`;
    const bin = binOf(sql`${dev}::float8`);
    const day = sql`date_trunc('day', ${row.createdAt.toISOString()}::timestamptz, 'UTC')`;
    const groups: Array<[string, string, string | null]> = [
      ['material', row.materialId, row.materialName],
      ['bench', row.benchId, null],
      ['operator', row.operatorId, row.operatorName],
    ];
    const values = sql.join(
      groups.map(
        ([kind, id, name]) => sql`(${kind}, ${id}, ${day}, ${name}, 1, ${go}, ${rescued},
          ${dev}::float8, ${dev}::float8 * ${dev}::float8, abs(${dev}::float8),
          (select array_agg(case when i = ${bin} then 1 else 0 end order by i)
             from generate_series(1, ${sql.raw(String(ACCURACY_BINS))}) i))`,
      ),
      sql`, `,
    );
    await tx.execute(sql`
      insert into ${accuracyDays} as a
        (kind, group_id, day, group_name, n, go, rescues, sum_dev, sum_sq, max_abs, hist)
      values ${values}
      on conflict (kind, group_id, day) do update set
        group_name = coalesce(excluded.group_name, a.group_name),
        n = a.n + 1,
        go = a.go + excluded.go,
        rescues = a.rescues + excluded.rescues,
        sum_dev = a.sum_dev + excluded.sum_dev,
        sum_sq = a.sum_sq + excluded.sum_sq,
        max_abs = greatest(a.max_abs, excluded.max_abs),
        hist[${bin}] = a.hist[${bin}] + 1`);
  }

  /**
   * Rebuilds the roll-up from the batches table in one statement: after a bulk load (the seed
   * script, tests that insert rows directly) that did not go through {@link countSaved}.
   */
  rebuildAccuracyDays(): Promise<void> {
    return rebuildAccuracyDays(this.db);
  }
}

/** Empties the roll-up and counts every saved batch again (see `rebuildAccuracyDays`). */
export async function rebuildAccuracyDays(db: DbOrTx): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.execute(sql`delete from ${accuracyDays}`);
    await tx.execute(rebuildAccuracyDaysSql());
  });
}

/** The roll-up of every saved batch, as one INSERT … SELECT (also the backfill migration's). */
export function rebuildAccuracyDaysSql(): SQL {
  const b = batches;
  const counts = sql.join(
    Array.from(
      { length: ACCURACY_BINS },
      (_, i) => sql`count(*) filter (where bin = ${sql.raw(String(i + 1))})::int`,
    ),
    sql`, `,
  );
  return sql`
    insert into ${accuracyDays}
      (kind, group_id, day, group_name, n, go, rescues, sum_dev, sum_sq, max_abs, hist)
    select kind, group_id, day, max(group_name), count(*)::int,
      (count(*) filter (where verdict = 'GO'))::int, (count(*) filter (where rescued))::int,
      sum(dev), sum(dev * dev), max(abs(dev)), array[${counts}]
    from (
      select g.kind, g.group_id, g.group_name, ${b.verdict} as verdict,
        coalesce(${b.ratioDeviationPct}, 0) as dev,
        jsonb_exists(${b.detail}->'steps', 'rescueTaken') as rescued,
        date_trunc('day', ${b.createdAt}, 'UTC') as day,
        ${binOf(sql`coalesce(${b.ratioDeviationPct}, 0)`)} as bin
      from ${b}
      cross join lateral (values
        ('material', ${b.materialId}, ${b.materialName}),
        ('bench', ${b.benchId}, null),
        ('operator', ${b.operatorId}, ${b.operatorName})) as g(kind, group_id, group_name)
      where ${b.state} = 'saved'
    ) s
    group by kind, group_id, day`;
}

/**
 * The 95th percentile of |deviation| from a histogram of fixed bins: the bin where the
 * cumulative count reaches 0.95 n, interpolated linearly inside it (the usual percentile of
 * grouped data: L + (0.95 n − F) / f × w), and never above the largest |deviation| seen. The
 * last bin runs from its lower edge to that largest value. Off from the exact percentile by at
 * most one bin width (0.05 percentage points) plus, in small samples, the gap between the two
 * batches around the 95th.
 */
export function p95FromHistogram(hist: readonly number[], maxAbs: number): number | null {
  const n = hist.reduce((s, c) => s + c, 0);
  if (n === 0) return null;
  const rank = 0.95 * n;
  let below = 0;
  for (let i = 0; i < hist.length; i += 1) {
    const f = hist[i]!;
    if (f > 0 && below + f >= rank) {
      const lower = i / (1 / ACCURACY_BIN_PCT);
      const upper =
        i === hist.length - 1 ? Math.max(maxAbs, lower) : (i + 1) / (1 / ACCURACY_BIN_PCT);
      return Math.min(maxAbs, lower + ((rank - below) / f) * (upper - lower));
    }
    below += f;
  }
  return maxAbs;
}
