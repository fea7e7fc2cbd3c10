import type { QueryClient } from '@tanstack/react-query';

export const stationKeys = {
  all: ['station'] as const,
  /** Every station form of every part: the prefix to refresh when what a station asks for may have changed. */
  forms: ['station', 'form'] as const,
  form: (station: string, serial: string) => ['station', 'form', station, serial] as const,
  /** The signed-in person's units to type readings in (cleared with the rest of the cache at sign-out). */
  unitPreferences: ['station', 'unit-preferences'] as const,
};

/**
 * Asks every station form again, open or cached: for anything that changes what a station records
 * or whether a part is due there (a result, a re-entry, a newly approved rule in the spec book).
 */
export const refreshStationForms = (queryClient: QueryClient) =>
  queryClient.invalidateQueries({ queryKey: stationKeys.forms });
