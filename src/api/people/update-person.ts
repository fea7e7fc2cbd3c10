import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Person, UpdatePersonBody } from '../../../shared/schemas/people';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { peopleKeys } from './keys';

export const updatePerson = ({ id, ...body }: UpdatePersonBody & { id: number }) =>
  http<Person>(`/api/people/${id}`, { method: 'PATCH', body });

export function useUpdatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePerson,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: peopleKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
