/**
 * Invented batch history for a data folder: a few benches, materials and operators of the
 * invented shop, and N batches spread over the past, written in COPY chunks. Used by
 * `npm run seed:batches` and by the review benchmark; the accuracy roll-up is rebuilt at the end
 * (bulk rows do not pass through the transaction that counts a batch as it is saved).
 */
import { ratioDeviationPct } from '@tareline/protocol';
import { stringify } from 'csv-stringify/sync';
import { getTableColumns, sql } from 'drizzle-orm';
import { rebuildAccuracyDays } from '../src/batches/batch-desk.repository.js';
import type { BatchDetail, NewBatchRow } from '../src/batches/batches.repository.js';
import type { Database } from '../src/database/database.js';
import { batchDispositions, batches, benches, materials } from '../src/database/schema/index.js';

/** Batches per COPY chunk (about 10 MB of CSV): memory stays small whatever N is. */
const ROWS_PER_INSERT = 10_000;

export const SEED_BENCHES = [
  { id: 'seed-bench-1', name: 'Mould shop bench', scaleUrl: 'sim://' },
  { id: 'seed-bench-2', name: 'Pattern bench', scaleUrl: 'sim://' },
  { id: 'seed-bench-3', name: 'Laminating bench', scaleUrl: 'sim://' },
] as const;

export const SEED_MATERIALS = [
  { id: 'seed-mat-urethane-60a', name: 'Casting urethane 60A', ratio: [100, 14], tolerancePct: 1 },
  { id: 'seed-mat-silicone-25a', name: 'Mould silicone 25A', ratio: [100, 10], tolerancePct: 2 },
  { id: 'seed-mat-epoxy-lam', name: 'Laminating epoxy', ratio: [100, 27], tolerancePct: 1 },
  {
    id: 'seed-mat-urethane-1to1',
    name: 'Rigid urethane 1:1',
    ratio: [100, 100],
    tolerancePct: 1.5,
  },
  { id: 'seed-mat-epoxy-clear', name: 'Clear casting epoxy', ratio: [100, 45], tolerancePct: 0.5 },
] as const;

/** Invented operators; `drift` is their habit, in percent of the ratio (most have none). */
export const SEED_OPERATORS = [
  { id: 'seed-op-01', name: 'Aino Brackley', drift: 0 },
  { id: 'seed-op-02', name: 'Bram Ostergaard', drift: 0.1 },
  { id: 'seed-op-03', name: 'Cato Whinmoor', drift: 0 },
  { id: 'seed-op-04', name: 'Dilys Farrant', drift: -0.15 },
  { id: 'seed-op-05', name: 'Emeric Holloway', drift: 0 },
  { id: 'seed-op-06', name: 'Fenna Quayle', drift: 0.35 },
  { id: 'seed-op-07', name: 'Gwil Ardent', drift: 0 },
  { id: 'seed-op-08', name: 'Hester Lannigan', drift: 0.05 },
  { id: 'seed-op-09', name: 'Ivo Carrow', drift: 0 },
  { id: 'seed-op-10', name: 'Juno Pellam', drift: -0.05 },
] as const;

const SEED_LEAD = { id: 'seed-lead', name: 'Rhoswen Tarrant' };

export interface SeedOptions {
  count: number;
  /** The newest batch's time; the others go back from it, one every `spacingMin`. */
  end?: Date;
  spacingMin?: number;
  /** Same seed, same batches. */
  seed?: number;
  onProgress?: (written: number) => void;
}

export interface SeedResult {
  firstId: number;
  lastId: number;
  saved: number;
  abandoned: number;
  noGo: number;
  dispositions: number;
}

/** A small deterministic generator (a linear congruential one), so a seed gives the same batches. */
export function random(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1_664_525) + 1_013_904_223) >>> 0;
    return s / 2 ** 32;
  };
}

/** A standard normal draw (Box–Muller). */
function normal(next: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
}

const round2 = (g: number) => Math.round(g * 100) / 100;

/** Writes the benches, materials and N batches (with some decisions) into an open database. */
export async function seedBatches(database: Database, options: SeedOptions): Promise<SeedResult> {
  const db = database.db;
  const next = random(options.seed ?? 20_260_101);
  const spacingMs = (options.spacingMin ?? 5) * 60_000;
  const end = (options.end ?? new Date()).getTime();
  await db
    .insert(benches)
    .values(SEED_BENCHES.map((b) => ({ ...b })))
    .onConflictDoNothing();
  await db
    .insert(materials)
    .values(
      SEED_MATERIALS.map((m) => ({
        id: m.id,
        name: m.name,
        ratioBasis: 'weight' as const,
        ratioParts: [...m.ratio],
        tolerancePct: m.tolerancePct,
        partLabels: ['Part A', 'Part B'],
      })),
    )
    .onConflictDoNothing();
  const [top] = await db.select({ max: sql<number | null>`max(${batches.id})` }).from(batches);
  const firstId = Number(top?.max ?? 0) + 1;
  const result: SeedResult = {
    firstId,
    lastId: firstId + options.count - 1,
    saved: 0,
    abandoned: 0,
    noGo: 0,
    dispositions: 0,
  };

  for (let first = 0; first < options.count; first += ROWS_PER_INSERT) {
    const rows: NewBatchRow[] = [];
    const decisions: (typeof batchDispositions.$inferInsert)[] = [];
    for (let i = first; i < Math.min(options.count, first + ROWS_PER_INSERT); i += 1) {
      const id = firstId + i;
      const createdAt = new Date(end - (options.count - 1 - i) * spacingMs);
      const row = inventBatch(next, id, createdAt);
      rows.push(row);
      if (row.state === 'abandoned') result.abandoned += 1;
      else result.saved += 1;
      if (row.verdict === 'NO-GO') result.noGo += 1;
      const decision = inventDecision(next, row);
      if (decision) decisions.push({ batchId: id, ...decision });
    }
    await copyBatches(database, rows);
    if (decisions.length) await db.insert(batchDispositions).values(decisions);
    result.dispositions += decisions.length;
    options.onProgress?.(Math.min(options.count, first + ROWS_PER_INSERT));
  }
  // Numbers taken by hand from here on must follow the seeded ones.
  await db.execute(
    sql`select setval(pg_get_serial_sequence('batches', 'id'), (select max(id) from batches))`,
  );
  await rebuildAccuracyDays(db);
  return result;
}

