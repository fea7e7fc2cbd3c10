import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ResultJson } from '../../../shared/schemas/results';
import { http } from '../../lib/http';
import { itemKeys } from './keys';

export type ItemResult = ResultJson & { supersededBy: number | null };

/** An item's station results, newest first; `serial` in its printed form (see item.ts). */
export const fetchItemResults = (serial: string, signal?: AbortSignal) =>
  http<ItemResult[]>(`/api/items/${encodeURIComponent(serial)}/results`, { signal });

export const itemResultsQueryOptions = (serial: string) =>
  queryOptions({ queryKey: itemKeys.results(serial), queryFn: ({ signal }) => fetchItemResults(serial, signal) });

export const useItemResults = (serial: string) => useQuery(itemResultsQueryOptions(serial));
