import { benchListSchema, type BenchSummary } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from './api-client';

export const benchesQueryKey = ['benches'] as const;

export function getBenches(): Promise<BenchSummary[]> {
  return apiRequest('/benches', benchListSchema);
}

/** The benches with their scale links (the live state itself comes over the socket). */
export function useBenches() {
  return useQuery({ queryKey: benchesQueryKey, queryFn: getBenches });
}
