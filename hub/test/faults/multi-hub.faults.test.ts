import { rm, mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type {
  Batch,
  BatchEvent,
  BatchPage,
  BenchSummary,
  LiveServerEvents,
  Material,
  PourEvent,
  ReadingEvent,
  ScaleStatusEvent,
  SignInResponse,
} from '@tareline/protocol';
import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO } from '../support/auth-helpers.js';
import { createDatabase, providedPgAdminUrl, serverEnv } from '../support/test-app.js';
import { startBuiltHub, type BuiltHub } from './built-hub.js';

// Two built hubs (their own processes) on one throwaway PostgreSQL server: "hall-a" reads
// bench-1's simulated scale, "hall-b" reads none. Killed with SIGKILL, as a power cut would.
const SCALE = 'sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=5';

interface Answer<T> {
  status: number;
  body: T;
}

async function call<T = Batch & { message: string }>(
  hub: BuiltHub,
  method: string,
  path: string,
  token?: string,
  body?: unknown,
): Promise<Answer<T>> {
  const res = await fetch(`${hub.url}${path}`, {
    method,
    headers: {
      ...(body !== undefined ? { 'Content-Type': 'application/json' } : {}),
      ...(token ? { Authorization: `Bearer ${token}` } : {}),
    },
    body: body !== undefined ? JSON.stringify(body) : undefined,
  });
  const text = await res.text();
  return { status: res.status, body: (text ? JSON.parse(text) : undefined) as T };
}

function watch(hub: BuiltHub, token: string) {
  const seen = {
    readings: [] as ReadingEvent[],
    statuses: [] as ScaleStatusEvent[],
    batches: [] as BatchEvent[],
    pours: [] as PourEvent[],
  };
  const socket: Socket<LiveServerEvents> = io(`${hub.url}/live`, {
    query: { benchId: 'bench-1' },
    auth: { token },
    transports: ['websocket'],
  });
  socket.on('reading', (r) => seen.readings.push(r));
  socket.on('scaleStatus', (s) => seen.statuses.push(s));
  socket.on('batch', (b) => seen.batches.push(b));
  socket.on('pour', (p) => seen.pours.push(p));
  const connected = new Promise<void>((resolve, reject) => {
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });
  return { socket, seen, connected };
}

