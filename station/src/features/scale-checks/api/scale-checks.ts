import {
  benchCheckStatusSchema,
  scaleCheckListSchema,
  scaleCheckSchema,
  scaleCheckStartedSchema,
  startScaleCheckSchema,
  type StartScaleCheck,
} from '@tareline/protocol/scale-checks';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';
import { benchesQueryKey } from '../../../lib/benches';

const base = (benchId: string) => `/benches/${encodeURIComponent(benchId)}`;
export const checkKeys = {
  all: (benchId: string) => ['scale-checks', benchId] as const,
  status: (benchId: string) => ['scale-checks', benchId, 'status'] as const,
  list: (benchId: string) => ['scale-checks', benchId, 'list'] as const,
  one: (benchId: string, id: number) => ['scale-checks', benchId, 'one', id] as const,
};

/** How often a waiting check is asked about: the hub takes the reading, the page follows it. */
export const CHECK_POLL_MS = 400;

/** Whether a check is due at the bench, what the bench says about it, the calibration date. */
export function useCheckStatus(benchId: string) {
  return useQuery({
    queryKey: checkKeys.status(benchId),
    queryFn: () => apiRequest(`${base(benchId)}/check-status`, benchCheckStatusSchema),
  });
}

export function useCheckHistory(benchId: string) {
  return useQuery({
    queryKey: checkKeys.list(benchId),
    queryFn: () => apiRequest(`${base(benchId)}/checks`, scaleCheckListSchema),
  });
}

/** One check, asked about again and again while it waits for the weight. */
export function useCheck(benchId: string, id: number | null) {
  const queryClient = useQueryClient();
  return useQuery({
    queryKey: checkKeys.one(benchId, id ?? 0),
    enabled: id !== null,
    queryFn: async () => {
      const check = await apiRequest(`${base(benchId)}/checks/${id}`, scaleCheckSchema);
      if (check.state !== 'waiting') {
        // Done: the history, the bench's status and its stored s have changed.
        void queryClient.invalidateQueries({ queryKey: checkKeys.list(benchId) });
        void queryClient.invalidateQueries({ queryKey: checkKeys.status(benchId) });
        void queryClient.invalidateQueries({ queryKey: benchesQueryKey });
      }
      return check;
    },
    refetchInterval: (query) => (query.state.data?.state === 'waiting' ? CHECK_POLL_MS : false),
  });
}

export function useStartCheck(benchId: string) {
  return useMutation({
    mutationFn: (body: StartScaleCheck) =>
      apiRequest(`${base(benchId)}/checks`, scaleCheckStartedSchema, {
        method: 'POST',
        body: JSON.stringify(startScaleCheckSchema.parse(body)),
      }),
  });
}

export function useCancelCheck(benchId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) =>
      apiRequest(`${base(benchId)}/checks/${id}/cancel`, scaleCheckSchema, { method: 'POST' }),
    onSuccess: (check) => {
      queryClient.setQueryData(checkKeys.one(benchId, check.id), check);
      void queryClient.invalidateQueries({ queryKey: checkKeys.all(benchId) });
    },
  });
}
