import { pourPlanSchema, type PourPlan } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from './api-client';

export const pourPlansQueryKey = ['pour-plans'] as const;

export function getPourPlans(): Promise<PourPlan[]> {
  return apiRequest('/pour-plans', z.array(pourPlanSchema));
}

/** The saved pour plans, each with its total as the material is now. */
export function usePourPlans() {
  return useQuery({ queryKey: pourPlansQueryKey, queryFn: getPourPlans });
}
