import { batchSchema, type Batch, type BatchState } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

export interface BatchFilter {
  state?: BatchState | undefined;
  benchId?: string | undefined;
  limit?: number | undefined;
}

export const batchesQueryKey = (filter: BatchFilter) => ['batches', filter] as const;

export function getBatches(filter: BatchFilter): Promise<Batch[]> {
  const params = new URLSearchParams();
  if (filter.state) params.set('state', filter.state);
  if (filter.benchId) params.set('benchId', filter.benchId);
  if (filter.limit) params.set('limit', String(filter.limit));
  const query = params.toString();
  return apiRequest(`/batches${query ? `?${query}` : ''}`, z.array(batchSchema));
}

/** The newest batches first, as the hub lists them. */
export function useBatches(filter: BatchFilter) {
  return useQuery({ queryKey: batchesQueryKey(filter), queryFn: () => getBatches(filter) });
}
