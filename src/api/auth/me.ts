import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Permission } from '../../../shared/permissions';
import { can } from '../../../shared/permissions';
import type { MeResponse, SessionResponse } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';

export const meKey = ['auth', 'me'] as const;

/**
 * The signed-in person, or null when nobody is signed in. Asked of /api/auth/session, which answers
 * 200 either way, so the sign-in page logs no failed request in the browser's console.
 */
export async function fetchMe(): Promise<MeResponse | null> {
  const reply = await http<SessionResponse>('/api/auth/session');
  return reply.user ? (reply as MeResponse) : null;
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
