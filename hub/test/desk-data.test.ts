import { execFile } from 'node:child_process';
import { resolve } from 'node:path';
import { promisify } from 'node:util';
import type {
  AccuracyAnswer,
  AccuracyRow,
  AuditPage,
  AuditVerify,
  BatchPage,
  Lot,
  Material,
  Person,
} from '@tareline/protocol';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SEED_MATERIALS } from '../scripts/batch-seed.js';
import {
  BatchDeskRepository,
  p95FromHistogram,
  rebuildAccuracyDays,
} from '../src/batches/batch-desk.repository.js';
import {
  BatchesRepository,
  detailFor,
  detailOf,
  recordOf,
} from '../src/batches/batches.repository.js';
import { Database } from '../src/database/database.js';
import { accuracyDays } from '../src/database/schema/index.js';
import { call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

const hubDir = resolve(import.meta.dirname, '..');
const SEEDED = 1200;

/** Runs `npm run seed:batches` as a person would (the script itself, through tsx). */
async function runSeedScript(dataDir: string, count: number): Promise<string> {
  const { stdout } = await promisify(execFile)(
    'npx',
    [
      'tsx',
      '--tsconfig',
      'tsconfig.json',
      '--conditions=@tareline/source',
      'scripts/seed-batches.ts',
      '--count',
      String(count),
      '--data-dir',
      dataDir,
      '--seed',
      '7',
    ],
    { cwd: hubDir, timeout: 120_000 },
  );
  return stdout;
}

describe('a data folder filled by the batch seed script', { timeout: 240_000 }, () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let lead: string;
  let admin: string;

  beforeAll(async () => {
    data = await tempDataDir();
    // The demo shop first (people to sign in with), as a hub's first start leaves it.
    await (await startTestHub(data.dir)).close();
    const out = await runSeedScript(data.dir, SEEDED);
    expect(out).toMatch(new RegExp(`Seeded batches 1–${SEEDED} into`));
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
  }, 240_000);

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  /** Every batch the list gives for `query`, page by page. */
  async function walk(query: string, limit: number): Promise<number[]> {
    const ids: number[] = [];
    let cursor: string | null = null;
    do {
      const answer: { status: number; body: BatchPage } = await call<BatchPage>(
        hub,
        'GET',
        `/api/batches?${query}&limit=${limit}${cursor ? `&cursor=${cursor}` : ''}`,
        { token: lead },
      );
      expect(answer.status).toBe(200);
      ids.push(...answer.body.items.map((b) => b.id));
      cursor = answer.body.nextCursor;
    } while (cursor);
    return ids;
  }

  it('holds N batches, each read once by a cursor walk in every order, none missed', async () => {
    const all = Array.from({ length: SEEDED }, (_, i) => i + 1);
    for (const sort of ['-createdAt', 'absDeviation', '-ratioDeviationPct']) {
      const ids = await walk(`sort=${sort}`, 97);
      expect(new Set(ids).size).toBe(ids.length);
      expect([...ids].sort((a, b) => a - b)).toEqual(all);
    }
  });

  it('gives a realistic mix: several materials, benches and operators, NO-GO, abandoned, decided', async () => {
    const database = hub.app.get(Database);
    const [mix] = await database.rows<{
      materials: number;
      benches: number;
      operators: number;
      nogo: number;
      abandoned: number;
      decided: number;
      near: number;
      saved: number;
    }>(sql`select count(distinct material_id)::int as materials,
        count(distinct bench_id)::int as benches, count(distinct operator_id)::int as operators,
        (count(*) filter (where verdict = 'NO-GO'))::int as nogo,
        (count(*) filter (where state = 'abandoned'))::int as abandoned,
        (select count(distinct batch_id)::int from batch_dispositions) as decided,
        (count(*) filter (where state = 'saved' and abs(ratio_deviation_pct) < 0.5))::int as near,
        (count(*) filter (where state = 'saved'))::int as saved
        from batches`);
    expect(mix).toMatchObject({ materials: 5, benches: 3, operators: 10 });
    expect(mix!.nogo).toBeGreaterThan(SEEDED * 0.01);
    expect(mix!.nogo).toBeLessThan(SEEDED * 0.1);
    expect(mix!.abandoned).toBeGreaterThan(0);
    expect(mix!.decided).toBeGreaterThan(0);
    // Mostly near the ratio.
    expect(mix!.near / mix!.saved).toBeGreaterThan(0.8);

    // The list agrees with the database on one material's NO-GO batches (filters on seeded data).
    const material = SEED_MATERIALS[2].id;
    const [count] = await database.rows<{ n: number }>(
      sql`select count(*)::int as n from batches where material_id = ${material} and verdict = 'NO-GO'`,
    );
    const ids = await walk(`materialId=${material}&verdict=NO-GO`, 50);
    expect(ids.length).toBe(count!.n);
  });

  it('finds a lot code whatever its letter case, through the lot index', async () => {
    const database = hub.app.get(Database);
    const [one] = await database.rows<{ code: string; n: number }>(sql`select l->>'code' as code,
        count(*) over (partition by lower(l->>'code'))::int as n
        from batches, jsonb_array_elements(detail->'lots') l limit 1`);
    const ids = await walk(`lot=${encodeURIComponent(one!.code.toLowerCase())}`, 200);
    expect(ids.length).toBe(one!.n);
  });

  it('answers accuracy from the roll-up as from the batches, the 95th within its bin error', async () => {
    const desk = hub.app.get(BatchDeskRepository);
    const q = { groupBy: 'material', bucket: 'week' } as const;
    const exact = await desk.accuracyFromBatches(q);
    const rolled = await desk.accuracyFromRollUp(q);
    expect(rolled.map((r) => [r.groupId, r.bucketStart, r.count, r.goShare, r.rescues])).toEqual(
      exact.map((r) => [r.groupId, r.bucketStart, r.count, r.goShare, r.rescues]),
    );
    const database = hub.app.get(Database);
    for (const [i, r] of rolled.entries()) {
      const e = exact[i]!;
      expect(r.meanDeviationPct).toBeCloseTo(e.meanDeviationPct!, 9);
      expect(r.sdDeviationPct).toBeCloseTo(e.sdDeviationPct!, 9);
      // The histogram's estimate and percentile_cont both lie between the batches next to the
      // 95th one (|dev| sorted); the histogram's may also be a bin width (0.05) off inside it.
      const sorted = (
        await database.rows<{ a: number }>(sql`select abs(ratio_deviation_pct) as a from batches
          where state = 'saved' and material_id = ${r.groupId}
          and date_trunc('week', created_at, 'UTC') = ${r.bucketStart}::timestamptz order by 1`)
      ).map((x) => Number(x.a));
      const j = Math.ceil(0.95 * sorted.length) - 1;
      const gap = sorted[Math.min(sorted.length - 1, j + 1)]! - sorted[Math.max(0, j - 1)]!;
      expect(Math.abs(r.p95AbsDeviationPct! - e.p95AbsDeviationPct!)).toBeLessThanOrEqual(
        0.05 + gap + 1e-12,
      );
    }
  });

  it('audits materials, lots and people with who changed them, and the chain still holds', async () => {
    const material = await call<Material>(hub, 'POST', '/api/materials', {
      token: lead,
      body: {
        name: 'Hollin test urethane 80A',
        ratio: { basis: 'weight', parts: [100, 20] },
        specificGravity: 1.05,
        tolerancePct: 1,
      },
    });
    expect(material.status, JSON.stringify(material.body)).toBe(201);
    const lot = await call<Lot>(hub, 'POST', '/api/lots', {
      token: lead,
      body: { materialId: material.body.id, part: 1, code: 'HT-B-0042', receivedG: 4000 },
    });
    expect(lot.status, JSON.stringify(lot.body)).toBe(201);
    const changed = await call(hub, 'PATCH', `/api/materials/${material.body.id}`, {
      token: lead,
      body: { tolerancePct: 0.5 },
    });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    const spilled = await call(hub, 'POST', `/api/lots/${lot.body.id}/adjustments`, {
      token: lead,
      body: { deltaG: -150, reason: 'Spilled while opening' },
    });
    expect(spilled.status, JSON.stringify(spilled.body)).toBe(201);
    const person = await call<Person>(hub, 'POST', '/api/people', {
      token: admin,
      body: { name: 'Wren Halloway', role: 'operator', badge: 'HR-1077' },
    });
    expect(person.status, JSON.stringify(person.body)).toBe(201);
    const renamed = await call<Person>(hub, 'PATCH', `/api/people/${person.body.id}`, {
      token: admin,
      body: { name: 'Wren Halloway-Brisk', active: false },
    });
    expect(renamed.status).toBe(200);
    const pin = await call(hub, 'PUT', `/api/people/${person.body.id}/pin`, {
      token: admin,
      body: { pin: '2468' },
    });
    expect(pin.status).toBe(200);

    const trail = async (entity: string, id: string) =>
      (
        await call<AuditPage>(hub, 'GET', `/api/audit?entity=${entity}&entityId=${id}`, {
          token: lead,
        })
      ).body.items;
    const leadName = 'Ilse Varga';
    const [m, m2] = await trail('material', material.body.id);
    expect(m2).toMatchObject({
      action: 'material.changed',
      actor: { name: leadName },
      data: { tolerancePct: 0.5 },
    });
    expect(m).toMatchObject({
      action: 'material.created',
      actor: { name: leadName },
      data: { name: 'Hollin test urethane 80A', ratioParts: [100, 20], tolerancePct: 1 },
    });
    const [l, l2] = await trail('lot', lot.body.id);
    expect(l2).toMatchObject({
      action: 'lot.adjusted',
      actor: { name: leadName },
      data: { deltaG: -150, reason: 'Spilled while opening' },
    });
    expect(l).toMatchObject({
      action: 'lot.created',
      actor: { name: leadName },
      data: { materialId: material.body.id, part: 1, code: 'HT-B-0042', receivedMg: 4_000_000 },
    });
    const p = await trail('person', person.body.id);
    expect(p.map((e) => [e.action, e.actor?.name])).toEqual([
      ['person.created', 'Oda Fenwick'],
      ['person.changed', 'Oda Fenwick'],
      ['person.pin', 'Oda Fenwick'],
    ]);
    expect(p[1]!.data).toMatchObject({
      before: { name: 'Wren Halloway', active: true },
      after: { name: 'Wren Halloway-Brisk', active: false },
    });
    // A secret never enters the trail, not even hashed.
    expect(JSON.stringify(p.map((e) => e.data))).not.toMatch(/2468|HR-1077|badgeHash|pinHash|\$/);

    const verify = await call<AuditVerify>(hub, 'GET', '/api/audit/verify', { token: lead });
    expect(verify.body).toMatchObject({ ok: true, firstBrokenId: null });
  });
});

