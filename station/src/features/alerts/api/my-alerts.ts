import {
  alertSubscriptionSchema,
  type AlertEvent,
  type AlertSubscription,
} from '@tareline/protocol';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export const myAlertsQueryKey = ['me', 'alerts'] as const;

/** The alerts the signed-in person gets by mail. */
export function useMyAlerts() {
  return useQuery({
    queryKey: myAlertsQueryKey,
    queryFn: () => apiRequest('/me/alerts', alertSubscriptionSchema),
  });
}

export function useSetMyAlerts() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (events: AlertEvent[]): Promise<AlertSubscription> =>
      apiRequest('/me/alerts', alertSubscriptionSchema, {
        method: 'PUT',
        body: JSON.stringify({ events }),
      }),
    onSuccess: (answer) => queryClient.setQueryData(myAlertsQueryKey, answer),
  });
}
