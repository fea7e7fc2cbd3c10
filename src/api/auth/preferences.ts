import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse, PreferencesBody } from '../../../shared/schemas/auth';
import { http } from '../../lib/http';
import { meKey } from './me';

export const setPreferences = (body: PreferencesBody) =>
  http<MeResponse>('/api/auth/preferences', { method: 'PATCH', body });

/** The reply is the person as /me gives it: put straight in the cache, so every screen follows at once. */
export function useSetPreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setPreferences,
    onSuccess: (me) => queryClient.setQueryData(meKey, me),
  });
}
