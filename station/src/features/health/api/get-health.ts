import { healthResponseSchema, type HealthResponse } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export const healthQueryKey = ['health'] as const;

export function getHealth(): Promise<HealthResponse> {
  return apiRequest('/health', healthResponseSchema);
}

/** The hub's health, polled so the indicator notices a hub that went away. */
export function useHealth() {
  return useQuery({
    queryKey: healthQueryKey,
    queryFn: getHealth,
    refetchInterval: 5_000,
    retry: false,
  });
}
