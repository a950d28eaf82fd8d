import { batchSchema, type Batch, type CreateDisposition } from '@tareline/protocol';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';
import { batchQueryKey } from './get-batch';

export function createDisposition(batchId: number, body: CreateDisposition): Promise<Batch> {
  return apiRequest(
    `/batches/${batchId}/dispositions`,
    batchSchema,
    { method: 'POST', body: JSON.stringify(body) },
    // A wrong password refuses the signature; the lead stays signed in.
    { signature: true },
  );
}

/** Signs a decision on a batch; the batch, the lists and its audit trail show it at once. */
export function useCreateDisposition(batchId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateDisposition) => createDisposition(batchId, body),
    onSuccess: async (batch) => {
      client.setQueryData(batchQueryKey(batchId), batch);
      await Promise.all([
        client.invalidateQueries({ queryKey: ['batches', 'list'] }),
        client.invalidateQueries({ queryKey: ['audit', 'batch', batchId] }),
      ]);
    },
  });
}
