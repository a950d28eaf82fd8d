import type { Batch } from '@tareline/protocol';

/** The newest moment the hub recorded for a batch: each of its steps is stamped with an ISO time. */
function lastStepAt(batch: Batch): string {
  return Object.values(batch.steps).reduce((a, b) => (b > a ? b : a), batch.createdAt);
}

/**
 * Of two versions of the bench's batch, the one the hub wrote last: a later batch beats an
 * earlier one, and of the same batch the version with the later step (a tie goes to `b`, the
 * one heard last). Answers and socket events can arrive in either order.
 */
export function newer(a: Batch | null, b: Batch): Batch {
  if (!a || b.id > a.id) return b;
  if (b.id < a.id) return a;
  return lastStepAt(b) >= lastStepAt(a) ? b : a;
}
