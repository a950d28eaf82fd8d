import {
  peopleListSchema,
  personSchema,
  type AssignBadgeRequest,
  type CreatePersonRequest,
  type Person,
  type SetPasswordRequest,
  type SetPinRequest,
  type UpdatePersonRequest,
} from '@tareline/protocol';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';

export const peopleQueryKey = ['people'] as const;

export function usePeople() {
  return useQuery({
    queryKey: peopleQueryKey,
    queryFn: () => apiRequest('/people', peopleListSchema),
  });
}

function send(path: string, method: string, body: unknown): Promise<Person> {
  return apiRequest(path, personSchema, { method, body: JSON.stringify(body) });
}

/** Every change to a person answers the updated person; the table refreshes after each. */
function usePersonMutation<V>(fn: (vars: V) => Promise<Person>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleQueryKey }),
  });
}

export const useCreatePerson = () =>
  usePersonMutation((body: CreatePersonRequest) => send('/people', 'POST', body));

export const useUpdatePerson = () =>
  usePersonMutation(({ id, ...body }: UpdatePersonRequest & { id: string }) =>
    send(`/people/${encodeURIComponent(id)}`, 'PATCH', body),
  );

export const useAssignBadge = () =>
  usePersonMutation(({ id, ...body }: AssignBadgeRequest & { id: string }) =>
    send(`/people/${encodeURIComponent(id)}/badge`, 'PUT', body),
  );

export const useSetPin = () =>
  usePersonMutation(({ id, ...body }: SetPinRequest & { id: string }) =>
    send(`/people/${encodeURIComponent(id)}/pin`, 'PUT', body),
  );

export const useSetPassword = () =>
  usePersonMutation(({ id, ...body }: SetPasswordRequest & { id: string }) =>
    send(`/people/${encodeURIComponent(id)}/password`, 'PUT', body),
  );
