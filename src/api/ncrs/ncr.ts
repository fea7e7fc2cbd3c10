import { queryOptions, useQuery } from '@tanstack/react-query';
import type { NcrDetail } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { ncrKeys } from './keys';

/** `number` in its printed form (NC-2026-00042), so one NCR has one cache entry. */
export const fetchNcr = (number: string, signal?: AbortSignal) =>
  http<NcrDetail>(`/api/ncrs/${encodeURIComponent(number)}`, { signal });

export const ncrQueryOptions = (number: string) =>
  queryOptions({ queryKey: ncrKeys.one(number), queryFn: ({ signal }) => fetchNcr(number, signal) });

export const useNcr = (number: string) => useQuery(ncrQueryOptions(number));
