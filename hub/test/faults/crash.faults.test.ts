import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Batch, BenchSummary, Material } from '@tareline/protocol';
import { serveTcp, SimulatedScale, type TcpAdapter } from '@tareline/simulator';
import { io, type Socket } from 'socket.io-client';
import { afterAll, describe, expect, it } from 'vitest';
import { startBuiltHub, type BuiltHub } from './built-hub.js';

/**
 * The fault suite: the built hub is killed with SIGKILL in every batch state and started again
 * at once, while the balance (a simulator behind a TCP serial adapter, in this process) keeps
 * what is physically in the cup. Every batch must still be there, and no record may claim GO
 * for a ratio the cup does not hold. `npm run test:faults`; prints a table at the end.
 */

const TRIES = Number(process.env.TARELINE_FAULT_TRIES ?? 5);
const SPEED = 4;
const D = 0.01;
/** How close a record must be to what is in the cup: max(0.5 g, 2 d). */
const SAME_G = Math.max(0.5, 2 * D);

type KillPoint =
  | 'weighing A mid-pour'
  | 'weighing B mid-pour'
  | 'weighing C mid-pour'
  | 'save dwell'
  | 'right after the save'
  | 'interrupted';

interface Row {
  point: KillPoint;
  tries: number;
  lost: number;
  wrong: number;
  goes: number;
  verdictsWhileAway: number;
  notes: string[];
}
const table: Row[] = [];

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const trace = (...args: unknown[]) => {
  if (process.env.TARELINE_FAULT_TRACE)
    console.log(new Date().toISOString().slice(11, 23), ...args);
};

async function until<T>(
  what: string,
  check: () => Promise<T | undefined> | T | undefined,
  ms = 60_000,
): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const value = await check();
    if (value !== undefined && value !== false) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(50);
  }
}

class Bench {
  hub!: BuiltHub;
  token = '';
  readonly scale: SimulatedScale;
  adapter!: TcpAdapter;
  /** Grams of each part physically poured into the current cup. */
  physical: number[] = [];
  /** Verdicts the bench screen was sent while the balance's cable was out. */
  verdictsWhileAway = 0;
  private socket: Socket | undefined;
  private unpluggedAt: number | undefined;

  constructor(
    private readonly dataDir: string,
    seed: number,
  ) {
    this.scale = new SimulatedScale({
      format: 'headered',
      rateHz: 20,
      noiseG: 0.002,
      speed: SPEED,
      seed,
    });
  }

  async open(): Promise<void> {
    this.adapter = await serveTcp(this.scale, { port: 0 });
    this.scale.start();
    this.scale.placeCup(40);
    await this.startHub();
  }

  /** Starts the hub on the same data folder; a lock left by a killed hub must not hold it up. */
  async startHub(): Promise<void> {
    const unplugged = !this.scale.plugged;
    this.hub = await startBuiltHub(this.dataDir, {
      TARELINE_SCALE: `tcp://127.0.0.1:${this.adapter.port}?format=headered`,
      TARELINE_SAVE_DWELL_MS: '1000',
      TARELINE_SIGN_IN_LIMIT: '10000',
    });
    const signIn = await this.api<{ token: string }>('POST', '/api/auth/badge', {
      benchId: 'bench-1',
      badge: 'HR-1003',
    });
    this.token = signIn.body.token;
    this.watchScreen();
    // A balance whose cable is out stays out until the operator plugs it back (in `finish`).
    if (unplugged) return;
    await until('the scale online', async () => {
      const benches = await this.api<BenchSummary[]>('GET', '/api/benches');
      return benches.body.find((b) => b.id === 'bench-1')?.scale.state === 'online' || undefined;
    });
  }

  /** What the bench screen is sent: no verdict may come while the scale is away. */
  private watchScreen(): void {
    this.socket?.disconnect();
    this.socket = io(`${this.hub.url}/live`, {
      query: { benchId: 'bench-1' },
      auth: { token: this.token },
      transports: ['websocket'],
      reconnection: false,
    });
    this.socket.on('pour', (event: { verdict: string | null }) => {
      // A reading already on its way when the cable came out is not a verdict without a scale.
      const away = this.unpluggedAt !== undefined && Date.now() - this.unpluggedAt > 250;
      if (away && event.verdict !== null) this.verdictsWhileAway += 1;
    });
  }

  unplug(): void {
    this.scale.unplug();
    this.unpluggedAt = Date.now();
  }

  replug(): void {
    this.unpluggedAt = undefined;
    this.scale.replug();
  }

  async close(): Promise<void> {
    this.socket?.disconnect();
    await this.hub?.stop();
    await this.adapter?.close();
    this.scale.stop();
  }

  async api<T>(method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await fetch(`${this.hub.url}${path}`, {
      method,
      headers: {
        'Content-Type': 'application/json',
        ...(this.token ? { Authorization: `Bearer ${this.token}` } : {}),
      },
      ...(body !== undefined ? { body: JSON.stringify(body) } : {}),
    });
    return { status: res.status, body: (await res.json()) as T };
  }

