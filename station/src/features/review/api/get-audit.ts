import { auditPageSchema } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

/** The first page of a batch's audit entries, oldest first (leads and admins only). */
export function useBatchAudit(batchId: number, enabled: boolean) {
  return useQuery({
    queryKey: ['audit', 'batch', batchId],
    queryFn: () => apiRequest(`/audit?entity=batch&entityId=${batchId}&limit=200`, auditPageSchema),
    enabled,
  });
}
