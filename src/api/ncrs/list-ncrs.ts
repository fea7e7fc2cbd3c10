import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { NCR_SORTS, NcrRow, NcrState, Severity } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { ncrKeys } from './keys';

/** The query GET /api/ncrs takes (shared ncrListQuery), with paging and sorting always set. */
export type NcrFilter = {
  page: number;
  pageSize: number;
  sort: (typeof NCR_SORTS)[number];
  dir: 'asc' | 'desc';
  state?: NcrState | 'open';
  severity?: Severity;
  defect?: string;
  family?: number;
  stage?: string;
  olderThanDays?: number;
  assignee?: number | 'none';
  q?: string;
  /** Critical use-as-is decisions waiting for the signed-in engineer's countersignature. */
  awaiting?: 'me';
};

export const fetchNcrs = (filter: NcrFilter, signal?: AbortSignal) =>
  http<Paged<NcrRow>>('/api/ncrs', { query: filter, signal });

export const ncrListQueryOptions = (filter: NcrFilter) =>
  queryOptions({ queryKey: ncrKeys.list(filter), queryFn: ({ signal }) => fetchNcrs(filter, signal) });

export function useNcrs(filter: NcrFilter) {
  return useQuery({ ...ncrListQueryOptions(filter), placeholderData: keepPreviousData });
}

/** The same rows as CSV: every filter and the sort, without the paging. */
export function ncrExportHref(filter: NcrFilter): string {
  const { page: _p, pageSize: _s, ...rest } = filter;
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(rest)) if (v !== undefined) q.set(k, String(v));
  return `/api/ncrs/export.csv?${q.toString()}`;
}
