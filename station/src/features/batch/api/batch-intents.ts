import { batchSchema, type Batch } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

/**
 * The operator's intents on an open batch: `POST /api/batches/:id/<intent>`, no body, the batch
 * after the change as the answer. They share one shape, so they share this file: the hub decides
 * whether each is allowed and says why not (409 with its message).
 */
export type BatchIntent = 'tare' | 'next' | 'rescue' | 'save-no-go' | 'resume';

export function postBatchIntent(batchId: number, intent: BatchIntent): Promise<Batch> {
  return apiRequest(`/batches/${batchId}/${intent}`, batchSchema, { method: 'POST' });
}

export function useBatchIntent(options: { onSuccess?: (batch: Batch) => void } = {}) {
  return useMutation({
    mutationFn: ({ batchId, intent }: { batchId: number; intent: BatchIntent }) =>
      postBatchIntent(batchId, intent),
    onSuccess: options.onSuccess,
  });
}
