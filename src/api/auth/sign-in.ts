import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LoginBody, MeResponse } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';
import { meKey } from './me';

export const signIn = (body: LoginBody) => http<MeResponse>('/api/auth/login', { method: 'POST', body });

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (me) => {
      // nothing cached for a previous person may leak into this one's screens
      queryClient.clear();
      queryClient.setQueryData(meKey, me);
    },
  });
}
