import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Station } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { referenceKeys } from './keys';

export const fetchStations = (signal?: AbortSignal) => http<Station[]>('/api/stations', { signal });

export const stationsQueryOptions = () =>
  queryOptions({ queryKey: referenceKeys.stations, queryFn: ({ signal }) => fetchStations(signal) });

export const useStations = () => useQuery(stationsQueryOptions());
