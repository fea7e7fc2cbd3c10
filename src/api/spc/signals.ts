import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StoredSignalJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { spcKeys } from './keys';

/** Signals station results raised against frozen limits (newest first, at most 500). */
export const fetchSignals = (family: string, characteristicId: number, signal?: AbortSignal) =>
  http<StoredSignalJson[]>('/api/spc/signals', { query: { family, characteristicId }, signal });

export const signalsQueryOptions = (family: string, characteristicId: number) =>
  queryOptions({
    queryKey: spcKeys.signals(family, characteristicId),
    queryFn: ({ signal }) => fetchSignals(family, characteristicId, signal),
  });

export const useSignals = (family: string | null, characteristicId: number | null) =>
  useQuery({
    ...signalsQueryOptions(family ?? '', characteristicId ?? 0),
    enabled: family !== null && characteristicId !== null,
  });
