import { batchPageSchema, type BatchState, type BatchSummary } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export interface BatchFilter {
  state?: BatchState | undefined;
  benchId?: string | undefined;
  limit?: number | undefined;
}

export const batchesQueryKey = (filter: BatchFilter) => ['batches', filter] as const;

export async function getBatches(filter: BatchFilter): Promise<BatchSummary[]> {
  const params = new URLSearchParams();
  if (filter.state) params.set('state', filter.state);
  if (filter.benchId) params.set('benchId', filter.benchId);
  if (filter.limit) params.set('limit', String(filter.limit));
  const query = params.toString();
  const page = await apiRequest(`/batches${query ? `?${query}` : ''}`, batchPageSchema);
  return page.items;
}

/** The newest batches first, as the hub lists them. */
export function useBatches(filter: BatchFilter) {
  return useQuery({ queryKey: batchesQueryKey(filter), queryFn: () => getBatches(filter) });
}
