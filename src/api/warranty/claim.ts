import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { warrantyKeys } from './keys';

export const fetchClaim = (number: string, signal?: AbortSignal) =>
  http<ClaimJson>(`/api/warranty/claims/${encodeURIComponent(number)}`, { signal });

export const claimQueryOptions = (number: string) =>
  queryOptions({ queryKey: warrantyKeys.claim(number), queryFn: ({ signal }) => fetchClaim(number, signal) });

export const useClaim = (number: string) => useQuery(claimQueryOptions(number));