  /** Posts an intent, waiting out "wait until steady" answers. */
  async act(path: string, body?: unknown): Promise<Batch> {
    for (let i = 0; ; i += 1) {
      const res = await this.api<Batch & { message: string; errors: { path: string }[] }>(
        'POST',
        path,
        body,
      );
      if (res.status < 300) return res.body;
      const code = res.body.errors?.[0]?.path;
      if (i > 100 || (code !== 'NOT_STABLE' && code !== 'SCALE_COMMAND' && res.status !== 503)) {
        throw new Error(`${path}: ${res.status} ${res.body.message}`);
      }
      await sleep(100);
    }
  }

  async batch(id: number): Promise<Batch | undefined> {
    const res = await this.api<Batch>('GET', `/api/batches/${id}`);
    return res.status === 200 ? res.body : undefined;
  }

  /** Pours into the cup; with `killAtG`, the hub dies when that much is in and the pour stops. */
  async pour(part: number, grams: number, rate: number, killAtG?: number): Promise<void> {
    if (!(grams > 0.005)) return;
    const before = this.scale.contentsInCupG;
    const flow = this.scale.pour(grams, rate);
    if (killAtG !== undefined) {
      await until(
        'the kill point',
        () => this.scale.contentsInCupG - before >= killAtG || undefined,
      );
      await this.hub.kill();
      // The screen froze: the operator stops pouring.
      this.scale.stopPour();
    }
    await flow;
    await this.scale.settle();
    this.physical[part] = (this.physical[part] ?? 0) + this.scale.contentsInCupG - before;
  }

  /** Follows the screen until the batch is saved or abandoned, as an operator would. */
  async finish(id: number): Promise<Batch | undefined> {
    for (let step = 0; step < 60; step += 1) {
      const b = await this.batch(id);
      trace('finish', id, b?.state, JSON.stringify(b?.active), 'net', this.scale.netG);
      if (!b) return undefined;
      if (b.state === 'saved' || b.state === 'abandoned') return b;
      if (b.state === 'interrupted') {
        if (!this.scale.plugged) this.replug();
        await until('the scale online', async () => {
          const benches = await this.api<BenchSummary[]>('GET', '/api/benches');
          return (
            benches.body.find((x) => x.id === 'bench-1')?.scale.state === 'online' || undefined
          );
        });
        await this.scale.settle();
        await this.act(`/api/batches/${id}/resume`);
        continue;
      }
      const active = b.active!;
      if (!active.tared) {
        await this.act(`/api/batches/${id}/tare`);
        continue;
      }
      const missing = active.targetG - this.scale.netG;
      if (missing > 0.005) await this.pour(active.part, missing, active.part === 0 ? 8 : 1);
      if (!active.band) {
        await this.act(`/api/batches/${id}/next`);
        continue;
      }
      const moved = await until(
        'the batch to move on',
        async () => {
          const now = await this.batch(id);
          return now && (now.state !== b.state || now.active?.tared !== active.tared)
            ? now
            : undefined;
        },
        8_000,
      ).catch(() => undefined);
      if (!moved) await this.act(`/api/batches/${id}/save-no-go`);
    }
    throw new Error(`batch ${id} did not finish`);
  }

  newCup(): void {
    this.scale.placeCup(40);
    this.physical = [];
  }
}

/** How far from the material's ratio the cup really is, in % (the worst part against part A). */
function physicalDeviationPct(ratio: number[], physical: number[]): number {
  let worst = 0;
  for (let i = 1; i < ratio.length; i += 1) {
    const dev = (physical[i]! / physical[0]! / (ratio[i]! / ratio[0]!) - 1) * 100;
    if (Math.abs(dev) > Math.abs(worst)) worst = dev;
  }
  return worst;
}

/** A record lies when it says GO and the cup is not what it says (beyond the scale's own noise). */
function lies(b: Batch, physical: number[]): string | undefined {
  if (b.verdict !== 'GO') return undefined;
  for (const [i, part] of b.parts.entries()) {
    if (Math.abs((part.actualG ?? 0) - (physical[i] ?? 0)) > SAME_G) {
      return `batch ${b.id}: part ${'ABC'[i]} recorded ${part.actualG?.toFixed(2)} g, cup holds ${physical[i]?.toFixed(2)} g`;
    }
  }
  const dev = physicalDeviationPct(b.weightRatio, physical);
  // The balance reads to d with noise: allow 2 d on the smallest part beside the tolerance.
  const slack = (100 * 2 * D) / Math.min(...physical.slice(1));
  if (Math.abs(dev) > b.tolerancePct + slack) {
    return `batch ${b.id}: GO, but the cup is ${dev.toFixed(2)} % off ratio`;
  }
  return undefined;
}

