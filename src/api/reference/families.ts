import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EngineFamily } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { referenceKeys } from './keys';

export const fetchFamilies = (signal?: AbortSignal) => http<EngineFamily[]>('/api/engine-families', { signal });

export const familiesQueryOptions = () =>
  queryOptions({ queryKey: referenceKeys.families, queryFn: ({ signal }) => fetchFamilies(signal) });

export const useFamilies = () => useQuery(familiesQueryOptions());
