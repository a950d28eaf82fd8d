import { describe, expect, it } from 'vitest';
import { batchFixture, partBFixture } from '../../../testing/live-fixtures';
import { newer } from './newer-batch';

describe('newer', () => {
  it('keeps the version with the later step, whichever arrives last', () => {
    const partA = batchFixture();
    const partB = partBFixture();
    // A socket event from before the answer that moved the batch on does not take it back.
    expect(newer(partB, partA).state).toBe('weighing-b');
    expect(newer(partA, partB).state).toBe('weighing-b');
    const saved = partBFixture({
      state: 'saved',
      steps: { ...partB.steps, saved: '2027-01-05T09:01:10.000Z' },
    });
    expect(newer(saved, partB).state).toBe('saved');
  });

  it('prefers a new batch over the last one, and anything over none', () => {
    const next = batchFixture({ id: 8, steps: { created: '2027-01-05T08:00:00.000Z' } });
    expect(newer(partBFixture(), next).id).toBe(8);
    expect(newer(next, partBFixture()).id).toBe(8);
    expect(newer(null, next)).toBe(next);
  });
});
