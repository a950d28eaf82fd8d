import type { Batch, PourEvent, ReadingEvent } from '@tareline/protocol';

/**
 * Live events as the hub sends them, for a 100:14 by weight epoxy on bench-1 (the demo shop's
 * SC-14). Targets: 114 g split 100:14 is 100 g and 14 g; the ± 1 % band around 14 g is
 * 13.86–14.14 g (the mix math's worked example).
 */
export function batchFixture(patch: Partial<Batch> = {}): Batch {
  return {
    id: 7,
    state: 'weighing-a',
    verdict: null,
    benchId: 'bench-1',
    materialId: 'mat-sc14',
    materialName: 'Grey surface-coat epoxy SC-14',
    operator: { id: 'id-Joss Whitcombe', name: 'Joss Whitcombe' },
    totalMassG: 114,
    weightRatio: [100, 14],
    parts: [
      { label: 'Resin', targetG: 100, actualG: null },
      { label: 'Hardener', targetG: 14, actualG: null },
    ],
    active: {
      part: 0,
      kind: 'first',
      targetG: 100,
      band: null,
      slowDownFromG: 90,
      tared: false,
    },
    rescue: null,
    ratioDeviationPct: null,
    tolerancePct: 1,
    readabilityG: 0.01,
    lots: [],
    potLifeMin: 25,
    potLifeMassG: 100,
    abandonReason: null,
    interruptedReason: null,
    steps: { created: '2027-01-05T09:00:00.000Z' },
    createdAt: '2027-01-05T09:00:00.000Z',
    savedAt: null,
    ...patch,
  };
}

/** The same batch after part A (100.00 g) was confirmed and the hub tared for part B. */
export function partBFixture(patch: Partial<Batch> = {}): Batch {
  return batchFixture({
    state: 'weighing-b',
    parts: [
      { label: 'Resin', targetG: 100, actualG: 100 },
      { label: 'Hardener', targetG: 14, actualG: null },
    ],
    active: {
      part: 1,
      kind: 'first',
      targetG: 14,
      band: { lowG: 13.86, highG: 14.14 },
      slowDownFromG: 12.6,
      tared: true,
    },
    steps: {
      created: '2027-01-05T09:00:00.000Z',
      taredA: '2027-01-05T09:00:10.000Z',
      confirmedA: '2027-01-05T09:00:40.000Z',
      taredB: '2027-01-05T09:00:41.000Z',
    },
    ...patch,
  });
}

export function readingFixture(netG: number, stable: boolean): ReadingEvent {
  return { benchId: 'bench-1', seq: Math.round(netG * 100), t: 1, grossG: netG + 40, netG, stable };
}

export function pourFixture(patch: Partial<PourEvent>): PourEvent {
  return {
    benchId: 'bench-1',
    batchId: 7,
    part: 1,
    netG: 14,
    stable: true,
    verdict: 'GO',
    saveInMs: null,
    rescue: null,
    ...patch,
  };
}