describe('the accuracy roll-up kept as batches are saved', { timeout: 120_000 }, () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let lead: string;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
  }, 120_000);

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  /** Starts a batch and saves it through the store's write (and so its roll-up hook). */
  async function saveBatch(at: string, dev: number, verdict: 'GO' | 'NO-GO', rescued = false) {
    const store = hub.app.get(BatchesRepository);
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: lead });
    const material = materials.body[0]!;
    const row = await store.insert({
      benchId: 'bench-1',
      operatorId: 'p-roll',
      operatorName: 'Operator roll-up',
      materialId: material.id,
      materialName: material.name,
      state: 'weighing-b',
      totalMassG: 114,
      weightRatio: [100, 14],
      tolerancePct: 1,
      readabilityG: 0.01,
      detail: {
        parts: [
          { label: 'Part A', targetG: 100, actualG: 100 },
          { label: 'Part B', targetG: 14, actualG: null },
        ],
        active: null,
        topUpQueue: [],
        rescue: null,
        steps: { created: at, ...(rescued ? { rescueTaken: at } : {}) },
        lots: [],
        potLifeMin: null,
        potLifeMassG: null,
      },
      createdAt: new Date(at),
    });
    const rec = { ...recordOf(row), state: 'saved' as const, verdict, ratioDeviationPct: dev };
    const saved = await store.writeRecord(row.id, rec, detailFor(rec, detailOf(row)), []);
    // Written again in the same state (a late trace, a handler noted): counted once.
    await store.writeRecord(row.id, rec, detailFor(rec, detailOf(saved)), []);
  }

  it('counts each save once and gives the hand-figured accuracy', async () => {
    const day = (d: number) => `2026-10-${String(5 + d).padStart(2, '0')}T09:00:00.000Z`;
    await saveBatch(day(0), 0.5, 'GO');
    await saveBatch(day(1), -0.3, 'GO', true);
    await saveBatch(day(2), 1.2, 'NO-GO');
    await saveBatch(day(4), 0.1, 'GO');
    await saveBatch(day(8), 0.8, 'GO');

    const desk = hub.app.get(BatchDeskRepository);
    const exactMax = desk.exactAccuracyMax;
    desk.exactAccuracyMax = 0; // the roll-up's path, for a handful of batches
    try {
      const answer = await call<AccuracyAnswer>(
        hub,
        'GET',
        '/api/accuracy?groupBy=operator&bucket=week&from=2026-10-01T00:00:00Z&to=2026-11-01T00:00:00Z',
        { token: lead },
      );
      expect(answer.status).toBe(200);
      const rows = answer.body.rows.filter((r) => r.groupId === 'p-roll');
      expect(rows.map((r) => [r.bucketStart, r.count, r.rescues])).toEqual([
        ['2026-10-05T00:00:00.000Z', 4, 1],
        ['2026-10-12T00:00:00.000Z', 1, 0],
      ]);
      const [week1, week2] = rows as [AccuracyRow, AccuracyRow];
      expect(week1.groupName).toBe('Operator roll-up');
      expect(week1.goShare).toBeCloseTo(0.75, 12);
      // Mean (0.5 − 0.3 + 1.2 + 0.1) / 4 = 0.375.
      expect(week1.meanDeviationPct).toBeCloseTo(0.375, 12);
      // Sample SD, n − 1 in the denominator (NIST/SEMATECH e-Handbook of Statistical Methods,
      // 1.3.5.6), here from the sums: Σx = 1.5, Σx² = 1.79; (1.79 − 1.5²/4) / 3 = 1.2275 / 3.
      expect(week1.sdDeviationPct).toBeCloseTo(Math.sqrt(1.2275 / 3), 12);
      // From the histogram: |dev| 0.1, 0.3, 0.5, 1.2; rank 0.95 × 4 = 3.8 falls in the bin of
      // 1.2 ([1.20, 1.25)), 1.2 + 0.8 × 0.05 = 1.24, capped by the largest |dev| seen: 1.2.
      expect(week1.p95AbsDeviationPct).toBeCloseTo(1.2, 12);
      expect(week2).toMatchObject({ count: 1, goShare: 1, sdDeviationPct: null });
      expect(week2.meanDeviationPct).toBeCloseTo(0.8, 12);
    } finally {
      desk.exactAccuracyMax = exactMax;
    }

    // What the saves kept equals a rebuild from the batches table.
    const db = hub.app.get(Database).db;
    const snapshot = () =>
      db
        .select()
        .from(accuracyDays)
        .orderBy(accuracyDays.kind, accuracyDays.groupId, accuracyDays.day);
    const kept = await snapshot();
    await rebuildAccuracyDays(db);
    const rebuilt = await snapshot();
    const norm = (rows: typeof kept) =>
      rows.map(({ groupName: _name, ...r }) => ({
        ...r,
        sumDev: r.sumDev.toFixed(9),
        sumSq: r.sumSq.toFixed(9),
      }));
    expect(norm(kept)).toEqual(norm(rebuilt));
  });
});

