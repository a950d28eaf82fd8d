import type {
  AccuracyAnswer,
  AccuracyRow,
  AuditPage,
  AuditVerify,
  Batch,
  BatchPage,
  BatchSort,
  BatchSummary,
  Material,
} from '@tareline/protocol';
import { parse } from 'csv-parse/sync';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { Database } from '../src/database/database.js';
import { batches } from '../src/database/schema/index.js';
import { HubEvents } from '../src/events/hub-events.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

/** An invented batch as the seed writes it: what the filters and sorts are checked against. */
interface Seeded {
  id: number;
  createdAt: Date;
  benchId: string;
  operatorId: string;
  materialId: string;
  state: 'saved' | 'abandoned' | 'interrupted';
  verdict: 'GO' | 'NO-GO' | null;
  dev: number | null;
  lots: string[];
}

const COUNT = 30;
const START = Date.parse('2026-11-20T06:00:00.000Z');
const HOUR = 3_600_000;
// A lot code a spreadsheet must keep whole: a comma, a quote and a line break.
const AWKWARD_LOT = 'LOT 7, "blue"\nsecond line';

function seedRows(materialIds: string[]): Omit<Seeded, 'id'>[] {
  return Array.from({ length: COUNT }, (_, i) => {
    const state = i % 10 === 9 ? 'abandoned' : i % 10 === 8 ? 'interrupted' : 'saved';
    // Several equal deviations, so the sorts' tie-break by number is exercised.
    const dev = state === 'saved' ? [0.4, -1.6, 0.4, -0.2, 2.5, -0.4, 0][i % 7]! : null;
    return {
      // Two batches in the same second: paging must not lose either.
      createdAt: new Date(START + Math.floor(i / 2) * HOUR),
      benchId: i % 3 === 0 ? 'bench-2' : 'bench-1',
      operatorId: ['p-one', 'p-two', 'p-three'][i % 4 === 0 ? 2 : i % 2]!,
      materialId: materialIds[i % materialIds.length]!,
      state,
      verdict: state === 'saved' ? (Math.abs(dev!) > 1 ? 'NO-GO' : 'GO') : null,
      dev,
      lots: i === 5 ? [AWKWARD_LOT, 'B-77'] : [`A-${100 + (i % 5)}`, 'B-77'],
    };
  });
}

/** Writes invented batches straight into the database, numbered from `firstId`. */
async function insertBatches(
  hub: TestHub,
  rows: (Omit<Seeded, 'id'> & { rescued?: boolean })[],
  firstId: number,
): Promise<number[]> {
  const inserted = await hub.app
    .get(Database)
    .db.insert(batches)
    .values(
      rows.map((r, i) => ({
        id: firstId + i,
        benchId: r.benchId,
        operatorId: r.operatorId,
        operatorName: `Operator ${r.operatorId}`,
        materialId: r.materialId,
        materialName: `Material ${r.materialId}`,
        state: r.state,
        verdict: r.verdict,
        totalMassG: 114,
        weightRatio: [100, 14],
        tolerancePct: 1,
        readabilityG: 0.01,
        ratioDeviationPct: r.dev,
        detail: {
          parts: [
            { label: 'Part A', targetG: 100, actualG: 100 },
            { label: 'Part B', targetG: 14, actualG: 14 * (1 + (r.dev ?? 0) / 100) },
          ],
          active: null,
          topUpQueue: [],
          rescue: null,
          steps: {
            created: r.createdAt.toISOString(),
            ...(r.rescued ? { rescueTaken: r.createdAt.toISOString() } : {}),
          },
          lots: r.lots.map((code, part) => ({ part, code, lotId: null, warnings: [] })),
          potLifeMin: null,
          potLifeMassG: null,
        },
        createdAt: r.createdAt,
        savedAt: r.state === 'saved' ? r.createdAt : null,
      })),
    )
    .returning({ id: batches.id });
  return inserted.map((r) => r.id);
}