describe('two built hubs on one PostgreSQL server', () => {
  let dirs: string[] = [];
  let env: Record<string, string>;
  let hallA: BuiltHub;
  let hallB: BuiltHub;
  let operator: string;
  let lead: string;
  let sc14: Material;

  const startA = () =>
    startBuiltHub(dirs[0]!, {
      ...env,
      TARELINE_HUB_ID: 'hall-a',
      TARELINE_SCALE: SCALE,
      TARELINE_SAVE_DWELL_MS: '400',
    });
  const startB = () =>
    startBuiltHub(dirs[1]!, { ...env, TARELINE_HUB_ID: 'hall-b', TARELINE_SCALE: 'none' });

  async function benchState(hub: BuiltHub): Promise<string | undefined> {
    const benches = await call<BenchSummary[]>(hub, 'GET', '/api/benches', operator);
    return benches.body.find((b) => b.id === 'bench-1')?.scale.state;
  }

  beforeAll(async () => {
    const adminUrl = providedPgAdminUrl();
    if (!adminUrl) throw new Error('needs the PostgreSQL global setup (vitest.faults.config.ts)');
    env = { ...serverEnv(await createDatabase(adminUrl)), TARELINE_SIGN_IN_LIMIT: '1000' };
    dirs = [
      await mkdtemp(join(tmpdir(), 'tareline-hall-a-')),
      await mkdtemp(join(tmpdir(), 'tareline-hall-b-')),
    ];
    // Both start at once on an empty database: one migrates and seeds, the other waits.
    [hallA, hallB] = await Promise.all([startA(), startB()]);
    const signIn = await call<SignInResponse>(hallB, 'POST', '/api/auth/badge', undefined, {
      benchId: 'bench-1',
      badge: DEMO.joss.badge,
    });
    expect(signIn.status).toBe(200);
    operator = signIn.body.token;
    const login = await call<SignInResponse>(hallB, 'POST', '/api/auth/login', undefined, {
      email: DEMO.lead.email,
      password: DEMO.lead.password,
    });
    lead = login.body.token;
    const materials = await call<Material[]>(hallB, 'GET', '/api/materials', operator);
    sc14 = materials.body.find((m) => m.name.includes('SC-14'))!;
    await vi.waitFor(async () => expect(await benchState(hallB)).toBe('online'), {
      timeout: 15_000,
      interval: 250,
    });
  });

  afterAll(async () => {
    await hallB?.stop();
    await hallA?.stop();
    for (const dir of dirs) await rm(dir, { recursive: true, force: true });
  });

  const simulate = (hub: BuiltHub, steps: unknown[]) =>
    call(hub, 'POST', '/api/benches/bench-1/simulator', operator, steps).then((a) =>
      expect(a.status, JSON.stringify(a.body)).toBe(200),
    );

  async function startBatch(hub: BuiltHub): Promise<number> {
    const created = await call(hub, 'POST', '/api/batches', operator, {
      benchId: 'bench-1',
      materialId: sc14.id,
      totalMassG: 114,
      lots: [
        { part: 0, code: 'SC14R-2609' },
        { part: 1, code: 'SC14H-2511' },
      ],
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    return created.body.id;
  }

  it("sends hall-a's readings to a screen on hall-b, in order", async () => {
    const screen = watch(hallB, operator);
    await screen.connected;
    await vi.waitFor(() => expect(screen.seen.readings.length).toBeGreaterThanOrEqual(30), {
      timeout: 15_000,
    });
    screen.socket.disconnect();
    const times = screen.seen.readings.map((r) => r.t);
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });

  it("saves a batch started and poured through hall-b's API on hall-a's bench; both list it", async () => {
    const screen = watch(hallB, operator);
    await screen.connected;
    const id = await startBatch(hallB);
    await simulate(hallB, [{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    expect((await call(hallB, 'POST', `/api/batches/${id}/tare`, operator)).status).toBe(201);
    await simulate(hallB, [{ do: 'pour', grams: 100, rateGPerS: 40 }, { do: 'settle' }]);
    await vi.waitFor(
      () => {
        const last = screen.seen.pours.at(-1);
        expect(last?.stable && Math.abs(last.netG - 100) < 0.02).toBe(true);
      },
      { timeout: 20_000 },
    );
    expect((await call(hallB, 'POST', `/api/batches/${id}/next`, operator)).status).toBe(201);
    await vi.waitFor(() => expect(screen.seen.batches.at(-1)?.batch?.active?.tared).toBe(true), {
      timeout: 15_000,
    });
    await simulate(hallB, [
      { do: 'pour', grams: 13, rateGPerS: 6 },
      { do: 'pour', grams: 1.1, rateGPerS: 0.5 },
      { do: 'settle' },
    ]);
    await vi.waitFor(() => expect(screen.seen.batches.at(-1)?.batch?.state).toBe('saved'), {
      timeout: 20_000,
    });
    screen.socket.disconnect();
    for (const hub of [hallA, hallB]) {
      const page = await call<BatchPage>(hub, 'GET', '/api/batches?limit=10', lead);
      expect(page.body.items.find((b) => b.id === id)).toMatchObject({
        state: 'saved',
        verdict: 'GO',
        benchId: 'bench-1',
      });
    }
    await simulate(hallB, [{ do: 'lift-cup' }]);
  });

  it('leaves hall-a unaffected when hall-b is killed', async () => {
    await hallB.kill();
    const screen = watch(hallA, operator);
    await screen.connected;
    const count = screen.seen.readings.length;
    await vi.waitFor(() => expect(screen.seen.readings.length).toBeGreaterThan(count + 20), {
      timeout: 15_000,
    });
    const health = await call<{ status: string }>(hallA, 'GET', '/api/health');
    expect(health.body.status).toBe('ok');
    expect(await benchState(hallA)).toBe('online');
    // A batch through hall-a itself still runs.
    const id = await startBatch(hallA);
    const abandoned = await call(hallA, 'POST', `/api/batches/${id}/abandon`, operator, {
      reason: 'test of a killed neighbour',
    });
    expect(abandoned.body.state).toBe('abandoned');
    screen.socket.disconnect();
    hallB = await startB();
  });

  it('interrupts the batch of a hall-a killed mid-pour, and resumes it after its restart', async () => {
    await vi.waitFor(async () => expect(await benchState(hallB)).toBe('online'), {
      timeout: 15_000,
      interval: 250,
    });
    const screen = watch(hallB, operator);
    await screen.connected;
    const id = await startBatch(hallB);
    await simulate(hallB, [{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    expect((await call(hallB, 'POST', `/api/batches/${id}/tare`, operator)).status).toBe(201);
    // The pour is under way (the request answers when the flow stops; not awaited).
    void call(hallB, 'POST', '/api/benches/bench-1/simulator', operator, [
      { do: 'pour', grams: 60, rateGPerS: 10 },
    ]);
    await vi.waitFor(() => expect(screen.seen.pours.at(-1)?.netG ?? 0).toBeGreaterThan(5), {
      timeout: 15_000,
    });
    await hallA.kill();
    const killedAt = Date.now();
    await vi.waitFor(() => expect(screen.seen.statuses.at(-1)?.state).toBe('offline'), {
      timeout: 10_000,
      interval: 50,
    });
    expect(Date.now() - killedAt).toBeLessThan(5_000);
    await vi.waitFor(() => expect(screen.seen.batches.at(-1)?.batch?.state).toBe('interrupted'), {
      timeout: 10_000,
    });
    const stored = await call(hallB, 'GET', `/api/batches/${id}`, lead);
    expect(stored.body).toMatchObject({ state: 'interrupted' });
    expect(stored.body.interruptedReason).toMatch(/hall-a/);
    // An intent at the silent hub's bench is refused in words.
    const refused = await call(hallB, 'POST', `/api/batches/${id}/resume`, operator);
    expect(refused.status).toBe(503);

    hallA = await startA();
    await vi.waitFor(async () => expect(await benchState(hallB)).toBe('online'), {
      timeout: 15_000,
      interval: 250,
    });
    const resumed = await call(hallB, 'POST', `/api/batches/${id}/resume`, operator);
    expect(resumed.status, JSON.stringify(resumed.body)).toBe(201);
    expect(resumed.body.state).toBe('weighing-a');
    const abandoned = await call(hallB, 'POST', `/api/batches/${id}/abandon`, operator, {
      reason: 'end of test',
    });
    expect(abandoned.body.state).toBe('abandoned');
    screen.socket.disconnect();
  });
});
