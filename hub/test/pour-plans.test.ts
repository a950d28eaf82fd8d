import {
  apiErrorSchema,
  pourPlanSchema,
  type Batch,
  type Material,
  type PourPlan,
  type PourPlanInput,
} from '@tareline/protocol';
import { parse } from 'csv-parse/sync';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Database } from '../src/database/database.js';
import { batches, materials } from '../src/database/schema/index.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

const ENV = {
  TARELINE_SCALE: 'sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=5',
  TARELINE_SAVE_DWELL_MS: '400',
  TARELINE_SIGN_IN_LIMIT: '1000',
};

async function until<T>(what: string, check: () => Promise<T | undefined>): Promise<T> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('pour plans', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;
  let lead: string;
  let operator: string;
  let lr27: Material;
  let plan: PourPlan;

  // A 10 × 5 × 2 cm box = 100 cm³, a 20 cm³ model, 10 % over, 5 g left in the first cup.
  const estimate = {
    cavity: { shape: 'box', length: 10, width: 5, height: 2, unit: 'cm' },
    displacement: { volume: 20, unit: 'cm3' },
    overagePct: 10,
    cupLossG: 5,
  } as const;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, ENV);
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    operator = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const list = await call<Material[]>(hub, 'GET', '/api/materials', { token: lead });
    lr27 = list.body.find((m) => m.name.includes('LR-27'))!;
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  const post = (body: unknown, token = lead) =>
    call<PourPlan & { message: string; errors: { path: string }[] }>(
      hub,
      'POST',
      '/api/pour-plans',
      { body, token },
    );

  it('saves a plan with the total the volume estimator computes', async () => {
    const res = await post({
      name: 'Pump housing, back half',
      moldRef: 'M-114',
      materialId: lr27.id,
      estimate,
    } satisfies PourPlanInput);
    expect(res.status).toBe(201);
    plan = pourPlanSchema.parse(res.body);
    // (100 − 20) cm³ × 1.10 = 88 cm³; × SG 1.12 = 98.56 g; + 5 g = 103.56 g (arithmetic on the
    // definitions of specific gravity and of the allowances, worked by hand).
    expect(plan.totalMassG).toBeCloseTo(103.56, 9);
    expect(plan.savedTotalMassG).toBeCloseTo(103.56, 9);
    expect(plan.materialChanged).toBe(false);
    expect(plan).toMatchObject({ moldRef: 'M-114', materialName: lr27.name });
    expect(plan.createdBy.name).toBe('Ilse Varga');

    const list = await call<PourPlan[]>(hub, 'GET', '/api/pour-plans', { token: operator });
    expect(list.status).toBe(200);
    expect(list.body.map((p) => p.name)).toEqual(['Pump housing, back half']);
  });

  it('refuses bad plans in words, naming the field', async () => {
    const bad = async (body: unknown, path: string, status = 400) => {
      const res = await post(body);
      expect(res.status).toBe(status);
      const error = apiErrorSchema.parse(res.body);
      expect(error.errors.map((e) => e.path)).toContain(path);
    };
    await bad({ materialId: lr27.id, estimate }, 'name');
    await bad({ name: 'x', estimate }, 'materialId');
    await bad({ name: 'x', materialId: lr27.id }, 'estimate');
    await bad(
      { name: 'x', materialId: lr27.id, estimate: { ...estimate, overagePct: -5 } },
      'estimate.overagePct',
    );
    await bad(
      {
        name: 'x',
        materialId: lr27.id,
        estimate: { ...estimate, cavity: { shape: 'sphere', diameter: 3, unit: 'cm' } },
      },
      'estimate.cavity.shape',
    );
    // A model larger than the cavity is caught by the arithmetic, on the same field.
    await bad(
      {
        name: 'x',
        materialId: lr27.id,
        estimate: { ...estimate, displacement: { volume: 500, unit: 'cm3' } },
      },
      'estimate.displacement.volume',
    );
    await bad({ name: 'x', materialId: 'no-such-material', estimate }, 'materialId', 404);
    expect((await post({ name: 'x', materialId: lr27.id, estimate }, operator)).status).toBe(403);

    const noPlan = await call(hub, 'GET', '/api/pour-plans/no-such-plan', { token: lead });
    expect(noPlan.status).toBe(404);
    const emptyPatch = await call(hub, 'PATCH', `/api/pour-plans/${plan.id}`, {
      body: {},
      token: lead,
    });
    expect(emptyPatch.status).toBe(400);
  });

  it('edits a plan and recomputes its total', async () => {
    const res = await call<PourPlan>(hub, 'PATCH', `/api/pour-plans/${plan.id}`, {
      body: { name: 'Pump housing, back', estimate: { ...estimate, cupLossG: 8 } },
      token: lead,
    });
    expect(res.status).toBe(200);
    // 98.56 g + 8 g of cup loss.
    expect(res.body.totalMassG).toBeCloseTo(106.56, 9);
    expect(res.body.name).toBe('Pump housing, back');
    expect(res.body.moldRef).toBe('M-114');
    plan = (
      await call<PourPlan>(hub, 'PATCH', `/api/pour-plans/${plan.id}`, {
        body: { estimate },
        token: lead,
      })
    ).body;
    expect(plan.totalMassG).toBeCloseTo(103.56, 9);
  });

  it('starts a batch from the plan at the bench, with the total recomputed after a material change', async () => {
    // The maker revised the density: SG 1.12 → 1.20 (the materials page would do this).
    const db = hub.app.get(Database).db;
    await db.update(materials).set({ specificGravity: 1.2 }).where(eq(materials.id, lr27.id));
    const changed = await call<PourPlan>(hub, 'GET', `/api/pour-plans/${plan.id}`, {
      token: operator,
    });
    // 88 cm³ × 1.20 = 105.6 g; + 5 g = 110.6 g.
    expect(changed.body.totalMassG).toBeCloseTo(110.6, 9);
    expect(changed.body.savedTotalMassG).toBeCloseTo(103.56, 9);
    expect(changed.body.materialChanged).toBe(true);

    const both = await call(hub, 'POST', '/api/batches', {
      body: { benchId: 'bench-1', planId: plan.id, materialId: lr27.id },
      token: operator,
    });
    expect(both.status).toBe(400);
    const missing = await call(hub, 'POST', '/api/batches', {
      body: { benchId: 'bench-1', planId: 'no-such-plan' },
      token: operator,
    });
    expect(missing.status).toBe(404);

    const started = await call<Batch>(hub, 'POST', '/api/batches', {
      body: { benchId: 'bench-1', planId: plan.id, lots: [{ part: 0, code: 'LR27R-0101' }] },
      token: operator,
    });
    expect(started.status).toBe(201);
    expect(started.body.planId).toBe(plan.id);
    expect(started.body.materialId).toBe(lr27.id);
    expect(started.body.totalMassG).toBeCloseTo(110.6, 9);
    // Split 100 : 27 by weight: 110.6 × 100 / 127 = 87.087 g of resin.
    expect(started.body.parts[0]!.targetG).toBeCloseTo(87.087, 3);

    const id = started.body.id;
    const simulate = (steps: unknown) =>
      call(hub, 'POST', '/api/benches/bench-1/simulator', { body: steps, token: operator });
    const current = async () =>
      (await call<Batch>(hub, 'GET', `/api/batches/${id}`, { token: operator })).body;
    await simulate([{ do: 'place-cup', massG: 30 }, { do: 'settle' }]);
    expect((await call(hub, 'POST', `/api/batches/${id}/tare`, { token: operator })).status).toBe(
      201,
    );
    await simulate([{ do: 'pour', grams: 87.1, rateGPerS: 30 }, { do: 'settle' }]);
    await new Promise((r) => setTimeout(r, 600));
    expect((await call(hub, 'POST', `/api/batches/${id}/next`, { token: operator })).status).toBe(
      201,
    );
    const b = await until('part B tared', async () => {
      const batch = await current();
      return batch.active?.tared ? batch : undefined;
    });
    await simulate([{ do: 'pour', grams: b.active!.targetG, rateGPerS: 4 }, { do: 'settle' }]);
    const saved = await until('saved', async () => {
      const batch = await current();
      return batch.state === 'saved' ? batch : undefined;
    });
    expect(saved.verdict).toBe('GO');

    const page = await call<PourPlan>(hub, 'GET', `/api/pour-plans/${plan.id}`, { token: lead });
    expect(page.body.batches).toEqual([
      expect.objectContaining({
        id,
        state: 'saved',
        verdict: 'GO',
        operatorName: 'Joss Whitcombe',
      }),
    ]);
  });

  it('prices a batch by what was weighed, on its detail and in the CSV', async () => {
    const db = hub.app.get(Database).db;
    const [row] = await db
      .select()
      .from(batches)
      .where(sql`${batches.planId} is not null`);
    const before = await call<Batch>(hub, 'GET', `/api/batches/${row!.id}`, { token: lead });
    // Priced at its material's prices per kg of each part when it started.
    const material = await call<Material>(hub, 'GET', `/api/materials/${before.body.materialId}`, {
      token: lead,
    });
    const prices = material.body.costPerKg!;
    expect(prices.length).toBe(before.body.parts.length);
    const atStart = before.body.parts.reduce(
      (sum, p, i) => sum + (p.actualG! / 1000) * prices[i]!,
      0,
    );
    expect(before.body.cost!.total).toBeCloseTo(atStart, 9);

    // Prices the batch keeps are its own: a later price change does not reprice it.
    await db
      .update(batches)
      .set({ detail: sql`${batches.detail} || '{"costPerKg":[24,31.5]}'::jsonb` })
      .where(eq(batches.id, row!.id));
    const priced = await call<Batch>(hub, 'GET', `/api/batches/${row!.id}`, { token: lead });
    const [a, b] = priced.body.parts.map((p) => p.actualG!);
    // a g / 1000 × 24 + b g / 1000 × 31.5, each part as weighed.
    const expected = (a! / 1000) * 24 + (b! / 1000) * 31.5;
    expect(priced.body.cost!.total).toBeCloseTo(expected, 9);
    expect(priced.body.cost!.total).toBeGreaterThan(2.7);

    const csv = await fetch(`${hub.url}/api/batches/export.csv`, {
      headers: { Authorization: `Bearer ${lead}` },
    });
    const rows = parse(await csv.text(), { columns: true, bom: true }) as Record<string, string>[];
    const line = rows.find((r) => r.number === String(row!.id))!;
    expect(Number(line.costTotal)).toBe(Math.round(expected * 100) / 100);
  });
});
