import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { LiftLockoutBody, LockoutsJson } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export const lockoutsKey = ['lockouts'] as const;

export const fetchLockouts = (signal?: AbortSignal) => http<LockoutsJson>('/api/lockouts', { signal });

export const lockoutsQueryOptions = () =>
  queryOptions({ queryKey: lockoutsKey, queryFn: ({ signal }) => fetchLockouts(signal) });

export const useLockouts = () => useQuery(lockoutsQueryOptions());

export const liftLockout = (body: LiftLockoutBody) => http<void>('/api/lockouts/lift', { method: 'POST', body });

export function useLiftLockout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: liftLockout,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: lockoutsKey }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
