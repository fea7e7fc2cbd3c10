import { useMutation, useQueryClient } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { meKey } from './me';

export const signOut = () => http<void>('/api/auth/logout', { method: 'POST' });

/**
 * Marks the session stale without refetching: the open screen keeps what it shows until the
 * caller reaches the sign-in page, which asks the server afresh and drops every cached answer.
 */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => queryClient.invalidateQueries({ queryKey: meKey, refetchType: 'none' }),
  });
}
