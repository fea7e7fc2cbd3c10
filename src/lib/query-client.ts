import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from './http';

export type QueryClientOptions = {
  /** Tests pass `false` so a failing request fails at once. */
  retry?: boolean;
  /** Called once whenever a request finds the session gone; the app sends the person to sign-in. */
  onSignedOut?: () => void;
};

const isClientError = (err: unknown) => err instanceof ApiError && err.status >= 400 && err.status < 500;

export function makeQueryClient({ retry = true, onSignedOut }: QueryClientOptions = {}): QueryClient {
  const onError = (err: unknown) => {
    if (err instanceof ApiError && err.isSignedOut) onSignedOut?.();
  };
  return new QueryClient({
    queryCache: new QueryCache({ onError }),
    mutationCache: new MutationCache({ onError }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: false,
        // a 4xx will not change by asking again; a dropped connection or a 5xx might
        retry: retry ? (count, err) => !isClientError(err) && count < 2 : false,
      },
      mutations: { retry: false },
    },
  });
}
