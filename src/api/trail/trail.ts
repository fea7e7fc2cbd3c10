import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrailJson } from '../../../shared/schemas/trail';
import { http } from '../../lib/http';
import { trailKeys } from './keys';

/** Everything about one serial; `serial` in its printed form (parseSerial). */
export const fetchTrail = (serial: string, signal?: AbortSignal) =>
  http<TrailJson>(`/api/trail/${encodeURIComponent(serial)}`, { signal });

export const trailQueryOptions = (serial: string) =>
  queryOptions({ queryKey: trailKeys.one(serial), queryFn: ({ signal }) => fetchTrail(serial, signal) });

export const useTrail = (serial: string | null) =>
  useQuery({ ...trailQueryOptions(serial ?? ''), enabled: serial !== null });
