import type {
  Batch,
  BatchEvent,
  BenchSummary,
  LiveServerEvents,
  Material,
  PourEvent,
  ReadingEvent,
  ScaleStatusEvent,
} from '@tareline/protocol';
import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { AuditRepository } from '../src/audit/audit.repository.js';
import { BatchesRepository } from '../src/batches/batches.repository.js';
import { FORWARDED_HEADER } from '../src/hubs/intent-forwarder.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { SHARED_SECRETS, startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

// Two hubs on one PostgreSQL server: "hall-a" reads bench-1's (simulated) scale, "hall-b"
// reads none and serves screens. Everything asked of hall-b about bench-1 must behave as on
// hall-a.
const SCALE = 'sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=11';

async function until(what: string, check: () => boolean, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

function watch(hub: TestHub, token: string) {
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
    reconnection: false,
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

describe('two hubs on one PostgreSQL server', () => {
  const dirs: Awaited<ReturnType<typeof tempDataDir>>[] = [];
  let hallA: TestHub;
  let hallB: TestHub;
  let token: string;

  beforeAll(async () => {
    dirs.push(await tempDataDir(), await tempDataDir());
    hallA = await startTestHub(dirs[0]!.dir, {
      TARELINE_HUB_ID: 'hall-a',
      TARELINE_SCALE: SCALE,
      TARELINE_SAVE_DWELL_MS: '400',
      TARELINE_SIGN_IN_LIMIT: '1000',
    });
    hallB = await startTestHub(dirs[1]!.dir, {
      DATABASE_URL: hallA.config.database.url!,
      ...SHARED_SECRETS,
      TARELINE_HUB_ID: 'hall-b',
      TARELINE_SCALE: 'none',
      TARELINE_SIGN_IN_LIMIT: '1000',
    });
    const signIn = await badgeSignIn(hallB, DEMO.joss.badge);
    expect(signIn.status).toBe(200);
    token = signIn.body.token;
    // hall-a tells the others about its scale with its heartbeat, once it reads it.
    await vi.waitFor(
      async () => {
        const benches = await call<BenchSummary[]>(hallB, 'GET', '/api/benches', { token });
        expect(benches.body.find((b) => b.id === 'bench-1')?.scale.state).toBe('online');
      },
      { timeout: 10_000, interval: 200 },
    );
  });

  afterAll(async () => {
    await hallB?.close();
    await hallA?.close().catch(() => undefined);
    for (const dir of dirs) await dir.remove();
  });

  it('lists the bench whose scale the other hub reads, with its live state', async () => {
    const benches = await call<BenchSummary[]>(hallB, 'GET', '/api/benches', { token });
    expect(benches.status).toBe(200);
    const bench1 = benches.body.find((b) => b.id === 'bench-1');
    expect(bench1?.scale).toMatchObject({ state: 'online', transport: 'simulated' });
  });

  it("sends the other hub's readings to a screen here, in the order they were read", async () => {
    const screen = watch(hallB, token);
    await screen.connected;
    await until('20 readings', () => screen.seen.readings.length >= 20);
    screen.socket.disconnect();
    const times = screen.seen.readings.map((r) => r.t);
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });

  it("starts and pours a batch through this hub's API; the owning hub saves it; both list it", async () => {
    const screen = watch(hallB, token);
    await screen.connected;
    const materials = await call<Material[]>(hallB, 'GET', '/api/materials', { token });
    const sc14 = materials.body.find((m) => m.name.includes('SC-14'))!;
    const post = <T = Batch>(path: string, body?: unknown) =>
      call<T & { message: string }>(hallB, 'POST', path, {
        token,
        ...(body !== undefined ? { body } : {}),
      });
    const created = await post('/api/batches', {
      benchId: 'bench-1',
      materialId: sc14.id,
      totalMassG: 114,
      lots: [
        { part: 0, code: 'SC14R-2609' },
        { part: 1, code: 'SC14H-2511' },
      ],
    });
    expect(created.status).toBe(201);
    const id = created.body.id;
    const simulate = (steps: unknown[]) =>
      post('/api/benches/bench-1/simulator', steps).then((a) => expect(a.status).toBe(200));
    await simulate([{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    expect((await post(`/api/batches/${id}/tare`)).status).toBe(201);
    await simulate([{ do: 'pour', grams: 100, rateGPerS: 40 }, { do: 'settle' }]);
    await until('a steady 100 g', () => {
      const last = screen.seen.pours.at(-1);
      return !!last && last.stable && Math.abs(last.netG - 100) < 0.02;
    });
    // The same refusal, in the same words, as on the owning hub.
    const retare = await post(`/api/batches/${id}/tare`);
    expect(retare.status).toBe(409);
    expect(retare.body.message).toMatch(/g are in this pour already/);
    expect((await post(`/api/batches/${id}/next`)).status).toBe(201);
    await until('part B tared', () => screen.seen.batches.at(-1)?.batch?.active?.tared === true);
    await simulate([
      { do: 'pour', grams: 13, rateGPerS: 6 },
      { do: 'pour', grams: 1.1, rateGPerS: 0.5 },
      { do: 'settle' },
    ]);
    await until('saved', () => screen.seen.batches.at(-1)?.batch?.state === 'saved');
    screen.socket.disconnect();
    expect(screen.seen.batches.at(-1)?.batch).toMatchObject({ id, verdict: 'GO' });
    for (const hub of [hallA, hallB]) {
      const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
      const stored = await call<Batch>(hub, 'GET', `/api/batches/${id}`, { token: lead });
      expect(stored.body).toMatchObject({ id, state: 'saved', verdict: 'GO', benchId: 'bench-1' });
    }
    await simulate([{ do: 'lift-cup' }]);
  });

  it('gives batch numbers without a gap or a repeat when both hubs start batches at once', async () => {
    const materials = await call<Material[]>(hallA, 'GET', '/api/materials', { token });
    const materialId = materials.body[0]!.id;
    const rows = await Promise.all(
      [hallA, hallB, hallA, hallB, hallA, hallB].map((hub, i) =>
        hub.app.get(BatchesRepository).insert({
          benchId: 'bench-1',
          operatorId: 'test',
          operatorName: 'Test',
          materialId,
          materialName: `race ${i}`,
          state: 'abandoned',
          totalMassG: 1,
          weightRatio: [1, 1],
          tolerancePct: 1,
          readabilityG: 0.01,
          detail: {},
        }),
      ),
    );
    const ids = rows.map((r) => r.id).sort((a, b) => a - b);
    expect(ids).toEqual(ids.map((_, i) => ids[0]! + i));
  });

  it('keeps one audit chain when both hubs append at once', async () => {
    await Promise.all(
      Array.from({ length: 12 }, (_, i) =>
        (i % 2 ? hallA : hallB).app.get(AuditRepository).record(
          async () => i,
          (n) => ({
            at: new Date().toISOString(),
            actor: null,
            entity: 'test',
            entityId: String(n),
            action: 'race',
            data: { n },
          }),
        ),
      ),
    );
    const lead = await login(hallA, DEMO.lead.email, DEMO.lead.password);
    const verify = await call<{ ok: boolean; firstBrokenId: number | null }>(
      hallB,
      'GET',
      '/api/audit/verify',
      { token: lead },
    );
    expect(verify.body).toMatchObject({ ok: true, firstBrokenId: null });
  });

  it('refuses a handed-on request with a wrong signature, and a backup, in words', async () => {
    const forged = await fetch(`${hallA.url}/api/batches/current?benchId=bench-1`, {
      headers: { authorization: `Bearer ${token}`, [FORWARDED_HEADER]: 'hall-b.0.bad' },
    });
    expect(forged.status).toBe(401);
    expect(((await forged.json()) as { message: string }).message).toMatch(/TARELINE_JWT_SECRET/);
    const admin = await login(hallB, DEMO.admin.email, DEMO.admin.password);
    const backup = await call<{ message: string }>(hallB, 'GET', '/api/backup', { token: admin });
    expect(backup.status).toBe(422);
    expect(backup.body.message).toMatch(/pg_dump/);
  });

  it('shows the bench offline here within 5 s once its hub stops', async () => {
    const screen = watch(hallB, token);
    await screen.connected;
    await hallA.close();
    const stoppedAt = Date.now();
    await until('offline', () => screen.seen.statuses.at(-1)?.state === 'offline', 10_000);
    expect(Date.now() - stoppedAt).toBeLessThan(5_000);
    expect(screen.seen.statuses.at(-1)!.detail).toMatch(/hall-a/);
    const benches = await call<BenchSummary[]>(hallB, 'GET', '/api/benches', { token });
    expect(benches.body.find((b) => b.id === 'bench-1')?.scale.state).toBe('offline');
    // An intent at it is refused in words, nothing changed.
    const current = await call<{ message: string }>(
      hallB,
      'GET',
      '/api/batches/current?benchId=bench-1',
      { token },
    );
    expect(current.status).toBe(503);
    expect(current.body.message).toMatch(/hall-a.*not answering/);
    screen.socket.disconnect();
  });
});
