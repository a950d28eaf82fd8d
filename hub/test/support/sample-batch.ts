import type { Batch } from '@tareline/protocol';

export const NOW = Date.UTC(2026, 11, 2, 6, 0, 0);
export const MIN = 60_000;

/** A saved NO-GO batch of SC-14 on bench-1, as the batch rooms announce it; change what a test needs. */
export function sampleBatch(over: Partial<Batch> = {}): Batch {
  return {
    id: 41,
    state: 'saved',
    verdict: 'NO-GO',
    benchId: 'bench-1',
    materialId: 'm-1',
    materialName: 'SC-14 <casting> resin',
    operator: { id: 'p-1', name: 'Joss Whitcombe' },
    totalMassG: 114,
    weightRatio: [100, 14],
    parts: [],
    active: null,
    rescue: null,
    ratioDeviationPct: 3.2,
    tolerancePct: 2,
    readabilityG: 0.01,
    lots: [
      { part: 0, code: 'SC14R-2609', lotId: 'l-1', warnings: [] },
      { part: 1, code: 'SC14H-2511', lotId: 'l-2', warnings: [] },
    ],
    potLifeMin: 30,
    potLifeMassG: 100,
    abandonReason: null,
    interruptedReason: null,
    steps: { created: new Date(NOW - 5 * MIN).toISOString(), saved: new Date(NOW).toISOString() },
    createdAt: new Date(NOW - 5 * MIN).toISOString(),
    savedAt: new Date(NOW).toISOString(),
    ...over,
  };
}
