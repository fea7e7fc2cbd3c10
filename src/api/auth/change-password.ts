import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordBody } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';
import { meKey } from './me';

export const changePassword = (body: ChangePasswordBody) => http<void>('/api/auth/password', { method: 'POST', body });

/** The server ends every session of this person, this one included; see useSignOut for what follows. */
export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changePassword,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: meKey, refetchType: 'none' }),
  });
}
