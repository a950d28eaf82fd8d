import { describe, expect, it } from 'vitest';
import { exportAddress } from './export-batches';
import { batchQuery } from './get-batches';

describe('the batch list query', () => {
  it('asks from the start of the first day to the end of the last, in local time', () => {
    const q = batchQuery({ from: '2026-12-01', to: '2026-12-02' });
    expect(q.get('from')).toBe(new Date(2026, 11, 1).toISOString());
    // `to` is exclusive on the hub: the day after the last one shown.
    expect(q.get('to')).toBe(new Date(2026, 11, 3).toISOString());
  });

  it('drops what a hand-edited address holds that the hub would refuse', () => {
    const q = batchQuery({
      from: 'last week',
      verdict: 'MAYBE',
      state: 'saved',
      disposition: 'none',
      sort: 'absDeviation',
      lot: '  SC14H-2511 ',
    });
    expect(q.toString()).toBe('lot=SC14H-2511&state=saved&disposition=none&sort=absDeviation');
  });

  it('exports the same filter', () => {
    expect(exportAddress({ verdict: 'NO-GO', benchId: 'bench-2' })).toBe(
      '/api/batches/export.csv?benchId=bench-2&verdict=NO-GO',
    );
    expect(exportAddress({})).toBe('/api/batches/export.csv');
  });
});
