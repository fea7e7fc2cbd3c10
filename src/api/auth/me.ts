import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Permission } from '../../../shared/permissions';
import { can } from '../../../shared/permissions';
import type { MeResponse } from '../../../shared/schemas/auth';
import { ApiError, http } from '../../lib/http';

export const meKey = ['auth', 'me'] as const;

/** The signed-in person, or null when nobody is signed in (a 401 here is an answer, not a failure). */
export async function fetchMe(): Promise<MeResponse | null> {
  try {
    return await http<MeResponse>('/api/auth/me');
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

/**
 * Only loaders ask this question (the layout merely reads the answer), so a session is checked at
 * navigation, never swapped out from under an open screen. No abort signal: a loader awaiting the
 * answer must get it even if the layout that was watching it goes away mid-request.
 */
export const meQueryOptions = () =>
  queryOptions({ queryKey: meKey, queryFn: () => fetchMe(), staleTime: 5 * 60_000, refetchOnReconnect: false });

export type SignedIn = MeResponse & { can: (p: Permission) => boolean };

export function toSignedIn(me: MeResponse): SignedIn {
  return { ...me, can: (p) => can(me.user.role, p) };
}

/** Inside the app layout the loader has already made sure someone is signed in. */
export function useSignedIn(): SignedIn | null {
  const { data } = useQuery(meQueryOptions());
  return data ? toSignedIn(data) : null;
}
