import { materialSchema, type Material } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';

export const materialsQueryKey = ['materials'] as const;

export function getMaterials(): Promise<Material[]> {
  return apiRequest('/materials', z.array(materialSchema));
}

/** Every material the hub knows, retired ones too (the flow offers only active ones). */
export function useMaterials() {
  return useQuery({ queryKey: materialsQueryKey, queryFn: getMaterials });
}
