import { batchSchema, type Batch, type CreateBatch } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export function createBatch(input: CreateBatch): Promise<Batch> {
  return apiRequest('/batches', batchSchema, { method: 'POST', body: JSON.stringify(input) });
}

/** Starts a batch on the hub: it splits the total by the ratio and waits for the tare. */
export function useCreateBatch(options: { onSuccess?: (batch: Batch) => void } = {}) {
  return useMutation({ mutationFn: createBatch, onSuccess: options.onSuccess });
}
