import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { UnitPreferenceBody, UnitPreferencesJson } from '../../../shared/schemas/unit-preferences';
import { http } from '../../lib/http';
import { inTabletMode } from '../../lib/tablet-mode';
import { stationKeys } from './keys';

// a shared tablet has no person signed in: its forms open in the characteristics' own units
export const fetchUnitPreferences = (signal?: AbortSignal) =>
  inTabletMode()
    ? Promise.resolve({ preferences: {} } as UnitPreferencesJson)
    : http<UnitPreferencesJson>('/api/auth/unit-preferences', { signal });

/** The signed-in person's units to type in: theirs alone, and changed only by them, so kept a while. */
export const unitPreferencesQueryOptions = () =>
  queryOptions({
    queryKey: stationKeys.unitPreferences,
    queryFn: ({ signal }) => fetchUnitPreferences(signal),
    staleTime: 10 * 60_000,
  });

export const useUnitPreferences = () => useQuery(unitPreferencesQueryOptions());

export const setUnitPreference = (body: UnitPreferenceBody) =>
  inTabletMode()
    ? Promise.resolve({ preferences: {} } as UnitPreferencesJson)
    : http<UnitPreferencesJson>('/api/auth/unit-preferences', { method: 'PUT', body });

/** Remembers the unit chosen at a station for the next form; the reply is the whole set. */
export function useSetUnitPreference() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setUnitPreference,
    onSuccess: (prefs) => queryClient.setQueryData(stationKeys.unitPreferences, prefs),
  });
}
