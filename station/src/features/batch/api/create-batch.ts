import { batchSchema, type Batch, type CreateBatch } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export function createBatch(input: CreateBatch): Promise<Batch> {
  return apiRequest(
    '/batches',
    batchSchema,
    { method: 'POST', body: JSON.stringify(input) },
    // A lead's password typed wrong is a 401 for the password, not the end of this session.
    { signature: input.override !== undefined },
  );
}

/** Starts a batch on the hub: it splits the total by the ratio and waits for the tare. */
export function useCreateBatch(options: { onSuccess?: (batch: Batch) => void } = {}) {
  return useMutation({ mutationFn: createBatch, onSuccess: options.onSuccess });
}
