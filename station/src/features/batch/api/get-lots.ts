import { lotSchema, type Lot } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

export const lotsQueryKey = (materialId: string) => ['lots', materialId] as const;

export function getLots(materialId: string): Promise<Lot[]> {
  return apiRequest(`/lots?materialId=${encodeURIComponent(materialId)}`, z.array(lotSchema));
}

/** The material's lots on the shelf, each with the hub's warnings (expired, open too long). */
export function useLots(materialId: string) {
  return useQuery({ queryKey: lotsQueryKey(materialId), queryFn: () => getLots(materialId) });
}
