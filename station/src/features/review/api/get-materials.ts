import { materialSchema, type Material } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

/** Every material, retired ones too: old batches are filtered by them. */
export function useFilterMaterials() {
  return useQuery({
    queryKey: ['materials'],
    queryFn: (): Promise<Material[]> => apiRequest('/materials', z.array(materialSchema)),
  });
}
