import type { Batch, BenchSummary, Material, SimulatorStep } from '@tareline/protocol';
import type { BenchCheckStatus, ScaleCheck } from '@tareline/protocol/scale-checks';
import { std } from 'mathjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

// A quick simulated 0.01 g balance: small noise, no drift, simulated time 4× the wall clock.
const SCALE = 'sim://?format=headered&rateHz=20&noiseG=0.002&driftGPerMin=0&speed=4&seed=7';
const ENV = { TARELINE_SCALE: SCALE, TARELINE_SIGN_IN_LIMIT: '1000' };

async function until<T>(what: string, probe: () => Promise<T>, ok: (v: T) => boolean): Promise<T> {
  const deadline = Date.now() + 20_000;
  for (;;) {
    const value = await probe();
    if (ok(value)) return value;
    if (Date.now() > deadline)
      throw new Error(`timed out waiting for ${what}: ${JSON.stringify(value)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('scale checks at a bench, through the simulated scale', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;
  let joss: string;
  let lead: string;
  let admin: string;
  let sc14: Material;

  const simulate = (steps: SimulatorStep[]) =>
    call(hub, 'POST', '/api/benches/bench-1/simulator', { body: steps, token: joss });
  const check = (id: number) =>
    call<ScaleCheck>(hub, 'GET', `/api/benches/bench-1/checks/${id}`, { token: joss }).then(
      (a) => a.body,
    );
  const status = () =>
    call<BenchCheckStatus>(hub, 'GET', '/api/benches/bench-1/check-status', { token: joss }).then(
      (a) => a.body,
    );
  const start = (body: unknown, token = joss) =>
    call<{ id: number; state: string; message: string; errors: { path: string }[] }>(
      hub,
      'POST',
      '/api/benches/bench-1/checks',
      { body, token },
    );
  const patch = (body: unknown, token = admin, bench = 'bench-1') =>
    call<BenchCheckStatus & { message: string; errors: { path: string }[] }>(
      hub,
      'PATCH',
      `/api/benches/${bench}`,
      { body, token },
    );

  /** Starts a routine check, places the weight when told, and answers the finished check. */
  async function routine(referenceG: number): Promise<ScaleCheck> {
    const started = await start({ kind: 'routine', referenceG });
    expect(started.status).toBe(201);
    expect(started.body).toEqual({ id: expect.any(Number), state: 'waiting' });
    await until(
      'told to place the weight',
      () => check(started.body.id),
      (c) => c.step === 'place',
    );
    await simulate([{ do: 'place-weight', massG: referenceG }, { do: 'settle' }]);
    const done = await until(
      'the check done',
      () => check(started.body.id),
      (c) => c.state !== 'waiting',
    );
    await simulate([{ do: 'lift-weight' }, { do: 'settle' }]);
    return done;
  }

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, ENV);
    joss = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: joss });
    sc14 = materials.body.find((m) => m.name.includes('SC-14'))!;
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  it('passes a routine check with a 200 g weight read within max(0.1 %, 2 d) = 0.2 g', async () => {
    const done = await routine(200);
    expect(done).toMatchObject({ kind: 'routine', state: 'passed', referenceG: 200 });
    // Default tolerance: 0.1 % of 200 g (USP General Chapter <41>) = 0.2 g, over 2 d = 0.02 g.
    expect(done.toleranceG).toBeCloseTo(0.2, 9);
    expect(Math.abs(done.readingG! - 200)).toBeLessThanOrEqual(0.02);
    expect(done.errorG).toBeCloseTo(done.readingG! - 200, 9);
    expect(done.by.name).toBe('Joss Whitcombe');
    expect(done.finishedAt).not.toBeNull();
  });

  it('fails a routine check when the scale reads 0.5 g heavy, and says so in words', async () => {
    await simulate([{ do: 'set-scale-error', offsetG: 0.5 }]);
    const done = await routine(200);
    await simulate([{ do: 'set-scale-error', offsetG: 0 }]);
    expect(done.state).toBe('failed');
    expect(done.errorG!).toBeGreaterThan(0.45);
    expect(done.errorG!).toBeLessThan(0.55);
    expect(done.note).toMatch(/over, more than the 0\.2 g allowed/);
    const s = await status();
    expect(s).toMatchObject({ due: true, reason: 'last-failed', blocked: false });
    expect(s.message).toMatch(/last scale check at this bench failed/);
    const list = await call<ScaleCheck[]>(hub, 'GET', '/api/benches/bench-1/checks', {
      token: lead,
    });
    expect(list.body.map((c) => c.state).slice(0, 2)).toEqual(['failed', 'passed']);
  });

  it('measures repeatability over ten placements and stores s on the bench', async () => {
    // A placement-to-placement spread of 0.03 g, well above the USP floor of 0.41 d = 0.0041 g.
    await simulate([{ do: 'set-scale-error', spreadG: 0.03 }]);
    const started = await start({ kind: 'repeatability', referenceG: 100 }, lead);
    expect(started.status).toBe(201);
    const id = started.body.id;
    for (let i = 0; i < 10; i++) {
      await until(
        `placement ${i + 1} asked`,
        () => check(id),
        (c) => c.step === 'place',
      );
      await simulate([{ do: 'place-weight', massG: 100 }, { do: 'settle' }]);
      await until(
        `placement ${i + 1} read`,
        () => check(id),
        (c) => c.readings.length === i + 1,
      );
      await simulate([{ do: 'lift-weight' }, { do: 'settle' }]);
    }
    await simulate([{ do: 'set-scale-error', spreadG: 0 }]);
    const done = await until(
      'the test done',
      () => check(id),
      (c) => c.state !== 'waiting',
    );
    expect(done.state).toBe('passed');
    expect(done.readings).toHaveLength(10);
    // s (n − 1), cross-checked with mathjs std (unbiased by default).
    expect(done.sdG!).toBeCloseTo(Number(std(done.readings)), 9);
    expect(done.sdUsedG).toBeCloseTo(Math.max(done.sdG!, 0.0041), 9);
    // The demo shop's tightest band is ±1 %: m_min = 2 s / 0.01 (USP <41> at coverage 2).
    expect(done.bandPct).toBe(1);
    expect(done.minNetG!).toBeCloseTo((2 * done.sdUsedG!) / 0.01, 9);
    const benches = await call<BenchSummary[]>(hub, 'GET', '/api/benches', { token: joss });
    const bench1 = benches.body.find((b) => b.id === 'bench-1')!;
    expect(bench1.repeatabilitySdG).toBeCloseTo(done.sdUsedG!, 9);
    expect(bench1.repeatabilityAt).toBe(done.finishedAt);
  });

  it('lets a lead or the operator at the bench run checks, and no one else', async () => {
    expect((await start({ kind: 'routine', referenceG: 200 }, admin)).status).toBe(403);
    const tomas = (await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin, 'bench-2')).body.token;
    const other = await start({ kind: 'routine', referenceG: 200 }, tomas);
    expect(other.status).toBe(403);
    expect((await start({ kind: 'routine', referenceG: -1 })).body.errors[0]!.path).toBe(
      'referenceG',
    );
    expect((await start({ kind: 'routine', referenceG: 0.05 })).status).toBe(400);
    // One at a time; a waiting check can be cancelled.
    const first = await start({ kind: 'routine', referenceG: 200 });
    expect((await start({ kind: 'routine', referenceG: 200 })).status).toBe(409);
    const cancelled = await call<ScaleCheck>(
      hub,
      'POST',
      `/api/benches/bench-1/checks/${first.body.id}/cancel`,
      { token: joss },
    );
    expect(cancelled.status).toBe(200);
    expect(cancelled.body).toMatchObject({
      state: 'cancelled',
      note: 'Cancelled by Joss Whitcombe',
    });
  });

  it('checks the bench policy patch and lets only an admin make it', async () => {
    expect((await patch({ checkEveryHours: 8 }, lead)).status).toBe(403);
    const zero = await patch({ checkEveryHours: 0 });
    expect(zero.status).toBe(400);
    expect(zero.body.errors.map((e) => e.path)).toEqual(['checkEveryHours']);
    expect((await patch({})).status).toBe(400);
    expect((await patch({ calibrationDueOn: '2027-02-30' })).status).toBe(400);
    expect((await patch({ blockWhenDue: 'yes' })).status).toBe(400);
    expect((await patch({ checkEveryHours: 8 }, admin, 'no-such-bench')).status).toBe(404);
    const ok = await patch({ calibrationDueOn: '2027-03-01', checkToleranceG: 0.05 });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ calibrationDueOn: '2027-03-01', checkToleranceG: 0.05 });
    // The bench's own tolerance replaces the default 0.2 g for a 200 g weight.
    const tight = await start({ kind: 'routine', referenceG: 200 });
    expect((await check(tight.body.id)).toleranceG).toBe(0.05);
    await call(hub, 'POST', `/api/benches/bench-1/checks/${tight.body.id}/cancel`, {
      token: joss,
    });
    expect((await patch({ checkToleranceG: null })).body.checkToleranceG).toBeNull();
    // Each accepted change is in the audit trail with the admin who made it; refused ones not.
    const trail = await call<{
      items: { action: string; actor: { name: string }; data: unknown }[];
    }>(hub, 'GET', '/api/audit?entity=bench&entityId=bench-1', { token: admin });
    const changes = trail.body.items.filter((e) => e.action === 'bench.check-policy');
    expect(changes.map((e) => e.data)).toEqual([
      { calibrationDueOn: '2027-03-01', checkToleranceG: 0.05 },
      { checkToleranceG: null },
    ]);
    expect(changes[0]!.actor.name).toBe('Oda Fenwick');
  });

  it('with blockWhenDue, refuses a batch while a check is due and accepts one after a pass', async () => {
    const newBatch = () =>
      call<Batch & { message: string; errors: { path: string; message: string }[] }>(
        hub,
        'POST',
        '/api/batches',
        {
          token: joss,
          body: {
            benchId: 'bench-1',
            materialId: sc14.id,
            totalMassG: 114,
            lots: [
              { part: 0, code: 'SC14R-2609' },
              { part: 1, code: 'SC14H-2511' },
            ],
          },
        },
      );
    // The last routine check failed (the 0.5 g error above): the bench is due.
    await simulate([{ do: 'set-scale-error', offsetG: 0.5 }]);
    expect((await routine(200)).state).toBe('failed');
    await simulate([{ do: 'set-scale-error', offsetG: 0 }]);
    const policy = await patch({ checkEveryHours: 8, blockWhenDue: true });
    expect(policy.status).toBe(200);
    expect(policy.body).toMatchObject({ due: true, blocked: true, reason: 'last-failed' });
    const refused = await newBatch();
    expect(refused.status).toBe(409);
    expect(refused.body.errors[0]).toMatchObject({ path: 'SCALE_CHECK_DUE' });
    expect(refused.body.message).toMatch(/Batches wait until a check passes/);

    expect((await routine(200)).state).toBe('passed');
    expect(await status()).toMatchObject({ due: false, blocked: false, message: null });
    const accepted = await newBatch();
    expect(accepted.status).toBe(201);
    // No check while the batch is open: it would tare the cup away.
    expect((await start({ kind: 'routine', referenceG: 200 })).status).toBe(409);
    await call(hub, 'POST', `/api/batches/${accepted.body.id}/abandon`, {
      token: joss,
      body: { reason: 'test done' },
    });
  });
});
