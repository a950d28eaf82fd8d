import type { Material } from '@tareline/protocol';
import { beforeEach, describe, expect, it } from 'vitest';
import { FakeBatchStore, FakeScales, RecordingEvents } from '../../test/support/batch-fakes.js';
import { FakeClock } from '../../test/support/fake-clock.js';
import type { AuthUser } from '../auth/auth-user.js';
import { statusOf } from '../common/api-exception.filter.js';
import { NotAllowed, NotFound, ScaleCommandFailed } from '../common/domain-errors.js';
import { ScaleCommandError } from '../scales/scale-link.js';
import type { MaterialsService } from '../materials/materials.service.js';
import type { PourPlansService } from '../pour-plans/pour-plans.service.js';
import { BatchRunner, TRACE_FLUSH_MS } from './batch-runner.js';
import { BatchesService } from './batches.service.js';
import { BenchSessions } from './bench-sessions.js';
import { decodeTrace } from './pour-trace.js';

const DWELL_MS = 400;

/** A filled surface-coat epoxy of the invented demo shop: 100 : 14 by weight, ±1 %. */
const SC14 = {
  id: 'sc-14',
  name: 'SC-14 surface coat',
  ratio: { basis: 'weight', parts: [100, 14] },
  weightRatio: [100, 14],
  partLabels: ['Resin', 'Hardener'],
  tolerancePct: 1,
  agitateMin: 0,
  cautions: [],
  active: true,
} satisfies Material;

const materials = {
  get: async (id: string) => {
    if (id !== SC14.id) throw new NotFound(`No material ${id}`);
    return SC14;
  },
  findLot: async () => undefined,
} as unknown as MaterialsService;
/** No pour plans here: these batches are sized by hand. */
const plans = {
  forBatch: async (id: string) => {
    throw new NotFound(`No pour plan ${id}`);
  },
} as unknown as PourPlansService;

const TOMAS: AuthUser = {
  id: 'p-tomas',
  name: 'Tomas Reyl',
  role: 'operator',
  benchId: 'bench-1',
  tokenId: 't1',
  expiresAt: Number.MAX_SAFE_INTEGER,
};

