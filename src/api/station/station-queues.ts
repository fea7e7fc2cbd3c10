import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { stationKeys } from './keys';

export type StationQueue = { code: string; waiting: number; rank: number };

export const fetchStationQueues = (signal?: AbortSignal) => http<StationQueue[]>('/api/station-queues', { signal });

/** The chooser's counts: a glance, so a minute old is fine, and asked again whenever it opens. */
export const stationQueuesQueryOptions = () =>
  queryOptions({
    queryKey: [...stationKeys.all, 'queues'] as const,
    queryFn: ({ signal }) => fetchStationQueues(signal),
    staleTime: 0,
  });

export const useStationQueues = () => useQuery(stationQueuesQueryOptions());
