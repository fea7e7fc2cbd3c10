import { dehydrate, hydrate, type Query, type QueryClient } from '@tanstack/react-query';
import { createStore, get, set } from 'idb-keyval';

/**
 * What a station needs to keep working through a network drop, and a reload during one, kept in
 * IndexedDB: the plant, the stations, the forms already opened, the tablet's own record and the session's
 * person. Written a second after the cache changes (a sign-out empties it, and so empties this).
 */
const KEY = 'queries';
/** Older than a shift: not worth showing. */
const MAX_AGE = 12 * 60 * 60_000;
/** Raised when the shape of what is kept changes, so an old copy is dropped rather than misread. */
const VERSION = 1;

type Saved = { version: number; at: number; state: ReturnType<typeof dehydrate> };

let store: ReturnType<typeof createStore> | null = null;
const db = () => (store ??= createStore('coretrail-cache', 'queries'));

const kept = (q: Query) =>
  q.state.status === 'success' && ['station', 'stations', 'plant', 'auth'].includes(String(q.queryKey[0]));

/**
 * Before the first screen: the kept answers, except who is signed in when the network is up
 * (the server is asked that afresh; the copy is only for a reload with no network).
 */
export async function restoreCache(queryClient: QueryClient): Promise<void> {
  try {
    const saved = await get<Saved>(KEY, db());
    if (!saved || saved.version !== VERSION || Date.now() - saved.at > MAX_AGE) return;
    const queries = navigator.onLine
      ? saved.state.queries.filter((q) => q.queryKey[0] !== 'auth')
      : saved.state.queries;
    hydrate(queryClient, { ...saved.state, queries });
  } catch {
    // IndexedDB switched off or broken: the station works online as before
  }
}

export function keepCache(queryClient: QueryClient): void {
  let timer: ReturnType<typeof setTimeout> | undefined;
  queryClient.getQueryCache().subscribe(() => {
    clearTimeout(timer);
    timer = setTimeout(() => {
      const state = dehydrate(queryClient, { shouldDehydrateQuery: kept });
      void set(KEY, { version: VERSION, at: Date.now(), state } satisfies Saved, db()).catch(() => undefined);
    }, 1000);
  });
}
