import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatePersonBody, Person } from '../../../shared/schemas/people';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { peopleKeys } from './keys';

export const createPerson = (body: CreatePersonBody) => http<Person>('/api/people', { method: 'POST', body });

export function useCreatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createPerson,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: peopleKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
