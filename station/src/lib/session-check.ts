import { meResponseSchema } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from './api-client';
import { useSession } from './auth';

/**
 * Asks the hub every 30 s whether the session still holds. When the hub says no (signed out
 * elsewhere, person switched off, token run out), `apiRequest` forgets the session and the screen
 * falls back to sign-in.
 */
export function useSessionCheck(): void {
  const session = useSession();
  useQuery({
    queryKey: ['me', session?.token],
    queryFn: () => apiRequest('/me', meResponseSchema),
    enabled: !!session,
    refetchInterval: 30_000,
    retry: false,
  });
}
