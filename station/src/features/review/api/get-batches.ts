import {
  batchDispositionFilterOptions,
  batchPageSchema,
  batchSortSchema,
  batchStateSchema,
  batchVerdictSchema,
  type BatchPage,
  type BatchSort,
} from '@tareline/protocol';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

/** The list's filters as the address holds them: every value a string, absent when not set. */
export interface BatchFilter {
  from?: string | undefined;
  to?: string | undefined;
  materialId?: string | undefined;
  benchId?: string | undefined;
  operatorId?: string | undefined;
  verdict?: string | undefined;
  state?: string | undefined;
  disposition?: string | undefined;
  lot?: string | undefined;
  sort?: BatchSort | undefined;
}

export const FILTER_KEYS = [
  'from',
  'to',
  'materialId',
  'benchId',
  'operatorId',
  'verdict',
  'state',
  'disposition',
  'lot',
  'sort',
] as const satisfies readonly (keyof BatchFilter)[];

/** Dates in the address are local days (`2026-12-02`); the hub takes instants. */
const startOfDay = (day: string, plusDays = 0) => {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Date(y, m - 1, d + plusDays).toISOString();
};

/**
 * The hub's query for a filter: the day range from the start of `from` to the end of `to`, and
 * only values the hub knows (a hand-edited address drops what it cannot use).
 */
export function batchQuery(filter: BatchFilter): URLSearchParams {
  const params = new URLSearchParams();
  const day = /^\d{4}-\d\d-\d\d$/;
  if (filter.from && day.test(filter.from)) params.set('from', startOfDay(filter.from));
  if (filter.to && day.test(filter.to)) params.set('to', startOfDay(filter.to, 1));
  for (const key of ['materialId', 'benchId', 'operatorId', 'lot'] as const) {
    const value = filter[key]?.trim();
    if (value) params.set(key, value);
  }
  if (batchVerdictSchema.safeParse(filter.verdict).success) params.set('verdict', filter.verdict!);
  if (batchStateSchema.safeParse(filter.state).success) params.set('state', filter.state!);
  if (batchDispositionFilterOptions.safeParse(filter.disposition).success) {
    params.set('disposition', filter.disposition!);
  }
  if (filter.sort && batchSortSchema.safeParse(filter.sort).success) {
    params.set('sort', filter.sort);
  }
  return params;
}

export const batchesQueryKey = (filter: BatchFilter) => ['batches', 'list', filter] as const;

export function getBatchPage(filter: BatchFilter, cursor: string | null): Promise<BatchPage> {
  const params = batchQuery(filter);
  if (cursor) params.set('cursor', cursor);
  params.set('limit', '50');
  return apiRequest(`/batches?${params.toString()}`, batchPageSchema);
}

/** One page of the batches a filter finds: the first page with no cursor, later ones after it. */
export function useBatchPage(filter: BatchFilter, cursor: string | null) {
  return useQuery({
    queryKey: [...batchesQueryKey(filter), cursor] as const,
    queryFn: () => getBatchPage(filter, cursor),
    // The page on screen stays while the next one loads: the table does not jump to empty.
    placeholderData: keepPreviousData,
  });
}
