import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  getCodec,
  LineSplitter,
  type LiveServerEvents,
  type ReadingEvent,
  type ScaleStatusEvent,
} from '@tareline/protocol';
import { SimulatedScale } from '@tareline/simulator';
import { SerialPort } from 'serialport';
import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

async function until(what: string, check: () => boolean, timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

/** A socat pseudo-terminal pair: one end for the simulator, one for the hub. Killing it unplugs. */
class PtyPair {
  private child: ChildProcess | undefined;
  constructor(
    readonly scaleEnd: string,
    readonly hubEnd: string,
  ) {}

  async plug(): Promise<void> {
    const child = spawn(
      'socat',
      [`pty,raw,echo=0,link=${this.scaleEnd}`, `pty,raw,echo=0,link=${this.hubEnd}`],
      { stdio: 'ignore' },
    );
    this.child = child;
    const deadline = Date.now() + 5_000;
    for (;;) {
      const made = await Promise.all([stat(this.scaleEnd), stat(this.hubEnd)]).then(
        () => true,
        () => false,
      );
      if (made) return;
      if (Date.now() > deadline || child.exitCode !== null) {
        child.kill('SIGKILL');
        throw new Error('socat did not create the pseudo-terminals (is socat installed?)');
      }
      await new Promise((r) => setTimeout(r, 20));
    }
  }

  async unplug(): Promise<void> {
    const child = this.child;
    if (!child || child.exitCode !== null) return;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await exited;
  }
}

/** The simulator on the scale end of the pair, through the real serialport bindings. */
async function attachSimulator(
  path: string,
  simulator: SimulatedScale,
): Promise<() => Promise<void>> {
  const port = new SerialPort({ path, baudRate: 9600, autoOpen: false });
  await new Promise<void>((resolve, reject) => port.open((err) => (err ? reject(err) : resolve())));
  const commands = new LineSplitter();
  port.on('data', (chunk: Buffer) => {
    for (const line of commands.push(chunk.toString('latin1'))) simulator.receive(line);
  });
  port.on('error', () => undefined);
  const off = simulator.onLine((line) => {
    if (port.isOpen) port.write(`${line}\r\n`);
  });
  return () =>
    new Promise<void>((resolve) => {
      off();
      if (!port.isOpen) return resolve();
      port.close(() => resolve());
    });
}

describe('a scale on a real pseudo-terminal, read by the hub and seen on the live socket', () => {
  let folder: string;
  let pty: PtyPair;
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let socket: Socket<LiveServerEvents>;
  const simulator = new SimulatedScale({ format: 'headered', rateHz: 20, seed: 11 });
  let detach: () => Promise<void> = async () => undefined;
  const printed: string[] = [];
  const readings: ReadingEvent[] = [];
  const states: (ScaleStatusEvent & { at: number })[] = [];

  beforeAll(async () => {
    folder = await mkdtemp(join(tmpdir(), 'tareline-pty-'));
    pty = new PtyPair(join(folder, 'scale'), join(folder, 'hub'));
    await pty.plug();
    simulator.onLine((line) => printed.push(line));
    simulator.start();
    detach = await attachSimulator(pty.scaleEnd, simulator);
    data = await tempDataDir();
    hub = await startTestHub(data.dir, {
      TARELINE_SCALE: `serial://${pty.hubEnd}?baud=9600&format=auto`,
    });
    // The live socket needs a signed-in person; a lead may watch any bench.
    const token = await login(hub, DEMO.lead.email, DEMO.lead.password);
    socket = io(`${hub.url}/live`, {
      query: { benchId: 'bench-1' },
      auth: { token },
      transports: ['websocket'],
    });
    socket.on('reading', (r) => readings.push(r));
    socket.on('scaleStatus', (s) => states.push({ ...s, at: Date.now() }));
  });

  afterAll(async () => {
    socket?.disconnect();
    await hub?.close();
    await detach();
    simulator.stop();
    await pty?.unplug();
    await data?.remove();
    await rm(folder, { recursive: true, force: true });
  });

  it('recognises the format and delivers the scripted pour in order', async () => {
    // The first start compiles and opens the port under a busy CI machine: give it time.
    await until('online', () => states.at(-1)?.state === 'online', 30_000);
    expect(states.at(-1)?.detail).toMatch(/headered lines \(recognised\)/);
    // The port is bench-1's alone: the demo's second bench, with no scale URL of its own, does not
    // read it too (two links on one port fought over its lock and took turns failing).
    const token = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const benches = await call<{ id: string }[]>(hub, 'GET', '/api/benches', { token });
    expect(benches.body.map((b) => b.id)).toEqual(['bench-1']);
    const from = readings.length;
    await simulator.runScript([
      { do: 'place-cup', massG: 40 },
      { do: 'settle' },
      { do: 'pour', grams: 25, rateGPerS: 10 },
      { do: 'settle' },
      { do: 'wait', seconds: 0.5 },
    ]);
    await new Promise((r) => setTimeout(r, 300));
    const codec = getCodec('headered');
    const sent = printed.flatMap((line) => {
      const parsed = codec.parse(line);
      return parsed.kind === 'weight' ? [parsed.grams] : [];
    });
    const got = readings.slice(from).map((r) => r.grossG);
    // Every socket reading is one the simulator printed, in the order it printed them.
    let cursor = 0;
    for (const grams of got) {
      const found = sent.indexOf(grams, cursor);
      expect(found, `reading ${grams} g out of order or never printed`).toBeGreaterThanOrEqual(
        cursor,
      );
      cursor = found;
    }
    // 20 lines a second fit under the 25-a-second limit: nearly all of the pour's lines arrive.
    const pourLines = sent.filter((g) => g > 40.5 && g < 64.5).length;
    const pourReadings = got.filter((g) => g > 40.5 && g < 64.5).length;
    expect(pourReadings).toBeGreaterThan(pourLines * 0.8);
    expect(got.at(-1)).toBeCloseTo(65, 1);
    expect(readings.at(-1)?.stable).toBe(true);
  });

  it('goes offline when the pty closes and is online again within 3 s of replugging', async () => {
    // The first start compiles and opens the port under a busy CI machine: give it time.
    await until('online', () => states.at(-1)?.state === 'online', 30_000);
    await detach();
    await pty.unplug();
    await until('offline', () => states.at(-1)?.state === 'offline');
    // Unplugged for a while: the hub keeps trying, and stays offline (not an error).
    await new Promise((r) => setTimeout(r, 1_500));
    expect(states.at(-1)?.state).toBe('offline');
    expect(states.some((s) => s.state === 'error')).toBe(false);

    await pty.plug();
    detach = await attachSimulator(pty.scaleEnd, simulator);
    const replugged = Date.now();
    await until('online again', () => states.at(-1)?.state === 'online', 3_000);
    expect(Date.now() - replugged).toBeLessThan(3_000);
  });
});
