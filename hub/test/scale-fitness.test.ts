import type { Batch, Material } from '@tareline/protocol';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { AuditRepository } from '../src/audit/audit.repository.js';
import { Database } from '../src/database/database.js';
import { benches } from '../src/database/schema/index.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

// A simulated balance with d = 0.01 g (the simulator's default).
const SCALE = 'sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=7';
// Sign-ins and override attempts share this budget per address (the hub's sign-in throttle).
const LIMIT = 8;

type Answer = Batch & { message: string; errors: { path: string; message: string }[] };

describe('a batch too small for the bench scale (USP <41> minimum net mass)', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let operator: string;
  let lr27: Material;
  let attempts = 0;

  const start = (body: Record<string, unknown>) => {
    if (body.override) attempts += 1;
    return call<Answer>(hub, 'POST', '/api/batches', {
      token: operator,
      body: { benchId: 'bench-1', materialId: lr27.id, totalMassG: 2, ...body },
    });
  };

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, {
      TARELINE_SCALE: SCALE,
      TARELINE_SIGN_IN_LIMIT: String(LIMIT),
    });
    const admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    // An operator who happens to have a desk password: still not a lead.
    const added = await call(hub, 'POST', '/api/people', {
      token: admin,
      body: {
        name: 'Rafe Mallory',
        role: 'operator',
        email: 'rafe.mallory@hollin-ridge.example',
        password: 'rafe-operator-demo',
      },
    });
    expect(added.status).toBe(201);
    const signedIn = await badgeSignIn(hub, DEMO.joss.badge);
    expect(signedIn.status).toBe(200);
    operator = signedIn.body.token;
    attempts = 2; // the admin's login and Joss's badge
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: operator });
    lr27 = materials.body.find((m) => m.name.includes('LR-27'))!;
    expect(lr27.weightRatio).toEqual([100, 27]);
  }, 60_000);

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  it('refuses 2 g of a 100:27 epoxy on a 0.01 g scale, naming the smallest batch', async () => {
    // Part B = 2 × 27 / 127 = 0.425 g; USP <41>: m_min = 2 × 0.41 × 0.01 / 0.01 = 0.82 g at ±1 %;
    // smallest batch 0.82 × 127 / 27 = 3.857 → 3.86 g (hand calculation).
    const refused = await start({});
    expect(refused.status).toBe(409);
    expect(refused.body.errors[0]!.path).toBe('SCALE_TOO_COARSE');
    expect(refused.body.message).toMatch(/Part B would be 0\.425 g, below the 0\.82 g/);
    expect(refused.body.message).toMatch(/smallest batch it can weigh is 3\.86 g/);
    // A batch at that size starts without anyone's leave.
    const fits = await start({ totalMassG: 3.86 });
    expect(fits.status).toBe(201);
    expect(fits.body.scaleOverride).toBeUndefined();
    const gone = await call(hub, 'POST', `/api/batches/${fits.body.id}/abandon`, {
      token: operator,
      body: { reason: 'test: only checking that it starts' },
    });
    expect(gone.status).toBe(201);
  });

  it("refuses a wrong password and an operator's own, and starts on a lead's", async () => {
    const wrong = await start({ override: { email: DEMO.lead.email, password: 'not-the-one' } });
    expect(wrong.status).toBe(401);
    expect(wrong.body.message).toMatch(/not recognised/);

    const byOperator = await start({
      override: { email: 'rafe.mallory@hollin-ridge.example', password: 'rafe-operator-demo' },
    });
    expect(byOperator.status).toBe(403);
    expect(byOperator.body.message).toMatch(/Only a lead/);

    // Nothing was started by the refused attempts: the bench is free.
    const current = await call<{ batch: Batch | null }>(
      hub,
      'GET',
      '/api/batches/current?benchId=bench-1',
      { token: operator },
    );
    expect(current.body.batch).toBeNull();

    const allowed = await start({ override: DEMO.lead });
    expect(allowed.status).toBe(201);
    expect(allowed.body.state).toBe('weighing-a');
    expect(allowed.body.scaleOverride).toMatchObject({
      by: { name: expect.stringMatching(/Ilse/) },
      smallestBatchG: 3.86,
    });
    expect(allowed.body.scaleOverride!.minNetG).toBeCloseTo(0.82, 10);
    // The lead who allowed it is named among those who handled the batch.
    expect(allowed.body.handledBy?.map((h) => h.role)).toEqual(['lead']);

    const trail = await hub.app
      .get(AuditRepository)
      .list({ entity: 'bench', entityId: 'bench-1', limit: 10 });
    const overrides = trail.filter((e) => e.action === 'scale-fitness.override');
    expect(overrides).toHaveLength(1);
    expect(overrides[0]!.actor?.name).toMatch(/Ilse/);
    expect(overrides[0]!.data).toMatchObject({ totalMassG: 2, part: 1, smallestBatchG: 3.86 });

    await call(hub, 'POST', `/api/batches/${allowed.body.id}/abandon`, {
      token: operator,
      body: { reason: 'test: override checked' },
    });
  });

  it("uses the bench's measured repeatability once a scale check has stored one", async () => {
    const db = hub.app.get(Database).db;
    // As a repeatability check would leave it: s = 0.01 g, above the 0.41 d floor (0.0041 g).
    await db.update(benches).set({ repeatabilitySdG: 0.01 }).where(eq(benches.id, 'bench-1'));
    try {
      // USP <41>: minimum net mass 2 s / 1 % = 2 g; smallest 100:27 batch 2 × 127 / 27 = 9.407
      // → 9.41 g at d = 0.01 g (hand calculation). 5 g passed with the 0.41 d floor (3.86 g).
      const refused = await start({ totalMassG: 5 });
      expect(refused.status).toBe(409);
      expect(refused.body.message).toMatch(/smallest batch it can weigh is 9\.41 g/);
    } finally {
      await db.update(benches).set({ repeatabilitySdG: null }).where(eq(benches.id, 'bench-1'));
    }
  });

  it('counts override passwords against the sign-in budget, like sign-in', async () => {
    const wrong = { override: { email: DEMO.lead.email, password: 'guess-again' } };
    while (attempts < LIMIT) expect((await start(wrong)).status).toBe(401);
    expect((await start(wrong)).status).toBe(429);
    // A batch start without a password is not a sign-in attempt and is not held back.
    expect((await start({ totalMassG: 3.86 })).status).toBe(201);
  });
});
