import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { language } from '../../lib/i18n';
import { localizeForm } from '../../lib/position-words';
import { inTabletMode } from '../../lib/tablet-mode';
import { stationKeys } from './keys';
import type { StationFormJson } from './types';

/** `serial` is the checked, printed form (parseSerial), so one part has one cache entry per station. */
export const fetchStationForm = (station: string, serial: string, signal?: AbortSignal) =>
  inTabletMode()
    ? http<StationFormJson>('/api/tablet/form', { query: { serial }, signal })
    : http<StationFormJson>(`/api/stations/${encodeURIComponent(station)}/form`, { query: { serial }, signal });

/**
 * Kept only briefly: whether a part is due here changes as other stations record it, and a form
 * opened on an old answer would only be refused on submit. A new scan asks again.
 */
export const stationFormQueryOptions = (station: string, serial: string) =>
  queryOptions({
    queryKey: stationKeys.form(station, serial),
    queryFn: ({ signal }) => fetchStationForm(station, serial, signal),
    staleTime: 5_000,
    // kept for the shift, so a form opened once can still be recorded on when the network drops
    gcTime: 12 * 60 * 60_000,
  });

/** The form with its positions named in the screen's language (the cache keeps the server's words). */
export const useStationForm = (station: string | null, serial: string | null) =>
  useQuery({
    ...stationFormQueryOptions(station ?? '', serial ?? ''),
    enabled: station !== null && serial !== null,
    select: language() === 'en' ? undefined : localizeForm,
  });
