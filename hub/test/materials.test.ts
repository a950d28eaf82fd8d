import type { ApiError, Batch, Lot, Material, StockMovement } from '@tareline/protocol';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BatchesRepository, detailOf, recordOf } from '../src/batches/batches.repository.js';
import { type TracePoint } from '../src/batches/pour-trace.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { Bench, SIM_BENCH_ENV, until } from './support/sim-bench.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

type Answer = ApiError & Material & Lot;

const URETHANE = {
  name: 'Hollin test urethane HT-5',
  ratio: { basis: 'volume', parts: [1, 1] },
  // 1:1 by volume with SGs 1.10 and 0.98 is 100 : 89.09 by weight (mass = volume × SG,
  // ASTM D792 §3 defines SG as density relative to water); the sheet rounds it to 100 : 89.
  alsoStatedRatio: { basis: 'weight', parts: [100, 89] },
  partSpecificGravities: [1.1, 0.98],
  partLabels: ['Iso', 'Polyol'],
  tolerancePct: 2,
  potLifeMin: 7,
  potLifeMassG: 100,
  demoldMin: 240,
  agitateMin: 0,
  openShelfLifeDays: 90,
  storageNote: 'Keep sealed under dry nitrogen.\nAbove 18 °C.',
  cautions: ['Isocyanate: wear gloves and goggles, see the SDS'],
  costPerKg: [18.5, 16.25],
  lowStockG: [500, 400],
};

