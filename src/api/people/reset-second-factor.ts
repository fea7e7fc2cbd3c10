import { useMutation, useQueryClient } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { peopleKeys } from './keys';

export const resetSecondFactor = (id: number) =>
  http<void>(`/api/people/${id}/second-factor/reset`, { method: 'POST' });

export function useResetSecondFactor() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resetSecondFactor,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: peopleKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
