import { batchSchema, type Batch } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export function abandonBatch(batchId: number, reason: string): Promise<Batch> {
  return apiRequest(`/batches/${batchId}/abandon`, batchSchema, {
    method: 'POST',
    body: JSON.stringify({ reason }),
  });
}

/** Abandons the batch with a reason; the hub keeps it, with what was weighed. */
export function useAbandonBatch(options: { onSuccess?: (batch: Batch) => void } = {}) {
  return useMutation({
    mutationFn: ({ batchId, reason }: { batchId: number; reason: string }) =>
      abandonBatch(batchId, reason),
    onSuccess: options.onSuccess,
  });
}