describe('the batch rooms with a fake clock, store and scale', () => {
  let clock: FakeClock;
  let store: FakeBatchStore;
  let scales: FakeScales;
  let events: RecordingEvents;
  let sessions: BenchSessions;
  let runner: BatchRunner;
  let service: BatchesService;

  async function boot() {
    sessions = new BenchSessions(store, scales, events, clock, {
      hub: { id: 'hub-1', internalUrl: undefined, readsScales: true },
      database: { url: undefined },
    });
    runner = new BatchRunner(sessions, scales, events, clock, {
      batches: { saveDwellMs: DWELL_MS },
    });
    service = new BatchesService(
      store,
      sessions,
      materials,
      plans,
      { confirmLead: () => Promise.reject(new Error('no lead in these tests')) },
      { record: () => Promise.reject(new Error('no audit in these tests')) },
    );
    await runner.onApplicationBootstrap();
  }

  beforeEach(async () => {
    clock = new FakeClock();
    store = new FakeBatchStore();
    scales = new FakeScales('bench-1', () => clock.now());
    events = new RecordingEvents();
    await boot();
  });

  /** Prints a steady net weight every 100 ms for `ms`, as a balance would. */
  async function holdSteady(netG: number, ms: number) {
    for (let t = 0; t <= ms; t += 100) {
      scales.print(netG);
      await sessions.of('bench-1')?.queue;
      clock.advance(100);
    }
  }

  /** A 114 g batch of SC-14 with 100.00 g of part A poured and confirmed: part B is next. */
  async function throughPartA() {
    const batch = await service.create(
      { benchId: 'bench-1', materialId: 'sc-14', totalMassG: 114, lots: [] },
      TOMAS,
    );
    await service.tare(batch.id, TOMAS);
    scales.print(0);
    scales.print(100);
    const afterA = await service.next(batch.id, TOMAS);
    expect(afterA.state).toBe('weighing-b');
    // The hub tares the cup holding part A for part B by itself.
    expect(scales.tares).toBe(2);
    expect(afterA.active).toMatchObject({ part: 1, tared: true });
    scales.print(0);
    return batch.id;
  }

  const lastBatch = () => events.of('batch.changed').at(-1)!.batch!;
  const pours = () => events.of('pour.judged');

  it('saves GO by itself once part B stays steady inside the band for the dwell', async () => {
    const id = await throughPartA();
    await holdSteady(14.1, DWELL_MS - 100);
    expect(lastBatch().state).toBe('weighing-b');
    expect(pours().at(-1)).toMatchObject({ verdict: 'GO', saveInMs: 100 });
    await holdSteady(14.1, 100);
    expect(lastBatch()).toMatchObject({ id, state: 'saved', verdict: 'GO' });
    // (14.10 / 100 − 0.14) / 0.14 × 100 = +0.714 %: the ratio deviation as defined for parts
    // by weight (actual B/A over the stated B/A, minus one), worked by hand.
    expect(lastBatch().ratioDeviationPct).toBeCloseTo(0.714, 3);
    expect(store.rows.get(id)).toMatchObject({ state: 'saved', verdict: 'GO' });
    expect(sessions.of('bench-1')).toBeUndefined();
  });

  it('is announced only after the store took it', async () => {
    const id = await throughPartA();
    const announced = events.of('batch.changed').map((e) => e.batch!.state);
    expect(announced).toEqual(['weighing-a', 'weighing-a', 'weighing-b', 'weighing-b']);
    expect(store.rows.get(id)!.state).toBe('weighing-b');
  });

  it('gives no verdict while the scale is away, and interrupts the batch', async () => {
    await throughPartA();
    scales.state = 'offline';
    runner.onScaleStatus({
      benchId: 'bench-1',
      state: 'offline',
      detail: 'the cable is out; trying again in 0.3 s',
    });
    await sessions.of('bench-1')!.queue;
    expect(lastBatch()).toMatchObject({ state: 'interrupted' });
    // The record keeps what happened, not when the link meant to retry.
    expect(lastBatch().interruptedReason).toBe('The scale went offline: the cable is out');
    const before = pours().length;
    await holdSteady(14.1, 1000);
    // An interrupted batch judges nothing, and nothing saves.
    expect(pours().length).toBe(before);
    expect(lastBatch().state).toBe('interrupted');
    const id = lastBatch().id;
    await expect(service.next(id, TOMAS)).rejects.toThrow(/interrupted: resume it first/);
    // Resuming needs the scale back.
    await expect(service.resume(id, TOMAS)).rejects.toThrow(/scale is offline/);
    scales.state = 'online';
    runner.onScaleStatus({ benchId: 'bench-1', state: 'online', detail: 'back' });
    const resumed = await service.resume(id, TOMAS);
    expect(resumed.state).toBe('weighing-b');
    await holdSteady(14.1, DWELL_MS + 100);
    expect(lastBatch()).toMatchObject({ id, state: 'saved', verdict: 'GO' });
  });

  it('while stale: no verdict on the readings that still come, and no save', async () => {
    await throughPartA();
    scales.state = 'stale';
    runner.onScaleStatus({ benchId: 'bench-1', state: 'stale', detail: 'no line for 2 s' });
    await holdSteady(14.1, 1000);
    expect(pours().at(-1)).toMatchObject({ verdict: null, saveInMs: null });
    expect(lastBatch().state).toBe('weighing-b');
  });

  it('offers the rescue for an over-pour of part B', async () => {
    await throughPartA();
    scales.print(14.5);
    const over = pours().at(-1)!;
    expect(over.verdict).toBe('OVER');
    // Part A to restore 100 : 14 with 14.5 g of B: 14.5 × 100 / 14 − 100 = 3.571 g (parts by
    // weight, worked by hand).
    expect(over.rescue!.addG[0]).toBeCloseTo(3.571, 2);
    const rescued = await service.rescue(sessions.of('bench-1')!.id, TOMAS);
    expect(rescued.active).toMatchObject({ part: 0, kind: 'top-up' });
  });

  it('tells the bench when the store refuses the save, and saves on a later steady reading', async () => {
    const id = await throughPartA();
    store.refuseWrites = 1;
    await holdSteady(14.1, DWELL_MS);
    expect(lastBatch().state).toBe('weighing-b');
    await holdSteady(14.1, 100);
    const told = pours().findLast((p) => p.saveProblem !== undefined)!;
    expect(told.saveProblem).toMatch(/could not write the batch.*keeps trying/);
    expect(lastBatch().state).toBe('weighing-b');
    await holdSteady(14.1, DWELL_MS);
    expect(lastBatch()).toMatchObject({ id, state: 'saved', verdict: 'GO' });
  });

  it('writes the growing pour trace as the clock passes each flush', async () => {
    const id = await throughPartA();
    for (let g = 1; g <= 10; g += 1) scales.print(g, false);
    expect(store.traceWrites).toEqual([]);
    clock.advance(TRACE_FLUSH_MS);
    expect(store.traceWrites.at(-1)).toMatchObject({ id });
    const stored = decodeTrace(store.rows.get(id)!.trace);
    expect(stored.at(-1)![1]).toBeCloseTo(10, 2);
  });

  it('after a restart, a batch being weighed comes back interrupted with what it had', async () => {
    const id = await throughPartA();
    scales.print(7, false);
    await runner.onApplicationShutdown();
    events = new RecordingEvents();
    await boot();
    const back = await service.get(id);
    expect(back).toMatchObject({ state: 'interrupted' });
    expect(back.interruptedReason).toMatch(/hub restarted/);
    expect(back.parts[0]!.actualG).toBeCloseTo(100, 2);
    expect(back.trace!.at(-1)![1]).toBeCloseTo(7, 2);
  });

  describe('a hub killed while part A pours: 26.04 g in the cup, 14.77 g last written', () => {
    async function killMidPartA() {
      const batch = await service.create(
        { benchId: 'bench-1', materialId: 'sc-14', totalMassG: 114, lots: [] },
        TOMAS,
      );
      await service.tare(batch.id, TOMAS);
      for (const g of [2, 6, 10, 14.77]) scales.print(g, false);
      clock.advance(TRACE_FLUSH_MS);
      for (const g of [18, 22, 26.04]) scales.print(g, false);
      scales.print(26.04, true);
      // kill -9: no last flush, nothing more from the old rooms.
      runner.beforeApplicationShutdown();
      events = new RecordingEvents();
      await boot();
      return batch.id;
    }

    it('reads the 26.04 g from a balance that kept its tare, and asks for the rest', async () => {
      const id = await killMidPartA();
      scales.hubRestarted(true);
      scales.print(26.04);
      const back = await service.resume(id, TOMAS);
      expect(back.parts[0]!.actualG).toBeCloseTo(26.04, 6);
      // 100 − 26.04 = 73.96 g still to pour, on a fresh tare the hub gives by itself.
      expect(back.active).toMatchObject({ part: 0, tared: true });
      expect(back.active!.targetG).toBeCloseTo(73.96, 6);
      scales.print(73.96);
      const afterA = await service.next(id, TOMAS);
      expect(afterA.parts[0]!.actualG).toBeCloseTo(100, 6);
      await holdSteady(14.05, DWELL_MS + 100);
      expect(lastBatch()).toMatchObject({ id, state: 'saved', verdict: 'GO' });
    });

    it('reads it as display − stored gross from a power-cycled balance that prints gross', async () => {
      const id = await killMidPartA();
      scales.hubRestarted(false);
      scales.lineMode = 'gross';
      scales.print(66.04);
      const back = await service.resume(id, TOMAS);
      expect(back.parts[0]!.actualG).toBeCloseTo(26.04, 6);
      expect(back.noGoReason ?? null).toBeNull();
    });

    it('cannot end GO when the balance does not say and the reading fits both meanings', async () => {
      const id = await killMidPartA();
      scales.hubRestarted(false);
      scales.lineMode = 'unknown';
      scales.print(66.04);
      const back = await service.resume(id, TOMAS);
      expect(back.noGoReason).toMatch(/^contents uncertain after a restart/);
      scales.print(100 - back.parts[0]!.actualG!);
      await service.next(id, TOMAS);
      await holdSteady(14, DWELL_MS + 100);
      // Steady inside the band by the scale, and still NO-GO, with the reason kept.
      expect(lastBatch()).toMatchObject({ id, state: 'saved', verdict: 'NO-GO' });
      expect(lastBatch().noGoReason).toMatch(/contents uncertain after a restart/);
    });

    it('asks to wait while the reading moves', async () => {
      const id = await killMidPartA();
      scales.hubRestarted(true);
      scales.print(26.04, false);
      await expect(service.resume(id, TOMAS)).rejects.toThrow(/steady/);
    });
  });

  it('answers a tare the balance will not take (still moving) as a 409 in words, not a 500', async () => {
    const batch = await service.create(
      { benchId: 'bench-1', materialId: 'sc-14', totalMassG: 114, lots: [] },
      TOMAS,
    );
    scales.tare = async () => {
      throw new ScaleCommandError(
        'The scale did not settle at zero within 5 s after tare (net 3.2 g); keep the pan still and try again',
      );
    };
    const refusal = await service.tare(batch.id, TOMAS).catch((err: unknown) => err);
    expect(refusal).toBeInstanceOf(ScaleCommandFailed);
    expect(statusOf(refusal as ScaleCommandFailed)).toBe(409);
    expect((refusal as Error).message).toMatch(/did not tare.*keep the cup still/i);
    // Nothing changed: the pour is still untared.
    expect((await service.get(batch.id)).active!.tared).toBe(false);
  });

  it('names whoever drives the simulated scale under an open batch, at once', async () => {
    const id = await throughPartA();
    sessions.onSimulatorDriven({
      benchId: 'bench-1',
      by: { id: 'p-ilse', name: 'Ilse Varga', role: 'lead' },
      steps: [{ do: 'pour', grams: 14, rateGPerS: 2 }],
      at: new Date(clock.now()).toISOString(),
    });
    await sessions.of('bench-1')!.queue;
    expect(lastBatch().handledBy).toEqual([
      expect.objectContaining({ id: 'p-ilse', name: 'Ilse Varga', role: 'lead' }),
    ]);
    expect(store.rows.get(id)!.detail).toMatchObject({ handledBy: [{ id: 'p-ilse' }] });
  });

  it('refuses an operator at another bench, and shows them none of its batches', async () => {
    const id = await throughPartA();
    const elsewhere = { ...TOMAS, id: 'p-priya', benchId: 'bench-2' };
    await expect(service.next(id, elsewhere)).rejects.toThrow(/only at the bench/);
    await expect(service.get(id, elsewhere)).rejects.toThrow(NotFound);
    expect(() => service.current('bench-1', elsewhere)).toThrow(NotAllowed);
    await expect(service.list({ limit: 50, benchId: 'bench-1' }, elsewhere)).rejects.toThrow(
      NotAllowed,
    );
    expect(await service.list({ limit: 50 }, elsewhere)).toEqual([]);
    // At their own bench, and for a lead, the batch is there.
    expect((await service.get(id, TOMAS)).id).toBe(id);
    expect(await service.list({ limit: 50 }, { ...TOMAS, role: 'lead' })).toHaveLength(1);
  });
});
