import { batchSchema } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

const answerSchema = z.object({ batch: batchSchema.nullable() });

/**
 * The batch in progress at a bench when the overview opens; after that the live socket's `batch`
 * events keep it current.
 */
export function useBenchBatch(benchId: string) {
  return useQuery({
    queryKey: ['batches', 'current', benchId],
    queryFn: async () =>
      (await apiRequest(`/batches/current?benchId=${encodeURIComponent(benchId)}`, answerSchema))
        .batch,
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });
}
