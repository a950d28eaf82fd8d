import { batchSchema, type Batch } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export const batchQueryKey = (id: number) => ['batches', 'one', id] as const;

export function getBatch(id: number): Promise<Batch> {
  return apiRequest(`/batches/${id}`, batchSchema);
}

/** One batch with its pour trace. */
export function useBatch(id: number) {
  return useQuery({
    queryKey: batchQueryKey(id),
    queryFn: () => getBatch(id),
    enabled: Number.isInteger(id) && id > 0,
  });
}
