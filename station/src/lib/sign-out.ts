import { useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { z } from 'zod';
import { apiRequest } from './api-client';
import { getToken, setSession } from './auth';

/**
 * Signs out: forgets the session and drops every cached answer at once, so nothing of the
 * previous person stays on screen, then revokes the token on the hub (best effort: a hub that is
 * away must not keep the screen signed in).
 */
export function useSignOut(): () => Promise<void> {
  const queryClient = useQueryClient();
  return useCallback(async () => {
    const token = getToken();
    setSession(null);
    queryClient.clear();
    if (!token) return;
    await apiRequest('/auth/logout', z.undefined(), {
      method: 'POST',
      headers: { Authorization: `Bearer ${token}` },
    }).catch(() => undefined);
  }, [queryClient]);
}
