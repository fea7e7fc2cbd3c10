import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { OwnSession } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';

export const sessionsKey = ['auth', 'sessions'] as const;

export const fetchOwnSessions = (signal?: AbortSignal) => http<OwnSession[]>('/api/auth/sessions', { signal });

export const ownSessionsQueryOptions = () =>
  queryOptions({ queryKey: sessionsKey, queryFn: ({ signal }) => fetchOwnSessions(signal) });

export const useOwnSessions = () => useQuery(ownSessionsQueryOptions());

export const endOtherSessions = () => http<{ ended: number }>('/api/auth/sessions/end-others', { method: 'POST' });

export function useEndOtherSessions() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: endOtherSessions,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionsKey }),
  });
}
