import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SecondFactorStart, SecondFactorStatus } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';
import { meKey } from './me';

export const secondFactorKey = ['auth', 'second-factor'] as const;

export const fetchSecondFactor = (signal?: AbortSignal) =>
  http<SecondFactorStatus>('/api/auth/second-factor', { signal });

export const secondFactorQueryOptions = () =>
  queryOptions({ queryKey: secondFactorKey, queryFn: ({ signal }) => fetchSecondFactor(signal) });

export const useSecondFactor = () => useQuery(secondFactorQueryOptions());

export const startSecondFactor = () => http<SecondFactorStart>('/api/auth/second-factor/start', { method: 'POST' });
export const useStartSecondFactor = () => useMutation({ mutationFn: startSecondFactor });

export const confirmSecondFactor = (code: string) =>
  http<{ recoveryCodes: string[] }>('/api/auth/second-factor/confirm', { method: 'POST', body: { code } });

/** The session becomes a full one: who is signed in and what they have both change. */
export function useConfirmSecondFactor() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: confirmSecondFactor,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: meKey }),
        queryClient.invalidateQueries({ queryKey: secondFactorKey }),
      ]),
  });
}

export const removeSecondFactor = (password: string) =>
  http<void>('/api/auth/second-factor/remove', { method: 'POST', body: { password } });

export function useRemoveSecondFactor() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeSecondFactor,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: meKey }),
        queryClient.invalidateQueries({ queryKey: secondFactorKey }),
      ]),
  });
}
