import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PlantJson } from '../../../shared/schemas/plant';
import { http } from '../../lib/http';

export const plantKeys = { one: ['plant'] as const };

export const fetchPlant = (signal?: AbortSignal) => http<PlantJson>('/api/plant', { signal });

/** The plant's name, address and calendar; "today" comes from the server in the plant's time zone. */
export const plantQueryOptions = () =>
  queryOptions({ queryKey: plantKeys.one, queryFn: ({ signal }) => fetchPlant(signal), staleTime: 60_000 });

export const usePlant = () => useQuery(plantQueryOptions());
