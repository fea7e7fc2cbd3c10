import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { ClaimListQuery, ClaimSummaryJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { warrantyKeys } from './keys';

export type ClaimFilter = Partial<Pick<ClaimListQuery, 'state' | 'waiting' | 'q' | 'page' | 'pageSize'>>;

export const fetchClaims = (q: ClaimFilter, signal?: AbortSignal) =>
  http<Paged<ClaimSummaryJson>>('/api/warranty/claims', { query: { pageSize: 50, ...q }, signal });

export const claimsQueryOptions = (q: ClaimFilter) =>
  queryOptions({ queryKey: warrantyKeys.claims(q), queryFn: ({ signal }) => fetchClaims(q, signal) });

export const useClaims = (q: ClaimFilter, enabled = true) =>
  useQuery({ ...claimsQueryOptions(q), placeholderData: keepPreviousData, enabled });