describe('materials, lots and stock', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;
  let lead: string;
  let bench: Bench;
  let sc14: Material;

  const asLead = (method: string, path: string, body?: unknown) =>
    call<Answer>(hub, method, path, { token: lead, ...(body !== undefined ? { body } : {}) });

  const batchById = async (id: number) =>
    (await call<Batch>(hub, 'GET', `/api/batches/${id}`, { token: lead })).body;

  async function csvOf(token = lead): Promise<{ status: number; text: string; type: string }> {
    const res = await fetch(`${hub.url}/api/materials/export.csv`, {
      headers: { Authorization: `Bearer ${token}` },
    });
    return { status: res.status, text: await res.text(), type: res.headers.get('content-type')! };
  }

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, SIM_BENCH_ENV);
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const signIn = await badgeSignIn(hub, DEMO.joss.badge);
    bench = new Bench(hub, signIn.body.token);
    await bench.connect();
    const all = await call<Material[]>(hub, 'GET', '/api/materials', { token: lead });
    sc14 = all.body.find((m) => m.name.includes('SC-14'))!;
  });

  afterAll(async () => {
    bench?.socket.disconnect();
    await hub?.close();
    await data?.remove();
  });

  describe('a material', () => {
    it('keeps every field the bench and the desk use, cost and threshold per part', async () => {
      const created = await asLead('POST', '/api/materials', URETHANE);
      expect(created.status).toBe(201);
      expect(created.body).toMatchObject({
        ...URETHANE,
        active: true,
        costPerKg: [18.5, 16.25],
        lowStockG: [500, 400],
      });
      // The scale weighs to 1 : 0.8909 (0.98 / 1.10), from the ratio by volume.
      expect(created.body.weightRatio).toEqual([1, expect.closeTo(0.8909, 4)]);
    });

    it('refuses ratios that disagree with the SGs by more than 2 % and names the part', async () => {
      const bad = await asLead('POST', '/api/materials', {
        ...URETHANE,
        name: 'Disagreeing',
        // 85 / 89.09 − 1 = −4.6 % (worked by hand as above).
        alsoStatedRatio: { basis: 'weight', parts: [100, 85] },
      });
      expect(bad.status).toBe(400);
      expect(bad.body.errors).toEqual([
        { path: 'alsoStatedRatio.parts.1', message: expect.stringMatching(/^Part B is off/) },
      ]);
    });

    it('refuses a cost or threshold list of the wrong length, and a negative cost', async () => {
      const wrong = await asLead('POST', '/api/materials', {
        ...URETHANE,
        costPerKg: [18.5],
        lowStockG: [500, 400, 10],
      });
      expect(wrong.status).toBe(400);
      expect(wrong.body.errors.map((e) => e.path)).toEqual(['costPerKg', 'lowStockG']);
      const negative = await asLead('POST', '/api/materials', { ...URETHANE, costPerKg: [-1, 2] });
      expect(negative.status).toBe(400);
      expect(negative.body.errors[0]).toMatchObject({ path: 'costPerKg.0' });
    });

    it('is changed field by field, checked again as a whole; null clears a field', async () => {
      const created = await asLead('POST', '/api/materials', { ...URETHANE, name: 'To edit' });
      const id = created.body.id;
      const edited = await asLead('PATCH', `/api/materials/${id}`, {
        costPerKg: [20, 17],
        demoldMin: null,
      });
      expect(edited.status).toBe(200);
      expect(edited.body.costPerKg).toEqual([20, 17]);
      expect(edited.body.demoldMin).toBeUndefined();
      expect(edited.body.storageNote).toBe(URETHANE.storageNote);
      // New SGs that make the stated ratios disagree: refused, nothing changed.
      const clash = await asLead('PATCH', `/api/materials/${id}`, {
        partSpecificGravities: [1.1, 1.2],
      });
      expect(clash.status).toBe(400);
      expect(clash.body.errors[0]!.message).toMatch(/^Part B is off/);
      // A ratio by volume cannot lose its SGs.
      const noSg = await asLead('PATCH', `/api/materials/${id}`, {
        partSpecificGravities: null,
        alsoStatedRatio: null,
      });
      expect(noSg.status).toBe(400);
      expect(noSg.body.errors.map((e) => e.path)).toContain('partSpecificGravities');
      const unknownField = await asLead('PATCH', `/api/materials/${id}`, { colour: 'red' });
      expect(unknownField.status).toBe(400);
      const badValue = await asLead('PATCH', `/api/materials/${id}`, { tolerancePct: -1 });
      expect(badValue.status).toBe(400);
      expect(badValue.body.errors[0]!.path).toBe('tolerancePct');
      const after = await asLead('GET', `/api/materials/${id}`);
      expect(after.body.partSpecificGravities).toEqual([1.1, 0.98]);
      const missing = await asLead('PATCH', '/api/materials/no-such-material', { name: 'x' });
      expect(missing.status).toBe(404);
      const operator = await call(hub, 'PATCH', `/api/materials/${id}`, {
        token: bench.token,
        body: { name: 'x' },
      });
      expect(operator.status).toBe(403);
    });

    it('once retired is gone from the list and refused for a new batch, but listed on request', async () => {
      const created = await asLead('POST', '/api/materials', { ...URETHANE, name: 'To retire' });
      const id = created.body.id;
      const retired = await asLead('PATCH', `/api/materials/${id}`, { active: false });
      expect(retired.body.active).toBe(false);
      const inUse = await call<Material[]>(hub, 'GET', '/api/materials', { token: bench.token });
      expect(inUse.body.map((m) => m.id)).not.toContain(id);
      const all = await call<Material[]>(hub, 'GET', '/api/materials?includeRetired=true', {
        token: lead,
      });
      expect(all.body.find((m) => m.id === id)?.active).toBe(false);
      const badQuery = await asLead('GET', '/api/materials?includeRetired=maybe');
      expect(badQuery.status).toBe(400);
      const batch = await bench.post('', { benchId: 'bench-1', materialId: id, totalMassG: 50 });
      expect(batch.status).toBe(409);
      expect(batch.body.message).toMatch(/retired/);
      const back = await asLead('PATCH', `/api/materials/${id}`, { active: true });
      expect(back.body.active).toBe(true);
    });
  });

  describe('a lot', () => {
    let material: Material;

    beforeAll(async () => {
      material = (await asLead('POST', '/api/materials', { ...URETHANE, name: 'Lot test' })).body;
    });

    it('is received with its quantity; on hand starts at what was received', async () => {
      const lot = await asLead('POST', '/api/lots', {
        materialId: material.id,
        part: 0,
        code: 'HT5A-0001',
        expiresOn: '2030-01-31',
        receivedG: 4000,
      });
      expect(lot.status).toBe(201);
      expect(lot.body).toMatchObject({ code: 'HT5A-0001', receivedG: 4000, onHandG: 4000 });
      expect(lot.body.warnings).toEqual([]);
    });

    it('refuses a lot without a quantity, of a part the material lacks, or twice', async () => {
      const base = { materialId: material.id, part: 1, code: 'HT5B-0001' };
      const noQty = await asLead('POST', '/api/lots', base);
      expect(noQty.status).toBe(400);
      expect(noQty.body.errors[0]).toEqual({
        path: 'receivedG',
        message: 'Enter the quantity received',
      });
      const zero = await asLead('POST', '/api/lots', { ...base, receivedG: 0 });
      expect(zero.status).toBe(400);
      const partC = await asLead('POST', '/api/lots', { ...base, part: 2, receivedG: 100 });
      expect(partC.status).toBe(409);
      expect((await asLead('POST', '/api/lots', { ...base, receivedG: 100 })).status).toBe(201);
      const twice = await asLead('POST', '/api/lots', { ...base, receivedG: 100 });
      expect(twice.status).toBe(409);
      const operator = await call(hub, 'POST', '/api/lots', {
        token: bench.token,
        body: { ...base, code: 'HT5B-0002', receivedG: 100 },
      });
      expect(operator.status).toBe(403);
    });

    it('below its part threshold warns (400 g for the polyol here)', async () => {
      const lots = await call<Lot[]>(hub, 'GET', `/api/lots?materialId=${material.id}`, {
        token: bench.token,
      });
      const polyol = lots.body.find((l) => l.code === 'HT5B-0001')!;
      expect(polyol.onHandG).toBe(100);
      expect(polyol.warnings).toEqual([
        {
          code: 'LOT_LOW_STOCK',
          message: 'Lot HT5B-0001 is low: 100 g left (reorder below 400 g)',
        },
      ]);
    });

    it('is adjusted with who and why; it cannot go below zero', async () => {
      const lots = await call<Lot[]>(hub, 'GET', `/api/lots?materialId=${material.id}`, {
        token: lead,
      });
      const iso = lots.body.find((l) => l.code === 'HT5A-0001')!;
      const spill = await asLead('POST', `/api/lots/${iso.id}/adjustments`, {
        deltaG: -250.125,
        reason: 'Spilled on the bench',
      });
      expect(spill.status).toBe(201);
      expect(spill.body.onHandG).toBe(3749.875);
      const count = await asLead('POST', `/api/lots/${iso.id}/adjustments`, {
        deltaG: 0.125,
        reason: 'Stock count',
      });
      expect(count.body.onHandG).toBe(3750);
      const history = await call<StockMovement[]>(hub, 'GET', `/api/lots/${iso.id}/movements`, {
        token: lead,
      });
      expect(history.body.map((m) => [m.kind, m.deltaG, m.reason, m.by?.name])).toEqual([
        ['adjustment', 0.125, 'Stock count', 'Ilse Varga'],
        ['adjustment', -250.125, 'Spilled on the bench', 'Ilse Varga'],
      ]);
      const tooMuch = await asLead('POST', `/api/lots/${iso.id}/adjustments`, {
        deltaG: -3750.001,
        reason: 'Count',
      });
      expect(tooMuch.status).toBe(409);
      expect(tooMuch.body.message).toBe('Lot HT5A-0001 has only 3750 g on hand');
      for (const body of [
        { deltaG: 0, reason: 'x' },
        { deltaG: 5, reason: ' ' },
        { deltaG: 'five', reason: 'x' },
        { reason: 'x' },
      ]) {
        const bad = await asLead('POST', `/api/lots/${iso.id}/adjustments`, body);
        expect(bad.status, JSON.stringify(body)).toBe(400);
      }
      const missing = await asLead('POST', '/api/lots/no-such-lot/adjustments', {
        deltaG: 1,
        reason: 'x',
      });
      expect(missing.status).toBe(404);
      const operator = await call(hub, 'POST', `/api/lots/${iso.id}/adjustments`, {
        token: bench.token,
        body: { deltaG: 1, reason: 'x' },
      });
      expect(operator.status).toBe(403);
    });
  });

  describe('a pour on the simulated bench', () => {
    let resin: Lot;
    let hardener: Lot;
    let saved: Batch;

    beforeAll(async () => {
      const lot = async (part: number, code: string, receivedG: number) =>
        (
          await asLead('POST', '/api/lots', {
            materialId: sc14.id,
            part,
            code,
            expiresOn: '2030-06-30',
            receivedG,
          })
        ).body;
      resin = await lot(0, 'SC14R-T100', 1000);
      hardener = await lot(1, 'SC14H-T200', 200.5);
      await lot(1, 'SC14H-T010', 10);
    });

    it('warns before weighing when a lot holds less than the batch needs', async () => {
      // 114 g at 100 : 14 by weight takes 14 g of hardener; the lot holds 10 g.
      const created = await bench.post('', {
        benchId: 'bench-1',
        materialId: sc14.id,
        totalMassG: 114,
        lots: [
          { part: 0, code: 'SC14R-T100' },
          { part: 1, code: 'SC14H-T010' },
        ],
      });
      expect(created.status).toBe(201);
      expect(created.body.lots[0]!.warnings).toEqual([]);
      expect(created.body.lots[1]!.warnings).toContainEqual({
        code: 'LOT_OVERDRAW',
        message: 'Lot SC14H-T010 has 10 g left, this batch needs 14 g',
      });
      // Abandoned with nothing weighed: nothing comes off the lots.
      await bench.post(`/${created.body.id}/abandon`, { reason: 'Wrong hardener can' });
      const resinNow = await asLead('GET', `/api/lots/${resin.id}`);
      expect(resinNow.body.onHandG).toBe(1000);
    });

    it('takes off each lot exactly what the scale weighed, to the milligram', async () => {
      await bench.throughPartA(sc14.id, [
        { part: 0, code: 'SC14R-T100' },
        { part: 1, code: 'SC14H-T200' },
      ]);
      await bench.simulate([
        { do: 'pour', grams: 13, rateGPerS: 6 },
        { do: 'pour', grams: 1.05, rateGPerS: 0.5 },
        { do: 'settle' },
      ]);
      await until('saved', () => bench.latestBatch()?.state === 'saved');
      saved = await batchById(bench.latestBatch()!.id);
      const [a, b] = saved.parts.map((p) => Math.round(p.actualG! * 1000));
      const resinNow = await asLead('GET', `/api/lots/${resin.id}`);
      const hardenerNow = await asLead('GET', `/api/lots/${hardener.id}`);
      // Received − weighed, in whole milligrams (the ledger's unit).
      expect(Math.round(resinNow.body.onHandG * 1000)).toBe(1_000_000 - a!);
      expect(Math.round(hardenerNow.body.onHandG * 1000)).toBe(200_500 - b!);
      expect(a).toBeGreaterThan(99_000);
      const moves = await call<StockMovement[]>(hub, 'GET', `/api/lots/${resin.id}/movements`, {
        token: lead,
      });
      expect(moves.body).toEqual([
        expect.objectContaining({ kind: 'batch', batchId: saved.id, deltaG: -a! / 1000 }),
      ]);
      await bench.simulate([{ do: 'lift-cup' }]);
    });

    it('writing the saved batch again subtracts nothing more', async () => {
      const repo = hub.app.get(BatchesRepository);
      const row = (await repo.findById(saved.id))!;
      const before = (await asLead('GET', `/api/lots/${resin.id}`)).body.onHandG;
      await repo.writeRecord(row.id, recordOf(row), detailOf(row), [] as TracePoint[]);
      expect((await asLead('GET', `/api/lots/${resin.id}`)).body.onHandG).toBe(before);
    });

    it("an edit of the material leaves the batch's record as it was", async () => {
      const before = await batchById(saved.id);
      const edited = await asLead('PATCH', `/api/materials/${sc14.id}`, {
        name: 'Grey surface-coat epoxy SC-14 (new formula)',
        ratio: { basis: 'weight', parts: [100, 15] },
        tolerancePct: 2,
        potLifeMin: 30,
      });
      expect(edited.status).toBe(200);
      const after = await batchById(saved.id);
      expect(after).toEqual(before);
      expect(after).toMatchObject({
        materialName: 'Grey surface-coat epoxy SC-14',
        weightRatio: [100, 14],
        tolerancePct: 1,
        potLifeMin: 25,
      });
    });
  });

  describe('the library as CSV', () => {
    it('exports and imports back exactly, formula-like cells guarded', async () => {
      await asLead('POST', '/api/materials', {
        ...URETHANE,
        name: '=HYPERLINK("x") resin',
        cautions: ['+ wear gloves', "'quoted"],
        storageNote: '@ 20 °C, "dry"',
      });
      const first = await csvOf();
      expect(first.status).toBe(200);
      expect(first.type).toMatch(/^text\/csv/);
      const rows = parse(first.text, { columns: true }) as Record<string, string>[];
      const guarded = rows.find((r) => r.name!.includes('HYPERLINK'))!;
      // OWASP "CSV Injection": a cell starting with = + - @ must not run as a formula.
      expect(guarded.name).toBe('\'=HYPERLINK("x") resin');
      expect(guarded.cautions).toBe("'+ wear gloves\n'quoted");
      expect(guarded.storage_note).toBe('\'@ 20 °C, "dry"');
      const before = (await asLead('GET', '/api/materials?includeRetired=true')).body;
      const imported = await asLead('POST', '/api/materials/import', { csv: first.text });
      expect(imported.status).toBe(201);
      expect(imported.body).toEqual({ created: 0, updated: rows.length });
      expect((await asLead('GET', '/api/materials?includeRetired=true')).body).toEqual(before);
      expect((await csvOf()).text).toBe(first.text);
    });

    it('names each bad row and imports nothing when any row is bad', async () => {
      const before = await csvOf();
      const lines = before.text.trimEnd().split('\r\n');
      const header = lines[0]!.split(',');
      const row = (cells: Record<string, string>) =>
        header.map((col) => JSON.stringify(cells[col] ?? '')).join(',');
      const csv = [
        lines[0],
        row({
          name: 'New good one',
          ratio_basis: 'weight',
          ratio_a: '100',
          ratio_b: '50',
          specific_gravity: '1.1',
        }),
        row({
          name: 'Bad ratio',
          ratio_basis: 'weight',
          ratio_a: '100',
          ratio_b: 'lots',
          specific_gravity: '1.1',
        }),
        row({
          name: '',
          ratio_basis: 'weight',
          ratio_a: '100',
          ratio_b: '50',
          specific_gravity: '1.1',
        }),
        row({
          name: 'Costs',
          ratio_basis: 'weight',
          ratio_a: '100',
          ratio_b: '50',
          specific_gravity: '1.1',
          cost_per_kg_a: '4',
        }),
        ...lines.slice(1),
      ].join('\r\n');
      const answer = await asLead('POST', '/api/materials/import', { csv });
      expect(answer.status).toBe(400);
      expect(answer.body.message).toMatch(/^Nothing was imported/);
      expect(answer.body.errors).toEqual([
        { path: 'row 3.ratio.parts.1', message: 'Row 3: The ratio part must be a number' },
        { path: 'row 4.name', message: 'Row 4: Enter a name' },
        { path: 'row 5.costPerKg', message: 'Row 5: Give one value for each of the 2 parts' },
      ]);
      expect((await csvOf()).text).toBe(before.text);
      // Without the bad rows the new one is added and the rest updated in place.
      const good = [lines[0], csv.split('\r\n')[1], ...lines.slice(1)].join('\r\n');
      const ok = await asLead('POST', '/api/materials/import', { csv: good });
      expect(ok.body).toEqual({ created: 1, updated: lines.length - 1 });
    });

    it('refuses a file with an unknown column, an unreadable file, and callers who are not leads', async () => {
      const unknown = await asLead('POST', '/api/materials/import', {
        csv: 'name,ratio_basis,ratio_a,ratio_b,colour\r\nX,weight,1,1,red\r\n',
      });
      expect(unknown.status).toBe(400);
      expect(unknown.body.errors).toEqual([{ path: 'header', message: 'Unknown column "colour"' }]);
      const broken = await asLead('POST', '/api/materials/import', {
        csv: 'name,ratio_basis,ratio_a,ratio_b\r\nX,weight,1,1,2\r\n',
      });
      expect(broken.status).toBe(400);
      expect(broken.body.errors[0]!.message).toMatch(/^Not a readable CSV file/);
      const empty = await asLead('POST', '/api/materials/import', { csv: '' });
      expect(empty.status).toBe(400);
      expect((await csvOf(bench.token)).status).toBe(403);
      const operator = await call(hub, 'POST', '/api/materials/import', {
        token: bench.token,
        body: { csv: 'name\r\n' },
      });
      expect(operator.status).toBe(403);
    });
  });
});
