import { describe, expect, it } from 'vitest';
import { startBatch, type BatchRecord } from '../batches/batch-machine.js';
import { batchDraws } from './stock-ledger.js';

function record(over: Partial<BatchRecord>): BatchRecord {
  const rec = startBatch({
    weightRatio: [100, 14],
    partLabels: ['Resin', 'Hardener'],
    tolerancePct: 1,
    readabilityG: 0.01,
    totalMassG: 114,
    lots: [
      { part: 0, code: 'R-1', lotId: 'lot-r1', warnings: [] },
      { part: 0, code: 'R-2', lotId: 'lot-r2', warnings: [] },
      { part: 1, code: 'H-9', lotId: null, warnings: [] },
    ],
    now: '2026-12-04T10:00:00.000Z',
  });
  return { ...rec, ...over };
}

describe('what a batch takes from its lots', () => {
  const weighed = (a: number | null, b: number | null) =>
    record({}).parts.map((p, i) => ({ ...p, actualG: i === 0 ? a : b }));

  it('nothing while it is being weighed', () => {
    expect(batchDraws(record({ parts: weighed(100.004, null) }))).toEqual([]);
  });

  it("a saved batch: each part's grams, in whole milligrams, from the first registered lot of that part", () => {
    const rec = record({ state: 'saved', parts: weighed(100.0049, 14.1) });
    // The hardener's lot was scanned but is not registered: nothing to take it from.
    expect(batchDraws(rec)).toEqual([{ lotId: 'lot-r1', takenMg: 100_005 }]);
  });

  it('an abandoned batch: only the parts confirmed before it was abandoned', () => {
    expect(batchDraws(record({ state: 'abandoned', parts: weighed(99.5, null) }))).toEqual([
      { lotId: 'lot-r1', takenMg: 99_500 },
    ]);
    expect(batchDraws(record({ state: 'abandoned', parts: weighed(null, null) }))).toEqual([]);
  });
});
