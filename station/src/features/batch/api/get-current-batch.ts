import { batchSchema, type Batch } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

const currentBatchSchema = z.object({ batch: batchSchema.nullable() });

export const currentBatchQueryKey = (benchId: string) => ['batches', 'current', benchId] as const;

export async function getCurrentBatch(benchId: string): Promise<Batch | null> {
  const answer = await apiRequest(
    `/batches/current?benchId=${encodeURIComponent(benchId)}`,
    currentBatchSchema,
  );
  return answer.batch;
}

/**
 * The bench's batch in progress (being weighed or interrupted), so a reloaded screen continues
 * where it was. Read once: after that the live `batch` events keep it current.
 */
export function useCurrentBatch(benchId: string) {
  return useQuery({
    queryKey: currentBatchQueryKey(benchId),
    queryFn: () => getCurrentBatch(benchId),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });
}
