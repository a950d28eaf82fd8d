import {
  materialSchema,
  pourPlanSchema,
  type Material,
  type PourPlan,
  type PourPlanInput,
  type PourPlanPatch,
} from '@tareline/protocol';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '../../../lib/api-client';
import { pourPlansQueryKey } from '../../../lib/pour-plans';

export const pourPlanQueryKey = (id: string) => [...pourPlansQueryKey, id] as const;

/** One plan with the batches poured from it. */
export function usePourPlan(id: string | undefined) {
  return useQuery({
    queryKey: pourPlanQueryKey(id ?? ''),
    queryFn: (): Promise<PourPlan> =>
      apiRequest(`/pour-plans/${encodeURIComponent(id!)}`, pourPlanSchema),
    enabled: !!id,
  });
}

/** The materials a plan may name: those in use (a plan is for pouring). */
export function usePlanMaterials() {
  return useQuery({
    queryKey: ['materials'],
    queryFn: (): Promise<Material[]> => apiRequest('/materials', z.array(materialSchema)),
    select: (all) => all.filter((m) => m.active),
  });
}

/** Saves a new plan (no id) or changes one; the lists are read again afterwards. */
export function useSavePourPlan(id: string | undefined) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: PourPlanInput | PourPlanPatch): Promise<PourPlan> =>
      apiRequest(id ? `/pour-plans/${encodeURIComponent(id)}` : '/pour-plans', pourPlanSchema, {
        method: id ? 'PATCH' : 'POST',
        body: JSON.stringify(body),
      }),
    onSuccess: () => client.invalidateQueries({ queryKey: pourPlansQueryKey }),
  });
}