async function runPoint(point: KillPoint, seed: number): Promise<Row> {
  const dataDir = await mkdtemp(join(tmpdir(), 'tareline-faults-'));
  const bench = new Bench(dataDir, seed);
  const row: Row = { point, tries: 0, lost: 0, wrong: 0, goes: 0, verdictsWhileAway: 0, notes: [] };
  try {
    await bench.open();
    const materials = await bench.api<Material[]>('GET', '/api/materials');
    const material = materials.body.find((m) =>
      point === 'weighing C mid-pour' ? m.weightRatio.length === 3 : m.name.includes('SC-14'),
    )!;
    const total = material.weightRatio.reduce((a, b) => a + b, 0);
    for (let t = 0; t < TRIES; t += 1) {
      row.tries += 1;
      bench.newCup();
      const created = await bench.api<Batch>('POST', '/api/batches', {
        benchId: 'bench-1',
        materialId: material.id,
        totalMassG: total,
        lots: [],
      });
      if (created.status !== 201) throw new Error(`no batch: ${JSON.stringify(created.body)}`);
      const id = created.body.id;
      await bench.scale.settle();
      await bench.act(`/api/batches/${id}/tare`);
      const frac = 0.2 + 0.6 * ((t + 1) / (TRIES + 1));
      let killed = false;
      if (point === 'weighing A mid-pour') {
        await bench.pour(0, 100, 8, 100 * frac);
        killed = true;
      } else {
        await bench.pour(0, 100, 8);
        await bench.act(`/api/batches/${id}/next`);
        const b = await until('part B tared', async () => {
          const now = await bench.batch(id);
          return now?.active?.part === 1 && now.active.tared ? now : undefined;
        });
        const targetB = b.active!.targetG;
        if (point === 'weighing B mid-pour') {
          await bench.pour(1, targetB, 1, targetB * frac);
          killed = true;
        } else if (point === 'interrupted') {
          await bench.pour(1, targetB * frac, 1);
          bench.unplug();
          await until(
            'interrupted',
            async () => (await bench.batch(id))?.state === 'interrupted' || undefined,
          );
          await bench.hub.kill();
          killed = true;
        } else if (point === 'save dwell') {
          await bench.pour(1, targetB, 1);
          await sleep(200 + 100 * t);
          await bench.hub.kill();
          killed = true;
        } else {
          await bench.pour(1, targetB, 1);
          if (point === 'right after the save') {
            await until(
              'saved',
              async () => (await bench.batch(id))?.state === 'saved' || undefined,
            );
            await bench.hub.kill();
            killed = true;
          } else {
            const c = await until('part C tared', async () => {
              const now = await bench.batch(id);
              return now?.active?.part === 2 && now.active.tared ? now : undefined;
            });
            await bench.pour(2, c.active!.targetG, 0.3, c.active!.targetG * frac);
            killed = true;
          }
        }
      }
      if (killed) await bench.startHub();
      const done = await bench.finish(id);
      if (!done) {
        row.lost += 1;
        row.notes.push(`batch ${id} lost`);
        continue;
      }
      if (done.verdict === 'GO') row.goes += 1;
      const lie = lies(done, bench.physical);
      if (lie) {
        row.wrong += 1;
        row.notes.push(lie);
      }
    }
    // Every batch of the run is still there, numbered without a gap.
    const all = await bench.api<{ items: Batch[] }>('GET', '/api/batches?limit=500');
    const ids = all.body.items.map((b) => b.id).sort((a, b) => a - b);
    if (ids.length !== row.tries || ids.some((id, i) => id !== i + 1)) {
      row.notes.push(`batch numbers ${ids.join(', ')} for ${row.tries} batches`);
      row.lost += Math.max(0, row.tries - ids.length);
    }
    row.verdictsWhileAway = bench.verdictsWhileAway;
  } finally {
    await bench.close().catch(() => undefined);
    await rm(dataDir, { recursive: true, force: true });
  }
  return row;
}

describe('kill -9 in every batch state, restarted at once', () => {
  afterAll(() => {
    const lines = [
      '',
      '| state at the kill | tries | batches lost | wrong records | verdicts while the scale was away | saved GO |',
      '| --- | ---: | ---: | ---: | ---: | ---: |',
      ...table.map(
        (r) =>
          `| ${r.point} | ${r.tries} | ${r.lost} | ${r.wrong} | ${r.verdictsWhileAway} | ${r.goes} |`,
      ),
      '',
      ...table.flatMap((r) => r.notes.map((n) => `- ${r.point}: ${n}`)),
    ];
    console.log(lines.join('\n'));
  });

  const points: KillPoint[] = [
    'weighing A mid-pour',
    'weighing B mid-pour',
    'weighing C mid-pour',
    'save dwell',
    'right after the save',
    'interrupted',
  ];
  for (const [i, point] of points.entries()) {
    it(`${point}: no batch lost, no record claims GO for a cup it does not describe`, async () => {
      const row = await runPoint(point, 100 + i);
      table.push(row);
      expect(row.notes).toEqual([]);
      expect(row.lost).toBe(0);
      expect(row.wrong).toBe(0);
      expect(row.verdictsWhileAway).toBe(0);
    });
  }
});
