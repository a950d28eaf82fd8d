import { apiErrorSchema, planResponseSchema } from '@tareline/protocol';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ACCESS_POLICY } from '../src/auth/access.decorator.js';
import { PlanController } from '../src/plan/plan.controller.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

const epoxy = { ratio: { basis: 'weight', parts: [100, 14] }, specificGravity: 1.2 };
const box = { shape: 'box', length: 10, width: 8, height: 3, unit: 'in' };

describe('POST /api/plan on the real hub', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir);
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  function post(body: unknown, contentType = 'application/json') {
    return fetch(`${hub.url}/api/plan`, {
      method: 'POST',
      headers: { 'Content-Type': contentType },
      body: typeof body === 'string' ? body : JSON.stringify(body),
    });
  }

  async function expectBad(body: unknown, fields: Record<string, RegExp>, contentType?: string) {
    const res = await post(body, contentType);
    expect(res.status).toBe(400);
    const error = apiErrorSchema.parse(await res.json());
    expect(error.message).toBeTruthy();
    const byPath = Object.fromEntries(error.errors.map((e) => [e.path, e.message]));
    expect(Object.keys(byPath).sort()).toEqual(Object.keys(fields).sort());
    for (const [path, message] of Object.entries(fields)) expect(byPath[path]).toMatch(message);
    return error;
  }

  it('is declared public: it computes and stores nothing', () => {
    expect(Reflect.getMetadata(ACCESS_POLICY, PlanController.prototype.plan)).toEqual({
      kind: 'public',
    });
  });

  it('answers 200 with every step of the plan', async () => {
    const res = await post({
      cavity: box,
      displacement: { volume: 60, unit: 'in3' },
      overagePct: 10,
      cupLossG: 15,
      material: epoxy,
      scale: { readabilityG: 0.1, repeatabilityG: 0.05, capacityG: 4000 },
    });
    expect(res.status).toBe(200);
    const plan = planResponseSchema.parse(await res.json());
    // 10 × 8 × 3 in = 240 in³; − 60 in³ = 180 in³; + 10 % = 198 in³ (arithmetic on the definitions).
    expect(plan.cavityVolumeIn3).toBeCloseTo(240, 9);
    expect(plan.netVolumeIn3).toBeCloseTo(180, 9);
    expect(plan.fillVolumeIn3).toBeCloseTo(198, 9);
    // 198 in³ × 16.387 064 cm³/in³ (1959 inch) × SG 1.2 + 15 g = 3908.566 g.
    expect(plan.totalMassG).toBeCloseTo(3908.566, 3);
    expect(plan.parts[0]!.massG + plan.parts[1]!.massG).toBeCloseTo(plan.totalMassG, 9);
    // USP <41> at a 1 % band: 2 × max(0.05, 0.41 × 0.1) / 1 % = 10 g.
    expect(plan.minNetWeightG).toBeCloseTo(10, 9);
    expect(plan.warnings.map((w) => w.code)).toEqual(['PART_VOLUMES_FROM_MIX_SG']);
  });

  it('warns when the scale is too coarse and the mix too heavy for it', async () => {
    const res = await post({
      cavity: { shape: 'volume', volume: 1, unit: 'floz' },
      material: { ratio: { basis: 'volume', parts: [1, 1] }, partSpecificGravities: [1.1, 0.98] },
      scale: { readabilityG: 0.5, capacityG: 25 },
    });
    expect(res.status).toBe(200);
    const plan = planResponseSchema.parse(await res.json());
    expect(plan.warnings.map((w) => w.code).sort()).toEqual(['OVER_CAPACITY', 'SCALE_TOO_COARSE']);
  });

  it('names each bad size, number and unit', async () => {
    await expectBad(
      {
        cavity: { shape: 'box', length: 0, width: -2, height: 'three', unit: 'ft' },
        material: epoxy,
      },
      {
        'cavity.length': /more than zero/,
        'cavity.width': /more than zero/,
        'cavity.height': /must be a number/,
        'cavity.unit': /Choose a length unit/,
      },
    );
    await expectBad(
      { cavity: { shape: 'volume', volume: 5, unit: 'bucket' }, material: epoxy },
      { 'cavity.unit': /Choose a volume unit/ },
    );
    await expectBad({ cavity: { shape: 'pyramid' }, material: epoxy }, { 'cavity.shape': /shape/ });
    await expectBad(
      { cavity: { shape: 'cylinder', height: 2, unit: 'in' }, material: epoxy },
      { 'cavity.diameter': /Enter the diameter/ },
    );
  });

  it('refuses a model larger than the cavity, naming the model', async () => {
    await expectBad(
      { cavity: box, displacement: { volume: 300, unit: 'in3' }, material: epoxy },
      { 'displacement.volume': /as much room as the cavity or more/ },
    );
  });

  it('refuses water outside the density table', async () => {
    await expectBad(
      { cavity: { shape: 'water', waterMassG: 850, waterTempC: 45 }, material: epoxy },
      { 'cavity.waterTempC': /between 0 and 40 °C/ },
    );
  });

  it('refuses a bad ratio or a material without its density', async () => {
    await expectBad(
      {
        cavity: box,
        material: { ratio: { basis: 'weight', parts: [100, 0] }, specificGravity: 1 },
      },
      { 'material.ratio.parts.1': /more than zero/ },
    );
    await expectBad(
      { cavity: box, material: { ratio: { basis: 'volume', parts: [1, 1] }, specificGravity: 1 } },
      { 'material.partSpecificGravities': /needs each part's specific gravity/ },
    );
    await expectBad(
      { cavity: box, material: { ratio: { basis: 'weight', parts: [1, 1] } } },
      { 'material.specificGravity': /specific gravity or its yield/ },
    );
    await expectBad(
      { cavity: box, material: epoxy, tolerancePct: 0, overagePct: -1, cupLossG: -3 },
      {
        tolerancePct: /more than zero/,
        overagePct: /cannot be negative/,
        cupLossG: /cannot be negative/,
      },
    );
  });

  it('refuses sizes too large to compute instead of answering nonsense', async () => {
    await expectBad(
      { cavity: { ...box, length: 1e300, width: 1e300 }, material: epoxy },
      { cavity: /too large/ },
    );
  });

  it('answers 400, never 500, for bodies that are not a plan at all', async () => {
    await expectBad('{"cavity": ', {});
    await expectBad('[1, 2]', { '(body)': /JSON object/ });
    await expectBad('null', {});
    await expectBad('cavity=box', { '(body)': /JSON object/ }, 'text/plain');
    await expectBad({}, { cavity: /shape/, material: /mix ratio/ });
  });
});
