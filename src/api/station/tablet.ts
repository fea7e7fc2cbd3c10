import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EnrolTabletBody, TabletJson } from '../../../shared/schemas/tablets';
import { http } from '../../lib/http';
import { stationKeys } from './keys';

/** The tablet this browser is enrolled as (its own sign-in, a device cookie), or a 401. */
export const fetchTablet = (signal?: AbortSignal) => http<TabletJson>('/api/tablet', { signal });

export const tabletQueryOptions = () =>
  queryOptions({ queryKey: [...stationKeys.all, 'tablet'] as const, queryFn: ({ signal }) => fetchTablet(signal) });

export const useTablet = () => useQuery({ ...tabletQueryOptions(), retry: false });

export const enrolTablet = (body: EnrolTabletBody) => http<TabletJson>('/api/tablets', { method: 'POST', body });
