import type {
  Batch,
  BatchEvent,
  LiveServerEvents,
  PourEvent,
  SimulatorStep,
} from '@tareline/protocol';
import { io, type Socket } from 'socket.io-client';
import { expect } from 'vitest';
import { call } from './auth-helpers.js';
import type { TestHub } from './test-app.js';

/** Drives bench-1 of a test hub on the simulated balance: a socket on its room and its routes. */

// A quick simulated balance: 0.01 g, small noise, simulated time 4× the wall clock.
export const SIM_BENCH_SCALE = 'sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=11';
export const SIM_BENCH_ENV = {
  TARELINE_SCALE: SIM_BENCH_SCALE,
  TARELINE_SAVE_DWELL_MS: '400',
  TARELINE_SIGN_IN_LIMIT: '1000',
};

export async function until(what: string, check: () => boolean, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** An operator at bench-1 with a socket on the bench's room. */
export class Bench {
  batches: BatchEvent[] = [];
  pours: PourEvent[] = [];
  socket!: Socket<LiveServerEvents>;

  constructor(
    readonly hub: TestHub,
    readonly token: string,
  ) {}

  async connect(): Promise<void> {
    this.socket = io(`${this.hub.url}/live`, {
      query: { benchId: 'bench-1' },
      auth: { token: this.token },
      transports: ['websocket'],
      reconnection: false,
    });
    this.socket.on('batch', (e) => this.batches.push(e));
    this.socket.on('pour', (e) => this.pours.push(e));
    await new Promise<void>((resolve, reject) => {
      this.socket.once('connect', () => resolve());
      this.socket.once('connect_error', reject);
    });
  }

  simulate(steps: SimulatorStep[]) {
    return call(this.hub, 'POST', '/api/benches/bench-1/simulator', {
      body: steps,
      token: this.token,
    });
  }

  post<T = Batch>(path: string, body?: unknown) {
    return call<T & { message: string }>(this.hub, 'POST', `/api/batches${path}`, {
      token: this.token,
      ...(body !== undefined ? { body } : {}),
    });
  }

  latestBatch(): Batch | null {
    return this.batches.at(-1)?.batch ?? null;
  }

  /** Starts a batch of SC-14 (100:14 by weight) with 100 g of part A poured and confirmed. */
  async throughPartA(
    materialId: string,
    lots = [
      { part: 0, code: 'SC14R-2609' },
      { part: 1, code: 'SC14H-2511' },
    ],
  ): Promise<Batch> {
    const created = await this.post('', { benchId: 'bench-1', materialId, totalMassG: 114, lots });
    expect(created.status).toBe(201);
    expect(created.body.state).toBe('weighing-a');
    await this.simulate([{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    expect((await this.post(`/${created.body.id}/tare`)).status).toBe(201);
    await this.simulate([{ do: 'pour', grams: 100, rateGPerS: 40 }, { do: 'settle' }]);
    await until('a steady 100 g', () => {
      const last = this.pours.at(-1);
      return !!last && last.stable && Math.abs(last.netG - 100) < 0.02;
    });
    // Taring again now would zero the 100 g of part A and lose it from the record.
    const retare = await this.post(`/${created.body.id}/tare`);
    expect(retare.status).toBe(409);
    expect(retare.body.message).toMatch(/(99\.9\d|100\.0\d) g are in this pour already/);
    const confirmed = await this.post(`/${created.body.id}/next`);
    expect(confirmed.status).toBe(201);
    expect(confirmed.body.state).toBe('weighing-b');
    // The hub tares the cup with part A in it for part B.
    await until('part B tared', () => this.latestBatch()?.active?.tared === true);
    return this.latestBatch()!;
  }
}
