import { onlineManager, type QueryClient } from '@tanstack/react-query';
import { data, redirect } from 'react-router';
import type { Permission } from '../../shared/permissions';
import { meKey, meQueryOptions, toSignedIn, type SignedIn } from '../api/auth/me';
import { signInHref } from './paths';

const pathOf = (request: Request) => {
  const url = new URL(request.url);
  return `${url.pathname}${url.search}`;
};

/**
 * For loaders: the signed-in person, or a redirect to sign-in that remembers where they were going.
 * fetchQuery (not ensureQueryData) so a stale answer is checked again before a page trusts it.
 */
export async function requireSignedIn(queryClient: QueryClient, request: Request): Promise<SignedIn> {
  const before = queryClient.getQueryData(meQueryOptions().queryKey);
  // no network: the session this page already knew stands (asking would wait until the network is back)
  const me = before && !onlineManager.isOnline() ? before : await queryClient.fetchQuery(meQueryOptions());
  // someone was signed in a moment ago: say the session ended rather than just asking to sign in
  if (!me) throw redirect(signInHref({ next: pathOf(request), note: before ? 'expired' : undefined }));
  return toSignedIn(me);
}

/** For loaders of an area: the server would refuse anyway; this says so before any data is asked for. */
export async function requirePermission(
  queryClient: QueryClient,
  request: Request,
  permission: Permission,
): Promise<SignedIn> {
  const me = await requireSignedIn(queryClient, request);
  if (!me.can(permission)) throw data({ permission }, { status: 403, statusText: 'Not part of your role' });
  return me;
}

/** Everything cached for whoever was signed in, kept only until the sign-in page is reached. */
export function forgetEverything(queryClient: QueryClient): void {
  queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== meKey[0] });
}
