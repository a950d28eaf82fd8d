import {
  benchListSchema,
  readingEventSchema,
  type LiveServerEvents,
  type ReadingEvent,
  type ScaleStatusEvent,
} from '@tareline/protocol';
import { io, type Socket } from 'socket.io-client';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

type LiveSocket = Socket<LiveServerEvents>;

async function until(what: string, check: () => boolean, timeoutMs = 5_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('live weights from the simulated bench over socket.io', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  const sockets: LiveSocket[] = [];
  // A lead signed in at a desk may watch any bench.
  let token: string;

  function watch(benchId: string) {
    const socket: LiveSocket = io(`${hub.url}/live`, {
      query: { benchId },
      auth: { token },
      transports: ['websocket'],
      reconnection: false,
    });
    sockets.push(socket);
    const readings: ReadingEvent[] = [];
    const states: ScaleStatusEvent[] = [];
    socket.on('reading', (r) => readings.push(r));
    socket.on('scaleStatus', (s) => states.push(s));
    return { socket, readings, states };
  }

  beforeAll(async () => {
    data = await tempDataDir();
    // 50 lines a second: twice what the socket may carry, to see the throttle at work.
    hub = await startTestHub(data.dir, {
      TARELINE_SCALE: 'sim://?format=headered&rateHz=50&seed=4',
    });
    token = await login(hub, DEMO.lead.email, DEMO.lead.password);
  });

  afterEach(() => {
    for (const socket of sockets.splice(0)) socket.disconnect();
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  it('lists bench 1 with its simulated scale', async () => {
    const res = await fetch(`${hub.url}/api/benches`, {
      headers: { Authorization: `Bearer ${token}` },
    });
    expect(res.status).toBe(200);
    const benches = benchListSchema.parse(await res.json());
    // bench-1 from TARELINE_SCALE, and the demo shop's casting bench, also simulated.
    expect(benches.map((b) => b.id)).toEqual(['bench-1', 'bench-2']);
    expect(benches[0]).toMatchObject({
      id: 'bench-1',
      name: 'Bench 1',
      scale: { benchId: 'bench-1', transport: 'simulated', readabilityG: 0.01, capacityG: 4000 },
    });
  });

  it('sends the scale state and readings in order, at most 25 a second', async () => {
    const { readings, states } = watch('bench-1');
    await until('online', () => states.some((s) => s.state === 'online'));
    const start = readings.length;
    await new Promise((r) => setTimeout(r, 2_000));
    const inTwoSeconds = readings.slice(start);
    // 50 lines a second come in; the socket carries at most 25 a second. How many fewer it
    // carries depends on the machine's load (the throttle's own timing is in
    // src/live/reading-throttle.test.ts, on fake timers): here only that readings flow.
    expect(inTwoSeconds.length).toBeLessThanOrEqual(52);
    expect(inTwoSeconds.length).toBeGreaterThan(5);
    for (const r of readings) readingEventSchema.parse(r);
    const seqs = readings.map((r) => r.seq);
    expect([...seqs].sort((a, b) => a - b)).toEqual(seqs);
  });

  it('shows a cup placed through the simulator endpoint on the socket', async () => {
    const { readings, states } = watch('bench-1');
    await until('online', () => states.some((s) => s.state === 'online'));
    const res = await fetch(`${hub.url}/api/benches/bench-1/simulator`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
      body: JSON.stringify([{ do: 'place-cup', massG: 42 }, { do: 'settle' }]),
    });
    expect(res.status).toBe(200);
    await until('the cup on the socket', () =>
      readings.some((r) => r.stable && Math.abs(r.grossG - 42) < 0.05),
    );
  });

  it('refuses the simulator to anyone not signed in', async () => {
    const res = await fetch(`${hub.url}/api/benches/bench-1/simulator`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify([{ do: 'unplug' }]),
    });
    expect(res.status).toBe(401);
  });

  it('answers a bad script with 400 naming the step, and an unknown bench with 404', async () => {
    const bad = await fetch(`${hub.url}/api/benches/bench-1/simulator`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
      body: JSON.stringify([{ do: 'pour', grams: -5, rateGPerS: 2 }]),
    });
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { message: string; errors: { path: string }[] };
    expect(body.errors[0]?.path).toBe('0.grams');
    const unknown = await fetch(`${hub.url}/api/benches/bench-9/simulator`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
      body: '[]',
    });
    expect(unknown.status).toBe(404);
  });

  it('refuses a socket for a bench that does not exist, saying so', async () => {
    const { socket } = watch('bench-404');
    const message = await new Promise<string>((resolve) =>
      socket.on('connect_error', (err) => resolve(err.message)),
    );
    expect(message).toBe('There is no bench "bench-404"');
  });

  it("tares bench 1 through the scale's own command (the cup placed above stays as gross)", async () => {
    const { readings, states } = watch('bench-1');
    await until('online', () => states.some((s) => s.state === 'online'));
    const { ScalesService } = await import('../src/scales/scales.service.js');
    const scales = hub.app.get(ScalesService);
    await until('a stable reading', () => readings.at(-1)?.stable === true);
    await scales.tare('bench-1');
    await until('net zero on the socket', () => Math.abs(readings.at(-1)?.netG ?? 99) <= 0.02);
    // The headered family tares on the balance: its lines turn net, gross stays the cup.
    expect(readings.at(-1)!.grossG).toBeGreaterThan(40);
  });
});
