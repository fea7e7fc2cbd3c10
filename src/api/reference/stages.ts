import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Stage } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { referenceKeys } from './keys';

export const fetchStages = (signal?: AbortSignal) => http<Stage[]>('/api/stages', { signal });

/** Stages change only with a release of the route book, so they are kept for the session. */
export const stagesQueryOptions = () =>
  queryOptions({
    queryKey: referenceKeys.stages,
    queryFn: ({ signal }) => fetchStages(signal),
    staleTime: 30 * 60_000,
  });

export const useStages = () => useQuery(stagesQueryOptions());