describe("the lead's desk: batches by filter, sort and page; CSV; decisions; audit trail", () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let lead: string;
  let seeded: Seeded[];

  async function page(query: string, token = lead) {
    return call<BatchPage & { message: string }>(hub, 'GET', `/api/batches?${query}`, { token });
  }

  /** Every batch the query finds, walking the pages by cursor. */
  async function walk(query: string, limit: number): Promise<{ ids: number[]; pages: number }> {
    const ids: number[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const q: string = `${query}&limit=${limit}${cursor ? `&cursor=${cursor}` : ''}`;
      const answer = await page(q);
      expect(answer.status).toBe(200);
      ids.push(...answer.body.items.map((b) => b.id));
      cursor = answer.body.nextCursor;
      pages += 1;
    } while (cursor);
    return { ids, pages };
  }

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: lead });
    const materialIds = materials.body.slice(0, 2).map((m) => m.id);
    const rows = seedRows(materialIds);
    const inserted = await insertBatches(hub, rows, 1000);
    seeded = rows.map((r, i) => ({ ...r, id: inserted[i]! }));
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  const idsWhere = (keep: (s: Seeded) => boolean) =>
    seeded
      .filter(keep)
      .sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime() || b.id - a.id)
      .map((s) => s.id);

  it('filters by time, material, bench, operator, verdict, state and lot', async () => {
    const from = new Date(START + 3 * HOUR).toISOString();
    const to = new Date(START + 8 * HOUR).toISOString();
    const cases: [string, (s: Seeded) => boolean][] = [
      [
        `from=${from}&to=${to}`,
        (s) =>
          s.createdAt.getTime() >= START + 3 * HOUR && s.createdAt.getTime() < START + 8 * HOUR,
      ],
      [`materialId=${seeded[1]!.materialId}`, (s) => s.materialId === seeded[1]!.materialId],
      ['benchId=bench-2', (s) => s.benchId === 'bench-2'],
      ['operatorId=p-three', (s) => s.operatorId === 'p-three'],
      ['verdict=NO-GO', (s) => s.verdict === 'NO-GO'],
      ['state=abandoned', (s) => s.state === 'abandoned'],
      ['lot=a-102', (s) => s.lots.includes('A-102')],
      ['lot=B-77&verdict=GO&benchId=bench-1', (s) => s.verdict === 'GO' && s.benchId === 'bench-1'],
    ];
    for (const [query, keep] of cases) {
      const answer = await page(`${query}&limit=500`);
      expect(answer.status, query).toBe(200);
      const expected = idsWhere(keep);
      expect(expected.length, query).toBeGreaterThan(0);
      expect(
        answer.body.items.map((b) => b.id).filter((id) => id >= 1000),
        query,
      ).toEqual(expected);
    }
    // A summary is light: no trace, and the bench by its name.
    const one = (await page('benchId=bench-2&limit=1')).body.items[0]!;
    expect(one).not.toHaveProperty('trace');
    expect(one.benchName).toBe('Casting bench');
  });

  it('sorts each way and walks every page by cursor, no batch twice and none missed', async () => {
    // Batches without a deviation (abandoned, interrupted) come last in either direction.
    const byKey = (key: (s: Seeded) => number | null, descending: boolean) =>
      [...seeded]
        .sort((a, b) => {
          const ka = key(a);
          const kb = key(b);
          if (ka === null || kb === null) {
            if (ka !== kb) return ka === null ? 1 : -1;
          } else if (ka !== kb) {
            return descending ? kb - ka : ka - kb;
          }
          return descending ? b.id - a.id : a.id - b.id;
        })
        .map((s) => s.id);
    const sorts: [BatchSort, number[]][] = [
      ['-createdAt', byKey((s) => s.createdAt.getTime(), true)],
      ['createdAt', byKey((s) => s.createdAt.getTime(), false)],
      ['ratioDeviationPct', byKey((s) => s.dev, false)],
      ['-ratioDeviationPct', byKey((s) => s.dev, true)],
      ['absDeviation', byKey((s) => (s.dev === null ? null : Math.abs(s.dev)), false)],
      ['-absDeviation', byKey((s) => (s.dev === null ? null : Math.abs(s.dev)), true)],
    ];
    const seededIds = new Set(seeded.map((s) => s.id));
    for (const [sort, expected] of sorts) {
      const { ids, pages } = await walk(`sort=${sort}`, 4);
      expect(pages, sort).toBeGreaterThan(2);
      expect(new Set(ids).size, sort).toBe(ids.length);
      expect(
        ids.filter((id) => seededIds.has(id)),
        sort,
      ).toEqual(expected);
    }
  });

  it('refuses a cursor it did not give, or one given for another sort', async () => {
    expect((await page('cursor=not-a-cursor')).status).toBe(400);
    const first = await page('sort=createdAt&limit=2');
    const other = await page(`sort=absDeviation&cursor=${first.body.nextCursor}`);
    expect(other.status).toBe(400);
    expect(other.body.message).toBe('Not a cursor this list gave');
    expect((await page('limit=0')).status).toBe(400);
    expect((await page('from=yesterday')).status).toBe(400);
  });

  it("shows an operator only their own bench's batches", async () => {
    const joss = await badgeSignIn(hub, DEMO.joss.badge);
    const token = joss.body.token;
    const mine = await page('limit=500', token);
    expect(mine.status).toBe(200);
    expect(mine.body.items.length).toBeGreaterThan(0);
    expect(new Set(mine.body.items.map((b) => b.benchId))).toEqual(new Set(['bench-1']));
    expect((await page('benchId=bench-2', token)).status).toBe(403);
    const csv = await fetch(`${hub.url}/api/batches/export.csv`, {
      headers: { Authorization: `Bearer ${token}` },
    });
    expect(csv.status).toBe(403);
  });

  it('exports the filtered batches as CSV that reads back to the same numbers', async () => {
    const res = await fetch(`${hub.url}/api/batches/export.csv?lot=B-77&sort=createdAt`, {
      headers: { Authorization: `Bearer ${lead}` },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    const body = await res.text();
    // RFC 4180: records end in CR LF.
    expect(body.split('\r\n')[0]).toMatch(/^number,created \(UTC\),saved \(UTC\),bench/);
    const records = parse(body, { columns: true }) as Record<string, string>[];
    expect(records.map((r) => Number(r.number))).toEqual(
      [...idsWhere((s) => s.lots.includes('B-77'))].reverse(),
    );
    const api = (await page('lot=B-77&limit=500')).body.items;
    const awkward = seeded.find((s) => s.lots.includes(AWKWARD_LOT))!;
    const row = records.find((r) => Number(r.number) === awkward.id)!;
    const summary = api.find((b) => b.id === awkward.id)!;
    expect(row['part A lot']).toBe(AWKWARD_LOT);
    expect(row['created (UTC)']).toBe(awkward.createdAt.toISOString());
    expect(row.bench).toBe(summary.benchName);
    expect(Number(row['deviation %'])).toBe(summary.ratioDeviationPct);
    expect(Number(row['part B actual g'])).toBe(summary.parts[1]!.actualG);
    expect(row.verdict).toBe(summary.verdict);
    // An abandoned batch shows no deviation.
    const abandoned = records.find((r) => r.state === 'abandoned')!;
    expect(abandoned['deviation %']).toBe('');
  });

  it('records decisions signed by password, append-only, and filters by the latest', async () => {
    const noGo = seeded.find((s) => s.verdict === 'NO-GO')!;
    const url = `/api/batches/${noGo.id}/dispositions`;
    const joss = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const asOperator = await call(hub, 'POST', url, {
      token: joss,
      body: { decision: 'release', password: 'x' },
    });
    expect(asOperator.status).toBe(403);
    const noReason = await call<{ errors: { path: string }[] }>(hub, 'POST', url, {
      token: lead,
      body: { decision: 'hold', password: DEMO.lead.password },
    });
    expect(noReason.status).toBe(400);
    expect(noReason.body.errors.map((e) => e.path)).toContain('reason');
    const wrongPassword = await call(hub, 'POST', url, {
      token: lead,
      body: { decision: 'hold', reason: 'Ratio out of band', password: 'not-it' },
    });
    expect(wrongPassword.status).toBe(401);
    // The session goes on after a wrong signature.
    expect((await call(hub, 'GET', '/api/me', { token: lead })).status).toBe(200);

    const held = await call<Batch>(hub, 'POST', url, {
      token: lead,
      body: { decision: 'hold', reason: 'Ratio out of band', password: DEMO.lead.password },
    });
    expect(held.status).toBe(201);
    const scrapped = await call<Batch>(hub, 'POST', url, {
      token: lead,
      body: { decision: 'scrap', reason: 'Customer refused', password: DEMO.lead.password },
    });
    expect(scrapped.status).toBe(201);
    const detail = await call<Batch>(hub, 'GET', `/api/batches/${noGo.id}`, { token: lead });
    expect(detail.body.disposition).toBe('scrap');
    expect(detail.body.dispositions?.map((d) => [d.decision, d.reason, d.by.name])).toEqual([
      ['hold', 'Ratio out of band', 'Ilse Varga'],
      ['scrap', 'Customer refused', 'Ilse Varga'],
    ]);

    const scrappedList = await page('disposition=scrap');
    expect(scrappedList.body.items.map((b: BatchSummary) => b.id)).toEqual([noGo.id]);
    expect((await page('disposition=hold')).body.items).toEqual([]);
    const undecided = await page('disposition=none&verdict=NO-GO&limit=500');
    expect(undecided.body.items.map((b) => b.id)).not.toContain(noGo.id);
    expect(undecided.body.items.length).toBe(
      seeded.filter((s) => s.verdict === 'NO-GO').length - 1,
    );

    const open = seeded.find((s) => s.state === 'interrupted')!;
    const notSaved = await call(hub, 'POST', `/api/batches/${open.id}/dispositions`, {
      token: lead,
      body: { decision: 'release', password: DEMO.lead.password },
    });
    expect(notSaved.status).toBe(409);
  });

  it('chains audit entries and finds a row changed behind the hub', async () => {
    const noGo = seeded.filter((s) => s.verdict === 'NO-GO')[1]!;
    const signed = await call(hub, 'POST', `/api/batches/${noGo.id}/dispositions`, {
      token: lead,
      body: { decision: 'release', password: DEMO.lead.password },
    });
    expect(signed.status).toBe(201);
    const trail = await call<AuditPage>(hub, 'GET', `/api/audit?entity=batch&entityId=${noGo.id}`, {
      token: lead,
    });
    expect(trail.body.items.map((e) => [e.action, e.actor?.name])).toEqual([
      ['disposition.release', 'Ilse Varga'],
    ]);

    // A batch's state heard on the bus is appended once, however often it is announced.
    const batch = (await call<Batch>(hub, 'GET', `/api/batches/${noGo.id}`, { token: lead })).body;
    const events = hub.app.get(HubEvents);
    events.emit('batch.changed', { benchId: batch.benchId, batch });
    events.emit('batch.changed', { benchId: batch.benchId, batch });
    await vi.waitFor(async () => {
      const after = await call<AuditPage>(
        hub,
        'GET',
        `/api/audit?entity=batch&entityId=${noGo.id}`,
        { token: lead },
      );
      expect(after.body.items.map((e) => e.action)).toEqual(['disposition.release', 'state.saved']);
    });

    const verify = () => call<AuditVerify>(hub, 'GET', '/api/audit/verify', { token: lead });
    const before = await verify();
    expect(before.body.ok).toBe(true);
    expect(before.body.firstBrokenId).toBeNull();
    const total = before.body.checked;
    expect(total).toBeGreaterThanOrEqual(4);

    const tampered = trail.body.items[0]!;
    await hub.app
      .get(Database)
      .db.execute(
        sql`update audit_entries set data = jsonb_set(data, '{decision}', '"scrap"') where id = ${tampered.id}`,
      );
    const after = await verify();
    expect(after.body).toEqual({
      ok: false,
      checked: expect.any(Number),
      firstBrokenId: tampered.id,
    });
    expect(after.body.checked).toBeLessThanOrEqual(total);
  });

  it('computes accuracy per operator and week in the database, as figured by hand', async () => {
    const monday = Date.parse('2026-10-05T00:00:00.000Z');
    const at = (days: number) => new Date(monday + days * 24 * HOUR + 9 * HOUR);
    const base = {
      benchId: 'bench-1',
      operatorId: 'p-acc',
      materialId: seeded[0]!.materialId,
      lots: [],
    };
    await insertBatches(
      hub,
      [
        { ...base, createdAt: at(0), state: 'saved', verdict: 'GO', dev: 0.5 },
        { ...base, createdAt: at(1), state: 'saved', verdict: 'GO', dev: -0.3, rescued: true },
        { ...base, createdAt: at(2), state: 'saved', verdict: 'NO-GO', dev: 1.2 },
        { ...base, createdAt: at(4), state: 'saved', verdict: 'GO', dev: 0.1 },
        // Abandoned: not counted.
        { ...base, createdAt: at(3), state: 'abandoned', verdict: null, dev: 3 },
        { ...base, createdAt: at(8), state: 'saved', verdict: 'GO', dev: 0.8 },
      ],
      2000,
    );
    const answer = await call<AccuracyAnswer>(
      hub,
      'GET',
      `/api/accuracy?groupBy=operator&bucket=week&from=2026-10-01T00:00:00Z&to=2026-10-31T00:00:00Z`,
      { token: lead },
    );
    expect(answer.status).toBe(200);
    const rows = answer.body.rows.filter((r) => r.groupId === 'p-acc');
    expect(rows.map((r) => [r.bucketStart, r.count, r.rescues])).toEqual([
      ['2026-10-05T00:00:00.000Z', 4, 1],
      ['2026-10-12T00:00:00.000Z', 1, 0],
    ]);
    const [week1, week2] = rows as [AccuracyRow, AccuracyRow];
    expect(week1.groupName).toBe('Operator p-acc');
    // By hand: 3 of 4 GO.
    expect(week1.goShare).toBeCloseTo(0.75, 10);
    // Mean (0.5 − 0.3 + 1.2 + 0.1) / 4 = 0.375.
    expect(week1.meanDeviationPct).toBeCloseTo(0.375, 10);
    // Sample standard deviation, n − 1 in the denominator (NIST/SEMATECH e-Handbook of
    // Statistical Methods, 1.3.5.6): squares about the mean 0.015625 + 0.455625 + 0.680625 +
    // 0.075625 = 1.2275; √(1.2275 / 3) = 0.639661...
    expect(week1.sdDeviationPct).toBeCloseTo(Math.sqrt(1.2275 / 3), 10);
    // 95th percentile interpolated between order statistics (Hyndman & Fan 1996, definition 7,
    // which PostgreSQL's percentile_cont follows): |dev| sorted 0.1, 0.3, 0.5, 1.2; position
    // 0.95 × 3 = 2.85, so 0.5 + 0.85 × (1.2 − 0.5) = 1.095.
    expect(week1.p95AbsDeviationPct).toBeCloseTo(1.095, 10);
    expect(week2.meanDeviationPct).toBeCloseTo(0.8, 10);
    expect(week2.sdDeviationPct).toBeNull();
    expect(week2.goShare).toBe(1);

    const operator = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const refused = await call(hub, 'GET', '/api/accuracy?groupBy=bench', { token: operator });
    expect(refused.status).toBe(403);
    const bad = await call(hub, 'GET', '/api/accuracy?groupBy=shift', { token: lead });
    expect(bad.status).toBe(400);
  });
});

describe('signing a decision', () => {
  it('counts password guesses against the sign-in budget of the address', async () => {
    const data = await tempDataDir();
    const hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '3' });
    try {
      // The sign-in is the first of the three tries a minute.
      const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
      const guess = () =>
        call(hub, 'POST', '/api/batches/1/dispositions', {
          token: lead,
          body: { decision: 'release', password: 'guess' },
        });
      // No batch 1 in the demo shop: each guess is refused, and counted.
      expect((await guess()).status).toBe(404);
      expect((await guess()).status).toBe(404);
      expect((await guess()).status).toBe(429);
    } finally {
      await hub.close();
      await data.remove();
    }
  });
});
