import {
  computePlan,
  fieldErrors,
  planRequestSchema,
  type ApiError,
  type PlanRequest,
  type PlanResponse,
} from '@tareline/protocol';
import { useMemo } from 'react';

export type PlanPreview =
  | { plan: PlanResponse; request: PlanRequest; problems: [] }
  | { plan: undefined; request: undefined; problems: ApiError['errors'] };

/**
 * The plan for what is typed so far, computed on the station with the same pure function the hub
 * runs for `POST /api/plan`; or, while something is missing or wrong, the list of what is.
 */
export function usePlanPreview(values: unknown): PlanPreview {
  return useMemo(() => {
    const parsed = planRequestSchema.safeParse(values);
    if (!parsed.success) {
      return { plan: undefined, request: undefined, problems: fieldErrors(parsed.error) };
    }
    return { plan: computePlan(parsed.data), request: parsed.data, problems: [] };
  }, [values]);
}
