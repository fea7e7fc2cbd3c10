import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { z } from 'zod';
import type { ncrListQuery, NcrRow } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { exportHref, type Filled } from '../../lib/list-filter';
import { ncrKeys } from './keys';

/** The query GET /api/ncrs takes (shared ncrListQuery), with paging and sorting always set. */
export type NcrFilter = Filled<z.input<typeof ncrListQuery>, 'page' | 'pageSize' | 'sort' | 'dir'>;

export const fetchNcrs = (filter: NcrFilter, signal?: AbortSignal) =>
  http<Paged<NcrRow>>('/api/ncrs', { query: filter, signal });

export const ncrListQueryOptions = (filter: NcrFilter) =>
  queryOptions({ queryKey: ncrKeys.list(filter), queryFn: ({ signal }) => fetchNcrs(filter, signal) });

export function useNcrs(filter: NcrFilter) {
  return useQuery({ ...ncrListQueryOptions(filter), placeholderData: keepPreviousData });
}

/** The same rows as CSV: every filter and the sort, without the paging. */
export const ncrExportHref = (filter: NcrFilter) => exportHref('/api/ncrs/export.csv', filter);
