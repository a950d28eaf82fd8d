import { outboxMessageSchema } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

/** The hub's alert outbox (admins), refreshed while the page is open so a retry shows. */
export function useOutbox() {
  return useQuery({
    queryKey: ['outbox'],
    queryFn: () => apiRequest('/outbox', z.array(outboxMessageSchema)),
    refetchInterval: 10_000,
  });
}
