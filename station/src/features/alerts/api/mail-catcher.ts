import { caughtMailSchema } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

/** What the hub's local mail catcher received (admins; only when no SMTP server is set). */
export function useCaughtMail() {
  return useQuery({
    queryKey: ['mail-catcher'],
    queryFn: () => apiRequest('/mail-catcher', z.array(caughtMailSchema)),
    refetchInterval: 10_000,
    retry: false,
  });
}