const COPY_COLUMNS = Object.entries(getTableColumns(batches)).filter(([key]) => key !== 'trace');

/**
 * Writes batches with one COPY (PGlite reads the CSV from a blob): several times faster than
 * multi-row INSERTs, which bind twenty parameters a row.
 */
async function copyBatches(database: Database, rows: readonly NewBatchRow[]): Promise<void> {
  const csv = stringify(
    rows.map((row) =>
      COPY_COLUMNS.map(([key]) => {
        const v = row[key as keyof NewBatchRow];
        if (v === null || v === undefined) return null;
        if (v instanceof Date) return v.toISOString();
        return typeof v === 'object' ? JSON.stringify(v) : v;
      }),
    ),
  );
  await database.copyCsv(
    'batches',
    COPY_COLUMNS.map(([, c]) => c.name),
    csv,
  );
}

function inventBatch(next: () => number, id: number, createdAt: Date): NewBatchRow {
  const material = SEED_MATERIALS[Math.floor(next() * SEED_MATERIALS.length)]!;
  const bench = SEED_BENCHES[Math.floor(next() * SEED_BENCHES.length)]!;
  const operator = SEED_OPERATORS[Math.floor(next() * SEED_OPERATORS.length)]!;
  const totalMassG = Math.round(100 + next() * 1900);
  const [ra, rb] = material.ratio;
  const targets = [(totalMassG * ra) / (ra + rb), (totalMassG * rb) / (ra + rb)].map(round2);
  // Most pours land close: SD a sixth of the tolerance, plus the operator's habit; one in ten
  // is a slip with an SD of the whole tolerance (most of the NO-GO batches, a few percent).
  const slip = next() < 1 / 10 ? 6 : 1;
  const wanted = operator.drift + normal(next) * (material.tolerancePct / 6) * slip;
  const actualA = round2(targets[0]! * (1 + normal(next) * 0.002));
  const actualB = round2(((actualA * rb) / ra) * (1 + wanted / 100));
  const abandoned = next() < 0.03;
  const rescued = !abandoned && next() < 0.02;
  const dev = abandoned ? null : ratioDeviationPct(material.ratio, [actualA, actualB]);
  const verdict = dev === null ? null : Math.abs(dev) <= material.tolerancePct ? 'GO' : 'NO-GO';
  const at = createdAt.toISOString();
  const savedAt = new Date(createdAt.getTime() + (4 + next() * 6) * 60_000);
  const lotA = `${material.id.slice(9, 12).toUpperCase()}-A${2400 + Math.floor(next() * 60)}`;
  const lotB = `${material.id.slice(9, 12).toUpperCase()}-B${2400 + Math.floor(next() * 60)}`;
  const detail: BatchDetail = {
    parts: [
      { label: 'Part A', targetG: targets[0]!, actualG: actualA },
      { label: 'Part B', targetG: targets[1]!, actualG: abandoned ? null : actualB },
    ],
    active: null,
    topUpQueue: [],
    rescue: null,
    steps: {
      created: at,
      ...(rescued ? { rescueTaken: at } : {}),
      ...(abandoned ? { abandoned: at } : { saved: savedAt.toISOString() }),
    },
    lots: [
      { part: 0, code: lotA, lotId: null, warnings: [] },
      { part: 1, code: lotB, lotId: null, warnings: [] },
    ],
    potLifeMin: null,
    potLifeMassG: null,
  } as unknown as BatchDetail;
  return {
    id,
    benchId: bench.id,
    operatorId: operator.id,
    operatorName: operator.name,
    materialId: material.id,
    materialName: material.name,
    state: abandoned ? 'abandoned' : 'saved',
    verdict,
    totalMassG,
    weightRatio: [...material.ratio],
    tolerancePct: material.tolerancePct,
    readabilityG: 0.01,
    ratioDeviationPct: dev,
    abandonReason: abandoned ? 'Cup knocked over' : null,
    detail,
    createdAt,
    updatedAt: abandoned ? createdAt : savedAt,
    savedAt: abandoned ? null : savedAt,
  };
}

/** Most NO-GO batches get a decision within the hour; a few GO ones are held for a look. */
function inventDecision(
  next: () => number,
  row: NewBatchRow,
): Omit<typeof batchDispositions.$inferInsert, 'batchId'> | null {
  if (row.state !== 'saved') return null;
  const r = next();
  const at = new Date((row.createdAt as Date).getTime() + 30 * 60_000);
  const by = { byId: SEED_LEAD.id, byName: SEED_LEAD.name, at };
  if (row.verdict === 'NO-GO') {
    if (r < 0.4) return { decision: 'scrap', reason: 'Off ratio: soft spots likely', ...by };
    if (r < 0.7) return { decision: 'hold', reason: 'Test coupon before use', ...by };
    if (r < 0.85) return { decision: 'release', reason: 'Coupon cured hard: fit for use', ...by };
    return null;
  }
  if (r < 0.005) return { decision: 'hold', reason: 'Checking the lot', ...by };
  return null;
}
