import type { Batch } from '@tareline/protocol';
import { useState } from 'react';
import { useCurrentBatch } from '../api/get-current-batch';
import { newer } from '../utils/newer-batch';

export interface BenchBatch {
  /** The bench's batch as the hub last told it, or null when there is none to show. */
  batch: Batch | null;
  /** Whether the hub has answered which batch is open on the bench. */
  loading: boolean;
  loadError: Error | null;
  /** A batch the hub answered an intent with (create, tare, confirm…). */
  offer: (batch: Batch) => void;
  /** Puts a finished batch away ("Next batch"): later news of it is ignored. */
  dismiss: () => void;
}

/**
 * The bench's batch, from every source the hub speaks through: the open batch read at start-up
 * (a reloaded screen continues), each live `batch` event, and each answer to an intent. All of
 * them come after the hub's commit; the newest wins.
 */
export function useBenchBatch(benchId: string, liveBatch: Batch | null | undefined): BenchBatch {
  const current = useCurrentBatch(benchId);
  const [answered, setAnswered] = useState<Batch | null>(null);
  const [dismissed, setDismissed] = useState<readonly number[]>([]);

  const batch = [current.data, liveBatch, answered]
    .filter((b): b is Batch => !!b && b.benchId === benchId && !dismissed.includes(b.id))
    .reduce<Batch | null>(newer, null);

  return {
    batch,
    loading: current.isPending,
    loadError: current.error,
    offer: (b) => setAnswered((a) => newer(a, b)),
    dismiss: () => {
      if (batch) setDismissed((d) => [...d, batch.id]);
    },
  };
}