describe('the 95th percentile read from a histogram of |deviation|', () => {
  // Grouped-data percentile, L + (p·n − F) / f × w (lower edge, count below, count in the bin,
  // bin width): the usual interpolation for grouped frequencies, written here from memory of
  // introductory statistics texts, no published source checked.
  it('interpolates inside the bin where the count passes 0.95 n', () => {
    const hist = Array<number>(61).fill(0);
    hist[0] = 2; // [0, 0.05)
    hist[1] = 2; // [0.05, 0.10)
    // n = 4, rank 3.8: 2 below, 2 in the bin → 0.05 + (1.8 / 2) × 0.05 = 0.095.
    expect(p95FromHistogram(hist, 0.099)).toBeCloseTo(0.095, 12);
    // Never above the largest |deviation| seen.
    expect(p95FromHistogram(hist, 0.08)).toBeCloseTo(0.08, 12);
  });

  it('spreads the last bin (3 % and up) to the largest |deviation| seen', () => {
    const hist = Array<number>(61).fill(0);
    hist[0] = 10;
    hist[60] = 10;
    // n = 20, rank 19: 10 below, 10 in [3, 5] → 3 + 0.9 × 2 = 4.8.
    expect(p95FromHistogram(hist, 5)).toBeCloseTo(4.8, 12);
    expect(p95FromHistogram(Array<number>(61).fill(0), 0)).toBeNull();
  });
});
