import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ResetPasswordBody } from '../../../shared/schemas/people';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export const resetPersonPassword = ({ id, ...body }: ResetPasswordBody & { id: number }) =>
  http<void>(`/api/people/${id}/password`, { method: 'POST', body });

/** Changes nothing the people list shows; only the trail gains an event. */
export function useResetPersonPassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resetPersonPassword,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKeys.all }),
  });
}
