import {
  lotSchema,
  materialImportResultSchema,
  materialSchema,
  stockMovementSchema,
  type LotAdjustmentInput,
  type LotInput,
  type MaterialInput,
  type MaterialPatch,
} from '@tareline/protocol';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';
import { downloadFromHub } from '../../../lib/download';

// The bench caches materials under ['materials'] and lots under ['lots', id]: every change here
// invalidates both prefixes so an open bench sees it too.
const MATERIALS = ['materials'] as const;
const LOTS = ['lots'] as const;

/** The library; retired materials too when asked. */
export function useMaterialLibrary(includeRetired: boolean) {
  return useQuery({
    queryKey: [...MATERIALS, 'library', includeRetired],
    queryFn: () =>
      apiRequest(
        `/materials${includeRetired ? '?includeRetired=true' : ''}`,
        z.array(materialSchema),
      ),
  });
}

/** Every lot of every material, with on-hand stock and warnings. */
export function useAllLots() {
  return useQuery({
    queryKey: [...LOTS, 'all'],
    queryFn: () => apiRequest('/lots', z.array(lotSchema)),
  });
}

export function useLotMovements(lotId: string) {
  return useQuery({
    queryKey: [...LOTS, 'movements', lotId],
    queryFn: () =>
      apiRequest(`/lots/${encodeURIComponent(lotId)}/movements`, z.array(stockMovementSchema)),
  });
}

function useChange<V, R>(fn: (vars: V) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: MATERIALS });
      await queryClient.invalidateQueries({ queryKey: LOTS });
    },
  });
}

const json = (method: string, body: unknown): RequestInit => ({
  method,
  body: JSON.stringify(body),
});

export const useCreateMaterial = () =>
  useChange((body: MaterialInput) => apiRequest('/materials', materialSchema, json('POST', body)));

export const useUpdateMaterial = () =>
  useChange(({ id, ...body }: MaterialPatch & { id: string }) =>
    apiRequest(`/materials/${encodeURIComponent(id)}`, materialSchema, json('PATCH', body)),
  );

export const useReceiveLot = () =>
  useChange((body: LotInput) => apiRequest('/lots', lotSchema, json('POST', body)));

export const useAdjustLot = () =>
  useChange(({ id, ...body }: LotAdjustmentInput & { id: string }) =>
    apiRequest(`/lots/${encodeURIComponent(id)}/adjustments`, lotSchema, json('POST', body)),
  );

export const useImportLibrary = () =>
  useChange((csv: string) =>
    apiRequest('/materials/import', materialImportResultSchema, json('POST', { csv })),
  );

/** Downloads the whole library, retired materials included, as the import reads it. */
export function downloadLibraryCsv(): Promise<void> {
  return downloadFromHub(
    '/api/materials/export.csv',
    `materials-${new Date().toISOString().slice(0, 10)}.csv`,
    'text/csv',
  );
}
