import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FrozenLimitsJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { spcKeys } from './keys';

export const fetchFrozenLimits = (family: string, characteristicId: number, signal?: AbortSignal) =>
  http<FrozenLimitsJson[]>('/api/spc/limits', { query: { family, characteristicId }, signal });

export const frozenLimitsQueryOptions = (family: string, characteristicId: number) =>
  queryOptions({
    queryKey: spcKeys.limits(family, characteristicId),
    queryFn: ({ signal }) => fetchFrozenLimits(family, characteristicId, signal),
  });

export const useFrozenLimits = (family: string | null, characteristicId: number | null) =>
  useQuery({
    ...frozenLimitsQueryOptions(family ?? '', characteristicId ?? 0),
    enabled: family !== null && characteristicId !== null,
  });
